"""The differential tests' own expression trees: their text in qseries' notation
(:func:`text`), their value by the reference arithmetic of :mod:`.series` (:func:`value`,
:func:`reference`), and random generators for them (:func:`gen_tree`, :func:`gen_check`).

Nothing here imports qseries.  The meaning of every node is written out next to it, from the
definitions in the README's notation table: (a;q)_n = prod_{j<n} (1 - a q^j) and, for n < 0,
(a;q)_n = 1/(a q^n;q)_(-n); eta(q^d) = q^(d/24) (q^d;q^d)_inf; O(q^e) is an unknown remainder.

Infinite sums and products are evaluated to a working precision R of the test's choosing by
an elementary bound, not by qseries' valuation analysis: the k-th term
c q^(alpha k^2 + beta k + gamma) / (q;q)_k^p has valuation exactly alpha k^2 + beta k + gamma
(its other factor has constant term 1), which is nondecreasing from the vertex
k = -beta/(2 alpha) on, so once k is past the vertex and the valuation is >= R, no later term
reaches below q^R; the factor 1 - c q^(t n + s) with t >= 1 is 1 + O(q^R) once t n + s >= R.

>>> text(Div(Sum(3, None, 1, 0, 0, p=1), Sub(Mono(1, 9), Mono(1, 10))))
'(sum_{k>=3} q^(k^2)/(q;q)_k)/(q^9 - q^10)'
>>> value(Prod(4, 1, 0), 8)              # prod_{n>=4} (1 - q^n) to O(q^8)
Ref(1 - q^4 - q^5 - q^6 - q^7 + O(q^8))
>>> value(Add(Eta(1), BigO(12)), 40).prec
Fraction(12, 1)
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction
from typing import Protocol

from .series import (
    INF,
    Ref,
    RefUndefined,
    RefUnknown,
    add,
    big_o,
    inverse,
    limit,
    monomial,
    mul,
    power,
    sub,
    truncate,
)

Num = int | Fraction


# -- the tree -------------------------------------------------------------------------------
@dataclass(frozen=True)
class Mono:
    """c q^e (exact)."""
    c: Num
    e: Num


@dataclass(frozen=True)
class Poly:
    """The exact polynomial sum of c q^e over ``terms`` = ((e, c), ...)."""
    terms: tuple[tuple[Num, Num], ...]


@dataclass(frozen=True)
class BigO:
    """O(q^e): an unknown remainder."""
    e: Num


@dataclass(frozen=True)
class Sum:
    """sum over k = lo..hi (hi None: k >= lo) of c q^(alpha k^2 + beta k + gamma) / (q;q)_k^p."""
    lo: int
    hi: int | None
    alpha: Num
    beta: Num
    gamma: Num
    c: Num = 1
    p: int = 0


@dataclass(frozen=True)
class Prod:
    """prod over n >= lo of (1 - c q^(t n + s))^m, with t >= 1."""
    lo: int
    t: int
    s: Num
    c: Num = 1
    m: int = 1


@dataclass(frozen=True)
class Poch:
    """(c q^a; q^t)_n ^ m; n None is inf."""
    c: Num
    a: Num
    t: int
    n: int | None
    m: int = 1


@dataclass(frozen=True)
class Eta:
    """eta(q^d) = q^(d/24) (q^d;q^d)_inf."""
    d: int


@dataclass(frozen=True)
class Add:
    x: object
    y: object


@dataclass(frozen=True)
class Sub:
    x: object
    y: object


@dataclass(frozen=True)
class Mul:
    x: object
    y: object


@dataclass(frozen=True)
class Div:
    x: object
    y: object


@dataclass(frozen=True)
class Pow:
    x: object
    m: int


Node = Mono | Poly | BigO | Sum | Prod | Poch | Eta | Add | Sub | Mul | Div | Pow


# -- text in qseries' notation ----------------------------------------------------------------
# Each node renders with a binding level: 4 an atom that may be the base of ^; 3 a power;
# 2 a product or quotient; 1 a sum or a leading minus; 0 sum_/prod_ (whose body takes the
# rest of its term, so it must be bracketed inside a product).
def _num(x: Num) -> str:
    x = Fraction(x)
    return str(x.numerator) if x.denominator == 1 else f"{x.numerator}/{x.denominator}"


def _qpow(e: Num) -> str:
    e = Fraction(e)
    if e == 1:
        return "q"
    return f"q^{e.numerator}" if e.denominator == 1 else f"q^({e})"


def _mono(c: Num, e: Num) -> tuple[str, int]:
    c, e = Fraction(c), Fraction(e)
    if e == 0:
        if c < 0:
            return _num(c), 1
        return _num(c), 4 if c.denominator == 1 else 2
    if c == 1:
        return _qpow(e), 4 if e == 1 else 3
    if c == -1:
        return "-" + _qpow(e), 1
    if c > 0 and c.denominator == 1:
        return f"{_num(c)}*{_qpow(e)}", 2
    return f"({_num(c)})*{_qpow(e)}", 2


def _linear(pairs: list[tuple[Num, str]]) -> str:
    """Text of sum x*m over (x, m) (m = "" for the constant)."""
    out = ""
    for x, m in pairs:
        x = Fraction(x)
        if x == 0:
            continue
        mag = abs(x)
        if not m:
            t = _num(mag)
        elif mag == 1:
            t = m
        elif mag.denominator == 1:
            t = f"{mag.numerator}*{m}"
        elif mag.numerator == 1:
            t = f"{m}/{mag.denominator}"
        else:
            t = f"{mag.numerator}*{m}/{mag.denominator}"
        if not out:
            out = ("-" if x < 0 else "") + t
        else:
            out += (" - " if x < 0 else " + ") + t
    return out or "0"


def _q_to(exponent_text: str) -> str:
    bare = exponent_text.isidentifier() or exponent_text.isdigit()
    if exponent_text == "1":
        return "q"
    return f"q^{exponent_text}" if bare else f"q^({exponent_text})"


def _power_suffix(m: int) -> str:
    return "" if m == 1 else f"^{m}" if m > 0 else f"^({m})"


def _render(node: Node) -> tuple[str, int]:
    if isinstance(node, Mono):
        return _mono(node.c, node.e)
    if isinstance(node, Poly):
        if not node.terms:
            return "0", 4
        out = ""
        for e, c in node.terms:
            c = Fraction(c)
            if not out:
                t, level = _mono(c, e)
                out = t
            else:
                out += (" - " if c < 0 else " + ") + _mono(abs(c), e)[0]
                level = 1
        return out, level
    if isinstance(node, BigO):
        return f"O({_qpow(node.e)})", 4
    if isinstance(node, Eta):
        return f"eta({_qpow(node.d)})", 4
    if isinstance(node, Poch):
        c, a = Fraction(node.c), Fraction(node.a)
        if a == 0:
            param = _num(c)
        elif c == 1:
            param = _qpow(a)
        elif c == -1:
            param = "-" + _qpow(a)
        else:
            param = f"{_num(c)}*{_qpow(a)}"
        sub_ = "inf" if node.n is None else str(node.n) if node.n >= 0 else f"({node.n})"
        base = f"({param};{_qpow(node.t)})_{sub_}"
        return base + _power_suffix(node.m), 4 if node.m == 1 else 3
    if isinstance(node, Sum):
        exponent = _linear([(node.alpha, "k^2"), (node.beta, "k"), (node.gamma, "")])
        parts = [] if node.c == 1 else [f"({_num(node.c)})"]
        if exponent != "0":
            parts.append(_q_to(exponent))
        body = "*".join(parts) or "1"
        if node.p > 0:
            body += "/(q;q)_k" + ("" if node.p == 1 else f"^{node.p}")
        elif node.p < 0:
            body += "*(q;q)_k" + ("" if node.p == -1 else f"^{-node.p}")
        head = (f"sum_{{k>={node.lo}}}" if node.hi is None
                else f"sum_{{k={node.lo}}}^{{{node.hi}}}")
        return f"{head} {body}", 0
    if isinstance(node, Prod):
        c = Fraction(node.c)
        qn = _q_to(_linear([(node.t, "n"), (node.s, "")]))
        factor = (f"(1 - {qn})" if c == 1 else f"(1 + {qn})" if c == -1
                  else f"(1 - ({_num(c)})*{qn})")
        return f"prod_{{n>={node.lo}}} {factor}{_power_suffix(node.m)}", 0
    if isinstance(node, Pow):
        return f"{_wrap(node.x, 4)}{_power_suffix(node.m)}", 3
    if isinstance(node, Mul):
        return f"{_wrap(node.x, 2)}*{_wrap(node.y, 2)}", 2
    if isinstance(node, Div):
        return f"{_wrap(node.x, 2)}/{_wrap(node.y, 3)}", 2
    if isinstance(node, Add):
        return f"{_render(node.x)[0]} + {_wrap(node.y, 0)}", 1
    if isinstance(node, Sub):
        y, level = _render(node.y)
        return f"{_render(node.x)[0]} - {y if level in (0, 2, 3, 4) else f'({y})'}", 1
    raise TypeError(f"not a node: {node!r}")


def _wrap(node: Node, at_least: int) -> str:
    t, level = _render(node)
    if level == 0 and at_least > 0:
        return f"({t})"
    return t if level >= at_least else f"({t})"


def text(node: Node) -> str:
    """The node in qseries' notation."""
    return _render(node)[0]


