"""The nested (innermost-first) evaluation of long sums against the direct reference, in
every ring, across its thresholds: the number of terms (chooser.SPLIT_MIN_TERMS, shared
with binary splitting) and the degree budget beyond which splitting gives way to it."""

import pytest

from qseries.engine import Evaluator, chooser
from qseries.lang import parse
from qseries.series import ZZ

from .strategy_helpers import RINGS, both, count_results

TEXTS = [
    "sum_{n>=0} q^n/(q;q)_n",                              # Euler: 1/(q;q)_inf
    "sum_{n>=0} (-q;q)_n q^n/(q;q)_n",                     # the q-binomial theorem
    "sum_{n>=0} (-1)^n q^n (q;q^2)_n/(q^2;q^2)_n",
    "sum_{n>=0} 2^n q^(2n) / (q;q)_(2n)",
    "sum_{n>=1} q^(n-1) (q^3;q)_n/(q;q)_(n+1)",
    "sum_{n>=0} q^n/(2;q)_n",                              # a first factor 1 - 2 = -1
    "sum_{n=0}^{40} q^n/(q;q)_n",                          # a finite range
]


@pytest.mark.parametrize("text", TEXTS)
@pytest.mark.parametrize("order", [5, 120])
def test_nested_matches_the_reference_in_every_ring(text, order, monkeypatch):
    for ring in RINGS:
        seen = count_results(monkeypatch, None, "sum_nested")
        fast, slow = both(text, order, "nested", ring)
        assert fast == slow, (text, ring, order)
        assert seen or order <= 5, (text, ring)


@pytest.mark.parametrize("terms", [chooser.SPLIT_MIN_TERMS - 1, chooser.SPLIT_MIN_TERMS,
                                   chooser.SPLIT_MIN_TERMS + 1])
def test_the_number_of_terms_threshold(terms, monkeypatch):
    seen = count_results(monkeypatch, None, "sum_nested")
    text = f"sum_{{n=0}}^{{{terms - 1}}} q^n/(q;q)_n"
    fast, slow = both(text, 100, "nested")
    assert fast == slow
    assert bool(seen) == (terms >= chooser.SPLIT_MIN_TERMS)


def test_it_takes_over_where_splitting_gives_way(monkeypatch):
    # about N terms whose binomials add up to ~N^2/2 > SPLIT_DEGREE * N: splitting refuses,
    # the nested evaluation is next in the chooser's order (before stepping)
    splitting = count_results(monkeypatch, None, "sum_splitting")
    nested = count_results(monkeypatch, None, "sum_nested")
    got = Evaluator(ZZ).evaluate(parse("sum_{n>=0} q^n/(q;q)_n"), 300)
    assert not splitting and nested
    # Euler (Andrews, The Theory of Partitions, eq. (2.2.5) with z = q): 1/(q;q)_inf
    assert got == Evaluator(ZZ).evaluate(parse("1/(q;q)_inf"), 300)


def test_extra_variables_are_left_to_stepping(monkeypatch):
    from qseries.series import laurent_ring
    seen = count_results(monkeypatch, None, "sum_nested")
    R = laurent_ring(["z"])
    fast = Evaluator(R, strategies=["nested"]).evaluate(parse("sum_{n>=0} z^n q^n/(q;q)_n"), 30)
    slow = Evaluator(R, strategies=["direct"]).evaluate(parse("sum_{n>=0} z^n q^n/(q;q)_n"), 30)
    assert fast == slow and not seen


# -- over ZZ: the coefficient bound and the evaluation modulo word-size primes -------------

def _nested_parts(text, order, ring=ZZ):
    """(ratios, levels, w, last) of the nested evaluation of ``text``, as sum_nested
    computes them."""
    from qseries.engine import sum_nested as sn
    captured = {}
    original = sn.nest

    def spy(ring_, ratios, levels, w, last):
        captured.update(ratios=ratios, levels=levels, w=w, last=last)
        return original(ring_, ratios, levels, w, last)

    with pytest.MonkeyPatch.context() as mp:
        mp.setattr(sn, "NESTED_CRT_ORDER", 10**9)          # always the direct nest
        mp.setattr(sn, "nest", spy)
        value = Evaluator(ring, strategies=["nested"]).evaluate(parse(text), order)
    return captured, value


BOUND_TEXTS = TEXTS[:5] + [
    "sum_{n>=0} (-1)^n q^n/(q;q)_n",                       # cancellation: the bound is loose
    "sum_{n>=0} 3^n q^(2n)/(q^2;q^2)_n",
]


@pytest.mark.parametrize("text", BOUND_TEXTS)
def test_the_majorant_bounds_every_coefficient(text):
    from qseries.engine.sum_nested import majorant_bits, nest
    got, _ = _nested_parts(text, 400)
    exact = ZZ.coefficients(nest(ZZ, got["ratios"], got["levels"], got["w"], got["last"]))
    largest = max(abs(c) for c in exact).bit_length()
    bits = majorant_bits(got["ratios"], got["levels"], got["w"], got["last"])
    assert largest <= bits, (text, largest, bits)


