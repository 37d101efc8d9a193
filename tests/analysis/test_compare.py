"""The comparison of two sides: verdicts, first mismatch, order boundary, precision loss."""

from fractions import Fraction

import pytest

from qseries import check
from qseries.errors import ArgumentError, ArgumentTypeError

RR1_SUM = "sum_{k>=0} q^(k^2)/(q;q)_k"
RR1_PRODUCT = "1/((q;q^5)_inf (q^4;q^5)_inf)"


def test_defect_at_order_boundary():
    # a defect planted at q^150 is invisible modulo q^150 and seen modulo q^151
    broken = f"{RR1_PRODUCT} + q^150"
    assert check(RR1_SUM, broken, order=150).holds
    r = check(RR1_SUM, broken, order=151)
    assert not r.holds
    assert r.first_mismatch.exponent == 150
    assert r.first_mismatch.rhs - r.first_mismatch.lhs == 1


def test_misprinted_modulus_is_located_exactly():
    # Rogers-Ramanujan with the modulus 5 misprinted as 6: 1/((q;q^6)(q^5;q^6)) counts
    # partitions into parts = +-1 mod 6; the first difference is at q^4, where the sum side
    # has 2 (4, 3+1) and the product side 1 (1+1+1+1) -- counted by hand
    r = check(RR1_SUM, "1/((q;q^6)_inf (q^5;q^6)_inf)", order=100)
    assert not r.holds
    assert (r.first_mismatch.exponent, r.first_mismatch.lhs, r.first_mismatch.rhs) == (4, 2, 1)


def test_extra_factor_is_located_at_its_first_effect():
    # an extra factor 1/(q^20;q^20)_inf changes the product side first at q^20 (by 1)
    r = check("sum_{k>=0} q^(k^2+k)/(q;q)_k",
              "1/((q^2;q^5)_inf (q^3;q^5)_inf (q^20;q^20)_inf)", order=300)
    assert r.first_mismatch.exponent == 20
    assert r.first_mismatch.rhs - r.first_mismatch.lhs == 1


def test_neighbours_show_coefficients_around_the_mismatch():
    r = check("1/(1-q)", "1/(1-q) + q^5", order=10)
    rows = r.neighbours(radius=1)
    assert rows == [(4, 1, 1), (5, 1, 2), (6, 1, 1)]


def test_precision_lost_to_negative_powers_is_reported():
    # O(q^10) inside, shifted by q^-3: only the coefficients below q^7 are known
    r = check("q^-3 (1/(1-q) + O(q^10))", "q^-3/(1-q)", order=20)
    assert r.holds
    assert r.order_verified == 7


def test_negative_powers_are_compensated_when_possible():
    r = check("q^-5 sum_{k>=0} q^(k+5)", "1/(1-q)", order=50)
    assert r.holds and r.order_verified == 50


def test_fractional_offsets_compare_by_exponent():
    r = check("eta(q)", "q^(1/24) (q;q)_inf", order=100)
    assert r.holds
    r = check("eta(q)", "(q;q)_inf", order=100)
    assert not r.holds
    assert r.first_mismatch.exponent == 0
    assert r.first_mismatch.lhs == 0 and r.first_mismatch.rhs == 1
    r = check("eta(q)", "q^(1/24) (q;q)_inf + q^(25/24)", order=100)
    assert r.first_mismatch.exponent == Fraction(25, 24)


def test_rational_coefficients():
    r = check("1/(2-q)", "sum_{k>=0} q^k/2^(k+1)", order=40)
    assert r.holds


def test_verdict_is_honest():
    r = check("(q;q)_inf", "(q;q)_inf", order=30)
    assert "evidence, not a proof" in r.verdict


@pytest.mark.parametrize("order, error", [(0, ArgumentError), (-3, ArgumentError),
                                          (True, ArgumentTypeError), (2.5, ArgumentTypeError)])
def test_bad_orders(order, error):
    with pytest.raises(error, match=r"order must be an? (positive |non-negative )?integer"):
        check("q", "q", order=order)


def test_modular_method_agrees_and_reports_primes():
    r = check(RR1_SUM, RR1_PRODUCT, order=3000, method="modular", seed=11)
    assert r.holds and r.method == "modular" and len(r.primes) == 3
    assert all(2**61 <= p < 2**62 for p in r.primes)
    assert "modulo the primes" in r.verdict and "not a proof" in r.verdict


