"""Benchmark panel: qseries on the shapes of identity researchers check (single sums, products
in any spelling, Lambert series with and without signs, sums of squares, long sums, multi-sums,
a theta/eta-quotient identity, an identity in an extra variable, product recovery, ``verify`` on
a catalogue subset, a failed check with its diagnosis), at several orders, side by side with the
straightforward PARI/GP script for the same shape and, where one applies, FLINT's own floor.
Every run is a fresh process (wall time includes start-up).

    python benchmarks/bench_shapes.py [--orders 1000,5000,10000,100000] [--only multisum,long]
        [--trees before=/path/to/old/checkout,after=.] [--timeout 60] [--no-gp] [--no-flint]

Columns, per shape and order: each tree's qseries run as wall seconds / the ``seconds``
qseries reports (for product recovery, which reports none, the library call
``product_form`` timed in its process); the GP script as wall / compute
(``getwalltime``: the wall time of its computation, as qseries' ``seconds`` is, not CPU
time); FLINT's floor as compute seconds, exact (fmpz_series) and modulo one prime
(nmod_poly); the ratio GP / qseries (the last tree; wall and compute: > 1 means qseries is
faster); with several trees the ratio of the first tree to each other one.  Below each shape,
the growth exponent of each program's compute time in the order, between its two largest
orders measured (the local slope of log time against log order).

The GP scripts are what a researcher would write: truncated series with ``O(q^N)``, loops for
sums, products by loops of ``P *= 1 - q^e`` (no ``eta``), each computing both sides and
comparing them.  At the smallest order each GP script's left side is checked against
``qseries expand`` (or the exponents against ``qseries product``) by a checksum (the
coefficients, at z = 3 where there is an extra variable, as a polynomial evaluated at 7
modulo 2^61 - 1), so every column computes the same series.  A run over ``--timeout`` shows
``>T``; a run predicted to take longer (from the previous order: growth exponent 2 for GP,
the measured one for qseries) is skipped and shows ``skip``.  Without ``gp`` on the path
the GP column is skipped with a note.
"""

from __future__ import annotations

import argparse
import json
import math
import os
import re
import shutil
import signal
import subprocess
import sys
import time
from dataclasses import dataclass, field

CHECKSUM_PRIME = 2**61 - 1

#: GP prelude of every script: q is created before z (so series in q have coefficients in
#: z); poch(c, a, m) = prod_{e = a, a + m, ... < N} (1 - c q^e), the product by a loop
GP_PRELUDE = """\
N = {N}; q; z;
poch(c, a, m) = my(P = 1 + O(q^N)); forstep(e = a, N - 1, m, P *= 1 - c * q^e); P;
cs(S) = lift(subst(subst(truncate(S), z, 3), q, Mod(7, 2^61 - 1)));
t0 = getwalltime();
"""
#: epilogue: both sides compared, a checksum of the left one, the compute time
GP_EPILOGUE = """
t = (getwalltime() - t0) / 1000.;
print("EQUAL ", L == R);
print("CHECK ", cs(L));
print("TIME ", t);
quit;
"""

#: the GP scripts' building blocks (N is the order)
GP_RR = ("L = sum(k = 0, sqrtint(N - 1), q^(k^2) / prod(j = 1, k, 1 - q^j) + O(q^N));\n")
GP_THETA3 = "t3 = 1 + 2 * sum(n = 1, sqrtint(N), q^(n^2)) + O(q^N);\n"
GP_PENTAGONAL = ("R = sum(k = -sqrtint(N) - 1, sqrtint(N) + 1, (-1)^k * q^(k * (3*k - 1) / 2))"
                 " + O(q^N);\n")


def gp_multisum(k: int) -> str:
    """The Andrews-Gordon sum with i = k (k - 1 nested loops), each term truncated at its own
    precision and 1/(q;q)_n precomputed once."""
    idx = [f"n{j}" for j in range(1, k)]
    exps = " + ".join(f"({' + '.join(idx[j:])})^2" for j in range(k - 1))
    body = "\n".join(f"{'  ' * j}for({v} = 0, B," for j, v in enumerate(idx))
    inner = "  " * (k - 1)
    dens = " * ".join(f"(ip[{v} + 1] + O(q^(N - e)))" for v in idx)
    return (f"B = sqrtint(N);\nip = vector(B + 1); ip[1] = 1 + O(q^N);\n"
            f"for(n = 1, B, ip[n + 1] = ip[n] / (1 - q^n));\n"
            f"L = O(q^N);\n{{{body}\n{inner}e = {exps}; if(e >= N, break);\n"
            f"{inner}L += q^e * {dens}{')' * (k - 1)}}};\n")


