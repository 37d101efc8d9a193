"""The ``chain`` strategy for nests of sums (Andrews-Gordon, Bressoud, Capparelli-type
multi-sums): dynamic programming over the chain of indices, each inner partial sum computed
once and shared by every outer index that needs it.

A nest ``sum_{x_1>=l_1} sum_{x_2>=l_2(x_1)} ... sum_{x_r>=l_r(...)} T`` (lower limits affine
in the outer indices, no upper limits) whose term T is a product of numbers, one power
q^E(x) with E a polynomial of degree <= 2, and q-Pochhammer symbols (a, ...;q^t)_(s(x))^p
with parameters of valuation >= 1 and subscripts affine in the indices, is rewritten in new
indices y with x_j - l_j = y_j (``identity``), y_j - y_(j+1) (``suffix``: the partial sums
N_j = n_j + ... + n_r of the Andrews-Gordon identities) or y_j - y_(j-1) (``prefix``: the
chain n_1 >= n_2 >= ... written from the inside out).  The first of these in which every
factor involves at most two consecutive indices y_j, y_(j+1) (a *chain*: E = e_0 + sum_j
u_j(y_j) + sum_j c_j y_j y_(j+1)) is summed from the innermost index outwards,

    G_r(t) = U_r(t),   G_j(t) = U_j(t) * sum_(t') q^(c_j t t') P_j(t, t') G_(j+1)(t'),

U_j the factors in y_j alone, P_j those in y_j and y_(j+1), so that each G_(j+1)(t') is
computed once whatever the outer indices are (r M^2 products of series instead of about
M^r terms, M ~ sqrt(N)).  The q-Pochhammer symbols are tables indexed by their subscript,
each entry one binomial step from the previous one.

Cut-offs come from the valuations: every Pochhammer factor is a unit (valuation 0), so a
term's valuation is E(y) exactly.  The strategy applies only when the coefficients of
E's products of indices are >= 0 and u_j(t + 1) >= u_j(t) from t = 0 on (then E does not
decrease along any index on the integer points y >= 0, which hold the region, and the least
valuation given some indices is E at the least completion of the others); a pair (t, t')
is kept only when that least valuation is below the order, and each G_j(t) is computed only
to the order the outer indices leave it.  Where a sum over t or t' multiplies q-Pochhammer
factors stepping with the index, it is done by Horner's rule (a few binomials per step, no
product of series).

The Andrews-Gordon identity for k = 3, i = 3 in its chain form (G. E. Andrews, The Theory
of Partitions, Thm. 7.8): partitions into parts not 0, +-3 modulo 7.

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> ev = Evaluator(strategies=["chain"])
>>> ev.evaluate(parse("sum_{n1>=n2>=0} q^(n1^2+n2^2)/((q;q)_(n1-n2) (q;q)_n2)"), 8)
1 + q + 2q^2 + 2q^3 + 3q^4 + 4q^5 + 6q^6 + 7q^7 + O(q^8)
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from typing import TYPE_CHECKING, Any

from ..errors import DomainError, QSeriesError
from ..lang.ast import BigOp, Node, Poch, Q
from ..products import monomial_parts
from ..series import Series
from . import chains
from . import symbolic as sym
from .ranges import MAX_TERMS
from .termination import NoBound
from .terms import floor_int, is_q_power, rational_power, signed_factors, times_binomial

if TYPE_CHECKING:
    from .evaluator import Evaluator

NAME = "chain"
#: the changes of indices tried, in order
MODES = ("identity", "suffix", "prefix")
#: deepest nest the strategy takes
MAX_DEPTH = 12
_Y = "\x00y"        # internal index names (no name the parser accepts contains NUL)

Linear = tuple[int, dict[int, int]]          # c + sum_j a_j y_j


class _Decline(Exception):
    """The nest does not have the shape (the caller falls back to the other strategies)."""


def nest_levels(ev: Evaluator, node: BigOp) -> tuple[list[BigOp], list[tuple[Node, int]], int
                                                      ] | None:
    """The sums of a nest, outermost first, the other factors of their bodies, and the
    product of the signs; None when some body has several sums among its factors, a sum to
    a power, or a product in place of a sum.

    >>> from qseries.lang import parse
    >>> from qseries.engine import Evaluator
    >>> sums, factors, sign = nest_levels(Evaluator(), parse("sum_{i>=0} -sum_{j>=i} q^(i+j)"))
    >>> [s.var for s in sums], len(factors), sign
    (['i', 'j'], 1, -1)
    """
    levels: list[BigOp] = []
    factors: list[tuple[Node, int]] = []
    sign = 1
    cur = node
    while True:
        cur = ev._reordered(cur)
        if not isinstance(cur, BigOp) or cur.kind != "sum" or len(levels) >= MAX_DEPTH:
            return None
        levels.append(cur)
        s, fs = signed_factors(cur.body)
        sign *= s
        inner = [(f, p) for f, p in fs if isinstance(f, BigOp)]
        factors.extend((f, p) for f, p in fs if not isinstance(f, BigOp))
        if not inner:
            return levels, factors, sign
        if len(inner) > 1 or inner[0][1] != 1:
            return None
        cur = inner[0][0]  # type: ignore[assignment]


def nest_depth(ev: Evaluator, node: BigOp) -> int:
    """How many sums are nested in ``node`` as the chain strategy reads it (1: a single
    sum, or a shape it does not take).

    >>> from qseries.lang import parse
    >>> from qseries.engine import Evaluator
    >>> nest_depth(Evaluator(), parse("sum_{a>=b>=c>=0} q^(a^2+b^2+c^2)"))
    3
    """
    got = nest_levels(ev, node)
    return 1 if got is None else len(got[0])


@dataclass
class _Poch:
    node: Poch
    power: int
    step: int                     # t of the base q^t
    params: list[Series]
    sub: Linear                   # the subscript in y
    level: int
    pair: bool

    @property
    def monos(self) -> list[Any]:
        return [monomial_parts(a) for a in self.params]


@dataclass
class _Scalar:
    node: Node
    power: int
    xs: dict[str, Linear]         # the indices it mentions, in y
    level: int
    pair: bool


def sum_chain(ev: Evaluator, node: BigOp, env: dict[str, int], order: int) -> Series | None:
    """The nest ``node`` modulo q^order by dynamic programming over its chain of indices;
    None when it does not have the shape (see the module docstring).

    >>> from qseries.lang import parse
    >>> from qseries.engine import Evaluator
    >>> sum_chain(Evaluator(), parse("sum_{i>=0} sum_{j>=0} q^(i^2+j^2)"), {}, 6)
    1 + 2q + q^2 + 2q^4 + 2q^5 + O(q^6)
    >>> sum_chain(Evaluator(), parse("sum_{i>=0} sum_{j>=0} q^(i^2+j^2) (q^i;q)_j"), {}, 6)
    """
    try:
        return _sum_chain(ev, node, env, order)
    except (_Decline, NoBound):
        return None


def _sum_chain(ev: Evaluator, node: BigOp, env: dict[str, int], order: int) -> Series:
    got = nest_levels(ev, node)
    if got is None or len(got[0]) < 2:
        raise _Decline
    levels, factors, sign = got
    xs = [lv.var for lv in levels]
    if len(set(xs)) != len(xs) or set(xs) & env.keys():
        raise _Decline
    nest = set(xs)
    lowers: list[sym.MPoly] = []
    for j, lv in enumerate(levels):
        if lv.upper is not None or lv.lower is None:
            raise _Decline
        try:
            lo = ev.bounds.poly_of(lv.lower, {x: 1 for x in xs[:j]}, env)
        except QSeriesError:
            raise _Decline from None
        _linear_check(lo)
        lowers.append(lo)
    # the factors: constant ones, the exponent, q-Pochhammer symbols and numbers in x
    const_f: list[tuple[Node, int]] = []
    exponent: sym.MPoly = {}
    pochs: list[tuple[Poch, int, sym.MPoly, int, list[Series]]] = []
    scalars: list[tuple[Node, int]] = []
    syms = {x: 1 for x in xs}
    for f, p in factors:
        if not (ev.free(f) & nest):
            const_f.append((f, p))
        elif not ev.has_q(f):
            scalars.append((f, p))
        elif is_q_power(f):
            e = sym.m_const(1) if isinstance(f, Q) else ev.bounds.poly_of(f.right, syms, env)  # type: ignore[attr-defined]
            exponent = sym.m_add(exponent, sym.m_scale(e, p))
        elif isinstance(f, Poch) and f.length is not None and not any(
                ev.free(a) & nest for a in (*f.params, f.base)):
            try:
                t = ev._base_step(f, env, order)
            except QSeriesError:
                raise _Decline from None
            params = [ev._param(a, env, order) for a in f.params]
            for a in params:
                v = a.valuation
                if v is not None and (a.den != 1 or v < 1):
                    raise _Decline         # a factor that is not a unit
                if a.ring != ev.ring:
                    raise _Decline         # q/2 over ZZ: the levels would mix rings
            sub = ev.bounds.poly_of(f.length, syms, env)
            _linear_check(sub)
            pochs.append((f, p, sub, t, params))
        else:
            raise _Decline
    for mode in MODES:
        try:
            plan = _Plan.build(ev, mode, xs, lowers, exponent, pochs, scalars)
        except _Decline:
            continue
        const = chains.chain(ev, const_f, env, order) if const_f else Fraction(1)
        vconst = 0
        if isinstance(const, Series):
            if const.is_zero() and const.is_exact:
                return Series.zero(ev.ring)
            vv = const.valuation
            vconst = floor_int(vv) if vv is not None else 0
        target = order - vconst
        moving = plan.evaluate(ev, node, env, target) * sign
        return (moving * const).truncate(order).limit_precision(order)
    raise _Decline


def _linear_check(p: sym.MPoly) -> None:
    for mono, c in p.items():
        if len(mono) > 1 or (mono and mono[0][1] != 1) or c.denominator != 1:
            raise _Decline


def _y(j: int) -> str:
    return f"{_Y}{j}"


def _as_linear(p: sym.MPoly) -> Linear:
    c = 0
    coeffs: dict[int, int] = {}
    for mono, v in p.items():
        if v.denominator != 1:
            raise _Decline
        if not mono:
            c = int(v)
        else:
            if len(mono) > 1 or mono[0][1] != 1:
                raise _Decline
            coeffs[int(mono[0][0][len(_Y):])] = int(v)
    return c, coeffs


def _lin_eval(lin: Linear, y: dict[int, int]) -> int:
    c, coeffs = lin
    return c + sum(a * y[j] for j, a in coeffs.items())


def _placement(deps: set[int]) -> tuple[int, bool]:
    """The level of a factor in the indices ``deps`` and whether it joins two levels."""
    if not deps:
        return 0, False
    lo, hi = min(deps), max(deps)
    if hi - lo > 1:
        raise _Decline
    return lo, hi > lo


class _Plan:
    """A nest in chain form: the exponent's pieces and the factors at each level."""

    def __init__(self, mode: str, r: int) -> None:
        self.mode = mode
        self.r = r
        self.e0 = 0
        self.uq = [0] * r       # u_j(t) = (uq t^2 + ul t) / 2
        self.ul = [0] * r
        self.c = [0] * r        # c_j: coefficient of y_j y_(j+1)
        self.pochs: list[_Poch] = []
        self.scalars: list[_Scalar] = []

    @classmethod
    def build(cls, ev: Evaluator, mode: str, xs: list[str], lowers: list[sym.MPoly],
              exponent: sym.MPoly, pochs: list, scalars: list) -> _Plan:
        r = len(xs)
        plan = cls(mode, r)
        # x_j in the new indices y
        xy: dict[str, sym.MPoly] = {}
        for j, x in enumerate(xs):
            if mode == "identity":
                d = sym.m_var(_y(j))
            elif mode == "suffix":
                d = sym.m_var(_y(j)) if j == r - 1 else sym.m_sub(sym.m_var(_y(j)),
                                                                  sym.m_var(_y(j + 1)))
            else:
                d = sym.m_var(_y(j)) if j == 0 else sym.m_sub(sym.m_var(_y(j)),
                                                              sym.m_var(_y(j - 1)))
            xy[x] = sym.m_add(d, _subst(lowers[j], xy))
        lin_x = {x: _as_linear(p) for x, p in xy.items()}
        e = _subst(exponent, xy)
        for mono, v in e.items():
            deg = sum(k for _, k in mono)
            idx = sorted(int(n[len(_Y):]) for n, _ in mono)
            if deg > 2 or v < 0 and deg == 2:
                raise _Decline   # E might decrease in an index: the cut-offs need it not to
            if deg == 0:
                if v.denominator != 1:
                    raise _Decline
                plan.e0 = int(v)
            elif len(idx) == 1:
                j = idx[0]
                if 2 * v != int(2 * v):
                    raise _Decline
                if deg == 2:
                    plan.uq[j] = int(2 * v)
                else:
                    plan.ul[j] = int(2 * v)
            else:
                j, k = idx
                if k != j + 1 or v.denominator != 1:
                    raise _Decline
                plan.c[j] = int(v)
        for j in range(r):
            # u_j(1) must be an integer, and u_j(t + 1) - u_j(t) >= 0 from t = 0 on (with
            # the products of indices, whose coefficients are >= 0, E then does not
            # decrease along any index on the integer points y >= 0)
            if (plan.uq[j] + plan.ul[j]) % 2 or plan.uq[j] + plan.ul[j] < 0:
                raise _Decline
        for f, p, sub, t, params in pochs:
            lin = _as_linear(_subst(sub, xy))
            level, pair = _placement(set(lin[1]))
            plan.pochs.append(_Poch(f, p, t, params, lin, level, pair))
        for f, p in scalars:
            used = {x: lin_x[x] for x in xs if x in ev.free(f)}
            deps = {j for lin in used.values() for j in lin[1]}
            level, pair = _placement(deps)
            plan.scalars.append(_Scalar(f, p, used, level, pair))
        return plan

    # -- the least completions ------------------------------------------------------------
    def u(self, j: int, t: int) -> int:
        return (self.uq[j] * t * t + self.ul[j] * t) // 2

    def point(self, j: int, t: int) -> list[int]:
        """The least point of the region with y_j = t."""
        if self.mode == "identity":
            y = [0] * self.r
        elif self.mode == "suffix":
            y = [t] * (j + 1) + [0] * (self.r - j - 1)
        else:
            y = [0] * j + [t] * (self.r - j)
        y[j] = t
        return y

    def outer(self, j: int, y: list[int]) -> int:
        """e_0 and the pieces of E in y_1 .. y_(j-1) (with c_(j-1) y_(j-1) y_j)."""
        return self.e0 + sum(self.u(k, y[k]) + self.c[k] * y[k] * y[k + 1] for k in range(j))

    def inner(self, j: int, y: list[int]) -> int:
        """The pieces of E in y_j .. y_r."""
        return sum(self.u(k, y[k]) + (self.c[k] * y[k] * y[k + 1] if k + 1 < self.r else 0)
                   for k in range(j, self.r))

    # -- evaluation ---------------------------------------------------------------------
    def evaluate(self, ev: Evaluator, node: BigOp, env: dict[str, int], target: int) -> Series:
        r = self.r
        ring = ev.ring
        # the ranges: y_j = t matters while E at the least point with y_j = t is below
        # the target (E does not decrease along any index, so beyond that nothing does)
        outer_v: list[list[int]] = []
        inner_v: list[list[int]] = []
        for j in range(r):
            ov: list[int] = []
            iv: list[int] = []
            first = [self.outer(j, y) + self.inner(j, y) for y in map(
                lambda t: self.point(j, t), range(3))]
            if first[0] == first[1] == first[2]:
                raise _Decline     # E (of degree <= 2) does not grow along y_j
            t = 0
            while True:
                y = self.point(j, t)
                o, i = self.outer(j, y), self.inner(j, y)
                if o + i >= target:
                    break
                ov.append(o)
                iv.append(i)
                t += 1
                if t > MAX_TERMS:
                    raise _Decline
            outer_v.append(ov)
            inner_v.append(iv)
        # which G_j(t) are needed, to which order, and which pairs (t, t') add to them
        need: list[dict[int, int]] = [dict() for _ in range(r)]
        need[0] = {t: target - self.e0 for t in range(len(outer_v[0]))}
        pairs: list[dict[int, list[int]]] = [dict() for _ in range(r)]
        count = 0
        for j in range(r - 1):
            top = len(outer_v[j + 1])
            for t, w in need[j].items():
                budget = w - self.u(j, t)        # S_j(t) modulo q^budget
                if self.mode == "suffix":
                    span = range(0, min(t + 1, top))
                elif self.mode == "prefix":
                    span = range(t, top)
                else:
                    span = range(0, top)
                got = []
                for t2 in span:
                    v = self.c[j] * t * t2 + inner_v[j + 1][t2]
                    if v >= budget:
                        break          # and so for every larger t2 (E does not decrease)
                    got.append(t2)
                    w2 = budget - self.c[j] * t * t2
                    if w2 > need[j + 1].get(t2, -1):
                        need[j + 1][t2] = w2
                pairs[j][t] = got
                count += len(got)
                if count > MAX_TERMS:
                    raise _Decline
        ev._count_terms(node, count + sum(len(n) for n in need))
        tables = self._tables(ev, need, inner_v, ring)
        # from the innermost level outwards
        below: dict[int, Series] = {}
        for j in range(r - 1, 0, -1):
            level: dict[int, Series] = {}
            for t, w in need[j].items():
                budget = w - self.u(j, t)
                if budget <= 0:
                    level[t] = Series.zero(ring, w)
                    continue
                acc = None if j == r - 1 else self._pair_sum(ev, j, t, pairs[j][t], below,
                                                             env, budget)
                acc = self._unary(ev, acc, j, t, env, tables, budget)
                u = self.u(j, t)
                level[t] = (acc.shift(u) if u else acc).truncate(w)
            below = level
        # the outermost sum: sum_t U_1(t) S_1(t), the factors in y_1 stepped from one t to
        # the next (Horner's rule) rather than multiplied in
        budget0 = target - self.e0
        items: list[tuple[dict[int, int], Series]] = []
        scal = [s for s in self.scalars if s.level == 0 and not s.pair]
        for t in need[0]:
            u = self.u(0, t)
            if u >= budget0:
                continue
            acc = Series.constant(1, ring).truncate(budget0 - u) if r == 1 else \
                self._pair_sum(ev, 0, t, pairs[0][t], below, env, budget0 - u)
            c = self._scalar(ev, scal, env, {0: t})
            if c == 0:
                continue
            if c != 1:
                acc = acc * c
            items.append(({0: t}, (acc.shift(u) if u else acc).truncate(budget0)))
        total = _horner(ring, items, [p for p in self.pochs if p.level == 0 and not p.pair],
                        budget0)
        return total.shift(self.e0) if self.e0 else total

    def _pair_sum(self, ev: Evaluator, j: int, t: int, t2s: list[int],
                  below: dict[int, Series], env: dict[str, int], budget: int) -> Series:
        """S_j(t) = sum_(t') q^(c_j t t') P_j(t, t') G_(j+1)(t') modulo q^budget, the
        q-Pochhammer factors of P_j stepped from one t' to the next (Horner's rule)."""
        scal = [s for s in self.scalars if s.level == j and s.pair]
        pair_pochs = [p for p in self.pochs if p.level == j and p.pair]
        if not pair_pochs:
            shifted: list[tuple[int, Series]] = []
            for t2 in t2s:
                c = self._scalar(ev, scal, env, {j: t, j + 1: t2})
                if c != 0:
                    y = below[t2]
                    shifted.append((self.c[j] * t * t2, y * c if c != 1 else y))
            got = _shifted_sum(ev.ring, shifted, budget)
            if got is not None:
                return got
        items: list[tuple[dict[int, int], Series]] = []
        for t2 in t2s:
            sh = self.c[j] * t * t2
            c = self._scalar(ev, scal, env, {j: t, j + 1: t2})
            if c == 0:
                continue
            term = below[t2].truncate(budget - sh)
            if c != 1:
                term = term * c
            items.append(({j: t, j + 1: t2}, term.shift(sh) if sh else term))
        return _horner(ev.ring, items, [p for p in self.pochs if p.level == j and p.pair],
                       budget)

    def _scalar(self, ev: Evaluator, scalars: list[_Scalar], env: dict[str, int],
                y: dict[int, int]) -> Fraction:
        c = Fraction(1)
        for s in scalars:
            env_k = {**env, **{x: _lin_eval(lin, y) for x, lin in s.xs.items()}}
            v = ev.scalar(s.node, env_k)
            if v == 0 and s.power < 0:
                raise DomainError(f"division by zero in a factor at column "
                                  f"{getattr(s.node, 'pos', 0) + 1} of a multi-sum")
            c *= rational_power(v, Fraction(s.power))
        return c

    def _unary(self, ev: Evaluator, acc: Series | None, j: int, t: int, env: dict[str, int],
               tables: dict[int, dict[int, Series]], budget: int) -> Series:
        """acc (None: 1) times the factors in y_j alone at y_j = t, modulo q^budget."""
        y = {j: t}
        c = self._scalar(ev, [s for s in self.scalars if s.level == j and not s.pair], env, y)
        if c == 0:
            return Series.zero(ev.ring, budget)
        for pp in self.pochs:
            if pp.level == j and not pp.pair:
                entry = tables[id(pp)][_lin_eval(pp.sub, y)]
                acc = entry.truncate(budget) if acc is None else \
                    (acc * entry).truncate(budget)
        if acc is None:
            acc = Series.constant(1, ev.ring).truncate(budget)
        return acc * c if c != 1 else acc

    def _tables(self, ev: Evaluator, need: list[dict[int, int]], inner_v: list[list[int]],
                ring: Any) -> dict[int, dict[int, Series]]:
        """The q-Pochhammer factors in one inner index y_j (j > 1) at the subscripts used,
        each to the order it is used at (the budget less the valuation of what it
        multiplies); the others are stepped by Horner's rule."""
        tables: dict[int, dict[int, Series]] = {}
        for pp in self.pochs:
            j = pp.level
            if pp.pair or j == 0:
                continue
            want: dict[int, int] = {}
            for t, w in need[j].items():
                n = _lin_eval(pp.sub, {j: t})
                p = w - self.u(j, t) - (inner_v[j][t] - self.u(j, t))
                want[n] = max(want.get(n, 1), p)
            tables[id(pp)] = _table(pp, want, ring)
        return tables


