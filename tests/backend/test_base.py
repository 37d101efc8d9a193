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
from qseries.backend import GF, QQ, ZZ, laurent_ring
from qseries.backend.base import exp_online
from qseries.errors import ArgumentError, ArgumentTypeError


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


# -- public operations validate; the underscore twins are the unchecked implementations --

#: every operation of the Ring interface on polynomials, with good arguments (``P`` stands for
#: a polynomial of the ring under test)
P = object()
OPERATIONS = {
    "coefficients": (P,), "length": (P,), "valuation": (P,), "coefficient_bits": (P,),
    "coeff": (P, 0), "truncate": (P, 2), "shift_up": (P, 1), "shift_down": (P, 0),
    "mul_low": (P, P, 3), "pow_low": (P, 2, 3), "inflate": (P, 2), "inv_series": (P, 3),
    "binomial_mul": (P, 1, 1, 3), "binomial_div": (P, 1, 1, 3), "exp_integral": ([0, -1, -1], 3),
}
#: for each operation, (argument index, bad value, name in the message, error type)
BAD_ARGUMENTS = {
    "coeff": [(1, -1, "i", ArgumentError), (1, 1.0, "i", ArgumentTypeError)],
    "truncate": [(1, -1, "n", ArgumentError), (1, "2", "n", ArgumentTypeError)],
    "shift_up": [(1, -1, "k", ArgumentError), (1, True, "k", ArgumentTypeError)],
    "shift_down": [(1, -1, "k", ArgumentError)],
    "mul_low": [(2, "x", "n", ArgumentTypeError), (2, -3, "n", ArgumentError)],
    "pow_low": [(1, -2, "e", ArgumentError), (2, -1, "n", ArgumentError),
                (1, 0.5, "e", ArgumentTypeError)],
    "inflate": [(1, 0, "d", ArgumentError), (1, 2.0, "d", ArgumentTypeError)],
    "inv_series": [(1, -1, "n", ArgumentError), (1, None, "n", ArgumentTypeError)],
    "binomial_mul": [(1, "1", "c", ArgumentTypeError), (1, True, "c", ArgumentTypeError),
                     (2, -1, "j", ArgumentError), (3, -1, "n", ArgumentError)],
    "binomial_div": [(1, 1.5, "c", ArgumentTypeError), (2, 0, "j", ArgumentError),
                     (3, "3", "n", ArgumentTypeError)],
    "exp_integral": [(0, "s", "s", ArgumentTypeError), (1, -1, "n", ArgumentError)],
}
RINGS = [ZZ, QQ, GF(101), laurent_ring(("z",))]


def _arguments(ring, op):
    return [ring.poly([1, 1]) if a is P else a for a in OPERATIONS[op]]


@pytest.mark.parametrize("ring", RINGS, ids=repr)
@pytest.mark.parametrize("op", OPERATIONS)
def test_public_operation_agrees_with_its_unchecked_twin(ring, op):
    args = _arguments(ring, op)
    got, twin = getattr(ring, op)(*args), getattr(ring, "_" + op)(*args)
    assert got == twin


@pytest.mark.parametrize("ring", RINGS, ids=repr)
@pytest.mark.parametrize("op", [op for op in OPERATIONS if P in OPERATIONS[op]])
def test_public_operation_refuses_a_foreign_polynomial(ring, op):
    names = ["a", "b"] if op == "mul_low" else ["p"]
    for i, name in enumerate(names):
        for bad in ("x", [1, 1], 3, ZZ.poly([1]) if ring != ZZ else QQ.poly([1])):
            args = _arguments(ring, op)
            args[i] = bad
            with pytest.raises(ArgumentTypeError, match=rf"^{name} must be a polynomial over"):
                getattr(ring, op)(*args)


@pytest.mark.parametrize("ring", RINGS, ids=repr)
@pytest.mark.parametrize("op, index, bad, name, error",
                         [(op, *case) for op, cases in BAD_ARGUMENTS.items() for case in cases])
def test_public_operation_refuses_a_bad_number(ring, op, index, bad, name, error):
    args = _arguments(ring, op)
    args[index] = bad
    with pytest.raises(error, match=rf"^{name} must be") as got:
        getattr(ring, op)(*args)
    assert isinstance(got.value, ArgumentError)
    if error is ArgumentError:
        assert not isinstance(got.value, ArgumentTypeError)


