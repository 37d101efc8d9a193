"""A slow pure-Python reference for truncated series arithmetic, used by the tests to check
the FLINT-backed :class:`~qseries.series.Series` on random inputs.

A reference series is a pair (coeffs, prec): coeffs[i] is the coefficient of q^(start+i)
with the start passed separately; arithmetic is schoolbook.

>>> ref_mul([1, 1], [1, -1], 4)
[Fraction(1, 1), Fraction(0, 1), Fraction(-1, 1), Fraction(0, 1)]
>>> ref_inverse([1, -1], 4)
[Fraction(1, 1), Fraction(1, 1), Fraction(1, 1), Fraction(1, 1)]
"""

from __future__ import annotations

from fractions import Fraction


def ref_mul(a: list, b: list, n: int) -> list[Fraction]:
    """The first n coefficients of a*b (schoolbook)."""
    out = [Fraction(0)] * n
    for i, x in enumerate(a[:n]):
        if x:
            for j, y in enumerate(b[: n - i]):
                out[i + j] += x * y
    return out


def ref_inverse(a: list, n: int) -> list[Fraction]:
    """The first n coefficients of 1/a for a[0] != 0, by the recurrence
    a0 b_m = -sum_{i=1}^{m} a_i b_(m-i)."""
    if not a or a[0] == 0:
        raise ZeroDivisionError("constant term is zero")
    a0 = Fraction(a[0])
    b = [Fraction(0)] * n
    for m in range(n):
        s = Fraction(1) if m == 0 else Fraction(0)
        for i in range(1, min(m, len(a) - 1) + 1):
            s -= a[i] * b[m - i]
        b[m] = s / a0
    return b


def ref_pow(a: list, e: int, n: int) -> list[Fraction]:
    """The first n coefficients of a^e for e >= 0."""
    out = [Fraction(1)] + [Fraction(0)] * (n - 1) if n else []
    for _ in range(e):
        out = ref_mul(out, a, n)
    return out
