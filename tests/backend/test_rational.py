"""qseries.backend.rational: the ring QQ on fmpq_poly."""

import math
from fractions import Fraction

import flint
import pytest
from hypothesis import given
from hypothesis import strategies as st

from qseries.backend import QQ, ZZ
from qseries.errors import DomainError
from qseries.series.reference import ref_inverse

from .pentagonal import euler_case

fractions = st.fractions(min_value=-5, max_value=5, max_denominator=7)


@given(fractions.filter(bool), st.lists(fractions, max_size=8), st.integers(0, 10))
def test_inv_series_matches_reference(c0, rest, n):
    got = QQ.coefficients(QQ.inv_series(QQ.poly([c0, *rest]), n))
    assert got + [0] * (n - len(got)) == ref_inverse([c0, *rest], n)


def test_zero_constant_term_is_refused():
    with pytest.raises(DomainError):
        QQ.inv_series(QQ.poly([0, 1]), 3)


def test_numbers_and_conversion():
    assert QQ.to_number(QQ.coerce(Fraction(6, 4))) == Fraction(3, 2)
    assert QQ.to_number(QQ.coerce(flint.fmpz(5))) == 5
    assert QQ.coefficients(QQ.convert(ZZ.poly([1, -2]))) == [1, -2]
    assert QQ.fractions is QQ


def test_exponential_with_rational_coefficients():
    # exp(q) = sum q^k / k!, exp(q + q^2/2) = sum (involutions of k) q^k / k!
    got = QQ.coefficients(QQ.exp_integral([0, 1], 8))
    assert got == [Fraction(1, math.factorial(k)) for k in range(8)]
    involutions = [1, 1, 2, 4, 10, 26, 76, 232]
    got = QQ.coefficients(QQ.exp_integral([0, 1, 1], 8))
    assert got == [Fraction(c, math.factorial(k)) for k, c in enumerate(involutions)]


def test_exponential_of_a_logarithm_over_the_rationals():
    # Euler's (q;q)_inf: the pentagonal numbers with signs + - - + + - - + +
    n = 30
    s, expected = euler_case(n)
    got = QQ.coefficients(QQ.exp_integral(s, n))
    assert got + [0] * (n - len(got)) == expected
