"""The logarithmic derivative q p'(q)/p(q) of an integer series, exactly, when its
coefficients are small: computed modulo a prime, lifted to the integers of least absolute
value, and accepted only after the exact check q p' = c p over ZZ.

For the series of an infinite product p = prod (1 - q^n)^(e_n) the coefficients of
c = q p'/p are c_k = -sum_{d | k} d e_d, a few bits where the coefficients of p and of 1/p
have hundreds: the residues cost one series inverse and one product modulo the prime, and
the check one product of c (small) by p, where the exact inverse of p over ZZ costs several
products at the full size of its coefficients.  The primes are tried in turn
(``LIFT_PRIMES``: one near 2^30 first, whose products are faster, then one near 2^62); a
lift with a coefficient of more than the prime's ``bits`` is taken as failed without the
check (the residues of a larger c look random).  The check makes the result exact whatever
the size of c: a c that does not fit fails it, and None is returned (the caller computes c
another way), never a wrong series.

A second way, exact for any size of c (no prime, no check): the series quotient
c = q p'/p modulo q^n read from one Euclidean division of polynomials over ZZ,
rev(q p') x^(n-1) // rev(p) (``log_derivative_by_division``; rev reverses n coefficients:
from q p' = c p + q^n R follows rev_(2n-2)(q p') = rev_(n-1)(c) rev_(n-1)(p) + rev_(n-2)(R),
and the leading coefficient of rev_(n-1)(p) is p(0) = +-1, so the quotient is integral).
FLINT divides by divide and conquer on products of quotient blocks, without the inverse of
p: faster than the residues up to order about 20 000 on the Rogers-Ramanujan parts, slower
beyond (at 10^5, 0.62 s against 0.39 s), and faster than the exact inverse where c is
large (1/(q;q)_inf + q^2 at order 20 000: 1.6 s against 3.7 s).

>>> from qseries.backend import ZZ
>>> small_log_derivative(ZZ.poly([1, -1, -1, 0, 0, 1]), 6)   # (q;q)_inf to O(q^6)
[0, -1, -3, -4, -7, -6]
>>> log_derivative_by_division(ZZ.poly([1, -1, -1, 0, 0, 1]), 6)
[0, -1, -3, -4, -7, -6]
"""

from __future__ import annotations

from typing import Any

import flint

from ..errors import ArgumentError, integer_argument
from .integer import ZZ

__all__ = ["LIFT_PRIMES", "theta", "small_log_derivative", "log_derivative_by_division"]

#: (prime, bits): the primes modulo which the log derivative is computed, in turn (the
#: largest below 2^30 and below 2^62), and the most bits a lifted coefficient may have
#: (fewer than the prime's: the residues of a larger c look random, so the exact check is
#: skipped as certain to fail).  With 26 bits, |c_k| = |sum_{d|k} d e_d| < 2^26 holds for
#: every |e_d| <= 8 up to order 10^6 (sigma(k) < 2^23 there); the smaller prime's products
#: are faster (at order 10^5, 0.11 s against 0.19 s for the residues of c)
LIFT_PRIMES = ((2**30 - 35, 26), (2**62 - 57, 56))

_CONTEXTS = [flint.fmpz_mod_poly_ctx(p) for p, _ in LIFT_PRIMES]


def theta(p: Any) -> Any:
    """q p'(q), the Euler operator, for a polynomial over ZZ.

    >>> from qseries.backend import ZZ
    >>> ZZ.coefficients(theta(ZZ.poly([1, 2, 3])))
    [0, 2, 6]
    """
    ZZ._poly_argument("p", p)
    return _theta(p)


def _theta(p: Any) -> Any:
    if p.length() <= 1:
        return p.truncate(0)
    return p.derivative().left_shift(1)