# -- value by the reference -----------------------------------------------------------------
def _sum_value(s: Sum, R: int) -> Ref:
    alpha, beta, gamma, c = (Fraction(x) for x in (s.alpha, s.beta, s.gamma, s.c))

    def e(k: int) -> Fraction:
        return alpha * k * k + beta * k + gamma

    if s.p and s.lo < 0:
        raise ValueError("(q;q)_k with k < 0 is not generated")
    if s.hi is None:
        if not (alpha > 0 or (alpha == 0 and beta > 0)):
            raise ValueError("an infinite sum whose exponent does not grow is not generated")
        vertex = -beta / (2 * alpha) if alpha else Fraction(s.lo)
        ks = []
        k = s.lo
        while not (k >= vertex and e(k) >= R):
            ks.append(k)
            k += 1
        skipped = True        # the tail k >= ks[-1] + 1: every term there is O(q^R)
    else:
        ks = list(range(s.lo, s.hi + 1))
        skipped = False
    live = [k for k in ks if e(k) < R]
    skipped = skipped or len(live) < len(ks)
    total = Ref()
    if live and c:
        cap = R - min(e(k) for k in live)     # (q;q)_k^-p is needed modulo q^cap at most
        g = Ref({0: 1})                        # (q;q)_j^-p, from j = 0
        j = 0
        for k in live:
            while j < k:
                j += 1
                if j >= cap:                   # 1 - q^j = 1 + O(q^cap)
                    g = limit(g, cap)
                    continue
                factor = Ref({0: 1, j: -1})
                if s.p > 0:
                    factor = inverse(factor, cap)
                for _ in range(abs(s.p)):
                    g = mul(g, factor, cap)
            term = mul(monomial(e(k), c), truncate(g, R - e(k)), R)
            total = add(total, term)
    return limit(total, R) if skipped else total


