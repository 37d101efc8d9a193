"""Proofs by a Sturm or valence bound, each certificate re-verified by the independent
re-checker of tests/modularity/recheck.py."""

import copy
import importlib
from fractions import Fraction

import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from qseries import check, parse, show
from qseries.modularity.eta import EtaQuotient
from qseries.modularity.gamma0 import divisors
from qseries.modularity.prove import looks_provable, prove
from qseries.report.proof import proof_json

from .recheck import multiplied_through, recheck

# Jacobi's quartic identity theta_3^4 = theta_2^4 + theta_4^4 (C. G. J. Jacobi, Fundamenta
# Nova, 1829; E. T. Whittaker and G. N. Watson, A Course of Modern Analysis, §21.3, from
# memory)
JACOBI = ("theta_3(q)^4", "theta_2(q)^4 + theta_4(q)^4")
# the Borweins' cubic identity a^3 = b^3 + c^3 with b(q) = eta(tau)^3/eta(3 tau),
# c(q) = 3 eta(3 tau)^3/eta(tau) (J. M. Borwein, P. B. Borwein and F. G. Garvan, Trans. AMS
# 343 (1994), from memory); a(q) = sum_{m,n} q^(m^2+mn+n^2) written as
# phi(q) phi(q^3) + 4 q psi(q^2) psi(q^6) (B. C. Berndt, Number Theory in the Spirit of
# Ramanujan, AMS 2006, chapter 4, from memory; checked below against the Lambert series)
A_THETA = "phi(q) phi(q^3) + 4 q psi(q^2) psi(q^6)"
A_LAMBERT = "1 + 6 sum_{n>=1} (q^(3n-2)/(1-q^(3n-2)) - q^(3n-1)/(1-q^(3n-1)))"
B3_PLUS_C3 = "eta(q)^9/eta(q^3)^3 + 27 eta(q^3)^9/eta(q)^3"


def _proved(lhs, rhs):
    r = prove(lhs, rhs)
    assert r.proved and r.holds is True, r.verdict
    assert recheck(lhs, rhs, proof_json(r)["certificate"]) == []
    return r.certificate


def test_jacobi_quartic_needs_two_coefficients():
    # weight 2 on Gamma_0(4): index 6, Sturm's bound 2*6/12 = 1, so q^0 and q^1 suffice
    c = _proved(*JACOBI)
    assert (c.method, c.level, c.weight, c.bound, c.coefficients) == ("sturm", 4, 2, 1, 2)
    assert c.character_text == "trivial"


def test_jacobi_quartic_as_modular_functions():
    # the methods guide's worked example: 1 = f_1 + 16 f_2 at level 4, valence bound 1
    c = _proved("1", "eta(q)^16 eta(q^2)^-24 eta(q^4)^8 + 16 eta(q)^8 eta(q^2)^-24 eta(q^4)^16")
    assert (c.method, c.level, c.weight, c.bound) == ("valence", 4, 0, 1)
    assert [x.least for x in c.cusps] == [0, -1, 0]


def test_theta_3_as_an_eta_quotient():
    # theta_3(q) = eta(2 tau)^5 / (eta(tau)^2 eta(4 tau)^2) (Berndt, Ramanujan's Notebooks
    # III, Entry 22(i), from memory): weight 1/2, so the valence method
    c = _proved("theta_3(q)", "eta(q^2)^5/(eta(q)^2 eta(q^4)^2)")
    assert c.method == "valence" and c.weight == Fraction(1, 2) and c.level == 4


def test_theta_3_split_by_parity():
    # theta_3(q) = theta_3(q^4) + theta_2(q^4): the terms n even and n odd (Whittaker and
    # Watson §21.3, from memory)
    c = _proved("theta_3(q)", "theta_3(q^4) + theta_2(q^4)")
    assert c.method == "valence" and c.level == 16


def test_ramanujan_phi_squared():
    # phi(q)^2 - phi(-q)^2 = 8 q psi(q^4)^2 (Berndt, Ramanujan's Notebooks III, Entry
    # 25(v), from memory)
    c = _proved("phi(q)^2 - phi(-q)^2", "8 q psi(q^4)^2")
    assert c.method == "sturm" and c.weight == 1 and c.character_text == "(-1/d)"


