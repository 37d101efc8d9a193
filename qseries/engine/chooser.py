"""The one place that holds the order of preference among the evaluation strategies and every
threshold that decides between them.

A strategy is named, public and tested against the reference it replaces: for sums the
``direct`` reference (every term from scratch, through the general walk) and for q-Pochhammer
symbols the ``factors`` reference (factor by factor).  ``Evaluator(strategies=...)`` takes a
collection of these names to force or exclude strategies; the references stay available as the
last resort.

>>> allowed_strategies(["direct"]) == frozenset({"direct", "factors"})
True
>>> allowed_strategies(["spliting"])  # doctest: +ELLIPSIS
Traceback (most recent call last):
...
qseries.errors.ArgumentError: unknown evaluation strategy 'spliting'; the strategies are ...
"""

from __future__ import annotations

from collections.abc import Iterable

from ..errors import ArgumentError
from ..products import (
    exp_log_factors,
    has_zero_factor,
    pochhammer,
    pochhammer_euler,
    pochhammer_exp_log,
)
from ..series import Series

#: strategies for a sum, in the order of preference (the first that applies and succeeds wins)
SUM_STRATEGIES = ("monomials", "splitting", "nested", "lambert", "stepping", "direct")
#: strategies for products: ``prod_{n}`` of binomials in n rewritten to q-Pochhammer symbols
#: (``prod_pochhammer``), Jacobi's triple product for pairs of factors, then for a single
#: infinite q-Pochhammer symbol Euler's product, the exponential of the logarithm, and the
#: reference factor by factor
PRODUCT_STRATEGIES = ("pochhammer-form", "triple-pairs", "euler", "exp-log", "factors")
#: strategies for a nest of sums taken as a whole (``sum_chain``), tried before the
#: outermost sum is summed term by term with the strategies above
NEST_STRATEGIES = ("chain",)
STRATEGIES = SUM_STRATEGIES + PRODUCT_STRATEGIES + NEST_STRATEGIES
#: the references, always allowed
REFERENCES = frozenset({"direct", "factors"})

# -- thresholds ----------------------------------------------------------------------------
#: finite ranges longer than this are cut by the valuation analysis where it applies
SPLIT_RANGE = 256
#: a finite range the analysis cannot cut is evaluated in full only up to this length
FALLBACK_RANGE = 20_000
#: the ``chain`` strategy takes nests of at least this many sums (a single sum has the
#: single-sum strategies)
CHAIN_MIN_DEPTH = 2
#: binary splitting needs at least this many terms
SPLIT_MIN_TERMS = 8
#: binary splitting is used while the binomials' exponents add up to at most this many times
#: the order (beyond, the tree's nodes are all dense and stepping term by term is cheaper)
SPLIT_DEGREE = 8
#: FLINT keeps integers of up to this many bits in a machine word; larger ones cost about a
#: hundred times more per coefficient added
WORD_BITS = 62
#: ``nested`` over ZZ bounds the size of the coefficients from this order on, and runs
#: modulo word-size primes (then the Chinese remainder theorem) when the bound exceeds
#: ``WORD_BITS``
NESTED_CRT_ORDER = 256
#: an infinite product (c q^a; q^t)_inf with at least this many factors below the order is
#: computed as the exponential of its logarithm instead of factor by factor
EXP_FACTORS = 24
#: from this order on, over ZZ and QQ, the infinite q-Pochhammer powers of a quotient (an
#: eta quotient with negative exponents) are evaluated together as the exponential of their
#: summed logarithms (``chains.pochhammer_quotient``): its coefficients are small where the
#: denominator's inverse has large ones (16 q (q^4;q^4)^8/(q^2;q^2)^4: 0.42 s -> 0.12 s at
#: order 20 000, 0.042 s -> 0.030 s at 5000; below about 3000 the separate powers are faster)
EXP_QUOTIENT_ORDER = 3000
#: ``check(method="auto")`` may go modular from this order on (series in q alone) ...
AUTO_MODULAR_ORDER = 3000
#: ... and from this order on when there are extra variables (exact Laurent coefficients
#: grow fast)
AUTO_MODULAR_ORDER_EXTRA = 400
#: above those orders ``auto`` first evaluates both sides exactly to this order and
#: extrapolates the size of their largest coefficient to the order asked (from its growth
#: between half this order and this order) ...
AUTO_PROBE_ORDER = 1024
#: ... and estimates the cost of each method from it (``auto_costs``), in units of one
#: evaluation of both sides modulo one prime: exact arithmetic costs this much while the
#: largest coefficient fits a machine word (``WORD_BITS``: Lambert series, theta and eta
#: products have coefficients of a few dozen bits at any order) ...
AUTO_SMALL_COST = 0.8
#: ... and this much per 64 bits of the largest coefficient beyond (measured with
#: benchmarks/bench_auto.py on the panel of benchmarks/bench_shapes.py, orders 5000 to
#: 50000: 0.6 to 1.8, mostly 1.0 to 1.4)
AUTO_WORD_COST = 1.2
#: the modular method evaluates the primes after the first in worker processes from here on
PARALLEL_ORDER = 50_000
#: from this order on the command line estimates the cost of a run before starting it
#: (``engine.cost``): probes from ``PROBE_FIRST_ORDER`` on, doubled until one takes
#: ``PROBE_SECONDS``
COST_CHECK_ORDER = 50_000
PROBE_FIRST_ORDER = 1024
PROBE_SECONDS = 0.25
#: ``product`` refuses orders above this unless --allow-long is given: a series whose log
#: derivative has large coefficients (no product form with small exponents) falls back to an
#: exact division or inverse whose coefficients grow to thousands of digits, and the probes
#: of the estimate do not see that working memory
PRODUCT_MAX_ORDER = 200_000
#: a run estimated above these is refused on the command line unless --allow-long is given
COST_LIMIT_SECONDS = 600.0
COST_LIMIT_BYTES = 2_000_000_000


