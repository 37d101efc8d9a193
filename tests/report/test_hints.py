"""report.hints: one line per hint of a failed check, for each kind diagnose gives."""

import pytest

from qseries import check
from qseries.analysis import diagnose
from qseries.report import hint_json, hint_line


@pytest.mark.parametrize(("lhs", "rhs", "kind", "message"), [
    ("(q;q)_inf", "q (q;q)_inf", "shift", "the left side is q^(-1) times the right side"),
    ("1/(q;q)_inf", "2/(q;q)_inf", "constant", "the left side is 1/2 times the right side"),
    ("1/(q;q)_inf", "1/(q^2;q^2)_inf", "dilation", "the right side is the left side with "
                                                   "q -> q^2"),
    ("1/(q;q)_inf", "1/(q;q)_inf + q^3 - 2q^5", "polynomial",
     "the sides differ only by the polynomial -q^3 + 2q^5 below q^40"),
    ("1/(q;q)_inf", "1/(q^2;q)_inf", "product-factor", "the ratio left/right is (1 - q)^-1"),
])
def test_each_kind_of_hint_as_a_line_and_as_json(lhs, rhs, kind, message):
    [h] = diagnose(check(lhs, rhs, order=40))
    assert hint_line(h).startswith(f"  hint ({kind}): {message}")
    assert hint_json(h) == {"kind": kind, "message": h.message}
