"""qseries: check formal power series and q-series identities to high order.

Write both sides in the notation of papers, evaluate them to a chosen order over FLINT, and
compare.  Agreement to O(q^N) is evidence, not a proof.

>>> import qseries
>>> f = qseries.evaluate("1/(q;q)_inf", order=8)
>>> f[7]
15
>>> r = qseries.check("(q;q)_inf^3", "sum_{n>=0} (-1)^n (2n+1) q^(n(n+1)/2)", order=200)
>>> r.holds, r.order_verified
(True, 200)
>>> qseries.evaluate("(z q;q)_inf", order=3)       # z is an extra variable
1 - z*q - z*q^2 + O(q^3)
"""

from .analysis import (
                       CheckResult,
                       Dissection,
                       Distribution,
                       Mismatch,
                       ProductForm,
                       check,
                       diagnose,
                       dissect,
                       dissection,
                       distributions,
                       divisible,
                       express,
                       find_congruences,
                       product_form,
                       relations,
)
from .analysis.display import register_later
from .backend import GF, QQ, ZZ, laurent_ring
from .engine import evaluate
from .errors import (
                       ArgumentError,
                       ArgumentTypeError,
                       DomainError,
                       IncompatibleRingError,
                       ParseError,
                       PrecisionError,
                       QSeriesError,
                       UnableError,
)
from .lang import parse, show
from .series import Series


def _notebook() -> None:
    """Register the notebook displays of results (HTML, LaTeX, IPython's text)."""
    from .report import notebook  # noqa: F401


register_later(_notebook)      # at the first display, not now: the command line shows none


def __getattr__(name: str) -> object:
    """``prove`` is imported on first use: the modular-form machinery is needed by ``prove``
    alone, not by ``import qseries`` or the other commands."""
    if name == "prove":
        from .modularity import prove

        globals()["prove"] = prove
        return prove
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


def __dir__() -> list[str]:
    return sorted({*globals(), "prove"})

__version__ = "0.1.0"

__all__ = [
    "ArgumentError", "ArgumentTypeError", "CheckResult", "Dissection", "Distribution",
    "DomainError", "GF", "IncompatibleRingError", "Mismatch", "ParseError", "PrecisionError",
    "ProductForm", "QQ", "QSeriesError", "Series", "UnableError", "ZZ", "check", "diagnose",
    "dissect", "dissection", "distributions", "divisible", "evaluate", "express",
    "find_congruences", "laurent_ring", "parse", "product_form", "prove", "relations", "show",
]
