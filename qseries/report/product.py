"""Product forms (:func:`qseries.analysis.product_form`) as text.

>>> from qseries.analysis import product_form
>>> print("\\n".join(product_lines(product_form("(q;q)_inf^2 (q^2;q^2)_inf", 30))))
(q^2;q^2)_inf^3 (q;q^2)_inf^2 + O(q^30)
  the exponents repeat with period 2 (14 full periods below q^30)
  as an eta quotient: eta(q)^2 eta(q^2) q^(-1/6)
"""

from __future__ import annotations

from ..analysis import ProductForm
from ..series.formatting import power_text


def product_lines(pf: ProductForm) -> list[str]:
    """The report of ``qseries product``: the product to its order, its period (or that it
    is finite) and its eta quotient when there is one; or why there is no product form of
    this kind.

    >>> from qseries.analysis import product_form
    >>> print("\\n".join(product_lines(product_form("3(1-q)(1-q^3)^2", 30))))
    3 (1 - q) (1 - q^3)^2 + O(q^30)
      no period in the exponents below the order; the product is finite
    >>> product_lines(product_form("1 + 2q", 8))[0][:40]
    'no product form of this kind to this ord'
    >>> print("\\n".join(product_lines(product_form("(q;q^2)_inf (q;q^3)_inf", 60))))
    (q;q^6)_inf^2 (q^3, q^4, q^5;q^6)_inf + O(q^60)
      the exponents repeat with period 6 (9 full periods below q^60)
      in fewer factors: (q;q^2)_inf (q;q^3)_inf
    """
    if pf.expression is None:
        return [f"no product form of this kind to this order: {pf.reason}"]
    return [pf.expression + f" + O({power_text(pf.order)})"] + \
        [f"  {label}{value}" for label, value in product_notes(pf)]


def product_notes(pf: ProductForm) -> list[tuple[str, str]]:
    """The notes under a product form, as (sentence, notation) pairs (the notation empty
    where there is none), for the text and the HTML report alike.

    >>> from qseries.analysis import product_form
    >>> product_notes(product_form("(q;q)_inf", 12))[1]
    ('as an eta quotient: ', 'eta(q) q^(-1/24)')
    """
    notes = [(f"the exponents repeat with period {pf.period} ({pf.repetitions} full "
              f"periods below {power_text(pf.order)})", "") if pf.period else
             ("no period in the exponents below the order; the product is finite", "")]
    if pf.factors:
        notes.append(("in fewer factors: ", pf.factors))
    if pf.eta:
        notes.append(("as an eta quotient: ", pf.eta))
    return notes


def no_product_line(reason: str) -> str:
    """``qseries product`` when the exponents could not be recovered at all.

    >>> no_product_line("the exponent of (1-q^1) would be -1/2")
    'no product form: the exponent of (1-q^1) would be -1/2'
    """
    return f"no product form: {reason}"
