"""Ranges of sums and products: which terms are kept, and whether a cut was made (a cut
range leaves the result known modulo q^N only)."""

from fractions import Fraction

import pytest

from qseries.engine import Evaluator
from qseries.engine.chooser import SPLIT_RANGE
from qseries.engine.ranges import numbers, term_range
from qseries.errors import DomainError, UnableError
from qseries.lang import parse


@pytest.mark.parametrize("text, order, expected, cut", [
    ("sum_{k>=0} q^(k^2)", 10, [0, 1, 2, 3], True),
    ("sum_{k=-inf}^{inf} q^(k^2)", 5, [-2, -1, 0, 1, 2], True),
    ("sum_{k=0}^{5} q^k", 3, [0, 1, 2, 3, 4, 5], False),          # short: kept whole
    (f"sum_{{k=0}}^{{{SPLIT_RANGE}}} q^k", 3, [0, 1, 2], True),   # long: cut
    (f"sum_{{k=0}}^{{{SPLIT_RANGE - 1}}} q^k", 3, list(range(SPLIT_RANGE)), False),
    ("sum_{k=5}^{2} q^k", 3, [], False),
])
def test_kept_terms_and_cuts(text, order, expected, cut):
    assert term_range(Evaluator(), parse(text), {}, order, False) == (expected, cut)


def test_divergent_ranges_are_refused():
    with pytest.raises(DomainError, match="does not converge"):
        term_range(Evaluator(), parse("sum_{k>=0} q"), {}, 5, False)


def test_sums_of_numbers():
    # 1 + 1/2 + 1/3 = 11/6
    assert numbers(Evaluator(), parse("sum_{k=1}^{3} (1/k)"), {}) == Fraction(11, 6)
    with pytest.raises(UnableError):
        numbers(Evaluator(), parse("sum_{k=1}^{10^6} (1/k)"), {})


def test_a_product_whose_body_runs_on_says_so():
    """Found by a trial as a new user: prod_{n>=1} (1-q^n)^(-1) (q^2,q^3,q^5;q^5)_inf takes
    the second factor into the body (up to the next + or -); the refusal now says so."""
    from qseries import evaluate
    from qseries.errors import QSeriesError

    with pytest.raises(QSeriesError, match=r"free of n\) is a factor of every term"):
        evaluate("prod_{n>=1} (1-q^n)^(-1) (q^2,q^3,q^5;q^5)_inf", 10)
    assert evaluate("(prod_{n>=1} (1-q^n)^(-1)) (q^2,q^3,q^5;q^5)_inf", 10) == \
        evaluate("(q^2,q^3,q^5;q^5)_inf/(q;q)_inf", 10)


@pytest.mark.parametrize("text, shown, column", [
    # the valuation was printed as "-1*n" and "-1*(-k)" (k = -1, -2, ...), and the error of
    # the range was given the words "in a term of" the sum it was about
    ("sum_{n>=0} q^-n", "the valuation of its n-th term is -n, which does not grow", 1),
    ("1 + sum_{k=-inf}^{inf} q^k",
     "the valuation of its k-th term is k, which does not grow as k runs to -inf", 5),
    ("sum_{k>=0} 1/(q;q)_k", "stays at 0 (it does not grow with k)", 1),
])
def test_a_sum_that_does_not_converge_says_so_plainly(text, shown, column):
    from qseries import evaluate
    with pytest.raises(DomainError) as err:
        evaluate(text, 10)
    assert shown in str(err.value) and "in a term of" not in str(err.value)
    assert err.value.position == column - 1
