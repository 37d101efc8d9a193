"""Dissections: f = sum_r q^r F_r(q^m), with F_r = sum_n a(m n + r) q^n.

The whole m-dissection comes from one evaluation of f (to the order the last residue
needs) and one strided read of its coefficients per residue (``Series.section``): nothing is
evaluated again per residue.  Precision is honest: from f known to O(q^N), F_r is known to
O(q^ceil((N - r)/m)).

Fractional exponents: the residues r lie in the class of f's exponents.  For a series in
integer powers they are 0, 1, ..., m - 1; for q^(-1/24)/(q;q)_inf (exponents n - 1/24) they
are ``start``, ``start`` + 1, ..., with ``start`` by default the class's representative in
[0, 1) (here 23/24); pass ``start=Fraction(-1, 24)`` to label them as papers do, so that
F_(4 - 1/24) = sum p(5n + 4) q^n.  In the notation this is ``[q^(5n + 4 - 1/24)] F``.

>>> d = dissection("1/(q;q)_inf", 5, 4)
>>> d.part(4)
5 + 30q + 135q^2 + 490q^3 + O(q^4)
>>> [str(r) for r in d.residues]
['0', '1', '2', '3', '4']
"""

from __future__ import annotations

import numbers
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from fractions import Fraction

from ..engine import evaluate
from ..errors import ArgumentError, ArgumentTypeError, integer_argument, typed_argument
from ..lang import Node
from ..lang.definitions import Definition
from ..series import MAX_LENGTH, Ring, Series

Exponent = int | Fraction


@dataclass(frozen=True)
class Dissection:
    """The m-dissection of a series: ``parts[j]`` is F_r for r = ``residues[j]``, each known
    to its own precision (at least ``order`` when the series was known far enough)."""

    m: int
    residues: tuple[Exponent, ...]
    parts: tuple[Series, ...]

    def part(self, r: Exponent) -> Series:
        """F_r for one of the residues.

        >>> dissection("1/(1-q)", 2, 3).part(1)
        1 + q + q^2 + O(q^3)
        """
        r = Fraction(r)
        for res, f in zip(self.residues, self.parts, strict=True):
            if res == r:
                return f
        raise ArgumentError(f"r = {r} is not a residue of this {self.m}-dissection (they are "
                            f"{', '.join(str(x) for x in self.residues)})")

    @property
    def order(self) -> Exponent | None:
        """The order below which every part is known (None when all are exact).

        >>> dissection("1/(q;q)_inf", 3, 10).order
        10
        """
        known = [f.precision for f in self.parts if f.precision is not None]
        return min(known) if known else None


def _class_start(f: Series, start: Exponent | None) -> Fraction:
    """The first residue: ``start`` (checked against f's exponents) or f's class in [0, 1)."""
    f.one_class("a dissection into residue classes")
    if start is None:
        return Fraction(f.offset)
    s = Fraction(start)
    if not f.is_zero() and (s - f.offset).denominator != 1:
        raise ArgumentError(f"start = {s} is not in the class of the series' exponents "
                            f"(integers plus {f.offset})")
    return s


def _series(f: str | Node | Series, work: int, ring: Ring | None,
            definitions: Mapping[str, Definition] | Iterable[str] | None) -> Series:
    if isinstance(f, Series):
        return f
    typed_argument("f", f, (str, Node), "a string, a syntax tree or a Series")
    return evaluate(f, work, ring, definitions=definitions)


def _check_m(m: object) -> int:
    return integer_argument("m", m, 1, MAX_LENGTH)


def _rational(name: str, value: object) -> Fraction:
    if isinstance(value, bool) or not isinstance(value, (numbers.Rational)):
        raise ArgumentTypeError(f"{name} must be an integer or a Fraction, not {value!r}")
    return Fraction(value)


def _ceil(x: Fraction) -> int:
    return -((-x.numerator) // x.denominator)


def dissection(f: str | Node | Series, m: int, order: int | None = None, *,
               start: Exponent | None = None, ring: Ring | None = None,
               definitions: Mapping[str, Definition] | Iterable[str] | None = None
               ) -> Dissection:
    """The whole m-dissection of ``f`` (an expression, evaluated once, or a Series): the
    parts F_r = sum_n a(m n + r) q^n for the m residues r from ``start`` on (see the
    module docstring), each to O(q^order) when an expression is given (a Series gives what
    it knows, cut at ``order`` when given).

    >>> d = dissection("(q;q)_inf", 5, 6)     # Ramanujan: the part of q^(5n+4) vanishes
    >>> d.part(4), d.part(0)
    (O(q^6), 1 + q - q^3 + O(q^6))
    >>> dissection("q^(-1/24)/(q;q)_inf", 5, 3, start=Fraction(-1, 24)).part(Fraction(95, 24))
    5 + 30q + 135q^2 + O(q^3)
    """
    m = _check_m(m)
    if order is not None:
        integer_argument("order", order, 0, MAX_LENGTH)
    elif not isinstance(f, Series):
        raise ArgumentError("order is needed when f is an expression")
    if start is not None:
        start = _rational("start", start)
    if isinstance(f, Series):
        s = f
    else:
        assert order is not None
        last = (Fraction(1) if start is None else start) + m - 1   # the highest residue
        s = _series(f, max(m * order + _ceil(last), 0), ring, definitions)
    first = _class_start(s, start)
    residues = tuple(first + j for j in range(m))
    parts = []
    for r in residues:
        part = s.section(m, r)
        parts.append(part if order is None else part.truncate(order))
    shown = tuple(r.numerator if r.denominator == 1 else r for r in residues)
    return Dissection(m, shown, tuple(parts))


def dissect(f: str | Node | Series, m: int, r: Exponent, order: int | None = None, *,
            ring: Ring | None = None,
            definitions: Mapping[str, Definition] | Iterable[str] | None = None) -> Series:
    """One part F_r = sum_n a(m n + r) q^n of ``f``, for 0 <= r < m (r rational when the
    exponents of f are; the notation's ``[q^(m n + r)] F`` takes any r).

    >>> dissect("1/(q;q)_inf", 7, 5, 4)
    7 + 77q + 490q^2 + 2436q^3 + O(q^4)
    >>> dissect("1/(q;q)_inf", 7, 7, 4)
    Traceback (most recent call last):
    ...
    qseries.errors.ArgumentError: r must lie in 0 <= r < m = 7, not 7
    """
    m = _check_m(m)
    rr = _rational("r", r)
    if not 0 <= rr < m:
        raise ArgumentError(f"r must lie in 0 <= r < m = {m}, not {rr}")
    if order is not None:
        integer_argument("order", order, 0, MAX_LENGTH)
    elif not isinstance(f, Series):
        raise ArgumentError("order is needed when f is an expression")
    s = f if isinstance(f, Series) else _series(f, m * order + _ceil(rr), ring, definitions)
    part = s.section(m, rr)
    return part if order is None else part.truncate(order)
