"""Scans that must rediscover published identities, find nothing where there is nothing,
and give the same hits in this process, in worker processes, after an interrupt and a
resume, and on a Dask cluster (tests/discovery/test_engines.py)."""

import pytest

import qseries.discovery.examine as examine_module
from qseries.analysis import check
from qseries.discovery import (
    Criteria,
    Family,
    InlineEngine,
    ScanInterrupted,
    ScanRecord,
    record_header,
    run_scan,
)
from qseries.discovery.scan import batch_size_for

ORDER = 300

# Rogers-Ramanujan: L. J. Rogers, Proc. London Math. Soc. 25 (1894), 318-343; G. E. Andrews,
# The Theory of Partitions, 1976, Cor. 7.6 and 7.7 (numbering from memory)
RR = Family("sum_{n>=0} q^(n^2+$b n)/(q;q)_n", (("b", "0..3"),))
RR_PRODUCTS = {(("b", 0),): "1/((q;q^5)_inf (q^4;q^5)_inf)",
               (("b", 1),): "1/((q^2;q^5)_inf (q^3;q^5)_inf)"}

# Rogers' mod 14 identities: L. J. Rogers, Proc. London Math. Soc. 25 (1894) and (2) 16
# (1917); L. J. Slater, Proc. London Math. Soc. (2) 54 (1952), 147-167, entries 61, 60 and
# 59 (entry numbers from memory; the products as in the shipped catalogue,
# identities/rogers_ramanujan.toml, and OEIS A105781, A105782)
MOD14 = Family("sum_{n>=0} q^(n^2+$b n)/((q;q)_n (q;q^2)_(n+$c))",
               (("b", "0..2"), ("c", "0..1")))
MOD14_PRODUCTS = {(("b", 0), ("c", 0)): "(q^6,q^8,q^14;q^14)_inf/(q;q)_inf",
                  (("b", 1), ("c", 1)): "(q^4,q^10,q^14;q^14)_inf/(q;q)_inf",
                  (("b", 2), ("c", 1)): "(q^2,q^12,q^14;q^14)_inf/(q;q)_inf"}

# Rogers' mod 20 identity: sum q^(n^2)/(q;q)_(2n); G. E. Andrews, q-Series, CBMS 66, AMS
# 1986, p. 8, eq. (1.7) (Slater's entry 79, from memory)
MOD20 = Family("sum_{n>=0} q^(n^2)/(q;q)_(2n+$c)", (("c", "0..1"),))
MOD20_PRODUCTS = {(("c", 0),): "1/(q,q^3,q^4,q^5,q^7,q^9,q^11,q^13,q^15,q^16,q^17,q^19;q^20)_inf"}

# Rogers (1894): sum q^(n^2)/(q^4;q^4)_n = 1/((-q^2;q^2)_inf (q,q^4;q^5)_inf) and
# sum q^(n^2+2n)/(q^4;q^4)_n = 1/((-q^2;q^2)_inf (q^2,q^3;q^5)_inf); L. J. Slater (1952),
# entries 20 and 16 (entry numbers from memory)
ROGERS4 = Family("sum_{n>=0} q^(n^2+$b n)/(q^4;q^4)_n", (("b", "0..3"),))
ROGERS4_PRODUCTS = {(("b", 0),): "1/((-q^2;q^2)_inf (q;q^5)_inf (q^4;q^5)_inf)",
                    (("b", 2),): "1/((-q^2;q^2)_inf (q^2;q^5)_inf (q^3;q^5)_inf)"}

# A double sum: the Andrews-Gordon identities for k = 3 (modulus 7), G. E. Andrews, Proc. Nat.
# Acad. Sci. USA 71 (1974), 4082-4085; The Theory of Partitions, 1976, Thm. 7.8 (from
# memory): with N_1 = i + j, N_2 = j, sum q^(N_1^2 + N_2^2 + N_r + ... + N_2)/((q;q)_i (q;q)_j)
# = prod over n not = 0, +-r (mod 7) of 1/(1 - q^n), for r = 3, 2, 1
AG7 = Family("sum_{i>=0} sum_{j>=0} q^(i^2+2 i j+2 j^2+$a i+$b j)/((q;q)_i (q;q)_j)",
             (("a", "0..2"), ("b", "0..2")))
