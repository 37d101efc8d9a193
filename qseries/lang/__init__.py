"""The notation: syntax tree, parser, printer and evaluator.

>>> from qseries.lang import parse, show, evaluate
>>> show(parse("(q)_inf"))
'(q;q)_inf'
>>> evaluate("1/(q;q)_inf", 6)
1 + q + 2q^2 + 3q^3 + 5q^4 + 7q^5 + O(q^6)
"""

from .ast import Node
from .evaluator import Evaluator, evaluate
from .parser import parse
from .printer import show

__all__ = ["Node", "Evaluator", "evaluate", "parse", "show"]
