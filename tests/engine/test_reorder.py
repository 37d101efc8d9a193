"""qseries.engine.reorder: a nested sum whose inner upper limit depends on the outer index
is summed as the chain it is, checked against published identities and a brute-force sum."""

import pytest

from qseries import check, evaluate
from qseries.engine.reorder import dependent_upper
from qseries.lang import parse


def test_andrews_gordon_k3_with_a_dependent_upper_limit():
    """sum_{n1>=n2>=0} q^(n1^2+n2^2)/((q;q)_(n1-n2) (q;q)_n2) = (q^3,q^4,q^7;q^7)_inf/(q;q)_inf
    (Andrews-Gordon, k = 3, i = 3; G. E. Andrews, The Theory of Partitions, 1976, Thm 7.8;
    from memory), written as papers also print it: sum_{n1>=0} sum_{n2=0}^{n1}."""
    r = check("sum_{n1>=0} sum_{n2=0}^{n1} q^(n1^2+n2^2)/((q;q)_(n1-n2) (q;q)_n2)",
              "(q^3;q^7)_inf (q^4;q^7)_inf (q^7;q^7)_inf/(q;q)_inf", order=250)
    assert r.holds is True


@pytest.mark.parametrize(("text", "c"), [
    ("sum_{n>=0} sum_{k=0}^{n} q^(2n+3k)", 0),
    ("sum_{n>=0} sum_{k=0}^{n-1} q^(2n+3k)", -1),
    ("sum_{n>=0} sum_{k=2}^{n} q^(2n+3k)", 0),
])
def test_the_terms_are_those_of_the_pairs(text, c):
    # brute force over the pairs 0 <= n, lower <= k <= n + c
    lower = 2 if "k=2" in text else 0
    want = [0] * 60
    for n in range(60):
        for k in range(lower, n + c + 1):
            if 2 * n + 3 * k < 60:
                want[2 * n + 3 * k] += 1
    assert dependent_upper(parse(text)) is not None
    assert evaluate(text, 60).coefficient_list(60) == want


@pytest.mark.parametrize("text", [
    "sum_{n>=0} sum_{k=0}^{5} q^(n+k)",          # the inner limit does not depend on n
    "sum_{n>=0} sum_{k=0}^{n+1} q^(n+k)",        # a >= max(0, k - 1): not one chain
    "sum_{n>=1} sum_{k=0}^{n} q^(n+k)",
])
def test_sums_that_are_not_reordered(text):
    assert dependent_upper(parse(text)) is None
