"""A series to and from other libraries: sympy expressions (exactly, with the order as
sympy's ``O(q**N)``) and numpy arrays.  Both libraries are optional: each is imported inside
the function that needs it, with a clear error when it is missing.

>>> from qseries.series import Series
>>> Series.from_coefficients([1, -1, 0, 2], prec=6).to_sympy()
1 - q + 2*q**3 + O(q**6)
"""

from __future__ import annotations

from fractions import Fraction
from typing import TYPE_CHECKING, Any

from ..backend import QQ, ZZ, LaurentPoly, Ring, ring_for
from ..errors import ArgumentError, ArgumentTypeError, UnableError

if TYPE_CHECKING:
    from .core import Series

#: int64 holds the coefficients when each lies in this range
_INT64 = (-(2**63), 2**63 - 1)


def _optional(name: str, extra: str) -> Any:
    """Import the optional library ``name`` or say how to install it."""
    import importlib

    try:
        return importlib.import_module(name)
    except ImportError:
        raise UnableError(f"this conversion needs {name}, which is not installed: "
                          f"pip install {name} (or pip install 'qseries[{extra}]')") from None


def to_sympy(s: Series, symbol: str = "q") -> Any:
    """The series as a sympy expression in ``symbol`` (and the extra variables by their
    names), plus ``O(q**N)`` when it is known only to O(q^N); exact rationals throughout
    (over GF(p), the residues 0 .. p-1 as integers).

    >>> from qseries.series import Series
    >>> from fractions import Fraction
    >>> to_sympy(Series.from_coefficients([Fraction(1, 2), 0, 3]))
    3*q**2 + 1/2
    """
    sympy = _optional("sympy", "notebook")
    if not isinstance(symbol, str) or not symbol.isidentifier():
        raise ArgumentTypeError(f"symbol must be a name such as 'q', not {symbol!r}")
    q = sympy.Symbol(symbol)
    names = getattr(s.ring, "names", ())
    if symbol in names:
        raise ArgumentError(f"symbol {symbol!r} is also an extra variable of the series")
    gens = [sympy.Symbol(n) for n in names]

    def number(c: int | Fraction) -> Any:
        c = Fraction(c)
        return sympy.Rational(c.numerator, c.denominator)

    def exponent(e: Any) -> Any:
        e = Fraction(e)
        return sympy.Rational(e.numerator, e.denominator)

    terms = []
    for e, c in s.terms():
        mono = q ** exponent(e)
        if isinstance(c, LaurentPoly):
            for exps, coef in c.terms():
                factor = number(coef)
                for g, k in zip(gens, exps[1:], strict=True):
                    factor *= g ** k
                terms.append(factor * mono)
        else:
            terms.append(number(c) * mono)   # type: ignore[arg-type]
    expr = sympy.Add(*terms)
    if s.precision is not None:
        expr = expr + sympy.Order(q ** exponent(s.precision), q)
    return expr


