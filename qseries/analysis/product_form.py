"""Recover the infinite-product form of a series: f = c q^s prod_{n>=1} (1 - q^n)^(e_n).

Method (G. E. Andrews, q-Series, CBMS 66, AMS 1986; Bernstein and Sloane, Linear Algebra
Appl. 226-228 (1995)): normalise g = f/(c q^s) = 1 + ..., compute the logarithmic derivative
q g'/g = sum_n C_n q^n, where C_n = -sum_{d|n} d e_d, and recover n e_n = -sum_{d|n}
mu(n/d) C_d by Moebius inversion.  Everything is exact.  Periodic exponents
(e_{n+m} = e_n) are printed as powers of (q^r;q^m)_inf, and as an eta quotient where e_n
depends only on gcd(n, m).

Two ways to the exponents, the same numbers:

* :func:`exponents_of`, the reference: q g'/g by the exact inverse of g over ZZ (or QQ) and
  one product, then the Moebius inversion.  The inverse of a series whose coefficients
  have hundreds of bits costs several products at that size (at order 10^5, 3 s of the
  7 s the whole recovery of the Rogers-Ramanujan product took).
* :func:`exponents_from_parts`, used first at every order: the expression is evaluated as
  numerator and unit denominator (:func:`product_parts`, ``Evaluator.evaluate_parts``: a
  sum by binary splitting or a product chain leaves its last division undone, so f itself
  is never divided out), the log derivative C of each is computed exactly by
  ``backend.logderiv`` (below ``DIVISION_MAX_LENGTH``: one Euclidean division of the
  reversed polynomials over ZZ; from it on: modulo a prime, lifted to the least integers
  and checked exactly, q p' = c p over ZZ, then by the division when that lift fails), and
  C = C_num - C_den is turned into n e_n by a divisor sieve on Python ints (the multiples
  of each n with e_n != 0: O(N log N), fewer when exponents vanish).  The reference is
  left for a leading coefficient that does not divide the series (no integer exponents)
  and series over QQ.  Not slower than the reference at any order measured: products
  from order 20 to 10^5, and series without a product form (1/(q;q)_inf + q^2: 0.12 s
  against 0.17 s at order 5000, 2.2 s against 4.0 s at 20 000).

>>> pf = product_form("sum_{k>=0} q^(k^2)/(q;q)_k", 60)
>>> pf.period, pf.expression
(5, '(q, q^4;q^5)_inf^-1')
>>> product_form("(q;q)_inf^3", 40).eta
'eta(q)^3 q^(-1/8)'
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction

from ..backend.logderiv import log_derivative_by_division, small_log_derivative
from ..engine import Evaluator, evaluate
from ..errors import ArgumentTypeError, DomainError, integer_argument, typed_argument
from ..lang import Node, parse
from ..lang.ast import extra_variables
from ..series import QQ, ZZ, Ring, Series
from ..series.formatting import format_exponent, format_term, short_number_text
from .display import Displayed
from .product_factors import simplest_factors, symbol_count

Number = int | Fraction
Exponent = int | Fraction

#: a period must repeat at least this many times below the order to be reported
MIN_REPETITIONS = 3
#: below this length the log derivative of a part is one exact division
#: (``log_derivative_by_division``); from it on its residues modulo a prime, lifted and
#: checked (``small_log_derivative``), and the division only where that fails.  On the
#: Rogers-Ramanujan parts (process time, 2026-12-03): division 6 ms against 9 ms at order
#: 5000, 36 against 40 ms at 20 000, 104 against 97 ms at 40 000, 0.62 against 0.39 s at 10^5
DIVISION_MAX_LENGTH = 20_000


@dataclass(frozen=True)
class ProductForm(Displayed):
    """f = constant * q^shift * prod_{n=1}^{len(exponents)} (1 - q^n)^exponents[n-1]
    + O(q^order); ``period`` (with ``repetitions``) when the exponents repeat.

    ``expression`` is the product in the notation when it is recognisable: periodic
    exponents, or finitely many non-zero exponents (all in the lower half of the range
    computed).  Otherwise it is None and ``reason`` says why; every series 1 + O(q) with
    integer coefficients has integer exponents, so only such a pattern makes a product form.
    """

    order: Exponent
    constant: Number
    shift: Exponent
    exponents: list[int]
    period: int | None
    repetitions: int
    expression: str | None
    eta: str | None
    #: why there is no recognisable product (``expression`` is then None)
    reason: str = ""
    #: the same product in fewer q-Pochhammer symbols than ``expression`` (factors such as
    #: (q;q^2)_inf, (-q^a;q^m)_inf, (q^a;q^a)_inf found by :mod:`.product_factors`), or None
    factors: str | None = None
    #: when the exponents repeat with a period up to some n and then stop doing so (no
    #: product form then): (period, first n that breaks it)
    breaks: tuple[int, int] | None = None
    #: with ``breaks``: (exponent, coefficient) of the first term by which the series
    #: differs from the periodic product, c q^e (a stray term?)
    stray: tuple[Exponent, Number] | None = None

    def nonzero(self) -> list[tuple[int, int]]:
        """(n, e_n) for the nonzero exponents."""
        return [(n, e) for n, e in enumerate(self.exponents, start=1) if e]


def mobius_table(n: int) -> list[int]:
    """mu(0..n-1) by a linear sieve (mu(0) unused).

    >>> mobius_table(11)[1:]
    [1, -1, -1, 0, -1, 1, -1, 0, 0, 1]
    """
    mu = [1] * max(n, 2)
    mu[0] = 0
    is_comp = [False] * max(n, 2)
    primes: list[int] = []
    for i in range(2, n):
        if not is_comp[i]:
            primes.append(i)
            mu[i] = -1
        for p in primes:
            if i * p >= n:
                break
            is_comp[i * p] = True
            if i % p == 0:
                mu[i * p] = 0
                break
            mu[i * p] = -mu[i]
    return mu[:n]


def exponents_of(g: Series, length: int) -> list[Fraction]:
    """e_1..e_(length-1) with g = prod (1 - q^n)^(e_n) + O(q^length), for g = 1 + O(q)."""
    if length <= 1:
        return []
    ring: Ring = QQ if g.ring == QQ else ZZ
    coeffs = g.coefficient_list(length)
    dq = Series.from_coefficients([i * c for i, c in enumerate(coeffs)], ring, prec=length)
    log_der = dq * g.truncate(length).inverse(order=length)
    big_c = log_der.coefficient_list(length)
    # over ZZ the C_d are integers: the inversion runs on Python ints, and only n e_n / n
    # becomes a Fraction (Fraction arithmetic throughout took most of the time)
    zero: int | Fraction = 0 if all(isinstance(c, int) for c in big_c) else Fraction(0)
    mu = mobius_table(length)
    out = [zero] * length
    # n e_n = -sum_{d | n} mu(n/d) C_d, accumulated over multiples
    for d in range(1, length):
        cd = big_c[d]
        if cd:
            for n in range(d, length, d):
                m = mu[n // d]
                if m:
                    out[n] -= m * cd
    return [Fraction(out[n], n) if isinstance(out[n], int) else out[n] / n
            for n in range(1, length)]


def exponents_from_log_derivative(big_c: list[int], length: int) -> list[int | Fraction]:
    """e_1..e_(length-1) from the integers C_1..C_(length-1) (``big_c[n]``; ``big_c[0]``
    unused) with C_n = -sum_{d | n} d e_d: b_n = n e_n = -C_n - sum_{d | n, d < n} b_d by a
    sieve over the multiples of each n with b_n != 0; e_n an int, or a Fraction where n
    does not divide b_n.

    >>> exponents_from_log_derivative([0, -1, -3, -4, -7, -6], 6)   # (q;q)_inf
    [1, 1, 1, 1, 1]
    """
    s = [-x for x in big_c[:length]]
    for n in range(1, length):
        b = s[n]
        if b:
            for m in range(2 * n, length, n):
                s[m] -= b
    return [b // n if b % n == 0 else Fraction(b, n) for n, b in enumerate(s) if n]


def exponents_from_parts(num: Series, length: int, den: Series | None = None
                         ) -> list[int | Fraction] | None:
    """e_1..e_(length-1) with num/den = c q^v prod (1 - q^n)^(e_n) + O(q^(v+length)), for
    ``num`` over ZZ with integer exponents (leading term c q^v) and ``den`` over ZZ of
    valuation 0 with constant term +-1 (or None), both known that far; None when c does not
    divide the coefficients of ``num`` or a series is not of that kind (then use
    :func:`exponents_of`).  Exact: see ``backend.logderiv`` and ``DIVISION_MAX_LENGTH``.

    >>> from qseries.engine import evaluate
    >>> exponents_from_parts(evaluate("3 q^2 (q;q^2)_inf^2", 8), 6)
    [2, 0, 2, 0, 2]
    """
    for x in (num, den):
        if x is not None and (x.ring != ZZ or x.den != 1 or x.is_zero()):
            return None
    if den is not None and (den.start != 0 or den.offset != 0 or den.poly[0] not in (1, -1)):
        return None
    if length <= 1:
        return []
    big_c = _log_derivative(num.poly, length)
    if big_c is None:
        return None
    if den is not None:
        c_den = _log_derivative(den.poly, length)
        if c_den is None:
            return None
        big_c = [a - b for a, b in zip(big_c, c_den, strict=True)]
    return exponents_from_log_derivative(big_c, length)


def _log_derivative(p: object, length: int) -> list[int] | None:
    """C_0..C_(length-1) of the polynomial p over ZZ, exactly (None: see
    ``log_derivative_by_division``)."""
    if length < DIVISION_MAX_LENGTH:
        return log_derivative_by_division(p, length)
    c = small_log_derivative(p, length)
    return c if c is not None else log_derivative_by_division(p, length)


def find_period(ex: list[int], min_repetitions: int = MIN_REPETITIONS) -> int | None:
    """The least m with e_{n+m} = e_n for every known n, seen at least ``min_repetitions``
    times.

    >>> find_period([1, 0, 0, 1, 1, 0, 0, 1, 1, 0, 0, 1])
    4
    """
    n = len(ex)
    if n == 0:
        return None
    # the least m with ex[i] == ex[i + m] for all i is n minus the longest proper border
    # of the sequence (a prefix that is also a suffix): Knuth-Morris-Pratt's failure
    # function, O(n) comparisons (a scan over every m costs O(n^2) on long near-periodic
    # prefixes)
    fail = [0] * n
    k = 0
    for i in range(1, n):
        while k and ex[i] != ex[k]:
            k = fail[k - 1]
        if ex[i] == ex[k]:
            k += 1
        fail[i] = k
    m = n - fail[-1]
    return m if m <= n // min_repetitions else None


def periodic_break(ex: list[int], min_repetitions: int = MIN_REPETITIONS
                   ) -> tuple[int, int] | None:
    """(m, n) when e_1 .. e_(n-1) repeat with period m at least ``min_repetitions`` times
    and e_n breaks it (e_n != e_(n-m)): the m whose break comes last (the smallest such m);
    None when no period holds that long.

    The first break of period m is at index m + z[m] (0-based), z the Z-function of the
    sequence (z[m]: the longest common prefix of ex and ex[m:]), so every m costs O(1)
    after O(n) work (a scan per m took O(n^2 / m0) on a sequence of period m0 broken late:
    0.8 s at order 10^4 for the Rogers-Ramanujan product plus a stray q^9900, 0.11 s now).

    >>> periodic_break([1, 0, 1, 0, 1, 0, 1, 0, 5, 0, 1])
    (2, 9)
    """
    z = z_function(ex)
    best: tuple[int, int] | None = None
    for m in range(1, len(ex) // min_repetitions + 1):
        i = m + z[m]
        if i >= len(ex) or i < min_repetitions * m:
            continue
        if best is None or i + 1 > best[1]:
            best = (m, i + 1)
    return best


def z_function(ex: list[int]) -> list[int]:
    """z[i]: the length of the longest common prefix of ex and ex[i:] (z[0] = len(ex)), in
    O(n) comparisons (the Z-algorithm: Gusfield, Algorithms on Strings, Trees and
    Sequences, 1997, section 1.4).

    >>> z_function([1, 0, 1, 0, 1, 1])
    [6, 0, 3, 0, 1, 1]
    """
    n = len(ex)
    z = [0] * n
    if n:
        z[0] = n
    left = right = 0          # ex[left:right] = ex[0:right-left], right as far as seen
    for i in range(1, n):
        k = min(right - i, z[i - left]) if i < right else 0
        while i + k < n and ex[k] == ex[i + k]:
            k += 1
        z[i] = k
        if i + k > right:
            left, right = i, i + k
    return z


def _power(e: int) -> str:
    return "" if e == 1 else f"^{e}"


def _q(e: Exponent) -> str:
    return format_exponent(e)


def periodic_expression(period: int, ex: list[int]) -> str:
    """prod_r (q^r;q^m)_inf^(e_r), grouping residues with equal exponents.

    >>> periodic_expression(5, [-1, 0, 0, -1, 0])
    '(q, q^4;q^5)_inf^-1'
    """
    groups: dict[int, list[int]] = {}
    for r in range(1, period + 1):
        e = ex[r - 1]
        if e:
            groups.setdefault(e, []).append(r)
    parts = []
    for e, rs in sorted(groups.items(), key=lambda t: (-t[0], t[1])):
        params = ", ".join(_q(r) for r in rs)
        parts.append(f"({params};{_q(period)})_inf{_power(e)}")
    return " ".join(parts) if parts else "1"


def eta_quotient(period: int, ex: list[int]) -> tuple[dict[int, int], Fraction] | None:
    """(r_d, weight shift) with prod_{d|m} (q^d;q^d)_inf^(r_d) = prod (1-q^n)^(e_n), when e_n
    depends only on gcd(n, m); the shift sum d r_d / 24 makes it prod eta(d tau)^(r_d)."""
    from math import gcd

    m = period
    by_gcd: dict[int, int] = {}
    for n in range(1, m + 1):
        g = gcd(n, m)
        if by_gcd.setdefault(g, ex[n - 1]) != ex[n - 1]:
            return None
    divisors = [d for d in range(1, m + 1) if m % d == 0]
    mu = mobius_table(m + 1)
    r = {}
    for d in divisors:
        val = sum(mu[d // g] * by_gcd[g] for g in divisors if d % g == 0)
        if val:
            r[d] = val
    return r, Fraction(sum(d * v for d, v in r.items()), 24)


def _constant_text(c: Number) -> str:
    if c == 1:
        return ""
    if c == -1:
        return "-"
    return f"({c}) " if isinstance(c, Fraction) and c.denominator != 1 else f"{c} "


def product_form(expr: str | Node | Series | tuple[Series, Series | None], order: int = 100
                 ) -> ProductForm:
    """The product form of a series (or an expression evaluated to ``order``, or what
    :func:`product_parts` gave for it at ``order``).

    Raises DomainError when the series is zero to this order or its exponents are not all
    integers ("no product form of this kind to this order").
    """
    if isinstance(expr, tuple):
        if (len(expr) != 2 or not isinstance(expr[0], Series)
                or not isinstance(expr[1], (Series, type(None)))):
            raise ArgumentTypeError("expr as a pair must be (numerator, denominator or None) "
                                    "as product_parts gives")
        num, den = expr
    else:
        num, den = product_parts(expr, order)
    if den is not None:
        v = num.valuation
        if v is None:
            raise DomainError("the series vanishes to this order; it has no product form")
        c = num.coefficient(v) * den.coefficient(0)    # den(0) = +-1
        # both parts are known modulo q^order: the quotient to the absolute order
        # ``order``, so its coefficients relative to c q^v to q^(order - v)
        known: Exponent = order
        length = order - v
        ex = exponents_from_parts(num, length, den)
        if ex is None:
            ex = exponents_of(_normalised(num * den.inverse(order=order), v, c), length)
    else:
        f = num
        if getattr(f.ring, "names", ()):
            raise DomainError("product forms are recovered for series in q alone; this one "
                              f"has coefficients in {', '.join(f.ring.names)}")  # type: ignore[attr-defined]
        if f.ring not in (ZZ, QQ):
            raise DomainError(f"product forms are recovered for series over ZZ or QQ; this one "
                              f"is over {f.ring}")
        f.one_class("a product form prod (1-q^n)^(e_n)")
        v = f.valuation
        if v is None:
            raise DomainError("the series vanishes to this order; it has no product form")
        c = f.coefficient(v)
        # the absolute order to which f is known (an exact series: the order asked); the
        # normalised series is known at the exponents 0 .. ceil(known - v) - 1, so e_n up
        # to that exponent (``int`` of a fractional relative order dropped the last one)
        known = f.precision if f.precision is not None else order
        length = max(math.ceil(known - v), 0)
        ex = exponents_from_parts(f, length) if f.ring == ZZ else None
        if ex is None:
            ex = exponents_of(_normalised(f, v, c), length)
    for n, e in enumerate(ex, start=1):
        if not isinstance(e, int) and e.denominator != 1:
            raise DomainError(f"no product form prod (1-q^n)^(e_n) with integer exponents to "
                              f"this order: the exponent of (1-q^{n}) would be "
                              f"{short_number_text(e)}")
    ints = [e if isinstance(e, int) else int(e) for e in ex]
    period = find_period(ints) if ints else None
    reps = len(ints) // period if period else 0
    prefix = _constant_text(c) + ("" if v == 0 else f"{_q(v)} ")
    eta_text = None
    short = None
    if period:
        body = periodic_expression(period, ints[:period])
        fewer = simplest_factors(period, ints[:period])
        if fewer is not None and symbol_count(fewer) < symbol_count(body):
            short = (prefix + fewer).strip()
        eq = eta_quotient(period, ints[:period])
        if eq is not None:
            r, w = eq
            etas = " ".join(f"eta({_q(d)}){_power(e)}" for d, e in sorted(r.items())) or "1"
            rest = Fraction(v) - w
            eta_text = f"{_constant_text(c)}{etas}" + ("" if rest == 0 else f" {_q(rest)}")
    else:
        nonzero = [(n, e) for n, e in enumerate(ints, 1) if e]
        if nonzero and nonzero[-1][0] * 2 > len(ints) + 1:
            # exponents still non-zero in the upper half: neither periodic nor a finite
            # product that the computed terms can show
            big = max(nonzero, key=lambda t: abs(t[1]))
            at = known
            brk = periodic_break(ints)
            if brk is None:
                longest = len(ints) // MIN_REPETITIONS
                return ProductForm(at, c, v, ints, None, 0, None, None,
                                   f"the exponents show no period up to {longest} and do not "
                                   f"end below the order (e_{big[0]} = "
                                   f"{short_number_text(big[1])}): the order is too low "
                                   f"to see a longer period, if there is one (a "
                                   f"period m shows from order {MIN_REPETITIONS}m + 1 on; "
                                   f"try twice the order)")
            m, n = brk
            d = ints[n - 1] - ints[n - 1 - m]
            stray_e = Fraction(v) + n
            stray_c = -d * c
            stray = (stray_e.numerator if stray_e.denominator == 1 else stray_e, stray_c)
            pbody = periodic_expression(m, ints[:m])
            periodic = (prefix + pbody).strip() if pbody != "1" or not prefix else prefix.strip()
            return ProductForm(at, c, v, ints, None, 0, None, None,
                               f"the exponents repeat with period {m} up to n = {n - 1} and "
                               f"then break: e_{n} = {short_number_text(ints[n - 1])}, where the "
                               f"period gives {short_number_text(ints[n - 1 - m])}; the series "
                               f"is {periodic} "
                               f"{format_term(stray_e, stray_c, False)} + "
                               f"O({_q(stray_e + 1)}), as if a stray term had been added",
                               breaks=brk, stray=stray)
        body = " ".join(f"(1 - {_q(n)}){_power(e)}" for n, e in nonzero) or "1"
    expression = (prefix + body).strip() if body != "1" or not prefix else prefix.strip()
    if expression in ("", "-"):
        expression += "1"
    return ProductForm(known, c, v, ints, period, reps,
                       expression, eta_text, factors=short)


def _normalised(f: Series, v: Exponent, c: Number) -> Series:
    """g = f / (c q^v) = 1 + O(q)."""
    g = f * Series.monomial(-Fraction(v), f.ring)
    return g if c == 1 else g * (Fraction(1) / Fraction(c))


def product_parts(expr: str | Node | Series, order: int) -> tuple[Series, Series | None]:
    """What :func:`product_form` reads: the value of ``expr`` modulo q^order as (f, None),
    or as (numerator, denominator) over ZZ when it evaluates so
    (``Evaluator.evaluate_parts``: the denominator a unit with constant term +-1, both known
    modulo q^order, integer exponents), so that f itself is never divided out; an
    expression in extra variables is evaluated as a whole, a series is returned as it is.

    >>> product_parts("1/((q;q^5)_inf (q^4;q^5)_inf)", 8)
    (1 - q^5 + O(q^8), 1 - q - q^4 + q^7 + O(q^8))
    """
    typed_argument("expr", expr, (str, Node, Series),
                   "a string, a syntax tree from qseries.parse or a series")
    if isinstance(expr, Series):
        return expr, None
    integer_argument("order", order, 0)
    node = parse(expr) if isinstance(expr, str) else expr
    if extra_variables(node):
        return evaluate(node, order), None
    num, den = Evaluator(ZZ).evaluate_parts(node, order)
    if den is None:
        return num, None
    if (num.ring != ZZ or den.ring != ZZ or num.den != 1 or den.den != 1 or num.offset != 0
            or den.offset != 0 or den.start != 0 or den.poly[0] not in (1, -1)):
        return evaluate(node, order), None
    return num, den
