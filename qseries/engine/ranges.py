"""Which values of a sum's (product's) variable can matter modulo q^N, from the valuation
bounds of ``termination``; and sums and products of numbers alone.

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> term_range(Evaluator(), parse("sum_{k>=0} q^(k^2)"), {}, 10, False)
([0, 1, 2, 3], True)
"""

from __future__ import annotations

from fractions import Fraction
from typing import TYPE_CHECKING

from ..errors import DomainError, UnableError, weight_may_help
from ..lang.ast import BigOp
from ..lang.printer import show
from . import symbolic as sym
from .chooser import FALLBACK_RANGE, SPLIT_RANGE
from .termination import NoBound
from .terms import MAX_BITS, factors_of, fraction_text, label, poly_text

if TYPE_CHECKING:
    from .evaluator import Evaluator

#: most terms (or factors) a single sum (or product) may evaluate
MAX_TERMS = 1_000_000
#: most terms a sum or product of numbers alone may have (each is a walk of its body), and
#: most bit operations its running value may cost (sum of its sizes over the terms)
MAX_NUMBER_TERMS = 20_000
MAX_NUMBER_WORK = 200_000_000


def term_range(ev: Evaluator, node: BigOp, env: dict[str, int], order: int,
           deviation: bool) -> tuple[list[int], bool]:
    """The values of the bound variable whose terms can matter modulo q^order, and
    whether terms were left out: infinite directions (and finite ones longer than
    SPLIT_RANGE) end where the valuation analysis shows that every further term (factor
    minus 1) vanishes modulo q^order.  A result computed from a cut range is known only
    modulo q^order, however short it is: the caller must not mark it exact."""
    lo = None if node.lower is None else ev.integer(node.lower, env, "a lower limit")
    hi = None if node.upper is None else ev.integer(node.upper, env, "an upper limit")
    if lo is not None and hi is not None:
        if hi < lo:
            return [], False
        if hi - lo + 1 <= SPLIT_RANGE:
            return list(range(lo, hi + 1)), False
        try:
            return cut_range(ev, node, env, order, deviation, lo, hi)
        except (UnableError, DomainError) as why:
            # a finite range: terms that do not shrink are no error, just no shortcut
            if hi - lo + 1 <= FALLBACK_RANGE:
                return list(range(lo, hi + 1)), False
            raise UnableError(f"{label(node)} has {hi - lo + 1} terms, more than "
                              f"{FALLBACK_RANGE} that can be evaluated one by one, and the "
                              f"valuation analysis cannot cut the range: {why}") from None
    return cut_range(ev, node, env, order, deviation, lo, hi)


def cut_range(ev: Evaluator, node: BigOp, env: dict[str, int], order: int, deviation: bool,
               lo: int | None, hi: int | None) -> tuple[list[int], bool]:
    pieces: list[tuple[int, int]] = []      # inclusive ranges, in increasing order
    cut = False                             # whether a term that may be nonzero is left out
    if lo is None or lo < 0:                # the part k <= -1, as m = -k >= 1
        top = -1 if hi is None else min(hi, -1)
        if lo is None or top - lo + 1 > SPLIT_RANGE:
            stop_m, ones = cutoff(ev, node, env, order, -1, -top, deviation)
            first = -(stop_m - 1) if lo is None else max(lo, -(stop_m - 1))
            cut = cut or (not ones and (lo is None or first > lo))
        else:
            first = lo
        if first <= top:
            pieces.append((first, top))
    if hi is None or hi >= 0:               # the part k >= 0
        start = 0 if lo is None else max(lo, 0)
        if hi is None or hi - start + 1 > SPLIT_RANGE:
            stop, ones = cutoff(ev, node, env, order, +1, start, deviation)
            last = stop - 1 if hi is None else min(hi, stop - 1)
            cut = cut or (not ones and (hi is None or last < hi))
        else:
            last = hi
        if start <= last:
            pieces.append((start, last))
    count = sum(b - a + 1 for a, b in pieces)
    if count > MAX_TERMS:
        raise UnableError(f"{label(node)} needs {count} terms at this order; the limit "
                          f"is {MAX_TERMS}")
    return [k for a, b in pieces for k in range(a, b + 1)], cut


