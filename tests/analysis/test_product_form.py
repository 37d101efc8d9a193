"""Product-form recovery against published product sides, with sources named."""

from fractions import Fraction

import pytest
from hypothesis import given
from hypothesis import strategies as st

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


# -- issue 19: exponents from the parts (exponents_from_parts) against the reference -------
def _product_series(exponents, n):
    """prod (1 - q^j)^(e_j) + O(q^n) built factor by factor (series arithmetic)."""
    from qseries.series import Series
    f = Series.constant(1).truncate(n)
    for j, e in exponents.items():
        factor = Series.from_coefficients([1] + [0] * (j - 1) + [-1])
        f = f * (factor ** e if e >= 0 else factor.inverse(order=n) ** -e)
        f = f.truncate(n)
    return f


def _module():
    import sys
    return sys.modules["qseries.analysis.product_form"]


#: DIVISION_MAX_LENGTH forced to 0 (residues modulo a prime, then the division) and beyond
#: every length (the division alone): both sides of the threshold at any length
BOTH_WAYS = pytest.mark.parametrize("division_below", [0, 10**9])


@BOTH_WAYS
@given(exponents=st.dictionaries(st.integers(1, 15), st.integers(-3, 3), max_size=5),
       n=st.integers(1, 40), c=st.sampled_from([1, -1, 2]))
def test_exponents_from_parts_equal_the_reference_on_products(division_below, exponents, n,
                                                              c):
    module = _module()
    saved = module.DIVISION_MAX_LENGTH
    module.DIVISION_MAX_LENGTH = division_below
    try:
        f = _product_series(exponents, n) * c
        got = module.exponents_from_parts(f, n)
    finally:
        module.DIVISION_MAX_LENGTH = saved
    assert got == module.exponents_of(f * Fraction(1, c), n)
    assert got == [exponents.get(j, 0) for j in range(1, n)]


@BOTH_WAYS
@given(rest=st.lists(st.integers(-50, 50), min_size=1, max_size=30), n=st.integers(1, 30),
       c=st.sampled_from([1, -1, 3]))
def test_exponents_from_parts_on_any_series_are_the_reference(division_below, rest, n, c):
    # any integer series, leading coefficient c: the reference's exponents, or None only
    # where c does not divide the series (no integer exponents: the reference says why)
    from qseries.series import Series
    module = _module()
    f = Series.from_coefficients([c, *rest], prec=len(rest) + 1)
    n = min(n, len(rest) + 1)
    saved = module.DIVISION_MAX_LENGTH
    module.DIVISION_MAX_LENGTH = division_below
    try:
        got = module.exponents_from_parts(f, n)
    finally:
        module.DIVISION_MAX_LENGTH = saved
    want = module.exponents_of(f * Fraction(1, c), n)
    if got is None:
        assert any(x % c for x in rest[:n - 1])
    else:
        assert got == want


@given(st.lists(st.integers(-10**9, 10**9), max_size=40))
def test_the_divisor_sieve_inverts_the_divisor_sums(c_tail):
    # C_n = -sum_{d | n} d e_d: from any integers C the sieve's e_n (ints or Fractions)
    # give them back
    from qseries.analysis.product_form import exponents_from_log_derivative
    big_c = [0, *c_tail]
    ex = exponents_from_log_derivative(big_c, len(big_c))
    for k in range(1, len(big_c)):
        assert -sum(d * ex[d - 1] for d in range(1, k + 1) if k % d == 0) == big_c[k]


def _forbid_reference(monkeypatch):
    def refuse(*_args):
        raise AssertionError("the reference exponents_of was called")

    monkeypatch.setattr(_module(), "exponents_of", refuse)


