"""report.distribution: a distribution as text, and the mean/variance table as CSV."""

from fractions import Fraction

from qseries import distributions
from qseries.report import decimal_text, distribution_lines, trend_csv

DURFEE = "sum_{k>=0} z^k q^(k^2)/(q;q)_k^2"


def test_one_size_with_counts_shares_and_moments():
    [d] = distributions(DURFEE, "z", [10])
    assert distribution_lines(d, "z", 6) == [
        "n = 10: 42 objects",
        "  z =    1: 10  (0.238095)",
        "  z =    2: 30  (0.714286)",
        "  z =    3: 2  (0.047619)",
        "  mean      38/21  = 1.80952381",
        "  variance  110/441  = 0.2494331066",
        "  standardised moments (normal distribution in brackets):",
        "   1: 0.0000 [0]  2: 1.0000 [1]  3: -0.3294 [0]  4: 3.1959 [3]  5: 1.0063 [0]  "
        "6: 13.0546 [15]"]


def test_many_values_show_the_first_six_and_the_last_five():
    [d] = distributions("1/(z*q;q)_inf", "z", [20])      # largest part: 1 .. 20
    lines = distribution_lines(d, "z", 2)
    values = [line for line in lines if line.startswith("  z =")]
    assert [int(v.split()[2].rstrip(":")) for v in values] == [1, 2, 3, 4, 5, 6,
                                                               16, 17, 18, 19, 20]
    assert lines[7] == "    ..."


def test_decimals():
    assert decimal_text(Fraction(1, 3)) == "0.3333333333"
    assert decimal_text(Fraction(1, 3), 3) == "0.333"
    assert decimal_text(Fraction(10**301 + 1, 1)) == str(10**301 + 1)   # beyond a float


def test_trend_csv():
    # moved from tests/cli/test_main.py
    lines = trend_csv(distributions(DURFEE, "z", [1, 2, 3, 4, 5])).splitlines()
    assert lines[0] == "n,total,mean,variance,mean_decimal,variance_decimal"
    assert lines[4].startswith("4,5,6/5,4/25") and len(lines) == 6
