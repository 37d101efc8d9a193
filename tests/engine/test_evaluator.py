"""The evaluator: sums, products, q-Pochhammer conventions, honest termination, errors."""

from fractions import Fraction

import pytest

from qseries.engine import Evaluator, evaluate
from qseries.errors import DomainError, UnableError
from qseries.lang import parse
from qseries.series import QQ, ZZ, Series


def coeffs(text: str, n: int) -> list:
    return evaluate(text, n).coefficient_list(n)


def test_sums_with_finite_and_infinite_ranges():
    assert coeffs("sum_{k=0}^{3} q^k", 6) == [1, 1, 1, 1, 0, 0]
    assert coeffs("sum_{k=2}^{1} q^k", 3) == [0, 0, 0]          # empty sum
    assert coeffs("sum_{k>=3} q^k", 6) == [0, 0, 0, 1, 1, 1]
    assert coeffs("sum_{k=-inf}^{-1} q^(k^2)", 10) == [0, 1, 0, 0, 1, 0, 0, 0, 0, 1]
    assert coeffs("sum_{k=-inf}^{inf} q^(k^2)", 10) == [1, 2, 0, 0, 2, 0, 0, 0, 0, 2]
    assert evaluate("sum_{k=1}^{4} k", 5) == Series.constant(10)


def test_sum_takes_the_term_that_follows():
    assert coeffs("sum_{k=0}^{2} q^k 2 + 1", 4) == [3, 2, 2, 0]


def test_nested_sums_with_outer_variable_in_the_inner_range():
    # sum_{n=0}^{3} sum_{k=0}^{n} q^(n+k): exponents n+k for 0<=k<=n<=3
    got = coeffs("sum_{n=0}^{3} sum_{k=0}^{n} q^(n+k)", 8)
    expected = [0] * 8
    for n in range(4):
        for k in range(n + 1):
            expected[n + k] += 1
    assert got == expected


def test_products():
    assert evaluate("prod_{n>=1} (1-q^n)", 40) == evaluate("(q;q)_inf", 40)
    # (1-q)(1-q^2)(1-q^3) = 1 - q - q^2 + q^4 + q^5 - q^6, multiplied out by hand
    assert coeffs("prod_{n=1}^{3} (1-q^n)", 8) == [1, -1, -1, 0, 1, 1, -1, 0]
    assert evaluate("prod_{n>=1} (1-q^n)^-1", 60) == evaluate("1/(q;q)_inf", 60)
    assert evaluate("prod_{n>=1} (1+q^(2n-1))/(1-q^(2n))", 50) == \
        evaluate("(-q;q^2)_inf/(q^2;q^2)_inf", 50)


def test_pochhammer_conventions():
    assert evaluate("(q;q)_0", 5) == Series.constant(1)
    # (a;q)_n = 1/(a q^n;q)_(-n) for negative n
    assert evaluate("(q^3;q)_(-2)", 10) == evaluate("1/((q;q)_2)", 10)
    assert evaluate("(q,q^2;q^3)_inf", 30) == evaluate("(q;q^3)_inf (q^2;q^3)_inf", 30)
    assert evaluate("(1;q)_3", 10).is_zero()
    assert evaluate("(2;q)_2", 4) == evaluate("(1-2)(1-2q)", 4)


def test_stepping_fast_path_matches_direct_evaluation():
    for text in ["sum_{k>=0} q^(k^2)/(q;q)_k^2",
                 "sum_{k>=0} (-1)^k q^(k(k+1)/2) (q;q^2)_k/(q;q)_(2k+1)",
                 "sum_{k>=0} q^(k^2+k) (-q;q)_k / (q;q)_(2k+1)",
                 "sum_{k>=0} q^(2k) (q^8;q^2)_(k-3)"]:
        fast = Evaluator(ZZ).evaluate(parse(text), 120)
        slow = Evaluator(ZZ, strategies=["direct"]).evaluate(parse(text), 120)
        assert fast == slow, text


