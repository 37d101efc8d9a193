"""qseries.backend.base: the common Ring code, and the exponential ``exp_online`` (the
Euler transform of ``exp_integral``), which takes explicit lengths and never touches
python-flint's global series precision."""

import ast
import pathlib
from fractions import Fraction

import flint
import pytest
from hypothesis import given
from hypothesis import strategies as st

import qseries
from qseries.backend import GF, QQ, ZZ
from qseries.backend.base import exp_online


def _exp_reference(s: list[int], n: int) -> list[Fraction]:
    """k g[k] = sum_{j=1}^k s[j] g[k-j], term by term in Fractions (O(n^2))."""
    g = [Fraction(0)] * n
    if n:
        g[0] = Fraction(1)
    for k in range(1, n):
        g[k] = sum((s[j] * g[k - j] for j in range(1, k + 1) if j < len(s)), Fraction(0)) / k
    return g


def _euler_log(n: int) -> list[int]:
    # exp(sum_k s_k q^k / k) with s_k = -sigma(k) is Euler's (q;q)_inf
    s = [0] * n
    for x in range(1, n):
        for m in range(x, n, x):
            s[m] -= x
    return s


@given(st.lists(st.integers(-9, 9), max_size=90), st.integers(0, 90))
def test_exp_online_matches_the_recurrence(s, n):
    got = exp_online(s, n, flint.fmpq_poly, lambda a, k: flint.fmpq(a) / k)
    assert [Fraction(int(c.p), int(c.q)) for c in map(flint.fmpq, got)] == \
        _exp_reference(s, n)


def test_exp_online_in_integers_across_block_sizes():
    # lengths around the leaf size and powers of two: every branch of the recursion
    for n in (1, 2, 31, 32, 33, 64, 65, 200, 1000):
        s = _euler_log(n)
        got = exp_online(s, n, flint.fmpz_poly, lambda a, k: a // k)
        assert [int(c) for c in got] == _exp_reference(s, n)


def test_exponential_of_a_logarithm_over_the_integers():
    # the pentagonal numbers 0, 1, 2, 5, 7, 12, 15, 22, 26 with signs + - - + + - - + +
    # (Euler's pentagonal theorem)
    n = 30
    expected = [0] * n
    for e, c in ((0, 1), (1, -1), (2, -1), (5, 1), (7, 1), (12, -1), (15, -1), (22, 1), (26, 1)):
        expected[e] = c
    got = ZZ.coefficients(ZZ.exp_integral(_euler_log(n), n))
    assert got + [0] * (n - len(got)) == expected
    assert ZZ.coefficients(ZZ.exp_integral([0, 5], 0)) == []
    with pytest.raises(ArithmeticError, match="not integral"):
        ZZ.exp_integral([0, 1], 3)          # exp(q) = 1 + q + q^2/2 + ...


class _Recorder:
    """Stands in for flint.ctx and records every attribute set on it."""

    def __init__(self, real: object) -> None:
        object.__setattr__(self, "real", real)
        object.__setattr__(self, "sets", [])

    def __getattr__(self, name: str) -> object:
        return getattr(object.__getattribute__(self, "real"), name)

    def __setattr__(self, name: str, value: object) -> None:
        object.__getattribute__(self, "sets").append((name, value))
        setattr(object.__getattribute__(self, "real"), name, value)


def test_exp_integral_leaves_the_global_series_cap_alone(monkeypatch):
    # regression: exp_integral used to raise flint.ctx.cap for the length of the series
    before = flint.ctx.cap
    recorder = _Recorder(flint.ctx)
    monkeypatch.setattr(flint, "ctx", recorder)
    n = before + 50
    for ring in (ZZ, QQ, GF(1_000_003)):
        poly = ring.exp_integral(_euler_log(n), n)
        assert ring.length(poly) == n - 1 or ring.length(poly) <= n
    assert recorder.sets == []
    monkeypatch.undo()
    assert flint.ctx.cap == before


def test_no_module_sets_the_global_cap_or_uses_capped_series():
    # flint.ctx.cap is global state, and fmpz_series / fmpq_series truncate to it
    root = pathlib.Path(qseries.__file__).parent
    problems = []
    for path in root.rglob("*.py"):
        for node in ast.walk(ast.parse(path.read_text())):
            targets = node.targets if isinstance(node, ast.Assign) else \
                [node.target] if isinstance(node, (ast.AugAssign, ast.AnnAssign)) else []
            for t in targets:
                if isinstance(t, ast.Attribute) and t.attr == "cap" and \
                        isinstance(t.value, (ast.Name, ast.Attribute)) and \
                        getattr(t.value, "id", getattr(t.value, "attr", None)) == "ctx":
                    problems.append(f"{path.name}:{node.lineno} sets .cap")
            if isinstance(node, ast.Attribute) and node.attr in ("fmpz_series", "fmpq_series",
                                                                  "nmod_series"):
                problems.append(f"{path.name}:{node.lineno} uses {node.attr}")
    assert not problems, problems


@given(st.lists(st.integers(-50, 50), max_size=40), st.integers(1, 7), st.data())
def test_deflate_is_the_strided_read(coeffs, m, data):
    """Ring.deflate(p, m, r) against Python's slice of the coefficient list (ZZ, QQ)."""
    r = data.draw(st.integers(0, m - 1))
    for R in (ZZ, QQ):
        got = R.coefficients(R.deflate(R.poly(coeffs), m, r))
        want = coeffs[r::m]
        while want and want[-1] == 0:
            want = want[:-1]
        assert got == want


def test_deflate_undoes_inflate():
    p = ZZ.poly([3, -1, 4, 1, 5])
    assert ZZ.deflate(ZZ.inflate(p, 4), 4, 0) == p
    assert ZZ.length(ZZ.deflate(ZZ.inflate(p, 4), 4, 3)) == 0