@dataclass(frozen=True)
class Shape:
    """One row group of the panel.  kind: check (``left`` = ``right``), product (recover the
    product form of ``left``) or verify (``left`` lists catalogue keys, space-separated).
    ``gp`` defines L and R (the left and right side) after the prelude; ``floor`` names the
    FLINT floor that applies (``inv-eta``: 1/(q;q)_inf; ``theta4``: theta_3(q)^4) or ''."""

    name: str
    group: str
    kind: str
    left: str
    right: str
    gp: str
    floor: str = ""
    holds: bool = True
    extra: list[str] = field(default_factory=list)


CAPPARELLI_GP = (
    "B = sqrtint(N);\nip = vector(B + 1); ip[1] = 1 + O(q^N);\n"
    "for(n = 1, B, ip[n + 1] = ip[n] / (1 - q^n));\n"
    "i3 = vector(B + 1); i3[1] = 1 + O(q^N);\n"
    "for(n = 1, B, i3[n + 1] = i3[n] / (1 - q^(3*n)));\n"
    "L = O(q^N);\n{for(j = 0, B, for(i = 0, 2*B, e = 2*i^2 + 6*i*j + 6*j^2; if(e >= N, break);\n"
    "  L += q^e * (ip[i + 1] + O(q^(N - e))) * (i3[j + 1] + O(q^(N - e)))))};\n"
    "R = poch(-1, 2, 6) * poch(-1, 4, 6) * poch(-1, 3, 3);\n")

VERIFY_KEYS = ("euler-pentagonal euler-distinct-odd rogers-ramanujan-1 rogers-ramanujan-2 "
               "goellnitz-gordon-1 goellnitz-gordon-2 rogers-mod-10")
VERIFY_GP = (
    "ok = 1;\n"
    "ok = ok && (poch(1, 1, 1) == " + GP_PENTAGONAL.split("= ", 1)[1].rstrip(";\n") + ");\n"
    "ok = ok && (poch(-1, 1, 1) == 1 / poch(1, 1, 2));\n"
    + GP_RR + "ok = ok && (L == 1 / (poch(1, 1, 5) * poch(1, 4, 5)));\n"
    "L = sum(k = 0, sqrtint(N - 1), q^(k^2 + k) / prod(j = 1, k, 1 - q^j) + O(q^N));\n"
    "ok = ok && (L == 1 / (poch(1, 2, 5) * poch(1, 3, 5)));\n"
    "L = sum(n = 0, sqrtint(N - 1), q^(n^2) * prod(j = 1, n, 1 + q^(2*j - 1))"
    " / prod(j = 1, n, 1 - q^(2*j)) + O(q^N));\n"
    "ok = ok && (L == 1 / (poch(1, 1, 8) * poch(1, 4, 8) * poch(1, 7, 8)));\n"
    "L = sum(n = 0, sqrtint(N - 1), q^(n^2 + 2*n) * prod(j = 1, n, 1 + q^(2*j - 1))"
    " / prod(j = 1, n, 1 - q^(2*j)) + O(q^N));\n"
    "ok = ok && (L == 1 / (poch(1, 3, 8) * poch(1, 4, 8) * poch(1, 5, 8)));\n"
    "L = sum(n = 0, sqrtint(N), q^(n * (3*n - 1) / 2) / (prod(j = 1, n, 1 - q^j)"
    " * prod(j = 1, n, 1 - q^(2*j - 1))) + O(q^N));\n"
    "ok = ok && (L == poch(1, 4, 10) * poch(1, 6, 10) * poch(1, 10, 10) / poch(1, 1, 1));\n"
    "L = O(q^N); R = if(ok, L, 1 + L);\n")

