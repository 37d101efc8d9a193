"""Progress on a terminal for the long commands: a bar per prime (or per side) for
``check``, a bar per entry for ``verify`` with each entry's line printed as it finishes.
Nothing is shown on a non-terminal, under ``--json`` or with ``--quiet``; rich is imported
only when a bar is shown.
"""

from __future__ import annotations

import re
import sys
from collections.abc import Callable, Mapping
from typing import Any

#: "comparing modulo prime 2 of 3", "evaluating the right side": the stages ``check``
#: reports, turned into steps of a bar
_PRIME = re.compile(r"prime (\d+) of (\d+)")
_PRIMES = re.compile(r"modulo (\d+) primes")
_SIDES = {"evaluating the left side": (0, 2), "evaluating the right side": (1, 2)}


def _console() -> Any | None:
    """A rich console on standard error when it is a terminal, else None."""
    if not sys.stderr.isatty():
        return None
    from rich.console import Console

    console = Console(stderr=True)
    return console if console.is_terminal else None


def stage_step(text: str) -> tuple[int, int] | None:
    """(steps done, steps in all) that a stage reported by ``check`` stands for, or None
    for a stage that is not a step.

    >>> stage_step("comparing modulo prime 2 of 3"), stage_step("evaluating the right side")
    ((1, 3), (1, 2))
    >>> stage_step("comparing modulo 3 primes in parallel")
    (0, 3)
    >>> stage_step("recomputing the first mismatch exactly") is None
    True
    """
    m = _PRIME.search(text)
    if m:
        return int(m.group(1)) - 1, int(m.group(2))
    m = _PRIMES.search(text)
    if m:
        return 0, int(m.group(1))
    return _SIDES.get(text)


def run_with_bar(run: Callable[[Callable[[str], None]], Any], show: bool,
                 description: str = "checking") -> Any:
    """``run(say)`` with, on a terminal and when ``show``, a transient bar that follows the
    stages ``say`` reports (the two sides, or the primes of the modular method) and names
    the current one (``description`` until the first); elsewhere ``say`` does nothing.
    A run that reports no stages shows a moving bar with the time elapsed."""
    console = _console() if show else None
    if console is None:
        return run(lambda _text: None)
    from rich.progress import BarColumn, Progress, TextColumn, TimeElapsedColumn

    with Progress(TextColumn("{task.description}"), BarColumn(), TimeElapsedColumn(),
                  console=console, transient=True) as bar:
        task = bar.add_task(description, total=None)

        def say(text: str) -> None:
            step = stage_step(text)
            if step is None:
                bar.update(task, description=text)
            else:
                bar.update(task, description=text, completed=step[0], total=step[1])

        return run(say)


def verify_with_bar(entries: list, order: int | None, jobs: int | None, show: bool,
                    expects: Mapping[str, str], labels: Mapping[str, str]) -> tuple[list, bool]:
    """Run ``verify_entries``; on a terminal (and when ``show``) with a bar per entry and
    each entry's line printed above it as it finishes.  Returns (results, streamed):
    whether the lines were printed.  :class:`~qseries.catalogue.VerifyInterrupted` passes
    through."""
    from ..catalogue import job_count, verify_entries
    from ..report.tables import verify_line

    console = None
    if show:
        from rich.console import Console

        console = Console()
        console = console if console.is_terminal else None
    if console is None:
        return verify_entries(entries, order, jobs), False
    from rich.progress import (
        BarColumn,
        MofNCompleteColumn,
        Progress,
        TextColumn,
        TimeElapsedColumn,
    )

    with Progress(TextColumn("verifying"), BarColumn(), MofNCompleteColumn(),
                  TimeElapsedColumn(), console=console, transient=True) as bar:
        task = bar.add_task("verifying", total=job_count(entries))

        def finished(r: Any) -> None:
            bar.console.print(verify_line(r, expects.get(r.ident, "holds"),
                                          labels.get(r.ident)), markup=False,
                              highlight=False)
            bar.advance(task)

        return verify_entries(entries, order, jobs, progress=finished), True
