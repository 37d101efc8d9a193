"""Print a syntax tree back in the notation, so that ``parse(show(t)) == t``.

>>> from qseries.lang.parser import parse
>>> show(parse("2 sum_{k>=0} q^(k^2)/(q;q)_k^2 + (q,-q;q^2)_{n+1}", bound={"n"}))
'2 * sum_{k>=0} q^(k^2) / (q;q)_k^2 + (q, -q;q^2)_{n + 1}'
"""

from __future__ import annotations

from fractions import Fraction

from ..errors import typed_argument
from .ast import BigO, BigOp, BinOp, Call, Dissect, Name, Neg, Node, Num, Poch, Q, Var, sum_spine

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
            first, rest = sum_spine(node)
            return " ".join([_fmt(first, 1, True)] +
                            [f"{op} {_fmt(right, 2, True)}" for op, right in rest])
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


def _progression(node: Dissect) -> str:
    """``5n + 4``, ``n``, ``5n - 1/24``: the exponent of an extractor."""
    lin = node.var if node.m == 1 else f"{node.m}{node.var}"
    if node.r > 0:
        lin += f" + {_num(node.r)}"
    elif node.r < 0:
        lin += f" - {_num(-node.r)}"
    return lin


def _extractor(node: Dissect) -> str:
    """``[q^(5n + 4)]``, ``[q^(n)]``, ``[q^(5n - 1/24)]``."""
    return f"[q^({_progression(node)})]"


def show(node: Node) -> str:
    """The text of a syntax tree in the notation the parser reads.

    >>> from qseries.lang.parser import parse
    >>> show(parse("-q^-2 (1-q)^-1"))
    '-q^-2 * (1 - q)^-1'
    """
    typed_argument("node", node, Node, "a syntax tree (from qseries.parse)")
    return _bare(node)


# -- LaTeX ----------------------------------------------------------------------------------
def _tex_name(name: str) -> str:
    base, sep, sub = name.partition("_")
    return f"{base}_{{{sub}}}" if sep else name


def _tex_num(v: Fraction) -> str:
    if v.denominator == 1:
        return str(v.numerator)
    sign = "-" if v < 0 else ""
    return f"{sign}\\frac{{{abs(v.numerator)}}}{{{v.denominator}}}"


def _tex_fmt(node: Node, need: int, tail: bool) -> str:
    text = _tex(node)
    level = _level(node)
    if isinstance(node, Num) and node.value.denominator != 1 and node.value > 0:
        level = 5                       # \frac{a}{b} is an atom
    if isinstance(node, BinOp) and node.op == "/":
        level = 5
    if level < need or (not tail and _takes_tail(node)):
        return f"\\left({text}\\right)"
    return text


def _tex_sub(n: Node | None) -> str:
    return "\\infty" if n is None else "{" + _tex(n) + "}"


def _tex(node: Node) -> str:
    if isinstance(node, Num):
        return _tex_num(node.value)
    if isinstance(node, Q):
        return "q"
    if isinstance(node, (Name, Var)):
        return _tex_name(node.name)
    if isinstance(node, Neg):
        return "-" + _tex_fmt(node.operand, 3, True)
    if isinstance(node, BinOp):
        if node.op in "+-":
            first, rest = sum_spine(node)
            return " ".join([_tex_fmt(first, 1, True)] +
                            [f"{op} {_tex_fmt(right, 2, True)}" for op, right in rest])
        if node.op == "/":
            return f"\\frac{{{_tex(node.left)}}}{{{_tex(node.right)}}}"
        if node.op == "*":
            right = _tex_fmt(node.right, 3, True)
            sep = " \\cdot " if right[:1].isdigit() or right.startswith("-") else " "
            return f"{_tex_fmt(node.left, 2, False)}{sep}{right}"
        return f"{_tex_fmt(node.left, 5, False)}^{{{_tex(node.right)}}}"
    if isinstance(node, Poch):
        params = ", ".join(_tex(p) for p in node.params)
        return f"({params};{_tex(node.base)})_{_tex_sub(node.length)}"
    if isinstance(node, Dissect):
        return f"[q^{{{_progression(node)}}}] {_tex_fmt(node.body, 2, True)}"
    if isinstance(node, BigOp):
        op = "\\sum" if node.kind == "sum" else "\\prod"
        var = _tex_name(node.var)
        lower = "-\\infty" if node.lower is None else _tex(node.lower)
        if node.upper is None and node.lower is not None:
            head = f"{op}_{{{var} \\ge {lower}}}"
        else:
            head = f"{op}_{{{var}={lower}}}^{_tex_sub(node.upper)}"
        return f"{head} {_tex_fmt(node.body, 2, True)}"
    if isinstance(node, Call):
        args = [_tex(a) for a in node.args]
        if node.name == "gaussian":
            return f"\\begin{{bmatrix}} {args[0]} \\\\ {args[1]} \\end{{bmatrix}}_q"
        if node.name == "eta":
            a = node.args[0]
            if isinstance(a, Q):
                return "\\eta(\\tau)"
            if isinstance(a, BinOp) and a.op == "^" and isinstance(a.left, Q) \
                    and isinstance(a.right, Num) and a.right.value.denominator == 1:
                return f"\\eta({a.right.value.numerator}\\tau)"
        if node.name.startswith("theta_"):
            return f"\\theta_{node.name[6:]}({args[0]})"
        return f"\\{node.name}({', '.join(args)})" if node.name == "eta" else \
            f"{node.name}({', '.join(args)})"
    if isinstance(node, BigO):
        return f"O(q^{{{_tex(node.exponent)}}})"
    raise TypeError(f"not a syntax-tree node: {node!r}")


def show_latex(node: Node) -> str:
    r"""The LaTeX of a syntax tree, as a paper prints it; the parser reads it back.

    >>> from qseries.lang.parser import parse
    >>> show_latex(parse("sum_{k>=0} q^(k^2)/(q;q)_k"))
    '\\sum_{k \\ge 0} \\frac{q^{k^{2}}}{(q;q)_{k}}'
    >>> show_latex(parse("(q, q^4;q^5)_inf^-1"))
    '(q, q^{4};q^{5})_\\infty^{-1}'
    """
    typed_argument("node", node, Node, "a syntax tree (from qseries.parse)")
    return _tex(node)
