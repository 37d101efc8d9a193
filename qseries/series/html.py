"""The HTML form of a series for notebooks: the first terms, the order, and a line saying
how much is known; every piece of text escaped.

>>> from qseries.series import Series
>>> series_html(Series.from_coefficients([1, -3, 0, 5], prec=4))[28:]  # doctest: +ELLIPSIS
'<span>1 &minus; 3<i>q</i> + 5<i>q</i><sup>3</sup> + O(<i>q</i><sup>4</sup>)</span>...
"""

from __future__ import annotations

import html
from fractions import Fraction
from typing import TYPE_CHECKING

from ..backend import LaurentPoly
from .formatting import number_text

if TYPE_CHECKING:
    from .core import Exponent, Series

#: terms a notebook shows by default (``Series.html(max_terms=None)`` shows all)
SHOWN_TERMS = 20
#: a coefficient with more digits than this is shown as its first and last digits
SHOWN_DIGITS = 40


def _digits(n: int) -> str:
    """An integer, abbreviated in the middle when it has more than ``SHOWN_DIGITS`` digits.

    >>> _digits(2**200)
    '16069380442589...5301376 <small>(61 digits)</small>'
    """
    text = number_text(n)
    if len(text) <= SHOWN_DIGITS:
        return text
    return f"{text[:14]}...{text[-7:]} <small>({len(text)} digits)</small>"


def _number(a: Fraction) -> str:
    """A non-negative rational: 5, 3/4."""
    if a.denominator == 1:
        return _digits(a.numerator)
    return f"{_digits(a.numerator)}/{_digits(a.denominator)}"


def _power(var: str, e: Fraction) -> str:
    """var^e as HTML (escaped name)."""
    name = f"<i>{html.escape(var)}</i>"
    if e == 0:
        return ""
    if e == 1:
        return name
    text = str(e.numerator) if e.denominator == 1 else f"{e.numerator}/{e.denominator}"
    return f"{name}<sup>{html.escape(text)}</sup>"


def _signed(c: Fraction, mono: str) -> tuple[str, str]:
    sign = "-" if c < 0 else "+"
    a = abs(c)
    if not mono:
        return sign, _number(a)
    if a == 1:
        return sign, mono
    return sign, (f"{_number(a)}{mono}" if a.denominator == 1 else f"({_number(a)}){mono}")


def _term(e: Exponent, c: object) -> tuple[str, str]:
    mono = _power("q", Fraction(e))
    if isinstance(c, LaurentPoly):
        parts = []
        for exps, coef in c.terms():
            inner = "".join(_power(name, Fraction(k)) for name, k in
                            zip(c.ring.names, exps[1:], strict=True))
            parts.append(_signed(Fraction(coef), inner))
        if len(parts) == 1:
            sign, body = parts[0]
            return sign, body + mono
        text = " ".join(b if i == 0 and s == "+" else f"&minus;{b}" if i == 0 else
                        f"{'+' if s == '+' else '&minus;'} {b}"
                        for i, (s, b) in enumerate(parts))
        return "+", f"({text}){mono}"
    return _signed(Fraction(c), mono)   # type: ignore[arg-type]


def series_html(s: Series, max_terms: int | None = SHOWN_TERMS) -> str:
    """HTML of ``s``: its first ``max_terms`` nonzero terms (all when None), "..." with the
    number of terms left out, the order O(q^N), and a line with the ring, the precision and
    the number of nonzero terms.

    >>> from qseries.series import Series
    >>> s = Series.from_coefficients(list(range(1, 30)), prec=29)
    >>> "+ ... (27 more terms) +" in series_html(s, max_terms=2)
    True
    """
    terms = list(s.terms())
    shown = terms if max_terms is None else terms[:max_terms]
    parts: list[str] = []
    for e, c in shown:
        sign, body = _term(e, c)
        if not parts:
            parts.append(body if sign == "+" else f"&minus;{body}")
        else:
            parts.append(f"{'+' if sign == '+' else '&minus;'} {body}")
    left_out = len(terms) - len(shown)
    if left_out:
        parts.append(f"+ ... ({left_out} more term{'s' if left_out > 1 else ''})")
    if s.precision is not None:
        big_o = f"O({_power('q', Fraction(s.precision)) or '1'})"
        parts.append(f"+ {big_o}" if parts else big_o)
    body = " ".join(parts) if parts else "0"
    known = "exact polynomial" if s.precision is None else \
        f"known to O(q^{html.escape(str(s.precision))})"
    note = (f"{known}, {len(terms)} nonzero term{'' if len(terms) == 1 else 's'}, "
            f"coefficients in {html.escape(s.ring.name)}")
    if left_out:
        note += "; all of them: <code>.html(max_terms=None)</code> or <code>.view()</code>"
    return (f'<div class="qseries-series"><span>{body}</span><br>'
            f'<small style="color:gray">{note}</small></div>')


class SeriesView:
    """A series shown with a chosen number of terms (all by default) in a notebook:
    ``f.view()`` displays the whole of ``f``, ``f.view(100)`` its first 100 terms.

    >>> from qseries.series import Series
    >>> v = Series.from_coefficients(list(range(1, 60)), prec=59).view()
    >>> "more term" in v._repr_html_(), v._repr_latex_().count("+") > 50
    (False, True)
    """

    def __init__(self, series: Series, terms: int | None = None) -> None:
        self.series = series
        self.terms = terms

    def _repr_html_(self) -> str:
        return series_html(self.series, self.terms)

    def _repr_latex_(self) -> str:
        from .latex import series_latex

        return f"${series_latex(self.series, self.terms)}$"

    def __repr__(self) -> str:
        from .formatting import format_series

        return format_series(self.series, self.terms)
