"""Sums over every integer whose terms carry q-Pochhammer symbols with subscripts linear in
the index, split at 0 and the negative half reflected, so that no subscript is negative.

``sum_{k=-inf}^{U} T(k)`` is ``sum_{k=0}^{U} T(k) + sum_{k>=max(1,-U)} T(-k)``.  In T(-k) a
symbol (a;q^t)_L whose subscript L decreases with k is rewritten with K = -L by

    (a;q^t)_(-K) = (-q^t/a)^K q^(t K(K-1)/2) / (q^t/a;q^t)_K,

which holds for every integer K (G. Gasper and M. Rahman, Basic Hypergeometric Series,
2nd ed., Cambridge 2004, eq. (1.2.28); it follows from (a;q)_(-K) = 1/(a q^(-K);q)_K by taking
-a q^(-j) out of each factor).  The new subscript K grows with k, so the valuation analysis
of :mod:`.termination` sees the growth q^(t K(K-1)/2) that makes such sums converge, as in
Ramanujan's 1psi1 summation.  Each half adds the same terms as before; for formal power series
the order of summation does not change the value.

>>> from qseries.lang.parser import parse
>>> from qseries.lang.printer import show
>>> show(negative_half(parse("sum_{n=-inf}^{inf} (-q;q)_n/(-q^3;q)_n q^n")))
'sum_{n>=0} (-q;q)_n / (-q^3;q)_n * q^n + sum_{n>=1} q^(2 * n) * (-q^-2;q)_n * q^-n / (-1;q)_n'
"""

from __future__ import annotations

from collections.abc import Callable
from fractions import Fraction

from ..lang.ast import BigOp, BinOp, Name, Neg, Node, Num, Poch, Q, free_names, replace_name

Linear = tuple[Fraction, Fraction]


def linear_in(node: Node, var: str) -> Linear | None:
    """(s, c) when ``node`` is s*var + c with numbers s, c (built from numbers, ``var``, +, -,
    unary minus, products with a number and division by a number), else None.

    >>> from qseries.lang.parser import parse
    >>> linear_in(parse("2(n+1) - 5", bound={"n"}), "n")
    (Fraction(2, 1), Fraction(-3, 1))
    >>> linear_in(parse("n^2", bound={"n"}), "n") is None
    True
    """
    if isinstance(node, Num):
        return Fraction(0), node.value
    if isinstance(node, Name):
        return (Fraction(1), Fraction(0)) if node.name == var else None
    if isinstance(node, Neg):
        inner = linear_in(node.operand, var)
        return None if inner is None else (-inner[0], -inner[1])
    if not isinstance(node, BinOp):
        return None
    left, right = linear_in(node.left, var), linear_in(node.right, var)
    if left is None or right is None:
        return None
    if node.op == "+":
        return left[0] + right[0], left[1] + right[1]
    if node.op == "-":
        return left[0] - right[0], left[1] - right[1]
    if node.op == "*" and (left[0] == 0 or right[0] == 0):
        return left[0] * right[1] + right[0] * left[1], left[1] * right[1]
    if node.op == "/" and right[0] == 0 and right[1] != 0:
        return left[0] / right[1], left[1] / right[1]
    return None


def _base_exponent(base: Node) -> int | None:
    """t when ``base`` is written q or q^t with t a positive integer."""
    if isinstance(base, Q):
        return 1
    if isinstance(base, BinOp) and base.op == "^" and isinstance(base.left, Q) and \
            isinstance(base.right, Num) and base.right.value.denominator == 1 and \
            base.right.value >= 1:
        return int(base.right.value)
    return None


