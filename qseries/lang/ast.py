"""The syntax tree of the notation: frozen dataclasses.

Positions (0-based character offsets into the source) are kept for error messages and do
not take part in equality, so a printed-and-reparsed tree compares equal to the original.

>>> BinOp("+", Num(Fraction(1)), Q()) == BinOp("+", Num(Fraction(1), pos=7), Q(pos=9))
True
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass, field
from fractions import Fraction


@dataclass(frozen=True)
class Node:
    """Base class of every syntax-tree node."""


@dataclass(frozen=True)
class Num(Node):
    """A rational constant."""

    value: Fraction
    pos: int = field(default=0, compare=False)


@dataclass(frozen=True)
class Q(Node):
    """The series variable q."""

    pos: int = field(default=0, compare=False)


@dataclass(frozen=True)
class Name(Node):
    """A bound variable of an enclosing sum or product."""

    name: str
    pos: int = field(default=0, compare=False)


@dataclass(frozen=True)
class Var(Node):
    """An extra variable (z, a, b, x1, ...): a letter that no sum or product binds.  Its
    value is a series whose coefficients are Laurent polynomials in the extra variables."""

    name: str
    pos: int = field(default=0, compare=False)


@dataclass(frozen=True)
class Neg(Node):
    """Unary minus."""

    operand: Node
    pos: int = field(default=0, compare=False)


@dataclass(frozen=True)
class BinOp(Node):
    """``left op right`` with op one of ``+ - * / ^``."""

    op: str
    left: Node
    right: Node
    pos: int = field(default=0, compare=False)


@dataclass(frozen=True)
class Poch(Node):
    """(a1, ..., ar; base)_length; ``length`` None means infinity."""

    params: tuple[Node, ...]
    base: Node
    length: Node | None
    pos: int = field(default=0, compare=False)


@dataclass(frozen=True)
class BigOp(Node):
    """sum_{var=lower}^{upper} body (kind "sum") or the product (kind "prod");
    ``lower`` None means -infinity, ``upper`` None means +infinity."""

    kind: str
    var: str
    lower: Node | None
    upper: Node | None
    body: Node
    pos: int = field(default=0, compare=False)


@dataclass(frozen=True)
class Call(Node):
    """A named function of the registry, applied to arguments."""

    name: str
    args: tuple[Node, ...]
    pos: int = field(default=0, compare=False)


@dataclass(frozen=True)
class BigO(Node):
    """O(q^e): an unknown remainder of order e."""

    exponent: Node
    pos: int = field(default=0, compare=False)


def sum_spine(node: Node) -> tuple[Node, list[tuple[str, Node]]]:
    """A chain a + b - c + ... as (a, [("+", b), ("-", c), ...]), found without recursion
    (long sums of terms are deep left spines).

    >>> first, rest = sum_spine(BinOp("-", BinOp("+", Num(Fraction(1)), Q()), Q()))
    >>> first, [op for op, _ in rest]
    (Num(value=Fraction(1, 1), pos=0), ['+', '-'])
    """
    spine: list[tuple[str, Node]] = []
    left = node
    while isinstance(left, BinOp) and left.op in "+-":
        spine.append((left.op, left.right))
        left = left.left
    return left, spine[::-1]


@dataclass(frozen=True)
class Dissect(Node):
    """``[q^(m n + r)] body``: the series sum_n [q^(m n + r)]body q^n (a dissection; Atkin's
    U_m is r = 0).  ``m`` is an integer >= 1, ``r`` a rational number in the class of the
    body's exponents; ``var`` is the index letter as written (for printing only).

    >>> Dissect(5, Fraction(4), Q(), "n") == Dissect(5, Fraction(4), Q(pos=3), "k")
    True
    """

    m: int
    r: Fraction
    body: Node
    var: str = field(default="n", compare=False)
    pos: int = field(default=0, compare=False)


def children(node: Node) -> tuple[Node, ...]:
    """The direct sub-nodes of a node.

    >>> children(BinOp("*", Q(), Num(Fraction(2))))
    (Q(pos=0), Num(value=Fraction(2, 1), pos=0))
    """
    if isinstance(node, Neg):
        return (node.operand,)
    if isinstance(node, BinOp):
        return (node.left, node.right)
    if isinstance(node, Poch):
        extra = () if node.length is None else (node.length,)
        return (*node.params, node.base, *extra)
    if isinstance(node, BigOp):
        bounds = tuple(b for b in (node.lower, node.upper) if b is not None)
        return (*bounds, node.body)
    if isinstance(node, Call):
        return node.args
    if isinstance(node, BigO):
        return (node.exponent,)
    if isinstance(node, Dissect):
        return (node.body,)
    return ()


def free_names(node: Node) -> frozenset[str]:
    """Bound-variable names used in ``node`` and not bound inside it.

    >>> from qseries.lang.parser import parse
    >>> sorted(free_names(parse("q^(n k) + sum_{j>=0} q^(j n)", bound={"n", "k"})))
    ['k', 'n']
    """
    if isinstance(node, Name):
        return frozenset([node.name])
    if isinstance(node, BigOp):
        inner = free_names(node.body) - {node.var}
        for b in (node.lower, node.upper):
            if b is not None:
                inner |= free_names(b)
        return inner
    out: set[str] = set()
    stack = list(children(node))      # iterative: long sums of terms are deep left spines
    while stack:
        c = stack.pop()
        if isinstance(c, (Name, BigOp)):
            out |= free_names(c)
        else:
            stack.extend(children(c))
    return frozenset(out)


def mentions_q(node: Node) -> bool:
    """True when the node depends on q or an extra variable (so its value is a series, not
    a number).

    >>> from qseries.lang.parser import parse
    >>> mentions_q(parse("(-1)^k 2/3", bound={"k"})), mentions_q(parse("(q;q)_2"))
    (False, True)
    """
    stack = [node]
    while stack:
        c = stack.pop()
        if isinstance(c, (Q, Var, Poch, Call, BigO, Dissect)):
            return True
        stack.extend([c.body] if isinstance(c, BigOp) else children(c))
    return False


def extra_variables(node: Node) -> frozenset[str]:
    """Names of the extra variables (letters no sum or product binds) in ``node``.

    >>> from qseries.lang.parser import parse
    >>> sorted(extra_variables(parse("sum_{k>=0} z^k a q^k/(q;q)_k")))
    ['a', 'z']
    """
    out: set[str] = set()
    stack = [node]
    while stack:
        c = stack.pop()
        if isinstance(c, Var):
            out.add(c.name)
        stack.extend([c.body] if isinstance(c, BigOp) else children(c))
    return frozenset(out)


def replace_name(node: Node, name: str, by: Node) -> Node:
    """``node`` with every free occurrence of the bound variable ``name`` replaced by the
    tree ``by`` (sums and products that rebind ``name`` are left alone; ``by`` may mention
    ``name`` itself, as in k -> k + 3 or k -> -k).

    >>> from qseries.lang.parser import parse
    >>> from qseries.lang.printer import show
    >>> k = parse("k", bound={"k"})
    >>> show(replace_name(parse("q^k (q;q)_(2k)", bound={"k"}), "k", Neg(k)))
    'q^-k * (q;q)_{2 * -k}'
    """
    if isinstance(node, Name):
        return by if node.name == name else node
    if isinstance(node, BigOp) and node.var == name:
        return node
    changes: dict[str, object] = {}
    for f in dataclasses.fields(node):
        v = getattr(node, f.name)
        if isinstance(v, Node):
            changes[f.name] = replace_name(v, name, by)
        elif isinstance(v, tuple) and v and isinstance(v[0], Node):
            changes[f.name] = tuple(replace_name(x, name, by) for x in v)
    return dataclasses.replace(node, **changes) if changes else node
