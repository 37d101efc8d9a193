"""The ``direct`` reference for sums: every term from scratch through the evaluator's walk,
to the full order, added one by one.  It shares none of the other strategies' shortcuts
(no stepping, no splitting, no sparse terms) so that they can be tested against it.

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> Evaluator(strategies=["direct"]).evaluate(parse("sum_{k>=0} q^(k^2)/(q;q)_k"), 8)
1 + q + q^2 + q^3 + 2q^4 + 2q^5 + 3q^6 + 3q^7 + O(q^8)
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from ..series import Series

if TYPE_CHECKING:
    from .evaluator import Evaluator
    from .sums import SumPlan


def sum_direct(ev: Evaluator, plan: SumPlan) -> Series:
    """The whole sum modulo q^order, term by term."""
    node, order = plan.node, plan.order
    total = Series.zero(ev.ring, order)
    for k in plan.ks:
        term = ev._as_series(ev.value(node.body, {**plan.env, node.var: k}, order))
        total = (total + term).truncate(order)
    return total
