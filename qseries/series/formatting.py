"""Human-readable text of a series in the notation the parser reads back.

>>> from qseries.series import Series
>>> from fractions import Fraction
>>> format_series(Series.from_coefficients([1, -1, Fraction(1, 2)], prec=5))
'1 - q + (1/2)q^2 + O(q^5)'
"""

from __future__ import annotations

from fractions import Fraction
from typing import TYPE_CHECKING

from ..backend import LaurentPoly, int_to_decimal, laurent_text

if TYPE_CHECKING:
    from .core import Series

Exponent = int | Fraction


def number_text(x: int | Fraction) -> str:
    """str() of an int or Fraction of any size (Python refuses more than 4300 digits by
    default; the limit is lifted only for this conversion).

    >>> len(number_text(10**5000))
    5001
    """
    if isinstance(x, Fraction) and x.denominator != 1:
        return f"{number_text(x.numerator)}/{number_text(x.denominator)}"
    n = int(x)
    if n.bit_length() < 10_000:
        return str(n)
    return int_to_decimal(n)   # GMP: Python's own conversion is quadratic and capped


def coefficient_text(c: object) -> str:
    """A coefficient as text: a number of any size, or a Laurent polynomial in extra
    variables (``z^2 - z``).

    >>> coefficient_text(Fraction(-3, 4))
    '-3/4'
    """
    if isinstance(c, LaurentPoly):
        return laurent_text(c)
    return number_text(c)  # type: ignore[arg-type]


def short_number_text(x: int | Fraction, digits: int = 60) -> str:
    """The number, or a description of it when it is very long (for error messages)."""
    n = abs(Fraction(x).numerator).bit_length() + Fraction(x).denominator.bit_length()
    if n * 0.302 > digits * 2:
        return f"a number of about {int(n * 0.30103)} digits"
    return number_text(x)


def format_exponent(e: Exponent) -> str:
    """``q``, ``q^3``, ``q^-2`` or ``q^(1/24)`` for the monomial q^e (``1`` for e = 0).

    >>> format_exponent(Fraction(-23, 24))
    'q^(-23/24)'
    """
    e = Fraction(e)
    if e == 0:
        return "1"
    if e == 1:
        return "q"
    if e.denominator == 1:
        return f"q^{e.numerator}"
    return f"q^({e})"


def power_text(e: Exponent) -> str:
    """q^e for messages: ``q^0``, ``q^5``, ``q^-2``, ``q^(7/4)`` (a fraction in parentheses,
    so that the text reads back as the same power).

    >>> power_text(Fraction(2399, 24)), power_text(0), power_text(1)
    ('q^(2399/24)', 'q^0', 'q^1')
    """
    e = Fraction(e)
    return f"q^{e.numerator}" if e.denominator == 1 else f"q^({e})"


def format_term(e: Exponent, c: int | Fraction, first: bool) -> str:
    """One signed term: ``+ 2q^3``, ``- q``, ``(1/2)q^2``.

    >>> format_term(3, -2, False)
    '- 2q^3'
    """
    if isinstance(c, LaurentPoly):
        return _format_poly_term(e, c, first)
    c = Fraction(c)
    sign = "-" if c < 0 else "+"
    a = abs(c)
    mono = format_exponent(e)
    text = number_text(a)
    if mono == "1":
        body = text
    elif a == 1:
        body = mono
    elif a.denominator == 1:
        body = f"{text}{mono}"
    else:
        body = f"({text}){mono}"
    if first:
        return body if sign == "+" else f"-{body}"
    return f"{sign} {body}"


def _format_poly_term(e: Exponent, c: LaurentPoly, first: bool) -> str:
    """A term whose coefficient is a Laurent polynomial in extra variables: ``z*q^2``,
    ``- a*z*q``, ``(z^2 - z)*q^3``."""
    mono = format_exponent(e)
    terms = c.terms()
    text = laurent_text(c)
    sign = "+"
    if len(terms) == 1:
        if terms[0][1] < 0:
            sign, text = "-", text[1:]
        body = text if mono == "1" else f"{text}*{mono}"
    else:
        body = (text if first else f"({text})") if mono == "1" else f"({text})*{mono}"
    if first:
        return body if sign == "+" else f"-{body}"
    return f"{sign} {body}"


def format_series(s: Series, max_terms: int | None = None) -> str:
    """The series as ``c0 + c1 q + ... + O(q^N)``; ``max_terms`` elides the middle.

    >>> from qseries.series import Series
    >>> format_series(Series.from_coefficients(list(range(1, 9)), prec=8), max_terms=4)
    '1 + 2q + ... + 7q^6 + 8q^7 + O(q^8)'
    """
    terms = list(s.terms())
    parts: list[str] = []
    if max_terms is not None and len(terms) > max_terms:
        head = terms[: max_terms // 2]
        tail = terms[len(terms) - (max_terms - max_terms // 2):]
        parts = [format_term(e, c, i == 0) for i, (e, c) in enumerate(head)]
        parts.append("+ ...")
        parts += [format_term(e, c, False) for e, c in tail]
    else:
        parts = [format_term(e, c, i == 0) for i, (e, c) in enumerate(terms)]
    if s.precision is not None:
        big_o = f"O({format_exponent(s.precision)})" if s.precision != 0 else "O(q^0)"
        parts.append(f"+ {big_o}" if parts else big_o)
    return " ".join(parts) if parts else "0"
