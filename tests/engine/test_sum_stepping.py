"""Term-by-term stepping against the direct reference."""

import pytest

from .strategy_helpers import RINGS, both, count_results


@pytest.mark.parametrize("text", [
    "sum_{n>=0} q^n/(q;q)_n",                       # Euler: about N terms
    "sum_{n>=0} q^(n^2) (q;q^2)_n/(q^4;q^4)_n",
    "sum_{n>=0} q^(n(n+1)/2) (-q;q)_n / (q;q)_(2n+1)",
    "sum_{n>=0} q^(n^2)/((q;q)_n (1 - q^(2n+1)))",  # a factor that does not step
    "sum_{m=-2}^{8} q^(2m)/(q;q)_m^2",              # negative subscripts: 1/(q;q)_m = 0
    "sum_{n=-inf}^{inf} q^(3 (3n^2+n)/2) (q^(3 n) - q^(-(3n+1)))",
])
def test_stepping_matches_the_reference(text, monkeypatch):
    for ring in RINGS:
        seen = count_results(monkeypatch, None, "sum_stepping")
        fast, slow = both(text, 150, "stepping", ring)
        assert fast == slow, (text, ring)
        assert seen
