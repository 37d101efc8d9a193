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

import math
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


def integer_values(a: Poly, xs: list[int]) -> list[int] | None:
    """a(x) for each x of ``xs`` by Horner's rule on Python integers when the coefficients
    of ``a`` are integers (the fast path of term exponents and subscripts), else None.

    >>> integer_values((Fraction(1), Fraction(0), Fraction(2)), [0, 1, 3])   # 1 + 2x^2
    [1, 3, 19]
    """
    if not all(c.denominator == 1 for c in a):
        return None
    coeffs = [int(c) for c in reversed(a)]
    out = []
    for x in xs:
        acc = 0
        for c in coeffs:
            acc = acc * x + c
        out.append(acc)
    return out


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


def prem(a: Poly, b: Poly) -> Poly:
    """The remainder of a divided by b (b not zero).

    >>> prem((F(1), F(0), F(1)), (F(1), F(1)))       # x^2 + 1 = (x + 1)(x - 1) + 2
    (Fraction(2, 1),)
    """
    r = list(a)
    db, lb = degree(b), leading(b)
    while len(r) - 1 >= db and r:
        c = r[-1] / lb
        shift = len(r) - 1 - db
        for i, y in enumerate(b):
            r[shift + i] -= c * y
        r = list(norm(r))
    return norm(r)


def sturm_chain(a: Poly) -> list[Poly]:
    """Sturm's sequence a, a', -rem(a, a'), ...: the number of distinct real roots in (x, y]
    is the fall in sign changes from x to y when x is not a root."""
    chain = [a, derivative(a)]
    while chain[-1]:
        chain.append(pneg(prem(chain[-2], chain[-1])))
    return chain[:-1]


def _sign_changes(chain: list[Poly], x: Fraction) -> int:
    signs = [v for v in (peval(p, x) for p in chain) if v]
    return sum(1 for u, v in zip(signs, signs[1:], strict=False) if (u < 0) != (v < 0))


def _roots_between(a: Poly, chain: list[Poly], lo: int, hi: int) -> int:
    """Distinct real roots of a in (lo - d, hi + d) for some 0 < d < 1 (no root at either end)."""
    ends = []
    for base, sign in ((lo, -1), (hi, 1)):
        for den in range(2, degree(a) + 3):     # one of these is not a root
            x = base + sign * Fraction(1, den)
            if peval(a, x):
                ends.append(x)
                break
    return _sign_changes(chain, ends[0]) - _sign_changes(chain, ends[1])


def eventually_at_least(a: Poly, target: int | Fraction, start: int) -> int:
    """The least m >= start such that a(m') >= target for every integer m' >= m.

    The polynomial must tend to +infinity (degree >= 1, positive leading coefficient).  The
    integers where a < target are found by bisection on Sturm counts of the real roots of
    a - target (O(degree * log R) steps for Cauchy's bound R, never a walk over integers).

    >>> eventually_at_least((F(0), F(2)**64, F(1)), 1, 0)       # m^2 + 2^64 m >= 1
    1
    >>> eventually_at_least((F(10**12 + 1), F(-2 * 10**6), F(1)), 1, 0)  # (m - 10^6)^2 + 1
    0
    """
    if degree(a) < 1 or leading(a) <= 0:
        raise ValueError("polynomial does not tend to +infinity")
    b = psub(a, const(target))
    if degree(b) <= 2:
        return _low_degree_at_least(b, start)
    return _bisect_at_least(b, start)


def _bisect_at_least(b: Poly, start: int) -> int:
    """The least m >= start with b(m') >= 0 for every integer m' >= m, by bisection on Sturm
    counts (any degree; the reference of ``_low_degree_at_least``).

    >>> _bisect_at_least((F(-10), F(0), F(1)), 0)
    4
    """
    chain = sturm_chain(b)

    def last_below(lo: int, hi: int) -> int | None:
        """The largest integer m in [lo, hi] with b(m) < 0, else None."""
        if lo > hi:
            return None
        if lo == hi or _roots_between(b, chain, lo, hi) == 0:
            # one point, or no root near [lo, hi]: b has one sign there
            return hi if peval(b, hi) < 0 else None
        mid = (lo + hi) // 2
        got = last_below(mid + 1, hi)
        return got if got is not None else last_below(lo, mid)

    # beyond every real root of b it is positive
    last = last_below(start, max(start, root_bound(b)))
    return start if last is None else last + 1


