"""The only module that imports python-flint.

It defines the coefficient rings ("backends") on which truncated series are built.  Every
ring offers the same operation names on dense polynomials (coefficient ``i`` stands for
``q^i``); the series layer above never touches FLINT types directly.  Lengths are always
explicit: ``mul_low(a, b, n)`` keeps the coefficients of ``q^0 .. q^(n-1)``.

* :data:`ZZ` -- exact integers (``fmpz_poly``);
* :data:`QQ` -- exact rationals (``fmpq_poly``);
* :func:`GF` -- integers modulo a prime (``nmod_poly``), for modular checks.

>>> p = ZZ.poly([1, -1])                  # 1 - q
>>> ZZ.coefficients(ZZ.inv_series(p, 5))  # 1/(1 - q) to O(q^5)
[1, 1, 1, 1, 1]
>>> QQ.coefficients(QQ.inv_series(QQ.poly([2, 1]), 3))
[Fraction(1, 2), Fraction(-1, 4), Fraction(1, 8)]
"""

from __future__ import annotations

import contextlib
import contextvars
import time
from collections.abc import Callable, Iterator
from fractions import Fraction
from typing import Any

import flint

from .errors import DomainError, IncompatibleRingError, UnableError, weight_may_help

Number = int | Fraction

__all__ = ["ZZ", "QQ", "GF", "Ring", "LaurentPoly", "laurent_ring", "laurent_text",
           "int_to_decimal", "is_prime", "join_rings", "partitions_p",
           "FLINT_VERSION"]

FLINT_VERSION: str = flint.__version__

#: longest polynomial a shift may produce (FLINT aborts the process when memory runs out)
MAX_SHIFT = 50_000_000


def partitions_p(n: int) -> int:
    """Number of partitions of n by FLINT's Hardy-Ramanujan-Rademacher code (a reference).

    >>> partitions_p(100)
    190569292
    """
    return int(flint.fmpz(n).partitions_p())



def _fraction(c: Any) -> Fraction:
    """An fmpq as a Fraction without reducing it again (FLINT keeps it in lowest terms; a
    gcd of two million-bit integers costs most of a second)."""
    num, den = int(c.p), int(c.q)
    if den == 1:
        return Fraction(num)
    f = Fraction.__new__(Fraction)
    f._numerator, f._denominator = num, den      # type: ignore[attr-defined]
    return f

