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
from math import floor, gcd, isqrt

from qseries import QSeriesError
from qseries import check as _engine_check

#: each side is compared with the certificate's terms at least below q^FAR
FAR = 50


def check(lhs: str, rhs: str, order: int, method: str = "exact"):
    """The series engine's comparison; an expression the engine refuses compares as unequal."""
    try:
        return _engine_check(lhs, rhs, order, method=method)
    except QSeriesError:
        class _Failed:
            holds = False
            order_verified = 0
        return _Failed()


def agrees(lhs: str, rhs: str, top: Fraction | int) -> bool:
    """True when every coefficient of q^e, e <= top, was compared and agrees (asking for
    more, a few times, when negative powers of q cost a side precision)."""
    n = max(floor(top) + 1, 1)
    for _ in range(5):
        r = check(lhs, rhs, n)
        if r.holds is False:
            return False
        if r.holds is True and Fraction(r.order_verified) > top:
            return True
        n *= 2
    return False


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
        return isqrt(m) ** 2 == m
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


def _function_on(f: dict[int, int], n: int) -> bool:
    s = Fraction(1)
    for d, e in f.items():
        s *= Fraction(d) ** e
    return sum(f.values()) == 0 and _newman(f, n) and _is_square(s)


def _eta_text(r: dict[int, int]) -> str:
    return " ".join(f"eta(q^{d})^({e})" for d, e in r.items()) or "1"


def _u_bound(f: dict[int, int], m: int, a: int, c: int, n: int) -> int:
    """Own derivation: (1 j; 0 m)(a b; c d) = gamma' (A B; 0 D), A = gcd(a + jc, mc); the
    j-th term of U_m f at a/c starts at width * rho(mc/A) * A^2 / m, rho(y) = sum_delta
    gcd(y, delta)^2 r_delta / (24 delta)."""
    width = n // gcd(c * c, n)
    values = []
    for j in range(m):
        big_a = gcd(a + j * c, m * c)
        y = m * c // big_a
        rho = sum(Fraction(gcd(y, delta) ** 2 * e, 24 * delta) for delta, e in f.items())
        values.append(width * rho * big_a * big_a / m)
    return -floor(-min(values))


