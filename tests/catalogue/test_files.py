"""Identity files: loading, family expansion, and file:line errors for malformed files."""

import os
from pathlib import Path

import pytest

from qseries.catalogue import SHIPPED, IdentityFileError, load_entries, select
from qseries.catalogue.files import MAX_FILE_BYTES, MAX_MEMBERS

from .limits import deadline, memory_cap

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


# -- inputs that used to exhaust the machine or end in a traceback (issue 11 section 4) --

FAMILY = '''[[identity]]
key = "fam"
title = "a family"
left = "1/(1-q^$m)"
right = "1/(1-q^$m)"
params = PARAMS
order = 10
source = "invented for this test"
'''


@pytest.mark.parametrize("params", [
    '{ m = "1..10^9" }', '{ m = "1..10^18" }', '{ m = "1..2^62" }', '{ m = "-10^18..10^18" }',
    '{ a = "1..30", m = "1..30" }', '{ a = "1..10^18", m = "1..a" }',
    '{ a = "1..2", m = "1..10^18" }',
])
def test_huge_families_are_counted_before_they_are_expanded(tmp_path, params):
    path = write(tmp_path, FAMILY.replace("PARAMS", params))
    with deadline(20), pytest.raises(IdentityFileError) as info, memory_cap():
        load_entries([path])
    assert str(info.value).startswith(f"{path}:6:"), info.value
    assert f"more than {MAX_MEMBERS} family members" in str(info.value)


def test_the_largest_allowed_family_and_an_empty_one(tmp_path):
    largest = FAMILY.replace("PARAMS", f'{{ m = "1..{MAX_MEMBERS}" }}')
    entries = load_entries([write(tmp_path, largest)])
    assert len(entries) == MAX_MEMBERS and entries[-1].ident == f"fam[m={MAX_MEMBERS}]"
    assert load_entries([write(tmp_path, FAMILY.replace("PARAMS", '{ m = "3..1" }'))]) == []


def test_template_work_is_bounded_across_the_members_of_a_family(tmp_path):
    # each member's template is cheap, 500 of them together are not
    text = FAMILY.replace("PARAMS", '{ m = "1..500" }').replace(
        'left = "1/(1-q^$m)"', 'left = "1/(1-q^$m) $repeat(j=1..200; $repeat(l=1..40;;);)"')
    path = write(tmp_path, text)
    with deadline(20), pytest.raises(IdentityFileError) as info:
        load_entries([path])
    assert str(info.value).startswith(f"{path}:4:"), info.value
    assert "steps" in str(info.value)


def test_a_fifo_is_refused_not_waited_on(tmp_path):
    write(tmp_path, GOOD, "good.toml")
    fifo = tmp_path / "pipe.toml"
    os.mkfifo(fifo)
    for paths in ([tmp_path], [fifo]):
        with deadline(10), pytest.raises(IdentityFileError) as info:
            load_entries(paths)
        assert str(info.value).startswith(f"{fifo}: not a regular file"), info.value


def test_devices_and_oversized_files_are_refused(tmp_path):
    dev = tmp_path / "zero.toml"
    dev.symlink_to("/dev/zero")
    with deadline(10), pytest.raises(IdentityFileError, match="not a regular file"):
        load_entries([dev])
    big = write(tmp_path, "#" * (MAX_FILE_BYTES + 1), "big.toml")
    with pytest.raises(IdentityFileError, match=f"larger than {MAX_FILE_BYTES} bytes"):
        load_entries([big])


@pytest.mark.parametrize("text, line, message", [
    ("identity = [5]\n", 1, "array of tables"),
    ("\n\nidentity = [[1]]\n", 3, "array of tables"),
    ("identity = [{}]\n", 1, "missing field 'key'"),
])
def test_identity_must_hold_tables(tmp_path, text, line, message):
    path = write(tmp_path, text)
    with pytest.raises(IdentityFileError) as info:
        load_entries([path])
    assert str(info.value).startswith(f"{path}:{line}:"), info.value
    assert message in str(info.value)


@pytest.mark.parametrize("value", ['"inf"', '"nan"', "1e400", "nan", "2.5", "[1]", "{a = 1}",
                                   "1979-05-27", "07:32:00", "true", '"1/0"', '"x"', '""',
                                   '"' + "9" * 100 + '"'])
def test_fails_at_must_be_an_exponent(tmp_path, value):
    text = GOOD.replace("order = 50", f"order = 50\nexpect = \"fails\"\nfails_at = {value}", 1)
    path = write(tmp_path, text)
    with pytest.raises(IdentityFileError) as info:
        load_entries([path])
    assert str(info.value).startswith(f"{path}:9:"), info.value
    assert "fails_at must be" in str(info.value)


@pytest.mark.parametrize("value, exponent", [("7", 7), ('"7"', 7), ('"-23/24"', "-23/24")])
def test_fails_at_as_integer_or_fraction(tmp_path, value, exponent):
    text = GOOD.replace("order = 50", f"order = 50\nexpect = \"fails\"\nfails_at = {value}", 1)
    entry = load_entries([write(tmp_path, text)])[0]
    assert entry.fails_at == exponent