def test_published_products_from_the_parts(monkeypatch):
    _forbid_reference(monkeypatch)
    # Rogers-Ramanujan: exponents -1 exactly at n = 1, 4 mod 5 (first identity) and
    # n = 2, 3 mod 5 (second); Andrews, The Theory of Partitions, Cor. 7.9
    for text, residues in (("sum_{k>=0} q^(k^2)/(q;q)_k", {1, 4}),
                           ("sum_{k>=0} q^(k^2+k)/(q;q)_k", {2, 3})):
        pf = product_form(text, 2000)
        assert pf.exponents == [-1 if n % 5 in residues else 0 for n in range(1, 2000)]
    # Euler: (-q;q)_inf = 1/(q;q^2)_inf (Andrews, The Theory of Partitions, Cor. 1.2)
    pf = product_form("(-q;q)_inf", 1500)
    assert pf.exponents == [-1 if n % 2 else 0 for n in range(1, 1500)]
    assert pf.expression == "(q;q^2)_inf^-1"
    # Euler's generating function of partitions, 1/(q;q)_inf: every exponent -1
    assert set(product_form("1/(q;q)_inf", 1500).exponents) == {-1}
    assert set(product_form("sum_{n>=0} q^n/(q;q)_n", 800).exponents) == {-1}


def test_the_first_rogers_ramanujan_product_across_the_division_threshold(monkeypatch):
    # at lengths DIVISION_MAX_LENGTH - 1 (the division) and DIVISION_MAX_LENGTH (the
    # residues modulo a prime): Andrews, The Theory of Partitions, Cor. 7.9
    from qseries.backend import logderiv

    _forbid_reference(monkeypatch)
    calls = []
    for name in ("log_derivative_by_division", "small_log_derivative"):
        real = getattr(logderiv, name)

        def spy(p, n, real=real, name=name):
            calls.append(name)
            return real(p, n)

        monkeypatch.setattr(_module(), name, spy)
    limit = _module().DIVISION_MAX_LENGTH
    for order, used in ((limit - 1, "log_derivative_by_division"),
                        (limit, "small_log_derivative")):
        calls.clear()
        pf = product_form("sum_{k>=0} q^(k^2)/(q;q)_k", order)
        assert set(calls) == {used}
        assert pf.exponents == [-1 if n % 5 in (1, 4) else 0 for n in range(1, order)]


def test_exponents_too_large_to_lift_are_divided(monkeypatch):
    # (1 - q)^(2^60) (1 - q^2): C_n needs more than the second prime's 56 bits; above the
    # threshold the residues fail their check and the division gives the exponents
    from math import comb

    from qseries.series import Series
    _forbid_reference(monkeypatch)
    monkeypatch.setattr(_module(), "DIVISION_MAX_LENGTH", 0)
    e, n = 2**60, 12
    p = [(-1) ** k * comb(e, k) for k in range(n)]
    f = Series.from_coefficients(p, prec=n) * Series.from_coefficients([1, 0, -1])
    pf = product_form(f, n)
    assert pf.exponents == [e, 1] + [0] * (n - 3)


@pytest.mark.parametrize("expr", [
    "sum_{k>=0} q^(k^2)/(q;q)_k",
    "sum_{n>=0} q^(n^2) (-q;q^2)_n/(q^2;q^2)_n",
    "1/((q;q^5)_inf (q^4;q^5)_inf)",
    "-q^2 (q^2;q^7)_inf^2 (q^5;q^7)_inf^-1",
    "2 q^3 (q;q^2)_inf",
    "3 (q;q)_inf/(q^2;q^2)_inf",
    "eta(q)^3/eta(q^2)",
    "theta_3(q)",
    "1/(q;q)_inf + q^40",
    "1 + 2q",
    "(1-q)(1-q^3)^2",
    "sum_{k>=0} q^(k^2)/(q;q)_k^2",
    "sum_{n>=0} q^n/(q;q)_n",
    # numerator and denominator (binary splitting): valuation, sign and constant
    "sum_{k>=1} q^(k^2)/(q;q)_k",
    "-sum_{k>=0} q^(k^2+k)/(q;q)_k",
    "sum_{k>=0} 2 q^(k^2+k)/(q;q)_k",
    "sum_{k>=0} q^(k^2+3)/(q;q)_k",
    "sum_{n>=0} q^(n^2+n)/((q;q)_n (q;q)_(n+1))",
    "sum_{k=0}^{10} q^k/(q;q)_k",
    "sum_{n>=0} (-1)^n q^(n^2)/(q;q)_n",
    "sum_{k>=0} q^(k^2+k)/(q;q)_k/(1-q)",
])
def test_the_parts_give_the_same_product_form_as_the_series(expr):
    # product_parts leaves the division undone; the result is the one of the value
    from dataclasses import asdict

    from qseries.engine import evaluate

    def outcome(x):
        try:
            return asdict(product_form(x, 90))
        except DomainError as err:
            return str(err)

    assert outcome(expr) == outcome(evaluate(expr, 90))


