"""Write identity files: the TOML that :mod:`qseries.catalogue.files` reads.

>>> text = identity_file_text([{"key": "euler", "title": "Euler", "left": "(-q;q)_inf",
...     "right": "1/(q;q^2)_inf", "order": 50, "source": "from memory",
...     "params": {"b": "0..0"}, "tags": ["classic"]}], comment="written by a test")
>>> print(text)                     # doctest: +NORMALIZE_WHITESPACE
# written by a test
<BLANKLINE>
[[identity]]
key = "euler"
title = "Euler"
left = "(-q;q)_inf"
right = "1/(q;q^2)_inf"
order = 50
source = "from memory"
tags = ["classic"]
params = {b = "0..0"}
<BLANKLINE>
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence

from ..errors import IdentityFileError
from .files import OPTIONAL, REQUIRED

__all__ = ["identity_file_text", "toml_string"]


def toml_string(text: str) -> str:
    """A TOML basic string holding ``text`` exactly.

    >>> toml_string('say "hi"\\\\n')
    '"say \\\\"hi\\\\"\\\\\\\\n"'
    """
    out = ['"']
    for ch in text:
        if ch == '"':
            out.append('\\"')
        elif ch == "\\":
            out.append("\\\\")
        elif ord(ch) < 0x20 or ord(ch) == 0x7F:
            out.append(f"\\u{ord(ch):04X}")
        else:
            out.append(ch)
    out.append('"')
    return "".join(out)


def _bare_or_quoted(key: str) -> str:
    if key and all(c.isascii() and (c.isalnum() or c in "-_") for c in key):
        return key
    return toml_string(key)


def _value(name: str, value: object) -> str:
    if isinstance(value, bool):
        raise IdentityFileError(f"field {name}: booleans are not used in identity files")
    if isinstance(value, int):
        return str(value)
    if isinstance(value, str):
        return toml_string(value)
    if isinstance(value, Sequence):
        return "[" + ", ".join(_value(name, v) for v in value) + "]"
    if isinstance(value, Mapping):
        return "{" + ", ".join(f"{_bare_or_quoted(str(k))} = {_value(name, v)}"
                               for k, v in value.items()) + "}"
    raise IdentityFileError(f"field {name}: cannot write a {type(value).__name__}")


def identity_file_text(entries: Sequence[Mapping[str, object]],
                       definitions: Sequence[str] = (), comment: str = "") -> str:
    """The text of an identity file with one ``[[identity]]`` table per entry (fields as
    :mod:`qseries.catalogue.files` names them, written in its order), a ``[definitions]``
    table for the texts ``"NAME(params) = body"`` in ``definitions``, and ``comment`` as
    lines of ``#`` comments at the top."""
    lines = [f"# {line}".rstrip() for line in comment.splitlines()]
    if lines:
        lines.append("")
    if definitions:
        lines.append("[definitions]")
        for text in definitions:
            head, sep, body = text.partition("=")
            if not sep:
                raise IdentityFileError(f"definition {text!r}: write NAME(params) = body")
            lines.append(f"{toml_string(head.strip())} = {toml_string(body.strip())}")
        lines.append("")
    known = REQUIRED + OPTIONAL
    for entry in entries:
        unknown = [k for k in entry if k not in known]
        if unknown:
            raise IdentityFileError(f"unknown field(s) {unknown} (known: {', '.join(known)})")
        lines.append("[[identity]]")
        for name in known:
            if name in entry:
                lines.append(f"{name} = {_value(name, entry[name])}")
        lines.append("")
    return "\n".join(lines)
