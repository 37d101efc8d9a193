"""The container protocol of Series (indexing, slicing, refused iteration), equality and
``equal_to``, ``coefficient_list`` with a start, arithmetic with foreign numbers, pickling."""

import copy
import numbers
import pickle
from fractions import Fraction

import pytest
import sympy
from hypothesis import given
from hypothesis import strategies as st

from qseries import evaluate
from qseries.errors import (
    ArgumentError,
    IncompatibleRingError,
    PrecisionError,
    QSeriesError,
)
from qseries.series import GF, QQ, ZZ, Series, laurent_ring

q = Series.monomial(1)
LZ = laurent_ring(("z",))
LAZ = laurent_ring(("a", "z"), rational=True)
RINGS = [ZZ, QQ, GF(7), GF(1_000_003), LZ, LAZ]


def big_o(n: int) -> Series:
    return Series.zero(prec=n)


def eta_like() -> Series:
    """q^(1/24) (1 - q - q^2 + O(q^5))."""
    return Series.monomial(Fraction(1, 24)) * Series.from_coefficients([1, -1, -1], prec=5)


# -- random series in every ring ------------------------------------------------------------
@st.composite
def scalars(draw, ring):
    c = draw(st.integers(-9, 9))
    if ring == QQ or getattr(ring, "rational", False):
        c = Fraction(c, draw(st.integers(1, 5)))
    names = getattr(ring, "names", ())
    if not names or not c:
        return c
    x = ring.coerce(c)
    for name in names:
        x = x * ring.gen(name) ** draw(st.integers(-2, 2))
    return x + draw(st.integers(-2, 2))


@st.composite
def series_in(draw, ring):
    coeffs = draw(st.lists(scalars(ring), max_size=8))
    start = draw(st.integers(-4, 4))
    offset = draw(st.sampled_from([Fraction(0), Fraction(1, 24), Fraction(1, 2)]))
    prec = draw(st.none() | st.integers(start - 2, start + 10))
    return Series(ring, ring.poly(coeffs), start, offset, prec)


any_series = st.sampled_from(RINGS).flatmap(series_in)
exponents = st.builds(Fraction, st.integers(-150, 350), st.sampled_from([1, 2, 24])).map(
    lambda e: e.numerator if e.denominator == 1 else e)


def frame(f: Series, lo: int = -8, hi: int = 16) -> list:
    """Exponents around the known terms of f where coefficients may be nonzero, and some
    where they cannot be (other fractional parts), all below the precision."""
    out = []
    for k in range(lo, hi):
        for e in (k + f.offset, Fraction(k), k + Fraction(1, 3)):
            if f.precision is None or e < f.precision:
                out.append(e)
    return out


# -- iteration, membership and length are refused clearly -----------------------------------
def test_iteration_is_refused_and_points_to_terms():
    f = Series.from_coefficients([1, 2, 3], prec=3)
    for g in (f, Series.constant(1)):
        with pytest.raises(TypeError, match=r"terms\(\)"):
            iter(g)
        with pytest.raises(TypeError, match=r"terms\(\)"):
            list(g)
    assert list(f.terms()) == [(0, 1), (1, 2), (2, 3)]


def test_membership_terminates_with_a_clear_refusal():
    # before: `5 in f` walked f[0], f[1], ... (forever for an exact series)
    with pytest.raises(TypeError, match=r"coefficient"):
        5 in Series.from_coefficients([1, 2], prec=4)  # noqa: B015
    with pytest.raises(TypeError, match=r"coefficient"):
        5 in Series.constant(1)  # noqa: B015


def test_len_is_refused_but_truth_is_still_defined():
    with pytest.raises(TypeError, match=r"coefficient_list|terms\(\)"):
        len(Series.from_coefficients([1, 2], prec=4))
    # refusing len must not make `if series:` raise (the evaluator relies on it)
    assert bool(Series.zero()) and bool(big_o(3))


# -- indexing -------------------------------------------------------------------------------
def test_coefficient_beyond_the_precision_is_unknown():
    f = Series.from_coefficients([1, 2], prec=3)
    assert f[2] == 0 and f[-7] == 0
    with pytest.raises(PrecisionError, match="beyond the precision"):
        f[3]
    with pytest.raises(PrecisionError):
        f.coefficient(Fraction(7, 2))


def test_exponents_must_be_exact_numbers():
    f = Series.from_coefficients([1, 2], prec=3)
    assert f[sympy.Integer(1)] == 2
    assert eta_like()[sympy.Rational(25, 24)] == -1
    for bad in (0.5, "1", None, True):
        with pytest.raises(TypeError):
            f[bad]


