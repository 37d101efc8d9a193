"""q-Pochhammer builders: every fast path against the factor-by-factor product."""

import pytest

from qseries.products import (
    euler_product,
    has_zero_factor,
    pochhammer,
    pochhammer_euler,
    pochhammer_exp_log,
    theta_pair_power,
    triple_product_sum,
)
from qseries.products.pochhammer import euler_log
from qseries.series import GF, QQ, ZZ, Series

N = 90


def slow_infinite(c: int, e: int, t: int, ring=ZZ) -> Series:
    """prod_{j>=0} (1 - c q^(e+tj)) modulo q^N, one binomial at a time."""
    acc = Series.constant(1, ring)
    j = 0
    while e + t * j < N:
        acc = acc.mul_binomial(c, e + t * j, N)
        j += 1
    return acc.truncate(N)


@pytest.mark.parametrize("c, e, t", [(1, 1, 1), (1, 3, 1), (1, 6, 3), (-1, 2, 2), (-1, 5, 1),
                                     (1, 4, 2), (-1, 9, 3)])
def test_euler_based_fast_paths(c, e, t):
    fast = pochhammer_euler(Series.monomial(e, c=c), t, N)
    assert fast is not None and fast == slow_infinite(c, e, t)
    assert pochhammer(Series.monomial(e, c=c), t, None, N) == fast


def test_euler_variant_declines_other_parameters():
    assert pochhammer_euler(Series.monomial(1, c=2), 1, N) is None
    assert pochhammer_euler(Series.monomial(1), 2, N) is None      # (q;q^2)_inf


@pytest.mark.parametrize("a, m", [(1, 2), (1, 5), (2, 5), (3, 7), (1, 8)])
def test_triple_product_pairs(a, m):
    # Jacobi's triple product (Andrews, The Theory of Partitions, 1976, Thm. 2.8)
    full = (slow_infinite(1, a, m) * slow_infinite(1, m - a, m) * slow_infinite(1, m, m))
    assert triple_product_sum(a, m, ZZ, N) == full.truncate(N)
    pair = (slow_infinite(1, a, m) * slow_infinite(1, m - a, m)).truncate(N)
    assert theta_pair_power(a, m, 1, ZZ, N) == pair
    assert theta_pair_power(a, m, -2, ZZ, N) == pair.power(-2, N)


def test_euler_product_in_every_ring():
    for ring in (ZZ, QQ, GF(101)):
        assert euler_product(2, ring, N).coefficient_list(N) == \
            slow_infinite(1, 2, 2, ring).coefficient_list(N)


def test_finite_products_and_negative_subscripts():
    q = Series.monomial(1)
    assert pochhammer(q, 1, 4, N) == slow_finite(q, 4)
    # (a;q)_(-n) = 1/(a q^(-n);q)_n
    assert pochhammer(Series.monomial(5), 1, -2, N) == \
        slow_finite(Series.monomial(3), 2).inverse(order=N)


def slow_finite(a: Series, n: int) -> Series:
    acc = Series.constant(1)
    for j in range(n):
        acc = acc * (Series.constant(1) - a.shift(j))
    return acc


@pytest.mark.parametrize("c", [1, -1])
@pytest.mark.parametrize("e, t", [(1, 1), (1, 2), (2, 3), (5, 7), (3, 2), (4, 5)])
def test_long_products_as_the_exponential_of_their_logarithm(c, e, t):
    # (c q^e; q^t)_inf with many factors goes through exp(log) (the Euler transform): the same
    # coefficients as one binomial at a time, in every ring, and when the prime is too small
    # to divide by k < order the factor-by-factor path is taken instead
    n = 400
    for ring in (ZZ, QQ, GF(2**61 - 1), GF(101)):
        acc = Series.constant(1, ring)
        for x in range(e, n, t):
            acc = acc.mul_binomial(c, x, n)
        fast = pochhammer_exp_log(Series.monomial(e, c=c, ring=ring), t, n)
        if ring == GF(101):
            assert fast is None     # no division by k < order modulo 101
        else:
            assert fast == acc.truncate(n), ring
        assert pochhammer(Series.monomial(e, c=c, ring=ring), t, None, n) == acc.truncate(n)


