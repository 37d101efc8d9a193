"""A family of sums to scan: a template in the notation with parameters, their ranges and
constraints between them.

The template uses the catalogue's syntax (:mod:`qseries.catalogue.templates`): ``$b`` is
the value of the parameter b, ``$(2b+1)`` integer arithmetic, ``$repeat(...)`` repetition.
A range is ``LO..HI`` (both ends included); its ends are integer expressions that may use
the parameters given before it (``--param a=1..3 --param b=0..a``).  A constraint is two
integer expressions joined by one of ``<= < >= > == !=`` (``a != b``, ``2a <= b + 1``).
Nothing is executed: expressions go through the notation's parser.

>>> f = Family("sum_{n>=0} q^(n^2+$b n)/(q;q)_n", (("b", "0..3"),), ("b != 2",))
>>> [dict(p) for p in f.members()]
[{'b': 0}, {'b': 1}, {'b': 3}]
>>> f.expand({"b": 1})
'sum_{n>=0} q^(n^2+1 n)/(q;q)_n'

Limits: a family has at most ``MAX_SCAN_MEMBERS`` assignments before the constraints are
applied, counted from the ranges before any member is made.
"""

from __future__ import annotations

import re
from collections.abc import Iterator
from dataclasses import dataclass

from ..catalogue.templates import Budget, expand_template
from ..engine import Evaluator
from ..errors import ArgumentError, ParseError, QSeriesError
from ..lang import Node, parse

#: most assignments of the parameters (before constraints) in one scan
MAX_SCAN_MEMBERS = 1_000_000
#: most parameters of one family
MAX_PARAMETERS = 12

_NAME = re.compile(r"^[A-Za-z]+$")
_COMPARISONS = ("<=", ">=", "==", "!=", "<", ">")
Params = tuple[tuple[str, int], ...]

__all__ = ["MAX_SCAN_MEMBERS", "Family", "Params", "parse_param", "place_in_template"]


def parse_param(spec: str) -> tuple[str, str]:
    """``NAME=LO..HI`` as (name, range).

    >>> parse_param("b=0..3")
    ('b', '0..3')
    >>> parse_param("b=3")
    Traceback (most recent call last):
    ...
    qseries.errors.ArgumentError: --param 'b=3': write NAME=LO..HI, such as b=0..3
    """
    name, sep, rng = spec.partition("=")
    name, rng = name.strip(), rng.strip()
    if not sep or ".." not in rng or not rng.split("..", 1)[0].strip() \
            or not rng.split("..", 1)[1].strip():
        raise ArgumentError(f"--param {spec!r}: write NAME=LO..HI, such as b=0..3")
    if not (_NAME.match(name) and name.isascii()) or name == "q":
        raise ArgumentError(f"--param {spec!r}: a parameter name is a word of letters other "
                            f"than q")
    return name, rng


def place_in_template(err: ParseError, template: str) -> ParseError | None:
    """The parse error ``err`` of a member (``err.text``, the template with values put in)
    moved to the same place in ``template`` as typed, when the fault lies in text the
    template and the member share (before the first substitution or after the last);
    None when it lies in a substituted value.

    >>> member = "sum_{n>=0} q^(n^2+0 n)/(q;q_n"
    >>> err = ParseError("expected ')'", member, member.index("_n"))
    >>> moved = place_in_template(err, "sum_{n>=0} q^(n^2+$b n)/(q;q_n")
    >>> moved.text[moved.position:]
    '_n'
    """
    member, at = err.text, err.position
    if member == template:
        return err
    head = 0
    while head < min(len(member), len(template)) and member[head] == template[head]:
        head += 1
    tail = 0
    while tail < min(len(member), len(template)) - head and \
            member[-1 - tail] == template[-1 - tail]:
        tail += 1
    if at <= head:
        return ParseError(err.message, template, at)
    if at >= len(member) - tail:
        return ParseError(err.message, template, at - len(member) + len(template))
    return None


def _split_comparison(text: str) -> tuple[str, str, str]:
    for op in _COMPARISONS:
        left, sep, right = text.partition(op)
        if sep:
            if any(ch in left + right for ch in "<>=!") or not left.strip() \
                    or not right.strip():
                break                # "b =< 2", "a <= b <= c": not one comparison
            return left, op, right
    raise ArgumentError(f"constraint {text!r}: write two integer expressions in the "
                        f"parameters joined by one of {' '.join(_COMPARISONS)}, such as "
                        f"\"a <= b\"")


def _parse_part(whole: str, start: int, part: str, names: list[str], label: str) -> Node:
    """``part``, the text of ``whole`` from ``start`` on, parsed so that positions (of a
    syntax error, and the columns in later errors) count in ``whole``."""
    try:
        return parse(" " * start + part, bound=names)
    except ParseError as err:
        raise ParseError(f"{label}: {err.message}", whole, err.position) from None
    except QSeriesError as err:
        raise ArgumentError(f"{label}: {err}") from None


