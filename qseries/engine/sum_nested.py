"""The ``nested`` strategy for sums: a sum whose consecutive terms have a ratio
r_i = c_i q^(d_i) prod (1 - b q^x)^(+-1) (numbers, powers of q, q-Pochhammer symbols with
subscripts linear in the variable) is evaluated from the innermost term outwards,

    sum_i t_i = t_0 (1 + r_1 (1 + r_2 (1 + ... (1 + r_L)))),

each level modulo q^(w - v_i) (v_i the valuation of t_i / t_0, so the precision decreases
inwards), each step a shift, a scalar multiplication and O(N) binomial multiplications or
divisions on the ring's polynomials, with no series objects in between.  It is meant for
sums of about N terms whose binomials' exponents add up to far more than the order (Euler's
sum q^n/(q;q)_n, the q-binomial theorem, Heine-type sums), where binary splitting's tree is
dense and ``stepping`` pays for a series object and an addition of a dense term per term.

Runs of levels with no binomial below their precision and multiplier 1 (the outer half of
Euler's sum) are added in one pass as a sparse polynomial.  Over ZZ, from
``chooser.NESTED_CRT_ORDER`` on, the size of the coefficients is bounded first
(``majorant_bits``: each ratio replaced by its majorant |c| q^d prod (1 + |b| q^x) or
prod 1/(1 - |b| q^x), whose value at a real 0 < rho < 1 over rho^(w-1) bounds every
coefficient below q^w); above ``chooser.WORD_BITS`` (numbers that no longer fit a
machine word, where FLINT's integer arithmetic costs a hundred times more per coefficient)
the levels run modulo enough word-size primes (``CRT_PRIMES``) and the coefficients are
put together by the Chinese remainder theorem, exactly.

>>> from qseries.lang import parse
>>> from qseries.engine import Evaluator
>>> Evaluator(strategies=["nested"]).evaluate(parse("sum_{n>=0} q^n/(q;q)_n"), 8)
1 + q + 2q^2 + 3q^3 + 5q^4 + 7q^5 + 11q^6 + 15q^7 + O(q^8)
"""

from __future__ import annotations

import math
from fractions import Fraction
from typing import TYPE_CHECKING, Any

from ..backend import is_prime
from ..errors import QSeriesError
from ..series import GF, QQ, ZZ, Series
from .chooser import NESTED_CRT_ORDER, WORD_BITS
from .sum_splitting import Ratio, consecutive_ratios

if TYPE_CHECKING:
    from .evaluator import Evaluator
    from .sums import SumPlan


def sum_nested(ev: Evaluator, plan: SumPlan) -> Series | None:
    """The sum (with its constant factors) by nested evaluation; None when the terms do not
    have the shape (a ratio that is not c q^d times binomials, a coefficient the ring
    cannot hold as a number)."""
    ring = ev.ring
    if not (ring.int_coefficients or ring is QQ):
        return None            # coefficients in extra variables: stepping handles those
    got = consecutive_ratios(ev, plan.node, plan.ks, plan.env, plan.target, plan.sign,
                             plan.scalars, plan.steppable, plan.shifts)
    if got is None:
        return None
    if isinstance(got, Series):
        return plan.finish(got.limit_precision(plan.target))
    term_a, w, ratios = got
    # v_i: the valuation of t_i / t_0; levels with v_i >= w add nothing modulo q^w
    last = 0
    v = 0
    for i, (d, _, _) in enumerate(ratios, start=1):
        v += d
        if v >= w:
            break
        last = i
    levels = [0] * (last + 1)          # levels[i] = v_i
    for i in range(1, last + 1):
        levels[i] = levels[i - 1] + ratios[i - 1][0]
    try:
        if ring is ZZ and w >= NESTED_CRT_ORDER:
            bits = majorant_bits(ratios, levels, w, last)
            if bits > WORD_BITS:
                inner = ring.poly_from_ints(nest_crt(ratios, levels, w, last, bits))
            else:
                inner = nest(ring, ratios, levels, w, last)
        else:
            inner = nest(ring, ratios, levels, w, last)
    except (QSeriesError, ArithmeticError, TypeError, ValueError):
        return None            # a number or binomial's coefficient the ring cannot hold
    nested = Series(ring, ring._truncate(inner, w), 0, 0, w)
    value = (term_a * nested).truncate(plan.target).limit_precision(plan.target)
    return plan.finish(value)