AG7_PRODUCTS = {(("a", 0), ("b", 0)): "1/(q,q^2,q^5,q^6;q^7)_inf",
                (("a", 0), ("b", 1)): "1/(q,q^3,q^4,q^6;q^7)_inf",
                (("a", 1), ("b", 2)): "1/(q^2,q^3,q^4,q^5;q^7)_inf"}

# Ramanujan's third-order mock theta functions f(q) = sum q^(n^2)/(-q;q)_n^2 and
# phi(q) = sum q^(n^2)/(-q^2;q^2)_n (G. N. Watson, J. London Math. Soc. 11 (1936)) are not
# modular (M. Griffin, K. Ono and L. Rolen, Ramanujan's mock theta functions, PNAS 110
# (2013), from memory), while c q^s times a product with periodic exponents is a
# generalised eta product, which is (S. Robins, Contemp. Math. 166, 1994): no product form
MOCK = Family("sum_{n>=0} q^(n^2)/(-q^$c;q^$c)_n^$(3-c)", (("c", "1..2"),))
# and the fifth-order f_0(q) = sum q^(n^2)/(-q;q)_n and f_1(q) = sum q^(n^2+n)/(-q;q)_n
# (G. N. Watson, Proc. London Math. Soc. (2) 42 (1937), 274-304, from memory), mock theta
# functions too
MOCK5 = Family("sum_{n>=0} q^(n^2+$b n)/(-q;q)_n", (("b", "0..1"),))


def _hits(report):
    return {g.representative.params: g.representative.product for g in report.groups}


def _agrees(found, published):
    return check(found, published, order=ORDER, method="exact").holds is True


@pytest.mark.parametrize("family, published", [(RR, RR_PRODUCTS), (MOD14, MOD14_PRODUCTS),
                                               (MOD20, MOD20_PRODUCTS),
                                               (ROGERS4, ROGERS4_PRODUCTS),
                                               (AG7, AG7_PRODUCTS)])
def test_rediscovers_published_identities(family, published):
    report = run_scan(family, Criteria(order=ORDER), engine=InlineEngine())
    hits = _hits(report)
    assert set(hits) == set(published)
    for params, product in hits.items():
        assert _agrees(product, published[params]), (params, product)
    assert report.counts()["confirmed"] == len(published)
    assert not report.of("failed")


def test_the_rogers_ramanujan_hits_confirmed_at_the_full_order_only():
    # the filter works at order 82; the confirmation at the full order, every stage counted
    report = run_scan(RR, Criteria(order=ORDER, max_period=5), engine=InlineEngine())
    counts = report.counts()
    assert counts == {"members": 4, "failed": 0, "rejected": 2, "passed_filter": 2,
                      "confirmed": 2, "groups": 2}
    assert report.criteria.low_order == 50


def test_mock_theta_functions_have_no_product_form():
    for family in (MOCK, MOCK5):
        report = run_scan(family, Criteria(order=ORDER, max_period=40, max_exponent=20),
                          engine=InlineEngine())
        assert report.groups == ()
        assert [o.status for o in report.outcomes] == ["rejected", "rejected"]


def test_a_period_above_the_bound_is_no_hit():
    # 1/(q,q^4;q^5)_inf has period 5
    report = run_scan(RR, Criteria(order=ORDER, max_period=4), engine=InlineEngine())
    assert report.groups == ()
    assert "period" in report.of("rejected")[0].reason


