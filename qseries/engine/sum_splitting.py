"""The ``splitting`` strategy for sums: binary splitting on the ratio of consecutive terms,
for sums whose factors are numbers, powers of q and q-Pochhammer symbols with subscripts
linear in the variable.

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> ev = Evaluator(strategies=["splitting"])
>>> ev.evaluate(parse("sum_{k>=0} q^(k^2)/(q;q)_k"), 8)
1 + q + q^2 + q^3 + 2q^4 + 2q^5 + 3q^6 + 3q^7 + O(q^8)
"""

from __future__ import annotations

import threading
from collections import OrderedDict
from fractions import Fraction
from typing import TYPE_CHECKING

from ..errors import QSeriesError
from ..lang.ast import BigOp, Node, Poch
from ..products import monomial_parts
from ..series import LaurentPoly, Series
from . import symbolic as sym
from .chooser import SPLIT_DEGREE
from .sum_stepping import step
from .termination import NoBound
from .terms import Parts, ceil_int, floor_int, rational_power

if TYPE_CHECKING:
    from .evaluator import Evaluator
    from .sums import SumPlan


def sum_splitting(ev: Evaluator, plan: SumPlan, parts: bool) -> Series | Parts | None:
    """The sum (with its constant factors) by binary splitting, as (numerator, denominator)
    with ``parts``; None when the terms do not have the shape (or the splitting tree would
    be dense beyond ``SPLIT_DEGREE`` times the order)."""
    target, order = plan.target, plan.order
    split = split_ratio_sum(ev, plan.node, plan.ks, plan.env, target, plan.sign, plan.scalars,
                            plan.steppable, plan.shifts, order if parts else 0)
    if split is None:
        return None
    if isinstance(split, Series):
        return plan.finish(split)
    term_a, top, den, w = split
    if parts:
        num = (term_a * top).truncate(target).limit_precision(target)
        return plan.finish(num), den
    ratio_sum = (top * den.inverse(order=w)).truncate(w).limit_precision(w)
    return plan.finish((term_a * ratio_sum).truncate(target).limit_precision(target))


#: the ratio of consecutive terms t_i / t_(i-1): (d, c, binomials) for
#: c q^d prod (1 - b q^x)^times over the binomials (b, x, times), x >= 1
Ratio = tuple[int, Fraction, list[tuple[Fraction | int | LaurentPoly, int, int]]]


def consecutive_ratios(ev: Evaluator, node: BigOp, ks: list[int], env: dict[str, int],
                       target: int, sign: int, scalars: list[tuple[Node, int]],
                       stepping: list[tuple[Poch, int]], shifts: list[Fraction],
                       den_order: int = 0
                       ) -> Series | tuple[Series, int, list[Ratio]] | None:
    """The first term and the ratios of consecutive terms of a sum whose factors are
    numbers, powers of q and q-Pochhammer symbols with subscripts linear in the variable:
    (term_a, w, ratios) with the sum term_a (1 + r_1 (1 + r_2 (...))) needed modulo q^w
    (w at least ``den_order``), binomials 1 - b q^x with x >= w left out (they are 1
    modulo q^w); the sum itself when it is one term; None when the terms do not have that
    shape.

    The ratios are numbers and exponents, the same in every ring: they are kept for the
    last few sums (``RATIO_CACHE`` entries, keyed by the sum, its range, w and the values
    of the symbols' parameters), so that the modular method's primes, and ``nested`` after
    ``splitting`` gave way, read them once."""
    var = node.var
    steps = []
    for f, p in stepping:
        t = ev._base_step(f, env, 1)
        params = []
        for prm in f.params:
            if not ev.has_q(prm):           # a number c: the factors 1 - c q^(tj)
                params.append((ev.scalar(prm, env), 0))
                continue
            parts = monomial_parts(m) if (m := ev._exact_monomial(prm, env)) else None
            if parts is None or parts[1].denominator != 1:
                return None
            params.append((parts[0], int(parts[1])))
        steps.append((f, t, params, p))
    c0 = _coefficient(ev, var, scalars, env, sign, ks[0])
    if c0 is None:
        return None
    width = max(target - ceil_int(shifts[0]), 1)
    ring = ev.ring
    first = Series.constant(1, ring)
    for f, p in stepping:
        first = (first * step(ev, f, p, None, None, ks[0], env, var, width)).truncate(width)
    if first.is_zero():
        return None
    term_a = (first * c0).shift(shifts[0])
    va = term_a.valuation
    w = target - (floor_int(va) if va is not None else 0)
    if w <= 0:
        if _ratios(ev, node, ks, env, sign, scalars, steps, shifts, w, key=None) is None:
            return None
        return term_a.truncate(target)
    w = max(w, den_order)
    key = _ratio_key(node, ks, env, sign, steps, w)
    ratios = _ratios(ev, node, ks, env, sign, scalars, steps, shifts, w, key)
    if ratios is None:
        return None
    return term_a, w, ratios


