"""q-Pochhammer symbols and Euler's product, with the binomial fast paths.

(a; q^t)_n = (1 - a)(1 - a q^t) ... (1 - a q^(t(n-1))), with (a; q^t)_0 = 1, the standard
convention (a; q^t)_n = 1/(a q^(tn); q^t)_(-n) for n < 0, and the infinite product for
n = None.

>>> from qseries.series import Series, ZZ
>>> q = Series.monomial(1, ZZ)
>>> pochhammer(q, 1, 3, order=10)            # (q;q)_3
1 - q - q^2 + q^4 + q^5 - q^6
>>> euler_product(1, ZZ, 8)                  # (q;q)_inf
1 - q - q^2 + q^5 + q^7 + O(q^8)
"""

from __future__ import annotations

from fractions import Fraction

from ..errors import DomainError, UnableError
from ..series import Ring, Series

#: the largest number of factors a finite q-Pochhammer symbol may have
MAX_FACTORS = 10_000_000


def monomial_parts(s: Series) -> tuple[int | Fraction, Fraction] | None:
    """(c, e) when s is the exact monomial c q^e, else None.

    >>> from qseries.series import Series
    >>> monomial_parts(Series.monomial(3, c=-2))
    (-2, Fraction(3, 1))
    """
    if not s.is_exact or s.is_zero() or s.ring._length(s.poly) != 1:
        return None
    return s.ring.to_number(s.ring._coeff(s.poly, 0)), Fraction(s.start) + s.offset


def has_zero_factor(a: Series, t: int, n: int | None) -> bool:
    """True when one of the factors 1 - a q^(tj), 0 <= j < n (all j >= 0 for n = None), of
    (a;q^t)_n is exactly 1 - 1 = 0: a is the monomial q^(-tj) itself.  The product is then
    exactly 0, whatever the other factors are.

    >>> from qseries.series import Series
    >>> has_zero_factor(Series.monomial(-4), 2, 3), has_zero_factor(Series.monomial(-4), 2, 2)
    (True, False)
    """
    mono = monomial_parts(a)
    if mono is None or mono[0] != 1 or mono[1].denominator != 1 or mono[1] > 0:
        return False
    steps, rest = divmod(-int(mono[1]), t)
    return rest == 0 and (n is None or steps < n)


def euler_product(d: int, ring: Ring, order: int) -> Series:
    """(q^d; q^d)_inf modulo q^order from Euler's pentagonal number theorem,
    sum_k (-1)^k q^(d k(3k-1)/2) (see G. E. Andrews, The Theory of Partitions, 1976, ch. 1).

    >>> from qseries.series import ZZ
    >>> euler_product(2, ZZ, 11)
    1 - q^2 - q^4 + q^10 + O(q^11)
    """
    if d < 1:
        raise UnableError("(q^d;q^d)_inf needs d >= 1")
    if order <= 0:
        return Series.zero(ring, order)
    coeffs = [0] * order
    k = 0
    while True:
        e1 = d * k * (3 * k - 1) // 2
        if e1 >= order:
            break
        sign = -1 if k % 2 else 1
        coeffs[e1] = sign
        e2 = d * k * (3 * k + 1) // 2
        if k and e2 < order:
            coeffs[e2] = sign
        k += 1
    return Series.from_int_list(coeffs, ring, prec=order)


def triple_product_sum(a: int, m: int, ring: Ring, order: int) -> Series:
    """sum_{n=-inf}^{inf} (-1)^n q^(m n(n-1)/2 + a n) = (q^a, q^(m-a), q^m; q^m)_inf modulo
    q^order, for 0 < a < m (Jacobi's triple product; Andrews 1976, Thm. 2.8): O(sqrt(order))
    nonzero terms.

    >>> from qseries.series import ZZ
    >>> triple_product_sum(1, 3, ZZ, 8)   # (q, q^2, q^3; q^3)_inf = (q;q)_inf
    1 - q - q^2 + q^5 + q^7 + O(q^8)
    """
    if not 0 < a < m:
        raise UnableError("the triple product sum needs 0 < a < m")
    if order <= 0:
        return Series.zero(ring, order)
    coeffs = [0] * order
    for sign in (1, -1):
        n = 0 if sign == 1 else -1
        while True:
            e = m * n * (n - 1) // 2 + a * n
            if e >= order:
                break
            coeffs[e] += -1 if n % 2 else 1
            n += sign
    return Series.from_int_list(coeffs, ring, prec=order)


