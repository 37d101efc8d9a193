"""Every rendering of results, in one layer after the analyses: verdict text
(:mod:`.verdict`), the table around a mismatch (:mod:`.neighbours`), hints (:mod:`.hints`),
the JSON shapes shared by the command line and the catalogue (:mod:`.json_shapes`),
expansions and dissections (:mod:`.expansion`), congruences (:mod:`.congruences`),
relations (:mod:`.relations`), scans (:mod:`.scan`), product forms (:mod:`.product`),
distributions (:mod:`.distribution`), the tables of ``verify`` and ``list`` (:mod:`.tables`),
and the HTML and LaTeX that notebooks show for results (:mod:`.notebook`, imported at the
first display of a result or the first use of its names here, not with this package).

Each function returns text, lines or plain data; printing is the caller's business.

>>> from qseries.analysis import check
>>> check_json(check("1/(1-q)", "1 + q", order=5))["first_mismatch"]
{'index': 2, 'lhs': '1', 'rhs': '0'}
"""

from .congruences import congruence_lines, divisibility_lines, progression_text
from .distribution import decimal_text, distribution_lines, trend_csv
from .expansion import dissection_lines, expansion_note, expansion_text
from .hints import hint_line
from .json_shapes import (
    check_json,
    combination_json,
    congruences_json,
    dissection_json,
    distribution_json,
    distributions_json,
    divisibility_json,
    entry_json,
    expand_json,
    exponent_json,
    finite_json,
    hint_json,
    listing_json,
    listing_rows,
    mismatch_json,
    no_product_json,
    product_json,
    relations_json,
    trend_json,
    verify_json,
)
from .neighbours import neighbour_table
from .product import no_product_line, product_lines
from .relations import combination_lines, relation_lines
from .scan import relation_text, scan_json, scan_lines
from .tables import (
    listing_line,
    listing_summary,
    listing_table,
    row_label,
    slowest_line,
    sources_lines,
    verify_line,
    verify_summary,
    verify_table,
)
from .verdict import check_lines, entry_verdict_text, mismatch_report, mismatch_text

__all__ = ["check_html", "check_json", "check_lines", "combination_json", "combination_lines",
           "congruence_lines", "congruences_json",
           "decimal_text", "dissection_json", "dissection_lines", "distribution_html",
           "distribution_json", "distribution_lines", "distributions_json", "divisibility_json",
           "divisibility_lines", "entry_json", "entry_verdict_text", "expand_json",
           "expansion_note", "expansion_text", "exponent_json", "finite_json", "hint_json",
           "hint_line", "listing_json", "listing_line", "listing_rows",
           "listing_summary", "listing_table",
           "mismatch_json", "mismatch_report", "mismatch_text", "neighbour_table",
           "no_product_json", "no_product_line", "product_html", "product_json", "product_lines",
           "progression_text", "relation_lines", "relation_text", "relations_json", "row_label",
           "scan_json", "scan_lines", "slowest_line",
           "sources_lines", "trend_csv", "trend_json", "verify_json", "verify_line",
           "verify_summary", "verify_table"]

#: names of :mod:`.notebook`, imported on first use (PEP 562): the command line never
#: needs its HTML (nor the standard library's ``html``)
_NOTEBOOK = ("check_html", "distribution_html", "product_html")


def __getattr__(name: str) -> object:
    if name in _NOTEBOOK:
        from . import notebook

        return getattr(notebook, name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
