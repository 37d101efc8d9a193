"""Sparse Lambert-type terms against the direct reference (rings with integer
coefficients; over QQ the strategy does not apply)."""

import pytest

from qseries.series import GF, QQ, ZZ

from .strategy_helpers import both, count_results


@pytest.mark.parametrize("text", [
    "sum_{n>=1} q^n/(1-q^n)",
    "sum_{n>=1} n q^n/(1-q^n)",
    "1 + 4 sum_{n>=1} q^n/(1+q^(2n))",
    "sum_{n>=1} (-1)^n q^(n(n+1)/2)/(1+q^n)",
    "sum_{n>=1} q^n/(1-q^n)^2",
    "sum_{n>=1} q^n (1+q^n)/(1-q^n)^3",
    "sum_{n>=1} q^n/(1-3 q^n)",
    "sum_{n>=1} q^n/(2-q^n)",
    "sum_{n>=1} q^(2n)/(q^n - 1)",
    "sum_{n>=0} q^(n^2) (1 - q^(2n+1))",
    "q^-2 sum_{n>=1} q^n/(1-q^n)",
    "sum_{n>=1} q^(n-3)/(1-q^n)",
    # signs, weights and differences (issue 19, item 3)
    "sum_{n>=1} q^n/(1+(-q)^n)",
    "sum_{n>=1} n q^n/(1+(-q)^n)",
    "sum_{n>=1} n^3 q^n/(1-(-q)^n)",
    "sum_{n>=1} (-1)^n q^(2n+1)/(1-q^(3n+1))^2",
    "sum_{n>=1} (-1)^(n(n+1)/2) n^2 q^n/(1+q^(2n-1))^3",
    "sum_{n>=0} (q^(4n+1)/(1-q^(4n+1)) - q^(4n+3)/(1-q^(4n+3)))",
    "sum_{n>=1} (-q)^n/(1-q^n) + sum_{n>=1} q^(2n)/(q^n+1)",
    "sum_{n>=1} 2^n q^(n^2)/(1-q^n)",
    "sum_{n>=1} q^n (1 - q^n)/(1 + q^(2n))",
    "sum_{n>=1} ((-q)^n/(1-q^(2n)) + n q^(3n)/(1+q^n)^2)",
])
def test_lambert_terms_match_the_reference(text, monkeypatch):
    for ring in (ZZ, GF(1_000_003), GF(2**61 - 1)):
        seen = count_results(monkeypatch, None, "sum_lambert")
        for order in (7, 150):                           # no threshold in the order
            fast, slow = both(text, order, "lambert", ring)
            assert fast == slow, (text, ring, order)
        assert seen


def test_not_used_over_the_rationals(monkeypatch):
    seen = count_results(monkeypatch, None, "sum_lambert")
    fast, slow = both("sum_{n>=1} q^n/(1-q^n)", 60, "lambert", QQ)
    assert fast == slow and not seen


def test_every_term_of_the_signed_shapes_is_sparse(monkeypatch):
    # the pieces are read once and every term added as slices: the dense per-term path
    # (chains.apply_factors) is never taken
    import qseries.engine.sum_lambert as sum_lambert
    calls = []
    monkeypatch.setattr(sum_lambert.chains, "apply_factors",
                        lambda *a, **k: calls.append(a) or None)
    for text in ("sum_{n>=1} n q^n/(1+(-q)^n)",
                 "sum_{n>=0} (q^(4n+1)/(1-q^(4n+1)) - q^(4n+3)/(1-q^(4n+3)))",
                 "sum_{n>=1} (-1)^n n^2 q^n/(1-q^(2n))^2"):
        both_fast = both(text, 60, "lambert")[0]
        assert both_fast is not None
    assert not calls


def test_jacobi_four_squares_against_sympy():
    # Jacobi (Hardy and Wright, Thm. 386): theta_3(q)^4 = 1 + 8 sum_{n>=1} n q^n/(1+(-q)^n);
    # the coefficients are r_4(m), counted here by brute force
    from qseries.engine import Evaluator
    from qseries.lang import parse

    got = Evaluator(ZZ, strategies=["lambert"]).evaluate(
        parse("1 + 8 sum_{n>=1} n q^n/(1 + (-q)^n)"), 30)

    def r4(m: int) -> int:
        count = 0
        for a in range(-6, 7):
            for b in range(-6, 7):
                for c in range(-6, 7):
                    d2 = m - a * a - b * b - c * c
                    if d2 >= 0:
                        d = int(d2 ** 0.5 + 0.5)
                        if d * d == d2:
                            count += 1 if d == 0 else 2
        return count
    assert [got[m] for m in range(30)] == [r4(m) for m in range(30)]
