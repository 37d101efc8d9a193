"""Tokens of the notation, from plain text, Unicode as PDFs print it, or LaTeX.

LaTeX and Unicode are not rewritten into other text: each command or symbol becomes the token
its plain spelling would give (``\\ge`` and ``≥`` are ``>=``, ``\\sum`` and ``Σ`` are ``sum``,
``\\infty`` is ``∞``), keeping its own position, so one grammar reads all three and an error
points into the text as typed.  Spacing (``\\,``, ``\\quad``) and sizing (``\\left``,
``\\bigl``) commands are dropped.  ``\\frac``, ``\\binom`` and the matrix environment of a
Gaussian binomial are ``cmd`` tokens that the parser reads with their brace arguments.

>>> [t.text for t in tokenize(r"\\sum_{n\\ge 0}\\frac{q^{n^2}}{(q;q)_n}")][:8]
['sum', '_', '{', 'n', '>=', '0', '}', 'frac']
>>> [t.text for t in tokenize("θ_3(q) ≤ ∏")]
['theta', '_', '3', '(', 'q', ')', '<=', 'prod', '']
"""

from __future__ import annotations

from dataclasses import dataclass

from ..errors import ParseError

#: longest accepted input, in characters
MAX_TEXT = 100_000
#: most digits in one integer literal
MAX_DIGITS = 2_000

_DIGITS = frozenset("0123456789")
_SYMBOLS = ["**", ">=", "<=", "+", "-", "*", "/", "^", "(", ")", "{", "}", ",", ";", "_", "=",
            "∞", "<", ">", "[", "]"]

#: Unicode characters of papers and PDFs, as the token their plain spelling gives
UNICODE = {
    "≥": ("sym", ">="), "⩾": ("sym", ">="), "≤": ("sym", "<="), "⩽": ("sym", "<="),
    "−": ("sym", "-"), "·": ("sym", "*"), "⋅": ("sym", "*"), "×": ("sym", "*"),
    "Σ": ("name", "sum"), "∑": ("name", "sum"), "Π": ("name", "prod"), "∏": ("name", "prod"),
    "η": ("name", "eta"), "θ": ("name", "theta"), "ϑ": ("name", "theta"),
    "φ": ("name", "phi"), "ϕ": ("name", "phi"), "ψ": ("name", "psi"), "χ": ("name", "chi"),
    "τ": ("name", "tau"),
}

#: LaTeX commands, as the token their plain spelling gives
LATEX = {
    "sum": ("name", "sum"), "prod": ("name", "prod"), "infty": ("sym", "∞"),
    "ge": ("sym", ">="), "geq": ("sym", ">="), "geqslant": ("sym", ">="),
    "le": ("sym", "<="), "leq": ("sym", "<="), "leqslant": ("sym", "<="),
    "cdot": ("sym", "*"), "times": ("sym", "*"),
    "eta": ("name", "eta"), "theta": ("name", "theta"), "vartheta": ("name", "theta"),
    "phi": ("name", "phi"), "varphi": ("name", "phi"), "psi": ("name", "psi"),
    "chi": ("name", "chi"), "tau": ("name", "tau"),
    "frac": ("cmd", "frac"), "dfrac": ("cmd", "frac"), "tfrac": ("cmd", "frac"),
    "binom": ("cmd", "binom"), "dbinom": ("cmd", "binom"), "tbinom": ("cmd", "binom"),
    "{": ("sym", "("), "}": ("sym", ")"),
}
#: LaTeX commands that only space or size what follows: dropped
LATEX_IGNORED = frozenset({
    ",", ";", ":", "!", " ", "quad", "qquad", "left", "right", "big", "Big", "bigg", "Bigg",
    "bigl", "bigr", "Bigl", "Bigr", "biggl", "biggr", "Biggl", "Biggr", "displaystyle",
    "textstyle", "limits", "nolimits",
})
#: the environments a Gaussian binomial is printed with
MATRIX_ENVIRONMENTS = frozenset({"bmatrix", "matrix", "pmatrix"})


@dataclass(frozen=True)
class Token:
    kind: str  # "num", "name", "sym", "cmd", "end"
    text: str
    pos: int


def _command(text: str, i: int) -> tuple[list[Token], int]:
    """The tokens of the LaTeX command starting with the backslash at ``i``, and the index
    after it."""
    n = len(text)
    j = i + 1
    if j < n and text[j].isascii() and text[j].isalpha():
        while j < n and text[j].isascii() and text[j].isalpha():
            j += 1
    elif j < n:
        j += 1                       # a one-character command: \, \; \! \{ \\ ...
    else:
        raise ParseError("a backslash ends the expression", text, i)
    name = text[i + 1:j]
    if name == "\\":
        return [Token("sym", "\\\\", i)], j
    if name in LATEX_IGNORED:
        if name in ("left", "right") and j < n and text[j] == ".":
            j += 1                   # \left. and \right. are invisible delimiters
        return [], j
    if name in ("begin", "end"):
        k = j
        while k < n and text[k].isspace():
            k += 1
        close = text.find("}", k)
        env = text[k + 1:close] if k < n and text[k] == "{" and close > k else ""
        if env not in MATRIX_ENVIRONMENTS:
            raise ParseError(f"\\{name}{{{env or '...'}}} is not read here; a Gaussian "
                             f"binomial is written \\begin{{bmatrix}} n \\\\ k "
                             f"\\end{{bmatrix}}_q or \\binom{{n}}{{k}}_q", text, i)
        return [Token("cmd", f"{name}-matrix", i)], close + 1
    if name in ("ldots", "dots", "cdots", "dotsc", "dotsb"):
        raise ParseError("'...' cannot be evaluated: write every parameter out", text, i)
    if name in LATEX:
        kind, plain = LATEX[name]
        return [Token(kind, plain, i)], j
    raise ParseError(f"unknown LaTeX command \\{name}", text, i)


def tokenize(text: str) -> list[Token]:
    """Split text into tokens (plain, Unicode or LaTeX; see the module docstring).

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
        if ch == "\\":
            toks, i = _command(text, i)
            out.extend(toks)
            continue
        if ch in UNICODE:
            kind, plain = UNICODE[ch]
            out.append(Token(kind, plain, i))
            i += 1
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
