"""Congruences of coefficients: a(m n + r) ≡ 0 (mod M) for every n below the order.

``divisible`` tests one progression (the whole series by default) and reports the first
coefficient that is not divisible.  ``find_congruences`` searches every step m <= max_m,
every residue 0 <= r < m and every modulus M of a list (the primes up to 13 by default), and
keeps those not implied by another one found: (m, r, M) follows from (m', r', M') when
m' divides m, r ≡ r' (mod m') and M divides M'.  A series divisible by M from some exponent s
on (overpartitions modulo 2 from s = 1) gives the one congruence a(n + s) = 0 (mod M) instead
of every class in that tail.

A prime modulus is worked modulo that prime directly (the series is evaluated over GF(p),
so order 10^5 takes seconds); another modulus, or a prime whose field cannot hold a
denominator of the expression, from the exact series.  A rational coefficient a/b counts as
divisible by M when M divides a (b must be prime to M).  Agreement below the order is
evidence, not a proof: each result says how many coefficients it rests on.

>>> [(c.m, c.r, c.modulus) for c in find_congruences("1/(q;q)_inf", 1000).congruences]
[(5, 4, 5), (7, 5, 7), (11, 6, 11)]

At low orders a class of few coefficients can vanish modulo M by chance (at order 400,
p(29n + 17) ≡ 0 (mod 3) for the 14 values n < 14, not beyond): ``checked`` says how many
coefficients a congruence rests on, and ``FEW`` is the count below which the command line
warns.
>>> divisible("[q^(5n+4)] 1/(q;q)_inf", 5, 1000).holds
True
"""

from __future__ import annotations

import math
import numbers
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass
from fractions import Fraction

from ..backend import is_prime
from ..engine import evaluate
from ..errors import (
    ArgumentError,
    ArgumentTypeError,
    DomainError,
    integer_argument,
    typed_argument,
)
from ..lang import Node
from ..lang.ast import extra_variables
from ..lang.definitions import Definition
from ..lang.parser import parse
from ..series import GF, MAX_LENGTH, Series, power_text

Exponent = int | Fraction
Definitions = Mapping[str, Definition] | Iterable[str] | None

#: the moduli searched by default: the primes up to 13
DEFAULT_MODULI = (2, 3, 5, 7, 11, 13)
#: the largest step m of a search (each step reads every coefficient once)
MAX_STEP = 1000
#: most moduli in one search
MAX_MODULI = 100
#: a congruence resting on fewer coefficients than this is flagged as weak evidence
FEW = 20


@dataclass(frozen=True)
class Counterexample:
    """The first coefficient a(m n + r) not divisible by the modulus: its n, the exponent
    m n + r, its residue in 0 .. M-1 and, when it was computed exactly, its value."""

    n: int
    exponent: Exponent
    residue: int
    value: int | Fraction | None


@dataclass(frozen=True)
class Divisibility:
    """Whether every a(m n + r) with n < ``order`` is divisible by ``modulus`` (``checked``
    coefficients were read); the first counterexample when not.  Its truth value is
    ``holds``."""

    modulus: int
    m: int
    r: Exponent
    order: Exponent
    checked: int
    counterexample: Counterexample | None

    @property
    def holds(self) -> bool:
        return self.counterexample is None

    def __bool__(self) -> bool:
        """``holds``.

        >>> bool(divisible("1/(q;q)_inf", 2, 10))
        False
        """
        return self.holds


@dataclass(frozen=True)
class Congruence:
    """a(m n + r) ≡ 0 (mod ``modulus``) for the ``checked`` coefficients below the order."""

    m: int
    r: int
    modulus: int
    checked: int


@dataclass(frozen=True)
class CongruenceSearch:
    """The congruences a search found below q^``order`` (those implied by another omitted),
    and the ranges searched."""

    order: int
    max_m: int
    moduli: tuple[int, ...]
    congruences: tuple[Congruence, ...]


# -- evaluation modulo M --------------------------------------------------------------------
def _node(f: str | Node, definitions: Definitions) -> Node:
    typed_argument("f", f, (str, Node, Series), "a string, a syntax tree or a Series")
    node = parse(f, definitions=definitions) if isinstance(f, str) else f
    names = sorted(extra_variables(node))
    if names:
        raise DomainError(f"congruences are tested on a series in q alone; {names[0]!r} is an "
                          f"extra variable")
    return node


def _series_mod(f: str | Node | Series, modulus: int, order: int,
                definitions: Definitions) -> tuple[Series, bool]:
    """f modulo q^order, over GF(modulus) when that is a prime field that can hold the
    expression, else exactly; and whether it is exact."""
    if isinstance(f, Series):
        return f, f.ring.modulus is None
    node = _node(f, definitions)
    if modulus < 2**62 and is_prime(modulus):
        try:
            return evaluate(node, order, GF(modulus)), False
        except DomainError:
            pass            # a denominator divisible by the prime: exactly instead
    return evaluate(node, order), True


