#!/usr/bin/python3
"""Friction factors for many pipes: FlowSolve's CSV batch through the service against scipy in-process.

Generates N Colebrook-White cases (Reynolds number log-uniform from 1e4 to 1e8, relative roughness uniform from 0 to
0.01, seeded), then, side by side in one run:

  * scipy: scipy.optimize.newton on the whole array at once (vectorized), solving Colebrook-White in x = 1/sqrt(f)
    from the Swamee-Jain estimate, in this process; the time covers the estimate and the solve.
  * FlowSolve: the same cases as one CSV batch, POST /v1/batch/friction-factor?select=frictionFactor, to a running
    service; the time covers sending the CSV, the solve and receiving the whole answer (not parsing it here).

It checks that every row answered 200 and that the two friction factors agree to 1e-12 relative, then prints both
times per row and their ratio. Each side is timed REPEAT times and the fastest run is kept.

Not part of CI. Needs Debian's python3-scipy (apt-get install -y python3-scipy) and a service started with a row limit
that admits the batch, for example (from the repository root):

    dotnet build src/FlowSolve.Api -c Release
    FlowSolve__Limits__BatchRows=200000 FlowSolve__Logging__Level=Warning \\
        dotnet src/FlowSolve.Api/bin/Release/net10.0/FlowSolve.Api.dll --urls http://127.0.0.1:5080

    /usr/bin/python3 tests/FlowSolve.Benchmarks/scipy/friction_batch_compare.py [URL] [--rows N] [--repeat R]

Speed figures belong in docs/performance.md with the machine named; run this when the machine is quiet (uptime).
"""

import argparse
import http.client
import math
import os
import platform
import sys
import time
import urllib.parse

import numpy as np
import scipy
from scipy.optimize import newton

LN10 = math.log(10.0)


def cases(rows, seed):
    rng = np.random.default_rng(seed)
    reynolds = 10.0 ** rng.uniform(4.0, 8.0, rows)
    roughness = rng.uniform(0.0, 0.01, rows)
    return reynolds, roughness


def scipy_friction(reynolds, roughness, start="swamee-jain"):
    """Colebrook-White, 1/sqrt(f) = -2 log10(e/(3.7 D) + 2.51/(Re sqrt(f))), solved for x = 1/sqrt(f) by
    scipy.optimize.newton on the whole array, from the Swamee-Jain (1976) estimate (the faster start), or from
    f = 0.02 everywhere (start="constant", a common first guess, common practice)."""
    a = roughness / 3.7
    b = 2.51 / reynolds
    if start == "constant":
        x0 = np.full_like(reynolds, 1.0 / math.sqrt(0.02))
    else:
        swamee_jain = 0.25 / np.log10(a + 5.74 / reynolds ** 0.9) ** 2
        x0 = 1.0 / np.sqrt(swamee_jain)

    def residual(x):
        return x + 2.0 * np.log10(a + b * x)

    def slope(x):
        return 1.0 + 2.0 / LN10 * b / (a + b * x)

    x = newton(residual, x0, fprime=slope, tol=1e-14, maxiter=50)
    return 1.0 / (x * x)


def csv_body(reynolds, roughness):
    # repr gives the shortest text that reads back to the same double, so both sides solve the same numbers.
    lines = ["reynolds,relativeRoughness"]
    lines.extend(f"{re!r},{rr!r}" for re, rr in zip(reynolds.tolist(), roughness.tolist()))
    return ("\n".join(lines) + "\n").encode("ascii")


def post(url, body):
    parts = urllib.parse.urlsplit(url)
    connection = http.client.HTTPConnection(parts.hostname, parts.port or 80, timeout=600)
    path = (parts.path.rstrip("/") or "") + "/v1/batch/friction-factor?select=frictionFactor"
    try:
        start = time.perf_counter()
        connection.request("POST", path, body=body, headers={"Content-Type": "text/csv"})
        response = connection.getresponse()
        answer = response.read()
        elapsed = time.perf_counter() - start
    finally:
        connection.close()
    return response.status, answer, elapsed


