"""Identity files: loading, family expansion, and file:line errors for malformed files."""

from pathlib import Path

import pytest

from qseries.catalogue import SHIPPED, IdentityFileError, load_entries, select

GOOD = '''
[[identity]]
key = "first"
title = "A first entry"
left = "(-q;q)_inf"
right = "1/(q;q^2)_inf"
order = 50
source = "from memory"
tags = ["euler"]

[[identity]]
key = "fam"
title = "A family"
left = "sum_{n>=0} q^($c n)/(q;q)_n"
right = "1/(q^$c;q)_inf"
params = { c = "1..3" }
order = 40
source = "from memory"
'''


def write(tmp_path: Path, text: str, name: str = "f.toml") -> Path:
    p = tmp_path / name
    p.write_text(text)
    return p


def test_loading_and_family_expansion(tmp_path):
    entries = load_entries([write(tmp_path, GOOD)])
    assert [e.ident for e in entries] == ["first", "fam[c=1]", "fam[c=2]", "fam[c=3]"]
    assert entries[2].left == "sum_{n>=0} q^(2 n)/(q;q)_n"
    assert entries[2].right == "1/(q^2;q)_inf"
    assert [e.ident for e in select(entries, ["euler"])] == ["first"]
    assert [e.ident for e in select(entries, ["fam[c=2]"])] == ["fam[c=2]"]


@pytest.mark.parametrize("mutation, line, message", [
    (("order = 50", "order = 50\ncolour = \"red\""), 8, "unknown field 'colour'"),
    (("source = \"from memory\"\ntags", "tags"), 2, "missing field 'source'"),
    (("right = \"1/(q;q^2)_inf\"", "right = \"1/(q;q^2\""), 6, "expected ')'"),
    (("order = 50", "order = 0"), 7, "order must be"),
    (("key = \"first\"", "key = \"First Entry\""), 3, "lowercase"),
    (("params = { c = \"1..3\" }", "params = { c = \"1..x\" }"), 16, "range of c"),
    (("q^($c n)", "q^($d n)"), 14, "unknown template parameter"),
    (("order = 50", "order = 50\nexpect = \"fails\""), 8, "needs fails_at"),
    (("order = 50", "order = 50\nweights = { z = -1 }"), 8, "weights must be"),
    (("order = 50", "order = 50\nweights = { zz = 1 }"), 8, "weights must be"),
    (("order = 50", "order = 50\nweights = { z = 1 }"), 8, "'z' is not an extra variable"),
])
def test_errors_name_file_and_line(tmp_path, mutation, line, message):
    old, new = mutation
    assert old in GOOD
    path = write(tmp_path, GOOD.replace(old, new, 1))
    with pytest.raises(IdentityFileError) as info:
        load_entries([path])
    text = str(info.value)
    assert text.startswith(f"{path}:{line}:"), text
    assert message in text


def test_duplicate_keys_and_dangling_corrections(tmp_path):
    write(tmp_path, GOOD, "a.toml")
    write(tmp_path, GOOD.split("[[identity]]")[1].join(["[[identity]]", ""]), "b.toml")
    with pytest.raises(IdentityFileError, match="already used"):
        load_entries([tmp_path])
    bad = GOOD.replace("tags = [\"euler\"]", "tags = [\"euler\"]\ncorrects = \"nothing\"")
    with pytest.raises(IdentityFileError, match="corrects 'nothing'"):
        load_entries([write(tmp_path / ".." / tmp_path.name, bad, "c.toml")])


def test_not_toml_and_missing_paths(tmp_path):
    with pytest.raises(IdentityFileError, match="not valid TOML"):
        load_entries([write(tmp_path, "[[identity]\nkey=")])
    with pytest.raises(IdentityFileError, match="no such file"):
        load_entries([tmp_path / "missing.toml"])


def test_shipped_catalogue_size_and_sources():
    entries = load_entries([SHIPPED])
    keys = {e.key for e in entries}
    assert len(keys) >= 60          # the catalogue issue asks for at least 60 entries
    assert len(entries) >= 150
    for e in entries:
        assert e.source.strip(), e.key


def test_weights_reach_the_check(tmp_path):
    from qseries.catalogue import verify_entries
    text = GOOD + """
[[identity]]
key = "heine-like"
title = "needs c of weight 2"
left = "sum_{k>=0} (c/b)^k q^k"
right = "1/(1 - c q/b)"
weights = { b = 1, c = 2 }
order = 10
source = "geometric series (from memory)"
"""
    entries = load_entries([write(tmp_path, text)])
    assert entries[-1].weights == (("b", 1), ("c", 2))
    assert all(r.ok for r in verify_entries(entries[-1:], jobs=1))
