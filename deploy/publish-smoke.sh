#!/usr/bin/env bash
# Smoke test of the container build without Docker: replays deploy/Dockerfile on this machine.
#
# - runs the build stage's `RUN dotnet ...` lines as written (the repository root stands for WORKDIR /src, a temp
#   folder for /app/publish), so the configuration and flags are the Dockerfile's own;
# - starts the published output from that folder (WORKDIR /app) with the base image's and the runtime stage's ENV
#   lines, the port 8080 replaced by a free local one through the same Urls variable;
# - where it can (root, util-linux unshare and setpriv), runs it as the image does: user 1654, root file system
#   read-only and a tmpfs on /tmp, as `docker run --read-only --tmpfs /tmp` would; FLOWSOLVE_SMOKE_SANDBOX=0 skips that;
# - checks /health/ready, /health/live, a friction-factor GET, /openapi/v1.json and a clean exit on SIGTERM.
#
# Usage: bash deploy/publish-smoke.sh        (SMOKE_PORT=18080 by default; the next free port is used if it is taken)
# Exits non-zero on any failure.
set -euo pipefail

root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
dockerfile="${SMOKE_DOCKERFILE:-$root/deploy/Dockerfile}"   # another file only to test this script
port="${SMOKE_PORT:-18080}"
failures=0

fail() { echo "FAIL: $*"; failures=$((failures + 1)); }
pass() { echo "ok:   $*"; }

# --- read the Dockerfile -------------------------------------------------------------------------------------------
# Stage boundaries: lines from the first FROM to the second belong to the build stage, the rest to the runtime stage.
mapfile -t build_runs < <(awk '/^FROM /{stage++} stage==1 && /^RUN dotnet /{sub(/^RUN /, ""); print}' "$dockerfile")
mapfile -t runtime_envs < <(awk '/^FROM /{stage++} stage==2 && /^ENV /{sub(/^ENV /, ""); print}' "$dockerfile")
exposed="$(awk '/^FROM /{stage++} stage==2 && /^EXPOSE /{print $2}' "$dockerfile")"
workdir_build="$(awk '/^FROM /{stage++} stage==1 && /^WORKDIR /{print $2}' "$dockerfile")"
[ "${#build_runs[@]}" -gt 0 ] || { echo "no 'RUN dotnet' lines in the build stage of $dockerfile"; exit 1; }
[ -n "$exposed" ] || { echo "no EXPOSE in the runtime stage of $dockerfile"; exit 1; }

# --- a free port ---------------------------------------------------------------------------------------------------
port_taken() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }
for _ in $(seq 1 50); do port_taken "$port" || break; port=$((port + 1)); done
port_taken "$port" && { echo "no free port found from ${SMOKE_PORT:-18080}"; exit 1; }

# --- publish -------------------------------------------------------------------------------------------------------
# Not under /tmp: the sandbox mounts a fresh tmpfs there, which would hide the published files.
pub="$(mktemp -d /var/tmp/flowsolve-smoke.XXXXXX)"
log="$pub.log"
pid=""
cleanup() {
  if [ -n "$pid" ] && kill -0 "$pid" 2>/dev/null; then kill "$pid" 2>/dev/null || true; wait "$pid" 2>/dev/null || true; fi
  rm -rf "$pub" "$log"
}
trap cleanup EXIT

for line in "${build_runs[@]}"; do
  case "$line" in *\"*|*\'*|*\$*) echo "cannot replay a quoted or variable RUN line: $line"; exit 1;; esac
  read -ra words <<<"$line"
  for i in "${!words[@]}"; do
    [ "${words[$i]}" = "/app/publish" ] && words[$i]="$pub"
  done
  echo "+ ${words[*]}   (in ${workdir_build} = $root)"
  (cd "$root" && "${words[@]}" --nologo -v quiet) || { echo "FAIL: ${words[*]}"; exit 1; }
done
[ -f "$pub/FlowSolve.Api.dll" ] || { echo "FAIL: publish produced no FlowSolve.Api.dll"; exit 1; }
chmod -R a+rX "$pub"

# --- environment ---------------------------------------------------------------------------------------------------
# The base image's own settings first (mcr.microsoft.com/dotnet/aspnet sets these), then the Dockerfile's ENV lines,
# each with the exposed port swapped for the local one; later lines win, as in the image.
environment=(PATH=/usr/local/bin:/usr/bin:/bin HOME=/home/app APP_UID=1654 ASPNETCORE_HTTP_PORTS=8080 DOTNET_RUNNING_IN_CONTAINER=true)
for e in "${runtime_envs[@]}"; do
  key="${e%%=*}"; value="${e#*=}"
  value="${value%\"}"; value="${value#\"}"
  environment+=("$key=${value//:$exposed/:$port}")
done
printf '  env %s\n' "${environment[@]}"

