"""Series arithmetic against the slow pure-Python reference and sympy, and the precision rules."""

from fractions import Fraction

import pytest
import sympy
from hypothesis import example, given
from hypothesis import strategies as st

from qseries.errors import (
    ArgumentError,
    DomainError,
    IncompatibleRingError,
    PrecisionError,
    QSeriesError,
    UnableError,
)
from qseries.series import GF, QQ, ZZ, Series
from qseries.series.reference import ref_inverse, ref_mul, ref_pow

small_ints = st.integers(-20, 20)
coeff_lists = st.lists(small_ints, min_size=1, max_size=12)
unit_lists = st.tuples(st.sampled_from([1, -1]), st.lists(small_ints, max_size=11)).map(
    lambda t: [t[0], *t[1]])
precs = st.integers(1, 14)


def known(s: Series, n: int) -> list:
    return [Fraction(c) for c in s.coefficient_list(n)]


@given(coeff_lists, coeff_lists, precs, precs)
def test_mul_matches_reference(a, b, pa, pb):
    x = Series.from_coefficients(a, prec=pa)
    y = Series.from_coefficients(b, prec=pb)
    z = x * y
    # both have valuation >= 0, so the product is known to min(pa + val y, pb + val x)
    vx = x.valuation if x.valuation is not None else pa
    vy = y.valuation if y.valuation is not None else pb
    assert z.precision == min(pa + vy, pb + vx)
    n = z.precision
    assert known(z, n) == ref_mul(a[:pa], b[:pb], n)


@given(coeff_lists, coeff_lists, precs, precs)
def test_add_takes_minimum_precision(a, b, pa, pb):
    z = Series.from_coefficients(a, prec=pa) + Series.from_coefficients(b, prec=pb)
    n = min(pa, pb)
    assert z.precision == n
    ref = [Fraction(a[i] if i < len(a) else 0) + (b[i] if i < len(b) else 0) for i in range(n)]
    assert known(z, n) == ref


@given(unit_lists, precs)
def test_inverse_over_integers_matches_reference(a, p):
    x = Series.from_coefficients(a, prec=p)
    y = x.inverse()
    assert y.ring == ZZ
    assert y.precision == p
    assert known(y, p) == ref_inverse(a[:p], p)


@given(st.lists(small_ints, min_size=1, max_size=10).filter(lambda a: a[0] not in (0, 1, -1)),
       precs)
def test_inverse_with_non_unit_leading_coefficient_is_rational(a, p):
    y = Series.from_coefficients(a, prec=p).inverse()
    assert y.ring == QQ
    assert known(y, p) == ref_inverse(a[:p], p)


@given(coeff_lists.filter(lambda a: a[0] != 0), st.integers(0, 5), precs)
def test_power_matches_reference(a, e, p):
    y = Series.from_coefficients(a, prec=p).power(e)
    assert known(y, p) == ref_pow(a[:p], e, p)


@given(coeff_lists, coeff_lists, coeff_lists, precs)
def test_ring_laws(a, b, c, p):
    x, y, z = (Series.from_coefficients(v, prec=p) for v in (a, b, c))
    assert (x * (y + z)).coefficient_list(p) == (x * y + x * z).coefficient_list(p)
    assert ((x * y) * z).coefficient_list(p) == (x * (y * z)).coefficient_list(p)
    assert (x + y).coefficient_list(p) == (y + x).coefficient_list(p)


@given(coeff_lists.filter(lambda a: a[0] != 0), precs)
def test_series_times_inverse_is_one(a, p):
    x = Series.from_coefficients(a, prec=p)
    one = x * x.inverse()
    assert one.coefficient_list(p) == [1] + [0] * (p - 1)


def test_against_sympy_series_of_rational_function():
    # 1/(1 - q - q^2) is the Fibonacci generating function; sympy expands it independently
    q = sympy.symbols("q")
    ref = sympy.series(1 / (1 - q - q**2), q, 0, 30).removeO()
    ours = Series.from_coefficients([1, -1, -1]).inverse(order=30)
    assert ours.coefficient_list(30) == [int(ref.coeff(q, i)) for i in range(30)]