def _subst(p: sym.MPoly, values: dict[str, sym.MPoly]) -> sym.MPoly:
    for name, v in values.items():
        if name in sym.m_vars(p):
            p = sym.m_subst(p, name, v)
    return p


def _step(acc: Series, pp: _Poch, a: int, b: int, budget: int) -> Series:
    """acc * T(b) / T(a), T(n) = (params;q^t)_n^p: the binomials between a and b."""
    if a < 0 or b < 0:
        raise _Decline                 # negative subscripts: left to the other strategies
    times, lo, hi = (pp.power, a, b) if b > a else (-pp.power, b, a)
    for a_, mono in zip(pp.params, pp.monos, strict=True):
        va = a_.valuation
        for m in range(lo, hi):
            if va is not None and va + pp.step * m >= budget:
                break                  # 1 - a q^(tm) is 1 modulo q^budget from here on
            acc = times_binomial(acc, a_, mono, pp.step * m, times, budget)
    return acc


def _horner(ring: Any, items: list[tuple[dict[int, int], Series]], pochs: list[_Poch],
            budget: int) -> Series:
    """sum_i F(y_i) Y_i modulo q^budget for F the product of ``pochs`` (subscripts affine
    in the indices y_i), by Horner's rule: from the last item to the first, the running sum
    multiplied by F(y_(i+1))/F(y_i), a few binomials, before Y_i is added; the order is
    reversed when that ends on F = 1.  Every Y_i has valuation >= 0."""
    total = Series.zero(ring, budget)
    if not items:
        return total
    if not pochs:
        return _add_all(ring, [y for _, y in items], budget)
    if all(_lin_eval(pp.sub, items[-1][0]) == 0 for pp in pochs):
        items = items[::-1]
    fast = _horner_polys(ring, items, pochs, budget)
    if fast is not None:
        return fast
    acc = items[-1][1]
    for i in range(len(items) - 2, -1, -1):
        for pp in pochs:
            acc = _step(acc, pp, _lin_eval(pp.sub, items[i][0]),
                        _lin_eval(pp.sub, items[i + 1][0]), budget)
        acc = (acc + items[i][1]).truncate(budget)
    for pp in pochs:
        acc = _step(acc, pp, 0, _lin_eval(pp.sub, items[0][0]), budget)
    return (total + acc).truncate(budget)


