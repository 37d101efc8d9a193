"""The ``stepping`` strategy for sums: term by term, with the q-Pochhammer symbols whose
subscript is linear in the variable advanced from one term to the next by the few binomials
between their subscripts (all of them in one product), and each term computed only to the
order q^(N - its q-power); the other factors through the product chain.

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> ev = Evaluator(strategies=["stepping"])
>>> ev.evaluate(parse("sum_{n>=0} q^n/(q;q)_n"), 6)
1 + q + 2q^2 + 3q^3 + 5q^4 + 7q^5 + O(q^6)
"""

from __future__ import annotations

from fractions import Fraction
from typing import TYPE_CHECKING

from ..errors import QSeriesError
from ..lang.ast import Poch
from ..products import monomial_parts
from ..series import Series
from . import chains
from . import symbolic as sym
from .termination import NoBound
from .terms import ceil_int, floor_int, times_binomial

if TYPE_CHECKING:
    from .evaluator import Evaluator
    from .sums import SumPlan


def sum_stepping(ev: Evaluator, plan: SumPlan) -> Series:
    """The moving part of the sum (without the constant factors) modulo q^target."""
    from .sums import scalar_factor
    node, ks, env, var, target = plan.node, plan.ks, plan.env, plan.node.var, plan.target
    shifts = plan.shifts
    suffix_min: list[Fraction] = [Fraction(0)] * len(ks)
    running: Fraction | None = None
    for i in range(len(ks) - 1, -1, -1):
        running = shifts[i] if running is None else min(running, shifts[i])
        suffix_min[i] = running
    total = Series.zero(ev.ring, target)
    # the product of the stepping factors, one series advanced by every factor's
    # binomials (one dense product per term would cost a multiplication each)
    state: Series | None = None
    prev_k: int | None = None
    for i, k in enumerate(ks):
        env_k = {**env, var: k}
        # factors are computed to at least q^1 even when the q-power puts the term beyond
        # the order: modulo q^0 or below a factor would lose its valuation (O(q^-3)
        # times O(q^-3) is O(q^-6)), and the sum all its precision
        need = max(target - ceil_int(shifts[i]), 1)
        keep = target - ceil_int(suffix_min[i])
        # advance the stepping products (ratio of consecutive terms: a few binomials)
        if plan.steppable and (state is None or (state.is_zero() and state.is_exact)):
            # the first term, or after an exactly zero product (a factor 1 - 1, as in
            # 1/(q;q)_n for n < 0): no division can step on from 0, so every stepping
            # factor starts again from its value at k (restarting only the one whose turn
            # it was dropped the others, a wrong value the regression tests pin)
            state = Series.constant(1, ev.ring)
            for f, p in plan.steppable:
                first = step(ev, f, p, None, None, k, env, var, keep)
                state = (state * first).truncate(max(keep, 0))
        else:
            for f, p in plan.steppable:
                state = step(ev, f, p, state, prev_k, k, env, var, keep)
        prev_k = k
        # no term is skipped on the strength of its q-power alone: another factor may
        # have a negative valuation (a regression test covers this)
        c = scalar_factor(ev, node, plan.scalars, env_k, plan.sign)
        if c == 0:
            continue
        acc = state.truncate(need) if state is not None else Series.constant(1, ev.ring)
        if plan.dense:
            acc = chains.apply_factors(ev, acc, plan.dense, env_k, need)
        term = (acc * c).shift(shifts[i]) if shifts[i] else acc * c
        total = (total + term).truncate(target)
    return total


def steppable(ev: Evaluator, f: Poch, var: str, env: dict[str, int]) -> bool:
    """Whether the subscript of f is linear in ``var`` with integer coefficients and nothing
    else of f involves ``var``, so that consecutive values differ by a few binomials."""
    if any(var in ev.free(x) for x in (*f.params, f.base)) or f.length is None:
        return False
    try:
        ev._base_step(f, env, 1)        # a base -q^t (from q -> -q) is evaluated directly
    except QSeriesError:
        return False
    try:
        poly = sym.m_to_uni(ev.bounds.poly_of(f.length, {var: 1}, env), var)
    except NoBound:
        return False
    if poly is None:
        return False
    return sym.degree(poly) == 1 and all(c.denominator == 1 for c in poly)


def step(ev: Evaluator, f: Poch, p: int, state: Series | None, prev_k: int | None, k: int,
         env: dict[str, int], var: str, keep: int) -> Series:
    """(params; q^t)_{n(k)}^p from its value at prev_k by multiplying the binomials
    between n(prev_k) and n(k); computed directly the first time."""
    keep = max(keep, 1)     # modulo q^0 the first value could not be inverted
    n_k = ev.integer(f.length, {**env, var: k}, "a subscript")  # type: ignore[arg-type]
    if state is None or prev_k is None:
        return ev._poch_power(f, p, {**env, var: k}, keep)
    if state.is_zero() and state.is_exact:
        return state       # 0 stays 0: the caller restarts every factor at the next term
    n_prev = ev.integer(f.length, {**env, var: prev_k}, "a subscript")  # type: ignore[arg-type]
    t = ev._base_step(f, env, keep)
    acc = state
    # a factor 1 - a q^x changes the state from q^(x + v) on, v its valuation: with the
    # other stepping factors in the state, v can be negative
    vs = state.valuation
    limit = keep - min(floor_int(vs), 0) if vs is not None else keep
    lo, hi0 = sorted((n_prev, n_k))
    grow = n_k > n_prev
    skipped = False
    for param in f.params:
        a = ev._param(param, env, keep)
        mono = monomial_parts(a)
        va = a.valuation
        hi = hi0
        if va is not None and va >= 0:
            # factors 1 - a q^(tj) with val(a) + tj + v >= keep leave the state alone
            # modulo q^keep
            hi = min(hi, max(lo, -((va - limit) // t)))
        skipped = skipped or hi < hi0 or (a.is_zero() and not a.is_exact)
        for j in range(lo, hi):
            # (a;q^t)_{j+1} = (a;q^t)_j (1 - a q^(tj))
            times = p if grow else -p
            acc = times_binomial(acc, a, mono, t * j, times, keep)
    acc = acc.truncate(keep)
    return acc.limit_precision(keep) if skipped else acc
