"""Series to and from sympy and numpy (qseries/series/convert.py): exact both ways, checked
against sympy's own series expansions."""

from fractions import Fraction

import numpy as np
import pytest
import sympy
from hypothesis import given
from hypothesis import strategies as st
from sympy.functions.combinatorial.numbers import partition

from qseries import evaluate
from qseries.errors import ArgumentError, ArgumentTypeError, UnableError
from qseries.series import QQ, Series

q, z = sympy.symbols("q z")


def test_to_sympy_agrees_with_sympys_series_of_the_product():
    # 1/((1-q)(1-q^2)(1-q^3)) expanded by sympy itself; qseries evaluates the same product
    ours = evaluate("1/((1-q)(1-q^2)(1-q^3))", 12).to_sympy()
    theirs = sympy.series(1 / ((1 - q) * (1 - q**2) * (1 - q**3)), q, 0, 12)
    assert sympy.expand(ours - theirs) == sympy.O(q**12)
    assert ours.getO() == sympy.O(q**12)


def test_from_sympy_reads_sympys_expansion():
    theirs = sympy.series(sympy.exp(q) * 24, q, 0, 6)     # 24 + 24q + 12q^2 + 4q^3 + q^4 + q^5/5
    s = Series.from_sympy(theirs)
    assert s.ring == QQ and s.precision == 6
    assert s.coefficient_list() == [24, 24, 12, 4, 1, Fraction(1, 5)]


@given(st.lists(st.fractions(min_value=-9, max_value=9, max_denominator=5), max_size=10),
       st.integers(-3, 3), st.sampled_from([0, Fraction(1, 24), Fraction(5, 8)]),
       st.booleans())
def test_round_trip(coeffs, start, offset, exact):
    s = Series.from_coefficients(coeffs, start=start, prec=None if exact else start + len(coeffs))
    if offset:
        s = s.shift(offset)
    assert Series.from_sympy(s.to_sympy()) == s


def test_round_trip_in_extra_variables():
    s = evaluate("(z q, q/z, q;q)_inf", 7)
    e = s.to_sympy()
    assert e.coeff(q, 1) == -z - 1 - 1 / z           # Jacobi's triple product, first term
    assert Series.from_sympy(e) == s


def test_fractional_order_outside_the_class_is_kept_as_a_cap():
    s = Series.from_sympy(q ** sympy.Rational(1, 24) - q ** sympy.Rational(25, 24)
                          + sympy.O(q**2))
    assert s == evaluate("eta(q) + O(q^2)", 3)
    assert s.precision == 2


def test_order_truncates():
    assert Series.from_sympy(1 + q + q**7 + sympy.O(q**9), order=3) == \
        Series.from_coefficients([1, 1], prec=3)
    assert Series.from_sympy(sympy.O(q**4)) == Series.zero(prec=4)
    assert Series.from_sympy(sympy.Integer(5)) == Series.constant(5)


@pytest.mark.parametrize("bad, error, words", [
    ("1 + q", ArgumentTypeError, "strings are never evaluated"),
    (1 + sympy.Float(0.5) * q, ArgumentError, "inexact"),
    (1 + sympy.sqrt(2) * q, ArgumentError, "not a rational number"),
    (1 + sympy.sin(q), ArgumentError, "sin"),
    (1 + q**sympy.Rational(1, 2), ArgumentError, "more than one class"),
    (z**sympy.Rational(1, 2) * q, ArgumentError, "integer powers"),
    (1 + q**(10**9), UnableError, "span"),
    (1 + sympy.O(q**2, (q, 1)), ArgumentError, "at q = 0"),
])
def test_what_is_refused(bad, error, words):
    with pytest.raises(error, match=words):
        Series.from_sympy(bad)


def test_coefficient_list_without_a_length_is_everything_known():
    assert evaluate("1/(q;q)_inf", 8).coefficient_list() == [1, 1, 2, 3, 5, 7, 11, 15]  # A000041
    assert Series.from_coefficients([0, 0, 3]).coefficient_list() == [0, 0, 3]
    f = Series.from_coefficients([1, 0, 2], start=-2, prec=3)
    assert f.coefficient_list(start=-2) == [1, 0, 2, 0, 0]
    with pytest.raises(ArgumentError):
        f.coefficient_list()


def test_to_numpy_int64_when_safe_else_exact_objects():
    p = evaluate("1/(q;q)_inf", 500)
    a = p.to_numpy()
    assert a.dtype == object                         # p(499) has 23 digits, beyond int64
    assert int(a[499]) == partition(499)
    small = evaluate("1/(q;q)_inf", 100).to_numpy()
    assert small.dtype == np.int64 and small[99] == partition(99)
    halves = Series.from_coefficients([Fraction(1, 2), 1]).to_numpy()
    assert halves.dtype == object and halves[0] == Fraction(1, 2)


def test_missing_library_is_a_clear_error(monkeypatch):
    import sys

    monkeypatch.setitem(sys.modules, "sympy", None)      # import sympy now raises ImportError
    with pytest.raises(UnableError, match="pip install sympy"):
        Series.from_coefficients([1]).to_sympy()


def test_a_far_monomial_is_read_but_not_listed_whole():
    s = Series.from_sympy(q ** (10**100))
    assert s.valuation == 10**100 and s.to_sympy() == q ** (10**100)
    with pytest.raises(UnableError, match="beyond the limit"):
        s.coefficient_list()
    with pytest.raises(UnableError, match="beyond the limit"):
        s.to_numpy()
    assert s.to_numpy(3, start=10**100).tolist() == [1, 0, 0]
