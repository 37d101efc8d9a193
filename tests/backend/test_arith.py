"""qseries.backend.arith: partition numbers, primality and decimal text, each against a
computation from scratch."""

from hypothesis import given
from hypothesis import strategies as st

from qseries.backend import int_to_decimal, is_prime, partitions_p


def _partitions_by_recurrence(n: int) -> list[int]:
    # p(k) = sum over parts: the coin-change count with parts 1..n
    p = [1] + [0] * n
    for part in range(1, n + 1):
        for k in range(part, n + 1):
            p[k] += p[k - part]
    return p


def test_partitions_p_against_counting():
    assert [partitions_p(k) for k in range(301)] == _partitions_by_recurrence(300)


def test_is_prime_against_trial_division():
    def trial(n: int) -> bool:
        return n >= 2 and all(n % d for d in range(2, int(n**0.5) + 1))
    assert [n for n in range(-5, 2000) if is_prime(n)] == [n for n in range(-5, 2000)
                                                           if trial(n)]
    assert is_prime(2**61 - 1) and not is_prime((2**61 - 1) * (2**31 - 1))


@given(st.integers(-10**60, 10**60))
def test_int_to_decimal_matches_str(n):
    assert int_to_decimal(n) == str(n)


def test_int_to_decimal_beyond_pythons_digit_limit():
    # 40001 digits: above Python's default limit for str(int)
    assert int_to_decimal(10**40000 + 7) == "1" + "0" * 39999 + "7"
    assert int_to_decimal(-(10**40000)) == "-1" + "0" * 40000