def _low_degree_at_least(b: Poly, start: int) -> int:
    """``eventually_at_least`` for b = a - target of degree 1 or 2 with a positive leading
    coefficient, from the largest root r of b: the integers where b < 0 lie in an interval
    ending at r, so the answer is one more than the largest integer below r where b < 0
    (found among the integers next to an approximation of r, each tested exactly), or
    ``start``.  The exponents of most sums (n^2, n(n+1)/2, a n + c) take this path.

    >>> _low_degree_at_least((F(-10), F(0), F(1)), 0)    # m^2 >= 10 from m = 4 on
    4
    >>> _low_degree_at_least((F(-7, 2), F(2)), 0)        # 2m >= 7/2 from m = 2 on
    2
    >>> _low_degree_at_least((F(1), F(-3), F(1)), 0)     # m^2 - 3m + 1 < 0 at m = 1, 2 only
    3
    """
    if degree(b) == 1:
        r = -b[0] / b[1]
        guess = r.numerator // r.denominator
    else:
        c0, c1, c2 = b
        disc = c1 * c1 - 4 * c2 * c0
        if disc < 0:
            return start                  # b > 0 everywhere
        # sqrt(disc) to within 1/den by integer square roots: disc = u/v
        den = 1 << 8
        root = Fraction(math.isqrt(disc.numerator * disc.denominator * den * den),
                        disc.denominator * den)
        r = (-c1 + root) / (2 * c2)
        guess = r.numerator // r.denominator
    # the largest integer below the larger root lies within 2 of the guess (the square root
    # is low by less than 1/den, and 1/(2 c2) of that is less than 1 unless c2 is tiny:
    # widen the window by the error bound)
    spread = 2 if degree(b) == 1 else 2 + int(1 / (2 * abs(b[2]) * 256))
    below = [m for m in range(guess - spread, guess + spread + 1) if peval(b, m) < 0]
    if not below:
        return start
    return max(start, max(below) + 1)


# -- polynomials in several variables ------------------------------------------------------
# An MPoly maps a monomial (a sorted tuple of (name, exponent) pairs) to its coefficient.
# Used for valuation bounds of nested sums, where every variable ranges over integers >= 0.

Monomial = tuple[tuple[str, int], ...]
MPoly = dict[Monomial, Fraction]


def m_const(c: Fraction | int) -> MPoly:
    """The constant polynomial c.

    >>> m_const(3)
    {(): Fraction(3, 1)}
    """
    return {(): Fraction(c)} if c else {}


def m_var(name: str, coeff: Fraction | int = 1) -> MPoly:
    return {((name, 1),): Fraction(coeff)} if coeff else {}


def _clean(p: MPoly) -> MPoly:
    return {k: v for k, v in p.items() if v}


def m_add(a: MPoly, b: MPoly) -> MPoly:
    out = dict(a)
    for k, v in b.items():
        out[k] = out.get(k, Fraction(0)) + v
    return _clean(out)


def m_scale(a: MPoly, c: Fraction | int) -> MPoly:
    return _clean({k: v * c for k, v in a.items()})


def m_sub(a: MPoly, b: MPoly) -> MPoly:
    return m_add(a, m_scale(b, -1))


def _mono_mul(x: Monomial, y: Monomial) -> Monomial:
    d: dict[str, int] = dict(x)
    for name, e in y:
        d[name] = d.get(name, 0) + e
    return tuple(sorted(d.items()))


def m_mul(a: MPoly, b: MPoly) -> MPoly:
    out: MPoly = {}
    for ka, va in a.items():
        for kb, vb in b.items():
            k = _mono_mul(ka, kb)
            out[k] = out.get(k, Fraction(0)) + va * vb
    return _clean(out)


def m_pow(a: MPoly, e: int) -> MPoly:
    out = m_const(1)
    for _ in range(e):
        out = m_mul(out, a)
    return out


def m_vars(a: MPoly) -> set[str]:
    return {name for k in a for name, _ in k}


def m_coeffs_in(a: MPoly, name: str) -> dict[int, MPoly]:
    """a as a polynomial in ``name``: power -> coefficient polynomial.

    >>> m_coeffs_in(m_add(m_mul(m_var("j"), m_var("k")), m_var("k")), "j")
    {1: {(('k', 1),): Fraction(1, 1)}, 0: {(('k', 1),): Fraction(1, 1)}}
    """
    out: dict[int, MPoly] = {}
    for k, v in a.items():
        d = dict(k)
        e = d.pop(name, 0)
        rest = tuple(sorted(d.items()))
        out.setdefault(e, {})[rest] = v
    return out


def m_subst(a: MPoly, name: str, value: MPoly) -> MPoly:
    """Substitute the polynomial ``value`` for the variable ``name``."""
    out: MPoly = {}
    for e, c in m_coeffs_in(a, name).items():
        out = m_add(out, m_mul(c, m_pow(value, e)))
    return out


def m_nonnegative(a: MPoly) -> bool:
    """True when every coefficient is >= 0: then a >= 0 wherever all variables are >= 0."""
    return all(v >= 0 for v in a.values())


def m_min(a: MPoly, b: MPoly) -> MPoly:
    """Coefficient-wise minimum: a lower bound for min(a, b) where all variables are >= 0."""
    return _clean({k: min(a.get(k, Fraction(0)), b.get(k, Fraction(0))) for k in {*a, *b}})


def m_to_uni(a: MPoly, name: str) -> Poly | None:
    """a as a univariate polynomial in ``name`` (None if other variables occur)."""
    if m_vars(a) - {name}:
        return None
    coeffs = m_coeffs_in(a, name)
    top = max(coeffs, default=-1)
    return norm([coeffs.get(i, {}).get((), Fraction(0)) for i in range(top + 1)])


def m_from_uni(p: Poly, name: str) -> MPoly:
    out: MPoly = {}
    for i, c in enumerate(p):
        if c:
            out[((name, i),) if i else ()] = c
    return out
