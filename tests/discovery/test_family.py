"""Families: parameters, dependent ranges, constraints and their errors."""

import itertools

import pytest

from qseries.catalogue.files import load_file
from qseries.discovery import Family, parse_param
from qseries.discovery import family as family_module
from qseries.errors import ArgumentError, ParseError


def test_members_follow_the_ranges_in_order_with_dependent_ends():
    f = Family("$a $b", (("a", "1..3"), ("b", "a..2a")))
    expected = [((("a", a), ("b", b))) for a in range(1, 4) for b in range(a, 2 * a + 1)]
    assert list(f.members()) == expected


def test_constraints_are_all_applied():
    f = Family("$a $b", (("a", "0..4"), ("b", "0..4")), ("a < b", "a + b != 4", "2b <= 7"))
    brute = [(a, b) for a, b in itertools.product(range(5), repeat=2)
             if a < b and a + b != 4 and 2 * b <= 7]
    assert [(dict(p)["a"], dict(p)["b"]) for p in f.members()] == brute


@pytest.mark.parametrize("op, test", [("<=", lambda a, b: a <= b), (">=", lambda a, b: a >= b),
                                      ("==", lambda a, b: a == b), ("!=", lambda a, b: a != b),
                                      ("<", lambda a, b: a < b), (">", lambda a, b: a > b)])
def test_every_comparison(op, test):
    f = Family("$a", (("a", "-2..2"), ("b", "-1..1")), (f"a {op} b",))
    got = [tuple(v for _, v in p) for p in f.members()]
    assert got == [(a, b) for a in range(-2, 3) for b in range(-1, 2) if test(a, b)]


def test_members_expand_as_the_members_of_an_identity_file(tmp_path):
    template = "sum_{n>=0} q^(n^2+$(2b+1) n)/(q;q)_n $repeat(j=1..b; (q;q)_$j; )"
    f = Family(template, (("a", "0..1"), ("b", "a..2")))
    (tmp_path / "f.toml").write_text(
        f'[[identity]]\nkey = "f"\ntitle = "t"\nleft = "{template}"\nright = "1"\n'
        'order = 5\nsource = "s"\nparams = {a = "0..1", b = "a..2"}\n')
    entries = load_file(tmp_path / "f.toml")
    assert [e.params for e in entries] == list(f.members())
    assert [e.left for e in entries] == [f.expand(dict(p)) for p in f.members()]
    assert "q^(n^2+5 n)" in f.expand({"a": 0, "b": 2})


@pytest.mark.parametrize("spec", ["b", "b=1", "b=..3", "q=0..1", "b2=0..1", "=0..1"])
def test_bad_parameters_are_refused(spec):
    with pytest.raises(ArgumentError):
        parse_param(spec)


@pytest.mark.parametrize("constraint", ["a", "a <= <= b", "a < ", "a <= c", "a => b"])
def test_bad_constraints_are_refused(constraint):
    f = Family("$a", (("a", "0..1"),), (constraint,))
    with pytest.raises(ArgumentError):
        list(f.members())


def test_a_template_without_parameters_is_refused():
    with pytest.raises(ArgumentError, match="uses no parameter") as err:
        Family("sum_{n>=0} q^(n^2)/(q;q)_n", (("b", "0..1"),))
    # the usual cause: the template in double quotes, where the shell replaced $b by nothing
    assert "single quotes" in str(err.value)


def test_a_range_end_with_an_unknown_name_is_refused():
    with pytest.raises(ArgumentError, match=r"--param a=0\.\.c"):
        Family("$a", (("a", "0..c"),)).assignments()


def test_huge_families_are_refused_before_any_member_is_made(monkeypatch):
    f = Family("$a $b", (("a", "1..10^9"), ("b", "1..10^9")))
    with pytest.raises(ArgumentError, match="more than"):
        f.assignments()
    monkeypatch.setattr(family_module, "MAX_SCAN_MEMBERS", 6)
    assert len(Family("$a", (("a", "1..6"),)).assignments()) == 6
    with pytest.raises(ArgumentError, match="more than 6"):
        Family("$a", (("a", "1..7"),)).assignments()


@pytest.mark.parametrize(("ranges", "constraints", "text", "position"), [
    ((("a", "0..3"), ("b", "0..(a")), (), "b=0..(a", 7),
    ((("a", " 2*)..3"),), (), "a= 2*)..3", 5),
    ((("a", "0..3"),), ("a + 1 <= (2 a",), "a + 1 <= (2 a", 13),
    ((("a", "0..3"),), ("a +* 1 <= 2",), "a +* 1 <= 2", 3),
])
def test_a_syntax_error_is_placed_in_the_range_or_constraint_as_typed(ranges, constraints,
                                                                       text, position):
    # found by a trial: the column counted in one end of a range or one side of a
    # constraint, not in the text given
    with pytest.raises(ParseError) as caught:
        list(Family("$a", ranges, constraints).members())
    assert (caught.value.text, caught.value.position) == (text, position)


def test_an_end_that_is_no_number_names_the_range_and_its_column():
    with pytest.raises(ArgumentError, match=r"--param a=0\.\.x: .*column 6"):
        Family("$a", (("a", "0..x"),)).assignments()
    with pytest.raises(ArgumentError, match=r"constraint 'a <= 2 x' at .*column 8"):
        list(Family("$a", (("a", "0..1"),), ("a <= 2 x",)).members())

