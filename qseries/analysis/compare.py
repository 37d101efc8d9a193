"""Compare the two sides of a conjectured identity modulo q^N.

Agreement to O(q^N) is evidence, not a proof: :class:`CheckResult` says exactly which
coefficients were compared, and at a mismatch which exponent differs first.

>>> r = check("sum_{k>=0} q^(k^2)/(q;q)_k^2", "1/(q;q)_inf", order=50)
>>> r.holds, r.order_verified
(True, 50)
>>> r = check("1/(1-q)", "1 + q + q^2 + 2q^3", order=10)
>>> r.holds, r.first_mismatch.exponent, r.first_mismatch.lhs, r.first_mismatch.rhs
(False, 3, 1, 2)

A check that could compare no coefficient at all is inconclusive (``holds`` is None):

>>> r = check("O(q^-5) + 1", "2")
>>> r.holds, r.order_verified
(None, -5)
>>> print(r.verdict)       # doctest: +NORMALIZE_WHITESPACE
inconclusive: no coefficient could be compared, because the left side is known only
below q^-5 (it carries its own O(q^(-5)))
"""

from __future__ import annotations

import math
import os
import random
import time
from collections.abc import Callable, Iterable, Mapping
from dataclasses import dataclass, field
from fractions import Fraction
from typing import Any

from ..engine import Evaluator, Parts, check_weights, evaluate, quotient
from ..engine.chooser import (
    AUTO_MODULAR_ORDER,
    AUTO_MODULAR_ORDER_EXTRA,
    AUTO_PROBE_ORDER,
    PARALLEL_ORDER,
    auto_costs,
)
from ..engine.progress import PartProgress
from ..errors import (
    ArgumentError,
    ArgumentTypeError,
    DomainError,
    PrecisionError,
    QSeriesError,
    UnableError,
    integer_argument,
    typed_argument,
)
from ..lang import Node, parse, show
from ..lang.ast import BigO, children, extra_variables
from ..lang.definitions import Definition
from ..lang.parser import definitions_of
from ..series import (
    GF,
    QQ,
    ZZ,
    LaurentPoly,
    Ring,
    Series,
    is_prime,
    laurent_text,
    ring_for,
)
from ..series.formatting import coefficient_text, power_text
from .display import Displayed

Exponent = int | Fraction
Number = int | Fraction


@dataclass(frozen=True)
class Mismatch:
    """The first exponent at which the two sides differ, with both coefficients."""

    exponent: Exponent
    lhs: Number
    rhs: Number

    @property
    def difference(self) -> Number:
        return self.lhs - self.rhs


