"""Benchmark: check the first Rogers-Ramanujan identity at several orders, each in a fresh
process, so that the wall time includes interpreter start-up and imports (what a user waits).

    python benchmarks/bench_check.py [ORDER ...]

Prints one row per order: the wall time (best of 3 runs) and the time qseries itself reports.
"""

from __future__ import annotations

import json
import subprocess
import sys
import time

LHS = "sum_{k>=0} q^(k^2)/(q;q)_k"
RHS = "1/((q;q^5)_inf (q^4;q^5)_inf)"


def run_once(order: int) -> tuple[float, float]:
    t0 = time.perf_counter()
    out = subprocess.run([sys.executable, "-m", "qseries", "check", LHS, RHS, "--order",
                          str(order), "--json"], capture_output=True, text=True, check=False)
    wall = time.perf_counter() - t0
    if out.returncode != 0:
        raise SystemExit(f"qseries failed at order {order}: {out.stderr or out.stdout}")
    return wall, json.loads(out.stdout)["seconds"]


def main(argv: list[str]) -> None:
    orders = [int(a) for a in argv] or [500, 1000, 2000, 5000, 10000]
    print(f"{'order':>8}  {'wall s (best of 3)':>18}  {'check s':>8}")
    for n in orders:
        best = min(run_once(n) for _ in range(3))
        print(f"{n:>8}  {best[0]:>18.3f}  {best[1]:>8.3f}")


if __name__ == "__main__":
    main(sys.argv[1:])
