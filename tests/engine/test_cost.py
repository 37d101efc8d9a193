"""The estimate of a run's cost (engine.cost): probes at small orders, extrapolated."""

import pytest

from qseries.engine import cost
from qseries.engine.chooser import COST_CHECK_ORDER
from qseries.engine.cost import CostEstimate, estimate_cost, footprint
from qseries.series import GF, Series


def test_no_probe_below_the_order_where_estimates_start(monkeypatch):
    monkeypatch.setattr(cost, "evaluate", lambda *a: pytest.fail("probed"))
    assert estimate_cost("1/(q;q)_inf", COST_CHECK_ORDER - 1) is None


def test_probes_double_and_stop_at_a_quarter_of_the_order(monkeypatch):
    seen = []

    def fake(node, n, ring, weights):
        seen.append(n)
        return Series.from_int_list([1] * n, GF(101), prec=n)

    monkeypatch.setattr(cost, "evaluate", fake)
    monkeypatch.setattr(cost.time, "perf_counter", iter(range(10**6)).__next__)
    # each probe "takes" 1 s, above PROBE_SECONDS: a smaller probe is added for the fit
    est = estimate_cost("(q;q)_inf", 10**6)
    assert seen == [1024, 256]
    # time 1 s at both probes: growth clamped to 1; size 4x for 4x the order: exponent 1
    assert est.probe_order == 1024 and est.seconds == pytest.approx(10**6 / 1024)
    assert est.bytes == pytest.approx(8 * 10**6, rel=1e-3)


def test_the_fitted_exponent_extrapolates_a_quadratic_cost(monkeypatch):
    clock = [0.0]

    def fake(node, n, ring, weights):
        clock[0] += (n / 1024) ** 2 * 1e-3      # a run that costs order^2
        return Series.from_int_list([1] * n, GF(101), prec=n)

    monkeypatch.setattr(cost, "evaluate", fake)
    monkeypatch.setattr(cost.time, "perf_counter", lambda: clock[0])
    est = estimate_cost("(q;q)_inf", 2**22)
    n = est.probe_order
    assert est.probe_seconds >= cost.PROBE_SECONDS
    assert est.seconds == pytest.approx((2**22 / 1024) ** 2 * 1e-3, rel=1e-6)
    assert n < 2**22 // 2


def test_a_failing_probe_gives_no_estimate():
    assert estimate_cost("1/(q-q)", 10**6) is None


def test_footprint_counts_words_or_bits():
    assert footprint(Series.from_int_list([1] * 10, GF(7), prec=10)) == 80
    big = Series.from_coefficients([2**200, 1], prec=2)
    assert footprint(big) == 2 * 201 // 8


def test_an_order_out_of_reach_is_estimated_as_such():
    # 1/(q;q)_inf at 10^7: coefficients up to p(10^7 - 1), about 3,500 digits (the
    # Hardy-Ramanujan asymptotic, from memory), so gigabytes; the estimate must say so
    est = estimate_cost("1/(q;q)_inf", 10**7)
    assert est.bytes > 10**9 and est.exceeds(600, 2 * 10**9)
    assert "GB" in est.text() or "TB" in est.text()


def test_text_and_limits():
    e = CostEstimate(10**5, 30.0, 5 * 10**6, 4096, 0.3)
    assert not e.exceeds(600, 10**9) and e.exceeds(10, 10**9) and e.exceeds(600, 10**6)
    assert e.text() == "about 30 s and 5.0 MB (extrapolated from order 4096, computed in 0.3 s)"


def test_a_probe_that_fails_after_others_succeeded_still_gives_an_estimate(monkeypatch):
    # a limit reached at a later probe order must not let the real run start unestimated
    import qseries.engine.cost as cost
    from qseries.errors import UnableError

    real = cost.evaluate

    def failing_late(node, n, ring=None, weights=None):
        if n > 4 * cost.PROBE_FIRST_ORDER:
            raise UnableError("a limit")
        return real(node, n, ring, weights)

    monkeypatch.setattr(cost, "evaluate", failing_late)
    monkeypatch.setattr(cost, "PROBE_SECONDS", 1e9)     # never stop on time
    est = cost.estimate_cost("1/(q;q)_inf", 10**7)
    assert est is not None and est.probe_order == 4 * cost.PROBE_FIRST_ORDER