def _product(exponents: list[Fraction], c: Fraction, m: int, R: int, tail: bool) -> Ref:
    """prod over x in ``exponents`` of (1 - c q^x)^m; ``tail``: times factors
    1 + O(q^R) (the rest of an infinite product)."""
    if c == 0:
        return limit(Ref({0: 1}), R) if tail else Ref({0: 1})
    if c == 1 and 0 in exponents:          # a factor 1 - 1 = 0
        if m < 0:
            raise RefUndefined("a factor 1 - 1 in a denominator")
        return Ref()                       # exactly 0, whatever the other factors are
    # factors of negative valuation lower the precision of the others: work that much higher
    cap = R + sum(-x for x in exponents if x < 0) * abs(m)
    acc = Ref({0: 1})
    for x in exponents:
        factor = add(Ref({0: 1}), monomial(x, -c))
        if m < 0:
            factor = inverse(factor, cap)
        for _ in range(abs(m)):
            acc = mul(acc, factor, cap)
    if tail:
        acc = mul(acc, Ref({0: 1}, R))
    return acc


def _infinite_exponents(lo: int, t: int, s: Fraction, R: int) -> list[Fraction]:
    if t < 1:
        raise ValueError("t >= 1")
    out = []
    n = lo
    while t * n + s < R:
        out.append(t * n + s)
        n += 1
    return out


