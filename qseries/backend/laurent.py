"""Series in q whose coefficients are Laurent polynomials in named extra variables: the
element type ``LaurentPoly`` (with its text), the ring ``laurent_ring(names)`` offering the
operations of :class:`~qseries.backend.base.Ring` on it, and the limits and time budget
that keep such exact computations from exhausting memory or running for hours.

>>> R = laurent_ring(("z",))
>>> R.coefficients(R.inv_series(R.poly([1, -R.gen("z")]), 3))
[1, z, z^2]
"""

from __future__ import annotations

import contextlib
import contextvars
import time
from collections.abc import Callable, Iterator
from fractions import Fraction
from typing import Any

import flint

from ..errors import (
    ArgumentTypeError,
    DomainError,
    IncompatibleRingError,
    UnableError,
    typed_argument,
    weight_may_help,
)
from .arith import _about, _decimal
from .base import MAX_SHIFT, Number, Ring, _number, _scalar_argument, _sequence_argument

__all__ = ["LaurentPoly", "LaurentRing", "laurent_ring", "laurent_text", "laurent_budget",
           "MAX_LAURENT_TERMS", "MAX_VARIABLES", "LAURENT_SECONDS", "MAX_LAURENT_PRODUCT",
           "MAX_LAURENT_BITS"]

#: most terms a polynomial with coefficients in extra variables may have (about 100 bytes a
#: term before the integers themselves); beyond it the modular method is the way
MAX_LAURENT_TERMS = 3_000_000
#: most extra variables exact Laurent coefficients may have (each is a generator of FLINT's
#: multivariate polynomials, and every operation touches all of them)
MAX_VARIABLES = 100
#: longest time (seconds) one evaluation may spend on such polynomials (their size grows
#: fast with the order); checked only inside ``laurent_budget``
LAURENT_SECONDS = 60.0
#: most terms the product of two such polynomials may have by the bound checked before
#: multiplying (FLINT aborts the process when an allocation fails)
MAX_LAURENT_PRODUCT = 30_000_000
#: most bits (terms times coefficient size, estimated) a power of such a polynomial may have
MAX_LAURENT_BITS = 4_000_000_000

_deadline: contextvars.ContextVar[tuple[float, float] | None] = contextvars.ContextVar(
    "laurent_deadline", default=None)


@contextlib.contextmanager
def laurent_budget(seconds: float = LAURENT_SECONDS) -> Iterator[None]:
    """Within this block, arithmetic on polynomials with coefficients in extra variables
    stops with an UnableError once it has run for ``seconds`` (an exact evaluation that
    would run for many minutes ends with a clear message instead).

    >>> R = laurent_ring(("z",))
    >>> with laurent_budget(0):  # doctest: +ELLIPSIS
    ...     (R.gen("z") + 1) ** 2 * (R.gen("z") + 1) ** 3
    Traceback (most recent call last):
    ...
    qseries.errors.UnableError: this exact computation with coefficients in z has run for ...
    """
    token = _deadline.set((time.monotonic() + seconds, seconds))
    try:
        yield
    finally:
        _deadline.reset(token)


def _guard_product(a: Any, b: Any, names: tuple[str, ...]) -> None:
    """Refuse a product whose size bound (the smaller of len(a)*len(b) and the box of
    exponents it can reach) exceeds MAX_LAURENT_PRODUCT, before FLINT tries to allocate it."""
    bound = len(a) * len(b)
    if bound <= MAX_LAURENT_PRODUCT:
        return
    box = 1
    for da, db in zip(a.degrees(), b.degrees(), strict=True):
        box *= int(da) + int(db) + 1
    if min(bound, box) > MAX_LAURENT_PRODUCT:
        raise UnableError(f"a product of polynomials in q and {', '.join(names)} could have "
                          f"{_about(min(bound, box))} terms, beyond the limit "
                          f"{MAX_LAURENT_PRODUCT}; "
                          f"compare at random values of the variables instead (check --method "
                          f"modular), or lower the order")


def _tick(names: tuple[str, ...]) -> None:
    d = _deadline.get()
    if d is not None and time.monotonic() > d[0]:
        raise UnableError(f"this exact computation with coefficients in {', '.join(names)} has "
                          f"run for more than {d[1]:g} s; compare at random values of the "
                          f"variables instead (check --method modular), or lower the order")