class Ring:
    """Operations on dense truncated polynomials over one coefficient ring.

    Subclasses bind a FLINT polynomial type.  Methods whose name starts with an underscore
    assume validated input, as in FLINT.
    """

    name: str = "?"
    exact: bool = True
    #: coefficients are Python ints read modulo the ring (ZZ, GF(p)): ``poly_from_ints``
    #: takes any ints, so callers may accumulate coefficients in a plain list
    int_coefficients: bool = False
    #: p for GF(p), else None
    modulus: int | None = None

    @property
    def fractions(self) -> Ring:
        """The ring with the same variables over QQ (itself when it is a field)."""
        return QQ if self is ZZ else self

    # -- construction and conversion -------------------------------------------------
    def coerce(self, c: Number) -> Any:  # pragma: no cover - abstract
        raise NotImplementedError

    def poly(self, coeffs: list) -> Any:
        """Polynomial with the given coefficients (low degree first)."""
        return self._ptype([self.coerce(c) if isinstance(c, (int, Fraction)) else c
                            for c in coeffs])

    def zero(self) -> Any:
        return self._ptype([])

    def poly_from_ints(self, coeffs: list[int]) -> Any:
        """Polynomial from a list of Python ints, without per-coefficient conversion (the
        fast path for long sparse series such as Euler's product)."""
        return self._ptype(coeffs)

    def convert(self, p: Any) -> Any:
        """The polynomial p (over a subring) as a polynomial of this ring."""
        if isinstance(p, self._ptype):
            return p
        return self._ptype([self.coerce(c) for c in _py_coeffs(p)])

    def to_number(self, c: Any) -> Number:
        """A coefficient as a Python int or Fraction."""
        return int(c)

    def coefficients(self, p: Any) -> list[Number]:
        """All coefficients of p as Python numbers, low degree first."""
        return [self.to_number(c) for c in p.coeffs()]

    # -- queries ---------------------------------------------------------------------
    @staticmethod
    def length(p: Any) -> int:
        return p.length()

    @staticmethod
    def coeff(p: Any, i: int) -> Any:
        return p[i]

    @staticmethod
    def valuation(p: Any) -> int | None:
        """Index of the first nonzero coefficient, or None for the zero polynomial."""
        n = p.length()
        if n == 0:
            return None
        i = 0
        while p[i] == 0:
            i += 1
        return i

    def is_unit(self, c: Any) -> bool:  # pragma: no cover - abstract
        raise NotImplementedError

    # -- arithmetic ------------------------------------------------------------------
    @staticmethod
    def coefficient_bits(p: Any) -> int:
        """Bits of the largest coefficient (numerators and denominators for QQ)."""
        if p.length() == 0:
            return 0
        if isinstance(p, flint.fmpz_poly):
            return int(p.height_bits())
        if isinstance(p, flint.fmpq_poly):
            return int(p.numer().height_bits()) + int(flint.fmpz(p.denom()).bit_length())
        return 0   # modular coefficients do not grow

    @staticmethod
    def truncate(p: Any, n: int) -> Any:
        return p.truncate(max(n, 0))

    @staticmethod
    def shift_up(p: Any, k: int) -> Any:
        """p * q^k for k >= 0 (refused beyond MAX_SHIFT, where FLINT would abort)."""
        if not k or p.length() == 0:
            return p
        if k + p.length() > MAX_SHIFT:
            raise UnableError(f"a polynomial of degree {k + p.length() - 1} exceeds the limit")
        return p.left_shift(k)

    @staticmethod
    def shift_down(p: Any, k: int) -> Any:
        """p // q^k for k >= 0 (drops the k lowest coefficients)."""
        return p.right_shift(k) if k else p

    @staticmethod
    def mul_low(a: Any, b: Any, n: int) -> Any:
        if n <= 0:
            return a.truncate(0)
        return a.mul_low(b, n)

    @staticmethod
    def pow_low(p: Any, e: int, n: int) -> Any:
        if n <= 0:
            return p.truncate(0)
        return p.pow_trunc(e, n)

    def inflate(self, p: Any, d: int) -> Any:
        """p(q^d) for an integer d >= 1."""
        if d == 1 or p.length() <= 1:
            return p
        coeffs = p.coeffs()
        out = [self.coerce(0)] * ((len(coeffs) - 1) * d + 1)
        out[::d] = coeffs
        return self._ptype(out)

    def inv_series(self, p: Any, n: int) -> Any:
        """1/p modulo q^n, by Newton iteration; p[0] must be a unit (checked)."""
        if n <= 0:
            return self.zero()
        c0 = p[0] if p.length() else self.coerce(0)
        if not self.is_unit(c0):
            raise DomainError(f"constant term {self.to_number(c0)} is not invertible over "
                              f"{self.name}")
        g = self._ptype([self._unit_inverse(c0)])
        m = 1
        two = self._ptype([2])
        while m < n:
            m = min(2 * m, n)
            e = two - self.mul_low(p.truncate(m), g, m)
            g = self.mul_low(g, e, m)
        return g

    def _unit_inverse(self, c: Any) -> Any:  # pragma: no cover - abstract
        raise NotImplementedError

    def binomial_mul(self, p: Any, c: Number, j: int, n: int | None) -> Any:
        """p * (1 - c q^j), truncated to length n when n is not None; O(length) work."""
        if n is not None and j >= n:
            return p.truncate(max(n, 0))
        if n is not None:
            p = p.truncate(max(n, 0))
            shifted = self.shift_up(p.truncate(max(n - j, 0)), j)
        else:
            shifted = self.shift_up(p, j)
        cc = self._multiplier(c)
        return p - shifted if cc == 1 else p - shifted * cc

    def binomial_div(self, p: Any, c: Number, j: int, n: int) -> Any:
        """p / (1 - c q^j) modulo q^n for j >= 1, by the doubling
        1/(1-x) = (1+x)(1+x^2)(1+x^4)...; each step is a shift and an add."""
        p = p.truncate(max(n, 0))
        cc = self._multiplier(c)
        step = j
        while step < n and cc != 0:
            shifted = self.shift_up(p.truncate(n - step), step)
            p = p + shifted if cc == 1 else p + shifted * cc
            step *= 2
            cc = self._multiplier(cc * cc)
        return p

    def _multiplier(self, c: Any) -> Any:
        """c as a scalar that polynomials of this ring can be multiplied by."""
        return self.coerce(c)

    def exp_integral(self, s: list[int], n: int) -> Any | None:
        """exp(sum_{k>=1} s[k] q^k / k) modulo q^n for integers s[k] (s[0] is ignored): the
        Euler transform, which turns a long product of binomials into a logarithm known in
        closed form.  None where this ring cannot divide by k < n.  (Rings over ZZ use
        FLINT's rational series exponential; the caller knows the result is integral.)"""
        if n <= 0:
            return self.zero()
        if n == 1:
            return self.poly_from_ints([1])
        f = flint.fmpq_poly(list(s[1:n])).integral()
        old = flint.ctx.cap
        flint.ctx.cap = max(n, old)
        try:
            g = flint.fmpq_series(f, prec=n).exp()
            coeffs = [g[k] for k in range(n)]
        finally:
            flint.ctx.cap = old
        if self is QQ:
            return self.poly(coeffs)
        if any(c.q != 1 for c in coeffs):
            raise ArithmeticError("exp_integral: the exponential is not integral")
        return self.poly_from_ints([int(c.p) for c in coeffs])


