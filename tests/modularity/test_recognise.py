"""Recognising expressions as combinations of eta quotients, from their structure."""

from fractions import Fraction

import pytest

from qseries import check
from qseries.lang import parse
from qseries.modularity.recognise import recognise

# (expression, published eta-quotient exponents r_d, power of q left over); the q-products
# are from B. C. Berndt, Ramanujan's Notebooks, Part III (1991), Chapter 16, Entries 22 and
# 24 (from memory), turned into eta quotients by (q^d;q^d)_inf = q^(-d/24) eta(d tau)
PUBLISHED = [
    # phi(q) = (q^2;q^2)^5 / ((q;q)^2 (q^4;q^4)^2)
    ("phi(q)", {1: -2, 2: 5, 4: -2}, Fraction(0)),
    ("theta_3(q)", {1: -2, 2: 5, 4: -2}, Fraction(0)),
    # phi(-q) = (q;q)^2 / (q^2;q^2)
    ("phi(-q)", {1: 2, 2: -1}, Fraction(0)),
    ("theta_4(q)", {1: 2, 2: -1}, Fraction(0)),
    # psi(q) = (q^2;q^2)^2 / (q;q)
    ("psi(q)", {1: -1, 2: 2}, Fraction(-1, 8)),
    # psi(-q) = (q;q)(q^4;q^4)/(q^2;q^2)
    ("psi(-q)", {1: 1, 2: -1, 4: 1}, Fraction(-1, 8)),
    # f(-q) = (q;q)_inf
    ("f(-q)", {1: 1}, Fraction(-1, 24)),
    # chi(-q) = (q;q^2) = (q;q)/(q^2;q^2)
    ("chi(-q)", {1: 1, 2: -1}, Fraction(1, 24)),
    # theta_2(q) = 2 q^(1/4) psi(q^2) = 2 eta(4 tau)^2 / eta(2 tau)
    ("theta_2(q)/2", {2: -1, 4: 2}, Fraction(0)),
    # Euler's pentagonal number theorem (Andrews, Theory of Partitions, Cor. 1.7)
    ("sum_{n=-inf}^{inf} (-1)^n q^(n(3n-1)/2)", {1: 1}, Fraction(-1, 24)),
    ("eta(5tau)", {5: 1}, Fraction(0)),
    ("prod_{n>=1} (1 - q^(2n))", {2: 1}, Fraction(-1, 12)),
]


@pytest.mark.parametrize(("text", "r", "shift"), PUBLISHED)
def test_published_eta_forms(text, r, shift):
    rec = recognise(parse(text))
    assert rec.terms is not None and len(rec.terms) == 1, rec.reason
    [t] = rec.terms
    assert t.eta.r == r and t.shift == shift and t.coefficient == 1
    # and the series engine agrees with the recognised form (computed the other way)
    assert check(text, rec.text(), 150).holds is True


@pytest.mark.parametrize("text", [
    "phi(q)^2 - phi(-q)^2", "psi(q)^2 + 3 q^(-1/4) eta(q^2)^4 / eta(q)^2",
    "(-q;q)_inf^24 (q;q)_inf",
    "f(q)", "f(q^2)", "f(q, q^2)", "f(-q, -q^2)", "psi(-q^3)^2 chi(q)", "(-1;q)_inf",
    "prod_{n>=1} 1/(1 + q^(2n-1))", "sum_{n>=0} q^(n^2)", "(theta_3(q) + theta_4(q))^3 / 8",
    "(q^2;q^2)_inf/(q;q^2)_inf", "sum_{n>=1} q^(n(n+1))", "sum_{n>=-2} (-1)^n q^(n^2)",
    "sum_{n>=3} q^(n(n+1)/2)",
])
def test_recognised_forms_equal_the_expression(text):
    # each recognised combination is checked against the expression by the series engine
    rec = recognise(parse(text))
    assert rec.terms is not None, rec.reason
    assert check(text, rec.text(), 200).holds is True


def test_one_sided_sums_about_an_integer_keep_the_middle_term():
    # sum_{n>=0} q^(n^2) = (1 + theta_3(q))/2: a constant (weight 0) and a weight-1/2 term
    rec = recognise(parse("sum_{n>=0} q^(n^2)"))
    assert sorted(t.eta.weight for t in rec.terms) == [0, Fraction(1, 2)]
    assert {t.coefficient for t in rec.terms} == {Fraction(1, 2)}


@pytest.mark.parametrize(("text", "words"), [
    ("sum_{n>=1} n q^n/(1-q^n)", "Lambert series"),
    ("sum_{k>=0} q^(k^2)/(q;q)_k", "not a theta series"),       # Rogers-Ramanujan
    ("1/((q;q^5)_inf (q^4;q^5)_inf)", "generalised eta quotient"),
    ("f(-q, -q^4)", "generalised eta quotient"),
    ("(z;q)_inf", "parameter other than"),
    ("z eta(q)", "extra variable z"),
    ("[q^(5n+4)] 1/(q;q)_inf", "dissection"),
    ("eta(q) + O(q^5)", "O(q^k)"),
    ("(q;q)_5", "finite factor"),
    ("1/(1 - q)", "division by a sum"),
    ("eta(q)^(1/2)", "integer powers"),
    # the engine refuses eta(-q^d) (a fractional power of -q in front); it was recognised
    # as eta(q^d), the sign dropped
    ("eta(-q^4)", "eta(-q^d) is not a series in q"),
    ("eta(-q)^24", "eta(-q^d) is not a series in q"),
    ("sum_{n=0}^{5} q^(n^2)", "polynomial"),
    ("sum_{n>=0} q^(n^3)", "not a theta series"),
    ("gaussian(4, 2)", "not a modular object"),
])
def test_refusals_say_why(text, words):
    rec = recognise(parse(text))
    assert rec.terms is None and words in rec.reason


@pytest.mark.parametrize(("text", "words", "not_words"), [
    # issue 15: a Lambert series is refused "with a clear reason unless Eisenstein series
    # are recognised -- say which": the reason names the kind of sum it found
    ("1 - 5 sum_{n>=1} n q^n/(1-q^n)", "Lambert series", "Rogers-Ramanujan"),
    ("sum_{n>=1} n q^n/(1-q^n)", "Eisenstein series are not recognised", "Pochhammer"),
    ("sum_{k>=0} q^(k^2)/(q;q)_k", "q-Pochhammer", "Lambert"),
    ("sum_{k>=0} z^k q^(k^2)", "extra variable", "Lambert"),
])
def test_unrecognised_sums_say_what_they_are(text, words, not_words):
    rec = recognise(parse(text))
    assert rec.terms is None and words in rec.reason and not_words not in rec.reason


def test_zero_is_the_empty_combination():
    rec = recognise(parse("theta_3(q) - phi(q)"))
    assert rec.terms == () and rec.text() == "0"
    assert recognise(parse("(1;q)_inf")).terms == ()


def test_limits_refuse_instead_of_growing():
    assert "terms" in recognise(parse("(theta_3(q) + theta_4(q) + 1)^16")).reason
    assert "period above" in recognise(parse("(q;q^4999)_inf (q;q^4997)_inf")).reason


def test_large_inputs_are_refused_quickly():
    # no list of a million exponents is built, and a long sum is walked without recursion
    assert "above 5040" in recognise(parse("eta(q^1000000)")).reason
    long_sum = " + ".join(f"q^{i}" for i in range(3000))
    rec = recognise(parse(long_sum))
    assert rec.terms is not None and len(rec.terms) == 3000
    assert "bits" in recognise(parse("(10^100)^(10^5) eta(q)")).reason