def monomial(node: Node) -> tuple[Fraction, Fraction] | None:
    """(c, v) when ``node`` is written c q^v with numbers c != 0 and v (products, quotients
    and integer powers of numbers, q and q^v), else None.

    >>> from qseries.lang.parser import parse
    >>> monomial(parse("-q^3/2")), monomial(parse("q/(-q^3)")), monomial(parse("1 - q"))
    ((Fraction(-1, 2), Fraction(3, 1)), (Fraction(-1, 1), Fraction(-2, 1)), None)
    """
    if isinstance(node, Num):
        return (node.value, Fraction(0)) if node.value else None
    if isinstance(node, Q):
        return Fraction(1), Fraction(1)
    if isinstance(node, Neg):
        inner = monomial(node.operand)
        return None if inner is None else (-inner[0], inner[1])
    if not isinstance(node, BinOp):
        return None
    if node.op == "^":
        inner = monomial(node.left)
        if inner is None or not isinstance(node.right, Num) or \
                node.right.value.denominator != 1 or abs(node.right.value) > 64:
            if isinstance(node.left, Q) and isinstance(node.right, (Num, Neg)):
                e = linear_in(node.right, "")
                if e is not None and e[0] == 0:
                    return Fraction(1), e[1]
            return None
        e = int(node.right.value)
        return inner[0] ** e, inner[1] * e
    if node.op in "*/":
        left, right = monomial(node.left), monomial(node.right)
        if left is None or right is None:
            return None
        if node.op == "*":
            return left[0] * right[0], left[1] + right[1]
        return left[0] / right[0], left[1] - right[1]
    return None


def _num(x: Fraction, pos: int) -> Node:
    return Num(x, pos) if x >= 0 else Neg(Num(-x, pos), pos)


def _factors(node: Node, sign: int, out: list[tuple[Node, int]]) -> None:
    """``node`` as a product of factors to the powers +-1 (Poch^e as e copies)."""
    if isinstance(node, BinOp) and node.op in "*/":
        _factors(node.left, sign, out)
        _factors(node.right, sign if node.op == "*" else -sign, out)
    elif isinstance(node, Neg):
        out.append((Num(Fraction(-1), node.pos), 1))
        _factors(node.operand, sign, out)
    elif isinstance(node, BinOp) and node.op == "^" and isinstance(node.left, Poch) and \
            isinstance(node.right, Num) and node.right.value.denominator == 1 and \
            0 < abs(node.right.value) <= 64:
        e = int(node.right.value)
        out.extend([(node.left, sign if e > 0 else -sign)] * abs(e))
    else:
        out.append((node, sign))


def _product(factors: list[Node], pos: int) -> Node:
    out = factors[0] if factors else Num(Fraction(1), pos)
    for f in factors[1:]:
        out = BinOp("*", out, f, pos)
    return out


