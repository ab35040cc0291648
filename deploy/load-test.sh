#!/usr/bin/env bash
# Load test of the FlowSolve API on this machine, by hand (not in CI): throughput and tail latency of the
# calculation endpoints next to a trivial endpoint's rate as the ceiling, error counts, and the service's memory.
#
# - publishes the API in Release (the Dockerfile's flags) into a temp folder and starts it on 127.0.0.1 on a port of
#   its own (LOAD_PORT, 18090 by default, or the next free one), with the ConfigMap's logging settings (json,
#   Information, or LOAD_LOG_LEVEL) and the log thrown away, so the per-request log event is paid for as in production;
# - runs wrk (installed from Debian's packages if missing) on each scenario: a warm-up of LOAD_WARMUP seconds (10 by
#   default: tiered compilation with PGO is still recompiling hot methods after 5 s), then LOAD_ROUNDS rounds (3) of
#   LOAD_DURATION seconds (10 by default) per scenario, the scenarios taking turns within each round, with LOAD_THREADS
#   threads (2) and LOAD_CONNECTIONS connections (32); each scenario's rate is the median of its rounds and its share of
#   the ceiling the median of the per-round ratios, so a slow minute on a shared machine moves every row, not one;
#   scenarios: GET /health/live (ceiling), GET /v1/friction-factor, the same as a spreadsheet cell's format=text,
#   the same GET with different inputs on every
#   request, POST /v1/pipes/flow (skipped on a 404);
# - then a 60-second run of the friction GET while sampling VmRSS from /proc/PID/status every 5 s;
# - prints a table, and exits non-zero when any scenario saw a non-2xx answer or a socket error.
#
# wrk and the service share this machine's cores, so the figures are a floor for the service, not its capacity;
# compare the rows of one run, not runs on different days.
set -euo pipefail

root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
port="${LOAD_PORT:-18090}"
duration="${LOAD_DURATION:-10}"
rounds="${LOAD_ROUNDS:-3}"
warmup="${LOAD_WARMUP:-10}"
log_level="${LOAD_LOG_LEVEL:-Information}"
soak="${LOAD_SOAK:-60}"   # the memory run; shorter only to try the script out
threads="${LOAD_THREADS:-2}"
connections="${LOAD_CONNECTIONS:-32}"

if ! command -v wrk >/dev/null; then
  if [ "$(id -u)" = 0 ] && command -v apt-get >/dev/null; then
    echo "installing wrk from Debian's packages"
    apt-get update -qq && apt-get install -y -qq wrk >/dev/null
  else
    echo "wrk is missing: apt-get install wrk (as root)"; exit 1
  fi
fi
command -v curl >/dev/null || { echo "curl is missing"; exit 1; }

port_taken() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }
for _ in $(seq 1 50); do port_taken "$port" || break; port=$((port + 1)); done
port_taken "$port" && { echo "no free port found from ${LOAD_PORT:-18090}"; exit 1; }

load_before="$(cut -d' ' -f1-3 /proc/loadavg)"   # before this script adds any load of its own
work="$(mktemp -d /var/tmp/flowsolve-load.XXXXXX)"
pid=""
sampler=""
cleanup() {
  [ -n "$sampler" ] && kill "$sampler" 2>/dev/null || true
  if [ -n "$pid" ] && kill -0 "$pid" 2>/dev/null; then kill "$pid" 2>/dev/null || true; wait "$pid" 2>/dev/null || true; fi
  rm -rf "$work"
}
trap cleanup EXIT

echo "publishing (Release) ..."
(cd "$root" && dotnet publish src/FlowSolve.Api/FlowSolve.Api.csproj -c Release -o "$work/app" -p:UseAppHost=false --nologo -v quiet)

base="http://127.0.0.1:$port"
(cd "$work/app" && exec env Urls="$base" FlowSolve__Logging__Format=json FlowSolve__Logging__Level="$log_level" \
  dotnet FlowSolve.Api.dll >/dev/null 2>&1) &
pid=$!
for _ in $(seq 1 60); do
  [ "$(curl -s -o /dev/null -w '%{http_code}' "$base/health/ready" || true)" = 200 ] && break
  kill -0 "$pid" 2>/dev/null || { echo "the service stopped during start-up"; exit 1; }
  sleep 0.5