@dataclass(frozen=True)
class CheckResult(Displayed):
    """Outcome of comparing two sides modulo q^order.

    ``holds`` is True when every coefficient of q^e with e < ``order_verified`` agrees, False
    at a mismatch, and None when no coefficient could be compared at all (the check is
    inconclusive; ``reason`` says why).  It is never a proof of the identity;
    ``order_verified`` can be smaller than ``order_requested`` when a side carries its own
    O(q^k) or negative powers cost precision (``shortfall`` says which).  ``bool(result)`` is
    ``holds``, and an error for an inconclusive result.
    """

    holds: bool | None
    order_requested: int
    order_verified: Exponent
    first_mismatch: Mismatch | None
    seconds: float
    #: the two sides as computed (None after a modular check that held: the sides were
    #: compared modulo primes as cross-multiplied fractions, never expanded exactly; after a
    #: modular check that failed, they are computed exactly just past the first mismatch)
    lhs: Series | None = field(repr=False)
    rhs: Series | None = field(repr=False)
    #: "exact", or "modular" (both sides compared modulo ``primes``)
    method: str = "exact"
    primes: tuple[int, ...] = ()
    #: extra variables (sorted) and their weights: z stands for z*q^w, so with weights the
    #: coefficient of q^e is the part of weighted degree e (n + w*j for q^n z^j)
    variables: tuple[str, ...] = ()
    weights: tuple[int, ...] = ()
    #: why fewer coefficients than asked were compared ("" when all were): which side is
    #: known only below which power of q, and whether it carries its own O(q^k)
    shortfall: str = ""

    @property
    def weighted(self) -> bool:
        return any(self.weights)

    @property
    def inconclusive(self) -> bool:
        """True when no coefficient could be compared (``holds`` is None)."""
        return self.holds is None

    @property
    def reason(self) -> str | None:
        """Why the check is inconclusive (None when it is not).

        >>> check("O(q^-1)", "q^5").reason.startswith("no coefficient could be compared")
        True
        """
        if self.holds is not None:
            return None
        return f"no coefficient could be compared, because {self.shortfall}"

    def __bool__(self) -> bool:
        """``holds``: True when the sides agree to the order verified, False at a mismatch;
        an inconclusive check is neither, and raises :class:`~qseries.errors.PrecisionError`.

        >>> bool(check("1/(1-q)", "1 + q", order=5))
        False
        """
        if self.holds is None:
            raise PrecisionError(f"the check is inconclusive: {self.reason}; test "
                                 f"result.holds (True, False or None) instead of its truth")
        return self.holds


    @property
    def verdict(self) -> str:
        """One honest sentence.

        >>> print(check("(q;q)_inf", "1 - q - q^2", order=5).verdict)
        the two sides agree to O(q^5) (every coefficient below q^5 compared; evidence, not a proof)
        """
        if self.holds is None:
            return f"inconclusive: {self.reason}"
        order = _text(self.order_verified)
        scope = f"every coefficient below q^{order}"
        short = (f"; fewer than the q^{self.order_requested} asked, because {self.shortfall}"
                 if self.shortfall else "")
        if self.weighted:
            pairs = zip(self.variables, self.weights, strict=True)
            grade = " + ".join(["n"] + [f"{w}*e_{v}" if w != 1 else f"e_{v}"
                                        for v, w in pairs if w])
            scope = (f"every coefficient of q^n {'*'.join(f'{v}^e_{v}' for v in self.variables)}"
                     f" with {grade} < {order} (the weighted extra variables are expanded as "
                     f"power series)")
        if self.first_mismatch is None and self.method == "modular":
            k = len(self.primes)
            if self.variables:
                return (f"the two sides agree at random values of {', '.join(self.variables)} "
                        f"modulo the primes {', '.join(map(str, self.primes))}, at {scope} "
                        f"(Schwartz-Zippel: a nonzero coefficient difference of B bits and "
                        f"degree d in the extra variables escapes each prime with probability "
                        f"at most B/(61*{PRIME_COUNT:.2e}) + d/2^61, so all {k} with "
                        f"probability below {_upper(escape_bound(10**6, k, 10**6))} for B, d <= "
                        f"10^6{short}; evidence, not a proof)")
            return (f"the two sides agree modulo the primes {', '.join(map(str, self.primes))} "
                    f"at {scope} (a nonzero coefficient difference of B bits escapes all {k} "
                    f"with probability at most (B/(61*{PRIME_COUNT:.2e}))^{k}, below "
                    f"{_upper(escape_bound(10**6, k))} for B = 10^6{short}; evidence, not a proof)")
        if self.first_mismatch is None:
            return (f"the two sides agree to O(q^{order}) ({scope} compared{short}; evidence, "
                    f"not a proof)")
        m = self.first_mismatch
        where = _power(m.exponent)
        lhs, rhs = _text(m.lhs), _text(m.rhs)
        if self.weighted:
            where = f"weighted degree {_text(m.exponent)}"
            lhs = self.unweighted_text(m.lhs, m.exponent)
            rhs = self.unweighted_text(m.rhs, m.exponent)
        return (f"the two sides differ: first at {where}, where the left side "
                f"has {lhs} and the right side {rhs}")

    def unweighted_text(self, c: Number | LaurentPoly, e: Exponent) -> str:
        """The part of weighted degree e with coefficient c, written back in q and the
        extra variables (z*q^w -> z): ``z*q^2 + 3*z^2*q``; without weights, the coefficient
        c as text."""
        if not isinstance(c, LaurentPoly) or not self.weighted:
            return _text(c)
        w = [dict(zip(self.variables, self.weights, strict=True)).get(v, 0)
             for v in c.ring.names]
        return laurent_text(c, lambda exps: Fraction(e) - sum(
            wv * x for wv, x in zip(w, exps[1:], strict=True)))

    def neighbours(self, radius: int = 2) -> list[tuple[Exponent, Number, Number]]:
        """Coefficients of both sides at the exponents around the first mismatch (those
        known on both sides, at most ``radius`` on either side of it).

        >>> check("1/(1-q)", "1 + q", order=9).neighbours(1)
        [(1, 1, 1), (2, 1, 0), (3, 1, 0)]
        """
        integer_argument("radius", radius, 0)
        if self.first_mismatch is None or self.lhs is None or self.rhs is None:
            return []
        e0 = Fraction(self.first_mismatch.exponent)
        known = [Fraction(x.precision) for x in (self.lhs, self.rhs) if x.precision is not None]
        limit = min([Fraction(self.order_verified)] + known)
        start = min(_low(self.lhs), _low(self.rhs), e0)
        out = []
        # a side in q^(1/den) (theta_2(q) + theta_3(q)) has a term at every 1/den step
        step = Fraction(1, math.lcm(self.lhs.den, self.rhs.den))
        # only the steps d with start <= e0 + d step < limit (a huge radius costs nothing)
        for d in range(max(-radius, math.ceil((start - e0) / step)),
                       min(radius, math.ceil((limit - e0) / step) - 1) + 1):
            e = e0 + d * step
            e_out = e.numerator if e.denominator == 1 else e
            out.append((e_out, self.lhs.coefficient(e), self.rhs.coefficient(e)))
        return out


