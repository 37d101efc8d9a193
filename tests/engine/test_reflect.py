"""qseries.engine.reflect: sums over every integer whose q-Pochhammer subscripts fall with
the index, checked against Ramanujan's 1psi1 summation, against the same sums with finite
limits (the evaluator's own negative subscripts) and against the reflection formula."""

from fractions import Fraction

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from qseries import check, evaluate
from qseries.engine.reflect import (
    bounded_by_denominators,
    linear_in,
    monomial,
    negative_half,
    reflected_body,
)
from qseries.errors import QSeriesError
from qseries.lang import parse
from qseries.lang.printer import show

# Ramanujan's 1psi1 summation, for |b/a| < |z| < 1:
#   sum_{n=-inf}^{inf} (a;q)_n/(b;q)_n z^n
#     = (q, b/a, az, q/(az); q)_inf / (b, q/a, z, b/(az); q)_inf
# (G. Gasper and M. Rahman, Basic Hypergeometric Series, 2nd ed., 2004, eq. (5.2.1);
# G. E. Andrews, R. Askey, R. Roy, Special Functions, 1999, Thm 10.5.1).  As formal power
# series the condition reads val(b/a) > val(z) > 0.  The right sides below are that product
# with the parameters put in by hand.
ONE_PSI_ONE = [
    # a = -q, b = -q^3, z = q: b/a = q^2, az = -q^2, q/(az) = -1/q, q/a = -1, b/(az) = q
    ("sum_{n=-inf}^{inf} (-q;q)_n/(-q^3;q)_n q^n",
     "(q;q)_inf (q^2;q)_inf (-q^2;q)_inf (-q^(-1);q)_inf"
     " / ((-q^3;q)_inf (-1;q)_inf (q;q)_inf (q;q)_inf)"),
    # a = -q, b = q^4, z = q^2: b/a = -q^3, az = -q^3, q/(az) = -q^-2, q/a = -1, b/(az) = -q
    # (the terms n <= -4 vanish: 1/(q^4;q)_n has the factor 1 - q^0 there)
    ("sum_{n=-inf}^{inf} (-q;q)_n/(q^4;q)_n q^(2n)",
     "(q;q)_inf (-q^3;q)_inf (-q^3;q)_inf (-q^(-2);q)_inf"
     " / ((q^4;q)_inf (-1;q)_inf (q^2;q)_inf (-q;q)_inf)"),
    # a = 2q, b = -q^5, z = q^2 (q^2 base: (a;q^2)_n): b/a = -q^4/2, az = 2q^3,
    # q^2/(az) = q^-1/2, q^2/a = q/2, b/(az) = -q^2/2
    ("sum_{n=-inf}^{inf} (2q;q^2)_n/(-q^5;q^2)_n q^(2n)",
     "(q^2;q^2)_inf (-q^4/2;q^2)_inf (2q^3;q^2)_inf (q^(-1)/2;q^2)_inf"
     " / ((-q^5;q^2)_inf (q/2;q^2)_inf (q^2;q^2)_inf (-q^2/2;q^2)_inf)"),
]


@pytest.mark.parametrize(("left", "right"), ONE_PSI_ONE)
def test_ramanujans_1psi1_summation(left, right):
    r = check(left, right, order=400)
    assert r.holds is True and r.order_verified >= 390


def test_1psi1_with_an_extra_variable():
    """a = -q, b = -q^4 and z an extra variable of weight 1 (z stands for z q):
    b/a = q^3, az = -zq, q/(az) = -1/z, q/a = -1, b/(az) = q^3/z (Gasper-Rahman (5.2.1))."""
    r = check("sum_{n=-inf}^{inf} (-q;q)_n/(-q^4;q)_n z^n",
              "(q;q)_inf (q^3;q)_inf (-z q;q)_inf (-1/z;q)_inf"
              " / ((-q^4;q)_inf (-1;q)_inf (z;q)_inf (q^3/z;q)_inf)",
              order=40, weights={"z": 1})
    assert r.holds is True


def test_a_1psi1_misstated_is_caught():
    # the sign of b/(az) flipped (a slip made while writing these tests): must differ
    r = check("sum_{n=-inf}^{inf} (-q;q)_n/(-q^4;q)_n z^n",
              "(q;q)_inf (q^3;q)_inf (-z q;q)_inf (-1/z;q)_inf"
              " / ((-q^4;q)_inf (-1;q)_inf (z;q)_inf (-q^3/z;q)_inf)",
              order=20, weights={"z": 1})
    assert r.holds is False


@pytest.mark.parametrize(("text", "first"), [
    ("sum_{n=-inf}^{inf} (-q;q)_n/(-q^3;q)_n q^n", -40),
    # the terms n <= -4 are 0 (1/(q^4;q)_n = (q^(4+n);q)_(-n) has the factor 1 - q^0)
    ("sum_{n=-inf}^{inf} (-q;q)_n/(q^4;q)_n q^(2n)", -3),
    ("sum_{n=-inf}^{3} (-q^2;q)_(2n+1)/(-q^5;q)_n q^(3n)", -8),
    ("sum_{n=-inf}^{-2} (q^3;q^2)_n/(-q^7;q^2)_n q^(n)", -40),
])
def test_the_halves_add_the_terms_of_the_finite_sum(text, first):
    """The sum from -inf against the same sum from ``first``, beyond the last term that
    matters: the finite one evaluates the negative subscripts directly."""
    order = 25
    lo = text.index("-inf")
    finite = text[:lo] + str(first) + text[lo + 4:]
    a, b = evaluate(text, order), evaluate(finite, order)
    top = min(p for p in (a.precision, b.precision) if p is not None)
    assert top >= order - 12
    assert a.equal_to(b, top)


