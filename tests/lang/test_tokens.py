"""Plain text, Unicode and LaTeX read into one token stream (issue 13)."""

import pytest

from qseries import evaluate, parse
from qseries.errors import ParseError
from qseries.lang.tokens import tokenize


def texts(s):
    return [t.text for t in tokenize(s)][:-1]


@pytest.mark.parametrize(("latex", "plain"), [
    (r"\sum_{n\ge 0}\frac{q^{n^2}}{(q;q)_n}", "sum_{n>=0} q^(n^2)/(q;q)_n"),
    (r"\prod_{n\geq1}\frac{1}{1-q^n}", "prod_{n>=1} 1/(1-q^n)"),
    (r"(q;q)_{\infty}", "(q;q)_inf"),
    (r"\left( q;q \right)_\infty", "(q;q)_inf"),
    (r"\dfrac{1}{(q;q)_\infty} + \tfrac{1}{2}", "1/(q;q)_inf + 1/2"),
    (r"q \cdot (q;q)_\infty", "q * (q;q)_inf"),
    (r"\sum_{n=-\infty}^{\infty} q^{n^2}", "sum_{n=-inf}^{inf} q^(n^2)"),
    (r"\binom{6}{3}_q", "gaussian(6, 3)"),
    (r"\begin{bmatrix} 6 \\ 3 \end{bmatrix}_q", "gaussian(6, 3)"),
    (r"\eta(\tau)^2 \eta(5\tau)", "eta(q)^2 eta(q^5)"),
    (r"\theta_3(q) \vartheta_4(q)", "theta_3(q) theta_4(q)"),
    (r"\varphi(q) \psi(q) \chi(q)", "phi(q) psi(q) chi(q)"),
    (r"\sum_{k\leq 3, k \ge 0}", None),
])
def test_latex_reads_as_the_plain_notation(latex, plain):
    if plain is None:
        with pytest.raises(ParseError):
            parse(latex)
        return
    assert parse(latex) == parse(plain)


def test_unicode_of_pdfs_reads_as_the_plain_notation():
    assert parse("Σ_{n≥0} q^(n^2)/(q;q)_n") == parse("sum_{n>=0} q^(n^2)/(q;q)_n")
    assert parse("∏_{n≥1} (1 − q^n)") == parse("prod_{n>=1} (1 - q^n)")
    assert parse("η(5τ) θ_3(q) φ(q) ψ(q) χ(q)") == parse(
        "eta(q^5) theta_3(q) phi(q) psi(q) chi(q)")


def test_binomial_of_an_index_is_the_polynomial():
    # q^{\binom{n}{2}} = q^(n(n-1)/2): Euler's identity sum q^binom(n,2) z^n/(q;q)_n
    a = evaluate(r"\sum_{n\ge0} q^{\binom{n}{2}}/(q;q)_n", 40)
    b = evaluate("sum_{n>=0} q^(n(n-1)/2)/(q;q)_n", 40)
    assert a == b


def test_spacing_and_sizing_commands_are_dropped():
    assert texts(r"q\,\;\!\quad q\big(") == ["q", "q", "("]
    assert texts(r"\left. q \right.") == ["q"]


@pytest.mark.parametrize(("text", "column", "words"), [
    (r"\sum_{n\ge0} \foo q", 14, "unknown LaTeX command \\foo"),
    (r"(a_1,\ldots;q)_n", 6, "write every parameter out"),
    (r"\begin{cases} q \end{cases}", 1, "\\begin{cases}"),
    (r"\binom{n}{k} q", 1, "needs a number k"),
    ("q \\", 3, "backslash ends"),
])
def test_latex_errors_point_into_the_latex_text(text, column, words):
    with pytest.raises(ParseError) as info:
        parse(text, bound=["n", "k"])
    assert f"column {column}" in str(info.value)
    assert words in str(info.value)


@pytest.mark.parametrize(("latex", "plain"), [
    # what displays pasted from papers carry (found by a trial as a new user)
    (r"\left[\frac{1}{(q,q^4;q^5)_\infty}\right]", "1/((q;q^5)_inf (q^4;q^5)_inf)"),
    (r"\Bigl[ 1 - q \Bigr]^2", "(1-q)^2"),
    (r"\frac12 + \frac1{(q;q)_\infty}", "1/2 + 1/(q;q)_inf"),
    (r"\binom42_q", "gaussian(4, 2)"),
    (r"\frac{1}{(q;q)_\infty}.", "1/(q;q)_inf"),             # a display's full stop
    (r"\frac{1}{(q;q)_\infty}, \\", "1/(q;q)_inf"),
    (r"\label{eq:p} \frac{1}{(q;q)_\infty} \nonumber", "1/(q;q)_inf"),
])
def test_display_extras_read_as_papers_mean_them(latex, plain):
    assert evaluate(latex, 30) == evaluate(plain, 30)


@pytest.mark.parametrize("display", [
    r"\[ {} \]", r"$$ {} $$", r"${}$", r"\( {} \)", "  \\[{}\\]  ",
    r"\begin{{equation}} {} \end{{equation}}", r"\begin{{equation*}} {}. \end{{equation*}}",
    r"\begin{{align*}} {} \end{{align*}}",
])
def test_a_display_pasted_whole_reads_as_its_body(display):
    body = r"\frac{1}{(q;q)_\infty}"
    assert evaluate(display.format(body), 30) == evaluate("1/(q;q)_inf", 30)


@pytest.mark.parametrize(("text", "column", "words"), [
    (r"\[ q + 1", 1, "not closed by \\]"),
    (r"q + 1 \]", 7, "no \\[ opened"),
    ("$$ q", 1, "not closed by $$"),
    ("q $", 3, "no $ opened"),
    (r"\begin{equation} q", 1, "not closed by \\end{equation}"),
])
def test_an_unmatched_display_delimiter_is_an_error_at_it(text, column, words):
    with pytest.raises(ParseError) as info:
        parse(text)
    assert f"column {column}" in str(info.value) and words in str(info.value)


def test_a_plain_bracket_is_still_a_coefficient_extractor():
    assert evaluate("[q^(5n+4)] 1/(q;q)_inf", 5)[0] == 5      # p(4), from memory
    with pytest.raises(ParseError):
        tokenize(r"\label{eq:p")
