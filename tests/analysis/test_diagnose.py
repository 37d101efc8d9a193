"""Each diagnosis kind, exercised by a deliberately broken published identity."""
import importlib

from qseries import check
from qseries.analysis.diagnose import diagnose

RR2_SUM = "sum_{k>=0} q^(k^2+k)/(q;q)_k"
RR2_PRODUCT = "1/((q^2;q^5)_inf (q^3;q^5)_inf)"   # second Rogers-Ramanujan identity


def kinds(lhs, rhs, order=200):
    return [h.kind for h in diagnose(check(lhs, rhs, order=order))]


def test_power_of_q():
    assert kinds(RR2_SUM, f"q^2 {RR2_PRODUCT}") == ["shift"]


def test_sign_and_constant():
    # Jacobi's identity with a wrong sign, and with a stray factor 2
    assert kinds("(q;q)_inf^3", "-sum_{n>=0} (-1)^n (2n+1) q^(n(n+1)/2)") == ["constant"]
    assert kinds("2 (q;q)_inf^3", "sum_{n>=0} (-1)^n (2n+1) q^(n(n+1)/2)") == ["constant"]


def test_dilation():
    # Euler's (-q;q)_inf = 1/(q;q^2)_inf, misprinted with q^2 for q on the right
    assert kinds("(-q;q)_inf", "1/(q^2;q^4)_inf") == ["dilation"]


def test_missing_product_factor():
    assert kinds(RR2_SUM, f"{RR2_PRODUCT} / (q^20;q^20)_inf") == ["product-factor"]
    assert kinds(RR2_SUM, f"{RR2_PRODUCT} (1 - q^4)") == ["product-factor"]


def test_finitely_many_terms():
    # the Durfee square identity with two planted terms
    r = check("1/(q;q)_inf", "sum_{k>=0} q^(k^2)/(q;q)_k^2 + q^11 - 2q^40", order=200)
    hints = diagnose(r)
    assert [h.kind for h in hints] == ["polynomial"]
    assert "-q^11 + 2q^40" in hints[0].message


def test_no_hint_when_it_holds_or_nothing_fits():
    assert diagnose(check(RR2_SUM, RR2_PRODUCT, order=100)) == []
    assert kinds("1/(q;q)_inf", "1/(q;q)_inf + sum_{n>=1} q^(n^2)") == []


def test_swapped_rogers_ramanujan_sides_show_the_ratio():
    r = check("sum_{k>=0} q^(k^2)/(q;q)_k", RR2_PRODUCT, order=200)
    (hint,) = diagnose(r)
    assert hint.kind == "product-factor"
    assert "(q^2, q^3;q^5)_inf (q, q^4;q^5)_inf^-1" in hint.message


def test_hints_after_a_modular_check_claim_only_what_was_computed():
    # regression: after a modular check the two sides are recomputed exactly only just past
    # the mismatch, so a hint must not speak of the whole order.  (The planted q^100 of the
    # first check gives no hint at all, so the hints are looked at in three checks that give
    # one each.)  p(100) from FLINT's partitions_p
    from qseries.backend import partitions_p
    r = check("1/(q;q)_inf", "1/(q;q)_inf + q^100", order=6000, method="modular", seed=1)
    assert r.first_mismatch.lhs == partitions_p(100)
    for lhs, rhs, kind in [("(-q;q)_inf", "1/(q^2;q^4)_inf", "dilation"),
                           (RR2_SUM, f"q^2 {RR2_PRODUCT}", "shift"),
                           ("sum_{k>=0} q^(k^2)/(q;q)_k", RR2_PRODUCT, "polynomial")]:
        hints = diagnose(check(lhs, rhs, order=6000, method="modular", seed=1))
        assert [h.kind for h in hints] == [kind], (lhs, rhs)
        assert "6000" not in hints[0].message


def test_the_product_factor_hint_looks_at_a_bounded_number_of_terms(monkeypatch):
    # issue 11 (hangs): a sum of valuation -250000 checked to order 30 has 250030 known
    # terms; the ratio's product form over all of them ran for minutes after the verdict.
    # The hint examines at most HINT_PRODUCT_TERMS terms of the ratio.  The same at a tenth
    # of the scale (at full scale the product form of 3000 terms alone takes 5 s): valuation
    # -2500, 2530 known terms, at most 300 looked at
    dg = importlib.import_module("qseries.analysis.diagnose")
    monkeypatch.setattr(dg, "HINT_PRODUCT_TERMS", 300)

    seen = []
    real = dg.product_form

    def spy(s, order=100):
        seen.append(s.precision - s.valuation)
        return real(s, order)

    monkeypatch.setattr(dg, "product_form", spy)
    r = check("sum_{k>=0} q^(k^2-100k)", "q^(-2500)", 30, method="exact")
    assert not r.holds and r.lhs.precision - r.lhs.valuation == 2530
    dg.diagnose(r)
    assert seen and max(seen) <= 300


def test_a_hint_from_a_bounded_look_says_how_far_it_looked():
    # the Rogers-Ramanujan sum against G(q) with a missing (q^20;q^20)_inf factor, compared
    # beyond HINT_PRODUCT_TERMS: the ratio is still recognised, and the hint says where
    dg = importlib.import_module("qseries.analysis.diagnose")

    n = dg.HINT_PRODUCT_TERMS + 500
    r = check("sum_{k>=0} q^(k^2)/(q;q)_k",
              "1/((q;q^5)_inf (q^4;q^5)_inf (q^20;q^20)_inf)", n, method="exact")
    hints = dg.diagnose(r)
    assert [h.kind for h in hints] == ["product-factor"]
    assert f"q^{dg.HINT_PRODUCT_TERMS}" in hints[0].message


def test_a_ratio_of_one_names_no_factor():
    # a late single-term mismatch: the ratio's first terms are 1, which is no missing factor
    r = check("1/(q;q)_inf", "1/(q;q)_inf + q^297", order=300)
    assert r.holds is False
    assert not [h for h in diagnose(r) if h.kind == "product-factor"]
