#!/usr/bin/env python3
"""A FlowSolve client on Python's standard library alone (urllib, json, csv), and the Vandrel Vale demo.

The Vandrel Vale water scheme and all its data are invented for the demo: no real place, firm or person.
Every FlowSolve result is an engineering estimate to be checked by a qualified engineer; local codes, standards and
licensed practice govern.

Usage:
    FLOWSOLVE_URL=http://localhost:5080 python3 samples/python/flowsolve_client.py

Exits 0 when every call of the scenario answered as expected, 1 otherwise.
"""

from __future__ import annotations

import csv
import io
import json
import os
import sys
import urllib.error
import urllib.parse
import urllib.request
from pathlib import Path
from typing import Any


class FlowSolveError(Exception):
    """A call that did not answer 200: carries the HTTP status and the problem body (RFC 9457) when there is one."""

    def __init__(self, status: int, url: str, body: str):
        self.status = status
        self.url = url
        self.body = body
        try:
            self.problem: dict[str, Any] | None = json.loads(body) if body else None
        except ValueError:
            self.problem = None
        super().__init__(f"HTTP {status} from {url}: {self.describe()}")

    def describe(self) -> str:
        if isinstance(self.problem, dict):
            errors = self.problem.get("errors")
            if isinstance(errors, dict) and errors:
                return "; ".join(f"{field}: {', '.join(messages)}" for field, messages in errors.items())
            return str(self.problem.get("detail") or self.problem.get("title") or self.body[:200])
        return self.body[:200]


class FlowSolveClient:
    """Calls a FlowSolve service. Field names are the API's own camelCase names; values are SI unless units='us'."""

    def __init__(self, base_url: str = "http://localhost:5080", timeout: float = 30.0):
        self.base_url = base_url.rstrip("/")
        self.timeout = timeout

    # --- transport -------------------------------------------------------------------------------------------------
    def _send(self, method: str, path: str, params: dict[str, Any] | None = None,
              body: bytes | None = None, content_type: str | None = None) -> tuple[str, str]:
        url = self.base_url + path
        if params:
            url += "?" + urllib.parse.urlencode({k: _wire(v) for k, v in params.items() if v is not None})
        request = urllib.request.Request(url, data=body, method=method)
        if content_type:
            request.add_header("Content-Type", content_type)
        try:
            with urllib.request.urlopen(request, timeout=self.timeout) as response:
                return response.read().decode("utf-8"), response.headers.get_content_type()
        except urllib.error.HTTPError as e:
            raise FlowSolveError(e.code, url, e.read().decode("utf-8", "replace")) from None

    # --- the three ways of asking ----------------------------------------------------------------------------------
    def get(self, path: str, **params: Any) -> dict[str, Any]:
        """GET with query parameters; the full JSON answer."""
        text, _ = self._send("GET", path, params)
        return json.loads(text)

    def value(self, path: str, select: str | None = None, **params: Any) -> float | str:
        """GET with format=text: the primary output (or the field named by select), as a spreadsheet cell gets it."""
        params = {**params, "format": "text"}
        if select:
            params["select"] = select
        text, _ = self._send("GET", path, params)
        try:
            return float(text)
        except ValueError:
            return text

    def post(self, path: str, body: dict[str, Any] | list[Any]) -> Any:
        """POST a JSON body; the full JSON answer."""
        text, _ = self._send("POST", path, body=json.dumps(body).encode("utf-8"), content_type="application/json")
        return json.loads(text)

    def batch_csv(self, calculation: str, csv_text: str) -> list[dict[str, str]]:
        """POST /v1/batch/{calculation} with a CSV body; one dict per answered row (row, httpStatus, error, outputs)."""
        text, _ = self._send("POST", f"/v1/batch/{calculation}", body=csv_text.encode("utf-8"), content_type="text/csv")
        return list(csv.DictReader(io.StringIO(text)))

    # --- named calculations ----------------------------------------------------------------------------------------
    def water(self, temperature: float) -> dict[str, Any]:
        return self.get("/v1/fluids/water", temperature=temperature)

    def friction_factor(self, reynolds: float, relative_roughness: float, **extra: Any) -> dict[str, Any]:
        return self.get("/v1/friction-factor", reynolds=reynolds, relativeRoughness=relative_roughness, **extra)

    def head_loss(self, **fields: Any) -> dict[str, Any]:
        return self.post("/v1/pipes/head-loss", fields)

    def pipe_flow(self, **fields: Any) -> dict[str, Any]:
        return self.post("/v1/pipes/flow", fields)

    def pipe_diameter(self, **fields: Any) -> dict[str, Any]:
        return self.post("/v1/pipes/diameter", fields)

    def normal_depth(self, **fields: Any) -> dict[str, Any]:
        return self.post("/v1/channels/normal-depth", fields)

    def critical_depth(self, **fields: Any) -> dict[str, Any]:
        return self.post("/v1/channels/critical-depth", fields)

    def duty_point(self, **fields: Any) -> dict[str, Any]:
        return self.post("/v1/pumps/duty-point", fields)

    def solve_network(self, network: dict[str, Any]) -> dict[str, Any]:
        """POST /v1/networks/solve with a network document (junctions, reservoirs, pipes, pumps, demandMultipliers)."""
        return self.post("/v1/networks/solve", network)


