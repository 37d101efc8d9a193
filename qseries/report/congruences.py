"""Congruences (``qseries congruences``) as text: the result of a divisibility test, and the
list a search found.

>>> from qseries.analysis import find_congruences
>>> congruence_lines(find_congruences("1/(q;q)_inf", 1000, max_m=8))[1]
'a(5n + 4) = 0 (mod 5)  on 200 coefficients'
"""

from __future__ import annotations

from fractions import Fraction

from ..analysis import CongruenceSearch, Divisibility
from ..analysis.congruences import FEW
from ..series.formatting import coefficient_text


def progression_text(m: int, r: int | Fraction) -> str:
    """``a(5n + 4)``, ``a(n)``, ``a(2n - 1/24)``: the coefficient a(m n + r) as text.

    >>> progression_text(5, 4), progression_text(1, 0), progression_text(2, Fraction(1, 24))
    ('a(5n + 4)', 'a(n)', 'a(2n + 1/24)')
    """
    head = "n" if m == 1 else f"{m}n"
    if r > 0:
        head += f" + {coefficient_text(r)}"
    elif r < 0:
        head += f" - {coefficient_text(-r)}"
    return f"a({head})"


def divisibility_lines(d: Divisibility) -> list[str]:
    """One line: divisible below the order, or the first counterexample.

    >>> from qseries.analysis import divisible
    >>> divisibility_lines(divisible("1/(q;q)_inf", 5, 50, m=5, r=4))
    ['a(5n + 4) = 0 (mod 5) for every n < 50 (50 coefficients): divisible']
    >>> divisibility_lines(divisible("1/(q;q)_inf", 2, 50))[0]
    'a(n) is not divisible by 2: at n = 0 (q^0) it is 1 mod 2'
    """
    a = progression_text(d.m, d.r)
    if d.counterexample is None:
        return [f"{a} = 0 (mod {d.modulus}) for every n < {coefficient_text(d.order)} "
                f"({d.checked} coefficients): divisible"]
    c = d.counterexample
    value = "" if c.value is None else f" (the coefficient is {coefficient_text(c.value)})"
    return [f"{a} is not divisible by {d.modulus}: at n = {c.n} (q^{coefficient_text(c.exponent)}"
            f") it is {c.residue} mod {d.modulus}{value}"]


def congruence_lines(s: CongruenceSearch) -> list[str]:
    """A header with the ranges searched, then one line per congruence found (implied ones
    omitted) with the number of coefficients it rests on; those resting on fewer than
    ``FEW`` are marked.

    >>> from qseries.analysis import find_congruences
    >>> congruence_lines(find_congruences("1/(q;q)_inf", 100, max_m=3))
    ['no congruence below q^100 for m <= 3 and moduli 2, 3, 5, 7, 11, 13']
    """
    moduli = ", ".join(str(x) for x in s.moduli)
    if not s.congruences:
        return [f"no congruence below q^{s.order} for m <= {s.max_m} and moduli {moduli}"]
    n = len(s.congruences)
    lines = [f"{n} congruence{'s' if n > 1 else ''} below q^{s.order} for m <= {s.max_m} and "
             f"moduli {moduli} (implied ones omitted):"]
    # one line per progression, with every modulus it is divisible by (a progression of
    # zeros, as in (q;q)_inf^3, would otherwise fill a line per modulus)
    groups: dict[tuple[int, Fraction], list] = {}
    for c in s.congruences:
        groups.setdefault((c.m, c.r), []).append(c)
    for (m, r), found in groups.items():
        checked = min(c.checked for c in found)
        weak = f"  (fewer than {FEW}: raise --order)" if checked < FEW else ""
        mods = ", ".join(str(c.modulus) for c in found)
        lines.append(f"{progression_text(m, r)} = 0 (mod {mods})  on {checked} "
                     f"coefficients{weak}")
    return lines
