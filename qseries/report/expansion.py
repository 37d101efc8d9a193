"""Expansions (``qseries expand``) as text.

>>> from qseries.engine import evaluate
>>> expansion_text(evaluate("1/(1-q)", 4), 4)
'1 + q + q^2 + q^3 + O(q^4)'
"""

from __future__ import annotations

from ..analysis import Dissection
from ..series import Series
from ..series.formatting import coefficient_text, format_series
from .json_shapes import known_order


def expansion_text(s: Series, order: int) -> str:
    """The series in the notation the parser reads back: a series known to O(q^k) as it
    is, an exact polynomial cut at q^order (with O(q^order) when terms were cut).

    >>> from qseries.engine import evaluate
    >>> expansion_text(evaluate("1 + q^7", 4), 4), expansion_text(evaluate("1 + q^2", 4), 4)
    ('1 + O(q^4)', '1 + q^2')
    """
    return format_series(s if s.precision is not None else s.truncate(order))


def expansion_note(s: Series, order: int) -> str | None:
    """Why fewer coefficients than asked are known (None when all are); ``qseries expand``
    prints it on standard error.

    >>> from qseries.engine import evaluate
    >>> expansion_note(evaluate("1/(1-q)", 4), 4) is None
    True
    >>> expansion_note(evaluate("q^-3/(1-q) + O(q^5)", 10), 10)[:45]
    'note: only the coefficients below q^5 are kno'
    """
    known = known_order(s, order)
    if known >= order:
        return None
    return (f"note: only the coefficients below q^{coefficient_text(known)} are known "
            f"(negative powers of q or an O(q^N) term cost precision)")


def dissection_lines(d: Dissection, order: int) -> list[str]:
    """One line per part of an m-dissection, ``r=R: F_R`` with F_R = sum_n a(m n + R) q^n
    (``qseries expand --dissect M``).

    >>> from qseries.analysis import dissection
    >>> dissection_lines(dissection("1/(q;q)_inf", 2, 3), 3)
    ['r=0: 1 + 2q + 5q^2 + O(q^3)', 'r=1: 1 + 3q + 7q^2 + O(q^3)']
    """
    return [f"r={coefficient_text(r)}: {expansion_text(f, order)}"
            for r, f in zip(d.residues, d.parts, strict=True)]
