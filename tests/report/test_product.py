"""report.product: product forms as text."""

from qseries import product_form
from qseries.report import no_product_line, product_lines


def test_a_periodic_product():
    assert product_lines(product_form("sum_{k>=0} q^(k^2)/(q;q)_k", 100)) == [
        "(q, q^4;q^5)_inf^-1 + O(q^100)",
        "  the exponents repeat with period 5 (19 full periods below q^100)"]


def test_a_fractional_order_and_an_eta_quotient():
    # the series known to O(q^(719/12)) (its own O-term; the order is absolute): the
    # normalised series to q^(718/12), so e_1 .. e_59
    assert product_lines(product_form("(q;q)_inf^2 q^(1/12) + O(q^(719/12))", 60)) == [
        "q^(1/12) (q;q)_inf^2 + O(q^(719/12))",      # q^719/12 would read as q^719 / 12
        "  the exponents repeat with period 1 (59 full periods below q^(719/12))",
        "  as an eta quotient: eta(q)^2"]
    # evaluated to order 60: known to O(q^60), not to O(q^(60 - 1/12)) as it said
    assert product_lines(product_form("(q;q)_inf^2 q^(1/12)", 60))[0] == \
        "q^(1/12) (q;q)_inf^2 + O(q^60)"


def test_a_finite_product():
    assert product_lines(product_form("3(1-q)(1-q^3)^2", 30)) == [
        "3 (1 - q) (1 - q^3)^2 + O(q^30)",
        "  no period in the exponents below the order; the product is finite"]


def test_no_product_form():
    pf = product_form("1 + 2q", 20)
    assert product_lines(pf) == [f"no product form of this kind to this order: {pf.reason}"]
    assert no_product_line("why") == "no product form: why"
