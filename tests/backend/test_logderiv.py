"""qseries.backend.logderiv: the log derivative q p'/p, modulo primes with the exact check
and by the division of reversed polynomials, against the pure-Python reference (q p' times
the exact inverse of p) and divisor sums."""

from fractions import Fraction
from math import comb

import pytest
from hypothesis import given
from hypothesis import strategies as st

from qseries.backend import ZZ
from qseries.backend import logderiv as ld
from qseries.backend.logderiv import (
    LIFT_PRIMES,
    log_derivative_by_division,
    small_log_derivative,
    theta,
)
from qseries.errors import ArgumentError
from qseries.series.reference import ref_inverse, ref_mul


def reference(p: list[int], n: int) -> list[Fraction]:
    """q p'/p modulo q^n in exact rationals."""
    tp = [i * c for i, c in enumerate(p)]
    return ref_mul(tp, ref_inverse(p, n), n)


def product_poly(exponents: dict[int, int], n: int) -> list[int]:
    """prod (1 - q^j)^(e_j) modulo q^n, by the binomial series of each factor."""
    out = [1] + [0] * (n - 1)
    for j, e in exponents.items():
        factor = [0] * n
        for k in range(0, (n - 1) // j + 1):
            # (1 - x)^e = sum_k binom(e, k) (-x)^k, binom(e, k) for negative e too
            b = 1
            for i in range(k):
                # exact: binom(e, i) (e - i) = (i + 1) binom(e, i + 1)
                b = b * (e - i) // (i + 1)
            factor[j * k] = b * (-1) ** k
        out = [int(x) for x in ref_mul(out, factor, n)]
    return out


def test_theta_is_q_times_the_derivative():
    assert ZZ.coefficients(theta(ZZ.poly([5, 1, -2, 3]))) == [0, 1, -4, 9]
    assert ZZ.coefficients(theta(ZZ.poly([5]))) == []


@given(st.dictionaries(st.integers(1, 12), st.integers(-4, 4), max_size=5),
       st.integers(0, 30))
def test_products_with_small_exponents_are_lifted(exponents, n):
    # c_k = -sum_{d | k} d e_d (the logarithm of prod (1 - q^d)^(e_d)), small: the first
    # prime lifts it, and it agrees with the exact reference
    p = product_poly(exponents, max(n, 1))
    got = small_log_derivative(ZZ.poly(p), n)
    want = [0] + [-sum(d * e for d, e in exponents.items() if k % d == 0) for k in range(1, n)]
    assert got == want[:n]
    assert got == [int(x) for x in reference(p, n)]


@given(st.lists(st.integers(-10**6, 10**6), min_size=1, max_size=25).filter(lambda p: p[0]),
       st.integers(0, 25))
def test_any_series_gives_the_exact_answer_or_none(p, n):
    # random integer series: the log derivative is usually not small (or not integral);
    # whatever comes back is exact
    got = small_log_derivative(ZZ.poly(p), n)
    want = reference(p, n)
    if got is not None:
        assert got == want
    else:
        assert any(x.denominator != 1 or abs(x) >= 2**LIFT_PRIMES[-1][1] for x in want)


def test_the_second_prime_takes_coefficients_the_first_cannot_hold():
    # (1 - q)^E with E = 2^30: c = -E q/(1 - q), beyond the first prime's 26 bits
    e, n = 2**30, 12
    p = [(-1) ** k * comb(e, k) for k in range(n)]
    assert small_log_derivative(ZZ.poly(p), n) == [0] + [-e] * (n - 1)
    # E = 2^60: beyond the second prime's 56 bits too
    e = 2**60
    p = [(-1) ** k * comb(e, k) for k in range(n)]
    assert small_log_derivative(ZZ.poly(p), n) is None


def test_a_constant_term_divisible_by_the_first_prime():
    # P (1 - q): the first prime cannot invert P, the second gives -q/(1 - q)
    prime = LIFT_PRIMES[0][0]
    assert small_log_derivative(ZZ.poly([prime, -prime]), 5) == [0, -1, -1, -1, -1]


def test_rational_log_derivatives_are_refused():
    # q (2 + q)'/(2 + q) = q/2 - q^2/4 + ...: not an integer series
    assert small_log_derivative(ZZ.poly([2, 1]), 6) is None
    # but 2 (1 - q) has the integral -q/(1 - q)
    assert small_log_derivative(ZZ.poly([2, -2]), 4) == [0, -1, -1, -1]


def test_a_wrong_lift_is_caught_by_the_exact_check(monkeypatch):
    # break the modular step (an extra 1 in every residue series): the lift is small but
    # wrong, and the exact check q p' = c p refuses it at every prime
    original = ld._theta_mod

    def broken(p):
        return original(p) + 1

    monkeypatch.setattr(ld, "_theta_mod", broken)
    assert small_log_derivative(ZZ.poly([1, -1]), 6) is None


def test_arguments():
    with pytest.raises(ArgumentError, match="nonzero constant term"):
        small_log_derivative(ZZ.poly([0, 1]), 3)
    with pytest.raises(ArgumentError):
        small_log_derivative(ZZ.poly([1, 1]), -1)
    assert small_log_derivative(ZZ.poly([1, 1]), 0) == []


@given(st.sampled_from([1, -1, 5]), st.lists(st.integers(-10**6, 10**6), max_size=25),
       st.integers(0, 25))
def test_the_division_is_the_reference(c0, rest, n):
    # any size of c (no prime): exact wherever c0 divides the series (c0 = 5: 5 p)
    p = [c0] + [c0 * x if c0 == 5 else x for x in rest]
    assert log_derivative_by_division(ZZ.poly(p), n) == reference(p, n)


@given(st.dictionaries(st.integers(1, 12), st.integers(-4, 4), max_size=5),
       st.integers(0, 30))
def test_the_division_and_the_residues_agree_on_products(exponents, n):
    p = ZZ.poly(product_poly(exponents, max(n, 1)))
    assert log_derivative_by_division(p, n) == small_log_derivative(p, n)


def test_the_division_refuses_a_constant_term_that_does_not_divide():
    # 2 + q: c = q/2 - ... is not integral; 2 + 2q has c = q/(1+q)
    assert log_derivative_by_division(ZZ.poly([2, 1]), 4) is None
    assert log_derivative_by_division(ZZ.poly([2, 2]), 4) == [0, 1, -1, 1]
    assert log_derivative_by_division(ZZ.poly([7]), 3) == [0, 0, 0]
    with pytest.raises(ArgumentError, match="nonzero constant term"):
        log_derivative_by_division(ZZ.poly([0, 1]), 3)
