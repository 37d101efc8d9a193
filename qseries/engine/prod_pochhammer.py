"""The ``pochhammer-form`` strategy for products: ``prod_{n=lo}^{hi} body`` whose body is a
product of binomials ``(1 - c q^(a n + b))^e`` (c and e free of n, a >= 1, in any spelling:
``1 + q^n``, ``q^n + 1``, ``1/(1 - z q^(5n-1))``, ``(1 - q^(2n))^3``) is rewritten to the
q-Pochhammer symbols ``(c q^(a lo + b); q^a)_(hi - lo + 1)^e`` (``_inf`` for an infinite
range), so that the product chain's fast paths apply to it as to the symbols written out:
Euler's product, Jacobi's triple product for pairs, the exponential of the logarithm, one
inversion for all the denominators (or none, in ``evaluate_parts``).

The reference is the evaluator's walk factor by factor over the range (``factors``).
Precision stays honest: an infinite symbol is known modulo q^order only, as the cut
product is.

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> ev = Evaluator()
>>> [(type(n).__name__, p) for n, p in pochhammer_factors(
...     ev, parse("prod_{n>=1} (1+q^n)/(1-q^(2n-1))^2"), {})]
[('Poch', 1), ('Poch', -2)]
>>> ev.evaluate(parse("prod_{n>=1} (1-q^n)"), 8)
1 - q - q^2 + q^5 + q^7 + O(q^8)
"""

from __future__ import annotations

from fractions import Fraction
from typing import TYPE_CHECKING

from ..errors import QSeriesError
from ..lang.ast import BigO, BigOp, BinOp, Call, Dissect, Neg, Node, Num, Poch, Q
from . import symbolic as sym
from .termination import NoBound
from .terms import signed_factors

if TYPE_CHECKING:
    from .evaluator import Evaluator

#: the strategy's name in ``chooser.PRODUCT_STRATEGIES``
NAME = "pochhammer-form"


def pochhammer_factors(ev: Evaluator, node: BigOp, env: dict[str, int]
                       ) -> list[tuple[Node, int]] | None:
    """The product ``node`` (at the outer variables ``env``) as factors (symbol, power) of
    q-Pochhammer symbols, or None when its body is not of the form above (then the product
    is evaluated factor by factor)."""
    if node.kind != "prod" or node.lower is None:
        return None
    var = node.var
    try:
        lo = ev.integer(node.lower, env, "a lower limit")
        hi = None if node.upper is None else ev.integer(node.upper, env, "an upper limit")
    except QSeriesError:
        return None
    if hi is not None and hi < lo:
        return None                      # the empty product: the walk says 1
    sign, factors = signed_factors(node.body)
    if sign < 0 or not factors:
        return None
    out: list[tuple[Node, int]] = []
    for f, p in factors:
        if not ev.has_q(f) and var not in ev.free(f) and _is_one(ev, f, env):
            continue                     # the 1 of 1/(1 - q^n)
        got = _binomial_power(ev, f, var, env)
        if got is None:
            return None
        coeff, q_free, poly, e = got
        a, b = poly
        s = a * lo + b
        if s < 0 or (s == 0 and p * e < 0):
            return None                  # a first factor 1 - c (or a pole): leave to the walk
        n = None if hi is None else hi - lo + 1
        out.append((_symbol(ev, coeff, q_free, s, a, n), p * e))
    return out


def _is_one(ev: Evaluator, node: Node, env: dict[str, int]) -> bool:
    try:
        return ev.scalar(node, env) == 1
    except QSeriesError:
        return False