def machine():
    model = platform.processor() or platform.machine()
    try:
        with open("/proc/cpuinfo", encoding="ascii", errors="replace") as cpuinfo:
            for line in cpuinfo:
                if line.startswith("model name"):
                    model = line.split(":", 1)[1].strip()
                    break
    except OSError:
        pass
    load = ", ".join(f"{v:.2f}" for v in os.getloadavg())
    return f"{model}, {os.cpu_count()} cores, {platform.system()} {platform.release()}, load average {load}"


def main():
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("url", nargs="?", default="http://127.0.0.1:5080", help="the running service (default %(default)s)")
    parser.add_argument("--rows", type=int, default=200_000, help="cases (default %(default)s)")
    parser.add_argument("--repeat", type=int, default=5, help="timed runs of each side; the fastest is kept (default %(default)s)")
    parser.add_argument("--seed", type=int, default=22, help="seed of the cases (default %(default)s)")
    args = parser.parse_args()

    reynolds, roughness = cases(args.rows, args.seed)
    body = csv_body(reynolds, roughness)

    # One untimed call of each side first (imports, the service's first-call compilation).
    scipy_friction(reynolds[:1000], roughness[:1000])
    status, answer, _ = post(args.url, body)
    if status != 200:
        text = answer[:400].decode("utf-8", "replace")
        hint = " (start the service with FlowSolve__Limits__BatchRows at least --rows)" if status == 413 else ""
        sys.exit(f"the service answered {status}{hint}: {text}")

    scipy_times, constant_times, service_times = [], [], []
    for _ in range(args.repeat):
        start = time.perf_counter()
        expected = scipy_friction(reynolds, roughness)
        scipy_times.append(time.perf_counter() - start)
        start = time.perf_counter()
        from_constant = scipy_friction(reynolds, roughness, start="constant")
        constant_times.append(time.perf_counter() - start)
        status, answer, elapsed = post(args.url, body)
        if status != 200:
            sys.exit(f"the service answered {status}")
        service_times.append(elapsed)

    lines = answer.decode("ascii").split("\r\n")
    if lines[0] != "row,httpStatus,error,frictionFactor":
        sys.exit(f"unexpected header: {lines[0]}")
    rows = [line.split(",") for line in lines[1:] if line]
    if len(rows) != args.rows:
        sys.exit(f"{len(rows)} rows answered, {args.rows} sent")
    refused = [r for r in rows if r[1] != "200"]
    if refused:
        sys.exit(f"{len(refused)} rows refused, the first: {','.join(refused[0])}")
    if [int(r[0]) for r in rows] != list(range(1, args.rows + 1)):
        sys.exit("rows out of order")
    actual = np.array([float(r[3]) for r in rows])
    worst = float(np.max(np.abs(actual / expected - 1.0)))
    worst_constant = float(np.max(np.abs(from_constant / expected - 1.0)))

    per_row_scipy = min(scipy_times) / args.rows
    per_row_service = min(service_times) / args.rows
    print(f"machine: {machine()}")
    print(f"python {platform.python_version()}, numpy {np.__version__}, scipy {scipy.__version__}")
    print(f"rows: {args.rows}, fastest of {args.repeat} runs each")
    per_row_constant = min(constant_times) / args.rows
    print(f"scipy vectorized newton, in-process:         {per_row_scipy * 1e9:8.1f} ns a row (from Swamee-Jain)")
    print(f"  the same from f = 0.02 everywhere:         {per_row_constant * 1e9:8.1f} ns a row (ratio service / this "
          f"{(min(service_times) / args.rows) / per_row_constant:.3f})")
    print(f"FlowSolve CSV batch, select=frictionFactor:  {per_row_service * 1e9:8.1f} ns a row (HTTP round trip)")
    print(f"ratio service / scipy:                       {per_row_service / per_row_scipy:8.3f}")
    print(f"largest relative difference:                 {worst:.3e} (limit 1e-12)")
    if not (worst <= 1e-12 and worst_constant <= 1e-12):
        sys.exit("the two answers differ by more than 1e-12 relative")


if __name__ == "__main__":
    main()
