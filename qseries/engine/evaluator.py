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

from collections.abc import Iterable, Mapping
from fractions import Fraction
from typing import Any

from ..backend import laurent_budget
from ..errors import DomainError, UnableError
from ..lang.ast import (
    BigO,
    BigOp,
    BinOp,
    Call,
    Dissect,
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
    sum_spine,
)
from ..lang.definitions import Definition
from ..lang.parser import parse
from ..products import FUNCTIONS, monomial_parts
from ..series import MAX_LENGTH, ZZ, LaurentPoly, Ring, Series, ring_for
from ..series.formatting import short_number_text
from . import chains, chooser, prod_pochhammer, ranges, reflect, reorder, sums, triple_pairs
from .progress import PartProgress, PartTracker, tracking
from .termination import TermBounds
from .terms import (
    MAX_INTEGER,
    Parts,
    Value,
    factors_of,
    floor_int,
    int_value,
    label,
    rational_power,
    scalar_power,
    signed_factors,
    truncate_abs,
)

#: the working order may be raised to RETRY_FACTOR * order + RETRY_SLACK to make up for
#: precision lost to negative powers; beyond that the lower precision is reported
RETRY_FACTOR = 4
RETRY_SLACK = 2000
#: most terms all the sums and products of one evaluation may evaluate together
MAX_TOTAL_TERMS = 1_000_000


