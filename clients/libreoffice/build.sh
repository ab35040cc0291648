#!/usr/bin/env bash
# Builds the FlowSolve worksheet functions for LibreOffice Calc: writes OUT_DIR/flowsolve.oxt.
# Needs only bash and python3 (the type library is the IDL file itself, which LibreOffice reads; no SDK).
# Install: unopkg add OUT_DIR/flowsolve.oxt (docs/spreadsheets.md).
set -euo pipefail
if [ $# -ne 1 ]; then
  echo "usage: bash clients/libreoffice/build.sh OUT_DIR" >&2
  exit 2
fi
source_dir="$(cd "$(dirname "$0")" && pwd)/extension"
mkdir -p "$1"
out="$(cd "$1" && pwd)/flowsolve.oxt"
python3 - "$source_dir" "$out" <<'PY'
import os, sys, zipfile
source, out = sys.argv[1], sys.argv[2]
tmp = out + ".tmp"
with zipfile.ZipFile(tmp, "w", zipfile.ZIP_DEFLATED) as oxt:
    for folder, dirs, files in os.walk(source):
        dirs[:] = sorted(d for d in dirs if d != "__pycache__")
        for name in sorted(files):
            if name.endswith((".pyc", "~")):
                continue
            path = os.path.join(folder, name)
            oxt.write(path, os.path.relpath(path, source).replace(os.sep, "/"))
os.replace(tmp, out)
PY
echo "wrote $out"
