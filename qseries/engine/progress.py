"""Progress of one evaluation: the parts of an expression (its sums, products and named
functions that lie inside no other one, such as the two products of
``1/((q;q^5)_inf (q^4;q^5)_inf)``) and a tracker that reports each part as its value is
known, to a callback ``progress(text, done, total)`` passed to :class:`Evaluator`.

The callback is an argument, never global state.  A part evaluated inside another path
of the engine (a pair of products, a quotient left undone) is reported when the
evaluation ends, so ``done`` always reaches ``total``; a failed evaluation reports no more.

>>> from qseries.lang import parse
>>> [show(p) for p in top_parts(parse("2 sum_{n>=0} q^n/(q;q)_n + 1/(q;q^2)_inf"))]
['sum_{n>=0} q^n / (q;q)_n', '(q;q^2)_inf']
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from contextlib import contextmanager
from typing import TYPE_CHECKING

from ..lang.ast import BigOp, Call, Node, Poch, children, mentions_q
from ..lang.printer import show

if TYPE_CHECKING:
    from .evaluator import Evaluator

#: ``progress(text, done, total)``: the text of the part just evaluated, and how many of
#: the expression's ``total`` parts are evaluated
PartProgress = Callable[[str, int, int], None]

__all__ = ["PartProgress", "PartTracker", "top_parts", "tracking"]


def top_parts(node: Node) -> list[Node]:
    """The sums, products (written with sum_/prod_ or as q-Pochhammer symbols) and named
    functions of ``node`` that lie inside no other one and involve q, in the order written.

    >>> from qseries.lang import parse
    >>> [show(p) for p in top_parts(parse("theta_3(q)^2 - prod_{n>=1} (1-q^n)^(-1)"))]
    ['theta_3(q)', 'prod_{n>=1} (1 - q^n)^-1']
    >>> top_parts(parse("1/(1-q) + q^7"))
    []
    """
    out: list[Node] = []
    stack = [node]
    while stack:                # no recursion: long sums of terms are deep spines
        n = stack.pop()
        if isinstance(n, (BigOp, Poch, Call)):
            if mentions_q(n):
                out.append(n)
            continue
        stack.extend(reversed(children(n)))
    return out


class PartTracker:
    """Reports each of the top parts of one expression once, when it is first evaluated.

    >>> from qseries.lang import parse
    >>> said = []
    >>> t = PartTracker(parse("(q;q)_inf + (q^2;q^2)_inf"),
    ...                 lambda text, done, total: said.append((text, done, total)))
    >>> t.finished(t.parts[1]); t.finish()
    >>> said
    [('(q^2;q^2)_inf', 1, 2), ('(q;q)_inf', 2, 2)]
    """

    def __init__(self, node: Node, report: PartProgress) -> None:
        self.parts = top_parts(node)
        self.done = 0
        self._report = report
        # keyed by identity (equal subtrees at two places are two parts)
        self._pending = {id(p): p for p in self.parts}

    def finished(self, node: Node) -> None:
        """Report ``node`` if it is a part not yet reported."""
        if self._pending.get(id(node)) is node:
            del self._pending[id(node)]
            self.done += 1
            self._report(show(node), self.done, len(self.parts))

    def finish(self) -> None:
        """Report the parts not yet reported (evaluated along another path)."""
        for p in self.parts:
            self.finished(p)


@contextmanager
def tracking(ev: Evaluator, node: Node) -> Iterator[None]:
    """While evaluating ``node``, let ``ev`` report its parts to ``ev.progress`` (if any);
    the parts left are reported at a normal end.

    >>> from qseries.engine import Evaluator
    >>> from qseries.lang import parse
    >>> ev = Evaluator(progress=print)
    >>> with tracking(ev, parse("(q;q)_inf")):
    ...     pass
    (q;q)_inf 1 1
    """
    if ev.progress is None:
        yield
        return
    before = ev.parts
    ev.parts = PartTracker(node, ev.progress)
    try:
        yield
        ev.parts.finish()
    finally:
        ev.parts = before
