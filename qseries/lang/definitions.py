"""Functions defined in the notation: ``G(q) = 1/((q;q^5)_inf (q^4;q^5)_inf)``.

A definition is parsed by the same grammar as any expression; a call ``G(-q^2)`` is replaced,
when it is parsed, by the body with each parameter replaced by the argument's tree (the
parameter ``q`` stands for q itself, so ``G(q^2)`` is G with q -> q^2).  Variables that the
body's sums bind are renamed where an argument uses the same name.  Definitions may use each
other, in any order, but not in a cycle; nothing is ever run as code.

>>> from qseries.lang.printer import show
>>> defs = parse_definitions(["G(q) = 1/(q;q^5)_inf", "F(q) = G(q) G(q^2)"])
>>> show(defs["F"].body)
'1 / (q;q^5)_inf * (1 / (q^2;q^(2 * 5))_inf)'
"""

from __future__ import annotations

import dataclasses
from collections.abc import Callable, Iterable, Mapping
from dataclasses import dataclass
from fractions import Fraction

from ..errors import ArgumentTypeError, ParseError
from .ast import (
    BigOp,
    BinOp,
    Name,
    Node,
    Num,
    Q,
    Var,
    children,
    extra_variables,
    free_names,
    mentions_q,
)
from .tokens import Token, tokenize

#: most definitions in one set (each may expand into the others)
MAX_DEFINITIONS = 200
#: most nodes of the tree one call expands into (definitions that call each other twice
#: per level, or arguments used several times, would otherwise grow exponentially)
MAX_EXPANSION = 20_000


@dataclass(frozen=True)
class Definition:
    """``name(params) = body``: ``params`` are ``"q"`` or extra-variable names."""

    name: str
    params: tuple[str, ...]
    body: Node
    text: str


def split_head(text: str) -> tuple[str, tuple[str, ...], int, list[Token]]:
    """The name, the parameters and the position of the body of ``name(p1, ...) = body``.

    >>> split_head("G(q) = 1/(q;q)_inf")[:3]
    ('G', ('q',), 7)
    """
    from .parser import is_extra_variable  # the parser imports this module

    toks = tokenize(text)
    if len(toks) > 2 and toks[0].kind == "name" and toks[1].text == "_":
        sub = toks[3].text if toks[2].text == "{" and len(toks) > 3 else toks[2].text
        if toks[0].text == "theta":
            raise ParseError(f"'theta_{sub}' is already a name of the notation; choose another "
                             f"name", text, toks[0].pos)
        raise ParseError(f"a defined name carries no subscript: write {toks[0].text}{sub}(q) = "
                         f"... and call it as {toks[0].text}{sub}(q)", text, toks[1].pos)
    if len(toks) < 5 or toks[0].kind != "name" or toks[1].text != "(":
        raise ParseError("a definition reads NAME(q) = EXPRESSION, e.g. "
                         "G(q) = 1/((q;q^5)_inf (q^4;q^5)_inf)", text, toks[0].pos)
    name = toks[0].text
    params: list[str] = []
    i = 2
    while True:
        t = toks[i]
        if t.kind != "name" or not (t.text == "q" or is_extra_variable(t.text)):
            raise ParseError(f"a parameter of {name} must be q or a letter (optionally with "
                             f"digits)", text, t.pos)
        if t.text in params:
            raise ParseError(f"the parameter {t.text!r} appears twice", text, t.pos)
        params.append(t.text)
        i += 1
        if toks[i].text == ",":
            i += 1
            continue
        if toks[i].text != ")":
            raise ParseError(f"expected ',' or ')' in the parameters of {name}", text,
                             toks[i].pos)
        break
    if toks[i + 1].text != "=":
        raise ParseError(f"expected '=' after {name}({', '.join(params)})", text,
                         toks[i + 1].pos)
    return name, tuple(params), toks[i + 2].pos, toks


def substitute(defn: Definition, args: tuple[Node, ...], pos: int) -> Node:
    """The body of ``defn`` with its parameters replaced by ``args`` (trees), every node at
    ``pos`` (the call's position, for error messages).

    >>> from qseries.lang.parser import parse
    >>> from qseries.lang.printer import show
    >>> d = parse_definitions(["P(x) = sum_{n>=0} x^n"])["P"]
    >>> show(substitute(d, (parse("q^n", bound={"n"}),), 0))
    'sum_{n1>=0} q^(n * n1)'
    """
    if len(args) != len(defn.params):
        raise ValueError(f"{defn.name} takes {len(defn.params)} argument(s)")
    taken: set[str] = set()
    for a in args:
        taken |= free_names(a) | extra_variables(a)
    values = dict(zip(defn.params, args, strict=True))

    def walk(node: Node, renamed: dict[str, str]) -> Node:
        if isinstance(node, Q):
            return values["q"] if "q" in values else Q(pos)
        if isinstance(node, Var) and node.name in values:
            return values[node.name]
        if isinstance(node, BinOp) and node.op == "^" and _is_param(node.left, values):
            power = _q_power_of(values[_param_name(node.left)])
            if power is not None:
                # (q^a)^e as q^(a e), so that a sum over e still sees a power of q
                e = walk(node.right, renamed)
                if isinstance(power, Num) and power.value == 1:
                    return BinOp("^", Q(pos), e, pos)
                return BinOp("^", Q(pos), BinOp("*", power, e, pos), pos)
        if isinstance(node, Name):
            return Name(renamed.get(node.name, node.name), pos)
        if isinstance(node, BigOp):
            var = node.var
            inner = dict(renamed)
            if var in taken:
                k = 1
                while f"{var}{k}" in taken or f"{var}{k}" in inner.values():
                    k += 1
                inner[var] = f"{var}{k}"
            lower = None if node.lower is None else walk(node.lower, renamed)
            upper = None if node.upper is None else walk(node.upper, renamed)
            return BigOp(node.kind, inner.get(var, var), lower, upper,
                         walk(node.body, inner), pos)
        if not children(node):
            return dataclasses.replace(node, pos=pos)
        changes: dict[str, object] = {"pos": pos}
        for f in dataclasses.fields(node):
            v = getattr(node, f.name)
            if isinstance(v, Node):
                changes[f.name] = walk(v, renamed)
            elif isinstance(v, tuple) and v and isinstance(v[0], Node):
                changes[f.name] = tuple(walk(x, renamed) for x in v)
        return dataclasses.replace(node, **changes)

    result = walk(defn.body, {})
    if _larger_than(result, MAX_EXPANSION):
        raise ParseError(f"{defn.name} expands into more than {MAX_EXPANSION} terms of the "
                         f"notation (definitions that call each other several times, or "
                         f"nested calls); simplify the definitions", defn.text, 0)
    return result


