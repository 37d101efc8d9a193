"""The ``Ring`` interface: one set of operation names on dense truncated polynomials.

Coefficient ``i`` of a polynomial stands for ``q^i``; lengths are always explicit:
``mul_low(a, b, n)`` keeps the coefficients of ``q^0 .. q^(n-1)``.  The common code here
serves the rings over one FLINT polynomial type (``integer``, ``rational``, ``modular``);
``laurent`` overrides it for coefficients in extra variables.  Nothing here touches
python-flint's global series precision: the exponential is computed with explicit lengths.

>>> from qseries.backend import ZZ
>>> isinstance(ZZ, Ring) and ZZ.exact
True
"""

from __future__ import annotations

from collections.abc import Callable
from fractions import Fraction
from operator import add, mul
from typing import Any

import flint

from ..errors import (
    ArgumentTypeError,
    DomainError,
    UnableError,
    integer_argument,
    typed_argument,
)

Number = int | Fraction

FLINT_VERSION: str = flint.__version__

#: longest polynomial a shift may produce (FLINT aborts the process when memory runs out)
MAX_SHIFT = 50_000_000


def _fraction(c: Any) -> Fraction:
    """An fmpq as a Fraction without reducing it again (FLINT keeps it in lowest terms; a
    gcd of two million-bit integers costs most of a second)."""
    num, den = int(c.p), int(c.q)
    if den == 1:
        return Fraction(num)
    f = Fraction.__new__(Fraction)
    f._numerator, f._denominator = num, den      # type: ignore[attr-defined]
    return f


def _number(c: Any) -> Number:
    """An fmpz or fmpq as an int, or a Fraction when it is not an integer."""
    if isinstance(c, flint.fmpq):
        f = _fraction(c)
        return f.numerator if f.denominator == 1 else f
    return int(c)


def _py_coeffs(p: Any) -> list[Number]:
    out: list[Number] = []
    for c in p.coeffs():
        if isinstance(c, flint.fmpq):
            out.append(_fraction(c))
        else:
            out.append(int(c))
    return out



_NOT_SCALARS = (str, bytes, float, complex, list, tuple, dict, set, type(None))


def _scalar_argument(name: str, value: object) -> None:
    """Refuse what cannot be a number or a coefficient (text, floats, containers, None,
    bools) with an ArgumentTypeError naming the argument; O(1)."""
    if isinstance(value, bool) or isinstance(value, _NOT_SCALARS):
        raise ArgumentTypeError(f"{name} must be an integer, a Fraction or a coefficient of "
                                f"the ring, not {value!r:.60} ({type(value).__name__})")


def _sequence_argument(name: str, value: object) -> None:
    """Refuse coefficients that are not given as a list, tuple or range."""
    if not isinstance(value, (list, tuple, range)):
        raise ArgumentTypeError(f"{name} must be a list of coefficients, not "
                                f"{type(value).__name__}")


