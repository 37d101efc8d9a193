"""Distributions of statistics from two-variable generating functions."""

import math
from fractions import Fraction

import pytest

from qseries.analysis.statistic import Distribution, distributions, normal_moment
from qseries.backend import partitions_p
from qseries.errors import QSeriesError

DURFEE = "sum_{k>=0} z^k q^(k^2)/(q;q)_k^2"
#: the mean Durfee square side of a partition of n is ~ c sqrt(n) with this c (E. R. Canfield,
#: S. Corteel, C. D. Savage, "Durfee polynomials", Electron. J. Combin. 5 (1998) #R32)
DURFEE_CONSTANT = math.sqrt(6) * math.log(2) / math.pi


def test_durfee_distribution_counts_all_partitions():
    # reference: FLINT's partition function (Hardy-Ramanujan-Rademacher), not our series
    sizes = list(range(0, 301, 7)) + [299, 300]
    for d in distributions(DURFEE, "z", sizes):
        assert d.total == partitions_p(d.n)


def test_durfee_square_sizes_from_first_principles():
    # partitions of 4: 4, 31, 211, 1111 have Durfee square 1; 22 has 2
    d = distributions(DURFEE, "z", [4])[0]
    assert d.counts == {1: 4, 2: 1}
    assert d.mean == Fraction(6, 5) and d.variance == Fraction(4, 25)


def test_durfee_mean_over_sqrt_n_moves_towards_the_published_constant():
    sizes = [50, 100, 200, 400, 800]
    ratios = [float(d.mean) / math.sqrt(d.n) for d in distributions(DURFEE, "z", sizes)]
    gaps = [r - DURFEE_CONSTANT for r in ratios]
    assert all(g > 0 for g in gaps)
    assert all(b < a for a, b in zip(gaps, gaps[1:], strict=False))
    assert gaps[-1] < 0.004
    # the mean at n = 800 itself, from an independent count: a partition with Durfee square
    # k is the k x k square, a partition into at most k parts below it and one into parts at
    # most k beside it, so there are sum_{a+b=n-k^2} p_k(a) p_k(b) of them (p_k: parts <= k)
    n = 800
    parts_at_most = [[1] + [0] * n]
    for k in range(1, 29):
        row = list(parts_at_most[-1])
        for i in range(k, n + 1):
            row[i] += row[i - k]
        parts_at_most.append(row)
    counts = {k: sum(parts_at_most[k][a] * parts_at_most[k][n - k * k - a]
                     for a in range(n - k * k + 1)) for k in range(1, 29) if k * k <= n}
    assert sum(counts.values()) == partitions_p(n)
    d = distributions(DURFEE, "z", [n])[0]
    assert d.counts == counts
    assert d.mean == Fraction(sum(k * c for k, c in counts.items()), partitions_p(n))


def test_durfee_standardised_moments_approach_the_normal_ones():
    d = distributions(DURFEE, "z", [600])[0]
    assert abs(d.standardised_moment(1)) < 1e-12
    assert abs(d.standardised_moment(2) - 1) < 1e-12
    assert abs(d.standardised_moment(3)) < 0.05
    assert abs(d.standardised_moment(4) - 3) < 0.1


def test_number_of_parts_statistic_of_partitions():
    # 1/(zq;q)_inf: z marks the number of parts; partitions of 5 by number of parts 1,2,2,1,1
    d = distributions("1/(z q;q)_inf", "z", [5])[0]
    assert d.counts == {1: 1, 2: 2, 3: 2, 4: 1, 5: 1}


def test_normal_moments():
    assert [normal_moment(r) for r in range(1, 11)] == [0, 1, 0, 3, 0, 15, 0, 105, 0, 945]


def test_moments_of_a_small_distribution_by_hand():
    d = Distribution(0, {0: 1, 1: 2, 3: 1})     # values 0, 1, 1, 3
    assert d.mean == Fraction(5, 4)
    assert d.variance == Fraction(25 + 1 + 1 + 49, 16 * 4)   # (-5/4)^2, (-1/4)^2 twice, (7/4)^2
    assert d.central_moment(3) == Fraction(((0 - Fraction(5, 4)) ** 3 + 2 * (Fraction(-1, 4)) ** 3
                                            + Fraction(7, 4) ** 3), 4)
    assert math.isnan(Distribution(0, {2: 5}).standardised_moment(3))


@pytest.mark.parametrize("expr, var, sizes, message", [
    ("1/(q;q)_inf", "z", [3], "does not mention"),
    ("1/(z a q;q)_inf", "z", [3], "other extra variables"),
    ("1/(1 + z q)", "z", [3], "not a count"),
    ("(z q;q)_inf", "z", [1], "not a count"),
    ("1 + z q^2", "z", [1], "no objects"),
    ("1/(z q;q)_inf", "z", [], "at least one"),
    ("1/(z q;q)_inf", "z", [10**9], "sizes must lie"),
])
def test_bad_statistic_input_is_refused(expr, var, sizes, message):
    with pytest.raises(QSeriesError, match=message):
        distributions(expr, var, sizes)


def test_power_series_in_the_marker_is_refused_without_weight_advice():
    with pytest.raises(QSeriesError, match="finite distribution") as info:
        distributions("1/(1 - z)", "z", [3])
    assert "weight" not in str(info.value)


def test_fractional_exponents_are_refused():
    with pytest.raises(QSeriesError, match="fractional exponents"):
        distributions("sum_{n>=0} z^n q^(n/2)/(q;q)_n", "z", [4])


def test_progress_is_called_per_size_in_the_order_given():
    said = []
    got = distributions(DURFEE, "z", [30, 4, 17],
                        progress=lambda n, done, total: said.append((n, done, total)))
    assert said == [(30, 1, 3), (4, 2, 3), (17, 3, 3)]
    # p(n) by FLINT (Hardy-Ramanujan-Rademacher): the progress changes nothing
    assert [d.total for d in got] == [partitions_p(n) for n in (30, 4, 17)]


def test_progress_stops_at_a_size_without_objects():
    said = []
    with pytest.raises(QSeriesError, match="no objects of size 1"):
        distributions("1 + z q^2", "z", [0, 1, 2], progress=lambda *a: said.append(a))
    assert said == [(0, 1, 3)]


def test_progress_must_be_callable():
    with pytest.raises(QSeriesError, match="progress must be a function"):
        distributions(DURFEE, "z", [3], progress="yes")
