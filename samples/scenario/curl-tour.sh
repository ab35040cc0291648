#!/usr/bin/env bash
# A tour of FlowSolve with curl, through the Vandrel Vale water scheme (all data invented for the demo: no real
# place, firm or person). Every result is an engineering estimate to be checked by a qualified engineer; local codes,
# standards and licensed practice govern.
#
# Usage:  FLOWSOLVE_URL=http://localhost:5080 bash samples/scenario/curl-tour.sh
# Exits non-zero as soon as a call fails (any status but 200).
set -euo pipefail

base="${FLOWSOLVE_URL:-http://localhost:5080}"
base="${base%/}"
here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
body="$(mktemp)"
trap 'rm -f "$body"' EXIT

# request LABEL curl-arguments... : prints LABEL and the answer; fails the script on any status but 200.
request() {
  local label="$1"; shift
  local status
  status="$(curl -sS -o "$body" -w '%{http_code}' "$@")" || { echo "FAIL  $label: curl could not reach $base" >&2; exit 1; }
  if [ "$status" != 200 ]; then
    echo "FAIL  $label: HTTP $status" >&2
    cat "$body" >&2; echo >&2
    exit 1
  fi
  printf '%-58s %s\n' "$label" "$(head -c 300 "$body")"
}

# GET with format=text: one number per line, as a spreadsheet cell would see it.
cell() { local label="$1" query="$2"; request "$label" "$base$query"; }

echo "FlowSolve at $base: the Vandrel Vale water scheme (invented for the demo)"
echo

echo "== Water at 12 degrees C"
cell "density, kg/m3" "/v1/fluids/water?temperature=12&format=text&select=density"
cell "kinematic viscosity, m2/s" "/v1/fluids/water?temperature=12&format=text&select=kinematicViscosity"

echo
echo "== Pumping main: intake to Orvex reservoir, 2350 m of 350 mm steel, 0.12 m3/s"
main="flow=0.12&diameter=0.35&length=2350&material=commercial-steel&temperature=12&elevationChange=76.5"
main="$main&fittings=elbow-90-flanged-long-radius:8,gate-valve-open:2,swing-check-valve-forward:1,exit:1"
cell "friction factor (Re 353569, e/D 1.314e-4)" "/v1/friction-factor?reynolds=353569&relativeRoughness=0.0001314&format=text"
cell "head loss (friction and fittings), m" "/v1/pipes/head-loss?$main&format=text"
cell "total head with the 76.5 m lift, m" "/v1/pipes/head-loss?$main&format=text&select=totalHead"
cell "velocity, m/s" "/v1/pipes/head-loss?$main&format=text&select=velocity"
cell "d(head loss)/d(flow), m per m3/s" "/v1/pipes/head-loss?$main&sensitivities=true&format=text&select=sensitivities.headLoss.flow.derivative"
cell "head loss elasticity to roughness" "/v1/pipes/head-loss?$main&sensitivities=true&format=text&select=sensitivities.headLoss.roughness.elasticity"
cell "head loss if the steel is rusted (aged), m" "/v1/pipes/head-loss?$main&sensitivities=true&format=text&select=roughnessSpread.atAged"
request "the same as a JSON body (full answer, first 300 bytes)" -X POST "$base/v1/pipes/head-loss" \
  -H 'Content-Type: application/json' \
  -d '{"flow": 0.12, "diameter": 0.35, "length": 2350, "material": "commercial-steel", "temperature": 12,
       "elevationChange": 76.5, "fittings": [{"name": "elbow-90-flanged-long-radius", "count": 8},
       {"name": "gate-valve-open", "count": 2}, {"name": "swing-check-valve-forward", "count": 1}, {"name": "exit", "count": 1}]}'

echo
echo "== Gravity line: Orvex reservoir (TWL 118.5 m) to Tazmerin village tank (TWL 96.0 m), 4800 m of PE"
gravity="headLoss=22.5&length=4800&material=drawn-plastic-tubing&temperature=12"
cell "minimum bore for 0.045 m3/s, m" "/v1/pipes/diameter?flow=0.045&$gravity&sizeTable=iso-4427-pe-sdr-11&format=text"
cell "smallest ISO 4427 SDR 11 size" "/v1/pipes/diameter?flow=0.045&$gravity&sizeTable=iso-4427-pe-sdr-11&format=text&select=selectedSize.name"
cell "flow through DN 280 (bore 229.2 mm), m3/s" "/v1/pipes/flow?diameter=0.2292&$gravity&format=text"

echo
echo "== Brevix lined canal and Pegwhistle Lane culvert, 1.8 m3/s"
canal="shape=trapezoidal&bottomWidth=1.2&sideSlope=1.5&manningN=0.015&flow=1.8"
cell "canal normal depth, m" "/v1/channels/normal-depth?$canal&slope=0.0005&format=text"
cell "canal Froude number" "/v1/channels/normal-depth?$canal&slope=0.0005&format=text&select=froudeNumber"
cell "canal critical depth, m" "/v1/channels/critical-depth?$canal&format=text"
request "culvert (1.5 m pipe, n 0.013, S 0.002), JSON" -X POST "$base/v1/channels/normal-depth" \
  -H 'Content-Type: application/json' \
  -d '{"section": {"shape": "circular", "diameter": 1.5}, "manningN": 0.013, "slope": 0.002, "flow": 1.8}'

echo
echo "== Pipe-sizing study for the gravity line: $(($(wc -l <"$here/pipe-sizing-study.csv") - 1)) cases in one CSV batch"
request "batch pipes/diameter (CSV answer, first 300 bytes)" -X POST "$base/v1/batch/pipes/diameter" \
  -H 'Content-Type: text/csv' --data-binary "@$here/pipe-sizing-study.csv"

echo
echo "== Intake pumping station: two pumps in parallel, H = 98 - 2400 Q^2 per pump"
pump='{"pump": {"coefficients": [98, 0, -2400]}, "pumpsInParallel": 2, "pumpsInSeries": 1, "speedRatio": 1.0,
       "system": {"staticHead": 76.5, "pipes": [{"length": 2350, "diameter": 0.35, "roughness": 0.000046,
       "minorLossCoefficient": 4.9}]}, "temperature": 12}'
request "duty point" -X POST "$base/v1/pumps/duty-point" -H 'Content-Type: application/json' -d "$pump"
request "pump and system curves" -X POST "$base/v1/pumps/curves" -H 'Content-Type: application/json' -d "$pump"

echo
echo "== Quellix village network: fed from Orvex reservoir, three loops, a booster pump and two check valves"
echo "   (load cases: night 0.4, average day 1.0 and peak hour 1.8 times the demands)"
request "network solve (JSON answer, first 300 bytes)" -X POST "$base/v1/networks/solve" \
  -H 'Content-Type: application/json' --data-binary "@$here/vandrel-network.json"

echo
echo "curl tour: every call answered 200"