def _wire(value: Any) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float):
        return repr(value)
    return str(value)


# --- the Vandrel Vale scenario (invented for the demo) ---------------------------------------------------------------
TEMPERATURE = 12.0  # river water at the intake, degrees C
MAIN_FITTINGS = [
    {"name": "elbow-90-flanged-long-radius", "count": 8},
    {"name": "gate-valve-open", "count": 2},
    {"name": "swing-check-valve-forward", "count": 1},
    {"name": "exit", "count": 1},
]
MAIN = {"diameter": 0.35, "length": 2350, "material": "commercial-steel", "temperature": TEMPERATURE}
LIFT = 76.5  # Orvex reservoir top water level 118.5 m less the intake wet well's 42.0 m
GRAVITY = {"length": 4800, "material": "drawn-plastic-tubing", "temperature": TEMPERATURE}
LEVELS = 118.5 - 96.0  # Orvex reservoir to Tazmerin village tank, both at top water level
CANAL = {"section": {"shape": "trapezoidal", "bottomWidth": 1.2, "sideSlope": 1.5}, "manningN": 0.015, "flow": 1.8}
CULVERT = {"section": {"shape": "circular", "diameter": 1.5}, "manningN": 0.013, "slope": 0.002, "flow": 1.8}
STUDY = Path(__file__).resolve().parent.parent / "scenario" / "pipe-sizing-study.csv"
NETWORK = Path(__file__).resolve().parent.parent / "scenario" / "vandrel-network.json"


def _warnings(result: dict[str, Any]) -> str:
    codes = [w["code"] for w in result.get("warnings", [])]
    return ", ".join(codes) if codes else "none"