def test_borwein_cubic_identity():
    # first the theta form of a(q) against its Lambert series (evidence: the Lambert series
    # is not recognised, see below), then the proof with a in its theta form
    assert check(A_LAMBERT, A_THETA, 300).holds is True
    c = _proved(f"({A_THETA})^3", B3_PLUS_C3)
    assert (c.method, c.level, c.weight) == ("sturm", 12, 3)
    assert c.character_text == "(-3/d)"


def test_borwein_cubic_with_the_lambert_series_is_refused():
    r = prove(f"({A_LAMBERT})^3", B3_PLUS_C3, order=60)
    assert not r.proved and r.certificate is None
    assert "left side is not recognised" in r.reason and "Lambert" in r.reason
    assert r.holds is True                    # the ordinary evidence check agrees


def test_eta_quotient_against_a_lambert_series_is_refused():
    # eta(tau)^5/eta(5 tau) = 1 - 5 sum_n (n/5) n q^n/(1 - q^n) (Ramanujan; Berndt, Number
    # Theory in the Spirit of Ramanujan, chapter 3, from memory): Eisenstein series are not
    # recognised, so no proof; the evidence agrees
    lambert = ("1 - 5 sum_{k>=0} ((5k+1) q^(5k+1)/(1-q^(5k+1)) - (5k+2) q^(5k+2)/(1-q^(5k+2))"
               " - (5k+3) q^(5k+3)/(1-q^(5k+3)) + (5k+4) q^(5k+4)/(1-q^(5k+4)))")
    r = prove("eta(q)^5/eta(q^5)", lambert, order=200)
    assert not r.proved and r.holds is True and r.check.order_verified == 200
    assert r.reason.startswith("the right side is not recognised") and "Lambert" in r.reason
    assert "Eisenstein series are not recognised" in r.reason


@pytest.mark.parametrize("lhs, rhs", [
    # Jacobi's quartic times theta_3^4/theta_4^4 (constructed): weight 2, poles at 1/2
    ("theta_3(q)^8/theta_4(q)^4", "theta_3(q)^4 theta_2(q)^4/theta_4(q)^4 + theta_3(q)^4"),
    # Jacobi's quartic as modular functions: weight 0, poles at 1/2
    ("1", "eta(q)^16 eta(q^2)^-24 eta(q^4)^8 + 16 eta(q)^8 eta(q^2)^-24 eta(q^4)^16"),
    # the terms n even and n odd of theta_3, and theta_3 + theta_4 = 2 theta_3(q^4)
    # (Whittaker and Watson §21.3, from memory): weight 1/2
    ("theta_3(q)", "theta_3(q^4) + theta_2(q^4)"),
    ("theta_3(q) + theta_4(q)", "2 theta_3(q^4)"),
])
def test_multiplying_through_never_needs_fewer_coefficients_than_the_valence_bound(lhs, rhs):
    # issue 15 item 2: where a form is not holomorphic, "multiply through by a suitable eta
    # quotient (search a small set) to make the identity one between holomorphic forms".
    # The prover multiplies through by 1/f_j (one of the terms), which makes every term a
    # modular function, and uses the valence bound; the re-checker's own search finds a
    # multiplier M making every M f_i a holomorphic form of integral weight (so Sturm's bound
    # applies, the literature's route), and that route never needs fewer coefficients
    r = prove(lhs, rhs)
    cert = proof_json(r)["certificate"]
    assert r.proved and cert["method"] == "valence" and recheck(lhs, rhs, cert) == []
    high = multiplied_through(cert)
    assert high is not None and Fraction(cert["checked"]["to"]) <= high


def test_a_difference_beyond_a_naive_order_is_caught_within_the_bound():
    # constructed: add Delta(25 tau) = q^25 (q^25;q^25)^24 to the right side of Jacobi's
    # quartic raised to the 6th power; both sides are forms of weight 12 on Gamma_0(100)
    # (Sturm's bound 180), they agree below q^25 and differ there
    lhs, rhs = "theta_3(q)^24", "(theta_2(q)^4 + theta_4(q)^4)^6 + eta(q^25)^24"
    assert check(lhs, rhs, 20).holds is True           # a naive check is fooled
    r = prove(lhs, rhs)
    assert not r.proved and r.holds is False and r.reason is None
    assert r.certificate.bound == 180 and r.certificate.level == 100
    assert r.check.first_mismatch.exponent == 25 <= r.certificate.high


