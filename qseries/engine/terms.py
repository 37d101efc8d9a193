"""Small pieces the engine's modules share: the factors of a product chain, binomials,
integer parts of exponents, powers of numbers within size limits, labels for messages.

>>> floor_int(Fraction(-7, 2)), ceil_int(Fraction(-7, 2))
(-4, -3)
>>> rational_power(Fraction(2, 3), Fraction(-2))
Fraction(9, 4)
"""

from __future__ import annotations

from fractions import Fraction

from ..errors import DomainError, UnableError, weight_may_help
from ..lang.ast import BigOp, BinOp, Neg, Node, Num, Poch, Q
from ..series import MAX_LENGTH, LaurentPoly, Series
from ..series.formatting import short_number_text
from . import symbolic as sym

#: a value: a number or a series
Value = Fraction | Series
#: a value as numerator and denominator (None: 1), see Evaluator.evaluate_parts
Parts = tuple[Series, Series | None]
#: largest integer accepted as an exponent of q, a limit of a sum or a subscript
MAX_INTEGER = 10**18
#: largest bit size of a rational constant built by powers, sums or products of numbers
#: (about 30,000 digits)
MAX_BITS = 100_000


def floor_int(x: Fraction | int) -> int:
    if isinstance(x, int):
        return x
    return x.numerator // x.denominator


