"""Side-by-side benchmark of the analysis commands of issue 14, each peer a fresh process:

* **congruences**: the search for p(n) (``qseries congruences "1/(q;q)_inf"`` with its
  defaults: steps m <= 30, every residue r < m, the primes 2..13 as moduli, a congruence kept
  unless a smaller one implies it) against a PARI/GP script doing the same (1/eta(q) modulo
  each prime, every (m, r, ell) tested with an early exit at the first non-zero) and a
  plain-Python script (p(n) exactly by Euler's pentagonal recurrence, then the same loops);
* **relations**: the integer relations among ten series at order 2000 (theta and eta
  quotients with five known relations: Jacobi's quartic theta_3^4 = theta_2^4 + theta_4^4,
  theta_3(q)^2 = theta_3(q^2)^2 + theta_2(q^2)^2, Jacobi's four-squares Lambert series =
  theta_3^4, theta_4 = (q;q)^2/(q^2;q^2) and theta_3^2 as an eta quotient) against a GP
  script (series by sums and product loops, ``matkerint`` of the coefficient matrix) and a
  sympy script (series as coefficient lists, ``Matrix.nullspace``).

Every peer computes its series itself from the definitions; the answers are compared (the same
congruences; the same space of relations, i.e. the union of the bases has rank 5) and a
mismatch stops the benchmark.  Times: wall seconds including start-up / compute seconds as
each program reports it (qseries: the library call timed inside a fresh process after the
import; its command-line wall time is a separate column).

    python benchmarks/bench_analysis.py [--congruence-order 100000] [--relation-order 2000]
        [--only congruences,relations] [--timeout 600]

Without ``gp`` on the path the GP column is skipped with a note.
"""

from __future__ import annotations

import argparse
import json
import os
import shutil
import subprocess
import sys
import time
from fractions import Fraction

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))

from bench_shapes import run_killing_group  # noqa: E402  (one copy of the process-group runner)

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
#: the children's environment: this checkout first on the path, bytecode caches allowed
ENV = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
ENV["PYTHONPATH"] = ROOT

MAX_M, PRIMES = 30, (2, 3, 5, 7, 11, 13)

# -- congruences ---------------------------------------------------------------------------
QS_CONGRUENCES = r"""
import sys, time, json
from qseries.analysis.congruences import find_congruences
N = int(sys.argv[1])
t0 = time.perf_counter()
s = find_congruences("1/(q;q)_inf", N)
t = time.perf_counter() - t0
print(json.dumps([[c.m, c.r, c.modulus] for c in s.congruences]))
print("TIME", t)
"""

GP_CONGRUENCES = """\
N = {N}; M = {M};
t0 = getwalltime();
E = eta(q + O(q^N));
found = List(); kept = List();
{{forprime(ell = 2, {L},
  v = lift(Vec(1 / (E * Mod(1, ell))));
  for(m = 1, M, for(r = 0, m - 1,
    ok = 1;
    forstep(n = r + 1, N, m, if(v[n], ok = 0; break));
    if(ok && r < N,
      imp = 0;
      fordiv(m, d, if(d < m && setsearch(Set(found), [d, r % d, ell]), imp = 1; break));
      listput(found, [m, r, ell]);
      if(!imp, listput(kept, [m, r, ell]))))))}};
t = (getwalltime() - t0) / 1000.;
print(vecsort(Vec(kept)));
print("TIME ", t);
quit;
"""

PY_CONGRUENCES = r"""
import sys, time, json
N, M = int(sys.argv[1]), int(sys.argv[2])
primes = [int(x) for x in sys.argv[3].split(",")]
t0 = time.perf_counter()
# p(n) by Euler's pentagonal recurrence:
# p(n) = sum_k (-1)^(k+1) (p(n - k(3k-1)/2) + p(n - k(3k+1)/2))
pent = []
k = 1
while k * (3 * k - 1) // 2 < N:
    sign = 1 if k % 2 else -1
    pent.append((k * (3 * k - 1) // 2, sign))
    pent.append((k * (3 * k + 1) // 2, sign))
    k += 1
p = [1] + [0] * (N - 1)
for n in range(1, N):
    s = 0
    for g, sign in pent:
        if g > n:
            break
        s += sign * p[n - g]
    p[n] = s
found, kept = set(), []
for ell in primes:
    v = [x % ell for x in p]
    for m in range(1, M + 1):
        for r in range(m):
            if r < N and not any(v[r::m]):
                implied = any((d, r % d, ell) in found for d in range(1, m) if m % d == 0)
                found.add((m, r, ell))
                if not implied:
                    kept.append([m, r, ell])
t = time.perf_counter() - t0
print(json.dumps(sorted(kept)))
print("TIME", t)
"""

