"""The only package that imports python-flint: the coefficient rings ("backends") on which
truncated series are built.

Every ring offers the same operation names on dense polynomials (coefficient ``i`` stands
for ``q^i``; the interface is :class:`Ring`, in ``base.py``); the series layer above never
touches FLINT types directly.  Lengths are always explicit: ``mul_low(a, b, n)`` keeps the
coefficients of ``q^0 .. q^(n-1)``, and python-flint's global series precision is never
used.

* :data:`ZZ` -- exact integers (``integer.py``, ``fmpz_poly``);
* :data:`QQ` -- exact rationals (``rational.py``, ``fmpq_poly``);
* :func:`GF` -- integers modulo a prime (``modular.py``, ``nmod_poly``), for modular checks;
* :func:`laurent_ring` -- coefficients that are Laurent polynomials in extra variables
  (``laurent.py``: ``LaurentPoly``, its text, limits and the time budget);
* ``ring.py`` -- the one chooser of a ring (``ring_for``, ``join_rings``);
* ``arith.py`` -- number helpers (``partitions_p``, ``is_prime``, ``int_to_decimal``);
* ``allocator.py`` -- ``keep_heap_pad``: glibc serves large blocks from the heap and keeps a
  pad at its top (called here, once), so that FLINT's many large short-lived polynomials
  do not fault their pages in again and again.

>>> p = ZZ.poly([1, -1])                  # 1 - q
>>> ZZ.coefficients(ZZ.inv_series(p, 5))  # 1/(1 - q) to O(q^5)
[1, 1, 1, 1, 1]
>>> QQ.coefficients(QQ.inv_series(QQ.poly([2, 1]), 3))
[Fraction(1, 2), Fraction(-1, 4), Fraction(1, 8)]
"""

from .allocator import keep_heap_pad
from .arith import int_to_decimal, is_prime, partitions_p
from .base import FLINT_VERSION, MAX_SHIFT, Ring
from .integer import ZZ
from .laurent import (
    LAURENT_SECONDS,
    MAX_LAURENT_BITS,
    MAX_LAURENT_PRODUCT,
    MAX_LAURENT_TERMS,
    MAX_VARIABLES,
    LaurentPoly,
    laurent_budget,
    laurent_ring,
    laurent_text,
)
from .linalg import integer_kernel, matrix_rank
from .modular import GF
from .rational import QQ
from .ring import join_rings, ring_for

__all__ = ["ZZ", "QQ", "GF", "Ring", "LaurentPoly", "laurent_ring", "laurent_text",
           "laurent_budget", "ring_for", "join_rings", "int_to_decimal", "is_prime",
           "partitions_p", "FLINT_VERSION", "MAX_SHIFT", "MAX_LAURENT_TERMS",
           "MAX_VARIABLES", "LAURENT_SECONDS", "MAX_LAURENT_PRODUCT", "MAX_LAURENT_BITS",
           "integer_kernel", "matrix_rank", "keep_heap_pad"]

keep_heap_pad()
