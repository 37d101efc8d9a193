"""qseries.analysis.dissection: whole m-dissections from one evaluation, checked against
python-flint's partitions_p, against the series put back together, and against published
dissections."""

import math
from fractions import Fraction

import pytest

from qseries import evaluate
from qseries.analysis import dissect, dissection
from qseries.backend import partitions_p
from qseries.errors import ArgumentError, ArgumentTypeError, DomainError
from qseries.series import GF, Series


@pytest.mark.parametrize("m", [1, 2, 5, 7, 11])
def test_every_part_of_the_partition_function(m):
    d = dissection("1/(q;q)_inf", m, 40)
    assert d.m == m and d.residues == tuple(range(m)) and d.order == 40
    for r in range(m):
        assert d.part(r).coefficient_list(40) == [partitions_p(m * n + r) for n in range(40)]


def test_the_parts_put_back_together_give_the_series():
    """f = sum_r q^r F_r(q^m), below the order every part is known to."""
    f = evaluate("sum_{k>=0} q^(k^2)/(q;q)_k", 200)
    d = dissection(f, 6)
    total = sum((p.inflate(6).shift(r) for r, p in zip(d.residues, d.parts, strict=True)),
                Series.zero())
    assert total.equal_to(f, 200)


def test_precision_is_honest_for_each_residue():
    """From f known to O(q^N), F_r is known to O(q^ceil((N - r)/m))."""
    f = evaluate("1/(q;q)_inf", 23)
    d = dissection(f, 5)
    assert [p.precision for p in d.parts] == [-(-(23 - r) // 5) for r in range(5)]
    assert d.order == 4


def test_published_dissections():
    # Ramanujan: sum p(5n+4) q^n = 5 (q^5;q^5)^5/(q;q)^6 and
    # sum p(7n+5) q^n = 7 (q^7;q^7)^3/(q;q)^4 + 49 q (q^7;q^7)^7/(q;q)^8
    # (M. D. Hirschhorn, The Power of q, Springer 2017, chapters 3 and 5; from memory)
    d5 = dissection("1/(q;q)_inf", 5, 300)
    assert d5.part(4).equal_to(evaluate("5 (q^5;q^5)_inf^5/(q;q)_inf^6", 300), 300)
    d7 = dissection("1/(q;q)_inf", 7, 200)
    assert d7.part(5).equal_to(evaluate("7 (q^7;q^7)_inf^3/(q;q)_inf^4 + 49 q (q^7;q^7)_inf^7"
                                        "/(q;q)_inf^8", 200), 200)
    # Euler's pentagonal number theorem: an exponent e = k(3k-1)/2 has 24e + 1 = (6k-1)^2, a
    # square, and 24r + 1 is not a square mod 5 for r = 3, 4: those two parts vanish
    e = dissection("(q;q)_inf", 5, 400)
    assert e.part(3).is_zero() and e.part(4).is_zero()
    assert not any(e.part(r).is_zero() for r in range(3))


def test_fractional_exponents_use_their_class():
    # q^(-1/24)/(q;q)_inf = sum p(k) q^(k - 1/24)
    d = dissection("q^(-1/24)/(q;q)_inf", 5, 20)
    assert d.residues[0] == Fraction(23, 24)            # the class in [0, 1) by default
    assert d.part(Fraction(23, 24)).coefficient_list(20) == [partitions_p(5 * n + 1)
                                                            for n in range(20)]
    papers = dissection("q^(-1/24)/(q;q)_inf", 5, 20, start=Fraction(-1, 24))
    assert papers.residues == tuple(Fraction(-1, 24) + j for j in range(5))
    assert papers.part(Fraction(95, 24)).coefficient_list(20) == \
        [partitions_p(5 * n + 4) for n in range(20)]
    with pytest.raises(ArgumentError, match="class"):
        dissection("q^(-1/24)/(q;q)_inf", 5, 20, start=0)


def test_one_part_and_the_ring():
    assert dissect("1/(q;q)_inf", 11, 6, 30).coefficient_list(30) == \
        [partitions_p(11 * n + 6) for n in range(30)]
    assert dissect("1/(q;q)_inf", 11, 6, 300, ring=GF(11)).is_zero()


@pytest.mark.parametrize("call, kind, words", [
    (lambda: dissection("1/(q;q)_inf", 0, 10), ArgumentError, "m must be"),
    (lambda: dissection("1/(q;q)_inf", 2.5, 10), ArgumentTypeError, "m must be"),
    (lambda: dissection("1/(q;q)_inf", 5), ArgumentError, "order is needed"),
    (lambda: dissect("1/(q;q)_inf", 5, 5, 10), ArgumentError, "0 <= r < m"),
    (lambda: dissect("1/(q;q)_inf", 5, -1, 10), ArgumentError, "0 <= r < m"),
    (lambda: dissect("1/(q;q)_inf", 5, 1.5, 10), ArgumentTypeError, "r must be"),
    (lambda: dissection(5, 5, 10), ArgumentTypeError, "f must be"),
    (lambda: dissection("1/(q;q)_inf", 5, 10).part(7), ArgumentError, "not a residue"),
])
def test_bad_arguments(call, kind, words):
    with pytest.raises(kind, match=words):
        call()


def test_a_series_in_a_fractional_power():
    # one progression of exponents reads through the fractional power: the squares n^2/4
    # with n even are the integers k^2, so [q^(2n)] picks 1 + 2 sum q^(2 k^2)
    part = dissect("theta_2(q) + theta_3(q)", 2, 0, 60)
    assert part.coefficient_list(60) == [1 if n == 0 else 2 if math.isqrt(2 * n) ** 2 == 2 * n
                                         else 0 for n in range(60)]
    with pytest.raises(DomainError, match="several classes, so a dissection"):
        dissection("theta_2(q) + theta_3(q)", 2, 60)
