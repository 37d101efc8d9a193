"""When does an infinite sum or product stop mattering modulo q^N?

For the k-th term of ``sum_{k...} T`` (or the k-th factor minus 1 of a product) we derive a
lower bound for its valuation as a polynomial in m, where k = sign*m and m grows.  Nested sums
are bounded through their own bodies: with the inner variable j written as its lower limit plus
t >= 0, a body bound whose coefficients of t, t^2, ... are all non-negative is smallest at
t = 0.  All variables are assumed >= 0 where such coefficient tests are used, so bounds are
only applied for m >= 0.

Every rule is sound (a true lower bound, "exact" only when it is the valuation itself); when no
rule applies, :class:`NoBound` says why and the caller refuses to truncate.

>>> from qseries.lang.parser import parse
>>> from qseries.engine import Evaluator
>>> tb = TermBounds(Evaluator())
>>> body = parse("sum_{k>=0} q^(k^2)/(q;q)_k").body
>>> b = tb.lower(body, "k", {"k": 1}, {}, 50)
>>> sym.m_to_uni(b.poly, "k"), b.exact
((Fraction(0, 1), Fraction(0, 1), Fraction(1, 1)), True)
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from typing import Any

from ..errors import DomainError, QSeriesError
from ..lang.ast import BigO, BigOp, BinOp, Call, Name, Neg, Node, Num, Poch, Q, replace_name
from ..products import FUNCTIONS, monomial_parts
from . import symbolic as sym


def _shift_name(node: Node, name: str, by: Node) -> Node:
    """``node`` with the bound variable ``name`` replaced by ``by + name`` (inner sums that
    rebind ``name`` are left alone).

    >>> from qseries.lang.parser import parse
    >>> from qseries.lang.printer import show
    >>> show(_shift_name(parse("(q;q)_(n - m)", bound={"n", "m"}), "n", parse("m", bound={"m"})))
    '(q;q)_{m + n - m}'
    """
    return replace_name(node, name, BinOp("+", by, Name(name, node.pos), node.pos))


class NoBound(Exception):
    """No valuation bound could be established (the message says where)."""


@dataclass(frozen=True)
class Bound:
    """val(term) >= poly for every m >= start (and all inner variables >= 0); equality when
    ``exact``."""

    poly: sym.MPoly
    exact: bool
    start: int


def _pos(node: Node) -> int:
    return getattr(node, "pos", 0) + 1


def _falling_coefficients(by_power: dict[int, sym.MPoly]) -> dict[int, sym.MPoly]:
    """The coefficients f_k (k >= 1) of sum_d c_d t^d = c_0 + sum_k f_k t(t-1)...(t-k+1):
    t^d = sum_k S(d, k) t(t-1)...(t-k+1) (Stirling numbers of the second kind).  Every
    falling factorial is >= 0 at the integers t >= 0, so f_k >= 0 for all k >= 1 shows the
    polynomial is least at t = 0 there (t^2 - t, 0 at t = 0 and 1, where the powers alone
    show nothing).

    >>> _falling_coefficients({2: sym.m_const(1), 1: sym.m_const(-1)})   # t^2 - t
    {1: {}, 2: {(): Fraction(1, 1)}}
    """
    top = max(by_power, default=0)
    stirling = [[Fraction(0)] * (top + 1) for _ in range(top + 1)]
    stirling[0][0] = Fraction(1)
    for d in range(1, top + 1):
        for k in range(1, d + 1):
            stirling[d][k] = k * stirling[d - 1][k] + stirling[d - 1][k - 1]
    out: dict[int, sym.MPoly] = {}
    for k in range(1, top + 1):
        acc: sym.MPoly = {}
        for d in range(k, top + 1):
            if d in by_power and stirling[d][k]:
                acc = sym.m_add(acc, sym.m_scale(by_power[d], stirling[d][k]))
        out[k] = acc
    return out


class TermBounds:
    """The valuation analysis, over an evaluator that supplies values of closed subterms."""

    def __init__(self, evaluator: Any) -> None:
        self.ev = evaluator
        #: inner sums' bodies with their variable shifted by the lower limit, by id()
        self._shifted: dict[int, tuple[Node, Node]] = {}

    # -- polynomials in the bound variables -------------------------------------------
    def _symbolic(self, node: Node, syms: dict[str, int]) -> bool:
        return bool(self.ev.free(node) & syms.keys())

    def poly_of(self, node: Node, syms: dict[str, int], env: dict[str, int]) -> sym.MPoly:
        """A number-valued node as a polynomial in the symbolic variables (var = sign*m)."""
        if not self._symbolic(node, syms):
            if self.ev.has_q(node):
                raise NoBound("an exponent or limit involves q")
            return sym.m_const(self.ev.scalar(node, env))
        if isinstance(node, Name):
            return sym.m_var(node.name, syms[node.name])
        if isinstance(node, Neg):
            return sym.m_scale(self.poly_of(node.operand, syms, env), -1)
        if isinstance(node, BinOp):
            if node.op in "+-*":
                a = self.poly_of(node.left, syms, env)
                b = self.poly_of(node.right, syms, env)
                if node.op == "+":
                    return sym.m_add(a, b)
                return sym.m_sub(a, b) if node.op == "-" else sym.m_mul(a, b)
            if node.op == "/" and not self._symbolic(node.right, syms):
                d = self.ev.scalar(node.right, env)
                if d == 0:
                    raise DomainError(f"division by zero at column {_pos(node.right)}",
                                      position=_pos(node.right) - 1)
                return sym.m_scale(self.poly_of(node.left, syms, env), 1 / d)
            if node.op == "^" and not self._symbolic(node.right, syms):
                e = self.ev.scalar(node.right, env)
                if e.denominator == 1 and 0 <= e <= 8:
                    return sym.m_pow(self.poly_of(node.left, syms, env), int(e))
        raise NoBound(f"the expression at column {_pos(node)} is not a polynomial in the "
                      f"summation variables")

    # -- valuations ------------------------------------------------------------------------
    def _constant(self, node: Node, env: dict[str, int], order: int) -> Bound:
        # a monomial c q^e written as such is read exactly: truncated to the working order
        # (-q^42 at order 36, from f(-q^42) after a shift) it would vanish
        v = self.ev._exact_monomial(node, env) if self.ev.has_q(node) else None
        if v is None:
            v = self.ev._as_series(self.ev.value(node, env, order))
        val = v.valuation
        if val is None:
            raise NoBound(f"the factor at column {_pos(node)} vanishes to the working order")
        exact = v.precision is None or v.precision > val
        return Bound(sym.m_const(Fraction(val)), exact, 0)

    def lower(self, node: Node, main: str, syms: dict[str, int], env: dict[str, int],
              order: int) -> Bound:
        """A lower bound for the valuation of ``node``."""
        ev = self.ev
        if not ev.has_q(node):
            return Bound({}, True, 0)
        if not self._symbolic(node, syms):
            return self._constant(node, env, order)
        if isinstance(node, Neg):
            return self.lower(node.operand, main, syms, env, order)
        if isinstance(node, BinOp):
            if node.op in "+-":
                unit = self._unit_binomial(node, main, syms, env, order)
                if unit is not None:
                    return unit
                return min_bound(self.lower(node.left, main, syms, env, order),
                                 self.lower(node.right, main, syms, env, order), main)
            a = self.lower(node.left, main, syms, env, order)
            if node.op == "*":
                b = self.lower(node.right, main, syms, env, order)
                return Bound(sym.m_add(a.poly, b.poly), a.exact and b.exact,
                             max(a.start, b.start))
            if node.op == "/":
                b = self.lower(node.right, main, syms, env, order)
                if not b.exact:
                    raise NoBound(f"the valuation of the denominator at column "
                                  f"{_pos(node.right)} is not known exactly")
                return Bound(sym.m_sub(a.poly, b.poly), a.exact, max(a.start, b.start))
            return self._power(node, main, syms, env, order)
        if isinstance(node, Poch):
            return self.poch_bound(node, main, syms, env, order)
        if isinstance(node, Call) and FUNCTIONS[node.name].unit_constant_term:
            return Bound({}, False, 0)
        if isinstance(node, BigO):
            return Bound(self.poly_of(node.exponent, syms, env), False, 0)
        if isinstance(node, BigOp) and node.kind == "sum":
            return self._inner_sum(node, main, syms, env, order)
        raise NoBound(f"no valuation bound for the expression at column {_pos(node)}")

    def _unit_binomial(self, node: BinOp, main: str, syms: dict[str, int],
                       env: dict[str, int], order: int) -> Bound | None:
        """Valuation exactly 0 for c +- X with c a nonzero number and X of valuation >= 1
        (1 - q^(i+j+1) in a double sum), from the m on where the bound of X reaches 1; None
        when the node is not of that kind.

        >>> from qseries.lang.parser import parse
        >>> from qseries.engine import Evaluator
        >>> node = parse("1 - q^(i+j+1)", bound={"i", "j"})
        >>> b = TermBounds(Evaluator())._unit_binomial(node, "i", {"i": 1, "j": 1}, {}, 9)
        >>> b.poly, b.exact, b.start
        ({}, True, 0)
        """
        ev = self.ev
        for one, other in ((node.left, node.right), (node.right, node.left)):
            if ev.has_q(one) or self._symbolic(one, syms) or ev.scalar(one, env) == 0:
                continue
            try:
                b = self.lower(other, main, syms, env, order)
                start = self._eventually(b.poly, 1, main, b.start, "")
            except NoBound:
                continue
            return Bound({}, True, start)
        return None

    def _power(self, node: BinOp, main: str, syms: dict[str, int], env: dict[str, int],
               order: int) -> Bound:
        if self.ev.has_q(node.right):
            raise NoBound("an exponent involves q")
        base = self.lower(node.left, main, syms, env, order)
        if not self._symbolic(node.right, syms):
            e = self.ev.scalar(node.right, env)
            if e < 0 and not base.exact:
                raise NoBound(f"the valuation of the base at column {_pos(node.left)} is not "
                              f"known exactly")
            return Bound(sym.m_scale(base.poly, e), base.exact, base.start)
        if sym.m_vars(base.poly) or not base.exact:
            raise NoBound(f"a power with a variable exponent of a non-monomial at column "
                          f"{_pos(node)}")
        c = base.poly.get((), Fraction(0))
        return Bound(sym.m_scale(self.poly_of(node.right, syms, env), c), True, base.start)

    def _inner_sum(self, node: BigOp, main: str, syms: dict[str, int], env: dict[str, int],
                   order: int) -> Bound:
        j = node.var
        if node.lower is None and node.upper is None:
            return self._bilateral_inner(node, main, syms, env, order)
        if node.lower is None:
            raise NoBound(f"the inner sum at column {_pos(node)} has no lower limit")
        lo = self.poly_of(node.lower, syms, env)
        if not sym.m_nonnegative(lo):
            raise NoBound(f"the lower limit of the inner sum at column {_pos(node)} may be "
                          f"negative")
        # j = lower + t with t >= 0, written into the body before it is bounded, so that
        # what depends on j - lower (a subscript (q;q)_(n1 - n2) of sum_{n1>=n2}) is seen
        # to be t >= 0; t keeps the name j
        # (kept alive here: the evaluator caches facts about nodes by id())
        hit = self._shifted.get(id(node))
        if hit is None or hit[0] is not node:
            hit = self._shifted[id(node)] = (node, _shift_name(node.body, j, node.lower))
        shifted_body = hit[1]
        body = self.lower(shifted_body, main, {**syms, j: 1}, env, order)
        by_power = sym.m_coeffs_in(body.poly, j)
        for c in _falling_coefficients(by_power).values():
            if not sym.m_nonnegative(c):
                raise NoBound(f"the terms of the inner sum at column {_pos(node)} do not grow "
                              f"with {j} in a way this analysis can see")
        return Bound(by_power.get(0, {}), False, body.start)

    def _bilateral_inner(self, node: BigOp, main: str, syms: dict[str, int],
                         env: dict[str, int], order: int) -> Bound:
        """An inner sum over every integer j (sum_{m,n=-inf}^{inf} q^(m^2+mn+n^2)): when its
        body is a product of powers of q, numbers and factors free of j, its bound is a
        polynomial valid for every real j; if it is A j^2 + B j + C with A > 0 a number, its
        minimum over the reals, C - B^2/(4A), bounds every term; if it does not involve j,
        it is that bound itself.

        >>> from qseries.lang.parser import parse
        >>> from qseries.engine import Evaluator
        >>> inner = parse("sum_{m,n=-inf}^{inf} q^(m^2+m*n+n^2)").body
        >>> b = TermBounds(Evaluator())._bilateral_inner(inner, "m", {"m": 1}, {}, 9)
        >>> sym.m_to_uni(b.poly, "m")
        (Fraction(0, 1), Fraction(0, 1), Fraction(3, 4))
        """
        j = node.var
        if not self._plain_in(node.body, j):
            raise NoBound(f"the terms of the bilateral inner sum at column {_pos(node)} are "
                          f"not products of powers of q and numbers, which this analysis "
                          f"needs for an index running over every integer")
        body = self.lower(node.body, main, {**syms, j: 1}, env, order)
        by_power = sym.m_coeffs_in(body.poly, j)
        top = max(by_power, default=0)
        if top == 0:
            return Bound(by_power.get(0, {}), False, body.start)
        a = by_power.get(2, {})
        if top != 2 or sym.m_vars(a) or a.get((), Fraction(0)) <= 0:
            raise NoBound(f"the terms of the bilateral inner sum at column {_pos(node)} do "
                          f"not grow in both directions of {j} in a way this analysis can see")
        b, c = by_power.get(1, {}), by_power.get(0, {})
        least = sym.m_sub(c, sym.m_scale(sym.m_mul(b, b), 1 / (4 * a[()])))
        return Bound(least, False, body.start)

    def _plain_in(self, node: Node, j: str) -> bool:
        """True when ``node`` is built from factors free of j, numbers and powers q^(...) by
        products, quotients and powers: then its bound holds for every value of j, not only
        for j >= 0."""
        ev = self.ev
        if j not in ev.free(node) or not ev.has_q(node) or isinstance(node, Name):
            return True
        if isinstance(node, Neg):
            return self._plain_in(node.operand, j)
        if isinstance(node, BinOp):
            if node.op in "*/":
                return self._plain_in(node.left, j) and self._plain_in(node.right, j)
            if node.op == "^":
                if isinstance(node.left, Q) or not ev.has_q(node.left):
                    return True
                return j not in ev.free(node.right) and self._plain_in(node.left, j)
        return False

    def poch_start(self, node: Poch, main: str, syms: dict[str, int], env: dict[str, int],
                   order: int) -> int:
        """m from which (params; q^t)_n has constant term 1 (valuation exactly 0)."""
        if self._symbolic(node.base, syms):
            raise NoBound("the base of a q-Pochhammer symbol depends on the variable")
        start = 0
        if node.length is not None and self._symbolic(node.length, syms):
            start = self._eventually(self.poly_of(node.length, syms, env), 0, main, start,
                                     "the subscript of a q-Pochhammer symbol may be negative")
        elif node.length is not None and self.ev.integer(node.length, env, "a subscript") < 0:
            raise NoBound("a q-Pochhammer symbol with negative subscript")
        for p in node.params:
            if not self.ev.has_q(p):
                if self._symbolic(p, syms) or self.ev.scalar(p, env) == 1:
                    raise NoBound("a q-Pochhammer symbol (c;q)_n with c = 1 or varying")
                continue
            if not self._symbolic(p, syms) and self._unit_start(p, env, order):
                continue
            if not self._symbolic(p, syms) and self._exact_zero(p, env, order):
                continue        # 2q over GF(2): every factor 1 - 0 q^(tj) is 1
            b = self.lower(p, main, syms, env, order)
            start = self._eventually(b.poly, 1, main, max(start, b.start),
                                     "a q-Pochhammer parameter without positive valuation")
        return start

    def _exact_zero(self, p: Node, env: dict[str, int], order: int) -> bool:
        v = self.ev._exact_monomial(p, env)
        if v is None:
            v = self.ev._as_series(self.ev.value(p, env, order))
        return bool(v.is_zero() and v.is_exact)

    def poch_bound(self, node: Poch, main: str, syms: dict[str, int], env: dict[str, int],
                   order: int) -> Bound:
        """The valuation of (params; q^t)_n as n grows: 0 from some n on (``poch_start``),
        or, when a fixed parameter is c q^v with v <= 0, the constant sum of the negative
        valuations v + t j of its first factors, once n has passed them (the factor with
        v + t j = 0 is 1 - c, a nonzero constant unless c = 1, which is refused).

        >>> from qseries.lang.parser import parse
        >>> from qseries.engine import Evaluator
        >>> b = TermBounds(Evaluator()).poch_bound(parse("(-q^-3;q)_n", bound={"n"}), "n",
        ...                                        {"n": 1}, {}, 10)
        >>> b.poly, b.exact, b.start
        ({(): Fraction(-6, 1)}, True, 4)
        """
        try:
            return Bound({}, True, self.poch_start(node, main, syms, env, order))
        except NoBound as err:
            found = self._negative_parameters(node, main, syms, env, order)
            if found is None:
                raise err from None
            return found

    def _negative_parameters(self, node: Poch, main: str, syms: dict[str, int],
                             env: dict[str, int], order: int) -> Bound | None:
        ev = self.ev
        if self._symbolic(node.base, syms) or node.length is None \
                or not self._symbolic(node.length, syms):
            return None
        try:
            t = ev._base_step(node, env, 1)
        except QSeriesError:
            return None
        total, factors, start = Fraction(0), 0, 0
        for p in node.params:
            if not ev.has_q(p):
                if self._symbolic(p, syms) or ev.scalar(p, env) == 1:
                    return None
                continue
            if not self._symbolic(p, syms):
                mono = ev._exact_monomial(p, env)
                parts = monomial_parts(mono) if mono is not None else None
                if parts is not None and parts[1].denominator == 1 and parts[1] <= 0:
                    c, v = parts[0], int(parts[1])
                    negative = (-v + t - 1) // t if v < 0 else 0   # j with v + t j < 0
                    total += sum(v + t * j for j in range(negative))
                    if v + t * negative == 0 and c == 1:
                        return None                  # the factor 1 - 1: the term is 0
                    factors = max(factors, negative + 1)
                    continue
                if self._unit_start(p, env, order):
                    continue
            try:
                b = self.lower(p, main, syms, env, order)
                start = self._eventually(b.poly, 1, main, max(start, b.start), "")
            except NoBound:
                return None
        try:
            start = self._eventually(self.poly_of(node.length, syms, env), factors, main,
                                     start, "")
        except NoBound:
            return None
        return Bound(sym.m_const(total) if total else {}, True, start)

    def _unit_start(self, p: Node, env: dict[str, int], order: int) -> bool:
        """True when the parameter is exactly c + O(q) with c a constant other than 1 (such
        as a or c/b in extra variables): then every factor 1 - p q^(tj) has valuation 0 and
        the first one has constant term 1 - c != 0, so the symbol has valuation exactly 0."""
        v = self.ev._as_series(self.ev.value(p, env, order))
        if v.valuation != 0 or (v.precision is not None and v.precision < 1):
            return False
        return v.coefficient(0) != 1

    def _eventually(self, p: sym.MPoly, target: int, main: str, start: int, why: str) -> int:
        """m from which p >= target: for a polynomial in ``main`` alone, from its growth; for
        one involving inner variables, only if p - target has no negative coefficient."""
        uni = sym.m_to_uni(p, main)
        if uni is not None:
            if sym.degree(uni) >= 1 and sym.leading(uni) > 0:
                return max(start, sym.eventually_at_least(uni, target, 0))
            if sym.degree(uni) <= 0 and (uni[0] if uni else 0) >= target:
                return start
            raise NoBound(why)
        if sym.m_nonnegative(sym.m_sub(p, sym.m_const(target))):
            return start
        raise NoBound(why)

    def deviation(self, node: Node, main: str, syms: dict[str, int], env: dict[str, int],
                  order: int) -> Bound | None:
        """A lower bound for val(node - 1); None when node is exactly 1."""
        ev = self.ev
        if not ev.has_q(node):
            if not self._symbolic(node, syms) and ev.scalar(node, env) == 1:
                return None
            raise NoBound("a factor of the product is a number other than 1")
        if isinstance(node, BinOp):
            if node.op in "+-":
                for one, other in ((node.left, node.right), (node.right, node.left)):
                    if isinstance(one, Num) and one.value == 1 and \
                            (node.op == "+" or one is node.left):
                        return self.lower(other, main, syms, env, order)
                raise NoBound(f"the factor at column {_pos(node)} is not of the form 1 +- X")
            if node.op in "*/":
                a = self.deviation(node.left, main, syms, env, order)
                b = self.deviation(node.right, main, syms, env, order)
                if a is None or b is None:
                    return a or b
                return min_bound(a, b, main)
            if node.op == "^" and not ev.has_q(node.right):
                return self.deviation(node.left, main, syms, env, order)
        if isinstance(node, Poch):
            self.poch_start(node, main, syms, env, order)
            out = self.lower(node.params[0], main, syms, env, order)
            for p in node.params[1:]:
                out = min_bound(out, self.lower(p, main, syms, env, order), main)
            return Bound(out.poly, False, out.start)
        raise NoBound(f"no bound for the factor at column {_pos(node)}")


def min_bound(a: Bound, b: Bound, main: str) -> Bound:
    """A bound for the valuation of a sum of two terms with bounds a and b."""
    start = max(a.start, b.start)
    ua, ub = sym.m_to_uni(a.poly, main), sym.m_to_uni(b.poly, main)
    if ua is None or ub is None:
        return Bound(sym.m_min(a.poly, b.poly), False, start)
    d = sym.psub(ua, ub)
    if not d:
        return Bound(a.poly, False, start)
    # the smaller one from the first m where the difference keeps its sign
    if sym.leading(d) > 0:        # b is eventually the smaller
        return Bound(b.poly, b.exact, _keeps_sign(d, start))
    return Bound(a.poly, a.exact, _keeps_sign(sym.pneg(d), start))


def _keeps_sign(d: sym.Poly, start: int) -> int:
    """The first m >= start from which d(m') >= 0 for every m' >= m (d tends to +infinity or
    is a positive constant)."""
    if sym.degree(d) < 1:
        return start
    return sym.eventually_at_least(d, 0, start)
