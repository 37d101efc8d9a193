"""An independent re-checker of the certificates of ``qseries prove`` (its JSON form).

It shares no code with qseries.modularity: the index, the cusps and their widths, Newman's
congruences, Ligozat's orders, the weight and the bound are recomputed here from the
exponents r_d the certificate lists, by small code of its own written from the textbook
statements (K. Ono, The Web of Modularity, CBMS 102, 2004, Theorems 1.64 and 1.65; J. Sturm,
LNM 1240, 1987; the valence formula for modular functions).  Only the coefficients are
recomputed through the series engine (``qseries.check``, exact arithmetic): the two sides
against each other up to the bound, and each side against the terms of the certificate.

``recheck(lhs, rhs, cert)`` returns a list of complaints; an empty list means the
certificate stands.
"""

from __future__ import annotations

from fractions import Fraction
from math import floor, gcd

from qseries import check


def _frac(x: int | str) -> Fraction:
    return Fraction(x)


def _divisors(n: int) -> list[int]:
    return [d for d in range(1, n + 1) if n % d == 0]


def _phi(n: int) -> int:
    return sum(1 for k in range(1, n + 1) if gcd(k, n) == 1)


def _index(n: int) -> Fraction:
    out = Fraction(n)
    for p in range(2, n + 1):
        if n % p == 0 and all(p % r for r in range(2, p)):
            out *= Fraction(p + 1, p)
    return out


def _order(r: dict[int, int], c: int, n: int) -> Fraction:
    """Ligozat: (N/24) sum_delta gcd(c, delta)^2 r_delta / (gcd(c, N/c) c delta)."""
    return Fraction(n, 24) * sum(Fraction(gcd(c, delta) ** 2 * e, gcd(c, n // c) * c * delta)
                                 for delta, e in r.items())


def _newman(r: dict[int, int], n: int) -> bool:
    return (all(n % d == 0 for d in r) and sum(d * e for d, e in r.items()) % 24 == 0
            and sum(n // d * e for d, e in r.items()) % 24 == 0)


def _is_square(x: Fraction) -> bool:
    def sq(m: int) -> bool:
        s = int(round(m ** 0.5))
        return any((s + t) ** 2 == m for t in (-1, 0, 1))
    return x > 0 and sq(x.numerator) and sq(x.denominator)


def _side_text(terms: list[dict], side: str, shift: Fraction) -> str:
    parts = []
    for t in terms:
        if t["side"] != side:
            continue
        c = _frac(t["coefficient"]) * (-1 if side == "rhs" else 1)
        etas = " ".join(f"eta(q^{d})^({e})" for d, e in t["eta"].items())
        parts.append(f"({c}) q^({shift}) {etas}")
    return " + ".join(parts) or "0"


def recheck(lhs: str, rhs: str, cert: dict) -> list[str]:
    """Complaints about ``cert`` (the ``certificate`` of ``qseries prove --json``)."""
    bad: list[str] = []
    n = cert["level"]
    k = _frac(cert["weight"])
    m = _index(n)
    if m != cert["index"]:
        bad.append(f"index {cert['index']} != {m}")
    divs = _divisors(n)
    if [x["d"] for x in cert["cusps"]] != divs:
        bad.append("the cusp classes are not one per divisor of N")
    for x in cert["cusps"]:
        d = x["d"]
        if x["count"] != _phi(gcd(d, n // d)) or x["width"] != n // gcd(d * d, n):
            bad.append(f"cusp class d = {d}: count or width wrong")
    if sum(x["count"] * x["width"] for x in cert["cusps"]) != m:
        bad.append("the widths of the cusps do not add up to the index")
    terms = [{int(d): e for d, e in t["eta"].items()} for t in cert["terms"]]
    for r in terms:
        if Fraction(sum(r.values()), 2) != k:
            bad.append(f"a term {r} is not of weight {k}")
    shift = _frac(cert["shift"])
    if cert["method"] == "sturm":
        fns = terms
        for r in fns:
            if not _newman(r, n):
                bad.append(f"{r} fails Newman's congruences at level {n}")
        # one character: (-1)^k prod d^(r_d) in one square class for all terms
        s0 = Fraction(1)
        for d, e in fns[0].items():
            s0 *= Fraction(d) ** e
        for r in fns[1:]:
            s = Fraction(1)
            for d, e in r.items():
                s *= Fraction(d) ** e
            if not _is_square(s / s0):
                bad.append("the terms have different characters")
        need = floor(k * m / 12)
        top = shift + need
    else:
        j = cert["divisor"]
        base = terms[j]
        fns = [{d: r.get(d, 0) - base.get(d, 0) for d in set(r) | set(base)} for r in terms]
        fns = [{d: e for d, e in f.items() if e} for f in fns]
        for f in fns:
            s = Fraction(1)
            for d, e in f.items():
                s *= Fraction(d) ** e
            if sum(f.values()) != 0 or not _newman(f, n) or not _is_square(s):
                bad.append(f"the quotient {f} is not a modular function on Gamma_0({n})")
        need = 0
        for x in cert["cusps"]:
            if x["d"] != n:
                need -= x["count"] * min(_order(f, x["d"], n) for f in fns)
        top = need + shift + Fraction(sum(d * e for d, e in base.items()), 24)
    if cert["bound"] != need:
        bad.append(f"bound {cert['bound']} != {need}")
    for x in cert["cusps"]:
        orders = [_order(f, x["d"], n) for f in fns]
        if orders != [_frac(o) for o in x["orders"]]:
            bad.append(f"orders at the cusps c/{x['d']} are {orders}, not {x['orders']}")
        if cert["method"] == "sturm" and min(orders) < 0:
            bad.append(f"a term has a pole at the cusps c/{x['d']}")
    # the valence formula: orders over all cusps add up to k m / 12 (0 for functions)
    for f in fns:
        total = sum(x["count"] * _order(f, x["d"], n) for x in cert["cusps"])
        if total != Fraction(sum(f.values()), 2) * m / 12:
            bad.append(f"the orders of {f} do not add up to k m / 12")
    if _frac(cert["checked"]["to"]) < top:
        bad.append(f"coefficients checked to q^{cert['checked']['to']}, not q^{top}")
    upto = max(floor(top) + 1, 1)         # a check compares at least q^0
    if check(lhs, rhs, upto, method="exact").holds is not True:
        bad.append(f"the sides differ below q^{upto}")
    for side, text in (("lhs", lhs), ("rhs", rhs)):
        if check(text, _side_text(cert["terms"], side, shift), upto, method="exact").holds \
                is not True:
            bad.append(f"the {side} differs from its terms below q^{upto}")
    return bad