done
[ "$(curl -s -o /dev/null -w '%{http_code}' "$base/health/ready" || true)" = 200 ] || { echo "the service did not become ready"; exit 1; }

friction="$base/v1/friction-factor?reynolds=75000&relativeRoughness=0.005"
pipe_body='{"diameter":0.3,"length":1200,"roughness":0.00026,"headLoss":8,"temperature":15}'
# The same GET with a different Reynolds number and roughness on every request (no two alike).
cat >"$work/vary.lua" <<'LUA'
local n = 0
request = function()
  n = n + 1
  local re = 4000 * 10 ^ ((n * 0.6180339887) % 1 * 4.4)
  local rr = 1e-6 * 10 ^ ((n * 0.4142135623) % 1 * 4.7)
  -- fixed-point formats: "%g" would write 1e+08, and a "+" in a query string reads as a space
  return wrk.format("GET", string.format("/v1/friction-factor?reynolds=%.1f&relativeRoughness=%.10f", re, rr))
end
LUA
cat >"$work/post.lua" <<EOF
wrk.method = "POST"
wrk.body = '$pipe_body'
wrk.headers["Content-Type"] = "application/json"
EOF

rss_kib() { awk '/^VmRSS:/ {print $2}' "/proc/$pid/status"; }

# One wrk run: sets rps, p50, p99, total, non2xx, sockets.
measure() {
  local seconds="$1"; shift
  local out
  out="$(wrk -t"$threads" -c"$connections" -d"${seconds}s" --latency "$@")"
  rps="$(awk '/^Requests\/sec:/ {print $2}' <<<"$out")"
  p50="$(awk '$1 == "50%" {print $2}' <<<"$out")"
  p99="$(awk '$1 == "99%" {print $2}' <<<"$out")"
  total="$(awk '/requests in/ {print $1}' <<<"$out")"
  non2xx="$(awk -F': ' '/Non-2xx or 3xx responses/ {print $2}' <<<"$out")"; non2xx="${non2xx:-0}"
  sockets="$(awk -F'errors: ' '/Socket errors/ {print $2}' <<<"$out" | tr -dc '0-9,' | tr ',' '+')"
  sockets=$(( ${sockets:-0} + 0 ))
}
# wrk latencies (850.00us, 1.02ms, 2.10s) in milliseconds; the median of space-separated numbers.
to_ms() { awk '{v = $1; if (v ~ /us$/) print v / 1000; else if (v ~ /ms$/) print v + 0; else if (v ~ /s$/) print v * 1000; else print v}' <<<"$1"; }
median() { tr ' ' '\n' | sed '/^$/d' | sort -g | awk '{a[NR] = $1} END {if (NR % 2) print a[(NR + 1) / 2]; else print (a[NR / 2] + a[NR / 2 + 1]) / 2}'; }

pipe_status="$(curl -s -o /dev/null -w '%{http_code}' -X POST -H 'Content-Type: application/json' -d "$pipe_body" "$base/v1/pipes/flow" || true)"
names=("GET /health/live (ceiling)" "GET /v1/friction-factor" "GET friction, format=text" "GET friction, varied inputs")
args=("$base/health/live" "$friction" "$friction&format=text" "-s $work/vary.lua $base")
pipe_note=""
errors=0
if [ "$pipe_status" = 404 ]; then
  pipe_note="POST /v1/pipes/flow: skipped, the endpoint answers 404 in this build"
elif [ "$pipe_status" = 200 ]; then
  names+=("POST /v1/pipes/flow"); args+=("-s $work/post.lua $base/v1/pipes/flow")
else
  pipe_note="POST /v1/pipes/flow: answered $pipe_status to the sample body; not load-tested"
  errors=$((errors + 1))
fi

# Warm-up of every scenario (JIT tiering with PGO, connection pools), then the rounds.
for i in "${!names[@]}"; do
  # shellcheck disable=SC2086 # the argument strings hold wrk options and a URL
  wrk -t"$threads" -c"$connections" -d"${warmup}s" ${args[$i]} >/dev/null
