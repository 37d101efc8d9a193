"""The ``qseries`` command line: parse arguments, call the library, format the output.

Exit codes: 0 success (for ``check``: the sides agree to the order), 1 a mismatch,
2 bad input (a message on stderr, never a traceback), 3 (``check``) inconclusive: no
coefficient could be compared.
"""

from __future__ import annotations

import contextvars
import copy
import inspect
import json
import sys
import time
from enum import StrEnum
from fractions import Fraction
from pathlib import Path
from typing import Annotated, Any, NoReturn

import typer
import typer.main
from typer.core import TyperGroup

from ..analysis import diagnose, dissection, distributions, product_form
from ..analysis.compare import MAX_PRIMES, CheckResult, check
from ..analysis.product_form import product_parts
from ..engine import evaluate
from ..engine.chooser import (
    AUTO_MODULAR_ORDER,
    COST_LIMIT_BYTES,
    COST_LIMIT_SECONDS,
    PRODUCT_MAX_ORDER,
)
from ..engine.cost import CostEstimate, estimate_cost
from ..errors import ParseError, QSeriesError
from ..lang import Node, parse
from ..lang.ast import children, extra_variables
from ..lang.parser import NOTATION_FORMS, definitions_of, is_extra_variable, split_identity
from ..products import FUNCTIONS
from ..report import (
    check_json,
    check_lines,
    combination_json,
    combination_lines,
    congruence_lines,
    congruences_json,
    dissection_json,
    dissection_lines,
    distribution_lines,
    distributions_json,
    divisibility_json,
    divisibility_lines,
    expand_json,
    expansion_note,
    expansion_text,
    listing_json,
    listing_line,
    listing_rows,
    listing_summary,
    listing_table,
    no_product_json,
    no_product_line,
    product_json,
    product_lines,
    relation_lines,
    relations_json,
    slowest_line,
    sources_lines,
    trend_csv,
    trend_json,
    verify_json,
    verify_line,
    verify_summary,
    verify_table,
)
from ..report.distribution import counts_csv
from ..report.latex import check_latex, expansion_latex, product_latex
from ..series import GF, MAX_LENGTH, Series
from . import streams
from .progress import counted_with_bar, run_with_bar


class _Commands(TyperGroup):
    """The command group, listing each command by the first paragraph of its help as one
    line of text (rich keeps a docstring's line breaks, which fall inside sentences)."""

    def get_command(self, ctx: Any, name: str) -> Any:
        command = super().get_command(ctx, name)
        if command is not None and command.help and not command.short_help:
            first = inspect.cleandoc(command.help).split("\n\n")[0]
            command.short_help = " ".join(first.split())
        return command


app = typer.Typer(
    cls=_Commands,
    name="qseries",
    help="Check formal power series and q-series identities to a chosen order.\n\n"
         "Write both sides as papers do: (a;q)_n, (a,b;q)_inf, sum_{k>=0} ..., "
         "prod_{n>=1} ..., q^(k(3k-1)/2).  Agreement to O(q^N) is evidence, not a proof.",
    no_args_is_help=True,
    add_completion=False,
    pretty_exceptions_enable=False,
    rich_markup_mode=None,     # help texts are literal: "[q^(5n+4)] F" is notation, not markup
    context_settings={"max_content_width": 200},   # wrap at the terminal width, as rich did
)


def _print_version(value: bool) -> None:
    if value:
        from importlib.metadata import version

        from ..backend import FLINT_VERSION
        typer.echo(f"qseries {version('qseries')} (python-flint {FLINT_VERSION}, Python "
                   f"{sys.version.split()[0]})")
        raise typer.Exit(0)


@app.callback()
def _main(
    version: Annotated[bool, typer.Option(
        "--version", callback=_print_version, is_eager=True,
        help="Print the versions of qseries, python-flint and Python, and exit.")] = False,
) -> None:
    pass

class Method(StrEnum):
    """How check compares the two sides."""

    auto = "auto"
    exact = "exact"
    modular = "modular"


OrderOption = Annotated[int, typer.Option(
    "--order", "-n", min=1, max=MAX_LENGTH,
    help="Compare/expand modulo q^N: the coefficients of q^0 .. q^(N-1).")]
#: whether the running command was given --json (its errors are then JSON too)
_JSON_ERRORS: contextvars.ContextVar[bool] = contextvars.ContextVar("json_errors",
                                                                     default=False)


def _json_mode(value: bool) -> bool:
    _JSON_ERRORS.set(bool(value))
    return value


#: the expressions of the running command as typed, with their trees (set by ``_parsed``): an
#: evaluation error knows only its position, and is shown in the one text it points into
_SOURCES: contextvars.ContextVar[tuple[tuple[str, Node], ...]] = \
    contextvars.ContextVar("sources", default=())


def _text_at(position: int, side: str | None = None) -> str | None:
    """The text of the expression of the command that ``position`` points into: the side
    of check named by ``side``, else the one expression with a node at ``position`` (the
    sides of check both start at 0: a position held by both names neither)."""
    sources = _SOURCES.get()
    if side in ("left", "right") and len(sources) == 2:
        text = sources[0 if side == "left" else 1][0]
        return text if position < len(text) else None

    def positions(node: Node) -> set[int]:
        out, stack = set(), [node]
        while stack:
            n = stack.pop()
            out.add(getattr(n, "pos", -1))
            stack.extend(children(n))
        return out

    found = [text for text, node in sources
             if position < len(text) and position in positions(node)]
    return found[0] if len(found) == 1 else None


