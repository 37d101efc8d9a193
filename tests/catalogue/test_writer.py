"""Identity files written by catalogue/writer.py read back through catalogue/files.py."""

import tomllib

from hypothesis import given
from hypothesis import strategies as st

from qseries.catalogue.files import load_file
from qseries.catalogue.writer import identity_file_text, toml_string


@given(st.text(max_size=40))
def test_any_string_survives_toml(text):
    assert tomllib.loads(f"x = {toml_string(text)}")["x"] == text


def test_a_written_file_loads_with_its_families_and_definitions(tmp_path):
    entries = [
        {"key": "rr", "title": "Rogers-Ramanujan \"1\"", "left": "G(q^$k)",
         "right": "1/((q^$k;q^$(5k))_inf (q^$(4k);q^$(5k))_inf)", "order": 80,
         "source": "Andrews 1976, Cor. 7.6 (from memory)", "tags": ["scan"],
         "params": {"k": "1..2"}, "note": "a\nb"},
        {"key": "euler", "title": "Euler", "left": "(-q;q)_inf", "right": "1/(q;q^2)_inf",
         "order": 60, "source": "from memory"},
    ]
    text = identity_file_text(entries, ["G(q) = sum_{n>=0} q^(n^2)/(q;q)_n"],
                              comment="two lines\nof comment")
    path = tmp_path / "w.toml"
    path.write_text(text)
    loaded = load_file(path)
    assert [e.ident for e in loaded] == ["rr[k=1]", "rr[k=2]", "euler"]
    assert loaded[1].left == "G(q^2)" and loaded[1].right == "1/((q^2;q^10)_inf (q^8;q^10)_inf)"
    assert loaded[0].note == "a\nb" and loaded[0].title == 'Rogers-Ramanujan "1"'
    assert loaded[0].definitions == ("G(q) = sum_{n>=0} q^(n^2)/(q;q)_n",)
    assert text.startswith("# two lines\n# of comment\n")


def test_unknown_fields_are_refused():
    import pytest

    from qseries.errors import IdentityFileError
    with pytest.raises(IdentityFileError, match="unknown field"):
        identity_file_text([{"key": "x", "colour": "red"}])
