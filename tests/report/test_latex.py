"""Results as LaTeX: product forms and checks (issue 13, item 7)."""

from qseries import check, evaluate
from qseries.analysis import product_form
from qseries.lang import parse
from qseries.report.latex import check_latex, product_latex

RR_SUM = "sum_{k>=0} q^(k^2)/(q;q)_k"
RR_PRODUCT = "1/((q;q^5)_inf (q^4;q^5)_inf)"


def test_a_recovered_product_as_latex_reads_back_to_the_series():
    # the first Rogers-Ramanujan identity (Andrews, The Theory of Partitions, ch. 7)
    text = product_latex(product_form(RR_SUM, 100))
    assert text.startswith("\\[ ") and "O(q^{100})" in text
    body = text[3:text.index(" + O(")]
    assert evaluate(body, 100) == evaluate(RR_PRODUCT, 100)


def test_a_check_as_latex():
    r = check(RR_SUM, RR_PRODUCT, 100)
    text = check_latex(r, parse(RR_SUM), parse(RR_PRODUCT))
    assert "% AGREES to O(q^100)" in text and " = " in text
    r = check("1/(q;q)_inf", "sum_{k>=0} q^(k^2)/(q;q)_k^2 + q^50", 60)
    text = check_latex(r, parse("1/(q;q)_inf"), parse("sum_{k>=0} q^(k^2)/(q;q)_k^2 + q^50"))
    assert "\\neq" in text and "\\begin{tabular}{rrrr}" in text
    # p(50) = 204226 (python-flint's partitions_p agrees; from memory)
    assert "50 & 204226 & 204227 & -1 \\\\" in text


def test_no_product_form_is_a_latex_comment():
    assert product_latex(product_form("1 + 2q", 20)).startswith("%")