def runaway_factors(ev: Evaluator, node: BigOp) -> str:
    """For a product whose body has factors free of its index (``prod_{n>=1} (1-q^n)^(-1)
    (q^2;q^5)_inf``: the body runs to the next + or -, so the second factor is repeated for
    every n), a sentence saying so; else ''.

    >>> from qseries.lang import parse
    >>> from qseries.engine import Evaluator
    >>> runaway_factors(Evaluator(), parse("prod_{n>=1} (1-q^n) (q;q^5)_inf"))[:46]
    '; its body is everything up to the next + or -'
    """
    if node.kind != "prod":
        return ""
    free = [f for f, _ in factors_of(node.body)
            if node.var not in ev.free(f) and ev.has_q(f)]
    if not free:
        return ""
    shown = ", ".join(show(f) for f in free[:3])
    return (f"; its body is everything up to the next + or -, so {shown} (free of "
            f"{node.var}) is a factor of every term: to multiply by it once, write "
            f"(prod_{{...}} ...) {shown}")


def cutoff(ev: Evaluator, node: BigOp, env: dict[str, int], order: int, sign: int, start: int,
            deviation: bool) -> tuple[int, bool]:
    """First m >= start (k = sign*m) from which every term has valuation >= order, and
    whether the terms (factors) from there on are exactly 0 (exactly 1), not just small."""
    try:
        return _cutoff(ev, node, env, order, sign, start, deviation)
    except (UnableError, DomainError) as err:
        hint = runaway_factors(ev, node)
        if hint:
            err.args = (str(err) + hint, *err.args[1:])    # the same error, told why
        raise


def _cutoff(ev: Evaluator, node: BigOp, env: dict[str, int], order: int, sign: int,
            start: int, deviation: bool) -> tuple[int, bool]:
    name = label(node)
    what = "factor minus 1" if deviation else "term"
    var = node.var
    try:
        if deviation:
            b = ev.bounds.deviation(node.body, var, {var: sign}, env, order)
        else:
            b = ev.bounds.lower(node.body, var, {var: sign}, env, order)
        if b is None:  # every factor is exactly 1
            return start, True
        poly = sym.m_to_uni(b.poly, var)
        if poly is None:
            raise NoBound("the bound involves the variables of inner sums")
    except NoBound as why:
        raise weight_may_help(UnableError(
            f"cannot show that {name} converges as a formal power series ({why}); give "
            f"finite limits")) from None
    if sym.degree(poly) < 1 or sym.leading(poly) <= 0:
        shown = sym.peval(poly, 0)
        if b.exact and sym.degree(poly) < 1:
            raise weight_may_help(DomainError(
                f"{name} does not converge as a formal power series: the valuation of "
                f"its {var}-th {what} stays at {fraction_text(shown)} (it does not grow with "
                f"{var})"))
        if b.exact:
            raise weight_may_help(DomainError(
                f"{name} does not converge as a formal power series: the valuation of "
                f"its {var}-th {what} is {poly_text(poly, var, sign)}, which does not "
                f"grow" + (f" as {var} runs to -inf" if sign < 0 else "")))
        raise weight_may_help(UnableError(
            f"cannot show that {name} converges as a formal power series: the valuation "
            f"of its {var}-th {what} is only known to be at least "
            f"{poly_text(poly, var, sign)}"))
    m = sym.eventually_at_least(poly, order, max(start, b.start, 0))
    return max(m, start), False


def numbers(ev: Evaluator, node: BigOp, env: dict[str, int]) -> Fraction:
    """A sum or product of numbers over a finite range."""
    what = "adds" if node.kind == "sum" else "multiplies"
    if node.lower is None or node.upper is None:
        raise DomainError(f"{label(node)} {what} infinitely many numbers; it has no "
                          f"meaning as a formal power series")
    lo = ev.integer(node.lower, env, "a lower limit")
    hi = ev.integer(node.upper, env, "an upper limit")
    if hi - lo + 1 > MAX_NUMBER_TERMS:
        raise UnableError(f"{label(node)} has {hi - lo + 1} terms; a sum or product of "
                          f"numbers may have at most {MAX_NUMBER_TERMS}")
    total = Fraction(0 if node.kind == "sum" else 1)
    work = 0
    for k in range(lo, hi + 1):
        v = ev.scalar(node.body, {**env, node.var: k})
        total = total + v if node.kind == "sum" else total * v
        bits = total.numerator.bit_length() + total.denominator.bit_length()
        work += bits
        if bits > 2 * MAX_BITS or work > MAX_NUMBER_WORK:
            raise UnableError(f"the number {label(node)} is too large to compute (its "
                              f"value has {bits} bits at {node.var} = {k})")
    return total
