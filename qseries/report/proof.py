"""The report of ``qseries prove``: PROVED with the certificate, DIFFERS with the first
mismatch, or NOT PROVED with the reason and the ordinary evidence; and its JSON shape.

>>> from qseries.modularity.prove import prove
>>> r = prove("theta_3(q)^4", "theta_2(q)^4 + theta_4(q)^4")
>>> proof_lines(r)[0][:40]
'PROVED  proved: both sides are modular f'
>>> proof_json(r)["certificate"]["bound"]
1
"""

from __future__ import annotations

from fractions import Fraction
from typing import Any

from ..modularity.prove import Certificate, ProofResult
from .json_shapes import exponent_json, mismatch_json
from .verdict import check_lines


def _num(x: Fraction) -> int | str:
    return exponent_json(x)


def certificate_json(c: Certificate) -> dict[str, Any]:
    """The certificate as plain data: method, level, index, weight, character, the common
    power q^shift, the terms (side, coefficient, exponents r_d, text; the right side's
    coefficients negated), the divisor (valence), the cusp classes with their orders, the
    bound and the exponents whose coefficients were compared.

    >>> from qseries.modularity.prove import prove
    >>> c = certificate_json(prove("theta_3(q)^4", "theta_2(q)^4 + theta_4(q)^4").certificate)
    >>> c["level"], c["weight"], c["character"], [x["cusp"] for x in c["cusps"]]
    (4, 2, 'trivial', ['0', '1/2', 'inf'])
    """
    return {
        "method": c.method,
        "level": c.level,
        "index": c.index,
        "weight": _num(c.weight),
        "character": c.character_text,
        "shift": _num(c.shift),
        "terms": [{"side": side, "coefficient": str(t.coefficient),
                   "eta": {str(d): e for d, e in t.eta.exponents}, "text": t.text()}
                  for side, t in c.terms],
        "divisor": c.divisor,
        "cusps": [{"cusp": x.cusp, "d": x.d, "count": x.count, "width": x.width,
                   "orders": [_num(o) for o in x.orders], "least": _num(x.least)}
                  for x in c.cusps],
        "bound": c.bound,
        "operator": None if c.operator is None else {"m": c.operator[0],
                                                     "r": _num(c.operator[1])},
        "function": None if c.function is None else {str(d): e for d, e in c.function.exponents},
        "multiplier": None if c.multiplier is None else {
            str(d): e for d, e in c.multiplier.exponents},
        "scale": None if c.scale is None else str(c.scale),
        "checked": {"from": _num(c.low), "to": _num(c.high),
                    "coefficients": c.coefficients, "arithmetic": "exact"},
    }


def proof_json(r: ProofResult) -> dict[str, Any]:
    """The result of ``qseries prove --json``: ``proved``, ``holds`` (true, false, or null),
    the ``certificate`` (null unless a bound was computed), the ``reason`` when not proved,
    the ``first_mismatch``, and the ``evidence`` (the order the ordinary check compared to)
    when the proof was refused.

    >>> from qseries.modularity.prove import prove
    >>> out = proof_json(prove("sum_{n>=1} q^n/(1-q^n)", "q", order=5))
    >>> out["proved"], out["holds"], out["certificate"], out["first_mismatch"]
    (False, False, None, {'index': 2, 'lhs': '2', 'rhs': '0'})
    """
    check = r.check
    return {
        "proved": r.proved,
        "holds": r.holds,
        "certificate": None if r.certificate is None else certificate_json(r.certificate),
        "reason": r.reason,
        "first_mismatch": None if check is None else mismatch_json(check),
        "evidence": None if r.reason is None or check is None else {
            "holds": check.holds, "order": exponent_json(check.order_verified),
            "verdict": check.verdict},
    }


