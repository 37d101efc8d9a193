"""Builders for the trade's objects: q-Pochhammer symbols, Euler's product, theta and eta
functions, q-binomial coefficients, and the registry the parser and CLI read.

>>> from qseries.products import FUNCTIONS
>>> 'theta_3' in FUNCTIONS
True
"""

from .pochhammer import (
    euler_product,
    exp_log_factors,
    gaussian_binomial,
    has_zero_factor,
    monomial_parts,
    pochhammer,
    pochhammer_euler,
    pochhammer_exp_log,
    theta_pair_parts,
    theta_pair_power,
    triple_product_sum,
)
from .registry import FUNCTIONS, FunctionEntry

__all__ = ["FUNCTIONS", "FunctionEntry", "euler_product", "exp_log_factors",
           "gaussian_binomial", "has_zero_factor", "monomial_parts", "pochhammer",
           "pochhammer_euler", "pochhammer_exp_log", "theta_pair_parts", "theta_pair_power",
           "triple_product_sum"]
