r"""The LaTeX form of a series, as a paper prints an expansion; the parser reads it back.

>>> from qseries.series import Series
>>> series_latex(Series.from_coefficients([1, -3, 0, 5], prec=4))
'1 - 3 q + 5 q^{3} + O(q^{4})'
"""

from __future__ import annotations

from fractions import Fraction
from typing import TYPE_CHECKING

from ..backend import LaurentPoly

if TYPE_CHECKING:
    from .core import Exponent, Series


def _number(a: Fraction) -> str:
    """A non-negative number: 5, \\frac{1}{2}."""
    return str(a.numerator) if a.denominator == 1 else f"\\frac{{{a.numerator}}}{{{a.denominator}}}"


def _power(var: str, e: Fraction) -> str:
    if e == 0:
        return ""
    if e == 1:
        return var
    text = str(e.numerator) if e.denominator == 1 else \
        f"{'-' if e < 0 else ''}{abs(e.numerator)}/{e.denominator}"
    return f"{var}^{{{text}}}"


def _signed(c: Fraction, mono: str) -> tuple[str, str]:
    """(sign, body) of c * mono."""
    sign = "-" if c < 0 else "+"
    a = abs(c)
    if not mono:
        return sign, _number(a)
    if a == 1:
        return sign, mono
    return sign, f"{_number(a)} {mono}"


def _laurent(c: LaurentPoly) -> list[tuple[str, str]]:
    """The signed terms of a coefficient in extra variables: [("+", "z^{2}"), ("-", "z")]."""
    out = []
    for exps, coef in c.terms():
        mono = " ".join(p for p in (_power(name, Fraction(e)) for name, e in
                                    zip(c.ring.names, exps[1:], strict=True)) if p)
        out.append(_signed(Fraction(coef), mono))
    return out


def _term(e: Exponent, c: object) -> tuple[str, str]:
    mono = _power("q", Fraction(e))
    if isinstance(c, LaurentPoly):
        parts = _laurent(c)
        if len(parts) == 1:
            sign, body = parts[0]
            return sign, f"{body} {mono}".strip()
        inner = " ".join((b if i == 0 and s == "+" else f"-{b}" if i == 0 else f"{s} {b}")
                         for i, (s, b) in enumerate(parts))
        return "+", f"\\left({inner}\\right) {mono}".strip()
    return _signed(Fraction(c), mono)  # type: ignore[arg-type]


def series_latex(s: Series, max_terms: int | None = None) -> str:
    r"""LaTeX of ``s``: ``1 - 3 q + 5 q^{3} + O(q^{4})``; ``max_terms`` elides the middle
    with ``\cdots``.

    >>> from qseries.series import Series
    >>> series_latex(Series.from_coefficients([1, 2, 3, 4, 5, 6], prec=6), max_terms=4)
    '1 + 2 q + \\cdots + 5 q^{4} + 6 q^{5} + O(q^{6})'
    """
    terms = list(s.terms())
    shown: list[tuple[str, str] | None] = []
    if max_terms is not None and len(terms) > max_terms:
        head = terms[: max_terms // 2]
        tail = terms[len(terms) - (max_terms - max_terms // 2):]
        shown = [_term(e, c) for e, c in head] + [None] + [_term(e, c) for e, c in tail]
    else:
        shown = [_term(e, c) for e, c in terms]
    parts: list[str] = []
    for item in shown:
        if item is None:
            parts.append("+ \\cdots")
            continue
        sign, body = item
        if not parts:
            parts.append(body if sign == "+" else f"-{body}")
        else:
            parts.append(f"{sign} {body}")
    if s.precision is not None:
        big_o = f"O({_power('q', Fraction(s.precision)) or 'q^{0}'})"
        parts.append(f"+ {big_o}" if parts else big_o)
    return " ".join(parts) if parts else "0"