def _residue(c: int | Fraction, modulus: int, exponent: Exponent) -> int:
    if isinstance(c, int):
        return c % modulus
    if not isinstance(c, Fraction):
        raise DomainError(f"the coefficient of q^{exponent} is not a number")
    if math.gcd(c.denominator, modulus) != 1:
        raise DomainError(f"the coefficient {c} of q^{exponent} has a denominator not prime to "
                          f"{modulus}: divisibility by {modulus} is not defined")
    return c.numerator * pow(c.denominator, -1, modulus) % modulus


def _residues(s: Series, modulus: int, lo: int, n: int) -> list[int]:
    """The coefficients of q^lo .. q^(lo+n-1) modulo ``modulus``."""
    coeffs = s.coefficient_list(n, start=lo)
    if s.ring.modulus is not None:
        if s.ring.modulus != modulus:
            raise ArgumentError(f"a series over {s.ring.name} cannot be read modulo {modulus}")
        return coeffs      # type: ignore[return-value]   (ints already: the ring's residues)
    return [_residue(c, modulus, lo + i) for i, c in enumerate(coeffs)]


def _check_modulus(modulus: object) -> int:
    return integer_argument("modulus", modulus, 2, None)


def _check_order(order: object) -> int:
    return integer_argument("order", order, 1, MAX_LENGTH)