#: the panel.  Groups: single (the first Rogers-Ramanujan identity, the reference shape),
#: product, lambert, squares, long, multisum, theta, variable, recovery, verify, diagnose
PANEL: list[Shape] = [
    Shape("RR sum = product (reference)", "single", "check", "sum_{k>=0} q^(k^2)/(q;q)_k",
          "1/((q;q^5)_inf (q^4;q^5)_inf)",
          GP_RR + "R = 1 / (poch(1, 1, 5) * poch(1, 4, 5));\n", "inv-eta"),
    Shape("(q;q)_inf = pentagonal sum", "product", "check", "(q;q)_inf",
          "sum_{k=-inf}^{inf} (-1)^k q^(k(3k-1)/2)",
          "L = poch(1, 1, 1);\n" + GP_PENTAGONAL, "inv-eta"),
    Shape("prod_{n>=1} (1-q^n) = pentagonal sum", "product", "check", "prod_{n>=1} (1-q^n)",
          "sum_{k=-inf}^{inf} (-1)^k q^(k(3k-1)/2)",
          "L = poch(1, 1, 1);\n" + GP_PENTAGONAL, "inv-eta"),
    Shape("prod_{n>=1} 1/(1-q^n) = 1/(q;q)_inf", "product", "check", "prod_{n>=1} 1/(1-q^n)",
          "1/(q;q)_inf",
          "L = 1 + O(q^N); for(n = 1, N - 1, L /= 1 - q^n);\nR = 1 / poch(1, 1, 1);\n",
          "inv-eta"),
    Shape("prod (1+q^n) = 1/(q;q^2)_inf (Euler)", "product", "check", "prod_{n>=1} (1+q^n)",
          "prod_{n>=0} 1/(1-q^(2n+1))",
          "L = poch(-1, 1, 1);\nR = 1 / poch(1, 1, 2);\n", "inv-eta"),
    Shape("RR sum = prod_{n>=0} 1/(..)(..)", "product", "check", "sum_{k>=0} q^(k^2)/(q;q)_k",
          "prod_{n>=0} 1/((1-q^(5n+1))(1-q^(5n+4)))",
          GP_RR + "R = 1 / (poch(1, 1, 5) * poch(1, 4, 5));\n", "inv-eta"),
    Shape("sum q^n/(1+q^n) (unsigned)", "lambert", "check", "sum_{n>=1} q^n/(1+q^n)",
          "sum_{n>=1} q^n/(1+q^n)",
          "L = sum(n = 1, N - 1, q^n / (1 + q^n) + O(q^N));\n"
          "R = sum(n = 1, N - 1, q^n / (1 + q^n) + O(q^N));\n"),
    Shape("sum q^n/(1+(-q)^n) (signed)", "lambert", "check", "sum_{n>=1} q^n/(1+(-q)^n)",
          "sum_{n>=1} q^n/(1+(-q)^n)",
          "L = sum(n = 1, N - 1, q^n / (1 + (-q)^n) + O(q^N));\n"
          "R = sum(n = 1, N - 1, q^n / (1 + (-q)^n) + O(q^N));\n"),
    Shape("two squares (catalogue form)", "squares", "check", "theta_3(q)^2",
          "1 + 4 sum_{n>=0} (q^(4n+1)/(1-q^(4n+1)) - q^(4n+3)/(1-q^(4n+3)))",
          GP_THETA3 + "L = t3^2;\nR = 1 + 4 * sum(n = 0, (N - 1) \\ 4, q^(4*n + 1) / "
          "(1 - q^(4*n + 1)) - q^(4*n + 3) / (1 - q^(4*n + 3)) + O(q^N));\n", "theta4"),
    Shape("four squares (catalogue form)", "squares", "check", "theta_3(q)^4",
          "1 + 8 sum_{n>=1} n q^n/(1 + (-q)^n)",
          GP_THETA3 + "L = t3^4;\n"
          "R = 1 + 8 * sum(n = 1, N - 1, n * q^n / (1 + (-q)^n) + O(q^N));\n", "theta4"),
    Shape("Euler: sum q^n/(q;q)_n = 1/(q;q)_inf", "long", "check", "sum_{n>=0} q^n/(q;q)_n",
          "1/(q;q)_inf",
          "L = 0; t = 1 + O(q^N); for(n = 0, N - 1, L += t; t = t * q / (1 - q^(n + 1)));\n"
          "R = 1 / poch(1, 1, 1);\n", "inv-eta"),
    Shape("q-binomial: sum (-q;q)_n q^n/(q;q)_n", "long", "check",
          "sum_{n>=0} (-q;q)_n q^n/(q;q)_n", "(-q^2;q)_inf/(q;q)_inf",
          "L = 0; t = 1 + O(q^N);\n"
          "for(n = 0, N - 1, L += t; t = t * (1 + q^(n + 1)) * q / (1 - q^(n + 1)));\n"
          "R = poch(-1, 2, 1) / poch(1, 1, 1);\n", "inv-eta"),
    Shape("Andrews-Gordon k=3 double sum", "multisum", "check",
          "sum_{n1>=0} sum_{n2>=0} q^((n1+n2)^2 + n2^2)/((q;q)_n1 (q;q)_n2)",
          "(q^3,q^4,q^7;q^7)_inf/(q;q)_inf",
          gp_multisum(3) + "R = poch(1, 3, 7) * poch(1, 4, 7) * poch(1, 7, 7) / poch(1, 1, 1);\n",
          "inv-eta"),
    Shape("Andrews-Gordon k=4 triple sum", "multisum", "check",
          "sum_{n1>=0} sum_{n2>=0} sum_{n3>=0} q^((n1+n2+n3)^2 + (n2+n3)^2 + n3^2)"
          "/((q;q)_n1 (q;q)_n2 (q;q)_n3)",
          "(q^4,q^5,q^9;q^9)_inf/(q;q)_inf",
          gp_multisum(4) + "R = poch(1, 4, 9) * poch(1, 5, 9) * poch(1, 9, 9) / poch(1, 1, 1);\n",
          "inv-eta"),
    Shape("Capparelli double sum, (q^3;q^3)_j", "multisum", "check",
          "sum_{i>=0} sum_{j>=0} q^(2i^2+6i j+6j^2)/((q;q)_i (q^3;q^3)_j)",
          "(-q^2,-q^4;q^6)_inf (-q^3;q^3)_inf", CAPPARELLI_GP, "inv-eta"),
    Shape("theta_3^4 - theta_4^4 = 16q eta quotient", "theta", "check",
          "theta_3(q)^4 - theta_4(q)^4", "16 q (q^4;q^4)_inf^8/(q^2;q^2)_inf^4",
          GP_THETA3 + "t4 = 1 + 2 * sum(n = 1, sqrtint(N), (-1)^n * q^(n^2)) + O(q^N);\n"
          "L = t3^4 - t4^4;\nR = 16 * q * poch(1, 4, 4)^8 / poch(1, 2, 2)^4;\n", "inv-eta"),
    Shape("(-zq;q)_inf = sum z^n q^(n(n+1)/2)/(q;q)_n", "variable", "check",
          "(-z q;q)_inf", "sum_{n>=0} z^n q^(n(n+1)/2)/(q;q)_n",
          "L = poch(-z, 1, 1);\n"
          "R = sum(n = 0, sqrtint(2 * N), z^n * q^(n * (n + 1) / 2) / prod(j = 1, n, 1 - q^j)"
          " + O(q^N));\n"),
    Shape("product form of the RR sum", "recovery", "product", "sum_{k>=0} q^(k^2)/(q;q)_k",
          "", GP_RR + "D = q * deriv(L) / L;\n"
          "ex = vector(N - 1, n, -sumdiv(n, d, moebius(n / d) * polcoef(D, d)) / n);\n"
          "L = Ser(concat(0, ex), q) + O(q^N); R = L;\n", "inv-eta"),
    Shape("verify: 7 catalogue entries (-j 1)", "verify", "verify", VERIFY_KEYS, "", VERIFY_GP,
          extra=["-j", "1"]),
    Shape("failed check + diagnosis", "diagnose", "check", "1/(q;q)_inf",
          "1/(q;q)_inf + q^(N-3)",
          "L = 1 / poch(1, 1, 1);\nR = L + q^(N - 3);\n"
          "for(n = 0, N - 1, if(polcoef(L - R, n), print(\"MISMATCH \", n); break));\n",
          "inv-eta", holds=False),
]

