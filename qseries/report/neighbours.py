"""The table of both sides' coefficients around the first mismatch of a check.

>>> from qseries.analysis import check
>>> print("\\n".join(neighbour_table(check("1/(1-q)", "1 + q", order=9), 1)))
  exponent  left  right  difference
         1     1      1           0
         2     1      0           1
         3     1      0           1
"""

from __future__ import annotations

from ..analysis import CheckResult
from ..series.formatting import coefficient_text


def neighbour_table(r: CheckResult, radius: int = 2) -> list[str]:
    """Lines of a right-aligned table of both sides' coefficients around the first
    mismatch, at most ``radius`` exponents on either side (empty when the sides agree);
    with weighted extra variables, by weighted degree, written back in q and the variables.

    >>> from qseries.analysis import check
    >>> neighbour_table(check("1/(1-q)", "1/(1-q)", order=9))
    []
    """
    head = "weighted degree" if r.weighted else "exponent"
    show = r.unweighted_text   # without weights: the coefficient itself
    rows = [(head, "left", "right", "difference")] + [
        (coefficient_text(e), show(a, e), show(b, e), show(a - b, e))
        for e, a, b in r.neighbours(radius)]
    if len(rows) == 1:
        return []
    widths = [max(len(row[i]) for row in rows) for i in range(4)]
    return ["  " + "  ".join(c.rjust(w) for c, w in zip(row, widths, strict=True))
            for row in rows]
