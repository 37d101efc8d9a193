"""Progress on a terminal for the long commands: a bar per prime (or per side) for
``check`` that also advances as each sum or product of a side is evaluated, a bar per n
for ``distribution --trend-upto``, a bar per entry for ``verify`` with each entry's line
printed as it finishes.
Nothing is shown on a non-terminal, under ``--json`` or with ``--quiet``; rich is imported
only when a bar is shown.
"""

from __future__ import annotations

import re
import sys
from collections.abc import Callable, Mapping
from fractions import Fraction
from typing import Any

#: "comparing modulo prime 2 of 3", "evaluating the right side": the stages ``check``
#: reports, turned into steps of a bar
_PRIME = re.compile(r"prime (\d+) of (\d+)")
_PRIMES = re.compile(r"modulo (\d+) primes")
_SIDES = {"evaluating the left side": (0, 2), "evaluating the right side": (1, 2)}
#: "left side: evaluated part 1 of 2, (q;q)_inf", maybe after "prime 2 of 3, "
_PART = re.compile(r"(left|right) side: evaluated part (\d+) of (\d+)")
#: the longest stage text shown beside a bar
WIDTH = 70


def _console() -> Any | None:
    """A rich console on standard error when it is a terminal, else None."""
    if not sys.stderr.isatty():
        return None
    from rich.console import Console

    console = Console(stderr=True)
    return console if console.is_terminal else None


def stage_step(text: str) -> tuple[int | float, int] | None:
    """(steps done, steps in all) that a stage reported by ``check`` stands for, or None
    for a stage that is not a step.  The steps are the sides (or the primes); an evaluated
    part of a side is its share of the side's step.

    >>> stage_step("comparing modulo prime 2 of 3"), stage_step("evaluating the right side")
    ((1, 3), (1, 2))
    >>> stage_step("comparing modulo 3 primes in parallel")
    (0, 3)
    >>> stage_step("right side: evaluated part 1 of 2, (q;q)_inf")
    (1.5, 2)
    >>> stage_step("prime 2 of 3, left side: evaluated part 1 of 1, (q;q)_inf")
    (1.5, 3)
    >>> stage_step("recomputing the first mismatch exactly") is None
    True
    """
    part = _PART.search(text)
    if part:
        side = Fraction(part.group(1) == "right") + Fraction(int(part.group(2)),
                                                              int(part.group(3)))
        m = _PRIME.search(text)
        done, total = (side, 2) if m is None else (int(m.group(1)) - 1 + side / 2,
                                                   int(m.group(2)))
        return (int(done) if done.denominator == 1 else float(done)), total
    m = _PRIME.search(text)
    if m:
        return int(m.group(1)) - 1, int(m.group(2))
    m = _PRIMES.search(text)
    if m:
        return 0, int(m.group(1))
    return _SIDES.get(text)


def shortened(text: str, width: int = WIDTH) -> str:
    """``text`` cut to ``width`` characters (an ellipsis at the end when cut).

    >>> shortened("left side: evaluated part 1 of 1, sum_{n>=0} q^(n^2) / (q;q)_n", 40)
    'left side: evaluated part 1 of 1, sum...'
    """
    return text if len(text) <= width else text[:width - 3] + "..."


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
            text = shortened(text)
            if step is None:
                bar.update(task, description=text)
            else:
                bar.update(task, description=text, completed=step[0], total=step[1])

        return run(say)


def counted_with_bar(run: Callable[[Callable[[str, int, int], None]], Any], show: bool,
                     description: str) -> Any:
    """``run(step)`` with, on a terminal and when ``show``, a transient bar: a moving one
    named ``description`` until the first ``step(text, done, total)``, then ``done`` of
    ``total`` with ``text`` beside it (``distribution --trend-upto``: one step per n);
    elsewhere ``step`` does nothing."""
    console = _console() if show else None
    if console is None:
        return run(lambda _text, _done, _total: None)
    from rich.progress import BarColumn, Progress, TextColumn, TimeElapsedColumn

    with Progress(TextColumn("{task.description}"), BarColumn(), TimeElapsedColumn(),
                  console=console, transient=True) as bar:
        task = bar.add_task(description, total=None)

        def step(text: str, done: int, total: int) -> None:
            bar.update(task, description=shortened(f"{text} ({done} of {total})"),
                       completed=done, total=total)

        return run(step)


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
        from .streams import stdout_console

        console = stdout_console()
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