def _horner_polys(ring: Any, items: list[tuple[dict[int, int], Series]], pochs: list[_Poch],
                  budget: int) -> Series | None:
    """``_horner`` on the ring's polynomials (the items in the order ``_horner`` chose),
    when every item has integral exponents and valuation >= 0 and every parameter of the
    stepped q-Pochhammer symbols is c q^e with e >= 1 an integer and c a number of the ring:
    the running sum is one polynomial modulo q^prec, prec the least precision of the items
    (at most the budget), and each binomial one pass of ``_binomial_mul`` or
    ``_binomial_div``, without a Series built per step; None otherwise.

    >>> from qseries.series import ZZ
    >>> from qseries.lang import parse
    >>> pp = _Poch(parse("(q;q)_n", bound={"n"}), -1, 1, [Series.monomial(1, ZZ)], (0, {0: 1}),
    ...            0, False)
    >>> one = Series.constant(1, ZZ)
    >>> _horner_polys(ZZ, [({0: 0}, one), ({0: 1}, one)], [pp], 4)   # 1 + 1/(1-q)
    2 + q + q^2 + q^3 + O(q^4)
    """
    if any(y.den != 1 or y.offset != 0 or y.start < 0 for _, y in items):
        return None
    steps = []
    for pp in pochs:
        factors = []
        for mono in pp.monos:
            if mono is None:
                return None
            c, e = mono
            e = Fraction(e)
            if e.denominator != 1 or e < 1:
                return None
            if isinstance(c, Fraction) and c.denominator == 1:
                c = c.numerator
            if not isinstance(c, int) and not (isinstance(c, Fraction) and
                                               ring.fractions == ring):
                return None
            factors.append((c, int(e)))
        steps.append((pp, factors))
    prec = budget
    for _, y in items:
        if y.prec is not None:
            prec = min(prec, y.prec)
    if prec <= 0:
        return Series.zero(ring, prec)

    def poly_of(y: Series) -> Any:
        if y.start >= prec:
            return ring.zero()
        p = ring._truncate(y.poly, prec - y.start)
        return ring._shift_up(p, y.start) if y.start else p

    def step(acc: Any, a: int, b: int) -> Any:
        for pp, factors in steps:
            lo_hi = (_lin_eval(pp.sub, items[a][0]) if a >= 0 else 0,
                     _lin_eval(pp.sub, items[b][0]))
            if lo_hi[0] < 0 or lo_hi[1] < 0:
                raise _Decline         # negative subscripts: left to the other strategies
            times, lo, hi = (pp.power, lo_hi[0], lo_hi[1]) if lo_hi[1] > lo_hi[0] else \
                (-pp.power, lo_hi[1], lo_hi[0])
            for c, e in factors:
                for m in range(lo, hi):
                    j = e + pp.step * m
                    if j >= prec:
                        break          # 1 - c q^j is 1 modulo q^prec from here on
                    for _ in range(abs(times)):
                        acc = ring._binomial_mul(acc, c, j, prec) if times > 0 else \
                            ring._binomial_div(acc, c, j, prec)
        return acc

    acc = poly_of(items[-1][1])
    for i in range(len(items) - 2, -1, -1):
        acc = step(acc, i, i + 1) + poly_of(items[i][1])
    acc = step(acc, -1, 0)
    return Series(ring, ring._truncate(acc, prec), 0, 0, prec)