def test_the_bound_is_close_for_euler():
    # Euler's sum is 1/(q;q)_inf (Andrews, The Theory of Partitions, eq. (2.2.5) with z = q):
    # its largest coefficient below q^w is p(w - 1) (FLINT's partition numbers); the
    # saddle-point bound is within a few bits of it, so no prime is wasted
    from qseries.backend import partitions_p
    from qseries.engine.sum_nested import majorant_bits
    got, _ = _nested_parts("sum_{n>=0} q^n/(q;q)_n", 3000)
    bits = majorant_bits(got["ratios"], got["levels"], got["w"], got["last"])
    true = partitions_p(2999).bit_length()
    assert true <= bits <= true + 16


@pytest.mark.parametrize("text", BOUND_TEXTS)
def test_the_evaluation_modulo_primes_matches_the_reference(text, monkeypatch):
    from qseries.engine import sum_nested as sn
    monkeypatch.setattr(sn, "WORD_BITS", 0)            # always modulo primes
    monkeypatch.setattr(sn, "NESTED_CRT_ORDER", 0)
    used = []
    original = sn.nest_crt
    monkeypatch.setattr(sn, "nest_crt", lambda *a: used.append(a[-1]) or original(*a))
    fast, slow = both(text, 500, "nested")
    assert fast == slow and used, text


@pytest.mark.parametrize("shift", [-1, 0, 1])
def test_the_order_threshold_of_the_primes(shift, monkeypatch):
    from qseries.engine import sum_nested as sn
    order = 300
    # the sum is needed modulo q^order (its first term is 1): w = order
    monkeypatch.setattr(sn, "NESTED_CRT_ORDER", order + shift)
    monkeypatch.setattr(sn, "WORD_BITS", 0)
    used = []
    original = sn.nest_crt
    monkeypatch.setattr(sn, "nest_crt", lambda *a: used.append(a[-1]) or original(*a))
    fast, slow = both("sum_{n>=0} (-q;q)_n q^n/(q;q)_n", order, "nested")
    assert fast == slow
    assert bool(used) == (order >= order + shift)


def test_the_word_threshold_of_the_primes(monkeypatch):
    # the q-binomial theorem (Andrews, The Theory of Partitions, eq. (2.2.1)):
    # sum (-q;q)_n q^n/(q;q)_n = (-q^2;q)_inf/(q;q)_inf; at order 2000 its coefficients
    # exceed a machine word, so the default thresholds go modulo primes; with the word
    # raised above the bound the integers are used directly; both agree with the product
    from qseries.engine import sum_nested as sn
    text = "sum_{n>=0} (-q;q)_n q^n/(q;q)_n"
    expected = Evaluator(ZZ).evaluate(parse("(-q^2;q)_inf/(q;q)_inf"), 2000)
    for word, modular in ((sn.WORD_BITS, True), (10**6, False)):
        used = []
        original = sn.nest_crt
        with pytest.MonkeyPatch.context() as mp:
            mp.setattr(sn, "WORD_BITS", word)
            mp.setattr(sn, "nest_crt",
                       lambda *a, used=used, original=original:
                       used.append(a[-1]) or original(*a))
            got = Evaluator(ZZ, strategies=["nested"]).evaluate(parse(text), 2000)
        assert got == expected
        assert bool(used) == modular
        if used:
            assert used[0] > sn.WORD_BITS


def test_the_ratios_are_read_once_for_several_primes(monkeypatch):
    # the modular method evaluates each side once per prime: the ratios of consecutive
    # terms (numbers and exponents, the same modulo every prime) are computed once
    from collections import OrderedDict

    from qseries.engine import sum_splitting as ss
    from qseries.series import GF
    calls = []
    original = ss._compute_ratios
    monkeypatch.setattr(ss, "_ratio_cache", OrderedDict())
    monkeypatch.setattr(ss, "_compute_ratios", lambda *a: calls.append(1) or original(*a))
    text = "sum_{n>=0} q^n/(q;q)_n"
    values = [Evaluator(GF(p)).evaluate(parse(text), 200) for p in (1_000_003, 2**61 - 1)]
    assert len(calls) == 1
    for v, p in zip(values, (1_000_003, 2**61 - 1), strict=True):
        assert v == Evaluator(GF(p), strategies=["direct"]).evaluate(parse(text), 200)


def test_heine_transformation_over_the_integers(monkeypatch):
    # Heine's first transformation (Gasper and Rahman, Basic Hypergeometric Series,
    # eq. (1.4.1)) with a = q^2, b = q^3, c = q^4, z = q:
    # 2phi1(q^2, q^3; q^4; q, q) = (q^3, q^3; q)_inf / (q^4, q; q)_inf 2phi1(q, q; q^3; q, q^3);
    # the left side is a sum of about N terms (nested, modulo primes over ZZ at this order)
    from qseries.engine import sum_nested as sn
    used = []
    original = sn.nest_crt
    monkeypatch.setattr(sn, "nest_crt", lambda *a: used.append(a[-1]) or original(*a))
    lhs = Evaluator(ZZ).evaluate(
        parse("sum_{n>=0} (q^2;q)_n (q^3;q)_n q^n/((q;q)_n (q^4;q)_n)"), 1200)
    rhs = Evaluator(ZZ, strategies=["direct"]).evaluate(
        parse("(q^3;q)_inf (q^3;q)_inf/((q^4;q)_inf (q;q)_inf) "
              "sum_{n>=0} (q;q)_n q^(3n)/(q^3;q)_n"), 1200)
    assert used and lhs == rhs
