"""Products and quotients: a chain of factors node^power, numbers and monomials first (so
the other factors are computed only to the order they matter), then series, binomials
1 - c q^j by the O(N) fast paths, and one inversion for the other denominators, which
``evaluate_parts`` may leave undone.

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> from qseries.engine.terms import factors_of
>>> chain(Evaluator(), factors_of(parse("q^2/(1-q)")), {}, 5)
q^2 + q^3 + q^4 + O(q^5)
"""

from __future__ import annotations

from fractions import Fraction
from typing import TYPE_CHECKING

from ..errors import DomainError, QSeriesError
from ..lang.ast import BigOp, BinOp, Node, Poch, Q
from ..products import monomial_parts
from ..products.pochhammer import euler_log
from ..series import Series
from . import triple_pairs
from .chooser import EXP_QUOTIENT_ORDER
from .terms import Parts, Value, binomial_parts, ceil_int, floor_int, rational_power

if TYPE_CHECKING:
    from .evaluator import Evaluator


def chain(ev: Evaluator, factors: list[tuple[Node, int]], env: dict[str, int], order: int) -> Value:
    """Multiply out factors node^power: numbers and monomials first (so the remaining
    factors are computed only to the order they matter), then series, binomials
    1 - c q^j by the O(N) fast paths, and one inversion for the other denominators."""
    got = chain_parts(ev, factors, env, order)
    return quotient(*got, order) if isinstance(got, tuple) else got


def chain_parts(ev: Evaluator, factors: list[tuple[Node, int]], env: dict[str, int],
                 order: int) -> Value | Parts:
    """``_chain`` with the final inversion left out: a number, a series, or parts."""
    coeff = Fraction(1)
    shift = Fraction(0)
    rest: list[tuple[Node, int]] = []
    any_series = False
    for node, p in factors:
        if not ev.has_q(node):
            v = ev.scalar(node, env)
            if p < 0 and v == 0:
                raise DomainError(f"division by zero at column {getattr(node, 'pos', 0) + 1}",
                                  position=getattr(node, "pos", 0))
            coeff *= rational_power(v, Fraction(p))
        elif isinstance(node, Q) or (isinstance(node, BinOp) and node.op == "^"
                                     and isinstance(node.left, Q)):
            any_series = True
            e = Fraction(1) if isinstance(node, Q) else ev.scalar(node.right, env)
            shift += e * p
        else:
            any_series = True
            rest.append((node, p))
    if not any_series:
        return coeff
    if coeff == 0 and rest == []:
        return Series.zero(ev.ring)
    inner = max(order - ceil_int(shift), 1)
    acc, den = apply_parts(ev, Series.constant(1, ev.ring), rest, env, inner)
    if coeff != 1:
        acc = acc * coeff
    acc = acc.shift(shift).truncate(order) if shift else acc
    return acc if den is None else (acc, den)


def apply_factors(ev: Evaluator, acc: Series, factors: list[tuple[Node, int]], env: dict[str, int],
           order: int) -> Series:
    """acc * prod node^power modulo q^order."""
    return quotient(*apply_parts(ev, acc, factors, env, order), order)


def apply_parts(ev: Evaluator, acc: Series, factors: list[tuple[Node, int]], env: dict[str, int],
                 order: int) -> Parts:
    """acc * prod node^power modulo q^order as a numerator and the product of the
    denominators (None when there are none), which ``quotient`` inverts once."""
    dens: list[Series] = []
    binoms: list[tuple[Fraction | int, int, int]] = []
    factors = product_forms(ev, factors, env)
    together, factors = pochhammer_quotient(ev, factors, env, order)
    if together is not None:
        acc = (acc * together).truncate(order)
    paired, factors = triple_pairs.paired_products(ev, factors, env, order)
    for v, d in paired:
        acc = (acc * v).truncate(order)
        if d is not None:
            dens.append(d)
    for node, p in factors:
        if p == 1 and isinstance(node, BigOp) and not (ev.free(node) & env.keys()):
            got = ev._sum_parts(node, env, order)
            if got is not None:
                acc = (acc * got[0]).truncate(order)
                if got[1] is not None:
                    dens.append(got[1])
                continue
        if p < 0 and isinstance(node, Poch):
            recip = ev._reciprocal_poch(node, env, order)
            if recip is not None:       # 1/(a;q)_n with n < 0 is a numerator
                acc = (acc * (recip if p == -1 else recip.power(-p, order))).truncate(order)
                continue
        v = ev._divisor(node, env, order) if p < 0 else ev.value(node, env, order)
        if not isinstance(v, Series):
            if p < 0 and v == 0:
                raise DomainError(f"division by zero at column {getattr(node, 'pos', 0) + 1}",
                                  position=getattr(node, "pos", 0))
            acc = acc * rational_power(v, Fraction(p))
            continue
        if p < 0 and v.is_zero() and v.is_exact:      # 1/(q - q): the divisor is 0
            raise DomainError(f"division by zero at column {getattr(node, 'pos', 0) + 1}",
                              position=getattr(node, "pos", 0))
        b = binomial_parts(v)
        if b is not None:
            binoms.append((b[0], b[1], p))
        elif p > 0:
            acc = (acc * (v if p == 1 else v.power(p, order))).truncate(order)
        else:
            # known beyond the order by its valuation, as the divisors below
            vd = max(floor_int(v.valuation), 0) if v.valuation is not None else 0
            dens.append(v if p == -1 else v.power(-p, order + vd * (-p - 1)))
    for c, j, p in binoms:
        for _ in range(abs(p)):
            acc = (acc.mul_binomial(c, j, order) if p > 0
                   else acc.div_binomial(c, j, order))
    if not dens:
        return acc.truncate(order), None
    # truncated beyond the order by the divisors' valuations, which dividing gives
    # back (truncating at the order would make divisors of positive valuation vanish)
    work = order + sum(max(floor_int(d.valuation), 0) for d in dens
                       if d.valuation is not None)
    den = dens[0]
    for d in dens[1:]:
        den = (den * d).truncate(work)
    return acc.truncate(order), den

