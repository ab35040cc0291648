#!/usr/bin/env bash
# Container smoke test, run by CI (.ci/run): builds the image with a real container engine and runs it as
# docs/container.md documents, then checks it from the host over 127.0.0.1.
#
# - builds deploy/Dockerfile with deploy/build-image.sh (podman, base images assembled from this machine, no pulls);
# - runs it detached: read-only root file system, a tmpfs on /tmp, every capability dropped, no new privileges, the
#   image's own non-root user, settings (API key, JSON log format) from environment variables, the port published
#   on 127.0.0.1 only, a stop grace period of 30 s (the Deployment's terminationGracePeriodSeconds);
# - waits for GET /health/ready (start-up time reported), then: /health/live, a friction factor, a pipe diameter, a
#   network solve and a CSV batch, each checked against an independent reference or a stated property; the API key
#   enforced (401 without it or with a wrong one); the service's UID not 0, no capabilities, and a write to the root
#   file system refused while /tmp takes one; the log lines JSON, as the environment asked;
# - stops the container (SIGTERM, as docker/podman stop and Kubernetes do) while a batch is still uploading, and
#   checks that the request is answered in full after the shutdown began and that the service exits 0 within the grace
#   period;
# - removes the container, the image and the base images it built, and its temporary files (trap on exit).
#
# Usage: bash deploy/container-smoke.sh   (as root; installs podman and runc from Debian when missing)
# Exits non-zero on any failure.
set -uo pipefail

root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
id="flowsolve-smoke-$(date +%s)-$$"
image="localhost/flowsolve-api:$id"
grace=30
api_key="smoke-$(od -An -tx1 -N12 /dev/urandom | tr -d ' \n')"
export FLOWSOLVE_BASE_TAG="$id"
export CONTAINERS_CONF="${CONTAINERS_CONF:-$root/deploy/containers-ci.conf}"
work="$(mktemp -d /var/tmp/flowsolve-container-smoke.XXXXXX)"
failures=0
fail() { echo "FAIL: $*"; failures=$((failures + 1)); }
pass() { echo "ok:   $*"; }
now_ms() { date +%s%3N; }

cleanup() {
  if [ -n "${build_pid:-}" ]; then kill -TERM "$build_pid" 2>/dev/null; wait "$build_pid" 2>/dev/null; fi
  if [ -n "${upload_pid:-}" ]; then kill "$upload_pid" 2>/dev/null; fi
  podman rm -f "$id" >/dev/null 2>&1 || true
  local img
  for img in "$image" $(podman images --format '{{.Repository}}:{{.Tag}}' 2>/dev/null | grep -- "-$id\$"); do
    podman rmi -f "$img" >/dev/null 2>&1 || true
  done
  rm -rf "$work"
}
trap cleanup EXIT
trap 'exit 130' INT TERM

# --- tools -----------------------------------------------------------------------------------------------------------
missing=()
for tool in podman runc curl python3; do command -v "$tool" >/dev/null || missing+=("$tool"); done
if [ "${#missing[@]}" -gt 0 ]; then
  [ "$(id -u)" = 0 ] || { echo "missing ${missing[*]}, and not root to install them"; exit 1; }
  echo "installing ${missing[*]} from Debian"
  apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "${missing[@]}" >/dev/null \
    || { echo "could not install ${missing[*]}"; exit 1; }
fi

# --- build -----------------------------------------------------------------------------------------------------------
build_started=$(now_ms)
# In the background, so that a TERM from CI's own time limit reaches the trap at once; timeout passes it on to the
# whole build (its process group).
timeout 1800 bash deploy/build-image.sh "$image" >"$work/build.log" 2>&1 &
build_pid=$!
if ! wait "$build_pid"; then
  build_pid=""
  cat "$work/build.log"; echo "container smoke: the image did not build"; exit 1
