r"""A hand-written recursive-descent parser for the notation of papers: plain ASCII, Unicode
as PDFs print it, or LaTeX (:mod:`qseries.lang.tokens` reads all three into one token
stream, so one grammar serves them).

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
             | "[" "q" "^" ("(" lin ")" | "{" lin "}") "]" term      -- dissection
             | "U" "_" (number | "{" number "}") "(" expr ")"       -- Atkin's U_m
             | \frac{expr}{expr} | \binom{expr}{expr} ("_" "q")?
             | \begin{bmatrix} expr \\ expr \end{bmatrix} "_" "q"
    subscript := "inf" | "∞" | number | name | "(" expr ")" | "{" expr "}"
    lin     := an expression m n + r linear in one fresh index letter n, with m >= 1 an
               integer and r a rational number

A function is a registry builder (``eta``, ``theta_3``, ...), a registry function defined in
the notation (``phi``, ``psi``, ``chi``, ``f``) or a user definition; the latter two are
expanded in place when parsed (:mod:`qseries.lang.definitions`).  A name written directly
before ``(`` is a function call, never a product: an unknown one is an error.

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

import difflib
from collections.abc import Iterable, Mapping
from fractions import Fraction
from functools import cache
from math import factorial

from ..errors import ArgumentTypeError, ParseError, typed_argument
from ..products import FUNCTIONS
from .ast import BigO, BigOp, BinOp, Call, Dissect, Name, Neg, Node, Num, Poch, Q, Var
from .definitions import Definition, parse_definitions, split_head, substitute
from .tokens import MAX_DIGITS, MAX_TEXT, Token, display_body, tokenize

__all__ = ["MAX_DEPTH", "MAX_DIGITS", "MAX_TEXT", "NOTATION_FORMS", "Token", "is_extra_variable",
           "parse", "parse_body", "parse_definitions", "tokenize"]

#: deepest accepted nesting of parentheses, operators and sums
MAX_DEPTH = 100
#: longest run of letters read as a product of one-letter variables (zq, 6ij)
MAX_LETTER_RUN = 3
#: names of Greek letters, which papers use as names, never read as a product of letters
GREEK_NAMES = frozenset({"alpha", "beta", "gamma", "delta", "epsilon", "zeta", "eta", "theta",
                         "iota", "kappa", "lambda", "mu", "nu", "xi", "pi", "rho", "sigma",
                         "tau", "upsilon", "phi", "chi", "psi", "omega"})
#: largest k in an ordinary binomial \binom{n}{k} (a polynomial of degree k in n)
MAX_BINOM_K = 24

KEYWORDS = {"q", "sum", "prod", "inf", "O"}
#: one line per construction of the notation; ``qseries notation`` and the README show it
NOTATION_FORMS = [
    ("2q^3, q^-2, q^(1/24), q^(k(3k-1)/2)", "numbers, q and its powers; ^ or ** for powers"),
    ("(a;q)_n  (a;q^2)_{2k+1}  (q)_n", "q-Pochhammer symbol; (a)_n means (a;q)_n"),
    ("(a;q)_inf  (a;q)_∞", "infinite q-Pochhammer product"),
    ("(a,b,c;q)_inf", "the product (a;q)_inf (b;q)_inf (c;q)_inf"),
    ("sum_{k>=0} T   sum_{k=0}^{10} T", "sums; the body T is the product term that follows"),
    ("sum_{k=-inf}^{inf} T   \\sum_{k\\in\\mathbb{Z}} T", "bilateral sum"),
    ("prod_{n>=1} T   prod_{n=1}^{inf} T", "products"),
    ("O(q^N)", "an unknown remainder of order N"),
    ("sum_{i,j>=0} T   sum_{n1>=n2>=0} T", "multi-sums: indices over one range, or a chain "
                                          "(n2 from 0, n1 from n2)"),
    ("sum_{n_1>=0} T", "subscripted index names (n_1, n_{12})"),
    ("eta(q^5)  eta(5tau)  theta_3(-q)  phi(q^2)", "named functions (below) at q^d or -q^d; "
                                                   "the ones defined by a sum at any argument"),
    ("\\sum_{n\\ge0}\\frac{q^{n^2}}{(q;q)_n}", "LaTeX as papers print it (\\frac, \\binom{n}{k}_q, "
                                           "\\infty, \\eta(\\tau), \\theta_3, ...)"),
    ("phi^2(q)  (q;q)^2_\\infty", "a power written before the argument or the subscript, as "
                                 "papers print it: phi(q)^2, (q;q)_inf^2"),
    ("Σ ∏ ≥ ≤ η θ φ ψ χ τ", "Unicode as PDFs print it"),
    ("[q^(5n+4)] F   [q^{5n+4}] F", "dissection: the series sum_n [q^(5n+4)]F q^n; F is the "
                                    "product term that follows; any fresh index letter; "
                                    "r may be fractional, in the class of F's exponents"),
    ("U_5(F)  U_{5}(F)", "Atkin's operator U_m: [q^(5n)] F"),
    ("z, a, b, x1  (z q;q)_inf  z^-1", "extra variables: letters other than q that no sum "
                                      "binds; coefficients become Laurent polynomials in them"),
]


class _Parser:
    def __init__(self, text: str, bound: Iterable[str] = (),
                 definitions: Mapping[str, Definition] | None = None,
                 params: Iterable[str] = ()) -> None:
        self.text = text
        self.toks = tokenize(text)
        self.i = 0
        self.depth = 0
        self.bound: list[str] = list(bound)
        self.defs: Mapping[str, Definition] = definitions or {}
        #: the parameters of a definition being parsed (extra-variable names)
        self.params = frozenset(params)
        # set when a sum or product has just taken the rest of the term as its body
        self.tail_taken = False
        #: a Gaussian binomial written as a matrix whose _q follows the closing bracket
        self.bracketed_gaussian: Node | None = None

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
            if self.tok.text == "=":
                raise self.error("unexpected '=': an identity's two sides are two arguments "
                                 "(qseries check LHS RHS), not one text LHS = RHS")
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
        if t.kind in ("num", "name"):
            return True
        if t.kind == "cmd":
            return not t.text.startswith("end")
        return t.kind == "sym" and t.text in ("(", "{", "∞", "[")

    def adjacent(self, offset: int = 1) -> bool:
        """True when the token ``offset`` ahead touches the current one (no space between)."""
        t, u = self.tok, self.toks[self.i + offset]
        return u.pos == t.pos + len(t.text) and u.kind != "end"

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
            sign = self.tok.text if self.at("-", "+") else ""
            self.refuse_glued_number(1 if sign else 0, lambda num, word: (
                f"q^{sign}{num}{word} is ambiguous: write q^({sign}{num}{word}) for the "
                f"power, or q^{sign}{num} {word} for the product"))
            base = BinOp("^", base, self.signed(), t.pos)  # q^-2: a signed exponent
        return base

    def refuse_glued_number(self, offset: int, message) -> None:
        """Refuse a number written against a letter (``2n``) where one token is read: an
        exponent or a subscript takes the number alone, so ``q^2n`` would be q^2 n and
        ``(q;q)_2n`` would be (q;q)_2 n, never what a paper's q^{2n} means."""
        if self.i + offset + 1 >= len(self.toks):
            return
        t, u = self.toks[self.i + offset], self.toks[self.i + offset + 1]
        if t.kind == "num" and u.kind == "name" and u.pos == t.pos + len(t.text) \
                and self.text[u.pos].isalpha():  # q^2\eta(q) is LaTeX's q^{2} eta(q)
            raise ParseError(message(t.text, u.text), self.text, t.pos)

    def atom(self) -> Node:
        t = self.tok
        if t.kind == "num":
            self.take()
            return Num(Fraction(int(t.text)), t.pos)
        if t.kind == "end":
            raise self.error("the expression ends too early")
        if t.kind == "cmd":
            return self.latex_command()
        if t.kind == "sym":
            if t.text == "(":
                return self.paren()
            if t.text == "{":
                self.take()
                node = self.expr()
                self.expect("}")
                return node
            if t.text == "[":
                return self.extractor()
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
        joined = self.bound_subscripted()
        if joined is not None:
            return Name(joined, t.pos)
        if name in self.bound:
            self.take()
            return Name(name, t.pos)
        if name == "U" and self.toks[self.i + 1].text == "_" and "U" not in self.params:
            return self.atkin()
        if name == "theta" and self.toks[self.i + 1].text == "_":
            return self.call(self.subscripted_name())
        if name in FUNCTIONS or name in self.defs:
            self.take()
            return self.call(name, t)
        if name == "inf":
            raise self.error("'inf' may only stand as a subscript or a bound of a sum or product")
        if name == "theta":
            raise self.error("theta needs its subscript: theta_2(q), theta_3(q) or theta_4(q)")
        if name == "tau":
            raise self.error("'tau' is read only inside eta(...), as in eta(5tau); elsewhere "
                             "write the series in q")
        if self.toks[self.i + 1].text == "(" and self.adjacent():
            raise self.error(_unknown_function_message(name, list(self.defs)))
        if name in self.params or is_extra_variable(name):
            self.take()
            return Var(name, t.pos)
        if self.letters_of_a_product(name):
            # "zq", "ij": letters side by side multiply, as in papers (and in LaTeX, where a
            # run of letters is a run of one-letter symbols); a word close to a known name
            # ("Sum", "infty") is refused with a suggestion instead
            self.toks[self.i:self.i + 1] = [Token("name", ch, t.pos + k)
                                            for k, ch in enumerate(name)]
            return self.atom()
        raise self.error(_unknown_name_message(name, self.bound, list(self.defs)))

    def extractor(self) -> Node:
        """``[q^(m n + r)] term`` (after checking the shape): a Dissect node."""
        t = self.take()
        form = "write the coefficient extractor as [q^(5n+4)] F"
        if not self.at("q"):
            raise self.error(f"'[' starts a coefficient extractor here: {form}")
        self.take()
        self.expect("^", f" ({form})")
        if not self.at("(", "{"):
            raise self.error(f"the exponent of an extractor goes in parentheses: {form}")
        group = self.tok
        close = ")" if group.text == "(" else "}"
        var = self.index_letter(form)
        self.take()
        self.bound.append(var)
        try:
            exponent = self.expr()
        finally:
            self.bound.pop()
        self.expect(close)
        self.expect("]", f" closing the extractor ({form})")
        lin = _linear(exponent, var)
        if lin is None or lin[0] < 1 or lin[0].denominator != 1:
            raise ParseError(f"the exponent of an extractor must be m {var} + r with m a whole "
                             f"number >= 1 and r a number ({form})", self.text, group.pos)
        body = self.term()
        self.tail_taken = True
        return Dissect(int(lin[0]), lin[1], body, var, t.pos)

    def index_letter(self, form: str) -> str:
        """The one letter in the bracketed exponent at the current token that is not bound
        outside (the extractor's index), without consuming anything."""
        depth, j, seen, outer = 0, self.i, [], []
        while True:
            u = self.toks[j]
            if u.kind == "end":
                raise self.error(f"the extractor's exponent is not closed ({form})")
            if u.text in ("(", "{"):
                depth += 1
            elif u.text in (")", "}"):
                depth -= 1
                if depth == 0:
                    break
            elif u.kind == "name" and u.text not in self.bound and u.text not in seen:
                seen.append(u.text)
            elif u.kind == "name" and u.text in self.bound and u.text not in outer:
                outer.append(u.text)
            j += 1
        if not seen and outer:
            raise self.error(f"{outer[0]!r} is bound by an enclosing sum or product; the "
                             f"extractor needs its own index letter ({form})")
        if len(seen) != 1 or not is_extra_variable(seen[0]):
            what = "no index letter" if not seen else f"the names {', '.join(seen)}"
            raise self.error(f"the exponent of an extractor has {what}; it takes exactly one "
                             f"index letter that no enclosing sum binds ({form})")
        return seen[0]

    def atkin(self) -> Node:
        """``U_m(F)``: Atkin's operator, the extractor [q^(m n)] F."""
        t = self.take()
        self.take()                                   # the "_"
        braced = self.at("{")
        if braced:
            self.take()
        num = self.tok
        if num.kind != "num" or int(num.text) < 1:
            raise self.error("Atkin's operator is written U_m(F) with m a whole number >= 1, "
                             "such as U_5(F)")
        self.take()
        if braced:
            self.expect("}")
        self.expect("(", " after U_m (write U_5(F))")
        body = self.expr()
        self.expect(")")
        return Dissect(int(num.text), Fraction(0), body, "n", t.pos)

    def letters_of_a_product(self, name: str) -> bool:
        # only short runs (zq, 6ij, abc): a longer word (alpha, beta, sigma) is a name the
        # user meant, and reading it as a product of letters would be a silent misreading
        return (1 < len(name) <= MAX_LETTER_RUN and name.isascii() and name.isalpha()
                and name.lower() not in GREEK_NAMES
                and _suggestion(name, list(self.defs)) is None
                and all(ch == "q" or ch in self.bound or ch in self.params
                        or is_extra_variable(ch) for ch in name))

    def subscripted_name(self) -> tuple[str, Token]:
        """theta_3, theta_{3}: the function's name and its first token."""
        t = self.take()
        self.expect("_")
        braced = self.at("{")
        if braced:
            self.take()
        num = self.tok
        if num.kind != "num":
            raise self.error("expected the number of the theta function: theta_2, theta_3 "
                             "or theta_4")
        self.take()
        if braced:
            self.expect("}")
        name = f"{t.text}_{num.text}"
        if name not in FUNCTIONS:
            raise ParseError(f"{name} is not a function of the notation (theta_2, theta_3 and "
                             f"theta_4 are)", self.text, t.pos)
        return name, t

    def call(self, name: str | tuple[str, Token], t: Token | None = None) -> Node:
        if isinstance(name, tuple):
            name, t = name
        assert t is not None
        if self.at("^"):
            # phi^2(q), f^3(-q), \vartheta_3^4(q): papers put the power before the argument
            caret = self.take()
            exponent = self.signed()
            return BinOp("^", self.call_body(name, t), exponent, caret.pos)
        return self.call_body(name, t)

    def call_body(self, name: str, t: Token) -> Node:
        """A call after its name: the arguments in parentheses, expanded in place."""
        entry = FUNCTIONS.get(name)
        self.expect("(", f" after {name}")
        tau = self.tau_argument() if name == "eta" else None
        if tau is not None:
            args = [tau]
        else:
            args = [self.expr()]
            while self.at(","):
                self.take()
                args.append(self.expr())
            self.expect(")")
        if entry is not None and entry.build is not None:
            if len(args) != len(entry.arguments):
                raise ParseError(f"{name} takes {len(entry.arguments)} argument(s): "
                                 f"{name}({', '.join(entry.arguments)})", self.text, t.pos)
            return Call(name, tuple(args), t.pos)
        if entry is not None:
            defn = _builtin_definition(name, len(args))
            if defn is None:
                forms = " or ".join(d.split(" = ")[0] for d in entry.definitions)
                raise ParseError(f"{name} takes {forms}", self.text, t.pos)
        else:
            defn = self.defs[name]
            if len(args) != len(defn.params):
                raise ParseError(f"{name} takes {len(defn.params)} argument(s): "
                                 f"{name}({', '.join(defn.params)})", self.text, t.pos)
        return substitute(defn, tuple(args), t.pos)

    def tau_argument(self) -> Node | None:
        """eta(tau), eta(5tau), eta(5 tau), eta(5*tau): the argument q^5 (after the '(')."""
        j = self.i
        d = 1
        if self.toks[j].kind == "num":
            d = int(self.toks[j].text)
            j += 1
            if self.toks[j].text == "*":
                j += 1
        if self.toks[j].text != "tau" or self.toks[j + 1].text != ")" or d < 1:
            return None
        pos = self.tok.pos
        self.i = j + 2
        return Q(pos) if d == 1 else BinOp("^", Q(pos), Num(Fraction(d), pos), pos)

    def braced(self, what: str) -> Node:
        self.expect("{", f" (the argument of {what})")
        node = self.expr()
        self.expect("}", f" (closing the argument of {what})")
        return node

    def latex_command(self) -> Node:
        t = self.take()
        if t.text == "frac":
            num = self.braced("\\frac")
            den = self.braced("\\frac")
            return BinOp("/", num, den, t.pos)
        if t.text == "binom":
            top = self.braced("\\binom")
            bottom = self.braced("\\binom")
            return self.binomial(top, bottom, t)
        if t.text == "begin-matrix":
            top = self.expr()
            self.expect("\\\\", " between the rows of a Gaussian binomial")
            bottom = self.expr()
            if not (self.tok.kind == "cmd" and self.tok.text == "end-matrix"):
                raise self.error("expected \\end{bmatrix} after the two rows of a Gaussian "
                                 "binomial")
            self.take()
            gaussian = Call("gaussian", (top, bottom), t.pos)
            if self.gaussian_subscript():
                return gaussian
            if self.at(")") and self.toks[self.i + 1].text == "_":
                # \left[\begin{matrix} n \\ k \end{matrix}\right]_q: the bracket's _q, taken
                # by ``paren`` when the matrix is all the bracket holds
                self.bracketed_gaussian = gaussian
                return gaussian
            raise self.error("a matrix stands for a Gaussian binomial here: write "
                             "\\begin{bmatrix} n \\\\ k \\end{bmatrix}_q")
        raise self.error(f"unexpected {t.text}")

    def gaussian_subscript(self) -> bool:
        """Take ``_q`` or ``_{q}`` after a binomial when it follows."""
        if not self.at("_"):
            return False
        j = self.i + 1
        if self.toks[j].text == "q":
            self.i = j + 1
            return True
        if self.toks[j].text == "{" and self.toks[j + 1].text == "q" \
                and self.toks[j + 2].text == "}":
            self.i = j + 3
            return True
        return False

    def binomial(self, top: Node, bottom: Node, t: Token) -> Node:
        """\\binom{n}{k}_q is the Gaussian binomial; \\binom{n}{k} with k a number the
        polynomial n(n-1)...(n-k+1)/k! (as in q^{\\binom{n}{2}})."""
        if self.gaussian_subscript():
            return Call("gaussian", (top, bottom), t.pos)
        if not (isinstance(bottom, Num) and bottom.value.denominator == 1
                and 0 <= bottom.value <= MAX_BINOM_K):
            raise ParseError(f"\\binom{{n}}{{k}} without _q needs a number k from 0 to "
                             f"{MAX_BINOM_K}; write \\binom{{n}}{{k}}_q for the Gaussian "
                             f"binomial", self.text, t.pos)
        k = int(bottom.value)
        node: Node = Num(Fraction(1, factorial(k)), t.pos)
        for j in range(k):
            factor = top if j == 0 else BinOp("-", top, Num(Fraction(j), t.pos), t.pos)
            node = BinOp("*", node, factor, t.pos)
        return node

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
            power = self.power_before_subscript(True)
            length = self.subscript("a q-Pochhammer symbol")
            return self.raised(Poch(tuple(params), base, length, open_tok.pos), power)
        self.expect(")")
        if first is self.bracketed_gaussian:
            self.bracketed_gaussian = None
            if not self.gaussian_subscript():
                raise self.error("a matrix stands for a Gaussian binomial here: write "
                                 "\\left[\\begin{matrix} n \\\\ k \\end{matrix}\\right]_q")
            return first
        if self.bracketed_gaussian is not None:
            raise self.error("a matrix in square brackets stands for a Gaussian binomial: "
                             "write \\left[\\begin{matrix} n \\\\ k \\end{matrix}\\right]_q "
                             "with nothing else inside the brackets")
        power = self.power_before_subscript(False)
        if self.at("_"):
            # (a)_n is the usual shorthand for (a;q)_n
            length = self.subscript("a q-Pochhammer symbol")
            return self.raised(Poch((first,), Q(open_tok.pos), length, open_tok.pos), power)
        return first

    def power_before_subscript(self, always: bool) -> tuple[Node, int] | None:
        """``^e`` written between a q-Pochhammer symbol's ')' and its subscript, as LaTeX
        prints (q;q)^2_\\infty: (the exponent, the caret's position), or None.  After
        ``(a)`` only when a subscript follows (``(1-q)^2`` is a power of a bracket)."""
        if not self.at("^"):
            return None
        save = self.i
        caret = self.take()
        exponent = self.signed()
        if always or self.at("_"):
            return exponent, caret.pos
        self.i = save
        return None

    @staticmethod
    def raised(node: Node, power: tuple[Node, int] | None) -> Node:
        return node if power is None else BinOp("^", node, power[0], power[1])

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
            mark = self.toks[self.i - 1].text if self.i else "_"       # '_' or '^'
            what, other = ("subscript", "the product") if mark == "_" else \
                ("upper limit", "the limit and then the term")
            self.refuse_glued_number(0, lambda num, word: (
                f"{mark}{num}{word} is ambiguous: write {mark}({num}{word}) or "
                f"{mark}{{{num}{word}}} for the {what} {num}{word}, or {mark}{num} {word} for "
                f"{other}"))
            self.take()
            return Num(Fraction(int(t.text)), t.pos)
        joined = self.bound_subscripted()
        if joined is not None:
            return Name(joined, t.pos)
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
        var = self.index_name(kind, [])
        more: list[str] = []
        while self.at(","):
            self.take()
            more.append(self.index_name(kind, [var, *more]))
        lower: Node | None
        upper: Node | None = None
        has_upper_allowed = True
        #: n1 >= n2 >= ... >= L: the chain [n1, n2, ...], each summed from the next
        chain: list[str] = []
        if self.at(">="):
            self.take()
            while not more and self.starts_index_name() and self.after_index_name(">="):
                chain.append(self.index_name(kind, [var, *chain]))
                self.expect(">=")
            lower = self.bound_expr(allow_minus_inf=False)
            has_upper_allowed = False
        elif self.at("="):
            self.take()
            lower = self.bound_expr(allow_minus_inf=True)
        elif self.at("∈"):                       # n \in \mathbb{Z}: every integer
            self.take()
            self.expect("ℤ", " after \\in (a sum over the integers: n \\in \\mathbb{Z})")
            lower = None
            has_upper_allowed = False
        else:
            raise self.error(f"expected '>=' or '=' after the variable {var!r}")
        self.expect("}")
        explicit_upper = False
        if self.at("^"):
            if not has_upper_allowed:
                raise self.error(f"{kind}_{{{var}>=...}} and {kind}_{{{var} in Z}} have no "
                                 f"upper limit; write {kind}_{{{var}=...}}^{{...}}")
            self.take()
            upper = self.upper_bound()
            explicit_upper = True
        if not explicit_upper and has_upper_allowed:
            raise self.error(f"{kind}_{{{var}=...}} needs an upper limit ^{{...}}, or write "
                             f"{kind}_{{{var}>=...}}")
        names = [var, *more, *chain]
        self.bound.extend(names)
        try:
            body = self.term()
        finally:
            del self.bound[-len(names):]
        self.tail_taken = True
        if chain:
            # sum_{n1>=n2>=n3>=L}: n3 from L, n2 from n3, n1 from n2 (innermost first)
            steps = [var, *chain]
            for j in range(len(steps) - 1):
                body = BigOp(kind, steps[j], Name(steps[j + 1], t.pos), None, body, t.pos)
            return BigOp(kind, steps[-1], lower, None, body, t.pos)
        for name in reversed(names):
            body = BigOp(kind, name, lower, upper, body, t.pos)
        return body

    def starts_index_name(self) -> bool:
        t = self.tok
        return t.kind == "name" and t.text not in KEYWORDS and t.text not in FUNCTIONS \
            and t.text not in self.bound and (t.text.isalpha() or is_extra_variable(t.text))

    def after_index_name(self, sym: str) -> bool:
        """Whether the index name at the current token is followed by ``sym``."""
        j = self.i + 1
        if self.toks[j].text == "_":
            j += 4 if self.toks[j + 1].text == "{" else 2
        return self.toks[j].text == sym

    def index_name(self, kind: str, taken: list[str]) -> str:
        """The variable of a sum or product: a name, or a subscripted one (n_1, n_{12})."""
        t = self.tok
        if t.kind != "name" or t.text in KEYWORDS or t.text in FUNCTIONS:
            raise self.error(f"expected the name of the {kind}'s variable")
        self.take()
        name = t.text
        joined = self.subscript_of_index(name)
        if joined is not None:
            name = joined
        if name in self.bound:
            raise ParseError(f"{name!r} is already bound by an enclosing sum or product",
                             self.text, t.pos)
        if name in taken:
            raise ParseError(f"{name!r} appears twice among the variables", self.text, t.pos)
        return name

    def subscript_of_index(self, name: str) -> str | None:
        """After a name: ``_1`` or ``_{12}`` makes the subscripted name n_1 (tokens taken)."""
        if not self.at("_"):
            return None
        j = self.i + 1
        if self.toks[j].kind == "num":
            self.i = j + 1
            return f"{name}_{self.toks[j].text}"
        if self.toks[j].text == "{" and self.toks[j + 1].kind == "num" \
                and self.toks[j + 2].text == "}":
            self.i = j + 3
            return f"{name}_{self.toks[j + 1].text}"
        return None

    def bound_subscripted(self) -> str | None:
        """A bound subscripted name at the current token (n_1 inside its sum), taken."""
        t = self.tok
        if t.kind != "name" or self.toks[self.i + 1].text != "_":
            return None
        save = self.i
        self.take()
        joined = self.subscript_of_index(t.text)
        if joined is not None and joined in self.bound:
            return joined
        self.i = save
        return None

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


