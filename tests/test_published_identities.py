"""Published identities, each checked to a few hundred terms with its source named.

Statements are from memory of the cited books; equation numbers are given only where we are
sure of them.  A failure here means the engine is wrong (or our memory is): never adjust an
identity until it passes.
"""

import pytest

from qseries import check, evaluate

IDENTITIES = [
    pytest.param(
        "(q;q)_inf", "sum_{n=-inf}^{inf} (-1)^n q^(n(3n-1)/2)", 600,
        id="euler-pentagonal",
        # Euler's pentagonal number theorem; G. E. Andrews, The Theory of Partitions (1976), ch. 1
    ),
    pytest.param(
        "(-q;q)_inf", "1/(q;q^2)_inf", 600,
        id="euler-distinct-odd",
        # Euler: partitions into distinct parts = into odd parts; Andrews (1976), ch. 1
    ),
    pytest.param(
        "prod_{n>=1} (1+q^n)", "prod_{n>=1} 1/(1-q^(2n-1))", 300,
        id="euler-distinct-odd-as-products",
        # the same identity of Euler written as products over n; Andrews (1976), ch. 1
    ),
    pytest.param(
        "sum_{n=-inf}^{inf} (-1)^n q^(n^2)", "(q;q)_inf/(-q;q)_inf", 600,
        id="gauss-theta4",
        # Gauss; Andrews (1976), ch. 2 (a specialisation of Jacobi's triple product)
    ),
    pytest.param(
        "sum_{n>=0} q^(n(n+1)/2)", "(q^2;q^2)_inf/(q;q^2)_inf", 600,
        id="gauss-triangular",
        # Gauss; Andrews (1976), ch. 2
    ),
    pytest.param(
        "(q;q)_inf^3", "sum_{n>=0} (-1)^n (2n+1) q^(n(n+1)/2)", 600,
        id="jacobi-cube",
        # Jacobi's identity; G. H. Hardy and E. M. Wright, An Introduction to the Theory of
        # Numbers, ch. 19 (from memory)
    ),
    pytest.param(
        "1/(q;q)_inf", "sum_{k>=0} q^(k^2)/(q;q)_k^2", 600,
        id="durfee-square",
        # the Durfee square decomposition; Andrews (1976), ch. 2 (from memory)
    ),
    pytest.param(
        "sum_{k>=0} q^(k^2)/(q;q)_k", "1/((q;q^5)_inf (q^4;q^5)_inf)", 800,
        id="rogers-ramanujan-1",
        # first Rogers-Ramanujan identity; Andrews (1976), ch. 7
    ),
    pytest.param(
        "sum_{k>=0} q^(k^2+k)/(q;q)_k", "1/((q^2;q^5)_inf (q^3;q^5)_inf)", 800,
        id="rogers-ramanujan-2",
        # second Rogers-Ramanujan identity; Andrews (1976), ch. 7
    ),
    pytest.param(
        "theta_3(q)", "(q^2;q^2)_inf (-q;q^2)_inf^2", 500,
        id="jacobi-triple-product-theta3",
        # Jacobi's triple product at z = 1; Andrews (1976), Thm. 2.8 (from memory)
    ),
    pytest.param(
        "sum_{n=-inf}^{inf} q^(n^2)", "(q^2,-q,-q;q^2)_inf", 300,
        id="jacobi-triple-product-multi-parameter",
        # Jacobi's triple product at z = 1 in Gauss's form (q^2;q^2)(-q;q^2)^2, written with
        # one multi-parameter symbol; Andrews (1976), Thm. 2.8 (from memory)
    ),
    pytest.param(
        "eta(q)^3", "sum_{n>=0} (-1)^n (2n+1) q^((2n+1)^2/8)", 400,
        id="jacobi-cube-as-eta",
        # the same identity as jacobi-cube multiplied by q^(1/8): exercises rational offsets
    ),
    pytest.param(
        "sum_{k>=0} q^(k^2)/(q^2;q^2)_k", "(-q;q^2)_inf", 500,
        id="euler-odd-distinct-sum",
        # Euler; sum over partitions into distinct odd parts, Andrews (1976), ch. 2 (from memory)
    ),
    pytest.param(
        "sum_{k=0}^{12} gaussian(12, k) (-1)^k q^(k(k-1)/2) ", "0", 200,
        id="q-binomial-theorem-at-minus-one",
        # the finite q-binomial theorem (Cauchy): sum_k [n,k] (-1)^k q^(k(k-1)/2) z^k = (z;q)_n,
        # at z = 1 where (1;q)_n = 0 for n >= 1; Andrews (1976), Thm. 3.3 (from memory)
    ),
]


@pytest.mark.parametrize("lhs, rhs, order", IDENTITIES)
def test_published_identity_holds(lhs, rhs, order):
    r = check(lhs, rhs, order=order)
    assert r.holds is True, r.verdict
    assert r.order_verified == order


def _r2(n: int) -> int:
    """Representations of n as x^2 + y^2 over all integers, by direct counting."""
    count = 0
    x = 0
    while x * x <= n:
        rest = n - x * x
        y = int(rest ** 0.5)
        while y * y > rest:
            y -= 1
        while (y + 1) * (y + 1) <= rest:
            y += 1
        if y * y == rest:
            count += (2 if x else 1) * (2 if y else 1)
        x += 1
    return count


def test_theta3_squared_counts_sums_of_two_squares():
    # the coefficient of q^n in theta_3(q)^2 is r_2(n), counted here by brute force
    s = evaluate("theta_3(q)^2", 400)
    assert s.coefficient_list(400) == [_r2(n) for n in range(400)]


def test_jacobi_four_square_theorem():
    # Jacobi: r_4(n) = 8 * sum of the divisors d of n with 4 not dividing d (n >= 1);
    # Hardy and Wright, ch. 20 (from memory)
    s = evaluate("theta_3(q)^4", 300)
    expected = [1] + [8 * sum(d for d in range(1, n + 1) if n % d == 0 and d % 4)
                      for n in range(1, 300)]
    assert s.coefficient_list(300) == expected


@pytest.mark.parametrize("i", [1, 2, 3])
def test_andrews_gordon_mod_7_as_a_double_sum(i):
    # Andrews-Gordon identities for k = 3 (G. E. Andrews, Proc. Nat. Acad. Sci. USA 71 (1974);
    # see Andrews, The Theory of Partitions (1976), ch. 7): with N1 = n1 + n2, N2 = n2,
    # sum q^(N1^2 + N2^2 + N_i + ... + N_2) / ((q)_n1 (q)_n2)
    #   = (q^i, q^(7-i), q^7; q^7)_inf / (q)_inf
    linear = {1: "n1 + 2n2", 2: "n2", 3: "0"}[i]
    lhs = f"sum_{{n1>=0}} sum_{{n2>=0}} q^((n1+n2)^2 + n2^2 + {linear})/((q;q)_n1 (q;q)_n2)"
    rhs = f"(q^{i},q^{7 - i},q^7;q^7)_inf/(q;q)_inf"
    assert check(lhs, rhs, order=300).holds
