"""report.json_shapes: one shape per result, read by both the command line and the
catalogue's verify (which used to build the exponent and the first mismatch each itself)."""

import json
from fractions import Fraction
from types import SimpleNamespace

import pytest

from qseries import check, distributions, evaluate, product_form
from qseries.catalogue import Entry, verify_entry
from qseries.errors import DomainError
from qseries.report import (
    check_json,
    distribution_json,
    distributions_json,
    entry_json,
    expand_json,
    exponent_json,
    finite_json,
    listing_json,
    listing_rows,
    mismatch_json,
    no_product_json,
    product_json,
    trend_json,
    verify_json,
)

CHECK_KEYS = {"holds", "reason", "order", "order_requested", "shortfall", "first_mismatch",
              "seconds", "hints", "method", "primes", "variables", "weights"}


@pytest.mark.parametrize(("e", "out"), [(0, 0), (-5, -5), (Fraction(10, 2), 5),
                                        (Fraction(1, 24), "1/24"), (Fraction(-7, 3), "-7/3")])
def test_exponents_are_integers_or_fraction_strings(e, out):
    assert exponent_json(e) == out and type(exponent_json(e)) is type(out)


def test_non_finite_floats_become_null():
    assert [finite_json(x) for x in (0.5, float("nan"), float("-inf"))] == [0.5, None, None]


def test_check_shape_at_a_mismatch_and_at_agreement():
    r = check("1/(1-q)", "1 + q + q^2 + 2q^3", order=10)
    data = json.loads(json.dumps(check_json(r)))
    assert set(data) == CHECK_KEYS
    assert data["holds"] is False and data["reason"] is None and data["shortfall"] is None
    assert data["order"] == 10 and data["order_requested"] == 10
    assert data["first_mismatch"] == {"index": 3, "lhs": "1", "rhs": "2"}
    assert data["method"] == "exact" and data["primes"] == [] and data["hints"] == []
    data = check_json(check("(-q;q)_inf", "1/(q;q^2)_inf", order=20))
    assert data["holds"] is True and data["first_mismatch"] is None


def test_check_shape_when_inconclusive_and_with_a_shortfall():
    data = check_json(check("O(q^-5) + 1", "2"))
    assert data["holds"] is None and data["order"] == -5
    assert data["reason"].startswith("no coefficient could be compared")
    data = check_json(check("1/(1-q) + O(q^10)", "1/(1-q)", order=20))
    assert data["order"] == 10 and data["order_requested"] == 20
    assert "the left side is known only below q^10" in data["shortfall"]


def test_check_shape_with_variables_hints_and_primes():
    from qseries.analysis import diagnose
    r = check("sum_{k>=0} z^k/(q;q)_k", "1/(z q;q)_inf", order=30)
    data = check_json(r)
    assert data["variables"] == ["z"] and data["weights"] == [1]
    assert data["first_mismatch"] == {"index": 1, "lhs": "z", "rhs": "0"}
    r = check("1/(q;q)_inf", "1/(q^2;q^2)_inf", order=40)
    assert check_json(r, diagnose(r))["hints"][0]["kind"] == "dilation"
    r = check("(-q;q)_inf", "1/(q;q^2)_inf", order=20, method="modular", seed=1, primes=2)
    data = check_json(r)
    assert data["method"] == "modular" and data["primes"] == list(r.primes)


def test_the_first_mismatch_of_a_weighted_check_is_written_in_q_and_z():
    r = check("1/(1-z)", "1/(1-z) + z^3 q", order=10, weights={"z": 2})
    assert mismatch_json(r) == {"index": 7, "lhs": "0", "rhs": "z^3*q"}


def test_verify_and_check_write_the_same_first_mismatch():
    # the two copies of this shape (command line and catalogue) are one function now
    left, right = "eta(q)", "q^(1/24) (q;q)_inf + q^(25/24)"
    e = Entry("x", "x", left, right, 12, "invented for this test", "-", 1)
    assert verify_entry(e).first_mismatch == mismatch_json(check(left, right, order=12)) == \
        {"index": "25/24", "lhs": "-1", "rhs": "0"}