def test_negative_power_lowers_precision():
    f = Series.from_coefficients([1, 2, 3], prec=10)
    g = f * Series.monomial(-5)
    assert g.precision == 5
    assert g.valuation == -5


def test_division_by_positive_valuation_lowers_precision():
    # (f + O(q^10)) / (q^2 + q^3 + O(q^10)): the quotient is known to O(q^6)
    f = Series.from_coefficients([1, 1], prec=10)
    d = Series.from_coefficients([0, 0, 1, 1], prec=10)
    assert (f / d).precision == 10 - 2 - 2


def test_rational_offset_and_mismatched_offsets():
    eta_like = Series.monomial(Fraction(1, 24)) * Series.from_coefficients([1, -1], prec=5)
    assert eta_like.valuation == Fraction(1, 24)
    assert eta_like.precision == Fraction(121, 24)
    # exponents in different classes: a series in q^(1/24) (issue 13, item 5)
    mixed = eta_like + Series.constant(1)
    assert mixed.den == 24
    assert dict(mixed.terms()) == {0: 1, Fraction(1, 24): 1, Fraction(25, 24): -1}
    assert mixed.precision == Fraction(121, 24)
    # offsets add up and carry into the integer part
    s = Series.monomial(Fraction(2, 3)) * Series.monomial(Fraction(2, 3))
    assert s.valuation == Fraction(4, 3)


def test_exponents_in_too_fine_a_common_power_are_refused_by_name():
    # q^(1/3) + q^(1/5) + ... + q^(1/23) known to O(q^10) lives in q^(1/111546435): the
    # refusal was "a polynomial of length 31311281 exceeds the limit", after building it
    from qseries.errors import UnableError
    exact = Series.from_coefficients([1, 0, 1])
    for p in (3, 5, 7, 11, 13, 17, 19):
        exact = exact + Series.monomial(Fraction(1, p))
    with pytest.raises(UnableError) as err:
        exact + Series.monomial(Fraction(1, 23))
    assert "common power q^(1/111546435)" in str(err.value)
    # known to O(q^10), the series spans 10 d terms in q^(1/d): refused from d = 4849845
    with pytest.raises(UnableError) as err:
        s = Series.from_coefficients([1, 0, 1], prec=10)
        for p in (3, 5, 7, 11, 13, 17, 19):
            s = s + Series.monomial(Fraction(1, p))
    assert "common power q^(1/4849845)" in str(err.value)


def test_inverse_of_polynomial_needs_an_order():
    with pytest.raises(UnableError):
        Series.from_coefficients([1, -1]).inverse()
    assert Series.monomial(3, c=-1).inverse().valuation == -3


def test_division_by_zero_and_by_vanishing_series():
    with pytest.raises(DomainError):
        Series.zero().inverse()
    with pytest.raises(DomainError):
        Series.zero(prec=5).inverse()


def test_binomial_fast_paths_match_general_arithmetic():
    f = Series.from_coefficients(list(range(1, 40)), prec=40)
    b = Series.from_coefficients([1, 0, 0, -3])
    assert f.mul_binomial(3, 3) == (f * b).truncate(40)
    slow = (f * b.inverse(order=40)).coefficient_list(40)
    assert f.div_binomial(3, 3).coefficient_list(40) == slow
    half = f.div_binomial(Fraction(1, 2), 2)
    assert half.ring == QQ
    b_half = Series.from_coefficients([1, 0, Fraction(-1, 2)])
    assert half.coefficient_list(40) == (f * b_half.inverse(order=40)).coefficient_list(40)
    assert f.mul_binomial(Fraction(-3, 4), 5) == (f * Series.from_coefficients(
        [1, 0, 0, 0, 0, Fraction(3, 4)])).truncate(40)


def test_modular_ring_agrees_with_integers():
    p = 1_000_003
    a = Series.from_coefficients([1, 5, -7, 11], prec=20)
    m = a.change_ring(GF(p))
    inv = m.inverse()
    exact = a.inverse()
    assert [c % p for c in exact.coefficient_list(20)] == inv.coefficient_list(20)
    with pytest.raises(IncompatibleRingError):
        m + Series.from_coefficients([1], ring=GF(7))


