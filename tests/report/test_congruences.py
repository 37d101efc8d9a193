"""qseries.report.congruences: the text of a divisibility test and of a search."""

from qseries.analysis import divisible, find_congruences
from qseries.analysis.congruences import FEW
from qseries.backend import partitions_p
from qseries.report import congruence_lines, divisibility_lines, progression_text


def test_progressions():
    assert progression_text(11, 6) == "a(11n + 6)"
    assert progression_text(3, -1) == "a(3n - 1)"


def test_search_lines_and_weak_evidence():
    lines = congruence_lines(find_congruences("1/(q;q)_inf", 1000))
    assert lines[0].startswith("3 congruences below q^1000 for m <= 30 and moduli 2, 3, 5")
    assert lines[1:] == ["a(5n + 4) = 0 (mod 5)  on 200 coefficients",
                         "a(7n + 5) = 0 (mod 7)  on 143 coefficients",
                         "a(11n + 6) = 0 (mod 11)  on 91 coefficients"]
    # at order 400 a class of 14 coefficients vanishes mod 3 by chance: it is marked
    weak = congruence_lines(find_congruences("1/(q;q)_inf", 400))
    assert weak[-1] == (f"a(29n + 17) = 0 (mod 3)  on 14 coefficients  (fewer than {FEW}: "
                        f"raise --order)")
    assert partitions_p(29 * 14 + 17) % 3 != 0          # and it fails just beyond


def test_divisibility_lines_with_the_exact_coefficient():
    line = divisibility_lines(divisible("1/(q;q)_inf", 25, 100, m=5, r=4))[0]
    # p(5n+4) = 0 mod 25 fails at once: p(4) = 5
    assert line == ("a(5n + 4) is not divisible by 25: at n = 0 (q^4) it is 5 mod 25 (the "
                    "coefficient is 5)")


def test_a_progression_divisible_by_several_moduli_is_one_line():
    """(q;q)_inf^3 = sum (-1)^n (2n+1) q^(n(n+1)/2) (Jacobi; Andrews, The Theory of
    Partitions, Thm 2.8, from memory) is 0 off the triangular numbers, which are never
    2 mod 3: a(3n+2) = 0 is divisible by every modulus, one line (found by a trial: it was
    six lines)."""
    from qseries.analysis import find_congruences
    lines = congruence_lines(find_congruences("(q;q)_inf^3", 300, max_m=3))
    assert "a(3n + 2) = 0 (mod 2, 3, 5, 7, 11, 13)  on 100 coefficients" in lines
    assert sum("a(3n + 2)" in x for x in lines) == 1
