"""Templates for parametrised families of identities.

A side of a family member is written once with parameters:

* ``$k`` -- the value of the parameter (or repeat variable) k;
* ``$(2k+1-i)`` -- integer arithmetic on parameters, in the notation's own grammar;
* ``$repeat(j=1..k-1; TEXT; SEP)`` -- TEXT for j = 1, ..., k-1 joined by SEP (empty when the
  range is empty); TEXT may use $j and nested $repeat.

Nothing is executed: arithmetic goes through the notation's parser and evaluator.

Limits: one ``$repeat`` runs over at most ``MAX_REPEAT`` values, one expansion is at most
``MAX_OUTPUT`` characters long, and the total work is bounded by a :class:`Budget` of
``MAX_STEPS`` steps (a step is a character scanned or produced; each template or repeated
body expanded costs ``CALL_STEPS`` more, each integer expression ``ARITHMETIC_STEPS``; a
whole budget is at most a second or two of work), so that nested ``$repeat`` forms end in a
:class:`TemplateError` instead of running for hours.

>>> expand_template("sum_{n>=0} q^(n^2 + $(k-1) n)", {"k": 3})
'sum_{n>=0} q^(n^2 + 2 n)'
>>> expand_template("$repeat(j=1..k; (q;q)_n$j; )", {"k": 2})
'(q;q)_n1 (q;q)_n2'
"""

from __future__ import annotations

from ..engine import Evaluator
from ..errors import TemplateError
from ..lang import parse

MAX_OUTPUT = 50_000
MAX_REPEAT = 200
MAX_STEPS = 2_000_000
CALL_STEPS = 10
ARITHMETIC_STEPS = 50
_MAX_OUTPUT = MAX_OUTPUT      # the former names
_MAX_REPEAT = MAX_REPEAT

__all__ = ["MAX_OUTPUT", "MAX_REPEAT", "MAX_STEPS", "Budget", "TemplateError",
           "expand_template", "integer_expression"]


class Budget:
    """Steps of template work left; :meth:`spend` raises :class:`TemplateError` when they
    run out.  A budget with a ``parent`` spends from it too (the identity files use one
    budget per entry inside one for everything loaded together).

    >>> b = Budget(100)
    >>> b.spend(60); b.left
    40
    >>> b.spend(60)  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    qseries.errors.TemplateError: expanding the templates takes more than 100 steps (...
    """

    def __init__(self, steps: int = MAX_STEPS, parent: Budget | None = None,
                 what: str = "expanding the templates") -> None:
        self.steps = steps
        self.left = steps
        self.parent = parent
        self.what = what

    def spend(self, steps: int, position: int = 0) -> None:
        """Use ``steps`` steps; past the budget, raise TemplateError at ``position``."""
        self.left -= steps
        if self.left < 0:
            raise TemplateError(f"{self.what} takes more than {self.steps} steps (nested "
                                f"$repeat, long ranges or many family members); simplify "
                                f"them or split the family", position)
        if self.parent is not None:
            self.parent.spend(steps, position)


def integer_expression(text: str, values: dict[str, int], budget: Budget | None = None) -> int:
    """Evaluate an integer expression in the parameters (no q), safely, spending from
    ``budget`` if one is given.

    >>> integer_expression("2k+1-i", {"k": 3, "i": 2})
    5
    """
    if budget is not None:
        budget.spend(ARITHMETIC_STEPS + len(text))
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


def expand_template(text: str, values: dict[str, int], budget: Budget | None = None) -> str:
    """Expand every ``$...`` form of ``text`` with the given parameter values, spending from
    ``budget`` (by default a fresh one of ``MAX_STEPS`` steps).

    >>> expand_template("$repeat(i=1..3; x$i; +)", {})
    'x1 + x2 + x3'
    >>> expand_template("$repeat(a=1..200;$repeat(b=1..200;$repeat(c=1..200;;););)",
    ...                 {})  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    qseries.errors.TemplateError: expanding the templates takes more than 2000000 steps (...
    """
    if budget is None:
        budget = Budget()
    budget.spend(CALL_STEPS + len(text))
    out: list[str] = []
    size = 0          # characters in out (summing them at every form took quadratic time)
    i = 0
    while i < len(text):
        ch = text[i]
        if ch != "$":
            out.append(ch)
            size += 1
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
            lo = integer_expression(lo_text.strip(), values, budget)
            hi = integer_expression(hi_text.strip(), values, budget)
            body = body.strip()
            if hi - lo + 1 > MAX_REPEAT:
                raise TemplateError(f"$repeat over {hi - lo + 1} values (at most {MAX_REPEAT})",
                                    i)
            items = []
            length = 0
            for j in range(lo, hi + 1):
                item = expand_template(body, {**values, var: j}, budget)
                items.append(item)
                length += len(item)
                if length > MAX_OUTPUT:
                    raise TemplateError("the expanded template is too long", i)
            piece = sep.join(items) if sep.strip() == "" else f" {sep.strip()} ".join(items)
            i = close + 1
        elif text.startswith("$(", i):
            close = _matching(text, i + 1)
            piece = str(integer_expression(text[i + 2:close], values, budget))
            i = close + 1
        else:
            name = _name_at(text, i + 1)
            if not name or name not in values:
                raise TemplateError(f"unknown template parameter ${name or text[i + 1:i + 2]}",
                                    i)
            piece = str(values[name])
            i += 1 + len(name)
        out.append(piece)
        size += len(piece)
        if size > MAX_OUTPUT:
            raise TemplateError("the expanded template is too long", i)
    budget.spend(size)
    return "".join(out)
