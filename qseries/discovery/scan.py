"""Run a scan: split the members into batches, run them on an engine, take the outcomes as
they come back (recording each batch in the progress record), group the hits.

>>> from qseries.discovery.examine import Criteria
>>> from qseries.discovery.family import Family
>>> report = run_scan(Family("sum_{n>=0} q^(n^2+$b n)/(q;q)_n", (("b", "0..2"),)),
...                   Criteria(order=100), engine=InlineEngine())
>>> [(g.representative.label, g.representative.product) for g in report.groups]
[('b=0', '(q, q^4;q^5)_inf^-1'), ('b=1', '(q^2, q^3;q^5)_inf^-1')]
>>> report.counts()
{'members': 3, 'failed': 0, 'rejected': 1, 'passed_filter': 2, 'confirmed': 2, 'groups': 2}
"""

from __future__ import annotations

import re
import time
from collections.abc import Callable, Iterator
from dataclasses import asdict, dataclass
from itertools import islice
from typing import Any

from ..catalogue.writer import identity_file_text
from ..errors import QSeriesError
from ..report.scan import relation_text
from .engines import Batch, BatchLost, Engine, EngineLost, InlineEngine, PoolEngine
from .examine import Criteria, MemberOutcome, ScanJob
from .family import Family, Params
from .grouping import Group, group_hits
from .record import ScanRecord

#: the largest batch (members per task); smaller when there are few members per worker
MAX_BATCH = 32
#: batches in flight per worker (so that a worker never waits for the next one)
WINDOW_PER_WORKER = 2
#: the members of a batch lost with a local worker process run again one at a time, alone,
#: up to this many times each before they are listed as failed
ALONE_ATTEMPTS = 2

__all__ = ["MAX_BATCH", "ScanInterrupted", "ScanReport", "ScanStopped", "batch_size_for",
           "hits_file_text", "record_header", "run_scan"]


@dataclass(frozen=True)
class ScanReport:
    """The outcome of a scan: every member's outcome (in the family's order), the groups
    of hits, how many outcomes were read from the progress record (``resumed``) and how
    many were computed in this run (``computed``).

    >>> r = run_scan(Family("q^$a", (("a", "0..1"),)), Criteria(order=20), jobs=1)
    >>> r.members, [o.status for o in r.of("rejected")]
    (2, ['rejected', 'rejected'])
    """

    family: Family
    criteria: Criteria
    members: int
    outcomes: tuple[MemberOutcome, ...]
    groups: tuple[Group, ...]
    resumed: int = 0
    computed: int = 0
    seconds: float = 0.0

    def of(self, status: str) -> list[MemberOutcome]:
        """The outcomes with this status (hit, unconfirmed, rejected, failed)."""
        return [o for o in self.outcomes if o.status == status]

    def counts(self) -> dict[str, int]:
        """Members, and how many ended at each stage."""
        hits = len(self.of("hit"))
        return {"members": self.members, "failed": len(self.of("failed")),
                "rejected": len(self.of("rejected")),
                "passed_filter": hits + len(self.of("unconfirmed")), "confirmed": hits,
                "groups": len(self.groups)}


class ScanInterrupted(KeyboardInterrupt):
    """Ctrl-C during :func:`run_scan`, raised once the workers are stopped; ``report``
    holds the members that finished (they are in the progress record).

    >>> def stop(*args):
    ...     raise KeyboardInterrupt
    >>> try:
    ...     run_scan(Family("q^$a", (("a", "0..3"),)), Criteria(order=20), jobs=1,
    ...              batch_size=1, progress=stop)
    ... except ScanInterrupted as err:
    ...     print(err)
    interrupted: 1 of 4 members finished
    """

    def __init__(self, report: ScanReport) -> None:
        super().__init__(f"interrupted: {len(report.outcomes)} of {report.members} members "
                         f"finished")
        self.report = report


class ScanStopped(QSeriesError):
    """The engine could run nothing more (:class:`EngineLost`: the Dask scheduler went
    away); ``report`` holds the members that finished (they are in the progress record),
    the others are left for a resumed scan, not failed.

    >>> err = ScanStopped("lost the Dask cluster", None)
    >>> err.reason
    'lost the Dask cluster'
    """

    def __init__(self, reason: str, report: ScanReport | None) -> None:
        super().__init__(reason)
        self.reason = reason
        self.report = report


