"""Integer relations among truncated series: c_1 f_1 + ... + c_k f_k = 0 below the order,
or, with ``degree`` d > 1, polynomial relations (the monomials of total degree <= d in the
series, the constant 1 included, as the unknowns).

The coefficients below q^N of the unknowns are the columns of an integer matrix (a column
with fractions is scaled by its denominators' lcm); the relations are its integer kernel, a
reduced basis by FLINT's exact elimination and LLL (``backend.integer_kernel``).  With fewer
coefficients than unknowns the order cannot pin anything down, and the call refuses.  Each
result says how many coefficients beyond the number of unknowns confirm it, and whether the
relations found from the first coefficients alone were already the final ones (``stable``).
Agreement below the order is evidence, not a proof.

>>> r = relations(["theta_3(q)^4", "theta_2(q)^4", "theta_4(q)^4"], 100)   # Jacobi
>>> r.relations, r.confirmed
(((1, -1, -1),), 97)
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass
from fractions import Fraction
from itertools import combinations_with_replacement

from ..backend import integer_kernel, matrix_rank
from ..engine import evaluate
from ..errors import (
    ArgumentError,
    ArgumentTypeError,
    DomainError,
    UnableError,
    integer_argument,
    typed_argument,
)
from ..lang import Node
from ..lang.ast import extra_variables
from ..lang.definitions import Definition
from ..lang.parser import parse
from ..lang.printer import show
from ..series import MAX_LENGTH, ZZ, Series

Definitions = Mapping[str, Definition] | Iterable[str] | None

#: most unknowns (series, or monomials in them) of one search
MAX_UNKNOWNS = 400
#: highest total degree of polynomial relations
MAX_DEGREE = 12
#: most series in one call
MAX_SERIES = 50


@dataclass(frozen=True)
class Relations:
    """The integer relations found below q^``order``: ``relations`` is a reduced basis of
    the lattice of coefficient vectors, each entry going with the monomial of the same
    index in ``monomials`` (exponents of the series, in the order given; for degree 1 the
    series themselves).  ``equations`` coefficients were compared for ``unknowns``
    unknowns; ``confirmed`` = equations - unknowns; ``stable`` says whether the first
    unknowns + confirmed // 2 coefficients already gave the same relations."""

    labels: tuple[str, ...]
    order: int
    degree: int
    monomials: tuple[tuple[int, ...], ...]
    relations: tuple[tuple[int, ...], ...]
    equations: int
    unknowns: int
    stable: bool

    @property
    def confirmed(self) -> int:
        return self.equations - self.unknowns

    def text(self, relation: Sequence[int]) -> str:
        """One relation in the notation, ``... = 0``.

        >>> r = relations(["theta_3(q)^4", "theta_2(q)^4", "theta_4(q)^4"], 50)
        >>> r.text(r.relations[0])
        '(theta_3(q)^4) - (theta_2(q)^4) - (theta_4(q)^4) = 0'
        """
        parts: list[str] = []
        for c, mono in zip(relation, self.monomials, strict=True):
            if not c:
                continue
            factors = [f"({self.labels[i]})" + (f"^{e}" if e > 1 else "")
                       for i, e in enumerate(mono) if e]
            body = " ".join(factors)
            size = abs(c)
            term = (str(size) if not body else body if size == 1 else f"{size} {body}")
            sign = "-" if c < 0 else "+"
            parts.append(term if not parts and c > 0 else
                         f"-{term}" if not parts else f"{sign} {term}")
        return " ".join(parts) + " = 0"


def _monomials(k: int, degree: int) -> list[tuple[int, ...]]:
    """Exponent vectors: the k series themselves for degree 1, else every monomial of total
    degree 0 .. degree (graded, then lexicographic)."""
    if degree == 1:
        return [tuple(1 if j == i else 0 for j in range(k)) for i in range(k)]
    out = []
    for d in range(degree + 1):
        for combo in combinations_with_replacement(range(k), d):
            out.append(tuple(combo.count(i) for i in range(k)))
    return out


def _column(s: Series, lo: Fraction, n: int) -> list[int]:
    """The coefficients of q^lo .. q^(lo+n-1) as integers (scaled by their denominators)."""
    coeffs = s.coefficient_list(n, start=lo) if not s.is_zero() else [0] * n
    if any(not isinstance(c, (int, Fraction)) for c in coeffs):
        raise DomainError("a coefficient is not a number")
    den = math.lcm(*(Fraction(c).denominator for c in coeffs)) if coeffs else 1
    return [int(Fraction(c) * den) for c in coeffs]


