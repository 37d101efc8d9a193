"""The parser: the notation of papers, positions in errors, limits, and no code execution."""

from fractions import Fraction

import pytest

from qseries.errors import ParseError
from qseries.lang.ast import BigOp, BinOp, Call, Name, Neg, Num, Poch, Q
from qseries.lang.parser import MAX_DEPTH, MAX_TEXT, parse


def test_implicit_multiplication_and_powers():
    assert parse("2q^3") == BinOp("*", Num(Fraction(2)), BinOp("^", Q(), Num(Fraction(3))))
    assert parse("q**3") == parse("q^3")
    assert parse("-q^2") == Neg(BinOp("^", Q(), Num(Fraction(2))))
    assert parse("q^-2") == BinOp("^", Q(), Neg(Num(Fraction(2))))
    # right associative powers
    assert parse("q^2^3") == parse("q^(2^3)")


def test_pochhammer_forms():
    a = parse("(q;q)_inf")
    assert a == Poch((Q(),), Q(), None)
    assert parse("(q;q)_∞") == a == parse("(q)_inf") == parse("(q;q)_{inf}")
    assert parse("(q,-q;q^2)_inf").params == (Q(), Neg(Q()))
    assert parse("(q;q)_(2k+1)", bound={"k"}).length == parse("2k+1", bound={"k"})
    assert parse("(q;q)_{2k}", bound={"k"}).length == parse("2k", bound={"k"})
    assert parse("(q;q)_10").length == Num(Fraction(10))
    assert parse("(q;q)_k", bound={"k"}).length == Name("k")


def test_sums_and_products():
    s = parse("sum_{k>=0} q^(k^2)/(q;q)_k + 1")
    assert isinstance(s, BinOp) and s.op == "+"
    assert isinstance(s.left, BigOp) and s.left.lower == Num(Fraction(0)) and s.left.upper is None
    assert parse("sum_{k=0}^{inf} q^k") == parse("sum_{k>=0} q^k")
    b = parse("sum_{k=-inf}^{inf} q^(k^2)")
    assert b.lower is None and b.upper is None
    f = parse("sum_{k=0}^{10} q^k")
    assert f.upper == Num(Fraction(10))
    p = parse("prod_{n=1}^{inf} (1-q^n)")
    assert p.kind == "prod" and p.upper is None
    # the body is the product term that follows, up to the next + or -
    t = parse("2 sum_{k>=0} q^k (1-q) - 3")
    assert t.op == "-" and t.left.op == "*" and isinstance(t.left.right, BigOp)
    # parentheses end a body
    u = parse("(sum_{k>=0} q^k) (1-q)")
    assert u.op == "*" and isinstance(u.left, BigOp)


def test_nested_sums_see_outer_variables():
    t = parse("sum_{n>=0} sum_{k=0}^{n} q^(n+k)")
    assert isinstance(t.body, BigOp) and t.body.upper == Name("n")


def test_functions_and_big_o():
    assert parse("eta(q^2)") == Call("eta", (BinOp("^", Q(), Num(Fraction(2))),))
    assert parse("1 + O(q^5)").right.exponent == Num(Fraction(5))


@pytest.mark.parametrize("text, column", [
    ("1 + )", 5),
    ("(q;q", 5),
    ("(q;q)_", 7),
    ("q^", 3),
    ("", 1),
    ("2 $ 3", 3),
    ("1.5 q", 2),
    ("Sum_{k>=0} q + q", 1),          # a word near a known name
    ("q + etta(q)", 5),
    ("sum_{k>0} q^k", 7),
    ("sum_{k=0} q^k", 11),
    ("sum_{q>=0} q", 6),
    ("eta(q, q)", 1),
    ("O(2)", 1),
    ("q1 + z", 1),
    ("sum_{k=0}^n q^k", 11),
    ("sum_{k>=0} sum_{k>=0} q", 17),
    ("(q;q)_n", 7),
])
def test_errors_name_the_position(text, column):
    with pytest.raises(ParseError) as info:
        parse(text)
    assert f"column {column}" in str(info.value)
    assert "^" in str(info.value) or text == ""


