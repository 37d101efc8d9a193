"""Polynomials in bound variables: the cut-off of a sum from its valuation bound."""

from fractions import Fraction

from hypothesis import given, settings
from hypothesis import strategies as st

from qseries.engine import symbolic as sym


def brute_force(poly: tuple, target: int, start: int, beyond: int) -> int:
    """The least m >= start with poly(m') >= target for all m' in [m, beyond] (beyond lies
    past every real root), by evaluating every integer."""
    m = beyond
    while m > start and sym.peval(poly, m - 1) >= target:
        m -= 1
    return m


@given(st.lists(st.integers(-30, 30), min_size=1, max_size=4), st.integers(1, 5),
       st.integers(-50, 200), st.integers(0, 10))
def test_eventually_at_least_matches_a_walk_over_integers(low, lead, target, start):
    poly = sym.norm([Fraction(c) for c in low] + [Fraction(lead)])
    if sym.degree(poly) < 1:
        return
    beyond = max(start, sym.root_bound(sym.psub(poly, sym.const(target))))
    assert sym.eventually_at_least(poly, target, start) == \
        brute_force(poly, target, start, beyond)


def test_huge_coefficients_are_answered_at_once():
    # issue 11: a root bound near 2^63 was walked down one integer at a time (a walk would
    # not end: the deadline fails the test instead of hanging the suite)
    from ..catalogue.limits import deadline
    with deadline(30):
        _huge_coefficients()


def _huge_coefficients():
    two64 = Fraction(2) ** 64
    assert sym.eventually_at_least((Fraction(0), two64, Fraction(1)), 1, 0) == 1
    assert sym.eventually_at_least((Fraction(0), Fraction(10**20), Fraction(1)), 5, 0) == 1
    # (m - 10^9)^2 >= 4 except for m in [10^9 - 1, 10^9 + 1]
    p = sym.pmul((Fraction(-10**9), Fraction(1)), (Fraction(-10**9), Fraction(1)))
    assert sym.eventually_at_least(p, 4, 0) == 10**9 + 2
    # a polynomial with several sign changes: (m - 3)(m - 5)(m - 100) >= 0 from m = 100 on,
    # also on [3, 5]
    p = sym.pmul(sym.pmul((Fraction(-3), Fraction(1)), (Fraction(-5), Fraction(1))),
                 (Fraction(-100), Fraction(1)))
    assert sym.eventually_at_least(p, 0, 0) == 100
    assert sym.eventually_at_least(p, 0, 101) == 101


def test_integer_values_agree_with_peval():
    from fractions import Fraction

    from qseries.engine.symbolic import integer_values, peval
    poly = (Fraction(-3), Fraction(5), Fraction(0), Fraction(2))     # 2x^3 + 5x - 3
    xs = list(range(-5, 6))
    assert integer_values(poly, xs) == [peval(poly, x) for x in xs]
    assert integer_values((Fraction(1, 2), Fraction(1)), xs) is None


@settings(max_examples=400, deadline=None)
@given(st.integers(-10**6, 10**6), st.integers(-10**6, 10**6), st.integers(1, 10**4),
       st.integers(1, 300), st.integers(1, 3), st.integers(-50, 50), st.booleans())
def test_low_degree_cut_off_equals_the_sturm_bisection(c0, c1, n2, d2, d, start, linear):
    # exponents of sums (a n^2 + b n + c, rational coefficients, tiny leading ones too):
    # the closed form from the larger root against bisection on Sturm counts, and both
    # against the definition on the integers around the answer
    from fractions import Fraction as F

    from qseries.engine.symbolic import _bisect_at_least, _low_degree_at_least
    b = (F(c0, d), F(c1, d)) if linear else (F(c0, d), F(c1, d), F(n2, d2))
    if linear and b[1] <= 0:
        b = (b[0], F(n2, d2))
    got = _low_degree_at_least(b, start)
    assert got == _bisect_at_least(b, start)
    value = lambda m: sum(c * m**i for i, c in enumerate(b))  # noqa: E731
    assert got >= start and all(value(m) >= 0 for m in range(got, got + 50))
    assert got == start or value(got - 1) < 0
