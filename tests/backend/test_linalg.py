"""qseries.backend.linalg: the integer kernel against brute force over small vectors."""

from itertools import product

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from qseries.backend import integer_kernel, matrix_rank


def _in_lattice(v, basis):
    """Whether v is an integer combination of basis (small coefficients, brute force)."""
    if not basis:
        return not any(v)
    for cs in product(range(-6, 7), repeat=len(basis)):
        if all(sum(c * b[i] for c, b in zip(cs, basis, strict=True)) == v[i]
               for i in range(len(v))):
            return True
    return False


@settings(max_examples=40, deadline=None)
@given(st.integers(1, 3), st.integers(2, 4), st.data())
def test_kernel_holds_every_small_solution(rows, k, data):
    a = [data.draw(st.lists(st.integers(-3, 3), min_size=k, max_size=k)) for _ in range(rows)]
    basis = integer_kernel(a)
    for v in basis:
        assert all(sum(r[i] * v[i] for i in range(k)) == 0 for r in a)
        assert next(c for c in v if c) > 0
    assert len(basis) == k - matrix_rank(a)
    # saturated: every small integer solution is an integer combination of the basis
    for v in product(range(-2, 3), repeat=k):
        if all(sum(r[i] * v[i] for i in range(k)) == 0 for r in a):
            assert _in_lattice(list(v), basis)


def test_saturation_needs_more_than_the_rational_kernel():
    # 2x + 4y + 6z = 0: (1, 1, -1) is a solution though the row has a common factor 2
    assert integer_kernel([[2, 4, 6]]) == [[1, 1, -1], [2, -1, 0]]


def test_bad_shapes():
    with pytest.raises(ValueError):
        integer_kernel([])
    with pytest.raises(ValueError):
        integer_kernel([[1, 2], [1]])
