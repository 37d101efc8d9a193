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

from ..analysis import CheckResult, check
from ..lang import Node
from ..series import ZZ, Ring


def mismatch_report(r: CheckResult, radius: int = 2) -> str:
    """The verdict and a table of coefficients around the first mismatch."""
    lines = [r.verdict] + r.table(radius)
    if r.order_verified != r.order_requested:
        lines.append(f"  (only the coefficients below q^{r.order_verified} were known)")
    return "\n".join(lines)


def assert_identity(lhs: str | Node, rhs: str | Node, order: int = 100,
                    ring: Ring = ZZ, weights: dict[str, int] | None = None) -> CheckResult:
    """Assert that both sides agree to O(q^order), with the order really verified; on failure
    the message shows the first mismatch and its neighbouring coefficients.  ``weights`` is
    passed to :func:`qseries.check` (for extra variables).

    >>> _ = assert_identity("sum_{k>=0} z^k/(q;q)_k", "1/(z;q)_inf", order=20)
    """
    r = check(lhs, rhs, order=order, ring=ring, weights=weights)
    if not r.holds or r.order_verified != order:
        raise AssertionError(mismatch_report(r))
    return r


__all__ = ["assert_identity", "mismatch_report"]
