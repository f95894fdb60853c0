"""Floor sums by the Euclid-like reduction, in O(log) arithmetic steps.

For integers n >= 0, c >= 1 and any integers a, b:

    f(a, b, c, n) = sum_{i=0}^{n} floor((a i + b) / c)
    g(a, b, c, n) = sum_{i=0}^{n} i * floor((a i + b) / c)
    h(a, b, c, n) = sum_{i=0}^{n} floor((a i + b) / c)^2

computed together by alternately reducing (a, b) modulo c and exchanging the
roles of the axes (the lattice points under the line counted column by column
or row by row).  The steps are recorded going down and combined coming back,
so the depth of the reduction is not bounded by Python's recursion limit.

>>> staircase(10, 3, 0, 4)          # floor(0/4)+floor(3/4)+...+floor(27/4)
30
>>> floor_sums(4, 7, 3, 5)          # floors 2, 3, 5, 6, 7, 9
(32, 104, 204)
"""
from __future__ import annotations

__all__ = ["staircase", "floor_sums"]


def staircase(count: int, a: int, b: int, c: int) -> int:
    """sum_{i=0}^{count-1} floor((a i + b)/c), for count >= 0 and c >= 1."""
    if count <= 0:
        return 0
    return floor_sums(a, b, c, count - 1)[0]


def floor_sums(a: int, b: int, c: int, n: int) -> tuple[int, int, int]:
    """(f, g, h) as in the module docstring, i running from 0 to n."""
    if c < 1:
        raise ValueError("floor_sums needs c >= 1")
    if n < 0:
        return 0, 0, 0
    steps = []
    while True:
        if a == 0:
            t = b // c
            f, g, h = (n + 1) * t, t * (n * (n + 1) // 2), (n + 1) * t * t
            break
        if a >= c or b >= c or a < 0 or b < 0:
            qa, qb = a // c, b // c
            steps.append((0, qa, qb, n))
            a, b = a - qa * c, b - qb * c
            continue
        m = (a * n + b) // c
        if m == 0:
            f = g = h = 0
            break
        steps.append((1, m, 0, n))
        a, b, c, n = c, c - b - 1, a, m - 1
    for kind, x, y, n in reversed(steps):
        if kind == 0:
            qa, qb = x, y
            s1 = n * (n + 1) // 2
            s2 = n * (n + 1) * (2 * n + 1) // 6
            f, g, h = (
                f + qa * s1 + qb * (n + 1),
                g + qa * s2 + qb * s1,
                h + 2 * qb * f + 2 * qa * g + qa * qa * s2 + 2 * qa * qb * s1 + qb * qb * (n + 1),
            )
        else:
            m = x
            f_new = n * m - f
            g_new = (m * n * (n + 1) - h - f) // 2
            h_new = n * m * (m + 1) - 2 * g - 2 * f - f_new
            f, g, h = f_new, g_new, h_new
    return f, g, h