def theta_pair_parts(a: int, m: int, power: int, ring: Ring, order: int) -> tuple[Series, Series]:
    """(q^a, q^(m-a); q^m)_inf^power as a numerator and a denominator modulo q^order, both
    with constant term 1: by the triple product the pair is a sparse sum over
    (q^m;q^m)_inf, so neither part needs an inversion.

    >>> from qseries.series import ZZ
    >>> num, den = theta_pair_parts(1, 5, -1, ZZ, 12)
    >>> num, den
    (1 - q^5 - q^10 + O(q^12), 1 - q - q^4 + q^7 + O(q^12))
    """
    num = triple_product_sum(a, m, ring, order)
    den = euler_product(m, ring, order)
    if power < 0:
        num, den = den, num
        power = -power
    if power == 1:
        return num, den
    return num.power(power, order), den.power(power, order)


def theta_pair_power(a: int, m: int, power: int, ring: Ring, order: int) -> Series:
    """(q^a, q^(m-a); q^m)_inf^power by the triple product: a sparse sum divided by
    (q^m;q^m)_inf, instead of 2 order/m binomial multiplications.

    >>> from qseries.series import ZZ
    >>> slow = (pochhammer(Series.monomial(1), 5, None, 10)
    ...         * pochhammer(Series.monomial(4), 5, None, 10))
    >>> theta_pair_power(1, 5, -1, ZZ, 10) == slow.power(-1, 10)
    True
    """
    num, den = theta_pair_parts(a, m, power, ring, order)
    return (num * den.inverse()).truncate(order)


def _one(ring: Ring) -> Series:
    return Series.constant(1, ring)


def _times_factor(acc: Series, a: Series, mono: tuple | None, shift: int, invert: bool,
                  order: int | None) -> Series:
    """acc * (1 - a q^shift), or acc / (1 - a q^shift) when invert."""
    if mono is not None:
        c, e = mono
        e = e + shift
        if e.denominator == 1 and e >= 1:
            j = int(e)
            if invert:
                return acc.div_binomial(c, j, order)
            return acc.mul_binomial(c, j, order)
    factor = _one(acc.ring) - a.shift(shift)
    if order is None:
        return acc * factor
    if invert:
        vnum = acc.valuation if acc.valuation is not None else 0
        return (acc * factor.inverse(order=order - int(vnum))).truncate(order)
    return (acc * factor).truncate(order)