def test_rogers_ramanujan_is_refused_with_the_reason():
    # the first Rogers-Ramanujan identity (Andrews, Theory of Partitions, ch. 7): neither
    # side is an eta quotient (the product is a generalised one)
    r = prove("sum_{k>=0} q^(k^2)/(q;q)_k", "1/((q;q^5)_inf (q^4;q^5)_inf)", order=100)
    assert not r.proved and r.certificate is None and r.holds is True
    assert "left side is not recognised" in r.reason
    assert "right side is not recognised" in r.reason and "generalised eta" in r.reason


def test_different_weights_and_powers_of_q_are_refused():
    r = prove("theta_3(q)", "theta_3(q)^2", order=10)
    assert "different weights" in r.reason and r.holds is False
    r = prove("q eta(q)^24", "eta(q)^24", order=10)
    assert "different powers of q" in r.reason


def test_looks_provable():
    assert looks_provable(*JACOBI)
    assert not looks_provable("sum_{k>=0} q^(k^2)/(q;q)_k", "1/((q;q^5)_inf (q^4;q^5)_inf)")
    assert not looks_provable("theta_3(q)", "theta_3(q)^2")


@pytest.mark.parametrize("tamper", [
    lambda c: c.update(bound=c["bound"] - 1),
    lambda c: c.update(level=c["level"] * 2),
    lambda c: c["cusps"][0]["orders"].__setitem__(0, 5),
    lambda c: c["checked"].update(to=0),
    lambda c: c["terms"][1].update(coefficient="-2"),
    lambda c: c.update(index=7),
])
def test_the_rechecker_rejects_a_tampered_certificate(tamper):
    r = prove(*JACOBI)
    cert = copy.deepcopy(proof_json(r)["certificate"])
    tamper(cert)
    assert recheck(*JACOBI, cert) != []


def test_the_rechecker_rejects_sturm_at_half_integral_weight():
    # theta_3 = eta(2)^5/(eta(1)^2 eta(4)^2) passes Newman's sums at level 4, but the
    # criteria of Ono's Theorem 1.64 are for integral weight: a certificate claiming
    # Sturm's bound for weight 1/2 terms is refused (the prover uses the valence method)
    lhs, rhs = "theta_3(q)", "eta(q^2)^5/(eta(q)^2 eta(q^4)^2)"
    cert = copy.deepcopy(proof_json(prove(lhs, rhs))["certificate"])
    assert cert["method"] == "valence" and recheck(lhs, rhs, cert) == []
    cert.update(method="sturm", divisor=None)
    assert any("integral weight" in x for x in recheck(lhs, rhs, cert))


def test_a_wrong_recognition_is_caught_beyond_a_tiny_bound(monkeypatch):
    # the guard against a fault in the recognition: here theta_4(q) = 1 - 2q + ... is
    # (wrongly, on purpose) recognised as theta_3's eta quotient 1 + 2q + ...; the valence
    # bound is then 0, and q^0 alone agrees, so a guard only up to the bound would let a
    # false identity through.  Each side is compared with its recognised form to --order
    prove_module = importlib.import_module("qseries.modularity.prove")
    real = prove_module.recognise
    theta_3 = real(parse("eta(q^2)^5/(eta(q)^2 eta(q^4)^2)"))
    monkeypatch.setattr(prove_module, "recognise",
                        lambda node: theta_3 if node == parse("theta_4(q)") else real(node))
    r = prove("theta_4(q)", "eta(q^2)^5/(eta(q)^2 eta(q^4)^2)", order=20)
    assert not r.proved and "internal fault" in r.reason


def test_the_rechecker_compares_each_side_with_its_terms_beyond_a_tiny_bound():
    # theta_3's certificate (bound 0: q^0 alone) offered for theta_4(q) = theta_3's eta
    # quotient, false from q^1 on: the sides agree at q^0, so only a comparison of each side
    # with the certificate's terms beyond the bound finds that theta_4 is not those terms
    rhs = "eta(q^2)^5/(eta(q)^2 eta(q^4)^2)"
    cert = proof_json(prove("theta_3(q)", rhs))["certificate"]
    assert cert["bound"] == 0 and recheck("theta_3(q)", rhs, cert) == []
    assert any("lhs differs from its terms" in x for x in recheck("theta_4(q)", rhs, cert))


