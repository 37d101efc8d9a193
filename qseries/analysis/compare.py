"""Compare the two sides of a conjectured identity modulo q^N.

Agreement to O(q^N) is evidence, not a proof: :class:`CheckResult` says exactly which
coefficients were compared, and at a mismatch which exponent differs first.

>>> r = check("sum_{k>=0} q^(k^2)/(q;q)_k^2", "1/(q;q)_inf", order=50)
>>> r.holds, r.order_verified
(True, 50)
>>> r = check("1/(1-q)", "1 + q + q^2 + 2q^3", order=10)
>>> r.holds, r.first_mismatch.exponent, r.first_mismatch.lhs, r.first_mismatch.rhs
(False, 3, 1, 2)
"""

from __future__ import annotations

import os
import random
import time
from collections.abc import Callable
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, field
from fractions import Fraction

from ..errors import DomainError, QSeriesError
from ..lang import Node, evaluate, parse
from ..series import GF, QQ, ZZ, Ring, Series, is_prime
from ..series.formatting import number_text

Exponent = int | Fraction
Number = int | Fraction


@dataclass(frozen=True)
class Mismatch:
    """The first exponent at which the two sides differ, with both coefficients."""

    exponent: Exponent
    lhs: Number
    rhs: Number

    @property
    def difference(self) -> Number:
        return self.lhs - self.rhs


@dataclass(frozen=True)
class CheckResult:
    """Outcome of comparing two sides modulo q^order.

    ``holds`` means: every coefficient of q^e with e < ``order_verified`` agrees.  It is never
    a proof of the identity; ``order_verified`` can be smaller than ``order_requested`` when
    negative powers cost precision.
    """

    holds: bool
    order_requested: int
    order_verified: Exponent
    first_mismatch: Mismatch | None
    seconds: float
    lhs: Series = field(repr=False)
    rhs: Series = field(repr=False)
    #: "exact", or "modular" (both sides compared modulo ``primes``)
    method: str = "exact"
    primes: tuple[int, ...] = ()

    @property
    def verdict(self) -> str:
        """One honest sentence.

        >>> print(check("(q;q)_inf", "1 - q - q^2", order=5).verdict)
        the two sides agree to O(q^5) (every coefficient below q^5 compared; evidence, not a proof)
        """
        if self.first_mismatch is None and self.method == "modular":
            k = len(self.primes)
            return (f"the two sides agree modulo the primes {', '.join(map(str, self.primes))} "
                    f"at every coefficient below q^{_text(self.order_verified)} (a nonzero "
                    f"coefficient difference of B bits escapes all {k} with probability at "
                    f"most (B/(61*{PRIME_COUNT:.2e}))^{k}, below {escape_bound(10**6, k):.0e} "
                    f"for B = 10^6; evidence, not a proof)")
        if self.first_mismatch is None:
            return (f"the two sides agree to O(q^{_text(self.order_verified)}) (every "
                    f"coefficient below q^{_text(self.order_verified)} compared; evidence, "
                    f"not a proof)")
        m = self.first_mismatch
        return (f"the two sides differ: first at q^{_text(m.exponent)}, where the left side "
                f"has {_text(m.lhs)} and the right side {_text(m.rhs)}")

    def neighbours(self, radius: int = 2) -> list[tuple[Exponent, Number, Number]]:
        """Coefficients of both sides at the exponents around the first mismatch."""
        if self.first_mismatch is None:
            return []
        e0 = Fraction(self.first_mismatch.exponent)
        out = []
        for d in range(-radius, radius + 1):
            e = e0 + d
            known = [x.precision for x in (self.lhs, self.rhs) if x.precision is not None]
            if e < min(_low(self.lhs), _low(self.rhs), e0) or e >= self.order_verified or \
                    any(e >= k for k in known):
                continue
            e_out = e.numerator if e.denominator == 1 else e
            out.append((e_out, self.lhs.coefficient(e), self.rhs.coefficient(e)))
        return out


def _low(s: Series) -> Fraction:
    v = s.valuation
    return Fraction(v) if v is not None else Fraction(0)


def _text(x: Exponent | Number) -> str:
    return number_text(x)


def _known_to(s: Series, order: int) -> Exponent:
    p = s.precision
    if p is None or p >= order:
        return order
    return p


def compare_series(lhs: Series, rhs: Series, order: int) -> tuple[Exponent, Mismatch | None]:
    """(order verified, first mismatch or None) for two computed series.

    >>> from qseries.series import Series
    >>> compare_series(Series.from_coefficients([1, 2, 3]), Series.from_coefficients([1, 2, 4]), 9)
    (9, Mismatch(exponent=2, lhs=3, rhs=4))
    """
    verified = min(_known_to(lhs, order), _known_to(rhs, order))
    if lhs.offset == rhs.offset or lhs.is_zero() or rhs.is_zero():
        diff = lhs - rhs
        for e, _ in diff.terms():
            if e >= verified:
                break
            return verified, Mismatch(e, lhs.coefficient(e), rhs.coefficient(e))
        return verified, None
    # different fractional offsets: the first term of either side below the order differs
    firsts = [e for s in (lhs, rhs) for e, _ in list(s.terms())[:1] if e < verified]
    if not firsts:
        return verified, None
    e = min(firsts)
    return verified, Mismatch(e, lhs.coefficient(e), rhs.coefficient(e))


#: orders above this use the modular method under ``method="auto"``
AUTO_MODULAR_ORDER = 3000
#: the modular method draws primes from [2^61, 2^62); there are about this many
PRIME_COUNT = 2**61 / (62 * 0.6931471805599453)