# -- slicing --------------------------------------------------------------------------------
def test_slicing_by_exponent_range():
    f = evaluate("q^-2 + 1 + q", 5) + big_o(5)          # q^-2 + 1 + q + O(q^5)
    assert f[0:3] == 1 + q
    assert f[0:3].is_exact
    assert f[-2:1] == q**-2 + 1
    assert f[:0] == q**-2
    assert f[3:1] == 0 and f[5:5] == 0
    assert f[0:5] == 1 + q
    # a tail keeps the precision: its coefficients from q^5 on are unknown
    assert f[1:] == q + big_o(5)
    assert f[7:] == big_o(7)
    assert f[:] == f


def test_slice_beyond_the_precision_is_refused():
    f = Series.from_coefficients([1, 1], prec=5)
    with pytest.raises(PrecisionError, match="O\\(q\\^5\\)"):
        f[0:6]
    with pytest.raises(PrecisionError):
        f[:Fraction(11, 2)]
    assert Series.constant(1)[0:10**6] == 1


def test_slices_with_a_rational_offset():
    f = eta_like()
    assert f[0:1] == Series.monomial(Fraction(1, 24))
    assert f[Fraction(1, 24):Fraction(25, 24)] == Series.monomial(Fraction(1, 24))
    assert f[Fraction(25, 24):] == -Series.monomial(Fraction(25, 24)) \
        - Series.monomial(Fraction(49, 24)) + f[5:]
    assert f[5:].is_zero() and f[5:].precision == Fraction(121, 24)
    with pytest.raises(PrecisionError):
        f[0:6]


def test_slice_steps_and_bad_bounds_are_refused():
    f = Series.from_coefficients([1, 1], prec=5)
    with pytest.raises(ArgumentError, match="step"):
        f[0:4:2]
    with pytest.raises(TypeError):
        f[0:2.5]


@given(any_series, exponents, exponents)
def test_slicing_agrees_with_coefficient(f, a, b):
    p = f.precision
    if p is not None and b > p:
        with pytest.raises(PrecisionError):
            f[a:b]
        return
    s = f[a:b]
    assert s.is_exact and s.ring == f.ring
    for e in frame(f):
        assert s.coefficient(e) == (f.coefficient(e) if a <= e < b else 0)


@given(any_series, exponents)
def test_a_series_is_its_head_plus_its_tail(f, a):
    if f.precision is not None and a > f.precision:
        return
    head, tail = f[:a], f[a:]
    assert head + tail == f
    assert tail.precision == f.precision


# -- coefficient_list -----------------------------------------------------------------------
def test_coefficient_list_does_not_drop_negative_powers():
    f = evaluate("q^-2 + 1 + q", 5)
    with pytest.raises(ArgumentError, match="start=-2"):
        f.coefficient_list(3)
    assert f.coefficient_list(5, start=-2) == [1, 0, 1, 1, 0]
    assert f.coefficient_list(3, start=f.valuation) == [1, 0, 1]
    with pytest.raises(ArgumentError, match="start=-2"):
        f.coefficient_list(3, start=-1)


def test_coefficient_list_does_not_drop_the_offset():
    f = eta_like()
    with pytest.raises(ArgumentError, match="1/24"):
        f.coefficient_list(3)
    assert f.coefficient_list(3, start=Fraction(1, 24)) == [1, -1, -1]
    assert f.coefficient_list(5, start=f.valuation) == [1, -1, -1, 0, 0]
    with pytest.raises(PrecisionError):
        f.coefficient_list(6, start=f.valuation)
    # nothing known is nonzero: any start lists zeros
    assert (big_o(5) * Series.monomial(Fraction(1, 2))).coefficient_list(5) == [0] * 5


def test_coefficient_list_beyond_the_precision_is_unknown():
    f = Series.from_coefficients([1, 2], prec=5)
    assert f.coefficient_list(5) == [1, 2, 0, 0, 0]
    assert f.coefficient_list(0) == []
    with pytest.raises(PrecisionError):
        f.coefficient_list(6)
    with pytest.raises(PrecisionError):
        f.coefficient_list(3, start=3)


@given(any_series, st.integers(0, 12))
def test_coefficient_list_agrees_with_coefficient(f, n):
    start = f.valuation if f.valuation is not None else f.offset
    if f.precision is not None and start + n - 1 >= f.precision and n:
        with pytest.raises(PrecisionError):
            f.coefficient_list(n, start=start)
        return
    got = f.coefficient_list(n, start=start)
    assert got == [f.coefficient(start + k) for k in range(n)]