def _ceil(x: Fraction) -> int:
    return -((-x.numerator) // x.denominator)


# -- one progression --------------------------------------------------------------------------
def divisible(f: str | Node | Series, modulus: int, order: int, *, m: int = 1,
              r: Exponent | None = None, definitions: Definitions = None) -> Divisibility:
    """Whether every coefficient a(m n + r) with n < ``order`` of ``f`` is divisible by
    ``modulus`` (n from the first term on: negative n too when f has negative powers).  By
    default m = 1 and r is the class of f's exponents (every coefficient); 0 <= r < m.
    ``f`` may itself be a dissection, ``"[q^(5n+4)] 1/(q;q)_inf"``.  The order is honest:
    a series known only to O(q^k) is tested below that, and ``order`` says so.

    >>> d = divisible("1/(q;q)_inf", 5, 100, m=5, r=4)
    >>> d.holds, d.checked, d.order
    (True, 100, 100)
    >>> divisible("1/(q;q)_inf", 7, 100, m=5, r=4).counterexample
    Counterexample(n=0, exponent=4, residue=5, value=None)
    >>> divisible("1/(q;q)_inf", 1, 10)
    Traceback (most recent call last):
    ...
    qseries.errors.ArgumentError: modulus must be an integer >= 2, not 1
    """
    modulus = _check_modulus(modulus)
    order = _check_order(order)
    m = integer_argument("m", m, 1, MAX_LENGTH)
    if r is not None:
        if isinstance(r, bool) or not isinstance(r, numbers.Rational):
            raise ArgumentTypeError(f"r must be an integer or a Fraction, not {r!r}")
        r = Fraction(r)
        if not 0 <= r < m:
            raise ArgumentError(f"r must lie in 0 <= r < m = {m}, not {r}")
    work = m * order + (m if r is None else _ceil(r))
    if not isinstance(f, Series) and work > MAX_LENGTH:
        raise ArgumentError(f"m * order = {m * order} is beyond the limit {MAX_LENGTH}")
    s, exact = _series_mod(f, modulus, work, definitions)
    s.one_class("a divisibility test")
    rr = Fraction(s.offset) if r is None else r
    part = s.section(m, rr)
    known = part.precision if part.precision is not None else order
    top = min(order, known) if not isinstance(known, Fraction) else min(order, _ceil(known))
    low = part.valuation
    lo = min(0, low) if isinstance(low, int) else 0
    values = _residues(part, modulus, lo, max(top - lo, 0))
    first = next((i for i, c in enumerate(values) if c), None)
    found = None
    if first is not None:
        n = lo + first
        e = m * n + rr
        value = part.coefficient(n) if exact else None
        found = Counterexample(n, e.numerator if e.denominator == 1 else e, values[first],
                               value)
    return Divisibility(modulus, m, rr.numerator if rr.denominator == 1 else rr, top,
                        len(values), found)


# -- the search ---------------------------------------------------------------------------
def _moduli(moduli: Sequence[int]) -> tuple[int, ...]:
    if isinstance(moduli, (str, bytes)) or not isinstance(moduli, Iterable):
        raise ArgumentTypeError(f"moduli must be a list of integers, not {moduli!r}")
    out = tuple(sorted({_check_modulus(x) for x in moduli}))
    if not out:
        raise ArgumentError("moduli must name at least one modulus")
    if len(out) > MAX_MODULI:
        raise ArgumentError(f"at most {MAX_MODULI} moduli may be searched at once")
    return out


def _implied(c: tuple[int, int, int], found: set[tuple[int, int, int]],
             moduli: tuple[int, ...]) -> bool:
    """Whether (m, r, M) follows from another congruence found: (m', r', M') with m' | m,
    r ≡ r' (mod m') and M | M'."""
    m, r, mod = c
    for d in range(1, m + 1):
        if m % d:
            continue
        for big in moduli:
            if big % mod == 0 and (d, r % d, big) != c and (d, r % d, big) in found:
                return True
    return False


def find_congruences(f: str | Node | Series, order: int, *, max_m: int = 30,
                     moduli: Sequence[int] = DEFAULT_MODULI,
                     definitions: Definitions = None) -> CongruenceSearch:
    """Every (m, r, M) with m <= ``max_m``, 0 <= r < m and M in ``moduli`` such that
    a(m n + r) ≡ 0 (mod M) for all m n + r below the order, except those implied by
    another one found (see the module docstring).  When the coefficients not divisible by
    M all lie at the start (theta_3(q) = 1 + 2q + ... modulo 2), the tail from the next
    exponent s is one congruence a(n + s) = 0 (mod M) (m = 1, r = s), which implies every
    class that starts at or after s.  f must have integer exponents (multiply
    q^(-1/24) normalisations away first); negative exponents take part.  A residue class
    with no coefficient below the order is not reported.

    >>> s = find_congruences("1/(q^2;q^2)_inf", 200, max_m=4, moduli=[2, 3])
    >>> [(c.m, c.r, c.modulus) for c in s.congruences]     # the odd part vanishes
    [(2, 1, 2), (2, 1, 3)]
    >>> find_congruences("1/(q;q)_inf", 100, max_m=0)
    Traceback (most recent call last):
    ...
    qseries.errors.ArgumentError: max_m must be an integer between 1 and 1000, not 0
    """
    order = _check_order(order)
    max_m = integer_argument("max_m", max_m, 1, MAX_STEP)
    mods = _moduli(moduli)
    exact: Series | None = f if isinstance(f, Series) else None
    series: dict[int, Series] = {}
    for mod in mods:
        if exact is None and mod < 2**62 and is_prime(mod):
            series[mod], _ = _series_mod(f, mod, order, definitions)
        else:
            if exact is None:
                exact = evaluate(_node(f, definitions), order)    # type: ignore[arg-type]
            series[mod] = exact
    lo, known = 0, order
    for s in series.values():
        s.one_class("a congruence search")
        if s.offset != 0 and not s.is_zero():
            raise DomainError(f"the exponents of this series are {power_text(s.offset)} times "
                              f"integer powers of q: multiply by {power_text(-s.offset)} (or the "
                              f"power papers "
                              f"use) to search its congruences")
        p = s.precision
        known = min(known, order if p is None else _ceil(Fraction(p)))
        v = s.valuation
        lo = min(lo, v) if isinstance(v, int) else lo
    # every series read on the same window q^lo .. q^(known - 1)
    residues = {mod: _residues(s, mod, lo, max(known - lo, 0)) for mod, s in series.items()}
    found: dict[tuple[int, int, int], int] = {}
    tails: dict[int, int] = {}
    for mod in mods:
        values = residues[mod]
        for m in range(1, max_m + 1):
            for r in range(m):
                cls = values[(r - lo) % m::m]
                if cls and not any(cls):
                    found[(m, r, mod)] = len(cls)
        start = _tail_start(values, lo)
        if start is not None and (1, 0, mod) not in found:
            tails[mod] = start
            found[(1, start, mod)] = len(values) - (start - lo)
    keys = set(found)
    kept = [Congruence(m, r, mod, found[(m, r, mod)])
            for (m, r, mod) in sorted(found, key=lambda c: (c[0], c[1], c[2]))
            if not _implied((m, r, mod), keys, mods)
            and not _in_a_tail((m, r, mod), tails)]
    return CongruenceSearch(known, max_m, mods, tuple(kept))


def _tail_start(values: list[int], lo: int) -> int | None:
    """The exponent s from which every coefficient read is divisible, when the ones that
    are not all lie at the start (1 + 2q + 2q^4 + ...: s = 1) and the tail from s holds at
    least ``FEW`` coefficients and half of those read; else None.

    >>> _tail_start([1] + [0] * 40, 0), _tail_start([1] * 41, 0)
    (1, None)
    """
    last = next((i for i in range(len(values) - 1, -1, -1) if values[i]), None)
    if last is None:
        return None
    tail = len(values) - last - 1
    return lo + last + 1 if tail >= FEW and 2 * tail >= len(values) else None


def _in_a_tail(c: tuple[int, int, int], tails: Mapping[int, int]) -> bool:
    """Whether (m, r, M) follows from a tail a(n + s) = 0 (mod M'), M | M': when the class
    starts inside it, r >= s (a class that starts before s is the tail and a finite check,
    and is kept)."""
    m, r, mod = c
    return any(big % mod == 0 and (m > 1 or big != mod) and r >= start
               for big, start in tails.items())
