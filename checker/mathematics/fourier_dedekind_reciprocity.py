"""The reciprocity law of Fourier-Dedekind sums, and evaluation by it.

Let A = [a_1, ..., a_d], d >= 2, be pairwise coprime positive integers and
s_n(B; b) = fourier_dedekind(n, B, b).  In the partial fractions of
1/prod_i (1 - z^(a_i)) the pole z = 1 gives the polynomial part poly_A(n) of
p_A(n), and every other pole is simple (a root of unity of order dividing
a_j divides no other part); its share is s_{-n}(A without a_j; a_j).  Hence
(Gessel, Electron. J. Combin. 4(2) (1997) #R11; Zagier, Math. Ann. 202 (1973)
for the cotangent sums behind them):

    decomposition:  p_A(n) = poly_A(n) + sum_j s_{-n}(A without a_j; a_j),  n > -(a_1 + ... + a_d),

and since p_A(0) = 1 and p_A(-n) = 0 for 0 < n < a_1 + ... + a_d:

    reciprocity:    sum_j s_0(A without a_j; a_j) = 1 - poly_A(0),
                    sum_j s_n(A without a_j; a_j) = -poly_A(-n),   1 <= n <= a_1 + ... + a_d - 1.

For A = [1, h, k] it is Dedekind's law (Rademacher & Grosswald, *Dedekind
Sums* (1972), ch. 2), since s_0(1, k; h) = -s(k', h) + (h - 1)/(4h) with
k k' = 1 (mod h) (the bridge below).

Reciprocity is also an algorithm: s_n(a_1, ..., a_m; b) with small pairwise
coprime a_i and a huge b is, by the law for A = [a_1, ..., a_m, b], a
polynomial part (its cost depends on m only, not on b) minus m sums modulo the
small a_i, so it costs O(m (a_1 + ... + a_m)) instead of O(m b).

>>> from checker.mathematics.fourier_dedekind import fourier_dedekind

p_{1,2,3}(n) = (n + 3)^2/12 - 7/72 + (-1)^n/8 + (2/9) cos(2 pi n/3) (Cayley), so
poly_A(0) = 47/72, and the law at n = 0 reads s_0(1, 3; 2) + s_0(1, 2; 3) = 1/8 + 2/9:

>>> reciprocity_total(0, [1, 2, 3]), fourier_dedekind(0, [1, 3], 2) + fourier_dedekind(0, [1, 2], 3)
(Fraction(25, 72), Fraction(25, 72))
>>> by_reciprocity(5, [3, 7, 11], 101) == fourier_dedekind(5, [3, 7, 11], 101)
True
"""
from __future__ import annotations

from fractions import Fraction
from math import gcd

from .fourier_dedekind import fourier_dedekind
from .partitions import polynomial_part
from ..foundation.numbers import value_text

__all__ = ["coprimality_problem", "reciprocity_total", "reciprocity_range_problem",
           "by_reciprocity", "reciprocity_cost", "polynomial_part_cost", "bridge_constant", "poly_at"]


def coprimality_problem(parts) -> str:
    """'' when the parts are positive and pairwise coprime, else the reason."""
    for a in parts:
        if a < 1:
            return f"the parts must be positive, but {value_text(a)} is not"
    for i, a in enumerate(parts):
        for c in parts[i + 1:]:
            if gcd(a, c) != 1:
                return (f"the parts must be pairwise coprime, but gcd({value_text(a)}, {value_text(c)}) = "
                        f"{value_text(gcd(a, c))}")
    return ""


def reciprocity_range_problem(n: int, parts) -> str:
    """'' when the law holds at n (0 <= n <= a_1 + ... + a_d - 1), else the reason."""
    top = sum(parts) - 1
    if not 0 <= n <= top:
        return (f"the reciprocity law for A = {value_text(list(parts))} holds for 0 <= n <= {value_text(top)} "
                f"(the sum of the parts minus 1), not at n = {value_text(n)}")
    return ""


def poly_at(n: int, parts) -> Fraction:
    """poly_A(n), the polynomial part of p_A at n."""
    total = Fraction(0)
    for c in reversed(polynomial_part(parts)):
        total = total * n + c
    return total


def reciprocity_total(n: int, parts) -> Fraction:
    """sum_j s_n(A without a_j; a_j): 1 - poly_A(0) at n = 0, -poly_A(-n) above."""
    return 1 - poly_at(0, parts) if n == 0 else -poly_at(-n, parts)


def bridge_constant(b: int) -> Fraction:
    """(b - 1)/(4b): s_0(a, c; b) = -s(a c', b) + (b - 1)/(4b) for c c' = 1 (mod b)."""
    return Fraction(b - 1, 4 * b)


def _reduced_parts(parts, b):
    """The parts modulo b, when reciprocity applies to s_n(parts; b); else None."""
    if b < 2 or not parts:
        return None
    reduced = [a % b for a in parts]
    if coprimality_problem(reduced + [b]):
        return None
    return reduced


def reciprocity_cost(parts, b: int):
    """Operations for by_reciprocity, or None when it does not apply."""
    reduced = _reduced_parts(parts, b)
    if reduced is None:
        return None
    m = len(reduced)
    return m * sum(reduced) + polynomial_part_cost(m + 1, b.bit_length())


def polynomial_part_cost(d: int, bits: int) -> int:
    """Operations for the polynomial part of d parts of about `bits` bits: the series products
    cost O(d^3) operations on numbers that grow with d (measured: d = 100 takes seconds)."""
    return d ** 4 // 10 + d * bits


def by_reciprocity(n: int, parts, b: int) -> Fraction:
    """s_n(parts; b) by the reciprocity law for A = parts (mod b) + [b]."""
    reduced = _reduced_parts(list(parts), b)
    if reduced is None:
        raise ValueError("by_reciprocity needs b >= 2 and parts that are pairwise coprime modulo b")
    n %= b                       # s_n depends on n mod b; now 0 <= n <= b - 1 < sum(A)
    A = reduced + [b]
    total = reciprocity_total(n, A)
    for j, a in enumerate(reduced):
        others = [x % a for x in A[:j] + A[j + 1:]] if a > 1 else []
        if a > 1:
            total -= fourier_dedekind(n % a, others, a)
    return total