def pochhammer_euler(a: Series, t: int, order: int) -> Series | None:
    """(+-q^(kt); q^t)_inf modulo q^order from Euler's product (``euler_product``): the
    parameter +1 is (q^t;q^t)_inf / (q^t;q^t)_(k-1), the parameter -1 uses
    (-q^t;q^t)_inf = (q^2t;q^2t)_inf / (q^t;q^t)_inf, then k - 1 binomial divisions.  None
    when the parameter is not of that form.

    >>> from qseries.series import ZZ
    >>> pochhammer_euler(Series.monomial(2, ZZ, -1), 1, 6)      # (-q^2;q)_inf
    1 + q^2 + q^3 + q^4 + 2q^5 + O(q^6)
    >>> pochhammer_euler(Series.monomial(2, ZZ, 3), 1, 6) is None
    True
    """
    ring = a.ring
    mono = monomial_parts(a)
    sign = _sign(mono[0], ring) if mono is not None else None
    if sign is None or mono is None or mono[1].denominator != 1 or mono[1] < t or \
            mono[1] % t != 0:
        return None
    if sign == 1:
        acc = euler_product(t, ring, order)
    else:
        acc = (euler_product(2 * t, ring, order)
               * euler_product(t, ring, order).inverse()).truncate(order)
    for i in range(1, int(mono[1]) // t):
        if t * i >= order:
            break
        acc = acc.div_binomial(sign, t * i, order)
    return acc


def pochhammer_exp_log(a: Series, t: int, order: int) -> Series | None:
    """(c q^e; q^t)_inf modulo q^order as the exponential of its logarithm (``euler_log``
    and the ring's ``exp_integral``), for c = +-1, or any residue modulo p, and e >= 0.
    None when the parameter is not of that form or the ring has no exponential (a prime not
    above the order, extra variables).

    >>> from qseries.series import ZZ
    >>> pochhammer_exp_log(Series.monomial(1, ZZ), 2, 8)      # (q;q^2)_inf
    1 - q - q^3 + q^4 - q^5 + q^6 - q^7 + O(q^8)
    """
    ring = a.ring
    mono = monomial_parts(a)
    if mono is None or mono[1].denominator != 1 or mono[1] < 0:
        return None
    sign = _sign(mono[0], ring)
    # modulo p any number c is a residue, and c^m modulo p stays small
    c_exp = sign if sign is not None else (
        int(mono[0]) % ring.modulus if ring.modulus is not None and isinstance(mono[0], int)
        else None)
    if c_exp is None:
        return None
    e0 = int(mono[1])
    first = 1 - c_exp if e0 == 0 else 1        # the factor 1 - c q^0 is a number
    if first == 0:
        return None
    got = _euler_transform(c_exp, e0 or t, t, ring, order)
    if got is None:
        return None
    return got * first if first != 1 else got


def exp_log_factors(a: Series, t: int, order: int) -> int:
    """How many factors of (a; q^t)_inf lie below q^order for a monomial parameter (the
    measure the chooser compares with its threshold for ``pochhammer_exp_log``); 0 when the
    parameter is not a monomial with an integer exponent.

    >>> exp_log_factors(Series.monomial(3), 2, 11)
    4
    """
    mono = monomial_parts(a)
    if mono is None or mono[1].denominator != 1 or mono[1] < 0:
        return 0
    return max(int(order - mono[1]) // t, 0)


def pochhammer(a: Series, t: int, n: int | None, order: int) -> Series:
    """(a; q^t)_n modulo q^order factor by factor (exact when the result is a short
    polynomial): the reference the fast variants ``pochhammer_euler`` and
    ``pochhammer_exp_log`` are tested against.

    ``n = None`` is the infinite product; it needs val(a) > 0 or t > 0 to converge and stops
    when the remaining factors are 1 + O(q^order).

    >>> from qseries.series import Series, ZZ
    >>> q = Series.monomial(1, ZZ)
    >>> pochhammer(-q, 2, None, order=9)        # (-q;q^2)_inf
    1 + q + q^3 + q^4 + q^5 + q^6 + q^7 + 2q^8 + O(q^9)
    >>> pochhammer(q, 1, -1, order=4)           # (q;q)_-1 = 1/(1 - 1) is undefined
    Traceback (most recent call last):
    ...
    qseries.errors.DomainError: (a;q)_n has a factor 1 - 1 = 0 in a denominator
    """
    if t < 1:
        raise UnableError("the base of a q-Pochhammer symbol must be q^t with t >= 1")
    mono = monomial_parts(a)
    acc = _one(a.ring)
    if (n is None or n >= 0) and has_zero_factor(a, t, n):
        return Series.zero(a.ring)
    if n is None:
        va = a.valuation
        if a.is_zero():
            # a = 0 exactly: every factor is 1; a = O(q^p): every factor is 1 + O(q^p)
            return acc if a.prec is None else acc.limit_precision(min(a.prec, order))
        # factors 1 - a q^(tj) with negative valuation give the product valuation v < 0; the
        # factors left out are 1 + O(q^e), which only leave the product exact below
        # q^(e + v): so go on to e >= order - v
        v = _negative_valuation(va, t, None)
        j = 0
        while va + t * j < order - v:
            acc = _checked(acc, a, mono, t * j, False, order - v)
            j += 1
            if j > MAX_FACTORS:
                raise UnableError("too many factors in an infinite q-Pochhammer symbol")
        # the factors left out are 1 + O(q^(order - v)): the product is known below q^order
        if acc.is_zero() and acc.is_exact:
            return acc            # a factor 1 - 1: the product is exactly 0
        return acc.truncate(order).limit_precision(order)
    if n < -MAX_FACTORS:
        raise UnableError(f"a q-Pochhammer symbol with {abs(n)} factors is too large")
    if a.is_zero() and n != 0:
        # a = O(q^p) with p >= 1: every factor, and so the product, is 1 + O(q^p)
        if a.prec is None:
            return acc
        # factor j is 1 - O(q^(p + tj)); with n < 0 the factors j = n .. -1 count
        known = a.prec + (t * n if n < 0 else 0)
        if known < 1:
            raise UnableError(f"a q-Pochhammer parameter known only to O(q^{a.prec}) gives "
                              f"no information here")
        return acc.limit_precision(known)
    if n >= 0:
        # a short product of binomials stays an exact polynomial
        work: int | None = order
        if mono is not None and mono[1] >= 0 and mono[1] * n + t * n * (n - 1) // 2 < order:
            work = None
        count = n
        va = a.valuation
        if work is not None and va is not None:
            # factors 1 - a q^(tj) with val(a) + tj >= order - v are 1 modulo q^(order - v),
            # where v <= 0 is the valuation the factors with negative exponents give
            v = _negative_valuation(va, t, n)
            count = min(n, max(1, -((va - (order - v)) // t)))
        for j in range(count):
            acc = _checked(acc, a, mono, t * j, False, work)
        if count < n:
            acc = acc.limit_precision(order)
    else:
        acc = _negative_subscript(acc, a, mono, t, n, order)
    return acc.truncate(order)


def _sign(c: object, ring: Ring) -> int | None:
    """1 or -1 when the number c is that sign in the ring (p - 1 is -1 modulo p), else None."""
    if isinstance(c, bool) or not isinstance(c, int):
        return None
    for sign in (1, -1):
        if ring.coerce(c) == ring.coerce(sign):
            return sign
    return None


def euler_log(c: int, a: int, t: int, order: int, modulus: int | None = None) -> list[int]:
    """s[k] = k [q^k] log prod_{j>=0} (1 - c q^(a+tj)) for k < order and a, t >= 1:
    log(1 - c q^x) = -sum_m c^m q^(mx)/m, so s[k] = -sum x c^(k/x) over the divisors x of k
    with x = a (mod t), x >= a.  c is +-1, or any residue modulo ``modulus``.

    >>> euler_log(1, 1, 1, 7)      # -sigma(k): (q;q)_inf
    [0, -1, -3, -4, -7, -6, -12]
    >>> euler_log(2, 1, 1, 4, modulus=101)      # (2q;q)_inf modulo 101
    [0, -2, -8, -14]
    """
    s = [0] * max(order, 0)
    powers: list[int] = []
    if c not in (1, -1):
        if modulus is None:
            raise ValueError("euler_log needs c = +-1 or a modulus")
        powers = [1] * max(order, 1)     # powers[m] = c^m modulo the modulus
        for m in range(1, len(powers)):
            powers[m] = powers[m - 1] * c % modulus
    for x in range(a, order, t):
        if c == 1:
            s[x::x] = [v - x for v in s[x::x]]
        elif c == -1:       # c^m = (-1)^m: + x for odd m, - x for even m
            s[x::2 * x] = [v + x for v in s[x::2 * x]]
            s[2 * x::2 * x] = [v - x for v in s[2 * x::2 * x]]
        else:
            seg = s[x::x]           # only the powers it needs (not a copy of them all)
            s[x::x] = [v - x * w for v, w in zip(seg, powers[1:len(seg) + 1], strict=True)]
    return s


def _euler_transform(c: int, a: int, t: int, ring: Ring, order: int) -> Series | None:
    """(c q^a; q^t)_inf modulo q^order as exp of its logarithm (None where the ring has no
    exponential: a prime not above the order, extra variables)."""
    poly = ring._exp_integral(euler_log(c, a, t, order, ring.modulus), order)
    if poly is None:
        return None
    return Series(ring, poly, 0, 0, order)


def _negative_subscript(acc: Series, a: Series, mono: tuple | None, t: int, n: int,
                        order: int) -> Series:
    """acc * (a;q^t)_n for n < 0, that is acc / prod_{j=n}^{-1} (1 - a q^(tj)).

    A factor with exponent e = val(a) + tj < 0 raises the valuation by -e once inverted, so
    when those add up to the order the result is O(q^order) at once; factors with
    e >= order are 1 modulo q^order and are left out (never a loop over a huge n)."""
    va = a.valuation
    if va is None:
        return acc.limit_precision(order) if n else acc
    va = Fraction(va)
    # j with va + t j < 0 are those below ceil(-va/t) = -floor(va/t)
    top_neg = min(0, int(-(va // t)))
    neg_lo, neg_hi = n, max(n, top_neg)
    count_neg = neg_hi - neg_lo
    # the factor with exponent 0 is 1 - c + O(q): zero (c = 1) or of positive valuation
    # unless c != 1 is known, and then the shortcut below does not apply
    j0 = -va / t
    if j0.denominator == 1 and n <= j0 < 0:
        c0 = a.coefficient(va) if a.precision is None or a.precision > va else None
        if mono is not None and mono[0] == 1:
            raise DomainError("(a;q)_n has a factor 1 - 1 = 0 in a denominator")
        if c0 is None or c0 == 1:
            count_neg = 0        # no shortcut: the loop below handles every factor
    if count_neg > 0:
        e_first, e_last = va + t * neg_lo, va + t * (neg_hi - 1)
        raise_by = -(e_first + e_last) * count_neg / 2
        vacc = acc.valuation if acc.valuation is not None else 0
        if raise_by + Fraction(vacc) >= order:
            return Series.zero(acc.ring, order)
    # factors with exponent >= order are 1 + O(q^order)
    first_big = int(-((va - order) // t))        # least j with va + t j >= order
    hi = min(0, max(n, first_big))
    for j in range(n, hi):
        acc = _checked(acc, a, mono, t * j, True, order)
    return acc.limit_precision(order) if hi < 0 else acc



def _negative_valuation(va: int | Fraction, t: int, n: int | None) -> Fraction:
    """Sum of va + t*i over the factors i (i < n when n is given) where it is negative: the
    valuation those factors 1 - a q^(ti) give the product."""
    va = Fraction(va)
    if va >= 0:
        return Fraction(0)
    k = -((va) // t)          # i < k  <=>  va + t i < 0  (ceil(-va / t))
    if n is not None:
        k = min(k, n)
    if k > MAX_FACTORS:
        raise UnableError(f"a q-Pochhammer symbol with {k} factors of negative valuation is "
                          f"too large")
    return k * va + t * k * (k - 1) // 2


def _checked(acc: Series, a: Series, mono: tuple | None, shift: int, invert: bool,
             order: int | None) -> Series:
    if mono is not None and mono[0] == 1 and mono[1] + shift == 0:
        if invert:
            raise DomainError("(a;q)_n has a factor 1 - 1 = 0 in a denominator")
        return Series.zero(acc.ring)
    return _times_factor(acc, a, mono, shift, invert, order)


def gaussian_binomial(n: int, k: int, ring: Ring, order: int) -> Series:
    """The q-binomial coefficient [n, k]_q = (q;q)_n / ((q;q)_k (q;q)_(n-k)); 0 unless
    0 <= k <= n.  Exact when its degree k(n-k) is below ``order``.

    >>> from qseries.series import ZZ
    >>> gaussian_binomial(4, 2, ZZ, 100)
    1 + q + 2q^2 + q^3 + q^4
    """
    if k < 0 or k > n:
        return Series.zero(ring)
    k = min(k, n - k)
    if k > MAX_FACTORS:
        raise UnableError("q-binomial coefficient too large")
    degree = k * (n - k)
    work = min(order, degree + 1)
    acc = _one(ring)
    for i in range(1, k + 1):
        acc = acc.mul_binomial(1, n - k + i, work).div_binomial(1, i, work)
    if degree < order:
        return Series(ring, acc.poly, acc.start, 0, None)
    return acc
