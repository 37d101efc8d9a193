"""Product-form recovery against published product sides, with sources named."""

import pytest

from qseries import check
from qseries.analysis.product_form import find_period, mobius_table, product_form
from qseries.errors import DomainError


def test_rogers_ramanujan_sum_sides_give_their_products():
    # L. J. Rogers (1894); Andrews, The Theory of Partitions (1976), ch. 7
    pf = product_form("sum_{k>=0} q^(k^2)/(q;q)_k", 300)
    assert pf.period == 5 and pf.exponents[:5] == [-1, 0, 0, -1, 0]
    assert pf.expression == "(q, q^4;q^5)_inf^-1"
    assert pf.repetitions == 299 // 5      # whole periods among the exponents of n = 1 .. 299
    pf2 = product_form("sum_{k>=0} q^(k^2+k)/(q;q)_k", 300)
    assert pf2.expression == "(q^2, q^3;q^5)_inf^-1"


def test_goellnitz_gordon_sum_side():
    # B. Gordon, Duke Math. J. 32 (1965); H. Goellnitz (1967)
    pf = product_form("sum_{n>=0} q^(n^2) (-q;q^2)_n/(q^2;q^2)_n", 200)
    assert pf.period == 8
    assert pf.expression == "(q, q^4, q^7;q^8)_inf^-1"


def test_euler_and_jacobi():
    # Euler: (-q;q)_inf = 1/(q;q^2)_inf, exponent -1 at odd n
    pf = product_form("(-q;q)_inf", 100)
    assert all(e == (-1 if n % 2 else 0) for n, e in enumerate(pf.exponents, 1))
    # (q;q)_inf^3 (Jacobi's product side) has exponent 3 everywhere
    assert set(product_form("(q;q)_inf^3", 100).exponents) == {3}


def test_eta_quotient_of_theta4():
    # Gauss: theta_4(q) = (q;q)_inf/(-q;q)_inf = eta(tau)^2/eta(2 tau)
    pf = product_form("theta_4(q)", 120)
    assert pf.eta == "eta(q)^2 eta(q^2)^-1"


@pytest.mark.parametrize("expr", [
    "sum_{k>=0} q^(k^2)/(q;q)_k^2",
    "theta_3(q)",
    "2 q^3 (q;q^2)_inf",
    "-q^2 (q^2;q^7)_inf^2 (q^5;q^7)_inf^-1",
    "eta(q)^3/eta(q^2)",
    "(1-q)(1-q^3)^2",
])
def test_printed_forms_round_trip(expr):
    pf = product_form(expr, 150)
    assert check(expr, pf.expression, order=150).holds
    if pf.eta:
        assert check(expr, pf.eta, order=150).holds


def test_series_without_such_a_product_form():
    # every 1 + O(q) integer series has integer exponents; 1 + 2q has no pattern in them
    pf = product_form("1 + 2q", 60)
    assert pf.expression is None and "no period" in pf.reason
    with pytest.raises(DomainError, match="integer exponents"):
        product_form("2 + q", 20)
    with pytest.raises(DomainError, match="vanishes"):
        product_form("O(q^5)", 20)


def test_helpers():
    # Moebius function, OEIS A008683 (from memory): 1, -1, -1, 0, -1, 1, -1, 0, 0, 1
    assert mobius_table(11)[1:] == [1, -1, -1, 0, -1, 1, -1, 0, 0, 1]
    # period 2 is seen 5/2 times here: fewer than the 3 repetitions asked by default
    assert find_period([0, 1, 0, 1, 0]) is None
    assert find_period([0, 1, 0, 1, 0], min_repetitions=2) == 2
    assert find_period([0, 1] * 3) == 2 and find_period([7] * 3) == 1
    assert find_period([1, 2, 3, 4]) is None


def test_find_period_against_the_definition():
    # every 0/1 sequence of length 6 to 9: the least m with e_(n+m) = e_n wherever both are
    # known, among the m seen at least 3 times (m <= n/3)
    from itertools import product
    for n in range(6, 10):
        for ex in product((0, 1), repeat=n):
            periods = [m for m in range(1, n // 3 + 1)
                       if all(ex[i] == ex[i % m] for i in range(n))]
            assert find_period(list(ex)) == (periods[0] if periods else None), ex


def test_a_series_in_a_fractional_power_is_refused_with_the_substitution():
    # theta_2(q) + theta_3(q) has terms at q^(n^2/4): no product form in q, but F(q^4) has
    with pytest.raises(DomainError, match=r"q\^\(1/4\) in several classes.*F\(q\^4\)"):
        product_form("theta_2(q) + theta_3(q)", 40)
    # theta_2(q^4) + theta_3(q^4) = theta_3(q) = (q^2;q^2)^5/((q;q)^2 (q^4;q^4)^2) (Gauss;
    # e.g. Berndt, Ramanujan's Notebooks III, Ch. 16, Entry 22(i); from memory)
    pf = product_form("theta_2(q^4) + theta_3(q^4)", 80)
    assert pf.eta == "eta(q)^-2 eta(q^2)^5 eta(q^4)^-2"


def test_huge_exponents_are_described_not_printed():
    # exponents of thousands of digits: the message describes the number (Python refuses
    # to print an int of more than 4300 digits, which was a traceback)
    from qseries.series import Series
    f = Series.from_coefficients([1, 10**5000, 3, 7, 1, 9, 4], prec=7)
    pf = product_form(f, 7)
    assert pf.period is None and pf.expression is None and "digits" in pf.reason


# -- issue 16: where the period breaks, and an order too low to see one -----------------
def test_a_stray_term_is_located():
    # Rogers-Ramanujan's product 1/((q;q^5)_inf (q^4;q^5)_inf) plus a stray q^100
    pf = product_form("1/((q;q^5)_inf (q^4;q^5)_inf) + q^100", 200)
    assert pf.expression is None
    assert pf.breaks == (5, 100) and pf.stray == (100, 1)
    assert "period 5 up to n = 99" in pf.reason
    assert "(q, q^4;q^5)_inf^-1 + q^100 + O(q^101)" in pf.reason
    # with a constant and a shift the stray term is where the series has it
    pf = product_form("2 q^3 (q;q^2)_inf - 6 q^73", 160)
    assert pf.breaks == (2, 70) and pf.stray == (73, -6)


def test_an_order_too_low_for_the_period_says_so():
    # (q;q^37)_inf has period 37, seen from order 3*37 + 1 = 112 on
    low = product_form("(q;q^37)_inf", 60)
    assert low.expression is None and "too low" in low.reason and "3m + 1" in low.reason
    assert product_form("(q;q^37)_inf", 112).period == 37
