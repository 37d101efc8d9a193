r"""Results as a notebook shows them: HTML (tables, escaped text) and LaTeX that MathJax
typesets (``$$ ... $$`` with ``array``, no ``tabular``), for a check, a product form and a
distribution.

Importing this module registers the renderers with :mod:`qseries.analysis.display`, so that
``CheckResult``, ``ProductForm`` and ``Distribution`` show themselves in Jupyter; ``import
qseries`` imports it.  (The result classes cannot import the report layer, which lies below
them; see the contributor guide.)

>>> from qseries.analysis import check
>>> r = check("1/(1-q)", "1 + q", order=6)
>>> "<table" in r._repr_html_() and "DIFFERS" in r._repr_html_()
True
>>> print(check_latex_display(check("(q;q)_inf", "1 - q - q^2", order=5)))
$$\textbf{AGREES}\ \text{to}\ O(q^{5})\ \text{(exact; evidence, not a proof)}$$
"""

from __future__ import annotations

import html
from collections.abc import Iterable
from fractions import Fraction

from ..analysis import CheckResult, Distribution, Hint, ProductForm, diagnose, normal_moment
from ..analysis.display import register_display
from ..errors import QSeriesError
from ..lang import parse
from ..lang.printer import show_latex
from ..series.formatting import coefficient_text, number_text
from .distribution import decimal_text, distribution_lines
from .latex import _reciprocals
from .product import product_lines, product_notes
from .verdict import check_lines

#: a distribution with more values than this shows the first and last half of it
SHOWN_ROWS = 100
#: the neighbours of a mismatch shown on either side
RADIUS = 3

_COLOURS = {"AGREES": "#1a7f37", "DIFFERS": "#cf222e", "INCONCLUSIVE": "#9a6700"}


def _e(x: object) -> str:
    return html.escape(str(x))


def _tex_text(s: str) -> str:
    r"""Plain text for ``\text{...}`` as MathJax reads it (verbatim, so characters that
    would end or upset it are replaced: braces by parentheses, a backslash by a slash, $ % &
    # spelled out).

    >>> _tex_text("50% of {a_b} & $x$")
    '50 percent of (a_b) and x'
    """
    table = {"{": "(", "}": ")", "\\": "/", "%": " percent", "&": "and", "$": "", "#": "no. "}
    return "".join(table.get(ch, ch) for ch in s)


def _tex_order(e: object) -> str:
    f = Fraction(e)  # type: ignore[arg-type]
    return f"O(q^{{{f.numerator if f.denominator == 1 else f}}})"


def _tex_number(c: object) -> str:
    if isinstance(c, (int, Fraction)):
        f = Fraction(c)
        if f.denominator == 1:
            return number_text(f.numerator)
        sign = "-" if f < 0 else ""
        return f"{sign}\\frac{{{number_text(abs(f.numerator))}}}{{{number_text(f.denominator)}}}"
    return show_latex(parse(str(c)))


def verdict_word(r: CheckResult) -> str:
    """AGREES, DIFFERS or INCONCLUSIVE.

    >>> from qseries.analysis import check
    >>> verdict_word(check("1", "1", order=3))
    'AGREES'
    """
    if r.holds is None:
        return "INCONCLUSIVE"
    return "AGREES" if r.holds else "DIFFERS"


def _hints(r: CheckResult) -> list[Hint]:
    try:
        return diagnose(r)
    except QSeriesError:
        return []


