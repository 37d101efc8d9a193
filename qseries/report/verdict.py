"""Verdict text: the AGREES / DIFFERS / INCONCLUSIVE report of a check with its notes, the
verdict column of ``qseries verify``, and the report of a failed assertion.

The sentence itself is :attr:`qseries.analysis.CheckResult.verdict` (the result states what
was compared); this module lays it out for people.

>>> from qseries.analysis import check
>>> r = check("O(q^-5) + 1", "2")
>>> check_lines(r)[0][:40]
'INCONCLUSIVE  inconclusive: no coefficie'
"""

from __future__ import annotations

from collections.abc import Iterable
from fractions import Fraction
from typing import TYPE_CHECKING

from ..analysis import CheckResult, Hint
from ..errors import typed_argument
from ..series.formatting import coefficient_text, power_text
from .hints import hint_line
from .neighbours import neighbour_table

if TYPE_CHECKING:
    from .json_shapes import EntryOutcome


def check_lines(r: CheckResult, hints: Iterable[Hint] = ()) -> list[str]:
    """The report of ``qseries check``: AGREES, DIFFERS or INCONCLUSIVE with the verdict; at a
    mismatch the difference, how far the sides agree and the table of neighbouring
    coefficients; the hints; a note when fewer coefficients than asked were compared (for a
    failed check: otherwise the verdict says it); the time.

    >>> from qseries.analysis import check
    >>> print("\\n".join(check_lines(check("1/(1-q)", "1 + q", order=4), [])[:2]))
    ... # doctest: +NORMALIZE_WHITESPACE
    DIFFERS  the two sides differ: first at q^2, where the left side has 1 and the right side
    0 (difference 1)
      coefficients below q^2 agree
    """
    lines = []
    if r.holds is None:
        lines.append(f"INCONCLUSIVE  {r.verdict}")
    elif r.first_mismatch is None:
        lines.append(f"AGREES  {r.verdict}")
    else:
        m = r.first_mismatch
        lines.append(f"DIFFERS  {r.verdict} (difference "
                     f"{r.unweighted_text(m.difference, m.exponent)})")
        e = Fraction(m.exponent)
        below = (f"weighted degree {m.exponent}" if r.weighted else
                 f"q^{e}" if e.denominator == 1 else f"q^({e})")
        lowest = min((x.valuation for x in (r.lhs, r.rhs)
                      if x is not None and x.valuation is not None), default=e)
        if r.weighted or e > lowest:       # nothing lies below the first term of both sides
            lines.append(f"  coefficients below {below} agree")
        lines.extend(neighbour_table(r))
    lines.extend(hint_line(h) for h in hints)
    if r.order_verified != r.order_requested and r.holds is False:   # else in the verdict
        lines.append(f"note: only the coefficients below q^{coefficient_text(r.order_verified)}"
                     f" could be compared, not q^{r.order_requested}: {r.shortfall}")
    lines.append(f"  ({r.seconds:.3f} s)")
    return lines


def mismatch_report(r: CheckResult, radius: int = 2) -> str:
    """The verdict, a table of coefficients around the first mismatch, and why fewer
    coefficients than asked were compared (if they were).

    >>> from qseries.analysis import check
    >>> print(mismatch_report(check("1/(1-q) + O(q^3)", "1/(1-q)", order=5)))
    ... # doctest: +NORMALIZE_WHITESPACE
    the two sides agree to O(q^3) (every coefficient below q^3 compared; fewer than the q^5
    asked, because the left side is known only below q^3 (it carries its own O(q^3));
    evidence, not a proof)
      (only the coefficients below q^3 were compared, not q^5)
    """
    typed_argument("r", r, CheckResult, "a CheckResult from qseries.check")
    lines = [r.verdict] + neighbour_table(r, radius)
    if r.order_verified != r.order_requested:
        lines.append(f"  (only the coefficients below {power_text(r.order_verified)} were "
                     f"compared, not {power_text(r.order_requested)})")
    return "\n".join(lines)


def entry_verdict_text(r: EntryOutcome, expect: str) -> str:
    """The verdict column of ``qseries verify`` for an entry recorded to hold or to fail
    (``expect``): the first line of its error, or whether it behaved as recorded.

    >>> from types import SimpleNamespace as Outcome
    >>> entry_verdict_text(Outcome(ok=True, error=""), "holds")
    'holds'
    >>> entry_verdict_text(Outcome(ok=False, error=""), "fails")
    'NOT AS RECORDED'
    >>> entry_verdict_text(Outcome(ok=False, error="bad\\nmore"), "holds")
    'ERROR bad'
    """
    if r.error:
        return "ERROR " + r.error.splitlines()[0]
    if expect == "fails":
        if r.ok and getattr(r, "holds", None) is True:     # the failure was not reached
            return "agrees to this order (its recorded failure lies beyond it)"
        return "fails as recorded" if r.ok else "NOT AS RECORDED"
    return "holds" if r.ok else "FAILS"


def mismatch_text(r: EntryOutcome) -> str:
    """The first-mismatch column of ``qseries verify`` ("" when there is none).

    >>> from types import SimpleNamespace as Outcome
    >>> mismatch_text(Outcome(first_mismatch={"index": 3, "lhs": "3", "rhs": "4"}))
    'q^3: 3 vs 4'
    """
    m = r.first_mismatch
    if not m:
        return ""
    return f"q^{m['index']}: {m['lhs']} vs {m['rhs']}"