def small_log_derivative(p: Any, n: int) -> list[int] | None:
    """c_0, ..., c_(n-1) (c_0 = 0) with q p' = c p + O(q^n) for a polynomial p over ZZ with
    p[0] != 0, as Python ints, when c has integer coefficients of at most ``LIFT_BITS``
    bits; None otherwise (c too large or not integral: compute it another way).  Exact:
    the lift is returned only after q p' = c p has been checked over ZZ.

    >>> from qseries.backend import ZZ
    >>> small_log_derivative(ZZ.poly([1, -2]), 4)              # q (1-2q)'/(1-2q)
    [0, -2, -4, -8]
    >>> small_log_derivative(ZZ.poly([1, -2**40]), 4) is None  # -2^120 q^3: too large
    True
    >>> small_log_derivative(ZZ.poly([2, 1]), 3) is None      # -q^2/4: not integral
    True
    """
    _check_arguments(p, n)
    return _small_log_derivative(p, n)


def _check_arguments(p: Any, n: int) -> None:
    """Refuse what the two ways cannot take: p not over ZZ, n not a length, p(0) = 0."""
    ZZ._poly_argument("p", p)
    integer_argument("n", n, 0)
    if p.length() == 0 or p[0] == 0:
        raise ArgumentError("p must have a nonzero constant term")


def _small_log_derivative(p: Any, n: int) -> list[int] | None:
    if n == 0:
        return []
    p = p.truncate(n)
    tp = None
    for (prime, bits), ctx in zip(LIFT_PRIMES, _CONTEXTS, strict=True):
        if p[0] % prime == 0:
            continue
        pm = ctx(p)
        cm = _theta_mod(pm).mul_low(pm.inverse_series_trunc(n), n)
        half = prime // 2
        lifted = [c if c <= half else c - prime for c in map(int, cm.coeffs())]
        c = flint.fmpz_poly(lifted)
        if c.length() and c.height_bits() > bits:
            continue
        if tp is None:
            tp = _theta(p)
        if c.mul_low(p, n) == tp:
            return lifted + [0] * (n - len(lifted))
    return None


def _theta_mod(p: Any) -> Any:
    if p.length() <= 1:
        return p - p
    return p.derivative().left_shift(1)


def log_derivative_by_division(p: Any, n: int) -> list[int] | None:
    """c_0, ..., c_(n-1) (c_0 = 0) with q p' = c p + O(q^n) for a polynomial p over ZZ whose
    constant term p(0) divides every coefficient (p / p(0) has constant term 1), exactly,
    by one Euclidean division of the reversed polynomials; None when p(0) does not divide
    them (c need not be integral then).

    >>> from qseries.backend import ZZ
    >>> log_derivative_by_division(ZZ.poly([3, -3]), 4)          # q (1-q)'/(1-q)
    [0, -1, -1, -1]
    >>> log_derivative_by_division(ZZ.poly([1, -2**40]), 4)[3]  # no limit on the size
    -1329227995784915872903807060280344576
    >>> log_derivative_by_division(ZZ.poly([2, 1]), 3) is None
    True
    """
    _check_arguments(p, n)
    return _log_derivative_by_division(p, n)


def _log_derivative_by_division(p: Any, n: int) -> list[int] | None:
    if n <= 1:
        return [0] * n
    p = p.truncate(n)
    c0 = p[0]
    if c0 != 1 and c0 != -1:
        if any(c % c0 for c in p.coeffs()):
            return None
        p = flint.fmpz_poly([c // c0 for c in p.coeffs()])
    top = _reversed(_theta(p), n).left_shift(n - 1)        # rev_(2n-2)(q p')
    quotient = top // _reversed(p, n)                      # rev_(n-1)(c)
    c = [int(x) for x in quotient.coeffs()]
    c += [0] * (n - len(c))
    c.reverse()
    return c


def _reversed(p: Any, n: int) -> Any:
    """x^(n-1) p(1/x) for p of length at most n."""
    c = p.coeffs()
    c += [0] * (n - len(c))
    c.reverse()
    return flint.fmpz_poly(c)
