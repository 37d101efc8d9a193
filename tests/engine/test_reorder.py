"""qseries.engine.reorder: a nested sum whose inner upper limit depends on the outer index
is summed as the chain it is, checked against published identities and a brute-force sum."""

import pytest

from qseries import check, evaluate
from qseries.engine.reorder import dependent_upper, symmetric_range
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


@pytest.mark.parametrize(("big_a", "low", "c"), [(0, 0, 0), (1, 0, 2), (2, -1, -1), (3, 2, 0),
                                                  (2, 0, -3), (0, 0, -1)])
def test_a_range_from_minus_n_holds_the_terms_of_the_pairs(big_a, low, c):
    text = f"sum_{{n>={big_a}}} q^n sum_{{j=-n{low:+d}}}^{{n{c:+d}}} q^(2n + j)"
    want = [0] * 60           # brute force over the pairs A <= n, -n + l <= j <= n + c
    for n in range(big_a, 60):
        for j in range(-n + low, n + c + 1):
            if 3 * n + j < 60:
                want[3 * n + j] += 1
    assert symmetric_range(parse(text)) is not None
    assert evaluate(text, 60).coefficient_list(60) == want


def test_rogers_bailey_pair_summed_from_minus_n():
    """sum_{j=-n}^{n} (-1)^j q^(j(3j-1)/2)/((q;q)_(n-j) (q;q)_(n+j)) = 1/(q;q)_n, the Bailey
    pair relative to 1 behind the first Rogers-Ramanujan identity (alpha_j = (-1)^j
    q^(j(3j-1)/2) (1 + q^j), beta_n = 1/(q;q)_n; G. E. Andrews, q-Series: Their Development
    and Application, CBMS 66, 1986, ch. 3; from memory), checked for every n at once with z^n
    marking n, and summed against q^(n^2) as the Rogers-Ramanujan sum side."""
    body = "(-1)^j q^(j(3j-1)/2)/((q;q)_(n-j) (q;q)_(n+j))"
    r = check(f"sum_{{n>=0}} z^n sum_{{j=-n}}^{{n}} {body}", "sum_{n>=0} z^n/(q;q)_n",
              order=30, weights={"z": 1})
    assert r.holds is True
    r = check(f"sum_{{n>=0}} q^(n^2) sum_{{j=-n}}^{{n}} {body}",
              "1/((q;q^5)_inf (q^4;q^5)_inf)", order=300)
    assert r.holds is True


def test_a_range_that_does_not_reach_zero_is_not_split():
    # j from -n + 2: for n = 0, 1 the range lies above 0, so splitting at 0 would add terms
    assert symmetric_range(parse("sum_{n>=0} sum_{j=-n+2}^{n} q^(n+j)")) is None
    # j up to n - 3 (regression, found by a fuzzing run): for n = 1 the range -1..-2 is
    # empty, but the negative half added j = -1
    assert symmetric_range(parse("sum_{n>=0} q^n sum_{j=-n}^{n-3} q^(j^2)")) is None
    assert symmetric_range(parse("sum_{n>=2} q^n sum_{j=-n}^{n-3} q^(j^2)")) is not None


def test_rogers_bailey_pair_summed_over_every_integer():
    """The same Bailey pair written with j over every integer, as sum_j alpha_j/((q;q)_(n-j)
    (q;q)_(n+j)) is often printed: the denominators vanish outside -n <= j <= n."""
    r = check("sum_{n>=0} q^(n^2) sum_{j=-inf}^{inf} (-1)^j q^(j(3j-1)/2)"
              "/((q;q)_(n-j) (q;q)_(n+j))", "1/((q;q^5)_inf (q^4;q^5)_inf)", order=300)
    assert r.holds is True