def _negative_poch(node: Poch, k: int, R: int) -> Ref:
    """(x;q^t)_n ^ (m k) for n < 0.  By the README, (x;q^t)_n = 1/P with
    P = (x q^(t n); q^t)_(-n) = prod_{i=1}^{-n} (1 - x q^(-t i)); the power is taken as
    P^(-m k), so that a negative power of the symbol is a polynomial even when P = 0 (the
    usual convention 1/(q;q)_n = 0 for n < 0, which qseries adopts)."""
    a, c, t = Fraction(node.a), Fraction(node.c), node.t
    p = _product([a - t * i for i in range(1, -node.n + 1)], c, 1, R, tail=False)
    return power(p, -node.m * k, R)


def _fold(node: Node, k: int, R: int) -> Ref | None:
    """node^k when node is (x;q^t)_n^m with n < 0, possibly under one more power (written
    (x;q^t)_n^m in the text either way); None otherwise."""
    if isinstance(node, Pow) and isinstance(node.x, Poch) and node.x.n is not None \
            and node.x.n < 0 and node.x.m == 1:
        return _negative_poch(node.x, node.m * k, R)
    if isinstance(node, Poch) and node.n is not None and node.n < 0:
        return _negative_poch(node, k, R)
    return None


def value(node: Node, R: int) -> Ref:
    """The node's value, infinite sums and products cut at the working precision R (honestly:
    the result's precision says what is known, and it may be below R after negative powers)."""
    if isinstance(node, Mono):
        return monomial(node.e, node.c)
    if isinstance(node, Poly):
        out = Ref()
        for e, c in node.terms:
            out = add(out, monomial(e, c))
        return out
    if isinstance(node, BigO):
        return big_o(node.e)
    if isinstance(node, Sum):
        return _sum_value(node, R)
    if isinstance(node, Prod):
        xs = _infinite_exponents(node.lo, node.t, Fraction(node.s), R)
        return _product(xs, Fraction(node.c), node.m, R, tail=True)
    if isinstance(node, Eta):
        xs = _infinite_exponents(1, node.d, Fraction(0), R)
        return mul(monomial(Fraction(node.d, 24)), _product(xs, Fraction(1), 1, R, tail=True))
    if isinstance(node, Poch):
        a, c, t = Fraction(node.a), Fraction(node.c), node.t
        if node.n is None:
            base = _product(_infinite_exponents(0, t, a, R), c, 1, R, tail=True)
        elif node.n >= 0:
            base = _product([a + t * j for j in range(node.n)], c, 1, R, tail=False)
        else:
            return _negative_poch(node, 1, R)
        return power(base, node.m, R)
    if isinstance(node, Add):
        return add(value(node.x, R), value(node.y, R))
    if isinstance(node, Sub):
        return sub(value(node.x, R), value(node.y, R))
    if isinstance(node, Mul):
        return mul(value(node.x, R), value(node.y, R), R)
    if isinstance(node, Div):
        x = value(node.x, R)
        folded = _fold(node.y, -1, R)
        if folded is not None:
            return mul(x, folded, R)
        y = value(node.y, R)
        vx = x.val()
        if vx == INF:                  # 0 / y
            if not y.c:
                raise RefUndefined("0/0") if y.exact else RefUnknown("0/O(...)")
            return Ref()
        return mul(x, inverse(y, R - vx), R)
    if isinstance(node, Pow):
        folded = _fold(node.x, node.m, R)
        return folded if folded is not None else power(value(node.x, R), node.m, R)
    raise TypeError(f"not a node: {node!r}")