LatexOption = Annotated[bool, typer.Option(
    "--latex", help="Print the result as LaTeX a paper can include (the parser reads it back).")]
QuietOption = Annotated[bool, typer.Option(
    "--quiet", help="No progress bar on a terminal (a pipe or --json never shows one).")]
JsonOption = Annotated[bool, typer.Option(
    "--json", callback=_json_mode,
    help="Print machine-readable JSON (errors too: {\"error\": {\"message\", \"position\"}} "
         "with exit code 2).")]
AllowLongOption = Annotated[bool, typer.Option(
    "--allow-long",
    help=f"Run even when the estimate made first (from order 50000 on, by probes at small "
         f"orders) says it would take more than {COST_LIMIT_SECONDS / 60:.0f} minutes or "
         f"{COST_LIMIT_BYTES / 1e9:.0f} GB.")]


def _refuse_long(allow: bool, exprs: list[Node], order: int, ring: Any = None,
                 weights: dict[str, int] | None = None, times: int = 1,
                 then: Any = None, smaller: str = "a smaller --order") -> None:
    """Exit 2 with the estimate when evaluating ``exprs`` at ``order`` (``times`` over,
    followed by ``then`` on each series) would take too long or too much memory, unless
    ``allow``; ``smaller`` names the option to lower."""
    if allow:
        return
    seconds, size, shown = 0.0, 0, None
    for e in exprs:
        est = _guarded(estimate_cost, e, order, ring, weights, then)
        if est is None:
            continue
        seconds += times * est.seconds
        size += est.bytes
        shown = est if shown is None else shown
    if shown is None or (seconds <= COST_LIMIT_SECONDS and size <= COST_LIMIT_BYTES):
        return
    total = CostEstimate(order, seconds, size, shown.probe_order, shown.probe_seconds)
    _fail(f"order {order} would take {total.text()}; pass --allow-long to run it anyway, or "
          f"choose {smaller}")


DefineOption = Annotated[list[str] | None, typer.Option(
    "--define", "-D", metavar="NAME(q) = EXPR",
    help="Define a function in the notation, e.g. --define \"G(q) = 1/((q;q^5)_inf "
         "(q^4;q^5)_inf)\"; the expressions may then call it at any argument (G(q^2), "
         "G(-q)).  Repeatable; definitions may call each other, not in a cycle.")]


RhsArgument = Annotated[str | None, typer.Argument(
    metavar="RHS", help="The right side; or give one argument \"LHS = RHS\" (a display "
                        "pasted whole, &= allowed).")]


def _sides(lhs: str, rhs: str | None) -> list[str]:
    """The two sides: as given, or split at the one '=' of a pasted identity."""
    return [lhs, rhs] if rhs is not None else list(_guarded(split_identity, lhs))


def _parsed(exprs: list[str], defines: list[str] | None) -> list[Node]:
    """The expressions' syntax trees, with the --define functions expanded (exit 2 with the
    position on an error)."""
    defs = _guarded(definitions_of, defines or [])
    nodes = [_guarded(parse, e, (), defs) for e in exprs]
    _SOURCES.set(tuple(zip(exprs, nodes, strict=True)))
    return nodes


WeightOption = Annotated[list[str] | None, typer.Option(
    "--weight", "-w", metavar="VAR=W",
    help="Let the extra variable VAR stand for VAR*q^W (W >= 0), so that coefficients "
         "which are power series in it, such as 1/(1-z), are expanded too; repeat for "
         "several variables.  check tries W = 1 for every variable by itself when weight 0 "
         "fails.")]


def _weights(items: list[str] | None) -> dict[str, int] | None:
    if not items:
        return None
    out: dict[str, int] = {}
    for item in items:
        name, sep, value = item.partition("=")
        name, value = name.strip(), value.strip()
        if not sep or not is_extra_variable(name) or not value.isascii() or \
                not value.isdigit() or len(value) > 6:
            _fail(f"--weight {item!r}: write VAR=W with VAR an extra variable (such as z) and "
                  f"W a non-negative integer")
        if name in out:
            _fail(f"--weight gives {name!r} twice")
        out[name] = int(value)
    return out


def _fail(message: str, err: QSeriesError | None = None) -> None:
    position = getattr(err, "position", None)
    text = err.text if isinstance(err, ParseError) else \
        None if position is None else _text_at(position, getattr(err, "side", None))
    if _JSON_ERRORS.get():
        error: dict[str, Any] = {"message": getattr(err, "message", message),
                                 "position": position}
        if text is not None:
            error["text"] = text           # the text the position points into
        typer.echo(json.dumps({"error": error}))
        raise typer.Exit(2)
    if text is not None and not isinstance(err, ParseError):
        # an evaluation error names its column; show it in the text, as a parse error does
        caret = str(ParseError("", text, position)).split("\n")[1:]
        message = "\n".join([message, *caret])
    typer.echo(f"qseries: error: {message}", err=True)
    raise typer.Exit(2)


def _emit(as_json: bool, result: Any, shape: Any, lines: Any, found: bool) -> NoReturn:
    """Print ``shape(result)`` as JSON or ``lines(result)`` as text, then exit 0 when
    something was found (a relation, a combination, divisibility) and 1 when not."""
    if as_json:
        typer.echo(json.dumps(shape(result)))
    else:
        for line in lines(result):
            typer.echo(line)
    raise typer.Exit(0 if found else 1)


