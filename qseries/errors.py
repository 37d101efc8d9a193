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
    """Base class of every error qseries raises on purpose.

    ``weights_may_help`` is True when giving the extra variables a weight (z -> z*q^w) may
    remove the error: a sum that does not converge in q alone, a coefficient such as 1 - z
    that cannot be inverted (``check`` then retries with weights).

    >>> QSeriesError("x").weights_may_help, DomainError("x", weights_may_help=True).weights_may_help
    (False, True)
    >>> DomainError("division by zero at column 5", position=4).position
    4
    """

    weights_may_help: bool = False
    #: where in the expression's text the fault lies (0-based), when it is known: the parser
    #: always knows it; the evaluator knows it for the node it was evaluating
    position: int | None = None
    #: which side of a check the fault lies in ("left" or "right"), when it is known: the
    #: position then counts into that side's text
    side: str | None = None

    def __init__(self, *args: object, weights_may_help: bool = False,
                 position: int | None = None) -> None:
        super().__init__(*args)
        self.weights_may_help = weights_may_help
        if position is not None:
            self.position = position


class ParseError(QSeriesError):
    """The text is not a well-formed expression; carries the position (0-based) of the fault."""

    def __init__(self, message: str, text: str = "", position: int = 0) -> None:
        self.message = message
        self.text = text
        self.position = max(0, min(position, len(text)))
        super().__init__(self._render())

    def __reduce__(self) -> tuple:
        # rebuild from the parts, not from the rendered message (which would render twice)
        return (type(self), (self.message, self.text, self.position), self.__dict__)

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
    """Set the field :attr:`QSeriesError.weights_may_help` of ``err`` and return it (for
    ``raise weight_may_help(DomainError(...))``).

    >>> weight_may_help(DomainError("x")).weights_may_help
    True
    """
    err.weights_may_help = True
    return err


class DomainError(QSeriesError):
    """The operation is mathematically undefined (division by zero, no invertible leading term,
    a sum that does not converge as a formal power series)."""


class UnableError(QSeriesError):
    """The operation is defined but refused: too large, or not supported yet."""


class IncompatibleRingError(QSeriesError):
    """Two series live over rings (or rational exponent offsets) that cannot be combined."""


class PrecisionError(QSeriesError):
    """Unknown rather than undefined: what was asked for lies beyond the precision O(q^N) to
    which a series is known (a coefficient past it, a check that compared no coefficient)."""


class ArgumentError(QSeriesError, ValueError):
    """A public function got a bad argument (the message names it)."""


class ArgumentTypeError(ArgumentError, TypeError):
    """A public function got an argument of the wrong type (the message names it)."""


def _shown(value: object) -> str:
    """A short ``repr`` of a (possibly huge) argument value."""
    if isinstance(value, int) and not isinstance(value, bool) and value.bit_length() > 200:
        return f"an integer of {value.bit_length()} bits"
    text = repr(value)
    return text if len(text) <= 60 else text[:57] + "..."


def integer_argument(name: str, value: object, low: int | None = None,
                     high: int | None = None) -> int:
    """``value`` when it is an int (not a bool) in ``low .. high`` (either bound may be
    None); otherwise an :class:`ArgumentError` (:class:`ArgumentTypeError` for a wrong type)
    that names the argument.

    >>> integer_argument("primes", 3, 1, 20)
    3
    >>> integer_argument("primes", 10**7, 1, 20)
    Traceback (most recent call last):
    ...
    qseries.errors.ArgumentError: primes must be an integer between 1 and 20, not 10000000
    """
    if isinstance(value, bool) or not isinstance(value, int):
        raise ArgumentTypeError(f"{name} must be an integer, not {_shown(value)} "
                                f"({type(value).__name__})")
    if (low is not None and value < low) or (high is not None and value > high):
        if low is not None and high is not None:
            wanted = f"an integer between {low} and {high}"
        elif low is not None:
            wanted = "a positive integer" if low == 1 else "a non-negative integer" \
                if low == 0 else f"an integer >= {low}"
        else:
            wanted = f"an integer <= {high}"
        raise ArgumentError(f"{name} must be {wanted}, not {_shown(value)}")
    return value


def typed_argument(name: str, value: object, types: type | tuple[type, ...],
                   wanted: str) -> None:
    """Refuse ``value`` with an :class:`ArgumentTypeError` naming the argument unless it is
    an instance of ``types`` (``wanted`` says what it should be, in words).

    >>> typed_argument("lhs", 5, str, "a string")
    Traceback (most recent call last):
    ...
    qseries.errors.ArgumentTypeError: lhs must be a string, not 5 (int)
    """
    if not isinstance(value, types):
        raise ArgumentTypeError(f"{name} must be {wanted}, not {_shown(value)} "
                                f"({type(value).__name__})")


class IdentityFileError(QSeriesError):
    """A malformed identity file (catalogue); the message starts with ``file:line:``."""


class TemplateError(QSeriesError):
    """A malformed or too costly family template; ``position`` is the offset in its text.

    >>> TemplateError("unknown template parameter $x", 4).position
    4
    """

    def __init__(self, message: str, position: int = 0) -> None:
        self.position = position
        super().__init__(message)
