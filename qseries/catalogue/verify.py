"""Verify catalogue entries, in parallel worker processes.

An entry is "ok" when it behaves as its file says: it holds to the order, or (for a printed
form recorded as wrong) it fails exactly at the recorded exponent.  An inconclusive check
(no coefficient compared, ``holds`` None) is neither: such an entry is never ok.

>>> from qseries.catalogue.files import Entry
>>> e = Entry("euler", "Euler", "(-q;q)_inf", "1/(q;q^2)_inf", 60, "from memory", "-", 1)
>>> r = verify_entry(e)
>>> r.ok, r.holds, r.order
(True, True, 60)

An entry with ``same_as`` gives one more result, the pair (:func:`verify_pair`): its id is
``this ~ other`` (:func:`pair_ident`), and it is ok when both pairs of corresponding sides
agree as series to the order (the other entry's sides under the recorded substitution).

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
from ..lang import parse
from ..lang.ast import Node
from ..lang.definitions import Definition, substitute
from ..report import mismatch_json
from .files import Entry, substitution_node


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
    pair: dict | None = None


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


def pair_ident(entry: Entry) -> str:
    """The id of the result that checks an entry's ``same_as``: ``this ~ other``, with the
    substitution when there is one.

    >>> from qseries.catalogue.files import Entry, SameAs
    >>> s = SameAs("b", "q -> -q", False, "from memory", "f:1", partner="b")
    >>> pair_ident(Entry("a", "t", "1", "1", 5, "s", "-", 1, same_as=s))
    'a ~ b (q -> -q)'
    """
    s = entry.same_as
    if s is None:
        raise ValueError(f"{entry.ident} has no same_as")
    return f"{entry.ident} ~ {s.partner or s.key}" + (f" ({s.substitution})"
                                                     if s.substitution else "")


def _moved(text: str, definitions: tuple[str, ...], substitution: str) -> Node:
    """The other entry's side, parsed with its own definitions, q replaced as recorded."""
    node = parse(text, definitions=definitions or None)
    by = substitution_node(substitution)
    if by is None:
        return node
    return substitute(Definition("same_as", ("q",), node, text), (by,), 0)


def verify_pair(entry: Entry, order: int | None = None) -> EntryResult:
    """Check an entry's ``same_as``: each side of the entry against the corresponding side
    of the other entry (swapped when recorded) with q replaced as recorded, to the entry's
    order (or ``order``).  ok when both agree to that order; ``first_mismatch`` is that of
    the first side that differs, and ``pair`` says which side it is.

    >>> from qseries.catalogue.files import Entry, SameAs
    >>> s = SameAs("b", "q -> -q", False, "from memory", "f:1", partner="b",
    ...            left="sum_{n=-inf}^{inf} q^(n^2)", right="(q^2;q^2)_inf (-q;q^2)_inf^2")
    >>> a = Entry("a", "t", "sum_{n=-inf}^{inf} (-1)^n q^(n^2)", "(q;q)_inf/(-q;q)_inf",
    ...           100, "s", "-", 1, same_as=s)
    >>> r = verify_pair(a)
    >>> r.ident, r.ok, r.pair["differs"]
    ('a ~ b (q -> -q)', True, None)
    """
    s = entry.same_as
    if s is None:
        raise ValueError(f"{entry.ident} has no same_as")
    n = order or entry.order
    t0 = time.perf_counter()
    ident = pair_ident(entry)
    info: dict = {"of": entry.ident, "same_as": s.partner or s.key,
                  "substitution": s.substitution or None, "swap": s.swap, "differs": None}
    others = (s.right, s.left) if s.swap else (s.left, s.right)
    holds: bool | None = True
    reached: int | Fraction = n
    for side, mine, other in (("left", entry.left, others[0]),
                              ("right", entry.right, others[1])):
        try:
            r = check(mine, _moved(other, s.definitions, s.substitution), order=n,
                      method="auto", weights=entry.weight_map,
                      definitions=entry.definitions or None)
        except QSeriesError as err:
            return EntryResult(ident, False, False, 0, None, time.perf_counter() - t0,
                               f"{side} side: {err}", info)
        reached = min(reached, r.order_verified)
        if r.holds is not True:
            holds = r.holds if holds is True else holds
            if r.holds is False:
                info["differs"] = side
                return EntryResult(ident, False, False, r.order_verified, mismatch_json(r),
                                   time.perf_counter() - t0, "", info)
    ok = holds is True and reached == n
    return EntryResult(ident, holds, ok, reached, None, time.perf_counter() - t0, "", info)


def job_count(entries: list[Entry]) -> int:
    """The number of results :func:`verify_entries` gives: one per entry and one per
    ``same_as``.

    >>> job_count([])
    0
    """
    return len(entries) + sum(e.same_as is not None for e in entries)


def _jobs(entries: list[Entry]) -> list[tuple[Entry, bool]]:
    out: list[tuple[Entry, bool]] = []
    for e in entries:
        out.append((e, False))
        if e.same_as is not None:
            out.append((e, True))
    return out


def _work(args: tuple[Entry, bool, int | None]) -> EntryResult:
    entry, pair, order = args
    return verify_pair(entry, order) if pair else verify_entry(entry, order)


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
    the entries or the cores); results come back in the entries' order, each entry with a
    ``same_as`` followed by its pair's result (:func:`verify_pair`).  A
    KeyboardInterrupt (Ctrl-C, or raised by ``progress``) stops the workers and raises
    :class:`VerifyInterrupted` with the results that came back before it.

    >>> verify_entries([]) == []
    True
    """
    results: dict[int, EntryResult] = {}
    work = _jobs(entries)
    workers = worker_count(jobs, len(work))
    try:
        if workers <= 1:
            for i, (e, pair) in enumerate(work):
                results[i] = _work((e, pair, order))
                if progress:
                    progress(results[i])
        else:
            _run(work, order, workers, results, progress)
    except KeyboardInterrupt:
        raise VerifyInterrupted([results[i] for i in sorted(results)], len(work)) from None
    return [results[i] for i in range(len(work))]


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


def _run(work: list[tuple[Entry, bool]], order: int | None, workers: int,
         results: dict[int, EntryResult],
         progress: Callable[[EntryResult], None] | None) -> None:
    """Fill ``results`` from a pool of worker processes; on any exception (Ctrl-C
    included) the pool is stopped before the exception goes on."""
    from concurrent.futures import as_completed
    from concurrent.futures.process import BrokenProcessPool

    pool = _start_pool(workers)
    try:
        with _interrupts_held():         # the workers start with Ctrl-C ignored
            futures = {pool.submit(_work, (e, pair, order)): i
                       for i, (e, pair) in enumerate(work)}
        for fut in as_completed(futures):
            i = futures[fut]
            try:
                results[i] = fut.result()
            except BrokenProcessPool:
                e, pair = work[i]
                results[i] = EntryResult(pair_ident(e) if pair else e.ident, False, False, 0,
                                         None, 0.0,
                                         "a worker process ended abruptly (out of memory?)")
            if progress:
                progress(results[i])
    except BaseException:
        _stop_pool(pool)
        raise
    pool.shutdown(wait=True)