def test_rational_coefficients_and_exponents():
    s = evaluate("1/(2-q)", 4)
    assert s.ring == QQ and s.coefficient_list(4) == [Fraction(1, 2 ** (k + 1)) for k in range(4)]
    assert evaluate("q^(1/3) q^(2/3)", 5) == evaluate("q", 5)


def test_negative_powers_raise_the_working_order():
    s = evaluate("q^-10 (q;q)_inf", 5)
    assert s.precision == 5
    assert s.valuation == -10


@pytest.mark.parametrize("text", [
    "sum_{k>=0} 1/(q;q)_k",
    "sum_{k>=0} (q;q)_k",
    "sum_{k>=0} q^(-k)",
    "sum_{k>=0} 1",
    "prod_{n>=1} 2",
])
def test_divergent_sums_and_products_are_refused(text):
    with pytest.raises(DomainError, match="converge|infinitely many|no meaning"):
        evaluate(text, 20)


def test_unprovable_convergence_is_refused_not_truncated():
    with pytest.raises(UnableError, match="cannot show"):
        evaluate("prod_{n>=1} (2 - q^n)", 20)


@pytest.mark.parametrize("text", [
    "1/0", "1/(1;q)_inf", "1/(q-q)", "q/(q^2-q^2)", "(q;q)_(-1)", "0^(-1)",
    "sum_{k=0}^{2} 1/k",
    # a zero inverted twice is still a division by zero (issue 11: these gave 0 once the
    # chain of factors was flattened into (1;q)_inf^1)
    "1/(1;q)_inf^(-1)", "1/((1;q)_inf^(-1))", "1/(1/(1;q)_inf)", "2/(1/(1-1))",
    "1/(1;q)_2^(-3)", "sum_{k=0}^{2} q^k/(1/(1;q)_k)",
])
def test_division_by_zero(text):
    with pytest.raises(DomainError):
        evaluate(text, 10)


@pytest.mark.parametrize("text, column", [
    # a term of a sum that divides by zero (k = 0 in a Lambert series started at 0) was
    # "division by zero" with no position at all: the divisor at fault is named, or the sum
    ("sum_{k>=0} q^k/(1-q^k)", 18),
    ("1 + sum_{k=0}^{3} q^k/(1-q^k)", 25),
    ("(q;q)_inf + sum_{n>=0} q^n/(q;q)_(n-1)^(-1)", 13),
    ("q + 1/(q-q)", 9),              # a divisor that is exactly 0
])
def test_a_division_by_zero_names_its_place(text, column):
    with pytest.raises(DomainError) as err:
        evaluate(text, 10)
    assert err.value.position == column - 1 and f"column {column}" in str(err.value)
    if column == 13:
        assert "in a term of sum_{n>=0}" in str(err.value)


# errors.py: DomainError for what has no meaning, UnableError for what is too large or not
# supported (an irrational number, a non-integer power of a series)
@pytest.mark.parametrize("text, error, message", [
    ("2^q", DomainError, "must be a number here"),
    ("2^(1/2)", UnableError, "not rational"),
    ("(1+q)^(1/2)", UnableError, "only integer powers"),
    ("(q;q)_(1/2)", DomainError, "must be an integer"),
    ("(q;q^0)_inf", DomainError, "base of the q-Pochhammer symbol"),
    ("(q;2q)_inf", DomainError, "base of the q-Pochhammer symbol"),
    ("theta_3(2)", DomainError, "takes a power q\\^d"),
    ("eta(1+q)", DomainError, "takes a power q\\^d"),
    ("gaussian(q, 2)", DomainError, "integer arguments"),
    ("gaussian(1/2, 1)", DomainError, "integer arguments"),
    ("2^(10^9)", UnableError, "too large"),
    ("10^(10^7)", UnableError, "too large"),
    ("q^(-10^8) (q;q)_inf", UnableError, "working order of 100000010, beyond the limit"),
    ("sum_{k=0}^{10^9} 1", UnableError, "1000000001 terms"),
])
def test_other_bad_input_is_a_clear_error(text, error, message):
    with pytest.raises(error, match=message):
        evaluate(text, 10)