def check_html(r: CheckResult, hints: Iterable[Hint] | None = None) -> str:
    """A check as HTML: the verdict word (coloured) and sentence, at a mismatch the table of
    both sides' coefficients around it (the first differing row marked), the hints (from
    :func:`qseries.analysis.diagnose` unless given) and the time.

    >>> from qseries.analysis import check
    >>> text = check_html(check("1/(1-q)", "1/(1-q) + q^4", order=9), hints=[])
    >>> text.count("<tr>"), "<b>4</b>" in text
    (8, True)
    """
    word = verdict_word(r)
    parts = [f'<div class="qseries-check"><p><b style="color:{_COLOURS[word]}">{word}</b> '
             f"{_e(r.verdict)}</p>"]
    rows = r.neighbours(RADIUS)
    if rows:
        head = "weighted degree" if r.weighted else "exponent"
        mark = r.first_mismatch.exponent if r.first_mismatch is not None else None
        body = []
        for e, a, b in rows:
            cells = [coefficient_text(e), r.unweighted_text(a, e), r.unweighted_text(b, e),
                     r.unweighted_text(a - b, e)]
            if e == mark:
                cells = [f"<b>{_e(c)}</b>" for c in cells]
            else:
                cells = [_e(c) for c in cells]
            body.append("<tr>" + "".join(f'<td style="text-align:right">{c}</td>'
                                         for c in cells) + "</tr>")
        parts.append(f"<table><thead><tr><th>{_e(head)}</th><th>left</th><th>right</th>"
                     f"<th>difference</th></tr></thead><tbody>{''.join(body)}</tbody>"
                     f"</table>")
    shown = _hints(r) if hints is None else list(hints)
    if shown:
        items = "".join(f"<li><i>{_e(h.kind)}</i>: {_e(h.message)}</li>" for h in shown)
        parts.append(f"<p>hints:</p><ul>{items}</ul>")
    parts.append(f'<small style="color:gray">{_e(r.method)} comparison, '
                 f"{r.seconds:.3f} s</small></div>")
    return "".join(parts)


def check_latex_display(r: CheckResult) -> str:
    r"""A check as LaTeX for MathJax: the verdict word with the order, and at a mismatch an
    ``array`` of both sides' coefficients around it.

    >>> from qseries.analysis import check
    >>> print(check_latex_display(check("1/(1-q)", "1 + q", order=4)))
    ... # doctest: +NORMALIZE_WHITESPACE
    $$\textbf{DIFFERS}\ \text{first at}\ q^{2}\qquad\begin{array}{rrrr} n & \text{left}
    & \text{right} & \text{difference} \\ \hline 0 & 1 & 1 & 0 \\ 1 & 1 & 1 & 0 \\ 2 & 1
    & 0 & 1 \\ 3 & 1 & 0 & 1 \\ \end{array}$$
    """
    if r.holds is None:
        return f"$$\\textbf{{INCONCLUSIVE}}\\ \\text{{{_tex_text(r.reason or '')}}}$$"
    if r.holds:
        how = _tex_text(f"({r.method}; evidence, not a proof)")
        return (f"$$\\textbf{{AGREES}}\\ \\text{{to}}\\ {_tex_order(r.order_verified)}\\ "
                f"\\text{{{how}}}$$")
    m = r.first_mismatch
    assert m is not None
    where = "weighted degree " if r.weighted else ""
    at = f"\\text{{{where}}}{_tex_number(m.exponent)}" if r.weighted else \
        f"q^{{{_tex_number(m.exponent)}}}"
    rows = " ".join(f"{_tex_number(e)} & {_tex_number(a)} & {_tex_number(b)} & "
                    f"{_tex_number(a - b)} \\\\" for e, a, b in r.neighbours(RADIUS))
    return (f"$$\\textbf{{DIFFERS}}\\ \\text{{first at}}\\ {at}\\qquad"
            f"\\begin{{array}}{{rrrr}} n & \\text{{left}} & \\text{{right}} & "
            f"\\text{{difference}} \\\\ \\hline {rows} \\end{{array}}$$")


def product_html(pf: ProductForm) -> str:
    """A product form as HTML: the product in the notation (which ``qseries`` reads back)
    with its order, the period and the eta quotient; or why there is none.

    >>> from qseries.analysis import product_form
    >>> text = product_html(product_form("sum_{k>=0} q^(k^2)/(q;q)_k", 40))
    >>> "(q, q^4;q^5)_inf^-1 + O(q^40)" in text, "period 5" in text
    (True, True)
    """
    if pf.expression is None:
        return (f'<div class="qseries-product"><p>no product form of this kind to this '
                f"order: {_e(pf.reason)}</p></div>")
    order = coefficient_text(pf.order)
    items = "".join(f"<li>{_e(label)}" + (f"<code>{_e(value)}</code>" if value else "")
                    + "</li>" for label, value in product_notes(pf))
    return (f'<div class="qseries-product"><p><code>{_e(pf.expression)} + O(q^{_e(order)})'
            f"</code></p><ul>{items}</ul></div>")