def _linear(node: Node, var: str) -> tuple[Fraction, Fraction] | None:
    """(a, b) when ``node`` is a var + b with rational a and b, else None."""
    if isinstance(node, Num):
        return Fraction(0), node.value
    if isinstance(node, Name) and node.name == var:
        return Fraction(1), Fraction(0)
    if isinstance(node, Neg):
        inner = _linear(node.operand, var)
        return None if inner is None else (-inner[0], -inner[1])
    if not isinstance(node, BinOp):
        return None
    left, right = _linear(node.left, var), _linear(node.right, var)
    if left is None or right is None:
        return None
    if node.op in "+-":
        sign = 1 if node.op == "+" else -1
        return left[0] + sign * right[0], left[1] + sign * right[1]
    if node.op == "*" and (left[0] == 0 or right[0] == 0):
        return left[0] * right[1] + right[0] * left[1], left[1] * right[1]
    if node.op == "/" and right[0] == 0 and right[1] != 0:
        return left[0] / right[1], left[1] / right[1]
    if node.op == "^" and left[0] == 0 and right[0] == 0 and right[1].denominator == 1 \
            and abs(right[1]) <= 64 and (left[1] != 0 or right[1] > 0):
        return Fraction(0), left[1] ** int(right[1])
    return None


def _suggestion(name: str, defined: list[str]) -> str | None:
    """The known name closest to ``name`` (``Sum`` -> ``sum``, ``infty`` -> ``inf``;
    ``infinity`` and ``oo``, other spellings of infinity, -> ``inf``)."""
    if name.lower() in ("infinity", "oo"):
        return "inf"
    known = ["sum", "prod", "inf", *FUNCTIONS, *defined]
    lowered = {k.lower(): k for k in known}
    close = difflib.get_close_matches(name.lower(), list(lowered), n=1, cutoff=0.6)
    return lowered[close[0]] if close else None


