"""The congruence subgroup Gamma_0(N): its index in SL2(Z), its cusps with their widths, and
Sturm's bound.

Formulas (textbook facts; F. Diamond and J. Shurman, A First Course in Modular Forms,
Springer 2005, sections 3.8-3.9; K. Ono, The Web of Modularity, CBMS 102, AMS 2004, §1.2):

- index m(N) = [SL2(Z) : Gamma_0(N)] = N prod_{p | N} (1 + 1/p);
- for each divisor d of N there are phi(gcd(d, N/d)) cusps c/d (c prime to d, taken modulo
  gcd(d, N/d)), each of width N / gcd(d^2, N); the widths of all cusps add up to the index;
  the cusp 1/N is infinity (width 1), the cusp 1/1 is 0;
- Sturm: a form f in M_k(Gamma_0(N), chi) whose coefficients vanish up to q^(k m / 12) is 0
  (J. Sturm, On the congruence of modular forms, LNM 1240, Springer 1987), so comparing the
  coefficients of q^0 .. q^B with B = floor(k m / 12) decides an identity between two such
  forms.

>>> index_gamma0(11), sturm_bound(2, 11), [c.text for c in cusps_gamma0(4)]
(12, 2, ['0', '1/2', 'inf'])
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction

from ..errors import ArgumentError, integer_argument

#: the largest level handled (the cusps are listed one divisor at a time)
MAX_LEVEL = 10**7


def _level(n: object) -> int:
    integer_argument("N", n, 1)
    assert isinstance(n, int)
    if n > MAX_LEVEL:
        raise ArgumentError(f"the level N = {n} is above the limit {MAX_LEVEL}")
    return n


def divisors(n: int) -> list[int]:
    """The positive divisors of n, in increasing order.

    >>> divisors(12)
    [1, 2, 3, 4, 6, 12]
    """
    n = _level(n)
    small, large = [], []
    i = 1
    while i * i <= n:
        if n % i == 0:
            small.append(i)
            if i * i != n:
                large.append(n // i)
        i += 1
    return small + large[::-1]


def prime_factors(n: int) -> list[int]:
    """The distinct primes dividing n.

    >>> prime_factors(360)
    [2, 3, 5]
    """
    n = _level(n)
    out, p = [], 2
    while p * p <= n:
        if n % p == 0:
            out.append(p)
            while n % p == 0:
                n //= p
        p += 1
    if n > 1:
        out.append(n)
    return out


def euler_phi(n: int) -> int:
    """Euler's totient.

    >>> [euler_phi(n) for n in range(1, 11)]
    [1, 1, 2, 2, 4, 2, 6, 4, 6, 4]
    """
    out = _level(n)
    for p in prime_factors(n):
        out = out // p * (p - 1)
    return out


def index_gamma0(n: int) -> int:
    """[SL2(Z) : Gamma_0(N)] = N prod_{p | N} (1 + 1/p).

    >>> index_gamma0(1), index_gamma0(389), index_gamma0(100)
    (1, 390, 180)
    """
    out = _level(n)
    for p in prime_factors(n):
        out = out // p * (p + 1)
    return out


@dataclass(frozen=True)
class CuspClass:
    """The cusps c/d of Gamma_0(N) with one denominator d | N: ``count`` = phi(gcd(d, N/d))
    of them, each of ``width`` N / gcd(d^2, N).  Every eta quotient has the same order at
    all cusps of the class (Ligozat's formula depends on d alone)."""

    d: int
    count: int
    width: int
    level: int

    @property
    def text(self) -> str:
        """A representative: "inf" for d = N, "0" for d = 1, else "1/d"."""
        if self.d == self.level:
            return "inf"
        return "0" if self.d == 1 else f"1/{self.d}"

    @property
    def is_infinity(self) -> bool:
        return self.d == self.level


def cusps_gamma0(n: int) -> list[CuspClass]:
    """The cusps of Gamma_0(N), grouped by denominator d | N (increasing; infinity last).

    >>> [(c.d, c.count, c.width) for c in cusps_gamma0(8)]
    [(1, 1, 8), (2, 1, 2), (4, 1, 1), (8, 1, 1)]
    """
    n = _level(n)
    return [CuspClass(d, euler_phi(math.gcd(d, n // d)), n // math.gcd(d * d, n), n)
            for d in divisors(n)]


def cusp_count(n: int) -> int:
    """The number of cusps of Gamma_0(N): sum_{d | N} phi(gcd(d, N/d)).

    >>> [cusp_count(n) for n in (1, 2, 4, 9, 16, 36)]
    [1, 2, 3, 4, 6, 12]
    """
    return sum(c.count for c in cusps_gamma0(n))


def sturm_bound(k: int | Fraction, n: int) -> int:
    """B = floor(k m / 12), m the index of Gamma_0(N): two forms of weight k on Gamma_0(N)
    (with the same character) are equal when their coefficients of q^0 .. q^B agree.

    >>> sturm_bound(2, 11), sturm_bound(2, 389), sturm_bound(2, 100), sturm_bound(12, 1)
    (2, 65, 30, 1)
    """
    k = Fraction(k)
    if k < 0:
        raise ArgumentError(f"the weight k must be >= 0, not {k}")
    return math.floor(k * index_gamma0(n) / 12)
