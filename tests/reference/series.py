"""Truncated series in q with rational exponents, in Python ints and Fractions only.

A :class:`Ref` is ``sum c_e q^e + O(q^P)``: a dict from exponent (a Fraction, any
denominator, so q^(1/24) and q^(1/3) may even be mixed) to a nonzero Fraction, and an absolute
precision P (a Fraction; ``INF`` when the value is known exactly).  Every coefficient of q^e
with e < P is known (0 when not stored); nothing at all is known at e >= P, whatever the
denominator of e.

Precision rules (the textbook ones for power series with an O-term, e.g. Knuth, TAOCP vol. 2,
sec. 4.7; ``val`` is the exponent of the first known nonzero term, P when no term is known,
infinite for an exact 0):

* a + b        known to min(Pa, Pb)
* a * b        known to min(Pa + val b, Pb + val a)
* 1 / a        with a = c q^v (1 + w), w known modulo q^(Pa - v): 1/a = c^-1 q^-v (1 + w)^-1
               is known to (Pa - v) - v = Pa - 2v
* truncation   at a working precision R: known to min(P, R) (exact only if nothing was dropped)

This file does not import qseries, so it shares no code with the library it checks.

>>> geometric = inverse(Ref({0: 1, 1: -1}), cap=4)          # 1/(1 - q) to O(q^4)
>>> geometric
Ref(1 + q + q^2 + q^3 + O(q^4))
>>> mul(monomial(-2), geometric)                            # q^-2 / (1 - q): precision 2
Ref(q^-2 + q^-1 + 1 + q + O(q^2))
>>> add(Ref({Fraction(1, 24): 1}), big_o(12)).prec         # never overstated: 12, not 12+1/24
Fraction(12, 1)
>>> inverse(Ref({3: 1, 4: -1}, prec=5), cap=100)            # 1/(q^3 - q^4 + O(q^5)): P - 2v
Ref(q^-3 + q^-2 + O(q^-1))
"""

from __future__ import annotations

import math
from fractions import Fraction

#: the precision of an exactly known value
INF = math.inf


class RefUndefined(ArithmeticError):
    """The value is undefined (division by an exact 0)."""


class RefUnknown(ArithmeticError):
    """The reference cannot decide at this working precision (e.g. no known term to invert)."""


def _frac(x: int | Fraction) -> Fraction:
    return x if isinstance(x, Fraction) else Fraction(x)


class Ref:
    """An immutable series ``sum c_e q^e + O(q^prec)``; ``prec`` is ``INF`` when exact."""

    __slots__ = ("c", "prec")

    def __init__(self, coeffs: dict | None = None, prec: int | Fraction | float = INF) -> None:
        prec = prec if prec == INF else _frac(prec)
        self.prec = prec
        self.c: dict[Fraction, Fraction] = {}
        for e, x in (coeffs or {}).items():
            e, x = _frac(e), _frac(x)
            if x and e < prec:
                self.c[e] = x

    @property
    def exact(self) -> bool:
        return self.prec == INF

    def val(self) -> Fraction | float:
        """First known nonzero exponent; P when no term is known; INF for an exact 0."""
        return min(self.c) if self.c else self.prec

    def coefficient(self, e: int | Fraction) -> Fraction:
        e = _frac(e)
        if e >= self.prec:
            raise ValueError(f"q^{e} lies beyond the precision O(q^{self.prec})")
        return self.c.get(e, Fraction(0))

    def __repr__(self) -> str:
        parts = [_term_text(e, self.c[e]) for e in sorted(self.c)]
        if not self.exact:
            parts.append(f"O(q^{_exp_text(self.prec)})")
        text = " + ".join(parts) if parts else "0"
        return f"Ref({text.replace('+ -', '- ')})"


def _exp_text(e: Fraction) -> str:
    return str(e) if e.denominator == 1 else f"({e})"


def _term_text(e: Fraction, x: Fraction) -> str:
    if e == 0:
        return str(x)
    mono = "q" if e == 1 else f"q^{_exp_text(e)}"
    if x == 1:
        return mono
    if x == -1:
        return "-" + mono
    return f"{x}*{mono}"


def monomial(e: int | Fraction, c: int | Fraction = 1) -> Ref:
    """The exact c q^e."""
    return Ref({e: c})


def big_o(e: int | Fraction) -> Ref:
    """O(q^e): nothing known at or beyond q^e."""
    return Ref({}, e)


def limit(a: Ref, p: int | Fraction | float) -> Ref:
    """a with its precision lowered to p (at most), known terms at or beyond p dropped."""
    return a if a.prec <= p else Ref(a.c, p)


