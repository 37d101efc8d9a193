"""Verify catalogue entries, in parallel worker processes.

An entry is "ok" when it behaves as its file says: it holds to the order, or (for a printed
form recorded as wrong) it fails exactly at the recorded exponent.

>>> from qseries.catalogue.files import Entry
>>> e = Entry("euler", "Euler", "(-q;q)_inf", "1/(q;q^2)_inf", 60, "from memory", "-", 1)
>>> r = verify_entry(e)
>>> r.ok, r.holds, r.order
(True, True, 60)
"""

from __future__ import annotations

import os
import time
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from fractions import Fraction

from ..analysis import check
from ..errors import QSeriesError
from .files import Entry


@dataclass(frozen=True)
class EntryResult:
    """The outcome for one entry."""

    ident: str
    holds: bool
    ok: bool
    order: int | Fraction
    first_mismatch: dict | None
    seconds: float
    error: str = ""


def _json_exp(e: int | Fraction) -> int | str:
    e = Fraction(e)
    return e.numerator if e.denominator == 1 else str(e)


def verify_entry(entry: Entry, order: int | None = None) -> EntryResult:
    """Check one entry at its default order (or ``order``), by the method ``check`` picks
    for that order (exact, or modulo primes at high order)."""
    n = order or entry.order
    t0 = time.perf_counter()
    try:
        r = check(entry.left, entry.right, order=n, method="auto", weights=entry.weight_map)
    except QSeriesError as err:
        return EntryResult(entry.ident, False, False, 0, None, time.perf_counter() - t0,
                           str(err))
    m = r.first_mismatch
    mismatch = None if m is None else {"index": _json_exp(m.exponent),
                                       "lhs": r.unweighted_text(m.lhs, m.exponent),
                                       "rhs": r.unweighted_text(m.rhs, m.exponent)}
    if entry.expect == "holds":
        ok = r.holds and r.order_verified == n
    else:
        # a recorded misprint must fail exactly where the file says (if that is below n)
        expected = Fraction(str(entry.fails_at))
        ok = (m is not None and Fraction(m.exponent) == expected) or \
            (m is None and expected >= Fraction(r.order_verified))
    return EntryResult(entry.ident, r.holds, ok, r.order_verified, mismatch,
                       time.perf_counter() - t0)


def _work(args: tuple[Entry, int | None]) -> EntryResult:
    return verify_entry(*args)


def verify_entries(entries: list[Entry], order: int | None = None, jobs: int | None = None,
                   progress: Callable[[EntryResult], None] | None = None
                   ) -> list[EntryResult]:
    """Verify entries with ``jobs`` worker processes (default: all cores); results come back
    in the entries' order."""
    jobs = jobs or os.cpu_count() or 1
    results: dict[int, EntryResult] = {}
    for i, r in _run(entries, order, jobs):
        results[i] = r
        if progress:
            progress(r)
    return [results[i] for i in range(len(entries))]


def _run(entries: list[Entry], order: int | None, jobs: int
         ) -> Iterator[tuple[int, EntryResult]]:
    if jobs <= 1 or len(entries) <= 1:
        for i, e in enumerate(entries):
            yield i, verify_entry(e, order)
        return
    from concurrent.futures import ProcessPoolExecutor, as_completed  # only when needed

    with ProcessPoolExecutor(max_workers=jobs) as pool:
        futures = {pool.submit(_work, (e, order)): i for i, e in enumerate(entries)}
        for fut in as_completed(futures):
            yield futures[fut], fut.result()
