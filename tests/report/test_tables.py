"""report.tables: the rich tables of verify and list."""

import io
from types import SimpleNamespace

from rich.console import Console

from qseries.report import listing_summary, listing_table, verify_summary, verify_table


def _text(table) -> str:
    console = Console(width=120, record=True, file=io.StringIO())
    console.print(table)
    return console.export_text()


def test_verify_table_rows():
    results = [
        SimpleNamespace(ident="a", holds=True, ok=True, order=30, seconds=0.126, error="",
                        first_mismatch=None),
        SimpleNamespace(ident="b", holds=False, ok=True, order=30, seconds=1.0, error="",
                        first_mismatch={"index": 7, "lhs": "1", "rhs": "2"}),
        SimpleNamespace(ident="c", holds=False, ok=False, order=0, seconds=0.0,
                        error="cannot parse\nmore", first_mismatch=None),
    ]
    table = verify_table(results, {"a": "holds", "b": "fails", "c": "holds"})
    cells = [list(c.cells) for c in table.columns]
    assert cells == [["a", "b", "c"], ["holds", "fails as recorded", "ERROR cannot parse"],
                     ["30", "30", "0"], ["0.13", "1.00", "0.00"], ["", "q^7: 1 vs 2", ""]]
    assert "first mismatch" in _text(table)


def test_listing_table_rows():
    rows = [{"id": "fam", "members": 3, "title": "F", "source": "src"}]
    table = listing_table(rows)
    assert [list(c.cells) for c in table.columns] == [["fam"], ["3"], ["F"], ["src"]]
    assert [c.header for c in table.columns] == ["identifier", "members", "title", "source"]


def test_summary_lines():
    ok, bad = SimpleNamespace(ok=True), SimpleNamespace(ok=False)
    assert verify_summary([ok, bad, ok], 12.34) == (
        "2 of 3 entries behave as recorded (12.3 s); agreement to O(q^N) is evidence, not a "
        "proof")
    assert verify_summary([ok], 0.0, interrupted=True).startswith(
        "1 of 1 finished entries behave as recorded")
    assert listing_summary([{"members": 3}, {"members": 1}]) == \
        "2 entries, 4 identities counting family members"