def _py_coeffs(p: Any) -> list[Number]:
    out: list[Number] = []
    for c in p.coeffs():
        if isinstance(c, flint.fmpq):
            out.append(_fraction(c))
        else:
            out.append(int(c))
    return out


class _IntegerRing(Ring):
    name = "ZZ"
    _ptype = flint.fmpz_poly
    int_coefficients = True

    def coerce(self, c: Number) -> Any:
        if isinstance(c, flint.fmpz):
            return c
        if isinstance(c, Fraction):
            if c.denominator != 1:
                raise IncompatibleRingError(f"{c} is not an integer")
            c = c.numerator
        return flint.fmpz(int(c))

    def is_unit(self, c: Any) -> bool:
        return c == 1 or c == -1

    def _unit_inverse(self, c: Any) -> Any:
        return c

    def __repr__(self) -> str:
        return "ZZ"


class _RationalRing(Ring):
    name = "QQ"
    _ptype = flint.fmpq_poly

    def coerce(self, c: Number) -> Any:
        if isinstance(c, flint.fmpq):
            return c
        if isinstance(c, Fraction):
            return flint.fmpq(c.numerator, c.denominator)
        if isinstance(c, flint.fmpz):
            return flint.fmpq(c)
        return flint.fmpq(int(c))

    def to_number(self, c: Any) -> Number:
        f = _fraction(c)
        return f.numerator if f.denominator == 1 else f

    def convert(self, p: Any) -> Any:
        if isinstance(p, flint.fmpz_poly):
            return flint.fmpq_poly(p)
        return super().convert(p)

    def is_unit(self, c: Any) -> bool:
        return c != 0

    def _unit_inverse(self, c: Any) -> Any:
        return 1 / c

    def __repr__(self) -> str:
        return "QQ"