def reflected_body(body: Node, var: str) -> tuple[Node, int | None] | None:
    """T(-var) for the term T(var) of a sum, with each q-Pochhammer factor whose subscript
    then falls with ``var`` reflected, and the powers of q that reflection brings (quadratic
    in ``var``) gathered into one factor q^(A var^2 + B var + C), so that their growth in the
    numerator and the denominator cancels before anything is evaluated; None when there is
    no such factor at the top level of the term.  With it, the last value of ``var`` whose
    term can be nonzero, when a reflected denominator (b;q^t)_(-K) with b = q^(jt), j >= 1,
    makes every further term 0 (the factor 1 - q^0 of (q^(t-jt);q^t)_K), else None.

    >>> from qseries.lang.parser import parse
    >>> from qseries.lang.printer import show
    >>> body, last = reflected_body(parse("(-q;q)_n/(-q^3;q)_n", bound={"n"}), "n")
    >>> show(body), last
    ('q^(2 * n) * (-q^-2;q)_n / (-1;q)_n', None)
    >>> reflected_body(parse("1/(q^4;q)_(n+1)", bound={"n"}), "n")[1]    # (q^-3;q)_(n-1)
    4
    """
    factors: list[tuple[Node, int]] = []
    _factors(replace_name(body, var, Neg(Name(var, body.pos), body.pos)), 1, factors)
    top: list[Node] = []
    bottom: list[Node] = []
    a2, a1, a0 = Fraction(0), Fraction(0), Fraction(0)     # the exponent of q, in var
    found = False
    stop: int | None = None
    poles = False            # whether a denominator may vanish for some index
    for node, s in factors:
        lin = linear_in(node.length, var) if isinstance(node, Poch) and \
            node.length is not None else None
        t = _base_exponent(node.base) if isinstance(node, Poch) else None
        if lin is None or lin[0] >= 0 or t is None or not isinstance(node, Poch):
            (top if s > 0 else bottom).append(node)
            poles = poles or (s < 0 and var in free_names(node))   # may vanish somewhere
            continue
        found = True
        p = node.pos
        alpha, beta = -lin[0], -lin[1]            # K = alpha var + beta
        k: Node = _linear_node(alpha, beta, var, p)
        flipped = []
        for a in node.params:
            # (a;q^t)_(-K) = (-q^t/a)^K q^(t K(K-1)/2) / (q^t/a;q^t)_K
            mono = monomial(a)
            if mono is not None:
                c, v = mono
                if s > 0 and c == 1 and t - v <= 0 and (t - v) % t == 0:
                    poles = True     # 1/(q^(t-v);q^t)_K: the term is infinite from there
                if s < 0 and c == 1 and t - v <= 0 and (t - v) % t == 0:
                    # the factor 1 - q^0 of (q^(t-v);q^t)_K once K > (v-t)/t: from there
                    # on the terms are 0 (the negative half is finite)
                    first_zero = ((v - t) / t + 1 - beta) / alpha     # K >= (v-t)/t + 1
                    last = -((-first_zero.numerator) // first_zero.denominator) - 1
                    stop = last if stop is None else min(stop, last)
                flipped.append(_q_power_node(t - v, 1 / c, p))
                if -1 / c != 1:
                    unit = BinOp("^", _num(-1 / c, p), k, p)
                    (top if s > 0 else bottom).append(unit)
                lin_coeff = t - v
            else:
                flipped.append(BinOp("/", node.base, a, p))
                (top if s > 0 else bottom).append(
                    BinOp("^", BinOp("/", Neg(node.base, p), a, p), k, p))
                lin_coeff = Fraction(0)
            # s * (lin_coeff K + t K (K - 1) / 2), K = alpha var + beta
            half = Fraction(t, 2)
            a2 += s * half * alpha * alpha
            a1 += s * (lin_coeff * alpha + half * (2 * alpha * beta - alpha))
            a0 += s * (lin_coeff * beta + half * (beta * beta - beta))
        (bottom if s > 0 else top).append(Poch(tuple(flipped), node.base, k, p))
    if not found:
        return None
    pos = body.pos
    exponent = _quadratic_node(a2, a1, a0, var, pos)
    if exponent is not None:
        top.insert(0, BinOp("^", Q(pos), exponent, pos))
    num = _product(top, pos)
    if poles:
        stop = None          # 0 times an infinite factor is no term: never cut the range there
    return (num if not bottom else BinOp("/", num, _product(bottom, pos), pos)), stop


def _q_power_node(e: Fraction, c: Fraction, pos: int) -> Node:
    """c q^e as a node."""
    power: Node = Q(pos) if e == 1 else BinOp("^", Q(pos), _num(e, pos), pos)
    if e == 0:
        power = Num(Fraction(1), pos)
    if c == 1:
        return power
    if c == -1:
        return Neg(power, pos)
    return BinOp("*", _num(c, pos), power, pos) if e else _num(c, pos)


def _linear_node(alpha: Fraction, beta: Fraction, var: str, pos: int) -> Node:
    return _quadratic_node(Fraction(0), alpha, beta, var, pos) or Num(Fraction(0), pos)


def _quadratic_node(a2: Fraction, a1: Fraction, a0: Fraction, var: str,
                    pos: int) -> Node | None:
    """a2 var^2 + a1 var + a0 as a node, None when it is 0."""
    terms: list[tuple[Fraction, Node | None]] = [
        (a2, BinOp("^", Name(var, pos), Num(Fraction(2), pos), pos)),
        (a1, Name(var, pos)), (a0, None)]
    out: Node | None = None
    for c, x in terms:
        if c == 0:
            continue
        mag = abs(c)
        piece: Node = Num(mag, pos) if x is None else \
            (x if mag == 1 else BinOp("*", Num(mag, pos), x, pos))
        if out is None:
            out = piece if c > 0 else Neg(piece, pos)
        else:
            out = BinOp("+" if c > 0 else "-", out, piece, pos)
    return out


def negative_half(node: BigOp) -> Node | None:
    """For a sum from -inf (to an integer or +inf) whose terms carry a q-Pochhammer symbol
    with a subscript that decreases without bound as the index goes to -inf: the sum of its
    part k >= 0 and of its part k <= -1 written over k >= 1 with those symbols reflected
    (see the module's docstring); else None.

    >>> from qseries.lang.parser import parse
    >>> negative_half(parse("sum_{n=-inf}^{inf} q^(n^2)")) is None    # nothing to reflect
    True
    """
    if node.kind != "sum" or node.lower is not None:
        return None
    top: Fraction | None = None
    if node.upper is not None:
        upper = linear_in(node.upper, "")
        if upper is None or upper[1].denominator != 1:
            return None
        top = upper[1]
    got = reflected_body(node.body, node.var)
    if got is None:
        return None
    body, last = got
    p = node.pos
    first = Fraction(1) if top is None else max(Fraction(1), -top)
    negative: Node = BigOp("sum", node.var, Num(first, p),
                           None if last is None else Num(Fraction(last), p), body, p)
    if last is not None and last < first:
        negative = Num(Fraction(0), p)
    if top is not None and top < 0:
        return negative
    upper = None if top is None else Num(top, p)
    return BinOp("+", BigOp("sum", node.var, Num(Fraction(0), p), upper, node.body, p),
                 negative, p)


def _index_plus(node: Node, var: str) -> tuple[int, Node | None] | None:
    """(s, R) when ``node`` is s*var + R with s = +-1 and R free of ``var`` (None for 0),
    however the sum is written (j + n + 1, n + 1 - j, -j + 3, ...)."""
    parts: list[tuple[int, Node]] = []          # the summands, with their signs

    def walk(x: Node, sign: int) -> None:
        if isinstance(x, BinOp) and x.op in "+-":
            walk(x.left, sign)
            walk(x.right, sign if x.op == "+" else -sign)
        elif isinstance(x, Neg):
            walk(x.operand, -sign)
        else:
            parts.append((sign, x))

    walk(node, 1)
    at_var = [sg for sg, x in parts if isinstance(x, Name) and x.name == var]
    rest = [(sg, x) for sg, x in parts if not (isinstance(x, Name) and x.name == var)]
    if len(at_var) != 1 or any(var in free_names(x) for _, x in rest):
        return None
    out: Node | None = None
    for sg, x in rest:
        if out is None:
            out = x if sg > 0 else Neg(x, x.pos)
        else:
            out = BinOp("+" if sg > 0 else "-", out, x, x.pos)
    return at_var[0], out


def bounded_by_denominators(node: BigOp) -> BigOp | None:
    """A sum over every integer j whose term has denominators (q^t;q^t)_(R + j) and
    (q^t;q^t)_(R' - j) as the same sum from -R to R': 1/(q^t;q^t)_L is 0 for L < 0 (then
    (q^t;q^t)_L = 1/(q^(t(1+L));q^t)_(-L) has the factor 1 - q^0), so no other term counts;
    else None.  Bailey pairs are written so: sum_j alpha_j/((q;q)_(n-j) (q;q)_(n+j)).

    >>> from qseries.lang.parser import parse
    >>> from qseries.lang.printer import show
    >>> show(bounded_by_denominators(parse("sum_{j=-inf}^{inf} q^(j^2)/((q;q)_(5-j) (q;q)_(5+j))")))
    'sum_{j=-5}^{5} q^(j^2) / ((q;q)_{5 - j} * (q;q)_{5 + j})'
    """
    if node.kind != "sum" or node.lower is not None or node.upper is not None:
        return None
    var, p = node.var, node.pos
    factors: list[tuple[Node, int]] = []
    _factors(node.body, 1, factors)
    lows: list[Node] = []
    highs: list[Node] = []
    for f, s in factors:
        if s > 0:
            if isinstance(f, Poch) and f.length is not None and var in free_names(f.length):
                return None     # it may be infinite outside the range: 0 times it is no term
            continue
        if not isinstance(f, Poch) or f.length is None or len(f.params) != 1 or \
                f.params[0] != f.base or _base_exponent(f.base) is None:
            continue
        got = _index_plus(f.length, var)
        if got is None:
            continue
        sign, rest = got
        zero: Node = Num(Fraction(0), p)
        if sign > 0:                           # R + j >= 0: j >= -R
            lows.append(zero if rest is None else Neg(rest, p))
        else:                                  # R - j >= 0: j <= R
            highs.append(zero if rest is None else rest)
    if not lows or not highs:
        return None
    low, high = _tightest(lows, max), _tightest(highs, min)
    return BigOp("sum", var, low, high, node.body, p)


def _tightest(bounds: list[Node], pick: Callable[..., Fraction]) -> Node:
    """The tightest of several limits when they are all numbers, else the first (every one
    of them is a valid limit: the terms beyond each are 0)."""
    values = [linear_in(b, "") for b in bounds]
    if all(v is not None for v in values):
        return Num(pick(v[1] for v in values if v is not None), bounds[0].pos)
    return bounds[0]
