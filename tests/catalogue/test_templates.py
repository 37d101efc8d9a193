"""Family templates: substitution, arithmetic and repetition, never code execution."""

import pytest

from qseries.catalogue.templates import TemplateError, expand_template


def test_substitution_and_arithmetic():
    assert expand_template("q^$a (q^$(2m+1-a);q^$m)_inf", {"a": 2, "m": 5}) == \
        "q^2 (q^9;q^5)_inf"


def test_repeat_and_nested_repeat():
    text = "$repeat(j=1..k; ($repeat(l=j..k; n$l; +))^2; +)"
    assert expand_template(text, {"k": 3}) == "(n1 + n2 + n3)^2 + (n2 + n3)^2 + (n3)^2"
    assert expand_template("x$repeat(j=2..1; y; +)x", {}) == "xx"


@pytest.mark.parametrize("text", ["$zz", "$(1/2)", "$repeat(j=1..2; a)", "$(__import__('os'))",
                                  "$repeat(j=1..3; $(", "$repeat(j=1..10^9; xxxxxxxx; )"])
def test_bad_templates(text):
    with pytest.raises(Exception) as info:
        expand_template(text, {"k": 2})
    assert isinstance(info.value, (TemplateError,)) or "qseries" in type(info.value).__module__