def test_huge_positive_exponents_vanish_quickly():
    s = evaluate("q^(10^9) + 1", 10)
    assert s.coefficient_list(10) == [1] + [0] * 9 and s.precision == 10
    assert evaluate("(q;q)_(10^9)", 30) == evaluate("(q;q)_inf", 30)


def test_nested_infinite_sums_terminate_through_their_inner_bodies():
    # sum_{a>=0} sum_{b>=0} q^(a^2 + a b + b^2): count pairs directly
    n = 60
    expected = [0] * n
    for a in range(n):
        for b in range(n):
            if a * a + a * b + b * b < n:
                expected[a * a + a * b + b * b] += 1
    assert coeffs("sum_{a>=0} sum_{b>=0} q^(a^2 + a b + b^2)", n) == expected


def test_nested_sums_whose_inner_terms_do_not_grow_are_refused():
    with pytest.raises(UnableError, match="cannot show that sum_{a>=0} converges"):
        evaluate("sum_{a>=0} sum_{b>=0} q^(a - b)", 10)


def test_terms_with_negative_valuation_factors_are_not_skipped():
    # regression: the n = -4 term is q^66 (q^-12 - q^11); its q^54 must not be dropped at
    # order 60 just because its q-power factor q^66 lies beyond the order
    text = "sum_{n=-inf}^{inf} q^(3 (3n^2+n)/2) (q^(3 n) - q^(-(3n+1)))"
    low, high = evaluate(text, 60), evaluate(text, 200)
    assert low.coefficient_list(61, start=-1) == high.coefficient_list(61, start=-1)
    assert low.coefficient(54) == 2


def test_binary_splitting_matches_term_by_term_evaluation():
    # the binary-splitting path (ratio of consecutive terms a quotient of polynomials) against
    # the reference path that evaluates every term from scratch, over ZZ and modulo a prime
    from qseries.series import GF
    texts = ["sum_{k>=0} q^(k^2)/(q;q)_k^2",
             "sum_{k>=0} (-1)^k q^(k(k+1)/2) (q;q^2)_k/(q;q)_(2k+1)",
             "sum_{k>=0} 3^k q^(k^2) (-q;q^2)_k/((q^2;q^2)_k (q;q)_k)",
             "sum_{k>=0} q^(k^2+k) (q^3;q)_k (2;q)_k / (q;q)_(2k+1)"]
    for ring in (ZZ, GF(1_000_003)):
        for text in texts:
            fast = Evaluator(ring).evaluate(parse(text), 400)
            slow = Evaluator(ring, strategies=["direct"]).evaluate(parse(text), 400)
            assert fast == slow, text


@pytest.mark.parametrize("text, step, first", [
    ("(-q^-1;q)_inf", 1, -1),
    ("(-q^-3;q^2)_inf", 2, -3),
    ("prod_{n>=0} (1+q^(n-4))", 1, -4),
])
def test_infinite_products_with_negative_valuation_against_sympy(text, step, first):
    # regression: the factors left out of an infinite product are 1 + O(q^N), but times a
    # partial product of negative valuation v they disturb q^(N+v) .. q^(N-1); the reference
    # is sympy's expansion of enough factors (those beyond j = 45 cannot reach below q^30)
    import sympy
    q = sympy.symbols("q")
    poly, shift = sympy.Poly(1, q), 0
    for j in range(46):
        e = first + step * j
        if e >= 0:
            poly = poly * sympy.Poly(1 + q**e, q)
        else:                      # 1 + q^e = q^e (q^-e + 1)
            poly, shift = poly * sympy.Poly(q**(-e) + 1, q), shift + e
    n = 30
    ours = evaluate(text, n)
    assert ours.precision == n
    for e in range(shift, n):
        assert ours.coefficient(e) == poly.coeff_monomial(q**(e - shift)), e