def test_periodic_break_against_the_definition():
    # every 0/1/2 sequence of length 6 to 9 (and long ones below): the m <= n/3 whose first
    # break e_i != e_(i-m) comes last, among those holding at least 3 periods (the scan of
    # every m, which periodic_break replaced by the Z-function, issue 19)
    from itertools import product

    from qseries.analysis.product_form import periodic_break, z_function

    def by_definition(ex):
        best = None
        for m in range(1, len(ex) // 3 + 1):
            i = next((i for i in range(m, len(ex)) if ex[i] != ex[i - m]), None)
            if i is None or i < 3 * m:
                continue
            if best is None or i + 1 > best[1]:
                best = (m, i + 1)
        return best

    for n in range(6, 10):
        for ex in product((0, 1, 2), repeat=n):
            assert periodic_break(list(ex)) == by_definition(list(ex)), ex
            assert z_function(list(ex)) == [
                next((k for k in range(n - i) if ex[k] != ex[i + k]), n - i) for i in range(n)]
    # a long period-5 sequence broken late, and one broken twice
    ex = [-1 if n % 5 in (1, 4) else 0 for n in range(1, 3001)]
    ex[2800] = 7
    assert periodic_break(ex) == by_definition(ex) == (5, 2801)
    ex[1500] = 3
    assert periodic_break(ex) == by_definition(ex)


@pytest.mark.parametrize("expr, order, exponents", [
    # by hand from the definitions: q^-4 (1 - q^6) = q^-4 - q^2 exactly, so to O(q^3) the
    # factor (1 - q^6) is seen (the order is absolute, the exponents relative to q^-4)
    ("q^(-4) (1 - q^6)", 3, [0, 0, 0, 0, 0, 1]),
    ("q^(-4)/(1 - q^6)", 3, [0, 0, 0, 0, 0, -1]),
    ("-3 q^(-2) (q^2;q^2)_inf", 1, [0, 1]),
    # q^(1/3)/(1 - q^4) = q^(1/3) + q^(13/3) + ..., and q^(13/3) lies below q^5
    ("q^(1/3)/(1 - q^4)", 5, [0, 0, 0, -1]),
    ("q^(1/3) (1 - q^7)/(1 - q^9) (-q^2;q^4)_inf", 5, [0, -1, 0, 1]),
    # q^2 (1 - q^2) to O(q^5): q^2 - q^4, so e_1, e_2 are known and nothing beyond
    ("q^2 (1 - q^2)", 5, [0, 1]),
])
def test_the_order_is_absolute_and_every_known_coefficient_is_used(expr, order, exponents):
    # f = c q^v prod (1 - q^n)^(e_n) + O(q^order): the product must match f at every
    # exponent below the order it states (a product cut short claimed too much)
    pf = product_form(expr, order)
    assert pf.order == order
    assert pf.exponents == exponents
    if pf.expression is not None:
        assert check(expr, pf.expression, order=order).holds
    else:     # the last exponent lies in the upper half: no finite product is claimed
        assert "q^-4 - q^2 + O(q^3)" in pf.reason if expr == "q^(-4) (1 - q^6)" else pf.reason


def test_a_series_modulo_a_prime_is_refused_with_its_ring_named():
    # the exponents of a product are integers read from integer coefficients; the residues
    # of (q;q)_inf modulo 7 (1 + 6q + 6q^2 + ...) are not its coefficients, and the refusal
    # said "cannot combine series over ZZ and GF(7)", which the caller never asked for
    from qseries import GF, evaluate
    with pytest.raises(DomainError, match="over ZZ or QQ; this one is over GF\\(7\\)"):
        product_form(evaluate("(q;q)_inf", 12, GF(7)), 12)