#: how far above the needed precision the working precision starts
SLACK = 24


def reference(node: Node, need: Num) -> tuple[Ref, int]:
    """(value, working precision R) with the value known at least to q^need when that is
    possible: R is raised while the precision still grows with it.  When the returned
    precision is below ``need``, see :func:`is_intrinsic`."""
    R = math.ceil(need) + SLACK
    a = value(node, R)
    for _ in range(4):
        if a.prec >= need:
            break
        R2 = R + math.ceil(need - a.prec) + SLACK
        b = value(node, R2)
        if b.prec == a.prec:
            break
        R, a = R2, b
    return a, R


def is_intrinsic(node: Node, a: Ref, R: int) -> bool:
    """True when a's precision does not grow with the working precision: it comes from an
    O(q^e) of the input (every precision here is a minimum of R + const and constants)."""
    return a.exact or value(node, R + SLACK).prec == a.prec


# -- generators ---------------------------------------------------------------------------
class Source(Protocol):
    """A source of choices: hypothesis' draw (shrinks towards lo) or random.Random."""

    def integer(self, lo: int, hi: int) -> int: ...


def pick(src: Source, options: list | tuple):
    """An element; the first one is the simplest (hypothesis shrinks towards it)."""
    return options[src.integer(0, len(options) - 1)]


def rarely(src: Source, n: int) -> bool:
    """True with probability 1/n (False when shrunk)."""
    return src.integer(0, n - 1) == n - 1


COEFFICIENTS = (1, -1, 2, -2, 3, Fraction(1, 2), Fraction(-3, 2))
DENOMINATORS = (2, 3, 24)


def gen_exponent(src: Source, lo: int, hi: int, fractional: int = 10) -> Num:
    e = src.integer(lo, hi)
    if rarely(src, fractional):
        d = pick(src, DENOMINATORS)
        return e + Fraction(src.integer(1, d - 1), d)
    return e


def gen_sum(src: Source) -> Sum:
    p = pick(src, (0, 1, 2, -1))
    # alpha = A/2, beta = B/2 with A + B even (then the exponent is an integer + gamma)
    A = src.integer(0, 4)
    B = 2 * src.integer(-3, 3) + (A % 2)
    if A == 0 and B <= 0:
        B = 2 * src.integer(1, 2)
    if A == 0 and rarely(src, 10):
        B = 1                       # beta = 1/2: the terms' exponents mix two offsets
    gamma = gen_exponent(src, -6, 8)
    lo = src.integer(0, 12) if p else src.integer(-3, 12)
    form = src.integer(0, 3)        # 0, 1: infinite; 2: long finite; 3: short finite
    hi = None if form < 2 else lo + (src.integer(257, 700) if form == 2 else src.integer(0, 20))
    return Sum(lo, hi, Fraction(A, 2), Fraction(B, 2), gamma, pick(src, COEFFICIENTS), p)


def gen_prod(src: Source) -> Prod:
    t = src.integer(1, 4)
    lo = src.integer(1, 12) if not rarely(src, 5) else src.integer(-2, 0)
    s = gen_exponent(src, -1, 4) if rarely(src, 3) else 0
    if t * lo + s <= 0 and rarely(src, 2):
        s = 1 - t * lo          # mostly keep every factor's exponent positive
    return Prod(lo, t, s, pick(src, (1, -1, 2, 1)), pick(src, (1, -1, 2)))


