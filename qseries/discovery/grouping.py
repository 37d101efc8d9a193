"""Group hits that differ only trivially: equal series, a constant factor, a power of q,
and q -> -q.

Two hits of a product scan are related when their products have the same exponents
(f = c q^s prod (1 - q^n)^(e_n)), or when one's exponents are those of the other's
product at -q: from (1 - (-q)^n) = (1 - q^(2n))/(1 - q^n) for odd n,

    e'_n = -e_n (n odd),  e_n + e_(n/2) (n = 2 mod 4),  e_n (4 | n),

periodic with a period dividing lcm(2m, 4).  Each hit agrees with its product to the
full order, so related hits satisfy g(q) = k q^t f(+-q) to that order.  Hits of an
equality scan are related when their right sides are the same text.

>>> minus_q((-1, 0, 0, -1, 0))      # 1/(q, q^4; q^5)_inf at -q
(1, -1, 0, -1, 0, -1, 0, 0, 1, 0, 1, 0, 0, -1, 0, -1, 0, -1, 1, 0)
>>> minus_q((1, 0))                 # (q; q^2)_inf at -q is (-q; q^2)_inf
(-1, 1, -1, 0)
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from math import lcm

from ..analysis.product_form import find_period
from .examine import MemberOutcome

__all__ = ["Group", "Relation", "group_hits", "minus_q"]


def minus_q(pattern: tuple[int, ...]) -> tuple[int, ...]:
    """The exponents over one (least) period of F(-q), for F with periodic exponents
    ``pattern`` (one period)."""
    m = len(pattern)
    big = lcm(2 * m, 4)

    def e(n: int) -> int:
        return pattern[(n - 1) % m]

    out = []
    for n in range(1, 3 * big + 1):
        if n % 2:
            out.append(-e(n))
        elif n % 4 == 2:
            out.append(e(n) + e(n // 2))
        else:
            out.append(e(n))
    period = find_period(out) or big
    return tuple(out[:period])


@dataclass(frozen=True)
class Relation:
    """``member`` = ``factor`` * q^``shift`` * representative(``sign`` q), to the order of
    the scan (``same_right`` for an equality scan: the two have the same right side).

    >>> from qseries.discovery.examine import MemberOutcome as M
    >>> Relation(M(1, (), "f", "hit"), Fraction(1), Fraction(0), 1).equal
    True
    """

    member: MemberOutcome
    factor: Fraction
    shift: Fraction
    sign: int
    same_right: bool = False

    @property
    def equal(self) -> bool:
        """True when the two series are equal (to the order)."""
        return self.same_right or (self.factor == 1 and self.shift == 0 and self.sign == 1)


@dataclass(frozen=True)
class Group:
    """A representative hit and the hits related to it: the representative is the first
    member (in the family's order) with constant 1 and no power of q in front, or the
    first member when none has them.

    >>> from qseries.discovery.examine import MemberOutcome as M
    >>> Group(M(0, (), "f", "hit"), ()).related
    ()
    """

    representative: MemberOutcome
    related: tuple[Relation, ...]


def _key(o: MemberOutcome) -> tuple[tuple, int]:
    """The class of a product under q -> -q, and which side of it o is on (a member with
    a fractional power of q in front is not turned by q -> -q)."""
    if Fraction(o.shift).denominator != 1:
        return ("fractional shift", o.pattern), 1
    flipped = minus_q(o.pattern)
    if o.pattern <= flipped:
        return ("product", o.pattern), 1
    return ("product", flipped), -1


def _relation(o: MemberOutcome, rep: MemberOutcome, same_side: bool) -> Relation:
    c, s = Fraction(o.constant), Fraction(o.shift)
    c0, s0 = Fraction(rep.constant), Fraction(rep.shift)
    if same_side:
        return Relation(o, c / c0, s - s0, 1)
    # o = c q^s P(-q) and rep = c0 q^s0 P(q): rep(-q) = c0 (-1)^s0 q^s0 P(-q)
    return Relation(o, c / (c0 * (-1) ** int(s0)), s - s0, -1)   # s0 is an integer here


def group_hits(hits: list[MemberOutcome]) -> list[Group]:
    """Groups of trivially related hits, in the order of their representatives.

    >>> from qseries.discovery.examine import MemberOutcome as M
    >>> a = M(0, (("s", 0),), "f", "hit", "p", pattern=(-1, 0, 0, -1, 0))
    >>> b = M(1, (("s", 2),), "q^2 f", "hit", "p", pattern=(-1, 0, 0, -1, 0), shift="2")
    >>> [(g.representative.index, [(r.member.index, r.shift) for r in g.related])
    ...  for g in group_hits([a, b])]
    [(0, [(1, Fraction(2, 1))])]
    """
    order: list[tuple] = []
    members: dict[tuple, list[tuple[MemberOutcome, int]]] = {}
    for o in sorted(hits, key=lambda h: h.index):
        if o.pattern:
            k, side = _key(o)
        else:
            k, side = ("right", o.product), 1
        if k not in members:
            order.append(k)
            members[k] = []
        members[k].append((o, side))
    groups = []
    for k in order:
        # the representative: constant 1 and no power of q if a member has them, else
        # the first
        first = min(range(len(members[k])), key=lambda j: (
            members[k][j][0].constant != "1", members[k][j][0].shift != "0", j))
        (rep, rep_side) = members[k][first]
        rest = members[k][:first] + members[k][first + 1:]
        related = tuple(Relation(o, Fraction(1), Fraction(0), 1, same_right=True)
                        if k[0] == "right" else _relation(o, rep, side == rep_side)
                        for o, side in rest)
        groups.append(Group(rep, related))
    return sorted(groups, key=lambda g: g.representative.index)
