"""Benchmark: ``check --method auto`` against ``--method exact`` and ``--method modular`` on
the panel of ``bench_shapes.py`` (its ``SHAPES``, imported, so shapes added there are
measured here too), each at a few orders, the three methods side by side in one run.

    python benchmarks/bench_auto.py [--orders 1000,5000,10000,50000] [--only long,lambert]
        [--tree .] [--timeout 120] [--repeat 1] [--json OUT]

Prints, per method, the ``seconds`` qseries reports (the check, auto's probe included; the
process start, which is the same for every method and very noisy on a loaded machine, left
out) and the wall time of the process, the method auto chose, and auto's seconds over the
better of the other two (``auto/best``); a row where auto is more than 1.5x slower than the
better method (and more than 0.2 s slower) is marked ``!``.  A run over the timeout is
``>T``.  With ``--repeat R`` each method runs R times and the least time counts (on a
loaded machine one run of a few tenths of a second varies by 2x).
Needs neither PARI/GP nor anything beyond qseries itself.
"""

from __future__ import annotations

import argparse
import json
import os
import sys
import time

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))

from bench_shapes import SHAPES, run_json  # noqa: E402

METHODS = ("auto", "exact", "modular")
#: auto may be this many times slower than the better method ...
TOLERANCE = 1.5
#: ... plus this many seconds (the noise of starting a process on a loaded machine)
SLACK = 0.2


def run(tree: str, left: str, right: str, order: int, method: str, timeout: float
        ) -> tuple[float, float, str] | None:
    """(wall seconds, reported seconds, method used) of one check; None past the timeout."""
    right = right.replace("N-3", str(order - 3))
    args = ["check", left, right, "-n", str(order), "--json", "--method", method, "--allow-long"]
    got = run_json(tree, args, timeout, f"{left} = {right} at {order} ({method})")
    if got is None:
        return None
    wall, data = got
    return wall, float(data["seconds"]), str(data["method"])


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--orders", default="1000,5000,10000,50000")
    ap.add_argument("--only", default="", help="comma-separated groups (default: all)")
    ap.add_argument("--tree", default=".", help="directory holding the qseries package")
    ap.add_argument("--timeout", type=float, default=120.0)
    ap.add_argument("--repeat", type=int, default=1, help="runs per method; the least counts")
    ap.add_argument("--json", default="", help="also write the rows to this file")
    args = ap.parse_args()
    orders = [int(x) for x in args.orders.split(",")]
    groups = {g for g in args.only.split(",") if g}
    run(args.tree, "q", "q", 10, "exact", args.timeout)          # warm-up: bytecode caches
    print(f"seconds reported by qseries (auto's probe included); tree {args.tree}; "
          f"load average {os.getloadavg()[0]:.2f}; "
          f"{time.strftime('%Y-%m-%d %H:%M UTC', time.gmtime())}")
    print(f"{'shape':<40} {'order':>7} {'auto':>8} {'exact':>8} {'modular':>8}  "
          f"{'chose':<8} auto/best   wall: auto / exact / modular")
    rows = []
    for name, group, left, right, _extra in SHAPES:
        if groups and group not in groups:
            continue
        for order in orders:
            got = {}
            for m in METHODS:
                runs = [run(args.tree, left, right, order, m, args.timeout)
                        for _ in range(max(args.repeat, 1))]
                done = [r for r in runs if r is not None]
                got[m] = min(done, key=lambda r: r[1]) if done else None
            over = f"{'>' + str(int(args.timeout)):>8}"
            cells = " ".join(f"{got[m][1]:8.2f}" if got[m] else over for m in METHODS)
            walls = " / ".join(f"{got[m][0]:.2f}" if got[m] else over.strip()
                               for m in METHODS)
            chose = got["auto"][2] if got["auto"] else "?"
            others = [got[m][1] for m in ("exact", "modular") if got[m]]
            best = max(min(others) if others else args.timeout, 0.01)
            auto = got["auto"][1] if got["auto"] else args.timeout
            ratio = auto / best
            flag = "!" if auto > TOLERANCE * best + SLACK else " "
            print(f"{name:<40} {order:>7} {cells}  {chose:<8} {ratio:5.2f} {flag}   {walls}",
                  flush=True)
            rows.append({"shape": name, "order": order, "chose": chose, "ratio": ratio,
                         **{m: (got[m][1] if got[m] else None) for m in METHODS},
                         **{m + "_wall": (got[m][0] if got[m] else None) for m in METHODS}})
    if args.json:
        with open(args.json, "w") as fh:
            json.dump(rows, fh, indent=1)


if __name__ == "__main__":
    main()
