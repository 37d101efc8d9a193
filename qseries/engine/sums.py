"""A sum over a range of its variable: the terms' shape (a ``SumPlan``) and the strategies
tried on it in the chooser's order of preference.

The term of ``sum_k T`` is split into factors: constant ones (computed once), numbers, powers
of q (the term's shift q^(e_k)), q-Pochhammer symbols whose subscript steps linearly with k
(``steppable``), and the rest (``dense``).  Each strategy returns the sum (or None when the
shape does not suit it after all, and the next one is tried):

- ``monomials`` (``sum_monomials``): every term c q^e, added into one coefficient list;
- ``splitting`` (``sum_splitting``): binary splitting on the ratio of consecutive terms;
- ``nested`` (``sum_nested``): the same ratios from the innermost term outwards, for long
  sums where the splitting tree would be dense;
- ``lambert`` (``sum_lambert``): sparse terms c q^s num/(1 - c' q^j)^p;
- ``stepping`` (``sum_stepping``): term by term, the q-Pochhammer symbols advanced by the
  ratio of consecutive values;
- ``direct`` (``sum_direct``): the reference, every term from scratch through the walk.

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> node = parse("sum_{k>=0} q^(k^2)/(q;q)_k")
>>> sum_value(Evaluator(), node, [0, 1, 2], {}, 8, cut=True)
1 + q + q^2 + q^3 + 2q^4 + 2q^5 + 3q^6 + 3q^7 + O(q^8)
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from typing import TYPE_CHECKING

from ..errors import DomainError, QSeriesError
from ..lang.ast import BigOp, BinOp, Neg, Node, Poch, Q
from ..series import Series
from . import chains, chooser
from . import symbolic as sym
from .sum_chain import nest_levels, sum_chain
from .sum_direct import sum_direct
from .sum_lambert import sum_lambert
from .sum_monomials import sum_monomials
from .sum_nested import sum_nested
from .sum_splitting import sum_splitting
from .sum_stepping import steppable, sum_stepping
from .termination import NoBound
from .terms import Parts, Value, floor_int, is_q_power, label, rational_power, signed_factors

if TYPE_CHECKING:
    from .evaluator import Evaluator


@dataclass
class SumPlan:
    """The shape of the terms of a sum over ``ks`` (see the module docstring)."""

    node: BigOp
    ks: list[int]
    env: dict[str, int]
    order: int
    sign: int
    #: the product of the factors free of the variable (computed once)
    const: Value
    #: the order the moving part is needed to: order minus the constant part's valuation
    target: int
    scalars: list[tuple[Node, int]]
    steppable: list[tuple[Poch, int]]
    dense: list[tuple[Node, int]]
    #: the exponent of the q-power factors at each k
    shifts: list[Fraction]

    def finish(self, moving: Series) -> Series:
        """The sum from its moving part: times the constant factors, modulo q^order."""
        return (moving * self.const).truncate(self.order)


def scalar_factor(ev: Evaluator, node: BigOp, scalars: list[tuple[Node, int]],
                  env_k: dict[str, int], sign: int) -> Fraction:
    """sign times the product of the factors free of q at one value of the variable."""
    c = Fraction(sign)
    for f, p in scalars:
        v = ev.scalar(f, env_k)
        if v == 0 and p < 0:
            raise DomainError(f"division by zero in {label(node)} at {node.var} = "
                              f"{env_k[node.var]}")
        c *= rational_power(v, Fraction(p))
    return c


def plan_sum(ev: Evaluator, node: BigOp, ks: list[int], env: dict[str, int],
             order: int) -> SumPlan | None:
    """The plan of a sum over a non-empty ``ks``; None when its constant factors are
    exactly 0."""
    var = node.var
    sign, factors = signed_factors(node.body)
    const_f = [(f, p) for f, p in factors if var not in ev.free(f)]
    moving = [(f, p) for f, p in factors if var in ev.free(f)]
    const = chains.chain(ev, const_f, env, order) if const_f else Fraction(1)
    if isinstance(const, Series) and const.is_zero() and const.is_exact:
        return None
    vconst = 0
    if isinstance(const, Series):
        vv = const.valuation
        vconst = floor_int(vv) if vv is not None else 0
    scalars = [(f, p) for f, p in moving if not ev.has_q(f)]
    monos = [(f, p) for f, p in moving if ev.has_q(f) and is_q_power(f)]
    stepping: list[tuple[Poch, int]] = []
    dense: list[tuple[Node, int]] = []
    for f, p in moving:
        if not ev.has_q(f) or is_q_power(f):
            continue
        if isinstance(f, Poch) and steppable(ev, f, var, env):
            stepping.append((f, p))
        else:
            dense.append((f, p))
    shifts = _shifts(ev, monos, ks, var, env)
    return SumPlan(node, ks, env, order, sign, const, order - vconst, scalars, stepping,
                   dense, shifts)


def _shifts(ev: Evaluator, monos: list[tuple[Node, int]], ks: list[int], var: str,
            env: dict[str, int]) -> list[Fraction]:
    """The exponent of the q-power factors at each k: from one polynomial in k when the
    exponents are polynomials (read once), else by evaluating them at each k."""
    total: sym.Poly | None = ()
    for f, p in monos:
        if total is None:
            break
        if isinstance(f, Q):
            total = sym.padd(total, sym.const(p))
            continue
        try:
            poly = sym.m_to_uni(ev.bounds.poly_of(f.right, {var: 1}, env), var)  # type: ignore[attr-defined]
        except (NoBound, QSeriesError):
            poly = None
        total = None if poly is None else sym.padd(total, sym.pscale(poly, Fraction(p)))
    if total is not None:
        values = sym.integer_values(total, ks)
        if values is not None:
            return [Fraction(v) for v in values]
        return [sym.peval(total, k) for k in ks]
    shifts: list[Fraction] = []
    for k in ks:
        e = Fraction(0)
        env_k = {**env, var: k}
        for f, p in monos:
            e += p * (Fraction(1) if isinstance(f, Q) else ev.scalar(f.right, env_k))  # type: ignore[attr-defined]
        shifts.append(e)
    return shifts


def chain_shaped(ev: Evaluator, node: BigOp) -> bool:
    """Whether ``node`` is a nest of sums that the chooser gives to the ``chain`` strategy
    first (it may still decline on a closer look).

    >>> from qseries.lang import parse
    >>> from qseries.engine import Evaluator
    >>> chain_shaped(Evaluator(), parse("sum_{i>=0} sum_{j>=0} q^(i^2+j^2)"))
    True
    >>> chain_shaped(Evaluator(strategies=["direct"]), parse("sum_{i>=0} sum_{j>=0} q^(i+j)"))
    False
    """
    if "chain" not in ev.allowed or not isinstance(node.body, (BigOp, BinOp, Neg)):
        return False
    got = nest_levels(ev, node)
    return got is not None and chooser.use_chain(ev.allowed, len(got[0]))


def nest_value(ev: Evaluator, node: BigOp, env: dict[str, int], order: int) -> Series | None:
    """A nest of sums as a whole by the ``chain`` strategy (``sum_chain``) when the chooser
    takes it and the nest has its shape; else None (the outermost sum is then summed term
    by term).

    >>> from qseries.lang import parse
    >>> from qseries.engine import Evaluator
    >>> nest_value(Evaluator(), parse("sum_{i>=0} sum_{j>=i} q^(i+j)"), {}, 5)
    1 + q + 2q^2 + 2q^3 + 3q^4 + O(q^5)
    """
    return sum_chain(ev, node, env, order) if chain_shaped(ev, node) else None


def sum_value(ev: Evaluator, node: BigOp, ks: list[int], env: dict[str, int], order: int,
              parts: bool = False, cut: bool = False) -> Series | Parts:
    """The sum over ``ks`` modulo q^order; with ``parts``, as (numerator, denominator) where
    binary splitting applies.  ``cut``: terms of valuation >= order were left out, so the
    sum is known modulo q^order only (the numerator likewise: the denominator is a unit)."""
    got = _sum_known(ev, node, ks, env, order, parts)
    if not cut:
        return got
    if isinstance(got, tuple):
        return got[0].limit_precision(order), got[1]
    return got.limit_precision(order)


def _sum_known(ev: Evaluator, node: BigOp, ks: list[int], env: dict[str, int], order: int,
               parts: bool) -> Series | Parts:
    ev._count_terms(node, len(ks))
    if not ks:
        return Series.zero(ev.ring)
    plan = plan_sum(ev, node, ks, env, order)
    if plan is None:
        return Series.zero(ev.ring)
    names = chooser.sum_strategies(
        ev.allowed,
        monomials=not plan.steppable and not plan.dense and
        all(e.denominator == 1 for e in plan.shifts),
        steppable_only=not plan.dense,
        lambert_shape=ev.ring.int_coefficients and not plan.steppable and bool(plan.dense),
        terms=len(ks))
    for name in names:
        if name == "monomials":
            return plan.finish(sum_monomials(ev, plan))
        if name == "splitting":
            got = sum_splitting(ev, plan, parts)
            if got is not None:
                return got
        elif name == "nested":
            got = sum_nested(ev, plan)
            if got is not None:
                return got
        elif name == "lambert":
            return plan.finish(sum_lambert(ev, plan))
        elif name == "stepping":
            return plan.finish(sum_stepping(ev, plan))
    return sum_direct(ev, plan)
