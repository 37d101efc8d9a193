"""The text and JSON of ``qseries prove``."""

import json

from qseries.modularity.prove import prove
from qseries.report.proof import (
    certificate_json,
    certificate_lines,
    proof_json,
    proof_lines,
    provable_note,
)

# Jacobi's quartic identity (Whittaker and Watson, §21.3, from memory)
JACOBI = ("theta_3(q)^4", "theta_2(q)^4 + theta_4(q)^4")


def test_proved_json_has_the_issue_shape():
    out = proof_json(prove(*JACOBI))
    assert set(out) >= {"proved", "holds", "certificate", "reason", "first_mismatch"}
    assert out["proved"] is True and out["holds"] is True and out["reason"] is None
    cert = out["certificate"]
    assert {"level", "weight", "bound", "character", "cusps", "terms", "checked"} <= set(cert)
    assert (cert["level"], cert["weight"], cert["bound"]) == (4, 2, 1)
    assert cert["checked"] == {"from": 0, "to": 1, "coefficients": 2, "arithmetic": "exact"}
    assert json.loads(json.dumps(out)) == out            # plain data


def test_fractions_are_strings():
    out = certificate_json(prove("theta_3(q)", "eta(q^2)^5/(eta(q)^2 eta(q^4)^2)").certificate)
    assert out["weight"] == "1/2" and out["character"] is None
    out = certificate_json(prove("psi(q)^2", "phi(q) psi(q^2)").certificate)
    assert out["shift"] == "-1/4"


def test_differs_json_and_lines():
    r = prove("theta_3(q)^24", "(theta_2(q)^4 + theta_4(q)^4)^6 + eta(q^25)^24")
    out = proof_json(r)
    assert out["proved"] is False and out["holds"] is False and out["reason"] is None
    assert out["first_mismatch"]["index"] == 25 and out["certificate"]["bound"] == 180
    lines = proof_lines(r)
    assert lines[0].startswith("DIFFERS  the two sides differ: first at q^25")
    assert "within the Sturm bound" in lines[1]


def test_refused_json_and_lines():
    r = prove("sum_{n>=1} q^n/(1-q^n)", "1", order=5)
    out = proof_json(r)
    assert out["certificate"] is None and out["reason"].startswith("the left side")
    assert out["evidence"]["order"] == 5 and out["evidence"]["holds"] is False
    lines = proof_lines(r)
    assert lines[0].startswith("NOT PROVED  not proved: the left side")
    assert any("evidence only" in line for line in lines)


def test_certificate_lines_show_cusps_and_bound():
    text = "\n".join(certificate_lines(prove(*JACOBI).certificate))
    assert "cusp   1/2 (d = 2, 1 cusp, width 1)" in text
    assert "Sturm's bound B = floor(k m / 12) = floor(2 * 6 / 12) = 1" in text
    assert "level N = 4, index [SL2(Z):Gamma_0(N)] = 6" in text


def test_provable_note_names_the_command():
    assert "qseries prove" in provable_note()
