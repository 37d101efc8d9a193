"""Polynomials in one bound variable with rational coefficients, for reasoning about the
exponents and valuations of the terms of a sum or product.

A polynomial is a tuple of Fractions, lowest degree first, with no trailing zeros
(the zero polynomial is ``()``).

>>> p = padd(pmul((F(3), ), (F(0), F(1))), (F(-1),))      # 3m - 1
>>> peval(p, 4), degree(p), leading(p)
(Fraction(11, 1), 1, Fraction(3, 1))
>>> eventually_at_least(pmul(p, (F(0), F(1))), 100, start=0)   # first m with 3m^2-m >= 100
6
"""

from __future__ import annotations

from fractions import Fraction

F = Fraction
Poly = tuple[Fraction, ...]


def norm(coeffs: list[Fraction] | tuple[Fraction, ...]) -> Poly:
    c = list(coeffs)
    while c and c[-1] == 0:
        c.pop()
    return tuple(c)


def const(c: Fraction | int) -> Poly:
    return norm([Fraction(c)])


def padd(a: Poly, b: Poly) -> Poly:
    n = max(len(a), len(b))
    return norm([(a[i] if i < len(a) else 0) + (b[i] if i < len(b) else 0) for i in range(n)])


def pneg(a: Poly) -> Poly:
    return tuple(-c for c in a)


def psub(a: Poly, b: Poly) -> Poly:
    return padd(a, pneg(b))


def pmul(a: Poly, b: Poly) -> Poly:
    if not a or not b:
        return ()
    out = [Fraction(0)] * (len(a) + len(b) - 1)
    for i, x in enumerate(a):
        if x:
            for j, y in enumerate(b):
                out[i + j] += x * y
    return norm(out)


def pscale(a: Poly, c: Fraction) -> Poly:
    return norm([c * x for x in a])


def ppow(a: Poly, e: int) -> Poly:
    out: Poly = const(1)
    for _ in range(e):
        out = pmul(out, a)
    return out


def peval(a: Poly, x: int | Fraction) -> Fraction:
    acc = Fraction(0)
    for c in reversed(a):
        acc = acc * x + c
    return acc


def degree(a: Poly) -> int:
    """Degree; -1 for the zero polynomial."""
    return len(a) - 1


def leading(a: Poly) -> Fraction:
    return a[-1] if a else Fraction(0)


def derivative(a: Poly) -> Poly:
    return norm([i * a[i] for i in range(1, len(a))])


def root_bound(a: Poly) -> int:
    """An integer R with every real root of a below R (Cauchy's bound); 0 for constants."""
    if degree(a) < 1:
        return 0
    lead = abs(a[-1])
    bound = 1 + max(abs(c) / lead for c in a[:-1])
    return int(bound) + 1


def eventually_at_least(a: Poly, target: int | Fraction, start: int) -> int:
    """The least m >= start such that a(m') >= target for every integer m' >= m.

    The polynomial must tend to +infinity (degree >= 1, positive leading coefficient).
    """
    if degree(a) < 1 or leading(a) <= 0:
        raise ValueError("polynomial does not tend to +infinity")
    # beyond both bounds a is increasing and has passed every root of a - target
    m0 = max(start, root_bound(derivative(a)), root_bound(psub(a, const(target))))
    # walk back from m0 while still >= target (a is increasing on [R', oo) only, so stop at
    # the first failure: everything from there on is >= target)
    lo = max(start, root_bound(derivative(a)))
    # binary search on [lo, m0] for the first m with a(m) >= target (monotone there)
    if peval(a, lo) >= target:
        m = lo
    else:
        left, right = lo, m0   # a(left) < target <= a(right)
        while right - left > 1:
            mid = (left + right) // 2
            if peval(a, mid) >= target:
                right = mid
            else:
                left = mid
        m = right
    # below lo the polynomial may wiggle: extend downwards only while all values stay >= target
    while m > start and peval(a, m - 1) >= target:
        m -= 1
    return m
