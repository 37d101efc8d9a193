"""Notebook renderings of results (qseries/report/notebook.py): HTML tables with escaped
text, LaTeX that MathJax reads, registered on the result classes."""

import re

from qseries import check, distributions, product_form
from qseries.analysis import Distribution, Hint
from qseries.report.notebook import (
    check_html,
    check_latex_display,
    distribution_html,
    distribution_latex_display,
    product_html,
    product_latex_display,
)
from tests.series.test_html import text_of


def _cells(markup: str) -> list[list[str]]:
    rows = re.findall(r"<tr>(.*?)</tr>", markup)
    return [[text_of(c) for c in re.findall(r"<t[dh][^>]*>(.*?)</t[dh]>", r)] for r in rows]


def test_a_mismatch_shows_the_neighbour_table_and_the_hint():
    # Rogers-Ramanujan's second identity, sum q^(k^2+k)/(q;q)_k = 1/((q^2;q^5)_inf
    # (q^3;q^5)_inf) (Andrews, The Theory of Partitions, Cor. 7.9), with a spurious factor
    # 1/(q^20;q^20)_inf on the right: first difference at q^20, and the diagnosis names it
    r = check("sum_{k>=0} q^(k^2+k)/(q;q)_k",
              "1/((q^2;q^5)_inf (q^3;q^5)_inf (q^20;q^20)_inf)", order=200)
    markup = r._repr_html_()
    shown = text_of(markup)
    assert shown.startswith("DIFFERS the two sides differ: first at q^20")
    rows = _cells(markup)
    assert rows[0] == ["exponent", "left", "right", "difference"]
    exps = [int(row[0]) for row in rows[1:]]
    assert exps == list(range(17, 24))
    at = rows[1 + exps.index(20)]
    assert int(at[1]) - int(at[2]) == int(at[3]) == r.first_mismatch.difference
    assert "<b>20</b>" in markup
    assert "product-factor" in shown
    assert r._repr_html_() == check_html(r)


def test_agreement_and_inconclusive():
    ok = check("(q;q)_inf", "sum_{n=-inf}^{inf} (-1)^n q^(n(3n-1)/2)", order=100)  # Euler
    assert text_of(ok._repr_html_()).startswith("AGREES the two sides agree to O(q^100)")
    assert "<table" not in ok._repr_html_()
    assert check_latex_display(ok).startswith("$$\\textbf{AGREES}\\ \\text{to}\\ O(q^{100})")
    no = check("O(q^-5) + 1", "2")
    assert text_of(no._repr_html_()).startswith("INCONCLUSIVE inconclusive: no coefficient")
    assert no._repr_latex_().startswith("$$\\textbf{INCONCLUSIVE}")


def test_text_is_escaped():
    r = check("1/(1-q)", "1 + q", order=5)
    markup = check_html(r, [Hint("shift", "<script>alert(1)</script> & more")])
    assert "<script>" not in markup and "&lt;script&gt;" in markup and "&amp; more" in markup
    text_of(markup)                       # still well formed
    d = Distribution(4, {0: 1, 2: 3})
    assert "&lt;z&gt;" in distribution_html(d, var="<z>")


def test_latex_of_a_mismatch_is_an_array():
    r = check("1/(1-q)", "1 + q", order=4)
    tex = r._repr_latex_()
    assert tex.startswith("$$") and tex.endswith("$$") and "tabular" not in tex
    assert "\\begin{array}{rrrr}" in tex and "2 & 1 & 0 & 1 \\\\" in tex


def test_weighted_check_shows_coefficients_in_the_variables():
    # (z q;q)_inf against a wrong sign: the table is by weighted degree
    r = check("(z q;q)_inf", "(-z q;q)_inf", order=4, weights={"z": 1})
    markup = r._repr_html_()
    assert _cells(markup)[0][0] == "weighted degree" and "z*q" in text_of(markup)
    assert "weighted degree" in r._repr_latex_()


