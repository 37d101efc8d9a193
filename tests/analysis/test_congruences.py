"""qseries.analysis.congruences: divisibility of a progression of coefficients and the
search for congruences, checked against named results and brute force."""

from fractions import Fraction
from itertools import product

import pytest

from qseries import evaluate
from qseries.analysis import divisible, find_congruences
from qseries.backend import partitions_p
from qseries.errors import ArgumentError, ArgumentTypeError, DomainError, ParseError


def _found(search):
    return [(c.m, c.r, c.modulus) for c in search.congruences]


def test_ramanujans_three_congruences_and_nothing_else():
    """p(5n+4) = 0 mod 5, p(7n+5) = 0 mod 7, p(11n+6) = 0 mod 11 (Ramanujan 1919, 1921;
    G. E. Andrews, The Theory of Partitions, Chapter 10; from memory).  For m <= 30 and the
    primes up to 13 nothing else holds: every other class has a coefficient below q^2000 that
    the prime does not divide, and the multiples such as (10, 4, 5) are implied."""
    s = find_congruences("1/(q;q)_inf", 2000)
    assert _found(s) == [(5, 4, 5), (7, 5, 7), (11, 6, 11)]
    assert s.order == 2000 and s.max_m == 30 and s.moduli == (2, 3, 5, 7, 11, 13)
    assert [c.checked for c in s.congruences] == [400, 285, 182]     # n with 5n+4 < 2000, ...


def test_ramanujans_congruences_at_order_100000():
    """Modulo each prime directly: order 10^5 in about a second."""
    s = find_congruences("1/(q;q)_inf", 100_000)
    assert _found(s) == [(5, 4, 5), (7, 5, 7), (11, 6, 11)]


def test_a_prime_power_modulus():
    """p(25n+24) = 0 mod 25 (Ramanujan; Andrews, loc. cit.; from memory): found from the
    exact series, and (25, 24, 5) is not listed since (5, 4, 5) implies it."""
    s = find_congruences("1/(q;q)_inf", 3000, moduli=[5, 25])
    assert _found(s) == [(5, 4, 5), (25, 24, 25)]


def test_two_colour_partitions():
    """p_2(n), the coefficients of 1/(q;q)_inf^2, counted here by brute force as
    sum_k p(k) p(n-k) (pairs of partitions).  1/(q;q)^2 = (q;q)^3/(q;q)^5 is congruent mod 5
    to (q;q)^3/(q^5;q^5), and by Jacobi's identity (q;q)^3 = sum_k (-1)^k (2k+1) q^(k(k+1)/2)
    the exponents are 0, 1, 3 mod 5, with 2k+1 = 0 mod 5 exactly where k(k+1)/2 = 3 mod 5:
    so p_2(5n+2), p_2(5n+3), p_2(5n+4) = 0 mod 5.  And 1/(q;q)^2 = 1/(q^2;q^2) mod 2, so
    p_2(2n+1) is even.  (Derived here; the mod 5 congruences are classical.)"""
    counts = [sum(partitions_p(k) * partitions_p(n - k) for k in range(n + 1))
              for n in range(300)]
    assert evaluate("1/(q;q)_inf^2", 300).coefficient_list(300) == counts
    s = find_congruences("1/(q;q)_inf^2", 3000)
    assert _found(s) == [(2, 1, 2), (5, 2, 5), (5, 3, 5), (5, 4, 5)]


