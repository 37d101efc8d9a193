"""The notation, syntax only: tokens, syntax tree, parser and printer (evaluation is the
engine's).

>>> from qseries.lang import parse, show
>>> show(parse("(q)_inf"))
'(q;q)_inf'
"""

from .ast import Node
from .parser import parse
from .printer import show

__all__ = ["Node", "parse", "show"]