class LaurentPoly:
    """A polynomial in q whose coefficients are Laurent polynomials in the extra variables:
    ``x^shift * m`` with ``m`` a FLINT polynomial in (q, x1, ..., xk).  Kept normalised
    (``shift`` is the least exponent of each extra variable in use), so equal elements have
    equal parts.  Scalars of a Laurent ring are the elements free of q.

    >>> R = laurent_ring(("z",))
    >>> z = R.gen("z")
    >>> (z + z**-1) ** 2
    z^2 + 2 + z^-2
    """

    __slots__ = ("ring", "m", "shift")

    def __init__(self, ring: LaurentRing, m: Any, shift: tuple[int, ...]) -> None:
        if len(m) > MAX_LAURENT_TERMS:
            raise UnableError(f"a series with coefficients in {', '.join(ring.names)} has "
                              f"{len(m)} terms, beyond the limit {MAX_LAURENT_TERMS}; compare "
                              f"at random values of the variables instead (check --method "
                              f"modular), or lower the order")
        if m.is_zero():
            shift = ring._no_shift
        else:
            lows = tuple(int(x) for x in m.term_content().degrees()[1:])
            if any(lows):
                m = m / ring._monomial(0, lows)
                shift = tuple(s + lo for s, lo in zip(shift, lows, strict=True))
        self.ring = ring
        self.m = m
        self.shift = shift

    # -- arithmetic ----------------------------------------------------------------------
    def _lift(self, other: Any) -> LaurentPoly:
        if isinstance(other, LaurentPoly):
            if other.ring is not self.ring:
                other = self.ring.coerce(other)
            return other
        return self.ring.coerce(other)

    def _pair(self, other: Any) -> tuple[LaurentPoly, LaurentPoly]:
        """Both operands over one ring (over QQ when either needs it)."""
        needs_q = (isinstance(other, Fraction) and other.denominator != 1) or \
            (isinstance(other, flint.fmpq) and other.q != 1) or \
            (isinstance(other, LaurentPoly) and other.ring.rational)
        if needs_q and not self.ring.rational:
            R = self.ring.fractions
            return R.coerce(self), R.coerce(other)   # type: ignore[attr-defined]
        return self, self._lift(other)

    def _aligned(self, other: LaurentPoly) -> tuple[Any, Any, tuple[int, ...]]:
        if self.shift == other.shift:
            return self.m, other.m, self.shift
        low = tuple(min(a, b) for a, b in zip(self.shift, other.shift, strict=True))
        R = self.ring
        a = self.m * R._monomial(0, [s - lo for s, lo in zip(self.shift, low, strict=True)])
        b = other.m * R._monomial(0, [s - lo for s, lo in zip(other.shift, low, strict=True)])
        return a, b, low

    def __add__(self, other: Any) -> LaurentPoly:
        x, other = self._pair(other)
        _tick(x.ring.names)
        a, b, s = x._aligned(other)
        return LaurentPoly(x.ring, a + b, s)

    __radd__ = __add__

    def __neg__(self) -> LaurentPoly:
        return LaurentPoly(self.ring, -self.m, self.shift)

    def __sub__(self, other: Any) -> LaurentPoly:
        x, other = self._pair(other)
        return x + (-other)

    def __rsub__(self, other: Any) -> LaurentPoly:
        x, other = self._pair(other)
        return other + (-x)

    def __mul__(self, other: Any) -> LaurentPoly:
        x, other = self._pair(other)
        _tick(x.ring.names)
        _guard_product(x.m, other.m, x.ring.names)
        m = x.m * other.m
        return LaurentPoly(x.ring, m,
                           tuple(a + b for a, b in zip(x.shift, other.shift, strict=True)))

    __rmul__ = __mul__

    def __pow__(self, e: int) -> LaurentPoly:
        if e < 0:
            return self.ring._unit_inverse(self) ** (-e)
        if e > 1 and len(self.m) > 1:
            box = 1
            for d in self.m.degrees():
                box *= int(d) * e + 1
            # each coefficient of the power has at most e * (bits + log2(terms)) bits
            bits = e * (self.ring._coefficient_bits(self) + len(self.m).bit_length())
            if box > MAX_LAURENT_PRODUCT or min(box, e + 1) * bits > MAX_LAURENT_BITS:
                raise UnableError(f"the power ({laurent_text(self)[:40]})^{e} is beyond the "
                                  f"limit (up to {_about(box)} terms of up to {_about(bits)} "
                                  f"bits)")
        return LaurentPoly(self.ring, self.m ** e, tuple(s * e for s in self.shift))

    def __eq__(self, other: object) -> bool:
        if isinstance(other, (int, Fraction)) or isinstance(other, (flint.fmpz, flint.fmpq)):
            other = self.ring.coerce(other)
        if not isinstance(other, LaurentPoly):
            return NotImplemented
        return self.shift == other.shift and self.m == other.m

    def __hash__(self) -> int:
        return hash((self.shift, str(self.m)))

    def __bool__(self) -> bool:
        return not self.m.is_zero()

    # -- text ------------------------------------------------------------------------------
    def terms(self) -> list[tuple[tuple[int, ...], Number]]:
        """(exponents of q and the extra variables, coefficient), highest first.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> (3 * z ** -1 - z).terms()
        [((0, 1), -1), ((0, -1), 3)]
        """
        out = []
        for exps, c in self.m.to_dict().items():
            shifted = (int(e) + s for e, s in zip(exps[1:], self.shift, strict=True))
            out.append(((int(exps[0]), *shifted), _number(c)))
        out.sort(key=lambda t: (sum(t[0][1:]), t[0][1:]), reverse=True)
        return out

    def __repr__(self) -> str:
        return laurent_text(self)


