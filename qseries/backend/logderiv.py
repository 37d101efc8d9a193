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

>>> from qseries.backend import ZZ
>>> small_log_derivative(ZZ.poly([1, -1, -1, 0, 0, 1]), 6)   # (q;q)_inf to O(q^6)
[0, -1, -3, -4, -7, -6]
"""

from __future__ import annotations

from typing import Any

import flint

from ..errors import ArgumentError, integer_argument
from .integer import ZZ

__all__ = ["LIFT_PRIMES", "theta", "small_log_derivative"]

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
    ZZ._poly_argument("p", p)
    integer_argument("n", n, 0)
    if p.length() == 0 or p[0] == 0:
        raise ArgumentError("p must have a nonzero constant term")
    return _small_log_derivative(p, n)


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
