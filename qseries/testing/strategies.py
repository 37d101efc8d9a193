"""Hypothesis strategies for property-based tests of identities (needs ``hypothesis``).

* :func:`family_members` draws members of a parametrised catalogue family;
* :func:`catalogue_entries` draws entries of identity files;
* :func:`q_products` draws random finite products of q-Pochhammer symbols, as text.

>>> from hypothesis import given, settings
>>> @settings(max_examples=5)
... @given(q_products())
... def test_product_is_a_unit(text):
...     from qseries import evaluate
...     assert evaluate(text, 20).coefficient(0) == 1
>>> test_product_is_a_unit()
"""

from __future__ import annotations

from pathlib import Path

try:
    from hypothesis import strategies as st
except ImportError as err:  # pragma: no cover - depends on the environment
    raise ImportError("qseries.testing.strategies needs hypothesis: "
                      "pip install 'qseries[test]'") from err

from ..catalogue import SHIPPED, Entry, load_entries


def catalogue_entries(paths: list[Path] | None = None) -> st.SearchStrategy[Entry]:
    """Entries (family members included) of the given identity files or folders."""
    entries = load_entries(paths or [SHIPPED])
    return st.sampled_from(entries)


def family_members(key: str, paths: list[Path] | None = None) -> st.SearchStrategy[Entry]:
    """Members of the parametrised family ``key`` (e.g. ``"andrews-gordon"``)."""
    members = [e for e in load_entries(paths or [SHIPPED]) if e.key == key]
    if not members:
        raise ValueError(f"no family {key!r} in the catalogue")
    return st.sampled_from(members)


@st.composite
def q_products(draw: st.DrawFn, max_factors: int = 4, max_modulus: int = 8) -> str:
    """Text of a product of powers of (q^a;q^m)_inf with 1 <= a <= m."""
    n = draw(st.integers(1, max_factors))
    parts = []
    for _ in range(n):
        m = draw(st.integers(1, max_modulus))
        a = draw(st.integers(1, m))
        e = draw(st.integers(-3, 3).filter(lambda x: x != 0))
        parts.append(f"(q^{a};q^{m})_inf^{e}" if e > 0 else f"(q^{a};q^{m})_inf^({e})")
    return " ".join(parts)


__all__ = ["catalogue_entries", "family_members", "q_products"]