def _with_weight_hint(node: Node, weights: dict[str, int] | None) -> Any:
    """``_guarded`` that adds, to an error a weight could cure (a sum in z that does not
    converge until z stands for z q), which --weight to try."""
    names = sorted(extra_variables(node))

    def guarded(fn: Any, *args: Any) -> Any:
        try:
            return fn(*args)
        except QSeriesError as err:
            if err.weights_may_help and names and not weights:
                tries = " ".join(f"-w {v}=1" for v in names)
                what = f"{names[0]} then stands for {names[0]}*q" if len(names) == 1 else \
                    "each variable then stands for itself times q"
                err.args = (f"{err}; try {tries} ({what}), which may make it converge",
                            *err.args[1:])
            return _guarded(_raise, err)

    return guarded


def _raise(err: BaseException) -> Any:
    raise err


def _guarded(fn: Any, *args: Any) -> Any:
    """Run library code, turning every anticipated failure into exit code 2."""
    try:
        return fn(*args)
    except QSeriesError as err:
        _fail(str(err), err)
    except RecursionError:
        _fail("the expression is nested too deeply")
    except MemoryError:
        _fail("not enough memory for this order; try a smaller --order")
    except KeyboardInterrupt:
        typer.echo("qseries: interrupted", err=True)
        raise typer.Exit(130) from None


def _busy(quiet: bool, text: str, order: int, fn: Any, *args: Any) -> Any:
    """``fn(*args)`` with a moving bar and the time elapsed on a terminal from order
    ``STATUS_ORDER`` on (unless ``quiet``)."""
    return run_with_bar(lambda _say: fn(*args), not quiet and order >= STATUS_ORDER, text)


def _draw(kind: str, what: Any, path: Path, *args: Any) -> None:
    """Draw ``what`` with :mod:`qseries.report.plots` (matplotlib is imported only then)
    into ``path``; a missing matplotlib or an unwritable file is exit 2."""
    from ..report import plots

    _guarded(getattr(plots, kind), what, path, *args)
    typer.echo(f"qseries: wrote {path}", err=True)


@app.command()
def expand(
    expr: Annotated[str, typer.Argument(
        metavar="EXPR", help="The expression, e.g. \"1/(q;q)_inf\".")],
    order: OrderOption = 100,
    weight: WeightOption = None,
    define: DefineOption = None,
    as_json: JsonOption = False,
    latex: LatexOption = False,
    allow_long: AllowLongOption = False,
    quiet: QuietOption = False,
    plot: Annotated[Path | None, typer.Option(
        "--plot", metavar="FILE",
        help="Also draw log|a_n| against sqrt(n) into FILE (.png or .svg; needs matplotlib)."
    )] = None,
    dissect: Annotated[int | None, typer.Option(
        "--dissect", min=1, max=MAX_LENGTH, metavar="M",
        help="Print the whole M-dissection instead: for each residue r the series "
             "sum_n a(Mn + r) q^n to O(q^N) (EXPR is evaluated once, to order about M*N); "
             "for exponents in q^c times integer powers, r runs over c, c+1, ...")] = None,
) -> None:
    """Expand EXPR modulo q^N and print its coefficients.  Letters other than q that no sum
    binds are extra variables: coefficients are then Laurent polynomials in them, printed
    as "z^2 - z" (strings in --json too).

    Example: qseries expand "sum_{k>=0} q^(k^2)/(q;q)_k" --order 20
    """
    weights = _weights(weight)
    [node] = _parsed([expr], define)
    if dissect is not None:
        _expand_dissection(node, dissect, order, weights, as_json, allow_long)
        return
    _refuse_long(allow_long, [node], order, None, weights)
    s: Series = _guarded(_with_weight_hint(node, weights), _busy, quiet or as_json,
                         f"evaluating to O(q^{order})", order, evaluate, node, order, None,
                         weights)
    if plot is not None:
        _draw("growth_plot", s.truncate(order), plot)
    if as_json:
        typer.echo(json.dumps(expand_json(s, order)))
        return
    if latex:
        typer.echo(expansion_latex(node, s, order))
        return
    typer.echo(expansion_text(s, order))
    note = expansion_note(s, order)
    if note:
        typer.echo(note, err=True)


def _expand_dissection(expr: Node, m: int, order: int, weights: dict[str, int] | None,
                       as_json: bool, allow_long: bool) -> None:
    """``expand --dissect M``: every part of the M-dissection, from one evaluation."""
    work = m * order + m
    if work > MAX_LENGTH:
        _fail(f"--dissect {m} at order {order} needs the series to order {work}, beyond the "
              f"limit {MAX_LENGTH}")
    _refuse_long(allow_long, [expr], work, None, weights)
    s: Series = _guarded(evaluate, expr, work, None, weights)
    d = _guarded(dissection, s, m, order)
    if as_json:
        typer.echo(json.dumps(dissection_json(d, order)))
        return
    for line in dissection_lines(d, order):
        typer.echo(line)


def _print_check(r: CheckResult) -> None:
    for line in check_lines(r, diagnose(r)):
        typer.echo(line)


#: checks from this order on show a progress bar on a terminal (per side, or per prime)
STATUS_ORDER = 2_000


