"""The exception tree: argument errors, the "a weight may help" field, pickling."""

import pickle

import pytest

from qseries.errors import (
    ArgumentError,
    ArgumentTypeError,
    DomainError,
    ParseError,
    PrecisionError,
    QSeriesError,
    UnableError,
    integer_argument,
    weight_may_help,
)


def test_argument_errors_are_qseries_errors_and_builtin_errors():
    assert issubclass(ArgumentError, QSeriesError) and issubclass(ArgumentError, ValueError)
    assert issubclass(ArgumentTypeError, ArgumentError)
    assert issubclass(ArgumentTypeError, TypeError)
    assert issubclass(PrecisionError, QSeriesError)
    assert not issubclass(PrecisionError, DomainError)     # unknown is not undefined


@pytest.mark.parametrize(("value", "kind", "words"), [
    ("q", ArgumentTypeError, "str"),
    (2.0, ArgumentTypeError, "float"),
    (float("inf"), ArgumentTypeError, "float"),
    (True, ArgumentTypeError, "bool"),
    (0, ArgumentError, "between 1 and 20"),
    (21, ArgumentError, "between 1 and 20"),
    (2**63, ArgumentError, "between 1 and 20"),
])
def test_integer_argument_names_the_argument(value, kind, words):
    with pytest.raises(kind, match="primes") as info:
        integer_argument("primes", value, 1, 20)
    assert words in str(info.value)
    assert integer_argument("primes", 20, 1, 20) == 20


def test_integer_argument_shortens_huge_values():
    with pytest.raises(ArgumentError) as info:
        integer_argument("order", 10**5000, 1, 10**7)
    assert len(str(info.value)) < 200


def test_weight_may_help_is_a_declared_field():
    assert QSeriesError("x").weights_may_help is False
    assert DomainError("x", weights_may_help=True).weights_may_help is True
    err = weight_may_help(UnableError("y"))
    assert isinstance(err, UnableError) and err.weights_may_help is True
    assert str(err) == "y"


@pytest.mark.parametrize("err", [
    QSeriesError("plain"),
    DomainError("with a weight", weights_may_help=True),
    DomainError("division by zero at column 3", position=2),
    ArgumentTypeError("order must be an integer"),
    ParseError("unexpected ')'", text="1 + )", position=4),
    ParseError("empty"),
])
def test_errors_survive_pickling(err):
    back = pickle.loads(pickle.dumps(err))
    assert type(back) is type(err)
    assert str(back) == str(err) and back.args == err.args
    assert back.weights_may_help == err.weights_may_help
    assert back.position == err.position
    if isinstance(err, ParseError):
        assert (back.message, back.text, back.position) == (err.message, err.text, err.position)
