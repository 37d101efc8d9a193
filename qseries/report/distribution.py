"""Distributions of a statistic (:func:`qseries.analysis.distributions`) as text: one size
with its counts and moments, and the mean/variance table as CSV.

>>> from qseries.analysis import distributions
>>> print(trend_csv(distributions("1/(z*q;q)_inf", "z", [1, 2])), end="")
n,total,mean,variance,mean_decimal,variance_decimal
1,1,1,0,1,0
2,2,3/2,1/4,1.5,0.25
"""

from __future__ import annotations

from collections.abc import Iterable
from fractions import Fraction

from ..analysis import Distribution, normal_moment
from ..series.formatting import number_text

#: a distribution with more values than this shows those between its 1% and 99% quantiles
SHOWN_VALUES = 12


def decimal_text(x: Fraction, digits: int = 10) -> str:
    """A rational number in decimal, to ``digits`` significant digits (as an integer when it
    is too large for a float).

    >>> decimal_text(Fraction(38, 21)), decimal_text(Fraction(10**400, 3))[:5]
    ('1.80952381', '33333')
    """
    return f"{float(x):.{digits}g}" if abs(x) < 10**300 else number_text(round(x))


def quantile(d: Distribution, p: Fraction) -> int:
    """The smallest value j of the statistic with P(X <= j) >= p (exactly).

    >>> quantile(Distribution(4, {1: 1, 2: 2, 3: 1}), Fraction(1, 2))
    2
    """
    need = p * d.total
    acc = 0
    for j, c in d.counts.items():
        acc += c
        if acc >= need:
            return j
    return next(reversed(d.counts))


#: the quantiles printed under a distribution
QUANTILES = ((Fraction(1, 100), "1%"), (Fraction(1, 4), "25%"), (Fraction(1, 2), "median"),
             (Fraction(3, 4), "75%"), (Fraction(99, 100), "99%"))


def _row(var: str, j: int, c: int, total: int) -> str:
    return f"{var} = {j:>4}: {number_text(c)}  ({float(Fraction(c, total)):.6f})"


def _tail(var: str, lo: int, hi: int, c: int, total: int) -> str:
    return (f"  {var} = {lo:>4} .. {hi}: {number_text(c)} together  "
            f"({float(Fraction(c, total)):.6f})")


def distribution_lines(d: Distribution, var: str, moments: int) -> list[str]:
    """The report of one size of ``qseries distribution``: the number of objects, the count
    and share of each value of the statistic, the mode and quantiles, the exact and decimal
    mean and variance, and the standardised moments 1..``moments`` with the normal
    distribution's in brackets.  With more than 12 values, those between the 1% and 99%
    quantiles are shown (three to a line when there are more than 12 of them) and the
    values outside them as one line on each side, so that every object is accounted for.

    >>> from qseries.analysis import distributions
    >>> [d] = distributions("1/(z*q;q)_inf", "z", [3])
    >>> print("\\n".join(distribution_lines(d, "z", 2)))
    n = 3: 3 objects
      z =    1: 1  (0.333333)
      z =    2: 1  (0.333333)
      z =    3: 1  (0.333333)
      mode z = 1, 2, 3; quantiles 1%: 1, 25%: 1, median: 2, 75%: 3, 99%: 3
      mean      2  = 2
      variance  2/3  = 0.6666666667
      standardised moments (normal distribution in brackets):
       1: 0.0000 [0]  2: 1.0000 [1]
    """
    lines = [f"n = {d.n}: {number_text(d.total)} object{'' if d.total == 1 else 's'}"]
    counts = list(d.counts.items())
    if len(counts) <= SHOWN_VALUES:
        lines.extend("  " + _row(var, j, c, d.total) for j, c in counts)
    else:
        lo, hi = quantile(d, QUANTILES[0][0]), quantile(d, QUANTILES[-1][0])
        below = [(j, c) for j, c in counts if j < lo]
        middle = [(j, c) for j, c in counts if lo <= j <= hi]
        above = [(j, c) for j, c in counts if j > hi]
        if below:
            lines.append(_tail(var, below[0][0], below[-1][0], sum(c for _, c in below),
                               d.total))
        rows = [_row(var, j, c, d.total) for j, c in middle]
        per_line = 1 if len(rows) <= SHOWN_VALUES else 3
        width = max(len(r) for r in rows)
        for i in range(0, len(rows), per_line):
            lines.append("  " + "   ".join(r.ljust(width) for r in
                                           rows[i:i + per_line]).rstrip())
        if above:
            lines.append(_tail(var, above[0][0], above[-1][0], sum(c for _, c in above),
                               d.total))
    top = max(d.counts.values())
    mode = ", ".join(str(j) for j, c in counts if c == top)
    lines.append(f"  mode {var} = {mode}; quantiles " +
                 ", ".join(f"{name}: {quantile(d, p)}" for p, name in QUANTILES))
    lines.append(f"  mean      {number_text(d.mean)}  = {decimal_text(d.mean)}")
    lines.append(f"  variance  {number_text(d.variance)}  = {decimal_text(d.variance)}")
    if d.variance == 0:                   # one value: E[(X - mean)^r] / 0^r is undefined
        lines.append("  standardised moments: none (the variance is 0)")
        return lines
    lines.append("  standardised moments (normal distribution in brackets):")
    lines.append("   " + "  ".join(f"{r}: {d.standardised_moment(r):.4f} [{normal_moment(r)}]"
                                   for r in range(1, moments + 1)))
    return lines


def counts_csv(dists: Iterable[Distribution], var: str) -> str:
    """Every count of the distributions as CSV: size n, value of the statistic, number of
    objects (exact) and their share (decimal), one row per value.

    >>> from qseries.analysis import distributions
    >>> print(counts_csv(distributions("1/(z*q;q)_inf", "z", [3]), "z"), end="")
    n,z,count,share
    3,1,1,0.3333333333
    3,2,1,0.3333333333
    3,3,1,0.3333333333
    """
    return f"n,{var},count,share\n" + "".join(
        f"{d.n},{j},{number_text(c)},{decimal_text(Fraction(c, d.total))}\n"
        for d in dists for j, c in d.counts.items())


def trend_csv(dists: Iterable[Distribution]) -> str:
    """The mean/variance table of ``qseries distribution --trend-upto N`` as CSV: one row per
    size, exact and in decimal (see the module's example).

    >>> trend_csv([]).strip()
    'n,total,mean,variance,mean_decimal,variance_decimal'
    """
    return "n,total,mean,variance,mean_decimal,variance_decimal\n" + "".join(
        f"{d.n},{number_text(d.total)},{number_text(d.mean)},{number_text(d.variance)},"
        f"{decimal_text(d.mean)},{decimal_text(d.variance)}\n" for d in dists)
