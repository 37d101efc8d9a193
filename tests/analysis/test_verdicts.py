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


# -- the escape bound of the modular method, recomputed here from its statement --------------
# The statement (compare.escape_bound, README "Extra variables"): k distinct primes are drawn
# uniformly from [2^61, 2^62), of which there are at least P; a nonzero integer of B bits has
# at most B/61 prime factors >= 2^61, so one random prime divides it with probability at most
# B/(61 P), and all k with probability at most (B/(61 P))^k.  With extra variables set to
# random nonzero residues, a nonzero Laurent polynomial of degree d that survives modulo p
# vanishes at the random point with probability at most d/(p - 1) <= d/2^61 (Schwartz-Zippel),
# so each prime is escaped with probability at most B/(61 P) + d/2^61, all k at most its k-th
# power.  The verdict prints P, the formula and its value at B (and d) = 10^6.

PLAIN = re.compile(r"modulo the primes ([\d, ]+) at .* escapes all (\d+) with probability at "
                   r"most \(B/\(61\*([\d.e+]+)\)\)\^(\d+), below ([\d.e+-]+) for B = 10\^6")
SCHWARTZ_ZIPPEL = re.compile(r"modulo the primes ([\d, ]+), at .* at most B/\(61\*([\d.e+]+)\) "
                             r"\+ d/2\^61, so all (\d+) with probability below ([\d.e+-]+) "
                             r"for B, d <= 10\^6")
EULER = ("(-q;q)_inf", "1/(q;q^2)_inf")
TRIPLE = ("sum_{n=-inf}^{inf} (-1)^n q^(n(n-1)/2) z^n", "(z, q/z, q;q)_inf")


def _primes_in_the_range_at_least() -> float:
    """A lower bound for the number of primes in [2^61, 2^62), independent of qseries:
    pi(2^62) - pi(2^61) >= L(2^62) - U(2^61) with Dusart's bounds L(x) = x/ln x (1 + 1/ln x)
    <= pi(x) (x >= 599) and pi(x) <= x/ln x (1 + 1/ln x + 2.51/ln^2 x) = U(x) (x >= 355991);
    P. Dusart, Math. Comp. 68 (1999) 411-415 (from memory).  About 5.39e16; the logarithmic
    integral gives 5.40e16."""
    def low(x: float) -> float:
        ln = math.log(x)
        return x / ln * (1 + 1 / ln)

    def high(x: float) -> float:
        ln = math.log(x)
        return x / ln * (1 + 1 / ln + 2.51 / ln**2)

    return low(2.0**62) - high(2.0**61)


def _one_digit(x: float) -> float:
    """x rounded UP to one significant digit, as the verdict prints it (an upper bound)."""
    import math
    e = math.floor(math.log10(x))
    d = math.ceil(x / 10.0**e - 1e-9)
    return float(f"{d}e{e}")


def _printed_as(printed: float, expected: float, k: int) -> bool:
    """``printed`` is ``expected`` rounded up to one digit; ``expected`` is recomputed from
    the prime count as printed (three digits), off by up to half a percent per prime."""
    slack = 1.005**k
    return _one_digit(expected / slack) <= printed <= _one_digit(expected * slack)


def test_the_printed_prime_count_is_a_lower_bound():
    r = check(*EULER, order=20, method="modular", primes=1, seed=1)
    printed = float(PLAIN.search(r.verdict).group(3))
    lower = _primes_in_the_range_at_least()
    # the printed P may not exceed the true count (the bound would be understated), and is not
    # needlessly small either
    assert 0.99 * lower <= printed <= lower, (printed, lower)
    # and near the estimate by the logarithmic integral (mpmath, which sympy ships)
    import mpmath
    assert abs(lower / float(mpmath.li(2**62) - mpmath.li(2**61)) - 1) < 0.01


@pytest.mark.parametrize("k", [1, 2, 3, 20])
def test_the_printed_escape_bound_is_the_formula(k):
    r = check(*EULER, order=20, method="modular", primes=k, seed=k)
    m = PLAIN.search(r.verdict)
    assert m, r.verdict
    primes = [int(p) for p in m.group(1).split(", ")]
    assert primes == list(r.primes) and len(set(primes)) == k
    assert all(2**61 <= p < 2**62 for p in primes)
    assert int(m.group(2)) == int(m.group(4)) == k          # "all k" and the exponent k
    big_p = float(m.group(3))
    expected = (10**6 / (61 * big_p)) ** k
    assert _printed_as(float(m.group(5)), expected, k), (m.group(5), expected)


@pytest.mark.parametrize("k", [1, 2, 3, 20])
def test_the_printed_schwartz_zippel_bound_is_the_formula(k):
    r = check(*TRIPLE, order=20, method="modular", primes=k, seed=k)
    m = SCHWARTZ_ZIPPEL.search(r.verdict)
    assert m, r.verdict
    assert [int(p) for p in m.group(1).split(", ")] == list(r.primes)
    assert int(m.group(3)) == k
    big_p = float(m.group(2))
    expected = (10**6 / (61 * big_p) + 10**6 / 2**61) ** k
    assert _printed_as(float(m.group(4)), expected, k), (m.group(4), expected)


# regression: the verdict rounded to the nearest digit ('below 3e-13' for 3.05e-13)
@pytest.mark.parametrize("k", [1, 2])
def test_the_printed_bound_is_never_below_the_formula(k):
    for sides, pattern, at in ((EULER, PLAIN, 5), (TRIPLE, SCHWARTZ_ZIPPEL, 4)):
        r = check(*sides, order=20, method="modular", primes=k, seed=k)
        m = pattern.search(r.verdict)
        big_p = float(m.group(3 if pattern is PLAIN else 2))
        per_prime = 10**6 / (61 * big_p) + (0 if pattern is PLAIN else 10**6 / 2**61)
        assert float(m.group(at)) >= per_prime**k, r.verdict


def test_the_command_line_prints_the_same_bound():
    from typer.testing import CliRunner

    from qseries.cli.main import app
    out = CliRunner().invoke(app, ["check", *EULER, "-n", "20", "-m", "modular", "--primes",
                                   "2"]).stdout
    m = PLAIN.search(" ".join(out.split()))
    assert m, out
    expected = (10**6 / (61 * float(m.group(3)))) ** 2
    assert int(m.group(4)) == 2 and _printed_as(float(m.group(5)), expected, 2)


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
