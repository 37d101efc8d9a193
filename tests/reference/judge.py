"""Judge what qseries claims against the reference, from plain data (Fractions and dicts), so
that this package still imports nothing from qseries.

Each judge returns (verdict, message): "ok", "skip" (the reference cannot decide at a
reasonable working precision) or "fail" (a wrong coefficient, precision or verdict).
"""

from __future__ import annotations

from fractions import Fraction

from .expressions import Node, is_intrinsic, reference, text
from .series import INF, Ref, RefUndefined, RefUnknown, agree_below

Num = int | Fraction
Verdict = tuple[str, str]


def _short(a: Ref, upto: int = 12) -> str:
    items = sorted(a.c.items())
    head = Ref(dict(items[:upto]), a.prec if len(items) <= upto else items[upto][0])
    return repr(head) + (" ..." if len(items) > upto else "")


def judge_value(node: Node, order: int, claimed_prec: Num | None,
                terms: dict[Fraction, Fraction], shown: str = "") -> Verdict:
    """qseries says the value of ``node`` (asked modulo q^order) is ``terms`` (every nonzero
    coefficient it knows) + O(q^claimed_prec), or exactly ``terms`` when claimed_prec is
    None."""
    where = f"{text(node)!r} at order {order}: qseries gives {shown or terms}"
    need = order if claimed_prec is None else max(order, claimed_prec)
    try:
        ref, R = reference(node, need)
    except RefUndefined as why:
        return "fail", f"{where}, but the value is undefined ({why})"
    except RefUnknown as why:
        return "skip", str(why)
    if claimed_prec is not None and ref.prec < claimed_prec:
        if is_intrinsic(node, ref, R):
            return "fail", (f"{where}: claims every coefficient below q^{claimed_prec}, but "
                            f"only those below q^{ref.prec} are known (reference "
                            f"{_short(ref)})")
        return "skip", "the reference does not reach the claimed precision"
    if claimed_prec is None:
        if ref.prec < order:
            return "skip", "the reference does not reach the order"
        if not ref.exact and is_intrinsic(node, ref, R):
            return "fail", (f"{where}: claims an exact value, but nothing is known from "
                            f"q^{ref.prec} on (reference {_short(ref)})")
        if any(e >= ref.prec for e in terms):
            return "skip", "qseries' terms reach beyond the reference"
        bound = ref.prec          # an exact claim: every coefficient the reference knows
    else:
        bound = Fraction(claimed_prec)
    for e in sorted(set(terms) | set(ref.c)):
        if e >= bound:
            break
        mine, theirs = ref.c.get(e, Fraction(0)), terms.get(e, Fraction(0))
        if mine != theirs:
            what = "an exact value" if claimed_prec is None else f"O(q^{claimed_prec})"
            return "fail", (f"{where} ({what}): the coefficient of q^{e} is {theirs}, the "
                            f"reference says {mine} (reference {_short(ref)})")
    return "ok", ""


def judge_check(left: Node, right: Node, order: int, holds: bool, verified: Num,
                mismatch: tuple[Num, Num, Num] | None, method: str = "") -> Verdict:
    """qseries' check says the two sides agree below q^verified (holds), or first differ at
    mismatch = (exponent, left coefficient, right coefficient)."""
    where = (f"check {text(left)!r} vs {text(right)!r} at order {order} {method}: qseries "
             + (f"says they agree to O(q^{verified})" if holds else
                f"says they first differ at q^{mismatch[0]} ({mismatch[1]} vs {mismatch[2]}),"
                f" verified order {verified}" if mismatch else "is inconclusive"))
    if not holds and mismatch is None:
        return "skip", "inconclusive"
    verified = Fraction(verified)
    refs = []
    for node in (left, right):
        try:
            ref, R = reference(node, max(verified, order))
        except RefUndefined as why:
            return "fail", f"{where}, but {text(node)!r} is undefined ({why})"
        except RefUnknown as why:
            return "skip", str(why)
        if ref.prec < verified:
            if is_intrinsic(node, ref, R):
                return "fail", (f"{where}, but {text(node)!r} is only known below "
                                f"q^{ref.prec} (reference {_short(ref)})")
            return "skip", "the reference does not reach the verified order"
        refs.append(ref)
    lref, rref = refs
    first = agree_below(lref, rref, verified)
    if holds:
        if first is not None:
            return "fail", (f"{where}, but at q^{first} the left side has "
                            f"{lref.coefficient(first)} and the right side "
                            f"{rref.coefficient(first)} (reference left {_short(lref)}, right "
                            f"{_short(rref)})")
        return "ok", ""
    e, lc, rc = mismatch
    e = Fraction(e)
    if e >= verified or e >= min(lref.prec, rref.prec):
        return "fail", f"{where}, a mismatch at an exponent that is not verified"
    if first != e:
        return "fail", (f"{where}, but the reference's first difference is at q^{first} "
                        f"(left {_short(lref)}, right {_short(rref)})")
    if (Fraction(lc), Fraction(rc)) != (lref.coefficient(e), rref.coefficient(e)):
        return "fail", (f"{where}, but the reference has {lref.coefficient(e)} vs "
                        f"{rref.coefficient(e)} there")
    return "ok", ""


__all__ = ["INF", "judge_check", "judge_value"]
