"""The JSON shapes of results: one function per shape, each returning plain data for
``json.dumps``.  The command line and :mod:`qseries.catalogue.verify` both use them, so a
shape is written once.

Exponents are integers when they are whole and strings such as ``"1/24"`` otherwise;
coefficients are strings (numbers of any size, or Laurent polynomials in extra variables).

>>> import json
>>> from qseries.analysis import check
>>> json.dumps(mismatch_json(check("1/(1-q)", "1 + q", order=5)))
'{"index": 2, "lhs": "1", "rhs": "0"}'
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from fractions import Fraction
from typing import Any, Protocol

from ..analysis import (
    CheckResult,
    Combination,
    CongruenceSearch,
    Dissection,
    Distribution,
    Divisibility,
    Hint,
    ProductForm,
    Relations,
    normal_moment,
)
from ..series import Series
from ..series.formatting import coefficient_text, number_text


class EntryOutcome(Protocol):
    """What the JSON of a verified catalogue entry reads (a
    :class:`qseries.catalogue.EntryResult`)."""

    @property
    def ident(self) -> str: ...
    @property
    def holds(self) -> bool | None: ...
    @property
    def ok(self) -> bool: ...
    @property
    def order(self) -> int | Fraction: ...
    @property
    def first_mismatch(self) -> dict | None: ...
    @property
    def seconds(self) -> float: ...
    @property
    def error(self) -> str: ...


class ListedEntry(Protocol):
    """What the JSON of ``qseries list`` reads from an entry (a
    :class:`qseries.catalogue.Entry`)."""

    @property
    def key(self) -> str: ...
    @property
    def title(self) -> str: ...
    @property
    def source(self) -> str: ...
    @property
    def tags(self) -> Sequence[str]: ...
    @property
    def expect(self) -> str: ...
    @property
    def path(self) -> Any: ...
    @property
    def line(self) -> int: ...


def exponent_json(e: int | Fraction) -> int | str:
    """An exponent as JSON: an integer when it is whole, else a string such as ``"1/24"``.

    >>> exponent_json(7), exponent_json(Fraction(14, 2)), exponent_json(Fraction(25, 24))
    (7, 7, '25/24')
    """
    e = Fraction(e)
    return e.numerator if e.denominator == 1 else str(e)


def finite_json(x: float) -> float | None:
    """A float as JSON, which has no nan or infinity: those become null (None).

    >>> finite_json(1.5), finite_json(float("nan")), finite_json(float("inf"))
    (1.5, None, None)
    """
    return x if math.isfinite(x) else None


def mismatch_json(r: CheckResult) -> dict[str, Any] | None:
    """The first mismatch of a check: its exponent (``index``; a weighted degree when the
    extra variables have weights) and both coefficients as text, written back in q and the
    extra variables when they are weighted; None when the sides agree.

    >>> from qseries.analysis import check
    >>> mismatch_json(check("1/(1-q)", "1/(1-q)", order=5)) is None
    True
    >>> mismatch_json(check("eta(q)", "q^(1/24) (q;q)_inf + q^(25/24)", order=5))
    {'index': '25/24', 'lhs': '-1', 'rhs': '0'}
    """
    m = r.first_mismatch
    if m is None:
        return None
    return {"index": exponent_json(m.exponent),
            "lhs": r.unweighted_text(m.lhs, m.exponent),
            "rhs": r.unweighted_text(m.rhs, m.exponent)}


def hint_json(h: Hint) -> dict[str, str]:
    """A hint for a failed check: its kind and message.

    >>> from qseries.analysis import Hint
    >>> hint_json(Hint("shift", "the left side is q times the right side"))
    {'kind': 'shift', 'message': 'the left side is q times the right side'}
    """
    return {"kind": h.kind, "message": h.message}


def check_json(r: CheckResult, hints: Iterable[Hint] = (),
               seconds: float | None = None) -> dict[str, Any]:
    """The result of ``qseries check --json``: ``holds`` (true, false, or null when
    inconclusive, with a ``reason``), the order verified and asked, the shortfall, the first
    mismatch, time, method, primes, extra variables and their weights, and the hints.
    ``seconds`` is the time of the whole command when given (parsing, the cost estimate,
    the check, the exact recomputation at a mismatch and the hints), else the check's own.

    >>> from qseries.analysis import check
    >>> out = check_json(check("O(q^-5) + 1", "2"))
    >>> out["holds"], out["order"], out["reason"].startswith("no coefficient could be compared")
    (None, -5, True)
    """
    return {
        "holds": r.holds,
        "reason": r.reason,
        "order": exponent_json(r.order_verified),
        "order_requested": r.order_requested,
        "shortfall": r.shortfall or None,
        "first_mismatch": mismatch_json(r),
        "seconds": round(r.seconds if seconds is None else seconds, 6),
        "method": r.method,
        "primes": list(r.primes),
        "variables": list(r.variables),
        "weights": list(r.weights),
        "hints": [hint_json(h) for h in hints],
    }


def known_order(s: Series, order: int) -> int | Fraction:
    """The order below which an expansion to ``order`` knows its coefficients: ``order``,
    or the series' own precision when that is lower.

    >>> from qseries.engine import evaluate
    >>> known_order(evaluate("1/(1-q)", 10), 10)
    10
    >>> known_order(evaluate("q^-3/(1-q) + O(q^7)", 10), 10)
    7
    """
    known = s.precision if s.precision is not None else order
    return min(known, order)


def expand_json(s: Series, order: int) -> dict[str, Any]:
    """The result of ``qseries expand --json``: the order to which the coefficients are
    known, and the nonzero terms below it as [exponent, coefficient text].

    >>> from qseries.engine import evaluate
    >>> expand_json(evaluate("q^-1 + 2 - q^3", 3), 3)
    {'order': 3, 'terms': [[-1, '1'], [0, '2']]}
    """
    known = known_order(s, order)
    terms = [[exponent_json(e), coefficient_text(c)] for e, c in s.terms() if e < known]
    return {"order": exponent_json(known), "terms": terms}


def dissection_json(d: Dissection, order: int) -> dict[str, Any]:
    """The result of ``qseries expand --dissect M --json``: the order below which every
    part is known, m, and per residue r the part F_r = sum_n a(m n + r) q^n in the shape
    of ``expand --json``.

    >>> from qseries.analysis import dissection
    >>> out = dissection_json(dissection("1/(1-q^2)", 2, 3), 3)
    >>> out["order"], out["m"], out["parts"][0]
    (3, 2, {'r': 0, 'order': 3, 'terms': [[0, '1'], [1, '1'], [2, '1']]})
    """
    parts = [{"r": exponent_json(r), **expand_json(f, order)}
             for r, f in zip(d.residues, d.parts, strict=True)]
    known = min((p["order"] for p in parts), key=Fraction, default=order)
    return {"order": known, "m": d.m, "parts": parts}


def congruences_json(s: CongruenceSearch) -> dict[str, Any]:
    """The result of ``qseries congruences --json`` (a search): the order below which every
    coefficient was read and the congruences found, implied ones omitted.

    >>> from qseries.analysis import find_congruences
    >>> congruences_json(find_congruences("1/(q;q)_inf", 1000, max_m=6))
    {'order': 1000, 'congruences': [{'m': 5, 'r': 4, 'modulus': 5}]}
    """
    return {"order": s.order,
            "congruences": [{"m": c.m, "r": c.r, "modulus": c.modulus}
                            for c in s.congruences]}


def divisibility_json(d: Divisibility) -> dict[str, Any]:
    """The result of ``qseries congruences --modulus M --json``: whether every a(m n + r)
    below the order is divisible by M, and the first counterexample (null when none).

    >>> from qseries.analysis import divisible
    >>> divisibility_json(divisible("1/(q;q)_inf", 3, 10, m=2, r=1))["counterexample"]
    {'n': 0, 'exponent': 1, 'residue': 1, 'value': None}
    """
    c = d.counterexample
    return {"order": exponent_json(d.order), "modulus": d.modulus, "m": d.m,
            "r": exponent_json(d.r), "checked": d.checked, "divisible": d.holds,
            "counterexample": None if c is None else {
                "n": c.n, "exponent": exponent_json(c.exponent), "residue": c.residue,
                "value": None if c.value is None else coefficient_text(c.value)}}


def relations_json(r: Relations) -> dict[str, Any]:
    """The result of ``qseries relations --json``: the order below which the coefficients
    were compared, one list of integer coefficients (strings) per relation of the reduced
    basis, in the order of ``monomials`` (for degree 1 the series as given), the relations
    as text, and the evidence (equations, unknowns, confirmed, stable).

    >>> from qseries.analysis import relations
    >>> out = relations_json(relations(["theta_3(q)^4", "theta_2(q)^4", "theta_4(q)^4"], 40))
    >>> out["order"], out["relations"], out["confirmed"]
    (40, [['1', '-1', '-1']], 37)
    """
    return {"order": exponent_json(r.order),
            "relations": [[str(c) for c in v] for v in r.relations],
            "monomials": [list(m) for m in r.monomials], "degree": r.degree,
            "texts": [r.text(v) for v in r.relations], "equations": r.equations,
            "unknowns": r.unknowns, "confirmed": r.confirmed, "stable": r.stable}


def combination_json(c: Combination) -> dict[str, Any]:
    """The result of ``qseries express --json``: the order, the target and basis as given,
    the coefficients as exact fractions (strings, in the order of the basis; null when the
    target is not in the span), the combination as text and the evidence.

    >>> from qseries.analysis import express
    >>> out = combination_json(express("2/(1-q)", ["1/(1-q)", "q"], 20))
    >>> out["coefficients"], out["confirmed"]
    (['2', '0'], 17)
    """
    return {"order": exponent_json(c.order), "target": c.target, "basis": list(c.basis),
            "coefficients": None if c.coefficients is None else
            [str(x) for x in c.coefficients],
            "text": c.text(), "equations": c.equations, "unknowns": c.unknowns,
            "confirmed": c.confirmed, "stable": c.stable}


def product_json(pf: ProductForm) -> dict[str, Any]:
    """The result of ``qseries product --json``: constant, shift, the exponents e_n, the
    period, the product, the same in fewer factors and the eta quotient as text (null when
    there is none, with a ``reason``, and ``breaks`` when a period held up to some n: the
    period, that n, and the first differing term [exponent, coefficient]).

    >>> from qseries.analysis import product_form
    >>> out = product_json(product_form("(q;q)_inf", 6))
    >>> out["expression"], out["exponents"], out["period"]
    ('(q;q)_inf', [1, 1, 1, 1, 1], 1)
    """
    out: dict[str, Any] = {
        "order": exponent_json(pf.order), "constant": coefficient_text(pf.constant),
        "shift": exponent_json(pf.shift), "exponents": pf.exponents, "period": pf.period,
        "repetitions": pf.repetitions, "expression": pf.expression, "eta": pf.eta,
        "factors": pf.factors}
    if pf.expression is None:
        out["reason"] = pf.reason
        if pf.breaks is not None and pf.stray is not None:
            out["breaks"] = {"period": pf.breaks[0], "at": pf.breaks[1],
                             "stray_term": [exponent_json(pf.stray[0]),
                                            coefficient_text(pf.stray[1])]}
    return out


def no_product_json(order: int, reason: str) -> dict[str, Any]:
    """``qseries product --json`` when the exponents could not be recovered at all.

    >>> no_product_json(20, "the exponent of (1-q^1) would be -1/2")["product_form"]
    False
    """
    return {"order": order, "product_form": False, "reason": reason}


def distribution_json(d: Distribution, moments: int) -> dict[str, Any]:
    """One size of ``qseries distribution --json``: counts by value of the statistic,
    total, mean, variance (exact, as text) and the standardised moments 1..``moments``
    (null where undefined) next to the normal distribution's.

    >>> from qseries.analysis import distributions
    >>> [d] = distributions("1/(z*q;q)_inf", "z", [3])
    >>> out = distribution_json(d, 2)
    >>> out["counts"], out["mean"], out["normal_moments"]
    ({'1': '1', '2': '1', '3': '1'}, '2', [0, 1])
    """
    return {
        "n": d.n,
        "counts": {str(j): number_text(c) for j, c in d.counts.items()},
        "total": number_text(d.total),
        "mean": number_text(d.mean), "variance": number_text(d.variance),
        "standardised_moments": [finite_json(d.standardised_moment(r))
                                 for r in range(1, moments + 1)],
        "normal_moments": [normal_moment(r) for r in range(1, moments + 1)],
    }


def distributions_json(var: str, dists: Iterable[Distribution], moments: int
                       ) -> dict[str, Any]:
    """The result of ``qseries distribution --at N --json``: the variable and one
    :func:`distribution_json` per size.

    >>> from qseries.analysis import distributions
    >>> out = distributions_json("z", distributions("1/(z*q;q)_inf", "z", [0]), 2)
    >>> out["variable"], [s["n"] for s in out["sizes"]]
    ('z', [0])
    """
    return {"variable": var, "sizes": [distribution_json(d, moments) for d in dists]}


def trend_json(dists: Iterable[Distribution]) -> list[dict[str, Any]]:
    """The mean/variance table of ``qseries distribution --trend-upto N --format json``:
    one row per size, exact (text) and as floats.

    >>> from qseries.analysis import distributions
    >>> trend_json(distributions("1/(z*q;q)_inf", "z", [2]))   # doctest: +NORMALIZE_WHITESPACE
    [{'n': 2, 'total': '2', 'mean': '3/2', 'variance': '1/4', 'mean_decimal': 1.5,
      'variance_decimal': 0.25}]
    """
    return [{"n": d.n, "total": number_text(d.total), "mean": number_text(d.mean),
             "variance": number_text(d.variance),
             "mean_decimal": float(d.mean), "variance_decimal": float(d.variance)}
            for d in dists]


def entry_json(r: EntryOutcome) -> dict[str, Any]:
    """One verified catalogue entry in ``qseries verify --json``; the result of a ``same_as``
    pair also has ``pair`` (``of``, ``same_as``, ``substitution``, ``swap``, ``differs``).

    >>> from types import SimpleNamespace as Outcome
    >>> entry_json(Outcome(ident="euler", holds=None, ok=False, order=-5, first_mismatch=None,
    ...                    seconds=0.0012345678, error=""))
    ... # doctest: +NORMALIZE_WHITESPACE
    {'id': 'euler', 'holds': None, 'ok': False, 'order': -5, 'first_mismatch': None,
     'seconds': 0.001235}
    """
    out: dict[str, Any] = {"id": r.ident, "holds": r.holds, "ok": r.ok,
                           "order": exponent_json(r.order), "first_mismatch": r.first_mismatch,
                           "seconds": round(r.seconds, 6)}
    if r.error:
        out["error"] = r.error
    pair = getattr(r, "pair", None)
    if pair:
        out["pair"] = pair
    return out


def verify_json(results: Sequence[EntryOutcome], seconds: float,
                total: int | None = None) -> dict[str, Any]:
    """The result of ``qseries verify --json``: one :func:`entry_json` per entry and a
    summary (entries, how many behave as recorded, errors, time); ``total`` is given when
    an interrupt left only ``results`` of ``total`` entries finished.

    >>> verify_json([], 0.5)
    {'results': [], 'summary': {'entries': 0, 'ok': 0, 'not_ok': 0, 'errors': 0, 'seconds': 0.5}}
    >>> verify_json([], 0.5, total=3)["summary"]["interrupted"]
    True
    """
    n_ok = sum(r.ok for r in results)
    summary: dict[str, Any] = {"entries": len(results), "ok": n_ok,
                               "not_ok": len(results) - n_ok,
                               "errors": sum(bool(r.error) for r in results),
                               "seconds": round(seconds, 3)}
    if total is not None:
        summary.update(entries=total, finished=len(results), interrupted=True)
    return {"results": [entry_json(r) for r in results], "summary": summary}


def listing_rows(entries: Iterable[ListedEntry]) -> list[dict[str, Any]]:
    """One row per identity key (the members of a family counted together): id, members,
    title, source, tags, expect and the file:line where it is written; a family also has
    ``params``, its parameter ranges (``{"k": "2..5", "i": "1..k"}``), an entry with a
    note its ``note``, one that corrects a misprint ``corrects``, and one recorded as the
    same identity as another entry ``same_as`` (``{"id", "substitution", "swap",
    "source"}``).

    >>> from types import SimpleNamespace as Entry
    >>> e = Entry(key="euler", title="Euler", source="from memory", tags=("classic",),
    ...           expect="holds", path="f", line=1)
    >>> [(row["id"], row["members"], row["file"]) for row in listing_rows([e, e])]
    [('euler', 2, 'f:1')]
    """
    rows: dict[str, dict[str, Any]] = {}
    for e in entries:
        row = rows.setdefault(e.key, {"id": e.key, "members": 0, "title": e.title,
                                      "source": e.source, "tags": list(e.tags),
                                      "expect": e.expect, "file": f"{e.path}:{e.line}"})
        row["members"] += 1
        ranges = getattr(e, "ranges", ())
        if ranges:
            row["params"] = dict(ranges)
        if getattr(e, "note", ""):
            row["note"] = e.note
        if getattr(e, "corrects", ""):
            row["corrects"] = e.corrects
        same = getattr(e, "same_as", None)
        if same is not None:
            row["same_as"] = {"id": same.key, "substitution": same.substitution or None,
                              "swap": same.swap, "source": same.source}
    return list(rows.values())


def listing_json(entries: Iterable[ListedEntry]) -> dict[str, Any]:
    """The result of ``qseries list --json``: :func:`listing_rows` under ``identities``.

    >>> listing_json([])
    {'identities': []}
    """
    return {"identities": listing_rows(entries)}
