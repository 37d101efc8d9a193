"""Progress of one evaluation (qseries/engine/progress.py): the top-level sums and
products of an expression, each reported once with the counts done/total, in order, to
a callback passed to the evaluator (never global state)."""

import pytest

from qseries.engine import Evaluator, evaluate
from qseries.engine.progress import PartTracker, top_parts
from qseries.errors import ArgumentTypeError, DomainError
from qseries.lang import parse, show
from qseries.series import GF, ZZ

# Rogers-Ramanujan, first identity (Andrews, The Theory of Partitions, Cor. 7.9)
RR_SUM = "sum_{k>=0} q^(k^2)/(q;q)_k"
RR_PRODUCT = "1/((q;q^5)_inf (q^4;q^5)_inf)"


def recorder():
    said = []
    return said, lambda text, done, total: said.append((text, done, total))


def test_the_parts_are_the_outermost_sums_and_products_in_the_order_written():
    node = parse(f"2 {RR_SUM} - prod_{{n>=1}} (1 - q^n) + theta_3(q^2) (q^2;q^2)_inf^3")
    assert [show(p) for p in top_parts(node)] == [
        show(parse(RR_SUM)), show(parse("prod_{n>=1} (1 - q^n)")), "theta_3(q^2)",
        "(q^2;q^2)_inf"]
    # the (q;q)_k inside the sum is no part of its own; a product of numbers is none
    assert top_parts(parse("prod_{k=1}^{5} k + 1/(1-q)")) == []
    # a dissection is seen through
    assert [show(p) for p in top_parts(parse("[q^(5n+4)] 1/(q;q)_inf"))] == ["(q;q)_inf"]


def test_the_same_text_twice_is_two_parts():
    node = parse("(q;q)_inf + (q;q)_inf")
    said, report = recorder()
    Evaluator(ZZ, progress=report).evaluate(node, 10)
    assert said == [("(q;q)_inf", 1, 2), ("(q;q)_inf", 2, 2)]


@pytest.mark.parametrize("how", ["evaluate", "evaluate_parts"])
@pytest.mark.parametrize("ring", [ZZ, GF(2**61 - 1)], ids=["ZZ", "GF(p)"])
def test_each_part_is_reported_once_with_counts_in_order(how, ring):
    text = f"{RR_SUM} - {RR_PRODUCT} + (q^2;q^2)_inf / (q;q)_inf^2"
    node = parse(text)
    said, report = recorder()
    ev = Evaluator(ring, progress=report)
    got = getattr(ev, how)(node, 300)
    parts = top_parts(node)
    assert len(parts) == 5
    assert [(d, t) for _, d, t in said] == [(i, 5) for i in range(1, 6)]
    assert sorted(text for text, _, _ in said) == sorted(show(p) for p in parts)
    # the progress changes nothing in the value
    assert got == getattr(Evaluator(ring), how)(node, 300)


def test_the_sum_is_reported_as_evaluated_before_the_product_after_it():
    said, report = recorder()
    evaluate(f"{RR_SUM} - {RR_PRODUCT}", 200, progress=report)
    assert said[0] == (show(parse(RR_SUM)), 1, 3)
    assert [d for _, d, _ in said] == [1, 2, 3]


def test_parts_evaluated_together_are_still_counted():
    # (q;q^5)_inf (q^4;q^5)_inf is evaluated as one pair (Jacobi's triple product,
    # engine.triple_pairs), not each symbol through the cache: both are reported at the end
    said, report = recorder()
    evaluate(RR_PRODUCT, 100, progress=report)
    assert [(t, d, n) for t, d, n in said] == [("(q;q^5)_inf", 1, 2), ("(q^4;q^5)_inf", 2, 2)]


def test_a_precision_retry_reports_no_part_twice():
    # dividing by (1 - (q;q)_inf)^2, of valuation 2, loses two coefficients: the whole
    # expression is evaluated again at a higher working order
    node = parse("(q;q^2)_inf / (1 - (q;q)_inf)^2")
    said, report = recorder()
    ev = Evaluator(ZZ, progress=report)
    orders = []
    value = ev.value

    def spy(n, env, order):
        if n is node:
            orders.append(order)
        return value(n, env, order)

    ev.value = spy
    ev.evaluate(node, 10)
    assert len(orders) == 2                      # the retry happened
    assert said == [("(q;q^2)_inf", 1, 2), ("(q;q)_inf", 2, 2)]


def test_evaluators_keep_their_own_callbacks():
    first, report_first = recorder()
    second, report_second = recorder()
    a = Evaluator(ZZ, progress=report_first)
    b = Evaluator(ZZ, progress=report_second)
    a.evaluate(parse("(q;q)_inf"), 10)
    b.evaluate(parse("(q;q^2)_inf (q^2;q^4)_inf"), 10)
    Evaluator(ZZ).evaluate(parse("(q^3;q^3)_inf"), 10)     # no callback: nobody told
    assert first == [("(q;q)_inf", 1, 1)]
    assert [d for _, d, _ in second] == [1, 2] and {t for t, _, _ in second} == {
        "(q;q^2)_inf", "(q^2;q^4)_inf"}
    # a second evaluation with the same evaluator counts its own parts afresh
    a.evaluate(parse("(q;q)_inf (q^2;q^2)_inf"), 10)
    assert [(d, t) for _, d, t in first] == [(1, 1), (1, 2), (2, 2)]


def test_a_failed_evaluation_reports_no_more():
    said, report = recorder()
    with pytest.raises(DomainError):
        evaluate("(q;q)_inf + sum_{k>=0} 1/(q;q)_k", 10, progress=report)
    assert said == [("(q;q)_inf", 1, 2)]        # the sum that failed is not reported


def test_an_interrupt_from_the_callback_stops_the_evaluation():
    def stop(_text, _done, _total):
        raise KeyboardInterrupt
    ev = Evaluator(ZZ, progress=stop)
    with pytest.raises(KeyboardInterrupt):
        ev.evaluate(parse("(q;q)_inf"), 10)
    assert ev.parts is None          # the tracker is gone: the evaluator is reusable


def test_the_tracker_ignores_nodes_that_are_not_parts():
    node = parse(RR_SUM)
    said, report = recorder()
    tracker = PartTracker(node, report)
    tracker.finished(parse(RR_SUM))          # equal, but another node
    assert said == []
    tracker.finished(node)
    tracker.finished(node)
    tracker.finish()
    assert said == [(show(node), 1, 1)]


def test_progress_must_be_callable():
    with pytest.raises(ArgumentTypeError, match="progress must be a function"):
        evaluate("(q;q)_inf", 5, progress=3)
