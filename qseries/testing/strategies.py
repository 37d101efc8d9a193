"""Hypothesis strategies for property-based tests of identities (needs ``hypothesis``).

* :func:`family_members` draws members of a parametrised catalogue family;
* :func:`catalogue_entries` draws entries of identity files;  an entry carries the
  functions its file defines (``entry.definitions``), to be passed on to
  :func:`qseries.check` or :func:`qseries.testing.assert_identity` with its sides;
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
from ..errors import ArgumentError, ArgumentTypeError, integer_argument, typed_argument


def _paths(paths: object) -> list[Path]:
    if paths is None:
        return [SHIPPED]
    if not isinstance(paths, (list, tuple)) or not all(isinstance(p, (str, Path))
                                                       for p in paths):
        raise ArgumentTypeError("paths must be a list of identity files or folders (str or "
                                "Path)")
    return [Path(p) for p in paths]


def catalogue_entries(paths: list[Path] | None = None) -> st.SearchStrategy[Entry]:
    """Entries (family members included) of the given identity files or folders; check one
    with ``assert_identity(e.left, e.right, order, weights=e.weight_map,
    definitions=e.definitions)``.

    >>> from hypothesis import given, settings
    >>> from qseries.testing import assert_identity
    >>> @settings(max_examples=3, deadline=None)
    ... @given(catalogue_entries())
    ... def test_low_order(e):
    ...     if e.expect == "holds":
    ...         assert_identity(e.left, e.right, 10, weights=e.weight_map,
    ...                         definitions=e.definitions)
    >>> test_low_order()
    """
    entries = load_entries(_paths(paths))
    return st.sampled_from(entries)


def family_members(key: str, paths: list[Path] | None = None) -> st.SearchStrategy[Entry]:
    """Members of the parametrised family ``key`` (e.g. ``"andrews-gordon"``).

    >>> from hypothesis import find
    >>> find(family_members("andrews-gordon"), lambda e: True).label[:16]
    'andrews-gordon k'
    """
    typed_argument("key", key, str, "the key of a catalogue family")
    members = [e for e in load_entries(_paths(paths)) if e.key == key]
    if not members:
        raise ArgumentError(f"no family {key!r} in the catalogue")
    return st.sampled_from(members)


def q_products(max_factors: int = 4, max_modulus: int = 8) -> st.SearchStrategy[str]:
    """Text of a product of powers of (q^a;q^m)_inf with 1 <= a <= m, with at most
    ``max_factors`` factors and moduli m up to ``max_modulus``."""
    integer_argument("max_factors", max_factors, 1)
    integer_argument("max_modulus", max_modulus, 1)
    return _q_products(max_factors, max_modulus)


@st.composite
def _q_products(draw: st.DrawFn, max_factors: int, max_modulus: int) -> str:
    n = draw(st.integers(1, max_factors))
    parts = []
    for _ in range(n):
        m = draw(st.integers(1, max_modulus))
        a = draw(st.integers(1, m))
        e = draw(st.integers(-3, 3).filter(lambda x: x != 0))
        parts.append(f"(q^{a};q^{m})_inf^{e}" if e > 0 else f"(q^{a};q^{m})_inf^({e})")
    return " ".join(parts)


__all__ = ["catalogue_entries", "family_members", "q_products"]
