"""Benchmark panel: ``qseries check`` on the shapes of identity researchers check (products in
any spelling, Lambert series with and without signs, sums of squares, a failed check with
its diagnosis), at a few orders, each run a fresh process (wall time includes start-up).

    python benchmarks/bench_shapes.py [--orders 1000,10000] [--only lambert,product]
        [--trees before=/path/to/old/checkout,after=.] [--timeout 120]

With several ``--trees`` (each a directory holding the ``qseries`` package) every shape is
run by each tree side by side in the same run, so before/after ratios come from one machine
state.  Prints, per shape and order, wall seconds / the ``seconds`` qseries reports, the
ratio of the first tree to each other one, and the growth exponent of each tree's time in
the order (slope of log time against log order between the first and last order).
A run over the timeout is shown as ``>T``.
"""

from __future__ import annotations

import argparse
import json
import math
import os
import subprocess
import sys
import time

#: (name, group, left, right, extra options): the panel.  Groups: product, lambert, squares,
#: long, diagnose, single (the first Rogers-Ramanujan identity, the reference shape)
SHAPES: list[tuple[str, str, str, str, list[str]]] = [
    ("RR sum = product (reference)", "single", "sum_{k>=0} q^(k^2)/(q;q)_k",
     "1/((q;q^5)_inf (q^4;q^5)_inf)", []),
    ("(q;q)_inf = pentagonal sum", "product", "(q;q)_inf",
     "sum_{k=-200}^{200} (-1)^k q^(k(3k-1)/2)", []),
    ("prod_{n>=1} (1-q^n) = pentagonal sum", "product", "prod_{n>=1} (1-q^n)",
     "sum_{k=-200}^{200} (-1)^k q^(k(3k-1)/2)", []),
    ("prod_{n>=1} 1/(1-q^n) = 1/(q;q)_inf", "product", "prod_{n>=1} 1/(1-q^n)",
     "1/(q;q)_inf", []),
    ("prod (1+q^n) = 1/(q;q^2)_inf (Euler)", "product", "prod_{n>=1} (1+q^n)",
     "prod_{n>=0} 1/(1-q^(2n+1))", []),
    ("RR sum = prod_{n>=0} 1/(..)(..)", "product", "sum_{k>=0} q^(k^2)/(q;q)_k",
     "prod_{n>=0} 1/((1-q^(5n+1))(1-q^(5n+4)))", []),
    ("sum q^n/(1+q^n) (unsigned)", "lambert", "sum_{n>=1} q^n/(1+q^n)",
     "sum_{n>=1} q^n/(1+q^n)", []),
    ("sum q^n/(1+(-q)^n) (signed)", "lambert", "sum_{n>=1} q^n/(1+(-q)^n)",
     "sum_{n>=1} q^n/(1+(-q)^n)", []),
    ("two squares (catalogue form)", "squares", "theta_3(q)^2",
     "1 + 4 sum_{n>=0} (q^(4n+1)/(1-q^(4n+1)) - q^(4n+3)/(1-q^(4n+3)))", []),
    ("four squares (catalogue form)", "squares", "theta_3(q)^4",
     "1 + 8 sum_{n>=1} n q^n/(1 + (-q)^n)", []),
    ("Euler: sum q^n/(q;q)_n = 1/(q;q)_inf", "long", "sum_{n>=0} q^n/(q;q)_n",
     "1/(q;q)_inf", []),
    ("q-binomial: sum (-q;q)_n q^n/(q;q)_n", "long", "sum_{n>=0} (-q;q)_n q^n/(q;q)_n",
     "(-q^2;q)_inf/(q;q)_inf", []),
    ("failed check + diagnosis", "diagnose", "1/(q;q)_inf",
     "1/(q;q)_inf + q^(N-3)", []),
]


def tree_env(path: str) -> dict[str, str]:
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    env["PYTHONPATH"] = os.path.abspath(path)
    return env


def run(tree: str, left: str, right: str, order: int, extra: list[str],
        timeout: float) -> tuple[float, float] | None:
    """(wall seconds, reported seconds) of one check, None past the timeout."""
    right = right.replace("N-3", str(order - 3))
    cmd = [sys.executable, "-m", "qseries", "check", left, right, "-n", str(order), "--json",
           *extra]
    t0 = time.perf_counter()
    try:
        # run from the tree itself: ``python -m`` puts the working directory first on the
        # path, which would otherwise shadow PYTHONPATH
        out = subprocess.run(cmd, capture_output=True, text=True, timeout=timeout,
                             check=False, env=tree_env(tree), cwd=os.path.abspath(tree))
    except subprocess.TimeoutExpired:
        return None
    wall = time.perf_counter() - t0
    if out.returncode not in (0, 1):
        raise SystemExit(f"{tree}: {left} = {right} at {order} failed: "
                         f"{out.stderr[-400:] or out.stdout[-400:]}")
    return wall, float(json.loads(out.stdout)["seconds"])


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--orders", default="1000,10000")
    ap.add_argument("--only", default="", help="comma-separated groups (default: all)")
    ap.add_argument("--trees", default=".", help="name=path,... (default: this checkout)")
    ap.add_argument("--timeout", type=float, default=120.0)
    args = ap.parse_args()
    orders = [int(x) for x in args.orders.split(",")]
    groups = {g for g in args.only.split(",") if g}
    trees = []
    for item in args.trees.split(","):
        name, _, path = item.rpartition("=")
        trees.append((name or path, path))
    for _, path in trees:
        run(path, "q", "q", 10, [], args.timeout)           # warm-up: bytecode caches
    print("seconds as wall (with start-up) / reported by qseries; "
          f"{'; '.join(f'{n} = {p}' for n, p in trees)}")
    width = 19
    print(f"{'shape':<40} {'order':>7} " + " ".join(f"{n:>{width}}" for n, _ in trees)
          + ("   ratio " + "/".join(n for n, _ in trees) if len(trees) > 1 else ""))
    for name, group, left, right, extra in SHAPES:
        if groups and group not in groups:
            continue
        times: dict[str, list[tuple[int, float]]] = {n: [] for n, _ in trees}
        for order in orders:
            cells = []
            for tname, path in trees:
                got = run(path, left, right, order, extra, args.timeout)
                cells.append(got)
                if got is not None:
                    times[tname].append((order, got[0]))
            text = " ".join(f"{c[0]:8.2f}/{c[1]:<8.2f} ".rjust(width) if c else
                            f">{args.timeout:.0f}".rjust(width) for c in cells)
            ratio = ""
            if len(trees) > 1:
                first = cells[0][0] if cells[0] else None
                parts = []
                for c in cells[1:]:
                    if c and first:
                        parts.append(f"{first / c[0]:.1f}x")
                    elif c and not first:
                        parts.append(f">{args.timeout / c[0]:.0f}x")
                    else:
                        parts.append("-")
                ratio = "   " + " ".join(parts)
            print(f"{name:<40} {order:>7} {text}{ratio}", flush=True)
        for tname, pts in times.items():
            if len(pts) >= 2 and pts[0][1] > 0:
                (n0, t0), (n1, t1) = pts[0], pts[-1]
                print(f"{'':<40} growth exponent ({tname}, wall): "
                      f"{math.log(t1 / t0) / math.log(n1 / n0):.2f}")


if __name__ == "__main__":
    main()
