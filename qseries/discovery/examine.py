"""Examine the members of a family: the cheap filter at a low order, then the
confirmation at the full order.

A product scan keeps a member when its exponents e_n (f = c q^s prod (1 - q^n)^(e_n),
:mod:`qseries.analysis.product_form`) repeat with a period of at most ``max_period``, seen
at least three times below the filter order, and every |e_n| is at most ``max_exponent``;
the product read off at the filter order is then compared with the member at the full
order by the modular method (:func:`qseries.analysis.check`).  An equality scan (a right
side given) compares the two sides exactly at the filter order, then by the modular method
at the full order.

Every member ends in one of four states: ``hit`` (confirmed at the full order),
``unconfirmed`` (passed the filter, differs at the full order or could not be compared),
``rejected`` (by the filter) or ``failed`` (does not parse, diverges, exceeds a limit, or
has extra variables).  Nothing a member does escapes as an exception: a scan never stops on
a member.

>>> job = ScanJob(Family("sum_{n>=0} q^(n^2+$b n)/(q;q)_n", (("b", "0..2"),)),
...               Criteria(order=100))
>>> [(o.status, o.product) for o in examine_batch(job, ((0, (("b", 0),)), (2, (("b", 2),))))]
[('hit', '(q, q^4;q^5)_inf^-1'), ('rejected', '')]
"""

from __future__ import annotations

import zlib
from dataclasses import dataclass, field
from fractions import Fraction

from ..analysis import check, product_form
from ..engine import evaluate
from ..errors import QSeriesError
from .family import Family, Params

#: the filter order is at least this (and at least 4 * max_period + 2, at most the order)
MIN_FILTER_ORDER = 50
#: the modular confirmation uses this many random primes
CONFIRM_PRIMES = 2
STATUSES = ("hit", "unconfirmed", "rejected", "failed")

__all__ = ["CONFIRM_PRIMES", "MIN_FILTER_ORDER", "STATUSES", "Criteria", "MemberOutcome",
           "ScanJob", "examine_batch", "examine_member"]


@dataclass(frozen=True)
class Criteria:
    """What counts as a hit: a product form with period <= ``max_period`` and exponents
    bounded by ``max_exponent`` (or, in an equality scan, agreement with the right side),
    filtered at ``filter_order`` (default: see :meth:`low_order`) and confirmed modulo
    q^``order``.

    >>> Criteria(order=500).low_order, Criteria(order=30).low_order
    (82, 30)
    """

    order: int
    max_period: int = 20
    max_exponent: int = 5
    filter_order: int | None = None

    def __post_init__(self) -> None:
        for name in ("order", "max_period", "max_exponent"):
            value = getattr(self, name)
            if isinstance(value, bool) or not isinstance(value, int) or value < 1:
                raise QSeriesError(f"{name} must be a positive integer, not {value!r}")
        if self.filter_order is not None and (not isinstance(self.filter_order, int)
                                              or self.filter_order < 2):
            raise QSeriesError(f"the filter order must be an integer >= 2, not "
                               f"{self.filter_order!r}")

    @property
    def low_order(self) -> int:
        """The filter's order: enough for three repetitions of the longest period."""
        wanted = self.filter_order or max(MIN_FILTER_ORDER, 4 * self.max_period + 2)
        return min(wanted, self.order)


@dataclass(frozen=True)
class ScanJob:
    """Everything a worker needs besides the members (plain data, pickled once per
    batch).

    >>> import pickle
    >>> job = ScanJob(Family("q^$a", (("a", "0..1"),)), Criteria(order=10))
    >>> pickle.loads(pickle.dumps(job)) == job
    True
    """

    family: Family
    criteria: Criteria


@dataclass(frozen=True)
class MemberOutcome:
    """What became of one member.  ``product`` is the product found (or the right side of
    an equality scan) for hits and unconfirmed members; ``pattern`` the exponents over one
    period, ``constant`` and ``shift`` the c and s of c q^s prod (...) (as text), used to
    group trivially related hits; ``reason`` says why a member was rejected, unconfirmed or
    failed.

    >>> MemberOutcome(3, (("a", 1), ("b", 2)), "x", "rejected").label
    'a=1 b=2'
    """

    index: int
    params: Params
    expression: str
    status: str
    product: str = ""
    reason: str = ""
    pattern: tuple[int, ...] = ()
    constant: str = "1"
    shift: str = "0"
    stage: str = field(default="")

    @property
    def label(self) -> str:
        """``b=0 c=1``: the parameter values."""
        return " ".join(f"{n}={v}" for n, v in self.params)


def _seed(text: str) -> int:
    """A seed for the modular check that depends only on the member (so a batch computed
    twice, on another worker, gives the same answer)."""
    return zlib.crc32(text.encode("utf-8"))


def _failed(index: int, params: Params, expression: str, reason: str,
            stage: str) -> MemberOutcome:
    return MemberOutcome(index, params, expression, "failed", reason=reason, stage=stage)


