"""Products over a range rewritten to q-Pochhammer symbols (``pochhammer-form``) against the
reference walk factor by factor, in every ring, below and above the fast paths' thresholds
(``chooser.EXP_FACTORS`` factors for the exponential of the logarithm)."""

import pytest

import qseries.engine.prod_pochhammer as prod_pochhammer
from qseries.engine import Evaluator, chooser
from qseries.lang import parse
from qseries.series import GF, QQ, ZZ, laurent_ring

from .strategy_helpers import RINGS

SHAPES = [
    "prod_{n>=1} (1-q^n)",
    "prod_{n>=1} 1/(1-q^n)",
    "prod_{n>=1} (1+q^n)",
    "prod_{n>=1} (q^n + 1)^2",
    "prod_{n>=1} (-q^n + 1)",
    "prod_{n>=0} (1-q^(5n+1))(1-q^(5n+4))",
    "prod_{n>=0} 1/((1-q^(5n+1))(1-q^(5n+4)))",
    "prod_{n>=1} (1-q^(2n))/(1+q^(2n-1))^3",
    "prod_{n>=1} (1-q^n)^(-2)",
    "prod_{n>=1} (1-3q^(2n+1))",
    "prod_{n>=2} (1-q^(3n-5))",
    "prod_{n>=0} (1+q^n)",                       # a first factor 1 + 1 = 2
    "prod_{n=1}^{7} (1-q^n)",
    "prod_{n=3}^{40} 1/(1-q^n)",
    "prod_{n=1}^{1000} (1+q^(2n))",
    "(prod_{n>=1} (1-q^n)) (prod_{m>=1} (1+q^m)^2) / (prod_{j>=1} (1-q^(2j)))",
    "q^3 (prod_{n>=1} 1/(1-q^n)) - 2/(prod_{m>=1} (1+q^(2m)))",
    "sum_{k=0}^{6} q^k prod_{n=1}^{k} 1/(1-q^n)",      # bounds from an outer variable
    "sum_{k=0}^{4} prod_{n>=1} (1-q^(n+k))",
]


def forms_used(monkeypatch) -> list:
    seen: list = []
    original = prod_pochhammer.pochhammer_factors

    def spy(*args):
        got = original(*args)
        if got is not None:
            seen.append(got)
        return got

    monkeypatch.setattr(prod_pochhammer, "pochhammer_factors", spy)
    return seen


@pytest.mark.parametrize("text", SHAPES)
@pytest.mark.parametrize("order", [chooser.EXP_FACTORS // 2, 4 * chooser.EXP_FACTORS + 7])
def test_matches_the_walk_factor_by_factor(text, order, monkeypatch):
    for ring in RINGS:
        seen = forms_used(monkeypatch)
        fast = Evaluator(ring).evaluate(parse(text), order)
        slow = Evaluator(ring, strategies=["direct"]).evaluate(parse(text), order)
        assert fast == slow, (text, ring)
        assert fast.precision == slow.precision
        assert seen, text


def test_extra_variables():
    # (z q;q)_inf and (-z q^2;q^3)_inf^2 written as products over n, in the Laurent ring
    R = laurent_ring(["z"])
    for text in ("prod_{n>=1} (1 - z q^n)", "prod_{n>=0} (1 + z q^(3n+2))^2",
                 "prod_{n>=1} 1/(1 - z^2 q^n)"):
        fast = Evaluator(R).evaluate(parse(text), 30)
        slow = Evaluator(R, strategies=["direct"]).evaluate(parse(text), 30)
        assert fast == slow, text


def test_euler_pentagonal_from_the_product():
    # Euler's pentagonal number theorem (Andrews, The Theory of Partitions, Cor. 1.7):
    # prod (1 - q^n) = sum_k (-1)^k q^(k(3k-1)/2), the sum over all integers k
    left = Evaluator(ZZ).evaluate(parse("prod_{n>=1} (1-q^n)"), 300)
    right = Evaluator(ZZ).evaluate(parse("sum_{k=-20}^{20} (-1)^k q^(k(3k-1)/2)"), 300)
    assert left == right


@pytest.mark.parametrize("text", [
    "prod_{n>=1} (1-q^n)^n",             # exponent depends on n
    "prod_{n>=1} (1-n q^n)",             # coefficient depends on n
    "prod_{n>=1} (1-q^(n^2))",           # exponent not linear
    "prod_{n>=1} (2-q^n)",               # constant term not 1
    "prod_{n>=1} (1-q^n-q^(2n))",        # not a binomial
    "prod_{n>=1} (1-(-q)^n)",            # base -q
    "prod_{n>=0} 1/(1-q^n)",             # a pole at n = 0
])
def test_other_shapes_are_left_to_the_walk(text, monkeypatch):
    seen = forms_used(monkeypatch)
    ev = Evaluator(ZZ)
    try:
        fast = ev.evaluate(parse(text), 20)
    except Exception as why:          # the walk's own error (divergence, division by zero)
        with pytest.raises(type(why)):
            Evaluator(ZZ, strategies=["direct"]).evaluate(parse(text), 20)
    else:
        assert fast == Evaluator(ZZ, strategies=["direct"]).evaluate(parse(text), 20)
    assert not seen


def test_precision_is_that_of_the_cut_product():
    ev = Evaluator(ZZ)
    assert ev.evaluate(parse("prod_{n>=1} (1-q^n)"), 50).precision == 50
    assert ev.evaluate(parse("prod_{n=1}^{3} (1-q^n)"), 50).is_exact
    # a product cut at the order, then divided by q^5: the working order is raised
    got = ev.evaluate(parse("q^-5 prod_{n>=1} (1-q^n)"), 40)
    assert got.precision == 40
    assert got == Evaluator(ZZ, strategies=["direct"]).evaluate(
        parse("q^-5 prod_{n>=1} (1-q^n)"), 40)


def test_parts_leave_the_division_undone():
    ev = Evaluator(GF(1_000_003))
    num, den = ev.evaluate_parts(parse("prod_{n>=0} 1/((1-q^(5n+1))(1-q^(5n+4)))"), 40)
    assert den is not None
    assert (num * den.inverse(order=40)).truncate(40) == \
        Evaluator(GF(1_000_003)).evaluate(parse("1/((q;q^5)_inf (q^4;q^5)_inf)"), 40)


def test_rationals_keep_fractions(monkeypatch):
    seen = forms_used(monkeypatch)
    got = Evaluator(QQ).evaluate(parse("prod_{n>=1} (1 - q^n/2)"), 12)
    assert got == Evaluator(QQ, strategies=["direct"]).evaluate(parse("prod_{n>=1} (1 - q^n/2)"),
                                                                12)
    assert seen


def test_parts_of_a_product_without_denominators():
    ev = Evaluator(GF(1_000_003))
    num, den = ev.evaluate_parts(parse("prod_{n>=1} (1-q^n)"), 30)
    assert den is None and num == Evaluator(GF(1_000_003)).evaluate(parse("(q;q)_inf"), 30)