def ceil_int(x: Fraction | int) -> int:
    if isinstance(x, int):
        return x
    return -(-x.numerator // x.denominator)


def rational_power(base: Fraction, e: Fraction) -> Fraction:
    """base^e when it is rational: 4^(1/2) = 2, (-8)^(1/3) = -2; an irrational value such as
    2^(1/2) is refused.

    >>> rational_power(Fraction(9, 4), Fraction(3, 2)), rational_power(Fraction(-8), Fraction(1, 3))
    (Fraction(27, 8), Fraction(-2, 1))
    """
    if e.denominator != 1:
        root = _exact_root(base, e.denominator)
        if root is None:
            shown = str(base) if base >= 0 and base.denominator == 1 else f"({base})"
            raise UnableError(f"{shown}^({e}) is not rational; only integer powers of numbers "
                              f"and rational roots of them")
        base, e = root, Fraction(e.numerator)
    n = e.numerator
    if n < 0 and base == 0:
        raise DomainError("division by zero (0 to a negative power)")
    bits = max(abs(base.numerator).bit_length(), abs(base.denominator).bit_length())
    if bits > 1 and abs(n) * bits > MAX_BITS:
        raise UnableError(f"the number {short_number_text(base)}^{short_number_text(n)} is "
                          f"too large")
    return base ** n


def _exact_root(x: Fraction, k: int) -> Fraction | None:
    """The rational k-th root of x (real; of a negative x only for odd k), or None."""
    if x < 0:
        if k % 2 == 0:
            return None
        root = _exact_root(-x, k)
        return None if root is None else -root
    if max(x.numerator.bit_length(), x.denominator.bit_length()) > MAX_BITS:
        return None
    parts = []
    for v in (x.numerator, x.denominator):
        r = _integer_root(v, k)
        if r ** k != v:
            return None
        parts.append(r)
    return Fraction(parts[0], parts[1])


def _integer_root(v: int, k: int) -> int:
    """floor(v^(1/k)) for v >= 0, by Newton's method on integers."""
    if v < 2:
        return v
    if k >= v.bit_length():                   # 1 <= root < 2
        return 1
    r = 1 << -(-v.bit_length() // k)          # an upper bound
    while True:
        s = ((k - 1) * r + v // r ** (k - 1)) // k
        if s >= r:
            return r
        r = s


def scalar_power(c: LaurentPoly, n: int) -> LaurentPoly:
    """c^n for a coefficient in extra variables; negative n only for monomials."""
    if n < 0 and not c.ring.is_unit(c) and c.ring.fractions.is_unit(c):
        c = c.ring.fractions.coerce(c)     # 2z: invertible over QQ
    if n < 0 and not c.ring.is_unit(c):
        raise weight_may_help(DomainError(
            f"{c} is not a monomial, so its negative powers are not Laurent polynomials (give "
            f"the extra variables a weight to expand them)"))
    bits = c.ring._coefficient_bits(c)
    one = 2 if getattr(c.ring, "rational", False) else 1     # the bits of the coefficient 1
    growth = 0 if bits <= one and c.ring.is_unit(c) else max(bits, 1)  # +-z^k stays small
    if abs(n) * growth > MAX_BITS or abs(n) > MAX_LENGTH:
        raise UnableError(f"the power ({c})^{n} is too large")
    return c ** n


def truncate_abs(s: Series, order: int) -> Series:
    """Keep exponents below ``order`` for a series with a fractional offset; its precision
    is then at most ``order`` itself (not the next exponent of its class)."""
    k = order - s.offset  # keep offset + i < order  <=>  i < order - offset
    return s.truncate(ceil_int(k)).limit_precision(order)


def int_value(v: Fraction, what: str) -> int:
    if v.denominator != 1:
        raise DomainError(f"{what} must be an integer, not {short_number_text(v)}")
    if abs(v.numerator) > MAX_INTEGER:
        raise UnableError(f"{what} is {short_number_text(v)}, beyond the limit 10^18")
    return v.numerator


def label(node: BigOp) -> str:
    if node.lower is not None and node.upper is None:
        return f"{node.kind}_{{{node.var}>=...}}" if not isinstance(node.lower, Num) else \
            f"{node.kind}_{{{node.var}>={fraction_text(node.lower.value)}}}"
    return f"{node.kind}_{{{node.var}=...}}"


def fraction_text(v: Fraction) -> str:
    return str(v.numerator) if v.denominator == 1 else str(v)


def poly_text(p: sym.Poly, var: str, sign: int) -> str:
    """The polynomial p(m) in m = sign * var as a polynomial in ``var``.

    >>> poly_text([0, -1], "n", 1), poly_text([0, -1], "k", -1), poly_text([3, 1, 2], "k", -1)
    ('-n', 'k', '2k^2 - k + 3')
    """
    if not p:
        return "0"
    parts = []
    for i in range(len(p) - 1, -1, -1):
        c = p[i] * (sign ** i)
        if not c:
            continue
        power = "" if i == 0 else var + ("" if i == 1 else f"^{i}")
        size = fraction_text(abs(c))
        term = size if i == 0 else (power if abs(c) == 1 else f"{size}{power}")
        if not parts:
            parts.append(term if c > 0 else f"-{term}")
        else:
            parts.append(f"+ {term}" if c > 0 else f"- {term}")
    return " ".join(parts)


def factors_of(node: Node, p: int = 1) -> list[tuple[Node, int]]:
    """Flatten a product/quotient chain into (factor, power) pairs; constant integer powers
    of q-Pochhammer symbols become powers of the factor.

    A factor inverted twice (a quotient in a denominator, a negative power of a symbol in
    a denominator) is not flattened: 1/(1/f) is defined only where f is not 0, which the
    pair (f, 1) would no longer check, so the inverted part stays one factor.

    >>> from qseries.lang import parse
    >>> [(type(n).__name__, k) for n, k in factors_of(parse("q/(q;q)_inf^2"))]
    [('Q', 1), ('Poch', -2)]
    >>> [(type(n).__name__, k) for n, k in factors_of(parse("1/(1/(q;q)_inf)"))]
    [('Num', 1), ('BinOp', -1)]
    """
    if isinstance(node, BinOp) and node.op == "*":
        return factors_of(node.left, p) + factors_of(node.right, p)
    if isinstance(node, BinOp) and node.op == "/":
        if p < 0:
            return [(node, p)]
        return factors_of(node.left, p) + factors_of(node.right, -p)
    if isinstance(node, BinOp) and node.op == "^" and isinstance(node.left, Poch):
        k = _small_integer(node.right)
        if k is not None and (k > 0 or p > 0):
            return [(node.left, p * k)]
    return [(node, p)]


def _small_integer(node: Node) -> int | None:
    """The integer k with |k| <= 64 that node writes as k or -k, else None."""
    sign = 1
    if isinstance(node, Neg):
        sign, node = -1, node.operand
    if isinstance(node, Num) and node.value.denominator == 1 and abs(node.value) <= 64:
        return sign * int(node.value)
    return None


def signed_factors(node: Node) -> tuple[int, list[tuple[Node, int]]]:
    sign = 1
    while isinstance(node, Neg):
        sign = -sign
        node = node.operand
    return sign, factors_of(node)


def is_q_power(node: Node) -> bool:
    return isinstance(node, Q) or (isinstance(node, BinOp) and node.op == "^"
                                   and isinstance(node.left, Q))


def binomial_parts(s: Series) -> tuple[Fraction | int, int] | None:
    """(c, j) when s is exactly 1 - c q^j with j >= 1."""
    if not s.is_exact or s.offset != 0 or s.start != 0 or s.den != 1:
        return None
    R = s.ring
    n = R._length(s.poly)
    if n < 2 or n > 1 << 20:
        return None
    if R._coeff(s.poly, 0) != 1:
        return None
    j = n - 1
    if n > 2:
        for i in range(1, j):
            if R._coeff(s.poly, i) != 0:
                return None
    return -R.to_number(R._coeff(s.poly, j)), j


def times_binomial(acc: Series, a: Series, mono: tuple | None, shift: int, times: int,
                    order: int) -> Series:
    """acc * (1 - a q^shift)^times."""
    if mono is not None:
        c, e = mono
        e = e + shift
        if e.denominator == 1 and e >= 1:
            for _ in range(abs(times)):
                acc = acc.mul_binomial(c, int(e), order) if times > 0 else \
                    acc.div_binomial(c, int(e), order)
            return acc
    factor = Series.constant(1, acc.ring) - a.shift(shift)
    if factor.is_zero() and factor.is_exact:
        if times < 0:
            raise DomainError("a q-Pochhammer symbol in a denominator vanishes")
        return Series.zero(acc.ring)
    for _ in range(abs(times)):
        if times > 0:
            acc = (acc * factor).truncate(order)
        else:
            va = acc.valuation
            acc = (acc * factor.inverse(order=order - (floor_int(va) if va is not None else 0))
                   ).truncate(order)
    return acc
