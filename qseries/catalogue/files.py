"""Identity files: TOML, one ``[[identity]]`` table per entry, validated with file:line errors.

Fields of an entry (our own names):

=========== ==========================================================================
key         identifier, lowercase letters, digits and dashes (required)
title       one line (required)
left        the left side, in the notation; may use family templates (required)
right       the right side (required)
order       default order N: coefficients below q^N are compared (required)
source      authors, title, venue, year, equation or theorem; "from memory" where the
            equation number is not known (required)
tags        list of words for selection
params      a family: ``{k = "2..6", i = "1..k"}``; each range may use earlier parameters
expect      "holds" (default) or "fails": a printed form known to be wrong
fails_at    with expect = "fails": the exponent of the first mismatch
note        free text (what the misprint is, who corrected it)
corrects    the key of the misprinted entry that this entry corrects
weights     weights of extra variables, ``{c = 2, z = 1}``: z stands for z*q^w (see
            ``qseries check --weight``); by default 0, or 1 for all when 0 fails
same_as     the same identity as another entry in another form: ``{key = "other",
            substitution = "q -> -q", source = "..."}`` (see below)
=========== ==========================================================================

``same_as`` records that this entry is another entry (``key``: its key, or a family
member's id such as ``"euler-exponential[c=1]"``) written in another form; ``source`` (required)
names where that equivalence is stated.  Optional: ``substitution``, ``"q -> E"`` with E
one of ``q``, ``-q``, ``q^m``, ``-q^m`` (m a positive integer), read by the notation's
grammar: this entry's sides are the other entry's sides with q replaced by E; and
``swap = true`` when this entry's left side corresponds to the other's right side.
``verify`` checks both pairs of corresponding sides as series at the verify order and
reports the pair as one more line, ``this ~ other``.  In a family every member is paired
with the member of the same parameter values when ``key`` names a family with the same
parameter names.

Functions used by the entries of a file may be defined once in a top-level table
``[definitions]``, one line per function, ``"NAME(params)" = "body"`` in the notation::

    [definitions]
    "G(q)" = "1/((q;q^5)_inf (q^4;q^5)_inf)"
    "H(q)" = "H0(q)"
    "H0(q)" = "1/((q^2;q^5)_inf (q^3;q^5)_inf)"

Every entry of that file (family templates included) may call them, e.g. ``G(q^$k)``; they
are parsed by :mod:`qseries.lang.definitions` (expanded where they are called, never run as
code), may call each other in any order but not in a cycle, and apply to that file only.
A bad head, an unknown name or a cycle is an error at the definition's file:line.  Each
entry carries the definition texts (``Entry.definitions``), which ``verify`` passes to
:func:`qseries.check`.

``fails_at`` is an integer, or a fraction in a string such as ``"23/24"``.

Limits: only regular files are read (a FIFO, socket or device named ``*.toml`` is refused
with an error instead of being waited on), at most ``MAX_FILE_BYTES`` each; a family has at
most ``MAX_MEMBERS`` members, counted before any member is made; expanding the templates
and reading the members of one entry may take ``templates.MAX_STEPS`` steps, and all the
files loaded together ``MAX_LOAD_STEPS``.

>>> import tempfile, pathlib
>>> d = pathlib.Path(tempfile.mkdtemp())
>>> _ = (d / "x.toml").write_text('''
... [[identity]]
... key = "euler"
... title = "Euler"
... left = "(-q;q)_inf"
... right = "1/(q;q^2)_inf"
... order = 50
... source = "L. Euler (1748), from memory"
... ''')
>>> [e.key for e in load_entries([d])]
['euler']
"""

from __future__ import annotations

import os
import re
import stat
import tomllib
from dataclasses import dataclass, field, replace
from fractions import Fraction
from pathlib import Path

from ..errors import IdentityFileError, ParseError, QSeriesError, TemplateError
from ..lang import parse
from ..lang.ast import BinOp, Neg, Node, Num, Q, extra_variables
from ..lang.definitions import Definition, parse_definitions
from ..lang.parser import is_extra_variable
from .templates import Budget, expand_template, integer_expression