@app.command(name="check")
def check_cmd(
    lhs: Annotated[str, typer.Argument(metavar="LHS", help="The left side.")],
    rhs: RhsArgument = None,
    order: OrderOption = 100,
    method: Annotated[Method, typer.Option(
        "--method", "-m",
        help="exact: integer/rational arithmetic; modular: compare modulo random primes near "
             "2^62 (fast at high order; the exact coefficients are recomputed at a "
             "mismatch); auto: exact up to order 3000 (400 with extra variables), modular "
             "above.")] = Method.auto,
    primes: Annotated[int, typer.Option(
        "--primes", min=1, max=MAX_PRIMES,
        help="How many primes the modular method uses.")] = 3,
    weight: WeightOption = None,
    define: DefineOption = None,
    as_json: JsonOption = False,
    latex: LatexOption = False,
    allow_long: AllowLongOption = False,
    quiet: QuietOption = False,
    plot: Annotated[Path | None, typer.Option(
        "--plot", metavar="FILE",
        help="At a mismatch, draw the coefficients of left minus right side into FILE (.png "
             "or .svg; needs matplotlib).")] = None,
) -> None:
    """Compare LHS and RHS modulo q^N; exit 0 if they agree, 1 at a mismatch, 3 if no
    coefficient could be compared (inconclusive: a side carries its own O(q^k) below the
    coefficients asked for), 2 for bad input.

    Example: qseries check "sum_{k>=0} q^(k^2)/(q;q)_k" "1/((q;q^5)_inf (q^4;q^5)_inf)" -n 500
    """
    started = time.perf_counter()   # --json reports the whole command's time
    weights = _weights(weight)
    lnode, rnode = _parsed(_sides(lhs, rhs), define)
    modular = method == Method.modular or (method == Method.auto and order >= AUTO_MODULAR_ORDER)
    _refuse_long(allow_long, [lnode, rnode], order, _probe_field() if modular else None, weights,
                 times=primes if modular else 1)
    r: CheckResult = _guarded(lambda: run_with_bar(
        lambda say: check(lnode, rnode, order, method=method.value, primes=primes, progress=say,
                          weights=weights),
        show=order >= STATUS_ORDER and not (as_json or quiet)))
    if plot is not None:
        if r.holds is False:
            _draw("difference_plot", r, plot)
        else:
            typer.echo(f"qseries: no picture written to {plot}: the sides do not differ",
                       err=True)
    if as_json:
        hints = diagnose(r)
        typer.echo(json.dumps(check_json(r, hints, seconds=time.perf_counter() - started)))
    elif latex:
        typer.echo(check_latex(r, lnode, rnode))
    else:
        _print_check(r)
        mention_prove(lnode, rnode, r.holds)
    raise typer.Exit(3 if r.holds is None else 0 if r.holds else 1)


def _probe_field() -> Any:
    """The field the modular method's estimate probes in: GF(p) for a prime near 2^62, as
    the method's own primes."""
    return GF(2**61 - 1)


@app.command()
def product(
    expr: Annotated[str, typer.Argument(metavar="EXPR", help="The series, e.g. a sum side.")],
    order: OrderOption = 100,
    define: DefineOption = None,
    as_json: JsonOption = False,
    latex: LatexOption = False,
    allow_long: AllowLongOption = False,
    quiet: QuietOption = False,
    plot: Annotated[Path | None, typer.Option(
        "--plot", metavar="FILE",
        help="Also draw the exponents e_n against n, coloured by n modulo the period, into "
             "FILE (.png or .svg; needs matplotlib).")] = None,
) -> None:
    """Find c, s and integers e_n with EXPR = c q^s prod_{n>=1} (1-q^n)^(e_n) + O(q^N); print
    the product in the notation (periodic exponents as (q^a;q^m)_inf powers, and as an eta
    quotient when there is one).  Exit 1 when there is no such product form.

    Example: qseries product "sum_{k>=0} q^(k^2)/(q;q)_k" --order 200
    """
    [node] = _parsed([expr], define)
    if order > PRODUCT_MAX_ORDER and not allow_long:
        _fail(f"product recovers exponents up to order {PRODUCT_MAX_ORDER} (beyond it a "
              f"series without a product form of small exponents needs an exact division "
              f"whose coefficients have thousands of digits, gigabytes at order 10^7); pass "
              f"--allow-long to try order {order} anyway")
    _refuse_long(allow_long, [node], order, then=product_form)
    # numerator and denominator where the evaluation leaves its last division undone
    parts = _guarded(_busy, quiet or as_json, f"evaluating to O(q^{order})", order,
                     product_parts, node, order)
    series: Series = parts[0]
    if getattr(series.ring, "names", ()):
        _fail("product forms are recovered for series in q alone; this expression has the "
              f"extra variables {', '.join(series.ring.names)}")  # type: ignore[attr-defined]
    try:
        pf = product_form(parts, order)
    except QSeriesError as err:
        if as_json:
            typer.echo(json.dumps(no_product_json(order, str(err))))
        else:
            typer.echo(no_product_line(str(err)))
        raise typer.Exit(1) from None
    if plot is not None:
        _draw("exponents_plot", pf, plot)
    if as_json:
        typer.echo(json.dumps(product_json(pf)))
    elif latex:
        typer.echo(product_latex(pf))
    else:
        for line in product_lines(pf):
            typer.echo(line)
    raise typer.Exit(0 if pf.expression is not None else 1)


class ExportFormat(StrEnum):
    """Format of the mean/variance table of ``distribution``."""

    csv = "csv"
    json = "json"