def test_expand_shape():
    # moved from tests/cli/test_main.py
    assert expand_json(evaluate("(q;q)_inf", 8), 8) == \
        {"order": 8, "terms": [[0, "1"], [1, "-1"], [2, "-1"], [5, "1"], [7, "1"]]}
    assert expand_json(evaluate("eta(q)", 2), 2)["terms"] == [["1/24", "1"], ["25/24", "-1"]]
    assert expand_json(evaluate("1/(2-q)", 2), 2)["terms"] == [[0, "1/2"], [1, "1/4"]]
    assert expand_json(evaluate("(z q, q/z, q;q)_inf", 4), 4)["terms"] == \
        [[0, "1"], [1, "-z - 1 - z^-1"], [3, "z^2 + z + 1 + z^-1 + z^-2"]]


def test_expand_shape_stops_at_the_known_order():
    assert expand_json(evaluate("q^-3/(1-q) + O(q^2)", 10), 10) == \
        {"order": 2, "terms": [[-3, "1"], [-2, "1"], [-1, "1"], [0, "1"], [1, "1"]]}


def test_product_shape():
    pf = product_form("sum_{k>=0} q^(k^2)/(q;q)_k", 200)
    data = product_json(pf)
    assert "reason" not in data and data["eta"] is None
    assert data["period"] == 5 and data["expression"] == "(q, q^4;q^5)_inf^-1"
    assert data["exponents"][:5] == [-1, 0, 0, -1, 0] and len(data["exponents"]) == 199
    assert data["constant"] == "1" and data["shift"] == 0 and data["order"] == 200
    data = product_json(product_form("(q;q)_inf^2 q^(1/12)", 60))
    # evaluated modulo q^60: the order is that absolute one (q^(1/12) ... q^(709/12) known),
    # so e_1 .. e_59
    assert data["shift"] == "1/12" and data["order"] == 60 and data["eta"] == "eta(q)^2"
    assert len(data["exponents"]) == 59


def test_product_shape_without_a_product():
    data = product_json(product_form("1 + 2q", 20))
    assert data["expression"] is None and data["period"] is None
    assert data["reason"].startswith("the exponents show no period")
    with pytest.raises(DomainError) as info:
        product_form("1 + q/2", 20)
    assert no_product_json(20, str(info.value)) == \
        {"order": 20, "product_form": False, "reason": str(info.value)}


def test_distribution_shape():
    # moved from tests/cli/test_main.py
    [d] = distributions("sum_{k>=0} z^k q^(k^2)/(q;q)_k^2", "z", [4])
    data = distribution_json(d, 6)
    assert data["counts"] == {"1": "4", "2": "1"} and data["normal_moments"][3] == 3
    assert data["n"] == 4 and data["total"] == "5" and data["mean"] == "6/5"
    assert len(data["standardised_moments"]) == 6
    [d0] = distributions("1/(z*q;q)_inf", "z", [0])    # variance 0: moments undefined
    assert distribution_json(d0, 3)["standardised_moments"] == [None, None, None]
    assert distributions_json("z", [d, d0], 2)["sizes"][1]["n"] == 0


def test_trend_shape():
    dists = distributions("sum_{k>=0} z^k q^(k^2)/(q;q)_k^2", "z", [1, 2])
    assert trend_json(dists)[1] == {"n": 2, "total": "2", "mean": "1", "variance": "0",
                                    "mean_decimal": 1.0, "variance_decimal": 0.0}


def _outcome(**kw):
    base = {"ident": "x", "holds": True, "ok": True, "order": 30, "first_mismatch": None,
            "seconds": 0.25, "error": ""}
    return SimpleNamespace(**{**base, **kw})


def test_entry_shape():
    assert set(entry_json(_outcome())) == {"id", "holds", "ok", "order", "first_mismatch",
                                           "seconds"}
    assert entry_json(_outcome(error="bad", ok=False))["error"] == "bad"
    assert entry_json(_outcome(order=Fraction(7, 2)))["order"] == "7/2"


def test_verify_summary():
    results = [_outcome(), _outcome(ok=False), _outcome(ok=False, error="e")]
    data = verify_json(results, 1.23456)
    assert data["summary"] == {"entries": 3, "ok": 1, "not_ok": 2, "errors": 1,
                               "seconds": 1.235}
    data = verify_json(results[:1], 1.0, total=5)
    assert data["summary"]["entries"] == 5 and data["summary"]["finished"] == 1
    assert data["summary"]["interrupted"] is True


