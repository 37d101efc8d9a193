"""Analyses on computed series: comparing the two sides of an identity, recovering product
forms, diagnosing failed checks, dissections, congruences and relations.

>>> from qseries.analysis import check
>>> check("(q;q)_inf", "sum_{n=-inf}^{inf} (-1)^n q^(n(3n-1)/2)", order=300).holds
True
"""

from .compare import CheckResult, Mismatch, check, compare_series
from .congruences import (
    Congruence,
    CongruenceSearch,
    Counterexample,
    Divisibility,
    divisible,
    find_congruences,
)
from .diagnose import Hint, diagnose
from .dissection import Dissection, dissect, dissection
from .product_form import ProductForm, product_form
from .relations import Combination, Relations, express, relations
from .statistic import Distribution, distributions, normal_moment

__all__ = ["CheckResult", "Combination", "Congruence", "CongruenceSearch", "Counterexample",
           "Dissection",
           "Distribution", "Divisibility", "Hint", "Mismatch", "ProductForm", "Relations",
           "check", "compare_series", "diagnose", "dissect", "dissection", "distributions",
           "divisible", "express", "find_congruences", "normal_moment", "product_form", "relations"]
