"""The built-in example run by ``qseries demo``.

The first case is a published identity; the second is an invented scenario: a fictional
colleague, Dr. Ines Halvorsen, "conjectures" a product side with an extra factor
(q^20;q^20)_inf.  The two sides agree up to q^19 and first differ at q^20.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class DemoCase:
    story: str
    lhs: str
    rhs: str
    order: int


DEMO_CASES = [
    DemoCase(
        "The second Rogers-Ramanujan identity (see G. E. Andrews, The Theory of "
        "Partitions, 1976, ch. 7) holds to the order asked:",
        "sum_{k>=0} q^(k^2+k)/(q;q)_k",
        "1/((q^2;q^5)_inf (q^3;q^5)_inf)",
        500,
    ),
    DemoCase(
        "An invented colleague, Dr. Ines Halvorsen, conjectures an extra factor on the "
        "product side; it survives the first twenty coefficients:",
        "sum_{k>=0} q^(k^2+k)/(q;q)_k",
        "1/((q^2;q^5)_inf (q^3;q^5)_inf (q^20;q^20)_inf)",
        500,
    ),
]