def test_product_form_renderings():
    # Rogers-Ramanujan: sum q^(k^2)/(q;q)_k = 1/((q;q^5)_inf (q^4;q^5)_inf)
    pf = product_form("sum_{k>=0} q^(k^2)/(q;q)_k", 50)
    shown = text_of(pf._repr_html_())
    assert "(q, q^4;q^5)_inf^-1 + O(q^50)" in shown and "period 5" in shown
    assert pf._repr_latex_() == product_latex_display(pf)
    assert "\\infty" in pf._repr_latex_() and "O(q^{50})" in pf._repr_latex_()
    # Euler: (q;q)_inf^3 is eta(tau)^3 q^(-1/8)
    assert "eta(q)^3 q^(-1/8)" in text_of(product_html(product_form("(q;q)_inf^3", 30)))
    none = product_form("1 + 2q + 3q^5 + q^30", 60)     # exponents that neither end nor repeat
    assert none.expression is None
    assert text_of(none._repr_html_()).startswith("no product form of this kind")
    assert none._repr_latex_().startswith("$$\\text{no product form")


def test_distribution_table_shows_every_value_and_the_mode():
    # Durfee squares of the 42 partitions of 10: 10 of side 1, 30 of side 2, 2 of side 3
    # (the module example of qseries.analysis.statistic; p(10) = 42, A000041)
    [d] = distributions("sum_{k>=0} z^k q^(k^2)/(q;q)_k^2", "z", [10])
    markup = d._repr_html_()
    rows = _cells(markup)
    assert [r[:2] for r in rows[1:]] == [["1", "10"], ["2", "30"], ["3", "2"]]
    assert "42 objects; mode 2" in text_of(markup)
    assert distribution_latex_display(d) == d._repr_latex_()
    assert "\\mu = \\frac{38}{21}" in d._repr_latex_()


def test_a_wide_distribution_is_cut_in_the_middle():
    # number of parts of the partitions of 300: values 1 .. 300, all present
    [d] = distributions("1/(z*q;q)_inf", "z", [300])
    rows = _cells(distribution_html(d))
    assert len(rows) == 1 + 100 + 1 and rows[51] == ["..."]
    assert rows[1][0] == "1" and rows[-1][0] == "300"


def test_ipython_plain_text_is_what_the_command_line_prints():
    from qseries.report import check_lines, distribution_lines, product_lines

    class Printer:
        def __init__(self):
            self.out = ""

        def text(self, t):
            self.out += t

    def pretty(obj):
        p = Printer()
        obj._repr_pretty_(p, False)
        return p.out

    r = check("1/(1-q)", "1 + q", order=6)
    assert pretty(r).splitlines()[:-1] == check_lines(r)[:-1]        # the time may differ
    pf = product_form("(q;q)_inf^3", 30)
    assert pretty(pf) == "\n".join(product_lines(pf))
    [d] = distributions("sum_{k>=0} w^k q^(k^2)/(q;q)_k^2", "w", [10])
    assert pretty(d) == "\n".join(distribution_lines(d, "w", 6))
    assert "<th>w</th>" in d._repr_html_()


def test_import_qseries_registers_the_renderers_for_the_first_display():
    # the renderers are imported at the first display (not with the package, which the
    # command line imports too); a fresh process sees them registered all the same, and
    # qseries.prove (the modular-form machinery) likewise loads on first use
    import subprocess
    import sys

    probe = (
        "import sys, qseries\n"
        "print('qseries.report.notebook' in sys.modules, 'qseries.modularity' in sys.modules)\n"
        "r = qseries.check('1/(1-q)', '1 + q', order=5)\n"
        "print(r._repr_html_().startswith('<div'), 'qseries.report.notebook' in sys.modules)\n"
        "print(qseries.prove is sys.modules['qseries.modularity.prove'].prove)\n")
    done = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True,
                          timeout=120, check=True)
    assert done.stdout.split() == ["False", "False", "True", "True", "True"]
