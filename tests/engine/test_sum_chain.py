"""The chain strategy for nests of sums (dynamic programming over the chain of indices)
against the direct reference in every ring, across its threshold (chooser.CHAIN_MIN_DEPTH),
in each change of indices, and on published multi-sum identities against their products."""

import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from qseries.engine import Evaluator, chooser
from qseries.engine.sum_chain import nest_depth
from qseries.errors import QSeriesError
from qseries.lang import parse
from qseries.series import ZZ, laurent_ring

from .strategy_helpers import RINGS, both, count_results


def ag_free(k: int, i: int) -> str:
    """The Andrews-Gordon sum as the catalogue writes it: n_j >= 0 free, N_j = n_j + ... +
    n_(k-1), q^(N_1^2 + ... + N_(k-1)^2 + N_i + ... + N_(k-1)) / prod (q;q)_(n_j)."""
    n = [f"n{j}" for j in range(1, k)]
    big = ["(" + " + ".join(n[j:]) + ")" for j in range(k - 1)]
    expo = " + ".join(f"{b}^2" for b in big) + "".join(f" + {b}" for b in big[i - 1:])
    sums = " ".join(f"sum_{{{x}>=0}}" for x in n)
    return f"{sums} q^({expo}) / ({' '.join(f'(q;q)_{x}' for x in n)})"


def ag_chain(k: int, i: int) -> str:
    """The same sum over N_1 >= N_2 >= ... >= N_(k-1) >= 0 (the form of Andrews, The
    Theory of Partitions, Thm. 7.8)."""
    N = [f"m{j}" for j in range(1, k)]
    expo = " + ".join(f"{x}^2" for x in N) + "".join(f" + {x}" for x in N[i - 1:])
    dens = [f"(q;q)_({N[j]}-{N[j + 1]})" for j in range(k - 2)] + [f"(q;q)_{N[-1]}"]
    return f"sum_{{{'>='.join(N)}>=0}} q^({expo}) / ({' '.join(dens)})"


def ag_product(k: int, i: int) -> str:
    m = 2 * k + 1
    return f"(q^{i},q^{m - i},q^{m};q^{m})_inf/(q;q)_inf"


def chain_only(text: str, order: int, ring=ZZ):
    return Evaluator(ring, strategies=["chain"]).evaluate(parse(text), order)


# -- published identities ------------------------------------------------------------------
# Andrews-Gordon: G. E. Andrews, Proc. Nat. Acad. Sci. USA 71 (1974), 4082-4085; The Theory
# of Partitions (1976), Thm. 7.8 (the statement from memory, as in the catalogue)
@pytest.mark.parametrize("k,i", [(3, 1), (3, 2), (3, 3), (4, 1), (4, 2), (4, 4), (5, 1),
                                 (5, 3), (5, 5)])
def test_andrews_gordon_both_forms_equal_the_product(k, i, monkeypatch):
    seen = count_results(monkeypatch, None, "sum_chain")
    order = 160 if k < 5 else 120
    product = Evaluator(ZZ, strategies=["direct"]).evaluate(parse(ag_product(k, i)), order)
    assert chain_only(ag_free(k, i), order) == product
    assert chain_only(ag_chain(k, i), order) == product
    assert len(seen) == 2


# Bressoud's even-modulus analogue: D. M. Bressoud, Quart. J. Math. Oxford (2) 31 (1980),
# 385-399 (from memory, as in the catalogue): the last denominator is (q^2;q^2)_(n_(k-1))
@pytest.mark.parametrize("k,i", [(3, 1), (4, 2), (4, 4)])
def test_bressoud_equals_the_product(k, i, monkeypatch):
    seen = count_results(monkeypatch, None, "sum_chain")
    text = ag_free(k, i).replace(f"(q;q)_n{k - 1})", f"(q^2;q^2)_n{k - 1})")
    got = chain_only(text, 150)
    m = 2 * k
    assert got == Evaluator(ZZ).evaluate(parse(f"(q^{i},q^{m - i},q^{m};q^{m})_inf/(q;q)_inf"),
                                         150)
    assert seen


# Capparelli's identity (conjectured by S. Capparelli, proved by G. E. Andrews, "Schur's
# theorem, Capparelli's conjecture and q-trinomial coefficients", Contemp. Math. 166 (1994);
# Alladi-Andrews-Gordon 1995) in Andrews' form: partitions into distinct parts not
# congruent to +-1 modulo 6.  The double sum with (q^3;q^3)_j is that of S. Kanade and
# M. C. Russell (Staircases to analytic sum-sides, 2019) and K. Kursungoz (J. Combin.
# Theory Ser. A 165 (2019)); the statement from memory.
def test_capparelli_double_sum(monkeypatch):
    seen = count_results(monkeypatch, None, "sum_chain")
    text = "sum_{i>=0} sum_{j>=0} q^(2i^2+6i j+6j^2)/((q;q)_i (q^3;q^3)_j)"
    got = chain_only(text, 600)
    assert got == Evaluator(ZZ).evaluate(parse("(-q^2,-q^3,-q^4,-q^6;q^6)_inf"), 600)
    assert seen