def test_euler_log_counts_divisors_in_the_progression():
    # k [q^k] log (q;q^2)_inf = -(sum of the odd divisors of k): log(1 - q^x) = -sum_m q^(mx)/m
    n = 60
    assert euler_log(1, 1, 2, n) == [0] + [-sum(d for d in range(1, k + 1, 2) if k % d == 0)
                                           for k in range(1, n)]
    assert euler_log(1, 1, 2, 13) == [0, -1, -1, -4, -1, -6, -4, -8, -1, -13, -6, -12, -4]
    # (-q;q)_inf: log(1 + q^x) = sum_m (-1)^(m+1) q^(mx)/m, so k [q^k] = sum over d | k of
    # d (-1)^(k/d + 1)
    assert euler_log(-1, 1, 1, n) == [0] + [sum(d * (-1) ** (k // d + 1) for d in range(1, k + 1)
                                                if k % d == 0) for k in range(1, n)]


@pytest.mark.parametrize(("c", "a", "t"), [(3, 1, 1), (2**61 - 5, 2, 3), (123456789, 1, 2)])
def test_euler_log_with_any_residue_sums_over_the_divisors(c, a, t):
    # log(1 - c q^x) = -sum_m c^m q^(mx)/m: k [q^k] = -sum over x | k, x = a (mod t), x >= a,
    # of x c^(k/x); the general residue c (an extra variable's random value modulo p)
    p, n = 2**61 - 1, 80
    want = [0] + [-sum(x * pow(c, k // x, p) for x in range(a, k + 1, t) if k % x == 0) % p
                  for k in range(1, n)]
    assert [v % p for v in euler_log(c, a, t, n, modulus=p)] == want


def test_minus_one_modulo_p_takes_the_fast_paths(monkeypatch):
    # regression: modulo p the parameter -q has coefficient p - 1, which was not recognised as
    # -1, so (-q;q)_inf and (-q;q^3)_inf were multiplied out one binomial at a time (minutes
    # at order 10^5); the results must also be the reductions of the exact ones
    # (order 1000, some 330 factors for t = 3, far above EXP_FACTORS; the exact reference at
    # 3000 took 1.5 s)
    p, n = 2**61 - 1, 1000
    calls = []
    original = Series.mul_binomial

    def counting(self, *args, **kwargs):
        calls.append(args)
        return original(self, *args, **kwargs)

    exact = {t: pochhammer(Series.monomial(1, ZZ, -1), t, None, n) for t in (1, 3)}
    monkeypatch.setattr(Series, "mul_binomial", counting)
    for t in (1, 3):
        a = Series.monomial(1, GF(p), -1)
        fast = pochhammer_euler(a, t, n) or pochhammer_exp_log(a, t, n)
        assert fast.coefficient_list(n) == [c % p for c in exact[t].coefficient_list(n)]
    assert calls == []


@pytest.mark.parametrize("c, e, t", [(3, 1, 1), (5, 0, 1), (2**40 + 3, 2, 3), (7, 0, 2)])
def test_any_parameter_modulo_p_through_the_logarithm(c, e, t):
    # modulo p a parameter c q^e with any number c (a random value of an extra variable in
    # the modular method) goes through exp(log) too; e = 0 contributes the number 1 - c
    p, n = 2**61 - 1, 300
    ring = GF(p)
    acc = Series.constant(1, ring)
    for x in range(e, n, t):
        acc = acc.mul_binomial(c, x, n) if x else acc * (1 - c)
    fast = pochhammer_exp_log(Series.monomial(e, c=c, ring=ring), t, n)
    assert fast == acc.truncate(n)


def test_a_factor_one_minus_one_makes_the_product_exactly_zero_without_multiplying(monkeypatch):
    # (q^-999;q)_1000 has the factor 1 - q^-999 q^999 = 0 (issue 11: 1/(q;q)_(-1000), which is
    # this product by the convention (a;q)_n = 1/(a q^n;q)_(-n), took minutes to give 0)
    import importlib
    module = importlib.import_module("qseries.products.pochhammer")
    calls = []
    real = module._checked
    monkeypatch.setattr(module, "_checked", lambda *a: calls.append(1) or real(*a))
    q = Series.monomial(1)
    assert has_zero_factor(Series.monomial(-999), 1, 1000)
    got = pochhammer(Series.monomial(-999), 1, 1000, order=30)
    assert got.is_exact and got.is_zero() and calls == []
    # (q^-6;q^3)_inf has the factor j = 2, (q^-6;q^3)_2 does not, (2q^-6;q^3)_inf neither
    assert pochhammer(Series.monomial(-6), 3, None, order=5) == Series.zero()
    assert not has_zero_factor(Series.monomial(-6), 3, 2)
    assert not has_zero_factor(Series.monomial(-6, c=2), 3, None)
    assert not has_zero_factor(Series.monomial(-5), 3, None)
    assert not has_zero_factor(q, 1, None)