@pytest.mark.parametrize("text", [
    "__import__('os').system('echo hi')",
    "exec('1')",
    "eval(1)",
    "q.__class__",
    "lambda: 1",
    "open('/etc/passwd')",
    "[x for x in ()]",
])
def test_code_is_rejected_not_run(text):
    with pytest.raises(ParseError):
        parse(text)


def test_limits():
    with pytest.raises(ParseError, match="longer than"):
        parse("q+" * MAX_TEXT + "q")
    with pytest.raises(ParseError, match="nested more than"):
        parse("(" * (MAX_DEPTH + 5) + "q" + ")" * (MAX_DEPTH + 5))
    with pytest.raises(ParseError, match="digits"):
        parse("1" * 5000)


def test_extra_variables_are_single_letters_not_bound():
    from qseries.lang.ast import Var, extra_variables
    node = parse("sum_{k>=0} z^k x1 q^k/(a;q)_k")
    assert extra_variables(node) == {"z", "x1", "a"}
    assert parse("z") == Var("z")
    # a bound letter is not an extra variable
    assert extra_variables(parse("sum_{z>=0} q^z")) == frozenset()


def test_coefficient_extractor_forms():
    from qseries.lang.ast import Dissect

    body = parse("1/(q;q)_inf")
    d = parse("[q^(5n+4)] 1/(q;q)_inf")
    assert d == Dissect(5, Fraction(4), body)
    # braces (LaTeX), any fresh index letter, the linear form written in other ways
    assert parse(r"[q^{5n+4}]\frac{1}{(q;q)_\infty}") == d
    assert parse("[q^(5k+4)] 1/(q;q)_inf") == d
    assert parse("[q^(4 + n*5)] 1/(q;q)_inf") == d
    assert parse("[q^(5(n+1) - 1)] 1/(q;q)_inf") == d
    assert parse(r"\left[q^{5n+4}\right] \frac{1}{(q;q)_\infty}") == d
    # Atkin's U_m is the residue 0
    assert parse("U_5(1/(q;q)_inf)") == parse("U_{5}(1/(q;q)_inf)") == Dissect(5, Fraction(0),
                                                                               body)
    # fractional residues (the class of the body's exponents)
    assert parse("[q^(5n - 1/24)] eta(q)").r == Fraction(-1, 24)
    # the extractor takes the product term that follows, as a sum does
    t = parse("[q^(2n)] q (q;q)_inf + 1")
    assert isinstance(t, BinOp) and t.op == "+" and isinstance(t.left, Dissect)
    assert t.left.body == parse("q (q;q)_inf")
    # a factor before it multiplies
    assert parse("3 [q^(2n)] q") == BinOp("*", Num(Fraction(3)), Dissect(2, Fraction(0), Q()))


@pytest.mark.parametrize("text, column, words", [
    ("[q^5n+4] F", 4, "in parentheses"),
    ("[q^(5n+m)] q", 4, "exactly one index letter"),
    ("[q^(n^2)] q", 4, "m n + r"),
    ("[q^(n/2)] q", 4, "m n + r"),
    ("[q^(-5n)] q", 4, "m n + r"),
    ("[q^(5)] q", 4, "no index letter"),
    ("[z^(n)] q", 2, "coefficient extractor"),
    ("[q^(5n+4) q", 11, "closing the extractor"),
    ("sum_{n>=0} [q^(5n)] q", 15, "'n' is bound by an enclosing sum"),
    ("U_0(q)", 3, "U_5(F)"),
    ("U_5 q", 5, "U_5(F)"),
    ("[q^(5n+4)]", 11, "ends too early"),
])
def test_coefficient_extractor_errors(text, column, words):
    with pytest.raises(ParseError) as err:
        parse(text)
    assert words in str(err.value)
    assert f"column {column}" in str(err.value)


def test_extractor_listed_in_notation():
    from qseries.lang.parser import NOTATION_FORMS

    forms = " ".join(f for f, _ in NOTATION_FORMS)
    assert "[q^(5n+4)]" in forms and "U_5(F)" in forms