def _shifted_sum(ring: Any, terms: list[tuple[int, Series]], budget: int) -> Series | None:
    """sum q^(s_i) Y_i modulo q^budget for shifts s_i >= 0 and series Y_i of valuation >= 0
    with integral exponents (None otherwise), added from the largest total shift down: the
    running sum is shifted by the gap to the next term before that is added, so each
    addition is as long as its term, not the budget.

    >>> from qseries.series import ZZ
    >>> y = Series(ZZ, ZZ.poly([1, 1]), 0, 0, 5)              # 1 + q + O(q^5)
    >>> _shifted_sum(ZZ, [(0, y), (3, y)], 6)
    1 + q + q^3 + q^4 + O(q^5)
    """
    if any(y.den != 1 or y.offset != 0 or y.start < 0 for _, y in terms):
        return None
    prec = budget
    acc, at = None, 0
    for sh, y in sorted(terms, key=lambda e: e[0] + e[1].start, reverse=True):
        if y.prec is not None:
            prec = min(prec, sh + y.prec)
        first = sh + y.start
        if first >= budget:
            continue
        p = ring._truncate(y.poly, budget - first)
        acc = p if acc is None else ring._shift_up(acc, at - first) + p
        at = first
    if acc is None:
        return Series.zero(ring, prec)
    return Series(ring, ring._truncate(ring._shift_up(acc, at) if at else acc, prec), 0, 0,
                  prec)


