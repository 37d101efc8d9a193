"""Hints for a failed check: does the difference look like a common slip?

Each hint is what the computed coefficients show to the order compared, nothing more:

* ``shift``: the sides differ by a factor q^s;
* ``constant``: by a constant factor (a sign, a factor 2);
* ``dilation``: one side is the other with q -> q^m;
* ``product-factor``: their ratio has a short product form (a missing or extra factor);
* ``polynomial``: they differ in finitely many terms only.

>>> from qseries.analysis import check
>>> r = check("sum_{k>=0} q^(k^2+k)/(q;q)_k",
...           "1/((q^2;q^5)_inf (q^3;q^5)_inf (q^20;q^20)_inf)", order=200)
>>> [h.kind for h in diagnose(r)]
['product-factor']
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from ..errors import QSeriesError, typed_argument
from ..series import Series
from ..series.formatting import format_term
from .compare import CheckResult
from .product_form import product_form

#: at most this many nonzero terms make a difference "finitely many terms"
MAX_POLY_TERMS = 6
#: a product factor is "short" when its printed form has at most this many q-Pochhammer symbols
MAX_FACTOR_SYMBOLS = 3
#: the product-factor hint looks at the first this many terms of the ratio (its product
#: form costs more than the check itself at high order)
HINT_PRODUCT_TERMS = 3000


@dataclass(frozen=True)
class Hint:
    kind: str
    message: str


def _to_known(s: Series, n: Fraction) -> Series:
    if s.offset:
        return s
    return s.truncate(int(n)) if n.denominator == 1 else s


def _leading(s: Series, terms: int) -> Series:
    """``s`` known to at most ``terms`` terms past its valuation."""
    v = s.valuation
    if v is None or s.offset or Fraction(v).denominator != 1:
        return s
    return s.truncate(int(v) + terms)


def _text(x: Fraction) -> str:
    return str(x.numerator) if x.denominator == 1 else f"({x})"


def _same(a: Series, b: Series, order: Fraction) -> bool:
    """a = b below q^order: the difference's valuation, read in one pass (not its terms
    converted one by one)."""
    try:
        d = a - b
    except QSeriesError:
        return False
    v = d.valuation
    return v is None or v >= order


def diagnose(r: CheckResult) -> list[Hint]:
    """Hints for a check that found a mismatch (an empty list when it holds)."""
    typed_argument("r", r, CheckResult, "a CheckResult (from qseries.check)")
    if r.first_mismatch is None or r.variables or r.lhs is None or r.rhs is None:
        return []   # the hints look at series in q alone
    # only what both computed sides know counts (after a modular check they are recomputed
    # exactly just past the mismatch, not to the whole order)
    n = min([Fraction(r.order_verified)] + [Fraction(s.precision) for s in (r.lhs, r.rhs)
                                           if s is not None and s.precision is not None])
    lhs, rhs = _to_known(r.lhs, n), _to_known(r.rhs, n)
    hints: list[Hint] = []
    vl, vr = lhs.valuation, rhs.valuation
    if vl is None or vr is None:
        return hints
    # a power of q, or a constant
    s = Fraction(vl) - Fraction(vr)
    cl, cr = lhs.coefficient(vl), rhs.coefficient(vr)
    if s != 0:
        compare_to = n - max(s, 0)
        if _same(lhs, rhs.shift(s), compare_to):
            hints.append(Hint("shift", f"the left side is q^({s}) times the right side "
                                       f"(to the order compared)"))
    elif cl != cr:
        ratio = Fraction(cl) / Fraction(cr)
        if _same(lhs, rhs * ratio, n):
            hints.append(Hint("constant", f"the left side is {ratio} times the right side "
                                          f"(to the order compared)"))
    # q -> q^m
    if not hints and lhs.offset == 0 and rhs.offset == 0 and n.denominator == 1:
        for m in range(2, 7):
            for big, small, name in ((lhs, rhs, "left"), (rhs, lhs, "right")):
                other = "right" if name == "left" else "left"
                if _same(big, small.inflate(m), n):
                    hints.append(Hint("dilation", f"the {name} side is the {other} side with "
                                                  f"q -> q^{m} (to the order compared)"))
    # finitely many terms
    if not hints:
        try:
            d = lhs - rhs
            terms = [(e, c) for e, c in d.terms() if e < n]
            if 0 < len(terms) <= MAX_POLY_TERMS and Fraction(terms[-1][0]) < n / 2:
                poly = " ".join(format_term(e, c, i == 0) for i, (e, c) in enumerate(terms))
                hints.append(Hint("polynomial", f"the sides differ only by the polynomial "
                                                f"{poly} below q^{_text(n)}"))
        except QSeriesError:
            pass
    # a short product factor
    if not hints and cl == cr:
        try:
            ratio = _leading(lhs, HINT_PRODUCT_TERMS) / _leading(rhs, HINT_PRODUCT_TERMS)
            ratio_pf = product_form(ratio, int(n))
            expr = ratio_pf.expression or ""
            where = ("to the order compared" if ratio.precision is None
                     or ratio.precision >= n - vr else
                     f"to q^{_text(Fraction(ratio.precision) - vl + vr)} (the first "
                     f"{HINT_PRODUCT_TERMS} terms)")
            if expr == "1":
                pass          # the ratio is 1 as far as its terms go: no factor to name
            elif ratio_pf.period and expr.count(";") <= MAX_FACTOR_SYMBOLS:
                hints.append(Hint("product-factor",
                                  f"the ratio left/right is {ratio_pf.expression} {where} "
                                  f"({ratio_pf.repetitions} periods of {ratio_pf.period} "
                                  f"seen): a factor is missing or extra"))
            elif expr and not ratio_pf.period and 0 < len(ratio_pf.nonzero()) <= MAX_FACTOR_SYMBOLS:
                hints.append(Hint("product-factor",
                                  f"the ratio left/right is {ratio_pf.expression} {where}: "
                                  f"a finite factor is missing or extra"))
        except (QSeriesError, ZeroDivisionError):
            pass
    return hints