def _low(s: Series) -> Fraction:
    v = s.valuation
    return Fraction(v) if v is not None else Fraction(0)


def _nothing_compared(verified: Exponent, *sides: Series) -> bool:
    """True when no coefficient lies in the compared range: from q^0 (or the first known
    nonzero term of a side, when it is lower) up to the order verified."""
    firsts = [Fraction(v) for v in (s.valuation for s in sides) if v is not None]
    return Fraction(verified) <= min([Fraction(0)] + firsts)


def _big_o_terms(node: Node) -> list[Node]:
    """The O(q^k) terms of an expression (iteratively: sums of many terms are deep)."""
    out, stack = [], [node]
    while stack:
        c = stack.pop()
        if isinstance(c, BigO):
            out.append(c)
        stack.extend(children(c))
    return out


def _shortfall(order: int, verified: Exponent, known: tuple[Exponent, Exponent],
               nodes: tuple[Node, Node]) -> str:
    """Why fewer coefficients than the order asks were compared ("" when none were lost)."""
    if Fraction(verified) >= order:
        return ""
    parts = []
    for side, k, node in zip(("left", "right"), known, nodes, strict=True):
        if Fraction(k) < order:
            own = _big_o_terms(node)
            why = (f"it carries its own {', '.join(show(o) for o in own[:3])}" if own else
                   "negative powers of q cost precision")
            parts.append(f"the {side} side is known only below q^{_text(k)} ({why})")
    return " and ".join(parts) or "negative powers of q cost precision"


def _text(x: Exponent | Number | LaurentPoly) -> str:
    return coefficient_text(x)


_power = power_text


def _known_to(s: Series, order: int) -> Exponent:
    p = s.precision
    if p is None or p >= order:
        return order
    return p


def compare_series(lhs: Series, rhs: Series, order: int) -> tuple[Exponent, Mismatch | None]:
    """(order verified, first mismatch or None) for two computed series.

    >>> from qseries.series import Series
    >>> compare_series(Series.from_coefficients([1, 2, 3]), Series.from_coefficients([1, 2, 4]), 9)
    (9, Mismatch(exponent=2, lhs=3, rhs=4))
    """
    verified = min(_known_to(lhs, order), _known_to(rhs, order))
    if lhs.offset == rhs.offset or lhs.is_zero() or rhs.is_zero():
        diff = lhs - rhs
        for e, _ in diff.terms():
            if e >= verified:
                break
            return verified, Mismatch(e, lhs.coefficient(e), rhs.coefficient(e))
        return verified, None
    # different fractional offsets: the first term of either side below the order differs
    firsts = [e for s in (lhs, rhs) for e, _ in list(s.terms())[:1] if e < verified]
    if not firsts:
        return verified, None
    e = min(firsts)
    return verified, Mismatch(e, lhs.coefficient(e), rhs.coefficient(e))


