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


@pytest.mark.parametrize(("big_a", "big_b", "c"), [
    (0, 0, 0), (0, 0, -1), (0, 2, 0),               # A <= B - c: one chain
    (1, 0, 0), (0, 0, 1), (3, 1, -1), (2, 0, 2),    # A > B - c: two pieces
])
def test_the_terms_are_those_of_the_pairs(big_a, big_b, c):
    text = f"sum_{{n>={big_a}}} sum_{{k={big_b}}}^{{n{c:+d}}} q^(2n+3k)"
    # brute force over the pairs A <= n, B <= k <= n + c
    want = [0] * 60
    for n in range(big_a, 60):
        for k in range(big_b, n + c + 1):
            if 2 * n + 3 * k < 60:
                want[2 * n + 3 * k] += 1
    assert dependent_upper(parse(text)) is not None
    assert evaluate(text, 60).coefficient_list(60) == want


def test_andrews_gordon_k3_without_its_first_term():
    """The same identity as above with the term n1 = 0 (which is 1) left out: the outer sum
    starts at 1 > 0 - 0, so the pairs split into two pieces (k from 0 to 1 with every
    n1 >= 1, then the chain from k = 2)."""
    r = check("sum_{n1>=1} sum_{n2=0}^{n1} q^(n1^2+n2^2)/((q;q)_(n1-n2) (q;q)_n2)",
              "(q^3;q^7)_inf (q^4;q^7)_inf (q^7;q^7)_inf/(q;q)_inf - 1", order=250)
    assert r.holds is True


@pytest.mark.parametrize("text", [
    "sum_{n>=0} sum_{k=0}^{5} q^(n+k)",          # the inner limit does not depend on n
    "sum_{n>=0} sum_{k=0}^{n^2} q^(n+k)",        # not n + c
])
def test_sums_that_are_not_reordered(text):
    assert dependent_upper(parse(text)) is None