@app.command()
def distribution(
    expr: Annotated[str, typer.Argument(metavar="EXPR",
        help="A generating function in q and one extra variable that marks a statistic, "
             "e.g. the Durfee square: \"sum_{k>=0} z^k q^(k^2)/(q;q)_k^2\".")],
    var: Annotated[str, typer.Option("--var", help="The variable that marks the statistic.")
                   ] = "z",
    at: Annotated[list[int] | None, typer.Option(
        "--at", min=0, help="A size n whose distribution to show (repeatable).")] = None,
    moments: Annotated[int, typer.Option(
        "--moments", min=2, max=12, help="Standardised moments 1..R to compare with the "
                                         "normal distribution.")] = 6,
    trend_upto: Annotated[int | None, typer.Option(
        "--trend-upto", min=1, max=100_000,
        help="Also export the mean and variance for every n = 1 .. N.")] = None,
    fmt: Annotated[ExportFormat | None, typer.Option(
        "--format", show_default=False,
        help="Format of the --trend-upto table (and of --out).  [default: csv; json with "
             "--json]")] = None,
    out: Annotated[Path | None, typer.Option(
        "--out", help="Write the --trend-upto table to this file (default: standard output); "
                      "without --trend-upto, every count of the --at sizes (CSV with the "
                      "columns n, the variable's name (its exponent), count, share; or JSON "
                      "with --format json).")] = None,
    define: DefineOption = None,
    as_json: JsonOption = False,
    allow_long: AllowLongOption = False,
    quiet: QuietOption = False,
    plot: Annotated[Path | None, typer.Option(
        "--plot", metavar="FILE",
        help="Also draw the standardised distribution at each --at size (at most 6) with the "
             "normal density over it into FILE (.png or .svg; needs matplotlib); without "
             "--at, the mean and variance of --trend-upto against n.")] = None,
    fit: Annotated[str | None, typer.Option(
        "--fit", metavar="FORM",
        help="With --plot of the trend: fit c*f(n) to the mean and to the variance, f one of "
             "sqrt, log, linear, sqrt-log.")] = None,
) -> None:
    """The distribution of the statistic marked by VAR among the objects of size n (the
    coefficient of q^n), with its mean, variance and standardised moments next to those of
    the normal distribution (0, 1, 0, 3, 0, 15, ...).

    Example: qseries distribution "sum_{k>=0} z^k q^(k^2)/(q;q)_k^2" --at 100 --at 400
    """
    if not at and trend_upto is None:
        _fail("give a size with --at N, or --trend-upto N for the mean/variance table")
    if fmt is None:
        fmt = ExportFormat.json if as_json else ExportFormat.csv
    sizes = list(at or [])
    trend = list(range(1, trend_upto + 1)) if trend_upto else []
    [node] = _parsed([expr], define)
    _refuse_long(allow_long, [node], max(sizes + trend) + 1,
                 smaller="smaller sizes (--at, --trend-upto)")
    top = max(sizes + trend)

    def read(step: Any) -> Any:     # one step of the bar per n, after the evaluation
        return distributions(node, var, sorted(set(sizes + trend)), progress=lambda n, i, k:
                             step(f"reading the distribution at n = {n}", i, k))

    dists = _guarded(counted_with_bar, read, not (quiet or as_json) and top >= STATUS_ORDER,
                     f"evaluating to O(q^{top + 1}) for n up to {top}")
    by_n = {d.n: d for d in dists}
    if fit is not None and (plot is None or sizes):
        _fail("--fit goes with --plot of the --trend-upto table (and no --at)")
    if plot is not None and sizes:
        _draw("distribution_plot", [by_n[n] for n in dict.fromkeys(sizes)], plot, var)
    elif plot is not None:
        _draw("trend_plot", [by_n[n] for n in trend], plot, fit)
    if sizes and as_json:
        typer.echo(json.dumps(distributions_json(var, [by_n[n] for n in sizes], moments)))
    elif sizes:
        for n in sizes:
            for line in distribution_lines(by_n[n], var, moments):
                typer.echo(line)
    if out is not None and not trend:
        chosen = [by_n[n] for n in dict.fromkeys(sizes)]
        text = counts_csv(chosen, var) if fmt == ExportFormat.csv else \
            json.dumps(distributions_json(var, chosen, moments)) + "\n"
        try:
            out.write_text(text)
        except OSError as err:
            _fail(f"cannot write {out}: {err.strerror}")
        typer.echo(f"wrote every count for n = {', '.join(map(str, dict.fromkeys(sizes)))} "
                   f"to {out}", err=True)
    if trend:
        rows = [by_n[n] for n in trend]
        text = trend_csv(rows) if fmt == ExportFormat.csv else json.dumps(trend_json(rows)) + "\n"
        if out is None:
            typer.echo(text, nl=False)
        else:
            try:
                out.write_text(text)
            except OSError as err:
                _fail(f"cannot write {out}: {err.strerror}")
            typer.echo(f"wrote the mean and variance for n = 1 .. {trend_upto} to {out}",
                       err=True)


