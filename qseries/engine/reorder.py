"""Nested sums with a dependent upper limit, reordered so that the valuation analysis sees
them.

``sum_{a>=A} sum_{b=B}^{a+c} T`` runs over the pairs A <= a, B <= b <= a + c.  The analysis of
:mod:`.termination` bounds an inner sum through its lower limit only, so a factor that
depends on a - b, such as (q;q)_(a-b), looks as if its subscript could be negative.  When
A <= B - c the same pairs are b >= B, a >= b - c, and the sum is

    sum_{b>=B} sum_{a>=b-c} T

(a chain such as sum_{n1>=n2>=0}, which the analysis handles: with a = b - c + t, what
depends on a - b is a function of t >= 0).  Both orders add the same terms; for formal power
series, in which each coefficient is a finite sum of the terms' coefficients, the order of
summation does not change the value.

>>> from qseries.lang.parser import parse
>>> from qseries.lang.printer import show
>>> show(dependent_upper(parse("sum_{n1>=0} sum_{n2=0}^{n1} q^(n1+n2)/(q;q)_(n1-n2)")))
'sum_{n2>=0} sum_{n1>=n2} q^(n1 + n2) / (q;q)_{n1 - n2}'
"""

from __future__ import annotations

from fractions import Fraction

from ..lang.ast import BigOp, BinOp, Name, Neg, Node, Num, free_names, replace_name
from .reflect import bounded_by_denominators, linear_in


def _inner_of(body: Node) -> tuple[BigOp | None, Node | None]:
    """(S, X) when ``body`` is a sum S or X S (either order), else (None, None)."""
    if isinstance(body, BigOp) and body.kind == "sum":
        return body, None
    if isinstance(body, BinOp) and body.op == "*":
        for one, other in ((body.left, body.right), (body.right, body.left)):
            if isinstance(one, BigOp) and one.kind == "sum":
                return one, other
    return None, None


def symmetric_range(node: BigOp) -> Node | None:
    """``sum_{a>=A} X sum_{b=-a+l}^{a+c} T(b)`` (l <= A and A + c >= -1, so that the range
    runs from <= 0 to >= -1 for every a; X free of b or absent) split at b = 0 into two
    sums with dependent upper limits:
    ``sum_{a>=A} X sum_{b=0}^{a+c} T(b) + sum_{a>=A} X sum_{b=1}^{a-l} T(-b)``, which
    :func:`dependent_upper` then orders as chains; else None.  Papers write such ranges
    ``sum_{j=-n}^{n}`` (Bailey pairs, Bressoud's identities); an inner sum over every
    integer whose denominators (q;q)_(a-j) (q;q)_(a+j) bound it is read as such a range
    (``reflect.bounded_by_denominators``).

    >>> from qseries.lang.parser import parse
    >>> from qseries.lang.printer import show
    >>> show(symmetric_range(parse("sum_{n>=0} q^n sum_{j=-n}^{n} q^(j^2)")))
    'sum_{n>=0} q^n * sum_{j=0}^{n} q^(j^2) + sum_{n>=0} q^n * sum_{j=1}^{n} q^((-j)^2)'
    """
    if node.kind != "sum" or node.upper is not None or not isinstance(node.lower, Num):
        return None
    a = node.var
    inner, outside = _inner_of(node.body)
    if inner is not None and inner.lower is None and inner.upper is None:
        inner = bounded_by_denominators(inner)   # sum_{j=-inf}^{inf} .../((q;q)_(a-j) ...)
    if inner is None or inner.lower is None or inner.upper is None or inner.var == a:
        return None
    low, high = linear_in(inner.lower, a), linear_in(inner.upper, a)
    if low is None or high is None or low[0] != -1 or high[0] != 1 or \
            low[1].denominator != 1 or high[1].denominator != 1 or \
            low[1] > node.lower.value or node.lower.value + high[1] < -1 or \
            (outside is not None and inner.var in free_names(outside)):
        # l <= A: the range reaches down to 0 for every a; A + c >= -1: it reaches up to -1
        # (else for small a the range ends below -1 and the negative half would add terms)
        return None
    b, p = inner.var, inner.pos
    negated = replace_name(inner.body, b, Neg(Name(b, p), p))
    top = BinOp("-", Name(a, p), Num(low[1], p), p) if low[1] else Name(a, p)
    halves = [BigOp("sum", b, Num(Fraction(0), p), inner.upper, inner.body, p),
              BigOp("sum", b, Num(Fraction(1), p), top, negated, p)]
    sums = [BigOp("sum", a, node.lower, None,
                  h if outside is None else BinOp("*", outside, h, node.body.pos), node.pos)
            for h in halves]
    return BinOp("+", sums[0], sums[1], node.pos)


def dependent_upper(node: BigOp) -> Node | None:
    """The reordered sum when ``node`` is ``sum_{a>=A} X sum_{b=B}^{a+c} T`` (X a factor
    free of b, or absent; A, B and c integers), else None.  When A > B - c the pairs are
    those of two pieces: ``sum_{b=B}^{A+c} sum_{a>=A} XT + sum_{b>=A+c+1} sum_{a>=b-c} XT``.

    >>> from qseries.lang.parser import parse
    >>> from qseries.lang.printer import show
    >>> dependent_upper(parse("sum_{n>=0} sum_{k=0}^{5} q^(n+k)")) is None   # not dependent
    True
    >>> show(dependent_upper(parse("sum_{n>=1} sum_{k=0}^{n} q^(n+k)")))
    'sum_{k=0}^{1} sum_{n>=1} q^(n + k) + sum_{k>=0} sum_{n>=k + 2} q^(n + (2 + k))'
    """
    if node.kind != "sum" or node.upper is not None or not isinstance(node.lower, Num):
        return None
    a, body = node.var, node.body
    inner, outside = _inner_of(body)
    if inner is None or inner.upper is None or not isinstance(inner.lower, Num):
        return None
    b = inner.var
    lin = linear_in(inner.upper, a)          # the upper limit a + c
    c = lin[1] if lin is not None and lin[0] == 1 else None
    if c is None or c.denominator != 1 or node.lower.value.denominator != 1 or \
            inner.lower.value.denominator != 1 or b == a:
        return None
    if outside is not None and b in free_names(outside):
        return None                      # moving X inside the sum over b would capture b
    new_body = inner.body if outside is None else BinOp("*", outside, inner.body, body.pos)
    low: Node = Name(b, inner.pos)
    if c:
        low = BinOp("-", low, Num(c, inner.pos), inner.pos)
    big_a = node.lower.value
    if big_a <= inner.lower.value - c:
        return BigOp("sum", b, inner.lower, None,
                     BigOp("sum", a, low, None, new_body, node.pos), inner.pos)
    # A > B - c: for b <= A + c every a >= A is allowed; beyond, a >= b - c, written with
    # b = A + c + 1 + b' (b' >= 0, keeping the name b) so that the chain's limits are
    # polynomials with non-negative coefficients in b', as the valuation analysis needs
    p = inner.pos
    head = BigOp("sum", b, inner.lower, Num(big_a + c, p),
                 BigOp("sum", a, node.lower, None, new_body, node.pos), p)
    start = Num(big_a + c + 1, p)
    shifted = replace_name(new_body, b, BinOp("+", start, Name(b, p), p))
    tail_low = BinOp("+", Name(b, p), Num(big_a + 1, p), p)          # b - c = b' + A + 1
    tail = BigOp("sum", b, Num(Fraction(0), p), None,
                 BigOp("sum", a, tail_low, None, shifted, node.pos), p)
    return BinOp("+", head, tail, p)