class _ModularRing(Ring):
    exact = False
    int_coefficients = True

    def __init__(self, p: int) -> None:
        if p < 2 or not flint.fmpz(p).is_prime():
            raise DomainError(f"modulus {p} is not a prime")
        if p >= 2**64:
            raise DomainError(f"modulus {p} does not fit in a machine word")
        self.p = p
        self.modulus = p
        self.name = f"GF({p})"

    def _ptype(self, coeffs: list) -> Any:  # type: ignore[override]
        return flint.nmod_poly([int(c) for c in coeffs], self.p)

    def poly(self, coeffs: list) -> Any:
        return flint.nmod_poly([int(self.coerce(c)) for c in coeffs], self.p)

    def poly_from_ints(self, coeffs: list[int]) -> Any:
        return flint.nmod_poly(coeffs, self.p)

    def convert(self, p: Any) -> Any:
        if isinstance(p, flint.nmod_poly):
            if p.modulus() != self.p:
                raise IncompatibleRingError(f"cannot mix GF({p.modulus()}) with {self.name}")
            return p
        return self.poly(_py_coeffs(p))

    def coerce(self, c: Number) -> Any:
        if isinstance(c, Fraction):
            if c.denominator % self.p == 0:
                raise DomainError(f"the denominator of {c} is not invertible modulo {self.p}")
            return flint.nmod(c.numerator, self.p) / flint.nmod(c.denominator, self.p)
        return flint.nmod(int(c), self.p)

    def is_unit(self, c: Any) -> bool:
        return int(c) % self.p != 0

    def _unit_inverse(self, c: Any) -> Any:
        return 1 / c

    def inv_series(self, p: Any, n: int) -> Any:
        if n <= 0:
            return self.zero()
        if p.length() == 0 or not self.is_unit(p[0]):
            raise DomainError(f"constant term is not invertible modulo {self.p}")
        return p.inverse_series_trunc(n)

    def exp_integral(self, s: list[int], n: int) -> Any | None:
        # Newton's iteration g <- g (1 + f - log g), log g = integral(g'/g), doubling the
        # precision each step; the integral divides by k < n, so p must exceed n
        if n <= 0:
            return self.zero()
        if self.p <= n:
            return None
        p = self.p
        f = flint.nmod_poly([c % p for c in s[1:n]], p).integral()
        g = flint.nmod_poly([1], p)
        m = 1
        while m < n:
            m2 = min(2 * m, n)
            h = g.inverse_series_trunc(m2)
            log_g = g.derivative().mul_low(h, m2 - 1).integral()
            # f - log g vanishes below q^m: only the top m2 - m coefficients of g (f - log g)
            # are needed
            d = (f.truncate(m2) - log_g).right_shift(m)
            g = g + g.truncate(m2 - m).mul_low(d, m2 - m).left_shift(m)
            m = m2
        return g

    def _multiplier(self, c: Number) -> Any:
        return int(self.coerce(c))

    def zero(self) -> Any:
        return flint.nmod_poly([], self.p)

    def inflate(self, p: Any, d: int) -> Any:
        if d == 1 or p.length() <= 1:
            return p
        coeffs = [int(c) for c in p.coeffs()]
        out = [0] * ((len(coeffs) - 1) * d + 1)
        out[::d] = coeffs
        return flint.nmod_poly(out, self.p)

    def __eq__(self, other: object) -> bool:
        return isinstance(other, _ModularRing) and other.p == self.p

    def __hash__(self) -> int:
        return hash(("GF", self.p))

    def __repr__(self) -> str:
        return self.name


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

    def __init__(self, ring: _LaurentRing, m: Any, shift: tuple[int, ...]) -> None:
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
            bits = e * (self.ring.coefficient_bits(self) + len(self.m).bit_length())
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
        """(exponents of q and the extra variables, coefficient), highest first."""
        out = []
        for exps, c in self.m.to_dict().items():
            shifted = (int(e) + s for e, s in zip(exps[1:], self.shift, strict=True))
            out.append(((int(exps[0]), *shifted), _number(c)))
        out.sort(key=lambda t: (sum(t[0][1:]), t[0][1:]), reverse=True)
        return out

    def __repr__(self) -> str:
        return laurent_text(self)


def _number(c: Any) -> Number:
    if isinstance(c, flint.fmpq):
        f = _fraction(c)
        return f.numerator if f.denominator == 1 else f
    return int(c)


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


