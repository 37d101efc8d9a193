"""report.distribution: a distribution as text, and the mean/variance table as CSV."""

import re
from fractions import Fraction

from qseries import distributions
from qseries.analysis import Distribution
from qseries.report import decimal_text, distribution_lines, trend_csv
from qseries.report.distribution import counts_csv, quantile

DURFEE = "sum_{k>=0} z^k q^(k^2)/(q;q)_k^2"


def test_one_size_with_counts_shares_and_moments():
    [d] = distributions(DURFEE, "z", [10])
    assert distribution_lines(d, "z", 6) == [
        "n = 10: 42 objects",
        "  z =    1: 10  (0.238095)",
        "  z =    2: 30  (0.714286)",
        "  z =    3: 2  (0.047619)",
        "  mode z = 2; quantiles 1%: 1, 25%: 2, median: 2, 75%: 2, 99%: 3",
        "  mean      38/21  = 1.80952381",
        "  variance  110/441  = 0.2494331066",
        "  standardised moments (normal distribution in brackets):",
        "   1: 0.0000 [0]  2: 1.0000 [1]  3: -0.3294 [0]  4: 3.1959 [3]  5: 1.0063 [0]  "
        "6: 13.0546 [15]"]


def test_many_values_show_the_middle_and_account_for_the_tails():
    # number of parts of the partitions of 300 (z marks each part): p(300) =
    # 9253082936723602 (A000041, from memory)
    [d] = distributions("1/(z*q;q)_inf", "z", [300])
    lines = distribution_lines(d, "z", 2)
    assert lines[0] == "n = 300: 9253082936723602 objects"
    assert lines[1].startswith("  z =    1 .. 20: ") and lines[1].endswith("together  (0.009849)")
    shown = [int(v) for line in lines[2:] for v in re.findall(r"z = +(\d+): ", line)]
    assert shown == list(range(21, 93))             # the 1% .. 99% quantiles, 3 to a line
    tail = next(line for line in lines if line.startswith("  z =   93 .. 300"))
    counted = sum(int(c) for c in re.findall(r": (\d+)  ", "\n".join(lines[1:])))
    counted += sum(int(c) for c in re.findall(r": (\d+) together", "\n".join(lines[1:])))
    assert counted == d.total and tail
    mode = next(line for line in lines if line.startswith("  mode"))
    # the most frequent number of parts: the count at 37 is the largest of the table
    assert mode.startswith("  mode z = 37; quantiles 1%: 21") and max(
        d.counts.values()) == d.counts[37]


def test_quantiles_and_counts_csv():
    d = Distribution(4, {0: 1, 1: 2, 5: 1})
    assert [quantile(d, Fraction(k, 4)) for k in range(1, 5)] == [0, 1, 1, 5]
    assert counts_csv([d], "w").splitlines() == ["n,w,count,share", "4,0,1,0.25", "4,1,2,0.5",
                                                 "4,5,1,0.25"]


def test_decimals():
    assert decimal_text(Fraction(1, 3)) == "0.3333333333"
    assert decimal_text(Fraction(1, 3), 3) == "0.333"
    assert decimal_text(Fraction(10**301 + 1, 1)) == str(10**301 + 1)   # beyond a float


def test_trend_csv():
    # moved from tests/cli/test_main.py
    lines = trend_csv(distributions(DURFEE, "z", [1, 2, 3, 4, 5])).splitlines()
    assert lines[0] == "n,total,mean,variance,mean_decimal,variance_decimal"
    assert lines[4].startswith("4,5,6/5,4/25") and len(lines) == 6


def test_a_single_value_has_no_standardised_moments():
    # every partition of 1 has a Durfee square of side 1: variance 0, so the standardised
    # moments are undefined; they were printed as "1: nan [0]  2: nan [1] ..."
    lines = distribution_lines(distributions("sum_{k>=0} z^k q^(k^2)/(q;q)_k^2", "z", [1])[0],
                               "z", 6)
    assert not any("nan" in line for line in lines)
    assert lines[0] == "n = 1: 1 object"
    assert lines[-1].strip() == "standardised moments: none (the variance is 0)"