fi
build_pid=""
build_ms=$(( $(now_ms) - build_started ))
grep -E '^(engine|assembled|built|image|runtime stage|  /)' "$work/build.log"
pass "built $image in $((build_ms / 1000)) s without pulling (--pull=never)"

# --- run ---------------------------------------------------------------------------------------------------------------
run=(podman run -d --name "$id" -p 127.0.0.1::8080 --read-only --tmpfs /tmp:rw,noexec,nosuid,size=16m
     --cap-drop ALL --security-opt no-new-privileges --stop-timeout "$grace"
     -e FlowSolve__ApiKey="$api_key" -e FlowSolve__Logging__Format=json "$image")
echo "+ ${run[*]//$api_key/<key>}"
run_started=$(now_ms)
"${run[@]}" >/dev/null || { echo "container smoke: podman run failed"; exit 1; }
port="$(podman port "$id" 8080/tcp | head -n 1 | sed 's/.*://')"
base="http://127.0.0.1:$port"
key=(-H "X-Api-Key: $api_key")

ready=0
deadline=$(( $(now_ms) + 60000 ))
while [ "$(now_ms)" -lt "$deadline" ]; do
  [ "$(podman inspect --format '{{.State.Running}}' "$id" 2>/dev/null)" = true ] || break
  if [ "$(curl -s -m 2 -o /dev/null -w '%{http_code}' "$base/health/ready")" = 200 ]; then ready=1; break; fi
  sleep 0.1
done
startup_ms=$(( $(now_ms) - run_started ))
if [ "$ready" = 0 ]; then
  podman logs "$id" 2>&1 | tail -n 40
  echo "container smoke: /health/ready never answered 200 on $base within 60 s"; exit 1
fi
pass "GET /health/ready answered 200 on $base, $startup_ms ms after podman run"

# status PATH-OR-URL curl-args...: the HTTP status, the body in $work/body.
status() { curl -s -m 30 -o "$work/body" -w '%{http_code}' "$@" || echo 000; }

body_is() { [ "$(cat "$work/body")" = "$1" ]; }
s="$(status "$base/health/live")"
if [ "$s" = 200 ] && body_is Healthy; then pass "GET /health/live answered 200 Healthy (no key needed)"; else fail "GET /health/live: $s $(head -c 200 "$work/body")"; fi

# --- the API key from the environment --------------------------------------------------------------------------------
ff="$base/v1/friction-factor?reynolds=75000&relativeRoughness=0.005"
s="$(status "$ff")"
if [ "$s" = 401 ]; then pass "without X-Api-Key a calculation answers 401"; else fail "without X-Api-Key: status $s, expected 401"; fi
s="$(status -H "X-Api-Key: not-$api_key" "$ff")"
if [ "$s" = 401 ]; then pass "with a wrong X-Api-Key a calculation answers 401"; else fail "with a wrong X-Api-Key: status $s, expected 401"; fi

# --- calculations ------------------------------------------------------------------------------------------------------
# json FIELD: a top-level number from the answer in $work/body.
json() { python3 -c 'import json, sys; print(repr(json.load(open(sys.argv[1]))[sys.argv[2]]))' "$work/body" "$1" 2>/dev/null; }

# Reference: F. M. White, Fluid Mechanics, Moody-type table at relative roughness 0.005: Re 75 000 -> f = 0.0316
# (three significant figures, so the tolerance is half a unit in the third figure).
s="$(status "${key[@]}" "$ff")"
f="$(json frictionFactor)"
if [ "$s" = 200 ] && awk -v f="$f" 'BEGIN { d = f - 0.0316; exit !(f != "" && d < 0.00005 && d > -0.00005) }'; then
  pass "GET /v1/friction-factor with the key: 200, frictionFactor $f (reference 0.0316)"
else fail "GET /v1/friction-factor with the key: status $s, frictionFactor '$f'"; fi

