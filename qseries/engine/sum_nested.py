"""The ``nested`` strategy for sums: a sum whose consecutive terms have a ratio
r_i = c_i q^(d_i) prod (1 - b q^x)^(+-1) (numbers, powers of q, q-Pochhammer symbols with
subscripts linear in the variable) is evaluated from the innermost term outwards,

    sum_i t_i = t_0 (1 + r_1 (1 + r_2 (1 + ... (1 + r_L)))),

each level modulo q^(w - v_i) (v_i the valuation of t_i / t_0, so the precision decreases
inwards), each step a shift, a scalar multiplication and O(N) binomial multiplications or
divisions on the ring's polynomials, with no series objects in between.  It is meant for
sums of about N terms whose binomials' exponents add up to far more than the order (Euler's
sum q^n/(q;q)_n, the q-binomial theorem, Heine-type sums), where binary splitting's tree is
dense and ``stepping`` pays for a series object and an addition of a dense term per term.

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> Evaluator(strategies=["nested"]).evaluate(parse("sum_{n>=0} q^n/(q;q)_n"), 8)
1 + q + 2q^2 + 3q^3 + 5q^4 + 7q^5 + 11q^6 + 15q^7 + O(q^8)
"""

from __future__ import annotations

from fractions import Fraction
from typing import TYPE_CHECKING, Any

from ..errors import QSeriesError
from ..series import QQ, ZZ, Series
from .sum_splitting import consecutive_ratios

if TYPE_CHECKING:
    from .evaluator import Evaluator
    from .sums import SumPlan


def sum_nested(ev: Evaluator, plan: SumPlan) -> Series | None:
    """The sum (with its constant factors) by nested evaluation; None when the terms do not
    have the shape (a ratio that is not c q^d times binomials, a coefficient the ring
    cannot hold as a number)."""
    ring = ev.ring
    if not (ring.int_coefficients or ring is QQ):
        return None            # coefficients in extra variables: stepping handles those
    got = consecutive_ratios(ev, plan.node, plan.ks, plan.env, plan.target, plan.sign,
                             plan.scalars, plan.steppable, plan.shifts)
    if got is None:
        return None
    if isinstance(got, Series):
        return plan.finish(got.limit_precision(plan.target))
    term_a, w, ratios = got
    # v_i: the valuation of t_i / t_0; levels with v_i >= w add nothing modulo q^w
    last = 0
    v = 0
    for i, (d, _, _) in enumerate(ratios, start=1):
        v += d
        if v >= w:
            break
        last = i
    try:
        numbers = [_multiplier(ring, coef) for _, coef, _ in ratios[:last]]
    except (QSeriesError, ArithmeticError, TypeError, ValueError):
        return None
    levels = [0] * (last + 1)          # levels[i] = v_i
    for i in range(1, last + 1):
        levels[i] = levels[i - 1] + ratios[i - 1][0]
    try:
        inner = _nest(ring, ratios, levels, numbers, w, last)
    except (QSeriesError, ArithmeticError, TypeError, ValueError):
        return None            # a binomial's coefficient the ring cannot hold as a number
    nested = Series(ring, ring._truncate(inner, w), 0, 0, w)
    value = (term_a * nested).truncate(plan.target).limit_precision(plan.target)
    return plan.finish(value)


def _nest(ring: Any, ratios: list, levels: list[int], numbers: list, w: int, last: int
          ) -> Any:
    """1 + r_1 (1 + r_2 (... (1 + r_last))) on the ring's polynomials, level i - 1 modulo
    q^(w - levels[i - 1])."""
    one = ring.poly_from_ints([1])
    inner = one
    for i in range(last, 0, -1):
        d, _, binoms = ratios[i - 1]
        n = w - levels[i - 1]           # the precision of level i - 1
        p = ring._shift_up(ring._truncate(inner, n - d), d) if d else ring._truncate(inner, n)
        cc = numbers[i - 1]
        if cc != 1:
            p = p * cc
        for b, x, times in binoms:
            if x >= n:
                continue
            for _ in range(abs(times)):
                p = ring._binomial_mul(p, b, x, n) if times > 0 else \
                    ring._binomial_div(p, b, x, n)
        inner = p + one
    return inner


def _multiplier(ring: Any, c: Fraction) -> Any:
    """c as a scalar the ring's polynomials can be multiplied by (ZZ: an integer only)."""
    if ring is ZZ:
        if c.denominator != 1:
            raise ArithmeticError("a fraction over ZZ")
        return c.numerator
    return ring._multiplier(c)