def test_errors_live_in_the_error_module():
    from qseries import errors
    from qseries.catalogue import files, templates
    assert files.IdentityFileError is errors.IdentityFileError is IdentityFileError
    assert templates.TemplateError is errors.TemplateError
    assert issubclass(errors.IdentityFileError, errors.QSeriesError)
    assert issubclass(errors.TemplateError, errors.QSeriesError)
    assert errors.TemplateError("x", 3).position == 3


# -- a [definitions] table (issue 17) --

DEFINED = '''
[definitions]
"G(q)" = "1/((q;q^5)_inf (q^4;q^5)_inf)"
"H(q)" = "H0(q)"
"H0(q)" = "1/((q^2;q^5)_inf (q^3;q^5)_inf)"

[[identity]]
key = "forty-1-4"
title = "H(q) G(q^11) - q^2 G(q) H(q^11) = 1"
left = "H(q) G(q^11) - q^2 G(q) H(q^11)"
right = "1"
order = 200
source = "Berndt et al., Mem. AMS 188 (2007), no. 880, (1.4)"

[[identity]]
key = "rr-family"
title = "G and H at q^m"
left = "sum_{k>=0} q^($m k^2)/(q^$m;q^$m)_k"
right = "G(q^$m)"
params = { m = "1..3" }
order = 100
source = "Rogers-Ramanujan at q -> q^m (from memory)"
'''


def test_definitions_table_is_used_by_entries_and_family_templates(tmp_path):
    from qseries.catalogue import verify_entry
    entries = load_entries([write(tmp_path, DEFINED)])
    assert [e.ident for e in entries] == ["forty-1-4", "rr-family[m=1]", "rr-family[m=2]",
                                          "rr-family[m=3]"]
    assert entries[0].definitions[0] == "G(q) = 1/((q;q^5)_inf (q^4;q^5)_inf)"
    assert all(len(e.definitions) == 3 for e in entries)
    for e in entries:
        r = verify_entry(e)
        assert r.ok and r.holds, e.ident


def test_definitions_apply_to_their_own_file_only(tmp_path):
    write(tmp_path, DEFINED, "a.toml")
    write(tmp_path, GOOD.replace('right = "1/(q;q^2)_inf"', 'right = "1/G(q)"'), "b.toml")
    with pytest.raises(IdentityFileError) as info:
        load_entries([tmp_path])
    assert str(info.value).startswith(f"{tmp_path / 'b.toml'}:6:")
    assert "unknown function 'G'" in str(info.value)


@pytest.mark.parametrize("mutation, line, message", [
    (('"H(q)" = "H0(q)"', '"H(q)" = "H0(q)"\n"K(q)" = "L(q)"\n"L(q)" = "K(q^2)"'), 5,
     "cycle: K -> L -> K"),
    (('"H(q)" = "H0(q)"', '"H[q]" = "H0(q)"'), 4, "a definition reads NAME(q) = EXPRESSION"),
    (('"H(q)" = "H0(q)"', '"H(q)" = "J0(q)"'), 4, "unknown function 'J0'"),
    (('"H(q)" = "H0(q)"', '"H(q)" = "H0(q"'), 4, "expected ')'"),
    (('"H(q)" = "H0(q)"', '"phi(q)" = "H0(q)"'), 4, "already a name of the notation"),
    (('"H(q)" = "H0(q)"', '"H(q)" = 5'), 4, "must be a non-empty string"),
    (('"H(q)" = "H0(q)"', '"H(q, q)" = "H0(q)"'), 4, "appears twice"),
    (('"H(q)" = "H0(q)"', '"H(q)" = "H0(q)"\n"A0(q)" = "1/(1-q)"\n'
      + "\n".join(f'"A{k}(q)" = "A{k - 1}(q) A{k - 1}(q)"' for k in range(1, 40))), 17,
     "expands into more than"),
])
def test_bad_definitions_name_file_and_line(tmp_path, mutation, line, message):
    old, new = mutation
    assert old in DEFINED
    path = write(tmp_path, DEFINED.replace(old, new, 1))
    with deadline(20):
        with pytest.raises(IdentityFileError) as info:
            load_entries([path])
    text = str(info.value)
    assert text.startswith(f"{path}:{line}:"), text
    assert message in text, text


def test_definitions_must_be_a_table(tmp_path):
    path = write(tmp_path, 'definitions = ["G(q) = 1"]\n' + GOOD)
    with pytest.raises(IdentityFileError, match=r":1: definitions must be a table"):
        load_entries([path])
    # an inline table is a table; its errors point at its line
    path = write(tmp_path, '# functions\ndefinitions = { "G(q)" = "1/(1-q" }\n' + GOOD)
    with pytest.raises(IdentityFileError, match=r"f.toml:2: bad definition: expected"):
        load_entries([path])


def test_a_field_after_the_definitions_table_is_not_an_entry_field(tmp_path):
    # [definitions] after the entries: its lines are not taken for the last entry's fields
    text = GOOD.replace('"1/(q^$c;q)_inf"', '"1/(q^$c;q)_inf * F(q)/F(q)"') + \
        '\n[definitions]\n"F(q)" = "(q;q)_inf"\n'
    entries = load_entries([write(tmp_path, text)])
    assert entries[-1].definitions == ("F(q) = (q;q)_inf",)