def truncate(a: Ref, cap: int | Fraction | float) -> Ref:
    """a modulo q^cap; stays exact when nothing is dropped."""
    if a.prec <= cap or all(e < cap for e in a.c):
        return a
    return Ref(a.c, cap)


def add(a: Ref, b: Ref) -> Ref:
    out = dict(a.c)
    for e, x in b.c.items():
        out[e] = out.get(e, 0) + x
    return Ref(out, min(a.prec, b.prec))


def neg(a: Ref) -> Ref:
    return Ref({e: -x for e, x in a.c.items()}, a.prec)


def sub(a: Ref, b: Ref) -> Ref:
    return add(a, neg(b))


def _integral(a: Ref) -> bool:
    """Every known exponent and coefficient of a is an integer."""
    return all(e.denominator == 1 and x.denominator == 1 for e, x in a.c.items())


def mul(a: Ref, b: Ref, cap: int | Fraction | float = INF) -> Ref:
    """a * b, truncated at the working precision ``cap``."""
    va, vb = a.val(), b.val()
    if va == INF or vb == INF:          # an exact 0 times anything is exactly 0
        return Ref()
    prec = min(a.prec + vb, b.prec + va)
    keep = min(prec, cap)
    out: dict[Fraction, Fraction] = {}
    dropped = False
    if _integral(a) and _integral(b):
        # the same sums in Python ints (most factors have integer exponents and coefficients;
        # Fraction arithmetic made this loop most of the differential tests' time)
        ints: dict[int, int] = {}
        bi = sorted((int(e), int(x)) for e, x in b.c.items())
        for e1, x1 in a.c.items():
            e1, x1 = int(e1), int(x1)
            for e2, x2 in bi:
                e = e1 + e2
                if e >= keep:
                    dropped = True
                    break
                ints[e] = ints.get(e, 0) + x1 * x2
        return Ref(ints, min(prec, cap) if dropped else prec)
    bs = sorted(b.c.items())
    for e1, x1 in a.c.items():
        for e2, x2 in bs:
            e = e1 + e2
            if e >= keep:
                dropped = True
                break
            out[e] = out.get(e, 0) + x1 * x2
    return Ref(out, min(prec, cap) if dropped else prec)


def inverse(a: Ref, cap: int | Fraction | float = INF) -> Ref:
    """1/a to the working precision ``cap`` (needed unless a is an exact monomial)."""
    if not a.c:
        if a.exact:
            raise RefUndefined("division by 0")
        raise RefUnknown(f"no known term to invert in O(q^{a.prec})")
    v = min(a.c)
    c0 = a.c[v]
    w = {e - v: x / c0 for e, x in a.c.items() if e != v}      # a = c0 q^v (1 + w)
    if not w and a.exact:
        return monomial(-v, 1 / c0)
    prec = min(a.prec - 2 * v, cap)
    if prec == INF:
        raise ValueError("the inverse of a polynomial needs a finite cap")
    rel = prec + v                                               # (1 + w)^-1 modulo q^rel
    den = math.lcm(*(e.denominator for e in w)) if w else 1
    steps = math.ceil(rel * den)                                 # grid points j/den < rel
    b: dict[int, Fraction] = {0: Fraction(1)}
    wg = sorted((int(e * den), x) for e, x in w.items())         # w on the grid 1/den
    for j in range(1, steps):
        s = Fraction(0)
        for i, x in wg:
            if i > j:
                break
            y = b.get(j - i)
            if y:
                s -= x * y
        if s:
            b[j] = s
    return Ref({Fraction(j, den) - v: y / c0 for j, y in b.items()}, prec)


def power(a: Ref, m: int, cap: int | Fraction | float = INF) -> Ref:
    """a^m (m = 0 gives exactly 1)."""
    if m < 0:
        v = a.val()
        k = -m
        inv_cap = cap + (k - 1) * v if v != INF and cap != INF else cap
        return power(inverse(a, inv_cap), k, cap)
    out = Ref({0: 1})
    for _ in range(m):
        out = mul(out, a, cap)
    return out


def agree_below(a: Ref, b: Ref, bound: int | Fraction | float) -> Fraction | None:
    """First exponent below ``bound`` where a and b differ (both must be known there), or
    None."""
    if bound > a.prec or bound > b.prec:
        raise ValueError("compare only below both precisions")
    for e in sorted(set(a.c) | set(b.c)):
        if e >= bound:
            break
        if a.c.get(e, 0) != b.c.get(e, 0):
            return e
    return None
