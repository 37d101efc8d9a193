r"""Results as LaTeX a paper can include: a check (the identity with its order, and the
coefficients around a mismatch as a tabular), a recovered product.

>>> from qseries.analysis import check, product_form
>>> print(product_latex(product_form("sum_{k>=0} q^(k^2)/(q;q)_k", 50)))
\[ \frac{1}{(q, q^{4};q^{5})_\infty} + O(q^{50}) \]
"""

from __future__ import annotations

from fractions import Fraction

from ..analysis import CheckResult, ProductForm
from ..lang import Node, parse
from ..lang.ast import BinOp, Neg, Num, Poch
from ..lang.printer import show_latex
from ..series import Series


def _order(e: object) -> str:
    f = Fraction(e)  # type: ignore[arg-type]
    text = str(f.numerator) if f.denominator == 1 else f"{f.numerator}/{f.denominator}"
    return f"O(q^{{{text}}})"


def _number(c: object) -> str:
    if isinstance(c, (int, Fraction)):
        f = Fraction(c)
        if f.denominator == 1:
            return str(f.numerator)
        return f"{'-' if f < 0 else ''}\\frac{{{abs(f.numerator)}}}{{{f.denominator}}}"
    return f"${show_latex(parse(str(c)))}$"


def _reciprocals(node: Node) -> Node:
    """x^-k as 1/x^k, which papers print as a fraction."""
    if isinstance(node, BinOp) and node.op == "^" and isinstance(node.left, Poch) \
            and isinstance(node.right, Neg):
        exp = node.right.operand
        den = node.left if isinstance(exp, Num) and exp.value == 1 else \
            BinOp("^", node.left, exp)
        return BinOp("/", Num(Fraction(1)), den)
    return node


def expansion_latex(expr: Node, s: Series, order: int) -> str:
    r"""The expansion of ``expr`` modulo q^order as a LaTeX display (which the parser
    reads back, delimiters included, as an identity for ``check``).

    >>> from qseries.engine import evaluate
    >>> print(expansion_latex(parse("(q;q)_inf^3"), evaluate("(q;q)_inf^3", 7), 7))
    \[ (q;q)_\infty^{3} = 1 - 3 q + 5 q^{3} - 7 q^{6} + O(q^{7}) \]
    """
    return f"\\[ {show_latex(expr)} = {s.truncate(order).latex()} \\]"


def product_latex(pf: ProductForm) -> str:
    """The recovered product as a LaTeX display (and its eta quotient when there is one)."""
    if pf.expression is None:
        return f"% no product form to this order: {pf.reason}"
    body = show_latex(_reciprocals(parse(pf.expression)))
    lines = [f"\\[ {body} + {_order(pf.order)} \\]"]
    if pf.eta:
        lines.append(f"\\[ = {show_latex(parse(pf.eta))} + {_order(pf.order)} \\]")
    return "\n".join(lines)


def check_latex(r: CheckResult, lhs: Node, rhs: Node, radius: int = 2) -> str:
    r"""The checked identity as a LaTeX display, with the order compared; after a mismatch,
    the identity with \neq and a tabular of both sides' coefficients around it.

    >>> from qseries.analysis import check
    >>> r = check("1/(1-q)", "1 + q", order=9)
    >>> print(check_latex(r, parse("1/(1-q)"), parse("1 + q"), radius=0))
    % DIFFERS: first at q^2
    \[ \frac{1}{1 - q} \neq 1 + q \pmod{q^{9}} \]
    \begin{tabular}{rrrr}
    $n$ & left & right & difference \\ \hline
    2 & 1 & 0 & 1 \\
    \end{tabular}
    """
    left, right = show_latex(lhs), show_latex(rhs)
    if r.holds is None:
        return f"% INCONCLUSIVE: {r.verdict}"
    if r.holds:
        return (f"% AGREES to O(q^{r.order_verified}) ({r.method}; evidence, not a proof)\n"
                f"\\[ {left} = {right} + {_order(r.order_verified)} \\]")
    m = r.first_mismatch
    assert m is not None
    rows = [f"{_number(e)} & {_number(a)} & {_number(b)} & {_number(a - b)} \\\\"
            for e, a, b in r.neighbours(radius)]
    return "\n".join([f"% DIFFERS: first at q^{m.exponent}",
                      f"\\[ {left} \\neq {right} \\pmod{{q^{{{r.order_verified}}}}} \\]",
                      "\\begin{tabular}{rrrr}",
                      "$n$ & left & right & difference \\\\ \\hline", *rows,
                      "\\end{tabular}"])
