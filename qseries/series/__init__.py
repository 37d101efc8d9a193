"""Truncated formal power series over explicit coefficient rings.

>>> from qseries.series import Series, ZZ
>>> Series.from_coefficients([1, 1], ZZ) ** 2
1 + 2q + q^2
"""

from ..backend import (
    GF,
    QQ,
    ZZ,
    LaurentPoly,
    Ring,
    is_prime,
    laurent_ring,
    laurent_text,
    ring_for,
)
from .core import MAX_LENGTH, Series
from .formatting import format_exponent, format_series, power_text

__all__ = ["Series", "Ring", "ZZ", "QQ", "GF", "LaurentPoly", "laurent_ring", "laurent_text",
           "is_prime", "ring_for", "MAX_LENGTH", "format_series",
           "format_exponent", "power_text"]
