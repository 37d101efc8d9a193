"""Coefficients against independent references: FLINT's Hardy-Ramanujan-Rademacher partition
function, and OEIS sequences (terms typed from memory, as marked)."""

from qseries import evaluate
from qseries.backend import partitions_p


def test_partition_numbers_against_flint_partitions_p():
    n = 2000
    s = evaluate("1/(q;q)_inf", n)
    assert s.coefficient_list(n) == [partitions_p(k) for k in range(n)]


def test_partition_numbers_from_a_sum_side_against_flint():
    # the Durfee-square sum computes p(n) by a different route than 1/(q;q)_inf
    n = 700
    s = evaluate("sum_{k>=0} q^(k^2)/(q;q)_k^2", n)
    assert s.coefficient_list(n) == [partitions_p(k) for k in range(n)]


# OEIS terms below are from memory.
A000041 = [1, 1, 2, 3, 5, 7, 11, 15, 22, 30, 42, 56, 77, 101, 135, 176, 231, 297, 385, 490, 627]
A000009 = [1, 1, 1, 2, 2, 3, 4, 5, 6, 8, 10, 12, 15, 18, 22, 27, 32, 38, 46, 54, 64]
A003114 = [1, 1, 1, 1, 2, 2, 3, 3, 4, 5, 6, 7, 9, 10, 12, 14, 17, 19, 23, 26, 31]
A003106 = [1, 0, 1, 1, 1, 1, 2, 2, 3, 3, 4, 4, 6, 6, 8, 9, 11, 12, 15, 16, 20]
A010815 = [1, -1, -1, 0, 0, 1, 0, 1, 0, 0, 0, 0, -1, 0, 0, -1, 0, 0, 0, 0, 0, 0, 1]


def test_oeis_a000041_partitions():
    assert evaluate("1/(q;q)_inf", 21).coefficient_list(21) == A000041


def test_oeis_a000009_distinct_parts():
    assert evaluate("(-q;q)_inf", 21).coefficient_list(21) == A000009


def test_oeis_a003114_first_rogers_ramanujan():
    assert evaluate("sum_{k>=0} q^(k^2)/(q;q)_k", 21).coefficient_list(21) == A003114


def test_oeis_a003106_second_rogers_ramanujan():
    assert evaluate("1/((q^2;q^5)_inf (q^3;q^5)_inf)", 21).coefficient_list(21) == A003106


def test_oeis_a010815_euler_function():
    assert evaluate("(q;q)_inf", 23).coefficient_list(23) == A010815
