"""Shared by the strategy tests: evaluate with one strategy and with the direct reference,
and count how often a strategy really produced the result."""

from __future__ import annotations

from qseries.engine import Evaluator
from qseries.lang import parse
from qseries.series import GF, QQ, ZZ, Series

RINGS = (ZZ, QQ, GF(1_000_003), GF(2**61 - 1))


def both(text: str, order: int, strategy: str, ring=ZZ) -> tuple[Series, Series]:
    """(value with only ``strategy`` and the references allowed, value by the references)."""
    fast = Evaluator(ring, strategies=[strategy]).evaluate(parse(text), order)
    slow = Evaluator(ring, strategies=["direct"]).evaluate(parse(text), order)
    return fast, slow


def count_results(monkeypatch, module, name: str) -> list:
    """Replace sums.<name> by a wrapper recording each result that was not None."""
    import qseries.engine.sums as sums
    original = getattr(sums, name)
    seen: list = []

    def wrapper(*args, **kwargs):
        got = original(*args, **kwargs)
        if got is not None:
            seen.append(got)
        return got

    monkeypatch.setattr(sums, name, wrapper)
    return seen
