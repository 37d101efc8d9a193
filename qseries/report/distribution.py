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

#: a distribution with more values than this shows the first and last few only
SHOWN_VALUES = 12


def decimal_text(x: Fraction, digits: int = 10) -> str:
    """A rational number in decimal, to ``digits`` significant digits (as an integer when it
    is too large for a float).

    >>> decimal_text(Fraction(38, 21)), decimal_text(Fraction(10**400, 3))[:5]
    ('1.80952381', '33333')
    """
    return f"{float(x):.{digits}g}" if abs(x) < 10**300 else number_text(round(x))


def distribution_lines(d: Distribution, var: str, moments: int) -> list[str]:
    """The report of one size of ``qseries distribution``: the number of objects, the count
    and share of each value of the statistic (the first 6 and last 5 when there are more
    than 12), the exact and decimal mean and variance, and the standardised moments
    1..``moments`` with the normal distribution's in brackets.

    >>> from qseries.analysis import distributions
    >>> [d] = distributions("1/(z*q;q)_inf", "z", [3])
    >>> print("\\n".join(distribution_lines(d, "z", 2)))
    n = 3: 3 objects
      z =    1: 1  (0.333333)
      z =    2: 1  (0.333333)
      z =    3: 1  (0.333333)
      mean      2  = 2
      variance  2/3  = 0.6666666667
      standardised moments (normal distribution in brackets):
       1: 0.0000 [0]  2: 1.0000 [1]
    """
    lines = [f"n = {d.n}: {number_text(d.total)} objects"]
    counts = list(d.counts.items())
    shown = counts if len(counts) <= SHOWN_VALUES else counts[:6] + [None] + counts[-5:]
    for item in shown:
        if item is None:
            lines.append("    ...")
            continue
        j, c = item
        lines.append(f"  {var} = {j:>4}: {number_text(c)}  ({float(Fraction(c, d.total)):.6f})")
    lines.append(f"  mean      {number_text(d.mean)}  = {decimal_text(d.mean)}")
    lines.append(f"  variance  {number_text(d.variance)}  = {decimal_text(d.variance)}")
    lines.append("  standardised moments (normal distribution in brackets):")
    lines.append("   " + "  ".join(f"{r}: {d.standardised_moment(r):.4f} [{normal_moment(r)}]"
                                   for r in range(1, moments + 1)))
    return lines


def trend_csv(dists: Iterable[Distribution]) -> str:
    """The mean/variance table of ``qseries distribution --trend-upto N`` as CSV: one row per
    size, exact and in decimal (see the module's example).

    >>> trend_csv([]).strip()
    'n,total,mean,variance,mean_decimal,variance_decimal'
    """
    return "n,total,mean,variance,mean_decimal,variance_decimal\n" + "".join(
        f"{d.n},{number_text(d.total)},{number_text(d.mean)},{number_text(d.variance)},"
        f"{decimal_text(d.mean)},{decimal_text(d.variance)}\n" for d in dists)