# Pipe diameter for Q = 0.1 m3/s, 10 m of head over 1000 m, e = 0.26 mm, nu = 1.0e-6 m2/s. Checked two ways outside
# the service: (1) the head loss of the answered diameter, from Darcy-Weisbach with the Colebrook-White friction
# factor solved here by plain fixed-point iteration, equals the 10 m given (0.2 %); (2) the explicit diameter formula
# of Swamee and Jain (1976, J. Hydraul. Div. ASCE 102(5)), stated to be within 2 % of Colebrook-White, agrees (3 %).
s="$(status "${key[@]}" "$base/v1/pipes/diameter?flow=0.1&headLoss=10&length=1000&roughness=0.00026&kinematicViscosity=1.0e-6&density=998.2")"
d="$(json diameter)"
check="$(awk -v D="$d" 'BEGIN {
  if (D == "" || D <= 0) { print "no diameter"; exit 1 }
  Q = 0.1; L = 1000; e = 0.00026; nu = 1.0e-6; g = 9.80665; hf = 10; pi = 3.141592653589793
  V = 4 * Q / (pi * D * D); Re = V * D / nu
  x = 8; for (i = 0; i < 100; i++) x = -2 * log(e / (3.7 * D) + 2.51 * x / Re) / log(10)
  f = 1 / (x * x); h = f * L / D * V * V / (2 * g)
  sj = 0.66 * (e ^ 1.25 * (L * Q * Q / (g * hf)) ^ 4.75 + nu * Q ^ 9.4 * (L / (g * hf)) ^ 5.2) ^ 0.04
  printf "head loss at D %.5f m: %.4f m (given 10); Swamee-Jain D %.5f m", D, h, sj
  exit !((h - hf) / hf < 0.002 && (hf - h) / hf < 0.002 && (D - sj) / sj < 0.03 && (sj - D) / sj < 0.03) }')"
check_ok=$?
if [ "$s" = 200 ] && [ "$check_ok" = 0 ]; then pass "GET /v1/pipes/diameter: 200, $check"
else fail "GET /v1/pipes/diameter: status $s, diameter '$d': $check"; fi

# Network: the sample scenario. Properties checked against the request document itself: every load case converged;
# the reservoirs together supply the demands given times the load case's multiplier (continuity); along every open
# pipe the head drop between its end nodes equals its head loss (energy), to 1 mm.
s="$(status "${key[@]}" -X POST -H 'Content-Type: application/json' --data-binary @samples/scenario/vandrel-network.json "$base/v1/networks/solve")"
if [ "$s" = 200 ] && out="$(python3 - samples/scenario/vandrel-network.json "$work/body" <<'EOF'
import json, math, sys
request, answer = json.load(open(sys.argv[1])), json.load(open(sys.argv[2]))
problems = []
base_demand = sum(j["demand"] for j in request["junctions"])
fixed = {r["id"]: r["head"] for r in request["reservoirs"]}
pipes = {p["id"]: p for p in request["pipes"]}
multipliers = request.get("demandMultipliers", [1])
if len(answer["cases"]) != len(multipliers):
    problems.append(f"{len(answer['cases'])} load cases for {len(multipliers)} multipliers")
worst = 0.0
for m, case in zip(multipliers, answer["cases"]):
    if not case.get("converged") or case.get("status") != "solved":
        problems.append(f"case x{m}: status {case.get('status')}, converged {case.get('converged')}")
    supply = sum(r["outflow"] for r in case["reservoirs"])
    if abs(supply - m * base_demand) > 1e-6 * max(1.0, m * base_demand):
        problems.append(f"case x{m}: the reservoirs supply {supply} m3/s, the demands sum to {m * base_demand}")
    heads = dict(fixed)
    heads.update({j["id"]: j["head"] for j in case["junctions"]})
    for p in case["pipes"]:
        if p["status"] != "open":
            continue
        spec = pipes[p["id"]]
        error = abs(heads[spec["from"]] - heads[spec["to"]] - math.copysign(abs(p["headLoss"]), p["flow"]))
        worst = max(worst, error)
        if error > 1e-3:
            problems.append(f"case x{m}, pipe {p['id']}: head drop and head loss differ by {error:.4f} m")
