"""qseries.backend.integer: the ring ZZ on fmpz_poly, against the pure-Python reference."""

from fractions import Fraction

import pytest
from hypothesis import given
from hypothesis import strategies as st

from qseries.backend import QQ, ZZ
from qseries.errors import DomainError, IncompatibleRingError
from qseries.series.reference import ref_inverse, ref_mul

ints = st.lists(st.integers(-20, 20), min_size=1, max_size=12)


@given(ints, ints, st.integers(0, 14))
def test_mul_low_matches_reference(a, b, n):
    got = ZZ.coefficients(ZZ.mul_low(ZZ.poly(a), ZZ.poly(b), n))
    assert got + [0] * (n - len(got)) == ref_mul(a, b, n)


@given(st.sampled_from([1, -1]), st.lists(st.integers(-20, 20), max_size=11),
       st.integers(0, 14))
def test_inv_series_matches_reference(c0, rest, n):
    got = ZZ.coefficients(ZZ.inv_series(ZZ.poly([c0, *rest]), n))
    assert got + [0] * (n - len(got)) == ref_inverse([c0, *rest], n)


def test_only_units_are_inverted():
    with pytest.raises(DomainError, match="not invertible over ZZ"):
        ZZ.inv_series(ZZ.poly([2, 1]), 3)
    with pytest.raises(DomainError):
        ZZ.inv_series(ZZ.zero(), 3)


def test_coercion_and_fractions():
    assert ZZ.coerce(Fraction(4, 2)) == 2
    with pytest.raises(IncompatibleRingError):
        ZZ.coerce(Fraction(1, 2))
    assert ZZ.fractions is QQ


def test_binomials_and_inflation():
    p = ZZ.poly([1, 2, 3])
    assert ZZ.coefficients(ZZ.binomial_mul(p, 2, 1, None)) == [1, 0, -1, -6]
    assert ZZ.coefficients(ZZ.binomial_mul(p, 2, 1, 3)) == [1, 0, -1]
    back = ZZ.binomial_div(ZZ.binomial_mul(p, 2, 1, None), 2, 1, 3)
    assert ZZ.coefficients(back) == [1, 2, 3]
    assert ZZ.coefficients(ZZ.inflate(p, 2)) == [1, 0, 2, 0, 3]
