"""The one table of named functions of the notation.

The parser learns which names are functions from :data:`FUNCTIONS`; the ``qseries notation``
command and the README's list are generated from it.  Each entry builds a series from
evaluated arguments at an explicit order and ring.

>>> sorted(FUNCTIONS)
['eta', 'gaussian', 'theta2', 'theta3', 'theta4']
>>> FUNCTIONS['eta'].example
'eta(q)^3'
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
    build: Callable[[tuple[Value, ...], Ring, int], Series]
    #: True when every value has constant term 1 or is 0 (valuation 0 whenever nonzero)
    unit_constant_term: bool = False


def _q_power(arg: Value, fname: str) -> int:
    """The d of an argument that must be the monomial q^d with d a positive integer."""
    if isinstance(arg, Series):
        mono = monomial_parts(arg)
        if mono is not None and mono[0] == 1 and mono[1].denominator == 1 and mono[1] >= 1:
            return int(mono[1])
    raise DomainError(f"{fname}(...) takes a power q^d of q with d a positive integer")


def _integer(arg: Value, fname: str) -> int:
    if isinstance(arg, Fraction) and arg.denominator == 1:
        return int(arg)
    raise DomainError(f"{fname}(...) takes integer arguments")


def _eta(args: tuple[Value, ...], ring: Ring, order: int) -> Series:
    d = _q_power(args[0], "eta")
    # eta(d tau) = q^(d/24) (q^d; q^d)_inf
    return euler_product(d, ring, order).shift(Fraction(d, 24))


def _theta_sum(d: int, ring: Ring, order: int, squares_of_halves: bool, alternate: bool) -> Series:
    coeffs = [0] * max(order, 0)
    if squares_of_halves:
        # theta2 = 2 q^(1/4) sum_{n>=0} q^(n(n+1)); stored without the q^(1/4)
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
    d = _q_power(args[0], "theta2")
    return _theta_sum(d, ring, order, True, False).shift(Fraction(d, 4))


def _theta3(args: tuple[Value, ...], ring: Ring, order: int) -> Series:
    return _theta_sum(_q_power(args[0], "theta3"), ring, order, False, False)


def _theta4(args: tuple[Value, ...], ring: Ring, order: int) -> Series:
    return _theta_sum(_q_power(args[0], "theta4"), ring, order, False, True)


def _gaussian(args: tuple[Value, ...], ring: Ring, order: int) -> Series:
    n, k = (_integer(a, "gaussian") for a in args)
    if n < 0:
        raise UnableError("gaussian(n, k) is defined here for n >= 0")
    return gaussian_binomial(n, k, ring, order)


FUNCTIONS: dict[str, FunctionEntry] = {
    e.name: e
    for e in [
        FunctionEntry("eta", ("q^d",), "Dedekind's eta(d tau) = q^(d/24) (q^d;q^d)_inf",
                      "eta(q)^3", _eta),
        FunctionEntry("theta2", ("q^d",), "Jacobi's theta_2 = sum_{n=-inf}^{inf} q^(d(n+1/2)^2)",
                      "theta2(q)", _theta2),
        FunctionEntry("theta3", ("q^d",), "Jacobi's theta_3 = sum_{n=-inf}^{inf} q^(d n^2)",
                      "theta3(q)^2", _theta3, True),
        FunctionEntry("theta4", ("q^d",), "Jacobi's theta_4 = sum_{n=-inf}^{inf} (-1)^n q^(d n^2)",
                      "theta4(q^2)", _theta4, True),
        FunctionEntry("gaussian", ("n", "k"),
                      "the q-binomial coefficient (q;q)_n/((q;q)_k (q;q)_(n-k)), 0 unless 0<=k<=n",
                      "gaussian(6, 3)", _gaussian, True),
    ]
}
