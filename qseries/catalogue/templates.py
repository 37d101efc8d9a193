"""Templates for parametrised families of identities.

A side of a family member is written once with parameters:

* ``$k`` -- the value of the parameter (or repeat variable) k;
* ``$(2k+1-i)`` -- integer arithmetic on parameters, in the notation's own grammar;
* ``$repeat(j=1..k-1; TEXT; SEP)`` -- TEXT for j = 1, ..., k-1 joined by SEP (empty when the
  range is empty); TEXT may use $j and nested $repeat.

Nothing is executed: arithmetic goes through the notation's parser and evaluator.

>>> expand_template("sum_{n>=0} q^(n^2 + $(k-1) n)", {"k": 3})
'sum_{n>=0} q^(n^2 + 2 n)'
>>> expand_template("$repeat(j=1..k; (q;q)_n$j; )", {"k": 2})
'(q;q)_n1 (q;q)_n2'
"""

from __future__ import annotations

from ..errors import QSeriesError
from ..lang import parse
from ..lang.evaluator import Evaluator


class TemplateError(QSeriesError):
    """A malformed template; ``position`` is the offset in the template text."""

    def __init__(self, message: str, position: int = 0) -> None:
        self.position = position
        super().__init__(message)


_MAX_OUTPUT = 50_000
_MAX_REPEAT = 200


def integer_expression(text: str, values: dict[str, int]) -> int:
    """Evaluate an integer expression in the parameters (no q), safely.

    >>> integer_expression("2k+1-i", {"k": 3, "i": 2})
    5
    """
    ev = Evaluator()
    node = parse(text, bound=values.keys())
    v = ev.scalar(node, dict(values))
    if v.denominator != 1:
        raise TemplateError(f"{text!r} is not an integer ({v})")
    return v.numerator


def _matching(text: str, open_at: int) -> int:
    """Index of the parenthesis closing the one at ``open_at``."""
    depth = 0
    for i in range(open_at, len(text)):
        if text[i] == "(":
            depth += 1
        elif text[i] == ")":
            depth -= 1
            if depth == 0:
                return i
    raise TemplateError("unbalanced parentheses in a template", open_at)


def _split_top(text: str, sep: str) -> list[str]:
    parts, depth, start = [], 0, 0
    for i, ch in enumerate(text):
        if ch == "(":
            depth += 1
        elif ch == ")":
            depth -= 1
        elif ch == sep and depth == 0:
            parts.append(text[start:i])
            start = i + 1
    parts.append(text[start:])
    return parts


def _name_at(text: str, i: int) -> str:
    j = i
    while j < len(text) and (text[j].isascii() and text[j].isalpha()):
        j += 1
    return text[i:j]


def expand_template(text: str, values: dict[str, int]) -> str:
    """Expand every ``$...`` form of ``text`` with the given parameter values."""
    out: list[str] = []
    i = 0
    while i < len(text):
        ch = text[i]
        if ch != "$":
            out.append(ch)
            i += 1
            continue
        if text.startswith("$repeat(", i):
            close = _matching(text, i + len("$repeat"))
            inner = text[i + len("$repeat("):close]
            pieces = _split_top(inner, ";")
            if len(pieces) != 3:
                raise TemplateError("$repeat takes three parts: j=a..b; TEXT; SEP", i)
            head, body, sep = pieces
            var, _, rng = head.partition("=")
            var = var.strip()
            lo_text, dots, hi_text = rng.partition("..")
            if not var.isalpha() or not dots:
                raise TemplateError("$repeat needs a range such as j=1..k-1", i)
            lo = integer_expression(lo_text.strip(), values)
            hi = integer_expression(hi_text.strip(), values)
            body = body.strip()
            if hi - lo + 1 > _MAX_REPEAT:
                raise TemplateError(f"$repeat over {hi - lo + 1} values (at most {_MAX_REPEAT})",
                                    i)
            items = []
            for j in range(lo, hi + 1):
                items.append(expand_template(body, {**values, var: j}))
                if sum(len(x) for x in items) > _MAX_OUTPUT:
                    raise TemplateError("the expanded template is too long", i)
            out.append(sep.join(items) if sep.strip() == "" else f" {sep.strip()} ".join(items))
            i = close + 1
        elif text.startswith("$(", i):
            close = _matching(text, i + 1)
            out.append(str(integer_expression(text[i + 2:close], values)))
            i = close + 1
        else:
            name = _name_at(text, i + 1)
            if not name or name not in values:
                raise TemplateError(f"unknown template parameter ${name or text[i + 1:i + 2]}",
                                    i)
            out.append(str(values[name]))
            i += 1 + len(name)
        if sum(len(s) for s in out) > _MAX_OUTPUT:
            raise TemplateError("the expanded template is too long", i)
    return "".join(out)
