"""The notebook display hook of the result classes (qseries/analysis/display.py)."""

import pytest

import qseries
from qseries.analysis import CheckResult, Distribution, ProductForm
from qseries.analysis.display import Displayed, register_display, rendered


def test_the_result_classes_render_through_the_table():
    for cls in (CheckResult, ProductForm, Distribution):
        assert issubclass(cls, Displayed)
    d = Distribution(2, {1: 1, 2: 1})
    assert d._repr_html_() == rendered(d, "html") and "<table>" in d._repr_html_()
    assert qseries.check("1", "1", order=2)._repr_latex_().startswith("$$")


def test_a_subclass_uses_its_own_renderer_first():
    class Loud(Distribution):
        pass

    d = Loud(2, {1: 1})
    assert "<table>" in d._repr_html_()              # inherited from Distribution
    register_display(Loud, "html", lambda x: "<b>loud</b>")
    assert d._repr_html_() == "<b>loud</b>"
    assert Distribution(2, {1: 1})._repr_html_() != "<b>loud</b>"


def test_nothing_registered_gives_none_and_jupyter_falls_back_to_text():
    class Plain(Displayed):
        pass

    assert Plain()._repr_html_() is None and Plain()._repr_latex_() is None
    with pytest.raises(ValueError, match="kind"):
        register_display(Plain, "png", str)