#: how many sums' ratios ``consecutive_ratios`` keeps (the most recently used)
RATIO_CACHE = 4
_ratio_cache: OrderedDict[tuple, list[Ratio] | None] = OrderedDict()
_ratio_lock = threading.Lock()


def _ratio_key(node: BigOp, ks: list[int], env: dict[str, int], sign: int, steps: list,
               w: int) -> tuple | None:
    """What the ratios depend on; None (not kept) when a parameter is not a plain number
    (a coefficient in extra variables)."""
    values = []
    for _, t, params, p in steps:
        for c, e in params:
            if isinstance(c, bool) or not isinstance(c, (int, Fraction)):
                return None
            values.append((c, e))
        values.append((t, p))
    return (node, tuple(sorted(env.items())), tuple(ks), sign, w, tuple(values))


def _coefficient(ev: Evaluator, var: str, scalars: list[tuple[Node, int]],
                 env: dict[str, int], sign: int, k: int) -> Fraction | None:
    """The product of the number factors at one value of the variable; None when it is 0."""
    c = Fraction(sign)
    for f, p in scalars:
        v = ev.scalar(f, {**env, var: k})
        if v == 0:
            return None
        c *= rational_power(v, Fraction(p))
    return c


def _ratios(ev: Evaluator, node: BigOp, ks: list[int], env: dict[str, int], sign: int,
            scalars: list[tuple[Node, int]], steps: list, shifts: list[Fraction], w: int,
            key: tuple | None) -> list[Ratio] | None:
    """The ratios of consecutive terms (None: not of the shape), from the cache when kept."""
    if key is not None:
        with _ratio_lock:               # evaluations may run in threads (Dask workers)
            if key in _ratio_cache:
                _ratio_cache.move_to_end(key)
                return _ratio_cache[key]
    got = _compute_ratios(ev, node, ks, env, sign, scalars, steps, shifts, w)
    if key is not None:
        with _ratio_lock:
            _ratio_cache[key] = got
            while len(_ratio_cache) > RATIO_CACHE:
                _ratio_cache.popitem(last=False)
    return got


