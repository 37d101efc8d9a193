"""The chooser: strategy names, the order of preference, and the exponential-of-the-
logarithm threshold (below, at and above it) against the factor-by-factor reference."""

import pytest

from qseries.engine import chooser
from qseries.errors import ArgumentError
from qseries.products import pochhammer
from qseries.series import GF, QQ, ZZ, Series


def test_names_are_validated():
    with pytest.raises(ArgumentError, match="unknown evaluation strategy"):
        chooser.allowed_strategies(["stepping", "fastest"])
    with pytest.raises(ArgumentError):
        chooser.allowed_strategies("direct")
    assert chooser.allowed_strategies(None) == frozenset(chooser.STRATEGIES)
    assert chooser.allowed_strategies([]) == chooser.REFERENCES


def test_order_of_preference():
    every = frozenset(chooser.STRATEGIES)
    assert chooser.sum_strategies(every, monomials=True, steppable_only=True,
                                  lambert_shape=False, terms=100)[:2] == ["monomials",
                                                                          "splitting"]
    assert chooser.sum_strategies(every, monomials=False, steppable_only=False,
                                  lambert_shape=True, terms=100) == ["lambert", "stepping",
                                                                     "direct"]
    assert chooser.sum_strategies(chooser.REFERENCES, monomials=True, steppable_only=True,
                                  lambert_shape=True, terms=100) == ["direct"]


@pytest.mark.parametrize("ring", [ZZ, QQ, GF(2**61 - 1)])
@pytest.mark.parametrize("extra", [-1, 0, 1])
def test_exp_log_threshold(ring, extra, monkeypatch):
    # (q;q^3)_inf with EXP_FACTORS + extra factors below the order
    t = 3
    order = 1 + t * (chooser.EXP_FACTORS + extra)
    a = Series.monomial(1, ring)
    calls = []
    original = chooser.pochhammer_exp_log

    def counting(*args):
        calls.append(args)
        return original(*args)

    monkeypatch.setattr(chooser, "pochhammer_exp_log", counting)
    got = chooser.pochhammer_value(a, t, None, order, frozenset(chooser.STRATEGIES))
    assert got == pochhammer(a, t, None, order)
    assert bool(calls) == (extra >= 0)
    reference = chooser.pochhammer_value(a, t, None, order, chooser.REFERENCES)
    assert reference == got
