"""Recognise an expression as a linear combination of eta quotients times one power of q,
from the structure of its syntax tree (never from its coefficients).

Each term is rewritten exactly into c q^s prod (1 - q^n)^(E(n)), with E periodic (plus
finitely many corrections), by these rules:

- eta(q^d) = q^(d/24) (q^d;q^d)_inf (the registry's definition);
- (q^a;q^m)_inf and (-q^a;q^m)_inf = (q^(2a);q^(2m))_inf / (q^a;q^m)_inf, finite
  (q^a;q^m)_n as finitely many factors, and prod_{n>=n0} (1 +- q^(an+b))^k the same way;
- a theta series sum_{n=-inf}^{inf} s^n q^(A n^2 + B n + C) (s = +-1, after shifting n so
  that -A < B <= A) by Jacobi's triple product in Ramanujan's form
  f(a, b) = (-a;ab)_inf (-b;ab)_inf (ab;ab)_inf (B. C. Berndt, Ramanujan's Notebooks, Part
  III, Springer 1991, Chapter 16, Entry 19), with a = s q^(A+B), b = s q^(A-B); a sum over
  n >= n0 that is symmetric about n0 - 1/2 is half the bilateral sum (so psi(q), f(a,b),
  phi, theta_2, theta_3, theta_4 are all recognised from their definitions);
- sums, differences, products, integer powers, and division by a single term.

The product part prod (1 - q^n)^(E(n)) with E of period M is an eta quotient
prod_{d | M} (q^d;q^d)_inf^(r_d) exactly when E(n) depends on gcd(n, M) alone, and then
E(g) = sum_{d | g} r_d, so r_d = sum_{g | d} mu(d/g) E(g) (Moebius inversion).  Since
(q^d;q^d)_inf = q^(-d/24) eta(d tau), each term is c q^t prod eta(d tau)^(r_d).

>>> rec = recognise(parse("theta_3(q)"))
>>> [(t.coefficient, t.eta.text(), t.shift) for t in rec.terms]
[(Fraction(1, 1), 'eta(q)^-2 eta(q^2)^5 eta(q^4)^-2', Fraction(0, 1))]
>>> recognise(parse("sum_{n>=0} q^(n^2)/(q;q)_n")).reason[:40]
'the sum over n is not a theta series: it'
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction

from ..lang import Node, parse
from ..lang.ast import (
    BigO,
    BigOp,
    BinOp,
    Call,
    Dissect,
    Name,
    Neg,
    Num,
    Poch,
    Q,
    Var,
    children,
    free_names,
    sum_spine,
)
from .eta import EtaQuotient

__all__ = ["Recognition", "RecognisedTerm", "parse", "recognise"]

#: the longest period of the exponents E(n) handled (the lcm of the moduli)
MAX_PERIOD = 5040
#: the most terms a combination may have (powers of sums multiply them)
MAX_TERMS = 256
#: the largest power |k| taken of a sum of several terms
MAX_SUM_POWER = 16
#: how many terms of a one-sided theta series may lie outside its symmetric half
MAX_SHIFT_TERMS = 1000
#: the most finite factors (1 - q^n) a term may carry
MAX_FINITE = 10_000
#: the largest number of bits of a constant raised to a power
MAX_CONSTANT_BITS = 100_000
#: the largest |exponent| of one factor
MAX_EXPONENT = 10**6


class _Refusal(Exception):
    """Why an expression is not recognised (internal; turned into ``Recognition.reason``)."""


Poly = tuple[Fraction, ...]          # coefficients c0, c1, c2, ... of a polynomial in n

# ---------------------------------------------------------------- products of (1 - q^n)


@dataclass(frozen=True)
class _Product:
    """q^shift prod_{n>=1} (1 - q^n)^(E(n)) prod (1 - q^n)^(finite[n]); E has period
    ``period``, E(n) = exps[(n - 1) % period]."""

    shift: Fraction
    period: int
    exps: tuple[int, ...]
    finite: tuple[tuple[int, int], ...]

    def __mul__(self, other: _Product) -> _Product:
        p = self.period * other.period // math.gcd(self.period, other.period)
        if p > MAX_PERIOD:
            raise _Refusal(f"the exponents of the product would have a period above "
                           f"{MAX_PERIOD}")
        exps = [self.exps[i % self.period] + other.exps[i % other.period] for i in range(p)]
        fin = dict(self.finite)
        for n, e in other.finite:
            fin[n] = fin.get(n, 0) + e
        return _make(self.shift + other.shift, exps, fin)

    def __pow__(self, k: int) -> _Product:
        return _make(self.shift * k, [e * k for e in self.exps],
                     {n: e * k for n, e in self.finite})


def _make(shift: Fraction, exps: list[int], finite: dict[int, int]) -> _Product:
    if any(abs(e) > MAX_EXPONENT for e in exps) or any(abs(e) > MAX_EXPONENT
                                                       for e in finite.values()):
        raise _Refusal(f"an exponent of the product is above {MAX_EXPONENT}")
    p = len(exps)
    least = p
    for d in range(1, p + 1):          # the minimal period
        if p % d == 0 and all(exps[i] == exps[i % d] for i in range(p)):
            least = d
            break
    return _Product(Fraction(shift), least, tuple(exps[:least]),
                    tuple(sorted((n, e) for n, e in finite.items() if e)))


_ONE = _make(Fraction(0), [0], {})


def _q_power(e: Fraction) -> _Product:
    return _make(e, [0], {})


def _poch_inf(a: int, m: int) -> _Product:
    """(q^a;q^m)_inf for integers a, m >= 1."""
    if m > MAX_PERIOD:
        raise _Refusal(f"a product (q^a;q^m)_inf with m = {m} above {MAX_PERIOD}")
    if a // m > MAX_FINITE:
        raise _Refusal(f"a product (q^a;q^m)_inf with a/m above {MAX_FINITE}")
    a0 = (a - 1) % m + 1
    exps = [1 if n % m == a0 % m else 0 for n in range(1, m + 1)]
    finite = {n: -1 for n in range(a0, a, m)}       # factors below q^a are not in it
    return _make(Fraction(0), exps, finite)


def _finite_factor(n: int) -> _Product:
    return _make(Fraction(0), [0], {n: 1})


# ---------------------------------------------------------------- combinations

Combination = dict[_Product, Fraction]


def _single(p: _Product, c: Fraction = Fraction(1)) -> Combination:
    return {p: Fraction(c)} if c else {}


def _add(x: Combination, y: Combination, sign: int = 1) -> Combination:
    out = dict(x)
    for p, c in y.items():
        v = out.get(p, Fraction(0)) + sign * c
        if v:
            out[p] = v
        else:
            out.pop(p, None)
    return out


def _mul(x: Combination, y: Combination) -> Combination:
    if len(x) * len(y) > MAX_TERMS:
        raise _Refusal(f"the expansion has more than {MAX_TERMS} terms")
    out: Combination = {}
    for p, c in x.items():
        for p2, c2 in y.items():
            out = _add(out, {p * p2: c * c2})
    return out


def _power(x: Combination, k: int) -> Combination:
    if len(x) == 1:
        [(p, c)] = x.items()
        return {p ** k: _constant_power(c, k)}
    if not x:
        if k <= 0:
            raise _Refusal("a power 0^k with k <= 0")
        return {}
    if k < 0:
        raise _Refusal("a sum of several terms is raised to a negative power (division by a "
                       "sum is not recognised)")
    if k > MAX_SUM_POWER:
        raise _Refusal(f"a sum of several terms is raised to a power above {MAX_SUM_POWER}")
    out = _single(_ONE)
    for _ in range(k):
        out = _mul(out, x)
    return out


# ---------------------------------------------------------------- monomials and polynomials


def _constant(node: Node) -> Fraction | None:
    """The value of a node built from numbers alone (None otherwise)."""
    mono = _monomial(node)
    if mono is None or mono[1] != 0:
        return None
    return mono[0]


def _monomial(node: Node) -> tuple[Fraction, Fraction] | None:
    """(c, e) when the node is c q^e built from numbers and q alone."""
    if isinstance(node, Num):
        return Fraction(node.value), Fraction(0)
    if isinstance(node, Q):
        return Fraction(1), Fraction(1)
    if isinstance(node, Neg):
        inner = _monomial(node.operand)
        return None if inner is None else (-inner[0], inner[1])
    if isinstance(node, BinOp):
        if node.op not in "*/^":
            return None
        left = _monomial(node.left)
        right = _monomial(node.right)
        if left is None or right is None:
            return None
        if node.op == "*":
            return left[0] * right[0], left[1] + right[1]
        if node.op == "/" and right[0] != 0:
            return left[0] / right[0], left[1] - right[1]
        if node.op == "^" and right[1] == 0:
            k = right[0]
            if k.denominator == 1 and abs(k) <= MAX_EXPONENT and (left[0] != 0 or k > 0):
                return _constant_power(left[0], int(k)), left[1] * k
            if left[0] == 1 and abs(k) <= MAX_EXPONENT:
                return Fraction(1), left[1] * k
        return None
    return None


def _constant_power(c: Fraction, k: int) -> Fraction:
    if c in (1, -1) or (c == 0 and k > 0):
        return c ** (k % 2 if c == -1 else 1)
    bits = max(c.numerator.bit_length(), c.denominator.bit_length())
    if bits * abs(k) > MAX_CONSTANT_BITS:
        raise _Refusal(f"a constant raised to the power {k} would have more than "
                       f"{MAX_CONSTANT_BITS} bits")
    return c ** k


def _padd(x: Poly, y: Poly, sign: int = 1) -> Poly:
    n = max(len(x), len(y))
    out = [(x[i] if i < len(x) else 0) + sign * (y[i] if i < len(y) else 0) for i in range(n)]
    while out and out[-1] == 0:
        out.pop()
    return tuple(Fraction(c) for c in out)


def _pmul(x: Poly, y: Poly) -> Poly:
    if not x or not y:
        return ()
    out = [Fraction(0)] * (len(x) + len(y) - 1)
    for i, a in enumerate(x):
        for j, b in enumerate(y):
            out[i + j] += a * b
    while out and out[-1] == 0:
        out.pop()
    if len(out) > 3:
        raise _Refusal("an exponent is a polynomial of degree above 2 in the summation index")
    return tuple(out)


def _pval(x: Poly, n: int) -> Fraction:
    return sum((c * n ** i for i, c in enumerate(x)), Fraction(0))


def _poly(node: Node, var: str) -> Poly | None:
    """The node as a polynomial in ``var`` of degree <= 2 (None when it is not one)."""
    if isinstance(node, Num):
        return _padd((Fraction(node.value),), ())
    if isinstance(node, Name):
        return (Fraction(0), Fraction(1)) if node.name == var else None
    if isinstance(node, Neg):
        inner = _poly(node.operand, var)
        return None if inner is None else _padd((), inner, -1)
    if isinstance(node, BinOp):
        left, right = _poly(node.left, var), _poly(node.right, var)
        if left is None or right is None:
            return None
        if node.op in "+-":
            return _padd(left, right, 1 if node.op == "+" else -1)
        if node.op == "*":
            return _pmul(left, right)
        if node.op == "/" and len(right) == 1:
            return tuple(c / right[0] for c in left)
        if node.op == "^" and len(right) <= 1:
            k = right[0] if right else Fraction(0)
            if k.denominator == 1 and 0 <= k <= 2:
                out: Poly = (Fraction(1),)
                for _ in range(int(k)):
                    out = _pmul(out, left)
                return out
    return None


#: a term of a sum: constant * (-1)^(sign(n)) * q^(exponent(n))
_Term = tuple[Fraction, Poly, Poly]


def _sum_term(node: Node, var: str) -> _Term | None:
    """The term of a sum over ``var`` as c (-1)^(S(n)) q^(Q(n)) (None when it is not)."""
    if isinstance(node, Num):
        return Fraction(node.value), (), ()
    if isinstance(node, Q):
        return Fraction(1), (), (Fraction(1),)
    if isinstance(node, Neg):
        inner = _sum_term(node.operand, var)
        return None if inner is None else (-inner[0], inner[1], inner[2])
    if isinstance(node, BinOp) and node.op in "*/":
        left, right = _sum_term(node.left, var), _sum_term(node.right, var)
        if left is None or right is None or (node.op == "/" and right[0] == 0):
            return None
        sign = 1 if node.op == "*" else -1
        c = left[0] * right[0] if sign == 1 else left[0] / right[0]
        return c, _padd(left[1], right[1], sign), _padd(left[2], right[2], sign)
    if isinstance(node, BinOp) and node.op == "^":
        exp = _poly(node.right, var)
        if exp is None:
            return None
        if len(exp) <= 1:                                # a constant power
            k = exp[0] if exp else Fraction(0)
            base = _sum_term(node.left, var)
            if base is None or k.denominator != 1 or abs(k) > MAX_EXPONENT:
                return None
            if base[0] == 0 and k <= 0:
                return None
            kk = int(k)
            return (_constant_power(base[0], kk), tuple(c * kk for c in base[1]),
                    tuple(c * kk for c in base[2]))
        mono = _monomial(node.left)                     # (c q^e)^(P(n))
        if mono is None or mono[0] not in (1, -1):
            return None
        sign_poly = exp if mono[0] == -1 else ()
        return Fraction(1), sign_poly, tuple(mono[1] * c for c in exp)
    return None


def _integer_valued(p: Poly) -> bool:
    # a polynomial of degree <= 2 is integer-valued iff it is at three consecutive integers
    return all(_pval(p, n).denominator == 1 for n in (0, 1, 2))


def _signs(p: Poly) -> list[int]:
    """(-1)^(P(n)) for n = 0, 1, 2, 3 (the pattern has period dividing 4)."""
    return [-1 if int(_pval(p, n)) % 2 else 1 for n in range(4)]


def _follows_power(sig: list[int]) -> bool:
    """Whether the signs for n = 0..3 are sig[0] s^n for s = +-1."""
    return sig[0] * sig[1] == sig[1] * sig[2] == sig[2] * sig[3]


def _negate_q(p: _Product, g: int = 1) -> tuple[_Product, int]:
    """(p', sign) with p(q -> -q on q^g) = sign * p'(q), for a product whose shift is a
    multiple of g: a factor 1 - q^n with g | n becomes 1 - (-1)^(n/g) q^n, which is
    (1 - q^(2n))/(1 - q^n) for n/g odd."""
    if p.shift.denominator != 1 or int(p.shift) % g:
        raise _Refusal("q^g -> -q^g in a product with a power of q not a multiple of q^g")
    m = p.period
    period = m * 4 * g // math.gcd(m, 4 * g)
    if period > MAX_PERIOD:
        raise _Refusal(f"the exponents of the product would have a period above {MAX_PERIOD}")
    exps = []
    for n in range(1, period + 1):
        e = p.exps[(n - 1) % m]
        if n % g:
            exps.append(e)
        elif (n // g) % 2:
            exps.append(-e)
        else:
            half = n // 2
            exps.append(e + (p.exps[(half - 1) % m] if (half // g) % 2 else 0))
    fin: dict[int, int] = {}
    for n, e in p.finite:
        if n % g == 0 and (n // g) % 2:
            fin[n] = fin.get(n, 0) - e
            fin[2 * n] = fin.get(2 * n, 0) + e
        else:
            fin[n] = fin.get(n, 0) + e
    sign = -1 if (int(p.shift) // g) % 2 else 1
    return _make(p.shift, exps, fin), sign


def _theta(s: int, a2: Fraction, b: Fraction) -> Combination:
    """sum_{n=-inf}^{inf} s^n q^(A n^2 + B n) by Jacobi's triple product."""
    k = math.floor((a2 - b) / (2 * a2))             # shift n so that -A < B <= A
    b2 = b + 2 * a2 * k
    front = Fraction(s) ** k
    shift = a2 * k * k + b * k
    m, u, v = 2 * a2, a2 + b2, a2 - b2
    if any(x.denominator != 1 for x in (m, u, v)):
        raise _Refusal(f"the theta series sum s^n q^({a2} n^2 + {b} n) has exponents that "
                       f"Jacobi's triple product does not write with integer powers of q")
    mm, uu, vv = int(m), int(u), int(v)
    out = _single(_q_power(shift), front)
    out = _mul(out, _signed_poch(-s, uu, mm))
    out = _mul(out, _signed_poch(-s, vv, mm))
    return _mul(out, _single(_poch_inf(mm, mm)))


def _signed_poch(c: int, a: int, m: int, length: int | None = None) -> Combination:
    """(c q^a; q^m)_length for c = +-1, a >= 0, m >= 1 (length None: infinite)."""
    if a == 0:
        if c == 1:
            return {}                                   # the factor (1 - 1) = 0
        rest = _signed_poch(c, m, m, None if length is None else length - 1)
        return {p: 2 * v for p, v in rest.items()} if length != 0 else _single(_ONE)
    if length is not None:
        out = _ONE
        for j in range(length):
            n = a + j * m
            out = out * (_finite_factor(n) if c == 1 else
                         _finite_factor(2 * n) * _finite_factor(n) ** -1)
        return _single(out)
    if c == 1:
        return _single(_poch_inf(a, m))
    return _single(_poch_inf(2 * a, 2 * m) * _poch_inf(a, m) ** -1)


# ---------------------------------------------------------------- the walk


def _walk(node: Node) -> Combination:
    mono = _monomial(node)
    if mono is not None:
        if mono[0] == 0:
            return {}
        return _single(_q_power(mono[1]), mono[0])
    if isinstance(node, Neg):
        return {p: -c for p, c in _walk(node.operand).items()}
    if isinstance(node, BinOp):
        if node.op in "+-":
            first, rest = sum_spine(node)       # long sums are deep left spines: no recursion
            acc = _walk(first)
            for op, term in rest:
                for p, c in _walk(term).items():
                    v = acc.get(p, Fraction(0)) + (c if op == "+" else -c)
                    if v:
                        acc[p] = v
                    else:
                        acc.pop(p, None)
            return acc
        if node.op == "*":
            return _mul(_walk(node.left), _walk(node.right))
        if node.op == "/":
            den = _walk(node.right)
            if len(den) != 1:
                raise _Refusal("division by a sum of terms (or by 0) is not recognised"
                               if den else "division by 0")
            [(p, c)] = den.items()
            return _mul(_walk(node.left), {p ** -1: 1 / c})
        if node.op == "^":
            k = _constant(node.right)
            if k is None or k.denominator != 1:
                raise _Refusal("only integer powers of a series are recognised")
            if abs(k) > MAX_EXPONENT:
                raise _Refusal(f"a power above {MAX_EXPONENT}")
            return _power(_walk(node.left), int(k))
    if isinstance(node, Poch):
        return _poch(node)
    if isinstance(node, Call):
        return _call(node)
    if isinstance(node, BigOp):
        return _sum(node) if node.kind == "sum" else _prod(node)
    if isinstance(node, Var):
        raise _Refusal(f"the extra variable {node.name} is not a modular object")
    if isinstance(node, BigO):
        raise _Refusal("a side with its own O(q^k) is known only to that order")
    if isinstance(node, Dissect):
        raise _Refusal("a dissection [q^(mn+r)] F is not recognised (the U_m operator on "
                       "modular forms is not implemented)")
    raise _Refusal(f"the expression {type(node).__name__} is not recognised")


def _q_power_argument(node: Node, what: str) -> tuple[int, int]:
    """(sign, d) for an argument +-q^d, d a positive integer."""
    mono = _monomial(node)
    if mono is None or mono[0] not in (1, -1) or mono[1].denominator != 1 or mono[1] < 1:
        raise _Refusal(f"{what} is recognised at +-q^d (d a positive integer) only")
    return int(mono[0]), int(mono[1])


def _poch(node: Poch) -> Combination:
    s, m = _q_power_argument(node.base, "a q-Pochhammer symbol")
    if s != 1:
        raise _Refusal("a q-Pochhammer symbol with base -q^m is not recognised")
    length: int | None = None
    if node.length is not None:
        n = _constant(node.length)
        if n is None or n.denominator != 1 or n < 0 or n > MAX_FINITE:
            raise _Refusal("a finite q-Pochhammer symbol needs a fixed length >= 0")
        length = int(n)
    out = _single(_ONE)
    for param in node.params:
        mono = _monomial(param)
        if mono is None or mono[0] not in (1, -1) or mono[1].denominator != 1 or mono[1] < 0:
            raise _Refusal("a q-Pochhammer parameter other than +-q^a (a >= 0 an integer) is "
                           "not recognised")
        out = _mul(out, _signed_poch(int(mono[0]), int(mono[1]), m, length))
    return out


def _call(node: Call) -> Combination:
    if node.name == "eta":
        s, d = _q_power_argument(node.args[0], "eta(...)")
        if s != 1:                      # as the engine: (-q^d)^(d/24) is not a power of q
            raise _Refusal("eta(-q^d) is not a series in q")
        return _single(_q_power(Fraction(d, 24)) * _poch_inf(d, d))
    if node.name in ("theta_3", "theta_4"):
        s, d = _q_power_argument(node.args[0], f"{node.name}(...)")
        if node.name == "theta_4":
            s = -s
        return _theta(s, Fraction(d), Fraction(0))
    if node.name == "theta_2":
        s, d = _q_power_argument(node.args[0], "theta_2(...)")
        if s != 1:
            raise _Refusal("theta_2(-q^d) is not a series in q")
        # sum_n q^(d (n + 1/2)^2) = q^(d/4) sum_n q^(d n^2 + d n)
        return _mul(_single(_q_power(Fraction(d, 4))), _theta(1, Fraction(d), Fraction(d)))
    raise _Refusal(f"{node.name}(...) is not a modular object")


def _bounds(node: BigOp) -> tuple[int | None, int | None]:
    out = []
    for b in (node.lower, node.upper):
        if b is None:
            out.append(None)
            continue
        v = _constant(b)
        if v is None or v.denominator != 1:
            raise _Refusal(f"the range of the {node.kind} over {node.var} is not fixed")
        out.append(int(v))
    return out[0], out[1]


def _what_sum(node: BigOp) -> str:
    """What kind of sum a term that is not +-c q^(quadratic) makes, for the refusal.

    >>> _what_sum(parse("sum_{n>=1} n q^n/(1-q^n)"))[:35]
    'its term divides by a sum (1 - q^(.'
    """
    stack, pochhammer, lambert, extra = [node.body], False, False, ""
    while stack:
        c = stack.pop()
        if isinstance(c, Poch):
            pochhammer = True
        elif isinstance(c, Var):
            extra = extra or c.name
        elif (isinstance(c, BinOp) and c.op == "/" and isinstance(c.right, BinOp)
              and c.right.op in "+-" and node.var in free_names(c.right)):
            lambert = True
        stack.extend([c.body] if isinstance(c, BigOp) else children(c))
    if extra:
        return (f"its term carries the extra variable {extra}; sums in extra variables are "
                f"not recognised as modular")
    if pochhammer:
        return ("its term carries q-Pochhammer symbols (as in the Rogers-Ramanujan sums); "
                "such sums are not recognised as modular")
    if lambert:
        return ("its term divides by a sum (1 - q^(...)) that depends on the index: a "
                "Lambert series; Eisenstein series are not recognised, so a Lambert series "
                "is not read as a modular form (only combinations of eta quotients are)")
    return f"its term is not +-c q^(quadratic in {node.var})"


def _sum(node: BigOp) -> Combination:
    lo, hi = _bounds(node)
    term = _sum_term(node.body, node.var)
    if term is None:
        raise _Refusal(f"the sum over {node.var} is not a theta series: {_what_sum(node)}")
    c, sign, qexp = term
    if hi is not None:
        raise _Refusal("a sum with an upper limit is a polynomial in q, not a modular object")
    if len(qexp) != 3 or qexp[2] <= 0 or not _integer_valued(sign):
        raise _Refusal(f"the sum over {node.var} is not a theta series: the exponent of q is "
                       f"not a quadratic in {node.var} with positive leading coefficient, or "
                       f"the sign is not (-1)^(integer)")
    sig = _signs(sign)
    a2, b, c0 = qexp[2], qexp[1], qexp[0]
    if _follows_power(sig):
        bilateral = _mul(_single(_q_power(c0), c * sig[0]), _theta(sig[0] * sig[1], a2, b))
    else:
        # (-1)^(S(n)) = +-s^n (-1)^((A n^2 + B n)/g): the sum is G(q) with q^g -> -q^g,
        # G a theta series
        for g in (1, 2, 4, 8):
            rest = (Fraction(0), b / g, a2 / g)
            both = [x * y for x, y in zip(sig, _signs(rest), strict=True)]
            if _integer_valued(rest) and _follows_power(both):
                break
        else:
            raise _Refusal(f"the signs of the sum over {node.var} follow neither s^"
                           f"{node.var} nor the sign of (-q^g)^(its exponent / g)")
        theta = _theta(both[0] * both[1], a2, b)
        bilateral = {}
        for p, v in theta.items():
            p2, sgn = _negate_q(p, g)
            bilateral = _add(bilateral, {p2: v * sgn})
        bilateral = _mul(_single(_q_power(c0), c * both[0]), bilateral)
    if lo is None:
        return bilateral
    centre = -b / (2 * a2)
    start = math.ceil(centre)                 # the sum over n >= start is the symmetric half
    if abs(start - lo) <= MAX_SHIFT_TERMS:
        # sum_{n >= lo} = sum_{n >= start} + the terms lo <= n < start (or minus start <= n < lo)
        between: Combination = {}
        for n in range(min(lo, start), max(lo, start)):
            between = _add(between, _single(_q_power(_pval(qexp, n)), c * sig[n % 4]),
                           1 if lo < start else -1)
        half = None
        if centre == start - Fraction(1, 2):
            if [sig[(2 * start - 1 - n) % 4] for n in range(4)] == sig:
                half = {p: v / 2 for p, v in bilateral.items()}
        elif centre == start:
            if [sig[(2 * start - n) % 4] for n in range(4)] == sig:
                middle = _single(_q_power(_pval(qexp, start)), c * sig[start % 4])
                half = {p: v / 2 for p, v in _add(bilateral, middle).items()}
        if half is not None:
            return _add(half, between)
    raise _Refusal(f"the one-sided sum over {node.var} >= {lo} is not half of a symmetric "
                   f"theta series")


def _prod(node: BigOp) -> Combination:
    """prod_{n=n0}^{(n1)} (1 +- q^(a n + b))^k, a >= 1."""
    lo, hi = _bounds(node)
    body, k = node.body, 1
    if isinstance(body, BinOp) and body.op == "^":
        kk = _constant(body.right)
        if kk is None or kk.denominator != 1:
            raise _Refusal("a product whose factor is raised to a non-integer power")
        body, k = body.left, int(kk)
    elif isinstance(body, BinOp) and body.op == "/" and _constant(body.left) == 1:
        body, k = body.right, -1
    if lo is None or not (isinstance(body, BinOp) and body.op in "+-"
                          and _constant(body.left) == 1):
        raise _Refusal(f"the product over {node.var} is not of the form "
                       f"prod_{{{node.var}>=n0}} (1 +- q^(a {node.var} + b))^k")
    term = _sum_term(body.right, node.var)
    if term is None or term[0] not in (1, -1) or len(term[1]) > 1 or len(term[2]) != 2:
        raise _Refusal(f"the factor of the product over {node.var} is not 1 +- q^(a "
                       f"{node.var} + b)")
    c = term[0] * (-1 if term[1] and int(term[1][0]) % 2 else 1)
    if body.op == "-":
        c = -c
    b, a = term[2]
    start = a * lo + b
    if a.denominator != 1 or start.denominator != 1 or a < 1 or start < 0:
        raise _Refusal(f"the factor of the product over {node.var} is not 1 +- q^(a "
                       f"{node.var} + b) with integers a >= 1, a n0 + b >= 0")
    length = None if hi is None else max(hi - lo + 1, 0)
    # 1 + c q^x = (1 - (-c) q^x): the Pochhammer parameter is -c q^start
    return _power(_signed_poch(-int(c), int(start), int(a), length), k)


# ---------------------------------------------------------------- results


@dataclass(frozen=True)
class RecognisedTerm:
    """coefficient * q^shift * eta (``eta`` an :class:`EtaQuotient`, ``shift`` rational)."""

    coefficient: Fraction
    eta: EtaQuotient
    shift: Fraction

    def text(self) -> str:
        """The term in the notation (the parser reads it back).

        >>> RecognisedTerm(Fraction(16), EtaQuotient.of({2: -4, 4: 8}), Fraction(0)).text()
        '16 eta(q^2)^-4 eta(q^4)^8'
        """
        parts = []
        if self.coefficient != 1 or not self.eta.exponents and not self.shift:
            c = self.coefficient
            parts.append(str(c) if c.denominator == 1 and c >= 0 else f"({c})")
        if self.shift:
            parts.append(f"q^({self.shift})")
        if self.eta.exponents:
            parts.append(self.eta.text())
        return " ".join(parts)


@dataclass(frozen=True)
class Recognition:
    """The expression as sum(terms), or None and the ``reason`` it is not recognised."""

    terms: tuple[RecognisedTerm, ...] | None
    reason: str | None = None

    def text(self) -> str:
        """The recognised combination in the notation ("0" when it is empty).

        >>> recognise(parse("phi(-q)^2")).text()
        'eta(q)^4 eta(q^2)^-2'
        """
        if self.terms is None:
            return ""
        return " + ".join(t.text() for t in self.terms) or "0"


def _mobius(n: int) -> int:
    out, p = 1, 2
    while p * p <= n:
        if n % p == 0:
            n //= p
            if n % p == 0:
                return 0
            out = -out
        p += 1
    return -out if n > 1 else out


def _as_eta(p: _Product) -> tuple[EtaQuotient, Fraction]:
    """(eta quotient, residual shift t) with p = q^t * eta quotient."""
    if p.finite:
        n, e = p.finite[0]
        raise _Refusal(f"a finite factor (1 - q^{n})^{e} remains after simplification: the "
                       f"term is not an eta quotient")
    m = p.period
    by_gcd: dict[int, int] = {}
    for n in range(1, m + 1):
        g = math.gcd(n, m)
        if by_gcd.setdefault(g, p.exps[n - 1]) != p.exps[n - 1]:
            residues = [r for r in range(1, m + 1) if p.exps[r - 1]]
            raise _Refusal(f"the product prod (1 - q^n)^(E(n)) has exponents of period {m} "
                           f"that depend on n mod {m}, not only on gcd(n, {m}) (residues "
                           f"{residues[:8]}{'...' if len(residues) > 8 else ''}): a "
                           f"generalised eta quotient such as the Rogers-Ramanujan products, "
                           f"not an eta quotient (Klein forms are not handled)")
    r = {}
    for d in by_gcd:
        v = sum(_mobius(d // g) * by_gcd[g] for g in by_gcd if d % g == 0)
        if v:
            r[d] = v
    eta = EtaQuotient.of(r)
    return eta, p.shift - eta.offset


def recognise(node: Node) -> Recognition:
    """The expression as a combination of terms c q^t prod eta(d tau)^(r_d), or the reason
    it is not recognised.  Never evaluates a series.

    >>> rec = recognise(parse("(q;q)_inf^3 / (q^2;q^2)_inf"))
    >>> [(t.eta.r, t.shift) for t in rec.terms]
    [({1: 3, 2: -1}, Fraction(-1, 24))]
    >>> recognise(parse("(q;q^5)_inf")).reason[:60]
    'the product prod (1 - q^n)^(E(n)) has exponents of period 5 '
    """
    try:
        combo = _walk(node)
        terms = []
        for p, c in sorted(combo.items(), key=lambda t: (t[0].shift, t[0].period, t[0].exps)):
            eta, t = _as_eta(p)
            terms.append(RecognisedTerm(c, eta, t))
    except _Refusal as why:
        return Recognition(None, str(why))
    except RecursionError:
        return Recognition(None, "the expression is nested too deeply to recognise")
    return Recognition(tuple(terms))
