"""report.expansion: an expansion as text, and the note when fewer coefficients are known."""

from qseries import evaluate
from qseries.report import expansion_note, expansion_text


def test_an_exact_series_is_shown_to_the_order():
    s = evaluate("1/(q;q)_inf", 8)
    assert expansion_text(s, 8) == "1 + q + 2q^2 + 3q^3 + 5q^4 + 7q^5 + 11q^6 + 15q^7 + O(q^8)"
    assert expansion_text(evaluate("1 + q^2", 10), 10) == "1 + q^2"     # exact, nothing cut
    assert expansion_text(evaluate("1 + q^20", 10), 10) == "1 + O(q^10)"
    assert expansion_note(s, 8) is None


def test_weighted_variables_are_written_in_q_and_z():
    # moved from tests/cli/test_main.py
    s = evaluate("1/(1-z)", 3, weights={"z": 1})
    assert expansion_text(s, 3) == "1 + z*q + z^2*q^2 + O(q^3)"


def test_a_series_known_to_less_says_so():
    s = evaluate("q^-3/(1-q) + O(q^5)", 10)
    assert expansion_text(s, 10).endswith("+ O(q^5)")
    assert expansion_note(s, 10) == ("note: only the coefficients below q^5 are known "
                                     "(negative powers of q or an O(q^N) term cost precision)")


def test_dissection_lines_one_per_residue():
    from qseries.analysis import dissection
    from qseries.report import dissection_lines

    lines = dissection_lines(dissection("q^(-1/24)/(q;q)_inf", 2, 3), 3)
    # the exponent -1/24 = 2(-1) + 47/24: p(0) stands at q^-1 of the part r = 47/24
    assert lines == ["r=23/24: 1 + 3q + 7q^2 + O(q^3)",
                     "r=47/24: q^-1 + 2 + 5q + 11q^2 + O(q^3)"]
