"""``qseries scan``: scan a family of sums for product forms (registered on the app of
:mod:`qseries.cli.main`)."""

from __future__ import annotations

import json
import os
from itertools import islice
from pathlib import Path
from typing import Annotated, Any

import typer

from ..errors import QSeriesError
from ..series import MAX_LENGTH
from .main import DefineOption, JsonOption, _fail, _guarded, app

__all__ = ["PROBE_MEMBERS", "scan"]

#: the template is bad input when none of its first this many members expands and parses
PROBE_MEMBERS = 100


def _write_atomically(path: Path, text: str) -> None:
    tmp = path.with_name(path.name + ".tmp")
    try:
        tmp.write_text(text, encoding="utf-8")
        os.replace(tmp, path)
    except OSError as err:
        _fail(f"cannot write {path}: {err.strerror or err}")


def _parse_member(text: str, typed: str, params: Any, defs: Any) -> None:
    """Parse a member's side; a syntax error is placed in the template as typed when it
    lies in text the two share, else named as the member's."""
    from ..discovery.family import place_in_template
    from ..errors import ParseError
    from ..lang.parser import parse

    try:
        parse(text, definitions=defs)
    except ParseError as err:
        moved = place_in_template(err, typed)
        if moved is not None:
            raise moved from None
        label = " ".join(f"{n}={v}" for n, v in params)
        raise ParseError(f"in the member {label}: {err.message}", err.text,
                         err.position) from None


def _one_member_reads(family: Any, probe: list, defs: Any) -> None:
    """Return when one of the members ``probe`` expands and parses (both sides); else
    raise the first member's error."""
    first: QSeriesError | None = None
    for params in probe:
        values = dict(params)
        try:
            for side, typed in ((family.expand, family.template),
                                (family.expand_right, family.right)):
                text = side(values)
                if text is not None:
                    _parse_member(text, typed, params, defs)
        except QSeriesError as err:
            first = first or err
            continue
        return
    if first is not None:
        raise first


def _engine(cluster: str | None, jobs: int | None, timeout: float) -> Any:
    from ..discovery import DaskEngine, InlineEngine, PoolEngine

    if cluster is None:
        return InlineEngine() if jobs == 1 else PoolEngine(jobs)
    address = cluster
    if cluster == "config":
        try:
            import dask.config
        except ImportError:
            _fail("--cluster needs dask.distributed: pip install 'qseries[cluster]'")
        address = dask.config.get("scheduler-address", None)
        if not address:
            _fail("--cluster config: no scheduler-address in the Dask configuration (set "
                  "DASK_SCHEDULER_ADDRESS or give the address)")
    return _guarded(DaskEngine, address, None, timeout)


def _run_with_bar(run: Any, wanted: bool, *args: Any, **kwargs: Any) -> Any:
    """``run(*args, **kwargs, progress=...)`` with a progress bar on a terminal."""
    from rich.console import Console  # only when a scan runs

    console = Console(stderr=True)
    if not (wanted and console.is_terminal):
        return run(*args, **kwargs)
    from rich.progress import Progress

    with Progress(console=console, transient=True) as bar:
        task = bar.add_task("scanning", total=None)

        def advance(_outcomes: Any, done: int, total: int) -> None:
            bar.update(task, completed=done, total=total)

        return run(*args, **kwargs, progress=advance)


