"""The engine: evaluates syntax trees to truncated series (walk, cache, precision retries,
ranges and termination) with named evaluation strategies and one chooser among them.

>>> from qseries.engine import evaluate
>>> evaluate("sum_{k>=0} q^(k^2)/(q;q)_k", 6)
1 + q + q^2 + q^3 + 2q^4 + 2q^5 + O(q^6)
"""

from .chains import quotient
from .chooser import STRATEGIES
from .evaluator import Evaluator, check_weights, evaluate
from .terms import Parts

__all__ = ["STRATEGIES", "Evaluator", "Parts", "check_weights", "evaluate", "quotient"]
