"""The one table of named functions of the notation.

The parser learns which names are functions from :data:`FUNCTIONS`; the ``qseries notation``
command and the README's list are generated from it.  An entry either builds a series from
evaluated arguments at an explicit order and ring (``build``), or is defined in the notation
itself (``definitions``: texts such as ``"phi(x) = sum_{n=-inf}^{inf} x^(n^2)"``, one per
number of arguments), which the parser expands in place, so that any argument works
(``phi(-q^3)``, ``chi(z q)``).  ``source`` names where the convention is printed.

>>> sorted(FUNCTIONS)
['chi', 'eta', 'f', 'gaussian', 'phi', 'psi', 'theta_2', 'theta_3', 'theta_4']
>>> FUNCTIONS['eta'].example
'eta(q)^3'
>>> FUNCTIONS['f'].definitions[1]
'f(x) = f(x, -x^2)'
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from fractions import Fraction

from ..errors import DomainError, UnableError
from ..series import Ring, Series
from .pochhammer import euler_product, gaussian_binomial, monomial_parts

Value = Fraction | Series


@dataclass(frozen=True)
class FunctionEntry:
    """One named function: its name, arguments, meaning, an example and its builder."""

    name: str
    arguments: tuple[str, ...]
    meaning: str
    example: str
    build: Callable[[tuple[Value, ...], Ring, int], Series] | None
    #: True when every value has constant term 1 or is 0 (valuation 0 whenever nonzero)
    unit_constant_term: bool = False
    #: the function in the notation, ``"name(params) = body"``, one text per arity
    definitions: tuple[str, ...] = ()
    #: where the convention is printed
    source: str = ""


def _q_power(arg: Value, fname: str, signed: bool = False) -> tuple[int, int]:
    """(s, d) for an argument s q^d with d a positive integer and s = 1 (or s = -1 when
    ``signed``: the function is then taken at -q^d)."""
    if isinstance(arg, Series):
        mono = monomial_parts(arg)
        if mono is not None and mono[1].denominator == 1 and mono[1] >= 1:
            if mono[0] == 1 or (signed and mono[0] == -1):
                return int(mono[0]), int(mono[1])
            if mono[0] == -1:
                raise DomainError(f"{fname}(-q^d) is not a series in q: its expansion starts "
                                  f"with a fractional power of -q")
    raise DomainError(f"{fname}(...) takes a power q^d of q with d a positive integer"
                      + (", or -q^d" if signed else ""))


def _integer(arg: Value, fname: str) -> int:
    if isinstance(arg, Fraction) and arg.denominator == 1:
        return int(arg)
    raise DomainError(f"{fname}(...) takes integer arguments")


def _eta(args: tuple[Value, ...], ring: Ring, order: int) -> Series:
    _, d = _q_power(args[0], "eta")
    # eta(d tau) = q^(d/24) (q^d; q^d)_inf
    return euler_product(d, ring, order).shift(Fraction(d, 24))


def _theta_sum(d: int, ring: Ring, order: int, squares_of_halves: bool, alternate: bool
               ) -> Series:
    coeffs = [0] * max(order, 0)
    if squares_of_halves:
        # theta_2 = 2 q^(1/4) sum_{n>=0} q^(n(n+1)); stored without the q^(1/4)
        n = 0
        while d * n * (n + 1) < order:
            coeffs[d * n * (n + 1)] += 2
            n += 1
    else:
        n = 0
        while d * n * n < order:
            c = (-1) ** n if alternate else 1
            coeffs[d * n * n] += c if n == 0 else 2 * c
            n += 1
    return Series.from_int_list(coeffs, ring, prec=order)


def _theta2(args: tuple[Value, ...], ring: Ring, order: int) -> Series:
    _, d = _q_power(args[0], "theta_2")
    return _theta_sum(d, ring, order, True, False).shift(Fraction(d, 4))


def _theta3(args: tuple[Value, ...], ring: Ring, order: int) -> Series:
    # theta_3(-q^d) = theta_4(q^d): the term q^(d n^2) takes the sign (-1)^(n^2) = (-1)^n
    s, d = _q_power(args[0], "theta_3", signed=True)
    return _theta_sum(d, ring, order, False, s == -1)


def _theta4(args: tuple[Value, ...], ring: Ring, order: int) -> Series:
    s, d = _q_power(args[0], "theta_4", signed=True)
    return _theta_sum(d, ring, order, False, s == 1)


def _gaussian(args: tuple[Value, ...], ring: Ring, order: int) -> Series:
    n, k = (_integer(a, "gaussian") for a in args)
    if n < 0:
        raise UnableError("gaussian(n, k) is defined here for n >= 0")
    return gaussian_binomial(n, k, ring, order)


_BERNDT_22 = "B. C. Berndt, Ramanujan's Notebooks, Part III, Chapter 16, Entry 22 (from memory)"

FUNCTIONS: dict[str, FunctionEntry] = {
    e.name: e
    for e in [
        FunctionEntry("eta", ("q^d",), "Dedekind's eta(d tau) = q^(d/24) (q^d;q^d)_inf; "
                      "also written eta(tau), eta(5tau)", "eta(q)^3", _eta,
                      source="K. Ono, The Web of Modularity (2004), Chapter 1 (from memory)"),
        FunctionEntry("theta_2", ("q^d",),
                      "Jacobi's theta_2 = sum_{n=-inf}^{inf} q^(d(n+1/2)^2)", "theta_2(q)",
                      _theta2, source="E. T. Whittaker, G. N. Watson, A Course of Modern "
                                      "Analysis, section 21.11 (from memory), nome q^d"),
        FunctionEntry("theta_3", ("q^d or -q^d",),
                      "Jacobi's theta_3 = sum_{n=-inf}^{inf} q^(d n^2)", "theta_3(q)^2",
                      _theta3, True, source="Whittaker and Watson, section 21.11 (from memory)"),
        FunctionEntry("theta_4", ("q^d or -q^d",),
                      "Jacobi's theta_4 = sum_{n=-inf}^{inf} (-1)^n q^(d n^2)", "theta_4(q^2)",
                      _theta4, True, source="Whittaker and Watson, section 21.11 (from memory)"),
        FunctionEntry("gaussian", ("n", "k"),
                      "the q-binomial coefficient (q;q)_n/((q;q)_k (q;q)_(n-k)), 0 unless 0<=k<=n",
                      "gaussian(6, 3)", _gaussian, True,
                      source="G. E. Andrews, The Theory of Partitions (1976), Chapter 3 "
                             "(from memory)"),
        FunctionEntry("f", ("a", "b"),
                      "Ramanujan's theta function f(a,b) = sum_{n=-inf}^{inf} a^(n(n+1)/2) "
                      "b^(n(n-1)/2); with one argument f(x) = f(x, -x^2), so f(-q) = (q;q)_inf",
                      "f(-q)^3", None,
                      definitions=("f(a, b) = sum_{n=-inf}^{inf} a^(n(n+1)/2) b^(n(n-1)/2)",
                                   "f(x) = f(x, -x^2)"),
                      source="B. C. Berndt, Ramanujan's Notebooks, Part III (1991), Chapter "
                             "16, (18.1) and Entry 22 (from memory)"),
        FunctionEntry("phi", ("x",), "Ramanujan's phi(x) = f(x, x) = sum_{n=-inf}^{inf} x^(n^2)",
                      "phi(-q)^2", None,
                      definitions=("phi(x) = sum_{n=-inf}^{inf} x^(n^2)",),
                      source=_BERNDT_22),
        FunctionEntry("psi", ("x",),
                      "Ramanujan's psi(x) = f(x, x^3) = sum_{n>=0} x^(n(n+1)/2)",
                      "psi(q)^2", None,
                      definitions=("psi(x) = sum_{n>=0} x^(n(n+1)/2)",),
                      source=_BERNDT_22),
        FunctionEntry("chi", ("x",), "Ramanujan's chi(x) = (-x;x^2)_inf", "chi(-q)", None,
                      definitions=("chi(x) = (-x;x^2)_inf",),
                      source=_BERNDT_22),
    ]
}