REQUIRED = ("key", "title", "left", "right", "order", "source")
OPTIONAL = ("tags", "params", "expect", "fails_at", "note", "corrects", "weights", "same_as")
SAME_AS_FIELDS = ("key", "substitution", "swap", "source")
MAX_MEMBERS = 500
MAX_ORDER = 100_000
MAX_FILE_BYTES = 1_000_000
MAX_LOAD_STEPS = 20_000_000
#: steps charged per character of a family member's side, for parsing it
PARSE_STEPS = 2
_KEY = re.compile(r"^[a-z0-9][a-z0-9-]*$")
_MEMBER = re.compile(r"^[a-z0-9][a-z0-9-]*(\[[A-Za-z]+=-?[0-9]+(,[A-Za-z]+=-?[0-9]+)*\])?$")
_EXPONENT = re.compile(r"^-?[0-9]{1,18}(/[0-9]{1,18})?$")
_ASSIGNS_IDENTITY = re.compile(r"^\s*identity\s*=")

__all__ = ["MAX_FILE_BYTES", "MAX_LOAD_STEPS", "MAX_MEMBERS", "MAX_ORDER", "Entry",
           "IdentityFileError", "SameAs", "identity_files", "load_entries", "load_file",
           "select", "substitution_node"]


@dataclass(frozen=True)
class SameAs:
    """An entry's ``same_as`` field: the other entry (``key`` as written), the substitution
    text (``""`` for none), whether the sides are swapped, the source of the equivalence and
    the field's ``file:line``.  Once the files are loaded, ``partner`` is the other entry's
    id and ``left``, ``right``, ``definitions`` are its sides and definition texts.

    >>> SameAs("x", "q -> -q", False, "from memory", "f.toml:3").partner
    ''
    """

    key: str
    substitution: str
    swap: bool
    source: str
    where: str
    partner: str = ""
    left: str = ""
    right: str = ""
    definitions: tuple[str, ...] = ()


def substitution_node(text: str) -> Node | None:
    """The tree of E in a substitution ``"q -> E"`` (None for ``""``, no substitution); E is
    parsed by the notation's grammar and must be q, -q, q^m or -q^m with m a positive
    integer.  A ValueError explains anything else.

    >>> substitution_node("q -> -q")
    Neg(operand=Q(pos=6), pos=5)
    >>> substitution_node("") is None
    True
    >>> substitution_node("q -> 1 - q")   # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    ValueError: the substitution must read "q -> E" with E one of q, -q, q^m, -q^m ...
    """
    wrong = ValueError(f"the substitution must read \"q -> E\" with E one of q, -q, q^m, "
                       f"-q^m (m a positive integer), not {text!r}")
    if not text.strip():
        return None
    head, arrow, body = text.partition("->")
    if not arrow or head.strip() != "q":
        raise wrong
    offset = len(head) + len(arrow)
    try:
        node = parse(" " * offset + body)
    except ParseError:
        raise wrong from None
    inner = node.operand if isinstance(node, Neg) else node
    if isinstance(inner, Q):
        return node
    if (isinstance(inner, BinOp) and inner.op == "^" and isinstance(inner.left, Q)
            and isinstance(inner.right, Num) and inner.right.value.denominator == 1
            and inner.right.value >= 1):
        return node
    raise wrong


