"""The direct reference itself, against sympy's expansion of the same finite sums (sympy's
ring_series: truncated power series over QQ; sympy.series on the whole rational function
gave the same coefficients in 5 s)."""

import pytest
from sympy import QQ
from sympy.polys.ring_series import rs_mul, rs_series_inversion
from sympy.polys.rings import ring

from qseries.engine import Evaluator
from qseries.lang import parse

R, x = ring("x", QQ)
N = 30


def _series(numerator, denominator):
    """numerator/denominator modulo x^N by sympy."""
    return rs_mul(numerator, rs_series_inversion(denominator, x, N), x, N)


def _prod(factors):
    out = R(1)
    for f in factors:
        out *= f
    return out


@pytest.mark.parametrize("text, term", [
    ("sum_{k=0}^{6} x^(k^2)/(x;x)_k",
     lambda k: _series(x**(k * k), _prod(1 - x**i for i in range(1, k + 1)))),
    ("sum_{k=0}^{6} (-1)^k x^(k(k+1)/2)/(1 - x^(k+1))",
     lambda k: _series((-1)**k * x**(k * (k + 1) // 2), 1 - x**(k + 1))),
])
def test_direct_sums_against_sympy(text, term):
    ours = Evaluator(strategies=["direct"]).evaluate(parse(text.replace("x", "q")), N)
    expected = sum((term(k) for k in range(7)), R(0))
    assert ours.coefficient_list(N) == [expected.coeff(x**e) for e in range(N)]
