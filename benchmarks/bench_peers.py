"""Side-by-side benchmark: the first Rogers-Ramanujan identity checked to order N by

* qseries (``qseries check ... --json``, method auto: exact up to 3000, modular above),
* sympy's ring_series (a straightforward script, what a Python user reaches for),
* PARI/GP (a straightforward gp script; skipped with a note when ``gp`` is not installed),
* FLINT's own series inverse of (q;q)_inf at the same order, exact (fmpz_series) and modulo
  one prime (nmod_poly.inverse_series_trunc): the floor a FLINT-based checker can approach.

Every run is a fresh process, so the times include start-up.  Bytecode caches are allowed
(PYTHONDONTWRITEBYTECODE is removed from the children's environment) and one warm-up run
compiles them, as an installed package has them.  Usage:

    python benchmarks/bench_peers.py [--orders 1000,5000,100000] [--skip-slow]

Prints a table of seconds, the ratios of each peer to qseries, and the growth exponent of
qseries' time over the orders measured (slope of log time against log order).
"""

from __future__ import annotations

import argparse
import json
import math
import os
import shutil
import subprocess
import sys
import time

LHS = "sum_{k>=0} q^(k^2)/(q;q)_k"
RHS = "1/((q;q^5)_inf (q^4;q^5)_inf)"

SYMPY_SCRIPT = r"""
import sys, time
from sympy import QQ
from sympy.polys.rings import ring
from sympy.polys.ring_series import rs_mul, rs_series_inversion
N = int(sys.argv[1])
t0 = time.perf_counter()
R, q = ring("q", QQ)
# sum side: sum_k q^(k^2) / (q;q)_k
lhs, k, poch = R(0), 0, R(1)
while k * k < N:
    if k:
        poch = rs_mul(poch, 1 - q**k, q, N)
    lhs += rs_mul(q**(k * k), rs_series_inversion(poch, q, N), q, N)
    k += 1
# product side: 1/prod (1-q^(5n+1))(1-q^(5n+4))
den, n = R(1), 0
while 5 * n + 1 < N:
    for e in (5 * n + 1, 5 * n + 4):
        if e < N:
            den = rs_mul(den, 1 - q**e, q, N)
    n += 1
rhs = rs_series_inversion(den, q, N)
print("ok" if lhs == rhs else "differ")
print("TIME", time.perf_counter() - t0)
"""

GP_SCRIPT = """\
N = {N};
gettime();
s = sum(k = 0, sqrtint(N - 1), q^(k^2) / prod(j = 1, k, 1 - q^j) + O(q^N));
p = 1 / prod(n = 0, (N - 1) \\ 5, (1 - q^(5*n + 1)) * (1 - q^(5*n + 4)) + O(q^N));
print(if(s == p, "ok", "differ"));
print("TIME ", gettime() / 1000.);
quit;
"""

FLINT_SCRIPT = r"""
import sys, flint
import time
N, mode = int(sys.argv[1]), sys.argv[2]
t0 = time.perf_counter()
c = [0] * N
k = 0
while k * (3 * k - 1) // 2 < N:
    s = -1 if k % 2 else 1
    c[k * (3 * k - 1) // 2] = s
    if k and k * (3 * k + 1) // 2 < N:
        c[k * (3 * k + 1) // 2] = s
    k += 1
if mode == "exact":
    flint.ctx.cap = N
    g = 1 / flint.fmpz_series(c)
else:
    p = 4611686018427388039
    g = flint.nmod_poly([x % p for x in c], p).inverse_series_trunc(N)
print("ok")
print("TIME", time.perf_counter() - t0)
"""


#: the children's environment: bytecode caches allowed, as for an installed package
ENV = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}


def timed(cmd: list[str], stdin: str | None = None,
          timeout: float = 900) -> tuple[float, float] | None:
    """(wall seconds including start-up, compute seconds reported by the script)."""
    t0 = time.perf_counter()
    try:
        out = subprocess.run(cmd, input=stdin, capture_output=True, text=True, timeout=timeout,
                             check=False, env=ENV)
    except subprocess.TimeoutExpired:
        return None
    wall = time.perf_counter() - t0
    if out.returncode != 0 or "differ" in out.stdout:
        raise SystemExit(f"{cmd[:3]} failed: {out.stderr[-500:] or out.stdout[-500:]}")
    compute = wall
    for line in out.stdout.splitlines():
        if line.startswith("TIME"):
            compute = float(line.split()[1])
        elif line.startswith("{"):
            compute = float(json.loads(line)["seconds"])
    return wall, compute


def run_qseries(n: int) -> tuple[float, float] | None:
    return timed([sys.executable, "-m", "qseries", "check", LHS, RHS, "-n", str(n), "--json"])


def run_sympy(n: int) -> tuple[float, float] | None:
    return timed([sys.executable, "-c", SYMPY_SCRIPT, str(n)])


def run_gp(n: int) -> tuple[float, float] | None:
    gp = shutil.which("gp")
    if gp is None:
        return None
    return timed([gp, "-q", "-s", "2G"], stdin=GP_SCRIPT.format(N=n))


def run_flint(n: int, mode: str) -> tuple[float, float] | None:
    return timed([sys.executable, "-c", FLINT_SCRIPT, str(n), mode])


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--orders", default="1000,5000,20000,100000")
    ap.add_argument("--skip-slow", action="store_true",
                    help="run sympy only up to order 1000 and gp only up to 5000")
    args = ap.parse_args()
    orders = [int(x) for x in args.orders.split(",")]
    if shutil.which("gp") is None:
        print("note: gp (PARI/GP) is not installed; its column is skipped")
    names = ["qseries", "sympy", "gp", "flint-ZZ", "flint-p"]
    run_qseries(10)                 # warm-up: writes the bytecode caches
    print("seconds as wall (with start-up) / compute (as each program reports it)")
    print(f"{'order':>8} " + " ".join(f"{n:>17}" for n in names))
    rows = []
    for n in orders:
        q = run_qseries(n)
        sy = run_sympy(n) if n <= (1000 if args.skip_slow else 5000) else None
        gp = run_gp(n) if n <= (5000 if args.skip_slow else 20000) else None
        fz = run_flint(n, "exact")
        fp = run_flint(n, "mod")
        rows.append((n, [q, sy, gp, fz, fp]))

        def cell(x: tuple[float, float] | None) -> str:
            return f"{x[0]:8.3f}/{x[1]:<8.3f}" if x is not None else f"{'-':>17}"
        print(f"{n:>8} " + " ".join(cell(x) for x in (q, sy, gp, fz, fp)), flush=True)
    print("\nratios, peer / qseries (> 1: qseries faster), wall and compute:")
    for n, cells in rows:
        q = cells[0]
        parts = []
        for name, x in zip(names[1:], cells[1:], strict=True):
            if x is not None and q is not None:
                parts.append(f"{name} {x[0] / q[0]:.2f} / {x[1] / max(q[1], 1e-6):.2f}")
        print(f"  order {n}: " + "; ".join(parts))
    pts = [(math.log(n), math.log(c[0][1])) for n, c in rows if c[0] and c[0][1] > 0]
    if len(pts) >= 2:
        (x0, y0), (x1, y1) = pts[0], pts[-1]
        print(f"\nqseries compute-time growth exponent from order {rows[0][0]} to "
              f"{rows[-1][0]}: {(y1 - y0) / (x1 - x0):.2f}")


if __name__ == "__main__":
    main()