def product_latex_display(pf: ProductForm) -> str:
    r"""A product form as LaTeX for MathJax (its eta quotient on a second line).

    >>> from qseries.analysis import product_form
    >>> print(product_latex_display(product_form("(q;q)_inf^3", 20)))
    ... # doctest: +NORMALIZE_WHITESPACE
    $$\begin{aligned} &(q;q)_\infty^{3} + O(q^{20}) \\
    &= \eta(\tau)^{3} q^{\frac{-1}{8}} + O(q^{20})\end{aligned}$$
    """
    if pf.expression is None:
        return f"$$\\text{{no product form to this order: {_tex_text(pf.reason)}}}$$"
    lines = [f"&{show_latex(_reciprocals(parse(pf.expression)))} + {_tex_order(pf.order)}"]
    if pf.eta:
        lines.append(f"&= {show_latex(parse(pf.eta))} + {_tex_order(pf.order)}")
    return "$$\\begin{aligned} " + " \\\\ ".join(lines) + "\\end{aligned}$$"


def _rows(d: Distribution) -> list[tuple[int, int] | None]:
    items = list(d.counts.items())
    if len(items) <= SHOWN_ROWS:
        return list(items)
    half = SHOWN_ROWS // 2
    return items[:half] + [None] + items[-half:]


def distribution_html(d: Distribution, var: str | None = None, moments: int = 6) -> str:
    """A distribution as HTML: the number of objects, a table of every value of the
    statistic (named ``var``, by default the variable that marked it) with its count, share
    and a bar (the first and last 50 values when there are more than 100), the mode, the
    mean and variance (exact and decimal), and the standardised moments beside the normal
    distribution's.

    >>> from qseries.analysis import distributions
    >>> [d] = distributions("sum_{k>=0} z^k q^(k^2)/(q;q)_k^2", "z", [10])
    >>> text = distribution_html(d)
    >>> text.count("<tr>"), "mode 2" in text, "38/21" in text
    (4, True, True)
    """
    var = var or d.var or "X"
    top = max(d.counts.values())
    mode = [j for j, c in d.counts.items() if c == top]
    body = []
    for item in _rows(d):
        if item is None:
            body.append('<tr><td colspan="4" style="text-align:center">...</td></tr>')
            continue
        j, c = item
        share = c / d.total
        width = max(1, round(120 * c / top))
        body.append(f'<tr><td style="text-align:right">{j}</td>'
                    f'<td style="text-align:right">{_e(number_text(c))}</td>'
                    f'<td style="text-align:right">{share:.6f}</td>'
                    f'<td style="text-align:left"><div style="background:#4c72b0;'
                    f'height:0.8em;width:{width}px"></div></td></tr>')
    std = ", ".join(f"{r}: {d.standardised_moment(r):.4f} [{normal_moment(r)}]"
                    for r in range(1, moments + 1))
    return (f'<div class="qseries-distribution"><p>n = {d.n}: {_e(number_text(d.total))} '
            f"objects; mode {', '.join(map(str, mode))}; mean {_e(number_text(d.mean))} = "
            f"{_e(decimal_text(d.mean))}; variance {_e(number_text(d.variance))} = "
            f"{_e(decimal_text(d.variance))}</p>"
            f"<table><thead><tr><th>{_e(var)}</th><th>count</th><th>share</th><th></th></tr>"
            f"</thead><tbody>{''.join(body)}</tbody></table>"
            f'<small style="color:gray">standardised moments (normal distribution in '
            f"brackets): {_e(std)}</small></div>")


def distribution_latex_display(d: Distribution) -> str:
    r"""A distribution's size, mean and variance as LaTeX for MathJax.

    >>> from qseries.analysis import Distribution
    >>> print(distribution_latex_display(Distribution(3, {0: 1, 2: 1})))
    $$n = 3:\quad 2\ \text{objects},\quad \mu = 1,\quad \sigma^2 = 1$$
    """
    return (f"$$n = {d.n}:\\quad {number_text(d.total)}\\ \\text{{objects}},\\quad "
            f"\\mu = {_tex_number(d.mean)},\\quad \\sigma^2 = {_tex_number(d.variance)}$$")


register_display(CheckResult, "html", check_html)
register_display(CheckResult, "latex", check_latex_display)
register_display(ProductForm, "html", product_html)
register_display(ProductForm, "latex", product_latex_display)
register_display(Distribution, "html", distribution_html)
register_display(Distribution, "latex", distribution_latex_display)
# IPython's plain text is what the command line prints
register_display(CheckResult, "text", lambda r: "\n".join(check_lines(r, _hints(r))))
register_display(ProductForm, "text", lambda pf: "\n".join(product_lines(pf)))
register_display(Distribution, "text",
                 lambda d: "\n".join(distribution_lines(d, d.var or "X", 6)))
