"""Bad arguments at the public surface (qseries.* and qseries.testing) get an ArgumentError
that names the argument, raised before any work: never a TypeError or AttributeError from
deep inside, never a hang."""

import signal
from contextlib import contextmanager

import pytest

import qseries
from qseries import GF, QQ, check, distributions, evaluate
from qseries.analysis import Distribution, normal_moment
from qseries.errors import ArgumentError, ArgumentTypeError
from qseries.testing import assert_identity, mismatch_report
from qseries.testing.strategies import family_members, q_products

STAT = "sum_{k>=0} z^k q^(k^2)/(q;q)_k^2"


@contextmanager
def within(seconds: int):
    """Fail (instead of hanging) when the block takes longer than ``seconds``."""
    def expired(*_args):
        raise TimeoutError(f"took longer than {seconds} s")
    old = signal.signal(signal.SIGALRM, expired)
    signal.alarm(seconds)
    try:
        yield
    finally:
        signal.alarm(0)
        signal.signal(signal.SIGALRM, old)


def refused(call, name: str, kind: type = ArgumentError) -> ArgumentError:
    with within(20), pytest.raises(kind) as info:
        call()
    assert name in str(info.value), str(info.value)
    return info.value


@pytest.mark.parametrize(("call", "name", "kind"), [
    (lambda: evaluate("z", 5, weights=1), "weights", ArgumentTypeError),
    (lambda: evaluate("z", 5, weights=[("z", 1)]), "weights", ArgumentTypeError),
    (lambda: evaluate("z", 5, weights={1: 1}), "weight", ArgumentTypeError),
    (lambda: evaluate("z", 5, weights={"z": "1"}), "weight of 'z'", ArgumentError),
    (lambda: evaluate(5, 10), "expr", ArgumentTypeError),
    (lambda: evaluate(None, 10), "expr", ArgumentTypeError),
    (lambda: evaluate("q", "10"), "order", ArgumentTypeError),
    (lambda: evaluate("q", 10, ring="ZZ"), "ring", ArgumentTypeError),
])
def test_evaluate_refuses_bad_arguments(call, name, kind):
    refused(call, name, kind)


@pytest.mark.parametrize(("kwargs", "name", "kind"), [
    ({"seed": []}, "seed", ArgumentTypeError),
    ({"seed": [], "method": "modular"}, "seed", ArgumentTypeError),
    ({"seed": 1.5, "method": "modular"}, "seed", ArgumentTypeError),
    ({"primes": "q"}, "primes", ArgumentTypeError),
    ({"primes": "q", "method": "modular"}, "primes", ArgumentTypeError),
    ({"primes": 0, "method": "modular"}, "primes", ArgumentError),
    ({"primes": 10**7, "method": "modular"}, "primes", ArgumentError),
    ({"primes": 2**63, "method": "modular"}, "primes", ArgumentError),
    ({"primes": float("inf"), "method": "modular"}, "primes", ArgumentTypeError),
    ({"order": "10"}, "order", ArgumentTypeError),
    ({"order": 0}, "order", ArgumentError),
    ({"method": 5}, "method", ArgumentError),
    ({"method": "fast"}, "method", ArgumentError),
    ({"ring": 5}, "ring", ArgumentTypeError),
    ({"progress": 5}, "progress", ArgumentTypeError),
    ({"weights": 1}, "weights", ArgumentTypeError),
])
def test_check_refuses_bad_arguments(kwargs, name, kind):
    refused(lambda: check("q", "q", **kwargs), name, kind)


@pytest.mark.parametrize(("lhs", "rhs", "name"), [(5, "q", "lhs"), ("q", [], "rhs")])
def test_check_refuses_sides_that_are_not_expressions(lhs, rhs, name):
    refused(lambda: check(lhs, rhs), name, ArgumentTypeError)


def test_the_primes_limit_is_the_command_lines():
    from qseries.analysis.compare import MAX_PRIMES
    assert MAX_PRIMES == 20
    assert len(check("q", "q", order=5, method="modular", primes=MAX_PRIMES).primes) == 20


def test_a_prime_field_is_not_silently_replaced():
    # 7q = 0 over GF(7): comparing modulo primes near 2^62, or over ZZ[z] for the extra
    # variable, would report a difference that does not exist over GF(7)
    assert check("7q", "0", ring=GF(7)).holds
    refused(lambda: check("7q", "0", ring=GF(7), method="modular"), "ring")
    refused(lambda: check("7z q", "0", ring=GF(7)), "ring")
    assert check("z/2", "z/2", ring=QQ).holds


