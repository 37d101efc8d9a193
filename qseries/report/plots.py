"""Pictures of results, drawn with matplotlib (the optional extra ``plot``): the
distribution of a statistic against the normal density, the growth of a series'
coefficients, the difference of the two sides of a failed check, and the exponents of a
product form by residue class.

matplotlib is imported inside each function and only its object interface is used (a
``Figure`` drawn on the Agg canvas): no pyplot, no global backend or state is touched, so
the functions are safe in a notebook and in a process without a display.  Each returns the
``Figure`` and, given ``path`` (``.png`` or ``.svg``), writes it there.

>>> from qseries.analysis import distributions
>>> [d] = distributions("1/(z*q;q)_inf", "z", [30])
>>> fig = distribution_plot(d)
>>> fig.axes[0].get_xlabel()
'(z - mean) / sd'
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from fractions import Fraction
from pathlib import Path
from typing import Any

from ..analysis import CheckResult, Distribution, ProductForm
from ..errors import ArgumentError, PrecisionError, UnableError
from ..series import LaurentPoly, Series

#: the file types a plot is written as (by the path's suffix)
FORMATS = (".png", ".svg")
#: figure size in inches and resolution of a PNG: about 800 x 500 pixels, tens of kB
SIZE = (8, 5)
DPI = 100
#: at most this many sizes n side by side in one distribution picture
MAX_PANELS = 6


def _figure(panels: int = 1) -> Any:
    try:
        from matplotlib.figure import Figure
    except ImportError:
        raise UnableError("pictures need matplotlib, which is not installed: "
                          "pip install matplotlib (or pip install 'qseries[plot]')") from None
    fig = Figure(figsize=(SIZE[0] * min(panels, 2) if panels > 1 else SIZE[0], SIZE[1]),
                 dpi=DPI, layout="constrained")
    return fig


def _check_path(path: str | Path | None) -> Path | None:
    if path is None:
        return None
    p = Path(path)
    if p.suffix.lower() not in FORMATS:
        raise ArgumentError(f"a picture is written as PNG or SVG: the file name must end in "
                            f"{' or '.join(FORMATS)}, not {p.name!r}")
    return p


def _save(fig: Any, path: Path | None) -> Any:
    if path is not None:
        try:
            fig.savefig(path, format=path.suffix.lower()[1:])
        except OSError as err:
            raise UnableError(f"cannot write {path}: {err.strerror or err}") from None
    return fig


def _log_abs(c: int | Fraction) -> float:
    """log|c| for a nonzero exact number of any size."""
    f = Fraction(c)
    return math.log(abs(f.numerator)) - math.log(f.denominator)


def distribution_plot(dists: Distribution | Sequence[Distribution], path: str | Path | None = None,
                      var: str | None = None) -> Any:
    """The standardised distribution of the statistic at each size n (one panel per size,
    at most 6): a bar at (j - mean)/sd of height sd * share, so that the bars have area 1
    like the standard normal density drawn over them; the legend gives the mean, the
    variance, the skewness and the excess kurtosis.

    >>> from qseries.analysis import Distribution
    >>> distribution_plot(Distribution(2, {1: 1}))  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    qseries.errors.ArgumentError: the statistic takes one value at n = 2 (variance 0): ...
    """
    ds = [dists] if isinstance(dists, Distribution) else list(dists)
    if not ds:
        raise ArgumentError("no distribution to draw")
    if len(ds) > MAX_PANELS:
        raise ArgumentError(f"at most {MAX_PANELS} sizes are drawn side by side, not {len(ds)}")
    for d in ds:
        if d.variance == 0:
            raise ArgumentError(f"the statistic takes one value at n = {d.n} (variance 0): "
                                f"there is no standardised distribution to draw")
    target = _check_path(path)
    fig = _figure(len(ds))
    axes = fig.subplots(1, len(ds), squeeze=False)[0]
    for ax, d in zip(axes, ds, strict=True):
        mean, sd = float(d.mean), math.sqrt(float(d.variance))
        xs = [(j - mean) / sd for j in d.counts]
        heights = [sd * float(Fraction(c, d.total)) for c in d.counts.values()]
        width = min(1 / sd, 0.9 * min((b - a for a, b in zip(xs, xs[1:], strict=False)),
                                      default=1 / sd))
        label = (f"n = {d.n}: mean {mean:.4g}, variance {float(d.variance):.4g}\n"
                 f"skewness {d.standardised_moment(3):.3f}, "
                 f"excess kurtosis {d.standardised_moment(4) - 3:.3f}")
        ax.bar(xs, heights, width=width, color="#4c72b0", alpha=0.75, label=label)
        lo, hi = min(xs + [-3.5]), max(xs + [3.5])
        grid = [lo + (hi - lo) * i / 400 for i in range(401)]
        ax.plot(grid, [math.exp(-x * x / 2) / math.sqrt(2 * math.pi) for x in grid],
                color="#c44e52", label="standard normal density")
        ax.set_xlabel(f"({var or d.var or 'X'} - mean) / sd")
        ax.set_ylabel("sd x share")
        ax.set_title(f"n = {d.n} ({d.total:,} objects)" if d.total < 10**15 else
                     f"n = {d.n} (about 10^{len(str(d.total)) - 1} objects)")
        ax.legend(loc="upper right", fontsize="small")
    return _save(fig, target)


def growth_plot(s: Series, path: str | Path | None = None) -> Any:
    """log|a_n| against sqrt(n) for the nonzero coefficients a_n of ``s`` (in q alone) with
    n >= 1: for partition-type generating functions the points lie near a straight line,
    log a_n ~ C sqrt(n).

    >>> from qseries.engine import evaluate
    >>> fig = growth_plot(evaluate("1/(q;q)_inf", 50))
    >>> len(fig.axes[0].lines[0].get_xdata())
    49
    """
    if getattr(s.ring, "names", ()):
        raise ArgumentError("the growth picture needs a series in q alone (numbers as "
                            "coefficients)")
    if s.ring.modulus is not None:
        raise ArgumentError("the growth picture needs exact coefficients, not residues")
    pts = [(math.sqrt(float(e)), _log_abs(c)) for e, c in s.terms()
           if e >= 1 and not isinstance(c, LaurentPoly)]
    if not pts:
        raise ArgumentError("the series has no nonzero coefficient a_n with n >= 1 to draw")
    target = _check_path(path)
    fig = _figure()
    ax = fig.subplots()
    ax.plot([p[0] for p in pts], [p[1] for p in pts], ".", markersize=3, color="#4c72b0",
            label=f"log|a_n|, {len(pts)} nonzero coefficients")
    ax.set_xlabel("sqrt(n)")
    ax.set_ylabel("log |a_n|")
    known = "exact" if s.precision is None else f"to O(q^{s.precision})"
    ax.set_title(f"growth of the coefficients ({known})")
    ax.legend(loc="upper left", fontsize="small")
    return _save(fig, target)


def difference_plot(r: CheckResult, path: str | Path | None = None) -> Any:
    """The coefficients of left minus right side of a failed check against n, over every
    exponent known on both sides (a symmetric logarithmic scale), the first mismatch marked.
    After a modular check the sides are known exactly only a few terms past the mismatch
    (they were compared modulo primes), so that is all the picture shows.

    >>> from qseries.analysis import check
    >>> fig = difference_plot(check("1/(1-q)", "1/(1-q) + q^5 - 3q^7", order=10))
    >>> fig.axes[0].get_title()
    'left - right: first difference at q^5'
    """
    m = r.first_mismatch
    if m is None or r.lhs is None or r.rhs is None:
        raise ArgumentError("the sides agree (or were not compared): there is no difference "
                            "to draw")
    try:
        diff = r.lhs - r.rhs
    except PrecisionError as err:    # pragma: no cover - sides of a failed check share a frame
        raise ArgumentError(f"the sides cannot be subtracted: {err}") from None
    if getattr(diff.ring, "names", ()):
        raise ArgumentError("the difference has coefficients in extra variables; the "
                            "picture needs numbers")
    limit = Fraction(r.order_verified)
    pts = [(float(e), float(c)) for e, c in diff.terms() if Fraction(e) < limit]
    target = _check_path(path)
    fig = _figure()
    ax = fig.subplots()
    ax.vlines([p[0] for p in pts], 0, [p[1] for p in pts], color="#4c72b0", linewidth=1)
    ax.plot([p[0] for p in pts], [p[1] for p in pts], ".", color="#4c72b0", markersize=3,
            label=f"{len(pts)} nonzero differences below q^{r.order_verified}")
    ax.plot([float(m.exponent)], [float(m.difference)], "o", color="#c44e52",
            label=f"first at n = {m.exponent}: {m.lhs} vs {m.rhs}")
    ax.set_yscale("symlog", linthresh=1)
    ax.axhline(0, color="gray", linewidth=0.5)
    ax.set_xlabel("n")
    ax.set_ylabel("coefficient of q^n, left - right")
    ax.set_title(f"left - right: first difference at q^{m.exponent}")
    ax.legend(loc="best", fontsize="small")
    return _save(fig, target)


def exponents_plot(pf: ProductForm, path: str | Path | None = None) -> Any:
    """The exponents e_n of f = c q^s prod (1 - q^n)^(e_n) against n, coloured by the
    residue of n modulo the period (one colour when there is none, or more than 12 classes).

    >>> from qseries.analysis import product_form
    >>> fig = exponents_plot(product_form("sum_{k>=0} q^(k^2)/(q;q)_k", 40))
    >>> fig.axes[0].get_title()
    'exponents e_n of prod (1 - q^n)^(e_n), period 5'
    """
    ex = pf.exponents
    if not ex:
        raise ArgumentError("the product form has no exponents to draw (order too low)")
    target = _check_path(path)
    fig = _figure()
    ax = fig.subplots()
    m = pf.period
    ns = list(range(1, len(ex) + 1))
    classes: list[int | None] = list(range(m)) if m and m <= 12 else [None]
    if m and m > 12:           # many classes: a colour scale instead of a legend entry each
        dots = ax.scatter(ns, ex, c=[n % m for n in ns], cmap="viridis", s=9,
                          label=f"e_n, coloured by n mod {m}")
        fig.colorbar(dots, ax=ax, label=f"n mod {m}")
    else:
        for r in classes:
            picked = [n for n in ns if r is None or n % m == r]   # type: ignore[operator]
            label = "e_n" if r is None else f"n = {r} mod {m}"
            ax.plot(picked, [ex[n - 1] for n in picked], "o", markersize=3, label=label)
    ax.axhline(0, color="gray", linewidth=0.5)
    ax.set_xlabel("n")
    ax.set_ylabel("e_n")
    ax.set_title("exponents e_n of prod (1 - q^n)^(e_n)" + (f", period {m}" if m else
                                                            ", no period"))
    ax.legend(loc="best", fontsize="small", ncol=2 if len(classes) > 6 else 1)
    return _save(fig, target)


#: the asymptotic forms ``trend_plot`` fits: name -> (label, function of n)
FITS: dict[str, tuple[str, Any]] = {
    "sqrt": ("c sqrt(n)", math.sqrt),
    "log": ("c log(n)", math.log),
    "linear": ("c n", float),
    "sqrt-log": ("c sqrt(n) log(n)", lambda n: math.sqrt(n) * math.log(n)),
}


def fitted_constant(xs: Sequence[float], ys: Sequence[float]) -> float:
    """The c of least squares for y ~ c x (through the origin).

    >>> fitted_constant([1.0, 2.0], [2.0, 4.0])
    2.0
    """
    den = sum(x * x for x in xs)
    if den == 0:
        raise ArgumentError("nothing to fit: every value of the form is 0")
    return sum(x * y for x, y in zip(xs, ys, strict=True)) / den


def trend_plot(dists: Sequence[Distribution], path: str | Path | None = None,
               fit: str | None = None) -> Any:
    """The mean and the variance of the statistic against n (two panels); with ``fit`` (one
    of ``FITS``: "sqrt", "log", "linear", "sqrt-log"), the curve c f(n) fitted to each by
    least squares over the upper half of the sizes, with c in the legend.

    >>> from qseries.analysis import distributions
    >>> fig = trend_plot(distributions("1/(z*q;q)_inf", "z", list(range(1, 60))), fit="sqrt")
    >>> [ax.get_ylabel() for ax in fig.axes]
    ['mean', 'variance']
    """
    ds = sorted(dists, key=lambda d: d.n)
    if len(ds) < 2:
        raise ArgumentError("the trend needs at least two sizes n")
    if fit is not None and fit not in FITS:
        raise ArgumentError(f"fit must be one of {', '.join(FITS)}, not {fit!r}")
    target = _check_path(path)
    fig = _figure(2)
    axes = fig.subplots(1, 2)
    ns = [d.n for d in ds]
    for ax, name, values in ((axes[0], "mean", [float(d.mean) for d in ds]),
                             (axes[1], "variance", [float(d.variance) for d in ds])):
        ax.plot(ns, values, ".", markersize=3, color="#4c72b0", label=name)
        if fit is not None:
            label, f = FITS[fit]
            upper = [(n, v) for n, v in zip(ns, values, strict=True) if n >= ns[-1] / 2 and n > 0]
            c = fitted_constant([f(n) for n, _ in upper], [v for _, v in upper])
            grid = [n for n in ns if n > 0]
            ax.plot(grid, [c * f(n) for n in grid], color="#c44e52",
                    label=f"{label}, c = {c:.5g} (fitted for n >= {ns[-1] // 2})")
        ax.set_xlabel("n")
        ax.set_ylabel(name)
        ax.legend(loc="upper left", fontsize="small")
    fig.suptitle(f"the statistic's mean and variance for n = {ns[0]} .. {ns[-1]}")
    return _save(fig, target)
