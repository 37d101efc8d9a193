"""An estimate of the time and memory an evaluation will take, made before it is run.

Some inputs are cheap at order 10^4 and out of reach at 10^7 (the coefficients of
1/(q;q)_inf grow to thousands of digits, a bivariate series holds order^2 terms).  Instead of
starting such a run and leaving the user waiting, the command line estimates it first: the
expression is evaluated at small probe orders, doubled until one probe takes
``PROBE_SECONDS`` (or a quarter of the order is reached; when the first probe is already
that slow, a probe at a quarter of its order is added), and the time and the size of the
result are extrapolated to the order asked with the growth exponent the last two probes show
(kept between 1 and 2.5 for time, 1 and 2 for size).  This is an estimate, not a bound; it is
meant to tell "seconds" from "hours", and it says how it was obtained.

>>> estimate_cost("1/(q;q)_inf", 1000) is None          # below COST_CHECK_ORDER: no probe
True
>>> est = estimate_cost("1/(q;q)_inf", 10**7)
>>> est.order, est.probe_order < 10**7, est.seconds > 60
(10000000, True, True)
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from ..errors import QSeriesError
from ..lang import Node, parse
from ..series import Ring, Series
from .chooser import COST_CHECK_ORDER, PROBE_FIRST_ORDER, PROBE_SECONDS
from .evaluator import evaluate

__all__ = ["CostEstimate", "estimate_cost"]


@dataclass(frozen=True)
class CostEstimate:
    """The extrapolated cost of evaluating an expression at ``order``: ``seconds`` of
    computation and ``bytes`` of memory for the result, from probes up to ``probe_order``
    (the last one took ``probe_seconds``).

    >>> e = CostEstimate(10**6, 7200.0, 3 * 10**9, 16384, 0.12)
    >>> e.exceeds(600, 10**10), e.exceeds(10**5, 10**9)
    (True, True)
    >>> e.text()
    'about 2.0 hours and 3.0 GB (extrapolated from order 16384, computed in 0.12 s)'
    """

    order: int
    seconds: float
    bytes: int
    probe_order: int
    probe_seconds: float

    def exceeds(self, seconds: float, size: int) -> bool:
        """True when the estimate is above ``seconds`` of time or ``size`` bytes."""
        return self.seconds > seconds or self.bytes > size

    def text(self) -> str:
        """The estimate in words, with the probe it rests on."""
        return (f"about {_duration(self.seconds)} and {_size(self.bytes)} (extrapolated "
                f"from order {self.probe_order}, computed in {self.probe_seconds:.2g} s)")


def _duration(s: float) -> str:
    for unit, length in (("days", 86400.0), ("hours", 3600.0), ("minutes", 60.0)):
        if s >= 2 * length:
            return f"{s / length:.1f} {unit}"
    return f"{s:.0f} s"


def _size(b: float) -> str:
    for unit, length in (("TB", 1e12), ("GB", 1e9), ("MB", 1e6)):
        if b >= length:
            return f"{b / length:.1f} {unit}"
    return f"{b / 1e3:.0f} kB"


def footprint(s: Series) -> int:
    """Approximate bytes held by the coefficients of ``s``: the length times the size of
    the largest coefficient (64 bits at least: a machine word per coefficient), or 16 bytes
    per term for coefficients in extra variables.

    >>> footprint(Series.from_coefficients([1, 2, 3], prec=3))
    24
    """
    R = s.ring
    n = R._length(s.poly)
    if getattr(R, "names", ()):
        return 16 * sum(len(c.terms()) if hasattr(c, "terms") else 1
                        for c in R._coefficients(s.poly))
    return n * max(R._coefficient_bits(s.poly), 64) // 8


def _growth(small: float, large: float, ratio: float, lo: float, hi: float) -> float:
    """The exponent k with large = small * ratio^k, kept within [lo, hi]."""
    if small <= 0 or large <= 0:
        return hi
    return min(max(math.log(large / small) / math.log(ratio), lo), hi)


def estimate_cost(expr: str | Node, order: int, ring: Ring | None = None,
                  weights: dict[str, int] | None = None,
                  then: Callable[[Series], Any] | None = None) -> CostEstimate | None:
    """Estimate the cost of ``evaluate(expr, order, ring, weights)`` by probes at small
    orders; None below ``COST_CHECK_ORDER`` (where every input is cheap enough) or when a
    probe fails (the real run then reports the error).  ``then``, when given, is the work
    done on the series afterwards (a product form, say); each probe times it too.  See the
    module docstring.

    >>> estimate_cost("(q;q)_inf", 5 * 10**4).order
    50000
    """
    if order < COST_CHECK_ORDER:
        return None
    node = parse(expr) if isinstance(expr, str) else expr

    def probe(n: int) -> tuple[int, float, int]:
        t0 = time.perf_counter()
        s = evaluate(node, n, ring, weights)
        if then is not None:
            try:
                then(s)
            except QSeriesError:        # the work is done (and timed) before it refuses
                pass
        return n, time.perf_counter() - t0, footprint(s)

    probes: list[tuple[int, float, int]] = []
    n = PROBE_FIRST_ORDER
    try:
        while n <= order // 4:
            probes.append(probe(n))
            if probes[-1][1] >= PROBE_SECONDS:
                break
            n *= 2
        if len(probes) == 1:               # the first probe was already slow: a smaller one
            probes.insert(0, probe(n // 4))
    except QSeriesError:
        # a probe refused (a limit reached at a probe order): the run itself would fail the
        # same way, unless earlier probes succeeded, whose trend then stands
        if len(probes) < 2:
            return None
    if len(probes) < 2:
        return None
    (n1, t1, b1), (n2, t2, b2) = probes[-2:]
    k_time = _growth(t1, t2, n2 / n1, 1.0, 2.5)
    k_size = _growth(b1, b2, n2 / n1, 1.0, 2.0)
    scale = order / n2
    return CostEstimate(order, t2 * scale ** k_time, int(b2 * scale ** k_size), n2, t2)