def test_modular_method_locates_and_recomputes_the_mismatch_exactly():
    # p(n) via 1/(q;q)_inf against the Durfee sum with a planted defect at q^1234;
    # the coefficients reported are the exact integers, p(1234) from FLINT
    from qseries.backend import partitions_p
    r = check("1/(q;q)_inf", "sum_{k>=0} q^(k^2)/(q;q)_k^2 + q^1234", order=2000,
              method="modular", primes=2, seed=5)
    assert not r.holds
    m = r.first_mismatch
    assert m.exponent == 1234
    assert m.lhs == partitions_p(1234) and m.rhs == partitions_p(1234) + 1


def test_modular_method_with_rational_coefficients_and_auto_choice():
    assert check("1/(2-q)", "sum_{k>=0} q^k/2^(k+1)", order=200, method="modular").holds
    assert check("q", "q", order=10, method="auto").method == "exact"
    # above AUTO_MODULAR_ORDER the choice follows the coefficients' size (issue 19, item 5):
    # small ones (a monomial; theta_3^2, whose coefficients r_2(n) stay tiny) stay exact,
    # partition numbers (about sqrt(n) digits) go modular
    assert check("q", "q", order=6000, method="auto").method == "exact"
    assert check("theta_3(q)^2", "1 + 4 sum_{n>=1} q^n/(1+q^(2n))", order=6000,
                 method="auto").method == "exact"
    assert check("1/(q;q)_inf", "1/(q;q)_inf", order=6000, method="auto").method == "modular"


def test_modular_method_agrees_with_exact_on_a_broken_identity():
    lhs, rhs = RR1_SUM, "1/((q;q^6)_inf (q^5;q^6)_inf)"
    exact = check(lhs, rhs, order=100)
    modular = check(lhs, rhs, order=100, method="modular")
    assert exact.first_mismatch == modular.first_mismatch


def test_modular_primes_in_worker_processes_give_the_same_verdict(monkeypatch):
    from qseries.analysis import compare
    monkeypatch.setattr(compare, "PARALLEL_ORDER", 100)
    broken = f"{RR1_PRODUCT} + q^300"
    r = check(RR1_SUM, broken, order=400, method="modular", seed=3)
    assert not r.holds and r.first_mismatch.exponent == 300
    assert check(RR1_SUM, RR1_PRODUCT, order=400, method="modular", seed=3).holds


def test_modular_cross_multiplication_keeps_the_order_with_negative_powers():
    # the modular method compares A/B = C/D as A*D = C*B; a side of negative valuation times
    # the other side's denominator (known to the order) would be known to less than the order
    for lhs in ("q^-1 + sum_{k>=0} q^(k^2)/(q;q)_k", "q^-1 (sum_{k>=0} q^(k^2)/(q;q)_k)"):
        r = check(lhs, RR1_PRODUCT, order=500, method="modular", seed=2)
        exact = check(lhs, RR1_PRODUCT, order=500, method="exact")
        assert r.order_verified == exact.order_verified == 500
        assert r.first_mismatch == exact.first_mismatch
        assert r.first_mismatch.exponent == -1
    r = check("q^-1 (sum_{k>=0} q^(k^2)/(q;q)_k)", "q^-1 " + RR1_PRODUCT, order=500,
              method="modular")
    assert r.holds and r.order_verified == 500


def test_a_failed_weighted_retry_reports_both_reasons(monkeypatch):
    # found in review: an exact check at order 400 with extra variables ran for seconds and
    # then reported only the first attempt's "does not converge", although the weighted
    # retry had stopped at a size limit whose message says what to do
    from qseries.analysis import compare
    from qseries.errors import DomainError, UnableError

    calls = []

    def fake(lnode, rnode, order, ring, t0, say, names, w):
        calls.append(w)
        if len(calls) == 1:
            raise DomainError("first reason", weights_may_help=True)
        raise UnableError("second reason: try --method modular")

    monkeypatch.setattr(compare, "_check_exact", fake)
    with pytest.raises(UnableError) as info:
        compare.check("z q", "z q", 10, method="exact")
    assert "first reason" in str(info.value) and "second reason" in str(info.value)
    assert len(calls) == 2