def _holds(a: int, op: str, b: int) -> bool:
    return {"<=": a <= b, ">=": a >= b, "==": a == b, "!=": a != b, "<": a < b,
            ">": a > b}[op]


@dataclass(frozen=True)
class Family:
    """The members of a scan: ``template`` with every assignment of the parameters in
    ``ranges`` (in the order given, the last varying fastest) that satisfies every
    ``constraints``; ``right`` is a right-side template when the scan looks for equality
    with it instead of a product form; ``definitions`` are functions the templates call
    (``"G(q) = ..."``).

    >>> Family("G(q^$k)", (("k", "1..2"),), definitions=("G(q) = 1/(1-q)",)).expand({"k": 2})
    'G(q^2)'
    """

    template: str
    ranges: tuple[tuple[str, str], ...]
    constraints: tuple[str, ...] = ()
    right: str | None = None
    definitions: tuple[str, ...] = ()

    def __post_init__(self) -> None:
        names = [n for n, _ in self.ranges]
        if len(set(names)) != len(names):
            raise ArgumentError("a parameter is given twice")
        if len(names) > MAX_PARAMETERS:
            raise ArgumentError(f"at most {MAX_PARAMETERS} parameters")
        for name, rng in self.ranges:
            parse_param(f"{name}={rng}")
        if names and "$" not in self.template + (self.right or ""):
            raise ArgumentError("the template uses no parameter: write $NAME where a "
                                "parameter's value goes, such as q^(n^2+$b n), and put the "
                                "template in single quotes (in double quotes the shell "
                                "replaces $b before qseries sees it)")

    def _bound_nodes(self) -> list[tuple[str, Node, Node]]:
        out = []
        for i, (name, rng) in enumerate(self.ranges):
            earlier = [n for n, _ in self.ranges[:i]]
            lo, hi = rng.split("..", 1)
            whole, label = f"{name}={rng}", f"--param {name}={rng}"
            start = len(name) + 1
            out.append((name, _parse_part(whole, start, lo, earlier, label),
                        _parse_part(whole, start + len(lo) + 2, hi, earlier, label)))
        return out

    def _constraint_nodes(self) -> list[tuple[str, Node, str, Node]]:
        names = [n for n, _ in self.ranges]
        out = []
        for text in self.constraints:
            left, op, right = _split_comparison(text)
            label = f"constraint {text!r}"
            out.append((text, _parse_part(text, 0, left, names, label), op,
                        _parse_part(text, len(left) + len(op), right, names, label)))
        return out

    def assignments(self) -> list[dict[str, int]]:
        """Every assignment of the parameters, constraints not applied; refused with an
        ArgumentError beyond ``MAX_SCAN_MEMBERS`` (counted before they are made).

        >>> len(Family("$a $b", (("a", "1..3"), ("b", "a..3"))).assignments())
        6
        """
        ev = Evaluator()
        levels: list[dict[str, int]] = [{}]
        for name, lo_node, hi_node in self._bound_nodes():
            bounds = []
            total = 0
            for a in levels:
                try:
                    lo = ev.integer(lo_node, dict(a), f"the lower end of {name}'s range")
                    hi = ev.integer(hi_node, dict(a), f"the upper end of {name}'s range")
                except QSeriesError as err:
                    raise ArgumentError(f"--param {name}={dict(self.ranges)[name]}: "
                                        f"{err}") from None
                total += max(0, hi - lo + 1)
                if total > MAX_SCAN_MEMBERS:
                    raise ArgumentError(f"the family has more than {MAX_SCAN_MEMBERS} members; "
                                        f"split the ranges into several scans")
                bounds.append((a, lo, hi))
            levels = [{**a, name: v} for a, lo, hi in bounds for v in range(lo, hi + 1)]
        return levels

    def members(self) -> Iterator[Params]:
        """The parameter values of each member (constraints applied), in order.

        >>> list(Family("$a", (("a", "0..5"),), ("2a > 7",)).members())
        [(('a', 4),), (('a', 5),)]
        """
        ev = Evaluator()
        constraints = self._constraint_nodes()
        for a in self.assignments():
            ok = True
            for text, left, op, right in constraints:
                try:
                    x = ev.scalar(left, dict(a))
                    y = ev.scalar(right, dict(a))
                except QSeriesError as err:
                    raise ArgumentError(f"constraint {text!r} at {a}: {err}") from None
                if not _holds(x, op, y):   # type: ignore[arg-type]
                    ok = False
                    break
            if ok:
                yield tuple(a.items())

    def expand(self, values: dict[str, int]) -> str:
        """The member's left side (the template with the values put in).

        >>> Family("q^$(a+1)", (("a", "0..1"),)).expand({"a": 1})
        'q^2'
        """
        return expand_template(self.template, values, Budget())

    def expand_right(self, values: dict[str, int]) -> str | None:
        """The member's right side in an equality scan (None in a product scan).

        >>> Family("q^$a", (("a", "0..1"),), right="q^$a").expand_right({"a": 1})
        'q^1'
        """
        if self.right is None:
            return None
        return expand_template(self.right, values, Budget())

