"""A short way to write a product with periodic exponents: as few q-Pochhammer factors as a
greedy search finds, instead of one residue list modulo the period.

A periodic exponent sequence e_n (period M) is a sum of patterns, one per factor:

* ``(q^a;q^m)_inf^k`` (m | M, 1 <= a <= m) adds k to e_n for every n = a (mod m); with
  a = m it is ``(q^m;q^m)_inf^k``;
* ``(-q^a;q^m)_inf^k`` = ``(q^(2a);q^(2m))_inf^k / (q^a;q^m)_inf^k`` (2m | M) adds -k on
  n = a (mod m) and k on n = 2a (mod 2m).

The search peels off, one at a time, the pattern that leaves the fewest nonzero exponents in
one period (ties: the plain factor, then the smaller modulus), until nothing is left; the
result is checked to add up to e exactly, and factors with the same modulus, sign and power
are written as one symbol ``(q^a, q^b;q^m)_inf^k``.  Greedy is not always optimal: the
result is a presentation, proved equal by construction, not a proof of minimality.

>>> e = [(n % 2 == 1) + (n % 5 == 1) + (n % 7 == 1) for n in range(1, 71)]
>>> simplest_factors(70, e)
'(q;q^2)_inf (q;q^5)_inf (q;q^7)_inf'
"""

from __future__ import annotations

from collections import Counter
from dataclasses import dataclass

from ..series.formatting import format_exponent

#: longest period searched (the work grows with the period times the sum of its divisors)
MAX_PERIOD = 2000
#: most factors the search peels off before giving up
MAX_FACTORS = 12


@dataclass(frozen=True)
class Factor:
    """(s q^a; q^m)_inf^k with s = 1 or -1 (``minus``)."""

    a: int
    m: int
    k: int
    minus: bool = False

    def pattern(self, period: int) -> list[int]:
        """Its contribution to e_1 .. e_period."""
        out = [0] * period
        for n in range(1, period + 1):
            if (n - self.a) % self.m == 0:
                out[n - 1] += -self.k if self.minus else self.k
            if self.minus and (n - 2 * self.a) % (2 * self.m) == 0:
                out[n - 1] += self.k
        return out


def _divisors(n: int) -> list[int]:
    return [d for d in range(1, n + 1) if n % d == 0]


def _left_after(residual: list[int], now: int, f: Factor, period: int) -> int:
    """How many of e_1 .. e_period stay nonzero once f's pattern is taken from
    ``residual`` (``now`` of them nonzero before), reading only the residue classes f
    touches: O(period/m), where building the pattern costs O(period) (the search tries
    every class of every divisor m: O(period sigma(period)) a step that way, 0.8 s for the
    period 1680; O(period d(period)) this way; issue 19).

    >>> _left_after([1, 0, 1, 0, 1, 0], 3, Factor(1, 2, 1), 6)
    0
    """
    delta: dict[int, int] = {}
    for i in range(f.a - 1, period, f.m):
        delta[i] = -f.k if f.minus else f.k
    if f.minus:
        for i in range(2 * f.a - 1, period, 2 * f.m):
            delta[i] = delta.get(i, 0) + f.k
    left = now
    for i, d in delta.items():
        left += (residual[i] != d) - (residual[i] != 0)
    return left


def _search(period: int, ex: list[int]) -> list[Factor] | None:
    residual = list(ex)
    chosen: list[Factor] = []
    divisors = _divisors(period)
    while any(residual):
        if len(chosen) >= MAX_FACTORS:
            return None
        now = sum(1 for x in residual if x)
        best: tuple[int, int, int, Factor] | None = None
        for m in divisors:
            for a in range(1, m + 1):
                cls = residual[a - 1::m]
                values = Counter(x for x in cls if x)
                for k, _ in values.most_common(2):
                    for minus in (False, True):
                        if minus and (period % (2 * m) or 2 * a > 2 * m):
                            continue
                        f = Factor(a, m, -k if minus else k, minus)
                        left = _left_after(residual, now, f, period)
                        if left >= now:
                            continue
                        key = (left, int(minus), m, f)
                        if best is None or key[:3] < best[:3]:
                            best = key
        if best is None:
            return None
        f = best[3]
        chosen.append(f)
        residual = [x - y for x, y in zip(residual, f.pattern(period), strict=True)]
    return chosen


def _power(k: int) -> str:
    return "" if k == 1 else f"^{k}"


def factor_text(factors: list[Factor]) -> str:
    """The factors, those with the same modulus, sign and power in one symbol.

    >>> factor_text([Factor(1, 5, -1), Factor(4, 5, -1), Factor(1, 2, 1, minus=True)])
    '(-q;q^2)_inf (q, q^4;q^5)_inf^-1'
    """
    groups: dict[tuple[int, bool, int], list[int]] = {}
    for f in factors:
        groups.setdefault((f.m, f.minus, f.k), []).append(f.a)
    parts = []
    for (m, minus, k), rs in sorted(groups.items(), key=lambda t: (t[0][2] < 0, t[0][0],
                                                                  t[0][1])):
        sign = "-" if minus else ""
        params = ", ".join(sign + format_exponent(r) for r in sorted(rs))
        parts.append(f"({params};{format_exponent(m)})_inf{_power(k)}")
    return " ".join(parts)


def symbol_count(text: str) -> int:
    """The number of factors (s q^a;q^m)_inf in a printed product: one per parameter of
    each q-Pochhammer symbol.

    >>> symbol_count("(q, q^4;q^5)_inf^-1 (q;q^2)_inf")
    3
    """
    return sum(head.count(",") + 1 for head in
               (part.split(";")[0] for part in text.split("_inf")[:-1]))


def simplest_factors(period: int, ex: list[int]) -> str | None:
    """The product prod (1 - q^n)^(e_n), e periodic with ``period`` (``ex`` = e_1 ..
    e_period), as few factors (q^a;q^m)_inf^k and (-q^a;q^m)_inf^k as the greedy search
    finds (see the module), or None when it finds no way (or the period is too long).

    >>> simplest_factors(2, [-1, 0])
    '(q;q^2)_inf^-1'
    >>> simplest_factors(4, [-1, 0, -1, 1])
    '(q^4;q^4)_inf (q;q^2)_inf^-1'
    """
    if period > MAX_PERIOD or len(ex) != period:
        return None
    factors = _search(period, ex)
    if factors is None:
        return None
    total = [0] * period
    for f in factors:
        total = [x + y for x, y in zip(total, f.pattern(period), strict=True)]
    assert total == list(ex), (factors, ex)      # the presentation is exact by construction
    return factor_text(factors) if factors else "1"