#: the ``check`` shapes as (name, group, left, right, extra options), for other benchmarks
#: that import the panel (``bench_auto.py`` on main)
SHAPES: list[tuple[str, str, str, str, list[str]]] = [
    (s.name, s.group, s.left, s.right, s.extra) for s in PANEL if s.kind == "check"]

FLINT_FLOOR = r"""
import sys, time, flint
N, what, mode = int(sys.argv[1]), sys.argv[2], sys.argv[3]
t0 = time.perf_counter()
c = [0] * N
if what == "inv-eta":        # the pentagonal series (q;q)_inf, to be inverted
    k = 0
    while k * (3 * k - 1) // 2 < N:
        s = -1 if k % 2 else 1
        c[k * (3 * k - 1) // 2] = s
        if k and k * (3 * k + 1) // 2 < N:
            c[k * (3 * k + 1) // 2] = s
        k += 1
else:                        # theta_3(q), to be raised to the 4th power
    k = 0
    while k * k < N:
        c[k * k] = 2 if k else 1
        k += 1
p = 4611686018427388039
if mode == "exact":
    flint.ctx.cap = N
    f = flint.fmpz_series(c)
    g = 1 / f if what == "inv-eta" else f * f * f * f
else:
    f = flint.nmod_poly([x % p for x in c], p)
    if what == "inv-eta":
        g = f.inverse_series_trunc(N)
    else:
        g = f.mul_low(f, N)
        g = g.mul_low(g, N)
print("TIME", time.perf_counter() - t0)
"""


