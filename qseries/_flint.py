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

from fractions import Fraction
from typing import Any

import flint

from .errors import DomainError, IncompatibleRingError, UnableError

Number = int | Fraction

__all__ = ["ZZ", "QQ", "GF", "Ring", "int_to_decimal", "is_prime", "join_rings", "partitions_p",
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


class Ring:
    """Operations on dense truncated polynomials over one coefficient ring.

    Subclasses bind a FLINT polynomial type.  Methods whose name starts with an underscore
    assume validated input, as in FLINT.
    """

    name: str = "?"
    exact: bool = True

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


def _py_coeffs(p: Any) -> list[Number]:
    out: list[Number] = []
    for c in p.coeffs():
        if isinstance(c, flint.fmpq):
            out.append(Fraction(int(c.p), int(c.q)))
        else:
            out.append(int(c))
    return out


class _IntegerRing(Ring):
    name = "ZZ"
    _ptype = flint.fmpz_poly

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
        f = Fraction(int(c.p), int(c.q))
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

    def __init__(self, p: int) -> None:
        if p < 2 or not flint.fmpz(p).is_prime():
            raise DomainError(f"modulus {p} is not a prime")
        if p >= 2**64:
            raise DomainError(f"modulus {p} does not fit in a machine word")
        self.p = p
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


ZZ: Ring = _IntegerRing()
QQ: Ring = _RationalRing()


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
    raise IncompatibleRingError(f"cannot combine series over {a.name} and {b.name}")