def _recheck_dissection(lhs: str, rhs: str, cert: dict) -> list[str]:
    bad: list[str] = []
    n, m = cert["level"], cert["operator"]["m"]
    r, t = _frac(cert["operator"]["r"]), _frac(cert["shift"])
    f = {int(d): e for d, e in cert["function"].items()}
    mult = {int(d): e for d, e in cert["multiplier"].items()}
    scale = _frac(cert["scale"])
    if n % m:
        bad.append(f"m = {m} does not divide the level {n}")
    if not _function_on(f, n):
        bad.append(f"f = {f} is not a modular function on Gamma_0({n})")
    gs = [{int(d): e for d, e in x["eta"].items()} for x in cert["terms"]]
    for g in gs:
        if not _function_on(g, n):
            bad.append(f"the term {g} is not a modular function on Gamma_0({n})")
    # B = f / M(m tau) is the dissected eta quotient; the other side is sum c_i q^t g_i / M
    body = dict(f)
    for d, e in mult.items():
        body[m * d] = body.get(m * d, 0) - e
    body = {d: e for d, e in body.items() if e}
    v_m = Fraction(sum(d * e for d, e in mult.items()), 24)
    if (t - v_m).denominator != 1:
        bad.append("t - v_M is not an integer: U_m(q^(m e) f) = q^e U_m(f) does not apply")
    cusps = []
    for c in _divisors(n):
        g0 = gcd(c, n // c)
        for u in range(g0):
            if g0 > 1 and gcd(u, g0) != 1:
                continue
            a = u if g0 > 1 else 1
            while gcd(a, c) != 1:
                a += g0
            if c != n:
                cusps.append((a, c))
    if [x["cusp"] for x in cert["cusps"]] != [f"{a}/{c}" for a, c in cusps]:
        bad.append("the cusps listed are not every cusp of Gamma_0(N) but infinity")
        return bad
    need = 0
    for (a, c), x in zip(cusps, cert["cusps"], strict=True):
        lows = [_u_bound(f, m, a, c, n)] + [_order(g, c, n) for g in gs]
        if lows != [_frac(o) for o in x["orders"]]:
            bad.append(f"bounds at {a}/{c} are {lows}, not {x['orders']}")
        need -= min(lows)
    if cert["bound"] != need:
        bad.append(f"bound {cert['bound']} != {need}")
    top = need + t - v_m
    if _frac(cert["checked"]["to"]) < top:
        bad.append(f"coefficients checked to q^{cert['checked']['to']}, not q^{top}")
    upto = max(floor(top) + 1, 1)
    dissected, other = (lhs, rhs) if lhs.lstrip().startswith("[") else (rhs, lhs)
    if not agrees(lhs, rhs, top):
        bad.append(f"the sides differ at or below q^{top}")
    mine = f"[q^({m}n+{r})] ({scale}) q^({m * t + r}) {_eta_text(body)}"
    # each side against its terms also beyond a tiny bound (FAR), where the bound alone
    # would compare too few coefficients to tell a side from wrong terms
    far = max(upto, FAR)
    if not agrees(dissected, mine, far - 1):
        bad.append("the dissected side is not [q^(mn+r)] of scale q^(mt+r) B")
    parts = []
    for x, g in zip(cert["terms"], gs, strict=True):
        eta_i = {d: g.get(d, 0) - mult.get(d, 0) for d in set(g) | set(mult)}
        eta_i = {d: e for d, e in eta_i.items() if e}
        parts.append(f"({-_frac(x['coefficient']) * scale}) q^({t}) {_eta_text(eta_i)}")
    if not agrees(other, " + ".join(parts), far - 1):
        bad.append("the other side is not sum_i c_i q^t g_i / M")
    return bad


def recheck(lhs: str, rhs: str, cert: dict) -> list[str]:
    """Complaints about ``cert`` (the ``certificate`` of ``qseries prove --json``)."""
    if cert["method"] == "dissection":
        return _recheck_dissection(lhs, rhs, cert)
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
        if k.denominator != 1:
            bad.append(f"Sturm's bound with Newman's criteria needs an integral weight, not {k}")
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
    if not agrees(lhs, rhs, top):
        bad.append(f"the sides differ at or below q^{top}")
    for side, text in (("lhs", lhs), ("rhs", rhs)):
        far = max(upto, FAR)            # beyond a tiny bound too
        if not agrees(text, _side_text(cert["terms"], side, shift), far - 1):
            bad.append(f"the {side} differs from its terms below q^{far}")
    return bad


def multiplied_through(cert: dict, max_exponent: int = 8) -> Fraction | None:
    """The literature's route for terms that are not holomorphic forms of integral weight
    (issue 15, item 2): multiply every term f_i by one eta quotient M (searched here among
    M on at most two divisors of N' in {N, 2N}, exponents up to ``max_exponent``) so that
    every M f_i is a holomorphic form of one integral weight k' >= 1 and one character on
    Gamma_0(N') (Newman, Ligozat); Sturm's bound B' = floor(k' m(N') / 12) then decides the
    identity with the coefficients of LHS - RHS up to q^(shift + B' - v_M).  Returns the
    least such highest exponent, or None when no M searched works.  Own code, like the rest
    of this module."""
    terms = [{int(d): e for d, e in t["eta"].items()} for t in cert["terms"]]
    k = Fraction(sum(terms[0].values()), 2)
    shift = _frac(cert["shift"])
    best = None
    for n in (cert["level"], 2 * cert["level"]):
        divs = _divisors(n)
        m = _index(n)
        cusps = [(c, _phi(gcd(c, n // c))) for c in divs]
        pairs = [(a,) for a in divs] + [(a, b) for i, a in enumerate(divs) for b in divs[i + 1:]]
        for ds in pairs:
            rng = range(-max_exponent, max_exponent + 1)
            for es in ([(e,) for e in rng] if len(ds) == 1
                       else [(e, g) for e in rng for g in rng]):
                mult = {d: e for d, e in zip(ds, es, strict=True) if e}
                k2 = k + Fraction(sum(mult.values()), 2)
                if k2.denominator != 1 or k2 < 1:
                    continue
                fns = [{d: f.get(d, 0) + mult.get(d, 0) for d in set(f) | set(mult)}
                       for f in terms]
                fns = [{d: e for d, e in f.items() if e} for f in fns]
                if not all(_newman(f, n) for f in fns):
                    continue
                s = [Fraction(1)] * len(fns)
                for i, f in enumerate(fns):
                    for d, e in f.items():
                        s[i] *= Fraction(d) ** e
                if not all(_is_square(x / s[0]) for x in s):
                    continue
                if any(_order(f, c, n) < 0 for f in fns for c, _ in cusps):
                    continue
                v_m = Fraction(sum(d * e for d, e in mult.items()), 24)
                high = shift + floor(k2 * m / 12) - v_m
                best = high if best is None else min(best, high)
    return best
