"""Helpers for users' own test suites: an assertion with a readable failure message, and
(in :mod:`qseries.testing.strategies`) hypothesis strategies.

>>> _ = assert_identity("(-q;q)_inf", "1/(q;q^2)_inf", order=100)
>>> assert_identity("1/(1-q)", "1 + q + q^2", order=5)
Traceback (most recent call last):
...
AssertionError: the two sides differ: first at q^3, where the left side has 1 and the right side 0
  exponent  left  right  difference
         1     1      1           0
         2     1      1           0
         3     1      0           1
         4     1      0           1
"""

from __future__ import annotations

from collections.abc import Iterable

from ..analysis import CheckResult, check
from ..lang import Node
from ..report import mismatch_report
from ..series import ZZ, Ring


def assert_identity(lhs: str | Node, rhs: str | Node, order: int = 100,
                    ring: Ring = ZZ, weights: dict[str, int] | None = None,
                    definitions: Iterable[str] | None = None) -> CheckResult:
    """Assert that both sides agree to O(q^order), with the order really verified; on failure
    the message shows the first mismatch and its neighbouring coefficients.  An inconclusive
    check (no coefficient compared) fails too.  ``weights`` (for extra variables) and
    ``definitions`` (functions defined in the notation, such as a catalogue entry's
    ``entry.definitions``) are passed to :func:`qseries.check`.

    >>> _ = assert_identity("sum_{k>=0} z^k/(q;q)_k", "1/(z;q)_inf", order=20)
    >>> _ = assert_identity("G(q)", "sum_{k>=0} q^(k^2)/(q;q)_k", order=50,
    ...                     definitions=["G(q) = 1/((q;q^5)_inf (q^4;q^5)_inf)"])
    >>> assert_identity("O(q^-1)", "1")
    Traceback (most recent call last):
    ...
    AssertionError: the check is inconclusive, not a pass: no coefficient could be compared, ...
    """
    r = check(lhs, rhs, order=order, ring=ring, weights=weights,
              definitions=None if definitions is None else tuple(definitions))
    if r.holds is None:
        raise AssertionError(f"the check is inconclusive, not a pass: {r.reason}")
    if not r.holds or r.order_verified != order:
        raise AssertionError(mismatch_report(r))
    return r


__all__ = ["assert_identity", "mismatch_report"]
