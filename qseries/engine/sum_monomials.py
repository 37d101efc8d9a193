"""The ``monomials`` strategy for sums: every term is c_k q^(e_k) with integer e_k, added
into one list of coefficients (one dense addition per term would cost the whole span each
time).

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> Evaluator().evaluate(parse("sum_{k>=0} q^(k^2-4k)"), 2)
q^-4 + 2q^-3 + 2 + O(q^2)
"""

from __future__ import annotations

from fractions import Fraction
from typing import TYPE_CHECKING

from ..errors import UnableError
from ..series import MAX_LENGTH, QQ, ZZ, Series
from .terms import label

if TYPE_CHECKING:
    from .evaluator import Evaluator
    from .sums import SumPlan


def sum_monomials(ev: Evaluator, plan: SumPlan) -> Series:
    """The moving part of the sum modulo q^target, every term c_k q^(e_k) with e_k an
    integer and c_k the product of the number factors."""
    from .sums import scalar_factor
    node, target = plan.node, plan.target
    coeffs: dict[int, Fraction] = {}
    for k, e in zip(plan.ks, plan.shifts, strict=True):
        if e >= target:
            continue
        c = scalar_factor(ev, node, plan.scalars, {**plan.env, node.var: k}, plan.sign)
        coeffs[int(e)] = coeffs.get(int(e), Fraction(0)) + c
    low = min(coeffs, default=target)
    if target - low > MAX_LENGTH:
        raise UnableError(f"{label(node)} spans {target - low} coefficients, beyond the "
                          f"limit {MAX_LENGTH}")
    nums = [coeffs.get(e, 0) for e in range(low, target)]
    ring = ev.ring
    if ring is ZZ and any(c.denominator != 1 for c in coeffs.values()):
        ring = QQ
    return Series.from_coefficients(nums, ring, start=low, prec=target)