def _overpartitions_by_enumeration(n_max: int) -> list[int]:
    """Overpartitions of n: a partition with each distinct part overlined or not, so
    sum over partitions of 2^(number of distinct parts)."""
    out = []
    for n in range(n_max):
        total = 0
        stack = [(n, n, 0)]          # (remaining, largest part allowed, distinct parts)
        while stack:
            rest, top, distinct = stack.pop()
            if rest == 0:
                total += 2 ** distinct
                continue
            for part in range(1, min(rest, top) + 1):
                for copies in range(1, rest // part + 1):
                    stack.append((rest - part * copies, part - 1, distinct + 1))
        out.append(total)
    return out


def test_overpartitions_modulo_4():
    """Overpartitions p̄(n): generating function (-q;q)_inf/(q;q)_inf (S. Corteel and
    J. Lovejoy, Overpartitions, Trans. Amer. Math. Soc. 356 (2004); from memory), checked
    here against enumeration.  By Gauss it is 1/phi(-q) with phi(-q) = 1 + 2x,
    x = sum_{k>=1} (-1)^k q^(k^2); modulo 4, 1/(1 + 2x) = 1 - 2x, so p̄(n) = 0 mod 4 unless n
    is a square (derived here).  So the classes r mod m holding no square are exactly the
    congruences modulo 4, the minimal ones listed."""
    assert evaluate("(-q;q)_inf/(q;q)_inf", 25).coefficient_list(25) == \
        _overpartitions_by_enumeration(25)
    assert divisible("(-q;q)_inf/(q;q)_inf", 4, 2000, m=3, r=2).holds
    squares = {m: {k * k % m for k in range(m)} for m in range(1, 9)}
    holds = {(m, r) for m in range(1, 9) for r in range(m) if r not in squares[m]}
    minimal = sorted((m, r, 4) for m, r in holds
                     if not any((d, r % d) in holds for d in range(1, m) if m % d == 0))
    s = find_congruences("(-q;q)_inf/(q;q)_inf", 2000, max_m=8, moduli=[4])
    assert _found(s) == minimal
    assert (8, 5, 4) in minimal and (3, 2, 4) in minimal


def test_overpartitions_are_even_from_n_1_on_in_one_line():
    """p̄(n) is even for n >= 1 (each overpartition of n >= 1 pairs off with the one whose
    first occurrence of its largest part is overlined or not; Corteel and Lovejoy, from
    memory; here also 1/phi(-q) = 1 mod 2, derived above).  The search listed 132 classes
    a(mn + r) = 0 (mod 2), r >= 1, each implied by that one statement; it is now the one
    congruence a(n + 1) = 0 (mod 2), and none of those it implies is listed."""
    overpartitions = _overpartitions_by_enumeration(25)
    assert all(c % 2 == 0 for c in overpartitions[1:]) and overpartitions[0] == 1
    s = find_congruences("(-q;q)_inf/(q;q)_inf", 3000)
    mod2 = [c for c in _found(s) if c[2] == 2]
    assert mod2 == [(1, 1, 2)]
    tail = next(c for c in s.congruences if (c.m, c.r, c.modulus) == (1, 1, 2))
    assert tail.checked == 2999
    # theta_3(q) = 1 + 2 sum_{n>=1} q^(n^2) (DLMF 20.2.3): the same, modulo 2 only
    t = find_congruences("theta_3(q)", 1000, moduli=[2, 3])
    assert [c for c in _found(t) if c[2] == 2] == [(1, 1, 2)]
    assert (3, 2, 3) in _found(t)            # a square is never 2 mod 3: a class of zeros


def test_a_tail_implies_only_the_classes_that_start_inside_it():
    """1 + q^2 + 2q/(1 - q) = 1 + 2q + 3q^2 + 2q^3 + 2q^4 + ...: odd only at q^0 and q^2, so
    a(n + 3) = 0 (mod 2); a(2n + 1), a(3n + 1) and a(5n + 1) start at q^1, before the tail,
    and are not implied by it; a(5n + 3) and a(5n + 4) are."""
    s = find_congruences("1 + q^2 + 2q/(1-q)", 400, max_m=5, moduli=[2])
    found = _found(s)
    assert {(1, 3, 2), (2, 1, 2), (3, 1, 2), (5, 1, 2)} <= set(found)
    assert (5, 3, 2) not in found and (5, 4, 2) not in found
    # a tail resting on few coefficients is not one: odd up to q^389
    late = find_congruences("1/(1-q) - q^390/(1-q)", 400, max_m=2, moduli=[2])
    assert all(c.m != 1 for c in late.congruences)


def test_divisible_reports_the_first_counterexample():
    d = divisible("1/(q;q)_inf", 7, 50, m=5, r=4)
    assert not d.holds and not d
    c = d.counterexample
    assert (c.n, c.exponent, c.residue) == (0, 4, 5)
    # exactly, by a composite modulus: the coefficient itself is reported
    d = divisible("1/(q;q)_inf", 25, 200, m=5, r=4)
    c = d.counterexample
    assert c is not None and c.value == partitions_p(c.exponent)
    assert all(partitions_p(5 * n + 4) % 25 == 0 for n in range(c.n))
    assert partitions_p(5 * c.n + 4) % 25 == c.residue != 0


def test_divisible_on_a_dissection_and_honest_order():
    d = divisible("[q^(5n+4)] 1/(q;q)_inf", 5, 20_000)
    assert d.holds and d.order == 20_000 and d.checked == 20_000
    # a series known only to O(q^30): tested below q^30, and the order says so
    d = divisible("5/(q;q)_inf + O(q^30)", 5, 100)
    assert d.holds and d.order == 30 and d.checked == 30
    # fractional exponents: the residue in their class
    d = divisible("q^(-1/24)/(q;q)_inf", 5, 100, m=5, r=Fraction(95, 24))
    assert d.holds and d.r == Fraction(95, 24)
    # negative exponents take part
    d = divisible("q^-3 + 2q^-1 + 2/(1-q)", 2, 10)
    assert d.counterexample.exponent == -3


def test_rational_coefficients_and_denominators():
    # 5/2 = 0 mod 5 (2 is a unit), worked in GF(5) and exactly alike
    assert divisible("5/(2(1-q))", 5, 10).holds
    assert not divisible("5/(2(1-q))", 25, 10).holds
    with pytest.raises(DomainError, match="denominator"):
        divisible("1/(4(1-q))", 2, 10)


@pytest.mark.parametrize("call, kind, words", [
    (lambda: divisible("1/(q;q)_inf", 1, 10), ArgumentError, "modulus"),
    (lambda: divisible("1/(q;q)_inf", 5, 10, m=0), ArgumentError, "m must be"),
    (lambda: divisible("1/(q;q)_inf", 5, 10, m=5, r=5), ArgumentError, "0 <= r < m"),
    (lambda: divisible("1/(q;q)_inf", 5, 10, m=5, r=-1), ArgumentError, "0 <= r < m"),
    (lambda: divisible("1/(q;q)_inf", 5, 10, m=5, r=0.5), ArgumentTypeError, "r must be"),
    (lambda: divisible("1/(q;q)_inf", 5, 0), ArgumentError, "order"),
    (lambda: divisible("1/(z q;q)_inf", 5, 10), DomainError, "extra variable"),
    (lambda: divisible("1/(q;q", 5, 10), ParseError, "column"),
    (lambda: find_congruences("1/(q;q)_inf", 10, moduli=[1]), ArgumentError, "modulus"),
    (lambda: find_congruences("1/(q;q)_inf", 10, moduli=[]), ArgumentError, "at least one"),
    (lambda: find_congruences("1/(q;q)_inf", 10, moduli="5"), ArgumentTypeError, "list"),
    (lambda: find_congruences("1/(q;q)_inf", 10, max_m=0), ArgumentError, "max_m"),
    (lambda: find_congruences("eta(q)", 10), DomainError, "integer powers"),
])
def test_bad_arguments(call, kind, words):
    with pytest.raises(kind, match=words):
        call()


def test_implied_congruences_are_omitted():
    """Every class the search drops follows from one it lists, and no listed one follows
    from another listed one."""
    s = find_congruences("1/(q^2;q^2)_inf^3", 1500, max_m=12, moduli=[2, 3, 4])
    listed = _found(s)

    def implies(a, b):
        return a != b and b[0] % a[0] == 0 and b[1] % a[0] == a[1] and a[2] % b[2] == 0

    for a, b in product(listed, listed):
        assert not implies(a, b)
    # the odd part vanishes: divisible by 4 implies divisible by 2
    assert (2, 1, 3) in listed and (2, 1, 4) in listed
    assert (2, 1, 2) not in listed and (4, 1, 3) not in listed


def test_a_series_in_a_fractional_power_is_refused():
    with pytest.raises(DomainError, match="several classes, so a congruence search"):
        find_congruences("theta_2(q) + theta_3(q)", 50)
    with pytest.raises(DomainError, match="several classes, so a divisibility test"):
        divisible("theta_2(q) + theta_3(q)", 3, 50)