@pytest.mark.parametrize("text, split", [
    ("sum_{k>=0} q^(k^2)/(q;q)_k", True),                 # binary splitting
    ("sum_{k>=1} q^(k^2)/(q;q)_k", True),                 # first term of valuation 1
    ("sum_{k>=0} q^(k^2+k-4)/(q;q)_k", False),            # negative valuation: divided
    ("1/((q;q^5)_inf (q^4;q^5)_inf)", True),              # Jacobi's triple product pair
    ("(q;q^5)_inf^-2 (q^4;q^5)_inf^-2 (q^2;q)_inf", True),
    ("-(q;q)_inf/(q^2;q^2)_inf", True),
    ("3 (sum_{k>=0} q^(k^2+k)/(q;q)_k) / (-q;q)_inf", True),
    ("q^3 (sum_{k>=0} q^(k^2+k)/(q;q)_k) / (-q;q)_inf", False),   # known to O(q^197)
    ("q^-3 (sum_{k>=0} q^(k^2+k)/(q;q)_k) / (-q;q)_inf", False),
    ("(q;q)_inf", False),                                 # nothing to divide
    ("1/(q - q^2)", False),                               # not a unit: divided at once
    ("1/(2 - q)", False),                                 # 2 is no unit of ZZ
    ("sum_{k>=0} q^(k^2)/(q;q)_k + O(q^50)", False),      # a sum of terms
])
def test_parts_divide_to_the_value(text, split):
    # evaluate_parts leaves the last division undone (for the modular method's A*D = C*B);
    # numerator / denominator must be the value to the same precision
    node = parse(text)
    num, den = Evaluator(ZZ).evaluate_parts(node, 200)
    assert (den is not None) == split
    value = evaluate(node, 200)
    if den is not None:
        assert den.valuation == 0 and den.coefficient(0) in (1, -1)
        assert num.valuation >= 0 and num.precision == 200
        assert den.precision is None or den.precision >= 200
        num = (num * den.inverse(order=200)).truncate(200)
    assert num == value


def _gaussian(m: int, j: int) -> list[int]:
    """The coefficients of the Gaussian polynomial [m, j]_q by q-Pascal's rule
    [m, j] = [m-1, j-1] + q^j [m-1, j] (Andrews 1976, Thm. 3.2, from memory), in Python ints."""
    row = [[1]]                                       # [i, t] for t = 0 .. i, from i = 0
    for i in range(1, m + 1):
        nxt = []
        for t in range(i + 1):
            a = row[t - 1] if t >= 1 else []
            b = [0] * t + row[t] if t < i else []
            n = max(len(a), len(b))
            nxt.append([(a[e] if e < len(a) else 0) + (b[e] if e < len(b) else 0)
                        for e in range(n)])
        row = nxt
    return row[j]


def test_gaussian_reference_by_hand():
    assert _gaussian(4, 2) == [1, 1, 2, 1, 1]           # 1 + q + 2q^2 + q^3 + q^4
    assert _gaussian(5, 0) == [1] and _gaussian(5, 5) == [1]
    assert sum(_gaussian(12, 5)) == 792                 # [n, k] at q = 1 is C(n, k)


def test_stepping_factors_with_negative_exponents_in_one_product():
    # regression: the stepping factors of a sum are advanced as one product; a factor
    # 1 - q^x with x beyond the order may not be skipped when another factor has brought
    # the product's valuation below 0 (wrong coefficients near q^-230 before the fix).
    # Reference: (q^-N;q)_n/(q;q)_n = (-1)^n q^(n(n-1)/2 - Nn) [N, n]_q, so the n-th term is
    # q^(n(n-1) - Nn) [N, n]_q, with the Gaussian polynomials from q-Pascal's rule (sympy's
    # cancel of the same quotients gave the same coefficients in 3 s)
    n_top = 30
    text = f"sum_{{n=0}}^{{{n_top}}} (-1)^n q^(n(n-1)/2) (q^-{n_top};q)_n/(q;q)_n"
    got = evaluate(text, 40)
    expected: dict[int, int] = {}
    for n in range(n_top + 1):
        for e, c in enumerate(_gaussian(n_top, n)):
            k = e + n * (n - 1) - n_top * n
            expected[k] = expected.get(k, 0) + c
    low = min(expected)
    assert got.valuation == low
    for e in range(low, 40):
        assert got.coefficient(e) == expected.get(e, 0), e


