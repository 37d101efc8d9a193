"""The exception tree of qseries.

Every error a user can provoke with bad input is a :class:`QSeriesError`; the command line
turns it into a message on stderr and exit code 2.  Nothing else escapes as a traceback.

>>> try:
...     raise ParseError("unexpected ')'", text="1 + )", position=4)
... except QSeriesError as err:
...     print(err)
unexpected ')' at column 5
  1 + )
      ^
"""

from __future__ import annotations


class QSeriesError(Exception):
    """Base class of every error qseries raises on purpose."""


class ParseError(QSeriesError):
    """The text is not a well-formed expression; carries the position (0-based) of the fault."""

    def __init__(self, message: str, text: str = "", position: int = 0) -> None:
        self.message = message
        self.text = text
        self.position = max(0, min(position, len(text)))
        super().__init__(self._render())

    def _render(self) -> str:
        if not self.text:
            return f"{self.message} at column 1"
        line_start = self.text.rfind("\n", 0, self.position) + 1
        line_end = self.text.find("\n", self.position)
        if line_end < 0:
            line_end = len(self.text)
        line = self.text[line_start:line_end]
        col = self.position - line_start
        # keep very long lines readable: show a window around the fault
        if len(line) > 100:
            lo = max(0, col - 50)
            line = ("..." if lo else "") + line[lo : lo + 100]
            col = col - lo + (3 if lo else 0)
        column = self.position - line_start + 1
        return f"{self.message} at column {column}\n  {line}\n  {' ' * col}^"


def weight_may_help(err: QSeriesError) -> QSeriesError:
    """Mark an error that giving extra variables a weight (z -> z*q^w) may remove: a sum
    that does not converge in q alone, a coefficient such as 1 - z that cannot be inverted.

    >>> weight_may_help(DomainError("x")).weights_may_help
    True
    """
    err.weights_may_help = True   # type: ignore[attr-defined]
    return err


class DomainError(QSeriesError):
    """The operation is mathematically undefined (division by zero, no invertible leading term,
    a sum that does not converge as a formal power series)."""


class UnableError(QSeriesError):
    """The operation is defined but refused: too large, or not supported yet."""


class IncompatibleRingError(QSeriesError):
    """Two series live over rings (or rational exponent offsets) that cannot be combined."""
