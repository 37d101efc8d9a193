"""Differential tests (issue 11): random expressions, evaluated by qseries and by the
independent reference in ``tests/reference`` (Python ints and Fractions, no qseries code).

Every coefficient qseries claims to know must be the reference's; a claimed precision must
be true (an O(q^e) of the input bounds it, whatever the offset); a value claimed exact must
have nothing beyond what qseries gives (the reference knows the value to a working precision
R well above the order, with infinite sums and products cut by its own bound); a verdict of
``check`` must be the reference's.  A refusal (QSeriesError) is accepted, except for the
pinned cases of the issue, which must evaluate.

The expected values come from the reference only; the pinned examples are the inputs of
issue 11 (found by a fuzzing campaign), where qseries marked a cut sum or product exact, and
the minimal forms of what this test found.  Hypothesis runs the generated examples only once
every @example passes.  QSERIES_DIFFERENTIAL_EXAMPLES sets how many: 300 evaluations and 200
checks when CI is set (as the hypothesis profile "ci" in conftest.py), 100 and 66 otherwise,
always the same ones.
"""

from __future__ import annotations

import os
from fractions import Fraction

import pytest
from hypothesis import HealthCheck, event, example, given, settings
from hypothesis import strategies as st

import qseries
from qseries import QSeriesError

from .reference.expressions import (
    Add,
    BigO,
    CheckCase,
    Div,
    Eta,
    EvalCase,
    Mono,
    Mul,
    Poch,
    Poly,
    Pow,
    Prod,
    Sub,
    Sum,
    gen_check,
    gen_eval,
    text,
)
from .reference.judge import judge_check, judge_value

#: a few hundred examples per run in CI, a hundred otherwise, always the same ones
#: (derandomize): CI stays deterministic
EXAMPLES = int(os.environ.get("QSERIES_DIFFERENTIAL_EXAMPLES",
                              "300" if os.environ.get("CI") else "100"))
CHECK_EXAMPLES = max(1, 2 * EXAMPLES // 3)
SETTINGS = settings(max_examples=EXAMPLES, derandomize=True, deadline=None, database=None,
                    suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much,
                                           HealthCheck.data_too_large])


class _Draw:
    """Feeds hypothesis' draws to the generators of tests/reference/expressions.py."""

    def __init__(self, draw: st.DrawFn) -> None:
        self.draw = draw

    def integer(self, lo: int, hi: int) -> int:
        return self.draw(st.integers(lo, hi))


@st.composite
def eval_cases(draw: st.DrawFn) -> EvalCase:
    return gen_eval(_Draw(draw))


@st.composite
def check_cases(draw: st.DrawFn) -> CheckCase:
    return gen_check(_Draw(draw))


# -- the inputs of issue 11 ------------------------------------------------------------------
def q(e: int) -> Mono:
    return Mono(1, e)


#: (sum_{k>=3} q^(k^2)/(q;q)_k)/(q^9 - q^10): the left side is 1 + 2q + ..., not 0
RR_TAIL = Div(Sum(3, None, 1, 0, 0, p=1), Sub(q(9), q(10)))
#: (prod_{n>=4} (1-q^n))/(q^3 - q^4): the coefficients at q^2..q^4 are -1, -2, -3
EULER_TAIL = Div(Prod(4, 1, 0), Sub(q(3), q(4)))
EULER_TAIL_WRONG = Add(Add(Add(q(-3), q(-2)), q(-1)), Mono(1, 0))
PROD_FROM_4 = Prod(4, 1, 0)                                      # 1 - q^4 - q^5 - ..., not exact
SUM_FROM_10 = Sum(10, None, 0, 1, 0)                             # q^10 + ..., not exactly 0
LONG_SUM = Div(Sum(10, 1000, 0, 1, 0), Sub(q(9), q(10)))         # q + 2q^2 + ..., not 0
ETA_PLUS_O = Add(Eta(1), BigO(12))                               # known below q^12, not 289/24
SUM_FROM_2 = Sum(2, None, 0, 1, 0)

ISSUE_TEXTS = [
    (RR_TAIL, "(sum_{k>=3} q^(k^2)/(q;q)_k)/(q^9 - q^10)"),
    (EULER_TAIL, "(prod_{n>=4} (1-q^n))/(q^3 - q^4)"),
    (EULER_TAIL_WRONG, "q^-3 + q^-2 + q^-1 + 1"),
    (PROD_FROM_4, "prod_{n>=4} (1-q^n)"),
    (SUM_FROM_10, "sum_{k>=10} q^k"),
    (LONG_SUM, "(sum_{k=10}^{1000} q^k)/(q^9-q^10)"),
    (ETA_PLUS_O, "eta(q) + O(q^12)"),
    (Poly(()), "0"),
]


@pytest.mark.parametrize(("node", "issue_text"), ISSUE_TEXTS)
def test_pinned_trees_are_the_issue_inputs(node, issue_text):
    assert text(node).replace(" ", "") == issue_text.replace(" ", "")