def test_an_identity_pasted_as_one_text_is_split_at_its_one_equals_sign():
    from qseries.lang.parser import split_identity
    assert split_identity("sum_{n=0}^{inf} q^n = 1/(1-q)") == ("sum_{n=0}^{inf} q^n ", " 1/(1-q)")
    left, right = split_identity(r"\sum_{n\ge 0} \frac{q^{n^2}}{(q;q)_n} &= G(q).")
    assert left.rstrip().endswith("&") and right.strip() == "G(q)."
    # a display pasted whole: its delimiters belong to neither side
    assert split_identity(r"\[ 1/(1-q) = \sum_{n\ge 0} q^n \]") == \
        (" 1/(1-q) ", r" \sum_{n\ge 0} q^n ")
    left, right = split_identity("$$ (q;q)_inf = 1 - q $$")
    assert (left, right) == (" (q;q)_inf ", " 1 - q ")
    for bad in ("sum_{n=0}^{inf} q^n", "a = b = c"):
        with pytest.raises(ParseError, match="two sides"):
            split_identity(bad)
    with pytest.raises(ParseError, match="two arguments"):
        parse("1 = 1")


@pytest.mark.parametrize("text, column, words", [
    # q^2n and (q;q)_2n read as q^2 * n and (q;q)_2 * n would silently change the identity
    # typed (papers print q^{2n} and (q;q)_{2n}): refused, with both unambiguous spellings
    ("sum_{n=0}^{5} q^2n", 17, "q^(2n)"),
    ("q^-3k", 4, "q^(-3k)"),
    ("sum_{n>=0} q^(n^2)/(q;q)_2n", 26, "(2n)"),
    ("sum_{n>=0} q^n/(q^2;q^2)_10n", 26, "(10n)"),
    (r"\sum_{n\ge0} q^2n", 16, "q^2 n"),
    ("sum_{k=0}^10q^k", 11, "^(10q)"),        # an upper limit: the caret, not '_'
])
def test_a_number_glued_to_a_letter_in_an_exponent_or_subscript_is_refused(text, column, words):
    with pytest.raises(ParseError) as err:
        parse(text)
    assert words in str(err.value)
    assert f"column {column}" in str(err.value)


def test_exponents_and_subscripts_written_unambiguously_still_read():
    assert parse("q^2 n") == parse("q^2*n")
    assert parse("q^(2n)") == parse("q^{2n}")
    assert parse("sum_{n>=0} q^(n^2)/(q;q)_(2n)") == parse("sum_{n>=0} q^(n^2)/(q;q)_{2n}")
    assert parse("q^n^2") == parse("q^(n^2)")
    assert parse("2q^3") == parse("2*q^3")


@pytest.mark.parametrize("text, column", [
    # other spellings of infinity: 'oo' was read as the product o*o of an extra variable
    # ("involves the extra variable o"), 'infinity' named no known name at all
    ("(q;q)_infinity", 7),
    ("(q;q)_oo", 7),
    ("sum_{n=0}^{oo} q^n", 12),
    ("sum_{n=0}^{infinity} q^n", 12),
])
def test_other_spellings_of_infinity_suggest_inf(text, column):
    with pytest.raises(ParseError) as err:
        parse(text)
    assert "did you mean inf?" in str(err.value) and f"column {column}" in str(err.value)


def test_a_power_written_before_the_argument_of_a_function():
    # papers write phi^2(q), f^3(-q), \vartheta_3^4(q), \eta^3(\tau) for phi(q)^2, ...: these
    # were "expected '(' after phi but found '^'"
    assert parse("f^3(-q)") == parse("f(-q)^3")
    assert parse(r"\varphi^2(q)") == parse("phi(q)^2")
    assert parse("theta_3^4(q)") == parse("theta_3(q)^4")
    assert parse(r"\vartheta_{3}^{4}(q)") == parse("theta_3(q)^4")
    assert parse(r"\eta^{3}(\tau)") == parse("eta(q)^3")
    assert parse("psi^-1(q^2)") == parse("psi(q^2)^(-1)")
    g = ["G(q) = 1/(1-q)"]
    assert parse("G^2(q^5)", definitions=g) == parse("G(q^5)^2", definitions=g)
    # the power applies to the call alone, before a product or a second power
    assert parse("2 phi^2(q) q") == parse("2 (phi(q)^2) q")
    with pytest.raises(ParseError, match="expected '\\(' after theta_3"):
        parse(r"\theta_3^4")


