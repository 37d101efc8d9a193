"""The ``lambert`` strategy for sums: terms c q^s num(q) / (1 - c' q^j)^p with a sparse
numerator (Lambert-type series) are added into one list of Python ints in O(N/j) each,
over rings with integer coefficients (ZZ, GF(p)); other terms are computed densely.

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> ev = Evaluator(strategies=["lambert"])
>>> ev.evaluate(parse("sum_{n>=1} q^n/(1-q^n)"), 8)      # the number of divisors
q + 2q^2 + 2q^3 + 3q^4 + 2q^5 + 4q^6 + 2q^7 + O(q^8)
"""

from __future__ import annotations

from fractions import Fraction
from typing import TYPE_CHECKING

from ..errors import QSeriesError
from ..lang.ast import BinOp, Node
from ..series import ZZ, Series
from . import chains

if TYPE_CHECKING:
    from .evaluator import Evaluator
    from .sums import SumPlan


def sum_lambert(ev: Evaluator, plan: SumPlan) -> Series:
    """The moving part of the sum modulo q^target (no stepping factors in the plan)."""
    from .sums import scalar_factor
    node, env, var, target = plan.node, plan.env, plan.node.var, plan.target
    total = Series.zero(ev.ring, target)
    sparse: list[int] | None = None
    for k, shift in zip(plan.ks, plan.shifts, strict=True):
        env_k = {**env, var: k}
        c = scalar_factor(ev, node, plan.scalars, env_k, plan.sign)
        if c == 0:
            continue
        if shift.denominator == 1 and 0 <= shift < target:
            geo = geometric_term(ev, plan.dense, env_k, c)
            if geo is not None:
                if sparse is None:
                    sparse = [0] * target
                add_geometric(sparse, int(shift), *geo, ev.ring.modulus)
                continue
        # as in the stepping strategy: at least to q^1, else the term loses its valuation
        need = max(target - (-(-shift.numerator // shift.denominator)), 1)
        acc = chains.apply_factors(ev, Series.constant(1, ev.ring), plan.dense, env_k, need)
        term = (acc * c).shift(shift) if shift else acc * c
        total = (total + term).truncate(target)
    if sparse is not None:
        total = total + Series(ev.ring, ev.ring.poly_from_ints(sparse), 0, 0, target)
    return total


def geometric_term(ev: Evaluator, direct: list[tuple[Node, int]], env: dict[str, int],
                    c: Fraction) -> tuple[int, dict[int, int], int, int, int] | None:
    """For a term c * prod node^p whose factors are all binomials a + b q^e (e >= 1) with
    at most one in the denominator: (coefficient, sparse numerator {exponent: coeff},
    c', j, p) with the term c * numerator / (1 - c' q^j)^p, every number an int of the
    ring; None otherwise (the term is then computed as a dense series)."""
    scale = c
    num: dict[int, Fraction] = {0: Fraction(1)}
    den: tuple[Fraction, int, int] | None = None
    for node, p in direct:
        b = binomial_node(ev, node, env)
        if b is None:
            return None
        a, cb, e = b
        scale = scale / a ** -p if p < 0 else scale * a ** p
        if p < 0:
            if den is not None:
                return None
            den = (cb, e, -p)
            continue
        for _ in range(p):
            nxt: dict[int, Fraction] = {}
            for x, v in num.items():
                nxt[x] = nxt.get(x, Fraction(0)) + v
                nxt[x + e] = nxt.get(x + e, Fraction(0)) - cb * v
            num = {x: v for x, v in nxt.items() if v}
            if len(num) > 64:
                return None
    cden, j, p = den if den is not None else (Fraction(0), 1, 1)
    ints = [ring_int(ev, x) for x in (scale, cden, *num.values())]
    if any(x is None for x in ints):
        return None
    return (ints[0], dict(zip(num, ints[2:], strict=True)),  # type: ignore[arg-type]
            ints[1], j, p)  # type: ignore[return-value]


def ring_int(ev: Evaluator, x: Fraction | int) -> int | None:
    """x as a Python int of a ring with int coefficients (None: not representable)."""
    if isinstance(x, int):
        return x
    if x.denominator == 1:
        return x.numerator
    if ev.ring is ZZ:
        return None
    try:
        return int(ev.ring.coerce(x))
    except QSeriesError:
        return None


def binomial_node(ev: Evaluator, node: Node, env: dict[str, int]
                   ) -> tuple[Fraction, Fraction, int] | None:
    """(a, c', e) when node is written a + b q^e or b q^e + a (a != 0, e >= 1 an integer),
    that is a (1 - c' q^e) with c' = -b/a; else None."""
    if not (isinstance(node, BinOp) and node.op in "+-"):
        return None
    left, right = node.left, node.right
    sign = 1 if node.op == "+" else -1
    for const_node, mono_node, s_const, s_mono in ((left, right, 1, sign),
                                                   (right, left, sign, 1)):
        if ev.has_q(const_node) or not ev.has_q(mono_node):
            continue
        parts = ev._monomial_of(mono_node, env)
        if parts is None or parts[1].denominator != 1 or parts[1] < 1 or parts[0] == 0:
            return None
        a = s_const * ev.scalar(const_node, env)
        if a == 0:
            return None
        return a, -s_mono * parts[0] / a, int(parts[1])
    return None


def add_geometric(acc: list[int], shift: int, coeff: int, num: dict[int, int], c: int,
                   j: int, p: int, modulus: int | None = None) -> None:
    """acc += coeff q^shift num(q) / (1 - c q^j)^p below len(acc), in O(len(acc)/j) per
    numerator term: (1 - c x)^-p = sum_m binomial(m + p - 1, p - 1) c^m x^m (the factors
    reduced modulo ``modulus`` when there is one).

    >>> acc = [0] * 8
    >>> add_geometric(acc, 1, 2, {0: 1}, -1, 3, 1)     # 2q/(1 + q^3)
    >>> acc
    [0, 2, 0, 0, -2, 0, 0, 2]
    """
    n = len(acc)
    for x, v in num.items():
        start = shift + x
        w = coeff * v
        if start >= n or w == 0:
            continue
        if p == 1 and c == 1:
            acc[start::j] = [a + w for a in acc[start::j]]
        elif p == 1 and c == -1:
            acc[start::2 * j] = [a + w for a in acc[start::2 * j]]
            acc[start + j::2 * j] = [a - w for a in acc[start + j::2 * j]]
        elif c == 0:
            acc[start] += w
        else:
            m, factor = 0, 1       # factor = binomial(m + p - 1, p - 1) c^m
            for e in range(start, n, j):
                acc[e] += w * factor
                m += 1
                factor = factor * c * (m + p - 1) // m
                if modulus is not None:
                    factor %= modulus
    return None
