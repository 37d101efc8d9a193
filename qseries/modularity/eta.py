"""Eta quotients prod_{d} eta(d tau)^(r_d) and the published criteria for their modularity.

With f = prod_d eta(d tau)^(r_d) (eta(tau) = q^(1/24) (q;q)_inf):

- weight k = (1/2) sum r_d; the q-expansion starts at q^v, v = sum d r_d / 24;
- Newman's conditions (K. Ono, The Web of Modularity, CBMS 102, AMS 2004, Theorem 1.64,
  after Gordon-Hughes and Newman): if every d divides N, sum d r_d = 0 and
  sum (N/d) r_d = 0 (mod 24), and k is an integer, then f transforms under Gamma_0(N) with
  the character chi(d) = ((-1)^k s / d), s = prod d^(r_d);
- Ligozat's formula (Ono, Theorem 1.65): the order of f at the cusp c/d (d | N, in the local
  parameter of the cusp) is (N/24) sum_{delta | N} gcd(d, delta)^2 r_delta /
  (gcd(d, N/d) d delta);
- a weight-0 eta quotient is a modular function on Gamma_0(N) (trivial character) when, in
  addition, s is a rational square (G. Ligozat, Courbes modulaires de genre 1, 1975).

>>> f = EtaQuotient.of({1: -24, 2: 24})
>>> f.weight, f.offset, f.order_at(2, 2), f.order_at(1, 2)
(Fraction(0, 1), Fraction(1, 1), Fraction(1, 1), Fraction(-1, 1))
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from fractions import Fraction

from .gamma0 import cusps_gamma0


def _lcm(values: list[int]) -> int:
    out = 1
    for v in values:
        out = out * v // math.gcd(out, v)
    return out


def squarefree_part(x: Fraction) -> int:
    """The squarefree integer t with x = t * (a rational square), for x != 0.

    >>> [squarefree_part(Fraction(x)) for x in ("8", "-3/4", "1/2")]
    [2, -3, 2]
    """
    n = x.numerator * x.denominator          # same square class as x
    sign = -1 if n < 0 else 1
    n = abs(n)
    out, p = 1, 2
    while p * p <= n:
        e = 0
        while n % p == 0:
            n //= p
            e += 1
        if e % 2:
            out *= p
        p += 1
    return sign * out * n


@dataclass(frozen=True)
class EtaQuotient:
    """prod_d eta(d tau)^(r_d), as the sorted pairs (d, r_d) with r_d != 0 (the empty
    quotient is the constant 1)."""

    exponents: tuple[tuple[int, int], ...]

    @staticmethod
    def of(r: Mapping[int, int]) -> EtaQuotient:
        """The quotient with the exponents ``r`` (d -> r_d; zeros dropped).

        >>> EtaQuotient.of({2: 5, 1: -2, 4: -2, 3: 0}).exponents
        ((1, -2), (2, 5), (4, -2))
        """
        return EtaQuotient(tuple(sorted((int(d), int(e)) for d, e in r.items() if e)))

    @property
    def r(self) -> dict[int, int]:
        return dict(self.exponents)

    @property
    def weight(self) -> Fraction:
        """k = (1/2) sum r_d."""
        return Fraction(sum(e for _, e in self.exponents), 2)

    @property
    def offset(self) -> Fraction:
        """v = sum d r_d / 24: the expansion is q^v (1 + O(q))."""
        return Fraction(sum(d * e for d, e in self.exponents), 24)

    @property
    def least_multiple(self) -> int:
        """lcm of the d with r_d != 0 (1 for a constant)."""
        return _lcm([d for d, _ in self.exponents])

    def __mul__(self, other: EtaQuotient) -> EtaQuotient:
        r = self.r
        for d, e in other.exponents:
            r[d] = r.get(d, 0) + e
        return EtaQuotient.of(r)

    def __truediv__(self, other: EtaQuotient) -> EtaQuotient:
        return self * other ** -1

    def __pow__(self, k: int) -> EtaQuotient:
        return EtaQuotient.of({d: e * k for d, e in self.exponents})

    def s_value(self) -> Fraction:
        """s = prod d^(r_d)."""
        out = Fraction(1)
        for d, e in self.exponents:
            out *= Fraction(d) ** e
        return out

    def newman(self, n: int) -> bool:
        """Newman's congruences at level N: every d | N, sum d r_d = 0 and
        sum (N/d) r_d = 0 (mod 24).

        >>> EtaQuotient.of({1: 16, 2: -24, 4: 8}).newman(4), EtaQuotient.of({1: 1}).newman(24)
        (True, False)
        """
        if any(n % d for d, _ in self.exponents):
            return False
        return (sum(d * e for d, e in self.exponents) % 24 == 0
                and sum((n // d) * e for d, e in self.exponents) % 24 == 0)

    def character_class(self) -> int:
        """The squarefree t with chi(d) = (t / d): the class of (-1)^k s (integral weight).

        >>> [EtaQuotient.of(r).character_class() for r in ({1: 2, 11: 2}, {1: -4, 2: 10, 4: -4})]
        [1, -1]
        """
        k = self.weight
        sign = -1 if k.denominator == 1 and k.numerator % 2 else 1
        return squarefree_part(sign * self.s_value())

    def is_function_on(self, n: int) -> bool:
        """A modular function on Gamma_0(N) (weight 0, Newman, s a square).

        >>> EtaQuotient.of({1: 16, 2: -24, 4: 8}).is_function_on(4)
        True
        """
        return self.weight == 0 and self.newman(n) and squarefree_part(self.s_value()) == 1

    def order_at(self, d: int, n: int) -> Fraction:
        """Ligozat's order at the cusps c/d of Gamma_0(N) (in the local parameter).

        >>> EtaQuotient.of({1: 24}).order_at(1, 2), EtaQuotient.of({1: 24}).order_at(2, 2)
        (Fraction(2, 1), Fraction(1, 1))
        """
        g = math.gcd(d, n // d)
        total = Fraction(0)
        for delta, e in self.exponents:
            total += Fraction(math.gcd(d, delta) ** 2 * e, g * d * delta)
        return Fraction(n, 24) * total

    def orders(self, n: int) -> dict[int, Fraction]:
        """d -> order at the cusps c/d, for every d | N.

        >>> EtaQuotient.of({1: 8, 2: -4}).orders(4)
        {1: Fraction(1, 1), 2: Fraction(0, 1), 4: Fraction(0, 1)}
        """
        return {c.d: self.order_at(c.d, n) for c in cusps_gamma0(n)}

    def text(self) -> str:
        """The quotient in the notation (``eta(q^2)^5 eta(q)^-2``), "1" when constant.

        >>> EtaQuotient.of({1: -2, 2: 5, 4: -2}).text()
        'eta(q)^-2 eta(q^2)^5 eta(q^4)^-2'
        """
        parts = []
        for d, e in self.exponents:
            arg = "q" if d == 1 else f"q^{d}"
            parts.append(f"eta({arg})" + ("" if e == 1 else f"^{e}"))
        return " ".join(parts) or "1"


def least_level(quotients: list[EtaQuotient], functions: bool = False,
                multiple_of: int = 1) -> int | None:
    """The least N, a multiple of ``multiple_of`` and of every d that occurs, at which every
    quotient satisfies Newman's congruences (and, with ``functions``, is a modular function
    on Gamma_0(N)); None when there is none (sum d r_d not 0 mod 24, or s not a square).

    >>> least_level([EtaQuotient.of({1: 16, 2: -24, 4: 8}), EtaQuotient.of({1: 8, 2: -24, 4: 16})])
    4
    >>> least_level([EtaQuotient.of({1: 24})]), least_level([EtaQuotient.of({1: 1})])
    (1, None)
    """
    base = _lcm([multiple_of] + [q.least_multiple for q in quotients])
    need = 1
    for q in quotients:
        if sum(d * e for d, e in q.exponents) % 24:
            return None
        if functions and (q.weight != 0 or squarefree_part(q.s_value()) != 1):
            return None
        s = sum((base // d) * e for d, e in q.exponents)
        j = 24 // math.gcd(24, s)
        need = need * j // math.gcd(need, j)
    return base * need