def test_a_sum_over_the_integers_as_papers_write_it():
    # \sum_{n\in\mathbb{Z}} was "unknown LaTeX command \in"
    bilateral = parse("sum_{n=-inf}^{inf} q^(n^2)")
    assert parse(r"\sum_{n\in\mathbb{Z}} q^{n^2}") == bilateral
    assert parse(r"\sum_{n \in \mathbb Z} q^{n^2}") == bilateral
    assert parse("Σ_{n∈ℤ} q^(n^2)") == bilateral
    assert parse(r"\sum_{m,n\in\mathbb{Z}} q^{m^2+n^2}") == \
        parse("sum_{m,n=-inf}^{inf} q^(m^2+n^2)")
    with pytest.raises(ParseError, match="no upper limit"):
        parse(r"\sum_{n\in\mathbb{Z}}^{5} q^n")
    with pytest.raises(ParseError, match=r"\\mathbb\{N\}"):
        parse(r"\sum_{n\in\mathbb{N}} q^n")


def test_a_power_written_before_the_subscript_of_a_q_pochhammer_symbol():
    # LaTeX prints (q;q)^2_\infty as (q;q)_\infty^2; it was "expected '_' after a
    # q-Pochhammer symbol but found '^'"
    assert parse(r"\frac{(q^2;q^2)^2_\infty}{(q;q)_\infty}") == \
        parse("(q^2;q^2)_inf^2/(q;q)_inf")
    assert parse(r"(q;q)^{-1}_{\infty}") == parse("(q;q)_inf^(-1)")
    assert parse("sum_{n>=0} q^n/(q;q)^2_n") == parse("sum_{n>=0} q^n/(q;q)_n^2")
    assert parse("(q)^3_inf") == parse("(q)_inf^3")
    assert parse("(1-q)^2") == BinOp("^", parse("1-q"), Num(Fraction(2)))   # no subscript


def test_a_gaussian_binomial_as_a_matrix_in_square_brackets():
    # \left[\begin{matrix} n \\ k \end{matrix}\right]_q, as many papers print the q-binomial
    # coefficient: it was "a matrix stands for a Gaussian binomial here: write \begin{bmatrix}"
    expected = parse("gaussian(6, 3)")
    assert parse(r"\left[\begin{matrix} 6 \\ 3 \end{matrix}\right]_q") == expected
    assert parse(r"\left[\begin{matrix} 6 \\ 3 \end{matrix}\right]_{q}") == expected
    assert parse(r"2\left[\begin{matrix} 6 \\ 3 \end{matrix}\right]_q q") == \
        parse("2 gaussian(6, 3) q")
    with pytest.raises(ParseError, match="Gaussian binomial"):
        parse(r"\left[1 + \begin{matrix} 6 \\ 3 \end{matrix}\right]_q")


def test_the_notation_lists_the_forms_papers_print():
    # what `qseries notation` lists reads, including the forms added for papers' LaTeX
    from qseries.lang.parser import NOTATION_FORMS

    forms = " ".join(f for f, _ in NOTATION_FORMS)
    for form in (r"\sum_{k\in\mathbb{Z}} T", "phi^2(q)", r"(q;q)^2_\infty"):
        assert form in forms
    parse(r"\sum_{k\in\mathbb{Z}} q^(k^2)")
    parse(r"phi^2(q) (q;q)^2_\infty")


def test_an_identity_written_with_a_double_equals_sign():
    # programmers type ==: "one text with one '=' between them (this one has 2)"
    from qseries.lang.parser import split_identity
    assert split_identity("1/(1-q) == sum_{n>=0} q^n") == ("1/(1-q) ", " sum_{n>=0} q^n")
    with pytest.raises(ParseError, match="has 2"):
        split_identity("a == b = c")
