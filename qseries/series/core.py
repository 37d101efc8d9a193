"""Truncated formal Laurent series in q with a rational exponent offset.

A :class:`Series` stands for

    q^offset * ( sum_i c_i q^(start + i) )  +  O(q^(offset + prec))

with ``0 <= offset < 1`` a Fraction, ``start`` an integer and ``prec`` the integer absolute
precision (``None`` when the series is an exact polynomial, such as ``q`` or ``1 - q^5``).
Every operation propagates the precision honestly: ``q^-5 * f`` loses 5, dividing by a series
of valuation ``v > 0`` loses ``v``, adding takes the minimum.

The coefficient ring is a backend of :mod:`qseries.backend` (ZZ, QQ, GF(p) or Laurent
polynomials in extra variables); there is no global precision or ring.

>>> from qseries.series import Series, ZZ
>>> f = Series.from_coefficients([1, -1], ZZ)          # 1 - q, exact
>>> g = f.inverse(order=6)                             # 1/(1-q) + O(q^6)
>>> g
1 + q + q^2 + q^3 + q^4 + q^5 + O(q^6)
>>> (g * Series.monomial(-2, ZZ)).precision            # q^-2 * g is known to O(q^4)
4

A series is indexed and sliced by exponents, not by positions: ``f[e]`` is the coefficient
of q^e (any integer or Fraction e below the precision, zero where there is no term) and
``f[a:b]`` is the exact polynomial of the terms with a <= e < b (``f[a:]``, the tail, keeps
the precision).  Asking for anything at or beyond the precision raises
:class:`~qseries.errors.PrecisionError`: it is unknown, not zero.

>>> f = Series.from_coefficients([1, 0, 1, 1], start=-2, prec=5)
>>> f[-2], f[3]
(1, 0)
>>> f[0:3]
1 + q
>>> f[1:]
q + O(q^5)

A series is not a Python container: ``iter``, ``len`` and ``in`` are refused with a
TypeError, because no reading of them is both finite and faithful (an exact series has
infinitely many coefficients, a truncated one may start below q^0 or at q^(1/24)).  Use
``f.terms()`` (the known nonzero terms), ``f.coefficient_list(n, start)`` or ``f[a:b]``.

>>> list(f.terms())
[(-2, 1), (0, 1), (1, 1)]

``f == g`` holds when both have the same precision (both exact, or the same O(q^N)) and the
same known terms, their rings being combinable as in arithmetic (ZZ inside QQ); a number
stands for the exact constant series.  So ``1 + O(q^5) != 1``: to compare below an order,
use ``equal_to``, which refuses an order beyond what is known on either side.

>>> Series.constant(1) == 1, Series.constant(1) + Series.zero(prec=5) == 1
(True, False)
>>> (Series.constant(1) + Series.zero(prec=5)).equal_to(1, 5)
True
"""

from __future__ import annotations

import copyreg
import math
import numbers
from collections.abc import Iterator
from fractions import Fraction
from typing import Any, NoReturn, overload

from ..backend import GF, QQ, ZZ, LaurentPoly, Ring, join_rings, laurent_ring
from ..errors import (
    ArgumentError,
    ArgumentTypeError,
    DomainError,
    IncompatibleRingError,
    PrecisionError,
    QSeriesError,
    UnableError,
    weight_may_help,
)
from .formatting import power_text

Number = int | Fraction
Exponent = int | Fraction

#: Largest coefficient size (in bits) a power may produce.
MAX_COEFFICIENT_BITS = 10_000_000
#: Largest absolute precision (and largest exact polynomial degree) a series may reach.
MAX_LENGTH = 10_000_000


def _as_number(x: Any) -> Number:
    if isinstance(x, bool):
        raise TypeError("booleans are not coefficients")
    if isinstance(x, int):
        return x
    if isinstance(x, Fraction):
        return x.numerator if x.denominator == 1 else x
    if isinstance(x, LaurentPoly):   # a coefficient involving extra variables
        return x
    if isinstance(x, numbers.Rational):   # sympy's Integer and Rational, among others
        return _exact(x)
    raise TypeError(f"cannot use {type(x).__name__} as a coefficient")


def _exact(x: numbers.Rational) -> Number:
    """A numbers.Rational as a Python int or Fraction."""
    n, d = int(x.numerator), int(x.denominator)
    return n if d == 1 else Fraction(n, d)


def _as_exponent(x: Any, what: str = "an exponent") -> Exponent:
    """x as an int or Fraction; floats (inexact), strings and booleans are refused."""
    if isinstance(x, bool) or not isinstance(x, numbers.Rational):
        text = repr(x)
        text = text if len(text) <= 40 else text[:37] + "..."
        raise ArgumentTypeError(f"{what} must be an integer or a Fraction, not {text} "
                                f"({type(x).__name__})")
    return x if type(x) is int else _exact(x)