@app.command(name="congruences")
def congruences_cmd(
    expr: Annotated[str, typer.Argument(metavar="EXPR",
        help="The series, e.g. \"1/(q;q)_inf\" or a dissection \"[q^(5n+4)] 1/(q;q)_inf\".")],
    order: Annotated[int, typer.Option(
        "--order", "-n", min=1, max=MAX_LENGTH,
        help="Read the coefficients of q^0 .. q^(N-1) (with --step M: a(Mn + R) for n < N); "
             "a class resting on few coefficients can vanish by chance, so the search "
             "marks those on fewer than 20.")] = 2000,
    modulus: Annotated[int | None, typer.Option(
        "--modulus", "-M", min=2,
        help="Test mode: is every coefficient (of the progression) divisible by M?  Exit 0 "
             "if so, 1 at the first that is not (reported).")] = None,
    step: Annotated[int, typer.Option(
        "--step", min=1, max=MAX_LENGTH, metavar="M",
        help="With --modulus: test a(Mn + R) only.")] = 1,
    residue: Annotated[str | None, typer.Option(
        "--residue", metavar="R",
        help="With --modulus: the residue R, 0 <= R < M (a fraction such as 95/24 for "
             "exponents in q^c times integer powers); default: every coefficient's class.")]
        = None,
    define: DefineOption = None,
    max_step: Annotated[int, typer.Option(
        "--max-step", min=1, max=1000,
        help="Search mode: steps m = 1 .. this, every residue 0 <= r < m.")] = 30,
    moduli: Annotated[str, typer.Option(
        "--moduli",
        help="Search mode: the moduli, comma-separated (primes are worked modulo the prime "
             "directly; others from the exact series).")] = "2,3,5,7,11,13",
    as_json: JsonOption = False,
) -> None:
    """Congruences a(mn + r) = 0 (mod M) among the coefficients of EXPR.  Without --modulus:
    search every step m <= --max-step, residue r and modulus of --moduli, listing those not
    implied by another found (m' | m, r = r' mod m', M | M'); exit 0.  With --modulus M: test
    divisibility (of a(Mn + R) with --step/--residue); exit 0 all divisible, 1 a
    counterexample, 2 bad input.  Agreement below the order is evidence, not a proof.

    Example: qseries congruences "1/(q;q)_inf" --order 10000
    """
    from ..analysis import divisible, find_congruences

    [node] = _parsed([expr], define)
    if modulus is None:
        if step != 1 or residue is not None:
            _fail("--step and --residue go with --modulus (the test mode); the search "
                  "takes --max-step and --moduli")
        mods = []
        for item in moduli.split(","):
            item = item.strip()
            if not item.isascii() or not item.isdigit() or len(item) > 19:
                _fail(f"--moduli {moduli!r}: write whole numbers >= 2 separated by commas")
            mods.append(int(item))
        found = _guarded(lambda: find_congruences(node, order, max_m=max_step, moduli=mods))
        if as_json:
            typer.echo(json.dumps(congruences_json(found)))
            return
        for line in congruence_lines(found):
            typer.echo(line)
        return
    r = None
    if residue is not None:
        try:
            r = Fraction(residue.strip()) if len(residue) < 40 else None
        except (ValueError, ZeroDivisionError):
            r = None
        if r is None:
            _fail(f"--residue {residue!r}: write a whole number or a fraction such as 95/24")
        if step == 1 and r != 0 and r.denominator == 1:
            _fail(f"--residue {residue} needs --step M with {residue} < M: the progression "
                  f"is a(M n + R) (without --step, M = 1 and every coefficient is tested)")
    result = _guarded(lambda: divisible(node, modulus, order, m=step, r=r))
    _emit(as_json, result, divisibility_json, divisibility_lines, bool(result.holds))


@app.command(name="relations")
def relations_cmd(
    exprs: Annotated[list[str], typer.Argument(metavar="EXPRS",
        help="The series, e.g. \"theta_3(q)^4\" \"theta_2(q)^4\" \"theta_4(q)^4\".")],
    order: OrderOption = 200,
    degree: Annotated[int, typer.Option(
        "--degree", "-d", min=1, max=12,
        help="Find polynomial relations of total degree <= D instead (the monomials in the "
             "series, 1 included, are the unknowns).")] = 1,
    define: DefineOption = None,
    as_json: JsonOption = False,
) -> None:
    """Integer relations c_1 f_1 + ... + c_k f_k = 0 among the series EXPRS below q^N (a
    reduced basis, by exact linear algebra and LLL), or polynomial ones with --degree.
    Exit 0 when a relation is found, 1 when none, 2 for bad input (more unknowns than
    coefficients is refused: raise the order).  Evidence below the order, not a proof.

    Example: qseries relations "theta_3(q)^4" "theta_2(q)^4" "theta_4(q)^4" -n 200
    """
    from ..analysis import relations

    nodes = _parsed(exprs, define)
    found = _guarded(lambda: relations(nodes, order, degree=degree, labels=exprs))
    _emit(as_json, found, relations_json, relation_lines, bool(found.relations))


@app.command(name="express")
def express_cmd(
    target: Annotated[str, typer.Argument(metavar="TARGET",
        help="The series to express, e.g. \"[q^(5n+4)] 1/(q;q)_inf\".")],
    basis: Annotated[list[str], typer.Argument(metavar="BASIS",
        help="The basis series, e.g. \"(q^5;q^5)_inf^5/(q;q)_inf^6\".")],
    order: OrderOption = 200,
    define: DefineOption = None,
    as_json: JsonOption = False,
) -> None:
    """TARGET as a linear combination of the BASIS series below q^N, with exact rational
    coefficients (by the relation search among them).  Exit 0 when it is one, 1 when the
    target is not in their span, 2 for bad input (a basis that is linearly dependent below
    q^N is refused, with the relation).  Evidence below the order, not a proof.

    Example: qseries express "[q^(7n+5)] 1/(q;q)_inf" "(q^7;q^7)_inf^3/(q;q)_inf^4"
    "q (q^7;q^7)_inf^7/(q;q)_inf^8" -n 200
    """
    from ..analysis import express

    nodes = _parsed([target, *basis], define)
    found = _guarded(lambda: express(nodes[0], nodes[1:], order, labels=[target, *basis]))
    _emit(as_json, found, combination_json, combination_lines, found.coefficients is not None)


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
    from .demo import DEMO_CASES

    for case in DEMO_CASES:
        typer.echo(f"== {case.story}")
        typer.echo(f"   qseries check \"{case.lhs}\" \\")
        typer.echo(f"                 \"{case.rhs}\" --order {case.order}")
        r: CheckResult = _guarded(check, case.lhs, case.rhs, case.order)
        _print_check(r)
        typer.echo("")


