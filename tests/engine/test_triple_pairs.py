"""Jacobi's triple product pairs against the factor-by-factor reference."""

import pytest

from .strategy_helpers import RINGS, both


@pytest.mark.parametrize("text", [
    "1/((q;q^5)_inf (q^4;q^5)_inf)",
    "(q^2;q^7)_inf^3 (q^5;q^7)_inf^3 (q;q)_inf",
    "(q;q^8)_inf^-2 (q^7;q^8)_inf^-2",
    "(q,q^3;q^4)_inf",
])
def test_pairs_match_the_reference(text):
    for ring in RINGS:
        fast, slow = both(text, 200, "triple-pairs", ring)
        assert fast == slow, (text, ring)
