"""A hand-written recursive-descent parser for the notation of papers, in ASCII.

Grammar (informally; juxtaposition is multiplication)::

    expr    := term (("+" | "-") term)*
    term    := signed (("*" | "/")? factor)*      -- a sum/prod factor takes the rest of the term
    signed  := ("-" | "+") signed | power
    power   := atom (("^" | "**") signed)?       -- right associative
    atom    := number | "q" | name | "inf" | "(" expr ")" | "{" expr "}"
             | "(" expr ("," expr)* ";" expr ")" "_" subscript     -- q-Pochhammer symbol
             | "(" expr ")" "_" subscript                            -- (a)_n = (a;q)_n
             | ("sum" | "prod") "_" "{" name (">=" expr | "=" bound) "}" ("^" upper)? term
             | function "(" expr ("," expr)* ")" | "O" "(" expr ")"
    subscript := "inf" | "∞" | number | name | "(" expr ")" | "{" expr "}"

No text is ever evaluated as code: the parser builds a tree of :mod:`qseries.lang.ast`
nodes, and every error names the position with a caret.

>>> from qseries.lang.printer import show
>>> show(parse("q^(k(3k-1)/2)", bound={"k"}))
'q^(k * (3 * k - 1) / 2)'
>>> parse("2 )")
Traceback (most recent call last):
...
qseries.errors.ParseError: unexpected ')' at column 3
  2 )
    ^
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass
from fractions import Fraction

from ..errors import ArgumentTypeError, ParseError, typed_argument
from ..products import FUNCTIONS
from .ast import BigO, BigOp, BinOp, Call, Name, Neg, Node, Num, Poch, Q, Var

#: longest accepted input, in characters
MAX_TEXT = 100_000
#: deepest accepted nesting of parentheses, operators and sums
MAX_DEPTH = 100
#: most digits in one integer literal
MAX_DIGITS = 2_000

KEYWORDS = {"q", "sum", "prod", "inf", "O"}
#: one line per construction of the notation; ``qseries notation`` and the README show it
NOTATION_FORMS = [
    ("2q^3, q^-2, q^(1/24), q^(k(3k-1)/2)", "numbers, q and its powers; ^ or ** for powers"),
    ("(a;q)_n  (a;q^2)_{2k+1}  (q)_n", "q-Pochhammer symbol; (a)_n means (a;q)_n"),
    ("(a;q)_inf  (a;q)_∞", "infinite q-Pochhammer product"),
    ("(a,b,c;q)_inf", "the product (a;q)_inf (b;q)_inf (c;q)_inf"),
    ("sum_{k>=0} T   sum_{k=0}^{10} T", "sums; the body T is the product term that follows"),
    ("sum_{k=-inf}^{inf} T", "bilateral sum"),
    ("prod_{n>=1} T   prod_{n=1}^{inf} T", "products"),
    ("O(q^N)", "an unknown remainder of order N"),
    ("z, a, b, x1  (z q;q)_inf  z^-1", "extra variables: letters other than q that no sum "
                                      "binds; coefficients become Laurent polynomials in them"),
]

_DIGITS = frozenset("0123456789")
_SYMBOLS = ["**", ">=", "<=", "+", "-", "*", "/", "^", "(", ")", "{", "}", ",", ";", "_", "=",
            "∞", "<", ">", "[", "]"]


@dataclass(frozen=True)
class Token:
    kind: str  # "num", "name", "sym", "end"
    text: str
    pos: int


def tokenize(text: str) -> list[Token]:
    """Split text into tokens; ``\\infty`` and ``oo`` are not accepted, ``∞`` is.

    >>> [t.text for t in tokenize("2q^3 (q;q)_inf")]
    ['2', 'q', '^', '3', '(', 'q', ';', 'q', ')', '_', 'inf', '']
    """
    if len(text) > MAX_TEXT:
        raise ParseError(f"the expression is longer than {MAX_TEXT} characters",
                         text[:200], 200)
    out: list[Token] = []
    i, n = 0, len(text)
    while i < n:
        ch = text[i]
        if ch.isspace():
            i += 1
            continue
        if ch in _DIGITS:
            j = i
            while j < n and text[j] in _DIGITS:
                j += 1
            if j < n and text[j] == "." and j + 1 < n and text[j + 1].isdigit():
                raise ParseError("decimal numbers are not accepted; write a fraction such as 3/2",
                                 text, j)
            if j - i > MAX_DIGITS:
                raise ParseError(f"number with more than {MAX_DIGITS} digits", text, i)
            out.append(Token("num", text[i:j], i))
            i = j
            continue
        if ch.isascii() and ch.isalpha():
            j = i
            while j < n and text[j].isascii() and (text[j].isalnum()):
                j += 1
            out.append(Token("name", text[i:j], i))
            i = j
            continue
        for sym in _SYMBOLS:
            if text.startswith(sym, i):
                out.append(Token("sym", "^" if sym == "**" else sym, i))
                i += len(sym)
                break
        else:
            raise ParseError(f"unexpected character {ch!r}", text, i)
    out.append(Token("end", "", n))
    return out


class _Parser:
    def __init__(self, text: str, bound: Iterable[str] = ()) -> None:
        self.text = text
        self.toks = tokenize(text)
        self.i = 0
        self.depth = 0
        self.bound: list[str] = list(bound)
        # set when a sum or product has just taken the rest of the term as its body
        self.tail_taken = False

    # -- helpers ------------------------------------------------------------------------
    @property
    def tok(self) -> Token:
        return self.toks[self.i]

    def error(self, message: str, tok: Token | None = None) -> ParseError:
        t = tok or self.tok
        return ParseError(message, self.text, t.pos)

    def at(self, *texts: str) -> bool:
        t = self.tok
        return t.kind in ("sym", "name") and t.text in texts

    def take(self) -> Token:
        t = self.tok
        self.i += 1
        return t

    def expect(self, text: str, what: str = "") -> Token:
        if not self.at(text):
            found = "the end of the expression" if self.tok.kind == "end" else repr(self.tok.text)
            raise self.error(f"expected {text!r}{what} but found {found}")
        return self.take()

    def enter(self) -> None:
        self.depth += 1
        if self.depth > MAX_DEPTH:
            raise self.error(f"the expression is nested more than {MAX_DEPTH} levels deep")

    def leave(self) -> None:
        self.depth -= 1

    # -- grammar ------------------------------------------------------------------------
    def parse(self) -> Node:
        if self.tok.kind == "end":
            raise self.error("empty expression")
        node = self.expr()
        if self.tok.kind != "end":
            raise self.error(f"unexpected {self.tok.text!r}")
        return node

    def expr(self) -> Node:
        self.enter()
        node = self.term()
        while self.at("+", "-"):
            op = self.take()
            right = self.term()
            node = BinOp(op.text, node, right, op.pos)
        self.leave()
        return node

    def starts_factor(self) -> bool:
        t = self.tok
        if t.kind == "num":
            return True
        if t.kind == "name":
            return True
        return t.kind == "sym" and t.text in ("(", "{", "∞")

    def term(self) -> Node:
        node = self.signed()
        while True:
            if self.tail_taken:
                self.tail_taken = False
                break  # a sum or product took the rest of the term as its body
            if self.at("*", "/"):
                op = self.take()
                right = self.signed_after_operator()
                node = BinOp(op.text, node, right, op.pos)
            elif self.starts_factor():
                pos = self.tok.pos
                right = self.power()
                node = BinOp("*", node, right, pos)
            else:
                break
        return node

    def signed_after_operator(self) -> Node:
        # allow "a * -b" as papers sometimes do
        if self.at("-", "+"):
            return self.signed()
        return self.power()

    def signed(self) -> Node:
        self.enter()
        if self.at("-"):
            t = self.take()
            node: Node = Neg(self.signed(), t.pos)
        elif self.at("+"):
            self.take()
            node = self.signed()
        else:
            node = self.power()
        self.leave()
        return node

    def power(self) -> Node:
        base = self.atom()
        if self.at("^") and not self.tail_taken:
            t = self.take()
            base = BinOp("^", base, self.signed(), t.pos)  # q^-2: a signed exponent
        return base

    def atom(self) -> Node:
        t = self.tok
        if t.kind == "num":
            self.take()
            return Num(Fraction(int(t.text)), t.pos)
        if t.kind == "end":
            raise self.error("the expression ends too early")
        if t.kind == "sym":
            if t.text == "(":
                return self.paren()
            if t.text == "{":
                self.take()
                node = self.expr()
                self.expect("}")
                return node
            raise self.error(f"unexpected {t.text!r}")
        # a name
        name = t.text
        if name == "q":
            self.take()
            return Q(t.pos)
        if name in ("sum", "prod"):
            return self.bigop()
        if name == "O":
            self.take()
            self.expect("(", " after O")
            inner = self.expr()
            self.expect(")")
            if not (isinstance(inner, BinOp) and inner.op == "^" and isinstance(inner.left, Q)) \
                    and not isinstance(inner, Q):
                raise ParseError("O(...) takes a power of q, such as O(q^50)", self.text, t.pos)
            exponent = inner.right if isinstance(inner, BinOp) else Num(Fraction(1), t.pos)
            return BigO(exponent, t.pos)
        if name in FUNCTIONS:
            return self.call()
        if name in self.bound:
            self.take()
            return Name(name, t.pos)
        if name == "inf":
            raise self.error("'inf' may only stand as a subscript or a bound of a sum or product")
        if is_extra_variable(name):
            self.take()
            return Var(name, t.pos)
        raise self.error(_unknown_name_message(name, self.bound))

    def call(self) -> Node:
        t = self.take()
        entry = FUNCTIONS[t.text]
        self.expect("(", f" after {t.text}")
        args = [self.expr()]
        while self.at(","):
            self.take()
            args.append(self.expr())
        self.expect(")")
        if len(args) != len(entry.arguments):
            raise ParseError(f"{t.text} takes {len(entry.arguments)} argument(s): "
                             f"{t.text}({', '.join(entry.arguments)})", self.text, t.pos)
        return Call(t.text, tuple(args), t.pos)

    def paren(self) -> Node:
        open_tok = self.take()
        first = self.expr()
        if self.at(",", ";"):
            params = [first]
            while self.at(","):
                self.take()
                params.append(self.expr())
            self.expect(";", " in a q-Pochhammer symbol (a;q)_n")
            base = self.expr()
            self.expect(")")
            length = self.subscript("a q-Pochhammer symbol")
            return Poch(tuple(params), base, length, open_tok.pos)
        self.expect(")")
        if self.at("_"):
            # (a)_n is the usual shorthand for (a;q)_n
            length = self.subscript("a q-Pochhammer symbol")
            return Poch((first,), Q(open_tok.pos), length, open_tok.pos)
        return first

    def subscript(self, what: str) -> Node | None:
        """After ``_``: None for infinity, else the length expression."""
        self.expect("_", f" after {what}")
        return self.short_operand(f"a subscript after '_' in {what}")

    def short_operand(self, what: str) -> Node | None:
        """A subscript or an upper limit: inf (None), a number, a bound variable, or an
        expression in parentheses or braces."""
        t = self.tok
        if self.at("inf", "∞"):
            self.take()
            return None
        if t.kind == "num":
            self.take()
            return Num(Fraction(int(t.text)), t.pos)
        if t.kind == "name" and t.text in self.bound:
            self.take()
            return Name(t.text, t.pos)
        if self.at("(", "{"):
            close = ")" if t.text == "(" else "}"
            self.take()
            if self.at("inf", "∞"):
                self.take()
                self.expect(close)
                return None
            node = self.expr()
            self.expect(close)
            return node
        if t.kind == "name" and is_extra_variable(t.text):
            raise self.error(f"{what} must be a number, a bound variable or inf; {t.text!r} is "
                             f"not bound by an enclosing sum or product")
        if t.kind == "name":
            raise self.error(_unknown_name_message(t.text, self.bound))
        raise self.error(f"expected {what}: a number, a bound variable, inf, or an "
                         f"expression in parentheses")

    def bigop(self) -> Node:
        t = self.take()
        kind = t.text
        self.expect("_", f" after {kind} (write {kind}_{{k>=0}} ...)")
        self.expect("{", f" after {kind}_ (write {kind}_{{k>=0}} ...)")
        var_tok = self.tok
        if var_tok.kind != "name" or var_tok.text in KEYWORDS or var_tok.text in FUNCTIONS:
            raise self.error(f"expected the name of the {kind}'s variable")
        if var_tok.text in self.bound:
            raise self.error(f"{var_tok.text!r} is already bound by an enclosing sum or product")
        var = var_tok.text
        self.take()
        lower: Node | None
        upper: Node | None = None
        has_upper_allowed = True
        if self.at(">="):
            self.take()
            lower = self.bound_expr(allow_minus_inf=False)
            has_upper_allowed = False
        elif self.at("="):
            self.take()
            lower = self.bound_expr(allow_minus_inf=True)
        else:
            raise self.error(f"expected '>=' or '=' after the variable {var!r}")
        self.expect("}")
        explicit_upper = False
        if self.at("^"):
            if not has_upper_allowed:
                raise self.error(f"{kind}_{{{var}>=...}} has no upper limit; "
                                 f"write {kind}_{{{var}=...}}^{{...}}")
            self.take()
            upper = self.upper_bound()
            explicit_upper = True
        if not explicit_upper and has_upper_allowed:
            raise self.error(f"{kind}_{{{var}=...}} needs an upper limit ^{{...}}, or write "
                             f"{kind}_{{{var}>=...}}")
        self.bound.append(var)
        try:
            body = self.term()
        finally:
            self.bound.pop()
        self.tail_taken = True
        return BigOp(kind, var, lower, upper, body, t.pos)

    def bound_expr(self, allow_minus_inf: bool) -> Node | None:
        if allow_minus_inf and self.at("-"):
            save = self.i
            self.take()
            if self.at("inf", "∞"):
                self.take()
                return None
            self.i = save
        if self.at("inf", "∞"):
            raise self.error("a lower limit cannot be +inf")
        return self.expr()

    def upper_bound(self) -> Node | None:
        return self.short_operand("an upper limit")


def is_extra_variable(name: str) -> bool:
    """True for the names an extra variable may have: one ASCII letter other than q, Q and O,
    optionally followed by digits (z, a, b, x1).

    >>> is_extra_variable("z"), is_extra_variable("x2"), is_extra_variable("zq")
    (True, True, False)
    """
    if not name or not name[0].isascii() or not name[0].isalpha() or name[0] in "qQO":
        return False   # Q is refused too: it is far more often a mistyped q
    rest = name[1:]
    return rest == "" or (rest.isascii() and rest.isdigit())


def _unknown_name_message(name: str, bound: list[str]) -> str:
    hint = ""
    if name == "Q":
        hint = " (did you mean q? Q is not accepted as an extra variable)"
    elif len(name) > 1 and name.isalpha():
        hint = (f" (extra variables are single letters, optionally followed by digits; "
                f"write a product with spaces or '*', e.g. {' '.join(name)})")
    return f"unknown name {name!r}{hint}"


def parse(text: str, bound: Iterable[str] = ()) -> Node:
    """Parse text in the notation into a syntax tree; ``bound`` names variables bound outside.

    >>> parse("(q;q)_inf") == parse("(q)_∞")
    True
    """
    typed_argument("text", text, str, "a string in the notation")
    if isinstance(bound, (str, bytes)) or not isinstance(bound, Iterable):
        raise ArgumentTypeError(f"bound must be a list of variable names, not "
                                f"{type(bound).__name__}")
    bound = tuple(bound)
    for i, name in enumerate(bound):
        typed_argument(f"bound[{i}]", name, str, "a variable name")
    return _Parser(text, bound).parse()