def examine_member(job: ScanJob, index: int, params: Params) -> MemberOutcome:
    """The outcome for one member (never raises for a member's own trouble).

    >>> job = ScanJob(Family("sum_{n>=0} q^($a n)", (("a", "0..1"),)), Criteria(order=20))
    >>> o = examine_member(job, 0, (("a", 0),))
    >>> o.status, o.stage
    ('failed', 'evaluation')
    """
    values = dict(params)
    expression = ""
    try:
        expression = job.family.expand(values)
        right = job.family.expand_right(values)
    except QSeriesError as err:
        return _failed(index, params, expression, f"template: {err}", "template")
    try:
        if right is None:
            return _product_scan(job, index, params, expression)
        return _equality_scan(job, index, params, expression, right)
    except QSeriesError as err:
        return _failed(index, params, expression, str(err), "evaluation")
    except RecursionError:
        return _failed(index, params, expression, "the expression is nested too deeply",
                       "evaluation")
    except MemoryError:
        return _failed(index, params, expression, "not enough memory at this order",
                       "evaluation")
    except Exception as err:  # noqa: BLE001 - a scan lists it and goes on
        return _failed(index, params, expression,
                       f"internal error: {type(err).__name__}: {err}", "evaluation")


def _text(x: int | Fraction) -> str:
    return str(x)


def _product_scan(job: ScanJob, index: int, params: Params, expression: str
                  ) -> MemberOutcome:
    crit = job.criteria
    low = crit.low_order
    defs = job.family.definitions or None
    series = evaluate(expression, low, definitions=defs)
    if getattr(series.ring, "names", ()):
        return _failed(index, params, expression, "the member has extra variables "
                       f"({', '.join(series.ring.names)}); a scan needs series in q alone",
                       "evaluation")
    try:
        pf = product_form(series, low)
    except QSeriesError as err:           # zero, or exponents that are not integers
        return MemberOutcome(index, params, expression, "rejected", reason=str(err),
                             stage="filter")
    if pf.period is None or pf.expression is None:
        return MemberOutcome(index, params, expression, "rejected", stage="filter",
                             reason=pf.reason or "the exponents show no period")
    pattern = tuple(pf.exponents[:pf.period])
    if pf.period > crit.max_period:
        return MemberOutcome(index, params, expression, "rejected", stage="filter",
                             reason=f"period {pf.period} > {crit.max_period}")
    big = max(abs(e) for e in pattern)
    if big == 0:
        return MemberOutcome(index, params, expression, "rejected", stage="filter",
                             reason="the series is c q^s (no product to find)")
    if big > crit.max_exponent:
        return MemberOutcome(index, params, expression, "rejected", stage="filter",
                             reason=f"an exponent of size {big} > {crit.max_exponent}")
    product = pf.expression
    found = dict(product=product, pattern=pattern, constant=_text(pf.constant),
                 shift=_text(pf.shift))
    return _confirm(job, index, params, expression, product, found)


def _confirm(job: ScanJob, index: int, params: Params, expression: str, right: str,
             found: dict) -> MemberOutcome:
    crit = job.criteria
    r = check(expression, right, order=crit.order, method="modular", primes=CONFIRM_PRIMES,
              seed=_seed(expression), definitions=job.family.definitions or None)
    if r.holds is True and r.order_verified == crit.order:
        return MemberOutcome(index, params, expression, "hit", stage="confirm", **found)
    if r.holds is False and r.first_mismatch is not None:
        reason = f"differs at the full order, first at q^{r.first_mismatch.exponent}"
    else:
        reason = f"could not be confirmed to O(q^{crit.order}): {r.verdict}"
    return MemberOutcome(index, params, expression, "unconfirmed", reason=reason,
                         stage="confirm", **found)


def _equality_scan(job: ScanJob, index: int, params: Params, expression: str, right: str
                   ) -> MemberOutcome:
    crit = job.criteria
    low = check(expression, right, order=crit.low_order, method="exact",
                definitions=job.family.definitions or None)
    if low.holds is not True:
        reason = (f"differs first at q^{low.first_mismatch.exponent}"
                  if low.first_mismatch is not None else low.verdict)
        return MemberOutcome(index, params, expression, "rejected", reason=reason,
                             stage="filter", product=right)
    return _confirm(job, index, params, expression, right, {"product": right})


def examine_batch(job: ScanJob, members: tuple[tuple[int, Params], ...]
                  ) -> list[MemberOutcome]:
    """The outcomes of a batch of (index, params) members, in order.  A pure function of
    its arguments: computing a batch twice (a lost worker's batch retried elsewhere) gives
    the same outcomes.

    >>> job = ScanJob(Family("1/(q^$a;q^$a)_inf", (("a", "1..2"),)), Criteria(order=30))
    >>> batch = ((0, (("a", 1),)), (1, (("a", 2),)))
    >>> examine_batch(job, batch) == examine_batch(job, batch)
    True
    """
    return [examine_member(job, i, p) for i, p in members]