def test_trivially_related_members_are_grouped():
    # L. Euler: sum_n q^(n(n-1)/2) z^n/(q;q)_n = (-z;q)_inf (Andrews 1976, Cor. 2.2, from
    # memory) at q -> q^2 and z = q^(b+1), times (-1)^(cn): b = -1 gives 2 (-q^2;q^2)_inf,
    # twice the member b = 1; c = 1 turns q into -q when b is even
    family = Family("sum_{n>=0} (-1)^($c n) q^(n^2+$b n)/(q^2;q^2)_n",
                    (("b", "-1..2"), ("c", "0..1")))
    report = run_scan(family, Criteria(order=200), engine=InlineEngine())
    groups = {g.representative.params: [(r.member.params, r.factor, r.shift, r.sign)
                                        for r in g.related] for g in report.groups}
    b1c0, bm1c0 = (("b", 1), ("c", 0)), (("b", -1), ("c", 0))
    b0c0, b0c1 = (("b", 0), ("c", 0)), (("b", 0), ("c", 1))
    assert groups[b1c0] == [(bm1c0, 2, 0, 1)]
    assert groups[b0c0] == [(b0c1, 1, 0, -1)]
    assert _agrees("(-q;q^2)_inf", next(g.representative.product for g in report.groups
                                        if g.representative.params == b0c0))
    # b = -1, c = 1 is (1;q^2)_inf = 0: no product form
    zero = next(o for o in report.outcomes if o.params == (("b", -1), ("c", 1)))
    assert zero.status == "rejected" and "vanishes" in zero.reason


def test_equal_series_are_grouped():
    # (q^a;q^5)_inf (q^(5-a);q^5)_inf is symmetric in a and 5 - a
    family = Family("1/((q^$a;q^5)_inf (q^$(5-a);q^5)_inf)", (("a", "1..4"),))
    report = run_scan(family, Criteria(order=200), engine=InlineEngine())
    groups = {g.representative.params: [(r.member.params, r.equal) for r in g.related]
              for g in report.groups}
    assert groups == {(("a", 1),): [((("a", 4),), True)], (("a", 2),): [((("a", 3),), True)]}


def test_a_q_shift_is_grouped():
    family = Family("q^$s sum_{n>=0} q^(n^2)/(q;q)_n", (("s", "0..2"),))
    report = run_scan(family, Criteria(order=100), engine=InlineEngine())
    [group] = report.groups
    assert group.representative.params == (("s", 0),)
    assert [(r.member.params, r.shift) for r in group.related] == [((("s", 1),), 1),
                                                                   ((("s", 2),), 2)]


def test_failed_members_are_counted_and_listed():
    # the template's $(6/b) divides by zero at b = 0 and is no integer at b = 4, 5
    family = Family("sum_{n>=0} q^(n^2+$(6/b) n)/(q;q)_n", (("b", "-1..6"),))
    report = run_scan(family, Criteria(order=100), engine=InlineEngine())
    failed = {o.params[0][1]: o.reason for o in report.of("failed")}
    assert set(failed) == {0, 4, 5}
    assert report.counts()["members"] == 8
    # b = 6 is the first Rogers-Ramanujan identity, b = 3 sum q^(n^2+2n)/(q;q)_n
    assert (("b", 6),) in _hits(report)


def test_divergent_and_unparsable_members_fail_without_stopping_the_scan():
    family = Family("sum_{n>=0} q^($a n)", (("a", "0..1"),))
    report = run_scan(family, Criteria(order=50), engine=InlineEngine())
    # a = 1 is 1/(1-q): a finite product, no periodic exponents
    assert [o.status for o in report.outcomes] == ["failed", "rejected"]
    assert "converge" in report.outcomes[0].reason
    family = Family("1/(q;q)_inf + q^$repeat(j=1..b;2;)", (("b", "0..1"),))
    report = run_scan(family, Criteria(order=50), engine=InlineEngine())
    assert [o.status for o in report.outcomes] == ["failed", "rejected"]
    assert "column" in report.outcomes[0].reason       # the parse error's position
    family = Family("1/(z^$b;q)_inf", (("b", "1..1"),))
    [o] = run_scan(family, Criteria(order=50), engine=InlineEngine()).outcomes
    assert o.status == "failed" and "extra variables" in o.reason