# ---- same_as: an entry recorded as the same identity as another entry in another form ----

PAIR = '''
[[identity]]
key = "theta4"
title = "theta_4 as a product (Gauss)"
left = "sum_{n=-inf}^{inf} (-1)^n q^(n^2)"
right = "(q;q)_inf/(-q;q)_inf"
order = 60
source = "DLMF 20.2.4 and 20.5.4 at z = 0"

[[identity]]
key = "theta3"
title = "theta_3 as a product"
left = "sum_{n=-inf}^{inf} q^(n^2)"
right = "(q^2;q^2)_inf (-q;q^2)_inf^2"
order = 60
source = "DLMF 20.2.3 and 20.5.3 at z = 0"
same_as = { key = "theta4", substitution = "q -> -q", source = "theta_4(0,q) = theta_3(0,-q)" }

[[identity]]
key = "fam"
title = "A family"
left = "sum_{n>=0} q^($c n)/(q;q)_n"
right = "1/(q^$c;q)_inf"
params = { c = "1..2" }
order = 40
source = "from memory"
'''


def test_same_as_is_resolved_to_the_other_entry(tmp_path):
    entries = load_entries([write(tmp_path, PAIR)])
    s = {e.ident: e for e in entries}["theta3"].same_as
    assert (s.partner, s.substitution, s.swap) == ("theta4", "q -> -q", False)
    assert s.left == "sum_{n=-inf}^{inf} (-1)^n q^(n^2)"     # the other entry's sides
    assert s.where == f"{tmp_path / 'f.toml'}:17"
    # a family member by its id, and a family paired member by member with a family
    member = PAIR.replace('key = "theta4", substitution = "q -> -q"', 'key = "fam[c=2]"')
    assert load_entries([write(tmp_path, member)])[1].same_as.partner == "fam[c=2]"
    both = PAIR + "[[identity]]" + PAIR.split("[[identity]]")[3].replace('"fam"', '"fam2"').replace(
        'source = "from memory"', 'source = "x"\nsame_as = { key = "fam", source = "y" }')
    twins = [e for e in load_entries([write(tmp_path, both)]) if e.key == "fam2"]
    assert [e.same_as.partner for e in twins] == ["fam[c=1]", "fam[c=2]"]


@pytest.mark.parametrize("old, new, message", [
    ('key = "theta4", substitution', 'key = "nothing", substitution',
     "same_as names 'nothing', which is not an entry"),
    ('key = "theta4", substitution', 'key = "theta3", substitution', "names the entry itself"),
    ('key = "theta4", substitution', 'key = "fam", substitution',
     "'fam' is a family: name a member"),
    ('"q -> -q"', '"q -> 1 - q"', 'the substitution must read "q -> E"'),
    ('"q -> -q"', '"q -> q^(1/2)"', 'the substitution must read "q -> E"'),
    ('"q -> -q"', '"z -> -z"', 'the substitution must read "q -> E"'),
    ('"q -> -q"', '"q -> -q^"', 'the substitution must read "q -> E"'),
    ('substitution = "q -> -q", ', 'colour = "red", ', "unknown field 'colour' in same_as"),
    (', source = "theta_4(0,q) = theta_3(0,-q)"', "", "same_as needs source"),
    ('same_as = { key = "theta4", substitution = "q -> -q", source = "theta_4(0,q) = '
     'theta_3(0,-q)" }', 'same_as = "theta4"', "same_as must be a table"),
    ('substitution = "q -> -q"', 'swap = "yes"', "swap must be true or false"),
])
def test_same_as_errors_name_file_and_line(tmp_path, old, new, message):
    assert old in PAIR
    path = write(tmp_path, PAIR.replace(old, new, 1))
    with pytest.raises(IdentityFileError) as info:
        load_entries([path])
    assert str(info.value).startswith(f"{path}:17:"), str(info.value)
    assert message in str(info.value)


def test_same_as_may_name_an_entry_of_another_file(tmp_path):
    first, second = PAIR.split('[[identity]]\nkey = "theta3"')
    write(tmp_path, first, "a.toml")
    write(tmp_path, '[[identity]]\nkey = "theta3"' + second, "b.toml")
    assert {e.key: e.same_as for e in load_entries([tmp_path])}["theta3"].partner == "theta4"
    # b.toml alone: the partner is found in a file beside it, which is not listed itself
    alone = load_entries([tmp_path / "b.toml"])
    assert [e.key for e in alone] == ["theta3", "fam", "fam"]
    assert alone[0].same_as.left == "sum_{n=-inf}^{inf} (-1)^n q^(n^2)"
    # a sibling that cannot be read is skipped: the pair is then unresolved, an error
    write(tmp_path, first.replace("order = 60", "order = 0", 1), "a.toml")
    with pytest.raises(IdentityFileError, match="same_as names 'theta4', which is not an"):
        load_entries([tmp_path / "b.toml"])
