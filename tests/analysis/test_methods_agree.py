"""Property tests: the exact and modular methods, and evaluations at two orders, agree on
random expressions built from the notation (sums with q-Pochhammer factors, products,
theta functions)."""

from hypothesis import given, settings
from hypothesis import strategies as st

from qseries import check, evaluate
from qseries.series import GF

PRIME = 1_000_000_007


@st.composite
def sum_sides(draw: st.DrawFn) -> str:
    a = draw(st.integers(1, 3))
    b = draw(st.integers(0, 3))
    t = draw(st.integers(1, 3))
    s = draw(st.sampled_from(["", "(-1)^k ", "2^k "]))
    num = draw(st.sampled_from(["", " (-q;q)_k", " (q^2;q^2)_k", f" (q^{t};q^{t})_k"]))
    den = draw(st.sampled_from(["(q;q)_k", "(q;q)_k^2", f"(q^{t};q^{t})_k", "(q;q)_(2k)"]))
    return f"sum_{{k>=0}} {s}q^({a} k^2 + {b} k){num} / {den}"


@st.composite
def product_sides(draw: st.DrawFn) -> str:
    parts = []
    for _ in range(draw(st.integers(1, 3))):
        m = draw(st.integers(1, 7))
        a = draw(st.integers(1, m))
        e = draw(st.sampled_from([-2, -1, 1, 2]))
        sign = draw(st.sampled_from(["", "-"]))
        parts.append(f"({sign}q^{a};q^{m})_inf^({e})")
    return " ".join(parts)


sides = st.one_of(sum_sides(), product_sides(),
                  st.sampled_from(["theta_3(q)^2", "eta(q)^2 eta(q^2)^-1", "theta_4(q^2)"]))


@settings(max_examples=40, deadline=None)
@given(sides)
def test_two_orders_agree_below_the_smaller(text):
    low, high = evaluate(text, 60), evaluate(text, 150)
    n = low.precision
    assert high.precision >= n
    for e, c in low.terms():
        assert high.coefficient(e) == c
    for e, c in high.terms():
        if e < n:
            assert low.coefficient(e) == c


@settings(max_examples=40, deadline=None)
@given(sides)
def test_modular_evaluation_is_the_reduction_of_the_exact_one(text):
    exact = evaluate(text, 120)
    modular = evaluate(text, 120, GF(PRIME))
    assert modular.precision == exact.precision
    for e, c in exact.terms():
        assert isinstance(c, int)           # these expressions have integer coefficients
        assert modular.coefficient(e) == c % PRIME
    for e, c in modular.terms():
        assert c == exact.coefficient(e) % PRIME


@settings(max_examples=25, deadline=None)
@given(sides, sides)
def test_exact_and_modular_checks_give_the_same_verdict(lhs, rhs):
    exact = check(lhs, rhs, order=100, method="exact")
    modular = check(lhs, rhs, order=100, method="modular")
    assert exact.holds == modular.holds
    if not exact.holds:
        assert exact.first_mismatch == modular.first_mismatch


@settings(max_examples=40, deadline=None)
@given(st.one_of(sides, st.builds(lambda a, b: f"({a}) / ({b})", sides, sides),
                 st.builds(lambda a, b: f"-({a}) ({b})", sum_sides(), product_sides())))
def test_numerator_over_denominator_is_the_value(text):
    # the modular method compares sides as A*D = C*B from evaluate_parts; the quotient of the
    # parts must be the value itself, to the same precision
    from qseries.engine import Evaluator
    from qseries.lang import parse
    for ring in (GF(PRIME),):
        node = parse(text)
        num, den = Evaluator(ring).evaluate_parts(node, 90)
        value = Evaluator(ring).evaluate(node, 90)
        if den is not None:
            assert den.valuation == 0 and den.offset == 0
            num = (num * den.inverse(order=90)).truncate(90)
        assert num == value, text