@dataclass(frozen=True)
class Entry:
    """One identity (a family member has its parameter values in ``params``)."""

    key: str
    title: str
    left: str
    right: str
    order: int
    source: str
    path: str
    line: int
    tags: tuple[str, ...] = ()
    params: tuple[tuple[str, int], ...] = ()
    expect: str = "holds"
    fails_at: int | str | None = None
    note: str = ""
    corrects: str = ""
    family: str = field(default="")
    weights: tuple[tuple[str, int], ...] | None = None
    definitions: tuple[str, ...] = ()
    ranges: tuple[tuple[str, str], ...] = ()
    same_as: SameAs | None = None

    @property
    def weight_map(self) -> dict[str, int] | None:
        """The entry's weights as a dict (for ``check(..., weights=...)``), or None."""
        return None if self.weights is None else dict(self.weights)

    @property
    def ident(self) -> str:
        """The key, with parameter values for a family member: ``andrews-gordon[k=3,i=1]``."""
        if not self.params:
            return self.key
        return f"{self.key}[{','.join(f'{n}={v}' for n, v in self.params)}]"

    @property
    def label(self) -> str:
        """The key with the parameter values spelled out, for tables: ``andrews-gordon k=3
        i=1`` (the key alone for an entry that is not a family member).

        >>> Entry("ag", "t", "1", "1", 5, "s", "-", 1, params=(("k", 3), ("i", 1))).label
        'ag k=3 i=1'
        """
        return " ".join([self.key, *(f"{n}={v}" for n, v in self.params)])


def _entry_lines(text: str) -> list[tuple[int, dict[str, int]]]:
    """For each [[identity]] table: its header line and the line of each field."""
    out: list[tuple[int, dict[str, int]]] = []
    current = False
    for number, raw in enumerate(text.splitlines(), start=1):
        line = raw.strip()
        if line == "[[identity]]":
            out.append((number, {}))
            current = True
        elif line.startswith("["):
            current = False           # another table, such as [definitions]
        elif out and current and "=" in line and not line.startswith("#"):
            name = line.split("=", 1)[0].strip()
            out[-1][1].setdefault(name, number)
    return out


def _definition_lines(text: str) -> dict[str, int]:
    """The line of each key of the top-level table [definitions] (quotes removed); the
    header's own line under the key ""."""
    out: dict[str, int] = {}
    inside = False
    for number, raw in enumerate(text.splitlines(), start=1):
        line = raw.strip()
        if line.startswith("["):
            inside = line.split("#", 1)[0].strip() == "[definitions]"
            if inside:
                out.setdefault("", number)
        elif inside and "=" in line and not line.startswith("#"):
            out.setdefault(line.split("=", 1)[0].strip().strip("\"'"), number)
    return out


def _definitions(value: object, text: str, path: Path,
                 budget: Budget) -> tuple[tuple[str, ...], dict[str, Definition]]:
    """The texts ``"NAME(params) = body"`` of a file's [definitions] table, and their
    parsed form; errors name the file and the definition's line."""
    if value is None:
        return (), {}
    lines = _definition_lines(text)
    if "" not in lines:             # an inline table or another form: its first line
        lines[""] = next((n for n, raw in enumerate(text.splitlines(), start=1)
                          if raw.strip().startswith("definitions")), 1)
    if not isinstance(value, dict):
        raise IdentityFileError(f"{path}:{lines['']}: definitions must be a table, "
                                f"[definitions] with lines \"G(q)\" = \"...\"")
    texts: list[str] = []
    where: dict[str, str] = {}
    for head, body in value.items():
        at = f"{path}:{lines.get(head, lines.get('', 1))}"
        if not isinstance(body, str) or not body.strip():
            raise IdentityFileError(f"{at}: the definition of {head} must be a non-empty "
                                    f"string in the notation")
        try:
            budget.spend(PARSE_STEPS * (len(head) + len(body)))
        except TemplateError as err:
            raise IdentityFileError(f"{at}: {err}") from None
        definition = f"{head} = {body}"
        texts.append(definition)
        where[definition] = at
    try:
        parsed = parse_definitions(texts)
    except ParseError as err:
        at = where.get(err.text, f"{path}:{lines.get('', 1)}")
        raise IdentityFileError(f"{at}: bad definition: {err}") from None
    except QSeriesError as err:
        raise IdentityFileError(f"{path}:{lines.get('', 1)}: bad definition: {err}") from None
    return tuple(texts), parsed


