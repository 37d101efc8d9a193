"""Number-theory and number-text helpers from FLINT: partition numbers (a reference for
tests), primality proofs, decimal text of huge integers.

>>> partitions_p(10), is_prime(97), int_to_decimal(10**20)
(42, True, '100000000000000000000')
"""

from __future__ import annotations

import flint

__all__ = ["partitions_p", "is_prime", "int_to_decimal"]


def partitions_p(n: int) -> int:
    """Number of partitions of n by FLINT's Hardy-Ramanujan-Rademacher code (a reference).

    >>> partitions_p(100)
    190569292
    """
    return int(flint.fmpz(n).partitions_p())


def is_prime(n: int) -> bool:
    """Primality by FLINT (a proof, not a probable-prime test).

    >>> is_prime(2**61 - 1)
    True
    """
    return n >= 2 and bool(flint.fmpz(n).is_prime())


def int_to_decimal(n: int) -> str:
    """Decimal text of an integer of any size, by GMP (fast for huge numbers).

    >>> int_to_decimal(-12345678901234567890)
    '-12345678901234567890'
    """
    return flint.fmpz(n).str()


def _decimal(n: int) -> str:
    """Decimal text of n: Python's own below 10,000 bits, GMP's above."""
    return str(n) if n.bit_length() < 10_000 else int_to_decimal(n)


def _about(n: int) -> str:
    """n, or its order of magnitude when it is long."""
    return str(n) if n < 10**12 else f"about 10^{len(str(n)) - 1}" if n < 10**4000 else \
        "astronomically many"
