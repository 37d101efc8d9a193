"""Proofs of dissection identities sum_n a(mn + r) q^n = G by the U_m operator on a
modular function (issue 15, item 4), as in Ramanujan's sum p(5n+4) q^n =
5 (q^5;q^5)_inf^5 / (q;q)_inf^6.

Write the dissected side as F = [q^(mn+r)] c_B q^(t_B) eta_B(tau) and the other side as
G = sum_i c_i q^t eta_i(tau) (both recognised by :mod:`.recognise`).  With P_B = q^(-v_B)
eta_B (a power series 1 + ...), F = c_B U_m(q^(k0) P_B), k0 = t_B + v_B - r.  For an eta
quotient M (the multiplier), U_m(g(q^m) h(q)) = g(q) U_m(h) gives

    U_m(f) = sum_i (c_i / c_B) M eta_i,    f = eta_B(tau) M(m tau),

provided t = (k0 - v_B) / m (the powers of q match; else the identity is false or needs
another normalisation) and t - v_M is an integer (U_m(q^(m e) f) = q^e U_m(f)).  The search
looks for M (small exponents on the divisors of the levels involved) making f and every
g_i = M eta_i modular functions on Gamma_0(N) with m | N; then U_m(f) is a modular function
on Gamma_0(N) too (U_p preserves Gamma_0(N) for p | N: A. O. L. Atkin and J. Lehner,
Math. Ann. 185 (1970) 134-160), holomorphic on the upper half-plane, and so is
h = U_m(f) - sum_i (c_i/c_B) g_i.  The valence argument of :mod:`.prove` needs a lower bound
for the order of U_m(f) at each cusp a/c != infinity of Gamma_0(N):
U_m f(tau) = (1/m) sum_{j<m} f((tau + j)/m), and with gamma = (a b; c d) in SL2(Z) the matrix
(1 j; 0 m) gamma = gamma' (A B; 0 D) with A = gcd(a + jc, mc) and D = m/A, so the j-th term
at the cusp a/c is f at the cusp gamma' infinity = ((a+jc)/A)/(mc/A), whose leading exponent
in e^(2 pi i tau'') is rho(y) = (1/24) sum_delta gcd(y, delta)^2 r_delta / delta (y its
denominator; Ligozat's formula over the width), taken at tau'' = (A tau' + B)/D.  In the
local parameter e^(2 pi i tau'/w) of a/c (width w) the j-th term starts at
w rho(y_j) A^2 / m, and the order of U_m f at a/c is at least the least of these (rounded
up: orders of functions are integers).  This is the argument of S. Radu, An algorithmic
approach to Ramanujan-Kolberg identities, J. Symbolic Comput. 68 (2015) 225-253, written
out here (our own derivation, re-derived in the tests' re-checker).

>>> r = prove_dissection(parse("[q^(5n+4)] 1/(q;q)_inf"),
...                      parse("5 (q^5;q^5)_inf^5/(q;q)_inf^6"))
>>> r.proved, r.certificate.level, r.certificate.bound, r.certificate.multiplier.text()
(True, 25, 1, 'eta(q^5)')
"""

from __future__ import annotations

import itertools
import math
from fractions import Fraction

from ..analysis import check
from ..lang import Node, parse
from ..lang.ast import Dissect
from .eta import EtaQuotient, least_level
from .gamma0 import MAX_LEVEL, divisors, index_gamma0
from .prove import (
    MAX_CHECK_ORDER,
    Certificate,
    CuspOrders,
    ProofResult,
    RecognisedTerm,
    _refused,
    compare_to,
)
from .recognise import recognise

#: exponents of the multiplier searched: -MAX_MULTIPLIER .. MAX_MULTIPLIER on each divisor
MAX_MULTIPLIER = 24
#: at most this many divisors carry the multiplier
MULTIPLIER_SUPPORT = 3
#: at most about this many multipliers are listed (the exponents shrink with more divisors)
MAX_CANDIDATES = 100_000
#: at most this many multipliers that work are compared for the least bound
MAX_TRIED = 200


def rho(f: EtaQuotient, y: int) -> Fraction:
    """The leading exponent of f at a cusp x/y in e^(2 pi i tau''): (1/24) sum_delta
    gcd(y, delta)^2 r_delta / delta.

    >>> rho(EtaQuotient.of({1: -1, 25: 1}), 1), rho(EtaQuotient.of({1: -1, 25: 1}), 25)
    (Fraction(-1, 25), Fraction(1, 1))
    """
    return sum((Fraction(math.gcd(y, d) ** 2 * e, 24 * d) for d, e in f.exponents),
               Fraction(0))