class Ring:
    """Operations on dense truncated polynomials over one coefficient ring.

    Subclasses bind a FLINT polynomial type.  Each operation on polynomials (``mul_low``,
    ``inv_series``, ``inflate``, ...) is public once, here: it checks its arguments (the
    polynomials are of this ring, lengths and exponents are non-negative ints, ...; an
    ``ArgumentError`` naming the argument otherwise) and calls its unchecked twin
    ``_mul_low``, ``_inv_series``, ...  Rings implement only the underscore methods, and
    code inside qseries calls them directly (the checks are O(1), but the calls are many).

    >>> from qseries.backend import QQ
    >>> QQ.coefficients(QQ.mul_low(QQ.poly([1, 1]), QQ.poly([1, -1]), 3))
    [1, 0, -1]
    """

    name: str = "?"
    exact: bool = True
    #: coefficients are Python ints read modulo the ring (ZZ, GF(p)): ``poly_from_ints``
    #: takes any ints, so callers may accumulate coefficients in a plain list
    int_coefficients: bool = False
    #: p for GF(p), else None
    modulus: int | None = None
    _ptype: Any = None
    #: the type of this ring's polynomials, which the public operations accept
    _poly_type: type = object
    #: whether a polynomial's constant term can be set in place cheaply (``_add_one_owned``)
    _inplace_constant: bool = False
    #: the scalars c of ``binomial_mul`` / ``binomial_div`` (bool is refused)
    _scalar_types: tuple[type, ...] = (int, Fraction, flint.fmpz, flint.fmpq, flint.nmod)

    @property
    def fractions(self) -> Ring:
        """The ring with the same variables over QQ (itself when it is a field).

        >>> from qseries.backend import GF
        >>> GF(5).fractions
        GF(5)
        """
        return self

    # -- construction and conversion -------------------------------------------------
    def coerce(self, c: Number) -> Any:  # pragma: no cover - abstract
        """A Python number as a coefficient of this ring (each ring says what it accepts).

        >>> from qseries.backend import ZZ
        >>> ZZ.coerce(5)
        5
        """
        raise NotImplementedError

    def poly(self, coeffs: list) -> Any:
        """Polynomial with the given coefficients (low degree first).

        >>> from qseries.backend import ZZ
        >>> ZZ.poly([1, 0, 2])
        2*x^2 + 1
        """
        _sequence_argument("coeffs", coeffs)
        return self._ptype([self.coerce(c) if isinstance(c, (int, Fraction)) else c
                            for c in coeffs])

    def zero(self) -> Any:
        """The zero polynomial.

        >>> from qseries.backend import ZZ
        >>> ZZ.length(ZZ.zero())
        0
        """
        return self._ptype([])

    def poly_from_ints(self, coeffs: list[int]) -> Any:
        """Polynomial from a list of Python ints, without per-coefficient conversion (the
        fast path for long sparse series such as Euler's product).

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficients(ZZ.poly_from_ints([1, -1, -1]))
        [1, -1, -1]
        """
        _sequence_argument("coeffs", coeffs)
        return self._ptype(coeffs)

    def convert(self, p: Any) -> Any:
        """The polynomial p (over a subring) as a polynomial of this ring.

        >>> from qseries.backend import QQ, ZZ
        >>> QQ.coefficients(QQ.convert(ZZ.poly([1, 2])))
        [1, 2]
        """
        _scalar_argument("p", p)
        if isinstance(p, self._ptype):
            return p
        return self._ptype([self.coerce(c) for c in _py_coeffs(p)])

    def to_number(self, c: Any) -> Number:
        """A coefficient as a Python int or Fraction.

        >>> from qseries.backend import ZZ
        >>> ZZ.to_number(ZZ.poly([7])[0])
        7
        """
        _scalar_argument("c", c)
        return int(c)

    def _coefficients(self, p: Any) -> list[Number]:
        """All coefficients of p as Python numbers, low degree first (for integer
        coefficients one int() each, without the per-call checks of ``to_number``: a
        congruence search reads 10^5 of them per prime)."""
        if self.int_coefficients:
            return list(map(int, p.coeffs()))
        return [self.to_number(c) for c in p.coeffs()]

    # -- queries ---------------------------------------------------------------------
    @staticmethod
    def _length(p: Any) -> int:
        """Number of coefficients up to the last nonzero one."""
        return p.length()

    @staticmethod
    def _coeff(p: Any, i: int) -> Any:
        """Coefficient i of p (in the ring's own type)."""
        return p[i]

    @staticmethod
    def _valuation(p: Any) -> int | None:
        """Index of the first nonzero coefficient, or None for the zero polynomial."""
        n = p.length()
        if n == 0:
            return None
        i = 0
        while p[i] == 0:
            i += 1
        return i

    def is_unit(self, c: Any) -> bool:  # pragma: no cover - abstract
        """Whether the coefficient c is invertible in this ring.

        >>> from qseries.backend import ZZ
        >>> ZZ.is_unit(ZZ.coerce(-1)), ZZ.is_unit(ZZ.coerce(2))
        (True, False)
        """
        raise NotImplementedError

    # -- arithmetic ------------------------------------------------------------------
    @staticmethod
    def _coefficient_bits(p: Any) -> int:
        """Bits of the largest coefficient (numerators and denominators for QQ)."""
        if p.length() == 0:
            return 0
        if isinstance(p, flint.fmpz_poly):
            return int(p.height_bits())
        if isinstance(p, flint.fmpq_poly):
            return int(p.numer().height_bits()) + int(flint.fmpz(p.denom()).bit_length())
        return 0   # modular coefficients do not grow

    @staticmethod
    def _truncate(p: Any, n: int) -> Any:
        """p modulo q^n (n < 0 counts as 0)."""
        return p.truncate(max(n, 0))

    @staticmethod
    def _shift_up(p: Any, k: int) -> Any:
        """p * q^k for k >= 0 (refused beyond MAX_SHIFT, where FLINT would abort)."""
        if not k or p.length() == 0:
            return p
        if k + p.length() > MAX_SHIFT:
            raise UnableError(f"a polynomial of degree {k + p.length() - 1} exceeds the limit")
        return p.left_shift(k)

    @staticmethod
    def _shift_down(p: Any, k: int) -> Any:
        """p // q^k for k >= 0 (drops the k lowest coefficients)."""
        return p.right_shift(k) if k else p

    @staticmethod
    def _mul_low(a: Any, b: Any, n: int) -> Any:
        """a * b modulo q^n."""
        if n <= 0:
            return a.truncate(0)
        return a.mul_low(b, n)

    @staticmethod
    def _pow_low(p: Any, e: int, n: int) -> Any:
        """p^e modulo q^n for e >= 0."""
        if n <= 0:
            return p.truncate(0)
        return p.pow_trunc(e, n)

    def _inflate(self, p: Any, d: int) -> Any:
        """p(q^d) for an integer d >= 1."""
        if d == 1 or p.length() <= 1:
            return p
        coeffs = p.coeffs()
        out = [self.coerce(0)] * ((len(coeffs) - 1) * d + 1)
        out[::d] = coeffs
        return self._ptype(out)

    def _deflate(self, p: Any, m: int, r: int) -> Any:
        """The strided read sum_n p[m n + r] q^n, unchecked (see :meth:`deflate`)."""
        if m == 1:
            return p
        return self._ptype(p.coeffs()[r::m])

    def _inv_series(self, p: Any, n: int) -> Any:
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
            e = two - self._mul_low(p.truncate(m), g, m)
            g = self._mul_low(g, e, m)
        return g

    def _unit_inverse(self, c: Any) -> Any:  # pragma: no cover - abstract
        raise NotImplementedError

    def _binomial_mul(self, p: Any, c: Number, j: int, n: int | None) -> Any:
        """p * (1 - c q^j), truncated to length n when n is not None; O(length) work."""
        if n is not None and j >= n:
            return p.truncate(max(n, 0)) if p.length() > n else p
        if n is not None:
            if p.length() > n:
                p = p.truncate(max(n, 0))
            low = p.truncate(max(n - j, 0)) if p.length() > n - j else p
            shifted = self._shift_up(low, j)
        else:
            shifted = self._shift_up(p, j)
        if isinstance(c, (int, Fraction)) and c == -1:
            return p + shifted                     # 1 + q^j: no scalar pass
        cc = self._multiplier(c)
        return p - shifted if cc == 1 else p - shifted * cc

    def _binomial_div(self, p: Any, c: Number, j: int, n: int) -> Any:
        """p / (1 - c q^j) modulo q^n for j >= 1, by the doubling
        1/(1-x) = (1+x)(1+x^2)(1+x^4)...; each step is a shift and an add (no copy of p
        is made where it is already short enough)."""
        if p.length() > n:
            p = p.truncate(max(n, 0))
        cc = self._multiplier(c)
        step = j
        while step < n and cc != 0:
            low = p.truncate(n - step) if p.length() > n - step else p
            shifted = self._shift_up(low, step)
            if cc == 1:
                p = p + shifted
            else:
                p = p + shifted * cc
                cc = self._multiplier(cc * cc)
            step *= 2
        return p

    def _add_one_owned(self, p: Any) -> Any:
        """p + 1 for a polynomial no one else holds: ZZ and GF(p) change its constant term
        in place (O(1)), the other rings add (a copy)."""
        if self._inplace_constant:
            p[0] = p[0] + 1
            return p
        return p + self._ptype([1])

    def _multiplier(self, c: Any) -> Any:
        """c as a scalar that polynomials of this ring can be multiplied by."""
        return self.coerce(c)

    def _exp_integral(self, s: list[int], n: int) -> Any | None:
        """exp(sum_{k>=1} s[k] q^k / k) modulo q^n for integers s[k] (s[0] is ignored): the
        Euler transform, which turns a long product of binomials into a logarithm known in
        closed form.  None where this ring cannot divide by k < n.  Here (for ZZ) the result
        must be integral, else ``ArithmeticError``; QQ also accepts a rational one."""
        if n <= 0:
            return self.zero()
        return self.poly_from_ints(exp_online(s, n, flint.fmpz_poly, _exact_quotient))

    # -- the public operations: check the arguments, then call the unchecked ``_name`` --
    # Each check is O(1) (types and signs, never a pass over coefficients).  Subclasses
    # implement only ``_name``; code inside qseries calls ``_name`` directly.
    def _poly_argument(self, name: str, p: Any) -> None:
        """Refuse ``p`` unless it is a polynomial of this ring (``ArgumentTypeError`` naming
        the argument ``name``); GF(p) and the Laurent rings also check the modulus or ring.

        >>> from qseries.backend import QQ, ZZ
        >>> ZZ.length(QQ.poly([1]))  # doctest: +ELLIPSIS
        Traceback (most recent call last):
        ...
        qseries.errors.ArgumentTypeError: p must be a polynomial over ZZ (fmpz_poly), not 1 ...
        """
        if not isinstance(p, self._poly_type):
            typed_argument(name, p, self._poly_type,
                           f"a polynomial over {self.name} ({self._poly_type.__name__})")

    def _scalar_argument(self, name: str, c: Any) -> None:
        if isinstance(c, bool) or not isinstance(c, self._scalar_types):
            raise ArgumentTypeError(f"{name} must be a number (int or Fraction) or a coefficient "
                                    f"of {self.name}, not {c!r:.60} ({type(c).__name__})")

    def coefficients(self, p: Any) -> list[Any]:
        """All coefficients of p as Python numbers (scalars over a Laurent ring), low degree
        first.

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficients(ZZ.poly([3, 0, -1]))
        [3, 0, -1]
        >>> ZZ.coefficients([3, 0, -1])  # doctest: +ELLIPSIS
        Traceback (most recent call last):
        ...
        qseries.errors.ArgumentTypeError: p must be a polynomial over ZZ (fmpz_poly), not [3, ...
        """
        self._poly_argument("p", p)
        return self._coefficients(p)

    def length(self, p: Any) -> int:
        """Number of coefficients up to the last nonzero one (one more than the degree in q).

        >>> from qseries.backend import ZZ
        >>> ZZ.length(ZZ.poly([1, 2, 0]))
        2
        """
        self._poly_argument("p", p)
        return self._length(p)

    def coeff(self, p: Any, i: int) -> Any:
        """Coefficient i >= 0 of p (in the ring's own type; 0 beyond the degree).

        >>> from qseries.backend import ZZ
        >>> ZZ.coeff(ZZ.poly([1, 2]), 1)
        2
        >>> ZZ.coeff(ZZ.poly([1, 2]), -1)
        Traceback (most recent call last):
        ...
        qseries.errors.ArgumentError: i must be a non-negative integer, not -1
        """
        self._poly_argument("p", p)
        integer_argument("i", i, 0)
        return self._coeff(p, i)

    def valuation(self, p: Any) -> int | None:
        """Index of the first nonzero coefficient, or None for the zero polynomial.

        >>> from qseries.backend import ZZ
        >>> ZZ.valuation(ZZ.poly([0, 0, 5])), ZZ.valuation(ZZ.zero())
        (2, None)
        """
        self._poly_argument("p", p)
        return self._valuation(p)

    def coefficient_bits(self, p: Any) -> int:
        """Bits of the largest coefficient (numerators and denominators over QQ).

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficient_bits(ZZ.poly([1, 255]))
        8
        """
        self._poly_argument("p", p)
        return self._coefficient_bits(p)

    def truncate(self, p: Any, n: int) -> Any:
        """p modulo q^n for n >= 0.

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficients(ZZ.truncate(ZZ.poly([1, 2, 3]), 2))
        [1, 2]
        """
        self._poly_argument("p", p)
        integer_argument("n", n, 0)
        return self._truncate(p, n)

    def shift_up(self, p: Any, k: int) -> Any:
        """p * q^k for k >= 0 (refused beyond MAX_SHIFT, where FLINT would abort).

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficients(ZZ.shift_up(ZZ.poly([1, 2]), 2))
        [0, 0, 1, 2]
        """
        self._poly_argument("p", p)
        integer_argument("k", k, 0)
        return self._shift_up(p, k)

    def shift_down(self, p: Any, k: int) -> Any:
        """p // q^k for k >= 0: drops the k lowest coefficients (over a Laurent ring p must
        be divisible by q^k).

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficients(ZZ.shift_down(ZZ.poly([1, 2, 3]), 1))
        [2, 3]
        """
        self._poly_argument("p", p)
        integer_argument("k", k, 0)
        return self._shift_down(p, k)

    def mul_low(self, a: Any, b: Any, n: int) -> Any:
        """a * b modulo q^n for n >= 0.

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficients(ZZ.mul_low(ZZ.poly([1, 1]), ZZ.poly([1, 1]), 2))
        [1, 2]
        >>> ZZ.mul_low(ZZ.poly([1, 1]), ZZ.poly([1, 1]), 'x')
        Traceback (most recent call last):
        ...
        qseries.errors.ArgumentTypeError: n must be an integer, not 'x' (str)
        """
        self._poly_argument("a", a)
        self._poly_argument("b", b)
        integer_argument("n", n, 0)
        return self._mul_low(a, b, n)

    def pow_low(self, p: Any, e: int, n: int) -> Any:
        """p^e modulo q^n for e >= 0 and n >= 0.

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficients(ZZ.pow_low(ZZ.poly([1, 1]), 3, 3))
        [1, 3, 3]
        """
        self._poly_argument("p", p)
        integer_argument("e", e, 0)
        integer_argument("n", n, 0)
        return self._pow_low(p, e, n)

    def deflate(self, p: Any, m: int, r: int) -> Any:
        """The strided read sum_n p[m n + r] q^n for integers m >= 1 and 0 <= r < m (one
        pass over the coefficients: the inverse of ``inflate`` on one residue class).

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficients(ZZ.deflate(ZZ.poly([1, 2, 3, 4, 5, 6, 7]), 3, 1))
        [2, 5]
        """
        self._poly_argument("p", p)
        integer_argument("m", m, 1)
        integer_argument("r", r, 0, m - 1)
        return self._deflate(p, m, r)

    def inflate(self, p: Any, d: int) -> Any:
        """p(q^d) for an integer d >= 1.

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficients(ZZ.inflate(ZZ.poly([1, 2]), 3))
        [1, 0, 0, 2]
        >>> ZZ.inflate(ZZ.poly([1, 2]), 0)
        Traceback (most recent call last):
        ...
        qseries.errors.ArgumentError: d must be a positive integer, not 0
        """
        self._poly_argument("p", p)
        integer_argument("d", d, 1)
        return self._inflate(p, d)

    def inv_series(self, p: Any, n: int) -> Any:
        """1/p modulo q^n for n >= 0; the constant term of p must be a unit (else a
        ``DomainError``).

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficients(ZZ.inv_series(ZZ.poly([1, -1]), 4))
        [1, 1, 1, 1]
        """
        self._poly_argument("p", p)
        integer_argument("n", n, 0)
        return self._inv_series(p, n)

    def binomial_mul(self, p: Any, c: Any, j: int, n: int | None) -> Any:
        """p * (1 - c q^j) for j >= 0, truncated to length n >= 0 when n is not None.

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficients(ZZ.binomial_mul(ZZ.poly([1, 1]), 1, 1, None))
        [1, 0, -1]
        """
        self._poly_argument("p", p)
        self._scalar_argument("c", c)
        integer_argument("j", j, 0)
        if n is not None:
            integer_argument("n", n, 0)
        return self._binomial_mul(p, c, j, n)

    def binomial_div(self, p: Any, c: Any, j: int, n: int) -> Any:
        """p / (1 - c q^j) modulo q^n for j >= 1 and n >= 0.

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficients(ZZ.binomial_div(ZZ.poly([1]), 2, 1, 4))
        [1, 2, 4, 8]
        """
        self._poly_argument("p", p)
        self._scalar_argument("c", c)
        integer_argument("j", j, 1)
        integer_argument("n", n, 0)
        return self._binomial_div(p, c, j, n)

    def exp_integral(self, s: list[int], n: int) -> Any | None:
        """exp(sum_{k>=1} s[k] q^k / k) modulo q^n for a list of integers s (s[0] is
        ignored) and n >= 0; None where this ring cannot compute it (see ``_exp_integral``).

        >>> from qseries.backend import ZZ
        >>> ZZ.coefficients(ZZ.exp_integral([0, -1, -1], 3))   # exp(log(1 - q)) = 1 - q
        [1, -1]
        """
        typed_argument("s", s, (list, tuple), "a list of integers")
        integer_argument("n", n, 0)
        return self._exp_integral(s, n)


