"""Benchmark: members scanned per second at order 500, in this process, with 1 and 2 local
worker processes, and on a two-worker Dask LocalCluster.  Each engine is started and warmed
up (one batch) before the clock runs: the figures are the throughput of a long scan.

    python benchmarks/bench_scan.py [--order N] [--repeat R]

The family, sum_n q^(a n^2 + b n) / ((q;q)_n (q;q^2)_(n+c)) for a = 1..3, b = -6..14,
c = 0..3 with a + b + c != 0 (240 members), holds Rogers' mod 14 identities among members
that the filter rejects; the figures are best of R runs, and the speed-ups are relative to
one worker process, measured in the same run.  The last column is the engine's cost per
member: the time per member of a family of constants ($a for a = 1..2000), which the
filter rejects at once, so that it is nearly all batching, transport and bookkeeping.
The machine's load average is printed: other processes on the same cores distort the
scaling.
"""

from __future__ import annotations

import argparse
import os
import time

from qseries.discovery import (
    Criteria,
    DaskEngine,
    Family,
    InlineEngine,
    PoolEngine,
    run_scan,
)
from qseries.discovery.engines import Engine
from qseries.discovery.examine import ScanJob

TRIVIAL = Family("$a", (("a", "1..2000"),))
FAMILY = Family("sum_{n>=0} q^($a n^2+$b n)/((q;q)_n (q;q^2)_(n+$c))",
                (("a", "1..3"), ("b", "-6..14"), ("c", "0..3")), ("a + b + c != 0",))


def timed(engine: Engine, criteria: Criteria, repeat: int) -> tuple[float, int, float]:
    """Best wall time of ``repeat`` scans on a started engine, the hits, and the engine's
    time per member on the trivial family."""
    warm = ScanJob(FAMILY, criteria)
    engine.result(engine.submit(warm, ((0, next(FAMILY.members())),)))
    best = float("inf")
    hits = 0
    for _ in range(repeat):
        t0 = time.perf_counter()
        report = run_scan(FAMILY, criteria, engine=engine)
        best = min(best, time.perf_counter() - t0)
        hits = len(report.of("hit"))
    t0 = time.perf_counter()
    run_scan(TRIVIAL, criteria, engine=engine)
    return best, hits, (time.perf_counter() - t0) / 2000


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--order", type=int, default=500)
    parser.add_argument("--repeat", type=int, default=3)
    args = parser.parse_args()
    criteria = Criteria(order=args.order)
    members = sum(1 for _ in FAMILY.members())
    print(f"{members} members at order {args.order} (filter at order {criteria.low_order}); "
          f"{os.cpu_count()} cores, load average {os.getloadavg()[0]:.1f}; best of "
          f"{args.repeat}")
    rows = [("in this process", InlineEngine), ("1 worker process", lambda: PoolEngine(1)),
            ("2 worker processes", lambda: PoolEngine(2))]
    results = []
    for name, make in rows:
        with make() as engine:
            results.append((name, *timed(engine, criteria, args.repeat)))
    try:
        import distributed
    except ImportError:
        distributed = None
    if distributed is not None:
        with distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=True,
                                      dashboard_address=":0", silence_logs=50) as cluster, \
                distributed.Client(cluster) as client:
            with DaskEngine(client=client) as engine:
                results.append(("Dask LocalCluster, 2 workers", *timed(engine, criteria,
                                                                        args.repeat)))
    base = results[1][1]
    print(f"{'engine':<30} {'seconds':>8} {'members/s':>10} {'speed-up':>9} {'hits':>5} "
          f"{'engine ms/member':>17}")
    for name, seconds, hits, cost in results:
        print(f"{name:<30} {seconds:>8.2f} {members / seconds:>10.1f} {base / seconds:>8.2f}x "
              f"{hits:>5} {1000 * cost:>17.3f}")
    print(f"load average afterwards {os.getloadavg()[0]:.1f}")


if __name__ == "__main__":
    main()