def run_scenario(client: FlowSolveClient, out=sys.stdout) -> list[str]:
    """Runs every calculation of the scenario; returns the list of failures (empty when all went well)."""
    failures: list[str] = []

    def check(label: str, ok: bool, detail: str) -> None:
        print(f"{'ok  ' if ok else 'FAIL'}  {label}: {detail}", file=out)
        if not ok:
            failures.append(f"{label}: {detail}")

    def step(label: str, action) -> Any:
        try:
            return action()
        except (FlowSolveError, urllib.error.URLError, OSError, ValueError) as e:
            check(label, False, str(e))
            return None

    print(f"FlowSolve at {client.base_url}: the Vandrel Vale water scheme (invented for the demo)", file=out)

    water = step("water", lambda: client.water(TEMPERATURE))
    if water:
        check("water at 12 C", water["kinematicViscosity"] > 0,
              f"density {water['density']:.2f} kg/m3, nu {water['kinematicViscosity']:.4e} m2/s")

    main = step("pumping main", lambda: client.head_loss(flow=0.12, elevationChange=LIFT, fittings=MAIN_FITTINGS, **MAIN))
    if main:
        check("pumping main head loss", main["converged"],
              f"{main['headLoss']:.3f} m (friction {main['frictionHeadLoss']:.3f}, fittings {main['minorHeadLoss']:.3f}), "
              f"total head {main['totalHead']:.2f} m, V {main['velocity']:.2f} m/s, f {main['frictionFactor']:.5f}, "
              f"{main['iterations']} iterations, warnings: {_warnings(main)}")
        friction = step("friction factor", lambda: client.friction_factor(main["reynolds"], main["relativeRoughness"]))
        if friction:
            check("friction factor at the main's Re", abs(friction["frictionFactor"] - main["frictionFactor"]) < 1e-12,
                  f"{friction['frictionFactor']:.6f} after {friction['iterations']} iterations ({friction['status']})")
        cell = step("cell value", lambda: client.value("/v1/pipes/head-loss", flow=0.12, fittings=
                    ",".join(f"{f['name']}:{f['count']}" for f in MAIN_FITTINGS), **MAIN))
        if cell is not None:
            check("format=text cell", isinstance(cell, float) and abs(cell - main["headLoss"]) <= 1e-12 * main["headLoss"],
                  f"{cell} (same number as the JSON answer)")

    size = step("gravity line size", lambda: client.pipe_diameter(flow=0.045, headLoss=LEVELS,
                                                                  sizeTable="iso-4427-pe-sdr-11", **GRAVITY))
    if size:
        chosen = size.get("selectedSize") or {}
        check("gravity line size", size["converged"] and bool(chosen),
              f"minimum bore {size['diameter'] * 1000:.1f} mm; {chosen.get('name')} (bore {chosen.get('insideDiameter', 0) * 1000:.1f} mm, "
              f"{chosen.get('headLoss', 0):.2f} m loss); warnings: {_warnings(size)}")
        if chosen:
            flow = step("gravity line flow", lambda: client.pipe_flow(headLoss=LEVELS, diameter=chosen["insideDiameter"], **GRAVITY))
            if flow:
                check("gravity line capacity", flow["converged"] and flow["flow"] >= 0.045,
                      f"{flow['flow']:.4f} m3/s at top water levels, {flow['iterations']} iterations")

    canal = step("canal", lambda: client.normal_depth(slope=0.0005, **CANAL))
    if canal:
        check("canal normal depth", canal["converged"],
              f"{canal['normalDepth']:.3f} m, V {canal['velocity']:.2f} m/s, Fr {canal['froudeNumber']:.2f} ({canal['regime']}), "
              f"{canal['iterations']} iterations, warnings: {_warnings(canal)}")
    critical = step("canal critical depth", lambda: client.critical_depth(**CANAL))
    if critical:
        check("canal critical depth", critical["converged"], f"{critical['criticalDepth']:.3f} m")
    culvert = step("culvert", lambda: client.normal_depth(**CULVERT))
    if culvert:
        check("culvert normal depth", culvert["converged"],
              f"{culvert['normalDepth']:.3f} m of 1.5 m, Fr {culvert['froudeNumber']:.2f}, "
              f"full-pipe flow {culvert['capacity']['fullFlow']:.2f} m3/s, warnings: {_warnings(culvert)}")

    study_text = STUDY.read_text(encoding="utf-8")
    cases = list(csv.DictReader(io.StringIO(study_text)))
    rows = step("sizing study", lambda: client.batch_csv("pipes/diameter", study_text))
    if rows is not None:
        bad = [r for r in rows if r["httpStatus"] != "200"]
        check("sizing study batch", len(rows) == len(cases) and not bad,
              f"{len(rows)} answers for {len(cases)} cases, {len(bad)} not 200")
        for case, row in list(zip(cases, rows))[:: max(1, len(cases) // 4)]:
            print(f"      {case['material']:22} {case['surfaceCondition']:4} Q {float(case['flow']):.3f} m3/s -> "
                  f"bore {float(row['diameter']) * 1000:6.1f} mm, size {row.get('selectedSize.name') or '-'}", file=out)

    pump = {"pump": {"coefficients": [98, 0, -2400]}, "pumpsInParallel": 2, "pumpsInSeries": 1, "speedRatio": 1.0,
            "system": {"staticHead": LIFT, "pipes": [{"length": 2350, "diameter": 0.35, "roughness": 0.000046,
                                                      "minorLossCoefficient": 4.9}]},
            "temperature": TEMPERATURE}
    try:
        duty = client.duty_point(**pump)
        check("duty point", duty.get("converged") is True and duty.get("flow") is not None,
              f"{duty.get('flow')} m3/s at {duty.get('head')} m ({duty.get('flowPerPump')} m3/s per pump)")
    except (FlowSolveError, urllib.error.URLError, OSError) as e:
        check("duty point", False, str(e))

    network = json.loads(NETWORK.read_text(encoding="utf-8"))
    solved = step("village network", lambda: client.solve_network(network))
    if solved:
        demand = sum(j.get("demand", 0) for j in network["junctions"])
        for case in solved["cases"]:
            m = case["demandMultiplier"]
            # Continuity, checked here from the answer: the reservoirs supply what the junctions draw.
            balanced = abs(case["totalSupply"] - demand * m) <= 1e-9
            lowest = min(case["junctions"], key=lambda j: j["pressureHead"])
            closed = [p["id"] for p in case["pipes"] if p["status"] != "open"]
            check(f"village network x {m:g}", case["converged"] and balanced,
                  f"{case['status']} in {case['iterations']} iterations, supply {case['totalSupply']:.4f} m3/s, "
                  f"lowest pressure head {lowest['pressureHead']:.1f} m at {lowest['id']}, "
                  f"closed: {', '.join(closed) or 'none'}, {len(case['warnings'])} warnings")

    return failures


def main(argv: list[str] | None = None) -> int:
    base = os.environ.get("FLOWSOLVE_URL", "http://localhost:5080")
    failures = run_scenario(FlowSolveClient(base))
    if failures:
        print(f"{len(failures)} step(s) failed", file=sys.stderr)
        return 1
    print("every step of the scenario succeeded")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
