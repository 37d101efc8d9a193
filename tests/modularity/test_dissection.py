"""Proofs of dissection identities by U_m on a modular function (issue 15, item 4), each
certificate re-verified by tests/modularity/recheck.py."""

import copy
import importlib

import pytest

from qseries import check, parse
from qseries.modularity.dissection import cusp_representatives, rho, u_lower_bound
from qseries.modularity.eta import EtaQuotient
from qseries.modularity.gamma0 import cusp_count
from qseries.modularity.prove import prove
from qseries.report.proof import proof_json

from .recheck import recheck

# Ramanujan: sum p(5n+4) q^n = 5 (q^5;q^5)^5/(q;q)^6 (S. Ramanujan, Some properties of p(n),
# Proc. Cambridge Philos. Soc. 19 (1919); G. E. Andrews, The Theory of Partitions, ch. 10,
# from memory), and sum p(7n+5) q^n = 7 (q^7;q^7)^3/(q;q)^4 + 49 q (q^7;q^7)^7/(q;q)^8 (same
# paper, from memory)
P5 = ("[q^(5n+4)] 1/(q;q)_inf", "5 (q^5;q^5)_inf^5/(q;q)_inf^6")
P7 = ("[q^(7n+5)] 1/(q;q)_inf",
      "7 (q^7;q^7)_inf^3/(q;q)_inf^4 + 49 q (q^7;q^7)_inf^7/(q;q)_inf^8")


def _proved(lhs, rhs):
    r = prove(lhs, rhs)
    assert r.proved, r.verdict
    assert recheck(lhs, rhs, proof_json(r)["certificate"]) == []
    return r.certificate


def test_ramanujan_p_5n_4():
    c = _proved(*P5)
    assert (c.method, c.level, c.bound) == ("dissection", 25, 1)
    assert c.operator == (5, 4) and c.function.r == {1: -1, 25: 1}
    assert c.multiplier.r == {5: 1}


def test_ramanujan_p_7n_5():
    c = _proved(*P7)
    assert (c.level, c.operator) == (49, (7, 5)) and c.function.r == {1: -1, 49: 1}


def test_either_side_may_be_the_dissection():
    _proved(P5[1], P5[0])


@pytest.mark.parametrize(("lhs", "rhs"), [
    # the parity split of phi(q) = sum q^(n^2): even squares give phi(q^2), odd squares
    # (2k+1)^2 = 4k(k+1) + 1 give 2 psi(q^4) (Berndt III, Entry 25, from memory)
    ("[q^(2n)] phi(q)", "phi(q^2)"),
    ("[q^(2n+1)] phi(q)", "2 psi(q^4)"),
])
def test_parity_dissections_of_phi(lhs, rhs):
    _proved(lhs, rhs)


def test_a_wrong_dissection_identity_is_caught_within_the_bound():
    # constructed: an extra term 5^5 q (q^5;q^5)^11/(q;q)^12 (same weight and power of q)
    lhs, rhs = P5[0], P5[1] + " + 5^5 q (q^5;q^5)_inf^11/(q;q)_inf^12"
    r = prove(lhs, rhs)
    assert r.holds is False and r.reason is None
    assert r.check.first_mismatch.exponent == 1 <= r.certificate.high


def test_the_lower_bound_for_u5_matches_the_known_image():
    # U_5(eta(25 tau)/eta(tau)) = 5 eta(5 tau)^6/eta(tau)^6 (Ramanujan's identity in this
    # form): the bound derived for U_5 f equals Ligozat's order of the image at every cusp
    f, image = EtaQuotient.of({1: -1, 25: 1}), EtaQuotient.of({1: -6, 5: 6})
    for a, c in cusp_representatives(25):
        if c != 25:
            assert u_lower_bound(f, 5, a, c, 25) == image.order_at(c, 25)


@pytest.mark.parametrize("n", [1, 4, 8, 9, 12, 25, 36, 49, 72, 100])
def test_one_representative_per_cusp(n):
    reps = cusp_representatives(n)
    assert len(reps) == cusp_count(n) and len(set(reps)) == len(reps)


def test_rho_is_ligozat_over_the_width():
    f = EtaQuotient.of({1: 16, 2: -24, 4: 8})
    for d, width in ((1, 4), (2, 1), (4, 1)):
        assert rho(f, d) * width == f.order_at(d, 4)


def test_refusals():
    r = prove("[q^(5n+4)] 1/(q;q)_inf", "5 q (q^5;q^5)_inf^5/(q;q)_inf^6", order=20)
    assert "powers of q do not match" in r.reason and r.holds is False
    r = prove("[q^(5n+4)] 1/(q;q)_inf", "sum_{k>=0} q^(k^2)/(q;q)_k", order=20)
    assert "other side is not recognised" in r.reason
    r = prove("[q^(5n)] sum_{k>=0} q^(k^2)/(q;q)_k", "1", order=20)
    assert "dissected series is not recognised" in r.reason
    r = prove("[q^(2n)] phi(q)", "[q^(2n)] phi(q)", order=20)
    assert "exactly one side" in r.reason
    assert check(*P5, 200).holds is True           # the evidence behind the refusals above


def test_a_tampered_certificate_is_rejected():
    cert = proof_json(prove(*P5))["certificate"]
    for change in (lambda c: c.update(bound=0),
                   lambda c: c["cusps"][0]["orders"].__setitem__(0, -4),
                   lambda c: c.update(multiplier={"5": 2}), lambda c: c.update(scale="2")):
        bad = copy.deepcopy(cert)
        change(bad)
        assert recheck(*P5, bad) != []


def test_a_wrong_recognition_is_caught_beyond_a_tiny_bound(monkeypatch):
    # the guard against a fault in the recognition runs to --order, not only to the bound
    # (one coefficient here): X below agrees with Ramanujan's right side at q^0 but not at
    # q^5, and is (wrongly, on purpose) recognised as that right side
    module = importlib.import_module("qseries.modularity.dissection")
    real = module.recognise
    fake = real(parse(P5[1]))
    x = "5 (q^5;q^5)_inf^4 (q^10;q^10)_inf/(q;q)_inf^6"
    monkeypatch.setattr(module, "recognise",
                        lambda node: fake if node == parse(x) else real(node))
    r = prove(P5[0], x, order=20)
    assert not r.proved and "internal fault" in r.reason