def test_an_equality_scan_confirms_a_given_right_side():
    family = Family("sum_{n>=0} q^(n^2+$b n)/(q;q)_n", (("b", "0..1"),), (),
                    right="1/((q^$(b+1);q^5)_inf (q^$(4-b);q^5)_inf)")
    report = run_scan(family, Criteria(order=ORDER), engine=InlineEngine())
    assert [o.status for o in report.outcomes] == ["hit", "hit"]
    wrong = Family("sum_{n>=0} q^(n^2)/(q;q)_n", (("b", "0..0"),), (),
                   right="1/((q;q^5)_inf (q^4;q^5)_inf) + q^(100+$b)")
    report = run_scan(wrong, Criteria(order=ORDER), engine=InlineEngine())
    [o] = report.outcomes
    assert o.status == "unconfirmed" and "q^100" in o.reason


def test_worker_processes_give_the_same_hits():
    inline = run_scan(MOD14, Criteria(order=ORDER), engine=InlineEngine())
    pooled = run_scan(MOD14, Criteria(order=ORDER), jobs=2, batch_size=1)
    assert pooled.outcomes == inline.outcomes
    assert _hits(pooled) == _hits(inline)


def _counting(monkeypatch):
    calls = []
    real = examine_module.examine_member

    def spy(job, index, params):
        calls.append(index)
        return real(job, index, params)

    monkeypatch.setattr(examine_module, "examine_member", spy)
    return calls


def test_resume_recomputes_nothing_already_recorded(tmp_path, monkeypatch):
    family = Family("sum_{n>=0} q^(n^2+$b n)/((q;q)_n (q;q^2)_(n+$c))",
                    (("b", "-2..3"), ("c", "0..1")))
    criteria = Criteria(order=200)
    path = tmp_path / "hits.toml.progress"
    header = record_header(family, criteria)
    calls = _counting(monkeypatch)

    def stop_after_two_batches(outcomes, done, total):
        if done >= 4:
            raise KeyboardInterrupt

    with ScanRecord.create(path, header) as record:
        with pytest.raises(ScanInterrupted) as stop:
            run_scan(family, criteria, engine=InlineEngine(), batch_size=2, record=record,
                     progress=stop_after_two_batches)
    first = list(calls)
    assert len(first) == 4 and len(stop.value.report.outcomes) == 4
    calls.clear()
    with ScanRecord.resume(path, header) as record:
        assert sorted(record.finished) == sorted(first)
        resumed = run_scan(family, criteria, engine=InlineEngine(), batch_size=2,
                           record=record)
    assert sorted(calls) == [i for i in range(12) if i not in first]   # nothing twice
    assert (resumed.resumed, resumed.computed) == (4, 8)
    calls.clear()
    whole = run_scan(family, criteria, engine=InlineEngine())
    assert len(calls) == 12
    assert resumed.outcomes == whole.outcomes
    assert _hits(resumed) == _hits(whole) and len(whole.groups) == 3


def test_resume_runs_again_the_members_an_engine_lost(tmp_path, monkeypatch):
    # a member listed as failed because its batch could not be run (stage "engine") has no
    # outcome of its own: a resumed scan computes it
    from qseries.discovery import MemberOutcome
    criteria = Criteria(order=100)
    path = tmp_path / "hits.toml.progress"
    header = record_header(RR, criteria)
    with ScanRecord.create(path, header) as record:
        record.append([MemberOutcome(0, (("b", 0),), "", "failed", reason="worker lost",
                                     stage="engine"),
                       MemberOutcome(1, (("b", 1),), "", "failed", reason="no",
                                     stage="evaluation")])
    calls = _counting(monkeypatch)
    with ScanRecord.resume(path, header) as record:
        report = run_scan(RR, criteria, engine=InlineEngine(), record=record)
    assert sorted(calls) == [0, 2, 3]
    assert (report.resumed, report.computed) == (1, 3)
    assert report.outcomes[0].status == "hit" and report.outcomes[1].status == "failed"


def test_a_resumed_scan_must_be_the_same_scan(tmp_path):
    path = tmp_path / "x.progress"
    ScanRecord.create(path, record_header(RR, Criteria(order=100))).close()
    from qseries.errors import QSeriesError
    with pytest.raises(QSeriesError, match="different scan"):
        ScanRecord.resume(path, record_header(RR, Criteria(order=101)))


def test_batches_are_large_enough_and_spread_over_the_workers():
    assert batch_size_for(10_000, 2) == 32
    assert batch_size_for(40, 2) == 5