def _ceil(x: Exponent) -> int:
    x = Fraction(x)
    return -((-x.numerator) // x.denominator)




def _big_o(p: Exponent) -> str:
    return f"O({power_text(p)})"


def _min_prec(*ps: int | None) -> int | None:
    finite = [p for p in ps if p is not None]
    return min(finite) if finite else None


def _align_offsets(a: Series, b: Series) -> tuple[Series, Series]:
    """Bring two series with different offsets to one frame; possible only when one of them
    has no known nonzero term (then it just contributes its precision)."""
    for x, y in ((a, b), (b, a)):
        if x.is_zero():
            if x.prec is None:
                z = Series(y.ring, y.ring.zero(), 0, y.offset, None)
            else:
                bound = x.prec + x.offset - y.offset      # exponents y.offset+k with k < bound
                p = bound.numerator // bound.denominator
                if p < bound:
                    p += 1
                z = Series(y.ring, y.ring.zero(), p, y.offset, p, x.precision)
            return (z, y) if x is a else (y, z)
    raise IncompatibleRingError(
        f"cannot add series whose exponents differ by a non-integer "
        f"(offsets {a.offset} and {b.offset})")


def _common_den(a: Series, b: Series) -> int:
    """The least d such that a and b are both series in q^(1/d) with their exponents in one
    class: a multiple of both ``den`` that makes the offsets differ by an integer."""
    d = math.lcm(a.den, b.den)
    gap = Fraction(d // a.den) * a.offset - Fraction(d // b.den) * b.offset
    return d * gap.denominator


def _over(g: Series, d: int) -> Series:
    """The series G(q^(1/d)) for a series G in integer classes (``den`` 1), in its simplest
    form: with ``den`` 1 again when its known terms lie in one class (q^c times integer
    powers of q), the precision kept exactly through ``cap``."""
    if d == 1:
        return g
    top = g.precision
    if g.is_zero():
        if top is None:
            return Series(g.ring, g.ring.zero(), 0)
        p = Fraction(top) / d
        return Series(g.ring, g.ring.zero(), _ceil(p), 0, _ceil(p), p)
    v = Fraction(g.valuation)            # type: ignore[arg-type]
    classes = {i % d for i, c in enumerate(g.ring._coefficients(g.poly)) if c}
    if len(classes) > 1:
        return Series(g.ring, g.poly, g.start, g.offset, g.prec, g.cap, d)
    # every term at t^(v + d n): G(t) = t^v K(t^d) with K the section, so the series is
    # q^(v/d) K(q)
    k = g.section(d, v).shift(v / d)
    return k if top is None else k._capped(Fraction(top) / d)


def _valuation_bound(x: Series) -> Fraction:
    """A lower bound of the absolute valuation of an inexact or nonzero series: its
    valuation, or its precision when no known term is nonzero."""
    v = x.valuation
    return Fraction(x.precision if v is None else v)  # type: ignore[arg-type]


def _split_exponent(e: Exponent) -> tuple[int, Fraction]:
    """Write e = n + f with n an integer and 0 <= f < 1."""
    e = Fraction(e)
    n = e.numerator // e.denominator
    return n, e - n


class Series:
    """An immutable truncated series; see the module docstring for its meaning."""

    __slots__ = ("ring", "poly", "start", "offset", "prec", "cap", "den")

    def __init__(self, ring: Ring, poly: Any, start: int, offset: Fraction | int = 0,
                 prec: int | None = None, cap: Exponent | None = None, den: int = 1) -> None:
        offset = Fraction(offset)
        if not 0 <= offset < 1:
            raise ValueError("offset must lie in [0, 1)")
        if isinstance(den, bool) or not isinstance(den, int) or den < 1:
            raise ValueError("den must be an integer >= 1")
        # normalise: drop coefficients at or beyond the precision (and the cap), then
        # leading zeros
        if prec is not None:
            if prec - start > MAX_LENGTH:
                raise UnableError(f"precision O(q^{prec}) exceeds the limit {MAX_LENGTH}")
            keep = prec
            if cap is not None and Fraction(cap) < offset + prec:
                keep = _ceil(Fraction(cap) - offset)    # exponents offset + k < cap
            poly = ring._truncate(poly, max(keep - start, 0))
        v = ring._valuation(poly)
        if v is None:
            start = prec if prec is not None else 0
        elif v:
            poly = ring._shift_down(poly, v)
            start += v
        if ring._length(poly) > MAX_LENGTH:
            raise UnableError(f"a polynomial of length {ring._length(poly)} exceeds the limit")
        self.ring = ring
        self.poly = poly
        self.start = start
        self.offset = offset
        self.prec = prec
        #: an absolute precision below offset + prec, where the exponents of the series' class
        #: cannot express it: eta(q) + O(q^12) is known below q^12, not below q^(12+1/24)
        self.cap: Fraction | None = None
        if prec is not None and cap is not None and Fraction(cap) < offset + prec:
            self.cap = Fraction(cap)
        #: the series in q^(1/den): the fields above describe G(t) with the series equal
        #: to G(q^(1/den)) (``den`` > 1 only for a sum of terms whose exponents differ by
        #: non-integers, such as theta_2(q) + theta_3(q); see ``_over``)
        self.den = den

    # -- constructors ------------------------------------------------------------------
    @classmethod
    def from_coefficients(cls, coeffs: list[Number], ring: Ring | None = None, start: int = 0,
                          prec: int | None = None, offset: Fraction | int = 0) -> Series:
        """Series sum coeffs[i] q^(start+i) (+ O(q^prec) when prec is given).  The ring
        defaults to ZZ, or QQ when a coefficient is a non-integral Fraction.

        >>> Series.from_coefficients([1, 2, 3], prec=2)
        1 + 2q + O(q^2)
        """
        nums = [_as_number(c) for c in coeffs]
        if ring is None:
            ring = QQ if any(isinstance(c, Fraction) for c in nums) else ZZ
        return cls(ring, ring.poly(nums), start, offset, prec)

    @classmethod
    def from_int_list(cls, coeffs: list[int], ring: Ring, prec: int | None = None) -> Series:
        """Like :meth:`from_coefficients` for a list of Python ints, converted in one step
        (no per-coefficient checks): for long series built by the library itself.

        >>> Series.from_int_list([1, 0, -1], ZZ, prec=3)
        1 - q^2 + O(q^3)
        """
        return cls(ring, ring.poly_from_ints(coeffs), 0, 0, prec)

    @classmethod
    def constant(cls, c: Number, ring: Ring | None = None) -> Series:
        """The exact constant c; the ring defaults to ZZ for integers and QQ for fractions.

        >>> Series.constant(Fraction(1, 2))
        1/2
        """
        c = _as_number(c)
        if ring is None:
            ring = QQ if isinstance(c, Fraction) else ZZ
        elif isinstance(c, Fraction) and c.denominator != 1:
            ring = ring.fractions
        return cls(ring, ring.poly([c]), 0)

    @classmethod
    def monomial(cls, e: Exponent, ring: Ring = ZZ, c: Number = 1) -> Series:
        """The exact monomial c q^e; e may be a Fraction.

        >>> Series.monomial(Fraction(1, 24))
        q^(1/24)
        """
        n, f = _split_exponent(e)
        c = _as_number(c)
        if isinstance(c, Fraction) and c.denominator != 1:
            ring = ring.fractions
        return cls(ring, ring.poly([c]), n, f)

    @classmethod
    def zero(cls, ring: Ring = ZZ, prec: int | None = None) -> Series:
        """0 (exact) or O(q^prec).

        >>> Series.zero(prec=3)
        O(q^3)
        """
        return cls(ring, ring.zero(), prec if prec is not None else 0, 0, prec)

    # -- queries -------------------------------------------------------------------------
    @property
    def precision(self) -> Exponent | None:
        """The exponent below which every coefficient is known (None when exact).

        >>> half = Series.monomial(Fraction(1, 2))
        >>> (half + Series.zero(prec=3) * half).precision
        Fraction(7, 2)
        """
        if self.prec is None:
            return None
        p = self.prec + self.offset if self.cap is None else self.cap
        p /= self.den
        return p.numerator if p.denominator == 1 else p

    @property
    def is_exact(self) -> bool:
        return self.prec is None

    def is_zero(self) -> bool:
        """True when every known coefficient vanishes (``O(q^N)`` counts as zero to that order)."""
        return self.ring._length(self.poly) == 0

    @property
    def valuation(self) -> Exponent | None:
        """Exponent of the first nonzero term, or None when no known term is nonzero.

        >>> Series.from_coefficients([0, 0, 5]).valuation
        2
        """
        if self.is_zero():
            return None
        v = (self.start + self.offset) / self.den
        return v.numerator if v.denominator == 1 else v

    def _val_int(self) -> int | None:
        """Integer part of the valuation (None for zero)."""
        return None if self.is_zero() else self.start

    def coefficient(self, e: Exponent) -> Number:
        """The coefficient of q^e (0 where the series has no term); a
        :class:`~qseries.errors.PrecisionError` at or beyond the precision, where it is
        unknown.

        >>> f = Series.from_coefficients([1, 1, 2, 3, 5], prec=5)
        >>> f.coefficient(4), f.coefficient(-1), f.coefficient(Fraction(1, 2))
        (5, 0, 0)
        >>> f.coefficient(5)  # doctest: +ELLIPSIS
        Traceback (most recent call last):
        ...
        qseries.errors.PrecisionError: the coefficient of q^5 lies beyond the precision O(q^5): ...
        """
        e = _as_exponent(e)
        if self.den != 1:
            if self.prec is not None and e >= self.precision:   # type: ignore[operator]
                raise PrecisionError(f"the coefficient of {power_text(e)} lies beyond the "
                                     f"precision {_big_o(self.precision)}: it is not known")
            return self._base().coefficient(e * self.den)
        n, f = _split_exponent(e)
        if self.prec is not None and e >= self.prec + self.offset:
            raise PrecisionError(f"the coefficient of {power_text(e)} lies beyond the "
                                 f"precision {_big_o(self.precision)}: it is not known")
        if f != self.offset:
            return 0
        i = n - self.start
        if i < 0 or i >= self.ring._length(self.poly):
            return 0
        return self.ring.to_number(self.ring._coeff(self.poly, i))

    @overload
    def __getitem__(self, e: slice) -> Series: ...

    @overload
    def __getitem__(self, e: Exponent) -> Number: ...

    def __getitem__(self, e: slice | Exponent) -> Series | Number:
        """``f[e]`` is ``f.coefficient(e)``; ``f[a:b]`` is the exact polynomial of the terms
        with exponents a <= e < b (refused when b lies beyond the precision); ``f[a:]`` is
        the tail from q^a on, with the precision of f (and at least a).

        >>> f = Series.monomial(Fraction(1, 2)) * Series.from_coefficients([1, 2, 3], prec=3)
        >>> f[Fraction(3, 2)], f[0:2], f[2:]
        (2, q^(1/2) + 2q^(3/2), 3q^(5/2) + O(q^(7/2)))
        >>> f[0:4]  # doctest: +ELLIPSIS
        Traceback (most recent call last):
        ...
        qseries.errors.PrecisionError: f[0:4] reaches q^4, beyond the precision O(q^(7/2)): ...
        """
        if isinstance(e, slice):
            return self._slice(e)
        return self.coefficient(e)

    def _slice(self, sl: slice) -> Series:
        if sl.step is not None:
            raise ArgumentError("a series is sliced by exponents, f[a:b], without a step")
        lo = None if sl.start is None else _as_exponent(sl.start, "a slice bound")
        hi = None if sl.stop is None else _as_exponent(sl.stop, "a slice bound")
        if self.den != 1:
            if hi is not None and self.prec is not None and \
                    hi > self.precision:  # type: ignore[operator]
                shown = f"{'' if lo is None else lo}:{hi}"
                raise PrecisionError(f"f[{shown}] reaches {power_text(hi)}, beyond the "
                                     f"precision {_big_o(self.precision)}")
            d = self.den
            return _over(self._base()._slice(slice(None if lo is None else lo * d,
                                                   None if hi is None else hi * d)), d)
        if hi is not None and self.prec is not None and hi > self.prec + self.offset:
            shown = f"{'' if lo is None else lo}:{hi}"
            raise PrecisionError(f"f[{shown}] reaches {power_text(hi)}, beyond the precision "
                                 f"{_big_o(self.precision)}: coefficients from there on are "
                                 f"not known")
        R, poly, prec = self.ring, self.poly, self.prec
        if hi is not None:        # exponents offset + k with k < ceil(hi - offset)
            poly = R._truncate(poly, _ceil(hi - self.offset) - self.start)
            prec = None
        if lo is not None:
            k_lo = _ceil(lo - self.offset)
            if k_lo > self.start:
                poly = poly - R._truncate(poly, k_lo - self.start)
            if prec is not None:  # the tail is known to vanish below q^lo
                prec = max(prec, k_lo)
        return Series(R, poly, self.start, self.offset, prec)

    def __iter__(self) -> NoReturn:
        """Refused: a series is not a sequence (see the module docstring).

        >>> iter(Series.constant(1))  # doctest: +ELLIPSIS
        Traceback (most recent call last):
        ...
        TypeError: a series is not iterable: iterate over f.terms() (its known nonzero terms), ...
        """
        raise TypeError("a series is not iterable: iterate over f.terms() (its known nonzero "
                        "terms), or use f.coefficient_list(n, start) or f[a:b]")

    def __contains__(self, item: object) -> NoReturn:
        """Refused: ``x in f`` could mean an exponent, a coefficient or a term.

        >>> 5 in Series.constant(1)  # doctest: +ELLIPSIS
        Traceback (most recent call last):
        ...
        TypeError: `x in series` is not defined (an exponent? a coefficient? a term?): use ...
        """
        raise TypeError("`x in series` is not defined (an exponent? a coefficient? a term?): "
                        "use f.coefficient(e), f.terms() or f.valuation")

    def __len__(self) -> NoReturn:
        """Refused: an exact series has infinitely many coefficients, and a truncated one
        need not start at q^0.

        >>> len(Series.zero(prec=3))  # doctest: +ELLIPSIS
        Traceback (most recent call last):
        ...
        TypeError: a series has no length: use f.coefficient_list(n, start), ...
        """
        raise TypeError("a series has no length: use f.coefficient_list(n, start), "
                        "f.precision or f.terms()")

    def __bool__(self) -> bool:
        """Always True, as for any object (``s or t`` picks s whenever s is a series); whether
        a series vanishes is ``is_zero()`` (to its precision) or ``s == 0`` (exactly).

        >>> bool(Series.zero()), Series.zero() == 0
        (True, True)
        """
        return True

    def terms(self) -> Iterator[tuple[Exponent, Number]]:
        """The nonzero known terms as (exponent, coefficient), in increasing order.

        >>> list(Series.from_coefficients([1, 0, -3], start=-1).terms())
        [(-1, 1), (1, -3)]
        """
        for i, c in enumerate(self.ring._coefficients(self.poly)):
            if c:
                e = (self.start + i + self.offset) / self.den
                yield (e.numerator if e.denominator == 1 else e), c

    def coefficient_list(self, n: int | None = None, start: Exponent = 0) -> list[Number]:
        """The coefficients of q^start, q^(start+1), ..., q^(start+n-1): the whole series
        below q^(start+n); without ``n``, every coefficient known (up to the precision, or
        to the last term of an exact polynomial).  Refused
        (:class:`~qseries.errors.ArgumentError`) when the series has a known nonzero term
        that the list would not show: below ``start``, or at an exponent that differs from
        ``start`` by a non-integer (pass ``start=f.valuation``);
        a :class:`~qseries.errors.PrecisionError` when q^(start+n-1) lies beyond the
        precision.  For a window that drops terms, slice: ``f[a:b]``.

        >>> Series.from_coefficients([1, 2], prec=5).coefficient_list(4)
        [1, 2, 0, 0]
        >>> f = Series.from_coefficients([1, 0, 1, 1], start=-2)        # q^-2 + 1 + q
        >>> f.coefficient_list(3)  # doctest: +ELLIPSIS
        Traceback (most recent call last):
        ...
        qseries.errors.ArgumentError: the series has a term in q^-2, below start=0, ...
        >>> f.coefficient_list(5, start=-2)
        [1, 0, 1, 1, 0]
        >>> (Series.monomial(Fraction(1, 24)) * f).coefficient_list(3, start=Fraction(-47, 24))
        [1, 0, 1]
        >>> Series.from_coefficients([1, 2], prec=4).coefficient_list()
        [1, 2, 0, 0]
        """
        if n is None:
            n = self._known_count(_as_exponent(start, "start"))
            if n > MAX_LENGTH:
                raise UnableError(f"the series has {n} known coefficients from "
                                  f"{power_text(start)} on, beyond the limit {MAX_LENGTH}: "
                                  f"pass n (and start) for the part you need")
        if isinstance(n, bool) or not isinstance(n, numbers.Integral):
            raise ArgumentTypeError(f"n must be an integer, not {type(n).__name__}")
        n = int(n)
        s = _as_exponent(start, "start")
        if n <= 0:
            return []
        last = s + n - 1
        if self.den != 1:
            return self._ramified_list(n, s)
        if self.prec is not None and last >= self.prec + self.offset:
            raise PrecisionError(f"the coefficients of {power_text(s)} .. "
                                 f"{power_text(last)} are asked for, but the series is known "
                                 f"only to {_big_o(self.precision)}")
        if self.is_zero():
            return [0] * n
        v = self.valuation
        assert v is not None
        if Fraction(v - s).denominator != 1 or v < s:
            where = "below" if v < s else "off the exponents listed from"
            raise ArgumentError(f"the series has a term in {power_text(v)}, {where} "
                                f"start={s}, that the list would not show: pass start={v} "
                                f"(its valuation), or slice f[a:b] for a window")
        base = int(v - s)             # the position of the first term in the list
        R = self.ring
        coeffs = R._coefficients(R._truncate(self.poly, n - base))
        out: list[Number] = [0] * n
        out[base:base + len(coeffs)] = coeffs
        return out

    def _ramified_list(self, n: int, s: Fraction) -> list[Number]:
        """coefficient_list for a series in q^(1/den): the coefficients at s, s + 1, ...,
        refused when a known term lies off that grid."""
        d = self.den
        base = self._base()
        if self.prec is not None and s + n - 1 >= self.precision:  # type: ignore[operator]
            raise PrecisionError(f"the coefficients of {power_text(s)} .. "
                                 f"{power_text(s + n - 1)} are asked for, but the series is "
                                 f"known only to {_big_o(self.precision)}")
        for e, _ in self.terms():
            if e < s or Fraction(e - s).denominator != 1:
                where = "below" if e < s else "off the exponents listed from"
                raise ArgumentError(f"the series has a term in {power_text(e)}, {where} "
                                    f"start={s}, that the list would not show (its exponents "
                                    f"are multiples of q^(1/{d})): slice f[a:b] for a window")
            if e >= s + n:
                break
        return [base.coefficient((s + i) * d) for i in range(n)]

    def one_class(self, purpose: str) -> Series:
        """self, when its exponents lie in one class (q^c times integer powers of q); a
        :class:`~qseries.errors.DomainError` naming ``purpose`` for a series in q^(1/d)
        with terms in several classes, such as theta_2(q) + theta_3(q).

        >>> (Series.monomial(Fraction(1, 2)) + 1).one_class("a congruence search")
        ... # doctest: +ELLIPSIS
        Traceback (most recent call last):
        ...
        qseries.errors.DomainError: the exponents of this series are multiples of q^(1/2) ...
        """
        if self.den != 1:
            raise DomainError(f"the exponents of this series are multiples of q^(1/{self.den}) "
                              f"in several classes, so {purpose} does not apply; substitute "
                              f"q -> q^{self.den} first (define the series as F(q) and use "
                              f"F(q^{self.den}))")
        return self

    # -- internal helpers ------------------------------------------------------------------
    def _known_count(self, start: Exponent) -> int:
        """How many coefficients from q^start on are known (up to the precision or the last
        term); the exponents of the list step from ``start`` by 1."""
        if self.precision is not None:
            return max(0, _ceil(Fraction(self.precision) - Fraction(start)))
        last = None
        for e, _ in self.terms():
            last = e
        return 0 if last is None else max(0, _ceil(Fraction(last) - Fraction(start)) + 1)

    def _with(self, poly: Any, start: int, offset: Fraction, prec: int | None,
              ring: Ring | None = None, cap: Exponent | None = None) -> Series:
        return Series(ring or self.ring, poly, start, offset, prec, cap, self.den)

    def _base(self) -> Series:
        """The series G with self = G(q^(1/den)) (self when den is 1)."""
        if self.den == 1:
            return self
        return Series(self.ring, self.poly, self.start, self.offset, self.prec, self.cap)

    def _in(self, d: int) -> Series:
        """The series G with self = G(q^(1/d)), for d a multiple of ``den``."""
        k = d // self.den
        if k == 1:
            return self._base()
        span = self.ring._length(self.poly) - 1 if self.prec is None else \
            self.prec - self.start
        if span > 0 and span * k + 1 > MAX_LENGTH:
            raise UnableError(f"the fractional exponents need the common power q^(1/{d}), in "
                              f"which this series spans {span * k + 1} terms, beyond the "
                              f"limit {MAX_LENGTH}")
        return self._base().inflate(k)

    def _capped(self, absolute: Exponent | None) -> Series:
        """self with its absolute precision at most ``absolute`` where the class of its
        exponents cannot express it (see ``cap``)."""
        p = self.precision
        if absolute is None or p is None or absolute >= p:
            return self
        return Series(self.ring, self.poly, self.start, self.offset, self.prec,
                      absolute * self.den, self.den)

    def _operand(self, other: Any) -> Series | None:
        """other as a series (numbers become exact constants in a ring holding them), or None
        for an object arithmetic does not know (the caller returns NotImplemented)."""
        if isinstance(other, Series):
            return other
        if isinstance(other, bool) or not isinstance(other, (numbers.Rational, LaurentPoly)):
            return None
        return self._coerce(other)

    def _coerce(self, other: Any) -> Series:
        if isinstance(other, Series):
            return other
        if isinstance(other, (numbers.Rational, LaurentPoly)) and not isinstance(other, bool):
            c = _as_number(other)
            ring = self.ring
            if isinstance(c, Fraction) and c.denominator != 1:
                ring = ring.fractions
            if isinstance(c, LaurentPoly):
                ring = join_rings(ring, c.ring)
            return Series(ring, ring.poly([c]), 0)
        raise TypeError(f"cannot combine a series with {type(other).__name__}")

    def change_ring(self, ring: Ring) -> Series:
        """The same series over a larger ring (ZZ -> QQ, or exact -> GF(p) by reduction).

        >>> Series.from_coefficients([3, 1]).change_ring(QQ).ring
        QQ
        """
        if ring == self.ring:
            return self
        return self._with(ring.convert(self.poly), self.start, self.offset, self.prec, ring,
                          cap=self.cap)

    def _joined(self, other: Series) -> tuple[Series, Series]:
        ring = join_rings(self.ring, other.ring)
        return self.change_ring(ring), other.change_ring(ring)

    # -- arithmetic ------------------------------------------------------------------------
    def __neg__(self) -> Series:
        return self._with(-self.poly, self.start, self.offset, self.prec, cap=self.cap)

    def __pos__(self) -> Series:
        return self

    def __add__(self, other: Any) -> Series:
        other = self._operand(other)
        if other is None:
            return NotImplemented
        a, b = self._joined(other)
        if a.den != 1 or b.den != 1 or (a.offset != b.offset and not a.is_zero() and
                                        not b.is_zero()):
            d = _common_den(a, b)
            return _over(a._in(d) + b._in(d), d)
        if a.offset != b.offset:
            a, b = _align_offsets(a, b)
        prec = _min_prec(a.prec, b.prec)
        R = a.ring
        s = min(a.start, b.start)
        if prec is not None:
            s = min(s, prec)
        top = max(a.start + R._length(a.poly), b.start + R._length(b.poly))
        if prec is not None:
            top = min(top, prec)
        if top - s > MAX_LENGTH:
            raise UnableError(f"the sum spans {top - s} coefficients, beyond the limit "
                              f"{MAX_LENGTH}")
        polys = []
        for x in (a, b):
            px = x.poly if prec is None else R._truncate(x.poly, prec - x.start)
            polys.append(R._shift_up(px, x.start - s) if R._length(px) else px)
        return Series(R, polys[0] + polys[1], s, a.offset, prec)._capped(
            _min_prec(a.precision, b.precision))

    __radd__ = __add__

    def __sub__(self, other: Any) -> Series:
        other = self._operand(other)
        return NotImplemented if other is None else self + (-other)

    def __rsub__(self, other: Any) -> Series:
        other = self._operand(other)
        return NotImplemented if other is None else other + (-self)

    def __mul__(self, other: Any) -> Series:
        other = self._operand(other)
        if other is None:
            return NotImplemented
        a, b = self._joined(other)
        if a.den != 1 or b.den != 1:
            d = math.lcm(a.den, b.den)
            return _over(a._in(d) * b._in(d), d)
        R = a.ring
        va, vb = a._val_int(), b._val_int()
        # absolute precision of a product: min(pa + val(b), pb + val(a))
        cands = []
        if a.prec is not None:
            if vb is None:
                if b.prec is None:
                    return Series.zero(R)
                cands.append(a.prec + b.prec)
            else:
                cands.append(a.prec + vb)
        if b.prec is not None:
            if va is None:
                if a.prec is None:
                    return Series.zero(R)
                cands.append(a.prec + b.prec)
            else:
                cands.append(b.prec + va)
        prec = min(cands) if cands else None
        # the same bound on absolute exponents, which the integer one above cannot express
        # when a factor carries a cap
        absolute = min((x.precision + _valuation_bound(y)  # type: ignore[operator]
                        for x, y in ((a, b), (b, a)) if x.precision is not None), default=None)
        off = a.offset + b.offset
        carry = 1 if off >= 1 else 0
        off -= carry
        if va is None or vb is None:
            return Series(R, R.zero(), 0, off,
                          prec + carry if prec is not None else None)._capped(absolute)
        start = va + vb + carry
        if prec is None:
            if R._length(a.poly) + R._length(b.poly) > MAX_LENGTH:
                raise UnableError("the exact product is too long; truncate first")
            poly = a.poly * b.poly
        else:
            prec += carry
            poly = R._mul_low(a.poly, b.poly, prec - start)
        return Series(R, poly, start, off, prec)._capped(absolute)

    __rmul__ = __mul__

    def mul_trunc(self, other: Series, order: int) -> Series:
        """(self * other) truncated to O(q^order), computing only the coefficients needed
        (for exact polynomials too).

        >>> a = Series.from_coefficients([1, 1, 1])
        >>> a.mul_trunc(a, 3)
        1 + 2q + 3q^2 + O(q^3)
        """
        a, b = self._joined(other)
        if a.prec is not None or b.prec is not None or a.offset or b.offset or \
                a.den != 1 or b.den != 1:
            return (a * b).truncate(order)
        va, vb = a._val_int(), b._val_int()
        if va is None or vb is None:
            return Series.zero(a.ring)
        R = a.ring
        start = va + vb
        if start + R._length(a.poly) + R._length(b.poly) - 1 <= order:
            return Series(R, a.poly * b.poly, start, 0, None)
        for x, y in ((a, b), (b, a)):
            if R._length(x.poly) == 1:   # a monomial: a scalar multiple, no multiplication
                c = R._coeff(x.poly, 0)
                poly = R._truncate(y.poly, order - start)
                return Series(R, poly if c == 1 else poly * c, start, 0, order)
        return Series(R, R._mul_low(a.poly, b.poly, order - start), start, 0, order)

    def shift(self, e: Exponent) -> Series:
        """Multiply by q^e (e an integer or a Fraction); precision moves with it.

        >>> Series.from_coefficients([1, 1], prec=3).shift(-5)
        q^-5 + q^-4 + O(q^-2)
        """
        if self.den != 1:
            return _over(self._base().shift(Fraction(e) * self.den), self.den)
        n, f = _split_exponent(e)
        off = self.offset + f
        if off >= 1:
            off -= 1
            n += 1
        prec = None if self.prec is None else self.prec + n
        return self._with(self.poly, self.start + n, off, prec,
                          cap=None if self.cap is None else self.cap + Fraction(e))

    def truncate(self, order: int) -> Series:
        """The series modulo q^order (precision becomes at most ``order``, measured from the
        offset).

        >>> Series.from_coefficients([1, 2, 3]).truncate(2)
        1 + 2q + O(q^2)
        """
        if self.den != 1:
            return _over(self._base().truncate(order * self.den), self.den)
        if self.prec is not None and self.prec <= order:
            return self
        if self.prec is None and self.start + self.ring._length(self.poly) <= order:
            return self
        return self._with(self.poly, self.start, self.offset, order, cap=self.cap)

    def _unit_part(self) -> tuple[int, Any, int | None]:
        """(v, u, r): self = q^(offset+v) * u(q) with u[0] != 0, u known to relative length r."""
        v = self._val_int()
        if v is None:
            raise DomainError("division by zero" if self.prec is None else
                              f"division by a series that vanishes to O(q^{self.precision})")
        r = None if self.prec is None else self.prec - v
        return v, self.poly, r

    def inverse(self, order: int | None = None) -> Series:
        """1/self.  For an exact polynomial that is not a monomial the result is infinite, so
        ``order`` (an absolute precision) is then required.

        >>> Series.from_coefficients([1, 1]).inverse(order=4)
        1 - q + q^2 - q^3 + O(q^4)
        >>> Series.from_coefficients([2], ring=QQ).inverse()
        1/2
        """
        if self.den != 1:
            return _over(self._base().inverse(None if order is None else order * self.den),
                         self.den)
        v, u, r = self._unit_part()
        R = self.ring
        if not R.is_unit(R._coeff(u, 0)):
            if R.fractions != R:
                return self.change_ring(R.fractions).inverse(order)
            c0 = R.to_number(R._coeff(u, 0))
            if isinstance(c0, LaurentPoly):
                raise weight_may_help(DomainError(
                    f"cannot divide by a series with leading coefficient {c0}: its inverse is "
                    f"not a Laurent polynomial in {', '.join(c0.ring.names)}; give the extra "
                    f"variables a weight (z stands for z*q^w) so that it is expanded as a "
                    f"power series"))
            raise DomainError(f"leading coefficient {c0} is not invertible over {R.name}")
        neg_off = Fraction(0) if self.offset == 0 else 1 - self.offset
        carry = 1 if self.offset else 0
        if r is None and R._length(u) == 1:
            return Series(R, R._inv_series(u, 1), -v - carry, neg_off, None)
        if r is None:
            if order is None:
                raise UnableError("the inverse of a polynomial is an infinite series: "
                                  "give an order")
            r = order + v + carry
        elif order is not None:
            r = min(r, order + v + carry)
        prec = r - v - carry
        # 1/(q^v (u + O(q^r))) is known below -v + r, i.e. P - 2v on absolute exponents
        absolute = None if self.prec is None else \
            self.precision - 2 * self.valuation  # type: ignore[operator]
        if r <= 0:
            return Series(R, R.zero(), prec, neg_off, prec)._capped(absolute)
        return Series(R, R._inv_series(u, r), -v - carry, neg_off, prec)._capped(absolute)

    def __truediv__(self, other: Any) -> Series:
        other = self._operand(other)
        return NotImplemented if other is None else self * other.inverse()

    def __rtruediv__(self, other: Any) -> Series:
        other = self._operand(other)
        return NotImplemented if other is None else other * self.inverse()

    def divide(self, other: Series, order: int | None = None) -> Series:
        """self/other, with ``order`` bounding the expansion where other is a polynomial.

        >>> Series.constant(1).divide(Series.from_coefficients([1, -1]), order=3)
        1 + q + q^2 + O(q^3)
        """
        other = self._coerce(other)
        if self.den != 1 or other.den != 1:
            d = math.lcm(self.den, other.den)
            return _over(self._in(d).divide(other._in(d), None if order is None else
                                            order * d), d)
        inv_order = None
        if order is not None:
            va = self._val_int() or 0
            inv_order = order - va
        return (self * other.inverse(inv_order)).truncate(order) if order is not None else \
            self * other.inverse()

    def __pow__(self, e: Any) -> Series:
        if isinstance(e, bool) or not isinstance(e, numbers.Number):
            return NotImplemented
        return self.power(e)

    def power(self, e: int, order: int | None = None) -> Series:
        """self^e for an integer e (negative e inverts first).

        >>> Series.from_coefficients([1, 1], prec=4).power(3)
        1 + 3q + 3q^2 + q^3 + O(q^4)
        """
        if isinstance(e, numbers.Integral) and not isinstance(e, bool):
            e = int(e)
        if isinstance(e, bool) or not isinstance(e, int):
            raise UnableError(f"only integer powers of a series are supported (got {e})")
        if self.den != 1 and e != 0:
            return _over(self._base().power(e, None if order is None else order * self.den),
                         self.den)
        if e < 0:
            return self.inverse(order).power(-e, order)
        if e == 0:
            return Series(self.ring, self.ring.poly([1]), 0)  # the empty product, as 0^0 = 1
        if e == 1:
            return self if order is None else self.truncate(order)
        v = self._val_int()
        R = self.ring
        n_off, f_off = _split_exponent(self.offset * e)
        if v is None:
            if self.prec is None:
                return Series.zero(R)
            # (O(q^p))^e = O(q^(e p)): every product of e unknown series of valuation >= p
            p = self.prec * e
            p = p + n_off if order is None else min(p + n_off, order)
            return Series(R, R.zero(), p, f_off, p)._capped(e * self.precision)
        start = v * e + n_off
        bits = R._coefficient_bits(self.poly)
        if bits and e * (bits + R._length(self.poly).bit_length()) > MAX_COEFFICIENT_BITS:
            raise UnableError(f"the coefficients of this power would have about "
                              f"{e * bits} bits, beyond the limit {MAX_COEFFICIENT_BITS}")
        if self.prec is None:
            if order is None:
                if (R._length(self.poly) - 1) * e > MAX_LENGTH:
                    raise UnableError("the exact power is too large; give an order")
                return Series(R, self.poly ** e, start, f_off, None)
            if (R._length(self.poly) - 1) * e + start < order:
                return Series(R, self.poly ** e, start, f_off, None)
            return Series(R, R._pow_low(self.poly, e, order - start), start, f_off, order)
        rel = self.prec - v
        prec = start + rel
        if order is not None:
            prec = min(prec, order)
        absolute = self.precision + (e - 1) * _valuation_bound(self)  # type: ignore[operator]
        return Series(R, R._pow_low(self.poly, e, prec - start), start, f_off,
                      prec)._capped(absolute)

    # -- fast paths --------------------------------------------------------------------------
    def _holding(self, c: Any) -> tuple[Series, Any]:
        """(self over a ring that holds the scalar c, c): QQ for a fraction over ZZ, the
        joined ring for a coefficient in extra variables."""
        c = _as_number(c)
        R = self.ring
        if isinstance(c, Fraction) and R.fractions != R:
            return self.change_ring(R.fractions), c
        if isinstance(c, LaurentPoly) and c.ring != R:
            joined = join_rings(R, c.ring)
            return (self.change_ring(joined) if joined != R else self), joined.coerce(c)
        return self, c

    def limit_precision(self, order: Exponent) -> Series:
        """self with its precision lowered to ``order`` (at most): for a product from which
        factors 1 + O(q^order) were left out, which is then not exact even when short.

        >>> Series.constant(1).limit_precision(3)
        1 + O(q^3)
        """
        if self.prec is not None and self.precision <= order:  # type: ignore[operator]
            return self
        if self.den != 1:
            return _over(self._base().limit_precision(Fraction(order) * self.den), self.den)
        k = Fraction(order) - self.offset
        prec = k.numerator // k.denominator + (1 if k.denominator != 1 else 0)
        return Series(self.ring, self.poly, self.start, self.offset, prec, order)

    def mul_binomial(self, c: Number, j: int, order: int | None = None) -> Series:
        """self * (1 - c q^j) for an integer j >= 1 in O(length) work.

        >>> Series.constant(1).mul_binomial(1, 2)
        1 - q^2
        """
        if j < 1:
            raise UnableError("mul_binomial needs j >= 1")
        if self.den != 1:
            d = self.den
            return _over(self._base().mul_binomial(c, j * d, None if order is None else
                                                   order * d), d)
        self, c = self._holding(c)
        R = self.ring
        prec = _min_prec(self.prec, order)
        if self.prec is None and prec is not None and \
                self.start + R._length(self.poly) + j <= prec:
            prec = None  # the exact product is short enough to stay exact
        n = None if prec is None else prec - self.start
        return Series(R, R._binomial_mul(self.poly, c, j, n), self.start, self.offset, prec,
                      self.cap)

    def div_binomial(self, c: Number, j: int, order: int | None = None) -> Series:
        """self / (1 - c q^j) for an integer j >= 1 in O(length * log) work.

        >>> Series.constant(1).div_binomial(1, 2, order=7)
        1 + q^2 + q^4 + q^6 + O(q^7)
        """
        if j < 1:
            raise UnableError("div_binomial needs j >= 1")
        if self.den != 1:
            d = self.den
            return _over(self._base().div_binomial(c, j * d, None if order is None else
                                                   order * d), d)
        self, c = self._holding(c)
        R = self.ring
        prec = _min_prec(self.prec, order)
        if prec is None:
            if c == 0:
                return self
            raise UnableError("1/(1 - c q^j) is an infinite series: give an order")
        n = prec - self.start
        if n <= 0:
            return Series(R, R.zero(), prec, self.offset, prec, self.cap)
        return Series(R, R._binomial_div(self.poly, c, j, n), self.start, self.offset, prec,
                      self.cap)

    def inflate(self, d: int) -> Series:
        """The substitution q -> q^d for an integer d >= 1.

        >>> Series.from_coefficients([1, 1], prec=2).inflate(3)
        1 + q^3 + O(q^6)
        """
        if d < 1:
            raise UnableError("q -> q^d needs an integer d >= 1")
        if self.den != 1:
            return _over(self._base().inflate(d), self.den)
        n, f = _split_exponent(self.offset * d)
        prec = None if self.prec is None else self.prec * d + n
        return Series(self.ring, self.ring._inflate(self.poly, d), self.start * d + n, f, prec,
                      None if self.cap is None else self.cap * d)

    def section(self, m: int, r: Exponent) -> Series:
        """The terms of exponent m n + r, as the series sum_n [q^(m n + r)]f q^n (for an
        integer m >= 1; n runs over every integer, negative ones included).  ``r`` must be in
        the class of the series' exponents (an integer for a series in integer powers,
        r - 1/24 + an integer for q^(-1/24) (q;q)_inf^-1, ...): another class holds no term
        and is refused, as almost surely a mistake.  Honest precision: from f known to
        O(q^N) the section is known to O(q^ceil((N - r)/m)).  One strided read of the
        coefficients (``Ring.deflate``).

        >>> f = Series.from_coefficients([1, 1, 2, 3, 5, 7, 11, 15, 22, 30], prec=10)
        >>> f.section(5, 4)
        5 + 30q + O(q^2)
        >>> (Series.monomial(Fraction(-1, 24)) * f).section(5, Fraction(95, 24))
        5 + 30q + O(q^2)
        >>> f.section(3, -1)
        2q + 7q^2 + 22q^3 + O(q^4)
        """
        if isinstance(m, bool) or not isinstance(m, numbers.Integral) or m < 1:
            raise ArgumentError(f"the step m of a dissection must be an integer >= 1, not {m!r}")
        m = int(m)
        r = _as_exponent(r, "the residue r")
        if self.den != 1:      # a(m n + r) of G(q^(1/den)) is [t^(den m n + den r)] G
            return self._base().section(m * self.den, Fraction(r) * self.den)
        s = Fraction(r) - self.offset
        known = self.precision
        prec = None if known is None else _ceil((Fraction(known) - Fraction(r)) / m)
        R = self.ring
        if self.is_zero():
            return Series(R, R.zero(), 0, 0, prec)
        if s.denominator != 1:
            raise DomainError(f"the exponents of this series are {power_text(self.offset)} "
                              f"times integer powers of q, so none of them is m n + {r}: "
                              f"choose r in their class, or multiply by a power of q first")
        s_int = s.numerator
        n0 = -((s_int - self.start) // m)           # the least n with m n + s >= start
        i0 = m * n0 + s_int - self.start             # its index in the coefficients
        poly = R._deflate(self.poly, m, i0)             # 0 <= i0 < m
        return Series(R, poly, n0, 0, prec)

    # -- comparison --------------------------------------------------------------------------
    def __eq__(self, other: object) -> bool:
        """The same truncated series: the same precision (both exact, or the same O(q^N))
        and the same known terms, compared in the ring joining both rings (ZZ inside QQ).
        Series over rings that arithmetic cannot combine (ZZ and GF(p)) are unequal.  A
        number (or a scalar in extra variables) stands for the exact constant series in this
        series' ring, as in arithmetic (over GF(7), 8 is 1).

        >>> one = Series.constant(1)
        >>> one == 1, one == Series.constant(1, QQ), one == one + Series.zero(prec=3)
        (True, True, False)
        """
        if isinstance(other, Series):
            return self._same(other)
        if isinstance(other, bool) or not isinstance(other, (numbers.Rational, LaurentPoly)):
            return NotImplemented
        try:
            return self._same(self._coerce(other))
        except QSeriesError:     # a number this ring cannot hold (1/7 in GF(7))
            return False

    def _same(self, other: Series) -> bool:
        if self.precision != other.precision:
            return False
        if self.den != other.den:
            d = math.lcm(self.den, other.den)
            return self._in(d)._same(other._in(d))
        try:
            R = join_rings(self.ring, other.ring)
        except QSeriesError:
            return False
        if self.is_zero() or other.is_zero():
            return self.is_zero() and other.is_zero()
        if self.offset != other.offset or self.start != other.start or \
                self.ring._length(self.poly) != other.ring._length(other.poly):
            return False
        return bool(R.convert(self.poly) == R.convert(other.poly))

    def __hash__(self) -> int:
        """Equal series hash alike, and an exact constant c hashes as c (except that over
        GF(p) c hashes as its residue only, as modular numbers do elsewhere)."""
        if self.is_zero():
            return hash(0) if self.prec is None else hash(("O", self.precision))
        R = self.ring
        lead = R.to_number(R._coeff(self.poly, 0))
        n = R._length(self.poly)
        if self.den != 1:       # the length depends on den, which equal series may not share
            return hash((self.valuation, self.precision, lead))
        if self.prec is None and self.start == 0 and self.offset == 0 and n == 1:
            return hash(lead)
        return hash((self.valuation, self.precision, n, lead))

    def equal_to(self, other: Series | Number, order: Exponent) -> bool:
        """Whether self and other have the same coefficients below q^order.  Both must be
        known to that order: a :class:`~qseries.errors.PrecisionError` otherwise (an unknown
        coefficient is neither equal nor unequal); an
        :class:`~qseries.errors.IncompatibleRingError` for rings that cannot be combined.

        >>> f = Series.from_coefficients([1, 1, 0, 5], prec=4)
        >>> f.equal_to(Series.from_coefficients([1, 1]), 3), f.equal_to(1, 2)
        (True, False)
        >>> f.equal_to(1, 5)
        Traceback (most recent call last):
        ...
        qseries.errors.PrecisionError: the left series is known only to O(q^4), not to O(q^5)
        """
        o = self._operand(other)
        if o is None:
            raise ArgumentTypeError(f"cannot compare a series with {type(other).__name__}")
        n = _as_exponent(order, "order")
        for side, s in (("left", self), ("right", o)):
            if s.prec is not None and s.precision < n:  # type: ignore[operator]
                raise PrecisionError(f"the {side} series is known only to "
                                     f"{_big_o(s.precision)}, not to {_big_o(n)}")
        a, b = self._joined(o)
        if a.den != 1 or b.den != 1 or (a.offset != b.offset and not a.is_zero() and
                                        not b.is_zero()):
            d = _common_den(a, b)
            return a._in(d).equal_to(b._in(d), n * d)
        return a[:n]._same(b[:n])

    def __reduce__(self) -> tuple[Any, tuple[Any, ...]]:
        """Pickled as plain data (the ring's name, modulus or variable names, and the
        coefficients as Python numbers), so that it unpickles to an equal series over the
        same ring object in any process."""
        return _unpickle, (_ring_key(self.ring), _poly_data(self.ring, self.poly),
                           self.start, self.offset, self.prec, self.cap, self.den)

    def __copy__(self) -> Series:
        return self          # immutable

    def __deepcopy__(self, memo: dict[int, Any]) -> Series:
        return self

    def __repr__(self) -> str:
        from .formatting import format_series
        return format_series(self)

    def latex(self, max_terms: int | None = None) -> str:
        r"""The series in LaTeX, as a paper prints an expansion (the parser reads it back);
        ``max_terms`` elides the middle.

        >>> Series.from_coefficients([1, 0, -2], prec=5).latex()
        '1 - 2 q^{2} + O(q^{5})'
        """
        from .latex import series_latex
        return series_latex(self, max_terms)

    def _repr_latex_(self) -> str:
        """Jupyter's rendering: the first and last 20 terms and the order."""
        return f"${self.latex(max_terms=40)}$"

    def html(self, max_terms: int | None = 20) -> str:
        """The series as HTML for a notebook: the first ``max_terms`` nonzero terms (all
        when None), the order and a line saying how much is known.

        >>> "O(<i>q</i><sup>5</sup>)" in Series.from_coefficients([1, 0, -2], prec=5).html()
        True
        """
        from .html import series_html
        return series_html(self, max_terms)

    def _repr_html_(self) -> str:
        """Jupyter's rendering (preferred to LaTeX by the notebook): the first 20 terms, the
        order and the number of terms; ``f.view()`` shows them all."""
        return self.html()

    def _repr_pretty_(self, p: Any, cycle: bool) -> None:
        """IPython's plain text: the first and last 20 terms (``print(f)`` shows all)."""
        from .formatting import format_series
        p.text(format_series(self, 40))

    def view(self, terms: int | None = None) -> Any:
        """A notebook display of the whole series (or its first ``terms`` terms).

        >>> Series.from_coefficients([1, 2, 3, 4], prec=4).view(2)
        1 + ... + 4q^3 + O(q^4)
        """
        from .html import SeriesView
        return SeriesView(self, terms)

    def to_sympy(self, symbol: str = "q") -> Any:
        """The series as a sympy expression (exact rationals, extra variables as symbols of
        the same names) plus ``O(q**N)`` when it is known only to O(q^N).  Needs sympy.

        >>> Series.from_coefficients([1, 0, -2], prec=5).to_sympy()
        1 - 2*q**2 + O(q**5)
        """
        from .convert import to_sympy
        return to_sympy(self, symbol)

    @classmethod
    def from_sympy(cls, expr: Any, order: Exponent | None = None,
                   symbol: str = "q") -> Series:
        """The series of a sympy expression: exact rational coefficients, rational powers of
        ``symbol`` (one class modulo 1), integer powers of other symbols (extra variables),
        and its own ``O(q**N)`` if any; ``order`` truncates further.  Strings are refused.

        >>> import sympy
        >>> q = sympy.Symbol("q")
        >>> Series.from_sympy(sympy.series(1/(1 - q), q, 0, 4))
        1 + q + q^2 + q^3 + O(q^4)
        """
        from .convert import from_sympy
        return from_sympy(expr, order, symbol)

    def to_numpy(self, n: int | None = None, start: Exponent = 0) -> Any:
        """The coefficients of :meth:`coefficient_list` as a numpy array: int64 when they
        all fit, else an object array of exact values.  Needs numpy.

        >>> Series.from_coefficients([1, 2], prec=3).to_numpy()
        array([1, 2, 0])
        """
        from .convert import to_numpy
        return to_numpy(self, n, start)

    def __str__(self) -> str:
        return self.__repr__()


# -- pickling ------------------------------------------------------------------------------
def _ring_key(ring: Ring) -> tuple[Any, ...]:
    if ring is ZZ:
        return ("ZZ",)
    if ring is QQ:
        return ("QQ",)
    if ring.modulus is not None:
        return ("GF", ring.modulus)
    names = getattr(ring, "names", None)
    if names is not None:
        return ("L", tuple(names), bool(getattr(ring, "rational", False)))
    raise UnableError(f"cannot pickle a series over {ring.name}")


def _ring_from_key(key: tuple[Any, ...]) -> Ring:
    kind = key[0]
    if kind == "ZZ":
        return ZZ
    if kind == "QQ":
        return QQ
    if kind == "GF":
        return GF(key[1])
    if kind == "L":
        return laurent_ring(tuple(key[1]), rational=key[2])
    raise UnableError(f"unknown ring {key!r} in pickled data")


def _poly_data(ring: Ring, poly: Any) -> list[Any]:
    """The polynomial as Python numbers: its coefficients, or for a Laurent ring its terms
    ((exponents of q and the extra variables), coefficient)."""
    if isinstance(poly, LaurentPoly):
        return poly.terms()
    return ring._coefficients(poly)


def _laurent_poly(ring: Ring, terms: list[Any]) -> Any:
    powers: dict[tuple[str, int], Any] = {}
    monomials = []
    for exps, c in terms:
        x = ring.coerce(c)
        for name, e in zip(ring.names, exps[1:], strict=True):  # type: ignore[attr-defined]
            if e:
                p = powers.get((name, e))
                if p is None:
                    p = powers[(name, e)] = ring.gen(name) ** e  # type: ignore[attr-defined]
                x = x * p
        monomials.append(ring._shift_up(x, exps[0]))
    while len(monomials) > 1:        # pairwise, so that the sum costs O(T log T)
        monomials = [sum(monomials[i:i + 2][1:], monomials[i])
                     for i in range(0, len(monomials), 2)]
    return monomials[0] if monomials else ring.zero()


def _reduce_laurent(c: LaurentPoly) -> tuple[Any, tuple[Any, ...]]:
    """A Laurent polynomial (a coefficient in extra variables) pickles as plain data, as a
    series over its ring does: the ring's key and its terms (FLINT's polynomials themselves
    do not pickle)."""
    return _unpickle_laurent, (_ring_key(c.ring), c.terms())


def _unpickle_laurent(key: tuple[Any, ...], terms: list[Any]) -> Any:
    return _laurent_poly(_ring_from_key(key), terms)


copyreg.pickle(LaurentPoly, _reduce_laurent)


def _unpickle(key: tuple[Any, ...], data: list[Any], start: int, offset: Fraction,
              prec: int | None, cap: Fraction | None = None, den: int = 1) -> Series:
    ring = _ring_from_key(key)
    if key[0] == "L":
        poly = _laurent_poly(ring, data)
    elif ring.int_coefficients:
        poly = ring.poly_from_ints(list(data))
    else:
        poly = ring.poly(list(data))
    return Series(ring, poly, start, offset, prec, cap, den)
