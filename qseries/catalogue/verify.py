"""Verify catalogue entries, in parallel worker processes.

An entry is "ok" when it behaves as its file says: it holds to the order, or (for a printed
form recorded as wrong) it fails exactly at the recorded exponent.  An inconclusive check
(no coefficient compared, ``holds`` None) is neither: such an entry is never ok.

>>> from qseries.catalogue.files import Entry
>>> e = Entry("euler", "Euler", "(-q;q)_inf", "1/(q;q^2)_inf", 60, "from memory", "-", 1)
>>> r = verify_entry(e)
>>> r.ok, r.holds, r.order
(True, True, 60)

Entries run in at most as many worker processes as there are entries and cores.  On Ctrl-C
the queued entries are cancelled, the workers are ended (they ignore the interrupt
themselves), and :class:`VerifyInterrupted` carries the results that had come back.
"""

from __future__ import annotations

import os
import signal
import time
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from fractions import Fraction
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from concurrent.futures import ProcessPoolExecutor

from ..analysis import check
from ..errors import QSeriesError
from ..report import mismatch_json
from .files import Entry


@dataclass(frozen=True)
class EntryResult:
    """The outcome for one entry: ``holds`` as the check says (None when inconclusive),
    ``ok`` whether the entry behaves as its file records, ``first_mismatch`` in the JSON
    shape of :func:`qseries.report.mismatch_json`."""

    ident: str
    holds: bool | None
    ok: bool
    order: int | Fraction
    first_mismatch: dict | None
    seconds: float
    error: str = ""


def verify_entry(entry: Entry, order: int | None = None) -> EntryResult:
    """Check one entry at its default order (or ``order``), by the method ``check`` picks
    for that order (exact, or modulo primes at high order).  The entry is ok when it holds
    to the order, or (``expect = "fails"``) fails exactly at ``fails_at``; an inconclusive
    check (``holds`` None) is never ok.

    >>> from qseries.catalogue.files import Entry
    >>> e = Entry("x", "x", "1/(1-q)", "1/(1-q) + q^7", 30, "invented", "-", 1,
    ...           expect="fails", fails_at=7)
    >>> r = verify_entry(e)
    >>> r.ok, r.holds, r.first_mismatch
    (True, False, {'index': 7, 'lhs': '1', 'rhs': '2'})
    """
    n = order or entry.order
    t0 = time.perf_counter()
    try:
        r = check(entry.left, entry.right, order=n, method="auto", weights=entry.weight_map,
                  definitions=entry.definitions or None)
    except QSeriesError as err:
        return EntryResult(entry.ident, False, False, 0, None, time.perf_counter() - t0,
                           str(err))
    m = r.first_mismatch
    mismatch = mismatch_json(r)
    if entry.expect == "holds":
        ok = r.holds is True and r.order_verified == n
    else:
        # a recorded misprint must fail exactly where the file says (if that is below n)
        try:
            expected = Fraction(str(entry.fails_at))
        except (ValueError, ZeroDivisionError):
            return EntryResult(entry.ident, r.holds, False, r.order_verified, mismatch,
                               time.perf_counter() - t0,
                               f"fails_at must be an exponent, not {entry.fails_at!r}")
        # an inconclusive check (holds None) is not the recorded failure either
        ok = (r.holds is False and m is not None and Fraction(m.exponent) == expected) or \
            (r.holds is True and expected >= Fraction(r.order_verified))
    return EntryResult(entry.ident, r.holds, ok, r.order_verified, mismatch,
                       time.perf_counter() - t0)


def _work(args: tuple[Entry, int | None]) -> EntryResult:
    return verify_entry(*args)


class VerifyInterrupted(KeyboardInterrupt):
    """Ctrl-C during :func:`verify_entries`, raised once the workers are stopped:
    ``results`` holds the entries that finished (in the entries' order), ``total`` the
    number of entries.

    >>> VerifyInterrupted([], 5).total
    5
    """

    def __init__(self, results: list[EntryResult], total: int) -> None:
        super().__init__(f"interrupted: {len(results)} of {total} entries finished")
        self.results = results
        self.total = total


def available_cores() -> int:
    """The number of cores this process may run on.

    >>> available_cores() >= 1
    True
    """
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except (AttributeError, OSError):
        return os.cpu_count() or 1