def batch_size_for(todo: int, workers: int) -> int:
    """Members per batch: about four batches per worker, at most ``MAX_BATCH``.

    >>> batch_size_for(1000, 2), batch_size_for(10, 2), batch_size_for(0, 4)
    (32, 2, 1)
    """
    return max(1, min(MAX_BATCH, -(-todo // (4 * workers))))


def record_header(family: Family, criteria: Criteria) -> dict[str, Any]:
    """What names a scan in its progress record (a resumed scan must match it).

    >>> sorted(record_header(Family("$a", (("a", "1..2"),)), Criteria(order=9)))
    ['criteria', 'family']
    """
    fam = asdict(family)
    fam["ranges"] = [list(r) for r in family.ranges]
    fam["constraints"] = list(family.constraints)
    fam["definitions"] = list(family.definitions)
    crit = asdict(criteria)
    crit["filter_order"] = criteria.low_order
    return {"family": fam, "criteria": crit}


def _batches(todo: list[tuple[int, Params]], size: int) -> Iterator[Batch]:
    it = iter(todo)
    while batch := tuple(islice(it, size)):
        yield batch


def _report(family: Family, criteria: Criteria, members: int,
            outcomes: dict[int, MemberOutcome], resumed: int, computed: int,
            seconds: float) -> ScanReport:
    ordered = tuple(outcomes[i] for i in sorted(outcomes))
    groups = tuple(group_hits([o for o in ordered if o.status == "hit"]))
    return ScanReport(family, criteria, members, ordered, groups, resumed, computed, seconds)


def run_scan(family: Family, criteria: Criteria, engine: Engine | None = None,
             jobs: int | None = None, batch_size: int | None = None,
             record: ScanRecord | None = None,
             progress: Callable[[list[MemberOutcome], int, int], None] | None = None
             ) -> ScanReport:
    """Scan ``family``: members already in ``record`` (a resumed scan) are not computed
    again; the others run in batches on ``engine`` (default: a pool of ``jobs`` local
    worker processes, or this process for one job), and each batch's outcomes go into
    ``record`` as they come back.  ``progress(outcomes, done, total)`` is called after
    each batch.  Ctrl-C (or a KeyboardInterrupt from ``progress``) stops the engine and
    raises :class:`ScanInterrupted` with the members finished so far; an engine that can
    run nothing more raises :class:`ScanStopped` with them.  Members recorded as failed by
    the engine (stage ``engine``) are run again."""
    t0 = time.perf_counter()
    members = list(enumerate(family.members()))
    outcomes: dict[int, MemberOutcome] = {}
    if record is not None:
        params = dict(members)
        for i, o in record.finished.items():
            # a member failed by the engine (its batch could not be run) is run again
            if params.get(i) == o.params and o.stage != "engine":
                outcomes[i] = o
    resumed = len(outcomes)
    todo = [(i, p) for i, p in members if i not in outcomes]
    job = ScanJob(family, criteria)
    computed = 0
    own = engine is None
    try:
        if engine is None:
            engine = InlineEngine() if jobs == 1 or len(todo) <= 1 else PoolEngine(jobs)
        size = batch_size or batch_size_for(len(todo), engine.workers)
        batches = _batches(todo, size)
        window = WINDOW_PER_WORKER * engine.workers
        pending: dict[Any, Batch] = {}
        # members of lost batches, to be run one at a time with nothing else in flight, so
        # that a member which crashes its worker is known: it fails alone, after
        # ALONE_ATTEMPTS tries
        quarantine: list[Batch] = []
        alone: dict[Batch, int] = {}

        def top_up() -> None:
            if quarantine:
                if not pending:
                    single = quarantine.pop(0)
                    alone[single] = alone.get(single, 0) + 1
                    pending[engine.submit(job, single)] = single
                return
            while len(pending) < window:
                batch = next(batches, None)
                if batch is None:
                    return
                pending[engine.submit(job, batch)] = batch

        top_up()
        while pending:
            for handle in engine.wait_any(list(pending)):
                batch = pending.pop(handle)
                try:
                    got = engine.result(handle)
                except BatchLost as lost:
                    if lost.retry and batch not in alone:
                        quarantine.extend((member,) for member in batch)
                        continue
                    if lost.retry and alone[batch] < ALONE_ATTEMPTS:
                        quarantine.insert(0, batch)
                        continue
                    got = [MemberOutcome(i, p, "", "failed", reason=lost.reason,
                                         stage="engine") for i, p in batch]
                for o in got:
                    outcomes[o.index] = o
                computed += len(got)
                if record is not None:
                    record.append(got)
                if progress is not None:
                    progress(got, len(outcomes), len(members))
            top_up()
    except KeyboardInterrupt:
        if engine is not None and own:
            engine.close(abort=True)
            own = False
        raise ScanInterrupted(_report(family, criteria, len(members), outcomes, resumed,
                                      computed, time.perf_counter() - t0)) from None
    except EngineLost as lost:
        if engine is not None and own:
            engine.close(abort=True)
            own = False
        raise ScanStopped(str(lost), _report(family, criteria, len(members), outcomes,
                                             resumed, computed,
                                             time.perf_counter() - t0)) from None
    except BaseException:
        if engine is not None and own:
            engine.close(abort=True)
            own = False
        raise
    finally:
        if engine is not None and own:
            engine.close()
    return _report(family, criteria, len(members), outcomes, resumed, computed,
                   time.perf_counter() - t0)


def _key_prefix(name: str) -> str:
    prefix = re.sub(r"[^a-z0-9]+", "-", name.lower()).strip("-")
    return prefix if prefix and prefix[0].isalnum() else "scan"


def hits_file_text(report: ScanReport, date: str, name: str = "scan") -> str:
    """An identity file with one entry per group of hits (its first member), which
    ``qseries verify`` reads as it is: the template as ``left`` with each parameter's value
    as a one-value range, the product (or the right side) as ``right``, the scan's order,
    and ``source = "found by scan on DATE, order N"``; the related members are named in
    ``note``.  ``name`` gives the keys (``name-1``, ``name-2``, ...).

    >>> r = run_scan(Family("sum_{n>=0} q^(n^2+$b n)/(q;q)_n", (("b", "0..0"),)),
    ...              Criteria(order=60), jobs=1)
    >>> [line for line in hits_file_text(r, "2026-01-01").splitlines()
    ...  if line.startswith(("key", "source", "params"))]
    ['key = "scan-1"', 'source = "found by scan on 2026-01-01, order 60"', 'params = {b = "0..0"}']
    """
    fam, crit = report.family, report.criteria
    prefix = _key_prefix(name)
    entries = []
    for k, g in enumerate(report.groups, start=1):
        rep = g.representative
        also = "; ".join(
            f"{r.member.label} = {relation_text(r, rep.label)}"
            for r in g.related)
        note = f"member {rep.label} of the scanned family ({rep.expression})"
        if also:
            note += f"; related members (to O(q^{crit.order})): {also}"
        entry: dict[str, object] = {
            "key": f"{prefix}-{k}",
            "title": f"Scan hit {rep.label}",
            "left": fam.template,
            "right": fam.right if fam.right is not None else rep.product,
            "order": crit.order,
            "source": f"found by scan on {date}, order {crit.order}",
            "tags": ["scan"],
            "params": {n: f"{v}..{v}" for n, v in rep.params},
            "note": note,
        }
        if not rep.params:
            del entry["params"]
            entry["left"] = rep.expression
            entry["right"] = rep.product
        entries.append(entry)
    ranges = ", ".join(f"{n} = {r}" for n, r in fam.ranges)
    where = f" where {' and '.join(fam.constraints)}" if fam.constraints else ""
    what = (f"equal to {fam.right}" if fam.right is not None else
            f"product forms with period <= {crit.max_period} and exponents at most "
            f"{crit.max_exponent} in size")
    comment = (f"Found by qseries scan on {date}: {what}, filtered at order "
               f"{crit.low_order}, confirmed to order {crit.order} (modular method)\n"
               f"template: {fam.template}\nparameters: {ranges}{where}\n"
               f"{report.members} members, {len(report.of('hit'))} hits in "
               f"{len(report.groups)} groups, {len(report.of('failed'))} failed")
    if len(report.outcomes) < report.members:
        comment += (f"\ninterrupted: {len(report.outcomes)} of {report.members} members "
                    f"finished (scan again with --resume for the others)")
    return identity_file_text(entries, fam.definitions, comment)