def _ranges(spec: dict, where: str, budget: Budget) -> list[dict[str, int]]:
    """All parameter assignments of a family, in order; the members are counted before any
    is made (a range such as 1..10^18 is refused at once)."""
    assignments: list[dict[str, int]] = [{}]
    for name, rng in spec.items():
        if not (isinstance(name, str) and name.isalpha() and name.isascii()):
            raise IdentityFileError(f"{where}: parameter names are letters, not {name!r}")
        if not isinstance(rng, str) or ".." not in rng:
            raise IdentityFileError(f"{where}: parameter {name} needs a range such as \"1..k\"")
        lo_text, hi_text = rng.split("..", 1)
        bounds: list[tuple[dict[str, int], int, int]] = []
        members = 0
        for a in assignments:
            try:
                lo = integer_expression(lo_text.strip(), a, budget)
                hi = integer_expression(hi_text.strip(), a, budget)
            except TemplateError as err:
                raise IdentityFileError(f"{where}: {err}") from None
            except QSeriesError as err:
                raise IdentityFileError(f"{where}: range of {name}: {err}") from None
            members += max(0, hi - lo + 1)
            if members > MAX_MEMBERS:
                raise IdentityFileError(f"{where}: more than {MAX_MEMBERS} family members")
            bounds.append((a, lo, hi))
        assignments = [{**a, name: v} for a, lo, hi in bounds for v in range(lo, hi + 1)]
    return assignments


def _check_side(text: str, where: str, definitions: dict[str, Definition] | None = None):
    try:
        return parse(text, definitions=definitions)
    except ParseError as err:
        raise IdentityFileError(f"{where}: {err}") from None


def _read(path: Path) -> str:
    """The text of a regular file of at most MAX_FILE_BYTES bytes.  The file is opened
    without blocking and checked after opening, so a FIFO (even one put in place of a file
    after it was listed) is refused instead of waited on."""
    flags = os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_NOCTTY", 0)
    try:
        fd = os.open(path, flags)
    except OSError as err:
        raise IdentityFileError(f"{path}: cannot read: {err.strerror or err}") from None
    try:
        info = os.fstat(fd)
        if not stat.S_ISREG(info.st_mode):
            raise IdentityFileError(f"{path}: not a regular file (a folder, FIFO, socket or "
                                    f"device); identity files must be regular files")
        if info.st_size > MAX_FILE_BYTES:
            raise IdentityFileError(f"{path}: larger than {MAX_FILE_BYTES} bytes; split it "
                                    f"into several identity files")
        with os.fdopen(fd, "rb", closefd=True) as f:
            fd = -1
            data = f.read(MAX_FILE_BYTES + 1)
    except OSError as err:
        raise IdentityFileError(f"{path}: cannot read: {err.strerror or err}") from None
    finally:
        if fd >= 0:
            os.close(fd)
    if len(data) > MAX_FILE_BYTES:
        raise IdentityFileError(f"{path}: larger than {MAX_FILE_BYTES} bytes; split it into "
                                f"several identity files")
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError as err:
        raise IdentityFileError(f"{path}: cannot read: not UTF-8 text ({err.reason} at byte "
                                f"{err.start})") from None


def _fails_at(value: object, where: str) -> int | str:
    """An exponent: an integer, or a fraction in a string such as "23/24"."""
    if isinstance(value, int) and not isinstance(value, bool):
        return value
    if isinstance(value, str) and _EXPONENT.match(value.strip()):
        number = value.strip()
        if number.partition("/")[2].strip("0") or "/" not in number:
            exponent = Fraction(number)
            return exponent.numerator if exponent.denominator == 1 else str(exponent)
    shown = repr(value) if len(repr(value)) <= 40 else repr(value)[:37] + "..."
    raise IdentityFileError(f"{where}: fails_at must be an integer or a fraction in a string "
                            f"such as \"23/24\" (the exponent of the first mismatch), not "
                            f"{shown}")


