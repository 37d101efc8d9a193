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


def test_brackets_are_shown_not_read_as_markup():
    # a family member's id has brackets, which rich would take for markup and drop
    r = SimpleNamespace(ident="ag[k=3,i=1]", holds=True, ok=True, order=30, seconds=0.1,
                        error="", first_mismatch=None)
    assert "ag[k=3,i=1]" in _text(verify_table([r], {"ag[k=3,i=1]": "holds"}))
    assert "ag k=3 i=1" in _text(verify_table([r], {"ag[k=3,i=1]": "holds"},
                                              {"ag[k=3,i=1]": "ag k=3 i=1"}))
    row = {"id": "fam", "members": 2, "title": "[sic]", "source": "[Slater 1952]",
           "params": {"k": "1..2"}}
    text = _text(listing_table([row]))
    assert "fam k=1..2" in text and "[sic]" in text and "[Slater 1952]" in text


def test_slowest_entries_line():
    from qseries.report import slowest_line
    rs = [SimpleNamespace(ident=f"e{i}", seconds=float(i)) for i in range(8)]
    assert slowest_line(rs, 3) == "slowest: e7 (7.0 s), e6 (6.0 s), e5 (5.0 s)"
    assert slowest_line(rs[:1], 3, {"e0": "zero"}) == "slowest: zero (0.0 s)"


def test_sources_lines_show_ranges_and_notes():
    from qseries.report import sources_lines
    rows = [{"id": "fam", "source": "S", "params": {"k": "2..5", "i": "1..k"}},
            {"id": "bad", "source": "B", "note": "misprint"}]
    assert sources_lines(rows) == ["fam k=2..5 i=1..k", "    S", "bad", "    B",
                                   "    note: misprint"]