# -- relations -----------------------------------------------------------------------------
#: the ten series, in qseries' notation; the GP and sympy scripts build the same ones
SERIES = [
    "theta_3(q)^4",
    "theta_2(q)^4",
    "theta_4(q)^4",
    "theta_3(q)^2",
    "theta_3(q^2)^2",
    "theta_2(q^2)^2",
    "theta_4(q)",
    "(q;q)_inf^2/(q^2;q^2)_inf",
    "1 + 8 sum_{n>=1} n q^n/(1 + (-q)^n)",
    "(q^2;q^2)_inf^10/((q;q)_inf^4 (q^4;q^4)_inf^4)",
]
#: the dimension of the space of relations among them (weights 2, 1 and 1/2: Jacobi's
#: quartic and four squares; theta_3(q)^2 twice; theta_4 as an eta quotient)
EXPECTED_RELATIONS = 5

QS_RELATIONS = r"""
import sys, time, json
from qseries.analysis.relations import relations
N = int(sys.argv[1])
series = json.loads(sys.argv[2])
t0 = time.perf_counter()
r = relations(series, N)
t = time.perf_counter() - t0
print(json.dumps([list(v) for v in r.relations]))
print("TIME", t)
"""

GP_RELATIONS = """\
N = {N};
t0 = getwalltime();
B = sqrtint(N) + 1;
t3 = 1 + 2 * sum(n = 1, B, q^(n^2)) + O(q^N);
t4 = 1 + 2 * sum(n = 1, B, (-1)^n * q^(n^2)) + O(q^N);
t2 = sum(n = 0, B, q^(n^2 + n)) + O(q^N);         \\\\ theta_2(q) = 2 q^(1/4) t2
t3q2 = 1 + 2 * sum(n = 1, B, q^(2*n^2)) + O(q^N);
t2q2 = sum(n = 0, B, q^(2*n^2 + 2*n)) + O(q^N);   \\\\ theta_2(q^2) = 2 q^(1/2) t2q2
pq(k) = my(P = 1 + O(q^N)); forstep(e = k, N - 1, k, P *= 1 - q^e); P;
P1 = pq(1); P2 = pq(2); P4 = pq(4);
{{F = [t3^4, 16 * q * t2^4, t4^4, t3^2, t3q2^2, 4 * q * t2q2^2, t4, P1^2 / P2,
     1 + 8 * sum(n = 1, N - 1, n * q^n / (1 + (-q)^n) + O(q^N)), P2^10 / (P1^4 * P4^4)]}};
A = matrix(N, #F, i, j, polcoef(F[j], i - 1));
K = matkerint(A);
t = (getwalltime() - t0) / 1000.;
print(Vec(K));
print("TIME ", t);
quit;
"""

SYMPY_RELATIONS = r"""
import sys, time, json
from sympy import Matrix, ilcm
N = int(sys.argv[1])
t0 = time.perf_counter()

def mul(a, b):                       # truncated product; a is the sparse one
    c = [0] * N
    for i, x in enumerate(a):
        if x:
            for j in range(N - i):
                c[i + j] += x * b[j]
    return c

def times_binomial(c, e, power=1):    # c * (1 - q^e)^power, power = +-1
    c = list(c)
    if power > 0:
        for i in range(N - 1, e - 1, -1):
            c[i] -= c[i - e]
    else:
        for i in range(e, N):
            c[i] += c[i - e]
    return c

def eta_quotient(exps):              # prod_k (q^k;q^k)_inf^(exps[k]), by loops
    c = [1] + [0] * (N - 1)
    for k, a in exps.items():
        for e in range(k, N, k):
            for _ in range(abs(a)):
                c = times_binomial(c, e, 1 if a > 0 else -1)
    return c

def theta(step, shift, sign, scale):  # sum over n>=0 of scale sign^n q^(step(n^2 + shift n))
    c = [0] * N
    n = 0
    while step * (n * n + shift * n) < N:
        c[step * (n * n + shift * n)] += scale * sign**n
        n += 1
    return c

t3 = theta(1, 0, 1, 2); t3[0] = 1
t4 = theta(1, 0, -1, 2); t4[0] = 1
t2 = theta(1, 1, 1, 1)
t3q2 = theta(2, 0, 1, 2); t3q2[0] = 1
t2q2 = theta(2, 1, 1, 1)
shift1 = lambda c, k: [0] * 1 + [k * x for x in c[:N - 1]]
four = [1] + [0] * (N - 1)
for n in range(1, N):                # n q^n/(1 + (-q)^n) as a geometric series
    r = -((-1) ** n)
    for j, e in enumerate(range(n, N, n)):
        four[e] += 8 * n * r**j
F = [mul(t3, mul(t3, mul(t3, t3))), shift1(mul(t2, mul(t2, mul(t2, t2))), 16),
     mul(t4, mul(t4, mul(t4, t4))), mul(t3, t3), mul(t3q2, t3q2), shift1(mul(t2q2, t2q2), 4),
     t4, eta_quotient({1: 2, 2: -1}), four, eta_quotient({2: 10, 1: -4, 4: -4})]
A = Matrix(N, len(F), lambda i, j: F[j][i])
basis = []
for v in A.nullspace():
    d = ilcm(*[x.q for x in v]) if len(v) > 1 else v[0].q
    basis.append([int(x * d) for x in v])
t = time.perf_counter() - t0
print(json.dumps(basis))
print("TIME", t)
"""