def _larger_than(node: Node, limit: int) -> bool:
    """Whether the tree (shared subtrees counted each time) has more than ``limit`` nodes;
    stops counting there, so the work is at most ``limit`` steps.

    >>> from qseries.lang.parser import parse
    >>> _larger_than(parse("q + q^2"), 3), _larger_than(parse("q + q^2"), 10)
    (True, False)
    """
    count = 0
    stack = [node]
    while stack:
        count += 1
        if count > limit:
            return True
        stack.extend(children(stack.pop()))
    return False


def _is_param(node: Node, values: Mapping[str, Node]) -> bool:
    return (isinstance(node, Q) and "q" in values) or (isinstance(node, Var)
                                                       and node.name in values)


def _param_name(node: Node) -> str:
    return "q" if isinstance(node, Q) else node.name  # type: ignore[attr-defined]


def _q_power_of(node: Node) -> Node | None:
    """a when ``node`` is q (a = 1) or q^a with a free of q and extra variables."""
    if isinstance(node, Q):
        return Num(Fraction(1))
    if isinstance(node, BinOp) and node.op == "^" and isinstance(node.left, Q) \
            and not mentions_q(node.right):
        return node.right
    return None


def _reserved_by_the_notation(name: str) -> bool:
    from ..products import FUNCTIONS
    return name in FUNCTIONS or name in ("theta", "tau")


def parse_definitions(texts: Iterable[str],
                      reserved: Callable[[str], bool] = _reserved_by_the_notation
                      ) -> dict[str, Definition]:
    """Parse definitions ``NAME(params) = body``; a body may call any of them (and the
    registry's functions), in any order, without a cycle.  ``reserved(name)`` refuses names
    taken by the notation.

    >>> parse_definitions(["H(q) = q G(q)", "G(q) = 1/(1-q)"])["H"].params
    ('q',)
    >>> parse_definitions(["A(q) = B(q)", "B(q) = A(q^2)"])
    Traceback (most recent call last):
    ...
    qseries.errors.ParseError: the definitions call each other in a cycle: A -> B -> A at column 8
      A(q) = B(q)
             ^
    """
    if isinstance(texts, (str, bytes)):
        raise ArgumentTypeError("definitions must be a list of texts such as "
                                "'G(q) = 1/(q;q)_inf', not one string")
    texts = list(texts)
    if len(texts) > MAX_DEFINITIONS:
        raise ParseError(f"more than {MAX_DEFINITIONS} definitions", "", 0)
    heads: dict[str, tuple[tuple[str, ...], int, str]] = {}
    for text in texts:
        if not isinstance(text, str):
            raise ArgumentTypeError(f"a definition must be a string, not "
                                    f"{type(text).__name__}")
        name, params, body_pos, toks = split_head(text)
        if reserved(name) or name in ("q", "sum", "prod", "inf", "O"):
            raise ParseError(f"{name!r} is already a name of the notation; choose another "
                             f"name", text, toks[0].pos)
        if name in heads:
            raise ParseError(f"{name} is defined twice", text, toks[0].pos)
        heads[name] = (params, body_pos, text)
    done: dict[str, Definition] = {}
    stack: list[str] = []

    def resolve(name: str) -> Definition:
        from .parser import parse_body  # the parser imports this module
        if name in done:
            return done[name]
        params, body_pos, text = heads[name]
        if name in stack:
            cycle = " -> ".join([*stack[stack.index(name):], name])
            first = heads[stack[stack.index(name)]]
            raise ParseError(f"the definitions call each other in a cycle: {cycle}",
                             first[2], first[1])
        stack.append(name)
        try:
            body = parse_body(text, body_pos, params, _Lookup(heads, resolve))
        finally:
            stack.pop()
        done[name] = Definition(name, params, body, text)
        return done[name]

    for name in heads:
        resolve(name)
    return done


class _Lookup(Mapping[str, Definition]):
    """The definitions a body may call, parsed on first use (so a cycle is found)."""

    def __init__(self, heads: Mapping[str, object],
                 resolve: Callable[[str], Definition]) -> None:
        self._heads = heads
        self._resolve = resolve

    def __getitem__(self, name: str) -> Definition:
        if name not in self._heads:
            raise KeyError(name)
        return self._resolve(name)

    def __iter__(self):  # type: ignore[no-untyped-def]
        return iter(self._heads)

    def __len__(self) -> int:
        return len(self._heads)

    def __contains__(self, name: object) -> bool:
        return name in self._heads

    def arity(self, name: str) -> int:
        return len(self._heads[name][0])  # type: ignore[index]