def load_file(path: Path, budget: Budget | None = None) -> list[Entry]:
    """Entries of one identity file, families expanded, every side parsed; template work
    is spent from ``budget`` (each entry has ``templates.MAX_STEPS`` steps of its own)."""
    text = _read(path)
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as err:
        raise IdentityFileError(f"{path}: not valid TOML: {err}") from None
    unknown_top = set(data) - {"identity", "definitions"}
    if unknown_top:
        raise IdentityFileError(f"{path}:1: unknown top-level field(s) {sorted(unknown_top)}; "
                                f"entries are [[identity]] tables, functions a "
                                f"[definitions] table")
    file_steps = Budget(parent=budget, what="reading the definitions of this file")
    definition_texts, definitions = _definitions(data.get("definitions"), text, path,
                                                 file_steps)
    tables = data.get("identity", [])
    if not isinstance(tables, list) or not all(isinstance(t, dict) for t in tables):
        line = next((n for n, raw in enumerate(text.splitlines(), start=1)
                     if _ASSIGNS_IDENTITY.match(raw)), 1)
        raise IdentityFileError(f"{path}:{line}: 'identity' must be an array of tables: "
                                f"[[identity]] sections")
    lines = _entry_lines(text)
    entries: list[Entry] = []
    for idx, table in enumerate(tables):
        header, field_lines = lines[idx] if idx < len(lines) else (1, {})

        def at(name: str, header: int = header, field_lines: dict = field_lines) -> str:
            return f"{path}:{field_lines.get(name, header)}"

        for name in table:
            if name not in REQUIRED and name not in OPTIONAL:
                raise IdentityFileError(f"{at(name)}: unknown field {name!r} (known: "
                                        f"{', '.join(REQUIRED + OPTIONAL)})")
        for name in REQUIRED:
            if name not in table:
                raise IdentityFileError(f"{path}:{header}: missing field {name!r}")
        for name in ("key", "title", "left", "right", "source"):
            if not isinstance(table[name], str) or not table[name].strip():
                raise IdentityFileError(f"{at(name)}: {name} must be a non-empty string")
        if not _KEY.match(table["key"]):
            raise IdentityFileError(f"{at('key')}: key {table['key']!r} must use lowercase "
                                    f"letters, digits and dashes")
        order = table["order"]
        if isinstance(order, bool) or not isinstance(order, int) or not 1 <= order <= MAX_ORDER:
            raise IdentityFileError(f"{at('order')}: order must be an integer from 1 to "
                                    f"{MAX_ORDER}")
        tags = table.get("tags", [])
        if not isinstance(tags, list) or not all(isinstance(t, str) for t in tags):
            raise IdentityFileError(f"{at('tags')}: tags must be a list of strings")
        expect = table.get("expect", "holds")
        if expect not in ("holds", "fails"):
            raise IdentityFileError(f"{at('expect')}: expect must be \"holds\" or \"fails\"")
        fails_at = table.get("fails_at")
        if expect == "fails" and fails_at is None:
            raise IdentityFileError(f"{at('expect')}: an entry expected to fail needs "
                                    f"fails_at (the exponent of the first mismatch)")
        if expect == "holds" and fails_at is not None:
            raise IdentityFileError(f"{at('fails_at')}: fails_at goes with expect = \"fails\"")
        if fails_at is not None:
            fails_at = _fails_at(fails_at, at("fails_at"))
        for name in ("note", "corrects"):
            if not isinstance(table.get(name, ""), str):
                raise IdentityFileError(f"{at(name)}: {name} must be a string")
        weights = _weights(table.get("weights"), at("weights"))
        same_as = _same_as(table.get("same_as"), at("same_as"), table["key"])
        params = table.get("params")
        if params is not None and not isinstance(params, dict):
            raise IdentityFileError(f"{at('params')}: params must be a table of ranges")
        steps = Budget(parent=budget, what="expanding the templates of this entry")
        assignments = _ranges(params, at("params"), steps) if params else [{}]
        for values in assignments:
            sides = []
            trees = []
            for name in ("left", "right"):
                try:
                    if params:
                        side = expand_template(table[name], values, steps)
                        steps.spend(PARSE_STEPS * len(side))
                    else:
                        side = table[name]
                except TemplateError as err:
                    raise IdentityFileError(f"{at(name)}: {err}") from None
                label = f"{at(name)}" + (f" (with {values})" if values else "")
                trees.append(_check_side(side, label, definitions))
                sides.append(side)
            entries.append(Entry(
                key=table["key"], title=table["title"], left=sides[0], right=sides[1],
                order=order, source=table["source"], path=str(path), line=header,
                tags=tuple(tags), params=tuple(values.items()), expect=expect,
                fails_at=fails_at, note=table.get("note", ""),
                corrects=table.get("corrects", ""), family=table["key"] if params else "",
                weights=weights, definitions=definition_texts,
                ranges=tuple((n, str(r)) for n, r in params.items()) if params else (),
                same_as=same_as))
            if weights is not None:
                names = extra_variables(trees[0]) | extra_variables(trees[1])
                stray = sorted(dict(weights).keys() - names)
                if stray:
                    raise IdentityFileError(f"{at('weights')}: {stray[0]!r} is not an extra "
                                            f"variable of either side")
    return entries