#: the modular method draws primes from [2^61, 2^62); there are more than this many
#: (about 5.40e16 by the logarithmic integral)
PRIME_COUNT = 2**61 / (62 * 0.6931471805599453)
#: most primes the modular method may use (as on the command line)
MAX_PRIMES = 20


def _upper(x: float) -> str:
    """x as one significant digit rounded up (a printed upper bound must stay one).

    >>> _upper(3.05e-13), _upper(3e-13), _upper(9.3e-26), _upper(0.96)
    ('4e-13', '3e-13', '1e-25', '1e+00')
    """
    if x <= 0:
        return "0"
    e = math.floor(math.log10(x))
    mant = x / 10.0**e
    digit = math.ceil(mant - 1e-9)          # 3.0000000001 from float noise stays 3
    if digit >= 10:
        digit, e = 1, e + 1
    return f"{digit}e{e:+03d}"


def escape_bound(bits: int, k: int, degree: int = 0) -> float:
    """Upper bound on the chance that a nonzero coefficient difference escapes k primes drawn
    at random from [2^61, 2^62): an integer of ``bits`` bits has at most bits/61 such prime
    factors; with extra variables set to random nonzero residues, a nonzero Laurent
    polynomial of degree spread ``degree`` vanishes with probability at most degree/(p-1)
    (Schwartz-Zippel).

    >>> escape_bound(10**6, 3) < 1e-30
    True
    """
    return (bits / 61 / PRIME_COUNT + degree / 2**61) ** k


def random_primes(k: int, seed: int | None = None) -> tuple[int, ...]:
    """k distinct random primes in [2^61, 2^62).

    >>> all(2**61 <= p < 2**62 for p in random_primes(2, seed=1))
    True
    """
    rng = random.Random(seed)
    out: list[int] = []
    while len(out) < k:
        # a draw that is not prime is drawn again (not replaced by the next prime, which
        # would favour primes after long gaps): each prime is equally likely, as the escape
        # bound assumes
        n = rng.randrange(2**61, 2**62) | 1
        if is_prime(n) and n not in out:
            out.append(n)
    return tuple(out)


def check(lhs: str | Node, rhs: str | Node, order: int = 100, ring: Ring = ZZ,
          method: str = "exact", primes: int = 3, seed: int | None = None,
          progress: Callable[[str], None] | None = None,
          weights: dict[str, int] | None = None,
          definitions: Mapping[str, Definition] | Iterable[str] | None = None) -> CheckResult:
    """Evaluate both sides modulo q^order and compare every coefficient below q^order.

    ``method="modular"`` compares modulo ``primes`` (1 to 20) random primes near 2^62 (much
    faster at high order; ``seed`` makes the draw reproducible) and recomputes the two
    coefficients exactly at a mismatch; ``"auto"`` may use it above order 3000 (above 400
    with extra variables): see :func:`auto_method`.  ``ring`` is ZZ, QQ or GF(p); the
    modular method and extra variables need ZZ or QQ.  ``progress`` (if given) is called
    with a short text at each stage: each side, each prime, and each top-level sum or
    product of a side as it is evaluated ("left side: evaluated part 1 of 2, (q;q)_inf";
    with the modular method prefixed by "prime 1 of 3, "; primes in worker processes
    report only as a whole).

    Extra variables (z, a, ...) make the coefficients Laurent polynomials in them; the
    modular method then also sets them to random residues (Schwartz-Zippel).  ``weights``
    maps a variable z to w >= 0 (z stands for z*q^w, which expands 1/(1-z) as a power
    series); by default the weights are 0, and 1 for every variable when weight 0 fails.

    >>> check("(-q;q)_inf", "1/(q;q^2)_inf", order=200).holds      # Euler
    True
    >>> check("(-q;q)_inf", "1/(q;q^2)_inf", order=200, method="modular", seed=7).method
    'modular'
    >>> r = check("sum_{k>=0} z^k/(q;q)_k", "1/(z;q)_inf", order=30)   # Euler, in z
    >>> r.holds, r.weights
    (True, (1,))
    """
    _check_arguments(lhs, rhs, order, ring, method, primes, seed, progress)
    defs = definitions_of(definitions)
    lnode = parse(lhs, definitions=defs) if isinstance(lhs, str) else lhs
    rnode = parse(rhs, definitions=defs) if isinstance(rhs, str) else rhs
    names = tuple(sorted(extra_variables(lnode) | extra_variables(rnode)))
    if names and ring.modulus is not None:
        raise ArgumentError(f"ring {ring} cannot hold the extra variables {', '.join(names)}: "
                            f"their coefficients are compared over ZZ or QQ")
    # the clock starts before auto's probe, so that ``seconds`` counts it
    t0 = time.perf_counter()
    if method == "auto":
        method = auto_method(lnode, rnode, order, ring, names, primes)
    check_weights(weights, set(names))
    tries = [dict(weights or {})]
    if weights is None and names:
        tries.append({v: 1 for v in names})
    say = progress or _silent
    if method == "modular" and weights is None and names and _weights_needed(lnode, rnode, ring,
                                                                            names):
        # modulo p the variables are numbers, and a sum such as sum z^k (a;q)_k/(q;q)_k that
        # has no Laurent coefficients at weight 0 may still look fine (or diverge); the
        # weights are chosen as the exact method would choose them
        tries = tries[1:]
    first_error: QSeriesError | None = None
    for w in tries:
        try:
            if method == "modular":
                return _check_modular(lnode, rnode, order, primes, seed, t0, say, names, w)
            return _check_exact(lnode, rnode, order, ring, t0, say, names, w)
        except QSeriesError as err:
            if first_error is not None and isinstance(err, (DomainError, UnableError)):
                # the weighted retry failed too, maybe for another reason (a size limit):
                # both reasons are reported, the retry's last, as it is what stopped
                raise type(err)(f"{first_error}; retried with the extra variables weighted "
                                f"(z -> z*q): {err}") from None
            if first_error is not None:
                raise
            first_error = err
            if not err.weights_may_help:
                raise
            say("retrying with the extra variables weighted (z -> z*q)")
    assert first_error is not None
    raise first_error