def test_the_examples_of_the_issue_are_refused_by_name():
    p = ZZ.poly([1, 1])
    for call, name in ((lambda: ZZ.mul_low(p, p, "x"), "n"), (lambda: ZZ.inv_series("x", 3), "p"),
                       (lambda: ZZ.inflate(p, 0), "d"), (lambda: ZZ.pow_low(p, -2, 3), "e")):
        with pytest.raises(ArgumentError, match=rf"^{name} must be"):
            call()


def test_another_modulus_or_laurent_ring_is_refused():
    with pytest.raises(ArgumentTypeError, match=r"^a must be a polynomial over GF\(7\), not one "
                                                 r"over GF\(5\)"):
        GF(7).mul_low(GF(5).poly([1]), GF(7).poly([1]), 2)
    Rz, Rq = laurent_ring(("z",)), laurent_ring(("z",), rational=True)
    with pytest.raises(ArgumentTypeError, match=r"^p must be a polynomial over ZZ\[z"):
        Rz.truncate(Rq.poly([1]), 1)
    # a scalar of the Laurent ring is a valid c
    z = Rz.gen("z")
    assert Rz.coefficients(Rz.binomial_mul(Rz.poly([1]), z, 1, None)) == [1, -z]


def test_rings_override_only_the_unchecked_operations():
    from qseries.backend.base import Ring
    from qseries.backend.integer import IntegerRing
    from qseries.backend.laurent import LaurentRing
    from qseries.backend.modular import ModularRing
    from qseries.backend.rational import RationalRing
    for cls in (IntegerRing, RationalRing, ModularRing, LaurentRing):
        assert not set(OPERATIONS) & set(vars(cls)), cls
    for op in OPERATIONS:
        assert op in vars(Ring) and "_" + op in vars(Ring)


def test_code_inside_qseries_calls_the_unchecked_operations():
    # the public names check their arguments (O(1), but on hot paths); the library's own
    # calls on a ring (``R.op``, ``ring.op``, ``x.ring.op``, ``self.op`` in a ring) use ``_op``
    root = pathlib.Path(qseries.__file__).parent
    problems = []
    for path in root.rglob("*.py"):
        in_backend = path.parent.name == "backend"
        for node in ast.walk(ast.parse(path.read_text())):
            if not (isinstance(node, ast.Call) and isinstance(node.func, ast.Attribute)
                    and node.func.attr in OPERATIONS):
                continue
            owner = node.func.value
            ring_like = (isinstance(owner, ast.Name) and owner.id in ("R", "ring", "ZZ", "QQ")) \
                or (isinstance(owner, ast.Attribute) and owner.attr == "ring") \
                or (in_backend and isinstance(owner, ast.Name) and owner.id == "self")
            if ring_like:
                problems.append(f"{path.name}:{node.lineno} calls {node.func.attr}")
    assert not problems, problems


@pytest.mark.parametrize("ring", RINGS, ids=repr)
def test_shift_down_drops_the_lowest_coefficients_in_every_ring(ring):
    # the Laurent ring used to divide exactly (FLINT's own DomainError when p had a term
    # below q^k); every ring now drops them
    assert ring.coefficients(ring.shift_down(ring.poly([1, 2, 3]), 1)) == [2, 3]
    assert ring.coefficients(ring.shift_down(ring.poly([1, 2, 3]), 5)) == []


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


@pytest.mark.parametrize("ring_name", ["ZZ", "QQ", "GF", "laurent"])
def test_construction_methods_refuse_what_is_not_a_number_or_a_list(ring_name):
    # issue 12: ZZ.poly("x") raised a bare TypeError from inside FLINT
    import qseries.backend as b
    from qseries.errors import ArgumentTypeError
    ring = {"ZZ": b.ZZ, "QQ": b.QQ, "GF": b.GF(101), "laurent": b.laurent_ring(("z",))}[ring_name]
    for call, name in [(lambda: ring.poly("x"), "coeffs"), (lambda: ring.poly(5), "coeffs"),
                       (lambda: ring.poly_from_ints("12"), "coeffs"),
                       (lambda: ring.coerce("x"), "c"), (lambda: ring.coerce(1.5), "c"),
                       (lambda: ring.coerce(None), "c"), (lambda: ring.to_number("x"), "c"),
                       (lambda: ring.convert("x"), "p")]:
        with pytest.raises(ArgumentTypeError, match=f"^{name} must"):
            call()
    assert ring.to_number(ring.coerce(3)) == 3 or ring_name == "laurent"
