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

from ..lang.ast import BigOp, BinOp, Name, Node, Num, free_names


def _offset_from(upper: Node, var: str) -> Fraction | None:
    """c when ``upper`` is ``var``, ``var + c`` or ``var - c`` with c a number, else None."""
    if isinstance(upper, Name) and upper.name == var:
        return Fraction(0)
    if isinstance(upper, BinOp) and upper.op in "+-":
        left, right = upper.left, upper.right
        if isinstance(left, Name) and left.name == var and isinstance(right, Num):
            return right.value if upper.op == "+" else -right.value
        if upper.op == "+" and isinstance(right, Name) and right.name == var and \
                isinstance(left, Num):
            return left.value
    return None


def dependent_upper(node: BigOp) -> BigOp | None:
    """The reordered sum when ``node`` is ``sum_{a>=A} X sum_{b=B}^{a+c} T`` (X a factor
    free of b, or absent; A, B and c integers with A <= B - c), else None.

    >>> from qseries.lang.parser import parse
    >>> dependent_upper(parse("sum_{n>=0} sum_{k=0}^{5} q^(n+k)")) is None   # not dependent
    True
    """
    if node.kind != "sum" or node.upper is not None or not isinstance(node.lower, Num):
        return None
    a, body = node.var, node.body
    outside: Node | None = None
    inner = body
    if isinstance(body, BinOp) and body.op == "*":
        for one, other in ((body.left, body.right), (body.right, body.left)):
            if isinstance(one, BigOp):
                inner, outside = one, other
                break
    if not isinstance(inner, BigOp) or inner.kind != "sum" or inner.upper is None or \
            not isinstance(inner.lower, Num):
        return None
    b = inner.var
    c = _offset_from(inner.upper, a)
    if c is None or c.denominator != 1 or node.lower.value.denominator != 1 or \
            inner.lower.value.denominator != 1 or b == a:
        return None
    if node.lower.value > inner.lower.value - c:
        return None                      # a >= max(A, b - c): not one chain
    if outside is not None and b in free_names(outside):
        return None                      # moving X inside the sum over b would capture b
    new_body = inner.body if outside is None else BinOp("*", outside, inner.body, body.pos)
    low: Node = Name(b, inner.pos)
    if c:
        low = BinOp("-", low, Num(c, inner.pos), inner.pos)
    return BigOp("sum", b, inner.lower, None,
                 BigOp("sum", a, low, None, new_body, node.pos), inner.pos)