def nest(ring: Any, ratios: list[Ratio], levels: list[int], w: int, last: int) -> Any:
    """1 + r_1 (1 + r_2 (... (1 + r_last))) on the ring's polynomials, level i - 1 modulo
    q^(w - levels[i - 1]) (``levels[i]``: the valuation of r_1 ... r_i); ArithmeticError
    when a number is not in the ring (a fraction over ZZ, a denominator p over GF(p)).

    >>> from fractions import Fraction
    >>> from qseries.series import ZZ
    >>> ratios = [(1, Fraction(1), [(1, i, -1)]) for i in range(1, 6)]   # q/(1 - q^i)
    >>> ZZ.coefficients(nest(ZZ, ratios, [0, 1, 2, 3, 4, 5], 6, 5))     # 1/(q;q)_inf
    [1, 1, 2, 3, 5, 7]
    """
    numbers = [1 if coef == 1 else _multiplier(ring, coef) for _, coef, _ in ratios[:last]]
    inner = ring.poly_from_ints([1])
    i = last
    while i > 0:
        # levels j+1 .. i with multiplier 1 and no binomial below their precision: together
        # 1 + q^(v_(j+1) - v_j) (1 + ...) is a sparse polynomial plus inner shifted, one pass
        j = i
        while j > 0 and numbers[j - 1] == 1 and \
                all(x >= w - levels[j - 1] for _, x, _ in ratios[j - 1][2]):
            j -= 1
        if i - j >= 2:
            n = w - levels[j]
            top = levels[i] - levels[j]
            plain = [0] * top
            for k in range(j, i):
                plain[levels[k] - levels[j]] += 1
            tail = ring._truncate(inner, n - top) if ring._length(inner) > n - top else inner
            inner = ring._shift_up(tail, top) + ring.poly_from_ints(plain)
            i = j
            continue
        d, _, binoms = ratios[i - 1]
        n = w - levels[i - 1]           # the precision of level i - 1
        p = ring._truncate(inner, n - d) if ring._length(inner) > n - d else inner
        if d:
            p = ring._shift_up(p, d)
        cc = numbers[i - 1]
        if cc != 1:
            p = p * cc
        for b, x, times in binoms:
            if x >= n:
                continue
            for _ in range(abs(times)):
                p = ring._binomial_mul(p, b, x, n) if times > 0 else \
                    ring._binomial_div(p, b, x, n)
        inner = ring._add_one_owned(p)     # p is this loop's own polynomial
        i -= 1
    return inner