print(f"{len(multipliers)} load cases converged, continuity met, largest energy mismatch on an open pipe {worst:.1e} m"
      if not problems else "; ".join(problems))
sys.exit(1 if problems else 0)
EOF
)"; then pass "POST /v1/networks/solve (samples/scenario): 200, $out"
else fail "POST /v1/networks/solve: status $s ${out:-}"; fi

# check_batch CSV ANSWER: one answer row per case, in order, each 200, each sized pipe using exactly the head given.
check_batch() {
  python3 - "$1" "$2" <<'EOF'
import csv, sys
cases = list(csv.DictReader(open(sys.argv[1])))
rows = list(csv.DictReader(open(sys.argv[2])))
problems = [] if len(rows) == len(cases) else [f"{len(rows)} answer rows for {len(cases)} cases"]
for case, row in zip(cases, rows):
    if row["httpStatus"] != "200":
        problems.append(f"row {row['row']}: {row['httpStatus']} {row['error']}")
    elif abs(float(row["headLoss"]) - float(case["headLoss"])) > 1e-6 * float(case["headLoss"]):
        problems.append(f"row {row['row']}: head loss {row['headLoss']} m, given {case['headLoss']} m")
print(f"{len(rows)} rows, each 200 with the head loss given" if not problems else "; ".join(problems[:5]))
sys.exit(1 if problems else 0)
EOF
}
csv_in=samples/scenario/pipe-sizing-study.csv
s="$(status "${key[@]}" -X POST -H 'Content-Type: text/csv' --data-binary "@$csv_in" "$base/v1/batch/pipes/diameter")"
if [ "$s" = 200 ] && out="$(check_batch "$csv_in" "$work/body")"; then pass "POST /v1/batch/pipes/diameter (CSV, $csv_in): 200, $out"
else fail "POST /v1/batch/pipes/diameter: status $s ${out:-}"; fi

# --- the process and its file system ------------------------------------------------------------------------------------
pid="$(podman inspect --format '{{.State.Pid}}' "$id")"
# podman top reads the container's processes from /proc: USER is the name in the image's /etc/passwd, HUSER the UID
# (the same number inside and outside: this engine runs the container without a user namespace).
read -r user uid < <(podman top "$id" user huser | awk 'NR == 2 { print $1, $2 }')
read -r _ ruid euid suid fsuid < <(grep '^Uid:' "/proc/$pid/status")
if [ -n "${uid:-}" ] && [ "$uid" != 0 ] && [ "$user" != root ] && [ "$ruid" != 0 ] && [ "$euid" != 0 ] && [ "$suid" != 0 ] && [ "$fsuid" != 0 ]; then
  pass "the service runs as $user, UID $uid, in the container (real, effective, saved, file-system UIDs $ruid $euid $suid $fsuid)"
else fail "the service's user: podman top '${user:-}' '${uid:-}', /proc status $ruid $euid $suid $fsuid"; fi
caps="$(awk '/^Cap(Eff|Prm|Bnd):/ { printf "%s%s ", $1, $2 }' "/proc/$pid/status")"
if [ "$caps" = "CapPrm:0000000000000000 CapEff:0000000000000000 CapBnd:0000000000000000 " ] && grep -q '^NoNewPrivs:[[:space:]]*1' "/proc/$pid/status"; then
  pass "no capabilities (permitted, effective, bounding) and no new privileges"
else fail "capabilities: $caps, $(grep NoNewPrivs "/proc/$pid/status")"; fi
# A write through the container's own root (/proc/PID/root), even as root: refused by the read-only mount. The same
# write to its /tmp succeeds, so the refusal is the mount's, not the path's.
if err="$(touch "/proc/$pid/root/flowsolve-write-probe" 2>&1)"; then
  rm -f "/proc/$pid/root/flowsolve-write-probe"; fail "a write to the container's root file system succeeded"