def gen_poch(src: Source) -> Poch:
    t = src.integer(1, 4)
    a = gen_exponent(src, 1, 8, fractional=12) if not rarely(src, 6) else src.integer(-2, 0)
    n = None if src.integer(0, 2) else (src.integer(0, 30) if not rarely(src, 4)
                                        else src.integer(-3, -1))
    c = pick(src, (1, -1, 2, -2))
    if n is not None and n < 0 and c == 1 and Fraction(a).denominator == 1 and a > 0 \
            and a % t == 0 and a // t <= -n:
        # (q^a;q^t)_n with a factor 1 - 1 in its denominator: qseries reads its negative
        # powers by the convention 1/(q;q)_n = 0 (n < 0) through any chain of products and
        # quotients, which the reference does only for a power of the symbol itself
        n = -n
    return Poch(c, a, t, n, pick(src, (1, -1, 2, 3, -2)))


def gen_poly_divisor(src: Source) -> Poly:
    """c1 q^v + c2 q^(v+d): positive valuation, like q^9 - q^10."""
    v = src.integer(1, 10)
    d = src.integer(1, 3)
    return Poly(((v, 1), (v + d, pick(src, (-1, 1, -2, 3)))))


def gen_leaf(src: Source) -> Node:
    kind = src.integer(0, 7)
    if kind == 0:
        return Mono(pick(src, COEFFICIENTS), gen_exponent(src, -6, 12))
    if kind in (1, 2):
        return gen_sum(src)
    if kind == 3:
        return gen_prod(src)
    if kind == 4:
        return gen_poch(src)
    if kind == 5:
        return BigO(gen_exponent(src, -2, 35, fractional=4))
    if kind == 6:
        return Eta(src.integer(1, 3))
    return gen_poly_divisor(src)


def gen_tree(src: Source, depth: int = 3) -> Node:
    if depth == 0 or src.integer(0, 2) == 0:
        return gen_leaf(src)
    op = src.integer(0, 5)
    if op == 0:
        return Add(gen_tree(src, depth - 1), gen_tree(src, depth - 1))
    if op == 1:
        return Sub(gen_tree(src, depth - 1), gen_tree(src, depth - 1))
    if op == 2:
        return Mul(gen_tree(src, depth - 1), gen_tree(src, depth - 1))
    if op == 3:
        return Mul(Mono(1, src.integer(-8, -1)), gen_tree(src, depth - 1))     # q^-5 * ...
    if op == 4:
        y = gen_poly_divisor(src) if src.integer(0, 2) else gen_tree(src, depth - 1)
        return Div(gen_tree(src, depth - 1), y)
    return Pow(gen_tree(src, depth - 1), pick(src, (2, -1, 0, 3, -2)))


def expansion(node: Node, order: int) -> Poly | None:
    """The reference's coefficients of ``node`` below min(order, its precision), as an exact
    polynomial (None when the reference cannot evaluate it)."""
    try:
        a, _ = reference(node, order)
    except (RefUndefined, RefUnknown):
        return None
    top = min(a.prec, order)
    return Poly(tuple((e, c) for e, c in sorted(a.c.items()) if e < top))


@dataclass(frozen=True)
class CheckCase:
    left: Node
    right: Node
    order: int
    method: str = "exact"
    #: a pinned case from the issue: a refusal is a failure too
    must_evaluate: bool = False


def gen_check(src: Source) -> CheckCase:
    left = gen_tree(src, 2)
    order = src.integer(1, 30)
    mode = src.integer(0, 3)
    right: Node | None = None
    if mode == 0:               # the reference's own expansion, maybe changed at one exponent
        right = expansion(left, order)
        if right is not None and rarely(src, 2):
            e = gen_exponent(src, -4, order + 2)
            right = Poly(right.terms + ((e, pick(src, (1, -1, 2))),))
    elif mode == 1:
        right = left            # the same text: must agree
    elif mode == 2:
        right = gen_tree(src, 2)
    if right is None:
        right = Poly(())
    return CheckCase(left, right, order, pick(src, ("exact", "modular")))


@dataclass(frozen=True)
class EvalCase:
    node: Node
    order: int
    #: a pinned case from the issue: a refusal is a failure too
    must_evaluate: bool = False


def gen_eval(src: Source) -> EvalCase:
    return EvalCase(gen_tree(src), src.integer(1, 30))
