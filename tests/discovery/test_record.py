"""The progress record: what a resumed scan reads back."""

import json

import pytest

from qseries.discovery import Criteria, Family, ScanRecord, progress_path, record_header
from qseries.discovery.examine import MemberOutcome
from qseries.errors import QSeriesError

HEADER = record_header(Family("$a", (("a", "0..9"),)), Criteria(order=20))
OUTCOMES = [MemberOutcome(0, (("a", 0),), "e0", "hit", "(q;q)_inf", pattern=(1,),
                          constant="-1/2", shift="3/8", stage="confirm"),
            MemberOutcome(1, (("a", 1),), "e1", "failed", reason="bad \"text\"\nhere",
                          stage="evaluation"),
            MemberOutcome(2, (("a", 2),), "e2", "rejected", reason="no period")]


def _write(path):
    with ScanRecord.create(path, HEADER) as rec:
        rec.append(OUTCOMES[:2])
        rec.append(OUTCOMES[2:])


def test_every_field_comes_back(tmp_path):
    path = tmp_path / "r"
    _write(path)
    with ScanRecord.resume(path, HEADER) as rec:
        assert [rec.finished[i] for i in range(3)] == OUTCOMES


def test_a_line_cut_short_is_dropped_and_overwritten(tmp_path):
    path = tmp_path / "r"
    _write(path)
    text = path.read_text()
    path.write_text(text + '{"index": 3, "par')           # killed while writing
    with ScanRecord.resume(path, HEADER) as rec:
        assert sorted(rec.finished) == [0, 1, 2]
        rec.append([MemberOutcome(3, (("a", 3),), "e3", "rejected")])
    with ScanRecord.resume(path, HEADER) as rec:
        assert sorted(rec.finished) == [0, 1, 2, 3]
    assert all(json.loads(line) for line in path.read_text().splitlines())


def test_a_damaged_line_is_an_error_with_its_line(tmp_path):
    path = tmp_path / "r"
    _write(path)
    lines = path.read_text().splitlines(keepends=True)
    lines[2] = "garbage\n"
    path.write_text("".join(lines))
    with pytest.raises(QSeriesError, match=r":3: damaged record"):
        ScanRecord.resume(path, HEADER)


def test_an_existing_record_is_not_overwritten(tmp_path):
    path = tmp_path / "r"
    _write(path)
    before = path.read_bytes()
    with pytest.raises(QSeriesError, match="--resume"):
        ScanRecord.create(path, HEADER)
    assert path.read_bytes() == before


def test_nothing_to_resume_or_not_a_record(tmp_path):
    with pytest.raises(QSeriesError, match="nothing to resume"):
        ScanRecord.resume(tmp_path / "none", HEADER)
    (tmp_path / "other").write_text("[[identity]]\n")
    with pytest.raises(QSeriesError, match="not the progress record"):
        ScanRecord.resume(tmp_path / "other", HEADER)


def test_the_record_sits_next_to_the_output(tmp_path):
    assert progress_path(tmp_path / "hits.toml") == tmp_path / "hits.toml.progress"


def test_a_failed_write_is_a_clear_error(tmp_path):
    class Full:
        def write(self, text):
            raise OSError(28, "No space left on device")

        def flush(self):
            pass

        def close(self):
            pass

    rec = ScanRecord(tmp_path / "r", Full(), {})
    with pytest.raises(QSeriesError, match="No space left on device.*--resume"):
        rec.append(OUTCOMES[:1])
    assert rec.finished == {}