class _LaurentRing(Ring):
    """Polynomials (truncated series) in q with coefficients Laurent polynomials in named
    extra variables, over ZZ or QQ (FLINT's fmpz_mpoly / fmpq_mpoly, q first)."""

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

    def exp_integral(self, s: list[int], n: int) -> Any | None:
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
        """The extra variable ``name`` as a scalar."""
        i = self.names.index(name)
        return self._wrap(self.ctx.gen(i + 1))

    @property
    def fractions(self) -> Ring:
        return laurent_ring(self.names, rational=True)

    # -- construction and conversion -------------------------------------------------
    def coerce(self, c: Any) -> LaurentPoly:
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
        acc = self.zero()
        for i, c in enumerate(coeffs):
            if c:
                acc = acc + self.coerce(c) * self._wrap(self._qpow(i))
        return acc

    def zero(self) -> LaurentPoly:
        return self._wrap(self.ctx.constant(0))

    def poly_from_ints(self, coeffs: list[int]) -> LaurentPoly:
        k = len(self.names)
        return self._wrap(self.ctx.from_dict({(i, *([0] * k)): c
                                              for i, c in enumerate(coeffs) if c}))

    def convert(self, p: Any) -> LaurentPoly:
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
        """A number when the scalar is constant, else the scalar itself."""
        if isinstance(c, LaurentPoly):
            if c.shift == self._no_shift and c.m.is_constant():
                return _number(c.m.coeffs()[0]) if not c.m.is_zero() else 0
            return c
        return _number(c)

    def coefficients(self, p: LaurentPoly) -> list[Any]:
        n = self.length(p)
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
    def length(self, p: LaurentPoly) -> int:  # type: ignore[override]
        return 0 if p.m.is_zero() else int(p.m.degrees()[0]) + 1

    def coeff(self, p: LaurentPoly, i: int) -> LaurentPoly:  # type: ignore[override]
        part = (p.m % self._qpow(i + 1)) - (p.m % self._qpow(i)) if i else p.m % self._q
        return self._wrap(part / self._qpow(i) if i else part, p.shift)

    def valuation(self, p: LaurentPoly) -> int | None:  # type: ignore[override]
        if p.m.is_zero():
            return None
        return int(p.m.term_content().degrees()[0])

    def is_unit(self, c: Any) -> bool:
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
    def coefficient_bits(self, p: LaurentPoly) -> int:  # type: ignore[override]
        best = 0
        for c in p.m.coeffs():
            if self.rational:
                best = max(best, int(c.p).bit_length() + int(c.q).bit_length())
            else:
                best = max(best, int(c).bit_length())
        return best

    def truncate(self, p: LaurentPoly, n: int) -> LaurentPoly:  # type: ignore[override]
        if n <= 0:
            return self.zero()
        if p.m.is_zero() or int(p.m.degrees()[0]) < n:
            return p
        return self._wrap(p.m % self._qpow(n), p.shift)

    def shift_up(self, p: LaurentPoly, k: int) -> LaurentPoly:  # type: ignore[override]
        if not k or p.m.is_zero():
            return p
        if k + self.length(p) > MAX_SHIFT:
            raise UnableError(f"a polynomial of degree {k + self.length(p) - 1} exceeds the "
                              f"limit")
        return self._wrap(p.m * self._qpow(k), p.shift)

    def shift_down(self, p: LaurentPoly, k: int) -> LaurentPoly:  # type: ignore[override]
        return self._wrap(p.m / self._qpow(k), p.shift) if k else p

    def mul_low(self, a: LaurentPoly, b: LaurentPoly, n: int) -> LaurentPoly:  # type: ignore[override]
        if n <= 0:
            return self.zero()
        return self.truncate(self.truncate(a, n) * self.truncate(b, n), n)

    def pow_low(self, p: LaurentPoly, e: int, n: int) -> LaurentPoly:  # type: ignore[override]
        result = self.coerce(1)
        base = self.truncate(p, n)
        while e:
            if e & 1:
                result = self.mul_low(result, base, n)
            e >>= 1
            if e:
                base = self.mul_low(base, base, n)
        return result

    def inflate(self, p: LaurentPoly, d: int) -> LaurentPoly:
        if d == 1:
            return p
        return self._wrap(self.ctx.from_dict({(e[0] * d, *e[1:]): c
                                              for e, c in p.m.to_dict().items()}), p.shift)

    def inv_series(self, p: LaurentPoly, n: int) -> LaurentPoly:
        if n <= 0:
            return self.zero()
        c0 = self.coeff(p, 0)
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
            e = 2 - self.mul_low(p, g, m)
            g = self.mul_low(g, e, m)
        return g

    def binomial_mul(self, p: LaurentPoly, c: Any, j: int, n: int | None) -> LaurentPoly:
        if n is not None:
            if j >= n:
                return self.truncate(p, n)
            p = self.truncate(p, n)
            shifted = self.shift_up(self.truncate(p, n - j), j)
        else:
            shifted = self.shift_up(p, j)
        return p - shifted * self.coerce(c)

    def binomial_div(self, p: LaurentPoly, c: Any, j: int, n: int) -> LaurentPoly:
        p = self.truncate(p, n)
        cc = self.coerce(c)
        step = j
        while step < n and cc:
            p = p + self.shift_up(self.truncate(p, n - step), step) * cc
            step *= 2
            cc = cc * cc
        return p

    def __eq__(self, other: object) -> bool:
        return isinstance(other, _LaurentRing) and other.names == self.names and \
            other.rational == self.rational

    def __hash__(self) -> int:
        return hash(("L", self.names, self.rational))

    def __repr__(self) -> str:
        return self.name