@pytest.mark.parametrize(("args", "name", "kind"), [
    ((STAT, [], [3]), "var", ArgumentTypeError),
    ((STAT, "z", 5), "sizes", ArgumentTypeError),
    ((STAT, "z", "12"), "sizes", ArgumentTypeError),
    ((STAT, "z", [1, "2"]), "sizes", ArgumentTypeError),
    ((STAT, "z", [1.0]), "sizes", ArgumentTypeError),
    ((STAT, "z", []), "size", ArgumentError),
    ((STAT, "z", [-1]), "sizes", ArgumentError),
    ((5, "z", [3]), "expr", ArgumentTypeError),
    ((STAT, "w", [3]), "var", ArgumentError),
])
def test_distributions_refuses_bad_arguments(args, name, kind):
    refused(lambda: distributions(*args), name, kind)


def test_distributions_takes_any_sequence_of_sizes():
    assert [d.n for d in distributions(STAT, "z", (3, 4))] == [3, 4]
    assert [d.n for d in distributions(STAT, "z", range(3, 5))] == [3, 4]


def test_moments_refuse_bad_orders():
    d = Distribution(3, {0: 1, 2: 1})
    refused(lambda: d.central_moment("2"), "r", ArgumentTypeError)
    refused(lambda: d.central_moment(-1), "r", ArgumentError)
    refused(lambda: d.standardised_moment(1.5), "r", ArgumentTypeError)
    refused(lambda: normal_moment(None), "r", ArgumentTypeError)


def test_result_tables_refuse_bad_radii():
    r = check("1", "1 + q^3", order=10)
    refused(lambda: r.neighbours("2"), "radius", ArgumentTypeError)
    refused(lambda: r.neighbours(-1), "radius", ArgumentError)
    # a huge radius costs nothing: only the known coefficients are visited
    with within(5):
        assert [e for e, _, _ in r.neighbours(10**15)] == list(range(10))


def test_testing_helpers_refuse_bad_arguments():
    refused(lambda: mismatch_report(5), "r", ArgumentTypeError)
    refused(lambda: mismatch_report(check("1", "q", order=3), radius="1"), "radius",
            ArgumentTypeError)
    refused(lambda: assert_identity(5, "q"), "lhs", ArgumentTypeError)
    refused(lambda: assert_identity("q", "q", order=1.5), "order", ArgumentTypeError)
    refused(lambda: family_members("no-such-family"), "no-such-family")
    refused(lambda: family_members(5), "key", ArgumentTypeError)
    refused(lambda: q_products(max_factors=0), "max_factors")
    refused(lambda: q_products(max_modulus="8"), "max_modulus", ArgumentTypeError)


def test_argument_errors_are_exported():
    assert qseries.ArgumentError is ArgumentError
    assert qseries.ArgumentTypeError is ArgumentTypeError
    assert issubclass(qseries.PrecisionError, qseries.QSeriesError)


@pytest.mark.parametrize(("call", "name"), [
    (lambda: qseries.parse(5), "text"),
    (lambda: qseries.parse(b"q"), "text"),
    (lambda: qseries.parse("q", 5), "bound"),
    (lambda: qseries.parse("q", "k"), "bound"),       # a string, not a list of names
    (lambda: qseries.parse("q", [1]), "bound[0]"),
    (lambda: qseries.lang.show("q"), "node"),
    (lambda: qseries.lang.show(None), "node"),
    (lambda: qseries.analysis.diagnose(5), "r"),
    (lambda: qseries.product_form(5), "expr"),
    (lambda: qseries.product_form("q", "x"), "order"),
])
def test_syntax_and_analysis_helpers_refuse_bad_types(call, name):
    # issue 12: parse/show/diagnose raised TypeError or AttributeError from deep inside
    refused(call, name, ArgumentTypeError)


def test_parse_takes_any_iterable_of_bound_names():
    assert qseries.parse("k q", ("k",)) == qseries.parse("k q", iter(["k"]))


@pytest.mark.parametrize(("call", "name"), [
    (lambda: GF("7"), "p"),
    (lambda: GF(True), "p"),
    (lambda: qseries.backend.laurent_ring("za"), "names"),
    (lambda: qseries.backend.laurent_ring((1,)), "names[0]"),
])
def test_ring_constructors_refuse_bad_types(call, name):
    # issue 12: GF("x") failed inside a comparison, laurent_ring("za") read a string as names
    refused(call, name, ArgumentTypeError)