def relations(series: Sequence[str | Node | Series], order: int, *, degree: int = 1,
              definitions: Definitions = None,
              labels: Sequence[str] | None = None) -> Relations:
    """A reduced basis of the integer relations among ``series`` (expressions or Series)
    below q^order: linear ones (``degree=1``, a vector per relation in the order given) or
    polynomial ones of total degree <= ``degree`` (unknowns: the monomials, constant
    included).  Linear relations need the series' exponents in one class (q^c times integer
    powers); polynomial ones integer exponents.  Refused when there are more unknowns than
    coefficients below the order.

    >>> r = relations(["theta_3(q)^2", "theta_3(q^2)^2", "theta_2(q^2)^2"], 60)
    >>> r.relations, r.stable
    (((1, -1, -1),), True)
    >>> relations(["1/(q;q)_inf", "(q;q)_inf"], 1)
    Traceback (most recent call last):
    ...
    qseries.errors.ArgumentError: 2 unknowns need more than 1 coefficients: raise the order
    """
    if isinstance(series, (str, bytes, Node, Series)) or not isinstance(series, Sequence):
        raise ArgumentTypeError("series must be a list of expressions or Series")
    k = len(series)
    if not 1 <= k <= MAX_SERIES:
        raise ArgumentError(f"give between 1 and {MAX_SERIES} series, not {k}")
    order = integer_argument("order", order, 1, MAX_LENGTH)
    degree = integer_argument("degree", degree, 1, MAX_DEGREE)
    monos = _monomials(k, degree)
    if len(monos) > MAX_UNKNOWNS:
        raise UnableError(f"{len(monos)} monomials of degree <= {degree} in {k} series are "
                          f"more than the limit {MAX_UNKNOWNS}")
    values: list[Series] = []
    names: list[str] = []
    for i, f in enumerate(series):
        typed_argument(f"series[{i}]", f, (str, Node, Series),
                       "an expression (a string or a syntax tree) or a Series")
        if isinstance(f, Series):
            values.append(f)
            names.append(f"f{i + 1}")
            continue
        node = parse(f, definitions=definitions) if isinstance(f, str) else f
        extra = sorted(extra_variables(node))
        if extra:
            raise DomainError(f"relations are found among series in q alone; {extra[0]!r} "
                              f"is an extra variable")
        values.append(evaluate(node, order, ZZ if not isinstance(f, Series) else None))
        names.append(f if isinstance(f, str) else show(node))
    if labels is not None:
        if len(labels) != k or not all(isinstance(x, str) for x in labels):
            raise ArgumentError("labels must be one string per series")
        names = list(labels)
    for v in values:
        v.one_class("a relation search")
    if degree == 1:
        offsets = {v.offset for v in values if not v.is_zero()}
        if len(offsets) > 1:
            raise DomainError("the series' exponents lie in different classes (q^c times "
                              "integer powers for different c): no linear relation can mix "
                              "them; multiply each by its own power of q first")
        columns = values
    else:
        if any(v.offset != 0 and not v.is_zero() for v in values):
            raise DomainError("polynomial relations need series in integer powers of q: "
                              "multiply a q^c normalisation away first")
        columns = []
        one = Series.constant(1)
        for mono in monos:
            acc = one
            for i, e in enumerate(mono):
                if e:
                    acc = (acc * values[i].power(e, order)).truncate(order)
            columns.append(acc)
    known = [c.precision for c in columns if c.precision is not None]
    top = min([Fraction(order), *(Fraction(p) for p in known)])
    lows = [Fraction(c.valuation) for c in columns if not c.is_zero()]
    offset = next((c.offset for c in columns if not c.is_zero()), Fraction(0))
    lo = min([Fraction(0) + offset, *lows])
    n = max(int(math.ceil(top - lo)), 0)
    unknowns = len(monos)
    if n <= unknowns:
        raise ArgumentError(f"{unknowns} unknowns need more than {n} coefficients: raise the "
                            f"order")
    cols = [_column(c, lo, n) for c in columns]
    rows = [[cols[j][i] for j in range(unknowns)] for i in range(n)]
    basis = integer_kernel(rows)
    head = unknowns + (n - unknowns) // 2
    stable = matrix_rank(rows[:head]) == unknowns - len(basis)
    top_int = int(math.floor(top)) if top.denominator == 1 else top
    return Relations(tuple(names), top_int, degree, tuple(monos),  # type: ignore[arg-type]
                     tuple(tuple(v) for v in basis), n, unknowns, stable)


