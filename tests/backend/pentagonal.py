"""A test case of the series exponential shared by the ring tests: log (q;q)_inf has
q d/dq-coefficients s_m = -sigma(m) (the input of ``Ring.exp_integral``), and (q;q)_inf
itself is given by the pentagonal number theorem (G. E. Andrews, The Theory of Partitions,
Corollary 1.7, from memory)."""


def euler_case(n: int) -> tuple[list[int], list[int]]:
    """(s, expected): exp_integral(s, n) should give the coefficients ``expected`` of
    (q;q)_inf below q^n (n <= 50), computed from the pentagonal numbers."""
    s = [0] * n
    for x in range(1, n):
        for m in range(x, n, x):
            s[m] -= x
    expected = [0] * n
    for k in range(-5, 6):
        e = k * (3 * k - 1) // 2
        if e < n:
            expected[e] += (-1) ** k
    return s, expected