PathsArgument = Annotated[list[Path] | None, typer.Argument(
    help="Identity files (.toml) or folders; default: the shipped catalogue.",
    show_default=False)]


def _load(paths: list[Path] | None, only: list[str]) -> list:
    from ..catalogue import SHIPPED, load_entries, select  # imported when a command needs it

    entries = _guarded(load_entries, paths or [SHIPPED])
    if not entries:
        _fail(f"no identities in {', '.join(str(p) for p in paths or [SHIPPED])}")
    chosen = select(entries, only)
    for wanted in only:                   # each value must select something, not just one
        if not select(entries, [wanted]):
            _fail(f"no entry matches {wanted}{_near_entries(entries, wanted)}")
    if not chosen:
        _fail(f"no entry matches {', '.join(only)}")
    return chosen


def _near_entries(entries: list, wanted: str) -> str:
    """A hint for an --only value that selects nothing: the members whose label starts with
    it (a family named with part of its parameters), else the closest key, label or tag."""
    import difflib

    want = " ".join(wanted.split())
    labels = [e.label for e in entries]
    members = [x for x in labels if x.startswith(want + " ")]
    if members:
        shown = ", ".join(members[:5]) + (", ..." if len(members) > 5 else "")
        return f" (its members: {shown})"
    names = {e.key for e in entries} | set(labels) | {t for e in entries for t in e.tags}
    close = difflib.get_close_matches(want, sorted(names), n=1, cutoff=0.8)
    return f" (did you mean {close[0]}?)" if close else ""


@app.command()
def verify(
    paths: PathsArgument = None,
    order: Annotated[int | None, typer.Option(
        "--order", "-n", min=1, max=MAX_LENGTH,
        help="Override every entry's default order.")] = None,
    jobs: Annotated[int | None, typer.Option(
        "--jobs", "-j", min=1,
        help="Worker processes (default: all cores; never more than the cores or the "
             "entries).")] = None,
    only: Annotated[list[str] | None, typer.Option(
        "--only", help="Run only entries with this key, member id or tag (repeatable).")] = None,
    as_json: JsonOption = False,
    quiet: QuietOption = False,
) -> None:
    """Verify every identity of the given files; exit 0 when every entry behaves as its file
    says (holds, or fails exactly where it is recorded to fail), 1 otherwise, 2 for
    malformed files.  Ctrl-C stops the workers, prints the entries that finished and exits
    with 130.

    Example: qseries verify --only rogers-ramanujan-1 -n 1000
    """
    import time

    from ..catalogue import VerifyInterrupted, job_count, pair_ident
    from .progress import verify_with_bar

    entries = _load(paths, only or [])
    t0 = time.perf_counter()
    console = None if as_json else streams.stdout_console()    # rich: not for --json
    interrupted = streamed = False
    labels = {e.ident: e.label for e in entries}
    expects = {e.ident: e.expect for e in entries}
    pairs = [pair_ident(e) for e in entries if e.same_as is not None]
    labels.update((p, p) for p in pairs)       # a same_as pair holds (its sides agree)
    expects.update((p, "holds") for p in pairs)
    try:
        results, streamed = verify_with_bar(entries, order, jobs, not (as_json or quiet),
                                            expects, labels)
    except VerifyInterrupted as stop:     # the workers are stopped; show what finished
        results, interrupted = stop.results, True
        streamed = not (as_json or quiet) and console.is_terminal
    except KeyboardInterrupt:
        typer.echo("qseries: interrupted", err=True)
        raise typer.Exit(130) from None
    elapsed = time.perf_counter() - t0
    n_ok = sum(r.ok for r in results)
    if as_json:
        typer.echo(json.dumps(verify_json(results, elapsed,
                                          job_count(entries) if interrupted else None)))
    else:
        if results and not streamed:      # on a terminal each line came as it finished
            if console.is_terminal:
                console.print(verify_table(results, expects, labels))
            else:                         # a pipe or a file: whole lines, never wrapped
                for r in results:
                    console.print(verify_line(r, expects[r.ident], labels.get(r.ident)),
                                  markup=False, highlight=False, soft_wrap=True)
        # whole lines (rich would fold them at 80 columns on a pipe, where grep reads them)
        console.print(verify_summary(results, elapsed, interrupted), markup=False,
                      highlight=False, soft_wrap=True)
        if len(results) > 1:
            console.print(slowest_line(results, 5, labels), markup=False, highlight=False,
                          soft_wrap=True)
    if interrupted:
        typer.echo(f"qseries: interrupted: {len(results)} of {job_count(entries)} entries "
                   f"finished", err=True)
        raise typer.Exit(130)
    raise typer.Exit(0 if n_ok == len(results) else 1)


