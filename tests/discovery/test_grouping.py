"""Grouping trivially related hits: F(-q)'s exponents, and each relation checked by
evaluating both sides."""

import pytest
from hypothesis import given
from hypothesis import strategies as st

from qseries.analysis import check, product_form
from qseries.analysis.product_form import periodic_expression
from qseries.discovery import Criteria, Family, InlineEngine, group_hits, minus_q, run_scan
from qseries.discovery.examine import MemberOutcome


@given(st.lists(st.integers(-2, 2), min_size=1, max_size=6).filter(any))
def test_minus_q_matches_the_product_evaluated_at_minus_q(pattern):
    m = len(pattern)
    product = periodic_expression(m, pattern)
    # F(-q) through a definition, evaluated directly
    order = 12 * 2 * m + 2
    pf = product_form(check("F(-q)", "0", order=order,
                            definitions=[f"F(q) = {product}"]).lhs, order)
    assert pf.period is not None
    assert minus_q(tuple(pattern)) == tuple(pf.exponents[:pf.period])


@given(st.lists(st.integers(-3, 3), min_size=1, max_size=8).filter(any))
def test_minus_q_twice_is_the_identity(pattern):
    once = minus_q(tuple(pattern))
    twice = minus_q(once)
    m = len(pattern)
    # the same exponents, perhaps written over a multiple of the least period
    assert all(twice[i % len(twice)] == pattern[i % m] for i in range(4 * m * len(twice)))


def test_relations_hold_between_the_series():
    # members related by a constant (2), a power of q, q -> -q and both
    family = Family("$k q^$s sum_{n>=0} (-1)^($c n) q^(n^2)/(q^2;q^2)_n",
                    (("k", "1..2"), ("s", "0..1"), ("c", "0..1")))
    report = run_scan(family, Criteria(order=120), engine=InlineEngine())
    [group] = report.groups
    rep = group.representative
    assert rep.params == (("k", 1), ("s", 0), ("c", 0))
    assert len(group.related) == 7
    for r in group.related:
        arg = "-q" if r.sign < 0 else "q"
        claim = f"({r.factor}) q^({r.shift}) F({arg})"
        assert check(r.member.expression, claim, order=120,
                     definitions=[f"F(q) = {rep.expression}"]).holds is True, r


def test_equality_hits_group_by_their_right_side():
    a = MemberOutcome(0, (("b", 0),), "x", "hit", "1/(1-q)")
    b = MemberOutcome(1, (("b", 1),), "y", "hit", "1/(1-q)")
    c = MemberOutcome(2, (("b", 2),), "z", "hit", "1/(1-q^2)")
    groups = group_hits([a, b, c])
    assert [(g.representative.index, [r.member.index for r in g.related]) for g in groups] \
        == [(0, [1]), (2, [])]
    assert groups[0].related[0].equal


@pytest.mark.parametrize("shift", ["1/24", "-1/8"])
def test_a_fractional_power_of_q_is_never_turned_by_q_to_minus_q(shift):
    p = (-1, 0)
    a = MemberOutcome(0, (("b", 0),), "x", "hit", "p", pattern=p, shift=shift)
    b = MemberOutcome(1, (("b", 1),), "y", "hit", "p", pattern=minus_q(p), shift="0")
    c = MemberOutcome(2, (("b", 2),), "z", "hit", "p", pattern=p, shift="0")
    groups = group_hits([a, b, c])
    assert [[g.representative.index, *[r.member.index for r in g.related]] for g in groups] \
        == [[0], [1, 2]]