def _compute_ratios(ev: Evaluator, node: BigOp, ks: list[int], env: dict[str, int],
                    sign: int, scalars: list[tuple[Node, int]], steps: list,
                    shifts: list[Fraction], w: int) -> list[Ratio] | None:
    var = node.var
    coeffs: list[Fraction] = []
    if scalars:
        for k in ks:
            c = _coefficient(ev, var, scalars, env, sign, k)
            if c is None:
                return None
            coeffs.append(c)
    if all(e.denominator == 1 for e in shifts):
        whole = [e.numerator for e in shifts]
        diffs: list = [b - a for a, b in zip(whole, whole[1:], strict=False)]    # ints: no Fraction
    else:
        diffs = [shifts[i] - shifts[i - 1] for i in range(1, len(ks))]
    if any(d < 0 or (isinstance(d, Fraction) and d.denominator != 1) for d in diffs):
        return None
    subscripts = [_integers_at(ev, f.length, var, env, ks)  # type: ignore[arg-type]
                  for f, _, _, _ in steps]
    ratios: list[Ratio] = []
    one = Fraction(1)
    for i in range(1, len(ks)):
        coef = coeffs[i] / coeffs[i - 1] if scalars else one
        binoms: list[tuple[Fraction | int | LaurentPoly, int, int]] = []
        for (_, t, params, p), ns in zip(steps, subscripts, strict=True):
            lo, hi = sorted((ns[i - 1], ns[i]))
            times = p if ns[i] > ns[i - 1] else -p
            for c, e in params:
                # factors 1 - c q^x with x >= w are 1 modulo q^w
                top = hi if e < 0 else min(hi, max(lo, -((e - w) // t)))
                for j in range(lo, top):
                    x = e + t * j
                    if x < 0:
                        return None
                    if x == 0:
                        if c == 1 or isinstance(c, LaurentPoly):
                            return None
                        coef = coef * rational_power(Fraction(1 - Fraction(c)),
                                                     Fraction(times))
                        continue
                    binoms.append((c, x, times))
        ratios.append((int(diffs[i - 1]), coef, binoms))
    return ratios


def _integers_at(ev: Evaluator, node: Node, var: str, env: dict[str, int], ks: list[int]
                 ) -> list[int]:
    """The integer value of ``node`` at each k of ``ks``: from its polynomial in the
    variable when that has integer coefficients (read once), else one evaluation per k."""
    try:
        poly = sym.m_to_uni(ev.bounds.poly_of(node, {var: 1}, env), var)
    except (NoBound, QSeriesError):
        poly = None
    values = None if poly is None else sym.integer_values(poly, ks)
    if values is not None:
        return values
    return [ev.integer(node, {**env, var: k}, "a subscript") for k in ks]


def split_ratio_sum(ev: Evaluator, node: BigOp, ks: list[int], env: dict[str, int],
                    target: int, sign: int, scalars: list[tuple[Node, int]],
                    stepping: list[tuple[Poch, int]], shifts: list[Fraction],
                    den_order: int = 0
                    ) -> Series | tuple[Series, Series, Series, int] | None:
    """Binary splitting for a sum whose consecutive terms have a ratio P(k)/Q(k) of
    polynomials (a power of q, a number, binomials 1 - c q^j): with
    P(l,r), Q(l,r) the products over [l, r) and T(l,r) = T(l,m) Q(m,r) + P(l,m) T(m,r),
    the sum is term_a (Q + T)/Q over the whole range, in O(M(N) log K) instead of
    K divisions by binomials.  Returns (term_a, Q + T, Q, w) with Q + T and Q known
    modulo q^w, w at least ``den_order``; the sum itself when it is one term; None when
    the terms do not have that shape (the caller then steps term by term)."""
    got = consecutive_ratios(ev, node, ks, env, target, sign, scalars, stepping, shifts,
                             den_order)
    if got is None or isinstance(got, Series):
        return got
    term_a, w, ratios = got
    ring = ev.ring
    one = Series.constant(1, ring)
    # the splitting tree holds polynomials of total degree up to the sum of the
    # binomials' exponents: far beyond the order (a sum of about N terms such as
    # sum q^n/(q;q)_n) every node is a dense length-N product, and the nested evaluation
    # (``sum_nested``) or term-by-term stepping is cheaper
    budget = SPLIT_DEGREE * w
    if sum(x * abs(times) for _, _, binoms in ratios for _, x, times in binoms) > budget:
        return None
    num: list[Series] = []
    den: list[Series] = []
    for d, coef, binoms in ratios:
        pn = one.shift(d).truncate(w) * coef
        qd = one
        for c, x, times in binoms:
            for _ in range(abs(times)):
                if times > 0:
                    pn = pn.mul_binomial(c, x, w)
                else:
                    qd = qd.mul_binomial(c, x, w)
        num.append(pn.truncate(w))
        den.append(qd.truncate(w))

    def split(lo: int, hi: int) -> tuple[Series, Series, Series]:
        if hi - lo == 1:
            return num[lo], den[lo], num[lo]
        mid = (lo + hi) // 2
        p1, q1, t1 = split(lo, mid)
        p2, q2, t2 = split(mid, hi)
        return (p1.mul_trunc(p2, w), q1.mul_trunc(q2, w),
                (t1.mul_trunc(q2, w) + p1.mul_trunc(t2, w)).truncate(w))

    _, qq, tt = split(0, len(num))
    return term_a, (qq + tt).truncate(w), qq, w