def test_coefficient_beyond_precision_is_an_error():
    f = Series.from_coefficients([1, 2], prec=3)
    assert f[2] == 0
    with pytest.raises(PrecisionError):
        f[3]


def test_inflate():
    f = Series.from_coefficients([1, 2, 3], prec=3)
    g = f.inflate(2)
    assert g.precision == 6 and g.coefficient_list(6) == [1, 0, 2, 0, 3, 0]


# -- absolute precision through every operation (issue 11: the cap of a series with a
#    fractional offset was lost in products, powers and inverses) ------------------------
# The rules are those of truncated series: writing P for the absolute precision and v for
# the valuation (v >= P for a series with no known term), f*g is known below
# min(Pf + vg, Pg + vf), f^e below P + (e-1) v, 1/f below P - 2v, q^s f below P + s, and
# f(q^d) below d P.

_OFFSETS = [Fraction(0), Fraction(1, 2), Fraction(1, 3), Fraction(5, 8)]


@st.composite
def _capped_series(draw):
    offset = draw(st.sampled_from(_OFFSETS))
    start = draw(st.integers(-2, 3))
    coeffs = draw(st.lists(st.integers(-3, 3), max_size=4))
    if draw(st.booleans()):                       # exact, unless it is the zero series
        if not any(coeffs):
            coeffs = [1]
        return Series(ZZ, ZZ.poly(coeffs), start, offset)
    prec = start + draw(st.integers(0, 6))
    cap = offset + prec - Fraction(draw(st.integers(0, 5)), 6)   # between two exponents
    return Series(ZZ, ZZ.poly(coeffs), start, offset, prec, cap)


def _val_bound(f):
    return f.precision if f.valuation is None else f.valuation


def _expected_product_precision(f, g):
    cands = [x.precision + _val_bound(y) for x, y in ((f, g), (g, f)) if x.precision is not None]
    return min(cands, default=None)


@given(_capped_series(), _capped_series())
def test_product_precision_follows_the_absolute_rule(f, g):
    if (f.is_exact and f.is_zero()) or (g.is_exact and g.is_zero()):
        return
    assert (f * g).precision == _expected_product_precision(f, g)


@given(_capped_series(), st.integers(1, 4))
def test_power_precision_follows_the_absolute_rule(f, e):
    if f.is_exact:
        return
    assert f.power(e).precision == f.precision + (e - 1) * _val_bound(f)


@given(_capped_series())
def test_inverse_precision_follows_the_absolute_rule(f):
    if f.is_exact or f.is_zero():
        return
    assert f.inverse().precision == f.precision - 2 * f.valuation


@given(_capped_series(), st.integers(1, 4), st.sampled_from(_OFFSETS), st.integers(-3, 3))
def test_inflate_and_shift_move_the_precision(f, d, frac, n):
    if f.is_exact:
        return
    assert f.inflate(d).precision == d * f.precision
    assert f.shift(frac + n).precision == f.precision + frac + n


@given(_capped_series(), st.integers(-2, 2), st.integers(1, 3))
def test_binomial_factors_keep_the_precision(f, c, j):
    if f.is_exact:
        return
    assert f.mul_binomial(c, j).precision == f.precision
    assert f.div_binomial(c, j, order=20).precision == f.precision


def test_cap_kept_in_the_fuzzing_cases():
    # the cases of issue 11, worked by hand
    half = Fraction(1, 2)
    one_plus = Series.constant(1) + Series.zero(prec=1).shift(-half)   # 1 + O(q^(1/2))
    assert one_plus.precision == half
    assert (one_plus ** 2).precision == half
    f = Series.monomial(1) + Series.zero(prec=2).shift(half)            # q + O(q^(5/2))
    assert f.inverse().precision == half                                # q^-1 (1 + O(q^(3/2)))
    g = Series.zero(prec=2) + Series.monomial(Fraction(7, 2))           # O(q^2)
    assert (g * 1).precision == 2


