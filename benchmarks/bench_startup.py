"""Benchmark of start-up: the wall time of whole ``qseries`` processes that compute little
(``check`` at order 1000 computes for about 0.01 s), beside the floors they cannot go below
(Python alone, Python importing python-flint, and python-flint and typer), for one or more
source trees side by side.

    python benchmarks/bench_startup.py [--trees before=/old/checkout,after=.] [--runs 20]
        [--markdown]

Every run is a fresh process with the tree on PYTHONPATH; PYTHONDONTWRITEBYTECODE is removed
from its environment, so the modules' bytecode is cached in the tree's ``__pycache__`` as
in an installed package (one warm-up run per tree and command first).  The trees' runs are
interleaved, so a change in the machine's load touches every column alike.  Each cell is
the best of the runs: wall milliseconds / CPU milliseconds (user + system of the child).
"""

from __future__ import annotations

import argparse
import os
import resource
import subprocess
import sys
import time

PENTAGONAL = ("(q;q)_inf", "sum_{n=-inf}^{inf} (-1)^n q^(n(3n-1)/2)")

#: (label, arguments of ``python``)
PROCESSES = [
    ("python -c pass (floor)", ["-c", "pass"]),
    ("import flint (floor)", ["-c", "import flint"]),
    ("import flint, typer (floor)", ["-c", "import flint, typer"]),
    ("import qseries", ["-c", "import qseries"]),
    ("import qseries.cli.main", ["-c", "import qseries.cli.main"]),
    ("qseries --help", ["-m", "qseries", "--help"]),
    ("qseries check --help", ["-m", "qseries", "check", "--help"]),
    ("qseries check (Euler) -n 1000 --json", ["-m", "qseries", "check", *PENTAGONAL,
                                              "--order", "1000", "--json"]),
    ("qseries check (Euler) -n 1000", ["-m", "qseries", "check", *PENTAGONAL, "--order",
                                       "1000"]),
    ("qseries expand 1/(q;q)_inf", ["-m", "qseries", "expand", "1/(q;q)_inf"]),
    ("qseries verify --only rogers-ramanujan-1 -n 100 -j 1 --json",
     ["-m", "qseries", "verify", "--only", "rogers-ramanujan-1", "-n", "100", "-j", "1",
      "--json"]),
    ("qseries verify --only rogers-ramanujan-1 -n 100 -j 1",
     ["-m", "qseries", "verify", "--only", "rogers-ramanujan-1", "-n", "100", "-j", "1"]),
]


def tree_env(path: str) -> dict[str, str]:
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    env["PYTHONPATH"] = os.path.abspath(path)
    return env


def one_run(args: list[str], path: str) -> tuple[float, float]:
    """Wall and CPU seconds of one ``python args`` process in the tree ``path``."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    start = time.perf_counter()
    subprocess.run([sys.executable, *args], stdout=subprocess.DEVNULL,
                   stderr=subprocess.DEVNULL, env=tree_env(path), cwd=os.path.abspath(path),
                   check=False)       # no timeout: waiting with one polls every 50 ms
    wall = time.perf_counter() - start
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    cpu = after.ru_utime + after.ru_stime - before.ru_utime - before.ru_stime
    return wall, cpu


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--trees", default=".", help="name=path,... (default: this checkout)")
    ap.add_argument("--runs", type=int, default=20, help="runs per cell (the best is shown)")
    ap.add_argument("--markdown", action="store_true", help="print a Markdown table")
    args = ap.parse_args()
    trees = []
    for item in args.trees.split(","):
        name, _, path = item.rpartition("=")
        trees.append((name or path, path))
    print(f"# {time.strftime('%Y-%m-%d %H:%M UTC', time.gmtime())}, load average "
          f"{os.getloadavg()[0]:.1f}, best of {args.runs}, wall ms / CPU ms; "
          f"{'; '.join(f'{n} = {p}' for n, p in trees)}")
    if args.markdown:
        print("| process | " + " | ".join(n for n, _ in trees) + " |")
        print("| --- |" + " ---: |" * len(trees))
    else:
        print(f"{'':56}" + "".join(f"{n:>16}" for n, _ in trees))
    for label, cmd in PROCESSES:
        for _, path in trees:
            one_run(cmd, path)                     # warm-up: the bytecode cache
        best = {path: (float("inf"), float("inf")) for _, path in trees}
        for _ in range(args.runs):
            for _, path in trees:
                wall, cpu = one_run(cmd, path)
                best[path] = (min(best[path][0], wall), min(best[path][1], cpu))
        cells = [f"{best[p][0] * 1000:.0f} / {best[p][1] * 1000:.0f}" for _, p in trees]
        if args.markdown:
            print(f"| {label} | " + " | ".join(cells) + " |", flush=True)
        else:
            print(f"{label:56}" + "".join(f"{c:>16}" for c in cells), flush=True)


if __name__ == "__main__":
    main()
