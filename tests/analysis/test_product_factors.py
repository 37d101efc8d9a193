"""The short presentation of periodic products (qseries/analysis/product_factors.py):
products built from known factors come back as those factors, and every presentation
evaluates back to the series it came from."""

import pytest
from hypothesis import given
from hypothesis import strategies as st

from qseries import check, product_form
from qseries.analysis.product_factors import Factor, simplest_factors, symbol_count


@pytest.mark.parametrize("built, short", [
    ("(q;q^7)_inf (q;q^2)_inf (q;q^5)_inf", "(q;q^2)_inf (q;q^5)_inf (q;q^7)_inf"),
    ("(-q;q^2)_inf", "(-q;q^2)_inf"),
    ("(q;q^3)_inf^2 (-q^2;q^5)_inf", "(q;q^3)_inf^2 (-q^2;q^5)_inf"),
    ("(q^3;q^3)_inf/(q;q^4)_inf", "(q^3;q^3)_inf (q;q^4)_inf^-1"),
])
def test_products_of_known_factors_print_as_those_factors(built, short):
    pf = product_form(built, 400)
    assert pf.factors == short
    assert symbol_count(pf.factors) < symbol_count(pf.expression)
    assert check(pf.factors, built, order=400).holds
    assert check(pf.expression, built, order=400).holds


def test_no_shorter_form_leaves_the_residue_form_alone():
    # Rogers-Ramanujan: 1/((q;q^5)_inf (q^4;q^5)_inf) is already two factors
    pf = product_form("sum_{k>=0} q^(k^2)/(q;q)_k", 200)
    assert pf.expression == "(q, q^4;q^5)_inf^-1" and pf.factors is None


def test_constant_and_shift_are_kept():
    pf = product_form("-3 q^2 (q;q^2)_inf (q;q^3)_inf", 200)
    assert pf.factors == "-3 q^2 (q;q^2)_inf (q;q^3)_inf"
    assert check(pf.factors, "-3 q^2 (q;q^2)_inf (q;q^3)_inf", order=200).holds


def test_patterns():
    # (-q;q^2)_inf = (q^2;q^4)_inf / (q;q^2)_inf: -1 on odd n, +1 on n = 2 mod 4
    assert Factor(1, 2, 1, minus=True).pattern(4) == [-1, 1, -1, 0]
    assert simplest_factors(4, [-1, 1, -1, 0]) == "(-q;q^2)_inf"
    assert simplest_factors(3, [0, 0, 0]) == "1"
    assert simplest_factors(3, [1, 0]) is None            # not one period


@given(st.data())
def test_left_after_counts_as_the_whole_pattern_does(data):
    # issue 19: the search counts what a factor leaves from the classes it touches; the
    # count is the one of residual - pattern over the whole period
    from qseries.analysis.product_factors import _left_after
    period = data.draw(st.integers(1, 24))
    residual = data.draw(st.lists(st.integers(-2, 2), min_size=period, max_size=period))
    m = data.draw(st.sampled_from([d for d in range(1, period + 1) if period % d == 0]))
    f = Factor(data.draw(st.integers(1, m)), m, data.draw(st.integers(-3, 3)),
               data.draw(st.booleans()))
    after = [x - y for x, y in zip(residual, f.pattern(period), strict=True)]
    now = sum(1 for x in residual if x)
    assert _left_after(residual, now, f, period) == sum(1 for x in after if x)