def certificate_lines(c: Certificate) -> list[str]:
    """The certificate as text: the identity as eta quotients, level, index, weight,
    character, the cusps (width, orders) and the bound.

    >>> from qseries.modularity.prove import prove
    >>> print("\\n".join(certificate_lines(prove("theta_3(q)", "eta(q^2)^5/(eta(q)^2 eta(q^4)^2)"
    ...                                             ).certificate)[:3]))
      terms (right side negated):
        lhs: eta(q)^-2 eta(q^2)^5 eta(q^4)^-2
        rhs: -1 eta(q)^-2 eta(q^2)^5 eta(q^4)^-2
    """
    scaled = "" if c.shift == 0 else f"; both sides times q^({-c.shift})"
    lines = [f"  terms (right side negated{scaled}):"]
    for side, t in c.terms:
        coeff = "" if t.coefficient == 1 else f"{t.coefficient} "
        lines.append(f"    {side}: {coeff}{t.eta.text()}")
    char = c.character_text or "not used (half-integral weight or mixed characters)"
    lines.append(f"  level N = {c.level}, index [SL2(Z):Gamma_0(N)] = {c.index}, weight "
                 f"{c.weight}, character {char}")
    if c.method == "dissection":
        assert c.operator is not None and c.function is not None and c.multiplier is not None
        m = c.operator[0]
        rhs = " + ".join(f"({-t.coefficient}) {t.eta.text()}" for _, t in c.terms)
        lines = [f"  the identity times M(tau) = {c.multiplier.text()} (and a power of q) is "
                 f"U_{m}(f) = {rhs}, with f = {c.function.text()}",
                 f"  level N = {c.level}, index [SL2(Z):Gamma_0(N)] = {c.index}; f and every "
                 f"term are modular functions on Gamma_0(N), and so is U_{m}(f) ({m} | N)",
                 f"  lower bounds at each cusp a/c other than infinity: for U_{m}(f) (from the "
                 f"orders of f at the cusps over a/c), then Ligozat's order of each term:"]
    elif c.method == "sturm":
        lines.append("  orders of the terms at the cusps (Ligozat; all >= 0, so every term is "
                     "holomorphic):")
    elif c.method == "valence":
        assert c.divisor is not None
        lines.append(f"  orders at the cusps (Ligozat) of each term divided by term "
                     f"{c.divisor + 1}, {c.terms[c.divisor][1].eta.text()}:")
    for x in c.cusps:
        orders = ", ".join(str(o) for o in x.orders)
        lines.append(f"    cusp {x.cusp:>5} (d = {x.d}, {x.count} cusp{'s' * (x.count != 1)}, "
                     f"width {x.width}): {orders}")
    if c.method == "dissection":
        lines.append(f"  valence bound B = -(sum over the cusps other than infinity of the "
                     f"least lower bound) = {c.bound}")
    elif c.method == "sturm":
        lines.append(f"  Sturm's bound B = floor(k m / 12) = floor({c.weight} * {c.index} / 12)"
                     f" = {c.bound}")
    else:
        lines.append(f"  valence bound B = -(sum over the cusps other than infinity of the "
                     f"least order) = {c.bound}")
    lines.append(f"  checked exactly: the coefficients of q^{c.low} .. q^{c.high} of both sides "
                 f"({c.coefficients})")
    return lines


def provable_note() -> str:
    """The note ``check`` prints when both sides are combinations of eta quotients of one
    weight.

    >>> provable_note()[:40]
    'note: both sides are combinations of eta'
    """
    return ("note: both sides are combinations of eta quotients of one weight, so a finite "
            "check may prove this identity: run `qseries prove` with the same sides")


def proof_lines(r: ProofResult) -> list[str]:
    """PROVED / DIFFERS / NOT PROVED with the verdict, then the certificate or the evidence.

    >>> from qseries.modularity.prove import prove
    >>> print(proof_lines(prove("sum_{n>=1} q^n/(1-q^n)", "q", order=5))[0][:46])
    NOT PROVED  not proved: the left side is not r
    """
    if r.proved and r.certificate is not None:
        return [f"PROVED  {r.verdict}"] + certificate_lines(r.certificate)
    if r.reason is None and r.check is not None:
        lines = [f"DIFFERS  {r.verdict}"]
        if r.certificate is not None:
            c = r.certificate
            name = "Sturm" if c.method == "sturm" else "valence"
            lines.append(f"  (within the {name} bound: the coefficients up to q^{c.high} "
                         f"decide this identity at level {c.level})")
        return lines + check_lines(r.check)[1:]
    lines = [f"NOT PROVED  {r.verdict}"]
    if r.check is not None:
        lines.append("  the ordinary check (evidence only):")
        lines.extend("    " + line for line in check_lines(r.check))
    return lines