def _unknown_name_message(name: str, bound: list[str], defined: list[str] = ()) -> str:
    if name == "Q":
        return "unknown name 'Q' (did you mean q? Q is not accepted as an extra variable)"
    near = _suggestion(name, list(defined))
    if near is not None:
        return f"unknown name {name!r} (did you mean {near}?)"
    return (f"unknown name {name!r} (extra variables are single letters, optionally followed "
            f"by digits; a product of them needs spaces or '*')")


def _unknown_function_message(name: str, defined: list[str]) -> str:
    near = _suggestion(name, defined)
    did = f"did you mean {near}? " if near is not None else ""
    return (f"unknown function {name!r} ({did}a name directly before '(' is a function call; "
            f"define it, e.g. {name}(q) = ..., or write {name}*(...) for a product)")


@cache
def _builtin_definition(name: str, arity: int) -> Definition | None:
    """The registry's definition of ``name`` with ``arity`` arguments, parsed once."""
    for text in FUNCTIONS[name].definitions:
        fname, params, body_pos, _ = split_head(text)
        if fname == name and len(params) == arity:
            return Definition(name, params, parse_body(text, body_pos, params, {}), text)
    return None


def parse_body(text: str, start: int, params: Iterable[str],
               definitions: Mapping[str, Definition]) -> Node:
    """Parse the part of ``text`` from character ``start`` on (the body of a definition),
    with ``params`` read as the definition's parameters.

    >>> from qseries.lang.printer import show
    >>> show(parse_body("P(x) = sum_{n>=0} x^n", 7, ("x",), {}))
    'sum_{n>=0} x^n'
    """
    p = _Parser(text, (), definitions, params)
    while p.tok.kind != "end" and p.tok.pos < start:
        p.i += 1
    return p.parse()


