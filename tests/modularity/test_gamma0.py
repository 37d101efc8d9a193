"""Gamma_0(N): index, cusps, widths and Sturm's bound against textbook values and brute force."""

from math import gcd

import pytest

from qseries.errors import ArgumentError
from qseries.modularity.gamma0 import (
    cusp_count,
    cusps_gamma0,
    divisors,
    euler_phi,
    index_gamma0,
    sturm_bound,
)


def _projective_line_size(n: int) -> int:
    """|P^1(Z/NZ)|, which is [SL2(Z):Gamma_0(N)]: pairs (c, d) mod N generating Z/NZ,
    divided by the units (brute force, independent of the product formula)."""
    pairs = sum(1 for c in range(n) for d in range(n) if gcd(gcd(c, d), n) == 1)
    units = sum(1 for u in range(n) if gcd(u, n) == 1)
    return pairs // units


@pytest.mark.parametrize("n", range(1, 41))
def test_index_is_the_size_of_the_projective_line(n):
    assert index_gamma0(n) == _projective_line_size(n)


def test_index_textbook_values():
    # [SL2(Z):Gamma_0(N)] = 12, 390, 180 for N = 11, 389, 100 (prime N: N + 1; 100 = 4*25:
    # 100 * 3/2 * 6/5) -- the methods guide's test values, textbook facts
    assert (index_gamma0(11), index_gamma0(389), index_gamma0(100)) == (12, 390, 180)


def test_number_of_cusps_oeis_a001616():
    # OEIS A001616, the number of cusps of Gamma_0(N), N = 1..20 (from memory)
    a001616 = [1, 2, 2, 3, 2, 4, 2, 4, 4, 4, 2, 6, 2, 4, 4, 6, 2, 8, 2, 6]
    assert [cusp_count(n) for n in range(1, 21)] == a001616


@pytest.mark.parametrize("n", [1, 2, 4, 6, 8, 9, 12, 16, 18, 24, 36, 50, 72, 100, 144])
def test_widths_add_up_to_the_index(n):
    # every coset of Gamma_0(N) lies over exactly one cusp: the widths add up to the index
    assert sum(c.count * c.width for c in cusps_gamma0(n)) == index_gamma0(n)


def test_cusps_of_level_four():
    # Gamma_0(4): the cusps 0 (width 4), 1/2 (width 1), infinity (width 1) (Diamond-Shurman,
    # section 3.8, from memory)
    assert [(c.text, c.count, c.width) for c in cusps_gamma0(4)] == [
        ("0", 1, 4), ("1/2", 1, 1), ("inf", 1, 1)]
    assert cusps_gamma0(4)[-1].is_infinity


def test_sturm_bounds_textbook_values():
    # weight 2: N = 11 -> 2, N = 389 -> 65, N = 100 -> 30; weight 12, N = 1 -> 1
    # (J. Sturm, LNM 1240, 1987: k m / 12; values as in the issue and the methods guide)
    assert sturm_bound(2, 11) == 2
    assert sturm_bound(2, 389) == 65
    assert sturm_bound(2, 100) == 30
    assert sturm_bound(12, 1) == 1


def test_helpers_against_brute_force():
    for n in range(1, 60):
        assert divisors(n) == [d for d in range(1, n + 1) if n % d == 0]
        assert euler_phi(n) == sum(1 for k in range(1, n + 1) if gcd(k, n) == 1)


def test_bad_arguments():
    with pytest.raises(ArgumentError):
        index_gamma0(0)
    with pytest.raises(ArgumentError):
        cusps_gamma0(10**8)
    with pytest.raises(ArgumentError):
        sturm_bound(-2, 11)
