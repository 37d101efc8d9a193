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
    # regressions (found by a fuzzing run): after an exactly zero product only the factor
    # whose turn it was restarted, dropping the others (and the zero itself)
    "sum_{n=0}^{1} (2;q)_(n-1) (1;q)_(n+1)",
    "sum_{j=-3}^{3} q^(j^2)/((q;q)_(1+j) (q;q)_(3-j))",
    "sum_{n=-6}^{4} (2q^2)^n/((q;q)_(n-2) (-2q;q)_n)",
    "sum_{j=-2}^{3} q^(j^2)/((q;q)_(j+2) (q;q)_(3-j) (q;q)_(-j))",
])
def test_stepping_matches_the_reference(text, monkeypatch):
    for ring in RINGS:
        seen = count_results(monkeypatch, None, "sum_stepping")
        fast, slow = both(text, 150, "stepping", ring)
        assert fast == slow, (text, ring)
        assert seen