# -- against the direct reference -----------------------------------------------------------
TEXTS = [
    # identity change of indices (two sums are always a chain)
    "sum_{i>=0} sum_{j>=0} q^(i^2+i j+j^2)/((q;q)_i (q;q)_j)",
    "sum_{i>=0} sum_{j>=0} (-1)^j 2^i q^(2i^2+6i j+6j^2+i)/((q;q)_i (q^3;q^3)_j)",
    "sum_{i>=1} sum_{j>=i} q^(i j + j)/(q;q)_j",
    "sum_{i>=0} sum_{j>=0} q^(i(i-1)/2 + j^2 + i j)/((q;q)_i (-q;q)_j (q;q)_(i+j))",
    # suffix sums (Andrews-Gordon as the catalogue writes it), with numbers
    "sum_{a>=0} sum_{b>=0} sum_{c>=0} (-1)^(a+b) q^((a+b+c)^2 + (b+c)^2 + c^2 + c)"
    " / ((q;q)_a (q;q)_b (q;q)_c)",
    # prefix (a chain written from the inside out), a lower limit beyond the outer index
    "sum_{m3>=0} sum_{m2>=m3+1} sum_{m1>=m2} q^(m1^2+m2^2+m3^2)/((q;q)_(m1-m2) "
    "(q^2;q^2)_(m2-m3) (q;q)_m3)",
    # constant factors and a power of q in front
    "(q;q)_inf q^-1 sum_{i>=0} sum_{j>=0} q^(i^2+j^2+1)/((q;q)_i (q;q)_j)",
    # q-Pochhammer symbols in the numerator, with two parameters
    "sum_{i>=0} sum_{j>=0} q^(2i^2+2j^2+i j) (q,-q^2;q^2)_j/(q;q)_(i+j)",
]


@pytest.mark.parametrize("text", TEXTS)
@pytest.mark.parametrize("order", [1, 9, 70])
def test_chain_matches_the_reference_in_every_ring(text, order, monkeypatch):
    for ring in RINGS:
        seen = count_results(monkeypatch, None, "sum_chain")
        fast, slow = both(text, order, "chain", ring)
        assert fast == slow, (text, ring, order)
        assert seen, (text, ring)


def test_extra_variables():
    R = laurent_ring(["z"])
    text = "sum_{i>=0} sum_{j>=0} z^i q^(i^2+i j+j^2)/((q;q)_i (z q;q)_j)"
    fast = Evaluator(R, strategies=["chain"]).evaluate(parse(text), 25)
    slow = Evaluator(R, strategies=["direct"]).evaluate(parse(text), 25)
    assert fast == slow


@pytest.mark.parametrize("depth", [chooser.CHAIN_MIN_DEPTH - 1, chooser.CHAIN_MIN_DEPTH,
                                   chooser.CHAIN_MIN_DEPTH + 1])
def test_the_depth_threshold(depth, monkeypatch):
    seen = count_results(monkeypatch, None, "sum_chain")
    names = [f"x{j}" for j in range(depth)]
    text = (" ".join(f"sum_{{{x}>=0}}" for x in names) + " q^("
            + " + ".join(f"{x}^2" for x in names) + ")/("
            + " ".join(f"(q;q)_{x}" for x in names) + ")")
    fast, slow = both(text, 60, "chain")
    assert fast == slow
    assert nest_depth(Evaluator(), parse(text)) == depth
    assert bool(seen) == (depth >= chooser.CHAIN_MIN_DEPTH)


DECLINED = [
    "sum_{i>=0} sum_{j>=0} q^(i^2 - i j + j^2)/(q;q)_i",      # a negative product of indices
    "sum_{i>=0} sum_{j>=0} q^(i^2+j^2) (q^i;q)_j",            # a parameter moving with i
    "sum_{i>=0} sum_{j>=0} q^(i^2+j^2-3j)",                   # E decreases along j at first
    "sum_{i>=0} sum_{j=0}^{5} q^(i^2+j)",                     # an upper limit
    "sum_{i>=0} sum_{j>=0} q^(i^2+j^2)/(q;q)_(j-i)",          # subscripts below 0
    # a rational parameter in a ZZ evaluation (regression, found by a fuzzing run: the
    # levels mixed fmpq and fmpz polynomials, a TypeError)
    "sum_{k>=0} sum_{n>=k} q^(n+k) (q/2;q)_(n-k)",
]


def _outcome(text: str, strategies=None):
    try:
        return Evaluator(ZZ, strategies=strategies).evaluate(parse(text), 40)
    except QSeriesError as why:       # what the other strategies make of it, unchanged
        return type(why).__name__


@pytest.mark.parametrize("text", DECLINED)
def test_shapes_it_declines_are_left_to_the_other_strategies(text, monkeypatch):
    seen = count_results(monkeypatch, None, "sum_chain")
    got = _outcome(text)
    assert not seen
    assert got == _outcome(text, ["direct"])