done
declare -A r_rps r_ratio r_p50 r_p99 r_total r_non2xx r_sockets
for round in $(seq 1 "$rounds"); do
  ceiling=""
  for i in "${!names[@]}"; do
    # shellcheck disable=SC2086
    measure "$duration" ${args[$i]}
    [ -z "$ceiling" ] && ceiling="$rps"
    r_rps[$i]+="$rps "
    r_ratio[$i]+="$(awk -v a="$rps" -v b="$ceiling" 'BEGIN {printf "%.4f", a / b}') "
    r_p50[$i]+="$(to_ms "$p50") "
    r_p99[$i]+="$(to_ms "$p99") "
    r_total[$i]=$(( ${r_total[$i]:-0} + total ))
    r_non2xx[$i]=$(( ${r_non2xx[$i]:-0} + non2xx ))
    r_sockets[$i]=$(( ${r_sockets[$i]:-0} + sockets ))
    errors=$((errors + non2xx + sockets))
  done
done
rows=()
for i in "${!names[@]}"; do
  share="$(median <<<"${r_ratio[$i]}")"
  rows+=("$(printf '%-28s %12.0f %9.0f %%  %8.2fms %8.2fms %10s %8s %8s   rounds: %s' "${names[$i]}" \
    "$(median <<<"${r_rps[$i]}")" "$(awk -v s="$share" 'BEGIN {print s * 100}')" \
    "$(median <<<"${r_p50[$i]}")" "$(median <<<"${r_p99[$i]}")" "${r_total[$i]}" "${r_non2xx[$i]}" "${r_sockets[$i]}" \
    "$(awk '{for (i = 1; i <= NF; i++) printf "%s%.0f", (i > 1 ? " " : ""), $i}' <<<"${r_rps[$i]}")")")
done

# Memory over a LOAD_SOAK-second run (60 by default): VmRSS every 5 s from the start of the run.
samples=()
rss_before="$(rss_kib)"
( for _ in $(seq 0 5 "$soak"); do rss_kib; sleep 5; done ) >"$work/rss" &
sampler=$!
measure "$soak" "$friction"
errors=$((errors + non2xx + sockets))
soak_row="$(printf '%-28s %12.0f %11s %8.2fms %8.2fms %10s %8s %8s' "GET /v1/friction-factor ${soak} s" "$rps" "" \
  "$(to_ms "$p50")" "$(to_ms "$p99")" "$total" "$non2xx" "$sockets")"
wait "$sampler" 2>/dev/null || true
sampler=""
mapfile -t samples <"$work/rss"

echo
echo "machine: $(lscpu | awk -F': +' '/^Model name/ {print $2; exit}'), $(nproc) cores; load average before the run: $load_before, after it: $(cut -d' ' -f1-3 /proc/loadavg)"
echo "wrk: $threads threads, $connections connections, $rounds rounds of ${duration} s per scenario after a ${warmup} s warm-up each, on the same machine as the service"
echo
printf '%-28s %12s %11s %10s %10s %10s %8s %8s\n' scenario "requests/s" "of ceiling" p50 p99 requests non-2xx socket
printf '%s\n' "${rows[@]}" "$soak_row"
echo "(requests/s, p50 and p99: medians of the rounds; of ceiling: median of each round's ratio to the ceiling's rate)"
[ -n "$pipe_note" ] && echo "$pipe_note"
echo
echo "RSS (MiB) before the ${soak} s run: $(awk -v k="$rss_before" 'BEGIN {printf "%.0f", k / 1024}'); every 5 s during it:"
printf '%s\n' "${samples[@]}" | awk '{printf "%s%.0f", (NR > 1 ? " " : "  "), $1 / 1024} END {print ""}'
printf '%s\n' "${samples[@]}" | awk 'NR == 1 {first = $1; min = $1; max = $1} {if ($1 < min) min = $1; if ($1 > max) max = $1; last = $1}
  END {printf "  min %.0f, max %.0f, first %.0f, last %.0f MiB\n", min / 1024, max / 1024, first / 1024, last / 1024}'

if [ "$errors" -ne 0 ]; then echo "load test: $errors error(s)"; exit 1; fi
echo "load test: no errors"
