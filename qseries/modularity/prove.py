"""Prove an identity LHS = RHS between combinations of eta quotients by a finite check.

Both sides are recognised from their structure (:mod:`.recognise`) as q^t times linear
combinations of eta quotients; the identity is then sum_i c_i f_i = 0 for eta quotients f_i
of one weight k (the right side's coefficients negated), with the same power q^t
factored out of every term.  Two published bounds turn this into a finite check:

- ``sturm``: when k is an integer, every f_i satisfies Newman's congruences at one level N
  (Ono, Web of Modularity, Theorem 1.64), all have the same character and are holomorphic at
  every cusp (Ligozat's orders >= 0, Theorem 1.65), the combination lies in M_k(Gamma_0(N),
  chi), and it is 0 when its coefficients of q^0 .. q^B vanish, B = floor(k m / 12)
  (J. Sturm, LNM 1240, 1987);
- ``valence`` otherwise (weight 0, half-integral weight, or poles at cusps): divide by one
  term f_j; the g_i = f_i / f_j are modular functions on Gamma_0(N) (weight 0, Newman, s a
  square; Ligozat), g = sum c_i g_i has no poles off the cusps, and a nonzero g has total
  order 0 over the cusps, so ord_inf(g) <= -sum_{s != inf} ord_s(g) <= B with
  B = -sum_{s != inf} min_i ord_s(g_i) (each cusp class counted with its number of cusps;
  G. Köhler, Eta Products and Theta Series Identities, Springer 2011; S. Radu, J. Symbolic
  Comput. 68 (2015)).  Coefficients up to q^B of g, that is up to q^(B + t + v_j) of
  LHS - RHS (v_j the leading exponent of f_j), vanishing prove g = 0.  The term divided by
  is the one that needs the fewest coefficients.

Dividing by f_j is multiplying through by the eta quotient 1/f_j; the literature's other
choice, a multiplier M making every M f_i a holomorphic form of integral weight k' and one
character on some Gamma_0(N') and then Sturm's bound, is never needed and never checks fewer
coefficients: the f_i/f_j = M f_i / M f_j then pass the valence criteria at N' (the
differences of Newman's sums vanish mod 24, s_i/s_j is a square), and since eta quotients
have no zeros in the upper half-plane, B' = k' m(N')/12 = sum_s ord_s(M f_j) over all cusps,
so shift + B' - v_M = shift + v_j + sum_{s != inf} ord_s(M f_j), where holomorphy gives
ord_s(M) >= -min_i ord_s(f_i) and so ord_s(M f_j) >= -min_i ord_s(f_i / f_j): the valence
bound at N' is at most B' - v_M - v_j, and at the least level N | N' it is no larger (a
test compares both routes with the re-checker's own multiplier search).

The coefficients are compared exactly (integers or rationals) by the ordinary series
engine on the sides as typed, and, as a guard against a fault in the recognition, each
side is also compared with its recognised form to that order or to ``order``, whichever
is higher.

>>> r = prove("theta_3(q)^4", "theta_2(q)^4 + theta_4(q)^4")
>>> r.proved, r.certificate.method, r.certificate.level, r.certificate.bound
(True, 'sturm', 4, 1)
>>> prove("sum_{n>=0} q^(n^2)/(q;q)_n", "1/((q;q^5)_inf (q^4;q^5)_inf)", order=50).reason[:32]
'the left side is not recognised '
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction

from ..analysis import CheckResult, check
from ..errors import integer_argument
from ..lang import Node, parse
from ..lang.ast import Dissect
from ..series import power_text
from .eta import EtaQuotient, least_level
from .gamma0 import MAX_LEVEL, cusps_gamma0, index_gamma0, sturm_bound
from .recognise import RecognisedTerm, Recognition, recognise

#: the highest exponent a proof checks coefficients to (the bound can grow with the level)
MAX_CHECK_ORDER = 100_000


@dataclass(frozen=True)
class CuspOrders:
    """The cusps c/d of one denominator d: how many, their width, and the order at them of
    each function the bound uses (the terms for ``sturm``, the quotients by the divisor
    for ``valence``), with the least."""

    cusp: str
    d: int
    count: int
    width: int
    orders: tuple[Fraction, ...]

    @property
    def least(self) -> Fraction:
        return min(self.orders, default=Fraction(0))


@dataclass(frozen=True)
class Certificate:
    """What a referee needs to re-check a proof.

    The identity proved is sum_i coefficient_i * eta_i = 0 for the ``terms`` (right side
    negated), which is LHS - RHS multiplied by q^(-shift).  ``method`` ``sturm``: every term
    in M_k(Gamma_0(level), chi), ``bound`` = floor(k * index / 12); ``valence``: the
    quotients by term ``divisor`` are modular functions on Gamma_0(level) and ``bound`` =
    -sum over the cusps other than infinity of count * least order.  The coefficients of
    LHS - RHS at every exponent from ``low`` to ``high`` (in steps of 1) were computed
    exactly and are 0.
    """

    method: str
    level: int
    index: int
    weight: Fraction
    character: int | None
    shift: Fraction
    terms: tuple[tuple[str, RecognisedTerm], ...]
    divisor: int | None
    cusps: tuple[CuspOrders, ...]
    bound: int
    low: Fraction
    high: Fraction
    #: for ``dissection`` (:mod:`.dissection`): (m, r) of [q^(mn+r)], the eta quotient f
    #: with U_m(f) = sum of the terms (each coefficient_i * eta_i, right side negated, is
    #: then a modular function on Gamma_0(level)), the multiplier M with f = B(tau) M(m tau),
    #: and the constant c_B in front of the dissected eta quotient B
    operator: tuple[int, Fraction] | None = None
    function: EtaQuotient | None = None
    multiplier: EtaQuotient | None = None
    scale: Fraction | None = None

    @property
    def coefficients(self) -> int:
        """How many coefficients were compared (high - low + 1)."""
        return int(self.high - self.low) + 1

    @property
    def character_text(self) -> str | None:
        """"trivial", "(t/d)" (Kronecker), or None (the valence method's quotients have the
        trivial character whatever the terms have)."""
        if self.character is None:
            return None
        return "trivial" if self.character == 1 else f"({self.character}/d)"


@dataclass(frozen=True)
class ProofResult:
    """``proved`` True with the ``certificate``; or ``holds`` False with the exact first
    mismatch in ``check`` (the sides differ); or ``reason`` why no proof was attempted or
    completed, with ``check`` the ordinary evidence check (``holds`` is its outcome)."""

    proved: bool
    holds: bool | None
    certificate: Certificate | None
    reason: str | None
    check: CheckResult | None

    @property
    def verdict(self) -> str:
        """One sentence.

        >>> print(prove("theta_3(q)", "eta(q^2)^5/(eta(q)^2 eta(q^4)^2)").verdict)
        ... # doctest: +NORMALIZE_WHITESPACE
        proved: every term divided by eta(q)^-2 eta(q^2)^5 eta(q^4)^-2 is a modular function
        on Gamma_0(4); the valence bound is 0 and the coefficients of q^0 .. q^0 agree exactly
        (1 compared)
        """
        c = self.certificate
        if self.proved and c is not None:
            checked = (f"the coefficients of q^{c.low} .. q^{c.high} agree exactly "
                       f"({c.coefficients} compared)")
            if c.method == "sturm":
                scaled = "" if c.shift == 0 else f" times q^({-c.shift})"
                return (f"proved: both sides{scaled} are modular forms of weight "
                        f"{c.weight} on Gamma_0({c.level}) with character {c.character_text}; "
                        f"Sturm's bound is {c.bound} and {checked}")
            if c.method == "dissection":
                assert c.operator is not None and c.function is not None
                m = c.operator[0]
                return (f"proved: U_{m} of f = {c.function.text()} and every term of the other "
                        f"side times {c.multiplier.text() if c.multiplier else '1'} are modular "
                        f"functions on Gamma_0({c.level}); the valence bound (with a lower "
                        f"bound for the orders of U_{m} f at the cusps) is {c.bound} and "
                        f"{checked}")
            assert c.divisor is not None
            return (f"proved: every term divided by {c.terms[c.divisor][1].eta.text()} is a "
                    f"modular function on Gamma_0({c.level}); the valence bound is {c.bound} "
                    f"and {checked}")
        if self.reason is None and self.check is not None and self.check.first_mismatch:
            m = self.check.first_mismatch
            return (f"the two sides differ: first at q^{m.exponent}, where the left side has "
                    f"{m.lhs} and the right side {m.rhs}")
        return f"not proved: {self.reason}"


def _node(x: str | Node) -> Node:
    return parse(x) if isinstance(x, str) else x


def looks_provable(lhs: str | Node, rhs: str | Node) -> bool:
    """True when both sides are recognised as q^t times combinations of eta quotients of one
    weight (recognition only: no series is computed, no level searched).

    >>> looks_provable("theta_3(q)^2", "theta_3(q^2)^2 + theta_2(q^2)^2")
    True
    >>> looks_provable("sum_{n>=1} q^n/(1-q^n)", "1")
    False
    >>> looks_provable("[q^(5n+4)] 1/(q;q)_inf", "5 (q^5;q^5)_inf^5/(q;q)_inf^6")
    True
    """
    lnode, rnode = _node(lhs), _node(rhs)
    if isinstance(lnode, Dissect) != isinstance(rnode, Dissect):
        dis, other = (lnode, rnode) if isinstance(lnode, Dissect) else (rnode, lnode)
        assert isinstance(dis, Dissect)
        body, rest = recognise(dis.body), recognise(other)
        return body.terms is not None and len(body.terms) == 1 and bool(rest.terms)
    left, right = recognise(lnode), recognise(rnode)
    if left.terms is None or right.terms is None:
        return False
    terms = list(left.terms) + list(right.terms)
    return (len({t.shift for t in terms}) <= 1 and len({t.eta.weight for t in terms}) <= 1
            and bool(terms))


def _cusp_table(level: int, fns: list[EtaQuotient]) -> tuple[CuspOrders, ...]:
    return tuple(CuspOrders(c.text, c.d, c.count, c.width,
                            tuple(f.order_at(c.d, level) for f in fns))
                 for c in cusps_gamma0(level))


def _sturm(terms: list[RecognisedTerm]) -> tuple[int, tuple[CuspOrders, ...], int] | None:
    """(level, cusps, character class) when every term is a holomorphic form of one integral
    weight and character at one level."""
    k = terms[0].eta.weight
    if k.denominator != 1 or k < 0:
        return None
    etas = [t.eta for t in terms]
    level = least_level(etas)
    if level is None:
        return None
    chars = {e.character_class() for e in etas}
    if len(chars) != 1:
        return None
    table = _cusp_table(level, etas)
    if any(c.least < 0 for c in table):
        return None
    return level, table, chars.pop()


def _valence(terms: list[RecognisedTerm], shift: Fraction
             ) -> tuple[int, int, tuple[CuspOrders, ...], int, Fraction] | None:
    """(divisor, level, cusps, bound, highest exponent) for the best term to divide by."""
    best = None
    seen: set[EtaQuotient] = set()
    for j, tj in enumerate(terms):
        if tj.eta in seen:
            continue
        seen.add(tj.eta)
        fns = [t.eta / tj.eta for t in terms]
        level = least_level(fns, functions=True,
                            multiple_of=least_level_base(terms))
        if level is None:
            continue
        table = _cusp_table(level, fns)
        bound = -sum(c.count * c.least for c in table if c.d != level)
        if bound.denominator != 1:          # orders of functions are integers
            continue
        high = bound + shift + tj.eta.offset
        if best is None or high < best[4]:
            best = (j, level, table, int(bound), high)
    return best


def least_level_base(terms: list[RecognisedTerm]) -> int:
    """The lcm of every d with eta(d tau) in a term: the level is a multiple of it.

    >>> least_level_base([RecognisedTerm(Fraction(1), EtaQuotient.of({2: 1, 3: 1}), Fraction(0))])
    6
    """
    out = 1
    for t in terms:
        m = t.eta.least_multiple
        out = out * m // math.gcd(out, m)
    return out


def _why_not_modular(terms: list[RecognisedTerm]) -> str:
    """Which criterion fails for the quotients by the first term."""
    base = terms[0].eta
    for t in terms[1:]:
        f = t.eta / base
        if sum(d * e for d, e in f.exponents) % 24:
            return (f"the quotient ({t.eta.text()}) / ({base.text()}) fails Newman's condition "
                    f"sum d r_d = 0 (mod 24)")
        if least_level([f], functions=True) is None:
            return (f"the quotient ({t.eta.text()}) / ({base.text()}) has a nontrivial "
                    f"character (prod d^(r_d) is not a square): the terms are not modular "
                    f"for one character")
    return "no level makes every term modular"


#: how many times the exact comparison is repeated further when negative powers of q cost
#: a side precision and the coefficients up to the bound were not all compared
COMPARE_RETRIES = 4


def compare_to(lnode: Node, rnode: Node, high: Fraction) -> tuple[CheckResult, int]:
    """The exact check of LHS against RHS that compares every coefficient up to q^high
    (asking for more when a side loses precision to negative powers of q, at most
    COMPARE_RETRIES times), with the order asked for last.

    >>> r, upto = compare_to(parse("f(q^4)^-2"), parse("q^(1/3) eta(q^4)^2 eta(q^8)^-6"
    ...                                                " eta(q^16)^2"), Fraction(0))
    >>> r.holds, r.order_verified > 0, upto
    (True, True, 2)
    """
    upto = max(math.floor(high) + 1, 1)   # exponents e <= high; a check compares q^0 at least
    result = check(lnode, rnode, upto, method="exact")
    for _ in range(COMPARE_RETRIES):
        if result.holds is False or (result.holds is not None
                                     and Fraction(result.order_verified) > high):
            break
        short = upto - Fraction(result.order_verified) if result.holds is not None else upto
        upto += max(math.ceil(short), 1)
        result = check(lnode, rnode, upto, method="exact")
    return result, upto


def _refused(lnode: Node, rnode: Node, order: int, reason: str) -> ProofResult:
    evidence = check(lnode, rnode, order)
    return ProofResult(False, evidence.holds, None, reason, evidence)


def prove(lhs: str | Node, rhs: str | Node, order: int = 100) -> ProofResult:
    """Prove LHS = RHS (or find where they differ) when both sides are combinations of eta
    quotients of one weight; otherwise say why not, with the ordinary check to ``order``.

    >>> prove("theta_3(q)^4", "theta_2(q)^4 + theta_4(q)^4").certificate.high
    Fraction(1, 1)
    >>> r = prove("eta(q)^5/eta(q^5)", "1 - 5 sum_{n>=1} n q^n/(1 - q^n)", order=20)
    >>> r.proved, r.holds, r.reason[:37]
    (False, False, 'the right side is not recognised as a')
    """
    integer_argument("order", order, 1)
    lnode, rnode = _node(lhs), _node(rhs)
    if isinstance(lnode, Dissect) or isinstance(rnode, Dissect):
        from .dissection import prove_dissection  # it builds on this module
        return prove_dissection(lnode, rnode, order)
    left, right = recognise(lnode), recognise(rnode)
    why = [f"the {name} side is not recognised as a combination of eta quotients: "
           f"{rec.reason}" for name, rec in (("left", left), ("right", right))
           if rec.terms is None]
    if why:
        return _refused(lnode, rnode, order, "; ".join(why))
    assert left.terms is not None and right.terms is not None
    labelled = [("lhs", t) for t in left.terms] + [
        ("rhs", RecognisedTerm(-t.coefficient, t.eta, t.shift)) for t in right.terms]
    terms = [t for _, t in labelled]
    if not terms:
        return _refused(lnode, rnode, order, "both sides are 0 as written; nothing to prove")
    shifts = sorted({t.shift for t in terms})
    if len(shifts) > 1:
        return _refused(lnode, rnode, order,
                        f"the terms carry different powers of q besides their eta quotients "
                        f"({power_text(shifts[0])} and {power_text(shifts[1])}); a power of q "
                        f"is not modular, so no Sturm or valence bound applies")
    weights = sorted({t.eta.weight for t in terms})
    if len(weights) > 1:
        return _refused(lnode, rnode, order,
                        f"the terms have different weights ({weights[0]} and {weights[-1]}): "
                        f"the identity is not one between modular forms of one weight")
    shift, weight = shifts[0], weights[0]
    if least_level_base(terms) * 24 > MAX_LEVEL:
        return _refused(lnode, rnode, order,
                        f"the level would be a multiple of {least_level_base(terms)}, and "
                        f"levels above {MAX_LEVEL} are not handled")
    sturm = _sturm(terms)
    if sturm is not None:
        level, table, char = sturm
        bound = sturm_bound(weight, level)
        cert = Certificate("sturm", level, index_gamma0(level), weight, char, shift,
                           tuple(labelled), None, table, bound, shift + min(
                               t.eta.offset for t in terms), shift + bound)
    else:
        val = _valence(terms, shift)
        if val is None:
            return _refused(lnode, rnode, order, _why_not_modular(terms))
        j, level, table, bound, high = val
        char = terms[0].eta.character_class() if weight.denominator == 1 else None
        chars = {t.eta.character_class() for t in terms}
        cert = Certificate("valence", level, index_gamma0(level), weight,
                           char if len(chars) == 1 else None, shift, tuple(labelled), j,
                           table, bound, shift + min(t.eta.offset for t in terms), high)
    if cert.high >= MAX_CHECK_ORDER:
        return _refused(lnode, rnode, order,
                        f"the {cert.method} bound at level {cert.level} needs the coefficients "
                        f"up to q^{cert.high}, above the limit q^{MAX_CHECK_ORDER}")
    # exponents e = high (mod 1) with e <= high; at least q^0 (a check compares below q^1)
    result, upto = compare_to(lnode, rnode, cert.high)
    if result.holds is False:
        return ProofResult(False, False, cert, None, result)
    if result.holds is None or Fraction(result.order_verified) <= cert.high:
        return ProofResult(False, result.holds, None,
                           f"the coefficients could be compared only below q^"
                           f"{result.order_verified}, not up to the bound q^{cert.high}", result)
    # the guard runs to --order too: a tiny bound would compare too few coefficients to
    # catch a fault in the recognition
    far = max(upto, order)
    for name, node, rec in (("left", lnode, left), ("right", rnode, right)):
        guard = check(node, parse(rec.text()), far, method="exact")
        if guard.holds is not True:
            return ProofResult(False, None, None,
                               f"internal fault: the {name} side differs from its recognised "
                               f"form {rec.text()!r} below q^{far}; please report it", result)
    return ProofResult(True, True, cert, None, result)


__all__ = ["Certificate", "CuspOrders", "ProofResult", "Recognition", "looks_provable",
           "prove"]
