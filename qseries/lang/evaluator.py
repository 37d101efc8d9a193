"""Evaluate a syntax tree to a truncated series, walking the tree (never eval/exec).

The order (absolute precision) and the coefficient ring are arguments.  Infinite sums and
products end honestly: a symbolic lower bound for the valuation of the k-th term (of the
k-th factor minus 1) shows when all further terms vanish below the order; when no such bound
can be established, evaluation stops with an error instead of truncating silently.

>>> evaluate("sum_{k>=0} q^(k^2)/(q;q)_k", 12)
1 + q + q^2 + q^3 + 2q^4 + 2q^5 + 3q^6 + 3q^7 + 4q^8 + 5q^9 + 6q^10 + 7q^11 + O(q^12)
>>> evaluate("sum_{k>=0} 1/(q;q)_k", 10)  # doctest: +ELLIPSIS
Traceback (most recent call last):
...
qseries.errors.DomainError: sum_{k>=0} does not converge as a formal power series: ...
"""

from __future__ import annotations

from fractions import Fraction
from typing import Any

from .._flint import laurent_budget
from ..errors import DomainError, QSeriesError, UnableError, weight_may_help
from ..products import FUNCTIONS, monomial_parts, pochhammer, theta_pair_parts
from ..series import MAX_LENGTH, QQ, ZZ, LaurentPoly, Ring, Series, laurent_ring
from ..series.formatting import short_number_text
from . import symbolic as sym
from .ast import (
    BigO,
    BigOp,
    BinOp,
    Call,
    Name,
    Neg,
    Node,
    Num,
    Poch,
    Q,
    Var,
    extra_variables,
    free_names,
    mentions_q,
)
from .parser import parse
from .termination import NoBound, TermBounds

Value = Fraction | Series
#: a value as numerator and denominator (None: 1), see Evaluator.evaluate_parts
Parts = tuple[Series, Series | None]

#: the working order may be raised to RETRY_FACTOR * order + RETRY_SLACK to make up for
#: precision lost to negative powers; beyond that the lower precision is reported
RETRY_FACTOR = 4
RETRY_SLACK = 2000
#: most terms (or factors) a single sum (or product) may evaluate
MAX_TERMS = 1_000_000
#: most terms all the sums and products of one evaluation may evaluate together
MAX_TOTAL_TERMS = 1_000_000
#: finite ranges longer than this are cut by the valuation analysis where it applies
SPLIT_RANGE = 256
#: a finite range the analysis cannot cut is evaluated in full only up to this length
FALLBACK_RANGE = 20_000
#: binary splitting is used while the binomials' exponents add up to at most this many times
#: the order (beyond, the tree's nodes are all dense and stepping term by term is cheaper)
SPLIT_DEGREE = 8
#: largest integer accepted as an exponent of q, a limit of a sum or a subscript
MAX_INTEGER = 10**18
#: largest bit size of a rational constant built by powers, sums or products of numbers
#: (about 30,000 digits)
MAX_BITS = 100_000
#: most terms a sum or product of numbers alone may have (each is a walk of its body), and
#: most bit operations its running value may cost (sum of its sizes over the terms)
MAX_NUMBER_TERMS = 20_000
MAX_NUMBER_WORK = 200_000_000


def _int_value(v: Fraction, what: str) -> int:
    if v.denominator != 1:
        raise DomainError(f"{what} must be an integer, not {short_number_text(v)}")
    if abs(v.numerator) > MAX_INTEGER:
        raise UnableError(f"{what} is {short_number_text(v)}, beyond the limit 10^18")
    return v.numerator


