"""The progress record of a scan: a file next to its output (``hits.toml.progress``) that
lists every finished member, hits and non-hits alike, so that an interrupted scan resumes
without computing them again.

The record is JSON lines: a header naming the scan (family, criteria) and then one line per
finished member, appended and flushed as each batch comes back.  A resumed scan must be the
same scan (same header); a last line cut short by a crash is dropped.

>>> import tempfile, pathlib
>>> from qseries.discovery.examine import MemberOutcome
>>> path = pathlib.Path(tempfile.mkdtemp()) / "hits.toml.progress"
>>> rec = ScanRecord.create(path, {"scan": "x"})
>>> rec.append([MemberOutcome(0, (("b", 0),), "f", "rejected", reason="no period")])
>>> rec.close()
>>> with ScanRecord.resume(path, {"scan": "x"}) as again:
...     [o.reason for o in again.finished.values()]
['no period']
"""

from __future__ import annotations

import json
from collections.abc import Iterable
from dataclasses import asdict
from pathlib import Path
from typing import IO, Any

from ..errors import QSeriesError
from .examine import MemberOutcome

FORMAT = "qseries-scan-progress"
VERSION = 1

__all__ = ["ScanRecord", "progress_path"]


def progress_path(out: Path) -> Path:
    """Where the progress of a scan writing ``out`` is recorded.

    >>> progress_path(Path("hits.toml")).name
    'hits.toml.progress'
    """
    return out.with_name(out.name + ".progress")


def outcome_data(o: MemberOutcome) -> dict[str, Any]:
    """One outcome as JSON data (the inverse of :func:`outcome_from`).

    >>> o = MemberOutcome(0, (("b", 1),), "f", "hit", "p", pattern=(-1, 0))
    >>> outcome_from(json.loads(json.dumps(outcome_data(o)))) == o
    True
    """
    data = asdict(o)
    data["params"] = [list(p) for p in o.params]
    data["pattern"] = list(o.pattern)
    return data


def outcome_from(data: dict[str, Any]) -> MemberOutcome:
    """The outcome written by :func:`outcome_data`.

    >>> outcome_from({"index": 0, "params": [["b", 1]], "expression": "f",
    ...               "status": "rejected", "pattern": []}).params
    (('b', 1),)
    """
    return MemberOutcome(**{**data, "params": tuple((str(n), int(v)) for n, v in data["params"]),
                            "pattern": tuple(int(e) for e in data["pattern"])})


class ScanRecord:
    """An open progress record: ``finished`` maps member indices to their outcomes (read
    from the file when resuming); :meth:`append` adds outcomes.  See the module's
    example."""

    def __init__(self, path: Path, stream: IO[str], finished: dict[int, MemberOutcome]
                 ) -> None:
        self.path = path
        self.stream = stream
        self.finished = finished

    @classmethod
    def create(cls, path: Path, header: dict[str, Any]) -> ScanRecord:
        """A new record; refused if one is there already (resume it, or remove it)."""
        try:
            stream = open(path, "x", encoding="utf-8")   # noqa: SIM115 - kept open
        except FileExistsError:
            raise QSeriesError(f"{path} exists: it records an earlier scan; pass --resume to "
                               f"continue that scan, or remove it") from None
        except OSError as err:
            raise QSeriesError(f"cannot write {path}: {err.strerror or err}") from None
        stream.write(json.dumps({"format": FORMAT, "version": VERSION, **header}) + "\n")
        stream.flush()
        return cls(path, stream, {})

    @classmethod
    def resume(cls, path: Path, header: dict[str, Any]) -> ScanRecord:
        """The record of an earlier run of the same scan, opened to append to."""
        try:
            raw = path.read_bytes()
        except FileNotFoundError:
            raise QSeriesError(f"nothing to resume: {path} does not exist (it is written "
                               f"next to --out by a scan)") from None
        except OSError as err:
            raise QSeriesError(f"cannot read {path}: {err.strerror or err}") from None
        lines = raw.split(b"\n")
        complete = lines[:-1]             # the part after the last newline is cut short
        good = sum(len(x) + 1 for x in complete)
        try:
            first = json.loads(complete[0]) if complete else None
        except ValueError:
            first = None
        if not isinstance(first, dict) or first.get("format") != FORMAT:
            raise QSeriesError(f"{path} is not the progress record of a scan")
        if first.get("version") != VERSION or \
                {k: v for k, v in first.items() if k not in ("format", "version")} != \
                json.loads(json.dumps(header)):
            raise QSeriesError(f"{path} records a different scan (template, parameters, "
                               f"constraints, right side, definitions or criteria differ); "
                               f"resume with the same options, or choose another --out")
        finished: dict[int, MemberOutcome] = {}
        for number, line in enumerate(complete[1:], start=2):
            try:
                o = outcome_from(json.loads(line))
            except (ValueError, TypeError, KeyError) as err:
                raise QSeriesError(f"{path}:{number}: damaged record ({err}); remove the "
                                   f"line or start the scan again") from None
            finished[o.index] = o
        try:
            stream = open(path, "r+", encoding="utf-8")  # noqa: SIM115 - kept open
            stream.seek(good)
            stream.truncate()
        except OSError as err:
            raise QSeriesError(f"cannot write {path}: {err.strerror or err}") from None
        return cls(path, stream, finished)

    def append(self, outcomes: Iterable[MemberOutcome]) -> None:
        """Record finished members (written and flushed at once)."""
        outcomes = list(outcomes)
        try:
            self.stream.write("".join(json.dumps(outcome_data(o)) + "\n" for o in outcomes))
            self.stream.flush()
        except OSError as err:
            raise QSeriesError(f"cannot write {self.path}: {err.strerror or err}; the "
                               f"members recorded so far are kept, continue with "
                               f"--resume") from None
        for o in outcomes:
            self.finished[o.index] = o

    def close(self) -> None:
        """Close the file."""
        try:
            self.stream.close()
        except OSError:        # a failed flush was reported by append already
            pass

    def __enter__(self) -> ScanRecord:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()