def _same_as(value: object, where: str, own_key: str) -> SameAs | None:
    """The ``same_as`` table of an entry, checked (its partner is found later)."""
    if value is None:
        return None
    if not isinstance(value, dict):
        raise IdentityFileError(f"{where}: same_as must be a table such as {{key = \"other\", "
                                f"substitution = \"q -> -q\", source = \"...\"}}")
    for name in value:
        if name not in SAME_AS_FIELDS:
            raise IdentityFileError(f"{where}: unknown field {name!r} in same_as (known: "
                                    f"{', '.join(SAME_AS_FIELDS)})")
    for name in ("key", "source"):
        if not isinstance(value.get(name), str) or not value[name].strip():
            raise IdentityFileError(f"{where}: same_as needs {name}, a non-empty string")
    key = value["key"].strip()
    if not _MEMBER.match(key):
        raise IdentityFileError(f"{where}: same_as key {key!r} must be an entry's key or a "
                                f"family member's id such as \"fam[c=1]\"")
    if key == own_key:
        raise IdentityFileError(f"{where}: same_as names the entry itself ({key!r}); it "
                                f"must name another entry")
    substitution = value.get("substitution", "")
    if not isinstance(substitution, str):
        raise IdentityFileError(f"{where}: same_as substitution must be a string such as "
                                f"\"q -> -q\"")
    try:
        substitution_node(substitution)
    except ValueError as err:
        raise IdentityFileError(f"{where}: {err}") from None
    swap = value.get("swap", False)
    if not isinstance(swap, bool):
        raise IdentityFileError(f"{where}: same_as swap must be true or false")
    return SameAs(key, " ".join(substitution.split()), swap, value["source"], where)


def _siblings(entries: list[Entry], budget: Budget) -> list[Entry]:
    """The entries of the other identity files beside the files of ``entries`` whose
    ``same_as`` names a key that none of ``entries`` has (a file verified alone may pair
    with an entry of its catalogue folder); a sibling file that cannot be read is skipped
    (the pair then stays unresolved, an error)."""
    keys = {e.key for e in entries}
    wanted = [e for e in entries if e.same_as is not None
              and e.same_as.key.split("[", 1)[0] not in keys]
    loaded = {str(Path(e.path)) for e in entries}
    folders = sorted({str(Path(e.path).parent) for e in wanted})
    out: list[Entry] = []
    for folder in folders:
        for f in sorted(Path(folder).glob("*.toml")):
            if str(f) in loaded or not f.is_file():
                continue
            loaded.add(str(f))
            try:
                out.extend(load_file(f, budget))
            except IdentityFileError:
                continue
    return out


