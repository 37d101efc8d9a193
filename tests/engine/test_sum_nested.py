"""The nested (innermost-first) evaluation of long sums against the direct reference, in
every ring, across its thresholds: the number of terms (chooser.SPLIT_MIN_TERMS, shared
with binary splitting) and the degree budget beyond which splitting gives way to it."""

import pytest

from qseries.engine import Evaluator, chooser
from qseries.lang import parse
from qseries.series import ZZ

from .strategy_helpers import RINGS, both, count_results

TEXTS = [
    "sum_{n>=0} q^n/(q;q)_n",                              # Euler: 1/(q;q)_inf
    "sum_{n>=0} (-q;q)_n q^n/(q;q)_n",                     # the q-binomial theorem
    "sum_{n>=0} (-1)^n q^n (q;q^2)_n/(q^2;q^2)_n",
    "sum_{n>=0} 2^n q^(2n) / (q;q)_(2n)",
    "sum_{n>=1} q^(n-1) (q^3;q)_n/(q;q)_(n+1)",
    "sum_{n>=0} q^n/(2;q)_n",                              # a first factor 1 - 2 = -1
    "sum_{n=0}^{40} q^n/(q;q)_n",                          # a finite range
]


@pytest.mark.parametrize("text", TEXTS)
@pytest.mark.parametrize("order", [5, 120])
def test_nested_matches_the_reference_in_every_ring(text, order, monkeypatch):
    for ring in RINGS:
        seen = count_results(monkeypatch, None, "sum_nested")
        fast, slow = both(text, order, "nested", ring)
        assert fast == slow, (text, ring, order)
        assert seen or order <= 5, (text, ring)


@pytest.mark.parametrize("terms", [chooser.SPLIT_MIN_TERMS - 1, chooser.SPLIT_MIN_TERMS,
                                   chooser.SPLIT_MIN_TERMS + 1])
def test_the_number_of_terms_threshold(terms, monkeypatch):
    seen = count_results(monkeypatch, None, "sum_nested")
    text = f"sum_{{n=0}}^{{{terms - 1}}} q^n/(q;q)_n"
    fast, slow = both(text, 100, "nested")
    assert fast == slow
    assert bool(seen) == (terms >= chooser.SPLIT_MIN_TERMS)


def test_it_takes_over_where_splitting_gives_way(monkeypatch):
    # about N terms whose binomials add up to ~N^2/2 > SPLIT_DEGREE * N: splitting refuses,
    # the nested evaluation is next in the chooser's order (before stepping)
    splitting = count_results(monkeypatch, None, "sum_splitting")
    nested = count_results(monkeypatch, None, "sum_nested")
    got = Evaluator(ZZ).evaluate(parse("sum_{n>=0} q^n/(q;q)_n"), 300)
    assert not splitting and nested
    # Euler (Andrews, The Theory of Partitions, eq. (2.2.5) with z = q): 1/(q;q)_inf
    assert got == Evaluator(ZZ).evaluate(parse("1/(q;q)_inf"), 300)


def test_extra_variables_are_left_to_stepping(monkeypatch):
    from qseries.series import laurent_ring
    seen = count_results(monkeypatch, None, "sum_nested")
    R = laurent_ring(["z"])
    fast = Evaluator(R, strategies=["nested"]).evaluate(parse("sum_{n>=0} z^n q^n/(q;q)_n"), 30)
    slow = Evaluator(R, strategies=["direct"]).evaluate(parse("sum_{n>=0} z^n q^n/(q;q)_n"), 30)
    assert fast == slow and not seen
