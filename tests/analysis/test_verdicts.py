"""The verdict contract: a check that compared no coefficient is inconclusive, never an
agreement; fewer coefficients than asked are said; bool() follows the verdict; results pickle;
the modular method's printed escape bound is the formula."""

import math
import pickle
import re

import pytest

from qseries import check
from qseries.analysis.compare import CheckResult
from qseries.errors import PrecisionError

METHODS = ["exact", "modular"]


@pytest.mark.parametrize("method", METHODS)
@pytest.mark.parametrize(("lhs", "rhs"), [
    ("O(q^-5) + 1", "2"),            # both sides known only below q^-5, where both are 0
    ("O(q^-5)", "q^-3"),
    ("O(q^-1)", "O(q^-1)"),
    ("2 + O(q^0)", "1"),
])
def test_no_coefficient_compared_is_inconclusive(method, lhs, rhs):
    r = check(lhs, rhs, order=100, method=method, seed=1)
    assert r.holds is None and r.inconclusive
    assert r.first_mismatch is None
    assert r.verdict.startswith("inconclusive: no coefficient could be compared")
    assert "agree" not in r.verdict
    assert r.reason is not None and "no coefficient could be compared" in r.reason
    assert "left side is known only below" in r.reason and "O(q^" in r.reason
    with pytest.raises(PrecisionError, match="inconclusive"):
        bool(r)


@pytest.mark.parametrize("method", METHODS)
def test_known_terms_below_the_precision_are_a_comparison(method):
    # q^-8 .. q^-6 are known on both sides: a (short) agreement, not an inconclusive check
    r = check("q^-8 + O(q^-5)", "q^-8 + 7", order=100, method=method, seed=1)
    assert r.holds is True and r.order_verified == -5
    r = check("q^-8 + O(q^-5)", "2q^-8", order=100, method=method, seed=1)
    assert r.holds is False and r.first_mismatch.exponent == -8
    # O(q^5) says the coefficients of q^0 .. q^4 are 0: five coefficients compared
    r = check("O(q^5)", "q^7", order=100, method=method, seed=1)
    assert r.holds is True and r.order_verified == 5


@pytest.mark.parametrize("method", METHODS)
def test_fewer_coefficients_than_asked_are_said(method):
    r = check("1/(1-q) + O(q^10)", "1/(1-q)", order=20, method=method, seed=1)
    assert r.holds is True and r.order_verified == 10 and r.order_requested == 20
    assert "the left side is known only below q^10" in r.shortfall
    assert "O(q^10)" in r.shortfall
    assert "fewer than the q^20 asked" in r.verdict and r.shortfall in r.verdict
    assert r.reason is None
    full = check("1/(1-q)", "1/(1-q)", order=20, method=method, seed=1)
    assert full.shortfall == "" and "fewer" not in full.verdict


def test_shortfall_from_negative_powers_is_told_apart():
    r = check("q^-3 (1/(1-q) + O(q^10))", "q^-3/(1-q)", order=20)
    assert r.order_verified == 7 and "O(q^10)" in r.shortfall
    r = check("q^-3/(1-q)", "q^-3 (1/(1-q) + O(q^10))", order=20)
    assert "the right side is known only below q^7" in r.shortfall


def test_bool_follows_the_verdict():
    assert bool(check("(-q;q)_inf", "1/(q;q^2)_inf", order=50)) is True
    assert bool(check("1/(1-q)", "1 + q", order=5)) is False
    with pytest.raises(AssertionError):
        assert check("1/(1-q)", "1 + q", order=5)


@pytest.mark.parametrize(("lhs", "rhs", "kwargs"), [
    ("(-q;q)_inf", "1/(q;q^2)_inf", {}),
    ("1/(1-q)", "1 + q + q^2 + 2q^3", {}),
    ("1/(2-q)", "sum_{k>=0} q^k/2^(k+1) + q^4/3", {}),
    ("eta(q)", "q^(1/24) (q;q)_inf + q^(25/24)", {}),
    ("O(q^-5) + 1", "2", {}),
    ("(-q;q)_inf", "1/(q;q^2)_inf", {"method": "modular", "seed": 3}),
    ("1/(q;q)_inf", "1/(q;q)_inf + q^30", {"method": "modular", "seed": 3}),
    ("sum_{k>=0} z^k/(q;q)_k", "1/(z;q)_inf", {}),
    ("sum_{k>=0} z^k/(q;q)_k", "1/(z q;q)_inf", {}),
    ("(z q, q/z, q;q)_inf", "(z q, q/z, q;q)_inf + z^2 q^5", {}),
    ("(z q/2;q)_inf", "(z q/2;q)_inf + z q^3/3", {}),
    ("(z q, q/z, q;q)_inf", "1 + z q^4", {"method": "modular", "seed": 3}),
])
def test_results_pickle(lhs, rhs, kwargs):
    r = check(lhs, rhs, order=12, **kwargs)
    back = pickle.loads(pickle.dumps(r))
    assert isinstance(back, CheckResult)
    assert back == r
    assert back.verdict == r.verdict and back.neighbours() == r.neighbours()


def test_the_printed_escape_bound_is_the_formula():
    # written out again here: k primes drawn from [2^61, 2^62), of which there are at least
    # P = 2^61/(62 ln 2); a difference of B bits has at most B/61 of them as factors, so it
    # escapes all k with probability at most (B/(61 P))^k; with extra variables each prime
    # adds the Schwartz-Zippel term d/2^61
    big_p = 2**61 / (62 * math.log(2))
    for k in (1, 2, 3):
        r = check("(-q;q)_inf", "1/(q;q^2)_inf", order=20, method="modular", primes=k, seed=k)
        expected = (10**6 / (61 * big_p)) ** k
        assert f"(B/(61*{big_p:.2e}))^{k}" in r.verdict
        assert f"below {expected:.0e} for B = 10^6" in r.verdict, r.verdict
    for k in (1, 2, 3):
        r = check("sum_{n=-inf}^{inf} (-1)^n q^(n(n-1)/2) z^n", "(z, q/z, q;q)_inf",
                  order=20, method="modular", primes=k, seed=k)
        expected = (10**6 / (61 * big_p) + 10**6 / 2**61) ** k
        assert f"B/(61*{big_p:.2e}) + d/2^61" in r.verdict
        assert f"all {k} with probability below {expected:.0e} for B, d <= 10^6" in r.verdict


def test_primes_are_drawn_uniformly_not_after_gaps(monkeypatch):
    # taking the next prime after a random number favours primes that follow long gaps, which
    # the escape bound (uniform over the primes) does not allow: a composite draw is redrawn
    import random

    from qseries.analysis import compare
    from qseries.series import is_prime
    composite = 2**61 + 1 + 2 * next(i for i in range(10**4) if not is_prime(2**61 + 1 + 2 * i))
    prime = next(n for n in range(2**61 + 10**6 + 1, 2**62, 2) if is_prime(n))
    draws = iter([composite, prime])
    monkeypatch.setattr(random.Random, "randrange", lambda self, a, b: next(draws))
    assert compare.random_primes(1, seed=0) == (prime,)


def test_verdict_text_of_an_inconclusive_modular_check_names_no_bound():
    r = check("O(q^-5) + 1", "2", order=100, method="modular", seed=1)
    assert not re.search(r"probability|agree", r.verdict)
