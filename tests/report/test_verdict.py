"""report.verdict: the AGREES / DIFFERS / INCONCLUSIVE report of a check, the verify
verdict column, and the report of a failed assertion."""

import pytest

from qseries import check
from qseries.analysis import Hint, diagnose
from qseries.errors import ArgumentError, ArgumentTypeError
from qseries.report import (
    check_lines,
    entry_verdict_text,
    hint_line,
    mismatch_report,
    mismatch_text,
    neighbour_table,
)
from qseries.report.json_shapes import mismatch_json


def test_agreement_is_one_line_and_the_time():
    r = check("(-q;q)_inf", "1/(q;q^2)_inf", order=50)
    lines = check_lines(r)
    assert lines[0] == f"AGREES  {r.verdict}" and "agree to O(q^50)" in lines[0]
    assert lines[1:] == [f"  ({r.seconds:.3f} s)"]


def test_a_mismatch_gives_the_difference_the_agreeing_range_and_the_table():
    r = check("1/(1-q)", "1 + q + q^2 + 2q^3", order=10)
    lines = check_lines(r)
    assert lines[0] == f"DIFFERS  {r.verdict} (difference -1)"
    assert lines[1] == "  coefficients below q^3 agree"
    assert lines[2:-1] == neighbour_table(r)


def test_an_inconclusive_check_never_says_agrees():
    r = check("O(q^-5) + 1", "2")
    lines = check_lines(r)
    assert lines[0].startswith("INCONCLUSIVE  inconclusive: no coefficient could be compared")
    assert not any("AGREES" in line for line in lines)


def test_hints_come_after_the_table():
    r = check("1/(q;q)_inf", "1/(q^2;q^2)_inf", order=40)
    hints = diagnose(r)
    lines = check_lines(r, hints)
    assert lines[-2] == hint_line(hints[0])
    assert lines[-2].startswith("  hint (dilation): the right side is the left side with q -> q^2")


def test_a_failed_check_with_a_shortfall_gets_a_note():
    # an agreeing check says the shortfall in its verdict; a failing one in a note
    r = check("q^-3 (1/(1-q) + O(q^10))", "q^-3/(1-q) + q^2", order=20)
    notes = [line for line in check_lines(r) if line.startswith("note:")]
    assert notes == ["note: only the coefficients below q^7 could be compared, not q^20: the "
                     "left side is known only below q^7 (it carries its own O(q^10))"]
    r = check("q^-3 (1/(1-q) + O(q^10))", "q^-3/(1-q)", order=20)
    assert not [line for line in check_lines(r) if line.startswith("note:")]
    assert "fewer than the q^20 asked" in check_lines(r)[0]


def test_weighted_mismatch_is_shown_in_q_and_z():
    # moved from tests/cli/test_main.py
    r = check("1/(1-z)", "1/(1-z) + z^3 q", order=10, weights={"z": 2})
    text = "\n".join(check_lines(r))
    assert "right side z^3*q (difference -z^3*q)" in text
    assert "coefficients below weighted degree 7 agree" in text
    assert "7     0  z^3*q      -z^3*q" in text


def test_mismatch_report_says_why_fewer_coefficients_were_compared():
    # moved from tests/testing/test_helpers.py
    text = mismatch_report(check("1/(1-q) + O(q^3)", "1/(1-q)", order=5))
    assert "the left side is known only below q^3" in text and "not q^5" in text


def test_mismatch_report_has_the_verdict_and_the_table():
    r = check("1/(1-q)", "1 + q", order=9)
    assert mismatch_report(r, 1).splitlines() == [r.verdict] + neighbour_table(r, 1)


def test_mismatch_report_refuses_bad_arguments():
    with pytest.raises(ArgumentTypeError, match="r must be"):
        mismatch_report(5)
    with pytest.raises(ArgumentTypeError, match="radius"):
        mismatch_report(check("1", "q", order=3), radius="1")
    with pytest.raises(ArgumentError, match="radius"):
        mismatch_report(check("1", "q", order=3), radius=-1)


class Outcome:
    def __init__(self, ok, error="", first_mismatch=None):
        self.ok, self.error, self.first_mismatch = ok, error, first_mismatch


@pytest.mark.parametrize(("ok", "error", "expect", "text"), [
    (True, "", "holds", "holds"),
    (False, "", "holds", "FAILS"),
    (True, "", "fails", "fails as recorded"),
    (False, "", "fails", "NOT AS RECORDED"),
    (False, "cannot parse\nat 3", "holds", "ERROR cannot parse"),
    (False, "boom", "fails", "ERROR boom"),
])
def test_entry_verdicts(ok, error, expect, text):
    assert entry_verdict_text(Outcome(ok, error), expect) == text


def test_entry_mismatch_text_reads_the_json_shape():
    r = check("eta(q)", "q^(1/24) (q;q)_inf + q^(25/24)", order=5)
    assert mismatch_text(Outcome(False, "", mismatch_json(r))) == "q^25/24: -1 vs 0"
    assert mismatch_text(Outcome(True)) == ""


def test_hint_lines_are_the_kind_and_the_message():
    assert hint_line(Hint("polynomial", "x")) == "  hint (polynomial): x"


def test_a_recorded_failure_beyond_the_order_is_not_reported_as_seen():
    # order 10 < fails_at = 20: the sides agree to the order, which is consistent with the
    # record, but "fails as recorded" claimed a failure that was never computed
    from qseries.catalogue.files import Entry
    from qseries.catalogue.verify import verify_entry
    e = Entry("x", "x", "1/(1-q)", "1/(1-q) + q^20", 10, "invented", "-", 1,
              expect="fails", fails_at=20)
    r = verify_entry(e)
    assert r.ok and r.holds is True
    text = entry_verdict_text(r, "fails")
    assert "fails" not in text.replace("failure", "") and "beyond" in text
    seen = verify_entry(e, order=30)
    assert entry_verdict_text(seen, "fails") == "fails as recorded"