def test_check_reports_each_evaluated_part_of_each_side_in_order():
    # Rogers-Ramanujan (Andrews, The Theory of Partitions, Cor. 7.9): one sum on the left,
    # two products on the right
    said = []
    assert check(RR1_SUM, RR1_PRODUCT, order=100, method="exact", progress=said.append).holds
    assert said[0] == "evaluating the left side"
    assert said[1].startswith("left side: evaluated part 1 of 1, sum_{k>=0}")
    assert said[2] == "evaluating the right side"
    assert said[3:] == ["right side: evaluated part 1 of 2, (q;q^5)_inf",
                        "right side: evaluated part 2 of 2, (q^4;q^5)_inf"]


def test_the_modular_method_reports_the_parts_per_prime():
    said = []
    assert check(RR1_SUM, RR1_PRODUCT, order=100, method="modular", primes=2, seed=3,
                 progress=said.append).holds
    parts = [t.split(",")[0:2] for t in said if "evaluated part" in t]
    assert parts == [["prime 1 of 2", " left side: evaluated part 1 of 1"],
                     ["prime 1 of 2", " right side: evaluated part 1 of 2"],
                     ["prime 1 of 2", " right side: evaluated part 2 of 2"],
                     ["prime 2 of 2", " left side: evaluated part 1 of 1"],
                     ["prime 2 of 2", " right side: evaluated part 1 of 2"],
                     ["prime 2 of 2", " right side: evaluated part 2 of 2"]]
    assert said.index("comparing modulo prime 2 of 2") == 4      # between the primes


def test_no_progress_no_part_texts(monkeypatch):
    # without a progress callback the engine is given none (no texts are made)
    from qseries.engine import evaluator

    made = []
    real = evaluator.Evaluator.__init__

    def spy(self, *args, **kwargs):
        made.append(kwargs.get("progress"))
        real(self, *args, **kwargs)

    monkeypatch.setattr(evaluator.Evaluator, "__init__", spy)
    assert check(RR1_SUM, RR1_PRODUCT, order=50, method="exact").holds
    assert check(RR1_SUM, RR1_PRODUCT, order=50, method="modular", primes=1).holds
    assert made and all(p is None for p in made)


def test_auto_probe_extrapolates_the_size_of_partition_numbers():
    # the largest coefficient of 1/(q;q)_inf below q^N is p(N - 1) (FLINT's partition
    # numbers): the extrapolation from order 1024 lands within 20% of its size
    from qseries.analysis.compare import probe_bits
    from qseries.backend import partitions_p
    from qseries.lang import parse
    for order in (6000, 20_000):
        true = partitions_p(order - 1).bit_length()
        got = probe_bits(parse("1/(q;q)_inf"), parse("1"), order)
        assert 0.8 * true <= got <= 1.2 * true, (order, got, true)


def test_auto_choice_weighs_the_number_of_primes():
    # p(n) near order 6000 has about 270 bits: more expensive exactly than three primes,
    # cheaper than ten (chooser.auto_costs); the old rule (exact up to 128 bits) ignored
    # the number of primes
    from qseries.analysis.compare import auto_method
    from qseries.lang import parse
    from qseries.series import ZZ
    lhs, rhs = parse("1/(q;q)_inf"), parse("sum_{k>=0} q^(k^2)/(q;q)_k^2")
    assert auto_method(lhs, rhs, 6000, ZZ, primes=3) == "modular"
    assert auto_method(lhs, rhs, 6000, ZZ, primes=10) == "exact"
    assert check("1/(q;q)_inf", "1/(q;q)_inf", order=6000, method="auto",
                 primes=10).method == "exact"


def test_an_undefined_side_under_the_modular_method_is_not_blamed_on_the_prime():
    # 1/(1-1) is undefined exactly: the modular check's error said "(modulo the prime p; try
    # --method exact)", which fails the same way; it now names the side and its column
    from qseries.errors import DomainError
    with pytest.raises(DomainError) as err:
        check("1/(1-q)", "q + 1/(1-1)", order=100, method="modular")
    assert "modulo the prime" not in str(err.value) and "try --method exact" not in str(err.value)
    assert err.value.side == "right" and err.value.position == 8