def worker_count(jobs: int | None, entries: int) -> int:
    """Worker processes for ``entries`` entries: ``jobs`` (default: every core), but never
    more than the entries or the cores, and at least one.

    >>> worker_count(1, 100), worker_count(30, 1)
    (1, 1)
    >>> worker_count(30, 19) == min(19, available_cores())
    True
    """
    cores = available_cores()
    return max(1, min(cores if jobs is None else jobs, cores, entries))


def verify_entries(entries: list[Entry], order: int | None = None, jobs: int | None = None,
                   progress: Callable[[EntryResult], None] | None = None
                   ) -> list[EntryResult]:
    """Verify entries with ``jobs`` worker processes (default: all cores; never more than
    the entries or the cores); results come back in the entries' order.  A
    KeyboardInterrupt (Ctrl-C, or raised by ``progress``) stops the workers and raises
    :class:`VerifyInterrupted` with the results that came back before it.

    >>> verify_entries([]) == []
    True
    """
    results: dict[int, EntryResult] = {}
    workers = worker_count(jobs, len(entries))
    try:
        if workers <= 1:
            for i, e in enumerate(entries):
                results[i] = verify_entry(e, order)
                if progress:
                    progress(results[i])
        else:
            _run(entries, order, workers, results, progress)
    except KeyboardInterrupt:
        raise VerifyInterrupted([results[i] for i in sorted(results)], len(entries)) from None
    return [results[i] for i in range(len(entries))]


@contextmanager
def _interrupts_held() -> Iterator[None]:
    """Hold SIGINT back (it is delivered afterwards) in this thread and the processes it
    starts meanwhile; nothing where the platform cannot."""
    if not hasattr(signal, "pthread_sigmask"):
        yield
        return
    old = signal.pthread_sigmask(signal.SIG_BLOCK, {signal.SIGINT})
    try:
        yield
    finally:
        signal.pthread_sigmask(signal.SIG_SETMASK, old)


def _ignore_interrupts() -> None:
    """Worker start-up: Ctrl-C reaches the whole process group, but only the main process
    acts on it (by ending the workers)."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    if hasattr(signal, "pthread_sigmask"):
        signal.pthread_sigmask(signal.SIG_UNBLOCK, {signal.SIGINT})


def _start_pool(workers: int) -> ProcessPoolExecutor:
    from concurrent.futures import ProcessPoolExecutor  # only when needed

    return ProcessPoolExecutor(max_workers=workers, initializer=_ignore_interrupts)


def _stop_pool(pool: ProcessPoolExecutor) -> None:
    """Cancel the queued entries and end the workers now.

    The pool's manager thread also joins the workers once it sees them end, and
    two threads waiting on one process race; so the workers are terminated here,
    the manager thread is left to reap them, and only those still running after it
    are killed and joined here."""
    with _interrupts_held():            # a second Ctrl-C must not leave workers behind
        processes = list((getattr(pool, "_processes", None) or {}).values())
        manager = getattr(pool, "_executor_manager_thread", None)
        pool.shutdown(wait=False, cancel_futures=True)
        for p in processes:
            p.terminate()
        if manager is not None:
            manager.join(timeout=10)
        for p in processes:
            p.join(timeout=5)
            if p.is_alive():
                p.kill()
                p.join(timeout=5)


def _run(entries: list[Entry], order: int | None, workers: int,
         results: dict[int, EntryResult],
         progress: Callable[[EntryResult], None] | None) -> None:
    """Fill ``results`` from a pool of worker processes; on any exception (Ctrl-C
    included) the pool is stopped before the exception goes on."""
    from concurrent.futures import as_completed
    from concurrent.futures.process import BrokenProcessPool

    pool = _start_pool(workers)
    try:
        with _interrupts_held():         # the workers start with Ctrl-C ignored
            futures = {pool.submit(_work, (e, order)): i for i, e in enumerate(entries)}
        for fut in as_completed(futures):
            i = futures[fut]
            try:
                results[i] = fut.result()
            except BrokenProcessPool:
                results[i] = EntryResult(entries[i].ident, False, False, 0, None, 0.0,
                                         "a worker process ended abruptly (out of memory?)")
            if progress:
                progress(results[i])
    except BaseException:
        _stop_pool(pool)
        raise
    pool.shutdown(wait=True)
