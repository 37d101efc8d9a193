"""One member through the filter and the confirmation."""

import pickle

import pytest

import qseries.discovery.examine as examine_module
from qseries.analysis import check
from qseries.discovery import Criteria, Family, ScanJob, examine_batch, examine_member
from qseries.errors import QSeriesError


def _one(template, criteria=None, **params):
    job = ScanJob(Family(template, tuple((k, f"{v}..{v}") for k, v in params.items())),
                  criteria or Criteria(order=200))
    return examine_member(job, 0, tuple(params.items()))


def test_a_hit_carries_its_product_and_pattern():
    # Rogers-Ramanujan (Andrews 1976, Cor. 7.6, from memory)
    o = _one("sum_{n>=0} q^(n^2+$b n)/(q;q)_n", b=0)
    assert o.status == "hit" and o.stage == "confirm"
    assert o.pattern == (-1, 0, 0, -1, 0)
    assert check(o.product, "1/((q;q^5)_inf (q^4;q^5)_inf)", order=200).holds


def test_the_exponent_bound():
    # 1/(q;q)_inf^3 (exponents -3, period 1)
    assert _one("1/(q;q)_inf^$k", Criteria(order=100, max_exponent=2), k=3).status \
        == "rejected"
    assert _one("1/(q;q)_inf^$k", Criteria(order=100, max_exponent=3), k=3).status == "hit"


def test_a_period_seen_only_at_the_filter_order_is_not_confirmed():
    # (q;q^5)_inf^-1 times 1 + q^90: periodic below q^82, not at q^200
    o = _one("(1 + q^$e)/(q;q^5)_inf", e=90)
    assert o.status == "unconfirmed" and "q^90" in o.reason
    assert check(o.expression, o.product, order=90).holds is True


def test_a_constant_and_a_power_of_q_are_part_of_the_product():
    o = _one("$c q^3 (q;q^2)_inf", c=-2)
    assert o.status == "hit" and (o.constant, o.shift) == ("-2", "3")
    assert check(o.product, "-2 q^3 (q;q^2)_inf", order=200).holds


def test_a_monomial_is_no_hit():
    o = _one("$c q^2", c=3)
    assert o.status == "rejected" and "c q^s" in o.reason


def test_non_integer_exponents_are_rejected_not_failed():
    o = _one("1 + q/$c", c=2)
    assert o.status == "rejected" and "integer" in o.reason


def test_the_outcome_depends_only_on_the_member(monkeypatch):
    # a batch run twice (retried elsewhere) gives equal outcomes: the modular primes
    # follow from the member's text
    job = ScanJob(Family("sum_{n>=0} q^(n^2+$b n)/(q;q)_n", (("b", "0..1"),)),
                  Criteria(order=300))
    batch = ((0, (("b", 0),)), (1, (("b", 1),)))
    first = examine_batch(job, batch)
    assert examine_batch(job, batch) == first
    assert pickle.loads(pickle.dumps(first)) == first
    assert pickle.loads(pickle.dumps(job)) == job


def test_an_unexpected_error_fails_the_member_only(monkeypatch):
    def broken(*args, **kwargs):
        raise ZeroDivisionError("boom")

    monkeypatch.setattr(examine_module, "product_form", broken)
    job = ScanJob(Family("1/(q;q)_inf^$k", (("k", "1..2"),)), Criteria(order=50))
    out = examine_batch(job, ((0, (("k", 1),)), (1, (("k", 2),))))
    assert [o.status for o in out] == ["failed", "failed"]
    assert "internal error: ZeroDivisionError: boom" in out[0].reason


@pytest.mark.parametrize("kwargs", [{"order": 0}, {"order": 10, "max_period": 0},
                                    {"order": 10, "filter_order": 1},
                                    {"order": True}])
def test_bad_criteria(kwargs):
    with pytest.raises(QSeriesError):
        Criteria(**kwargs)


def test_the_filter_order():
    assert Criteria(order=1000, max_period=30).low_order == 122
    assert Criteria(order=1000, filter_order=300).low_order == 300
    assert Criteria(order=40, filter_order=300).low_order == 40
