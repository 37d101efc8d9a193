"""The tables of ``qseries verify`` and ``qseries list`` with the line under each: rich
tables, built only when a command prints one (rich is imported inside the functions, to keep
start-up fast).

>>> listing_table([]).row_count
0
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from typing import TYPE_CHECKING, Any

from ..series.formatting import coefficient_text
from .verdict import entry_verdict_text, mismatch_text

if TYPE_CHECKING:
    from rich.table import Table

    from .json_shapes import EntryOutcome


def verify_table(results: Sequence[EntryOutcome], expects: Mapping[str, str]) -> Table:
    """The table of ``qseries verify``: identifier, verdict (as recorded or not; ``expects``
    maps an identifier to its entry's ``expect``), order, seconds, first mismatch.

    >>> from types import SimpleNamespace as Outcome
    >>> r = Outcome(ident="x", holds=False, ok=False, order=9, seconds=0.5, error="",
    ...             first_mismatch={"index": 2, "lhs": "1", "rhs": "0"})
    >>> table = verify_table([r], {"x": "holds"})
    >>> [c.header for c in table.columns], [list(c.cells) for c in table.columns][1:]
    ... # doctest: +NORMALIZE_WHITESPACE
    (['identifier', 'verdict', 'order', 'seconds', 'first mismatch'],
     [['FAILS'], ['9'], ['0.50'], ['q^2: 1 vs 0']])
    """
    from rich.table import Table

    table = Table(title=None, show_lines=False)
    for col in ("identifier", "verdict", "order", "seconds", "first mismatch"):
        table.add_column(col)
    for r in results:
        table.add_row(r.ident, entry_verdict_text(r, expects[r.ident]),
                      coefficient_text(r.order), f"{r.seconds:.2f}", mismatch_text(r))
    return table


def verify_summary(results: Sequence[EntryOutcome], seconds: float,
                   interrupted: bool = False) -> str:
    """The line under the table of ``qseries verify``: how many (finished) entries behave as
    recorded, the time, and that agreement is evidence.

    >>> from types import SimpleNamespace as Outcome
    >>> verify_summary([Outcome(ok=True), Outcome(ok=False)], 1.25)
    '1 of 2 entries behave as recorded (1.2 s); agreement to O(q^N) is evidence, not a proof'
    >>> verify_summary([], 0.0, interrupted=True)[:25]
    '0 of 0 finished entries b'
    """
    n_ok = sum(r.ok for r in results)
    return (f"{n_ok} of {len(results)} {'finished ' if interrupted else ''}entries behave as "
            f"recorded ({seconds:.1f} s); agreement to O(q^N) is evidence, not a proof")


def listing_table(rows: Sequence[Mapping[str, Any]]) -> Table:
    """The table of ``qseries list`` from :func:`~qseries.report.json_shapes.listing_rows`:
    identifier, members, title, source.

    >>> table = listing_table([{"id": "euler", "members": 1, "title": "Euler",
    ...                         "source": "from memory"}])
    >>> [list(c.cells) for c in table.columns]
    [['euler'], ['1'], ['Euler'], ['from memory']]
    """
    from rich.table import Table

    table = Table()
    for col in ("identifier", "members", "title", "source"):
        table.add_column(col, overflow="fold")
    for row in rows:
        table.add_row(row["id"], str(row["members"]), row["title"], row["source"])
    return table


def listing_summary(rows: Sequence[Mapping[str, Any]]) -> str:
    """The line under the table of ``qseries list``: entries, and identities counting the
    members of families.

    >>> listing_summary([{"members": 1}, {"members": 14}])
    '2 entries, 15 identities counting family members'
    """
    return (f"{len(rows)} entries, {sum(row['members'] for row in rows)} identities counting "
            f"family members")