def _partners(entries: list[Entry], others: list[Entry] = ()) -> list[Entry]:
    """The entries with each ``same_as`` resolved to its partner's id, sides and
    definitions (the partner is one of ``entries`` or else of ``others``); a family member
    pairs with the member of the same values when the key names a family with the same
    parameter names."""
    pool = [*others, *entries]
    by_ident = {e.ident: e for e in pool}
    families = {e.key: tuple(n for n, _ in e.params) for e in pool if e.params}
    out: list[Entry] = []
    for e in entries:
        s = e.same_as
        if s is None:
            out.append(e)
            continue
        target = s.key
        if e.params and families.get(target) == tuple(n for n, _ in e.params):
            target = Entry(target, "", "", "", 1, "", "", 0, params=e.params).ident
        partner = by_ident.get(target)
        if partner is None:
            hint = (f"; {s.key!r} is a family: name a member such as {s.key}[...]"
                    if s.key in families else "")
            raise IdentityFileError(f"{s.where}: same_as names {target!r}, which is not an "
                                    f"entry{hint}")
        if partner.ident == e.ident:
            raise IdentityFileError(f"{s.where}: same_as names the entry itself "
                                    f"({e.ident!r}); it must name another entry")
        out.append(replace(e, same_as=replace(
            s, partner=partner.ident, left=partner.left, right=partner.right,
            definitions=partner.definitions)))
    return out


def _weights(value: object, where: str) -> tuple[tuple[str, int], ...] | None:
    if value is None:
        return None
    if not isinstance(value, dict) or not all(
            isinstance(k, str) and is_extra_variable(k) and isinstance(v, int)
            and not isinstance(v, bool) and 0 <= v <= 1000 for k, v in value.items()):
        raise IdentityFileError(f"{where}: weights must be a table of extra variables and "
                                f"integers from 0 to 1000, such as {{c = 2, z = 1}}")
    return tuple(sorted(value.items()))


def identity_files(paths: list[Path]) -> list[Path]:
    """The .toml files named, or found (recursively) in the folders named, in order.  Names
    that are not regular files (a FIFO, a device) are listed too: reading them is refused."""
    files: list[Path] = []
    for p in paths:
        if p.is_dir():
            files.extend(sorted(f for f in p.rglob("*.toml") if not f.is_dir()))
        elif p.exists():
            files.append(p)
        else:
            raise IdentityFileError(f"{p}: no such file or folder")
    return files


def load_entries(paths: list[Path] | list[str]) -> list[Entry]:
    """All entries of the given files and folders; keys must be unique across them.  The
    template work of all of them together is at most ``MAX_LOAD_STEPS`` steps.  A
    ``same_as`` naming a key that is in none of them is looked up in the other identity
    files of the same folder (so one file of a catalogue can be verified alone)."""
    entries: list[Entry] = []
    seen: dict[str, str] = {}
    budget = Budget(MAX_LOAD_STEPS, what="expanding the templates of all the files")
    for f in identity_files([Path(p) for p in paths]):
        for e in load_file(f, budget):
            if e.key in seen and seen[e.key] != f"{e.path}:{e.line}":
                raise IdentityFileError(f"{e.path}:{e.line}: key {e.key!r} is already used at "
                                        f"{seen[e.key]}")
            seen[e.key] = f"{e.path}:{e.line}"
            entries.append(e)
    keys = {e.key for e in entries}
    for e in entries:
        if e.corrects and e.corrects not in keys:
            raise IdentityFileError(f"{e.path}:{e.line}: corrects {e.corrects!r}, which is not "
                                    f"an entry")
    return _partners(entries, _siblings(entries, budget))


def select(entries: list[Entry], wanted: list[str]) -> list[Entry]:
    """Entries whose key, member id (``andrews-gordon[k=3,i=1]``, or as the tables show it,
    ``andrews-gordon k=3 i=1``) or a tag is in ``wanted`` (all when empty).

    >>> e = Entry("ag", "t", "1", "1", 5, "s", "-", 1, params=(("k", 3),))
    >>> [len(select([e], [w])) for w in ("ag", "ag[k=3]", "ag k=3", "ag k=4")]
    [1, 1, 1, 0]
    """
    if not wanted:
        return entries
    w = {" ".join(x.split()) for x in wanted}
    return [e for e in entries if e.key in w or e.ident in w or e.label in w
            or w & set(e.tags)]
