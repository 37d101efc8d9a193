"""The distribution of a statistic from a two-variable generating function.

When F(z, q) = sum_n P_n(z) q^n and P_n(1) counts the objects of size n, the coefficient
P_n(z) / P_n(1) is the probability generating function of the statistic that z marks.  From
it come the mean, the variance and the central moments (exact rationals) and the
standardised moments E[(X - mean)^r] / sd^r, to be compared with those of the normal
distribution: 0, 1, 0, 3, 0, 15, 0, 105, ...  (see the contributor guide's methods notes).

>>> d = distributions("sum_{k>=0} z^k q^(k^2)/(q;q)_k^2", "z", [10])[0]   # Durfee squares
>>> d.counts, d.total, d.mean
({1: 10, 2: 30, 3: 2}, 42, Fraction(38, 21))
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field
from fractions import Fraction

from ..engine import Evaluator
from ..errors import (
    ArgumentError,
    ArgumentTypeError,
    DomainError,
    QSeriesError,
    UnableError,
    integer_argument,
    typed_argument,
)
from ..lang import Node, parse
from ..lang.ast import extra_variables
from ..series import LaurentPoly, ring_for
from .display import Displayed

#: largest size n for which distributions are computed
MAX_SIZE = 100_000
#: highest moment computed (exact rational powers beyond it cost more than they tell)
MAX_MOMENT = 1000


@dataclass(frozen=True)
class Distribution(Displayed):
    """The statistic's distribution over the objects of size n: ``counts[j]`` objects have
    statistic j (the coefficient of z^j q^n)."""

    n: int
    counts: dict[int, int]
    #: the extra variable that marks the statistic (for display; not compared)
    var: str = field(default="", compare=False)

    @property
    def total(self) -> int:
        return sum(self.counts.values())

    @property
    def mean(self) -> Fraction:
        return Fraction(sum(j * c for j, c in self.counts.items()), self.total)

    @property
    def variance(self) -> Fraction:
        """E[X^2] - E[X]^2, from integer power sums."""
        s0 = self.total
        s1 = sum(j * c for j, c in self.counts.items())
        s2 = sum(j * j * c for j, c in self.counts.items())
        return Fraction(s2 * s0 - s1 * s1, s0 * s0)

    def central_moment(self, r: int) -> Fraction:
        """E[(X - mean)^r], exactly.

        >>> Distribution(3, {0: 1, 2: 1}).central_moment(2)
        Fraction(1, 1)
        """
        integer_argument("the moment r", r, 0, MAX_MOMENT)
        m = self.mean
        return sum((Fraction(j) - m) ** r * c for j, c in self.counts.items()) / self.total

    def standardised_moment(self, r: int) -> float:
        """E[(X - mean)^r] / sd^r (a float; nan when the variance is 0).

        >>> Distribution(3, {0: 1, 2: 1}).standardised_moment(4)
        1.0
        """
        integer_argument("the moment r", r, 0, MAX_MOMENT)
        v = self.variance
        if v == 0:
            return math.nan
        ratio = self.central_moment(r) / v ** (r // 2)
        try:
            x = float(ratio)
            return x if r % 2 == 0 else x / math.sqrt(v)
        except OverflowError:
            return math.inf if ratio > 0 else -math.inf


def normal_moment(r: int) -> int:
    """E[Y^r] for a standard normal Y: 0 for odd r, (r-1)!! for even r.

    >>> [normal_moment(r) for r in range(1, 9)]
    [0, 1, 0, 3, 0, 15, 0, 105]
    """
    integer_argument("the moment r", r, 0, MAX_MOMENT)
    if r % 2:
        return 0
    out = 1
    for k in range(r - 1, 0, -2):
        out *= k
    return out


def distributions(expr: str | Node, var: str, sizes: list[int],
                  progress: Callable[[int, int, int], None] | None = None
                  ) -> list[Distribution]:
    """The distribution of the statistic marked by ``var`` at each size n in ``sizes``.

    The coefficient of q^n must be a Laurent polynomial in ``var`` with non-negative integer
    coefficients (they count objects); other extra variables are refused.  ``sizes`` is a
    list (or tuple, or range) of integers in 0 .. 100000.  The series is evaluated once,
    to O(q^(max(sizes) + 1)); then ``progress(n, done, total)`` (if given) is called as the
    distribution at each size is read, in the order of ``sizes``.

    >>> [d.total for d in distributions("1/(z*q;q)_inf", "z", [5, 6])]   # p(5), p(6)
    [7, 11]
    >>> _ = distributions("1/(z*q;q)_inf", "z", [5, 6], progress=print)
    5 1 2
    6 2 2
    """
    typed_argument("expr", expr, (str, Node), "an expression (a string, or a syntax tree "
                                              "from qseries.parse)")
    typed_argument("var", var, str, "the name of an extra variable, such as 'z'")
    if not isinstance(sizes, (list, tuple, range)):
        raise ArgumentTypeError(f"sizes must be a list of integers, not "
                                f"{type(sizes).__name__}")
    if not sizes:
        raise ArgumentError("sizes is empty: give at least one size n")
    if progress is not None and not callable(progress):
        raise ArgumentTypeError(f"progress must be a function of (n, done, total), not "
                                f"{type(progress).__name__}")
    for i, n in enumerate(sizes):
        if isinstance(n, bool) or not isinstance(n, int):
            raise ArgumentTypeError(f"sizes must be integers, but sizes[{i}] is {n!r} "
                                    f"({type(n).__name__})")
        if not 0 <= n <= MAX_SIZE:
            raise ArgumentError(f"sizes must lie in 0 .. {MAX_SIZE}, but sizes[{i}] is "
                                f"{n if n.bit_length() < 100 else 'huge'}")
    node = parse(expr) if isinstance(expr, str) else expr
    names = extra_variables(node)
    if var not in names:
        raise ArgumentError(f"the expression does not mention the variable {var!r} (var) "
                            f"that should mark the statistic")
    others = sorted(names - {var})
    if others:
        raise ArgumentError(f"the expression has other extra variables ({', '.join(others)}); "
                            f"only {var!r} may remain")
    order = max(sizes) + 1
    ring = ring_for((var,))
    try:
        s = Evaluator(ring).evaluate(node, order)
    except QSeriesError as err:
        if err.weights_may_help:
            raise DomainError(f"the coefficient of each q^n must be a Laurent polynomial in "
                              f"{var} (a finite distribution), but this expression has a "
                              f"power series in {var} (such as 1/(1 - {var})) or a sum that "
                              f"does not converge in q alone") from None
        raise
    if s.offset != 0 or s.den != 1:
        raise DomainError("the series has fractional exponents; multiply by a power of q")
    if s.precision is not None and s.precision < order:
        raise UnableError(f"only the coefficients below q^{s.precision} are known")
    # all coefficients in one pass over the series (not one extraction per size)
    coeffs = s.ring._coefficients(s.poly)
    out = []
    for n in sizes:
        i = n - s.start
        c = coeffs[i] if 0 <= i < len(coeffs) else 0
        counts: dict[int, int] = {}
        if isinstance(c, LaurentPoly):
            for exps, coef in c.terms():
                counts[exps[1]] = coef
        elif c:
            counts[0] = c
        for j, k in counts.items():
            if not isinstance(k, int) or k < 0:
                raise DomainError(f"the coefficient of {var}^{j} q^{n} is {k}, not a count "
                                  f"(a non-negative integer)")
        if not counts:
            raise DomainError(f"there are no objects of size {n} (the coefficient of q^{n} "
                              f"is 0)")
        out.append(Distribution(n, dict(sorted(counts.items())), var))
        if progress is not None:
            progress(n, len(out), len(sizes))
    return out