def run_killing_group(cmd: list[str], *, timeout: float, stdin: str | None = None,
                      env: dict[str, str] | None = None,
                      cwd: str | None = None) -> subprocess.CompletedProcess[str]:
    """``subprocess.run`` in a new process group; past the timeout the whole group is
    killed (a qseries check killed alone leaves its modular worker processes running) and
    TimeoutExpired is raised."""
    proc = subprocess.Popen(cmd, stdin=subprocess.PIPE if stdin is not None else None,
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                            env=env, cwd=cwd, start_new_session=True)
    try:
        out, err = proc.communicate(stdin, timeout=timeout)
    except subprocess.TimeoutExpired:
        os.killpg(proc.pid, signal.SIGKILL)
        proc.communicate()
        raise
    return subprocess.CompletedProcess(cmd, proc.returncode, out, err)


def tree_env(path: str) -> dict[str, str]:
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    env["PYTHONPATH"] = os.path.abspath(path)
    return env


Cell = tuple[float, float | None] | None


#: product recovery: the library call behind ``qseries product``, timed in a fresh process
#: (the command reports no time)
PRODUCT_FORM = r"""
import sys, time, json
from qseries.analysis import product_form
t0 = time.perf_counter()
pf = product_form(sys.argv[1], int(sys.argv[2]))
print(json.dumps({"seconds": time.perf_counter() - t0, "period": pf.period}))
"""


def qseries_cmd(shape: Shape, order: int) -> list[str]:
    right = shape.right.replace("N-3", str(order - 3))
    if shape.kind == "product":
        return ["-c", PRODUCT_FORM, shape.left, str(order)]
    if shape.kind == "verify":
        only = [x for key in shape.left.split() for x in ("--only", key)]
        return ["verify", *only, "-n", str(order), "--json", *shape.extra]
    return ["check", shape.left, right, "-n", str(order), "--json", *shape.extra]


def run_json(tree: str, args: list[str], timeout: float, what: str
             ) -> tuple[float, dict] | None:
    """(wall seconds, the JSON it printed) of ``python -m qseries ARGS`` (or ``python -c``)
    with the qseries of ``tree``; None past the timeout (the whole process group is killed:
    a check killed alone leaves its modular worker processes running); an exit code other
    than 0 or 1 stops the benchmark, naming ``what``."""
    cmd = [sys.executable, *(args if args[0] == "-c" else ["-m", "qseries", *args])]
    t0 = time.perf_counter()
    try:
        # run from the tree itself: ``python -m`` puts the working directory first on the
        # path, which would otherwise shadow PYTHONPATH
        out = run_killing_group(cmd, timeout=timeout, env=tree_env(tree),
                                cwd=os.path.abspath(tree))
    except subprocess.TimeoutExpired:
        return None
    wall = time.perf_counter() - t0
    if out.returncode not in (0, 1):
        raise SystemExit(f"{what} failed: {out.stderr[-400:] or out.stdout[-400:]}")
    return wall, json.loads(out.stdout)


def run_qseries(tree: str, shape: Shape, order: int, timeout: float) -> Cell:
    """(wall seconds, reported seconds or None) of one run, None past the timeout."""
    got = run_json(tree, qseries_cmd(shape, order), timeout, f"{tree}: {shape.name} at {order}")
    if got is None:
        return None
    wall, data = got
    if shape.kind == "check" and data["holds"] is not shape.holds:
        raise SystemExit(f"{tree}: {shape.name} at {order}: holds = {data['holds']}")
    if shape.kind == "verify":
        # (verify may add cross-checks of an entry against an equal family member)
        summary = data["summary"]
        if summary["not_ok"] or summary["errors"] or summary["ok"] < len(shape.left.split()):
            raise SystemExit(f"{tree}: {shape.name} at {order}: {data['summary']}")
        return wall, float(data["summary"]["seconds"])
    return wall, float(data["seconds"])