# --- start ---------------------------------------------------------------------------------------------------------
sandbox=0
if [ "${FLOWSOLVE_SMOKE_SANDBOX:-1}" = 1 ] && [ "$(id -u)" = 0 ] && command -v unshare >/dev/null && command -v setpriv >/dev/null \
   && unshare -m --propagation private true 2>/dev/null; then
  sandbox=1
fi
cd "$pub"
if [ "$sandbox" = 1 ]; then
  echo "starting as UID 1654 on a read-only root file system with a tmpfs on /tmp (private mount namespace)"
  # --propagation private: the remount and the tmpfs exist only inside this namespace, never on the host.
  unshare -m --propagation private sh -c '
    mount -o remount,bind,ro / && mount -t tmpfs -o rw,nosuid,noexec,size=16m,mode=1777 tmpfs /tmp || exit 97
    exec setpriv --reuid=1654 --regid=1654 --clear-groups -- "$@"' sandbox env -i "${environment[@]}" dotnet FlowSolve.Api.dll \
    >"$log" 2>&1 &
else
  echo "starting as $(id -un) with a writable file system (no sandbox: needs root, unshare and setpriv)"
  env -i "${environment[@]}" dotnet FlowSolve.Api.dll >"$log" 2>&1 &
fi
pid=$!
cd "$root"

base="http://127.0.0.1:$port"
ready=0
for _ in $(seq 1 60); do
  kill -0 "$pid" 2>/dev/null || break
  if [ "$(curl -s -o /dev/null -w '%{http_code}' "$base/health/ready" || true)" = 200 ]; then ready=1; break; fi
  sleep 0.5
done
if [ "$ready" = 1 ]; then pass "GET /health/ready answered 200"; else fail "the service did not become ready on $base"; fi

if [ "$ready" = 1 ]; then
  # The wildcard binding matters in a container: a loopback-only listener is unreachable through the port mapping.
  if grep -q "Now listening on: http://\[::\]:$port" "$log"; then pass "listens on every interface, port $port (from Urls)"
  else fail "not listening on every interface at port $port: $(grep -o 'Now listening on: [^"]*' "$log" | head -1)"; fi

  body="$(curl -s -w '\n%{http_code}' "$base/health/live")"
  if [ "${body##*$'\n'}" = 200 ] && [ "${body%$'\n'*}" = Healthy ]; then pass "GET /health/live answered 200 Healthy"
  else fail "GET /health/live: $body"; fi

  # Reference: F. M. White, Fluid Mechanics, Moody-type table at relative roughness 0.005: Re 75 000 -> f = 0.0316
  # (three significant figures, so the tolerance is half a unit in the third figure).
  body="$(curl -s -w '\n%{http_code}' "$base/v1/friction-factor?reynolds=75000&relativeRoughness=0.005")"
  f="$(grep -o '"frictionFactor":[-0-9.eE+]*' <<<"$body" | head -1 | cut -d: -f2)"
  if [ "${body##*$'\n'}" = 200 ] && [ -n "$f" ] && awk -v f="$f" 'BEGIN { d = f - 0.0316; exit !(d < 0.00005 && d > -0.00005) }'; then
    pass "GET /v1/friction-factor answered 200, frictionFactor $f (reference 0.0316)"
  else fail "GET /v1/friction-factor: status ${body##*$'\n'}, frictionFactor '${f}'"; fi

  body="$(curl -s -w '\n%{http_code}' "$base/openapi/v1.json")"
  if [ "${body##*$'\n'}" = 200 ] && grep -q '"openapi"' <<<"$body" && grep -q '"/v1/friction-factor"' <<<"$body"; then
    pass "GET /openapi/v1.json answered 200 with the friction-factor path"
  else fail "GET /openapi/v1.json: status ${body##*$'\n'}"; fi
fi

# Kubernetes and docker stop send SIGTERM: the host must drain and exit 0.
if kill -0 "$pid" 2>/dev/null; then
  kill -TERM "$pid"
  status=0
  for _ in $(seq 1 40); do kill -0 "$pid" 2>/dev/null || break; sleep 0.25; done
  if kill -0 "$pid" 2>/dev/null; then fail "still running 10 s after SIGTERM"; kill -KILL "$pid"; fi
  wait "$pid" || status=$?
  pid=""
  if [ "$status" = 0 ]; then pass "exited 0 on SIGTERM"; else fail "exit status $status after SIGTERM"; fi
else
  wait "$pid" || true
  pid=""
  fail "the service had stopped before the checks ended"
fi

if grep -qiE 'read-only file system|UnauthorizedAccess|Access to the path' "$log"; then
  fail "the service tried to write to disk:"; grep -iE 'read-only file system|UnauthorizedAccess|Access to the path' "$log" | head -5
fi

if [ "$failures" -ne 0 ]; then
  echo "--- service log ---"; cat "$log"
  echo "publish smoke: $failures check(s) failed"
  exit 1
fi
echo "publish smoke: all checks passed (sandbox: $([ "$sandbox" = 1 ] && echo 'UID 1654, read-only root, tmpfs /tmp' || echo none))"
