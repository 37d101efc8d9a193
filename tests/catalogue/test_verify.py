"""The shipped catalogue verifies entry by entry; an altered side is caught; a recorded
misprint counts as ok only when it fails exactly where recorded."""

from dataclasses import replace

import pytest

from qseries.catalogue import (
    SHIPPED,
    load_entries,
    pair_ident,
    verify_entries,
    verify_entry,
    verify_pair,
)
from qseries.catalogue.files import Entry

from .limits import deadline

ENTRIES = load_entries([SHIPPED])


@pytest.fixture(scope="module")
def verdicts(request) -> dict:
    """The verdicts of the entries this session runs (all, or those chosen with -k), computed
    together by verify_entries on every core, as `qseries verify` does: the catalogue takes
    some 25 s on one core, most of it in the 4-fold sums of the k = 5 families."""
    chosen = [item.callspec.params["entry"] for item in request.session.items
              if getattr(item, "originalname", None) == "test_catalogue_entry_behaves_as_recorded"]
    return {r.ident: r for r in verify_entries(chosen, jobs=None)}


@pytest.mark.parametrize("entry", ENTRIES, ids=[e.ident for e in ENTRIES])
def test_catalogue_entry_behaves_as_recorded(entry, verdicts):
    r = verdicts[entry.ident]
    assert r.ok, (r.error or r.first_mismatch)


def test_altered_side_is_caught():
    e = next(x for x in ENTRIES if x.key == "rogers-ramanujan-1")
    altered = Entry(**{**e.__dict__, "right": e.right.replace("q^4;q^5", "q^4;q^6")})
    r = verify_entry(altered)
    assert not r.ok and not r.holds
    # allowed parts below 10: {1, 4, 6, 9} for the product 1/((q;q^5)(q^4;q^5)), but only
    # {1, 4, 6} for the altered 1/((q;q^5)(q^4;q^6)): the partition "9" is the first difference
    assert r.first_mismatch["index"] == 9


def _misprint(fails_at):
    # an invented entry used only to exercise the "expected to fail" mechanism
    return Entry("printed-form", "a wrong printed form", "1/(1-q)", "1/(1-q) + q^7", 30,
                 "invented for this test", "-", 1, expect="fails", fails_at=fails_at)


def test_recorded_failure_is_ok_only_at_the_recorded_exponent():
    assert verify_entry(_misprint(7)).ok
    assert not verify_entry(_misprint(8)).ok
    # below the recorded exponent the failure cannot be seen: that is consistent
    assert verify_entry(_misprint(7), order=5).ok


def test_parallel_run_keeps_the_order():
    some = ENTRIES[:6]
    results = verify_entries(some, jobs=2)
    assert [r.ident for r in results] == [e.ident for e in some]
    assert all(r.ok for r in results)


# -- worker processes (issue 11 section 5) --

def test_jobs_are_capped_by_the_entries_and_the_cores(monkeypatch):
    from qseries.catalogue import verify
    cores = verify.available_cores()
    assert cores >= 1
    assert verify.worker_count(30, 3) == min(3, cores)
    assert verify.worker_count(None, 100) == cores
    assert verify.worker_count(1, 100) == 1
    started = []
    real = verify._start_pool

    def spy(workers):
        started.append(workers)
        return real(workers)

    monkeypatch.setattr(verify, "_start_pool", spy)
    some = ENTRIES[:3]
    results = verify_entries(some, jobs=30)
    assert [r.ident for r in results] == [e.ident for e in some]
    assert started == ([min(3, cores)] if cores > 1 else [])


def _slow(key):
    # about 8 s at order 20000 on the development machine, far longer at 40000
    return Entry(key, "slow", "sum_{n>=0} q^n/(q;q)_n", "1/(q;q)_inf", 40_000, "test", "-", 1)