def majorant_bits(ratios: list[Ratio], levels: list[int], w: int, last: int) -> float:
    """An upper bound for log2 |a_m| over the coefficients a_m (m < w) of
    1 + r_1 (1 + r_2 (... (1 + r_last))) with its binomials of exponent below each level's
    precision (the polynomial :func:`nest` computes modulo q^w): each ratio
    c q^d prod (1 - b q^x)^(+-1) is replaced by its majorant |c| q^d prod (1 + |b| q^x)
    or prod 1/(1 - |b| q^x), whose nested value M has nonnegative coefficients at least
    |a_m|, so |a_m| <= M(rho) / rho^(w-1) for any 0 < rho < 1; rho = e^(-s) is chosen by a
    golden-section search on log s (the bound is convex in s), computed with logarithms,
    with a margin for rounding.

    >>> from fractions import Fraction
    >>> ratios = [(1, Fraction(1), [(1, i, -1)]) for i in range(1, 400)]   # Euler's sum
    >>> from qseries.backend import partitions_p
    >>> bits = majorant_bits(ratios, list(range(400)), 400, 399)
    >>> partitions_p(399).bit_length() <= bits <= partitions_p(399).bit_length() + 12
    True
    """
    logc: list[float] = []
    pieces: list[list[tuple[float, int, int]]] = []
    for i in range(1, last + 1):
        d, coef, binoms = ratios[i - 1]
        logc.append(math.log(abs(coef.numerator)) - math.log(coef.denominator)
                    if coef else -math.inf)
        n = w - levels[i - 1]
        pieces.append([(abs(float(b)), x, times) for b, x, times in binoms if x < n])
    ds = [ratios[i - 1][0] for i in range(1, last + 1)]

    def log_bound(s: float) -> float:
        big = 0.0                                    # log M(rho), innermost level first
        for i in range(last - 1, -1, -1):
            lr = logc[i] - ds[i] * s
            for b, x, times in pieces[i]:
                y = b * math.exp(-s * x)
                if times > 0:
                    lr += times * math.log1p(y)
                elif y >= 1.0:
                    return math.inf
                else:
                    lr -= times * -math.log1p(-y)
            z = lr + big
            big = z + math.log1p(math.exp(-z)) if z > 0 else math.log1p(math.exp(z))
        return big + (w - 1) * s

    lo, hi = math.log(0.5 / w), math.log(8.0)
    g = (math.sqrt(5) - 1) / 2
    a, b = hi - g * (hi - lo), lo + g * (hi - lo)
    fa, fb = log_bound(math.exp(a)), log_bound(math.exp(b))
    for _ in range(14):
        if fa <= fb:
            hi, b, fb = b, a, fa
            a = hi - g * (hi - lo)
            fa = log_bound(math.exp(a))
        else:
            lo, a, fa = a, b, fb
            b = lo + g * (hi - lo)
            fb = log_bound(math.exp(b))
    best = min(fa, fb)
    # rounding: each level's logarithm is off by a few ulps
    return best / math.log(2) * (1 + 1e-9) + 1e-12 * last + 4


def _crt_primes() -> list[int]:
    out: list[int] = []
    n = 2**62 - 1
    while len(out) < 64:
        if is_prime(n):
            out.append(n)
        n -= 2
    return out


#: the word-size primes of the exact evaluation modulo primes (largest below 2^62 first)
CRT_PRIMES: list[int] = []


def nest_crt(ratios: list[Ratio], levels: list[int], w: int, last: int, bits: float
             ) -> list[int]:
    """The coefficients of :func:`nest` over ZZ, from its values modulo word-size primes
    whose product exceeds 2^(bits + 1) (``bits`` bounds log2 of every coefficient, so the
    symmetric residues are the integers), by Garner's form of the Chinese remainder theorem.

    >>> from fractions import Fraction
    >>> ratios = [(1, Fraction(1), [(1, i, -1)]) for i in range(1, 300)]
    >>> got = nest_crt(ratios, list(range(300)), 300, 299, 250.0)
    >>> from qseries.backend import partitions_p
    >>> got == [partitions_p(m) for m in range(300)]
    True
    """
    if not CRT_PRIMES:
        CRT_PRIMES.extend(_crt_primes())
    ps: list[int] = []
    modulus = 1
    for p in CRT_PRIMES:
        if modulus.bit_length() > bits + 2:
            break
        ps.append(p)
        modulus *= p
    if modulus.bit_length() <= bits + 2:
        raise ArithmeticError("the coefficients need more primes than kept")
    x: list[int] = []
    m = 1
    for p in ps:
        ring = GF(p)
        r = [int(c) for c in ring._truncate(nest(ring, ratios, levels, w, last), w).coeffs()]
        r += [0] * (w - len(r))
        if not x:
            x, m = r, p
            continue
        inv = pow(m % p, -1, p)
        x = [xi + m * (((ri - xi) * inv) % p) for xi, ri in zip(x, r, strict=True)]
        m *= p
    half = m // 2
    return [xi - m if xi > half else xi for xi in x]


def _multiplier(ring: Any, c: Fraction) -> Any:
    """c as a scalar the ring's polynomials can be multiplied by (ZZ: an integer only)."""
    if ring is ZZ:
        if c.denominator != 1:
            raise ArithmeticError("a fraction over ZZ")
        return c.numerator
    return ring._multiplier(c)
