"""How results show themselves in a notebook, without this layer knowing any layout.

The result classes of :mod:`qseries.analysis` (``CheckResult``, ``ProductForm``,
``Distribution``) derive from :class:`Displayed`, whose ``_repr_html_`` and ``_repr_latex_``
(the methods Jupyter calls) and ``_repr_pretty_`` (IPython's plain text) look the renderer
up in a table.  The renderers live in the
report layer, below this one (:mod:`qseries.report.notebook`), which fills the table when it
is imported; ``import qseries`` asks for that import to happen before the first lookup
(:func:`register_later`), so a program that displays nothing never loads it.  With no
renderer registered, the methods return None and Jupyter shows the plain text.

>>> class Answer(Displayed):
...     pass
>>> Answer()._repr_html_() is None
True
>>> register_display(Answer, "html", lambda a: "<b>42</b>")
>>> Answer()._repr_html_()
'<b>42</b>'
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

#: the kinds of rendering a notebook asks for ("text": IPython's plain text)
KINDS = ("html", "latex", "text")

_RENDERERS: dict[tuple[type, str], Callable[[Any], str]] = {}
#: loaders of renderers not yet run (each registers some when called)
_PENDING: list[Callable[[], object]] = []


def register_display(cls: type, kind: str, render: Callable[[Any], str]) -> None:
    """Let ``render(obj)`` be the ``kind`` ("html" or "latex") rendering of instances of
    ``cls`` (and of its subclasses that have none of their own).

    >>> register_display(int, "svg", str)
    Traceback (most recent call last):
    ...
    ValueError: kind must be one of ('html', 'latex', 'text'), not 'svg'
    """
    if kind not in KINDS:
        raise ValueError(f"kind must be one of {KINDS}, not {kind!r}")
    _RENDERERS[(cls, kind)] = render


def register_later(load: Callable[[], object]) -> None:
    """Call ``load()``, which registers renderers, once, before the next lookup of a
    rendering (rather than now).

    >>> class Later(Displayed):
    ...     pass
    >>> register_later(lambda: register_display(Later, "text", lambda x: "registered later"))
    >>> rendered(Later(), "text")
    'registered later'
    """
    _PENDING.append(load)


def rendered(obj: object, kind: str) -> str | None:
    """The registered ``kind`` rendering of ``obj`` (by its class, then its bases), or
    None when there is none.

    >>> rendered(3, "html") is None
    True
    """
    while _PENDING:
        _PENDING.pop(0)()
    for cls in type(obj).__mro__:
        render = _RENDERERS.get((cls, kind))
        if render is not None:
            return render(obj)
    return None


class Displayed:
    """Base of the results that a notebook renders as HTML or LaTeX (see the module)."""

    __slots__ = ()

    def _repr_html_(self) -> str | None:
        return rendered(self, "html")

    def _repr_latex_(self) -> str | None:
        return rendered(self, "latex")

    def _repr_pretty_(self, p: Any, cycle: bool) -> None:
        """IPython's plain text: the registered "text" rendering, else the ``repr``."""
        text = rendered(self, "text")
        p.text(repr(self) if text is None else text)
