"""Displays pasted as LaTeX (or Unicode) the way papers and books print them, each checked as
the identity its source states.  The sources are named beside each display; equation
numbers are from memory where marked.  Issue 13: "a test file pastes at least 30 displays as
printed in named published sources and checks each one"."""

import pytest

from qseries import check

ANDREWS = "G. E. Andrews, The Theory of Partitions (1976)"
BERNDT = "B. C. Berndt, Ramanujan's Notebooks, Part III (1991), Chapter 16"
BERNDT_NT = "B. C. Berndt, Number Theory in the Spirit of Ramanujan (2006), Chapter 3"
SLATER = "L. J. Slater, Further identities of the Rogers-Ramanujan type, Proc. LMS (2) 54 (1952)"

DISPLAYS = [
    # (source, left side, right side)
    (f"{ANDREWS}, Chapter 7: first Rogers-Ramanujan identity (from memory)",
     r"\sum_{n\ge0}\frac{q^{n^2}}{(q;q)_n}",
     r"\prod_{n\ge0}\frac{1}{(1-q^{5n+1})(1-q^{5n+4})}"),
    (f"{ANDREWS}, Chapter 7: second Rogers-Ramanujan identity (from memory)",
     r"\sum_{n\ge0}\frac{q^{n^2+n}}{(q;q)_n}", r"\frac{1}{(q^2;q^5)_\infty(q^3;q^5)_\infty}"),
    (f"{ANDREWS}, Corollary 2.2, Euler, z = q (from memory)",
     r"\sum_{n\geq 0}\frac{q^n}{(q;q)_n}", r"\frac{1}{(q;q)_{\infty}}"),
    (f"{ANDREWS}, Corollary 2.2, Euler (from memory)",
     r"\sum_{n\ge0}\frac{q^{\binom{n}{2}} z^n}{(q;q)_n}", r"(-z;q)_\infty"),
    (f"{ANDREWS}, Chapter 2: the Durfee square decomposition (from memory)",
     r"\frac{1}{(q;q)_\infty}", r"\sum_{n\ge0}\frac{q^{n^2}}{(q;q)_n^2}"),
    (f"{ANDREWS}, Corollary 2.10, Gauss (from memory)",
     r"\sum_{n=-\infty}^{\infty}(-1)^n q^{n^2}", r"\frac{(q;q)_\infty}{(-q;q)_\infty}"),
    (f"{ANDREWS}, Theorem 2.8, Jacobi's triple product (from memory)",
     r"\sum_{n=-\infty}^\infty z^n q^{n^2}",
     r"(q^2;q^2)_\infty(-zq;q^2)_\infty(-q/z;q^2)_\infty"),
    (f"{ANDREWS}, Corollary 1.7, Euler's pentagonal number theorem (from memory)",
     r"(q;q)_\infty", r"\sum_{n=-\infty}^{\infty}(-1)^n q^{n(3n-1)/2}"),
    (f"{ANDREWS}, Chapter 2, Jacobi (from memory)",
     r"(q;q)_\infty^3", r"\sum_{n\ge0}(-1)^n(2n+1)q^{\binom{n+1}{2}}"),
    (f"{ANDREWS}, Corollary 2.10, Gauss (from memory)",
     r"\sum_{n\ge0} q^{\binom{n+1}{2}}", r"\frac{(q^2;q^2)_\infty}{(q;q^2)_\infty}"),
    (f"{BERNDT}, Entry 22(i) (from memory)",
     r"\varphi(q)", r"(-q;q^2)_\infty^2 (q^2;q^2)_\infty"),
    (f"{BERNDT}, Entry 22(ii) (from memory)",
     r"\psi(q)", r"\frac{(q^2;q^2)_\infty}{(q;q^2)_\infty}"),
    (f"{BERNDT}, Entry 22(iii) (from memory)", r"f(-q)", r"(q;q)_\infty"),
    (f"{BERNDT}, Entry 22(iv): chi(q) = (-q;q^2)_inf (from memory)",
     r"\chi(q)", r"\frac{(-q;q)_\infty}{(-q^2;q^2)_\infty}"),
    (f"{BERNDT}, Entry 22 (from memory)",
     r"\varphi(-q)", r"\frac{(q;q)_\infty}{(-q;q)_\infty}"),
    (f"{BERNDT}, Entry 22 (from memory)",
     r"\psi(-q)", r"\frac{(q;q)_\infty (q^4;q^4)_\infty}{(q^2;q^2)_\infty}"),
    (f"{BERNDT_NT}: Jacobi's two-square theorem (from memory)",
     r"\theta_3(q)^2", r"1 + 4\sum_{n\ge1}\frac{q^n}{1+q^{2n}}"),
    (f"{BERNDT_NT}: Jacobi's four-square theorem (from memory)",
     r"\vartheta_3(q)^4", r"1 + 8 \sum_{n\ge1} \frac{n q^n}{1+(-q)^n}"),
    (f"{ANDREWS}, Chapter 3: the finite q-binomial theorem, n = 6 (from memory)",
     r"\sum_{k=0}^{6} \begin{bmatrix} 6 \\ k \end{bmatrix}_q (-1)^k q^{\binom{k}{2}} z^k",
     r"(z;q)_6"),
    ("G. Gasper, M. Rahman, Basic Hypergeometric Series (2004), (1.3.2), the q-binomial "
     "theorem at a = q^2, z = q (from memory)",
     r"\sum_{n\ge0}\frac{(q^2;q)_n}{(q;q)_n}q^n", r"\frac{(q^3;q)_\infty}{(q;q)_\infty}"),
    (f"{BERNDT}, Entry 22 with theta_2(q) = 2 q^(1/4) psi(q^2) (from memory)",
     r"\theta_2(q)", r"2q^{1/4}\frac{(q^4;q^4)_\infty}{(q^2;q^4)_\infty}"),
    (f"{BERNDT}, Entry 25 (from memory)", r"\theta_4(q^2)^2", r"\theta_3(q)\theta_4(q)"),
    ("K. Ono, The Web of Modularity (2004), Chapter 1: Dedekind's eta function (from memory)",
     r"\eta(\tau)", r"q^{1/24}\prod_{n\ge1}(1-q^n)"),
    (f"{ANDREWS}, Corollary 1.2, Euler: distinct parts and odd parts (from memory)",
     r"(-q;q)_\infty", r"\frac{1}{(q;q^2)_\infty}"),
    (f"{SLATER}, (36): Gollnitz-Gordon (from memory)",
     r"\sum_{n\ge0}\frac{q^{n^2}(-q;q^2)_n}{(q^2;q^2)_n}",
     r"\frac{1}{(q;q^8)_\infty(q^4;q^8)_\infty(q^7;q^8)_\infty}"),
    (f"{SLATER}, (20): Rogers (from memory)",
     r"\sum_{n\ge0}\frac{q^{n^2}}{(q^4;q^4)_n}",
     r"\frac{1}{(-q^2;q^2)_\infty (q;q^5)_\infty (q^4;q^5)_\infty}"),
    (f"{ANDREWS}, Chapter 2, examples: Lebesgue's identity (from memory)",
     r"\sum_{n\ge0}\frac{(a;q)_n q^{\binom{n+1}{2}}}{(q;q)_n}", r"(aq;q^2)_\infty (-q;q)_\infty"),
    (f"{BERNDT}, Entry 19: Jacobi's triple product in Ramanujan's form (from memory)",
     r"f(q,q^2)", r"(-q;q^3)_\infty(-q^2;q^3)_\infty(q^3;q^3)_\infty"),
    (f"{ANDREWS}, Chapter 2: Cauchy, Durfee squares with the number of parts (from memory)",
     r"\sum_{n\ge0}\frac{z^n q^{n^2}}{(q;q)_n(zq;q)_n}", r"\frac{1}{(zq;q)_\infty}"),
    (f"{SLATER}, (79): Rogers (from memory)",
     r"\sum_{n\ge0}\frac{q^{n^2}}{(q;q)_{2n}}",
     r"\frac{1}{(q;q^2)_\infty(q^4;q^{20})_\infty(q^{16};q^{20})_\infty}"),
    ("G. Kohler, Eta Products and Theta Series Identities (2011), Chapter 1: theta as an eta "
     "quotient (from memory)",
     r"\varphi(q)", r"\frac{\eta(2\tau)^5}{\eta(\tau)^2\eta(4\tau)^2}"),
    ("G. Kohler, Eta Products and Theta Series Identities (2011), Chapter 1 (from memory)",
     r"q^{1/8}\psi(q)", r"\frac{\eta(2\tau)^2}{\eta(\tau)}"),
    (f"{ANDREWS}, Chapter 7, as a PDF prints it in Unicode (from memory)",
     "Σ_{n≥0} q^(n^2)/(q;q)_n", "1/((q;q^5)_∞ (q^4;q^5)_∞)"),
    (f"{ANDREWS}, Chapter 2, Jacobi, in eta form and Unicode (from memory)",
     "η(τ)^3", "Σ_{n≥0} (-1)^n (2n+1) q^(n(n+1)/2 + 1/8)"),
    (f"{ANDREWS}, Chapter 2, Euler with \\left( \\right) and spacing (from memory)",
     r"\sum_{n\geq 0} \frac{q^{n(n-1)/2} \, z^n}{\left(q;q\right)_{n}}",
     r"\prod_{n\geq 0} \left( 1 + z q^{n} \right)"),
]


@pytest.mark.parametrize(("source", "lhs", "rhs"), DISPLAYS,
                         ids=[f"display-{i}" for i in range(len(DISPLAYS))])
def test_a_published_display_pasted_as_printed_holds(source, lhs, rhs):
    r = check(lhs, rhs, 150, method="exact")
    assert r.holds is True, (source, r.first_mismatch)
    assert r.order_verified == 150


def test_there_are_at_least_thirty_displays():
    assert len(DISPLAYS) >= 30