@app.command(name="list")
def list_cmd(
    paths: PathsArgument = None,
    sources: Annotated[bool, typer.Option(
        "--sources", help="Print each entry's citation (and note) in full instead of the "
                          "table.")] = False,
    as_json: JsonOption = False,
) -> None:
    """List the identities of the given files (identifier, members, title, source) without
    running them; a family's identifier shows its parameter ranges.

    Example: qseries list --sources
    """
    entries = _load(paths, [])
    if as_json:
        typer.echo(json.dumps(listing_json(entries)))
        return
    if sources:
        typer.echo("\n".join(sources_lines(listing_rows(entries))))
        return
    rows = listing_rows(entries)
    console = streams.stdout_console()
    if console.is_terminal:
        console.print(listing_table(rows))
    else:                                 # a pipe or a file: whole lines, never wrapped
        for row in rows:
            console.print(listing_line(row), markup=False, highlight=False, soft_wrap=True)
    console.print(listing_summary(rows), markup=False, highlight=False, soft_wrap=True)


from .prove import mention_prove, prove_cmd  # noqa: E402  (the command lives in its own module)

app.command(name="prove")(prove_cmd)
from . import scan as _scan  # noqa: E402, F401 - registers qseries scan on app


def _for_command(argv: list[str]) -> typer.Typer:
    """The app to run for the arguments ``argv``: when the first names a command, a copy of
    ``app`` that registers that command alone, else ``app``.  typer turns every registered
    command into a click command (signature, types, help texts) on each run; one is enough
    to run one, and the group's own help, its errors and a name that is no command still
    see them all."""
    if argv and not argv[0].startswith("-"):
        for info in app.registered_commands:
            name = info.name or typer.main.get_command_name(info.callback.__name__)
            if name == argv[0]:
                alone = copy.copy(app)
                alone.registered_commands = [info]
                return alone
    return app


def _run_for_json(which: typer.Typer) -> None:
    """``which()`` when --json is asked for: a usage error (an option out of range, a missing
    argument) is JSON too, {"error": {"message", "position"}}, exit 2, as every other error
    under --json is."""
    try:
        code = which(standalone_mode=False)
    except Exception as err:            # typer's copy of click's usage errors, by their shape
        if hasattr(err, "format_message") and hasattr(err, "exit_code"):
            typer.echo(json.dumps({"error": {"message": err.format_message(),
                                             "position": None}}))
            sys.exit(err.exit_code)
        if type(err).__name__ == "Abort":
            typer.echo("qseries: aborted", err=True)
            sys.exit(1)
        raise
    if code == 130:
        typer.echo("qseries: interrupted", err=True)
    sys.exit(code if isinstance(code, int) else 0)


def _expression_as_option(args: list[str]) -> str | None:
    """An argument before ``--`` that starts with a minus sign and is an expression (it
    holds a bracket, a power or a fraction: ``-1/(q;q)_inf``), which the option parser
    would refuse as an unknown option; None when there is none.

    >>> _expression_as_option(["product", "-1/(q;q)_inf"]), _expression_as_option(["-n", "5"])
    ('-1/(q;q)_inf', None)
    >>> _expression_as_option(["scan", "-p", "b=0..1", "--right", "-1/(q;q)_inf", "$b"])
    """
    valued: set[str] | None = None
    for i, arg in enumerate(args):
        if arg == "--":
            return None
        if arg.startswith("-") and not arg.startswith("--") and len(arg) > 1 \
                and any(ch in arg for ch in "()^/;_{}\\"):
            if valued is None:
                valued = _options_with_values(args[0] if args else "")
            if i == 0 or args[i - 1] not in valued:     # not the value of --right and such
                return arg
    return None


def _options_with_values(command: str) -> set[str]:
    """The option names of ``command`` that take a value (the next argument, even one that
    starts with a minus sign)."""
    import typer.main

    group = typer.main.get_command(app)
    cmd = getattr(group, "commands", {}).get(command)
    return {name for p in getattr(cmd, "params", ())
            if getattr(p, "param_type_name", "") == "option" and not getattr(p, "is_flag", True)
            for name in p.opts}


def run() -> None:
    """Console-script entry point."""
    leading = _expression_as_option(sys.argv[1:])
    if leading is not None:
        command = sys.argv[1] if len(sys.argv) > 1 and not sys.argv[1].startswith("-") \
            else "expand"
        message = (f"the expression {leading!r} starts with a minus sign, which reads as an "
                   f"option: put it after -- with the options before it, as in qseries "
                   f"{command} -n 10 -- {leading!r}")
        if "--json" in sys.argv[1:]:
            typer.echo(json.dumps({"error": {"message": message, "position": None}}))
        else:
            typer.echo(f"qseries: error: {message}", err=True)
        sys.exit(2)
    which = _for_command(sys.argv[1:])
    try:
        if "--json" in sys.argv[1:]:
            _run_for_json(which)
        which()
    except KeyboardInterrupt:
        typer.echo("qseries: interrupted", err=True)
        sys.exit(130)
    except SystemExit as done:
        # typer (its copy of click) ends a write to a closed pipe with exit code 1 after
        # wrapping the streams in a PacifyFlushWrapper; 1 means "differs" here
        if done.code == 1 and type(sys.stdout).__name__ == "PacifyFlushWrapper":
            sys.exit(streams.EXIT_PIPE_CLOSED)
        raise