def test_a_side_that_loses_precision_is_compared_further():
    # f(q) = (q^2;q^2)^3/((q;q)(q^4;q^4)) (Berndt, Ramanujan's Notebooks III, Entry 22(iii),
    # from memory), so f(q^4)^-2 = q^(1/3) eta(4 tau)^2 eta(16 tau)^2 / eta(8 tau)^6; the
    # negative power of q in the quotient costs the right side precision, so a check to the
    # bound alone compares nothing (it said "could be compared only below q^0")
    c = _proved("f(q^4)^-2", "q^(1/3) eta(q^4)^2 eta(q^8)^-6 eta(q^16)^2")
    assert c.high == 0


def test_levels_beyond_the_limit_are_refused():
    s = " + ".join(f"eta(q^{i})^24" for i in range(1, 40))
    r = prove(s, s, order=5)
    assert not r.proved and "levels above" in r.reason


def test_a_negative_power_of_q_in_front():
    # q^-5 Delta = q^-5 Delta: both sides times q^5 are Delta (the check starts at q^-4)
    c = _proved("q^-5 eta(q)^24", "q^-5 (q;q)_inf^24 q")
    assert c.shift == -5 and c.low == -4 and c.high == -4


def _catalogue_cases():
    from qseries.catalogue import SHIPPED, load_entries
    from qseries.lang.parser import definitions_of

    out = []
    for e in load_entries([SHIPPED]):
        defs = definitions_of(list(e.definitions))
        left, right = parse(e.left, (), defs), parse(e.right, (), defs)
        if looks_provable(left, right):
            out.append((e, left, right))
    return out


def test_the_catalogue_entries_that_look_provable():
    # every shipped identity (each with its published source in identities/) that both
    # sides recognise is proved when the file says it holds, and found to differ when the
    # file records the printed form as failing (Berndt IV, ch. 25, Entry 27 (27.1): the
    # printed form fails at q^4, Somos' correction is proved at level 252); each
    # certificate passes the independent re-checker
    cases = _catalogue_cases()
    assert len(cases) >= 20
    ids = {e.ident for e, _, _ in cases}
    assert {"jacobi-quartic", "berndt-iv-25-27-1", "berndt-iv-25-27-1-printed"} <= ids
    for e, left, right in cases:
        r = prove(left, right, order=50)
        if e.expect == "fails":
            assert r.holds is False and r.reason is None, e.ident
            assert r.check.first_mismatch.exponent == e.fails_at, e.ident
        else:
            assert r.proved, (e.ident, r.verdict)
            assert recheck(show(left), show(right), proof_json(r)["certificate"]) == [], e.ident


@settings(max_examples=40, deadline=None)
@given(st.sampled_from([6, 8, 12, 18]), st.data(), st.integers(1, 3))
def test_a_perturbed_identity_is_never_proved(n, data, c):
    # Jacobi's quartic plus c * H for a random eta quotient H of weight 2 with integral
    # exponents: the sides differ (H != 0), so prove must never say PROVED, and when it
    # computed a bound the mismatch lies at or below it.  r_1 and r_n are solved for so that
    # sum r_d = 4 and sum d r_d = 0 (mod 24) (n - 1 is prime to 24)
    r = {d: data.draw(st.integers(-6, 6), label=f"r_{d}") for d in divisors(n)[1:-1]}
    s, t = sum(r.values()), sum(d * e for d, e in r.items())
    r_n = (pow(n - 1, -1, 24) * (-t - (4 - s))) % 24
    r_n -= 24 if r_n >= 12 else 0
    r[n], r[1] = r_n, 4 - s - r_n
    h = EtaQuotient.of(r)
    assume(h.weight == 2 and h.offset.denominator == 1 and h.offset < 30)
    lhs, rhs = JACOBI[0], f"{JACOBI[1]} + {c} {h.text()}"
    result = prove(lhs, rhs, order=30)
    assert not result.proved
    if result.reason is None:
        assert result.holds is False
        assert result.check.first_mismatch.exponent <= result.certificate.high