elif [[ "$err" == *"Read-only file system"* ]]; then pass "a write to the root file system fails: Read-only file system"
else fail "a write to the root file system failed for another reason: $err"; fi
if touch "/proc/$pid/root/tmp/flowsolve-write-probe" 2>/dev/null; then
  rm -f "/proc/$pid/root/tmp/flowsolve-write-probe"; pass "a write to /tmp (the tmpfs) succeeds"
else fail "a write to the container's /tmp failed"; fi
echo "      native libraries mapped by the service: $(grep -o '/[^ ]*\.so[^ ]*' "/proc/$pid/maps" | sort -u | grep -v '^/usr/share/dotnet/' | xargs -n 1 basename | tr '\n' ' ')"

# --- graceful stop with a request in flight ----------------------------------------------------------------------------
# The batch body is sent in two parts three seconds apart (chunked); the stop comes one second after the first.
{ head -n 12 "$csv_in"; sleep 3; tail -n +13 "$csv_in"; } \
  | curl -s -m 60 -X POST "${key[@]}" -H 'Content-Type: text/csv' -H 'Expect:' -T - -o "$work/inflight.csv" -w '%{http_code}' \
    "$base/v1/batch/pipes/diameter" >"$work/inflight.status" 2>&1 &
upload_pid=$!
sleep 1
stop_started=$(now_ms)
timeout $((grace + 30)) podman stop -t "$grace" "$id" >/dev/null
stop_ms=$(( $(now_ms) - stop_started ))
wait "$upload_pid"; upload_pid=""
exit_code="$(podman inspect --format '{{.State.ExitCode}}' "$id")"
if [ "$exit_code" = 0 ] && [ "$stop_ms" -lt $((grace * 1000)) ]; then
  pass "SIGTERM (podman stop -t $grace): exited 0 after $stop_ms ms, within the $grace s grace period"
else fail "after podman stop -t $grace: exit code $exit_code after $stop_ms ms"; fi
if [ "$(cat "$work/inflight.status")" = 200 ] && out="$(check_batch "$csv_in" "$work/inflight.csv")"; then
  pass "the batch in flight at SIGTERM was answered in full: $out"
else fail "the batch in flight at SIGTERM: status $(cat "$work/inflight.status") ${out:-}"; fi

# The JSON log (FlowSolve__Logging__Format from the environment): every line parses, and the in-flight batch's
# request line comes after "Application is shutting down", so the request was drained, not finished before the stop.
podman logs "$id" >"$work/service.log" 2>&1
if out="$(python3 - "$work/service.log" <<'EOF'
import json, sys
lines = [l for l in open(sys.argv[1]) if l.strip()]
try:
    events = [json.loads(l) for l in lines]
except ValueError as e:
    print(f"a log line is not JSON: {e}"); sys.exit(1)
stop = [i for i, e in enumerate(events) if e.get("@mt", "").startswith("Application is shutting down")]
batches = [i for i, e in enumerate(events) if e.get("RequestPath") == "/v1/batch/pipes/diameter"]
if not stop or not batches or batches[-1] < stop[0]:
    print(f"shutdown logged at line {stop[:1]}, batch requests at lines {batches}: the last batch did not end after the shutdown began")
    sys.exit(1)
last = events[batches[-1]]
print(f"{len(events)} JSON lines; the last batch ended {last.get('StatusCode')} after the shutdown began ({last.get('Elapsed', 0):.0f} ms)")
EOF
)"; then pass "$out"; else fail "service log: $out"; fi

echo "container smoke: build $((build_ms / 1000)) s, start to first ready answer $startup_ms ms, stop $stop_ms ms"
if [ "$failures" -ne 0 ]; then
  echo "--- service log ---"; tail -n 60 "$work/service.log"
  echo "container smoke: $failures check(s) failed"
  exit 1
fi
echo "container smoke: all checks passed"