def test_double_sum_with_a_factor_in_both_indices_keeps_its_precision():
    # issue 12: the inner sum's far terms were computed modulo q^(negative order), which
    # lost their valuation and with it the whole sum's precision (O(q^-6) at order 10).
    # The double sum factors as a product of single sums by the distributive law.
    double = "sum_{i>=0} sum_{j>=0} q^(i^2+j^2) (1+q^(i+j+1))/((q;q)_i (q;q)_j)"
    factored = "(sum_{i>=0} q^(i^2)/(q;q)_i)^2 + q (sum_{i>=0} q^(i^2+i)/(q;q)_i)^2"
    for order in (10, 100):
        a = evaluate(double, order)
        assert a.precision == order
        assert a == evaluate(factored, order)
    assert Evaluator(ZZ).value(parse(double), {}, 10).precision == 10


def test_a_quotient_inverted_again_keeps_its_value():
    # 1/(q/(q;q)_inf) = (q;q)_inf / q, the same expansion written without the double inversion
    for text, plain in [("1/(q/(q;q)_inf)", "q^-1 (q;q)_inf"),
                        ("1/((q;q)_inf^(-2))", "(q;q)_inf^2"),
                        ("sum_{k=1}^{3} q^k/(1/(q;q)_k)", "sum_{k=1}^{3} q^k (q;q)_k")]:
        assert evaluate(text, 12) == evaluate(plain, 12)


def test_a_divisor_with_a_written_o_term_is_not_recomputed_to_ever_higher_orders(monkeypatch):
    # issue 11: (O(q^26) * P)^(-1) was computed again at order 2n + 8, 4n + 24, ... up to the
    # retry cap before the refusal; the O(q^26) does not move, so one retry shows it
    seen = []
    real = Evaluator.value

    def spy(self, node, env, order):
        seen.append(order)
        return real(self, node, env, order)

    monkeypatch.setattr(Evaluator, "value", spy)
    with pytest.raises(DomainError, match="vanishes to O"):
        evaluate("(O(q^26)*(prod_{n>=1}(1+q^n)^(-1)))^(-1)", 100)
    assert max(seen) == 2 * 100 + 8


@pytest.mark.parametrize(("poch", "product"), [
    ("(q;-q)_inf", "prod_{k=0}^{60} (1 - q*(-q)^k)"),
    ("(q;-q)_5", "prod_{k=0}^{4} (1 - q*(-q)^k)"),
    ("(z;-q^2)_3", "prod_{k=0}^{2} (1 - z*(-q^2)^k)"),
    ("(-q;-q)_inf", "prod_{k=1}^{60} (1 - (-q)^k)"),
])
def test_a_base_minus_q_to_the_t_is_the_product_it_names(poch, product):
    # (a;-q^t)_n, as q -> -q makes of (a;q)_n: factor by factor (issue 13, substitution)
    assert evaluate(poch, 40) == evaluate(product, 40)


def test_a_base_minus_q_with_a_negative_length_is_refused_clearly():
    with pytest.raises(UnableError, match="n < 0"):
        evaluate("(q;-q)_(-2)", 10)


# -- the coefficient extractor [q^(m n + r)] F -------------------------------------------
def test_extractor_gives_partition_numbers_in_progressions():
    """sum_n p(5n+4) q^n and sum_n p(7n+5) q^n against python-flint's partitions_p."""
    from qseries.backend import partitions_p

    for m, r in ((5, 4), (7, 5), (11, 6), (3, 0)):
        s = evaluate(f"[q^({m}n+{r})] 1/(q;q)_inf", 120)
        assert s.precision == 120
        assert s.coefficient_list(120) == [partitions_p(m * n + r) for n in range(120)]


