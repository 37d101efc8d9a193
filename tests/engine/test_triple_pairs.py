"""Jacobi's triple product pairs against the factor-by-factor reference."""

import pytest

from qseries.engine import triple_pairs

from .strategy_helpers import RINGS, both

TEXTS = [
    "1/((q;q^5)_inf (q^4;q^5)_inf)",
    "(q^2;q^7)_inf^3 (q^5;q^7)_inf^3 (q;q)_inf",
    "(q;q^8)_inf^-2 (q^7;q^8)_inf^-2",
    "2 (q,q^3;q^4)_inf",
    "(q,q^3;q^4)_inf",          # a lone symbol with a pair (was a missed fast path)
    "(q, q^4;q^5)_inf^-1",      # as `qseries product` prints it
]


def _counting(monkeypatch) -> list:
    """Record every sparse sum the strategy computes (the pairs' values)."""
    calls: list = []
    real = triple_pairs.theta_pair_parts

    def counting(*args):
        calls.append(args)
        return real(*args)

    monkeypatch.setattr(triple_pairs, "theta_pair_parts", counting)
    return calls


@pytest.mark.parametrize("text", [t if isinstance(t, str) else t.values[0] for t in TEXTS])
def test_pairs_match_the_reference(text):
    for ring in RINGS:
        fast, slow = both(text, 200, "triple-pairs", ring)
        assert fast == slow, (text, ring)


@pytest.mark.parametrize("text", TEXTS)
def test_the_pairs_are_computed_by_the_strategy(text, monkeypatch):
    # else the comparison above would compare the reference with itself
    calls = _counting(monkeypatch)
    both(text, 200, "triple-pairs")
    assert calls, "the strategy was not used"


def test_other_powers_of_a_lone_pair_still_take_the_general_path():
    """Regression: routing (a, b;q^m)_inf^p to the product must not loop on a power that is
    not an integer or that depends on a sum's index."""
    from qseries import evaluate
    from qseries.errors import QSeriesError

    with pytest.raises(QSeriesError, match="integer powers"):
        evaluate("(q,q^4;q^5)_inf^(1/2)", 8)
    by_index = evaluate("sum_{k=0}^{2} (q,q^4;q^5)_inf^(-k)", 40)
    g = evaluate("1/((q;q^5)_inf (q^4;q^5)_inf)", 40)          # Rogers-Ramanujan's G
    assert by_index == (1 + g + g * g).truncate(40)
