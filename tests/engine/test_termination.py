

def test_an_inner_sum_from_an_outer_index_sees_the_difference_is_non_negative():
    # issue 13: sum_{n1>=n2>=0} ... (q;q)_(n1-n2) was refused ("the subscript of a
    # q-Pochhammer symbol may be negative"): the inner index is written as its lower limit
    # plus t >= 0 before the body is bounded.  Checked against the Andrews-Gordon
    # identities for k = 3 (G. E. Andrews, The Theory of Partitions (1976), Theorem 7.8,
    # from memory), written with the sums as chains N1 >= N2 >= 0
    from qseries import check
    lhs = "sum_{n_1>=n_2>=0} q^(n_1^2+n_2^2)/((q;q)_{n_1-n_2} (q;q)_{n_2})"
    rhs = "1/((q;q^7)_inf (q^2;q^7)_inf (q^5;q^7)_inf (q^6;q^7)_inf)"
    assert check(lhs, rhs, 150).holds is True
    lhs = "sum_{n_1>=n_2>=0} q^(n_1^2+n_2^2+n_1+n_2)/((q;q)_{n_1-n_2} (q;q)_{n_2})"
    rhs = "1/((q^2;q^7)_inf (q^3;q^7)_inf (q^4;q^7)_inf (q^5;q^7)_inf)"
    assert check(lhs, rhs, 150).holds is True


def test_a_parameter_of_negative_valuation_in_a_sum():
    # issue 13 item 8: (a;q)_n with a = -q^-3 has three factors of negative degree, then
    # valuation -6 for ever: the sum terminates.  The q-binomial theorem
    # sum (a;q)_n z^n/(q;q)_n = (az;q)_inf/(z;q)_inf (G. Gasper, M. Rahman, Basic
    # Hypergeometric Series (2004), (1.3.2), from memory) at a = -q^-3, z = q^4
    from qseries import check
    for method in ("exact", "modular"):
        r = check("sum_{n>=0} (-q^-3;q)_n q^(4n)/(q;q)_n", "(-q;q)_inf/(q^4;q)_inf", 100,
                  method=method)
        assert r.holds is True, method


def test_a_parameter_with_a_factor_one_minus_one_is_still_refused_clearly():
    import pytest

    from qseries import evaluate
    from qseries.errors import UnableError
    with pytest.raises(UnableError, match="without positive valuation"):
        evaluate("sum_{n>=0} (q^-2;q^2)_n q^(n^2)/(q^2;q^2)_n", 20)


def test_a_bilateral_double_sum():
    """a(q) = sum_{m,n} q^(m^2+mn+n^2) = phi(q) phi(q^3) + 4 q psi(q^2) psi(q^6) (J. M. Borwein,
    P. B. Borwein and F. G. Garvan, Trans. Amer. Math. Soc. 343 (1994); from memory): the
    inner bilateral sum is bounded by the real minimum of its exponent, 3m^2/4."""
    from qseries import check

    r = check("sum_{m,n=-inf}^{inf} q^(m^2+m n+n^2)",
              "phi(q) phi(q^3) + 4 q psi(q^2) psi(q^6)", order=400)
    assert r.holds is True


def test_a_bilateral_inner_sum_that_does_not_grow_is_refused():
    import pytest

    from qseries import evaluate
    from qseries.errors import UnableError
    for text in ("sum_{m,n=-inf}^{inf} q^(m^2-n^2)", "sum_{m,n=-inf}^{inf} q^(m n)",
                 "sum_{m,n=-inf}^{inf} q^(m^2+n^2)/(q;q)_n"):
        with pytest.raises(UnableError, match="bilateral inner sum"):
            evaluate(text, 10)


def test_a_denominator_one_minus_a_positive_power_in_a_double_sum():
    """sum_{i,j>=0} q^(i+j)/(1-q^(i+j+1)) = sum_n sigma(n+1) q^n (grouping by s = i + j:
    (s+1) q^s/(1-q^(s+1)), a Lambert series), against sympy's divisor_sigma."""
    from sympy import divisor_sigma

    from qseries import evaluate
    f = evaluate("sum_{i,j>=0} q^(i+j)/(1-q^(i+j+1))", 80)
    assert f.coefficient_list(80) == [int(divisor_sigma(n + 1)) for n in range(80)]


def test_a_substituted_monomial_is_read_exactly():
    # f(-q^42) = (q^42;q^42)_inf (Berndt, Ramanujan's Notebooks III, ch. 16, Entry 22,
    # from memory) needed only to q^36 after the shift q^4: its parameters -q^42 and
    # -(-q^42)^2 must not be truncated to 0 before the terms are bounded (the catalogue's
    # berndt-iv-25-27-1 at order 40 found it)
    from qseries.engine import evaluate
    assert evaluate("q^4 f(-q^6)^2 f(-q^42)^2", 40) == \
        evaluate("q^4 (q^6;q^6)_inf^2 (q^42;q^42)_inf^2", 40)


def test_a_parameter_that_is_zero_in_the_ring_makes_a_factor_one():
    # over GF(2) the parameter 2q (-4q^2) is 0, so every factor 1 - 0 q^j is 1 and the sum
    # is sum_{i>=0} q^(i^2): 1 at the squares, 0 elsewhere (by the definitions); the
    # convergence analysis refused it as a factor that "vanishes"
    import math

    from qseries import GF, evaluate
    for expr in ("sum_{i>=0} q^(i^2) (2*q;q)_i", "sum_{i>=0} q^(i^2)/(2*q;q)_i",
                 "sum_{i>=0} q^(i^2)/(-4*q^2;q^3)_i^2"):
        got = evaluate(expr, 30, GF(2))
        assert got.coefficient_list(30) == [int(math.isqrt(n) ** 2 == n) for n in range(30)]


def test_an_inner_exponent_k_squared_minus_k_is_least_at_k_zero():
    # k^2 - k is 0 at k = 0 and k = 1 and positive beyond; its coefficient of k is negative,
    # so the inner sum over k was refused ("do not grow with k") when the nest was not a
    # chain (the i*k term joins the outer and the innermost index).  Reference: the
    # coefficients counted from the definition, term by term
    from qseries import evaluate
    expr = "sum_{i>=0} sum_{j>=0} sum_{k>=0} q^(i^2+j^2+k^2-k+i*k)"
    n = 25
    want = [0] * n
    for i in range(6):
        for j in range(6):
            for k in range(7):
                e = i * i + j * j + k * k - k + i * k
                if e < n:
                    want[e] += 1
    assert evaluate(expr, n).coefficient_list(n) == want