def run_gp(gp: str, shape: Shape, order: int, timeout: float) -> tuple[Cell, str]:
    """((wall, compute), checksum) of the shape's GP script; checks its own comparison."""
    script = GP_PRELUDE.format(N=order) + shape.gp + GP_EPILOGUE
    t0 = time.perf_counter()
    try:
        out = run_killing_group([gp, "-q", "-s", "4G"], stdin=script, timeout=timeout)
    except subprocess.TimeoutExpired:
        return None, ""
    wall = time.perf_counter() - t0
    if out.returncode != 0 or "***" in out.stdout + out.stderr:
        raise SystemExit(f"gp: {shape.name} at {order} failed: "
                         f"{(out.stderr + out.stdout)[-600:]}")
    got = dict(line.split(None, 1) for line in out.stdout.splitlines() if " " in line)
    if (got.get("EQUAL", "").strip() == "1") is not shape.holds:
        raise SystemExit(f"gp: {shape.name} at {order}: sides equal = {got.get('EQUAL')}")
    return (wall, float(got["TIME"])), got.get("CHECK", "").strip()


#: FLINT floors measured so far, by (floor, mode): [(order, seconds or None past the timeout)]
_FLOORS: dict[tuple[str, str], list[tuple[int, float | None]]] = {}


def run_floor(shape: Shape, order: int, mode: str, timeout: float) -> float | None:
    """FLINT's compute seconds for the floor of the shape, None where none applies or where
    it would exceed the timeout.  Each floor is measured once per order and mode (several
    shapes share one)."""
    if not shape.floor:
        return None
    seen = _FLOORS.setdefault((shape.floor, mode), [])
    for n, t in seen:
        if n == order:
            return t
    done = [(n, t) for n, t in seen if t is not None]
    if len(done) < len(seen) or predicted_over(done, order, timeout, None):
        seen.append((order, None))
        return None
    try:
        out = run_killing_group([sys.executable, "-c", FLINT_FLOOR, str(order), shape.floor,
                                 mode], timeout=timeout)
        t: float | None = float(out.stdout.split()[-1])
    except subprocess.TimeoutExpired:
        t = None
    seen.append((order, t))
    return t


def _poly_at(text: str, z: int) -> int:
    """A coefficient printed by ``qseries expand`` ("2*z^2 - z + 1", "-3", "z^-1") at z."""
    total = 0
    for sign, num, var, exp in re.findall(r"([+-]?)\s*(\d*)\*?(z)?(?:\^(-?\d+))?",
                                          text.replace(" ", "")):
        if not num and not var:
            continue
        c = int(num) if num else 1
        e = (int(exp) if exp else 1) if var else 0
        term = c * z**e if e >= 0 else c * pow(z, e, CHECKSUM_PRIME)
        total += -term if sign == "-" else term
    return total


def qseries_checksum(tree: str, shape: Shape, order: int) -> str:
    """The checksum of the left side (check) or of the exponents (product) by qseries."""
    if shape.kind == "verify":
        return ""
    if shape.kind == "product":
        cmd = ["product", shape.left, "-n", str(order), "--json"]
        out = subprocess.run([sys.executable, "-m", "qseries", *cmd], capture_output=True,
                             text=True, check=False, env=tree_env(tree),
                             cwd=os.path.abspath(tree))
        exps = json.loads(out.stdout)["exponents"]
        return str(sum(e * pow(7, n + 1, CHECKSUM_PRIME) for n, e in enumerate(exps))
                   % CHECKSUM_PRIME)
    out = subprocess.run([sys.executable, "-m", "qseries", "expand", shape.left, "-n",
                          str(order), "--json"], capture_output=True, text=True, check=False,
                         env=tree_env(tree), cwd=os.path.abspath(tree))
    total = 0
    for n, c in json.loads(out.stdout)["terms"]:
        total += _poly_at(str(c), 3) * pow(7, n, CHECKSUM_PRIME)
    return str(total % CHECKSUM_PRIME)


def growth(pts: list[tuple[int, float]]) -> str:
    """The local growth exponent between the two largest orders measured."""
    pts = [(n, t) for n, t in pts if t > 0]
    if len(pts) < 2:
        return "-"
    (n0, t0), (n1, t1) = pts[-2], pts[-1]
    return f"{math.log(t1 / t0) / math.log(n1 / n0):.2f}"