def test_an_interrupt_stops_the_workers_and_keeps_what_finished():
    import multiprocessing
    import time

    from qseries.catalogue import VerifyInterrupted
    fast = next(x for x in ENTRIES if x.key == "goellnitz-gordon-1")
    assert fast.same_as is None                 # one result, not an entry and its pair
    entries = [fast] + [_slow(f"slow-{i}") for i in range(6)]
    seen = []

    def progress(r):
        seen.append(r.ident)
        raise KeyboardInterrupt       # as if Ctrl-C came while the first result is shown

    before = {p.pid for p in multiprocessing.active_children()}
    t0 = time.monotonic()
    with deadline(60), pytest.raises(KeyboardInterrupt) as info:
        verify_entries(entries, jobs=2, progress=progress)
    assert isinstance(info.value, VerifyInterrupted)
    assert time.monotonic() - t0 < 30          # six slow entries would take minutes
    assert seen == ["goellnitz-gordon-1"]
    assert [r.ident for r in info.value.results] == ["goellnitz-gordon-1"]
    assert info.value.total == len(entries)
    assert {p.pid for p in multiprocessing.active_children()} <= before   # workers ended


def test_bad_fails_at_in_a_hand_made_entry_is_an_error_not_a_crash():
    r = verify_entry(_misprint("inf"))
    assert not r.ok and "fails_at" in r.error


@pytest.mark.parametrize("expect, fails_at", [("holds", None), ("fails", 3), ("fails", 100)])
def test_an_inconclusive_entry_is_not_ok(expect, fails_at):
    # no coefficient can be compared (holds is None): that is neither the identity holding
    # nor the recorded failure, whatever fails_at says
    e = Entry("unknown", "compares nothing", "O(q^-5) + 1", "2", 20, "invented for this test",
              "-", 1, expect=expect, fails_at=fails_at)
    r = verify_entry(e)
    assert r.holds is None and r.ok is False


def test_every_entry_names_its_source():
    assert ENTRIES
    for e in ENTRIES:
        assert e.source.strip(), e.ident
        assert len(e.source.strip()) >= 10, e.ident     # a citation, not a placeholder


def test_the_misprint_and_its_correction_are_recorded_together():
    # Berndt, Ramanujan's Notebooks IV, ch. 25, Entry 27 (27.1), p. 170; Somos' note
    by_key = {e.key: e for e in ENTRIES}
    printed, corrected = by_key["berndt-iv-25-27-1-printed"], by_key["berndt-iv-25-27-1"]
    assert printed.expect == "fails" and printed.fails_at == 4
    assert corrected.corrects == printed.key and corrected.expect == "holds"
    assert corrected.order >= 2000
    r = verify_entry(printed)
    assert r.ok and r.first_mismatch == {"index": 4, "lhs": "2", "rhs": "4"}
    assert "4 q^4 f(-q^6)^2 f(-q^42)^2" in corrected.left
    assert corrected.left.replace(" + 4 q^4 f(-q^6)^2 f(-q^42)^2", "") == printed.left


def test_forty_identities_use_the_files_definitions():
    forty = [e for e in ENTRIES if "forty-identities" in e.tags]
    assert {"forty-1-3", "forty-1-4"} <= {e.key for e in forty}
    assert all(any(d.startswith("G(q) = ") for d in e.definitions) for e in forty)


# ---- same_as pairs: the two entries' corresponding sides agree as series ----

PAIRED = [e for e in ENTRIES if e.same_as is not None]


@pytest.mark.parametrize("entry", PAIRED, ids=[e.ident for e in PAIRED])
def test_catalogue_pair_agrees(entry):
    # each pair is recorded from a named source (DLMF 20.2/20.5, Andrews 1976, ...)
    r = verify_pair(entry)
    assert r.ok and r.holds and r.order == entry.order, (r.error, r.first_mismatch)
    assert r.ident == pair_ident(entry) and r.pair["of"] == entry.ident


