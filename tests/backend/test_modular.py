"""qseries.backend.modular: GF(p) on nmod_poly, one cached ring per prime."""

from fractions import Fraction

import flint
import pytest
from hypothesis import given
from hypothesis import strategies as st

from qseries.backend import GF, ZZ
from qseries.errors import DomainError, IncompatibleRingError

from .pentagonal import euler_case

P = 1_000_003


def test_one_ring_object_per_prime():
    assert GF(P) is GF(P) and GF(7) is not GF(11)
    assert GF(P) == GF(P) and hash(GF(P)) == hash(GF(P))
    assert GF(P).modulus == P and not GF(P).exact and repr(GF(P)) == f"GF({P})"


def test_bad_moduli_are_refused():
    for p in (0, 1, 15, 2**61 + 1):
        with pytest.raises(DomainError, match="not a prime"):
            GF(p)
    with pytest.raises(DomainError, match="machine word"):
        GF(2**89 - 1)


def test_moduli_do_not_mix():
    with pytest.raises(IncompatibleRingError):
        GF(7).convert(GF(11).poly([1, 2]))
    assert GF(7).coefficients(GF(7).convert(ZZ.poly([8, -1]))) == [1, 6]


def test_fractions_and_units():
    assert GF(7).coerce(Fraction(1, 3)) == flint.nmod(5, 7)
    with pytest.raises(DomainError, match="not invertible"):
        GF(7).coerce(Fraction(1, 14))
    with pytest.raises(DomainError):
        GF(7).inv_series(GF(7).poly([7, 1]), 4)


@given(st.lists(st.integers(-50, 50), min_size=1, max_size=12), st.integers(0, 14))
def test_inv_series_against_the_integers(rest, n):
    # a unit constant term 1: the inverse over ZZ reduced modulo p
    poly = [1, *rest]
    exact = ZZ.coefficients(ZZ.inv_series(ZZ.poly(poly), n))
    got = GF(P).coefficients(GF(P).inv_series(GF(P).poly(poly), n))
    assert got == [c % P for c in exact][:len(got)] and all(c % P == 0 for c in exact[len(got):])


def test_exponential_of_a_logarithm_modulo_p():
    # Euler's (q;q)_inf, the pentagonal numbers, modulo a prime above the order
    n = 30
    s, expected = euler_case(n)
    expected = [c % P for c in expected]
    got = GF(P).coefficients(GF(P).exp_integral(s, n))
    assert got + [0] * (n - len(got)) == expected
    # dividing by k < 30 modulo 29 is impossible: the ring says so instead of guessing
    assert GF(29).exp_integral(s, n) is None


@given(st.lists(st.integers(-50, 50), max_size=40), st.integers(1, 7), st.data())
def test_deflate_is_the_strided_read(coeffs, m, data):
    """GF(p).deflate against the slice of the reduced coefficients."""
    r = data.draw(st.integers(0, m - 1))
    R = GF(7)
    want = [c % 7 for c in coeffs][r::m]
    while want and want[-1] == 0:
        want = want[:-1]
    assert R.coefficients(R.deflate(R.poly(coeffs), m, r)) == want
