"""Hints for a failed check (:func:`qseries.analysis.diagnose`) as text.

>>> from qseries.analysis import Hint
>>> hint_line(Hint("constant", "the left side is 1/2 times the right side"))
'  hint (constant): the left side is 1/2 times the right side'
"""

from __future__ import annotations

from ..analysis import Hint


def hint_line(h: Hint) -> str:
    """One line of the report of ``qseries check``: the hint's kind and message.

    >>> from qseries.analysis import Hint
    >>> hint_line(Hint("shift", "the left side is q^(-1) times the right side"))
    '  hint (shift): the left side is q^(-1) times the right side'
    """
    return f"  hint ({h.kind}): {h.message}"