def test_listing_counts_family_members_once_per_key():
    members = [Entry("fam", "F", "q", "q", 10, "src", "f.toml", 3, params=(("k", k),))
               for k in range(3)]
    single = Entry("one", "O", "q", "q", 10, "src2", "g.toml", 1, tags=("t",))
    rows = listing_rows(members + [single])
    assert rows == [
        {"id": "fam", "members": 3, "title": "F", "source": "src", "tags": [],
         "expect": "holds", "file": "f.toml:3"},
        {"id": "one", "members": 1, "title": "O", "source": "src2", "tags": ["t"],
         "expect": "holds", "file": "g.toml:1"}]
    assert listing_json([single]) == {"identities": rows[1:]}


def test_listing_rows_carry_a_familys_ranges_and_a_note():
    members = [Entry("fam", "F", "q", "q", 10, "src", "f.toml", 3, params=(("k", k),),
                     ranges=(("k", "0..2"),)) for k in range(3)]
    noted = Entry("one", "O", "q", "q", 10, "src2", "g.toml", 1, note="a misprint")
    rows = listing_rows(members + [noted])
    assert rows[0]["params"] == {"k": "0..2"} and "note" not in rows[0]
    assert rows[1]["note"] == "a misprint" and "params" not in rows[1]


def test_dissection_json_shape():
    from qseries.analysis import dissection
    from qseries.report import dissection_json

    out = dissection_json(dissection("1/(q;q)_inf", 3, 4), 4)
    assert json.loads(json.dumps(out)) == out
    assert out["order"] == 4 and out["m"] == 3
    assert [p["r"] for p in out["parts"]] == [0, 1, 2]
    assert out["parts"][2] == {"r": 2, "order": 4,
                               "terms": [[0, "2"], [1, "7"], [2, "22"], [3, "56"]]}
    frac = dissection_json(dissection("eta(q)", 2, 3), 3)
    assert [p["r"] for p in frac["parts"]] == ["1/24", "25/24"]


def test_congruence_json_shapes():
    from qseries.analysis import divisible, find_congruences
    from qseries.report import congruences_json, divisibility_json

    out = congruences_json(find_congruences("1/(q;q)_inf", 1000))
    assert out == {"order": 1000, "congruences": [{"m": 5, "r": 4, "modulus": 5},
                                                  {"m": 7, "r": 5, "modulus": 7},
                                                  {"m": 11, "r": 6, "modulus": 11}]}
    d = divisibility_json(divisible("1/(q;q)_inf", 25, 100, m=5, r=4))
    assert json.loads(json.dumps(d)) == d
    assert d == {"order": 100, "modulus": 25, "m": 5, "r": 4, "checked": 100,
                 "divisible": False,
                 "counterexample": {"n": 0, "exponent": 4, "residue": 5, "value": "5"}}
    frac = divisibility_json(divisible("q^(-1/24)/(q;q)_inf", 5, 10, m=5, r=Fraction(95, 24)))
    assert frac["r"] == "95/24" and frac["divisible"] is True


def test_relations_json_shape():
    from qseries.analysis import relations
    from qseries.report import relations_json

    out = relations_json(relations(["theta_3(q)^4", "theta_2(q)^4", "theta_4(q)^4"], 60))
    assert json.loads(json.dumps(out)) == out
    assert out["order"] == 60 and out["relations"] == [["1", "-1", "-1"]]
    assert out["monomials"] == [[1, 0, 0], [0, 1, 0], [0, 0, 1]] and out["stable"] is True


def test_combination_json_shape():
    from qseries.analysis import express
    from qseries.report import combination_json

    out = combination_json(express("1/(1-q^2)", ["1/(1-q)", "1/(1+q)"], 30))
    assert out == {"order": 30, "target": "1/(1-q^2)", "basis": ["1/(1-q)", "1/(1+q)"],
                   "coefficients": ["1/2", "1/2"],
                   "text": "(1/(1-q^2)) = 1/2 (1/(1-q)) + 1/2 (1/(1+q))",
                   "equations": 30, "unknowns": 3, "confirmed": 27, "stable": True}


def test_product_json_gives_the_short_form_and_where_a_period_breaks():
    from qseries import product_form
    from qseries.report import product_json

    out = product_json(product_form("(q;q^7)_inf (q;q^2)_inf (q;q^5)_inf", 300))
    assert out["factors"] == "(q;q^2)_inf (q;q^5)_inf (q;q^7)_inf" and out["period"] == 70
    out = product_json(product_form("1/((q;q^5)_inf (q^4;q^5)_inf) + q^100", 200))
    assert out["expression"] is None
    assert out["breaks"] == {"period": 5, "at": 100, "stray_term": [100, "1"]}