class Evaluator:
    """Evaluates syntax trees over one coefficient ring; caches subtrees free of bound
    variables, per order.

    >>> ev = Evaluator(ZZ)
    >>> ev.evaluate(parse("(q;q)_inf"), 6)
    1 - q - q^2 + q^5 + O(q^6)
    """

    def __init__(self, ring: Ring = ZZ, stepping: bool = True,
                 values: dict[str, Any] | None = None,
                 weights: dict[str, int] | None = None) -> None:
        self.ring = ring
        #: the value of each extra variable (default: the ring's generator of that name)
        #: and its weight w: the variable z stands for z*q^w, so that with w >= 1 a
        #: coefficient that is a power series in z (such as 1/(1-z)) is expanded in q too
        self.values = dict(values or {})
        self.weights = dict(weights or {})
        #: use the ratio of consecutive terms for q-Pochhammer factors of sums (the fast
        #: path); False evaluates every term from scratch (the reference path for tests)
        self.stepping = stepping
        self._cache: dict[tuple, Any] = {}
        self._free: dict[int, frozenset[str]] = {}
        self._hasq: dict[int, bool] = {}
        self.bounds = TermBounds(self)
        self._terms = 0

    # -- public ------------------------------------------------------------------------
    def evaluate(self, node: Node, order: int, retries: int = 3) -> Series:
        """The value of ``node`` modulo q^order.  Where negative powers cost precision the
        working order is raised and the evaluation repeated (at most ``retries`` times); the
        result's ``precision`` says what is really known."""
        if order > MAX_LENGTH:
            raise UnableError(f"order {order} exceeds the limit {MAX_LENGTH}")
        with laurent_budget():
            return self._evaluate(node, order, retries)

    def evaluate_parts(self, node: Node, order: int) -> Parts:
        """The value of ``node`` modulo q^order as (numerator, denominator), the denominator
        a unit series (valuation 0, invertible constant term) known modulo q^order and the
        numerator then of valuation >= 0 and known modulo q^order; or (value, None).  A sum
        done by binary splitting or a chain of products and quotients leaves its last
        division undone, so that two sides can be compared as A*D = C*B without inverting
        a series.  Anything else is evaluated as by ``evaluate``.

        >>> ev = Evaluator(ZZ)
        >>> ev.evaluate_parts(parse("1/((q;q^5)_inf (q^4;q^5)_inf)"), 8)
        (1 - q^5 + O(q^8), 1 - q - q^4 + q^7 + O(q^8))
        >>> ev.evaluate_parts(parse("(q;q)_inf"), 3)
        (1 - q - q^2 + O(q^3), None)
        """
        if order > MAX_LENGTH:
            raise UnableError(f"order {order} exceeds the limit {MAX_LENGTH}")
        with laurent_budget():
            self._cache.clear()
            self._terms = 0
            got = self._top_parts(node, order)
            if got is not None:
                num, den = got
                known = num.precision is None or num.precision >= order
                if den is None and known:
                    return (num.truncate(order) if num.offset == 0
                            else _truncate_abs(num, order)), None
                low = num.valuation
                if (den is not None and known and self._is_unit(den, order)
                        and (low is None or low >= 0)):
                    return num, den
            return self._evaluate(node, order, 3), None

    def _top_parts(self, node: Node, order: int) -> Parts | None:
        if isinstance(node, Neg):
            got = self._top_parts(node.operand, order)
            return None if got is None else (-got[0], got[1])
        if isinstance(node, BinOp) and node.op in "*/":
            v = self._chain_parts(_factors(node), {}, order)
            if isinstance(v, tuple):
                return v
            return (v, None) if isinstance(v, Series) else None
        if isinstance(node, BigOp):
            return self._sum_parts(node, {}, order)
        return None

    def _is_unit(self, s: Series, order: int) -> bool:
        return (s.offset == 0 and s.valuation == 0 and s.ring.is_unit(s.ring.coeff(s.poly, 0))
                and (s.precision is None or s.precision >= order))

    def _evaluate(self, node: Node, order: int, retries: int) -> Series:
        self._cache.clear()
        self._terms = 0
        work = order
        result = self._as_series(self.value(node, {}, work))
        for _ in range(retries):
            p = result.precision
            if p is None or p >= order:
                break
            deficit = order - p
            work += int(deficit) + (0 if Fraction(deficit).denominator == 1 else 1)
            if work > MAX_LENGTH or work > RETRY_FACTOR * order + RETRY_SLACK:
                break   # report the precision reached rather than compute far beyond order
            again = self._as_series(self.value(node, {}, work))
            if again.precision is not None and again.precision <= p:
                break   # an explicit O(q^e), or a loss that grows with the order
            result = again
        return result.truncate(order) if result.offset == 0 else _truncate_abs(result, order)

    def value(self, node: Node, env: dict[str, int], order: int) -> Value:
        """The value of ``node`` with bound variables ``env``, as a number or a series known
        modulo q^order."""
        if order > MAX_LENGTH:
            raise UnableError(f"this expression needs a working order of {order}, beyond the "
                              f"limit {MAX_LENGTH} (negative powers of q cost precision)")
        if isinstance(node, (Poch, BigOp, Call)) and not (self.free(node) & env.keys()):
            key = (id(node), order)
            hit = self._cache.get(key)
            if hit is None:
                hit = self._value(node, env, order)
                self._cache[key] = hit
            return hit
        return self._value(node, env, order)

    # -- helpers -----------------------------------------------------------------------
    def free(self, node: Node) -> frozenset[str]:
        f = self._free.get(id(node))
        if f is None:
            f = free_names(node)
            self._free[id(node)] = f
        return f

    def has_q(self, node: Node) -> bool:
        h = self._hasq.get(id(node))
        if h is None:
            h = mentions_q(node)
            self._hasq[id(node)] = h
        return h

    def _as_series(self, v: Value) -> Series:
        if isinstance(v, Series):
            return v
        return Series.constant(v, self.ring if self.ring is not ZZ or v.denominator == 1 else None)

    def _extra(self, node: Var) -> Series:
        w = self.weights.get(node.name, 0)
        if node.name in self.values:
            c = self.values[node.name]
        elif node.name in getattr(self.ring, "names", ()):
            c = self.ring.gen(node.name)  # type: ignore[attr-defined]
        else:
            raise DomainError(f"the extra variable {node.name!r} at column {node.pos + 1} has "
                              f"no value over {self.ring.name}")
        return Series.monomial(w, self.ring, c)

    def scalar(self, node: Node, env: dict[str, int]) -> Fraction:
        """The value of a node that must not involve q (an exponent, a bound, a subscript)."""
        if self.has_q(node):
            names = sorted(extra_variables(node))
            what = "q" if not names else f"the extra variable {names[0]}"
            raise DomainError(f"the expression at column {getattr(node, 'pos', 0) + 1} must be "
                              f"a number here, but it involves {what}")
        v = self.value(node, env, 0)
        assert isinstance(v, Fraction)
        return v

    def integer(self, node: Node, env: dict[str, int], what: str) -> int:
        return _int_value(self.scalar(node, env), what)

    # -- the walk ----------------------------------------------------------------------
    def _value(self, node: Node, env: dict[str, int], order: int) -> Value:
        if isinstance(node, Num):
            return node.value
        if isinstance(node, Q):
            return Series.monomial(1, self.ring)
        if isinstance(node, Name):
            if node.name not in env:
                raise DomainError(f"the variable {node.name!r} has no value here")
            return Fraction(env[node.name])
        if isinstance(node, Var):
            return self._extra(node)
        if isinstance(node, Neg):
            v = self.value(node.operand, env, order)
            return -v
        if isinstance(node, BinOp):
            if node.op in "+-":
                # a long sum of terms is a deep left spine: walk it without recursion
                spine: list[tuple[str, Node]] = []
                left: Node = node
                while isinstance(left, BinOp) and left.op in "+-":
                    spine.append((left.op, left.right))
                    left = left.left
                acc = self.value(left, env, order)
                for op, right in reversed(spine):
                    b = self.value(right, env, order)
                    acc = acc + b if op == "+" else acc - b
                    if isinstance(acc, Series):
                        acc = acc.truncate(order)
                return acc
            if node.op in "*/":
                return self._chain(_factors(node), env, order)
            return self._power(node, env, order)
        if isinstance(node, Poch):
            return self._poch(node, env, order)
        if isinstance(node, BigOp):
            if node.kind == "sum":
                return self._sum(node, env, order)
            return self._prod(node, env, order)
        if isinstance(node, Call):
            args = tuple((self._exact_monomial(a, env) or self.value(a, env, order))
                         if self.has_q(a) else self.scalar(a, env) for a in node.args)
            return FUNCTIONS[node.name].build(args, self.ring, order)
        if isinstance(node, BigO):
            e = self.scalar(node.exponent, env)
            if abs(e) > MAX_INTEGER:
                raise UnableError(f"O(q^{short_number_text(e)}) is beyond the limit")
            n = _floor(e)
            frac = e - n
            if frac == 0:
                return Series.zero(self.ring, n)
            return Series(self.ring, self.ring.zero(), n, frac, n)
        raise TypeError(f"not a syntax-tree node: {node!r}")

    def _power(self, node: BinOp, env: dict[str, int], order: int) -> Value:
        e = self.scalar(node.right, env)
        if not self.has_q(node.left):
            base = self.scalar(node.left, env)
            return _rational_power(base, e)
        if isinstance(node.left, Q):
            return Series.monomial(e, self.ring).truncate(order)
        base_s = self._divisor(node.left, env, order) if e < 0 else \
            self.value(node.left, env, order)
        assert isinstance(base_s, Series)
        mono = monomial_parts(base_s)
        if e.denominator != 1:
            if mono is not None and mono[0] == 1:
                return Series.monomial(mono[1] * e, self.ring)
            raise UnableError(f"only integer powers of a series are supported (got {e})")
        n = e.numerator
        if abs(n) > MAX_LENGTH:
            raise UnableError(f"the power {n} is beyond the limit {MAX_LENGTH}")
        if mono is not None:
            c, s = mono
            if isinstance(c, LaurentPoly):
                cp = _scalar_power(c, n)          # over QQ when c = 2z and n < 0
                return Series.monomial(s * n, cp.ring, cp)
            modulus = getattr(base_s.ring, "p", None)
            if modulus is not None:               # a residue (a random value of z): mod p
                if n < 0 and c % modulus == 0:
                    raise DomainError("division by zero (0 to a negative power)")
                return Series.monomial(s * n, base_s.ring, pow(int(c), n, modulus))
            return Series.monomial(s * n, base_s.ring, _rational_power(Fraction(c), e))
        return base_s.power(n, order)

    def _divisor(self, node: Node, env: dict[str, int], order: int) -> Value:
        """The value of a node that is divided by: when it vanishes modulo q^order (a
        polynomial such as q^2 - q^3 at order 2) it is computed again to a higher order,
        since dividing needs its first nonzero term."""
        v = self.value(node, env, order)
        work = order
        cap = RETRY_FACTOR * max(order, 1) + RETRY_SLACK
        while isinstance(v, Series) and v.is_zero() and not v.is_exact and work < cap:
            work = min(2 * work + 8, cap)
            v = self.value(node, env, work)
        return v

    def _exact_monomial(self, node: Node, env: dict[str, int]) -> Series | None:
        """The exact value of c*q^e written as such (q, q^e, -q^e, 2q^e), else None;
        unlike ``value`` it is never truncated, so q-Pochhammer bases and parameters keep
        their binomial fast paths at any order."""
        got = self._monomial_of(node, env)
        return None if got is None else Series.monomial(got[1], self.ring, got[0])

    def _monomial_of(self, node: Node, env: dict[str, int]) -> tuple[Fraction, Fraction] | None:
        """(c, e) when node is written c*q^e (see ``_exact_monomial``), else None."""
        c = Fraction(1)
        while True:
            if isinstance(node, Neg):
                c, node = -c, node.operand
            elif isinstance(node, BinOp) and node.op == "*" and not self.has_q(node.left):
                c, node = c * self.scalar(node.left, env), node.right
            else:
                break
        if isinstance(node, Q):
            return c, Fraction(1)
        if isinstance(node, BinOp) and node.op == "^" and isinstance(node.left, Q):
            e = self.scalar(node.right, env)
            if abs(e) <= MAX_INTEGER:
                return c, e
        return None

    def _base_step(self, node: Poch, env: dict[str, int], order: int) -> int:
        base = self._exact_monomial(node.base, env) or self.value(node.base, env, order)
        mono = monomial_parts(base) if isinstance(base, Series) else None
        if mono is None or mono[0] != 1 or mono[1].denominator != 1 or mono[1] < 1:
            raise DomainError(f"the base of the q-Pochhammer symbol at column {node.pos + 1} "
                              f"must be q^t with t a positive integer")
        return int(mono[1])

    def _param(self, node: Node, env: dict[str, int], order: int) -> Series:
        return self._exact_monomial(node, env) or self._as_series(self.value(node, env, order))

    def _reciprocal_poch(self, node: Poch, env: dict[str, int], order: int) -> Series | None:
        """1/(a, b, ...;q^t)_n for n < 0 as the product (a q^(tn), b q^(tn), ...;q^t)_(-n)
        modulo q^order, with no inversion (so 1/(q;q)_(-1) = (1;q)_1 = 0); None when n is
        infinite or not negative.

        >>> Evaluator(ZZ)._reciprocal_poch(parse("(q^3;q^5)_(-2)"), {}, 3)
        q^-9 - q^-7 - q^-2 + 1
        """
        if node.length is None:
            return None
        n = self.integer(node.length, env, "the subscript of (a;q)_n")
        if n >= 0:
            return None
        t = self._base_step(node, env, order)
        acc: Series | None = None
        for prm in node.params:
            a = self._param(prm, env, order).shift(t * n)
            f = pochhammer(a, t, -n, order)
            acc = f if acc is None else (acc * f).truncate(order)
        assert acc is not None
        return acc

    def _poch_power(self, node: Poch, p: int, env: dict[str, int], order: int) -> Series:
        """(a;q^t)_n^p modulo q^order; negative powers with n < 0 without inversion."""
        recip = self._reciprocal_poch(node, env, order) if p < 0 else None
        if recip is not None:
            return recip if p == -1 else recip.power(-p, order)
        v = self._as_series(self.value(node, env, order))
        return v.power(p, order) if p != 1 else v.truncate(order)

    def _poch(self, node: Poch, env: dict[str, int], order: int) -> Series:
        t = self._base_step(node, env, order)
        n = None if node.length is None else self.integer(node.length, env,
                                                            "the subscript of (a;q)_n")
        acc: Series | None = None
        for p in node.params:
            a = self._param(p, env, order)
            f = pochhammer(a, t, n, order)
            acc = f if acc is None else (acc * f).truncate(order)
        assert acc is not None
        return acc

    # -- products and quotients ----------------------------------------------------------
    def _chain(self, factors: list[tuple[Node, int]], env: dict[str, int], order: int) -> Value:
        """Multiply out factors node^power: numbers and monomials first (so the remaining
        factors are computed only to the order they matter), then series, binomials
        1 - c q^j by the O(N) fast paths, and one inversion for the other denominators."""
        got = self._chain_parts(factors, env, order)
        return self.quotient(*got, order) if isinstance(got, tuple) else got

    def _chain_parts(self, factors: list[tuple[Node, int]], env: dict[str, int],
                     order: int) -> Value | Parts:
        """``_chain`` with the final inversion left out: a number, a series, or parts."""
        coeff = Fraction(1)
        shift = Fraction(0)
        rest: list[tuple[Node, int]] = []
        any_series = False
        for node, p in factors:
            if not self.has_q(node):
                v = self.scalar(node, env)
                if p < 0 and v == 0:
                    raise DomainError(f"division by zero at column {getattr(node, 'pos', 0) + 1}")
                coeff *= _rational_power(v, Fraction(p))
            elif isinstance(node, Q) or (isinstance(node, BinOp) and node.op == "^"
                                         and isinstance(node.left, Q)):
                any_series = True
                e = Fraction(1) if isinstance(node, Q) else self.scalar(node.right, env)
                shift += e * p
            else:
                any_series = True
                rest.append((node, p))
        if not any_series:
            return coeff
        if coeff == 0 and rest == []:
            return Series.zero(self.ring)
        inner = max(order - _ceil(shift), 1)
        acc, den = self._apply_parts(Series.constant(1, self.ring), rest, env, inner)
        if coeff != 1:
            acc = acc * coeff
        acc = acc.shift(shift).truncate(order) if shift else acc
        return acc if den is None else (acc, den)

    def _poch_atoms(self, node: Node, env: dict[str, int]) -> list[tuple[int, int]] | None:
        """[(a, m), ...] when node is (q^a1, q^a2, ...; q^m)_inf with positive integer a_i."""
        if not isinstance(node, Poch) or node.length is not None:
            return None
        try:
            m = self._base_step(node, env, 1)
        except QSeriesError:
            return None
        out = []
        for p in node.params:
            mono = self._exact_monomial(p, env)
            parts = monomial_parts(mono) if mono is not None else None
            if parts is None or parts[0] != 1 or parts[1].denominator != 1 or parts[1] < 1:
                return None
            out.append((int(parts[1]), m))
        return out

    def _paired_products(self, factors: list[tuple[Node, int]], env: dict[str, int],
                         order: int) -> tuple[list[Parts], list[tuple[Node, int]]]:
        """Jacobi's triple product fast path: factors (q^a;q^m)_inf^p and (q^(m-a);q^m)_inf^p
        are computed together as a sparse sum over (q^m;q^m)_inf.  Returns the paired
        products as numerators and denominators, and the factors left to the general path."""
        atoms: list[tuple[int, int, int]] = []
        rest: list[tuple[Node, int]] = []
        for node, p in factors:
            info = self._poch_atoms(node, env)
            if info is None:
                rest.append((node, p))
            else:
                atoms.extend((a, m, p) for a, m in info)
        if len(atoms) < 2:
            return [], factors
        pool = list(atoms)
        values: list[Parts] = []
        singles: list[tuple[int, int, int]] = []
        while pool:
            a, m, p = pool.pop(0)
            partner = (m - a, m, p)
            if 0 < a < m and 2 * a != m and partner in pool:
                pool.remove(partner)
                key = ("pair", min(a, m - a), m, p, order)
                v = self._cache.get(key)
                if v is None:
                    v = theta_pair_parts(min(a, m - a), m, p, self.ring, order)
                    self._cache[key] = v
                values.append(v)
            else:
                singles.append((a, m, p))
        for a, m, p in singles:
            v = pochhammer(Series.monomial(a, self.ring), m, None, order)
            values.append((v if p == 1 else v.power(p, order), None))
        return values, rest

    def _apply(self, acc: Series, factors: list[tuple[Node, int]], env: dict[str, int],
               order: int) -> Series:
        """acc * prod node^power modulo q^order."""
        return self.quotient(*self._apply_parts(acc, factors, env, order), order)

    def _apply_parts(self, acc: Series, factors: list[tuple[Node, int]], env: dict[str, int],
                     order: int) -> Parts:
        """acc * prod node^power modulo q^order as a numerator and the product of the
        denominators (None when there are none), which ``quotient`` inverts once."""
        dens: list[Series] = []
        binoms: list[tuple[Fraction | int, int, int]] = []
        paired, factors = self._paired_products(factors, env, order)
        for v, d in paired:
            acc = (acc * v).truncate(order)
            if d is not None:
                dens.append(d)
        for node, p in factors:
            if p == 1 and isinstance(node, BigOp) and not (self.free(node) & env.keys()):
                got = self._sum_parts(node, env, order)
                if got is not None:
                    acc = (acc * got[0]).truncate(order)
                    if got[1] is not None:
                        dens.append(got[1])
                    continue
            if p < 0 and isinstance(node, Poch):
                recip = self._reciprocal_poch(node, env, order)
                if recip is not None:       # 1/(a;q)_n with n < 0 is a numerator
                    acc = (acc * (recip if p == -1 else recip.power(-p, order))).truncate(order)
                    continue
            v = self._divisor(node, env, order) if p < 0 else self.value(node, env, order)
            if not isinstance(v, Series):
                if p < 0 and v == 0:
                    raise DomainError(f"division by zero at column {getattr(node, 'pos', 0) + 1}")
                acc = acc * _rational_power(v, Fraction(p))
                continue
            b = _binomial_parts(v)
            if b is not None:
                binoms.append((b[0], b[1], p))
            elif p > 0:
                acc = (acc * (v if p == 1 else v.power(p, order))).truncate(order)
            else:
                # known beyond the order by its valuation, as the divisors below
                vd = max(_floor(v.valuation), 0) if v.valuation is not None else 0
                dens.append(v if p == -1 else v.power(-p, order + vd * (-p - 1)))
        for c, j, p in binoms:
            for _ in range(abs(p)):
                acc = (acc.mul_binomial(c, j, order) if p > 0
                       else acc.div_binomial(c, j, order))
        if not dens:
            return acc.truncate(order), None
        # truncated beyond the order by the divisors' valuations, which dividing gives
        # back (truncating at the order would make divisors of positive valuation vanish)
        work = order + sum(max(_floor(d.valuation), 0) for d in dens
                           if d.valuation is not None)
        den = dens[0]
        for d in dens[1:]:
            den = (den * d).truncate(work)
        return acc.truncate(order), den

    @staticmethod
    def quotient(num: Series, den: Series | None, order: int) -> Series:
        """num / den modulo q^order (den None: num), as from ``evaluate_parts``.

        >>> ev = Evaluator(ZZ)
        >>> Evaluator.quotient(*ev.evaluate_parts(parse("1/(q;q)_inf"), 6), 6)
        1 + q + 2q^2 + 3q^3 + 5q^4 + 7q^5 + O(q^6)
        """
        if den is None:
            return num.truncate(order)
        va = num.valuation
        shift_num = int(va) if va is not None else 0
        return (num * den.inverse(order=order - shift_num)).truncate(order)

    # -- sums and products ------------------------------------------------------------------
    def _range(self, node: BigOp, env: dict[str, int], order: int,
               deviation: bool) -> tuple[list[int], bool]:
        """The values of the bound variable whose terms can matter modulo q^order, and
        whether terms were left out: infinite directions (and finite ones longer than
        SPLIT_RANGE) end where the valuation analysis shows that every further term (factor
        minus 1) vanishes modulo q^order.  A result computed from a cut range is known only
        modulo q^order, however short it is: the caller must not mark it exact."""
        lo = None if node.lower is None else self.integer(node.lower, env, "a lower limit")
        hi = None if node.upper is None else self.integer(node.upper, env, "an upper limit")
        if lo is not None and hi is not None:
            if hi < lo:
                return [], False
            if hi - lo + 1 <= SPLIT_RANGE:
                return list(range(lo, hi + 1)), False
            try:
                return self._cut_range(node, env, order, deviation, lo, hi)
            except (UnableError, DomainError) as why:
                # a finite range: terms that do not shrink are no error, just no shortcut
                if hi - lo + 1 <= FALLBACK_RANGE:
                    return list(range(lo, hi + 1)), False
                raise UnableError(f"{_label(node)} has {hi - lo + 1} terms, more than "
                                  f"{FALLBACK_RANGE} that can be evaluated one by one, and the "
                                  f"valuation analysis cannot cut the range: {why}") from None
        return self._cut_range(node, env, order, deviation, lo, hi)

    def _cut_range(self, node: BigOp, env: dict[str, int], order: int, deviation: bool,
                   lo: int | None, hi: int | None) -> tuple[list[int], bool]:
        pieces: list[tuple[int, int]] = []      # inclusive ranges, in increasing order
        cut = False                             # whether a term that may be nonzero is left out
        if lo is None or lo < 0:                # the part k <= -1, as m = -k >= 1
            top = -1 if hi is None else min(hi, -1)
            if lo is None or top - lo + 1 > SPLIT_RANGE:
                stop_m, ones = self._cutoff(node, env, order, -1, -top, deviation)
                first = -(stop_m - 1) if lo is None else max(lo, -(stop_m - 1))
                cut = cut or (not ones and (lo is None or first > lo))
            else:
                first = lo
            if first <= top:
                pieces.append((first, top))
        if hi is None or hi >= 0:               # the part k >= 0
            start = 0 if lo is None else max(lo, 0)
            if hi is None or hi - start + 1 > SPLIT_RANGE:
                stop, ones = self._cutoff(node, env, order, +1, start, deviation)
                last = stop - 1 if hi is None else min(hi, stop - 1)
                cut = cut or (not ones and (hi is None or last < hi))
            else:
                last = hi
            if start <= last:
                pieces.append((start, last))
        count = sum(b - a + 1 for a, b in pieces)
        if count > MAX_TERMS:
            raise UnableError(f"{_label(node)} needs {count} terms at this order; the limit "
                              f"is {MAX_TERMS}")
        return [k for a, b in pieces for k in range(a, b + 1)], cut

    def _cutoff(self, node: BigOp, env: dict[str, int], order: int, sign: int, start: int,
                deviation: bool) -> tuple[int, bool]:
        """First m >= start (k = sign*m) from which every term has valuation >= order, and
        whether the terms (factors) from there on are exactly 0 (exactly 1), not just small."""
        label = _label(node)
        what = "factor minus 1" if deviation else "term"
        var = node.var
        try:
            if deviation:
                b = self.bounds.deviation(node.body, var, {var: sign}, env, order)
            else:
                b = self.bounds.lower(node.body, var, {var: sign}, env, order)
            if b is None:  # every factor is exactly 1
                return start, True
            poly = sym.m_to_uni(b.poly, var)
            if poly is None:
                raise NoBound("the bound involves the variables of inner sums")
        except NoBound as why:
            raise weight_may_help(UnableError(
                f"cannot show that {label} converges as a formal power series ({why}); give "
                f"finite limits")) from None
        if sym.degree(poly) < 1 or sym.leading(poly) <= 0:
            shown = sym.peval(poly, 0)
            if b.exact and sym.degree(poly) < 1:
                raise weight_may_help(DomainError(
                    f"{label} does not converge as a formal power series: the valuation of "
                    f"its {var}-th {what} stays at {_num(shown)} (it does not grow with "
                    f"{var})"))
            if b.exact:
                raise weight_may_help(DomainError(
                    f"{label} does not converge as a formal power series: the valuation of "
                    f"its {var}-th {what} is {_poly_text(poly, var, sign)}, which does not "
                    f"grow"))
            raise weight_may_help(UnableError(
                f"cannot show that {label} converges as a formal power series: the valuation "
                f"of its {var}-th {what} is only known to be at least "
                f"{_poly_text(poly, var, sign)}"))
        m = sym.eventually_at_least(poly, order, max(start, b.start, 0))
        return max(m, start), False

    def _numbers(self, node: BigOp, env: dict[str, int]) -> Fraction:
        """A sum or product of numbers over a finite range."""
        what = "adds" if node.kind == "sum" else "multiplies"
        if node.lower is None or node.upper is None:
            raise DomainError(f"{_label(node)} {what} infinitely many numbers; it has no "
                              f"meaning as a formal power series")
        lo = self.integer(node.lower, env, "a lower limit")
        hi = self.integer(node.upper, env, "an upper limit")
        if hi - lo + 1 > MAX_NUMBER_TERMS:
            raise UnableError(f"{_label(node)} has {hi - lo + 1} terms; a sum or product of "
                              f"numbers may have at most {MAX_NUMBER_TERMS}")
        total = Fraction(0 if node.kind == "sum" else 1)
        work = 0
        for k in range(lo, hi + 1):
            v = self.scalar(node.body, {**env, node.var: k})
            total = total + v if node.kind == "sum" else total * v
            bits = total.numerator.bit_length() + total.denominator.bit_length()
            work += bits
            if bits > 2 * MAX_BITS or work > MAX_NUMBER_WORK:
                raise UnableError(f"the number {_label(node)} is too large to compute (its "
                                  f"value has {bits} bits at {node.var} = {k})")
        return total

    def _sum(self, node: BigOp, env: dict[str, int], order: int) -> Value:
        if not self.has_q(node.body):
            return self._numbers(node, env)
        ks, cut = self._range(node, env, order, deviation=False)
        return self._sum_terms(node, ks, env, order, cut=cut)

    def _count_terms(self, node: BigOp, n: int) -> None:
        self._terms += n
        if self._terms > MAX_TOTAL_TERMS:
            raise UnableError(f"the sums and products need more than {MAX_TOTAL_TERMS} terms "
                              f"together at this order (at {_label(node)})")

    def _sum_parts(self, node: BigOp, env: dict[str, int], order: int) -> Parts | None:
        """A sum as numerator and denominator (binary splitting leaves one division undone);
        (value, None) for a sum evaluated otherwise, None for a node that is not a sum."""
        if node.kind != "sum" or not self.has_q(node.body):
            return None
        if order > MAX_LENGTH:
            return None     # value() gives the error
        closed = not (self.free(node) & env.keys())
        key = ("parts", id(node), order)
        hit = self._cache.get(key) if closed else None
        if hit is None:
            ks, cut = self._range(node, env, order, deviation=False)
            got = self._sum_terms(node, ks, env, order, parts=True, cut=cut)
            hit = got if isinstance(got, tuple) else (got, None)
            if closed:
                self._cache[key] = hit
        return hit

    def _sum_terms(self, node: BigOp, ks: list[int], env: dict[str, int], order: int,
                   parts: bool = False, cut: bool = False) -> Series | tuple[Series, Series]:
        """The sum over ``ks``; with ``parts``, as (numerator, denominator) where binary
        splitting applies.  ``cut``: terms of valuation >= order were left out, so the sum
        is known modulo q^order only (the numerator likewise: the denominator is a unit)."""
        got = self._sum_known_terms(node, ks, env, order, parts)
        if not cut:
            return got
        if isinstance(got, tuple):
            return got[0].limit_precision(order), got[1]
        return got.limit_precision(order)

    def _sum_known_terms(self, node: BigOp, ks: list[int], env: dict[str, int], order: int,
                         parts: bool) -> Series | tuple[Series, Series]:
        var = node.var
        self._count_terms(node, len(ks))
        if not ks:
            return Series.zero(self.ring)
        sign, factors = _signed_factors(node.body)
        const_f = [(f, p) for f, p in factors if var not in self.free(f)]
        moving = [(f, p) for f, p in factors if var in self.free(f)]
        # the constant factors: computed once
        const = self._chain(const_f, env, order) if const_f else Fraction(1)
        if isinstance(const, Series) and const.is_zero() and const.is_exact:
            return Series.zero(self.ring)
        vconst = 0
        if isinstance(const, Series):
            vv = const.valuation
            vconst = _floor(vv) if vv is not None else 0
        target = order - vconst
        # classify the moving factors
        scalars = [(f, p) for f, p in moving if not self.has_q(f)]
        monos = [(f, p) for f, p in moving if self.has_q(f) and _is_q_power(f)]
        stepping: list[tuple[Poch, int]] = []
        direct: list[tuple[Node, int]] = []
        for f, p in moving:
            if not self.has_q(f) or _is_q_power(f):
                continue
            if isinstance(f, Poch) and self._steppable(f, var, env):
                stepping.append((f, p))
            else:
                direct.append((f, p))
        # exponents of the monomial part, and which terms are needed
        shifts: list[Fraction] = []
        for k in ks:
            e = Fraction(0)
            env_k = {**env, var: k}
            for f, p in monos:
                e += p * (Fraction(1) if isinstance(f, Q) else self.scalar(f.right, env_k))
            shifts.append(e)
        suffix_min: list[Fraction] = [Fraction(0)] * len(ks)
        running: Fraction | None = None
        for i in range(len(ks) - 1, -1, -1):
            running = shifts[i] if running is None else min(running, shifts[i])
            suffix_min[i] = running
        if self.stepping and not stepping and not direct and \
                all(e.denominator == 1 for e in shifts):
            # every term is a monomial c q^e: add them into one list of coefficients (one
            # dense addition per term would cost the whole span each time)
            total = self._monomial_sum(node, ks, env, sign, scalars, shifts, target)
            return (total * const).truncate(order)
        if self.stepping and not direct and len(ks) >= 8:
            split = self._sum_by_splitting(node, ks, env, target, sign, scalars, stepping,
                                           shifts, order if parts else 0)
            if isinstance(split, Series):
                return (split * const).truncate(order)
            if split is not None:
                term_a, top, den, w = split
                if parts:
                    num = (term_a * top).truncate(target).limit_precision(target)
                    return (num * const).truncate(order), den
                ratio_sum = (top * den.inverse(order=w)).truncate(w).limit_precision(w)
                total = (term_a * ratio_sum).truncate(target).limit_precision(target)
                return (total * const).truncate(order)
        total = Series.zero(self.ring, target)
        # the product of the stepping factors, one series advanced by every factor's
        # binomials (one dense product per term would cost a multiplication each)
        state: Series | None = None
        prev_k: int | None = None
        # terms c q^s (numerator binomials) / (1 - c' q^j)^p are sparse (Lambert series):
        # they are added into a list of coefficients, O(target/j) each, not as dense series
        sparse: list[int] | None = None
        geometric = (self.stepping and self.ring.int_coefficients and not stepping
                     and bool(direct))
        for i, k in enumerate(ks):
            env_k = {**env, var: k}
            # factors are computed to at least q^1 even when the q-power puts the term beyond
            # the order: modulo q^0 or below a factor would lose its valuation (O(q^-3)
            # times O(q^-3) is O(q^-6)), and the sum all its precision
            need = max(target - _ceil(shifts[i]), 1)
            keep = target - _ceil(suffix_min[i])
            # advance the stepping products (ratio of consecutive terms: a few binomials)
            if stepping and state is None:
                state = Series.constant(1, self.ring)
                for f, p in stepping:
                    first = self._step(f, p, None, None, k, env, var, keep)
                    state = (state * first).truncate(max(keep, 0))
            else:
                for f, p in stepping:
                    state = self._step(f, p, state, prev_k, k, env, var, keep)
            prev_k = k
            # no term is skipped on the strength of its q-power alone: another factor may
            # have a negative valuation (a regression test covers this)
            c = self._scalar_factor(node, scalars, env_k, sign)
            if c == 0:
                continue
            if geometric and shifts[i].denominator == 1 and 0 <= shifts[i] < target:
                geo = self._geometric_term(direct, env_k, c)
                if geo is not None:
                    if sparse is None:
                        sparse = [0] * target
                    _add_geometric(sparse, int(shifts[i]), *geo, self.ring.modulus)
                    continue
            acc = (state.truncate(need) if state is not None
                   else Series.constant(1, self.ring))
            if direct:
                acc = self._apply(acc, direct, env_k, need)
            term = (acc * c).shift(shifts[i]) if shifts[i] else acc * c
            total = (total + term).truncate(target)
        if sparse is not None:
            total = total + Series(self.ring, self.ring.poly_from_ints(sparse), 0, 0, target)
        return (total * const).truncate(order)

    def _monomial_sum(self, node: BigOp, ks: list[int], env: dict[str, int], sign: int,
                      scalars: list[tuple[Node, int]], shifts: list[Fraction],
                      target: int) -> Series:
        """sum_k c_k q^(e_k) modulo q^target for integers e_k, c_k the product of the
        scalar factors."""
        coeffs: dict[int, Fraction] = {}
        for k, e in zip(ks, shifts, strict=True):
            if e >= target:
                continue
            c = self._scalar_factor(node, scalars, {**env, node.var: k}, sign)
            coeffs[int(e)] = coeffs.get(int(e), Fraction(0)) + c
        low = min(coeffs, default=target)
        if target - low > MAX_LENGTH:
            raise UnableError(f"{_label(node)} spans {target - low} coefficients, beyond the "
                              f"limit {MAX_LENGTH}")
        nums = [coeffs.get(e, 0) for e in range(low, target)]
        ring = self.ring
        if ring is ZZ and any(c.denominator != 1 for c in coeffs.values()):
            ring = QQ
        return Series.from_coefficients(nums, ring, start=low, prec=target)

    def _scalar_factor(self, node: BigOp, scalars: list[tuple[Node, int]],
                       env_k: dict[str, int], sign: int) -> Fraction:
        """sign times the product of the factors free of q at one value of the variable."""
        c = Fraction(sign)
        for f, p in scalars:
            v = self.scalar(f, env_k)
            if v == 0 and p < 0:
                raise DomainError(f"division by zero in {_label(node)} at {node.var} = "
                                  f"{env_k[node.var]}")
            c *= _rational_power(v, Fraction(p))
        return c

    def _geometric_term(self, direct: list[tuple[Node, int]], env: dict[str, int],
                        c: Fraction) -> tuple[int, dict[int, int], int, int, int] | None:
        """For a term c * prod node^p whose factors are all binomials a + b q^e (e >= 1) with
        at most one in the denominator: (coefficient, sparse numerator {exponent: coeff},
        c', j, p) with the term c * numerator / (1 - c' q^j)^p, every number an int of the
        ring; None otherwise (the term is then computed as a dense series)."""
        scale = c
        num: dict[int, Fraction] = {0: Fraction(1)}
        den: tuple[Fraction, int, int] | None = None
        for node, p in direct:
            b = self._binomial_node(node, env)
            if b is None:
                return None
            a, cb, e = b
            scale = scale / a ** -p if p < 0 else scale * a ** p
            if p < 0:
                if den is not None:
                    return None
                den = (cb, e, -p)
                continue
            for _ in range(p):
                nxt: dict[int, Fraction] = {}
                for x, v in num.items():
                    nxt[x] = nxt.get(x, Fraction(0)) + v
                    nxt[x + e] = nxt.get(x + e, Fraction(0)) - cb * v
                num = {x: v for x, v in nxt.items() if v}
                if len(num) > 64:
                    return None
        cden, j, p = den if den is not None else (Fraction(0), 1, 1)
        ints = [self._ring_int(x) for x in (scale, cden, *num.values())]
        if any(x is None for x in ints):
            return None
        return (ints[0], dict(zip(num, ints[2:], strict=True)),  # type: ignore[arg-type]
                ints[1], j, p)  # type: ignore[return-value]

    def _ring_int(self, x: Fraction | int) -> int | None:
        """x as a Python int of a ring with int coefficients (None: not representable)."""
        if isinstance(x, int):
            return x
        if x.denominator == 1:
            return x.numerator
        if self.ring is ZZ:
            return None
        try:
            return int(self.ring.coerce(x))
        except QSeriesError:
            return None

    def _binomial_node(self, node: Node, env: dict[str, int]
                       ) -> tuple[Fraction, Fraction, int] | None:
        """(a, c', e) when node is written a + b q^e or b q^e + a (a != 0, e >= 1 an integer),
        that is a (1 - c' q^e) with c' = -b/a; else None."""
        if not (isinstance(node, BinOp) and node.op in "+-"):
            return None
        left, right = node.left, node.right
        sign = 1 if node.op == "+" else -1
        for const_node, mono_node, s_const, s_mono in ((left, right, 1, sign),
                                                       (right, left, sign, 1)):
            if self.has_q(const_node) or not self.has_q(mono_node):
                continue
            parts = self._monomial_of(mono_node, env)
            if parts is None or parts[1].denominator != 1 or parts[1] < 1 or parts[0] == 0:
                return None
            a = s_const * self.scalar(const_node, env)
            if a == 0:
                return None
            return a, -s_mono * parts[0] / a, int(parts[1])
        return None

    def _sum_by_splitting(self, node: BigOp, ks: list[int], env: dict[str, int], target: int,
                          sign: int, scalars: list[tuple[Node, int]],
                          stepping: list[tuple[Poch, int]], shifts: list[Fraction],
                          den_order: int = 0
                          ) -> Series | tuple[Series, Series, Series, int] | None:
        """Binary splitting for a sum whose consecutive terms have a ratio P(k)/Q(k) of
        polynomials (a power of q, a number, binomials 1 - c q^j): with
        P(l,r), Q(l,r) the products over [l, r) and T(l,r) = T(l,m) Q(m,r) + P(l,m) T(m,r),
        the sum is term_a (Q + T)/Q over the whole range, in O(M(N) log K) instead of
        K divisions by binomials.  Returns (term_a, Q + T, Q, w) with Q + T and Q known
        modulo q^w, w at least ``den_order``; the sum itself when it is one term; None when
        the terms do not have that shape (the caller then steps term by term)."""
        var = node.var
        coeffs: list[Fraction] = []
        for k in ks:
            c = Fraction(sign)
            for f, p in scalars:
                v = self.scalar(f, {**env, var: k})
                if v == 0:
                    return None
                c *= _rational_power(v, Fraction(p))
            coeffs.append(c)
        for i in range(1, len(ks)):
            d = shifts[i] - shifts[i - 1]
            if d.denominator != 1 or d < 0:
                return None
        steps = []
        for f, p in stepping:
            t = self._base_step(f, env, 1)
            params = []
            for prm in f.params:
                parts = monomial_parts(m) if (m := self._exact_monomial(prm, env)) else None
                if parts is None or parts[1].denominator != 1:
                    return None
                params.append((parts[0], int(parts[1])))
            ns = [self.integer(f.length, {**env, var: k}, "a subscript")  # type: ignore[arg-type]
                  for k in ks]
            steps.append((t, params, p, ns))
        width = max(target - _ceil(shifts[0]), 1)
        ring = self.ring
        first = Series.constant(1, ring)
        for f, p in stepping:
            first = (first * self._step(f, p, None, None, ks[0], env, var, width)).truncate(width)
        if first.is_zero():
            return None
        term_a = (first * coeffs[0]).shift(shifts[0])
        va = term_a.valuation
        w = target - (_floor(va) if va is not None else 0)
        if w <= 0:
            return term_a.truncate(target)
        w = max(w, den_order)
        one = Series.constant(1, ring)
        # the splitting tree holds polynomials of total degree up to the sum of the
        # binomials' exponents: far beyond the order (a sum of about N terms such as
        # sum q^n/(q;q)_n) every node is a dense length-N product, and term-by-term stepping
        # is cheaper
        degree, budget = 0, SPLIT_DEGREE * w
        num: list[Series] = []
        den: list[Series] = []
        for i in range(1, len(ks)):
            pn = one.shift(int(shifts[i] - shifts[i - 1])).truncate(w) * (coeffs[i] / coeffs[i - 1])
            qd = one
            for t, params, p, ns in steps:
                lo, hi = sorted((ns[i - 1], ns[i]))
                times = p if ns[i] > ns[i - 1] else -p
                for c, e in params:
                    # factors 1 - c q^x with x >= w are 1 modulo q^w
                    top = hi if e < 0 else min(hi, max(lo, -((e - w) // t)))
                    for j in range(lo, top):
                        x = e + t * j
                        if x < 0:
                            return None
                        if x == 0:
                            if c == 1 or isinstance(c, LaurentPoly):
                                return None
                            pn = pn * _rational_power(Fraction(1 - Fraction(c)), Fraction(times))
                            continue
                        degree += x * abs(times)
                        if degree > budget:
                            return None
                        for _ in range(abs(times)):
                            if times > 0:
                                pn = pn.mul_binomial(c, x, w)
                            else:
                                qd = qd.mul_binomial(c, x, w)
            num.append(pn.truncate(w))
            den.append(qd.truncate(w))

        def split(lo: int, hi: int) -> tuple[Series, Series, Series]:
            if hi - lo == 1:
                return num[lo], den[lo], num[lo]
            mid = (lo + hi) // 2
            p1, q1, t1 = split(lo, mid)
            p2, q2, t2 = split(mid, hi)
            return (p1.mul_trunc(p2, w), q1.mul_trunc(q2, w),
                    (t1.mul_trunc(q2, w) + p1.mul_trunc(t2, w)).truncate(w))

        _, qq, tt = split(0, len(num))
        return term_a, (qq + tt).truncate(w), qq, w

    def _steppable(self, f: Poch, var: str, env: dict[str, int]) -> bool:
        if not self.stepping:
            return False
        if any(var in self.free(x) for x in (*f.params, f.base)) or f.length is None:
            return False
        try:
            poly = sym.m_to_uni(self.bounds.poly_of(f.length, {var: 1}, env), var)
        except NoBound:
            return False
        if poly is None:
            return False
        return sym.degree(poly) == 1 and all(c.denominator == 1 for c in poly)

    def _step(self, f: Poch, p: int, state: Series | None, prev_k: int | None, k: int,
              env: dict[str, int], var: str, keep: int) -> Series:
        """(params; q^t)_{n(k)}^p from its value at prev_k by multiplying the binomials
        between n(prev_k) and n(k); computed directly the first time."""
        keep = max(keep, 1)     # modulo q^0 the first value could not be inverted
        n_k = self.integer(f.length, {**env, var: k}, "a subscript")  # type: ignore[arg-type]
        if state is None or prev_k is None or (state.is_zero() and state.is_exact):
            # an exactly zero state (a factor 1 - 1 of 1/(q;q)_n, n < 0) cannot be stepped
            # on by division: start again from the value at k
            return self._poch_power(f, p, {**env, var: k}, keep)
        n_prev = self.integer(f.length, {**env, var: prev_k}, "a subscript")  # type: ignore[arg-type]
        t = self._base_step(f, env, keep)
        acc = state
        # a factor 1 - a q^x changes the state from q^(x + v) on, v its valuation: with the
        # other stepping factors in the state, v can be negative
        vs = state.valuation
        limit = keep - min(_floor(vs), 0) if vs is not None else keep
        lo, hi0 = sorted((n_prev, n_k))
        grow = n_k > n_prev
        skipped = False
        for param in f.params:
            a = self._param(param, env, keep)
            mono = monomial_parts(a)
            va = a.valuation
            hi = hi0
            if va is not None and va >= 0:
                # factors 1 - a q^(tj) with val(a) + tj + v >= keep leave the state alone
                # modulo q^keep
                hi = min(hi, max(lo, -((va - limit) // t)))
            skipped = skipped or hi < hi0 or (a.is_zero() and not a.is_exact)
            for j in range(lo, hi):
                # (a;q^t)_{j+1} = (a;q^t)_j (1 - a q^(tj))
                times = p if grow else -p
                acc = _times_binomial(acc, a, mono, t * j, times, keep)
        acc = acc.truncate(keep)
        return acc.limit_precision(keep) if skipped else acc

    def _prod(self, node: BigOp, env: dict[str, int], order: int) -> Value:
        if not self.has_q(node.body):
            return self._numbers(node, env)
        ks, cut = self._range(node, env, order, deviation=True)
        self._count_terms(node, len(ks))
        sign, factors = _signed_factors(node.body)
        acc = Series.constant(1, self.ring)
        for k in ks:
            acc = self._apply(acc, factors, {**env, node.var: k}, order)
            if sign < 0:
                acc = -acc
        if cut:
            # the factors left out are 1 + O(q^order); times a product of valuation v they
            # leave it known only below q^(order + v), and never exact (for v < 0 the caller
            # raises the working order and tries again)
            v = acc.valuation
            acc = acc.limit_precision(order + min(_floor(v), 0) if v is not None else order)
        return acc


# -- module helpers ---------------------------------------------------------------------------
def _label(node: BigOp) -> str:
    if node.lower is not None and node.upper is None:
        return f"{node.kind}_{{{node.var}>=...}}" if not isinstance(node.lower, Num) else \
            f"{node.kind}_{{{node.var}>={_num(node.lower.value)}}}"
    return f"{node.kind}_{{{node.var}=...}}"


def _num(v: Fraction) -> str:
    return str(v.numerator) if v.denominator == 1 else str(v)


def _poly_text(p: sym.Poly, var: str, sign: int) -> str:
    if not p:
        return "0"
    m = var if sign > 0 else f"(-{var})"
    parts = []
    for i in range(len(p) - 1, -1, -1):
        if p[i]:
            power = "" if i == 0 else f"*{m}" + ("" if i == 1 else f"^{i}")
            parts.append(f"{_num(p[i])}{power}")
    return " + ".join(parts)


def _factors(node: Node, p: int = 1) -> list[tuple[Node, int]]:
    """Flatten a product/quotient chain into (factor, power) pairs; constant integer powers
    of q-Pochhammer symbols become powers of the factor."""
    if isinstance(node, BinOp) and node.op == "*":
        return _factors(node.left, p) + _factors(node.right, p)
    if isinstance(node, BinOp) and node.op == "/":
        return _factors(node.left, p) + _factors(node.right, -p)
    if isinstance(node, BinOp) and node.op == "^" and isinstance(node.left, Poch) and \
            isinstance(node.right, Num) and node.right.value.denominator == 1 and \
            abs(node.right.value) <= 64:
        return [(node.left, p * int(node.right.value))]
    if isinstance(node, BinOp) and node.op == "^" and isinstance(node.left, Poch) and \
            isinstance(node.right, Neg) and isinstance(node.right.operand, Num) and \
            node.right.operand.value.denominator == 1 and abs(node.right.operand.value) <= 64:
        return [(node.left, -p * int(node.right.operand.value))]
    return [(node, p)]


def _signed_factors(node: Node) -> tuple[int, list[tuple[Node, int]]]:
    sign = 1
    while isinstance(node, Neg):
        sign = -sign
        node = node.operand
    return sign, _factors(node)


def _add_geometric(acc: list[int], shift: int, coeff: int, num: dict[int, int], c: int,
                   j: int, p: int, modulus: int | None = None) -> None:
    """acc += coeff q^shift num(q) / (1 - c q^j)^p below len(acc), in O(len(acc)/j) per
    numerator term: (1 - c x)^-p = sum_m binomial(m + p - 1, p - 1) c^m x^m (the factors
    reduced modulo ``modulus`` when there is one).

    >>> acc = [0] * 8
    >>> _add_geometric(acc, 1, 2, {0: 1}, -1, 3, 1)     # 2q/(1 + q^3)
    >>> acc
    [0, 2, 0, 0, -2, 0, 0, 2]
    """
    n = len(acc)
    for x, v in num.items():
        start = shift + x
        w = coeff * v
        if start >= n or w == 0:
            continue
        if p == 1 and c == 1:
            acc[start::j] = [a + w for a in acc[start::j]]
        elif p == 1 and c == -1:
            acc[start::2 * j] = [a + w for a in acc[start::2 * j]]
            acc[start + j::2 * j] = [a - w for a in acc[start + j::2 * j]]
        elif c == 0:
            acc[start] += w
        else:
            m, factor = 0, 1       # factor = binomial(m + p - 1, p - 1) c^m
            for e in range(start, n, j):
                acc[e] += w * factor
                m += 1
                factor = factor * c * (m + p - 1) // m
                if modulus is not None:
                    factor %= modulus
    return None


def _is_q_power(node: Node) -> bool:
    return isinstance(node, Q) or (isinstance(node, BinOp) and node.op == "^"
                                   and isinstance(node.left, Q))


def _binomial_parts(s: Series) -> tuple[Fraction | int, int] | None:
    """(c, j) when s is exactly 1 - c q^j with j >= 1."""
    if not s.is_exact or s.offset != 0 or s.start != 0:
        return None
    R = s.ring
    n = R.length(s.poly)
    if n < 2 or n > 1 << 20:
        return None
    if R.coeff(s.poly, 0) != 1:
        return None
    j = n - 1
    if n > 2:
        for i in range(1, j):
            if R.coeff(s.poly, i) != 0:
                return None
    return -R.to_number(R.coeff(s.poly, j)), j


def _times_binomial(acc: Series, a: Series, mono: tuple | None, shift: int, times: int,
                    order: int) -> Series:
    """acc * (1 - a q^shift)^times."""
    if mono is not None:
        c, e = mono
        e = e + shift
        if e.denominator == 1 and e >= 1:
            for _ in range(abs(times)):
                acc = acc.mul_binomial(c, int(e), order) if times > 0 else \
                    acc.div_binomial(c, int(e), order)
            return acc
    factor = Series.constant(1, acc.ring) - a.shift(shift)
    if factor.is_zero() and factor.is_exact:
        if times < 0:
            raise DomainError("a q-Pochhammer symbol in a denominator vanishes")
        return Series.zero(acc.ring)
    for _ in range(abs(times)):
        if times > 0:
            acc = (acc * factor).truncate(order)
        else:
            va = acc.valuation
            acc = (acc * factor.inverse(order=order - (_floor(va) if va is not None else 0))
                   ).truncate(order)
    return acc


def _floor(x: Fraction | int) -> int:
    if isinstance(x, int):
        return x
    return x.numerator // x.denominator


def _ceil(x: Fraction | int) -> int:
    if isinstance(x, int):
        return x
    return -(-x.numerator // x.denominator)


def _rational_power(base: Fraction, e: Fraction) -> Fraction:
    if e.denominator != 1:
        if base == 1:
            return Fraction(1)
        raise UnableError(f"{base}^{e} is not rational; only integer powers of numbers")
    n = e.numerator
    if n < 0 and base == 0:
        raise DomainError("division by zero (0 to a negative power)")
    bits = max(abs(base.numerator).bit_length(), abs(base.denominator).bit_length())
    if bits > 1 and abs(n) * bits > MAX_BITS:
        raise UnableError(f"the number {short_number_text(base)}^{short_number_text(n)} is "
                          f"too large")
    return base ** n


def _scalar_power(c: LaurentPoly, n: int) -> LaurentPoly:
    """c^n for a coefficient in extra variables; negative n only for monomials."""
    if n < 0 and not c.ring.is_unit(c) and c.ring.fractions.is_unit(c):
        c = c.ring.fractions.coerce(c)     # 2z: invertible over QQ
    if n < 0 and not c.ring.is_unit(c):
        raise weight_may_help(DomainError(
            f"{c} is not a monomial, so its negative powers are not Laurent polynomials (give "
            f"the extra variables a weight to expand them)"))
    bits = c.ring.coefficient_bits(c)
    one = 2 if getattr(c.ring, "rational", False) else 1     # the bits of the coefficient 1
    growth = 0 if bits <= one and c.ring.is_unit(c) else max(bits, 1)  # +-z^k stays small
    if abs(n) * growth > MAX_BITS or abs(n) > MAX_LENGTH:
        raise UnableError(f"the power ({c})^{n} is too large")
    return c ** n


def _truncate_abs(s: Series, order: int) -> Series:
    """Keep exponents below ``order`` for a series with a fractional offset."""
    k = order - s.offset  # keep offset + i < order  <=>  i < order - offset
    return s.truncate(_ceil(k))


def evaluate(expr: str | Node, order: int, ring: Ring | None = None,
             weights: dict[str, int] | None = None) -> Series:
    """Parse (if needed) and evaluate an expression modulo q^order over ``ring`` (default:
    ZZ, or Laurent polynomials in the extra variables when there are any).  ``weights``
    maps extra variables z to w >= 0: z stands for z*q^w (see :class:`Evaluator`).

    >>> evaluate("(q;q)_inf^3", 11)
    1 - 3q + 5q^3 - 7q^6 + 9q^10 + O(q^11)
    >>> evaluate("eta(q)", 3)
    q^(1/24) - q^(25/24) - q^(49/24) + O(q^(73/24))
    >>> evaluate("(z*q;q)_inf", 4)
    1 - z*q - z*q^2 + (z^2 - z)*q^3 + O(q^4)
    """
    if isinstance(order, bool) or not isinstance(order, int) or order < 0:
        raise QSeriesError(f"the order must be a non-negative integer, not {order!r}")
    node = parse(expr) if isinstance(expr, str) else expr
    names = extra_variables(node)
    check_weights(weights, names)
    if ring is None:
        ring = laurent_ring(tuple(sorted(names))) if names else ZZ
    return Evaluator(ring, weights=weights).evaluate(node, order)


def check_weights(weights: dict[str, int] | None, names: frozenset[str] | set[str]) -> None:
    """Refuse weights that are not non-negative integers of extra variables in ``names``.

    >>> check_weights({"z": -1}, {"z"})
    Traceback (most recent call last):
    ...
    qseries.errors.QSeriesError: the weight of 'z' must be a non-negative integer, not -1
    """
    for name, w in (weights or {}).items():
        if name not in names:
            raise QSeriesError(f"a weight is given for {name!r}, which is not an extra "
                               f"variable of the expression")
        if isinstance(w, bool) or not isinstance(w, int) or w < 0 or w > MAX_INTEGER:
            raise QSeriesError(f"the weight of {name!r} must be a non-negative integer, "
                               f"not {w!r}")
