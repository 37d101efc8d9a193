"""report.neighbours: the table of both sides' coefficients around the first mismatch."""

import pickle

import pytest

from qseries import check
from qseries.errors import ArgumentError, ArgumentTypeError
from qseries.report import neighbour_table


def test_rows_are_right_aligned_around_the_mismatch():
    r = check("1/(q;q)_inf", "1/(q;q)_inf + q^30", order=40)
    assert neighbour_table(r) == [
        "  exponent  left  right  difference",
        "        28  3718   3718           0",
        "        29  4565   4565           0",
        "        30  5604   5605          -1",
        "        31  6842   6842           0",
        "        32  8349   8349           0"]


def test_the_rows_are_the_neighbours():
    r = check("1/(1-q)", "1 + q", order=9)
    rows = neighbour_table(r, 3)[1:]
    assert [int(row.split()[0]) for row in rows] == [e for e, _, _ in r.neighbours(3)]


def test_no_table_when_the_sides_agree():
    assert neighbour_table(check("(-q;q)_inf", "1/(q;q^2)_inf", order=20)) == []


def test_fractional_exponents_and_weighted_degrees():
    r = check("eta(q)", "q^(1/24) (q;q)_inf + q^(25/24)", order=12)
    assert neighbour_table(r)[2].split() == ["25/24", "-1", "0", "-1"]
    r = check("sum_{k>=0} z^k/(q;q)_k", "1/(z q;q)_inf", order=12)
    table = neighbour_table(r)
    assert table[0].split()[:2] == ["weighted", "degree"]
    assert table[3].split() == ["2", "z^2", "+", "z*q", "z*q", "z^2"]


def test_bad_radii_are_refused():
    r = check("1", "1 + q^3", order=10)
    with pytest.raises(ArgumentError, match="radius"):
        neighbour_table(r, -1)
    with pytest.raises(ArgumentTypeError, match="radius"):
        neighbour_table(r, "2")


@pytest.mark.parametrize(("lhs", "rhs", "kwargs"), [
    ("1/(1-q)", "1 + q + q^2 + 2q^3", {}),
    ("(z q, q/z, q;q)_inf", "(z q, q/z, q;q)_inf + z^2 q^5", {}),
    ("(z q/2;q)_inf", "(z q/2;q)_inf + z q^3/3", {}),
    ("(z q, q/z, q;q)_inf", "1 + z q^4", {"method": "modular", "seed": 3}),
])
def test_a_pickled_result_gives_the_same_table(lhs, rhs, kwargs):
    # moved from tests/analysis/test_verdicts.py (CheckResult.table is now neighbour_table)
    r = check(lhs, rhs, order=12, **kwargs)
    assert neighbour_table(pickle.loads(pickle.dumps(r))) == neighbour_table(r) != []
