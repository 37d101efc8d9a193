"""Family templates: substitution, arithmetic and repetition, never code execution."""

import pytest

from qseries.catalogue.templates import MAX_STEPS, Budget, TemplateError, expand_template
from qseries.errors import ParseError

from .limits import deadline


def test_substitution_and_arithmetic():
    assert expand_template("q^$a (q^$(2m+1-a);q^$m)_inf", {"a": 2, "m": 5}) == \
        "q^2 (q^9;q^5)_inf"


def test_repeat_and_nested_repeat():
    text = "$repeat(j=1..k; ($repeat(l=j..k; n$l; +))^2; +)"
    assert expand_template(text, {"k": 3}) == "(n1 + n2 + n3)^2 + (n2 + n3)^2 + (n3)^2"
    assert expand_template("x$repeat(j=2..1; y; +)x", {}) == "xx"


@pytest.mark.parametrize("text, error, message", [
    ("$zz", TemplateError, "unknown template parameter"),
    ("$(1/2)", TemplateError, "not an integer"),
    ("$repeat(j=1..2; a)", TemplateError, "three parts"),
    # the integer expression goes through the expression parser, which knows no strings
    ("$(__import__('os'))", ParseError, "unexpected character"),
    ("$repeat(j=1..3; $(", TemplateError, "unbalanced parentheses"),
    ("$repeat(j=1..10^9; xxxxxxxx; )", TemplateError, "at most"),
])
def test_bad_templates(text, error, message):
    with pytest.raises(error, match=message):
        expand_template(text, {"k": 2})


def _nested(levels: int, size: int, body: str = "") -> str:
    text = body
    for depth in range(levels):
        var = "abcdefgh"[depth]
        text = f"$repeat({var}=1..{size};{text};)"
    return text


@pytest.mark.parametrize("levels, size", [(3, 100), (4, 200), (8, 200)])
def test_nested_repeats_have_a_bounded_total_work(levels, size):
    # three levels of 100 took 11 s, four levels of 200 would have taken hours
    with deadline(10), pytest.raises(TemplateError, match=f"more than {MAX_STEPS} steps"):
        expand_template(_nested(levels, size), {})


def test_a_budget_is_shared_between_expansions():
    budget = Budget()
    text = _nested(2, 100)
    with pytest.raises(TemplateError, match="steps"):
        for _ in range(1000):
            expand_template(text, {}, budget)
    assert budget.left < 0


def test_many_substitutions_take_linear_time():
    # each $k used to re-add the lengths of everything expanded so far
    with deadline(5):
        assert expand_template("$k" * 40_000, {"k": 1}) == "1" * 40_000