# -- evaluate ----------------------------------------------------------------------------------
def _claim(s: qseries.Series) -> tuple[Fraction | None, dict[Fraction, Fraction]]:
    p = s.precision
    terms = {Fraction(e): Fraction(s.coefficient(e)) for e, _ in s.terms()}
    return (None if p is None else Fraction(p)), terms


@SETTINGS
@example(EvalCase(PROD_FROM_4, 5, must_evaluate=True))
@example(EvalCase(SUM_FROM_10, 5, must_evaluate=True))
@example(EvalCase(LONG_SUM, 5, must_evaluate=True))
@example(EvalCase(ETA_PLUS_O, 30, must_evaluate=True))
@example(EvalCase(RR_TAIL, 5, must_evaluate=True))
@example(EvalCase(EULER_TAIL, 5, must_evaluate=True))
# found by this test (minimal forms; the reference's values in the comments):
# q + O(q^(1/2)): qseries says O(q), but the coefficient of q^(1/2) is unknown
@example(EvalCase(Add(Mono(1, 1), BigO(Fraction(1, 2))), 5))
# eta(q) - 2*q at order 1: q^(1/24) + O(q^(25/24)) claims 0 at q^1, where it is -2
@example(EvalCase(Sub(Eta(1), Mono(2, 1)), 1))
# eta(q) + sum_{k>=2} q^k at order 2: q^(1/24) - q^(25/24) + O(q^(49/24)) claims 0 at q^2
# (the cut sum, O(q^2), is moved to the offset 1/24 with its precision rounded up); it is 1
@example(EvalCase(Add(Eta(1), SUM_FROM_2), 2))
# O(q^2) + q^(7/2) at order 5: O(q^(5/2)), but nothing is known from q^2 on (commit
# 4e36ae7); with the offset work in progress the sum is right but (O(q^2) + q^(7/2))*1 is not
@example(EvalCase(Add(BigO(2), Mono(1, Fraction(7, 2))), 5))
@example(EvalCase(Mul(Add(BigO(2), Mono(1, Fraction(7, 2))), Mono(1, 0)), 5))
# (1 + O(q^(1/2)))^2 and 1/(q + O(q^(5/2))) at order 5: 1 + O(q) and q^-1 + O(q), but
# nothing is known from q^(1/2) on (for the inverse: 5/2 - 2*1)
@example(EvalCase(Pow(Add(Mono(1, 0), BigO(Fraction(1, 2))), 2), 5))
@example(EvalCase(Div(Mono(1, 0), Add(Mono(1, 1), BigO(Fraction(5, 2)))), 5))
# 1/(1;q)_inf^(-1): (1;q)_inf = 0 exactly, so its inverse is undefined (qseries refuses
# (1;q)_inf^(-1) and 1/(1-1)^(-1), but gives 0 here)
@example(EvalCase(Div(Mono(1, 0), Pow(Poch(1, 0, 1, None), -1)), 3))
@given(eval_cases())
def test_evaluate_agrees_with_the_reference(case: EvalCase):
    source = text(case.node)
    try:
        s = qseries.evaluate(source, case.order)
    except QSeriesError as err:
        if case.must_evaluate:
            raise AssertionError(f"{source!r} at order {case.order} was refused: {err}") from err
        event(f"refused: {type(err).__name__}")
        return
    prec, terms = _claim(s)
    verdict, message = judge_value(case.node, case.order, prec, terms, shown=repr(s))
    event(verdict)
    assert verdict != "fail", message


# -- check ---------------------------------------------------------------------------------------
@settings(SETTINGS, max_examples=CHECK_EXAMPLES)
@example(CheckCase(RR_TAIL, Poly(()), 5, "exact", must_evaluate=True))
@example(CheckCase(RR_TAIL, Poly(()), 5, "modular", must_evaluate=True))
@example(CheckCase(EULER_TAIL, EULER_TAIL_WRONG, 5, "exact", must_evaluate=True))
@example(CheckCase(EULER_TAIL, EULER_TAIL_WRONG, 5, "modular", must_evaluate=True))
# found by this test: "agree to O(q^(49/24))", but the coefficient of q^2 is unknown
@example(CheckCase(Add(Eta(1), BigO(2)), Eta(1), 3, "exact"))
@example(CheckCase(Add(Eta(1), BigO(2)), Eta(1), 3, "modular"))
# "agree to O(q)", but the coefficient of q^(1/2) is unknown
@example(CheckCase(Add(Mono(1, 0), BigO(Fraction(1, 2))), Mono(1, 0), 3, "exact"))
@given(check_cases())
def test_check_agrees_with_the_reference(case: CheckCase):
    left, right = text(case.left), text(case.right)
    try:
        r = qseries.check(left, right, order=case.order, method=case.method, seed=1)
    except QSeriesError as err:
        if case.must_evaluate:
            raise AssertionError(f"check {left!r} vs {right!r} was refused: {err}") from err
        event(f"refused: {type(err).__name__}")
        return
    assert Fraction(r.order_verified) <= case.order, r
    m = r.first_mismatch
    verdict, message = judge_check(
        case.left, case.right, case.order, r.holds, r.order_verified,
        None if m is None else (m.exponent, m.lhs, m.rhs), case.method)
    event(verdict)
    assert verdict != "fail", message