class Evaluator:
    """Evaluates syntax trees over one coefficient ring; caches subtrees free of bound
    variables, per order.  ``strategies`` names the evaluation strategies it may use (see
    ``engine.chooser``; default all, the references always).  ``progress(text, done,
    total)``, if given, is called as each top-level sum or product of an evaluated
    expression is evaluated (see ``engine.progress``).

    >>> ev = Evaluator(ZZ)
    >>> ev.evaluate(parse("(q;q)_inf"), 6)
    1 - q - q^2 + q^5 + O(q^6)
    """

    def __init__(self, ring: Ring = ZZ, values: dict[str, Any] | None = None,
                 weights: dict[str, int] | None = None,
                 strategies: Iterable[str] | None = None,
                 progress: PartProgress | None = None) -> None:
        self.ring = ring
        #: the value of each extra variable (default: the ring's generator of that name)
        #: and its weight w: the variable z stands for z*q^w, so that with w >= 1 a
        #: coefficient that is a power series in z (such as 1/(1-z)) is expanded in q too
        self.values = dict(values or {})
        self.weights = dict(weights or {})
        #: the strategy names this evaluator may use (``chooser.allowed_strategies``)
        self.allowed = chooser.allowed_strategies(strategies)
        self._cache: dict[tuple, Any] = {}
        self._free: dict[int, tuple[Node, frozenset[str]]] = {}
        self._hasq: dict[int, tuple[Node, bool]] = {}
        self._reorders: dict[int, tuple[BigOp, Node]] = {}
        self.bounds = TermBounds(self)
        self._terms = 0
        #: nodes the engine builds (``prod_pochhammer``), kept alive with the evaluator
        #: because the caches above are keyed by the identity of nodes
        self._synthetic: dict[tuple, Node] = {}
        #: the progress callback, and the parts of the expression being evaluated
        self.progress = progress
        self.parts: PartTracker | None = None

    def evaluate(self, node: Node, order: int, retries: int = 3) -> Series:
        """The value of ``node`` modulo q^order.  Where negative powers cost precision the
        working order is raised and the evaluation repeated (at most ``retries`` times); the
        result's ``precision`` says what is really known."""
        if order > MAX_LENGTH:
            raise UnableError(f"order {order} exceeds the limit {MAX_LENGTH}")
        with laurent_budget(), tracking(self, node):
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
        with laurent_budget(), tracking(self, node):
            self._cache.clear()
            self._terms = 0
            got = self._top_parts(node, order)
            if got is not None:
                num, den = got
                known = num.precision is None or num.precision >= order
                if den is None and known:
                    return (num.truncate(order) if num.offset == 0
                            else truncate_abs(num, order)), None
                low = num.valuation
                if (den is not None and known and self._is_unit(den, order)
                        and (low is None or low >= 0)):
                    return num, den
            return self._evaluate(node, order, 3), None

    def _top_parts(self, node: Node, order: int) -> Parts | None:
        if isinstance(node, Neg):
            got = self._top_parts(node.operand, order)
            return None if got is None else (-got[0], got[1])
        forms = self.product_forms(node, {}) if isinstance(node, BigOp) else None
        if forms is not None or (isinstance(node, BinOp) and node.op in "*/"):
            v = chains.chain_parts(self, forms or factors_of(node), {}, order)
            if isinstance(v, tuple):
                return v
            return (v, None) if isinstance(v, Series) else None
        if isinstance(node, BigOp):
            return self._sum_parts(node, {}, order)
        return None

    def _is_unit(self, s: Series, order: int) -> bool:
        return (s.offset == 0 and s.valuation == 0 and s.ring.is_unit(s.ring._coeff(s.poly, 0))
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
        return result.truncate(order) if result.offset == 0 else truncate_abs(result, order)

    def value(self, node: Node, env: dict[str, int], order: int) -> Value:
        """The value of ``node`` with bound variables ``env``, as a number or a series known
        modulo q^order."""
        if order > MAX_LENGTH:
            raise UnableError(f"this expression needs a working order of {order}, beyond the "
                              f"limit {MAX_LENGTH} (negative powers of q cost precision)")
        if isinstance(node, (Poch, BigOp, Call, Dissect)) and not (self.free(node) & env.keys()):
            key = (id(node), order)
            hit = self._cache.get(key)
            if hit is None:
                hit = self._value(node, env, order)
                self._cache[key] = hit
                if self.parts is not None:
                    self.parts.finished(node)
            return hit
        return self._value(node, env, order)

    def free(self, node: Node) -> frozenset[str]:
        # keyed by id() with the node kept alive and compared: an evaluator used on a
        # tree after another tree was freed must not read the freed nodes' facts
        hit = self._free.get(id(node))
        if hit is None or hit[0] is not node:
            hit = self._free[id(node)] = (node, free_names(node))
        return hit[1]

    def has_q(self, node: Node) -> bool:
        hit = self._hasq.get(id(node))
        if hit is None or hit[0] is not node:
            hit = self._hasq[id(node)] = (node, mentions_q(node))
        return hit[1]

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
                              f"no value over {self.ring.name}", position=node.pos)
        return Series.monomial(w, self.ring, c)

    def scalar(self, node: Node, env: dict[str, int]) -> Fraction:
        """The value of a node that must not involve q (an exponent, a bound, a subscript)."""
        if self.has_q(node):
            names = sorted(extra_variables(node))
            what = "q" if not names else f"the extra variable {names[0]}"
            raise DomainError(f"the expression at column {getattr(node, 'pos', 0) + 1} must be "
                              f"a number here, but it involves {what}",
                              position=getattr(node, "pos", 0))
        v = self.value(node, env, 0)
        assert isinstance(v, Fraction)
        return v

    def integer(self, node: Node, env: dict[str, int], what: str) -> int:
        return int_value(self.scalar(node, env), what)

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
                left, spine = sum_spine(node)
                acc = self.value(left, env, order)
                for op, right in spine:
                    b = self.value(right, env, order)
                    acc = acc + b if op == "+" else acc - b
                    if isinstance(acc, Series):
                        acc = acc.truncate(order)
                return acc
            if node.op in "*/":
                return chains.chain(self, factors_of(node), env, order)
            if self._paired(node.left, env):
                powers = factors_of(node)
                if powers[0][0] is node.left:   # (a, b;q^m)_inf^p, p an integer: a pair
                    return chains.chain(self, powers, env, order)   # takes the triple product
            return self._power(node, env, order)
        if isinstance(node, Poch):
            if self._paired(node, env):
                return chains.chain(self, [(node, 1)], env, order)
            return self._poch(node, env, order)
        if isinstance(node, BigOp):
            if node.kind == "sum":
                return self._sum(node, env, order)
            return self._prod(node, env, order)
        if isinstance(node, Call):
            args = tuple((self._exact_monomial(a, env) or self.value(a, env, order))
                         if self.has_q(a) else self.scalar(a, env) for a in node.args)
            return FUNCTIONS[node.name].build(args, self.ring, order)
        if isinstance(node, Dissect):
            return self._dissect(node, env, order)
        if isinstance(node, BigO):
            e = self.scalar(node.exponent, env)
            if abs(e) > MAX_INTEGER:
                raise UnableError(f"O(q^{short_number_text(e)}) is beyond the limit")
            n = floor_int(e)
            frac = e - n
            if frac == 0:
                return Series.zero(self.ring, n)
            return Series(self.ring, self.ring.zero(), n, frac, n)
        raise TypeError(f"not a syntax-tree node: {node!r}")

    def _dissect(self, node: Dissect, env: dict[str, int], order: int) -> Series:
        """[q^(m n + r)] body modulo q^order: the body once, modulo q^(m order + r), read
        with stride m (``Series.section``); its precision is then ceil((N - r)/m) from the
        body's O(q^N), and the working-order retries make up for a shortfall.

        >>> Evaluator(ZZ).evaluate(parse("[q^(5n+4)] 1/(q;q)_inf"), 4)
        5 + 30q + 135q^2 + 490q^3 + O(q^4)
        """
        if node.m > MAX_LENGTH or abs(node.r) > MAX_INTEGER:
            raise UnableError(f"the extractor at column {node.pos + 1} is beyond the limits",
                              position=node.pos)
        work = max(node.m * order + _ceil_fraction(node.r), 0)
        if work > MAX_LENGTH:
            raise UnableError(f"the extractor at column {node.pos + 1} needs its series to "
                              f"order {work}, beyond the limit {MAX_LENGTH}",
                              position=node.pos)
        body = self._as_series(self.value(node.body, env, work))
        return body.section(node.m, node.r).truncate(order)

    def _power(self, node: BinOp, env: dict[str, int], order: int) -> Value:
        e = self.scalar(node.right, env)
        if not self.has_q(node.left):
            base = self.scalar(node.left, env)
            return rational_power(base, e)
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
                cp = scalar_power(c, n)          # over QQ when c = 2z and n < 0
                return Series.monomial(s * n, cp.ring, cp)
            modulus = getattr(base_s.ring, "p", None)
            if modulus is not None:               # a residue (a random value of z): mod p
                if n < 0 and c % modulus == 0:
                    raise DomainError("division by zero (0 to a negative power)")
                return Series.monomial(s * n, base_s.ring, pow(int(c), n, modulus))
            return Series.monomial(s * n, base_s.ring, rational_power(Fraction(c), e))
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
            known = v.precision
            v = self.value(node, env, work)
            if isinstance(v, Series) and v.is_zero() and v.precision == known:
                break        # an O(q^k) written in the input: a higher order cannot help
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
        if isinstance(node, BinOp) and node.op in "*/" and self.has_q(node.left):
            # c q^a / (d q^b) and c q^a * d q^b, as (a;q)_(-n) = (-q/a)^n ... writes them
            left, right = self._monomial_of(node.left, env), self._monomial_of(node.right, env)
            if left is None or right is None or (node.op == "/" and right[0] == 0):
                return None
            if node.op == "*":
                return c * left[0] * right[0], left[1] + right[1]
            return c * left[0] / right[0], left[1] - right[1]
        if isinstance(node, BinOp) and node.op == "^" and isinstance(node.left, Q):
            e = self.scalar(node.right, env)
            if abs(e) <= MAX_INTEGER:
                return c, e
        if isinstance(node, BinOp) and node.op == "^" and not self.has_q(node.right) \
                and not (self.free(node.right) - env.keys()):
            # (c' q^e)^k with an integer k, such as (-q^42)^2 after a substitution
            inner = self._monomial_of(node.left, env)
            k = self.scalar(node.right, env)
            if inner is not None and k.denominator == 1 and 0 <= k <= 64 \
                    and abs(inner[1] * k) <= MAX_INTEGER:
                return c * inner[0] ** int(k), inner[1] * k
        return None

    def _base_step(self, node: Poch, env: dict[str, int], order: int,
                   signed: bool = False) -> int:
        """t for the base q^t; with ``signed``, -t for a base -q^t (as after q -> -q)."""
        base = self._exact_monomial(node.base, env) or self.value(node.base, env, order)
        mono = monomial_parts(base) if isinstance(base, Series) else None
        if mono is None or mono[1].denominator != 1 or mono[1] < 1 \
                or mono[0] not in ((1, -1) if signed else (1,)):
            raise DomainError(f"the base of the q-Pochhammer symbol at column {node.pos + 1} "
                              f"must be q^t with t a positive integer"
                              + (" (or -q^t)" if signed else ""), position=node.pos)
        return int(mono[1]) * (1 if mono[0] == 1 else -1)

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
            f = chooser.pochhammer_value(a, t, -n, order, self.allowed)
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
        t = self._base_step(node, env, order, signed=True)
        n = None if node.length is None else self.integer(node.length, env,
                                                            "the subscript of (a;q)_n")
        acc: Series | None = None
        for p in node.params:
            a = self._param(p, env, order)
            if t > 0:
                f = chooser.pochhammer_value(a, t, n, order, self.allowed)
            else:
                f = self._signed_poch(a, -t, n, order, node)
            acc = f if acc is None else (acc * f).truncate(order)
        assert acc is not None
        return acc

    def _signed_poch(self, a: Series, t: int, n: int | None, order: int, node: Poch
                     ) -> Series:
        """(a;-q^t)_n = (a;q^(2t))_(ceil(n/2)) (-a q^t;q^(2t))_(floor(n/2)): the factors
        1 - a (-q^t)^k for even and odd k (a base -q^t comes from q -> -q in (a;q)_n).

        >>> Evaluator(ZZ).evaluate(parse("(q;-q)_inf"), 6)
        1 - q + q^2 - 2q^3 + 2q^4 - 3q^5 + O(q^6)
        """
        if n is not None and n < 0:
            raise UnableError(f"(a;-q^t)_n with n < 0 (column {node.pos + 1}) is not "
                              f"supported; write it as 1/(a (-q^t)^n;-q^t)_(-n)",
                              position=node.pos)
        even = None if n is None else (n + 1) // 2
        odd = None if n is None else n // 2
        first = chooser.pochhammer_value(a, 2 * t, even, order, self.allowed)
        second = chooser.pochhammer_value(-a.shift(t), 2 * t, odd, order, self.allowed)
        return (first * second).truncate(order)

    def _paired(self, node: Node, env: dict[str, int]) -> bool:
        """True for (q^a_1, ..., q^a_r;q^m)_inf, r >= 2, when the strategy ``triple-pairs``
        may take it (as a factor of a product it would): the product evaluates it, and all
        of its parameters, paired or not, are taken there, so this does not recurse."""
        if not isinstance(node, Poch) or node.length is not None or len(node.params) < 2 \
                or "triple-pairs" not in self.allowed:
            return False
        return triple_pairs.poch_atoms(self, node, env) is not None

    def _reordered(self, node: BigOp) -> Node:
        """``node``, or the same sum reordered when its inner sum's upper limit depends on
        the outer variable (``reorder.dependent_upper``), or, for a sum from -inf whose
        q-Pochhammer subscripts fall with the index, its two halves with the negative one
        reflected (``reflect.negative_half``); kept alive with the original, as the caches
        key nodes by id()."""
        hit = self._reorders.get(id(node))
        if hit is None or hit[0] is not node:
            new = reorder.dependent_upper(node) or reorder.symmetric_range(node) or \
                reflect.bounded_by_denominators(node) or reflect.negative_half(node) or node
            hit = self._reorders[id(node)] = (node, new)
        return hit[1]

    def _sum(self, node: BigOp, env: dict[str, int], order: int) -> Value:
        try:
            return self._sum_value(node, env, order)
        except DomainError as err:
            raise _placed(err, node) from None

    def _sum_value(self, node: BigOp, env: dict[str, int], order: int) -> Value:
        new = self._reordered(node)
        if not isinstance(new, BigOp):
            return self.value(new, env, order)
        node = new
        if not self.has_q(node.body):
            return ranges.numbers(self, node, env)
        nested = sums.nest_value(self, node, env, order)
        if nested is not None:
            return nested
        ks, cut = ranges.term_range(self, node, env, order, deviation=False)
        return sums.sum_value(self, node, ks, env, order, cut=cut)

    def _count_terms(self, node: BigOp, n: int) -> None:
        self._terms += n
        if self._terms > MAX_TOTAL_TERMS:
            raise UnableError(f"the sums and products need more than {MAX_TOTAL_TERMS} terms "
                              f"together at this order (at {label(node)})")

    def _sum_parts(self, node: BigOp, env: dict[str, int], order: int) -> Parts | None:
        """A sum as numerator and denominator (binary splitting leaves one division undone);
        (value, None) for a sum evaluated otherwise, None for a node that is not a sum."""
        if node.kind != "sum" or not self.has_q(node.body):
            return None
        if order > MAX_LENGTH:
            return None     # value() gives the error
        if sums.chain_shaped(self, node):
            return self.value(node, env, order), None     # a nest: ``chain``, no parts
        closed = not (self.free(node) & env.keys())
        key = ("parts", id(node), order)
        hit = self._cache.get(key) if closed else None
        if hit is None:
            new = self._reordered(node)
            if not isinstance(new, BigOp):
                return self.value(new, env, order), None
            node = new
            ks, cut = ranges.term_range(self, node, env, order, deviation=False)
            try:
                got = sums.sum_value(self, node, ks, env, order, parts=True, cut=cut)
            except DomainError as err:
                raise _placed(err, node) from None
            hit = got if isinstance(got, tuple) else (got, None)
            if closed:
                self._cache[key] = hit
                if self.parts is not None:
                    self.parts.finished(node)
        return hit

    def product_forms(self, node: BigOp, env: dict[str, int]) -> list[tuple[Node, int]] | None:
        """A product over a range as q-Pochhammer symbols (``prod_pochhammer``), or None
        (not a product of binomials in n, or the strategy is not allowed).

        >>> len(Evaluator().product_forms(parse("prod_{n>=0} 1/(1-q^(5n+1))"), {}))
        1
        """
        if node.kind != "prod" or prod_pochhammer.NAME not in self.allowed:
            return None
        return prod_pochhammer.pochhammer_factors(self, node, env)

    def _prod(self, node: BigOp, env: dict[str, int], order: int) -> Value:
        if not self.has_q(node.body):
            return ranges.numbers(self, node, env)
        forms = self.product_forms(node, env)
        if forms is not None:
            return chains.chain(self, forms, env, order)
        ks, cut = ranges.term_range(self, node, env, order, deviation=True)
        self._count_terms(node, len(ks))
        sign, factors = signed_factors(node.body)
        acc = Series.constant(1, self.ring)
        for k in ks:
            acc = chains.apply_factors(self, acc, factors, {**env, node.var: k}, order)
            if sign < 0:
                acc = -acc
        if cut:
            # the factors left out are 1 + O(q^order); times a product of valuation v they
            # leave it known only below q^(order + v), and never exact (for v < 0 the caller
            # raises the working order and tries again)
            v = acc.valuation
            acc = acc.limit_precision(order + min(floor_int(v), 0) if v is not None else order)
        return acc


