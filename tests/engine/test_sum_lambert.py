"""Sparse Lambert-type terms against the direct reference (rings with integer
coefficients; over QQ the strategy does not apply)."""

import pytest

from qseries.series import GF, QQ, ZZ

from .strategy_helpers import both, count_results


@pytest.mark.parametrize("text", [
    "sum_{n>=1} q^n/(1-q^n)",
    "sum_{n>=1} n q^n/(1-q^n)",
    "1 + 4 sum_{n>=1} q^n/(1+q^(2n))",
    "sum_{n>=1} (-1)^n q^(n(n+1)/2)/(1+q^n)",
    "sum_{n>=1} q^n/(1-q^n)^2",
    "sum_{n>=1} q^n (1+q^n)/(1-q^n)^3",
    "sum_{n>=1} q^n/(1-3 q^n)",
    "sum_{n>=1} q^n/(2-q^n)",
    "sum_{n>=1} q^(2n)/(q^n - 1)",
    "sum_{n>=0} q^(n^2) (1 - q^(2n+1))",
    "q^-2 sum_{n>=1} q^n/(1-q^n)",
    "sum_{n>=1} q^(n-3)/(1-q^n)",
])
def test_lambert_terms_match_the_reference(text, monkeypatch):
    for ring in (ZZ, GF(1_000_003), GF(2**61 - 1)):
        seen = count_results(monkeypatch, None, "sum_lambert")
        fast, slow = both(text, 150, "lambert", ring)     # no threshold in the order
        assert fast == slow, (text, ring)
        assert seen


def test_not_used_over_the_rationals(monkeypatch):
    seen = count_results(monkeypatch, None, "sum_lambert")
    fast, slow = both("sum_{n>=1} q^n/(1-q^n)", 60, "lambert", QQ)
    assert fast == slow and not seen