def test_extractor_precision_is_honest():
    """From F known to O(q^N) the part is known to O(q^ceil((N - r)/m)), never more."""
    for n_known in (19, 20, 21, 24, 25):
        s = evaluate(f"[q^(5n+4)] (1/(q;q)_inf + O(q^{n_known}))", 10)
        assert s.precision == -(-(n_known - 4) // 5)
    # the working order is raised for negative powers inside the body
    s = evaluate("[q^(2n)] q^-9/(q;q)_inf", 10)
    assert s.precision == 10


def test_extractor_takes_negative_and_fractional_residues():
    from qseries.backend import partitions_p

    # q^(-1/24)/(q;q)_inf = sum p(k) q^(k - 1/24): the exponents 5n + 4 - 1/24 give p(5n+4)
    s = evaluate("[q^(5n + 4 - 1/24)] q^(-1/24)/(q;q)_inf", 30)
    assert s.coefficient_list(30) == [partitions_p(5 * n + 4) for n in range(30)]
    # a residue outside 0..m-1 shifts: [q^(5n-1)] F = q [q^(5n+4)] F
    a = evaluate("[q^(5n-1)] 1/(q;q)_inf", 20)
    b = evaluate("q [q^(5n+4)] 1/(q;q)_inf", 20)
    assert a == b
    with pytest.raises(DomainError, match="none of them is m n"):
        evaluate("[q^(5n+4)] eta(q)", 10)


def test_extractor_over_other_rings_and_inside_sums():
    from qseries.backend import partitions_p
    from qseries.series import GF

    s = evaluate("[q^(5n+4)] 1/(q;q)_inf", 200, ring=GF(5))
    assert s.is_zero() and s.precision == 200          # Ramanujan: p(5n+4) = 0 mod 5
    s = evaluate("[q^(5n+4)] 1/(q;q)_inf", 50, ring=GF(7))
    assert s.coefficient_list(50) == [partitions_p(5 * n + 4) % 7 for n in range(50)]
    # with an extra variable: coefficients in z come along
    whole = evaluate("(z q;q)_inf", 12)
    part = evaluate("[q^(2n+1)] (z q;q)_inf", 5)
    assert [part.coefficient(n) for n in range(5)] == [whole.coefficient(2 * n + 1)
                                                       for n in range(5)]
    # inside a finite sum, the part of each term
    assert evaluate("sum_{k=0}^{3} [q^(2n)] q^k/(1-q)", 6) == \
        evaluate("1/(1-q) + 2q/(1-q) + q^2/(1-q)", 6)


def test_one_evaluator_on_many_trees():
    # the evaluator caches facts about nodes by id(); a tree freed after its evaluation must
    # not lend its facts to a later tree whose nodes reuse the ids (a product over n read as
    # a product of numbers was the symptom)
    ev = Evaluator(ZZ)
    texts = ["prod_{n>=1} (1+q^n)/(1-q^(2n-1))^2", "prod_{n>=1} (1-q^n)",
             "sum_{n>=0} q^(n^2)/(q;q)_n", "prod_{n=1}^{5} (1-2q^n)"]
    for _ in range(20):
        for text in texts:
            assert ev.evaluate(parse(text), 30) == Evaluator(ZZ).evaluate(parse(text), 30)


def test_a_parameter_written_as_a_quotient_of_monomials_is_a_monomial():
    """-q/q^3 is -q^-2: its symbol (-q/q^3;q)_n has finitely many factors of negative
    degree, as (-q^-2;q)_n has (before, only the second spelling was bounded)."""
    a = evaluate("sum_{n>=1} (q^-2)^n q^(n(n-1)/2)/(-q/q^3;q)_n", 30)
    b = evaluate("sum_{n>=1} (q^-2)^n q^(n(n-1)/2)/(-q^(-2);q)_n", 30)
    assert a == b and a.precision is not None and a.precision >= 25
