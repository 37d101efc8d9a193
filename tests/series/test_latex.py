"""Series.latex(): what a paper would print, and what the parser reads back (issue 13)."""

from fractions import Fraction

from hypothesis import given
from hypothesis import strategies as st

from qseries import evaluate
from qseries.series import Series


@given(st.lists(st.fractions(min_value=-5, max_value=5, max_denominator=4), max_size=12),
       st.integers(-3, 3), st.sampled_from([0, Fraction(1, 24), Fraction(1, 4)]),
       st.booleans())
def test_latex_of_a_series_evaluates_back_to_it(coeffs, start, offset, exact):
    s = Series.from_coefficients(coeffs, start=start, prec=None if exact else start + len(coeffs))
    if offset:
        s = s.shift(offset)
    order = max(start + len(coeffs) + 2, 1)
    back = evaluate(s.latex(), order)
    assert back.equal_to(s, order) if exact else back == s, s.latex()


def test_latex_in_extra_variables_evaluates_back():
    s = evaluate("(z q, q/z, q;q)_inf", 8)
    assert "\\left(" in s.latex()
    assert evaluate(s.latex(), 8) == s


def test_the_form_a_paper_prints():
    # Jacobi: (q;q)_inf^3 = sum (-1)^n (2n+1) q^(n(n+1)/2)
    assert evaluate("(q;q)_inf^3", 11).latex() == \
        "1 - 3 q + 5 q^{3} - 7 q^{6} + 9 q^{10} + O(q^{11})"
    assert evaluate("eta(q)", 2).latex() == "q^{1/24} - q^{25/24} + O(q^{2})"
    s = Series.from_coefficients(list(range(1, 30)), prec=29)
    assert "\\cdots" in s.latex(max_terms=6) and s._repr_latex_().startswith("$")
