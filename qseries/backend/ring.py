"""The one place that chooses a coefficient ring: ZZ, QQ, GF(p), or ``laurent_ring(names)``
for extra variables (``ring_for``), and the smallest ring holding two others
(``join_rings``).  The ``Ring`` interface itself is in ``base.py``; each ring has its own
module.

>>> ring_for(("z",))
ZZ[z and inverses]
>>> join_rings(ZZ, QQ)
QQ
"""

from __future__ import annotations

from collections.abc import Iterable

from ..errors import IncompatibleRingError
from .base import Ring
from .integer import ZZ
from .laurent import LaurentRing, laurent_ring
from .modular import GF
from .rational import QQ

__all__ = ["Ring", "ZZ", "QQ", "GF", "laurent_ring", "ring_for", "join_rings"]


def ring_for(names: Iterable[str] = (), base: Ring = ZZ) -> Ring:
    """The ring for series over ``base`` (ZZ, QQ or GF(p)) in the extra variables ``names``:
    ``base`` itself when there are none, else the Laurent ring in ``names`` (in this order)
    over QQ when ``base`` is QQ, over ZZ otherwise; a prime field has no extra variables.

    >>> ring_for(), ring_for((), QQ), ring_for(("a", "z"), QQ)
    (ZZ, QQ, QQ[a, z and inverses])
    """
    names = tuple(names)
    if not names:
        return base
    if base.modulus is not None:
        raise IncompatibleRingError(f"extra variables ({', '.join(names)}) need exact "
                                    f"coefficients, not {base.name}")
    return laurent_ring(names, rational=base == QQ)


def join_rings(a: Ring, b: Ring) -> Ring:
    """The smallest ring containing both: ZZ inside QQ; a prime field only with itself;
    ZZ or QQ inside a Laurent ring (over QQ when either is).

    >>> join_rings(ZZ, QQ)
    QQ
    >>> join_rings(laurent_ring(("z",)), QQ)
    QQ[z and inverses]
    """
    if a == b:
        return a
    if {a, b} == {ZZ, QQ}:
        return QQ
    la, lb = isinstance(a, LaurentRing), isinstance(b, LaurentRing)
    if la or lb:
        names = a.names if la else b.names  # type: ignore[attr-defined]
        if (la and lb and a.names != b.names) or any(  # type: ignore[attr-defined]
                r.modulus is not None for r in (a, b)):
            raise IncompatibleRingError(f"cannot combine series over {a.name} and {b.name}")
        rational = any(r == QQ or getattr(r, "rational", False) for r in (a, b))
        return laurent_ring(names, rational)
    raise IncompatibleRingError(f"cannot combine series over {a.name} and {b.name}")