@given(st.lists(st.integers(-9, 9), max_size=30), st.integers(-6, 6),
       st.sampled_from([Fraction(0), Fraction(1, 24), Fraction(23, 24), Fraction(1, 2)]),
       st.one_of(st.none(), st.integers(0, 40)), st.integers(1, 8), st.integers(-10, 10))
def test_section_reads_coefficient_by_coefficient(coeffs, start, offset, prec, m, j):
    """f.section(m, r) against f.coefficient(m n + r), one exponent at a time, and its
    precision against ceil((N - r)/m)."""
    f = Series.from_coefficients(coeffs, start=start, prec=prec, offset=offset)
    r = offset + j
    g = f.section(m, r)
    if prec is None:
        assert g.precision is None
        top = (start + len(coeffs) + 2 - j) // m + 2
    else:
        known = f.precision
        assert g.precision == -((-(known - r)) // m)
        top = g.precision
    for n in range(-20, top):
        assert g.coefficient(n) == f.coefficient(m * n + r)


def test_section_refuses_another_class_and_bad_steps():
    f = Series.monomial(Fraction(1, 24)) * Series.from_coefficients([1, -1, -1], prec=3)
    with pytest.raises(DomainError, match="none of them is m n"):
        f.section(5, 4)
    assert f.section(5, Fraction(1, 24)) == Series.from_coefficients([1], prec=1)
    for bad in (0, -2, 1.5, True):
        with pytest.raises(QSeriesError, match="integer >= 1"):
            f.section(bad, Fraction(1, 24))
    assert Series.zero(prec=10).section(3, 1).precision == 3     # ceil((10 - 1)/3)


# --- series in q^(1/d): sums of terms whose exponents differ by non-integers (issue 13,
# item 5), against a dictionary of exponents as the reference ---

_CLASSES = [Fraction(0), Fraction(1, 4), Fraction(1, 3), Fraction(1, 2), Fraction(5, 6)]


@st.composite
def _in_a_class(draw):
    coeffs = draw(st.lists(st.integers(-5, 5), min_size=1, max_size=8))
    start = draw(st.integers(-2, 3))
    prec = draw(st.one_of(st.none(), st.integers(start, start + 10)))
    return Series.from_coefficients(coeffs, start=start, prec=prec,
                                    offset=draw(st.sampled_from(_CLASSES)))


def _low_bound(s: Series):
    return s.precision if s.valuation is None else s.valuation


def _least(*ps):
    return min(p for p in ps if p is not None)


def _dict_sum(*xs):
    out: dict = {}
    for x in xs:
        for e, c in x.terms():
            out[e] = out.get(e, 0) + c
    return out


def _dict_product(x: dict, y: dict) -> dict:
    out: dict = {}
    for e, c in x.items():
        for f, d in y.items():
            out[e + f] = out.get(e + f, 0) + c * d
    return out


def _assert_terms(s: Series, terms: dict, precision) -> None:
    assert s.precision == precision
    want = {e: c for e, c in terms.items() if c and (precision is None or e < precision)}
    assert dict(s.terms()) == want
    for e, c in want.items():
        assert s[e] == c


@given(_in_a_class(), _in_a_class(), _in_a_class())
def test_sums_across_classes_match_the_reference(a, b, c):
    total = (a + b) + c
    precs = [x.precision for x in (a, b, c) if x.precision is not None]
    _assert_terms(total, _dict_sum(a, b, c), min(precs) if precs else None)
    assert total == a + (b + c) and total == c + b + a
    assert hash(total) == hash(c + (a + b))


@given(_in_a_class(), _in_a_class(), _in_a_class())
def test_products_across_classes_match_the_reference(a, b, c):
    x = a + b
    if (x.is_exact and x.is_zero()) or (c.is_exact and c.is_zero()):
        return
    z = x * c
    cands = [p.precision + _low_bound(o) for p, o in ((x, c), (c, x)) if p.precision is not None]
    top = min(cands, default=None)
    _assert_terms(z, _dict_product(dict(x.terms()), dict(c.terms())), top)
    assert z == c * x


@given(_in_a_class(), _in_a_class())
def test_cancelling_a_class_gives_the_simple_form_back(a, b):
    x = (a + b) - b
    top = min((p for p in (a.precision, b.precision) if p is not None), default=None)
    if top is None:
        assert x == a
    else:
        assert x.precision == top and x.equal_to(a, top)
    if not x.is_zero():                  # one class left: no longer a series in q^(1/d)
        assert x.den == 1 and x.offset == a.offset


@given(_in_a_class(), _in_a_class(), st.integers(1, 4), st.integers(1, 3))
@example(Series.from_coefficients([0], start=-2, prec=-2),
         Series.from_coefficients([0], start=-2, prec=-2), 1, 1)   # found by CI
def test_inverse_power_and_substitution_across_classes(a, b, e, d):
    def lead(x: Series) -> Fraction:    # the first term, or for a zero series its precision
        first = x.valuation if x.valuation is not None else x.precision
        return Fraction(first or 0)

    one_plus = 1 + a.shift(3 - lead(a)) + \
        b.shift(2 - lead(b)).truncate(12)    # 1 + terms of positive degree (regression:
    # b = O(q^-2) was shifted to O(q^0), and 1 + O(q^0) has nothing to invert)
    inv = one_plus.inverse(10)
    assert (inv * one_plus).equal_to(1, _least(10, inv.precision))
    power = one_plus.power(e, 12)
    by_products = Series.constant(1)
    for _ in range(e):
        by_products = by_products * one_plus
    assert power.equal_to(by_products, _least(12, power.precision, by_products.precision))
    sub = one_plus.inflate(d)
    assert dict(sub.terms()) == {d * k: c for k, c in one_plus.terms()}
    assert sub.precision == (None if one_plus.precision is None else d * one_plus.precision)


@given(_in_a_class(), _in_a_class(), st.integers(1, 6), st.integers(-6, 6))
def test_section_of_a_series_in_a_fractional_power(a, b, m, j):
    x = a + b
    r = (a.offset if a.valuation is not None else b.offset) + j
    if x.den == 1 and not x.is_zero() and (r - x.offset).denominator != 1:
        with pytest.raises(DomainError, match="class"):   # the terms of a's class are lost
            x.section(m, r)                                # beyond b's precision
        return
    g = x.section(m, r)
    top = g.precision if g.precision is not None else 6
    for n in range(-6, top):
        assert g[n] == x[m * n + r]


def test_theta_2_plus_theta_3_is_theta_3_at_a_fourth_root():
    """theta_2(q) + theta_3(q) = sum_{n in Z} q^(n^2/4) (theta_2 is the sum over the odd
    squares (2n+1)^2/4, theta_3 over the even ones; from the definitions), read against
    the squares directly."""
    from qseries import evaluate

    f = evaluate("theta_2(q) + theta_3(q)", 60)
    assert f.den == 4 and f.precision == 60
    want = {Fraction(n * n, 4): (1 if n == 0 else 2) for n in range(16)}
    assert dict(f.terms()) == want
    with pytest.raises(ArgumentError, match=r"multiples of q\^\(1/4\)"):
        f.coefficient_list(3)            # a list by whole steps would hide q^(1/4), q^(9/4)


def test_a_term_beyond_the_cap_is_dropped():
    # regression: O(q^(7/3)) + 0 took the zero's class q^(1/4) and a cap of 7/3; adding q^3
    # then kept q^3 beyond the precision ("q^3 + O(q^(7/3))")
    a = Series.from_coefficients([0], start=2, prec=2, offset=Fraction(1, 3))
    b = Series.from_coefficients([0], offset=Fraction(1, 4))
    s = (a + b) + Series.monomial(3)
    assert s.precision == Fraction(7, 3) and s.is_zero()


def test_a_series_in_a_fractional_power_pickles_and_hashes():
    import pickle

    f = Series.monomial(Fraction(1, 3)) * Series.from_coefficients([1, -1, 2], prec=6) + \
        Series.from_coefficients([3, 1])
    assert f.den == 3
    g = pickle.loads(pickle.dumps(f))
    assert g == f and hash(g) == hash(f) and g.den == 3
    assert str(f) == "3 + q^(1/3) + q - q^(4/3) + 2q^(7/3) + O(q^(19/3))"
