"""Jacobi's triple product for pairs of factors (q^a;q^m)_inf^p (q^(m-a);q^m)_inf^p: a
sparse sum over (q^m;q^m)_inf (``products.theta_pair_parts``) instead of 2N/m binomials.

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> from qseries.engine.terms import factors_of
>>> pairs, rest = paired_products(Evaluator(), factors_of(parse("(q;q^5)_inf (q^4;q^5)_inf")),
...                               {}, 6)
>>> pairs, rest
([(1 - q - q^4 + O(q^6), 1 - q^5 + O(q^6))], [])
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from ..errors import QSeriesError
from ..lang.ast import Node, Poch
from ..products import monomial_parts, theta_pair_parts
from ..series import Series
from .chooser import pochhammer_value
from .terms import Parts

if TYPE_CHECKING:
    from .evaluator import Evaluator


def poch_atoms(ev: Evaluator, node: Node, env: dict[str, int]) -> list[tuple[int, int]] | None:
    """[(a, m), ...] when node is (q^a1, q^a2, ...; q^m)_inf with positive integer a_i."""
    if not isinstance(node, Poch) or node.length is not None:
        return None
    try:
        m = ev._base_step(node, env, 1)
    except QSeriesError:
        return None
    out = []
    for p in node.params:
        mono = ev._exact_monomial(p, env)
        parts = monomial_parts(mono) if mono is not None else None
        if parts is None or parts[0] != 1 or parts[1].denominator != 1 or parts[1] < 1:
            return None
        out.append((int(parts[1]), m))
    return out


def paired_products(ev: Evaluator, factors: list[tuple[Node, int]], env: dict[str, int],
                     order: int) -> tuple[list[Parts], list[tuple[Node, int]]]:
    """Jacobi's triple product fast path: factors (q^a;q^m)_inf^p and (q^(m-a);q^m)_inf^p
    are computed together as a sparse sum over (q^m;q^m)_inf.  Returns the paired
    products as numerators and denominators, and the factors left to the general path."""
    if "triple-pairs" not in ev.allowed:
        return [], factors
    atoms: list[tuple[int, int, int]] = []
    rest: list[tuple[Node, int]] = []
    for node, p in factors:
        info = poch_atoms(ev, node, env)
        if info is None:
            rest.append((node, p))
        else:
            atoms.extend((a, m, p) for a, m in info)
    if len(atoms) < 2:
        return [], factors
    pool = list(atoms)
    values: list[Parts] = []
    singles: list[tuple[int, int, int]] = []
    while pool:
        a, m, p = pool.pop(0)
        partner = (m - a, m, p)
        if 0 < a < m and 2 * a != m and partner in pool:
            pool.remove(partner)
            key = ("pair", min(a, m - a), m, p, order)
            v = ev._cache.get(key)
            if v is None:
                v = theta_pair_parts(min(a, m - a), m, p, ev.ring, order)
                ev._cache[key] = v
            values.append(v)
        else:
            singles.append((a, m, p))
    for a, m, p in singles:
        v = pochhammer_value(Series.monomial(a, ev.ring), m, None, order, ev.allowed)
        values.append((v if p == 1 else v.power(p, order), None))
    return values, rest