_PARAMS = st.tuples(st.sampled_from([1, -1, 2, -2, Fraction(1, 2)]), st.integers(-3, 4))


@settings(max_examples=40, deadline=None)
@given(_PARAMS, st.integers(1, 3), st.integers(0, 6))
def test_reflection_formula_against_negative_subscripts(a, t, k):
    """(a;q^t)_(-K) = (-q^t/a)^K q^(t K(K-1)/2) / (q^t/a;q^t)_K (Gasper-Rahman (1.2.28)),
    the right side as the reflection writes it, the left side evaluated directly."""
    c, v = a
    param = f"({c})*q^({v})"
    inside = f"sum_{{n=-{k}}}^{{-{k}}} ({param};q^{t})_n"          # one term, n = -K
    try:
        want = evaluate(f"({param};q^{t})_(-{k})", 30)
    except QSeriesError:
        return                                 # a factor 1 - q^0 in the denominator
    body, _ = reflected_body(parse(f"({param};q^{t})_n", bound={"n"}), "n")
    got = evaluate(f"sum_{{n={k}}}^{{{k}}} " + show(body), 30)        # the term n = K
    top = min(p for p in (want.precision, got.precision) if p is not None)
    assert want.equal_to(got, top)
    assert evaluate(inside, 30).equal_to(want, top)


def test_nothing_to_reflect_leaves_the_sum_alone():
    assert negative_half(parse("sum_{n=-inf}^{inf} q^(n^2)")) is None
    assert negative_half(parse("sum_{n>=-3} (q;q)_n q^n")) is None      # finitely many
    assert negative_half(parse("sum_{n=-inf}^{inf} (q;q)_(n^2) q^(n^2)")) is None


def test_a_divergent_negative_half_is_still_refused():
    # sum_n z^n/(-q^3;q)_n with z = 1: the terms n = -m grow like q^(-m^2/2)
    with pytest.raises(QSeriesError, match="converge"):
        evaluate("sum_{n=-inf}^{inf} 1/(-q^3;q)_n", 20)


def test_linear_and_monomial_readers():
    assert linear_in(parse("3 - 2 n", bound={"n"}), "n") == (-2, 3)
    assert linear_in(parse("n k", bound={"n", "k"}), "n") is None
    assert monomial(parse("2 q^2 / (4 q^-1)")) == (Fraction(1, 2), 3)
    assert monomial(parse("q^n", bound={"n"})) is None


def test_a_sum_over_every_integer_bounded_by_its_denominators():
    """1/(q;q)_L = 0 for L < 0, so sum_{j=-inf}^{inf} T/((q;q)_(5-j) (q;q)_(5+j)) is the sum
    over -5 <= j <= 5; compared with that sum written out."""
    bilateral = evaluate("sum_{j=-inf}^{inf} q^(j^2)/((q;q)_(5-j) (q;q)_(5+j))", 40)
    finite = evaluate("sum_{j=-5}^{5} q^(j^2)/((q;q)_(5-j) (q;q)_(5+j))", 40)
    assert bilateral == finite
    node = bounded_by_denominators(parse("sum_{j=-inf}^{inf} 1/((q^2;q^2)_(3+j) (q^2;q^2)_(4-j))"))
    assert show(node.lower) == "-3" and show(node.upper) == "4"


@pytest.mark.parametrize("text", [
    "sum_{j=-inf}^{inf} q^(j^2)/(q;q)_(5-j)",              # bounded on one side only
    "sum_{j=-inf}^{inf} q^(j^2)/((q;q^2)_(5-j) (q;q)_(5+j))",  # (q;q^2)_L is not 0 for L < 0
    "sum_{j=-inf}^{inf} q^(j^2) (q;q)_(5-j) (q;q)_(5+j)",    # numerators
])
def test_sums_not_bounded_by_their_denominators(text):
    assert bounded_by_denominators(parse(text)) is None


def test_zero_times_infinity_is_no_term():
    """Regressions (found by a fuzzing run): (q^2;q)_n/(q^2;q)_n for n <= -2 is 0/0 after
    reflection (a pole of the numerator against the zero of the denominator); those terms
    were dropped as if 0.  The same sum over a finite range is refused, so this one is too."""
    with pytest.raises(QSeriesError):
        evaluate("sum_{n=-inf}^{inf} (q^2;q)_n q^(n^2)/(q^2;q)_n", 10)
    with pytest.raises(QSeriesError):
        evaluate("sum_{n=-5}^{5} (q^2;q)_n q^(n^2)/(q^2;q)_n", 10)
    # a numerator that may be infinite outside the range: not bounded by the denominators
    assert bounded_by_denominators(parse(
        "sum_{j=-inf}^{inf} q^(j^2) (q;q)_(j+2)/((q;q)_(j+2) (q;q)_(3-j))")) is None


def test_the_tightest_denominator_bound_and_sums_written_any_way():
    node = bounded_by_denominators(parse(
        "sum_{j=-inf}^{inf} q^(j^2)/((q;q)_(j+2) (q;q)_(3-j) (q;q)_(-j))"))
    assert show(node.lower) == "-2" and show(node.upper) == "0"
    node = bounded_by_denominators(parse(
        "sum_{j=-inf}^{inf} q^(j^2)/((q;q)_(j+n+1) (q;q)_(-j+3))", bound={"n"}))
    assert node is not None and show(node.upper) == "3"
