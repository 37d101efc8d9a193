"""Pictures (qseries/report/plots.py): each is drawn into a real PNG or SVG file of
plausible size, and the data drawn are checked against values from outside the project."""

import math
import xml.etree.ElementTree as ET

import pytest
from sympy.functions.combinatorial.numbers import partition

from qseries import check, distributions, evaluate, product_form
from qseries.errors import ArgumentError, UnableError
from qseries.report.plots import (
    difference_plot,
    distribution_plot,
    exponents_plot,
    growth_plot,
)

PNG_MAGIC = b"\x89PNG\r\n\x1a\n"


def assert_png(path):
    data = path.read_bytes()
    assert data[:8] == PNG_MAGIC and data[12:16] == b"IHDR"
    width, height = int.from_bytes(data[16:20], "big"), int.from_bytes(data[20:24], "big")
    assert (width, height) == (800, 500) or (width, height) == (1600, 500)
    assert 5_000 < len(data) < 300_000
    return width, height


def assert_svg(path):
    root = ET.parse(path).getroot()          # well-formed XML
    assert root.tag.endswith("svg")
    assert 5_000 < path.stat().st_size < 2_000_000


def test_distribution_bars_have_area_one_under_the_normal_density(tmp_path):
    # Durfee squares of the partitions of 10: 10, 30, 2 (p(10) = 42, A000041)
    [d] = distributions("sum_{k>=0} z^k q^(k^2)/(q;q)_k^2", "z", [10])
    fig = distribution_plot(d, tmp_path / "d.png")
    assert_png(tmp_path / "d.png")
    ax = fig.axes[0]
    bars = ax.patches
    sd = math.sqrt(float(d.variance))
    assert len(bars) == 3
    assert sum(b.get_height() for b in bars) / sd == pytest.approx(1.0)  # spacing 1/sd
    curve = ax.lines[0].get_ydata()
    assert max(curve) == pytest.approx(1 / math.sqrt(2 * math.pi), rel=1e-4)
    legend = " ".join(t.get_text() for t in ax.get_legend().get_texts())
    assert "mean 1.81" in legend and "skewness" in legend and "kurtosis" in legend


def test_distribution_panels_side_by_side_and_svg(tmp_path):
    ds = distributions("1/(z*q;q)_inf", "z", [20, 40])
    fig = distribution_plot(ds, tmp_path / "two.svg")
    assert len(fig.axes) == 2
    assert_svg(tmp_path / "two.svg")
    with pytest.raises(ArgumentError, match="at most 6"):
        distribution_plot(distributions("1/(z*q;q)_inf", "z", list(range(5, 12))))


def test_growth_points_are_the_logarithms_of_the_partition_numbers(tmp_path):
    fig = growth_plot(evaluate("1/(q;q)_inf", 400), tmp_path / "g.png")
    assert_png(tmp_path / "g.png")
    xs, ys = fig.axes[0].lines[0].get_data()
    assert len(xs) == 399
    assert xs[99] == pytest.approx(10.0)                     # n = 100
    assert ys[99] == pytest.approx(math.log(partition(100)))  # p(100) from sympy
    # Hardy-Ramanujan: log p(n) / sqrt(n) increases to pi sqrt(2/3) = 2.565
    assert ys[99] / xs[99] < ys[-1] / xs[-1] < math.pi * math.sqrt(2 / 3)


def test_growth_refuses_what_it_cannot_draw():
    with pytest.raises(ArgumentError, match="q alone"):
        growth_plot(evaluate("(z q;q)_inf", 5))
    with pytest.raises(ArgumentError, match="no nonzero"):
        growth_plot(evaluate("1 + O(q^5)", 5))


def test_difference_of_a_failed_check(tmp_path):
    # Rogers-Ramanujan's second identity with a spurious factor 1/(q^20;q^20)_inf: the
    # difference is G(q) H'(q) ((q^20;q^20)_inf^-1 - 1), which starts at q^20 with -1
    r = check("sum_{k>=0} q^(k^2+k)/(q;q)_k",
              "1/((q^2;q^5)_inf (q^3;q^5)_inf (q^20;q^20)_inf)", order=120)
    fig = difference_plot(r, tmp_path / "c.svg")
    assert_svg(tmp_path / "c.svg")
    ax = fig.axes[0]
    xs, ys = ax.lines[0].get_data()
    diff = r.lhs - r.rhs
    assert list(xs) == [e for e, _ in diff.terms() if e < 120] and xs[0] == 20
    assert ys[0] == r.first_mismatch.difference == -1
    with pytest.raises(ArgumentError, match="agree"):
        difference_plot(check("1/(1-q)", "1/(1-q)", order=10))


def test_exponents_coloured_by_residue(tmp_path):
    # Rogers-Ramanujan: exponents -1 on n = 1, 4 mod 5, 0 elsewhere
    fig = exponents_plot(product_form("sum_{k>=0} q^(k^2)/(q;q)_k", 60), tmp_path / "p.png")
    assert_png(tmp_path / "p.png")
    lines = [line for line in fig.axes[0].lines if line.get_label().startswith("n =")]
    by_class = {int(line.get_label().split()[2]): set(line.get_ydata()) for line in lines}
    assert by_class == {0: {0}, 1: {-1}, 2: {0}, 3: {0}, 4: {-1}}
    # period 70 (q;q^7)(q;q^2)(q;q^5): a colour scale instead of 70 legend entries
    fig = exponents_plot(product_form("(q;q^7)_inf (q;q^2)_inf (q;q^5)_inf", 300))
    assert len(fig.axes) == 2 and fig.axes[1].get_ylabel() == "n mod 70"


def test_file_names_and_write_errors(tmp_path):
    [d] = distributions("1/(z*q;q)_inf", "z", [10])
    with pytest.raises(ArgumentError, match="PNG or SVG"):
        distribution_plot(d, tmp_path / "d.jpg")
    with pytest.raises(UnableError, match="cannot write"):
        distribution_plot(d, tmp_path / "missing" / "d.png")


def test_missing_matplotlib_is_a_clear_error(monkeypatch):
    import sys

    monkeypatch.setitem(sys.modules, "matplotlib.figure", None)
    [d] = distributions("1/(z*q;q)_inf", "z", [10])
    with pytest.raises(UnableError, match="pip install matplotlib"):
        distribution_plot(d)


def test_trend_of_the_number_of_parts(tmp_path):
    from sympy import divisor_count

    from qseries.report.plots import trend_plot

    ds = distributions("1/(z*q;q)_inf", "z", list(range(1, 201)))
    fig = trend_plot(ds, tmp_path / "t.svg", fit="sqrt-log")
    assert_svg(tmp_path / "t.svg")
    ns, means = fig.axes[0].lines[0].get_data()
    # the parts of all partitions of n number sum_{k=1}^n d(k) p(n-k) (each part size k
    # occurring j >= 1 times is counted through the divisors of jk)
    for n in (1, 17, 200):
        total = sum(int(divisor_count(k)) * int(partition(n - k)) for k in range(1, n + 1))
        assert means[n - 1] == pytest.approx(total / int(partition(n)))
    legend = fig.axes[0].get_legend().get_texts()[1].get_text()
    c = float(legend.split("c = ")[1].split()[0])
    # Erdos-Lehner: mean ~ sqrt(6n)/(2 pi) (log n + 2 gamma - log(pi^2/6)), so c is a little
    # above sqrt(6)/(2 pi) = 0.3898 at these n
    assert 0.39 < c < 0.47
    with pytest.raises(ArgumentError, match="fit must be"):
        trend_plot(ds, fit="cube")