def split_identity(text: str) -> tuple[str, str]:
    r"""The two sides of an identity pasted as one text ``LHS = RHS`` (plain or LaTeX, with
    ``&=`` as displays align it): split at the one ``=`` outside every bracket (the ``=``
    of ``sum_{n=0}`` lies inside braces); the delimiters of a display pasted whole
    (``\[ ... \]``, ``$$ ... $$``, ``\begin{equation} ... \end{equation}``) are left out of
    both sides.

    >>> split_identity(r"\sum_{n=0}^{\infty} q^n &= \frac{1}{1-q}")
    ('\\sum_{n=0}^{\\infty} q^n &', ' \\frac{1}{1-q}')
    >>> split_identity(r"\[ 1/(1-q) = \sum_{n\ge0} q^n \]")
    (' 1/(1-q) ', ' \\sum_{n\\ge0} q^n ')
    """
    depth, cuts, width = 0, [], 1
    for t in tokenize(text):
        if t.kind == "sym" and t.text in ("(", "{", "["):
            depth += 1
        elif t.kind == "sym" and t.text in (")", "}", "]"):
            depth -= 1
        elif t.kind == "sym" and t.text == "=" and depth == 0:
            if cuts and cuts[-1] + width == t.pos and width == 1:
                width = 2                  # '==', as programmers write it: one sign
                continue
            cuts.append(t.pos)
    if len(cuts) != 1:
        raise ParseError("give the two sides as two arguments (LHS RHS), or one text with "
                         "one '=' between them" + (f" (this one has {len(cuts)})" if cuts
                                                   else ""), text, cuts[1] if cuts else 0)
    start, end = display_body(text)
    return text[start:cuts[0]], text[cuts[0] + width:end]


