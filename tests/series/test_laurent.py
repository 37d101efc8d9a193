"""Series over the Laurent coefficient ring (the ring itself: tests/backend/test_laurent.py)."""

from fractions import Fraction

from qseries.backend import laurent_ring
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
