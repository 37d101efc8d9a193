"""Text and JSON of a scan (``qseries scan``): the count at each stage, the hits grouped
with the members trivially related to them, the members that passed the filter but not
the confirmation, and the members that failed.

>>> from types import SimpleNamespace as NS
>>> from fractions import Fraction
>>> rel = NS(member=NS(label="b=2", params=(("b", 2),), expression="q^2 f"),
...          factor=Fraction(1), shift=Fraction(2), sign=1, same_right=False)
>>> relation_text(rel, "b=0")
'q^2 * [b=0](q)'
"""

from __future__ import annotations

from collections.abc import Sequence
from fractions import Fraction
from typing import Any, Protocol

__all__ = ["relation_text", "scan_json", "scan_lines"]


class _Outcome(Protocol):
    index: int
    params: tuple[tuple[str, int], ...]
    expression: str
    status: str
    product: str
    reason: str

    @property
    def label(self) -> str: ...


class _Relation(Protocol):
    member: _Outcome
    factor: Fraction
    shift: Fraction
    sign: int
    same_right: bool


class _Group(Protocol):
    representative: _Outcome
    related: Sequence[_Relation]


class _Criteria(Protocol):
    order: int
    max_period: int
    max_exponent: int

    @property
    def low_order(self) -> int: ...


class _Family(Protocol):
    template: str
    right: str | None


class ScanResult(Protocol):
    """What the rendering reads (a :class:`qseries.discovery.ScanReport`)."""

    family: _Family
    criteria: _Criteria
    members: int
    outcomes: Sequence[_Outcome]
    groups: Sequence[_Group]
    resumed: int
    computed: int
    seconds: float

    def of(self, status: str) -> list: ...
    def counts(self) -> dict[str, int]: ...


def relation_text(r: _Relation, label: str) -> str:
    """How a related member is obtained from its group's first member (``label``):
    ``2 * q^-1 * [b=0](-q)``, or the same right side in an equality scan."""
    if r.same_right:
        return f"the same right side as [{label}]"
    parts = []
    if r.factor != 1:
        parts.append(f"{r.factor} *" if r.factor.denominator == 1 else f"({r.factor}) *")
    if r.shift != 0:
        shift = r.shift if r.shift > 0 and r.shift.denominator == 1 else f"({r.shift})"
        parts.append(f"q^{shift} *")
    return " ".join([*parts, f"[{label}]({'-q' if r.sign < 0 else 'q'})"])


def _params(o: _Outcome) -> dict[str, int]:
    return dict(o.params)


def scan_json(report: ScanResult) -> dict[str, Any]:
    """``{"order", "filter_order", "members", "stages", "hits": [{"params", "expression",
    "product", "related": [{"params", "expression", "relation"}]}], "unconfirmed",
    "failed", "resumed", "computed", "seconds"}``.

    >>> from qseries.discovery import Criteria, Family, run_scan
    >>> r = run_scan(Family("q^$a", (("a", "0..1"),)), Criteria(order=20), jobs=1)
    >>> scan_json(r)["stages"]["rejected"], scan_json(r)["hits"]
    (2, [])
    """
    crit = report.criteria
    hits = []
    for g in report.groups:
        rep = g.representative
        hits.append({"params": _params(rep), "expression": rep.expression,
                     "product": rep.product,
                     "related": [{"params": _params(r.member),
                                  "expression": r.member.expression,
                                  "relation": relation_text(r, rep.label)}
                                 for r in g.related]})
    return {"order": crit.order, "filter_order": crit.low_order, "members": report.members,
            "stages": report.counts(), "hits": hits,
            "unconfirmed": [{"params": _params(o), "expression": o.expression,
                             "product": o.product, "reason": o.reason}
                            for o in report.of("unconfirmed")],
            "failed": [{"params": _params(o), "expression": o.expression, "reason": o.reason}
                       for o in report.of("failed")],
            "resumed": report.resumed, "computed": report.computed,
            "seconds": round(report.seconds, 3)}


def scan_lines(report: ScanResult, finished: int | None = None) -> list[str]:
    """The text report; ``finished`` (members done) when the scan was interrupted.

    >>> from qseries.discovery import Criteria, Family, run_scan
    >>> r = run_scan(Family("q^$a", (("a", "0..1"),)), Criteria(order=20), jobs=1)
    >>> scan_lines(r)[-1]
    'no hits'
    """
    crit, fam = report.criteria, report.family
    c = report.counts()
    what = (f"equality with {fam.right}" if fam.right is not None else
            f"period <= {crit.max_period}, |exponent| <= {crit.max_exponent}")
    lines = [f"scan of {report.members} members at order {crit.order} (filter at order "
             f"{crit.low_order}: {what})"]
    if finished is not None:
        lines.append(f"  interrupted: {finished} of {report.members} members finished")
    lines.append(f"  failed {c['failed']}, rejected by the filter {c['rejected']}, passed "
                 f"the filter {c['passed_filter']}, confirmed at order {crit.order} "
                 f"{c['confirmed']} ({c['groups']} group{'s' if c['groups'] != 1 else ''})")
    if report.resumed:
        lines.append(f"  {report.resumed} members read from the progress record, "
                     f"{report.computed} computed now")
    if report.groups:
        lines.append(f"hits (each agrees with its product to O(q^{crit.order}) modulo random "
                     f"primes; evidence, not a proof):")
    for g in report.groups:
        rep = g.representative
        lines.append(f"  {rep.label}: {rep.expression} = {rep.product}")
        for r in g.related:
            lines.append(f"      {r.member.label} = {relation_text(r, rep.label)}")
    if report.of("unconfirmed"):
        lines.append("passed the filter, not confirmed:")
        lines.extend(f"  {o.label}: {o.expression}: {o.reason}"
                     for o in report.of("unconfirmed"))
    if report.of("failed"):
        lines.append("failed:")
        lines.extend(f"  {o.label}: {o.expression or '(no expression)'}: {o.reason}"
                     for o in report.of("failed"))
    if not report.groups:
        lines.append("no hits")
    return lines
