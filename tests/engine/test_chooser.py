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


# -- auto's cost model (issue 19, item 5): exact against modular -------------------------

def _choice(bits, primes, order=10_000, cores=2):
    exact, modular = chooser.auto_costs(bits, primes, order, cores)
    return "exact" if exact <= modular else "modular"


def test_auto_costs_small_coefficients_stay_exact_for_any_number_of_primes():
    # coefficients within a machine word (Lambert series, theta products) cost less exactly
    # than one evaluation per prime, even with a single prime
    for primes in (1, 2, 3, 20):
        assert _choice(chooser.WORD_BITS, primes) == "exact"
        assert _choice(1, primes, order=10**6) == "exact"


@pytest.mark.parametrize("primes", [1, 2, 3, 5, 20])
def test_auto_costs_crossover_follows_the_number_of_primes(primes):
    # exact costs AUTO_WORD_COST per 64 bits beyond a word, modular one unit per prime: the
    # crossover is at primes * 64 / AUTO_WORD_COST bits (not below a word)
    cross = max(primes * 64 / chooser.AUTO_WORD_COST, chooser.WORD_BITS)
    assert _choice(cross, primes) == "exact"
    assert _choice(cross + 1, primes) == "modular"


def test_auto_costs_more_primes_allow_larger_exact_numbers():
    bits = 300                      # partition numbers near order 7000
    assert [_choice(bits, k) for k in (3, 5, 6, 10)] == ["modular", "modular", "exact",
                                                         "exact"]


@pytest.mark.parametrize("shift", [-1, 0])
@pytest.mark.parametrize("cores", [1, 2, 4])
def test_auto_costs_parallel_primes_from_the_parallel_order(shift, cores):
    order = chooser.PARALLEL_ORDER + shift
    _, modular = chooser.auto_costs(500, 3, order, cores)
    parallel = shift >= 0 and cores > 1
    assert modular == (3 / min(3, cores) if parallel else 3.0)
