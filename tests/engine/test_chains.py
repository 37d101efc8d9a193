"""Products and quotients (engine/chains.py): the infinite q-Pochhammer powers of a quotient
taken together as the exponential of their summed logarithms (``pochhammer_quotient``, part
of the strategy ``exp-log``) against the factors taken one by one (the strategy switched
off), across ``EXP_QUOTIENT_ORDER``, and against published eta-quotient identities."""

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from qseries.engine import Evaluator, chooser
from qseries.engine import chains as chains_module
from qseries.lang import parse
from qseries.series import GF, QQ, ZZ

WITHOUT = ["pochhammer-form", "triple-pairs", "euler", "monomials", "splitting", "nested",
           "lambert", "stepping", "chain"]


def spied(monkeypatch):
    calls = []
    original = chains_module.pochhammer_quotient

    def spy(*args):
        got = original(*args)
        calls.append(got[0] is not None)
        return got

    monkeypatch.setattr(chains_module, "pochhammer_quotient", spy)
    return calls


@settings(max_examples=25, deadline=None)
@given(st.lists(st.tuples(st.sampled_from([1, -1]), st.integers(1, 4), st.integers(1, 4),
                          st.integers(-3, 3).filter(bool)), min_size=2, max_size=4),
       st.sampled_from([ZZ, QQ]))
def test_a_quotient_of_pochhammer_powers_equals_the_factors_one_by_one(atoms, ring):
    text = " ".join(f"({'-' if c < 0 else ''}q^{e};q^{t})_inf^({p})" for c, e, t, p in atoms)
    node = parse(text)
    order = chooser.EXP_QUOTIENT_ORDER
    got = Evaluator(ring).evaluate(node, order)
    assert got == Evaluator(ring, strategies=WITHOUT).evaluate(node, order)


@pytest.mark.parametrize("order", [chooser.EXP_QUOTIENT_ORDER, chooser.EXP_QUOTIENT_ORDER + 1])
def test_jacobi_quartic_as_eta_quotients_across_the_threshold(order, monkeypatch):
    # theta_3(q)^4 - theta_4(q)^4 = 16 q psi(q^2)^4 = 16 q (q^4;q^4)^8/(q^2;q^2)^4
    # (Berndt, Ramanujan's Notebooks III, ch. 16, Entry 25 (from memory); DLMF 20.7.1 with
    # the product forms 20.5.3) against the theta series, and the quotient is taken together
    # exactly from the threshold on (the factor q leaves the quotient one order less)
    calls = spied(monkeypatch)
    right = Evaluator(ZZ).evaluate(parse("16 q (q^4;q^4)_inf^8/(q^2;q^2)_inf^4"), order)
    left = Evaluator(ZZ).evaluate(parse("theta_3(q)^4 - theta_4(q)^4"), order)
    assert left == right
    assert any(calls) == (order - 1 >= chooser.EXP_QUOTIENT_ORDER)


def test_mixed_with_other_factors_and_not_modulo_a_prime(monkeypatch):
    # theta_3(q) = (q^2;q^2)^5/((q;q)^2 (q^4;q^4)^2) (Koehler, Eta Products and Theta Series
    # Identities, 2011 (from memory)) times a binomial and a sum; over GF(p) the quotient is
    # left to the parts of the modular method
    text = "(1 - q^3) (q^2;q^2)_inf^5/((q;q)_inf^2 (q^4;q^4)_inf^2) + sum_{n>=0} q^(n^2)"
    order = chooser.EXP_QUOTIENT_ORDER + 10
    calls = spied(monkeypatch)
    got = Evaluator(ZZ).evaluate(parse(text), order)
    assert any(calls)
    assert got == Evaluator(ZZ, strategies=WITHOUT).evaluate(parse(text), order)
    calls.clear()
    p = 2**61 - 1
    assert Evaluator(GF(p)).evaluate(parse(text), order) == got.change_ring(GF(p))
    assert not any(calls)
