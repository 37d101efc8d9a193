"""Exact integer linear algebra from FLINT (``fmpz_mat``): the lattice of integer vectors x
with A x = 0, as a reduced basis.

>>> integer_kernel([[1, 2, 3], [2, 4, 6], [1, 0, 1]])
[[1, 1, -1]]
"""

from __future__ import annotations

import flint

__all__ = ["integer_kernel", "matrix_rank"]

#: most times the weight of the LLL reduction is raised before giving up
_MAX_TRIES = 12


def matrix_rank(rows: list[list[int]]) -> int:
    """The rank of an integer matrix given by its rows.

    >>> matrix_rank([[1, 2], [2, 4], [0, 0]])
    1
    """
    if not rows or not rows[0]:
        return 0
    return int(flint.fmpz_mat(rows).rank())


def _first_positive(v: list[int]) -> list[int]:
    for c in v:
        if c:
            return v if c > 0 else [-x for x in v]
    return v


def integer_kernel(rows: list[list[int]]) -> list[list[int]]:
    """A reduced basis of {x in Z^k : A x = 0} for the integer matrix A with the given rows
    (each of length k): every integer solution is an integer combination of the vectors
    returned (the lattice is saturated, not only its rational span), and the vectors are
    LLL-reduced, so short.  The rational kernel comes from FLINT's ``rref``; the integer
    basis from LLL on the rows (e_i | W c_i) with c_i the i-th column of the reduced
    independent rows and W large (raised until the rows with zero tail number the kernel's
    dimension).  Each vector's first nonzero entry is positive.

    >>> integer_kernel([[2, 4, 6]])           # saturated: (1, 1, -1) and (2, -1, 0)
    [[1, 1, -1], [2, -1, 0]]
    >>> integer_kernel([[1, 0], [0, 1]])
    []
    """
    if not rows:
        raise ValueError("integer_kernel needs at least one row")
    k = len(rows[0])
    if any(len(r) != k for r in rows):
        raise ValueError("the rows of a matrix must have the same length")
    a = flint.fmpz_mat(rows)
    reduced, _den, rank = a.rref()
    rank = int(rank)
    d = k - rank
    if d == 0:
        return []
    c = [[int(reduced[i, j]) for j in range(k)] for i in range(rank)]
    size = max((abs(x) for row in c for x in row), default=1)
    weight = (size + 1) * 2 ** (k + 8)
    for _ in range(_MAX_TRIES):
        basis = flint.fmpz_mat([[1 if j == i else 0 for j in range(k)]
                                + [weight * c[r][i] for r in range(rank)] for i in range(k)])
        red = basis.lll()
        out = []
        for i in range(k):
            row = [int(red[i, j]) for j in range(k + rank)]
            if not any(row[k:]):
                out.append(_first_positive(row[:k]))
        if len(out) == d:
            return out
        weight *= weight
    raise ArithmeticError("the LLL reduction did not separate the kernel")  # pragma: no cover
