"""qseries.backend.ring: the one chooser of a ring (``ring_for``) and ``join_rings``."""

import pytest

from qseries.backend import GF, QQ, ZZ, join_rings, laurent_ring, ring_for
from qseries.errors import IncompatibleRingError

R = laurent_ring(("a", "z"))


def test_ring_for_without_extra_variables_is_the_base():
    assert ring_for() is ZZ
    assert ring_for((), QQ) is QQ
    assert ring_for((), GF(7)) == GF(7)


def test_ring_for_extra_variables_is_one_laurent_ring():
    assert ring_for(("a", "z")) is R
    assert ring_for(["a", "z"], QQ) is laurent_ring(("a", "z"), rational=True)
    # the order of the names is the caller's (the evaluator sorts them)
    assert ring_for(("z", "a")).names == ("z", "a")
    with pytest.raises(IncompatibleRingError, match="exact"):
        ring_for(("z",), GF(7))


def test_joining_rings():
    assert join_rings(R, ZZ) == R
    assert join_rings(R, QQ) == laurent_ring(("a", "z"), rational=True)
    with pytest.raises(Exception, match="cannot combine"):
        join_rings(R, laurent_ring(("z",)))


def test_joining_integer_rational_and_prime_rings():
    assert join_rings(ZZ, QQ) is QQ and join_rings(QQ, ZZ) is QQ
    assert join_rings(GF(7), GF(7)) == GF(7)
    for a, b in ((GF(7), GF(11)), (GF(7), ZZ), (QQ, GF(5)), (R, GF(7))):
        with pytest.raises(IncompatibleRingError, match="cannot combine"):
            join_rings(a, b)