def laurent_text(c: LaurentPoly,
                 q_exponent: Callable[[tuple[int, ...]], int | Fraction] | None = None) -> str:
    """ASCII text of a scalar of a Laurent ring: ``z^2 - z``, ``3*a*z^-1``, ``(1/2)*z``.
    ``q_exponent`` (if given) maps a term's exponents (q first) to the power of q to print
    with it (for weighted variables written back in q).

    >>> R = laurent_ring(("a", "z"))
    >>> a, z = R.gen("a"), R.gen("z")
    >>> laurent_text(2 * a * z**-1 - a**2 + 1)
    '-a^2 + 2*a*z^-1 + 1'
    >>> laurent_text(z**2 - z, lambda exps: 3 - exps[2])
    'z^2*q - z*q^2'
    """
    names = c.ring.names
    parts: list[str] = []
    for exps, coef in c.terms():
        factors = []
        for name, e in zip(names, exps[1:], strict=True):
            if e:
                factors.append(name if e == 1 else f"{name}^{e}")
        qe = Fraction(exps[0] if q_exponent is None else q_exponent(exps))
        if qe:
            factors.append("q" if qe == 1 else f"q^{qe}" if qe.denominator == 1 else
                           f"q^({qe})")
        mono = "*".join(factors)
        neg = coef < 0
        a = -coef if neg else coef
        num = _decimal(a) if isinstance(a, int) else f"({_decimal(a.numerator)}/" \
            f"{_decimal(a.denominator)})"
        body = num if not mono else (mono if a == 1 else f"{num}*{mono}")
        if not parts:
            parts.append(f"-{body}" if neg else body)
        else:
            parts.append(f"- {body}" if neg else f"+ {body}")
    return " ".join(parts) if parts else "0"


