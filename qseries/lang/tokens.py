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
    "τ": ("name", "tau"), "∈": ("sym", "∈"), "ℤ": ("sym", "ℤ"),
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
    "{": ("sym", "("), "}": ("sym", ")"), "in": ("sym", "∈"),
}
#: LaTeX commands that only space or size what follows: dropped
LATEX_IGNORED = frozenset({
    ",", ";", ":", "!", " ", "quad", "qquad", "left", "right", "big", "Big", "bigg", "Bigg",
    "bigl", "bigr", "Bigl", "Bigr", "biggl", "biggr", "Biggl", "Biggr", "displaystyle",
    "textstyle", "limits", "nolimits",
})
#: the sizing commands of LATEX_IGNORED that may come before a bracket
LATEX_SIZED = frozenset(x for x in LATEX_IGNORED if x in ("left", "right") or
                        x.lower().startswith("big"))
#: LaTeX commands dropped together with their argument in braces, or alone
LATEX_SKIPPED_WITH_ARGUMENT = frozenset({"label", "tag", "nonumber", "notag"})
#: the environments a Gaussian binomial is printed with
MATRIX_ENVIRONMENTS = frozenset({"bmatrix", "matrix", "pmatrix"})
#: the display environments whose whole text may be pasted (their delimiters are dropped)
DISPLAY_ENVIRONMENTS = frozenset({
    "equation", "equation*", "align", "align*", "gather", "gather*", "multline",
    "multline*", "displaymath", "math"})


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
        elif name in LATEX_SIZED and j < n and text[j] in "[]":
            # \left[ ... \right] (and \bigl[ ...): resolved by ``tokenize``
            return [Token("sized", text[j], j)], j + 1
        return [], j
    if name in LATEX_SKIPPED_WITH_ARGUMENT:          # \label{eq:1}, \tag{2.3}
        k = j
        while k < n and text[k].isspace():
            k += 1
        if k < n and text[k] == "{":
            close = text.find("}", k)
            if close < 0:
                raise ParseError(f"\\{name}{{ is not closed", text, i)
            return [], close + 1
        return [], j
    if name in ("frac", "dfrac", "tfrac", "binom", "dbinom", "tbinom"):
        return _unbraced_arguments(text, i, j, LATEX[name])
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
    if name == "mathbb":                             # \mathbb{Z}, \mathbb Z: the integers
        k = j
        while k < n and text[k].isspace():
            k += 1
        braced = k < n and text[k] == "{"
        letter = text[k + 1:text.find("}", k)].strip() if braced else text[k:k + 1]
        after = text.find("}", k) + 1 if braced else k + 1
        if letter != "Z" or (braced and after == 0):
            raise ParseError(f"\\mathbb{{{letter}}} is not read here: a sum over the integers "
                             f"is written n \\in \\mathbb{{Z}}; over the naturals write n \\ge 0 "
                             f"or n \\ge 1", text, i)
        return [Token("sym", "ℤ", i)], after
    if name in ("ldots", "dots", "cdots", "dotsc", "dotsb"):
        raise ParseError("'...' cannot be evaluated: write every parameter out", text, i)
    if name in LATEX:
        kind, plain = LATEX[name]
        return [Token(kind, plain, i)], j
    raise ParseError(f"unknown LaTeX command \\{name}", text, i)


def _unbraced_arguments(text: str, i: int, j: int, token: tuple[str, str]
                        ) -> tuple[list[Token], int]:
    """\\frac and \\binom, whose arguments may be single characters as in TeX: \\frac12,
    \\frac1{q}, \\binom n2.  Each argument written without braces is one character, given
    braces here; the first braced argument ends this (the braces then tokenize as usual)."""
    out = [Token(token[0], token[1], i)]
    n = len(text)
    for _ in range(2):
        k = j
        while k < n and text[k].isspace():
            k += 1
        if k >= n or text[k] == "{" or not (text[k].isascii() and text[k].isalnum()):
            break
        out += [Token("sym", "{", k), Token("num" if text[k].isdigit() else "name", text[k], k),
                Token("sym", "}", k)]
        j = k + 1
    return out, j


