"""Relations among series (``qseries relations``) as text.

>>> from qseries.analysis import relations
>>> relation_lines(relations(["1/(1-q)", "q/(1-q)", "1"], 20))[1]
'(1/(1-q)) - (q/(1-q)) - (1) = 0'
"""

from __future__ import annotations

from ..analysis import Combination, Relations


def relation_lines(r: Relations) -> list[str]:
    """A header with the count and the evidence, then one relation per line in the
    notation.

    >>> from qseries.analysis import relations
    >>> relation_lines(relations(["1/(1-q)", "(q;q)_inf"], 20))
    ['no integer relation below q^20 (20 coefficients for 2 unknowns)']
    """
    evidence = f"{r.equations} coefficients for {_unknowns(r.unknowns)}"
    def kind(n: int) -> str:
        noun = "relation" if n == 1 else "relations"
        return f"integer {noun}" if r.degree == 1 else \
            f"polynomial {noun} of degree <= {r.degree}"

    if not r.relations:
        return [f"no {kind(1)} below q^{r.order} ({evidence})"]
    n = len(r.relations)
    note = "" if r.stable else "; not yet stable: raise the order"
    lines = [f"{n} {kind(n)} below q^{r.order} (a reduced basis; "
             f"{evidence}, {r.confirmed} beyond the unknowns confirm {'them' if n > 1 else 'it'}"
             f"{note}):"]
    lines += [r.text(v) for v in r.relations]
    return lines


def combination_lines(c: Combination) -> list[str]:
    """The combination found by ``qseries express`` with its evidence, or why there is
    none.

    >>> from qseries.analysis import express
    >>> combination_lines(express("q/(1-q)", ["1/(1-q)", "1"], 20))[1]
    '(q/(1-q)) = (1/(1-q)) - (1)'
    """
    evidence = f"{c.equations} coefficients for {_unknowns(c.unknowns)}"
    if c.coefficients is None:
        return [f"no combination of the {len(c.basis)} basis series gives the target below "
                f"q^{c.order} ({evidence})"]
    note = "" if c.stable else "; not yet stable: raise the order"
    return [f"a unique combination below q^{c.order} ({evidence}, {c.confirmed} beyond the "
            f"unknowns confirm it{note}):", c.text()]


def _unknowns(n: int) -> str:
    """``1 unknown``, ``3 unknowns``.

    >>> _unknowns(1), _unknowns(3)
    ('1 unknown', '3 unknowns')
    """
    return f"{n} unknown{'' if n == 1 else 's'}"
