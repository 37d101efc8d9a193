"""The ring QQ: exact rationals, on FLINT's ``fmpq_poly``.

>>> QQ.coefficients(QQ.inv_series(QQ.poly([2, 1]), 3))
[Fraction(1, 2), Fraction(-1, 4), Fraction(1, 8)]
"""

from __future__ import annotations

from fractions import Fraction
from typing import Any

import flint

from .base import (
    Number,
    Ring,
    _exact_quotient,
    _fraction,
    _scalar_argument,
    exp_online,
)

__all__ = ["QQ", "RationalRing"]


class RationalRing(Ring):
    """Dense truncated polynomials with rational coefficients (``fmpq_poly``).

    >>> RationalRing() == QQ      # one instance is used: QQ
    False
    """

    name = "QQ"
    _ptype = flint.fmpq_poly
    _poly_type = flint.fmpq_poly

    def coerce(self, c: Number) -> Any:
        """A number (int, Fraction, fmpz, fmpq) as an fmpq.

        >>> QQ.coerce(Fraction(3, 6))
        1/2
        """
        _scalar_argument("c", c)
        if isinstance(c, flint.fmpq):
            return c
        if isinstance(c, Fraction):
            return flint.fmpq(c.numerator, c.denominator)
        if isinstance(c, flint.fmpz):
            return flint.fmpq(c)
        return flint.fmpq(int(c))

    def to_number(self, c: Any) -> Number:
        """An fmpq as an int when it is one, else a Fraction.

        >>> QQ.to_number(QQ.coerce(4)), QQ.to_number(QQ.coerce(Fraction(1, 3)))
        (4, Fraction(1, 3))
        """
        _scalar_argument("c", c)
        f = _fraction(c)
        return f.numerator if f.denominator == 1 else f

    def convert(self, p: Any) -> Any:
        """A polynomial over ZZ or QQ as an fmpq_poly.

        >>> QQ.convert(flint.fmpz_poly([1, 2]))
        2*x + 1
        """
        _scalar_argument("p", p)
        if isinstance(p, flint.fmpz_poly):
            return flint.fmpq_poly(p)
        return super().convert(p)

    def is_unit(self, c: Any) -> bool:
        """Every nonzero rational is a unit.

        >>> QQ.is_unit(QQ.coerce(3)), QQ.is_unit(QQ.coerce(0))
        (True, False)
        """
        return c != 0

    def _unit_inverse(self, c: Any) -> Any:
        return 1 / c

    def _exp_integral(self, s: list[int], n: int) -> Any | None:
        """As :meth:`Ring.exp_integral`, with rational coefficients where they arise.

        >>> QQ.coefficients(QQ.exp_integral([0, 1], 4))      # exp(q)
        [1, 1, Fraction(1, 2), Fraction(1, 6)]
        """
        if n <= 0:
            return self.zero()
        try:
            return self.poly_from_ints(exp_online(s, n, flint.fmpz_poly, _exact_quotient))
        except ArithmeticError:
            return self._ptype(exp_online(s, n, flint.fmpq_poly,
                                          lambda a, k: flint.fmpq(a) / k))

    def __repr__(self) -> str:
        return "QQ"


QQ: Ring = RationalRing()