def auto_method(lnode: Node, rnode: Node, order: int, ring: Ring,
                names: tuple[str, ...] = (), primes: int = 3) -> str:
    """"exact" or "modular" for ``check(method="auto")``: exact up to
    ``AUTO_MODULAR_ORDER`` (``AUTO_MODULAR_ORDER_EXTRA`` with extra variables); above, for
    series in q alone, the size of the largest coefficient is extrapolated from an exact
    evaluation to ``AUTO_PROBE_ORDER`` (:func:`probe_bits`) and the method that
    ``chooser.auto_costs`` estimates the cheaper is used (exact when it costs no more):
    the modular method evaluates each side once per prime, which pays only when the exact
    numbers are large.

    >>> from qseries.lang import parse
    >>> auto_method(parse("theta_3(q)^2"), parse("1 + 4 sum_{n>=1} q^n/(1+q^(2n))"), 10**5, ZZ)
    'exact'
    >>> auto_method(parse("(q;q)_inf"), parse("1/(q;q)_inf"), 10**5, ZZ)
    'modular'
    """
    limit = AUTO_MODULAR_ORDER_EXTRA if names else AUTO_MODULAR_ORDER
    if order <= limit or ring not in (ZZ, QQ):
        return "exact"
    if names:
        return "modular"
    bits = probe_bits(lnode, rnode, order, ring)
    if bits is None:
        return "modular"            # the check itself reports the error
    exact, modular = auto_costs(bits, primes, order, os.cpu_count() or 1)
    return "exact" if exact <= modular else "modular"


