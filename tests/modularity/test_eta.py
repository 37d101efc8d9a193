"""Eta quotients: weight, Newman's congruences, character, Ligozat's orders, least level."""

from fractions import Fraction

from hypothesis import given, settings
from hypothesis import strategies as st

from qseries import evaluate
from qseries.modularity.eta import EtaQuotient, least_level, squarefree_part
from qseries.modularity.gamma0 import cusps_gamma0, divisors, index_gamma0


def test_orders_of_the_level_two_hauptmodul():
    # eta(2 tau)^24 / eta(tau)^24 at level 2: order 1 at infinity and -1 at the cusp 0
    # (the textbook value; Ono, Theorem 1.65)
    f = EtaQuotient.of({1: -24, 2: 24})
    assert f.order_at(2, 2) == 1
    assert f.order_at(1, 2) == -1
    assert f.is_function_on(2)


def test_delta_at_level_one_and_two():
    # Delta = eta^24 has a simple zero at infinity (Serre, A Course in Arithmetic, VII.4);
    # on Gamma_0(2) the cusp 0 has width 2, so the order there in its local parameter is 2
    delta = EtaQuotient.of({1: 24})
    assert delta.weight == 12 and delta.order_at(1, 1) == 1
    assert delta.orders(2) == {1: 2, 2: 1}
    assert least_level([delta]) == 1


def test_the_weight_two_form_of_level_eleven():
    # eta(tau)^2 eta(11 tau)^2 is the newform of level 11 and weight 2, trivial character
    # (Ono, Web of Modularity, §1.4, from memory): Newman holds at 11, not at a smaller level
    f = EtaQuotient.of({1: 2, 11: 2})
    assert f.weight == 2 and f.newman(11) and least_level([f]) == 11
    assert f.character_class() == 1
    assert all(o >= 0 for o in f.orders(11).values())


def test_jacobi_quartic_quotients():
    # the methods guide's worked example: f_1 = eta^16 eta(2)^-24 eta(4)^8,
    # f_2 = eta^8 eta(2)^-24 eta(4)^16 at level 4: orders at the cusps 0, 1/2, inf are
    # (1, -1, 0) and (0, -1, 1)
    f1, f2 = EtaQuotient.of({1: 16, 2: -24, 4: 8}), EtaQuotient.of({1: 8, 2: -24, 4: 16})
    assert list(f1.orders(4).values()) == [1, -1, 0]
    assert list(f2.orders(4).values()) == [0, -1, 1]
    assert least_level([f1, f2], functions=True) == 4


def test_character_of_theta_squared():
    # theta_3(q)^2 = eta(2)^10 / (eta(1)^4 eta(4)^4) has weight 1 and the character of
    # Q(sqrt(-1)), (-4/d) (r_2(n) = 4 sum_{d|n} (-4/d): Jacobi; Ono §1.4, from memory)
    f = EtaQuotient.of({1: -4, 2: 10, 4: -4})
    assert f.weight == 1 and f.newman(4) and squarefree_part(Fraction(-4)) == -1
    assert f.character_class() == -1


def test_order_at_infinity_is_the_valuation():
    # Ligozat's order at infinity is where the q-expansion starts, computed by the engine
    for r in ({1: 16, 2: -24, 4: 8}, {1: 2, 11: 2}, {2: 5, 1: -2, 4: -2}, {4: 8, 2: -4}):
        f = EtaQuotient.of(r)
        n = least_level([f]) or f.least_multiple
        s = evaluate(f.text(), 30)
        assert f.order_at(n, n) == s.valuation == f.offset


@settings(max_examples=40, deadline=None)
@given(st.sampled_from([2, 4, 6, 8, 12, 25]), st.data())
def test_order_at_zero_is_the_valuation_of_the_fricke_image(n, data):
    # the cusp 0 (width N) is infinity moved by tau -> -1/(N tau), and eta(-1/tau) =
    # sqrt(tau/i) eta(tau) turns f into a constant times tau^k prod eta((N/d) tau)^(r_d):
    # Ligozat's order at 0 is where that quotient's expansion starts (computed by the engine)
    r = {d: data.draw(st.integers(-6, 6)) for d in divisors(n)}
    f = EtaQuotient.of(r)
    image = EtaQuotient.of({n // d: e for d, e in f.exponents})
    s = evaluate(image.text(), 40)
    assert f.order_at(1, n) == s.valuation


@settings(max_examples=60, deadline=None)
@given(st.sampled_from([4, 6, 8, 9, 10, 12, 16, 18]), st.data())
def test_valence_formula(n, data):
    # the orders over all cusps add up to k m / 12 (eta quotients have no zeros or poles in
    # the upper half-plane; Ono, Theorem 1.65 and the valence formula)
    r = {d: data.draw(st.integers(-12, 12)) for d in divisors(n)}
    f = EtaQuotient.of(r)
    if not f.newman(n) or f.weight.denominator != 1:
        return
    total = sum(c.count * f.order_at(c.d, n) for c in cusps_gamma0(n))
    assert total == f.weight * index_gamma0(n) / 12


def test_least_level_refuses():
    # eta(tau) alone: sum d r_d = 1 is not 0 mod 24 at any level
    assert least_level([EtaQuotient.of({1: 1})]) is None
    # eta(tau)^-5 eta(2 tau)^10 eta(3 tau)^-5: weight 0 and Newman at level 72, but
    # s = 2^10 / 3^5 is not a square: a form with a character, no function on Gamma_0(N)
    f = EtaQuotient.of({1: -5, 2: 10, 3: -5})
    assert least_level([f]) == 72 and f.weight == 0
    assert least_level([f], functions=True) is None and not f.is_function_on(72)
    assert least_level([EtaQuotient.of({1: 2, 11: 2})], multiple_of=2) == 22