def _only_an_ending_after(text: str, i: int) -> bool:
    """True when text[i:] is a display's closing punctuation: '.', ',' or a line break
    \\\\, then blanks."""
    rest = text[i:].strip()
    while rest.endswith("\\\\") or rest.endswith(".") or rest.endswith(","):
        rest = rest[:-2] if rest.endswith("\\\\") else rest[:-1]
        rest = rest.rstrip()
    return rest == ""


def _sized_bracket(t: Token, text: str, stack: list[str]) -> Token:
    """\\left[ ... \\right] as papers use it: the coefficient extractor when the bracket
    holds q^(...) (``\\left[q^{5n+4}\\right] F``), else grouping, as parentheses do
    (``\\left[\\frac{1}{(q;q)_\\infty}\\right]``)."""
    if t.text == "[":
        rest = text[t.pos + 1:].lstrip()
        kind = "[" if rest.startswith("q^") or rest.startswith("q ^") else "("
        stack.append(kind)
        return Token("sym", kind, t.pos)
    if not stack:
        raise ParseError("\\right] without \\left[", text, t.pos)
    return Token("sym", "]" if stack.pop() == "[" else ")", t.pos)


def display_body(text: str) -> tuple[int, int]:
    r"""The span (start, end) of ``text`` inside the delimiters of a LaTeX display pasted
    whole: ``\[ ... \]``, ``$$ ... $$``, ``$ ... $``, ``\( ... \)`` and
    ``\begin{equation} ... \end{equation}`` (also starred, align, gather, multline,
    displaymath); the whole text when it has none.  An opening delimiter without its
    closing one (or the reverse) is an error at the delimiter.

    >>> text = r"\[ \theta_3(q)^2 = 1 + 4q + O(q^{2}) \]"
    >>> start, end = display_body(text)
    >>> print(text[start:end].strip())
    \theta_3(q)^2 = 1 + 4q + O(q^{2})
    >>> display_body("1 + q")
    (0, 5)
    """
    n = len(text)
    start, end = n - len(text.lstrip()), len(text.rstrip())
    body = text[start:end]
    pairs = (("\\[", "\\]"), ("\\(", "\\)"), ("$$", "$$"), ("$", "$"))
    for opening, closing in pairs:
        if body.startswith(opening):
            if body.endswith(closing) and len(body) >= len(opening) + len(closing):
                return start + len(opening), end - len(closing)
            raise ParseError(f"the display opened by {opening} is not closed by {closing}",
                             text, start)
    for opening, closing in pairs:
        if body.endswith(closing):
            raise ParseError(f"{closing} closes a display that no {opening} opened", text,
                             end - len(closing))
    if body.startswith("\\begin{"):
        close = body.find("}")
        env = body[len("\\begin{"):close] if close > 0 else ""
        if env in DISPLAY_ENVIRONMENTS:
            ending = f"\\end{{{env}}}"
            if not body.endswith(ending):
                raise ParseError(f"\\begin{{{env}}} is not closed by {ending}", text, start)
            return start + close + 1, end - len(ending)
    return 0, n


def tokenize(text: str) -> list[Token]:
    """Split text into tokens (plain, Unicode or LaTeX; see the module docstring).  The
    delimiters of a display pasted whole (``\\[ ... \\]``, ``$ ... $``,
    ``\\begin{equation} ... \\end{equation}``) are dropped (:func:`display_body`).

    >>> [t.text for t in tokenize("2q^3 (q;q)_inf")]
    ['2', 'q', '^', '3', '(', 'q', ';', 'q', ')', '_', 'inf', '']
    >>> [t.text for t in tokenize(r"$$ q^{2} $$")]
    ['q', '^', '{', '2', '}', '']
    """
    if len(text) > MAX_TEXT:
        raise ParseError(f"the expression is longer than {MAX_TEXT} characters",
                         text[:200], 200)
    out: list[Token] = []
    sized: list[str] = []                # the open \left[ brackets, as what they became
    i, n = display_body(text)
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
        if ch in ".,\\" and _only_an_ending_after(text[:n], i):
            break                    # "... (q;q)_\\infty." as a display ends
        if ch == "&":
            i += 1                   # an alignment mark of a display: &=
            continue
        if ch == "\\":
            toks, i = _command(text, i)
            for t in toks:
                if t.kind == "sized":
                    t = _sized_bracket(t, text, sized)
                out.append(t)
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
