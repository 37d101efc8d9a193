"""``qseries prove LHS RHS``: prove an identity between combinations of eta quotients by a
Sturm or valence bound (exit 0, with the certificate), report where the sides differ within
the bound (exit 1), or say why no proof is possible and run the ordinary check to --order
(exit 3, whatever that check says: issue 15); exit 2 for bad input.
"""

from __future__ import annotations

import json
from typing import Annotated

import typer

from ..lang import Node
from .main import DefineOption, JsonOption, OrderOption, RhsArgument, _guarded, _parsed, _sides


def mention_prove(lnode: Node, rnode: Node, holds: bool | None) -> None:
    """After ``check`` agreed: print a note when ``qseries prove`` could decide the identity
    (recognition only, no series computed)."""
    if holds is not True:
        return
    from ..modularity.prove import looks_provable
    from ..report.proof import provable_note

    try:
        provable = looks_provable(lnode, rnode)
    except RecursionError:
        return
    if provable:
        typer.echo(provable_note())


def prove_cmd(
    lhs: Annotated[str, typer.Argument(metavar="LHS", help="The left side.")],
    rhs: RhsArgument = None,
    order: OrderOption = 100,
    define: DefineOption = None,
    as_json: JsonOption = False,
) -> None:
    """Prove LHS = RHS when both sides are (linear combinations of) eta quotients of one
    weight, written in any notation that reduces to them (eta, theta_2/3/4, phi, psi, f,
    chi, q-Pochhammer products, theta series): the level, weight, cusps and the Sturm or
    valence bound B are computed and the coefficients up to B compared exactly (each side
    also with the eta quotients it was recognised as, to B or --order, whichever is
    higher).  Exit 0
    PROVED (with the certificate), 1 DIFFERS (the first mismatch, found within the bound),
    3 NOT PROVED (the reason, and the ordinary check to --order as evidence, whatever it
    says: agrees, differs or inconclusive), 2 bad input.

    Example: qseries prove "theta_3(q)^4" "theta_2(q)^4 + theta_4(q)^4"
    """
    from ..modularity.prove import prove
    from ..report.proof import proof_json, proof_lines

    lnode, rnode = _parsed(_sides(lhs, rhs), define)
    result = _guarded(prove, lnode, rnode, order)
    if as_json:
        typer.echo(json.dumps(proof_json(result)))
    else:
        for line in proof_lines(result):
            typer.echo(line)
    # exit 1 only for a mismatch found within the bound; a refused proof is 3 whatever the
    # ordinary check says (issue 15, item 3)
    differs = result.reason is None and result.holds is False
    raise typer.Exit(0 if result.proved else 1 if differs else 3)
