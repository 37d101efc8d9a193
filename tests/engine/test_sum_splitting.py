"""Binary splitting against the direct reference, across its thresholds: the number of terms
(chooser.SPLIT_MIN_TERMS) and the degree budget (chooser.SPLIT_DEGREE times the order)."""

import pytest

from qseries.engine import chooser

from .strategy_helpers import RINGS, both, count_results

TEXTS = ["sum_{k>=0} q^(k^2)/(q;q)_k^2",
         "sum_{k>=0} (-1)^k q^(k(k+1)/2) (q;q^2)_k/(q;q)_(2k+1)",
         "sum_{k>=0} 3^k q^(k^2) (-q;q^2)_k/((q^2;q^2)_k (q;q)_k)",
         "sum_{k>=0} q^(k^2+k) (q^3;q)_k (2;q)_k / (q;q)_(2k+1)"]


@pytest.mark.parametrize("text", TEXTS)
def test_splitting_matches_the_reference_in_every_ring(text, monkeypatch):
    for ring in RINGS:
        seen = count_results(monkeypatch, None, "sum_splitting")
        fast, slow = both(text, 300, "splitting", ring)
        assert fast == slow, (text, ring)
        assert seen


@pytest.mark.parametrize("terms", [chooser.SPLIT_MIN_TERMS - 1, chooser.SPLIT_MIN_TERMS,
                                   chooser.SPLIT_MIN_TERMS + 1])
def test_the_number_of_terms_threshold(terms, monkeypatch):
    seen = count_results(monkeypatch, None, "sum_splitting")
    text = f"sum_{{k=0}}^{{{terms - 1}}} q^(k^2)/(q;q)_k"
    fast, slow = both(text, 100, "splitting")
    assert fast == slow
    assert bool(seen) == (terms >= chooser.SPLIT_MIN_TERMS)


def test_beyond_the_degree_budget_the_next_strategy_takes_over(monkeypatch):
    # sum q^n/(q;q)_n has about N terms whose binomials add up to ~N^2/2 > SPLIT_DEGREE * N
    seen = count_results(monkeypatch, None, "sum_splitting")
    fast, slow = both("sum_{n>=0} q^n/(q;q)_n", 200, "splitting")
    assert fast == slow and not seen
    # with a few terms the budget holds
    fast, slow = both("sum_{n=0}^{9} q^n/(q;q)_n", 200, "splitting")
    assert fast == slow and seen
