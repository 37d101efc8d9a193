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


def verify_table(results: Sequence[EntryOutcome], expects: Mapping[str, str],
                 labels: Mapping[str, str] | None = None) -> Table:
    """The table of ``qseries verify``: identifier, verdict (as recorded or not; ``expects``
    maps an identifier to its entry's ``expect``), order, seconds, first mismatch.
    ``labels`` maps an identifier to the text shown for it (a family member's parameters
    spelled out, ``andrews-gordon k=3 i=1``); text is shown as it is, never read as rich
    markup (``[k=3]`` would vanish).

    >>> from types import SimpleNamespace as Outcome
    >>> r = Outcome(ident="x", holds=False, ok=False, order=9, seconds=0.5, error="",
    ...             first_mismatch={"index": 2, "lhs": "1", "rhs": "0"})
    >>> table = verify_table([r], {"x": "holds"})
    >>> [c.header for c in table.columns], [list(c.cells) for c in table.columns][1:]
    ... # doctest: +NORMALIZE_WHITESPACE
    (['identifier', 'verdict', 'order', 'seconds', 'first mismatch'],
     [['FAILS'], ['9'], ['0.50'], ['q^2: 1 vs 0']])
    >>> list(verify_table([r], {"x": "holds"}, {"x": "fam k=2"}).columns[0].cells)
    ['fam k=2']
    """
    from rich.markup import escape
    from rich.table import Table

    table = Table(title=None, show_lines=False)
    for col in ("identifier", "verdict", "order", "seconds", "first mismatch"):
        table.add_column(col, overflow="fold")
    for r in results:
        shown = labels.get(r.ident, r.ident) if labels else r.ident
        table.add_row(escape(shown), escape(entry_verdict_text(r, expects[r.ident])),
                      coefficient_text(r.order), f"{r.seconds:.2f}", escape(mismatch_text(r)))
    return table


def slowest_line(results: Sequence[EntryOutcome], count: int = 5,
                 labels: Mapping[str, str] | None = None) -> str:
    """The line after the table of ``qseries verify`` naming the ``count`` slowest entries
    with their seconds (empty when there are none).

    >>> from types import SimpleNamespace as Outcome
    >>> rs = [Outcome(ident=k, seconds=s) for k, s in [("a", 0.5), ("b", 12.25), ("c", 3.0)]]
    >>> slowest_line(rs, 2)
    'slowest: b (12.2 s), c (3.0 s)'
    >>> slowest_line([])
    ''
    """
    ranked = sorted(results, key=lambda r: r.seconds, reverse=True)[:count]
    if not ranked:
        return ""
    names = [labels.get(r.ident, r.ident) if labels else r.ident for r in ranked]
    return "slowest: " + ", ".join(f"{n} ({r.seconds:.1f} s)"
                                   for n, r in zip(names, ranked, strict=True))


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


def row_label(row: Mapping[str, Any]) -> str:
    """The identifier of a row of ``qseries list``, with a family's parameter ranges.

    >>> row_label({"id": "andrews-gordon", "params": {"k": "2..5", "i": "1..k"}})
    'andrews-gordon k=2..5 i=1..k'
    >>> row_label({"id": "euler"})
    'euler'
    """
    params = row.get("params") or {}
    return " ".join([row["id"], *(f"{n}={r}" for n, r in params.items())])


def listing_table(rows: Sequence[Mapping[str, Any]]) -> Table:
    """The table of ``qseries list`` from :func:`~qseries.report.json_shapes.listing_rows`:
    identifier (with a family's parameter ranges), members, title, source.

    >>> table = listing_table([{"id": "euler", "members": 1, "title": "Euler",
    ...                         "source": "from memory"}])
    >>> [list(c.cells) for c in table.columns]
    [['euler'], ['1'], ['Euler'], ['from memory']]
    """
    from rich.markup import escape
    from rich.table import Table

    table = Table()
    for col in ("identifier", "members", "title", "source"):
        table.add_column(col, overflow="fold")
    for row in rows:
        table.add_row(escape(row_label(row)), str(row["members"]), escape(row["title"]),
                      escape(row["source"]))
    return table


def listing_line(row: Mapping[str, Any]) -> str:
    """One entry of ``qseries list`` as a line, for a pipe or a file (where a table would
    break identifiers across lines): identifier (with a family's parameter ranges),
    members, title and source, two spaces apart.

    >>> listing_line({"id": "euler", "members": 1, "title": "Euler", "source": "L. Euler"})
    'euler  1  Euler  L. Euler'
    """
    return "  ".join([row_label(row), str(row["members"]), row["title"], row["source"]])


def sources_lines(rows: Sequence[Mapping[str, Any]]) -> list[str]:
    """The text of ``qseries list --sources``: each identifier (a family with its parameter
    ranges) and, indented under it, its citation, its note if it has one, and the entry it
    is the same identity as (with the substitution and the source of that equivalence).

    >>> sources_lines([{"id": "euler", "source": "L. Euler (1748)", "note": ""}])
    ['euler', '    L. Euler (1748)']
    >>> sources_lines([{"id": "a", "source": "s", "same_as": {"id": "b", "swap": False,
    ...                 "substitution": "q -> -q", "source": "DLMF 20.2"}}])[2]
    '    same as b under q -> -q: DLMF 20.2'
    """
    out: list[str] = []
    for row in rows:
        out.append(row_label(row))
        out.append(f"    {row['source']}")
        if row.get("note"):
            out.append(f"    note: {row['note']}")
        same = row.get("same_as")
        if same:
            how = [f"under {same['substitution']}"] if same.get("substitution") else []
            how += ["with the sides swapped"] if same.get("swap") else []
            out.append(f"    same as {same['id']}{' ' + ', '.join(how) if how else ''}: "
                       f"{same['source']}")
    return out


def listing_summary(rows: Sequence[Mapping[str, Any]]) -> str:
    """The line under the table of ``qseries list``: entries, and identities counting the
    members of families.

    >>> listing_summary([{"members": 1}, {"members": 14}])
    '2 entries, 15 identities counting family members'
    """
    return (f"{len(rows)} entries, {sum(row['members'] for row in rows)} identities counting "
            f"family members")


def verify_line(r: EntryOutcome, expect: str, label: str | None = None) -> str:
    """One finished entry of ``qseries verify`` as a line, printed as it finishes on a
    terminal: identifier, verdict, order, seconds and the first mismatch (if any).

    >>> from types import SimpleNamespace as Outcome
    >>> r = Outcome(ident="x", holds=False, ok=False, order=9, seconds=0.5, error="",
    ...             first_mismatch={"index": 2, "lhs": "1", "rhs": "0"})
    >>> verify_line(r, "holds", "fam k=2")
    'fam k=2  FAILS  order 9  0.50 s  q^2: 1 vs 0'
    """
    parts = [label or r.ident, entry_verdict_text(r, expect)]
    if not r.error:
        parts.append(f"order {coefficient_text(r.order)}")
    parts.append(f"{r.seconds:.2f} s")
    mismatch = mismatch_text(r)
    if mismatch:
        parts.append(mismatch)
    return "  ".join(parts)
