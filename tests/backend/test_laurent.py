"""qseries.backend.laurent: the Laurent coefficient ring (series in q over Laurent polynomials
in extra variables), against sympy."""

import pytest
import sympy
from hypothesis import given
from hypothesis import strategies as st

from qseries.backend import laurent_ring
from qseries.errors import DomainError

R = laurent_ring(("a", "z"))
a, z = R.gen("a"), R.gen("z")


def test_laurent_arithmetic_matches_sympy():
    # reference: sympy's own expansion of the same rational expression
    A, Z = sympy.symbols("a z")
    ours = (a * z**-2 + 3 - z) ** 3 * (a - z**-1)
    ref = sympy.expand((A / Z**2 + 3 - Z) ** 3 * (A - 1 / Z))
    terms = {}
    for (qe, ea, ez), c in ours.terms():
        assert qe == 0
        terms[(ea, ez)] = c
    ref_terms = {}
    for term in sympy.Add.make_args(ref):
        c, rest = term.as_coeff_Mul()
        powers = rest.as_powers_dict()
        ref_terms[(int(powers.get(A, 0)), int(powers.get(Z, 0)))] = int(c)
    assert terms == ref_terms


@given(st.lists(st.integers(-5, 5), min_size=1, max_size=6),
       st.lists(st.integers(-5, 5), min_size=1, max_size=6), st.integers(-3, 3))
def test_laurent_ring_laws(xs, ys, s):
    p = sum((c * z ** (i + s) for i, c in enumerate(xs)), R.coerce(0))
    r = sum((c * a ** i * z ** -i for i, c in enumerate(ys)), R.coerce(0))
    assert p * r == r * p
    assert (p + r) * p == p * p + r * p
    assert p - p == R.coerce(0)
    if p:
        assert not (p * z**-7 == p)


def test_units_and_inverse_series():
    assert R.is_unit(-z**-3) and not R.is_unit(1 - z) and not R.is_unit(2 * z)
    assert z**-2 * z**2 == 1
    with pytest.raises(DomainError):
        (1 - z) ** -1
    # 1/(1 - z q) = sum z^k q^k
    inv = R.inv_series(R.poly([1, -z]), 5)
    assert R.coefficients(inv) == [1, z, z**2, z**3, z**4]
    with pytest.raises(DomainError, match="weight"):
        R.inv_series(R.poly([1 - z, 1]), 3)


def test_bad_variable_names_are_refused():
    with pytest.raises(DomainError):
        laurent_ring(("q",))
    with pytest.raises(DomainError):
        laurent_ring(("z", "z"))


def test_deflate_reads_every_m_th_coefficient():
    """The Laurent ring's deflate: coefficients in z carried along, the shift kept."""
    R = laurent_ring(("z",))
    z = R.gen("z")
    p = R.poly([1, z, 2 * z, z + 1, 0, z**-1])
    assert R.coefficients(R.deflate(p, 2, 1)) == [z, z + 1, z**-1]
    assert R.coefficients(R.deflate(p, 3, 0)) == [1, z + 1]
    assert R.coefficients(R.deflate(p, 1, 0)) == R.coefficients(p)
