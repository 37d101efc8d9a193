"""The rings GF(p): integers modulo a prime p < 2^64, on FLINT's ``nmod_poly`` (for the
modular method).  ``GF(p)`` returns one cached ring object per prime.

>>> R = GF(7)
>>> R.coefficients(R.inv_series(R.poly([1, 2]), 4))
[1, 5, 4, 6]
>>> GF(7) is R
True
"""

from __future__ import annotations

import functools
from fractions import Fraction
from typing import Any

import flint

from ..errors import ArgumentTypeError, DomainError, IncompatibleRingError, typed_argument
from .base import Number, Ring, _py_coeffs, _scalar_argument, _sequence_argument

__all__ = ["GF", "ModularRing"]

#: how many prime fields ``GF`` keeps (the modular method draws a few random primes a check)
GF_CACHE_SIZE = 256


class ModularRing(Ring):
    """Dense truncated polynomials modulo a prime p (``nmod_poly``); made by :func:`GF`.

    >>> ModularRing(11) == GF(11)
    True
    """

    exact = False
    int_coefficients = True
    _inplace_constant = True
    _poly_type = flint.nmod_poly

    def __init__(self, p: int) -> None:
        if p < 2 or not flint.fmpz(p).is_prime():
            raise DomainError(f"modulus {p} is not a prime")
        if p >= 2**64:
            raise DomainError(f"modulus {p} does not fit in a machine word")
        self.p = p
        self.modulus = p
        self.name = f"GF({p})"

    def _poly_argument(self, name: str, p: Any) -> None:
        """As :meth:`Ring._poly_argument`, and the modulus must be p.

        >>> GF(7).length(GF(5).poly([1]))
        Traceback (most recent call last):
        ...
        qseries.errors.ArgumentTypeError: p must be a polynomial over GF(7), not one over GF(5)
        """
        super()._poly_argument(name, p)
        if p.modulus() != self.p:
            raise ArgumentTypeError(f"{name} must be a polynomial over {self.name}, not one "
                                    f"over GF({p.modulus()})")

    def _ptype(self, coeffs: list) -> Any:  # type: ignore[override]
        return flint.nmod_poly([int(c) for c in coeffs], self.p)

    def poly(self, coeffs: list) -> Any:
        """Polynomial with the given coefficients reduced modulo p.

        >>> GF(5).coefficients(GF(5).poly([7, Fraction(1, 2)]))
        [2, 3]
        """
        _sequence_argument("coeffs", coeffs)
        return flint.nmod_poly([int(self.coerce(c)) for c in coeffs], self.p)

    def poly_from_ints(self, coeffs: list[int]) -> Any:
        """Polynomial from Python ints, reduced modulo p.

        >>> GF(5).coefficients(GF(5).poly_from_ints([6, -1]))
        [1, 4]
        """
        _sequence_argument("coeffs", coeffs)
        return flint.nmod_poly(coeffs, self.p)

    def convert(self, p: Any) -> Any:
        """A polynomial over ZZ or QQ reduced modulo p (another modulus is refused).

        >>> GF(5).coefficients(GF(5).convert(flint.fmpz_poly([6, 7])))
        [1, 2]
        """
        _scalar_argument("p", p)
        if isinstance(p, flint.nmod_poly):
            if p.modulus() != self.p:
                raise IncompatibleRingError(f"cannot mix GF({p.modulus()}) with {self.name}")
            return p
        return self.poly(_py_coeffs(p))

    def coerce(self, c: Number) -> Any:
        """A number modulo p (a denominator must be invertible).

        >>> GF(7).coerce(Fraction(1, 2))
        4
        """
        _scalar_argument("c", c)
        if isinstance(c, Fraction):
            if c.denominator % self.p == 0:
                raise DomainError(f"the denominator of {c} is not invertible modulo {self.p}")
            return flint.nmod(c.numerator, self.p) / flint.nmod(c.denominator, self.p)
        return flint.nmod(int(c), self.p)

    def is_unit(self, c: Any) -> bool:
        """Nonzero residues are units.

        >>> GF(7).is_unit(14), GF(7).is_unit(3)
        (False, True)
        """
        return int(c) % self.p != 0

    def _unit_inverse(self, c: Any) -> Any:
        return 1 / c

    def _inv_series(self, p: Any, n: int) -> Any:
        """1/p modulo q^n by FLINT's ``inverse_series_trunc``; p[0] must be nonzero
        (checked: FLINT itself only rejects the zero polynomial).

        >>> GF(7).coefficients(GF(7).inv_series(GF(7).poly([1, -1]), 3))
        [1, 1, 1]
        """
        if n <= 0:
            return self.zero()
        if p.length() == 0 or not self.is_unit(p[0]):
            raise DomainError(f"constant term is not invertible modulo {self.p}")
        return p.inverse_series_trunc(n)

    def _exp_integral(self, s: list[int], n: int) -> Any | None:
        """As :meth:`Ring.exp_integral` modulo p, by Newton's iteration; None unless p > n
        (the logarithm divides by every k < n).

        >>> GF(101).coefficients(GF(101).exp_integral([0, -1, -1, -1], 4))   # 1 - q
        [1, 100]
        >>> GF(3).exp_integral([0, -1, -1, -1], 4) is None
        True
        """
        # Newton's iteration g <- g (1 + f - log g), log g = integral(g'/g), doubling the
        # precision each step; the integral divides by k < n, so p must exceed n
        if n <= 0:
            return self.zero()
        if self.p <= n:
            return None
        p = self.p
        f = flint.nmod_poly([c % p for c in s[1:n]], p).integral()
        g = flint.nmod_poly([1], p)
        m = 1
        while m < n:
            m2 = min(2 * m, n)
            h = g.inverse_series_trunc(m2)
            log_g = g.derivative().mul_low(h, m2 - 1).integral()
            # f - log g vanishes below q^m: only the top m2 - m coefficients of g (f - log g)
            # are needed
            d = (f.truncate(m2) - log_g).right_shift(m)
            g = g + g.truncate(m2 - m).mul_low(d, m2 - m).left_shift(m)
            m = m2
        return g

    def _multiplier(self, c: Number) -> Any:
        return int(self.coerce(c))

    def zero(self) -> Any:
        """The zero polynomial modulo p.

        >>> GF(3).length(GF(3).zero())
        0
        """
        return flint.nmod_poly([], self.p)

    def _inflate(self, p: Any, d: int) -> Any:
        """p(q^d) for an integer d >= 1.

        >>> GF(3).coefficients(GF(3).inflate(GF(3).poly([1, 2]), 2))
        [1, 0, 2]
        """
        if d == 1 or p.length() <= 1:
            return p
        coeffs = [int(c) for c in p.coeffs()]
        out = [0] * ((len(coeffs) - 1) * d + 1)
        out[::d] = coeffs
        return flint.nmod_poly(out, self.p)

    def _deflate(self, p: Any, m: int, r: int) -> Any:
        """sum_n p[m n + r] q^n (see :meth:`Ring.deflate`).

        >>> GF(3).coefficients(GF(3).deflate(GF(3).poly([1, 2, 2, 1]), 2, 1))
        [2, 1]
        """
        if m == 1:
            return p
        return flint.nmod_poly([int(c) for c in p.coeffs()[r::m]], self.p)

    def __eq__(self, other: object) -> bool:
        return isinstance(other, ModularRing) and other.p == self.p

    def __hash__(self) -> int:
        return hash(("GF", self.p))

    def __repr__(self) -> str:
        return self.name


@functools.lru_cache(maxsize=GF_CACHE_SIZE, typed=True)
def _prime_field(p: int) -> ModularRing:
    return ModularRing(p)


def GF(p: int) -> Ring:
    """The ring of integers modulo the prime p (p < 2^64); one cached object per prime.

    >>> R = GF(7)
    >>> R.coefficients(R.inv_series(R.poly([1, 2]), 4))
    [1, 5, 4, 6]
    >>> GF("7")
    Traceback (most recent call last):
    ...
    qseries.errors.ArgumentTypeError: p must be an integer (a prime below 2^64), not '7' (str)
    """
    typed_argument("p", p, int, "an integer (a prime below 2^64)")
    if isinstance(p, bool):
        raise ArgumentTypeError("p must be an integer (a prime below 2^64), not a bool")
    return _prime_field(p)