class LaurentRing(Ring):
    """Polynomials (truncated series) in q with coefficients Laurent polynomials in named
    extra variables, over ZZ or QQ (FLINT's fmpz_mpoly / fmpq_mpoly, q first); made by
    :func:`laurent_ring`, one object per set of names.

    >>> R = laurent_ring(("a", "z"))
    >>> isinstance(R, LaurentRing), R.names, R.rational
    (True, ('a', 'z'), False)
    """

    def __init__(self, names: tuple[str, ...], rational: bool) -> None:
        self.names = names
        self.rational = rational
        base = "QQ" if rational else "ZZ"
        self.name = f"{base}[{', '.join(names)} and inverses]"
        kind = flint.fmpq_mpoly_ctx if rational else flint.fmpz_mpoly_ctx
        self.ctx = kind.get(("q", *names), "lex")
        self._q = self.ctx.gen(0)
        self._no_shift = (0,) * len(names)
        self._qpowers: dict[int, Any] = {}

    _poly_type = LaurentPoly
    _scalar_types = (*Ring._scalar_types, LaurentPoly)

    def _poly_argument(self, name: str, p: Any) -> None:
        """As :meth:`Ring._poly_argument`, and ``p`` must belong to this very ring.

        >>> laurent_ring(("z",)).length(laurent_ring(("a",)).zero())  # doctest: +ELLIPSIS
        Traceback (most recent call last):
        ...
        qseries.errors.ArgumentTypeError: p must be ... ZZ[z and inverses], not one over ZZ[a ...
        """
        super()._poly_argument(name, p)
        if p.ring is not self:
            raise ArgumentTypeError(f"{name} must be a polynomial over {self.name}, not one "
                                    f"over {p.ring.name}")

    def _exp_integral(self, s: list[int], n: int) -> Any | None:
        """None: a product over this ring is multiplied out factor by factor.

        >>> laurent_ring(("z",)).exp_integral([0, -1], 3) is None
        True
        """
        return None     # products are then multiplied out factor by factor

    # -- helpers -------------------------------------------------------------------------
    def _monomial(self, qexp: int, exps: Any) -> Any:
        return self.ctx.term(exp_vec=(qexp, *exps))

    def _qpow(self, n: int) -> Any:
        v = self._qpowers.get(n)
        if v is None:
            v = self._q ** n
            if len(self._qpowers) < 64:
                self._qpowers[n] = v
        return v

    def _wrap(self, m: Any, shift: tuple[int, ...] | None = None) -> LaurentPoly:
        return LaurentPoly(self, m, self._no_shift if shift is None else shift)

    def gen(self, name: str) -> LaurentPoly:
        """The extra variable ``name`` as a scalar.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> z ** 2 * R.gen("z") ** -3
        z^-1
        """
        i = self.names.index(name)
        return self._wrap(self.ctx.gen(i + 1))

    @property
    def fractions(self) -> Ring:
        """The same variables over QQ.

        >>> laurent_ring(("z",)).fractions
        QQ[z and inverses]
        """
        return laurent_ring(self.names, rational=True)

    # -- construction and conversion -------------------------------------------------
    def coerce(self, c: Any) -> LaurentPoly:
        """A number, an fmpz/fmpq or a scalar of a ring in the same variables, as a
        scalar of this ring (rationals only over QQ).

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coerce(3) + z
        z + 3
        """
        _scalar_argument("c", c)
        if isinstance(c, LaurentPoly):
            if c.ring is self:
                return c
            if c.ring.names != self.names:
                raise IncompatibleRingError(f"cannot combine {c.ring.name} and {self.name}")
            if not self.rational and c.ring.rational:
                raise IncompatibleRingError(f"{c} has non-integer coefficients")
            return self._wrap(self.ctx.from_dict(c.m.to_dict()), c.shift)
        if isinstance(c, bool):
            raise TypeError("booleans are not coefficients")
        if isinstance(c, Fraction):
            if c.denominator != 1:
                if not self.rational:
                    raise IncompatibleRingError(f"{c} is not an integer")
                return self._wrap(self.ctx.constant(flint.fmpq(c.numerator, c.denominator)))
            c = c.numerator
        if isinstance(c, flint.fmpq):
            if not self.rational and c.q != 1:
                raise IncompatibleRingError(f"{c} is not an integer")
            return self._wrap(self.ctx.constant(c if self.rational else flint.fmpz(c.p)))
        return self._wrap(self.ctx.constant(int(c)))

    def poly(self, coeffs: list) -> LaurentPoly:
        """Polynomial in q with the given coefficients (numbers or scalars), low degree first.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coefficients(R.poly([1, z]))
        [1, z]
        """
        _sequence_argument("coeffs", coeffs)
        acc = self.zero()
        for i, c in enumerate(coeffs):
            if c:
                acc = acc + self.coerce(c) * self._wrap(self._qpow(i))
        return acc

    def zero(self) -> LaurentPoly:
        """The zero polynomial.

        >>> R = laurent_ring(("z",)); R.length(R.zero())
        0
        """
        return self._wrap(self.ctx.constant(0))

    def poly_from_ints(self, coeffs: list[int]) -> LaurentPoly:
        """Polynomial in q from Python ints (free of the extra variables).

        >>> R = laurent_ring(("z",)); R.coefficients(R.poly_from_ints([1, 0, -2]))
        [1, 0, -2]
        """
        _sequence_argument("coeffs", coeffs)
        k = len(self.names)
        return self._wrap(self.ctx.from_dict({(i, *([0] * k)): c
                                              for i, c in enumerate(coeffs) if c}))

    def convert(self, p: Any) -> LaurentPoly:
        """A polynomial over ZZ or QQ (fmpz_poly, fmpq_poly) or over a Laurent ring in the
        same variables, as one of this ring.

        >>> import flint
        >>> R = laurent_ring(("z",)); R.coefficients(R.convert(flint.fmpz_poly([2, 3])))
        [2, 3]
        """
        _scalar_argument("p", p)
        if isinstance(p, LaurentPoly):
            return self.coerce(p)
        if isinstance(p, (flint.fmpz_poly, flint.fmpq_poly)):
            k = len(self.names)
            d = {}
            for i, c in enumerate(p.coeffs()):
                if c != 0:
                    d[(i, *([0] * k))] = c if self.rational or isinstance(c, flint.fmpz) \
                        else _integral(c)
            return self._wrap(self.ctx.from_dict(d))
        raise IncompatibleRingError(f"cannot bring a polynomial over another ring into "
                                    f"{self.name}")

    def to_number(self, c: Any) -> Any:
        """A number when the scalar is constant, else the scalar itself.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.to_number(R.coerce(3)), R.to_number(2 * z)
        (3, 2*z)
        """
        _scalar_argument("c", c)
        if isinstance(c, LaurentPoly):
            if c.shift == self._no_shift and c.m.is_constant():
                return _number(c.m.coeffs()[0]) if not c.m.is_zero() else 0
            return c
        return _number(c)

    def _coefficients(self, p: LaurentPoly) -> list[Any]:
        """All coefficients of p (in q), low degree first: numbers where constant, else scalars.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coefficients(R.poly([2, z + 1]))
        [2, z + 1]
        """
        n = self._length(p)
        buckets: list[dict] = [{} for _ in range(n)]
        for exps, c in p.m.to_dict().items():
            buckets[int(exps[0])][(0, *exps[1:])] = c
        out = []
        for b in buckets:
            if not b:
                out.append(0)
            else:
                out.append(self.to_number(self._wrap(self.ctx.from_dict(b), p.shift)))
        return out

    # -- queries ---------------------------------------------------------------------
    def _length(self, p: LaurentPoly) -> int:  # type: ignore[override]
        """One more than the degree in q (0 for the zero polynomial).

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.length(R.poly([1, 0, z]))
        3
        """
        return 0 if p.m.is_zero() else int(p.m.degrees()[0]) + 1

    def _coeff(self, p: LaurentPoly, i: int) -> LaurentPoly:  # type: ignore[override]
        """The coefficient of q^i of p, as a scalar.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coeff(R.poly([1, z - 1]), 1)
        z - 1
        """
        part = (p.m % self._qpow(i + 1)) - (p.m % self._qpow(i)) if i else p.m % self._q
        return self._wrap(part / self._qpow(i) if i else part, p.shift)

    def _valuation(self, p: LaurentPoly) -> int | None:  # type: ignore[override]
        """The least exponent of q in p, or None for the zero polynomial.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.valuation(R.poly([0, 0, z])), R.valuation(R.zero())
        (2, None)
        """
        if p.m.is_zero():
            return None
        return int(p.m.term_content().degrees()[0])

    def is_unit(self, c: Any) -> bool:
        """Whether the scalar c is a unit: a single term (with coefficient +-1 over ZZ).

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.is_unit(-z ** -3), R.is_unit(1 - z), R.is_unit(2 * z)
        (True, False, False)
        """
        if not isinstance(c, LaurentPoly):
            c = self.coerce(c)
        if len(c.m.coeffs()) != 1:
            return False
        v = c.m.coeffs()[0]
        return self.rational or v == 1 or v == -1

    def _unit_inverse(self, c: LaurentPoly) -> LaurentPoly:
        if not self.is_unit(c):
            raise DomainError(f"{laurent_text(c)} is not invertible among Laurent polynomials "
                              f"in {', '.join(self.names)}")
        v = c.m.coeffs()[0]
        exps = [int(x) for x in c.m.monoms()[0]]
        inv = self.ctx.constant(1 / v if self.rational else v)
        return self._wrap(inv, tuple(-(e + s) for e, s in zip(exps[1:], c.shift, strict=True)))

    # -- arithmetic ------------------------------------------------------------------
    def _coefficient_bits(self, p: LaurentPoly) -> int:  # type: ignore[override]
        """Bits of the largest numeric coefficient (numerator plus denominator over QQ).

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coefficient_bits(R.poly([255 * z, 1]))
        8
        """
        best = 0
        for c in p.m.coeffs():
            if self.rational:
                best = max(best, int(c.p).bit_length() + int(c.q).bit_length())
            else:
                best = max(best, int(c).bit_length())
        return best

    def _truncate(self, p: LaurentPoly, n: int) -> LaurentPoly:  # type: ignore[override]
        """p modulo q^n.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coefficients(R.truncate(R.poly([1, z, z ** 2]), 2))
        [1, z]
        """
        if n <= 0:
            return self.zero()
        if p.m.is_zero() or int(p.m.degrees()[0]) < n:
            return p
        return self._wrap(p.m % self._qpow(n), p.shift)

    def _shift_up(self, p: LaurentPoly, k: int) -> LaurentPoly:  # type: ignore[override]
        """p * q^k for k >= 0 (refused beyond MAX_SHIFT).

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coefficients(R.shift_up(R.poly([z]), 2))
        [0, 0, z]
        """
        if not k or p.m.is_zero():
            return p
        if k + self._length(p) > MAX_SHIFT:
            raise UnableError(f"a polynomial of degree {k + self._length(p) - 1} exceeds the "
                              f"limit")
        return self._wrap(p.m * self._qpow(k), p.shift)

    def _shift_down(self, p: LaurentPoly, k: int) -> LaurentPoly:  # type: ignore[override]
        """p // q^k for k >= 0: drops the k lowest coefficients, as in the other rings.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coefficients(R.shift_down(R.poly([0, z]), 1))
        [z]
        >>> R.coefficients(R.shift_down(R.poly([1, z, 2]), 1))
        [z, 2]
        """
        # floor division by the monomial q^k (lex order, q first) drops the lower terms
        return self._wrap(p.m // self._qpow(k), p.shift) if k else p

    def _mul_low(self, a: LaurentPoly, b: LaurentPoly,  # type: ignore[override]
                 n: int) -> LaurentPoly:
        """a * b modulo q^n.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coefficients(R.mul_low(R.poly([1, z]), R.poly([1, -z]), 3))
        [1, 0, -z^2]
        """
        if n <= 0:
            return self.zero()
        return self._truncate(self._truncate(a, n) * self._truncate(b, n), n)

    def _pow_low(self, p: LaurentPoly, e: int, n: int) -> LaurentPoly:  # type: ignore[override]
        """p^e modulo q^n for e >= 0, by repeated squaring.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coefficients(R.pow_low(R.poly([1, z]), 3, 3))
        [1, 3*z, 3*z^2]
        """
        result = self.coerce(1)
        base = self._truncate(p, n)
        while e:
            if e & 1:
                result = self._mul_low(result, base, n)
            e >>= 1
            if e:
                base = self._mul_low(base, base, n)
        return result

    def _inflate(self, p: LaurentPoly, d: int) -> LaurentPoly:
        """p(q^d) for an integer d >= 1.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coefficients(R.inflate(R.poly([1, z]), 2))
        [1, 0, z]
        """
        if d == 1:
            return p
        return self._wrap(self.ctx.from_dict({(e[0] * d, *e[1:]): c
                                              for e, c in p.m.to_dict().items()}), p.shift)

    def _deflate(self, p: LaurentPoly, m: int, r: int) -> LaurentPoly:
        """sum_n p[m n + r] q^n (see :meth:`Ring.deflate`).

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coefficients(R._deflate(R.poly([1, z, 2, z + 1]), 2, 1))
        [z, z + 1]
        """
        if m == 1:
            return p
        return self._wrap(self.ctx.from_dict({((e[0] - r) // m, *e[1:]): c
                                              for e, c in p.m.to_dict().items()
                                              if e[0] % m == r}), p.shift)

    def _inv_series(self, p: LaurentPoly, n: int) -> LaurentPoly:
        """1/p modulo q^n by Newton iteration; the constant term must be a unit (a single
        term), else the error suggests a weight.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coefficients(R.inv_series(R.poly([1, -z]), 3))
        [1, z, z^2]
        """
        if n <= 0:
            return self.zero()
        c0 = self._coeff(p, 0)
        if not self.is_unit(c0):
            text = laurent_text(c0) if c0 else "0"
            raise weight_may_help(DomainError(
                f"the constant term {text} is not invertible among Laurent polynomials in "
                f"{', '.join(self.names)} (give the variable a weight, so that it is expanded "
                f"as a power series)"))
        g = self._unit_inverse(c0)
        m = 1
        while m < n:
            m = min(2 * m, n)
            e = 2 - self._mul_low(p, g, m)
            g = self._mul_low(g, e, m)
        return g

    def _binomial_mul(self, p: LaurentPoly, c: Any, j: int, n: int | None) -> LaurentPoly:
        """p * (1 - c q^j) for a scalar c, truncated to length n when n is not None.

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coefficients(R.binomial_mul(R.poly([1]), z, 1, None))
        [1, -z]
        """
        if n is not None:
            if j >= n:
                return self._truncate(p, n)
            p = self._truncate(p, n)
            shifted = self._shift_up(self._truncate(p, n - j), j)
        else:
            shifted = self._shift_up(p, j)
        return p - shifted * self.coerce(c)

    def _binomial_div(self, p: LaurentPoly, c: Any, j: int, n: int) -> LaurentPoly:
        """p / (1 - c q^j) modulo q^n for j >= 1 and a scalar c, by the doubling
        (1+x)(1+x^2)(1+x^4)...

        >>> R = laurent_ring(("z",)); z = R.gen("z")
        >>> R.coefficients(R.binomial_div(R.poly([1]), z, 1, 3))
        [1, z, z^2]
        """
        p = self._truncate(p, n)
        cc = self.coerce(c)
        step = j
        while step < n and cc:
            p = p + self._shift_up(self._truncate(p, n - step), step) * cc
            step *= 2
            cc = cc * cc
        return p

    def __eq__(self, other: object) -> bool:
        return isinstance(other, LaurentRing) and other.names == self.names and \
            other.rational == self.rational

    def __hash__(self) -> int:
        return hash(("L", self.names, self.rational))

    def __repr__(self) -> str:
        return self.name


def _integral(c: Any) -> Any:
    if c.q != 1:
        raise IncompatibleRingError(f"{c} is not an integer")
    return flint.fmpz(c.p)


_LAURENT: dict[tuple[tuple[str, ...], bool], LaurentRing] = {}


def laurent_ring(names: tuple[str, ...], rational: bool = False) -> Ring:
    """Series in q whose coefficients are Laurent polynomials in the extra variables
    ``names`` (over QQ when ``rational``); one ring object per set of names.

    >>> R = laurent_ring(("z",))
    >>> R.coefficients(R.inv_series(R.poly([1, -R.gen("z")]), 3))
    [1, z, z^2]
    >>> laurent_ring("za")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    qseries.errors.ArgumentTypeError: names must be a tuple of variable names ..., not 'za' (str)
    """
    if not isinstance(names, (tuple, list)):
        typed_argument("names", names, (tuple, list), "a tuple of variable names such as ('z',)")
    for i, name in enumerate(names):
        typed_argument(f"names[{i}]", name, str, "a variable name such as 'z'")
    key = (tuple(names), rational)
    ring = _LAURENT.get(key)
    if ring is None:
        if not names or len(set(names)) != len(names) or "q" in names:
            raise DomainError(f"bad names for extra variables: {names!r}")
        if len(names) > MAX_VARIABLES:
            raise UnableError(f"{len(names)} extra variables; at most {MAX_VARIABLES} are "
                              f"supported")
        ring = LaurentRing(tuple(names), rational)
        _LAURENT[key] = ring
    return ring