def _integral(c: Any) -> Any:
    if c.q != 1:
        raise IncompatibleRingError(f"{c} is not an integer")
    return flint.fmpz(c.p)


_LAURENT: dict[tuple[tuple[str, ...], bool], _LaurentRing] = {}


def laurent_ring(names: tuple[str, ...], rational: bool = False) -> Ring:
    """Series in q whose coefficients are Laurent polynomials in the extra variables
    ``names`` (over QQ when ``rational``); one ring object per set of names.

    >>> R = laurent_ring(("z",))
    >>> R.coefficients(R.inv_series(R.poly([1, -R.gen("z")]), 3))
    [1, z, z^2]
    """
    key = (tuple(names), rational)
    ring = _LAURENT.get(key)
    if ring is None:
        if not names or len(set(names)) != len(names) or "q" in names:
            raise DomainError(f"bad names for extra variables: {names!r}")
        if len(names) > MAX_VARIABLES:
            raise UnableError(f"{len(names)} extra variables; at most {MAX_VARIABLES} are "
                              f"supported")
        ring = _LaurentRing(tuple(names), rational)
        _LAURENT[key] = ring
    return ring


ZZ: Ring = _IntegerRing()
QQ: Ring = _RationalRing()


def _about(n: int) -> str:
    """n, or its order of magnitude when it is long."""
    return str(n) if n < 10**12 else f"about 10^{len(str(n)) - 1}" if n < 10**4000 else \
        "astronomically many"


def _decimal(n: int) -> str:
    return str(n) if n.bit_length() < 10_000 else int_to_decimal(n)


def int_to_decimal(n: int) -> str:
    """Decimal text of an integer of any size, by GMP (fast for huge numbers).

    >>> int_to_decimal(-12345678901234567890)
    '-12345678901234567890'
    """
    return flint.fmpz(n).str()


def is_prime(n: int) -> bool:
    """Primality by FLINT (a proof, not a probable-prime test).

    >>> is_prime(2**61 - 1)
    True
    """
    return n >= 2 and bool(flint.fmpz(n).is_prime())


def GF(p: int) -> Ring:
    """The ring of integers modulo the prime p (p < 2^64).

    >>> R = GF(7)
    >>> R.coefficients(R.inv_series(R.poly([1, 2]), 4))
    [1, 5, 4, 6]
    """
    return _ModularRing(p)


def join_rings(a: Ring, b: Ring) -> Ring:
    """The smallest ring containing both: ZZ inside QQ; a prime field only with itself.

    >>> join_rings(ZZ, QQ)
    QQ
    """
    if a == b:
        return a
    if {a, b} == {ZZ, QQ}:
        return QQ
    la, lb = isinstance(a, _LaurentRing), isinstance(b, _LaurentRing)
    if la or lb:
        names = a.names if la else b.names  # type: ignore[attr-defined]
        if (la and lb and a.names != b.names) or any(  # type: ignore[attr-defined]
                isinstance(r, _ModularRing) for r in (a, b)):
            raise IncompatibleRingError(f"cannot combine series over {a.name} and {b.name}")
        rational = any(r == QQ or getattr(r, "rational", False) for r in (a, b))
        return laurent_ring(names, rational)
    raise IncompatibleRingError(f"cannot combine series over {a.name} and {b.name}")