def cusp_representatives(n: int) -> list[tuple[int, int]]:
    """One (a, c) per cusp a/c of Gamma_0(N): c | N, gcd(a, c) = 1, a running over the
    classes prime to gcd(c, N/c).

    >>> cusp_representatives(25)
    [(1, 1), (1, 5), (2, 5), (3, 5), (4, 5), (1, 25)]
    """
    out = []
    for c in divisors(n):
        g = math.gcd(c, n // c)
        for u in range(g):
            if math.gcd(u, g) != 1 and g > 1:
                continue
            a = u if g > 1 else 1
            while math.gcd(a, c) != 1:
                a += g
            out.append((a, c))
    return out


def u_lower_bound(f: EtaQuotient, m: int, a: int, c: int, n: int) -> int:
    """A lower bound for the order of U_m(f) at the cusp a/c of Gamma_0(N) (its local
    parameter), f a modular function on Gamma_0(N), m | N.

    >>> f = EtaQuotient.of({1: -1, 25: 1})
    >>> u_lower_bound(f, 5, 1, 1, 25), u_lower_bound(f, 5, 2, 5, 25)
    (-5, 1)
    """
    width = n // math.gcd(c * c, n)
    least = None
    for j in range(m):
        big_a = math.gcd(a + j * c, m * c)
        y = m * c // big_a
        v = width * rho(f, y) * big_a * big_a / m
        least = v if least is None else min(least, v)
    assert least is not None
    return math.ceil(least)


def _split(lnode: Node, rnode: Node) -> tuple[Dissect, Node, bool] | None:
    if isinstance(lnode, Dissect) and not isinstance(rnode, Dissect):
        return lnode, rnode, False
    if isinstance(rnode, Dissect) and not isinstance(lnode, Dissect):
        return rnode, lnode, True
    return None


def _multipliers(support: list[int], total: int) -> list[EtaQuotient]:
    """Eta quotients on at most MULTIPLIER_SUPPORT of the divisors, exponents summing to
    ``total``, small exponents first."""
    out = []
    top = min(MULTIPLIER_SUPPORT, len(support))
    bound = MAX_MULTIPLIER           # fewer exponents when there are many divisors
    while bound > 1 and math.comb(len(support), top) * (2 * bound + 1) ** (top - 1) > \
            MAX_CANDIDATES:
        bound -= 1
    rng = range(-bound, bound + 1)
    for size in range(1, top + 1):
        for ds in itertools.combinations(support, size):
            for es in itertools.product(rng, repeat=size - 1):
                last = total - sum(es)
                if abs(last) > bound or 0 in es or last == 0:
                    continue
                out.append(EtaQuotient.of(dict(zip(ds, (*es, last), strict=True))))
    if total == 0:
        out.insert(0, EtaQuotient.of({}))
    out.sort(key=lambda q: sum(abs(e) for _, e in q.exponents))
    return out


def _scaled(q: EtaQuotient, m: int) -> EtaQuotient:
    """q(m tau)."""
    return EtaQuotient.of({d * m: e for d, e in q.exponents})


def prove_dissection(lhs: Node, rhs: Node, order: int = 100) -> ProofResult:
    """Prove [q^(mn+r)] B = G (either side may be the dissection) for an eta quotient B and
    a combination G of eta quotients, or say why not (with the ordinary check to ``order``).
    """
    split = _split(lhs, rhs)
    if split is None:
        return _refused(lhs, rhs, order, "a proof about dissections needs exactly one side "
                                         "of the form [q^(mn+r)] F")
    dis, other, swapped = split
    m = dis.m
    body, rec = recognise(dis.body), recognise(other)
    why = []
    if body.terms is None or len(body.terms) != 1:
        why.append("the dissected series is not recognised as one eta quotient times a power "
                   "of q" + (f": {body.reason}" if body.reason else ""))
    if rec.terms is None or not rec.terms:
        why.append("the other side is not recognised as a combination of eta quotients"
                   + (f": {rec.reason}" if rec.reason else ""))
    if why:
        return _refused(lhs, rhs, order, "; ".join(why))
    assert body.terms is not None and rec.terms is not None
    [tb] = body.terms
    eta_b, vb = tb.eta, tb.eta.offset
    k0 = tb.shift + vb - dis.r
    shifts = {t.shift for t in rec.terms}
    weights = {t.eta.weight for t in rec.terms}
    if len(shifts) > 1 or weights != {eta_b.weight}:
        return _refused(lhs, rhs, order, "the terms of the other side need one power of q and "
                                         "the weight of the dissected eta quotient")
    t = shifts.pop()
    if k0.denominator != 1 or t != (k0 - vb) / m:
        return _refused(lhs, rhs, order,
                        f"the powers of q do not match: U_{m} of the dissected series carries "
                        f"q^({(k0 - vb) / m}) in front of its eta quotients, the other side "
                        f"q^({t})")
    base = 1
    for q in [eta_b] + [x.eta for x in rec.terms]:
        base = base * q.least_multiple // math.gcd(base, q.least_multiple)
    base = base * m // math.gcd(base, m)
    if base * m * 24 > MAX_LEVEL:
        return _refused(lhs, rhs, order, f"levels above {MAX_LEVEL} are not handled")
    support = divisors(base)
    best = None
    tried = 0
    for mult in _multipliers(support, -int(2 * eta_b.weight)):
        if (t - mult.offset).denominator != 1:
            continue
        f = eta_b * _scaled(mult, m)
        gs = [mult * x.eta for x in rec.terms]
        level = least_level([f] + gs, functions=True, multiple_of=m * base)
        if level is None or level > MAX_LEVEL:
            continue
        tried += 1
        table = []
        bound = 0
        for a, c in cusp_representatives(level):
            if c == level:
                continue
            lows = [u_lower_bound(f, m, a, c, level)] + [g.order_at(c, level) for g in gs]
            width = level // math.gcd(c * c, level)
            table.append(CuspOrders(f"{a}/{c}", c, 1, width, tuple(Fraction(x) for x in lows)))
            bound -= min(lows)
        e1 = (k0 - vb - m * mult.offset) / m
        high = bound + e1
        if best is None or high < best[0]:
            best = (high, int(bound), level, mult, f, tuple(table), e1)
        if tried >= MAX_TRIED:
            break
    if best is None:
        return _refused(lhs, rhs, order,
                        f"no multiplier eta quotient (exponents up to {MAX_MULTIPLIER} on at "
                        f"most {MULTIPLIER_SUPPORT} divisors of {base}) makes both U_{m}'s "
                        f"argument and the other side's terms modular functions on one "
                        f"Gamma_0(N)")
    high, bound, level, mult, f, table, e1 = best
    if high >= MAX_CHECK_ORDER:
        return _refused(lhs, rhs, order, f"the bound needs the coefficients up to q^{high}, "
                                         f"above the limit q^{MAX_CHECK_ORDER}")
    side = "rhs" if not swapped else "lhs"
    terms = tuple((side, RecognisedTerm(-x.coefficient / tb.coefficient, mult * x.eta,
                                        Fraction(0))) for x in rec.terms)
    low = min(Fraction(math.ceil(k0 / m)), t + min(x.eta.offset for x in rec.terms))
    cert = Certificate("dissection", level, index_gamma0(level), eta_b.weight, None, t, terms,
                       None, table, bound, low, high,
                       operator=(m, dis.r), function=f, multiplier=mult,
                       scale=tb.coefficient)
    result, upto = compare_to(lhs, rhs, high)
    if result.holds is False:
        return ProofResult(False, False, cert, None, result)
    if result.holds is None or Fraction(result.order_verified) <= high:
        return ProofResult(False, result.holds, None,
                           f"the coefficients could be compared only below q^"
                           f"{result.order_verified}, not up to the bound q^{high}", result)
    far = max(upto, order)              # as in prove: beyond a tiny bound
    guards = [(dis.body, body.text(), m * far + int(math.ceil(abs(dis.r))) + 1),
              (other, rec.text(), far)]
    for node, text, n in guards:
        if check(node, parse(text), n, method="exact").holds is not True:
            return ProofResult(False, None, None, f"internal fault: {text!r} differs from the "
                                                  f"expression it was recognised in", result)
    return ProofResult(True, True, cert, None, result)


__all__ = ["cusp_representatives", "prove_dissection", "rho", "u_lower_bound"]