def timed(cmd: list[str], stdin: str | None, timeout: float
          ) -> tuple[float, float, str] | None:
    """(wall seconds with start-up, compute seconds the script reports, its first line)."""
    t0 = time.perf_counter()
    try:
        out = run_killing_group(cmd, stdin=stdin, timeout=timeout, env=ENV, cwd=ROOT)
    except subprocess.TimeoutExpired:
        return None
    wall = time.perf_counter() - t0
    if out.returncode not in (0, 1) or "***" in out.stderr + out.stdout:
        raise SystemExit(f"{cmd[:3]} failed: {out.stderr[-800:] or out.stdout[-800:]}")
    compute, first = wall, ""
    for line in out.stdout.splitlines():
        if line.startswith("TIME"):
            compute = float(line.split()[1])
        elif line.strip() and not first:
            first = line.strip()
    return wall, compute, first


def gp_list(text: str) -> list[list[int]]:
    """A GP vector of vectors ``[[1, 2], [3, 4]]`` (or ``[]``) as lists of integers."""
    text = text.strip().replace(" ", "").replace("~", "")
    if text in ("[]", "[;]"):
        return []
    return [[int(x) for x in row.split(",")] for row in text[2:-2].split("],[")]


def rank(rows: list[list[int]]) -> int:
    """The rank over QQ (plain Gaussian elimination on fractions)."""
    m = [[Fraction(x) for x in row] for row in rows]
    r = 0
    for col in range(len(m[0]) if m else 0):
        piv = next((i for i in range(r, len(m)) if m[i][col]), None)
        if piv is None:
            continue
        m[r], m[piv] = m[piv], m[r]
        for i in range(len(m)):
            if i != r and m[i][col]:
                f = m[i][col] / m[r][col]
                m[i] = [a - f * b for a, b in zip(m[i], m[r], strict=True)]
        r += 1
    return r


def cell(x: tuple[float, float, str] | None, skipped: str = "-") -> str:
    return f"{x[0]:8.2f} / {x[1]:<8.3f}" if x is not None else f"{skipped:>19}"


def ratios(name: str, base: tuple[float, float, str] | None,
           peers: list[tuple[str, tuple[float, float, str] | None]]) -> None:
    if base is None:
        return
    parts = [f"{n} {p[0] / base[0]:.2f}x wall, {p[1] / max(base[1], 1e-6):.2f}x compute"
             for n, p in peers if p is not None]
    print(f"  {name}, peer / qseries (> 1: qseries faster): " + "; ".join(parts))