@dataclass(frozen=True)
class Combination:
    """``target`` written as a combination of ``basis`` below q^``order``: ``coefficients``
    (exact fractions, one per basis series, in the order given) or None when the target is
    not in the span of the basis there.  The evidence is that of the underlying relation
    search: ``equations`` coefficients for ``unknowns`` unknowns, ``stable`` as in
    :class:`Relations`.  Agreement below the order is evidence, not a proof."""

    target: str
    basis: tuple[str, ...]
    order: int
    coefficients: tuple[Fraction, ...] | None
    equations: int
    unknowns: int
    stable: bool

    @property
    def confirmed(self) -> int:
        return self.equations - self.unknowns

    def text(self) -> str:
        """The combination in the notation, ``target = c_1 (b_1) + ...``.

        >>> express("theta_3(q)^2", ["theta_3(q^2)^2", "theta_2(q^2)^2"], 40).text()
        '(theta_3(q)^2) = (theta_3(q^2)^2) + (theta_2(q^2)^2)'
        """
        if self.coefficients is None:
            return f"({self.target}) is not in the span of the basis below q^{self.order}"
        parts: list[str] = []
        for c, label in zip(self.coefficients, self.basis, strict=True):
            if not c:
                continue
            size = abs(c)
            term = f"({label})" if size == 1 else f"{size} ({label})"
            parts.append((f"-{term}" if c < 0 else term) if not parts else
                         f"{'-' if c < 0 else '+'} {term}")
        return f"({self.target}) = " + (" ".join(parts) if parts else "0")


def express(target: str | Node | Series, basis: Sequence[str | Node | Series], order: int,
            *, definitions: Definitions = None,
            labels: Sequence[str] | None = None) -> Combination:
    """``target`` as a linear combination of the series in ``basis`` below q^order, with
    exact rational coefficients, found by the relation search among target and basis (a
    relation with a non-zero coefficient at the target, solved for it).  The basis must be
    linearly independent below the order (else the combination is not unique: refused,
    naming a relation among the basis); a target outside the span gives ``coefficients``
    None.  ``labels`` names the target and then each basis series.

    Ramanujan's sum_n p(5n+4) q^n = 5 (q^5;q^5)_inf^5/(q;q)_inf^6, from the dissection:

    >>> express("[q^(5n+4)] 1/(q;q)_inf", ["(q^5;q^5)_inf^5/(q;q)_inf^6"], 60).coefficients
    (Fraction(5, 1),)
    >>> express("1/(1-q)", ["1", "q/(1-q)", "1/(1-q)^2"], 30).coefficients
    (Fraction(1, 1), Fraction(1, 1), Fraction(0, 1))
    """
    if isinstance(basis, (str, bytes, Node, Series)) or not isinstance(basis, Sequence):
        raise ArgumentTypeError("basis must be a list of expressions or Series")
    if not basis:
        raise ArgumentError("give at least one basis series")
    found = relations([target, *basis], order, definitions=definitions, labels=labels)
    dependent = [v for v in found.relations if v[0] == 0]
    if len(found.relations) > 1 or dependent:
        v = dependent[0] if dependent else _eliminate_target(found.relations)
        among = Relations(found.labels[1:], found.order, 1,
                          tuple(m[1:] for m in found.monomials[1:]), (v[1:],),
                          found.equations, found.unknowns - 1, found.stable)
        raise DomainError(f"the basis is linearly dependent below q^{found.order} "
                          f"({among.text(v[1:])}): the combination would not be unique; "
                          f"leave a series out")
    coefficients = None
    if found.relations:
        v = found.relations[0]
        coefficients = tuple(Fraction(-c, v[0]) for c in v[1:])
    return Combination(found.labels[0], found.labels[1:], found.order, coefficients,
                       found.equations, found.unknowns, found.stable)


def _eliminate_target(basis: Sequence[Sequence[int]]) -> tuple[int, ...]:
    """A non-zero vector of the lattice spanned by ``basis`` with first entry 0 (two
    vectors with non-zero first entries combined to cancel it)."""
    a, b = basis[0], basis[1]
    g = math.gcd(a[0], b[0])
    return tuple(b[0] // g * x - a[0] // g * y for x, y in zip(a, b, strict=True))
