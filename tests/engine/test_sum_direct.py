"""The direct reference itself, against sympy's expansion of the same finite sums."""

import pytest
import sympy

from qseries.engine import Evaluator
from qseries.lang import parse

x = sympy.symbols("x")


@pytest.mark.parametrize("text, terms", [
    ("sum_{k=0}^{6} x^(k^2)/(x;x)_k", lambda k: x**(k * k) / sympy.prod(
        [1 - x**i for i in range(1, k + 1)])),
    ("sum_{k=0}^{6} (-1)^k x^(k(k+1)/2)/(1 - x^(k+1))", lambda k: (-1)**k * x**(k * (k + 1) // 2)
     / (1 - x**(k + 1))),
])
def test_direct_sums_against_sympy(text, terms):
    n = 30
    ours = Evaluator(strategies=["direct"]).evaluate(parse(text.replace("x", "q")), n)
    total = sum(terms(k) for k in range(7))
    expected = sympy.series(total, x, 0, n).removeO()
    assert ours.coefficient_list(n) == [expected.coeff(x, e) for e in range(n)]