def escape_bound(bits: int, k: int) -> float:
    """Upper bound on the chance that a nonzero integer of ``bits`` bits is divisible by k
    primes drawn at random from [2^61, 2^62): it has at most bits/61 such prime factors.

    >>> escape_bound(10**6, 3) < 1e-30
    True
    """
    return (bits / 61 / PRIME_COUNT) ** k


def random_primes(k: int, seed: int | None = None) -> tuple[int, ...]:
    """k distinct random primes in [2^61, 2^62).

    >>> all(2**61 <= p < 2**62 for p in random_primes(2, seed=1))
    True
    """
    rng = random.Random(seed)
    out: list[int] = []
    while len(out) < k:
        n = rng.randrange(2**61, 2**62) | 1
        while not is_prime(n):
            n += 2
        if n < 2**62 and n not in out:
            out.append(n)
    return tuple(out)


def check(lhs: str | Node, rhs: str | Node, order: int = 100, ring: Ring = ZZ,
          method: str = "exact", primes: int = 3, seed: int | None = None,
          progress: Callable[[str], None] | None = None) -> CheckResult:
    """Evaluate both sides modulo q^order and compare every coefficient below q^order.

    ``method="modular"`` compares modulo ``primes`` random primes near 2^62 (much faster at
    high order) and recomputes the two coefficients exactly at a mismatch; ``"auto"`` uses
    it above order 3000.  ``progress`` (if given) is called with a short text at each stage.

    >>> check("(-q;q)_inf", "1/(q;q^2)_inf", order=200).holds      # Euler
    True
    >>> check("(-q;q)_inf", "1/(q;q^2)_inf", order=200, method="modular", seed=7).method
    'modular'
    """
    if isinstance(order, bool) or not isinstance(order, int) or order < 1:
        raise QSeriesError(f"the order must be a positive integer, not {order!r}")
    if method not in ("exact", "modular", "auto"):
        raise QSeriesError(f"unknown method {method!r}: use exact, modular or auto")
    if method == "auto":
        method = "modular" if order > AUTO_MODULAR_ORDER and ring in (ZZ, QQ) else "exact"
    t0 = time.perf_counter()
    say = progress or (lambda _text: None)
    if method == "modular":
        return _check_modular(lhs, rhs, order, primes, seed, t0, say)
    say("evaluating the left side")
    left = evaluate(lhs, order, ring)
    say("evaluating the right side")
    right = evaluate(rhs, order, ring)
    verified, mismatch = compare_series(left, right, order)
    return CheckResult(mismatch is None, order, verified, mismatch,
                       time.perf_counter() - t0, left, right)


#: from this order on, the modular method spreads its primes over worker processes
PARALLEL_ORDER = 50_000


def _modular_sides(lnode: Node, rnode: Node, order: int, p: int) -> tuple[Series, Series]:
    try:
        return evaluate(lnode, order, GF(p)), evaluate(rnode, order, GF(p))
    except DomainError as err:
        raise DomainError(f"{err} (modulo the prime {p}; try --method exact)") from None


def _modular_compare(lnode: Node, rnode: Node, order: int, p: int
                     ) -> tuple[Exponent, Mismatch | None]:
    left, right = _modular_sides(lnode, rnode, order, p)
    return compare_series(left, right, order)


def _check_modular(lhs: str | Node, rhs: str | Node, order: int, k: int, seed: int | None,
                   t0: float, say: Callable[[str], None]) -> CheckResult:
    if k < 1:
        raise QSeriesError("the modular method needs at least one prime")
    ps = random_primes(k, seed)
    lnode = parse(lhs) if isinstance(lhs, str) else lhs
    rnode = parse(rhs) if isinstance(rhs, str) else rhs
    verified: Exponent = order
    first: Exponent | None = None
    # at high order the other primes run in worker processes while this one computes the first
    parallel = order >= PARALLEL_ORDER and len(ps) > 1 and (os.cpu_count() or 1) > 1
    pool = ProcessPoolExecutor(max_workers=min(len(ps) - 1, os.cpu_count() or 1)) \
        if parallel else None
    try:
        futures = [pool.submit(_modular_compare, lnode, rnode, order, p) for p in ps[1:]] \
            if pool else []
        say(f"comparing modulo {len(ps)} primes" + (" in parallel" if pool else ""))
        left, right = _modular_sides(lnode, rnode, order, ps[0])
        outcomes = [compare_series(left, right, order)]
        if pool:
            outcomes += [f.result() for f in futures]
        else:
            for i, p in enumerate(ps[1:], start=2):
                say(f"comparing modulo prime {i} of {len(ps)}")
                outcomes.append(_modular_compare(lnode, rnode, order, p))
    finally:
        if pool:
            pool.shutdown(cancel_futures=True)
    for v, m in outcomes:
        verified = min(verified, v)
        if m is not None and (first is None or Fraction(m.exponent) < Fraction(first)):
            first = m.exponent
    if first is None:
        return CheckResult(True, order, verified, None, time.perf_counter() - t0, left, right,
                           "modular", ps)
    # recompute both sides exactly just past the first mismatch, and report them
    say("recomputing the first mismatch exactly")
    upto = int(Fraction(first)) + 3
    exact_l, exact_r = evaluate(lnode, upto), evaluate(rnode, upto)
    _, mismatch = compare_series(exact_l, exact_r, upto)
    return CheckResult(False, order, verified, mismatch, time.perf_counter() - t0,
                       exact_l, exact_r, "modular", ps)