# -- equality -------------------------------------------------------------------------------
def test_a_constant_series_equals_the_number():
    assert Series.constant(1) == 1 and 1 == Series.constant(1)
    assert Series.constant(Fraction(1, 2)) == Fraction(1, 2)
    assert Series.zero() == 0 and Series.constant(3) != 4
    assert Series.constant(2) == sympy.Integer(2) and sympy.Integer(2) == Series.constant(2)
    assert Series.constant(1, LZ) + LZ.gen("z") == LZ.gen("z") + 1
    assert hash(Series.constant(3)) == hash(3) and hash(Series.zero()) == hash(0)
    assert hash(Series.constant(Fraction(1, 2))) == hash(Fraction(1, 2))
    # in GF(7) the number is reduced, as in arithmetic
    assert Series.constant(1, GF(7)) == 8


def test_equality_compares_precision_and_known_terms():
    one = Series.constant(1)
    assert one + big_o(5) != 1          # 1 + O(q^5) is not the exact 1
    assert one + big_o(5) == 1 + big_o(5)
    assert big_o(5) != big_o(6) and big_o(5) != 0
    assert 1 + q != 1 + q + big_o(5)
    # the same series over ZZ and QQ is equal (and hashes alike)
    f = Series.from_coefficients([1, -2, 3], prec=7)
    assert f == f.change_ring(QQ) and hash(f) == hash(f.change_ring(QQ))
    # an exact zero is zero whatever frame of exponents it was built in
    assert Series(ZZ, ZZ.zero(), 0, Fraction(1, 2)) == 0
    # rings that cannot be combined, and foreign objects: unequal, never an error
    assert Series.constant(1, GF(7)) != Series.constant(1)
    assert Series.constant(1, GF(7)) != Series.constant(1, GF(11))
    assert Series.constant(1) != "1" and Series.constant(1) != 1.0
    assert Series.constant(1, GF(7)) != Fraction(1, 7)


@given(any_series, any_series)
def test_equality_is_consistent_with_hash_and_difference(f, g):
    if f == g:
        assert hash(f) == hash(g) and g == f
    try:
        d = f - g
    except QSeriesError:
        assert f != g or (f.is_zero() and g.is_zero())
        return
    if f.precision == g.precision and d.is_zero():
        assert f == g
    elif not d.is_zero():
        assert f != g


# -- equal_to -------------------------------------------------------------------------------
def test_equal_to_compares_below_a_common_order():
    f = 1 + q + big_o(5)
    assert f.equal_to(1 + q, 5) and f.equal_to(1 + q + q**7, 5)
    assert not f.equal_to(1 + q**2, 5)
    assert f.equal_to(1, 1) and not f.equal_to(1, 2)
    assert f.equal_to(1 + q + q**3, 3)          # they differ only from q^3 on
    assert (1 + q).equal_to(1 + q, 10**6)
    with pytest.raises(PrecisionError, match="left.*O\\(q\\^5\\)"):
        f.equal_to(1 + q, 6)
    with pytest.raises(PrecisionError, match="right.*O\\(q\\^4\\)"):
        (1 + q).equal_to(1 + q + big_o(4), 5)
    with pytest.raises(IncompatibleRingError):
        f.equal_to(Series.constant(1, GF(7)), 2)
    with pytest.raises(TypeError):
        f.equal_to("1 + q", 2)


def test_equal_to_with_rational_exponents():
    f = eta_like()
    assert f.equal_to(Series.monomial(Fraction(1, 24)), 1)
    assert f.equal_to(Series.monomial(Fraction(1, 24)), Fraction(25, 24))
    assert not f.equal_to(Series.monomial(Fraction(1, 24)), Fraction(26, 24))
    assert not f.equal_to(0, 1)
    assert f.equal_to(0, Fraction(1, 24))


@given(st.sampled_from(RINGS).flatmap(lambda R: st.tuples(series_in(R), series_in(R))),
       exponents)
def test_equal_to_agrees_with_the_coefficients(pair, n):
    f, g = pair
    if any(s.precision is not None and s.precision < n for s in pair):
        with pytest.raises(PrecisionError):
            f.equal_to(g, n)
        return
    expected = all(f.coefficient(e) == g.coefficient(e) for e in frame(f) + frame(g)
                   if e < n)
    assert f.equal_to(g, n) == expected