def from_sympy(expr: Any, order: int | Fraction | None = None, symbol: str = "q") -> Series:
    """A series from a sympy expression: a sum of terms c * q^e * z^j ... with exact
    rational c, rational e (all in one class modulo 1) and integer powers of the other
    symbols (extra variables), optionally plus ``O(q**N)``.  ``order`` truncates to O(q^order)
    (the lower of the two when the expression has its own O term).  Only sympy objects are
    read: a string is refused (it would have to be evaluated).

    >>> import sympy
    >>> q, z = sympy.symbols("q z")
    >>> from_sympy(1 - z*q + q**2/2 + sympy.O(q**5))
    1 - z*q + (1/2)q^2 + O(q^5)
    >>> from_sympy(1 + q + q**7, order=3)
    1 + q + O(q^3)
    """
    from .core import MAX_LENGTH, Series, _as_exponent

    sympy = _optional("sympy", "notebook")
    if not isinstance(expr, sympy.Basic):
        raise ArgumentTypeError(f"expr must be a sympy expression, not {type(expr).__name__} "
                                f"(strings are never evaluated: build the expression with "
                                f"sympy yourself)")
    if order is not None:
        order = _as_exponent(order, "order")
    q = sympy.Symbol(symbol)
    own_order: Fraction | None = None
    collected: dict[Fraction, dict[tuple[int, ...], Fraction]] = {}
    others = sorted(str(x) for x in expr.free_symbols if x != q)
    index = {name: i for i, name in enumerate(others)}
    for term in sympy.Add.make_args(sympy.expand(expr)):
        if isinstance(term, sympy.Order):
            point = term.args[1:]
            if len(term.args) < 2 or term.variables != (q,) or \
                    any(p[1] != 0 for p in point):
                raise ArgumentError(f"only O({symbol}**N) at {symbol} = 0 is understood, "
                                    f"not {term}")
            lead = term.expr
            k = Fraction(0) if lead == 1 else _rational_power(lead, q, sympy)
            own_order = k if own_order is None else min(own_order, k)
            continue
        coef, powers = _split_term(term, sympy)
        e = Fraction(0)
        exps = [0] * len(others)
        for base, k in powers.items():
            if base == q:
                e += k
            elif isinstance(base, sympy.Symbol) and k.denominator == 1:
                exps[index[str(base)]] += int(k)
            else:
                raise ArgumentError(f"the term {term} is not a number times powers of "
                                    f"{symbol} and integer powers of other symbols")
        slot = collected.setdefault(e, {})
        slot[tuple(exps)] = slot.get(tuple(exps), Fraction(0)) + coef
    prec = own_order if order is None else order if own_order is None else \
        min(order, own_order)
    terms = {e: {k: c for k, c in cs.items() if c} for e, cs in collected.items()}
    terms = {e: cs for e, cs in terms.items() if cs and (prec is None or e < prec)}
    offsets = {e - (e.numerator // e.denominator) for e in terms}
    if len(offsets) > 1:
        raise ArgumentError(f"the exponents of {symbol} lie in more than one class modulo 1 "
                            f"({', '.join(str(o) for o in sorted(offsets))}); a series has "
                            f"one")
    rational = any(c.denominator != 1 for cs in terms.values() for c in cs.values())
    ring: Ring = ring_for(tuple(others), QQ if rational else ZZ)
    if not terms:
        return Series.zero(ring) if prec is None else _zero_to(ring, prec)
    offset = offsets.pop()
    lo = min(int(e - offset) for e in terms)
    hi = max(int(e - offset) for e in terms)
    top = hi + 1 if prec is None else -_floor(offset - prec)     # ceil(prec - offset)
    if top - lo > MAX_LENGTH or hi - lo > MAX_LENGTH:
        raise UnableError(f"the exponents of {symbol} span more than {MAX_LENGTH}")
    coeffs: list[Any] = [0] * (hi - lo + 1)
    for e, cs in terms.items():
        coeffs[int(e - offset) - lo] = _coefficient(ring, cs)
    poly = ring.poly(coeffs)
    # O(q^N) with N outside the exponents' class: known below N, not below offset + top
    cap = prec if prec is not None and Fraction(prec) - offset != top else None
    return Series(ring, poly, lo, offset, None if prec is None else top, cap)


def _floor(x: Fraction) -> int:
    return x.numerator // x.denominator


def _zero_to(ring: Ring, prec: Fraction) -> Series:
    from .core import Series

    if prec.denominator == 1:
        return Series.zero(ring, int(prec))
    offset = prec - _floor(prec)
    return Series(ring, ring.zero(), _floor(prec), offset, _floor(prec))


def _coefficient(ring: Ring, cs: dict[tuple[int, ...], Fraction]) -> Any:
    if ring in (ZZ, QQ):
        [(_, c)] = cs.items()
        return c.numerator if c.denominator == 1 else c
    acc = ring.coerce(0)   # type: ignore[attr-defined]
    for exps, c in cs.items():
        mono = ring.coerce(c.numerator if c.denominator == 1 else c)   # type: ignore[attr-defined]
        for name, k in zip(ring.names, exps, strict=True):   # type: ignore[attr-defined]
            if k:
                mono = mono * ring.gen(name) ** k   # type: ignore[attr-defined]
        acc = acc + mono
    return acc


def _rational_power(lead: Any, q: Any, sympy: Any) -> Fraction:
    """k for the leading term q**k of an O term."""
    if lead == q:
        return Fraction(1)
    if isinstance(lead, sympy.Pow) and lead.base == q and lead.exp.is_Rational:
        return Fraction(int(lead.exp.p), int(lead.exp.q))
    raise ArgumentError(f"only O(q**N) with a rational N is understood, not O({lead})")


def _split_term(term: Any, sympy: Any) -> tuple[Fraction, dict[Any, Fraction]]:
    """(rational coefficient, {base: rational exponent}) of a product of powers."""
    coef = Fraction(1)
    powers: dict[Any, Fraction] = {}
    for factor in sympy.Mul.make_args(term):
        if factor.is_Rational:
            coef *= Fraction(int(factor.p), int(factor.q))
            continue
        base, k = factor.as_base_exp()
        if not isinstance(base, sympy.Symbol) or not k.is_Rational:
            why = "an inexact number" if factor.is_Float else "not a rational number times " \
                "rational powers of symbols"
            raise ArgumentError(f"cannot read the term {term}: {factor} is {why}")
        powers[base] = powers.get(base, Fraction(0)) + Fraction(int(k.p), int(k.q))
    return coef, powers


def to_numpy(s: Series, n: int | None = None, start: Any = 0) -> Any:
    """The coefficients of :meth:`Series.coefficient_list` as a numpy array: ``int64`` when
    every coefficient is an integer that fits, else ``object`` (Python ints, Fractions or
    Laurent polynomials, exact).

    >>> from qseries.series import Series
    >>> to_numpy(Series.from_coefficients([1, 2, 10**30], prec=3)).dtype
    dtype('O')
    """
    np = _optional("numpy", "notebook")
    values = s.coefficient_list(n, start)
    lo, hi = _INT64
    if all(type(c) is int and lo <= c <= hi for c in values):
        return np.array(values, dtype=np.int64)
    out = np.empty(len(values), dtype=object)
    out[:] = values
    return out
