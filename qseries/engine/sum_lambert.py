"""The ``lambert`` strategy for sums: terms that are sums of pieces
w q^s num(q) / (1 - c q^j)^p with a sparse numerator (Lambert-type series, signs included:
``(-q)^n``, ``(-1)^n``, ``1/(1 + q^(an+b))^k``, ``n^j`` weights, differences of such
fractions) are added into one list of Python ints in O(N/j) each, over rings with integer
coefficients (ZZ, GF(p)); a term of another shape is computed densely.

The shape of the term is read once (``compile_term``): exponents and weights that are
polynomials in the variable, powers (-1)^E and c^E, numbers; each term is then a few
integer operations before its slices are added, so a sum of N terms costs O(N log N) in
all, the coefficient of q^m being in effect a sum over the divisors of m (a divisor sieve).

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> ev = Evaluator(strategies=["lambert"])
>>> ev.evaluate(parse("sum_{n>=1} q^n/(1-q^n)"), 8)      # the number of divisors
q + 2q^2 + 2q^3 + 3q^4 + 2q^5 + 4q^6 + 2q^7 + O(q^8)
>>> ev.evaluate(parse("sum_{n>=1} q^n/(1+(-q)^n)"), 8)
q + 2q^2 + 2q^3 + q^4 + 2q^5 + 4q^6 + 2q^7 + O(q^8)
"""

from __future__ import annotations

from collections.abc import Callable
from fractions import Fraction
from typing import TYPE_CHECKING

from ..errors import QSeriesError
from ..lang.ast import BinOp, Neg, Node, Q
from ..series import ZZ, Series
from . import chains
from . import symbolic as sym
from .termination import NoBound

if TYPE_CHECKING:
    from .evaluator import Evaluator
    from .sums import SumPlan

Number = int | Fraction
#: a piece w * num(q) / (1 - c q^j)^p: (w, {exponent: coefficient}, (c, j, p) or None)
Piece = tuple[Number, dict[int, Number], "tuple[Number, int, int] | None"]
#: most pieces of one term, and most monomials of a piece's numerator
MAX_PIECES = 64


class Unfit(Exception):
    """This term (at this value of the variable) is not a sum of sparse pieces."""


