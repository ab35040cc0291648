#!/usr/bin/env bash
# Lints the committed OpenAPI document (openapi/flowsolve.v1.json) with Redocly CLI's recommended rules (redocly.yaml at
# the repository root) and exits non-zero on any error. Redocly CLI is an independent OpenAPI linter from npm, pinned
# here by version and by the registry's integrity hash; it ships as one package without dependencies and is installed
# once into a cache folder outside the work tree (REDOCLY_CLI_DIR to choose another). Needs Node.js 20.19+ (20.x) or
# 22.12+, and npm.
set -euo pipefail
cd "$(dirname "$0")/.."

version="2.77.0"
integrity="sha512-XUa4hURDWLPG9WukIXo+UBqa9VpeTndmLI5PHu9QDkwtwH990Jsgz9nl2m1pZjsWrKFPP7avn6etRxxDbuD2Bg=="
dir="${REDOCLY_CLI_DIR:-${XDG_CACHE_HOME:-${HOME:-/tmp}/.cache}/flowsolve/redocly-cli-$version}"
cli="$dir/node_modules/@redocly/cli/bin/cli.js"
lock="$dir/package-lock.json"

for tool in node npm; do
  command -v "$tool" >/dev/null || { echo "openapi/lint.sh: $tool is missing (Node.js 20.19+ or 22.12+ with npm)"; exit 2; }
done

installed_integrity() {
  [ -f "$lock" ] && node -e 'const l = require(process.argv[1]); const p = (l.packages || {})["node_modules/@redocly/cli"] || {};
    process.stdout.write((p.version || "") + " " + (p.integrity || ""))' "$lock" 2>/dev/null || true
}

if [ "$(installed_integrity)" != "$version $integrity" ] || [ ! -f "$cli" ]; then
  mkdir -p "$dir"
  npm install --prefix "$dir" --save-exact --no-audit --no-fund --loglevel=error "@redocly/cli@$version" >/dev/null
  if [ "$(installed_integrity)" != "$version $integrity" ]; then
    echo "openapi/lint.sh: @redocly/cli in $dir is not version $version with the pinned integrity hash"
    exit 2
  fi
fi

# No usage data sent and no update notice: the result depends on the document and the pinned version only.
export REDOCLY_TELEMETRY=off
export REDOCLY_SUPPRESS_UPDATE_NOTICE=true
node "$cli" lint --config redocly.yaml openapi/flowsolve.v1.json