def predicted_over(pts: list[tuple[int, float]], order: int, timeout: float,
                   exponent: float | None) -> bool:
    """Whether the next run is predicted to exceed the timeout (from the last one)."""
    if not pts:
        return False
    if exponent is None:
        e = 1.5
        if len(pts) >= 2 and pts[-2][1] > 0.05:
            e = max(1.0, math.log(pts[-1][1] / pts[-2][1]) / math.log(pts[-1][0] / pts[-2][0]))
    else:
        e = exponent
    n, t = pts[-1]
    return t * (order / n) ** e > 1.5 * timeout


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--orders", default="1000,5000,10000,100000")
    ap.add_argument("--only", default="", help="comma-separated groups (default: all)")
    ap.add_argument("--trees", default=".", help="name=path,... (default: this checkout)")
    ap.add_argument("--timeout", type=float, default=60.0)
    ap.add_argument("--no-gp", action="store_true", help="skip the GP column")
    ap.add_argument("--no-flint", action="store_true", help="skip FLINT's floor")
    ap.add_argument("--markdown", action="store_true",
                    help="also print the results as a Markdown table (for the README)")
    ap.add_argument("--no-checksum", action="store_true",
                    help="skip comparing GP's series with qseries' at the smallest order")
    args = ap.parse_args()
    orders = [int(x) for x in args.orders.split(",")]
    groups = {g for g in args.only.split(",") if g}
    trees = []
    for item in args.trees.split(","):
        name, _, path = item.rpartition("=")
        trees.append((name or path, path))
    gp = None if args.no_gp else shutil.which("gp")
    if gp is None and not args.no_gp:
        print("note: gp (PARI/GP) is not installed; its column is skipped")
    warm = Shape("warm-up", "", "check", "q", "q", "")
    for _, path in trees:
        run_qseries(path, warm, 10, args.timeout)           # warm-up: bytecode caches
    load = os.getloadavg()
    print(f"{time.strftime('%Y-%m-%d %H:%M UTC', time.gmtime())}, {os.cpu_count()} cores, "
          f"load average {load[0]:.2f} {load[1]:.2f} {load[2]:.2f}; timeout {args.timeout:.0f} s")
    print("seconds as wall (with start-up) / reported (qseries) or compute (GP); FLINT: "
          f"compute; {'; '.join(f'{n} = {p}' for n, p in trees)}")
    width = 19
    heads = [n for n, _ in trees] + (["gp"] if gp else [])
    print(f"{'shape':<44} {'order':>7} " + " ".join(f"{n:>{width}}" for n in heads)
          + (f" {'flint ZZ':>9} {'flint p':>9}" if not args.no_flint else "")
          + ("   gp/qs wall, compute" if gp else "")
          + ("   ratio " + "/".join(n for n, _ in trees) if len(trees) > 1 else ""))
    table: list[tuple[Shape, dict[int, list[Cell | str]], dict[int, tuple[float | None, ...]],
                      dict[str, str]]] = []
    for shape in PANEL:
        if groups and shape.group not in groups:
            continue
        times: dict[str, list[tuple[int, float]]] = {n: [] for n in heads}
        rows: dict[int, list[Cell | str]] = {}
        floors: dict[int, tuple[float | None, ...]] = {}
        table.append((shape, rows, floors, {}))
        dead: set[str] = set()
        for order in orders:
            cells: list[Cell | str] = []
            for tname, path in trees:
                if tname in dead or predicted_over(times[tname], order, args.timeout, None):
                    cells.append("skip")
                    dead.add(tname)
                    continue
                got = run_qseries(path, shape, order, args.timeout)
                cells.append(got)
                if got is None:
                    dead.add(tname)
                else:
                    times[tname].append((order, got[1] if got[1] is not None else got[0]))
            if gp:
                if "gp" in dead or predicted_over(times["gp"], order, args.timeout, 2.0):
                    cells.append("skip")
                    dead.add("gp")
                else:
                    got, check = run_gp(gp, shape, order, args.timeout)
                    cells.append(got)
                    if got is None:
                        dead.add("gp")
                    else:
                        times["gp"].append((order, got[1]))
                        if order == orders[0] and not args.no_checksum and check:
                            mine = qseries_checksum(trees[-1][1], shape, order)
                            if mine and mine != check:
                                raise SystemExit(f"{shape.name}: the GP script's series "
                                                 f"differs from qseries' ({check} != {mine})")
            text = " ".join(
                (f">{args.timeout:.0f}" if c is None else c if isinstance(c, str) else
                 f"{c[0]:8.2f}/{'-' if c[1] is None else f'{c[1]:.3f}':<8} ").rjust(width)
                for c in cells)
            rows[order] = cells
            floor = ""
            if not args.no_flint:
                fz = run_floor(shape, order, "exact", args.timeout)
                fp = run_floor(shape, order, "mod", args.timeout)
                floors[order] = (fz, fp)
                floor = " " + " ".join(f"{x:9.3f}" if x is not None else f"{'-':>9}"
                                       for x in (fz, fp))
            ratio = ""
            qs = cells[len(trees) - 1]
            if gp:
                g = cells[-1]
                if isinstance(g, tuple) and isinstance(qs, tuple):
                    comp = (f"{g[1] / max(qs[1], 1e-3):.1f}x" if qs[1] is not None else "-")
                    ratio = f"   {g[0] / qs[0]:.1f}x, {comp}"
                elif isinstance(qs, tuple):
                    ratio = f"   >{args.timeout / qs[0]:.0f}x (gp {g if g else 'timed out'})"
                else:
                    ratio = "   -"
            if len(trees) > 1:
                first = cells[0]
                parts = []
                for c in cells[1:len(trees)]:
                    if isinstance(c, tuple) and isinstance(first, tuple):
                        parts.append(f"{first[0] / c[0]:.1f}x")
                    elif isinstance(c, tuple):
                        parts.append(f">{args.timeout / c[0]:.0f}x")
                    else:
                        parts.append("-")
                ratio += "   " + " ".join(parts)
            print(f"{shape.name:<44} {order:>7} {text}{floor}{ratio}", flush=True)
        print(f"{'':<44} growth exponent (compute, two largest orders): "
              + ", ".join(f"{n} {growth(pts)}" for n, pts in times.items()), flush=True)
        table[-1][3].update({n: growth(pts) for n, pts in times.items()})
    load = os.getloadavg()
    print(f"finished {time.strftime('%H:%M UTC', time.gmtime())}, load average "
          f"{load[0]:.2f} {load[1]:.2f} {load[2]:.2f}")
    if args.markdown:
        markdown(table, orders, trees[-1][0], bool(gp), args.timeout)


