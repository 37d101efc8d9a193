"""Series.html() / _repr_html_ / view(): the first terms and the order, abbreviated, and the
whole series on request; valid, escaped HTML (qseries/series/html.py)."""

from fractions import Fraction
from html.parser import HTMLParser

from qseries import evaluate
from qseries.series import Series, laurent_ring


class _Checker(HTMLParser):
    """Collects the text and checks that every opened tag is closed in order."""

    VOID = {"br"}

    def __init__(self) -> None:
        super().__init__()
        self.stack: list[str] = []
        self.text: list[str] = []

    def handle_starttag(self, tag, attrs):
        if tag not in self.VOID:
            self.stack.append(tag)

    def handle_endtag(self, tag):
        assert self.stack and self.stack[-1] == tag, (tag, self.stack)
        self.stack.pop()

    def handle_data(self, data):
        self.text.append(data)


def text_of(markup: str) -> str:
    """The visible text of well-formed HTML (an AssertionError when it is not)."""
    p = _Checker()
    p.feed(markup)
    p.close()
    assert not p.stack, p.stack
    return "".join(p.text)


def test_partitions_show_their_first_terms_and_the_order():
    # 1/(q;q)_inf = sum p(n) q^n: p(0..5) = 1, 1, 2, 3, 5, 7 (OEIS A000041)
    s = evaluate("1/(q;q)_inf", 2000)
    shown = text_of(s._repr_html_())
    assert shown.startswith("1 + q + 2q2 + 3q3 + 5q4 + 7q5")
    assert "(1980 more terms)" in shown and "O(q2000)" in shown
    assert "2000 nonzero terms" in shown and "known to O(q^2000)" in shown
    assert len(s._repr_html_()) < 3000           # the plain text of this series is ~77 kB


def test_view_shows_everything_and_html_takes_a_count():
    s = evaluate("(q;q)_inf^3", 200)          # Jacobi: sum (-1)^n (2n+1) q^(n(n+1)/2)
    whole = text_of(s.view()._repr_html_())
    assert "more term" not in whole and "\N{MINUS SIGN} 39q190" in whole   # n = 19
    assert text_of(s.html(max_terms=None)) == whole
    assert "(17 more terms)" in text_of(s.html(max_terms=3))


def test_long_coefficients_are_abbreviated():
    s = evaluate("1/(q;q)_inf", 1001)
    tail = text_of(s.html(max_terms=None))
    # p(1000) = 24061467864032622473692149727991 (32 digits, from memory; A000041) is short
    # enough to show whole; a 61-digit number is cut in the middle
    assert "24061467864032622473692149727991q1000" in tail
    big = Series.from_coefficients([2**200])
    assert "(61 digits)" in text_of(big.html())


def test_fractions_offsets_and_extra_variables():
    s = Series.from_coefficients([Fraction(1, 2), 0, Fraction(-3, 4)], prec=5).shift(
        Fraction(1, 24))
    assert text_of(s.html()).startswith("(1/2)q1/24 \N{MINUS SIGN} (3/4)q49/24 + O(q121/24)")
    t = evaluate("(z q;q)_inf", 4)
    assert text_of(t.html()).startswith("1 \N{MINUS SIGN} zq \N{MINUS SIGN} zq2 + (z2 "
                                         "\N{MINUS SIGN} z)q3")


def test_names_are_escaped():
    R = laurent_ring(("a",))
    s = Series.monomial(1, R, R.gen("a"))
    assert "<i>a</i><i>q</i>" in s.html()
    assert "&lt;" not in s.html()        # nothing to escape here, and nothing double-escaped
    exact = text_of(Series.from_coefficients([1, 1]).html())
    assert exact.startswith("1 + q") and "exact polynomial" in exact


def test_ipython_plain_text_is_abbreviated_too():
    class Printer:
        def __init__(self):
            self.out = ""

        def text(self, t):
            self.out += t

    p = Printer()
    evaluate("1/(q;q)_inf", 2000)._repr_pretty_(p, False)
    assert " + ... + " in p.out and len(p.out) < 3000
