"""The monomials strategy against the direct reference."""

import pytest

from qseries.engine import Evaluator
from qseries.lang import parse

from .strategy_helpers import RINGS, both, count_results


@pytest.mark.parametrize("text", [
    "sum_{k>=0} q^(k^2)",                                 # theta-type
    "sum_{k=-inf}^{inf} (-1)^k q^(k(3k-1)/2)",            # Euler's pentagonal series
    "sum_{k>=0} q^(k^2-30k)",                             # deep negative valuation
    "sum_{k>=0} (2k+1) (-1)^k q^(k(k+1)/2)",
    "sum_{k=0}^{300} (1/(k+1)) q^k",                      # rational coefficients, long range
])
def test_monomial_sums_match_the_reference(text, monkeypatch):
    for ring in RINGS:
        if ring.modulus is None or "1/(k+1)" not in text or ring.modulus > 1000:
            seen = count_results(monkeypatch, None, "sum_monomials")
            fast, slow = both(text, 120, "monomials", ring)
            assert fast == slow, (text, ring)
            assert seen, "the strategy was not used"


def test_fractional_exponents_are_left_to_other_strategies(monkeypatch):
    seen = count_results(monkeypatch, None, "sum_monomials")
    fast, slow = both("sum_{k>=0} q^(k^2 + k + 1/2)", 20, "monomials")
    assert fast == slow and not seen
    assert Evaluator().evaluate(parse("sum_{k>=0} q^(k^2 + 1/2)"), 3).precision == 3