def test_the_shipped_catalogue_records_pairs_under_q_to_minus_q():
    # theta_3(q) (DLMF 20.2.3, 20.5.3) is theta_4(-q) = triple-product[m=2,a=1] at -q
    e = next(x for x in ENTRIES if x.key == "triple-product-theta-3")
    assert (e.same_as.partner, e.same_as.substitution) == ("triple-product[m=2,a=1]",
                                                           "q -> -q")
    assert len(PAIRED) >= 5


def test_a_pair_without_its_substitution_fails_on_the_left_side():
    e = next(x for x in ENTRIES if x.key == "triple-product-theta-3")
    plain = replace(e, same_as=replace(e.same_as, substitution=""))
    r = verify_pair(plain)
    # theta_3(q) = 1 + 2q + ... against theta_4(q) = 1 - 2q + ...: q^1, 2 against -2
    assert not r.ok and r.holds is False and r.pair["differs"] == "left"
    assert r.first_mismatch == {"index": 1, "lhs": "2", "rhs": "-2"}
    assert pair_ident(plain) == "triple-product-theta-3 ~ triple-product[m=2,a=1]"


def test_a_pair_checks_the_right_sides_too():
    e = next(x for x in ENTRIES if x.key == "gauss-theta4")
    # (q;q)_inf/(-q;q)_inf against (q,q,q^2;q^2)_inf altered to (q,q^2;q^2)_inf: the
    # left sides still agree, the right sides differ first at q^1 (-2 against -1)
    altered = replace(e, same_as=replace(e.same_as, right="(q,q^2;q^2)_inf"))
    r = verify_pair(altered)
    assert not r.ok and r.pair["differs"] == "right"
    assert r.first_mismatch == {"index": 1, "lhs": "-2", "rhs": "-1"}


def test_a_swapped_pair_compares_left_with_right():
    from qseries.catalogue.files import SameAs
    # two forms of one wrong statement (sides equal as series tell nothing about a swap)
    b = Entry("b", "t", "1/(1-q) + q^7", "1/(1-q)", 30, "s", "-", 1, expect="fails",
              fails_at=7)
    a = Entry("a", "t", "1/(1-q)", "1/(1-q) + q^7", 30, "s", "-", 2, expect="fails",
              fails_at=7, same_as=SameAs("b", "", True, "s", "f:2", partner="b",
                                         left=b.left, right=b.right))
    assert verify_pair(a).ok
    r = verify_pair(replace(a, same_as=replace(a.same_as, swap=False)))
    assert not r.ok and r.first_mismatch == {"index": 7, "lhs": "1", "rhs": "2"}
    e = next(x for x in ENTRIES if x.key == "euler-partition-sum")
    assert e.same_as.swap and verify_pair(e).ok


def test_q_to_q_squared_substitution():
    # Euler's odd-parts identity at q^2 against the entry at q (Andrews 1976, ch. 1)
    base = Entry("odd", "t", "(-q;q)_inf", "1/(q;q^2)_inf", 50, "s", "-", 1)
    from qseries.catalogue.files import SameAs
    moved = Entry("odd2", "t", "(-q^2;q^2)_inf", "1/(q^2;q^4)_inf", 50, "s", "-", 2,
                  same_as=SameAs("odd", "q -> q^2", False, "s", "f:2", partner="odd",
                                 left=base.left, right=base.right))
    assert verify_pair(moved).ok
    wrong = replace(moved, same_as=replace(moved.same_as, substitution="q -> -q^2"))
    r = verify_pair(wrong)
    assert not r.ok and r.first_mismatch["index"] == 2


def test_verify_entries_gives_each_pair_after_its_entry():
    chosen = [e for e in ENTRIES if e.key in ("gauss-theta4", "euler-pentagonal")]
    ids = [r.ident for r in verify_entries(chosen, jobs=1)]
    assert ids == ["euler-pentagonal", "gauss-theta4",
                   "gauss-theta4 ~ triple-product[m=2,a=1]"]