def allowed_strategies(strategies: Iterable[str] | None) -> frozenset[str]:
    """The strategy names an evaluator may use: all of them for None, else the given ones
    (validated) together with the references."""
    if strategies is None:
        return frozenset(STRATEGIES)
    if isinstance(strategies, str):
        raise ArgumentError("strategies must be a collection of names, not one string")
    names = frozenset(strategies)
    for name in sorted(names):
        if name not in STRATEGIES:
            raise ArgumentError(f"unknown evaluation strategy {name!r}; the strategies are "
                                f"{', '.join(STRATEGIES)}")
    return names | REFERENCES


def sum_strategies(allowed: frozenset[str], *, monomials: bool, steppable_only: bool,
                   lambert_shape: bool, terms: int) -> list[str]:
    """The sum strategies to try, in order, for a sum of ``terms`` terms whose factors are
    all monomials (``monomials``), or all monomials and q-Pochhammer symbols that step
    (``steppable_only``), or that has no stepping symbol and coefficients where sparse
    Lambert-type terms apply (``lambert_shape``).

    >>> sum_strategies(frozenset(STRATEGIES), monomials=False, steppable_only=True,
    ...                lambert_shape=False, terms=40)
    ['splitting', 'nested', 'stepping', 'direct']
    """
    shape = {
        "monomials": monomials,
        "splitting": steppable_only and terms >= SPLIT_MIN_TERMS,
        "nested": steppable_only and terms >= SPLIT_MIN_TERMS,
        "lambert": lambert_shape,
        "stepping": "stepping" in allowed,
        "direct": True,
    }
    return [name for name in SUM_STRATEGIES if name in allowed and shape[name]]


def use_chain(allowed: frozenset[str], depth: int) -> bool:
    """Whether a nest of ``depth`` sums is tried with the ``chain`` strategy first.

    >>> use_chain(frozenset(STRATEGIES), 3), use_chain(frozenset(STRATEGIES), 1)
    (True, False)
    """
    return "chain" in allowed and depth >= CHAIN_MIN_DEPTH


def pochhammer_value(a: Series, t: int, n: int | None, order: int,
                     allowed: frozenset[str]) -> Series:
    """(a; q^t)_n modulo q^order by the first strategy that applies: Euler's product, the
    exponential of the logarithm (from ``EXP_FACTORS`` factors on), factor by factor.

    >>> q = Series.monomial(1)
    >>> pochhammer_value(q, 1, None, 6, frozenset(STRATEGIES))
    1 - q - q^2 + q^5 + O(q^6)
    """
    if (n is None or n >= 0) and has_zero_factor(a, t, n):
        return Series.zero(a.ring)       # a factor 1 - 1: exactly 0, whatever the strategy
    if n is None and "euler" in allowed:
        got = pochhammer_euler(a, t, order)
        if got is not None:
            return got
    if n is None and "exp-log" in allowed and exp_log_factors(a, t, order) >= EXP_FACTORS:
        got = pochhammer_exp_log(a, t, order)
        if got is not None:
            return got
    return pochhammer(a, t, n, order)


def auto_costs(bits: float, primes: int, order: int, cores: int) -> tuple[float, float]:
    """(exact, modular): the estimated cost of a check by each method, in units of one
    evaluation of both sides modulo one prime, for an identity whose largest coefficient
    below the order has about ``bits`` bits: exact arithmetic costs ``AUTO_SMALL_COST``
    up to ``WORD_BITS`` and ``AUTO_WORD_COST`` per 64 bits beyond; the modular method one
    unit per prime, and from ``PARALLEL_ORDER`` on (the primes after the first in worker
    processes) the primes shared among ``cores``.  ``auto`` is exact when that costs no
    more.

    >>> auto_costs(20, 3, 10_000, 2)              # Lambert series, theta products
    (0.8, 3.0)
    >>> auto_costs(640, 3, 10_000, 2)             # partition numbers at order 50 000
    (12.0, 3.0)
    >>> auto_costs(200, 1, 10_000, 2)             # one prime: exact only within a word
    (3.75, 1.0)
    >>> auto_costs(100, 3, 60_000, 2)             # three primes on two cores
    (1.875, 1.5)
    """
    exact = AUTO_SMALL_COST if bits <= WORD_BITS else AUTO_WORD_COST * bits / 64
    parallel = order >= PARALLEL_ORDER and primes > 1 and cores > 1
    modular = primes / min(primes, cores) if parallel else float(primes)
    return exact, modular