def _add_all(ring: Any, terms: list[Series], budget: int) -> Series:
    """The sum of series of valuation >= 0 in q modulo q^budget: added as the ring's
    polynomials by ``_shifted_sum`` (one series object at the end, not one per term) when
    the exponents are integral, else as series."""
    got = _shifted_sum(ring, [(0, y) for y in terms], budget)
    if got is not None:
        return got
    total = Series.zero(ring, budget)
    for y in terms:
        total = total + y
    return total.truncate(budget)


def _table(pp: _Poch, want: dict[int, int], ring: Any) -> dict[int, Series]:
    """(params;q^t)_n^p for the n in ``want``, n modulo q^want[n], by stepping from n = 0."""
    if not want:
        return {}
    if min(want) < 0:
        raise _Decline            # negative subscripts: left to the other strategies
    top = max(want)
    keep = [1] * (top + 2)        # the order entry n is needed to: the most of n' >= n
    run = 1
    for n in range(top, -1, -1):
        run = max(run, want.get(n, 1))
        keep[n] = run
    monos = pp.monos
    acc = Series.constant(1, ring).truncate(keep[0])
    out: dict[int, Series] = {}
    for n in range(top + 1):
        if n in want:
            out[n] = acc.truncate(want[n])
        if n == top:
            break
        k = keep[n + 1]
        acc = acc.truncate(k)
        for a, mono in zip(pp.params, monos, strict=True):
            va = a.valuation
            if va is not None and va + pp.step * n >= k:
                continue                # 1 - a q^(tn) is 1 modulo q^k
            acc = times_binomial(acc, a, mono, pp.step * n, pp.power, k)
    return out