def bench_congruences(order: int, gp: str | None, timeout: float) -> None:
    print(f"\ncongruence search for p(n), order {order}, m <= {MAX_M}, moduli "
          f"{','.join(map(str, PRIMES))}")
    cli = timed([sys.executable, "-m", "qseries", "congruences", "1/(q;q)_inf", "-n",
                 str(order), "--json"], None, timeout)
    lib = timed([sys.executable, "-c", QS_CONGRUENCES, str(order)], None, timeout)
    want = sorted(json.loads(lib[2])) if lib else None
    if cli is not None:
        got = sorted([c["m"], c["r"], c["modulus"]] for c in json.loads(cli[2])["congruences"])
        if want is not None and got != want:
            raise SystemExit(f"qseries command {got} and library {want} differ")
    peers: list[tuple[str, tuple[float, float, str] | None]] = []
    if gp is not None:
        g = timed([gp, "-q", "-s", "4G"], GP_CONGRUENCES.format(
            N=order, M=MAX_M, L=max(PRIMES)), timeout)
        if g is not None and want is not None and sorted(gp_list(g[2])) != want:
            raise SystemExit(f"gp found {g[2]}, qseries {want}")
        peers.append(("gp", g))
    p = timed([sys.executable, "-c", PY_CONGRUENCES, str(order), str(MAX_M),
               ",".join(map(str, PRIMES))], None, timeout)
    if p is not None and want is not None and sorted(json.loads(p[2])) != want:
        raise SystemExit(f"python found {p[2]}, qseries {want}")
    peers.append(("python", p))
    print(f"  found (all agree): {want}")
    print(f"  {'qseries command':>19} {'qseries library':>19} {'PARI/GP script':>19} "
          f"{'Python script':>19}")
    gp_cell = cell(peers[0][1], ">" + str(int(timeout))) if gp else f"{'(no gp)':>19}"
    print(f"  {cell(cli, '>' + str(int(timeout)))} {cell(lib, '>' + str(int(timeout)))} "
          f"{gp_cell} {cell(p, '>' + str(int(timeout)))}")
    ratios("ratios", lib, peers)


def bench_relations(order: int, gp: str | None, timeout: float) -> None:
    print(f"\nrelations among {len(SERIES)} series, order {order}: " + "; ".join(SERIES))
    cli = timed([sys.executable, "-m", "qseries", "relations", *SERIES, "-n", str(order),
                 "--json"], None, timeout)
    lib = timed([sys.executable, "-c", QS_RELATIONS, str(order), json.dumps(SERIES)], None,
                timeout)
    answers: dict[str, list[list[int]]] = {}
    if cli is not None:
        answers["qseries command"] = [[int(x) for x in v]
                                      for v in json.loads(cli[2])["relations"]]
    if lib is not None:
        answers["qseries library"] = json.loads(lib[2])
    peers: list[tuple[str, tuple[float, float, str] | None]] = []
    if gp is not None:
        g = timed([gp, "-q", "-s", "4G"], GP_RELATIONS.format(N=order), timeout)
        if g is not None:
            answers["gp"] = gp_list(g[2])
        peers.append(("gp", g))
    s = timed([sys.executable, "-c", SYMPY_RELATIONS, str(order)], None, timeout)
    if s is not None:
        answers["sympy"] = json.loads(s[2])
    peers.append(("sympy", s))
    every = [v for basis in answers.values() for v in basis]
    for name, basis in answers.items():
        if len(basis) != EXPECTED_RELATIONS or rank(basis) != EXPECTED_RELATIONS:
            raise SystemExit(f"{name} found {basis}, not {EXPECTED_RELATIONS} relations")
    if every and rank(every) != EXPECTED_RELATIONS:
        raise SystemExit(f"the relations found differ: {answers}")
    print(f"  {EXPECTED_RELATIONS} relations, the same space for "
          f"{', '.join(answers)}; qseries' basis: {answers.get('qseries library')}")
    print(f"  {'qseries command':>19} {'qseries library':>19} {'PARI/GP script':>19} "
          f"{'sympy script':>19}")
    gp_cell = cell(peers[0][1], ">" + str(int(timeout))) if gp else f"{'(no gp)':>19}"
    print(f"  {cell(cli, '>' + str(int(timeout)))} {cell(lib, '>' + str(int(timeout)))} "
          f"{gp_cell} {cell(s, '>' + str(int(timeout)))}")
    ratios("ratios", lib, peers)


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--congruence-order", type=int, default=100000)
    ap.add_argument("--relation-order", type=int, default=2000)
    ap.add_argument("--only", default="", help="congruences and/or relations (default: both)")
    ap.add_argument("--timeout", type=float, default=600.0)
    args = ap.parse_args()
    only = {x for x in args.only.split(",") if x}
    gp = shutil.which("gp")
    if gp is None:
        print("note: gp (PARI/GP) is not installed; its column is skipped")
    timed([sys.executable, "-m", "qseries", "expand", "q", "-n", "3"], None, 60)  # warm-up
    load = os.getloadavg()
    print(f"{time.strftime('%Y-%m-%d %H:%M UTC', time.gmtime())}, {os.cpu_count()} cores, "
          f"load average {load[0]:.2f} {load[1]:.2f} {load[2]:.2f}")
    print("seconds as wall (with start-up) / compute (as each program reports it)")
    if not only or "congruences" in only:
        bench_congruences(args.congruence_order, gp, args.timeout)
    if not only or "relations" in only:
        bench_relations(args.relation_order, gp, args.timeout)


if __name__ == "__main__":
    main()
