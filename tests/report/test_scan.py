"""The text and JSON of a scan."""

import json

from qseries.discovery import Criteria, Family, InlineEngine, run_scan
from qseries.report import relation_text, scan_json, scan_lines

# L. Euler's sum_n q^(n^2-n) z^n/(q^2;q^2)_n = (-z;q^2)_inf (Andrews 1976, Cor. 2.2, from
# memory) at z = q^(b+1): b = -1 is twice b = 1; c = 1 is q -> -q for even b; the template's
# $(0*b/(b-2)) makes b = 2 fail (division by zero)
FAMILY = Family("sum_{n>=0} (-1)^($c n) q^(n^2+$b n+$(0*b/(b-2)))/(q^2;q^2)_n",
                (("b", "-1..2"), ("c", "0..1")))


def _report():
    return run_scan(FAMILY, Criteria(order=150), engine=InlineEngine())


def test_json_shape():
    data = json.loads(json.dumps(scan_json(_report())))
    assert set(data) == {"order", "filter_order", "members", "stages", "hits", "unconfirmed",
                         "failed", "resumed", "computed", "seconds"}
    assert (data["order"], data["filter_order"], data["members"]) == (150, 82, 8)
    assert data["stages"] == {"members": 8, "failed": 2, "rejected": 1, "passed_filter": 5,
                              "confirmed": 5, "groups": 3}
    hit = data["hits"][0]
    assert set(hit) == {"params", "expression", "product", "related"}
    assert hit["params"] == {"b": 0, "c": 0}
    assert hit["related"] == [{"params": {"b": 0, "c": 1},
                               "expression": hit["related"][0]["expression"],
                               "relation": "[b=0 c=0](-q)"}]
    assert {tuple(f["params"].values()) for f in data["failed"]} == {(2, 0), (2, 1)}
    assert all("reason" in f and "expression" in f for f in data["failed"])


def test_text_lists_stages_hits_relations_and_failures():
    lines = scan_lines(_report())
    text = "\n".join(lines)
    assert lines[0] == ("scan of 8 members at order 150 (filter at order 82: period <= 20, "
                        "|exponent| <= 5)")
    assert ("failed 2, rejected by the filter 1, passed the filter 5, confirmed at order "
            "150 5 (3 groups)") in lines[1]
    assert "b=-1 c=0 = 2 * [b=1 c=0](q)" in text
    assert "b=0 c=1 = [b=0 c=0](-q)" in text
    assert text.split("failed:\n")[1].count("\n") == 1          # two failed members
    assert "evidence, not a proof" in text


def test_relation_texts():
    from fractions import Fraction
    from types import SimpleNamespace as NS
    rel = NS(factor=Fraction(-1, 2), shift=Fraction(-3, 8), sign=-1, same_right=False)
    assert relation_text(rel, "a=1") == "(-1/2) * q^(-3/8) * [a=1](-q)"
    assert relation_text(NS(same_right=True), "a=1") == "the same right side as [a=1]"
