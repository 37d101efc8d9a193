"""Series over the Laurent coefficient ring (the ring itself: tests/backend/test_laurent.py)."""

from fractions import Fraction

import pytest

from qseries.backend import QQ, ZZ, join_rings, laurent_ring
from qseries.errors import DomainError, IncompatibleRingError
from qseries.series import Series

R = laurent_ring(("a", "z"))
a, z = R.gen("a"), R.gen("z")


def test_series_over_laurent_coefficients():
    one = Series.constant(1, R)
    s = one.mul_binomial(z, 1, 6).div_binomial(a, 2, 6)    # (1 - z q)/(1 - a q^2)
    assert s.coefficient(1) == -z and s.coefficient(2) == a and s.coefficient(3) == -a * z
    # rational coefficients move to the ring over QQ
    half = s * Fraction(1, 2)
    assert half.ring == laurent_ring(("a", "z"), rational=True)
    assert half.coefficient(1) == -z * Fraction(1, 2)


def test_joining_rings():
    assert join_rings(R, ZZ) == R
    assert join_rings(R, QQ) == laurent_ring(("a", "z"), rational=True)
    with pytest.raises(IncompatibleRingError, match="cannot combine"):
        join_rings(R, laurent_ring(("z",)))


def test_bad_variable_names_are_refused():
    with pytest.raises(DomainError):
        laurent_ring(("q",))
    with pytest.raises(DomainError):
        laurent_ring(("z", "z"))
