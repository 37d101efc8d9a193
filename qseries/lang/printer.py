"""Print a syntax tree back in the notation, so that ``parse(show(t)) == t``.

>>> from qseries.lang.parser import parse
>>> show(parse("2 sum_{k>=0} q^(k^2)/(q;q)_k^2 + (q,-q;q^2)_{n+1}", bound={"n"}))
'2 * sum_{k>=0} q^(k^2) / (q;q)_k^2 + (q, -q;q^2)_{n + 1}'
"""

from __future__ import annotations

from fractions import Fraction

from ..errors import typed_argument
from .ast import BigO, BigOp, BinOp, Call, Dissect, Name, Neg, Node, Num, Poch, Q, Var

# precedence levels: 1 sums, 2 products, 3 signed, 4 powers, 5 atoms
_LEVEL = {"+": 1, "-": 1, "*": 2, "/": 2, "^": 4}


def _level(node: Node) -> int:
    if isinstance(node, BinOp):
        return _LEVEL[node.op]
    if isinstance(node, Neg):
        return 3
    if isinstance(node, (BigOp, Dissect)):
        return 3
    if isinstance(node, Num) and (node.value.denominator != 1 or node.value < 0):
        return 0  # printed as a quotient: always parenthesise
    return 5


def _takes_tail(node: Node) -> bool:
    """Whether the printed node ends in a bare sum or product that would swallow what follows."""
    if isinstance(node, (BigOp, Dissect)):
        return True
    if isinstance(node, Neg):
        return _takes_tail(node.operand)
    if isinstance(node, BinOp) and node.op in "*/":
        return _takes_tail(node.right)
    return False


def _wrap(s: str) -> str:
    return f"({s})"


def _fmt(node: Node, need: int, tail: bool) -> str:
    """Text of node where the context requires precedence >= need; ``tail`` tells whether a
    trailing bare sum may swallow the rest of the term here."""
    text = _bare(node)
    if _level(node) < need or (not tail and _takes_tail(node)):
        return _wrap(text)
    return text


def _num(v: Fraction) -> str:
    return str(v.numerator) if v.denominator == 1 else f"{v.numerator}/{v.denominator}"


def _subscript(n: Node | None) -> str:
    if n is None:
        return "inf"
    if isinstance(n, Num) and n.value.denominator == 1 and n.value >= 0:
        return str(n.value.numerator)
    if isinstance(n, Name):
        return n.name
    return "{" + _bare(n) + "}"


def _bare(node: Node) -> str:
    if isinstance(node, Num):
        return _num(node.value)
    if isinstance(node, Q):
        return "q"
    if isinstance(node, (Name, Var)):
        return node.name
    if isinstance(node, Neg):
        return "-" + _fmt(node.operand, 3, True)
    if isinstance(node, BinOp):
        if node.op in "+-":
            spine: list[tuple[str, Node]] = []     # iterative over long sums of terms
            left: Node = node
            while isinstance(left, BinOp) and left.op in "+-":
                spine.append((left.op, left.right))
                left = left.left
            parts = [_fmt(left, 1, True)]
            parts += [f"{op} {_fmt(right, 2, True)}" for op, right in reversed(spine)]
            return " ".join(parts)
        if node.op in "*/":
            return f"{_fmt(node.left, 2, False)} {node.op} {_fmt(node.right, 3, True)}"
        right = node.right
        if isinstance(right, Neg) and _level(right.operand) >= 5:
            exp = "-" + _bare(right.operand)
        else:
            exp = _fmt(right, 5, False)
        return f"{_fmt(node.left, 5, False)}^{exp}"
    if isinstance(node, Poch):
        params = ", ".join(_bare(p) for p in node.params)
        return f"({params};{_bare(node.base)})_{_subscript(node.length)}"
    if isinstance(node, BigOp):
        lower = "-inf" if node.lower is None else _bare(node.lower)
        if node.upper is None and node.lower is not None:
            head = f"{node.kind}_{{{node.var}>={lower}}}"
        else:
            upper = "inf" if node.upper is None else _bare(node.upper)
            head = f"{node.kind}_{{{node.var}={lower}}}^{{{upper}}}"
        return f"{head} {_fmt(node.body, 2, True)}"
    if isinstance(node, Dissect):
        return f"{_extractor(node)} {_fmt(node.body, 2, True)}"
    if isinstance(node, Call):
        return f"{node.name}({', '.join(_bare(a) for a in node.args)})"
    if isinstance(node, BigO):
        if isinstance(node.exponent, Num) and node.exponent.value == 1:
            return "O(q)"
        return f"O(q^{_fmt(node.exponent, 4, False)})"
    raise TypeError(f"not a syntax-tree node: {node!r}")


def _extractor(node: Dissect) -> str:
    """``[q^(5n + 4)]``, ``[q^(n)]``, ``[q^(5n - 1/24)]``."""
    lin = node.var if node.m == 1 else f"{node.m}{node.var}"
    if node.r > 0:
        lin += f" + {_num(node.r)}"
    elif node.r < 0:
        lin += f" - {_num(-node.r)}"
    return f"[q^({lin})]"


def show(node: Node) -> str:
    """The text of a syntax tree in the notation the parser reads.

    >>> from qseries.lang.parser import parse
    >>> show(parse("-q^-2 (1-q)^-1"))
    '-q^-2 * (1 - q)^-1'
    """
    typed_argument("node", node, Node, "a syntax tree (from qseries.parse)")
    return _bare(node)