def _exact_quotient(a: Any, k: int) -> Any:
    quotient, rest = divmod(a, k)
    if rest:
        raise ArithmeticError("exp_integral: the exponential is not integral")
    return quotient


#: below this length ``exp_online`` adds up a block's own terms one by one
_EXP_LEAF = 32


def exp_online(s: list[int], n: int, ptype: Callable[[list], Any],
               divide: Callable[[Any, int], Any]) -> list[Any]:
    """The coefficients g[0 .. n-1] of g = exp(sum_{k>=1} s[k] q^k / k), from
    k g[k] = sum_{j=1}^{k} s[j] g[k-j] (g' = g * sum s[k] q^(k-1)), computed online: each
    block of g, once known, is multiplied by s with FLINT (``ptype``: fmpz_poly or
    fmpq_poly, ``mul_low`` to an explicit length) and added to the later coefficients, so
    the work is O(M(n) log n) and no global series precision is involved.  ``divide(a, k)``
    returns a / k (it may refuse an inexact quotient).

    >>> import flint
    >>> exp_online([0, 1, 1, 1, 1], 5, flint.fmpz_poly, lambda a, k: a // k)   # 1/(1-q)
    [1, 1, 1, 1, 1]
    """
    if n <= 0:
        return []
    sv: list[Any] = [0] * n
    top = min(len(s), n)
    sv[1:top] = s[1:top]
    g: list[Any] = [0] * n
    g[0] = 1
    acc: list[Any] = [0] * n
    s_prefix: dict[int, Any] = {}

    def solve(lo: int, hi: int) -> None:
        if hi - lo <= _EXP_LEAF:
            for i in range(max(lo, 1), hi):
                # s[i-lo], ..., s[1] against g[lo], ..., g[i-1]
                g[i] = divide(acc[i] + sum(map(mul, sv[i - lo:0:-1], g[lo:i])), i)
            return
        mid = (lo + hi) // 2
        solve(lo, mid)
        width = hi - lo
        sp = s_prefix.get(width)
        if sp is None:
            sp = s_prefix[width] = ptype(sv[:width])
        got = ptype(g[lo:mid]).mul_low(sp, width).coeffs()[mid - lo:]
        acc[mid:mid + len(got)] = map(add, acc[mid:mid + len(got)], got)
        solve(mid, hi)

    solve(0, n)
    return g