def _ceil_fraction(x: Fraction) -> int:
    return -((-x.numerator) // x.denominator)


# -- entry points --------------------------------------------------------------------------
def evaluate(expr: str | Node, order: int, ring: Ring | None = None,
             weights: dict[str, int] | None = None,
             definitions: Mapping[str, Definition] | Iterable[str] | None = None,
             progress: PartProgress | None = None) -> Series:
    """Parse (if needed) and evaluate an expression modulo q^order over ``ring`` (default:
    ZZ, or Laurent polynomials in the extra variables when there are any).  ``weights``
    maps extra variables z to w >= 0: z stands for z*q^w (see :class:`Evaluator`).
    ``definitions`` are functions defined in the notation (texts ``"NAME(q) = ..."``) that
    ``expr`` may call.  ``progress(text, done, total)`` is called as each top-level sum or
    product is evaluated (``engine.progress``).

    >>> evaluate("(q;q)_inf^3", 11)
    1 - 3q + 5q^3 - 7q^6 + 9q^10 + O(q^11)
    >>> evaluate("eta(q)", 3)
    q^(1/24) - q^(25/24) - q^(49/24) + O(q^3)
    >>> evaluate("(z*q;q)_inf", 4)
    1 - z*q - z*q^2 + (z^2 - z)*q^3 + O(q^4)
    >>> evaluate("F(-q)", 5, definitions=["F(q) = 1/(q;q)_inf"])
    1 - q + 2q^2 - 3q^3 + 5q^4 + O(q^5)
    >>> _ = evaluate("sum_{n>=0} q^n/(q;q)_n - 1/(q;q)_inf", 9, progress=print)
    sum_{n>=0} q^n / (q;q)_n 1 2
    (q;q)_inf 2 2
    """
    from ..errors import (  # checks at the public surface
        ArgumentTypeError,
        integer_argument,
        typed_argument,
    )

    typed_argument("expr", expr, (str, Node), "a string or a syntax tree from qseries.parse")
    integer_argument("order", order, 0)
    if ring is not None:
        typed_argument("ring", ring, Ring, "a coefficient ring such as qseries.ZZ or GF(p)")
    if progress is not None and not callable(progress):
        raise ArgumentTypeError(f"progress must be a function of (text, done, total), not "
                                f"{type(progress).__name__}")
    node = parse(expr, definitions=definitions) if isinstance(expr, str) else expr
    names = extra_variables(node)
    check_weights(weights, names)
    if ring is None:
        ring = ring_for(sorted(names))
    return Evaluator(ring, weights=weights, progress=progress).evaluate(node, order)


def check_weights(weights: dict[str, int] | None, names: frozenset[str] | set[str]) -> None:
    """Refuse weights that are not non-negative integers of extra variables in ``names``.

    >>> check_weights({"z": -1}, {"z"})  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    qseries.errors.ArgumentError: the weight of 'z' must be an integer between 0 and ..., not -1
    """
    from ..errors import ArgumentError, integer_argument, typed_argument

    if weights is None:
        return
    typed_argument("weights", weights, dict, "a dict from variable names to integers")
    for name, w in weights.items():
        typed_argument("a weight's variable", name, str, "a string (such as 'z')")
        if name not in names:
            raise ArgumentError(f"a weight is given for {name!r}, which is not an extra "
                                f"variable of the expression")
        integer_argument(f"the weight of {name!r}", w, 0, MAX_INTEGER)


def _placed(err: DomainError, node: BigOp) -> DomainError:
    """``err`` raised by a term of the sum ``node`` (by a strategy that evaluates the terms
    itself, without the nodes' positions) with the sum's position, when it has none.

    >>> str(_placed(DomainError("division by zero"), parse("1 + sum_{k=0}^{3} q^k").right))
    'division by zero in a term of sum_{k=...} at column 5'
    """
    if err.position is not None:
        return err
    name = label(node)
    text = str(err) if name in str(err) else f"{err} in a term of {name}"   # named already
    return DomainError(f"{text} at column {node.pos + 1}", weights_may_help=err.weights_may_help,
                       position=node.pos)