def probe_bits(lnode: Node, rnode: Node, order: int, ring: Ring = ZZ) -> float | None:
    """The size in bits of the largest coefficient of either side below q^order,
    extrapolated from an exact evaluation to ``AUTO_PROBE_ORDER``: the size there times
    (order / AUTO_PROBE_ORDER)^g, g (between 0 and 1) the growth exponent of the size from
    half that order; None when a side cannot be evaluated.

    >>> from qseries.lang import parse
    >>> probe_bits(parse("theta_3(q)^2"), parse("1"), 10**5)      # r_2(n) <= 4 d(n)
    5.0
    >>> 100 < probe_bits(parse("1/(q;q)_inf"), parse("1"), 1024) < 110   # p(1023): 106 bits
    True
    """
    bits = 0.0
    for node in (lnode, rnode):
        try:
            s = evaluate(node, AUTO_PROBE_ORDER, ring)
        except QSeriesError:
            return None
        full = ring._coefficient_bits(s.poly)
        half = ring._coefficient_bits(s.truncate(AUTO_PROBE_ORDER // 2).poly)
        growth = min(max(math.log2(full / half), 0.0), 1.0) if half and full else 0.0
        bits = max(bits, full * (order / AUTO_PROBE_ORDER) ** growth)
    return bits


#: the order of the exact trial that decides whether extra variables need weights
WEIGHT_PROBE_ORDER = 12


def _weights_needed(lnode: Node, rnode: Node, ring: Ring, names: tuple[str, ...]) -> bool:
    """True when an exact evaluation at weight 0 fails for a reason weights can remove."""
    lring = ring_for(names, ring)
    try:
        for node in (lnode, rnode):
            evaluate(node, WEIGHT_PROBE_ORDER, lring)
    except QSeriesError as err:
        return err.weights_may_help
    return False


def _check_arguments(lhs: object, rhs: object, order: object, ring: object, method: object,
                     primes: object, seed: object, progress: object) -> None:
    """Refuse bad arguments of :func:`check` before any work, naming the argument."""
    expression = "an expression (a string, or a syntax tree from qseries.parse)"
    typed_argument("lhs", lhs, (str, Node), expression)
    typed_argument("rhs", rhs, (str, Node), expression)
    integer_argument("order", order, 1)
    typed_argument("ring", ring, Ring, "a coefficient ring: qseries.ZZ, QQ or GF(p)")
    assert isinstance(ring, Ring)
    if ring != ZZ and ring != QQ and ring.modulus is None:
        raise ArgumentError(f"ring must be ZZ, QQ or GF(p), not {ring} (the ring of the extra "
                            f"variables is chosen from the expressions)")
    if not isinstance(method, str) or method not in ("exact", "modular", "auto"):
        raise ArgumentError(f"unknown method {method!r}: use exact, modular or auto")
    if method == "modular" and ring.modulus is not None:
        raise ArgumentError(f"the modular method compares modulo its own primes, which says "
                            f"nothing about ring {ring}: use method='exact'")
    integer_argument("primes", primes, 1, MAX_PRIMES)
    if seed is not None:
        integer_argument("seed", seed)
    if progress is not None and not callable(progress):
        raise ArgumentTypeError(f"progress must be a function of one string, not "
                                f"{type(progress).__name__}")


def _own(weights: dict[str, int] | None, node: Node) -> dict[str, int]:
    """The weights of the extra variables that occur in ``node`` (one side may lack some)."""
    names = extra_variables(node)
    return {v: w for v, w in (weights or {}).items() if v in names}


def _check_exact(lnode: Node, rnode: Node, order: int, ring: Ring, t0: float,
                 say: Callable[[str], None], names: tuple[str, ...], weights: dict[str, int]
                 ) -> CheckResult:
    ring = ring_for(names, ring)
    say("evaluating the left side")
    left = _on_side("left", evaluate, lnode, order, ring, _own(weights, lnode),
                    progress=_part_stages(say, "left side"))
    say("evaluating the right side")
    right = _on_side("right", evaluate, rnode, order, ring, _own(weights, rnode),
                     progress=_part_stages(say, "right side"))
    verified, mismatch = compare_series(left, right, order)
    holds = None if mismatch is None and _nothing_compared(verified, left, right) else \
        mismatch is None
    shortfall = _shortfall(order, verified, (_known_to(left, order), _known_to(right, order)),
                           (lnode, rnode))
    return CheckResult(holds, order, verified, mismatch,
                       time.perf_counter() - t0, left, right, variables=names,
                       weights=tuple(weights.get(v, 0) for v in names), shortfall=shortfall)




def _on_side(side: str, fn: Callable[..., Any], *args: Any, **options: Any) -> Any:
    """``fn(*args, **options)``, the evaluation of one side of a check: an error it raises
    says which side (``QSeriesError.side``), so that its position can be read in that text.

    >>> from qseries.errors import DomainError
    >>> try:
    ...     _on_side("right", evaluate, parse("1/(1-1)"), 5)
    ... except DomainError as err:
    ...     print(err.side, err.position)
    right 4
    """
    try:
        return fn(*args, **options)
    except QSeriesError as err:
        if err.side is None:
            err.side = side
        raise


def _silent(_text: str) -> None:
    """The stages of a check nobody follows."""


def _part_stages(say: Callable[[str], None], side: str) -> PartProgress | None:
    """The engine's progress over the parts of one side (``engine.progress``) as stages of
    :func:`check`: "left side: evaluated part 1 of 2, (q;q)_inf"; None when nobody follows."""
    if say is _silent:
        return None
    return lambda text, done, total: say(f"{side}: evaluated part {done} of {total}, {text}")


def _modular_sides(lnode: Node, rnode: Node, order: int, p: int, names: tuple[str, ...] = (),
                   weights: dict[str, int] | None = None,
                   say: Callable[[str], None] = _silent) -> tuple[Parts, Parts]:
    # the extra variables get random nonzero residues, drawn from the prime itself (so the
    # draw is reproducible and differs between primes)
    rng = random.Random(p)
    values = {v: rng.randrange(1, p) for v in names}
    ring = GF(p)
    try:
        ev_l = Evaluator(ring, values=values, weights=weights,
                         progress=_part_stages(say, "left side"))
        ev_r = Evaluator(ring, values=values, weights=weights,
                         progress=_part_stages(say, "right side"))
        left = _on_side("left", ev_l.evaluate_parts, lnode, order)
        right = _on_side("right", ev_r.evaluate_parts, rnode, order)
        # a side of negative valuation times the other side's denominator (known modulo
        # q^order) would be known to less than the order: that side is divided out instead
        # (its numerator has valuation >= 0, so the quotient is known modulo q^order)
        if _below_one(left[0]) and right[1] is not None:
            right = (quotient(*right, order), None)
        if _below_one(right[0]) and left[1] is not None:
            left = (quotient(*left, order), None)
        return left, right
    except DomainError as err:
        if not names and _undefined_exactly(err, lnode, rnode, order):
            raise                 # as undefined over the integers: the prime is not to blame
        again = DomainError(f"{err} (modulo the prime {p}; try --method exact)",
                            weights_may_help=err.weights_may_help, position=err.position)
        again.side = err.side
        raise again from None


#: the order of the exact evaluation that tells whether an error of the modular method
#: is the expression's own (1/(1-1)) or the prime's (a denominator divisible by it)
EXACT_RETRY_ORDER = 64


def _undefined_exactly(err: DomainError, lnode: Node, rnode: Node, order: int) -> bool:
    """Whether the side ``err`` came from fails at the same place over the integers (at a
    small order), so that the error is the expression's own."""
    node = {"left": lnode, "right": rnode}.get(err.side or "")
    if node is None or err.position is None:
        return False
    try:
        evaluate(node, min(order, EXACT_RETRY_ORDER))
    except DomainError as exact:
        return exact.position == err.position
    except QSeriesError:
        return False
    return False


def _below_one(s: Series) -> bool:
    v = s.valuation
    return v is not None and v < 0


def compare_parts(lhs: Parts, rhs: Parts, order: int) -> tuple[Exponent, Exponent | None]:
    """(order verified, first exponent where they differ or None) for two sides given as
    numerator and unit denominator (None: 1), compared as A*D = C*B: the difference
    A/B - C/D = (A*D - C*B)/(B*D) has its first nonzero term where A*D - C*B has, B*D being a
    unit, so no series is inverted.  (A numerator of negative valuation times the other
    denominator is known to less than the order, which the verified order then says.)

    >>> from qseries.series import Series
    >>> one_minus_q = Series.from_coefficients([1, -1])
    >>> geometric = Series.from_coefficients([1] * 9, prec=9)
    >>> compare_parts((Series.constant(1), one_minus_q), (geometric, None), 9)
    (9, None)
    >>> compare_parts((Series.constant(1), one_minus_q), (geometric - Series.monomial(5), None), 9)
    (9, 5)
    """
    left, right = _cross(lhs, rhs)
    verified, mismatch = compare_series(left, right, order)
    return verified, None if mismatch is None else mismatch.exponent


def _cross(lhs: Parts, rhs: Parts) -> tuple[Series, Series]:
    """A*D and C*B for the sides A/B and C/D."""
    (a, b), (c, d) = lhs, rhs
    return (a if d is None else a * d), (c if b is None else c * b)


#: what one prime tells: (order verified, first exponent where the sides differ or None,
#: whether no coefficient could be compared, the orders to which each side is known)
Outcome = tuple[Exponent, Exponent | None, bool, tuple[Exponent, Exponent]]


def _modular_compare(lnode: Node, rnode: Node, order: int, p: int,
                     names: tuple[str, ...] = (), weights: dict[str, int] | None = None,
                     say: Callable[[str], None] = _silent) -> Outcome:
    sides = _modular_sides(lnode, rnode, order, p, names, weights, say)
    left, right = _cross(*sides)
    verified, mismatch = compare_series(left, right, order)
    known = tuple(min(_known_to(x, order) for x in side if x is not None) for side in sides)
    return (verified, None if mismatch is None else mismatch.exponent,
            _nothing_compared(verified, left, right), known)   # type: ignore[return-value]


def _in_prime(say: Callable[[str], None], i: int, k: int) -> Callable[[str], None]:
    """The stages of the i-th of k primes, so named."""
    if say is _silent:
        return _silent
    return lambda text: say(f"prime {i} of {k}, {text}")


def _check_modular(lnode: Node, rnode: Node, order: int, k: int, seed: int | None,
                   t0: float, say: Callable[[str], None], names: tuple[str, ...] = (),
                   weights: dict[str, int] | None = None) -> CheckResult:
    ps = random_primes(k, seed)
    weights = weights or {}
    wt = tuple(weights.get(v, 0) for v in names)
    verified: Exponent = order
    first: Exponent | None = None
    # at high order the other primes run in worker processes while this one computes the first
    parallel = order >= PARALLEL_ORDER and len(ps) > 1 and (os.cpu_count() or 1) > 1
    pool = None
    if parallel:
        # imported here: multiprocessing costs start-up time that most checks do not need
        from concurrent.futures import ProcessPoolExecutor
        pool = ProcessPoolExecutor(max_workers=min(len(ps) - 1, os.cpu_count() or 1))
    try:
        futures = [pool.submit(_modular_compare, lnode, rnode, order, p, names, weights)
                   for p in ps[1:]] if pool else []
        say(f"comparing modulo {len(ps)} primes" + (" in parallel" if pool else ""))
        outcomes = [_modular_compare(lnode, rnode, order, ps[0], names, weights,
                                     _in_prime(say, 1, len(ps)))]
        if pool:
            for i, future in enumerate(futures, start=2):
                say(f"comparing modulo prime {i} of {len(ps)} (in a worker process)")
                outcomes.append(future.result())
        else:
            for i, p in enumerate(ps[1:], start=2):
                say(f"comparing modulo prime {i} of {len(ps)}")
                outcomes.append(_modular_compare(lnode, rnode, order, p, names, weights,
                                                 _in_prime(say, i, len(ps))))
    finally:
        if pool:
            pool.shutdown(cancel_futures=True)
    known: list[Exponent] = [order, order]
    nothing = False
    for v, e, none_compared, sides in outcomes:
        verified = min(verified, v)
        nothing = nothing or none_compared
        known = [min(x, y) for x, y in zip(known, sides, strict=True)]
        if e is not None and (first is None or Fraction(e) < Fraction(first)):
            first = e
    shortfall = _shortfall(order, verified, (known[0], known[1]), (lnode, rnode))
    if first is None:
        return CheckResult(None if nothing else True, order, verified, None,
                           time.perf_counter() - t0, None, None, "modular", ps, names, wt,
                           shortfall)
    # recompute both sides exactly just past the first mismatch, and report them
    say("recomputing the first mismatch exactly")
    f = Fraction(first)
    upto = max(f.numerator // f.denominator + 3, 1)
    ring = ring_for(names)      # one ring for both sides
    exact_l = evaluate(lnode, upto, ring, _own(weights, lnode))
    exact_r = evaluate(rnode, upto, ring, _own(weights, rnode))
    _, mismatch = compare_series(exact_l, exact_r, upto)
    if mismatch is None:
        raise UnableError(f"the two sides differ modulo a prime first at q^{_text(f)}, but "
                          f"their exact coefficients there could not be compared; try "
                          f"method='exact'")
    return CheckResult(False, order, verified, mismatch, time.perf_counter() - t0,
                       exact_l, exact_r, "modular", ps, names, wt, shortfall)
