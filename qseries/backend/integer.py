"""The ring ZZ: exact integers, on FLINT's ``fmpz_poly``.

>>> p = ZZ.poly([1, -1])                  # 1 - q
>>> ZZ.coefficients(ZZ.inv_series(p, 5))  # 1/(1 - q) to O(q^5)
[1, 1, 1, 1, 1]
"""

from __future__ import annotations

from fractions import Fraction
from typing import Any

import flint

from ..errors import IncompatibleRingError
from .base import Number, Ring, _scalar_argument
from .rational import QQ

__all__ = ["ZZ", "IntegerRing"]


class IntegerRing(Ring):
    """Dense truncated polynomials with integer coefficients (``fmpz_poly``).

    >>> IntegerRing().fractions
    QQ
    """

    name = "ZZ"
    _ptype = flint.fmpz_poly
    _poly_type = flint.fmpz_poly
    int_coefficients = True
    _inplace_constant = True

    @property
    def fractions(self) -> Ring:
        """QQ, the field of fractions.

        >>> ZZ.fractions
        QQ
        """
        return QQ

    def coerce(self, c: Number) -> Any:
        """A number as an fmpz (a Fraction must be an integer).

        >>> ZZ.coerce(Fraction(6, 3))
        2
        """
        _scalar_argument("c", c)
        if isinstance(c, flint.fmpz):
            return c
        if isinstance(c, Fraction):
            if c.denominator != 1:
                raise IncompatibleRingError(f"{c} is not an integer")
            c = c.numerator
        return flint.fmpz(int(c))

    def is_unit(self, c: Any) -> bool:
        """The units of ZZ: 1 and -1.

        >>> ZZ.is_unit(-1), ZZ.is_unit(2)
        (True, False)
        """
        return c == 1 or c == -1

    def _unit_inverse(self, c: Any) -> Any:
        return c

    def __repr__(self) -> str:
        return "ZZ"


ZZ: Ring = IntegerRing()
