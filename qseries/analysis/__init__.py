"""Analyses on computed series: comparing the two sides of an identity.

>>> from qseries.analysis import check
>>> check("(q;q)_inf", "sum_{n=-inf}^{inf} (-1)^n q^(n(3n-1)/2)", order=300).holds
True
"""

from .compare import CheckResult, Mismatch, check, compare_series

__all__ = ["CheckResult", "Mismatch", "check", "compare_series"]