def sum_lambert(ev: Evaluator, plan: SumPlan) -> Series:
    """The moving part of the sum modulo q^target (no stepping factors in the plan)."""
    from .sums import scalar_factor
    node, env, var, target = plan.node, plan.env, plan.node.var, plan.target
    total = Series.zero(ev.ring, target)
    sparse: list[int] | None = None
    term = compile_term(ev, plan.scalars + plan.dense, var, env)
    modulus = ev.ring.modulus
    for k, shift in zip(plan.ks, plan.shifts, strict=True):
        if term is not None and shift.denominator == 1:
            try:
                pieces = ring_pieces(ev, term(k), plan.sign, int(shift))
            except Unfit:
                pieces = None
            if pieces is not None:
                if sparse is None:
                    sparse = [0] * target
                for w, num, c, j, p in pieces:
                    add_geometric(sparse, 0, w, num, c, j, p, modulus)
                continue
        env_k = {**env, var: k}
        c = scalar_factor(ev, node, plan.scalars, env_k, plan.sign)
        if c == 0:
            continue
        # as in the stepping strategy: at least to q^1, else the term loses its valuation
        need = max(target - (-(-shift.numerator // shift.denominator)), 1)
        acc = chains.apply_factors(ev, Series.constant(1, ev.ring), plan.dense, env_k, need)
        term_k = (acc * c).shift(shift) if shift else acc * c
        total = (total + term_k).truncate(target)
    if sparse is not None:
        total = total + Series(ev.ring, ev.ring.poly_from_ints(sparse), 0, 0, target)
    return total


def ring_pieces(ev: Evaluator, pieces: list[Piece], sign: int, shift: int
                ) -> list[tuple[int, dict[int, int], int, int, int]]:
    """The pieces times sign q^shift with every number an int of the ring:
    (weight, numerator, c, j, p); Unfit when a number is not one (a fraction over ZZ) or a
    numerator has a negative exponent."""
    out = []
    for w, num, den in pieces:
        c, j, p = den if den is not None else (0, 1, 1)
        wi = _ring_int(ev, w * sign)
        ci = _ring_int(ev, c)
        nums = {}
        for x, v in num.items():
            if x + shift < 0:
                raise Unfit
            nums[x + shift] = _ring_int(ev, v)
        out.append((wi, nums, ci, j, p))
    return out


def _ring_int(ev: Evaluator, x: Number) -> int:
    got = ring_int(ev, x)
    if got is None:
        raise Unfit
    return got


# -- reading the shape of a term once --------------------------------------------------
Scalar = Callable[[int], Number]
Term = Callable[[int], list[Piece]]


def compile_term(ev: Evaluator, factors: list[tuple[Node, int]], var: str,
                 env: dict[str, int]) -> Term | None:
    """A function of the variable's value k giving the term (without its q-power shift
    and sign) as pieces; None when the factors are not of the shape (then every term is
    computed densely).

    >>> from qseries.lang import parse
    >>> from qseries.engine import Evaluator
    >>> f = compile_term(Evaluator(), [(parse("n/(1+(-q)^n)", bound={"n"}), 1)], "n", {})
    >>> f(3)
    [(3, {0: 1}, (1, 3, 1))]
    """
    try:
        parts = [_factor(ev, node, p, var, env) for node, p in factors]
    except (Unfit, NoBound, QSeriesError):
        return None

    if not parts:
        return lambda k: [(1, {0: 1}, None)]
    first, rest = parts[0], parts[1:]

    def term(k: int) -> list[Piece]:
        acc = first(k)
        for part in rest:
            acc = _times(acc, part(k))
        return acc
    return term


def _factor(ev: Evaluator, node: Node, p: int, var: str, env: dict[str, int]) -> Term:
    """node^p; a power b^e of a binomial to a negative total power as one denominator
    (1 - c q^j)^(-p e), not the inverse of b^e expanded."""
    if isinstance(node, BinOp) and node.op == "^" and not ev.has_q(node.right) \
            and not isinstance(node.left, Q):
        base = _series(ev, node.left, var, env)
        e = _scalar(ev, node.right, var, env)

        return lambda k: _raise(base(k), p * _int(e(k)))
    return _power(_series(ev, node, var, env), p)


def _power(f: Term, p: int) -> Term:
    if p == 1:
        return f
    return lambda k: _raise(f(k), p)


def _raise(b: list[Piece], x: int) -> list[Piece]:
    """b^x: a monomial in one step, a denominator for x < 0, else by multiplication."""
    if x < 0:
        return _inverse(b, -x)
    if x == 0:
        return [(1, {0: 1}, None)]
    if len(b) == 1 and b[0][2] is None and len(b[0][1]) == 1:
        (w, num, _), = b           # a monomial: (c q^a)^x in one step
        (a, c), = num.items()
        return [(w ** x if isinstance(w, int) else _small(Fraction(w) ** x),
                 {a * x: c ** x if isinstance(c, int) else _small(Fraction(c) ** x)}, None)]
    if x > 8:
        raise Unfit
    acc = b
    for _ in range(x - 1):
        acc = _times(acc, b)
    return acc


def _scalar(ev: Evaluator, node: Node, var: str, env: dict[str, int]) -> Scalar:
    """A number-valued node as a fast function of k."""
    if var not in ev.free(node):
        v = _small(ev.scalar(node, env))
        return lambda k: v
    try:
        poly = sym.m_to_uni(ev.bounds.poly_of(node, {var: 1}, env), var)
    except (NoBound, QSeriesError):
        poly = None
    if poly is not None:
        if all(c.denominator == 1 for c in poly):
            coeffs = [int(c) for c in reversed(poly)]

            def horner(k: int) -> int:
                acc = 0
                for c in coeffs:
                    acc = acc * k + c
                return acc
            return horner
        return lambda k: _small(sym.peval(poly, k))
    if isinstance(node, Neg):
        inner = _scalar(ev, node.operand, var, env)
        return lambda k: -inner(k)
    if isinstance(node, BinOp) and node.op == "^" and var not in ev.free(node.left):
        base = _small(ev.scalar(node.left, env))
        e = _scalar(ev, node.right, var, env)
        if base == -1:
            return lambda k: -1 if e(k) % 2 else 1
        if base in (0, 1):
            return lambda k: ev.scalar(node, {**env, var: k})
        return lambda k: _small(Fraction(base) ** e(k)) if isinstance(e(k), int) else \
            ev.scalar(node, {**env, var: k})
    if isinstance(node, BinOp) and node.op in "*/":
        left = _scalar(ev, node.left, var, env)
        right = _scalar(ev, node.right, var, env)
        if node.op == "*":
            return lambda k: left(k) * right(k)
        return lambda k: _div(left(k), right(k))
    return lambda k: ev.scalar(node, {**env, var: k})


def _series(ev: Evaluator, node: Node, var: str, env: dict[str, int]) -> Term:
    """A node as a function of k giving pieces; Unfit (at once) for other shapes."""
    if not ev.has_q(node):
        s = _scalar(ev, node, var, env)
        return lambda k: [(s(k), {0: 1}, None)]
    if isinstance(node, Q):
        return lambda k: [(1, {1: 1}, None)]
    if isinstance(node, Neg):
        inner = _series(ev, node.operand, var, env)
        return lambda k: [(-w, num, den) for w, num, den in inner(k)]
    if isinstance(node, BinOp) and node.op in "+-":
        left = _series(ev, node.left, var, env)
        right = _series(ev, node.right, var, env)
        if node.op == "+":
            return lambda k: _add(left(k), right(k))
        return lambda k: _add(left(k), [(-w, num, den) for w, num, den in right(k)])
    if isinstance(node, BinOp) and node.op == "*":
        left = _series(ev, node.left, var, env)
        right = _series(ev, node.right, var, env)
        return lambda k: _times(left(k), right(k))
    if isinstance(node, BinOp) and node.op == "/":
        left = _series(ev, node.left, var, env)
        right = _factor(ev, node.right, -1, var, env)
        return lambda k: _times(left(k), right(k))
    if isinstance(node, BinOp) and node.op == "^" and not ev.has_q(node.right):
        e = _scalar(ev, node.right, var, env)
        if isinstance(node.left, Q):
            return lambda k: [(1, {_int(e(k)): 1}, None)]
        base = _series(ev, node.left, var, env)
        return lambda k: _raise(base(k), _int(e(k)))
    raise Unfit


def _times(a: list[Piece], b: list[Piece]) -> list[Piece]:
    if len(a) == 1 and a[0][2] is None and len(a[0][1]) == 1 and 0 in a[0][1]:
        w = a[0][0] * a[0][1][0]           # a number times b
        return [(w * wb, nb, db) for wb, nb, db in b]
    if len(b) == 1 and b[0][2] is None and len(b[0][1]) == 1 and 0 in b[0][1]:
        w = b[0][0] * b[0][1][0]
        return [(w * wa, na, da) for wa, na, da in a]
    out: list[Piece] = []
    for wa, na, da in a:
        for wb, nb, db in b:
            if da is None:
                den = db
            elif db is None:
                den = da
            elif da[0] == db[0] and da[1] == db[1]:
                den = (da[0], da[1], da[2] + db[2])
            else:
                raise Unfit
            if len(na) == 1 and len(nb) == 1:
                (xa, va), = na.items()
                (xb, vb), = nb.items()
                num = {xa + xb: va * vb}
            else:
                num = {}
                for xa, va in na.items():
                    for xb, vb in nb.items():
                        num[xa + xb] = num.get(xa + xb, 0) + va * vb
                num = {x: v for x, v in num.items() if v}
                if len(num) > MAX_PIECES:
                    raise Unfit
            out.append((wa * wb, num, den))
    return _limit(out)


def _inverse(b: list[Piece], p: int) -> list[Piece]:
    """1/b^p for b one piece with a numerator of one or two monomials and no
    denominator: c q^e gives a monomial, a q^e0 + b q^e1 (e0 < e1) gives
    q^-e0/a (1 - c q^j)^-1 with c = -b/a, j = e1 - e0."""
    if len(b) != 1 or b[0][2] is not None:
        raise Unfit
    w, num, _ = b[0]
    if w == 0:
        raise Unfit
    if len(num) == 1:
        (e, c), = num.items()
        return [(_div(1, (w * c) ** p), {-e * p: 1}, None)]
    if len(num) != 2:
        raise Unfit
    (e0, a), (e1, bb) = sorted(num.items())
    return [(_div(1, (w * a) ** p), {-e0 * p: 1}, (_div(-bb, a), e1 - e0, p))]


def _add(a: list[Piece], b: list[Piece]) -> list[Piece]:
    """a + b, the pieces without a denominator gathered into one polynomial piece."""
    poly: dict[int, Number] = {}
    out: list[Piece] = []
    for w, num, den in a + b:
        if den is not None:
            out.append((w, num, den))
            continue
        for x, v in num.items():
            poly[x] = poly.get(x, 0) + w * v
    poly = {x: v for x, v in poly.items() if v}
    if poly or not out:
        out.append((1, poly, None))
    return _limit(out)


def _limit(pieces: list[Piece]) -> list[Piece]:
    if len(pieces) > MAX_PIECES:
        raise Unfit
    return pieces


def _int(x: Number) -> int:
    if isinstance(x, int):
        return x
    if x.denominator != 1:
        raise Unfit
    return x.numerator


def _small(x: Number) -> Number:
    """An integral Fraction as an int (ints keep the inner loop free of Fractions)."""
    if isinstance(x, Fraction) and x.denominator == 1:
        return x.numerator
    return x


def _div(a: Number, b: Number) -> Number:
    if b == 0:
        raise Unfit
    if isinstance(a, int) and isinstance(b, int) and a % b == 0:
        return a // b
    return _small(Fraction(a) / b)


def ring_int(ev: Evaluator, x: Fraction | int) -> int | None:
    """x as a Python int of a ring with int coefficients (None: not representable)."""
    if isinstance(x, int):
        return x
    if x.denominator == 1:
        return x.numerator
    if ev.ring is ZZ:
        return None
    try:
        return int(ev.ring.coerce(x))
    except QSeriesError:
        return None


def add_geometric(acc: list[int], shift: int, coeff: int, num: dict[int, int], c: int,
                   j: int, p: int, modulus: int | None = None) -> None:
    """acc += coeff q^shift num(q) / (1 - c q^j)^p below len(acc), in O(len(acc)/j) per
    numerator term: (1 - c x)^-p = sum_m binomial(m + p - 1, p - 1) c^m x^m (the factors
    reduced modulo ``modulus`` when there is one).

    >>> acc = [0] * 8
    >>> add_geometric(acc, 1, 2, {0: 1}, -1, 3, 1)     # 2q/(1 + q^3)
    >>> acc
    [0, 2, 0, 0, -2, 0, 0, 2]
    >>> acc = [0] * 6
    >>> add_geometric(acc, 0, 1, {0: 1}, -1, 1, 2, modulus=7)   # 1/(1 + q)^2 mod 7
    >>> [a % 7 for a in acc]
    [1, 5, 3, 3, 5, 1]
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
            # binomial(m + p - 1, p - 1) exactly (the division by m is exact only there)
            # times c^m, reduced modulo ``modulus`` when there is one
            m, binom, power = 0, 1, 1
            for e in range(start, n, j):
                acc[e] += w * binom * power
                m += 1
                binom = binom * (m + p - 1) // m
                power = power * c if modulus is None else power * c % modulus
    return None