# -- arithmetic with foreign objects --------------------------------------------------------
class Tag:
    """A foreign operand that knows how to combine with anything."""

    def __radd__(self, other):
        return "radd"

    __rsub__ = __rmul__ = __rtruediv__ = __rpow__ = __radd__


class Ratio:
    """A minimal numbers.Rational that is neither int nor Fraction."""

    def __init__(self, n, d):
        self.numerator, self.denominator = n, d


numbers.Rational.register(Ratio)


def test_foreign_operands_get_their_turn():
    f = Series.from_coefficients([1, 2], prec=4)
    for op in ("__add__", "__radd__", "__sub__", "__rsub__", "__mul__", "__rmul__",
               "__truediv__", "__rtruediv__", "__pow__"):
        assert getattr(f, op)(object()) is NotImplemented, op
    assert f.__eq__(object()) is NotImplemented
    assert f + Tag() == "radd" and f - Tag() == "radd" and f * Tag() == "radd"
    assert f / Tag() == "radd" and f ** Tag() == "radd"
    with pytest.raises(TypeError):
        f + 0.5
    with pytest.raises(TypeError):
        f * True


def test_sympy_and_other_rational_numbers_combine():
    f = Series.from_coefficients([1, 2], prec=4)
    assert sympy.Integer(2) * f == 2 * f and f * sympy.Integer(2) == 2 * f
    assert f + sympy.Rational(1, 2) == f + Fraction(1, 2)
    assert (sympy.Rational(1, 2) + f).ring == QQ
    assert sympy.Integer(3) - f == 3 - f and f / sympy.Integer(2) == f * Fraction(1, 2)
    assert sympy.Integer(1) / Series.from_coefficients([1, -1], prec=4) == \
        Series.from_coefficients([1, 1, 1, 1], prec=4)
    assert f ** sympy.Integer(2) == f * f
    assert f + Fraction(1, 2) == Series.from_coefficients([Fraction(3, 2), 2], prec=4)
    assert f * Ratio(3, 4) == f * Fraction(3, 4) and Ratio(3, 1) + f == 3 + f
    assert Series.from_coefficients([sympy.Integer(1), Ratio(1, 2)]) == \
        Series.from_coefficients([1, Fraction(1, 2)])


# -- pickling -------------------------------------------------------------------------------
def test_pickle_in_every_ring():
    z, a = LAZ.gen("z"), LAZ.gen("a")
    cases = [Series.from_coefficients([1, -2, 3], prec=7).shift(-3),
             Series.from_coefficients([Fraction(1, 3), 0, 5], QQ),
             Series.from_coefficients([1, 5, 6], GF(7), prec=9),
             eta_like(),
             big_o(4) * Series.monomial(Fraction(1, 2)),
             Series.zero(),
             evaluate("z*q + 1/(1-z*q)", 6),
             Series.constant(1, LAZ).mul_binomial(z * Fraction(1, 2) + a**-1, 1)
             .div_binomial(a, 2, 6)]
    for f in cases:
        for protocol in (0, pickle.HIGHEST_PROTOCOL):
            data = pickle.dumps(f, protocol)
            assert b"flint.types" not in data   # plain data, no FLINT objects
            g = pickle.loads(data)
            assert g == f and g.ring == f.ring and repr(g) == repr(f)
            assert g.ring is f.ring or f.ring.modulus is not None
            assert (g - f).is_zero()
        assert copy.copy(f) == f and copy.deepcopy(f) == f


def test_coefficients_in_extra_variables_pickle():
    # a coefficient of a series over a Laurent ring (such as a check's first mismatch)
    # pickles as plain data too, into the same ring object
    z, a = LAZ.gen("z"), LAZ.gen("a")
    f = Series.constant(1, LAZ).mul_binomial(z * Fraction(1, 2) + a**-1, 1)
    for c in (f.coefficient(1), z**-3 - 2 * a * z + 7, LAZ.coerce(0)):
        for protocol in (0, pickle.HIGHEST_PROTOCOL):
            data = pickle.dumps(c, protocol)
            assert b"flint.types" not in data
            d = pickle.loads(data)
            assert d == c and d.ring is c.ring and repr(d) == repr(c)
    g = evaluate("z*q + 1/(1-z*q)", 6)
    assert pickle.loads(pickle.dumps(g.coefficient(2))) == g.coefficient(2)


@given(any_series)
def test_pickle_round_trip(f):
    g = pickle.loads(pickle.dumps(f))
    assert g == f and g.ring == f.ring and g.precision == f.precision
    assert list(g.terms()) == list(f.terms())