@app.command(name="scan")
def scan(
    template: Annotated[str, typer.Argument(metavar="TEMPLATE",
        help="A sum side with parameters in the catalogue's template syntax, e.g. "
             "\"sum_{n>=0} q^(n^2+$b n)/(q;q)_n\".")],
    param: Annotated[list[str], typer.Option(
        "--param", "-p", metavar="NAME=LO..HI",
        help="A parameter and its range, both ends included; an end may use parameters "
             "given before (b=0..a).  Repeatable.")],
    where: Annotated[list[str] | None, typer.Option(
        "--where", metavar="CONSTRAINT",
        help="Keep members with, e.g., \"a <= b\" or \"a != 2b\" (<=, <, >=, >, ==, != "
             "between integer expressions).  Repeatable.")] = None,
    order: Annotated[int, typer.Option(
        "--order", "-n", min=2, max=MAX_LENGTH,
        help="Confirm hits modulo q^N (the modular method).")] = 500,
    period: Annotated[int, typer.Option(
        "--max-period", "-P", min=1, max=10_000,
        help="A hit's exponents repeat with period at most P.")] = 20,
    exponent: Annotated[int, typer.Option(
        "--max-exponent", "-E", min=1,
        help="A hit's exponents are at most E in size.")] = 5,
    filter_order: Annotated[int | None, typer.Option(
        "--filter-order", min=2, max=MAX_LENGTH,
        help="Order of the cheap filter (default: max(50, 4P+2), at most N).")] = None,
    right: Annotated[str | None, typer.Option(
        "--right", metavar="TEMPLATE",
        help="Look for members equal to this right side (a template too) instead of "
             "product forms.")] = None,
    define: DefineOption = None,
    out: Annotated[Path | None, typer.Option(
        "--out", "-o", metavar="FILE",
        help="Write the hits as an identity file for verify; the progress is recorded in "
             "FILE.progress.")] = None,
    resume: Annotated[bool, typer.Option(
        "--resume", help="Continue the scan recorded in FILE.progress (same options): "
                         "finished members are not computed again.")] = False,
    jobs: Annotated[int | None, typer.Option(
        "--jobs", "-j", min=1, help="Local worker processes (default: all cores).")] = None,
    cluster: Annotated[str | None, typer.Option(
        "--cluster", metavar="ADDRESS",
        help="Run on the Dask scheduler at ADDRESS (tcp://host:8786), or \"config\" for the "
             "one in the Dask configuration; needs qseries[cluster] here and qseries on the "
             "workers.")] = None,
    connect_timeout: Annotated[float, typer.Option(
        "--connect-timeout", min=0.1, max=3600, metavar="SECONDS",
        help="How long to try reaching the --cluster scheduler.")] = 30,
    batch: Annotated[int | None, typer.Option(
        "--batch", min=1, max=10_000, help="Members per task (default: automatic).")] = None,
    as_json: JsonOption = False,
) -> None:
    """Scan a family of sums for product forms: each member is expanded at a low order
    and kept when its exponents repeat (period <= P, size <= E); the product found is then
    compared with the member to O(q^N) modulo random primes.  Hits that differ only by a
    constant, a power of q or q -> -q are grouped.  Exit 0 with hits, 1 without, 130 when
    interrupted, 2 on bad input or when the --cluster scheduler goes away (resume with
    --resume).

    Example: qseries scan 'sum_{n>=0} q^(n^2+$b n)/(q;q)_n' -p b=0..3 -n 500
    """
    from ..discovery import (
        Criteria,
        Family,
        ScanInterrupted,
        ScanRecord,
        ScanStopped,
        hits_file_text,
        parse_param,
        progress_path,
        record_header,
        run_scan,
    )
    from ..lang.parser import definitions_of
    from ..report import scan_json, scan_lines

    ranges = tuple(_guarded(parse_param, p) for p in param)
    _guarded(definitions_of, define or [])
    family = _guarded(lambda: Family(template, ranges, tuple(where or ()), right,
                                     tuple(define or ())))
    criteria = _guarded(lambda: Criteria(order, period, exponent, filter_order))
    probe = _guarded(lambda: list(islice(family.members(), PROBE_MEMBERS)))
    if not probe:                                                  # ranges, constraints
        _fail("the parameter ranges and --where constraints leave no member to scan")
    # a template that does not read (an unknown $name, a syntax error) is bad input, not a
    # scan whose every member fails: one of its first members must expand and parse (the
    # others that do not are listed as failed by the scan)
    _guarded(_one_member_reads, family, probe, definitions_of(define or []))
    if cluster is not None and jobs is not None:
        _fail("--jobs counts local worker processes; with --cluster the cluster's workers run "
              "the scan: give one or the other")
    record = None
    if resume and out is None:
        _fail("--resume continues the scan recorded next to --out FILE: give --out")
    if out is not None:
        if out.exists() and not resume:
            _fail(f"{out} exists; choose another --out, or pass --resume to continue the "
                  f"scan recorded in {progress_path(out)}")
        header = record_header(family, criteria)
        opener = ScanRecord.resume if resume else ScanRecord.create
        record = _guarded(opener, progress_path(out), header)
    from datetime import UTC, datetime

    date = datetime.now(UTC).date().isoformat()
    interrupted = None
    stopped: str | None = None
    try:
        engine = _engine(cluster, jobs, connect_timeout)
        try:
            report = _run_with_bar(run_scan, not as_json, family, criteria, engine=engine,
                                   batch_size=batch, record=record)
        except ScanInterrupted as stop:
            report, interrupted = stop.report, len(stop.report.outcomes)
        except ScanStopped as stop:      # the engine is gone: keep what finished
            report, interrupted, stopped = stop.report, len(stop.report.outcomes), stop.reason
        except QSeriesError as err:
            _fail(str(err), err)
        finally:
            engine.close(abort=interrupted is not None)
    except KeyboardInterrupt:
        typer.echo("qseries: interrupted", err=True)
        raise typer.Exit(130) from None
    finally:
        if record is not None:
            record.close()
    if out is not None:
        _write_atomically(out, hits_file_text(report, date, out.stem))
    if as_json:
        data = scan_json(report)
        if interrupted is not None:
            data["interrupted"] = True
        if stopped is not None:              # the shape of every command's error
            data["error"] = {"message": stopped, "position": None}
        typer.echo(json.dumps(data))
    else:
        for line in scan_lines(report, interrupted):
            typer.echo(line)
    if stopped is not None:
        typer.echo(f"qseries: error: {stopped}: {interrupted} of {report.members} members "
                   f"finished" + (f"; continue with --resume --out {out}" if out else ""),
                   err=True)
        raise typer.Exit(2)
    if interrupted is not None:
        typer.echo(f"qseries: interrupted: {interrupted} of {report.members} members finished"
                   + (f"; continue with --resume --out {out}" if out else ""), err=True)
        raise typer.Exit(130)
    raise typer.Exit(0 if report.groups else 1)