def _binomial_power(ev: Evaluator, node: Node, var: str, env: dict[str, int]
                    ) -> tuple[Fraction, tuple[Node, ...], tuple[int, int], int] | None:
    """(c, extra factors of c, (a, b), e) when node is (1 - c q^(a var + b))^e with c free
    of ``var`` (a number times factors in extra variables only), a >= 1 and b integers and e
    an integer free of ``var``; else None."""
    e = 1
    if isinstance(node, BinOp) and node.op == "^":
        if var in ev.free(node.right) or ev.has_q(node.right):
            return None
        try:
            x = ev.scalar(node.right, env)
        except QSeriesError:
            return None
        if x.denominator != 1 or x == 0 or abs(x) > 64:
            return None
        e, node = int(x), node.left
    if not (isinstance(node, BinOp) and node.op in "+-"):
        return None
    op_sign = 1 if node.op == "+" else -1
    for one, mono, mono_sign in ((node.left, node.right, op_sign), (node.right, node.left, 1)):
        if ev.has_q(one) or var in ev.free(one):
            continue
        try:
            if ev.scalar(one, env) != (1 if one is node.left else op_sign):
                return None
        except QSeriesError:
            return None
        got = _monomial(ev, mono, var, env)
        if got is None:
            return None
        c, extra, poly = got
        # 1 + s*m = 1 - c q^E with c = -s*m's coefficient
        return -mono_sign * c, extra, poly, e
    return None


def _monomial(ev: Evaluator, node: Node, var: str, env: dict[str, int]
              ) -> tuple[Fraction, tuple[Node, ...], tuple[int, int]] | None:
    """(c, extra factors, (a, b)) when node is c * extras * q^(a var + b)."""
    c = Fraction(1)
    extra: list[Node] = []
    exponent: Node | None = None
    stack = [node]
    while stack:
        x = stack.pop()
        if isinstance(x, Neg):
            c = -c
            stack.append(x.operand)
        elif isinstance(x, BinOp) and x.op == "*":
            stack.extend((x.left, x.right))
        elif isinstance(x, BinOp) and x.op == "/" and not ev.has_q(x.right) \
                and var not in ev.free(x.right):
            try:
                d = ev.scalar(x.right, env)
            except QSeriesError:
                return None
            if d == 0:
                return None
            c /= d
            stack.append(x.left)
        elif isinstance(x, Q) or (isinstance(x, BinOp) and x.op == "^" and isinstance(x.left, Q)):
            if exponent is not None:
                return None
            exponent = Num(Fraction(1)) if isinstance(x, Q) else x.right
        elif var in ev.free(x) or not _q_free(x):
            return None
        elif not ev.has_q(x):
            try:
                c *= ev.scalar(x, env)
            except QSeriesError:
                return None
        else:
            extra.append(x)              # a factor in extra variables (z, a/b)
    if exponent is None or c == 0:
        return None
    try:
        poly = sym.m_to_uni(ev.bounds.poly_of(exponent, {var: 1}, env), var)
    except (NoBound, QSeriesError):
        return None
    if poly is None or sym.degree(poly) != 1 or any(x.denominator != 1 for x in poly):
        return None
    a, b = int(poly[1]), int(poly[0])
    if a < 1:
        return None
    return c, tuple(extra), (a, b)


def _q_free(node: Node) -> bool:
    """True when node mentions neither q nor a series (numbers and extra variables only)."""
    stack = [node]
    while stack:
        x = stack.pop()
        if isinstance(x, (Q, Poch, Call, BigO, Dissect, BigOp)):
            return False
        if isinstance(x, Neg):
            stack.append(x.operand)
        elif isinstance(x, BinOp):
            stack.extend((x.left, x.right))
    return True


def _symbol(ev: Evaluator, c: Fraction, extra: tuple[Node, ...], s: int, a: int,
            n: int | None) -> Poch:
    """The node (c extras q^s; q^a)_n, one per content for the evaluator's lifetime (its
    caches are keyed by the identity of nodes, which must then not be reused)."""
    key = (c, extra, s, a, n)
    memo = ev._synthetic
    got = memo.get(key)
    if got is None:
        param: Node = BinOp("^", Q(), Num(Fraction(s)))
        for x in extra:
            param = BinOp("*", x, param)
        if c != 1:
            param = BinOp("*", Num(c), param)
        base: Node = Q() if a == 1 else BinOp("^", Q(), Num(Fraction(a)))
        got = Poch((param,), base, None if n is None else Num(Fraction(n)))
        memo[key] = got
    return got