def parse(text: str, bound: Iterable[str] = (),
          definitions: Mapping[str, Definition] | Iterable[str] | None = None) -> Node:
    r"""Parse text in the notation into a syntax tree; ``bound`` names variables bound outside;
    ``definitions`` are functions defined in the notation (texts such as
    ``"G(q) = 1/((q;q^5)_inf (q^4;q^5)_inf)"``, or the result of ``parse_definitions``),
    expanded where they are called.

    >>> parse("(q;q)_inf") == parse("(q)_∞")
    True
    >>> parse(r"\prod_{n\geq 1}\frac{1}{1-q^n}") == parse("prod_{n>=1} 1/(1-q^n)")
    True
    >>> parse("G(q^2)", definitions=["G(q) = 1/(q;q)_inf"]) == parse("1/(q^2;q^2)_inf")
    True
    """
    typed_argument("text", text, str, "a string in the notation")
    if isinstance(bound, (str, bytes)) or not isinstance(bound, Iterable):
        raise ArgumentTypeError(f"bound must be a list of variable names, not "
                                f"{type(bound).__name__}")
    bound = tuple(bound)
    for i, name in enumerate(bound):
        typed_argument(f"bound[{i}]", name, str, "a variable name")
    return _Parser(text, bound, definitions_of(definitions)).parse()


def definitions_of(definitions: Mapping[str, Definition] | Iterable[str] | None
                   ) -> dict[str, Definition]:
    """Parsed definitions from texts (or already parsed ones, passed through).

    >>> sorted(definitions_of(["G(q) = 1/(1-q)"]))
    ['G']
    """
    if definitions is None:
        return {}
    if isinstance(definitions, Mapping):
        for k, v in definitions.items():
            if not isinstance(v, Definition):
                raise ArgumentTypeError(f"definitions[{k!r}] must be a parsed definition, "
                                        f"not {type(v).__name__}")
        return dict(definitions)
    return parse_definitions(definitions, reserved=_reserved)


def _reserved(name: str) -> bool:
    return name in FUNCTIONS or name in ("theta", "tau", "eta")
