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
"""

from ._flint import GF, QQ, ZZ
from .analysis import CheckResult, Mismatch, ProductForm, check, diagnose, product_form
from .errors import DomainError, IncompatibleRingError, ParseError, QSeriesError, UnableError
from .lang import evaluate, parse, show
from .series import Series

__version__ = "0.1.0"

__all__ = [
    "CheckResult", "DomainError", "GF", "IncompatibleRingError", "Mismatch", "ParseError",
    "ProductForm", "QQ", "QSeriesError", "Series", "UnableError", "ZZ", "check", "diagnose",
    "evaluate", "parse", "product_form", "show",
]