def _secs(x: float) -> str:
    return f"{x:.3f}" if x < 0.1 else f"{x:.2f}" if x < 10 else f"{x:.0f}"


def markdown(table: list[tuple[Shape, dict[int, list[Cell | str]],
                               dict[int, tuple[float | None, ...]], dict[str, str]]],
             orders: list[int], tree: str, gp: bool, timeout: float) -> None:
    """The results as one Markdown table: per order, qseries' reported seconds / GP's
    compute seconds (GP / qseries); the wall-time ratios at the two smallest orders; the
    growth exponents; FLINT's floor (exact / modulo p) at the largest order where both were
    measured."""
    def order_name(n: int) -> str:
        return f"10^{round(math.log10(n))}" if 10 ** round(math.log10(n)) == n else str(n)
    small = orders[:2]
    print("\n| shape | " + " | ".join(order_name(n) for n in orders)
          + (" | GP / qs wall at " + ", ".join(order_name(n) for n in small) if gp else "")
          + " | growth qs" + (" / GP" if gp else "") + " | FLINT floor ZZ / p |")
    print("| --- | " + " | ".join("---:" for _ in orders) + (" | ---:" if gp else "")
          + " | ---: | ---: |")
    for shape, rows, floors, grow in table:
        cells, walls = [], []
        for n in orders:
            row = rows.get(n)
            if row is None:
                cells.append("")
                continue
            qs = row[-2] if gp else row[-1]
            g = row[-1] if gp else None
            if not isinstance(qs, tuple):
                text = f">{timeout:.0f}" if qs is None else "skip"
                qsec = None
            else:
                qsec = qs[1] if qs[1] is not None else qs[0]
                text = _secs(qsec) + ("†" if qs[1] is None else "")
            if gp:
                if isinstance(g, tuple):
                    text += f" / {_secs(g[1])}"
                    if qsec:
                        text += f" ({g[1] / max(qsec, 1e-3):.1f}×)"
                    if n in small and isinstance(qs, tuple):
                        walls.append(f"{g[0] / qs[0]:.1f}×")
                else:
                    text += f" / >{timeout:.0f}" if g is None else " / –"
                    if n in small and isinstance(qs, tuple):
                        walls.append(f">{timeout / qs[0]:.0f}×" if g is None else "–")
            cells.append(text)
        # the floor at the largest order where both were measured (else where either was)
        measured = ([(n, f) for n, f in floors.items() if None not in f]
                    or [(n, f) for n, f in floors.items() if f != (None, None)])
        floor = "–"
        if measured:
            n, (fz, fp) = measured[-1]
            floor = (f"{_secs(fz) if fz is not None else '–'} / "
                     f"{_secs(fp) if fp is not None else '–'} at {order_name(n)}")
        g = grow.get(tree, "-") + (f" / {grow.get('gp', '-')}" if gp else "")
        print(f"| {shape.name} | " + " | ".join(cells)
              + (f" | {', '.join(walls)}" if gp else "") + f" | {g} | {floor} |")


if __name__ == "__main__":
    main()