def test_a_nest_that_is_no_chain_leaves_its_inner_nests_to_it(monkeypatch):
    # i and k are not neighbours in any change of indices tried: the outer sum is summed
    # term by term, and each inner double sum (over j, k) is a chain
    seen = count_results(monkeypatch, None, "sum_chain")
    fast, slow = both("sum_{i>=0} sum_{j>=0} sum_{k>=0} q^(i^2+j^2+k^2+i k)", 50, "chain")
    assert fast == slow and seen


def test_the_modular_method_takes_it_too(monkeypatch):
    from qseries import check
    seen = count_results(monkeypatch, None, "sum_chain")
    got = check(ag_free(4, 2), ag_product(4, 2), 300, method="modular")
    assert got.holds and seen


# -- property: random chains against the reference -------------------------------------------
@st.composite
def nests(draw):
    depth = draw(st.integers(2, 3))
    names = ["a", "b", "c"][:depth]
    mode = draw(st.sampled_from(["free", "chain"]))
    sums = []
    for j, x in enumerate(names):
        if mode == "chain" and j > 0:
            sums.append(f"sum_{{{x}>={names[j - 1]}+{draw(st.integers(0, 1))}}}")
        else:
            sums.append(f"sum_{{{x}>={draw(st.integers(0, 2))}}}")
    expo = []
    for x in names:
        expo.append(f"{draw(st.integers(1, 3))}{x}^2 + {draw(st.integers(-1, 3))}{x}")
    for x, y in zip(names, names[1:], strict=False):
        expo.append(f"{draw(st.integers(0, 2))}{x} {y}")
    dens = []
    for j, x in enumerate(names):
        base = draw(st.sampled_from(["q;q", "q^2;q^2", "-q;q", "q^3;q"]))
        sub = x if mode == "free" or j == 0 else f"({x}-{names[j - 1]})"
        dens.append(f"({base})_{sub}")
    sign = draw(st.sampled_from(["", "(-1)^a ", "2^b "]))
    return " ".join(sums) + f" {sign}q^({' + '.join(expo)})/({' '.join(dens)})"


@given(nests(), st.integers(0, 30))
@settings(max_examples=25, deadline=None)
def test_random_chains_match_the_reference(text, order):
    try:
        slow = Evaluator(ZZ, strategies=["direct"]).evaluate(parse(text), order)
    except QSeriesError:
        # the reference's valuation analysis cannot bound some inner sums (q^(b^2 - b))
        assume(False)
    fast = Evaluator(ZZ, strategies=["chain"]).evaluate(parse(text), order)
    assert fast == slow, text


@settings(max_examples=60, deadline=None)
@given(st.lists(st.tuples(st.integers(0, 12), st.integers(0, 4),
                          st.lists(st.integers(-3, 3), min_size=0, max_size=8),
                          st.one_of(st.none(), st.integers(0, 14))),
                max_size=6),
       st.integers(1, 16))
def test_shifted_sum_is_the_plain_sum_of_the_shifted_terms(terms, budget):
    # the pair sums' addition from the largest shift down against adding the shifted series
    # one by one (Series arithmetic, which tracks each term's O(q^k))
    from qseries.engine.sum_chain import _shifted_sum
    from qseries.series import Series

    series = []
    for sh, start, coeffs, prec in terms:
        y = Series(ZZ, ZZ.poly(coeffs), start, 0, None if prec is None else start + prec)
        series.append((sh, y))
    want = Series.zero(ZZ, budget)
    for sh, y in series:
        want = want + y.shift(sh)
    got = _shifted_sum(ZZ, series, budget)
    assert got == want.truncate(budget)


@pytest.mark.parametrize("ring", RINGS)
@pytest.mark.parametrize("text", [
    ag_free(4, 2),
    ag_chain(4, 1),
    # parameters c q^e with c != 1 and e > 1, a factor to a power, a stepped numerator
    "sum_{i>=0} sum_{j>=0} q^(i^2 + i j + j^2) (-q^2;q)_j / ((q;q)_i (q^2;q^2)_j^2)",
    "sum_{i>=0} sum_{j>=i} 3^j q^(j^2) / ((q;q)_(j-i) (2q;q^2)_i)",
])
def test_horner_on_polynomials_equals_horner_on_series(text, ring, monkeypatch):
    # the chain's stepped sums on the ring's polynomials (_horner_polys) against the same
    # Horner's rule on Series (the fast path switched off), and both against direct
    import qseries.engine.sum_chain as chain

    calls = []
    original = chain._horner_polys

    def counting(*args):
        got = original(*args)
        calls.append(got is not None)
        return got

    monkeypatch.setattr(chain, "_horner_polys", counting)
    fast = chain_only(text, 60, ring)
    assert any(calls)
    monkeypatch.setattr(chain, "_horner_polys", lambda *args: None)
    assert chain_only(text, 60, ring) == fast
    assert Evaluator(ring, strategies=["direct"]).evaluate(parse(text), 60) == fast
