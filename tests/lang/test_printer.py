"""Round trips: parse(show(tree)) == tree, on examples and on random trees (hypothesis)."""

from fractions import Fraction

import pytest
from hypothesis import given
from hypothesis import strategies as st

from qseries.lang.ast import BigO, BigOp, BinOp, Call, Dissect, Name, Neg, Num, Poch, Q
from qseries.lang.ast import children as children_of
from qseries.lang.parser import parse
from qseries.lang.printer import show

EXAMPLES = [
    "sum_{k>=0} q^(k^2)/(q;q)_k^2",
    "2 sum_{k>=0} q^k (1-q) - 3",
    "(sum_{k>=0} q^k) (1-q)",
    "-sum_{n=-inf}^{inf} (-1)^n q^(n(3n-1)/2) + 1",
    "(q,-q,q^3;q^2)_{2k+1}",
    "prod_{n=1}^{10} (1-q^n)^-1",
    "eta(q)^3 eta(q^2)^-1 + O(q^40)",
    "q^-(2+1) - -q",
    "gaussian(6, 2) theta_3(q^2)",
    "sum_{n>=0} sum_{k=0}^{n} q^(n k)",
    "1/(q)_inf",
    "q^(1/24) (q;q)_(-3)",
    "[q^(5n+4)] 1/(q;q)_inf",
    "[q^{7k+5}] 1/(q;q)_inf + 1",
    "U_5(q (q^5;q^5)_inf^5/(q;q)_inf^6) - 2 [q^(2n - 1/24)] q^(-1/24) eta(q)",
    "[q^(n)] [q^(3n+2)] (q;q)_inf",
]


@pytest.mark.parametrize("text", EXAMPLES)
def test_examples_round_trip(text):
    bound = {"k"} if "{2k+1}" in text else set()
    tree = parse(text, bound=bound)
    assert parse(show(tree), bound=bound) == tree


def _trees(var_names: tuple[str, ...] = ()):
    leaves = [st.builds(Q), st.integers(0, 30).map(lambda n: Num(Fraction(n)))]
    if var_names:
        leaves.append(st.sampled_from(var_names).map(Name))
    base = st.one_of(*leaves)

    def extend(children):
        return st.one_of(
            st.builds(Neg, children),
            st.builds(BinOp, st.sampled_from(["+", "-", "*", "/", "^"]), children, children),
            st.builds(lambda a, b, n: Poch((a,), b, n), children, children,
                      st.one_of(st.none(), children)),
            st.builds(lambda a, n: Poch(a, Q(), n), st.lists(children, min_size=1, max_size=3)
                      .map(tuple), st.one_of(st.none(), children)),
            st.builds(lambda lo, hi, body: BigOp("sum", "j", lo, hi, body),
                      st.one_of(st.none(), children), st.one_of(st.none(), children), children)
            .filter(lambda b: not any(_has_bigop(c) for c in children_of(b))),
            st.builds(lambda e: Call("eta", (e,)), children),
            st.builds(BigO, children),
            st.builds(lambda m, r, body: Dissect(m, r, body), st.integers(1, 12),
                      st.fractions(-30, 30, max_denominator=24), children),
        )

    return st.recursive(base, extend, max_leaves=12)


def _has_bigop(node) -> bool:
    return isinstance(node, BigOp) or any(_has_bigop(c) for c in children_of(node))


@given(_trees())
def test_random_trees_round_trip(tree):
    text = show(tree)
    assert parse(text) == tree, text


def test_extra_variables_round_trip():
    for text in ["sum_{n=-inf}^{inf} z^n q^(n^2)", "(a z, q/z; q)_inf", "x1^-2 + b"]:
        node = parse(text)
        assert parse(show(node)) == node


# -- LaTeX (issue 13, item 7): what qseries prints as LaTeX, it reads back ------------------
@pytest.mark.parametrize("text", EXAMPLES)
def test_examples_round_trip_through_latex(text):
    from qseries.lang.printer import show_latex
    bound = {"k"} if "{2k+1}" in text else set()
    tree = parse(text, bound=bound)
    assert parse(show_latex(tree), bound=bound) == tree, show_latex(tree)


@given(_trees())
def test_random_trees_round_trip_through_latex(tree):
    from qseries.lang.printer import show_latex
    text = show_latex(tree)
    assert parse(text) == tree, text
