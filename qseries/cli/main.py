"""The ``qseries`` command line: parse arguments, call the library, format the output.

Exit codes: 0 success (for ``check``: the sides agree to the order), 1 a mismatch,
2 bad input (a message on stderr, never a traceback).
"""

from __future__ import annotations

import json
import sys
from fractions import Fraction
from typing import Annotated, Any

import typer

from ..analysis.compare import CheckResult, check
from ..errors import QSeriesError
from ..lang import evaluate
from ..lang.parser import NOTATION_FORMS
from ..products import FUNCTIONS
from ..series import MAX_LENGTH, Series
from ..series.formatting import format_series
from .demo import DEMO_CASES

app = typer.Typer(
    name="qseries",
    help="Check formal power series and q-series identities to a chosen order.\n\n"
         "Write both sides as papers do: (a;q)_n, (a,b;q)_inf, sum_{k>=0} ..., "
         "prod_{n>=1} ..., q^(k(3k-1)/2).  Agreement to O(q^N) is evidence, not a proof.",
    no_args_is_help=True,
    add_completion=False,
    pretty_exceptions_enable=False,
)

OrderOption = Annotated[int, typer.Option(
    "--order", "-n", min=1, max=MAX_LENGTH,
    help="Compare/expand modulo q^N: the coefficients of q^0 .. q^(N-1).")]
JsonOption = Annotated[bool, typer.Option("--json", help="Print machine-readable JSON.")]


def _exp_json(e: int | Fraction) -> int | str:
    e = Fraction(e)
    return e.numerator if e.denominator == 1 else str(e)


def _num_text(c: int | Fraction) -> str:
    return str(c)


def _fail(message: str) -> None:
    typer.echo(f"qseries: error: {message}", err=True)
    raise typer.Exit(2)


def _guarded(fn: Any, *args: Any) -> Any:
    """Run library code, turning every anticipated failure into exit code 2."""
    try:
        return fn(*args)
    except QSeriesError as err:
        _fail(str(err))
    except RecursionError:
        _fail("the expression is nested too deeply")
    except MemoryError:
        _fail("not enough memory for this order; try a smaller --order")
    except KeyboardInterrupt:
        typer.echo("qseries: interrupted", err=True)
        raise typer.Exit(130) from None


@app.command()
def expand(
    expr: Annotated[str, typer.Argument(help="The expression, e.g. \"1/(q;q)_inf\".")],
    order: OrderOption = 100,
    as_json: JsonOption = False,
) -> None:
    """Expand EXPR modulo q^N and print its coefficients.

    Example: qseries expand "sum_{k>=0} q^(k^2)/(q;q)_k" --order 20
    """
    s: Series = _guarded(evaluate, expr, order)
    known = s.precision if s.precision is not None else order
    known = min(known, order)
    if as_json:
        terms = [[_exp_json(e), _num_text(c)] for e, c in s.terms() if e < known]
        typer.echo(json.dumps({"order": _exp_json(known), "terms": terms}))
        return
    shown = s if s.precision is not None else s.truncate(order)
    typer.echo(format_series(shown))
    if known < order:
        typer.echo(f"note: negative powers cost precision; only the coefficients below "
                   f"q^{_exp_json(known)} are known", err=True)


def _print_check(r: CheckResult, lhs: str, rhs: str) -> None:
    if r.first_mismatch is None:
        typer.echo(f"AGREES  {r.verdict}")
    else:
        m = r.first_mismatch
        typer.echo(f"DIFFERS  {r.verdict} (difference {m.difference})")
        typer.echo(f"  coefficients below q^{m.exponent} agree")
        rows = [("exponent", "left", "right", "difference")] + [
            (str(e), str(a), str(b), str(a - b)) for e, a, b in r.neighbours()]
        widths = [max(len(row[i]) for row in rows) for i in range(4)]
        for row in rows:
            typer.echo("  " + "  ".join(cell.rjust(w) for cell, w in zip(row, widths, strict=True)))
    if r.order_verified != r.order_requested:
        typer.echo(f"note: negative powers cost precision: only the coefficients below "
                   f"q^{r.order_verified} could be compared, not q^{r.order_requested}")
    typer.echo(f"  ({r.seconds:.3f} s)")


@app.command(name="check")
def check_cmd(
    lhs: Annotated[str, typer.Argument(help="The left side.")],
    rhs: Annotated[str, typer.Argument(help="The right side.")],
    order: OrderOption = 100,
    as_json: JsonOption = False,
) -> None:
    """Compare LHS and RHS modulo q^N; exit 0 if they agree, 1 at a mismatch.

    Example: qseries check "sum_{k>=0} q^(k^2)/(q;q)_k" "1/((q;q^5)_inf (q^4;q^5)_inf)" -n 500
    """
    r: CheckResult = _guarded(check, lhs, rhs, order)
    if as_json:
        m = r.first_mismatch
        typer.echo(json.dumps({
            "holds": r.holds,
            "order": _exp_json(r.order_verified),
            "first_mismatch": None if m is None else {
                "index": _exp_json(m.exponent), "lhs": _num_text(m.lhs),
                "rhs": _num_text(m.rhs)},
            "seconds": round(r.seconds, 6),
        }))
    else:
        _print_check(r, lhs, rhs)
    raise typer.Exit(0 if r.holds else 1)


@app.command()
def notation() -> None:
    """List the notation: q-Pochhammer symbols, sums, products and the named functions."""
    typer.echo("Built-in notation (ASCII, as papers write it):")
    for form, meaning in NOTATION_FORMS:
        typer.echo(f"  {form:<34} {meaning}")
    typer.echo("\nNamed functions:")
    for entry in FUNCTIONS.values():
        sig = f"{entry.name}({', '.join(entry.arguments)})"
        typer.echo(f"  {sig:<34} {entry.meaning}   e.g. {entry.example}")


@app.command()
def demo() -> None:
    """Run the built-in example: a published identity that holds, and an invented
    colleague's conjecture that agrees for a while and then fails."""
    for case in DEMO_CASES:
        typer.echo(f"== {case.story}")
        typer.echo(f"   qseries check \"{case.lhs}\" \\")
        typer.echo(f"                 \"{case.rhs}\" --order {case.order}")
        r: CheckResult = _guarded(check, case.lhs, case.rhs, case.order)
        _print_check(r, case.lhs, case.rhs)
        typer.echo("")


def run() -> None:
    """Console-script entry point."""
    try:
        app()
    except KeyboardInterrupt:
        typer.echo("qseries: interrupted", err=True)
        sys.exit(130)