def pochhammer_quotient(ev: Evaluator, factors: list[tuple[Node, int]], env: dict[str, int],
                        order: int) -> tuple[Series | None, list[tuple[Node, int]]]:
    """The infinite q-Pochhammer symbols (c q^e;q^t)_inf^p (one parameter, c = +-1, e >= 1)
    among ``factors`` multiplied together modulo q^order as the exponential of the sum of
    their logarithms (``euler_log``, one ``exp_integral``), with the other factors; (None,
    factors) unless the strategy ``exp-log`` is allowed, the ring is ZZ or QQ, the order is
    at least ``EXP_QUOTIENT_ORDER`` and they form a quotient (powers of both signs): an eta
    quotient's coefficients are small where its denominator's inverse, which the factors
    taken one by one compute, has large ones.

    >>> from qseries.lang import parse
    >>> from qseries.engine import Evaluator
    >>> from qseries.engine.terms import factors_of
    >>> node = parse("(q^2;q^2)_inf^5/((q;q)_inf^2 (q^4;q^4)_inf^2)")      # theta_3(q)
    >>> got, rest = pochhammer_quotient(Evaluator(), factors_of(node), {}, 3000)
    >>> rest, got[:10]
    ([], 1 + 2q + 2q^4 + 2q^9)
    """
    if order < EXP_QUOTIENT_ORDER or "exp-log" not in ev.allowed or \
            ev.ring.modulus is not None or getattr(ev.ring, "names", ()):
        return None, factors
    logs: list[tuple[int, int, int, int]] = []          # (c, e, t, p)
    rest: list[tuple[Node, int]] = []
    for node, p in factors:
        got = _pochhammer_atom(ev, node, env, order) if isinstance(node, Poch) and \
            node.length is None and len(node.params) == 1 else None
        if got is None:
            rest.append((node, p))
        else:
            logs.append((*got, p))
    if not (any(p > 0 for *_, p in logs) and any(p < 0 for *_, p in logs)):
        return None, factors
    s = [0] * order
    for c, e, t, p in logs:
        for k, v in enumerate(euler_log(c, e, t, order)):
            if v:
                s[k] += p * v
    poly = ev.ring._exp_integral(s, order)
    if poly is None:
        return None, factors
    return Series(ev.ring, poly, 0, 0, order), rest


def _pochhammer_atom(ev: Evaluator, node: Poch, env: dict[str, int], order: int
                     ) -> tuple[int, int, int] | None:
    """(c, e, t) for (c q^e;q^t)_inf with c = +-1, e >= 1 and t >= 1 integers, else None."""
    try:
        t = ev._base_step(node, env, order)
        a = ev._param(node.params[0], env, order)
    except QSeriesError:
        return None
    mono = monomial_parts(a)
    if mono is None or mono[0] not in (1, -1) or Fraction(mono[1]).denominator != 1 \
            or mono[1] < 1:
        return None
    return int(mono[0]), int(mono[1]), t


def product_forms(ev: Evaluator, factors: list[tuple[Node, int]], env: dict[str, int]
                  ) -> list[tuple[Node, int]]:
    """The factors with each product over a range of binomials replaced by its
    q-Pochhammer symbols (``Evaluator.product_forms``), so that pairs and one inversion
    apply across them."""
    if not any(isinstance(node, BigOp) and node.kind == "prod" for node, _ in factors):
        return factors
    out: list[tuple[Node, int]] = []
    for node, p in factors:
        forms = ev.product_forms(node, env) if isinstance(node, BigOp) else None
        if forms is None:
            out.append((node, p))
        else:
            out.extend((f, p * e) for f, e in forms)
    return out


def quotient(num: Series, den: Series | None, order: int) -> Series:
    """num / den modulo q^order (den None: num), as from ``evaluate_parts``.

    >>> from qseries.lang import parse
    >>> from qseries.engine import Evaluator
    >>> quotient(*Evaluator().evaluate_parts(parse("1/(q;q)_inf"), 6), 6)
    1 + q + 2q^2 + 3q^3 + 5q^4 + 7q^5 + O(q^6)
    """
    if den is None:
        return num.truncate(order)
    va = num.valuation
    shift_num = int(va) if va is not None else 0
    return (num * den.inverse(order=order - shift_num)).truncate(order)
