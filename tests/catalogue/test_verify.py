"""The shipped catalogue verifies entry by entry; an altered side is caught; a recorded
misprint counts as ok only when it fails exactly where recorded."""

import pytest

from qseries.catalogue import SHIPPED, load_entries, verify_entries, verify_entry
from qseries.catalogue.files import Entry

ENTRIES = load_entries([SHIPPED])


@pytest.mark.parametrize("entry", ENTRIES, ids=[e.ident for e in ENTRIES])
def test_catalogue_entry_behaves_as_recorded(entry):
    r = verify_entry(entry)
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
