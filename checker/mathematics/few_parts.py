"""Restricted partition functions with at most three parts, in O(log) arithmetic steps.

p_A(n) counts the (m_1, ..., m_d) in Z_{>=0}^d with m_1 a_1 + ... + m_d a_d = n
(a multiset A of positive integers; 0 for n < 0; p_{}(n) = [n = 0]).  For d <= 3
the count needs no table and no quasi-polynomial, whatever the size of the parts:

* one part: p_{a}(n) = [a | n];
* two parts (Popoviciu, Mathematica (Cluj) 1953): for coprime a, b and n >= 0,
  p_{a,b}(n) = n/(ab) - {b' n/a} - {a' n/b} + 1 with b b' = 1 (mod a), a a' = 1 (mod b);
  with g = gcd(a, b), p_{a,b}(n) = [g | n] p_{a/g,b/g}(n/g);
* three parts: p_{a,b,c}(n) = sum_{j=0}^{floor(n/c)} p_{a,b}(n - j c).  After
  dividing A by its gcd, g = gcd(a, b) is coprime to c, so only j = j0 (mod g)
  give a term; each term is Popoviciu's formula at N - c t, a linear part plus
  two fractional parts {x (N - c t)/q}, and summed over t the fractional parts
  are floor sums sum_t floor((-x c t + x N)/q), computed by the staircase
  (floor_sums) in O(log) steps.

The three-part value is assembled over the common denominator a b / g^2 and
must come out an integer; a remainder would be a bug and raises instead of
being rounded.  OEIS A001399 (parts 1, 2, 3) has a(n) = round((n + 3)^2/12):

>>> three_parts(10**6, 1, 2, 3) == ((10**6 + 3) ** 2 + 6) // 12
True
>>> two_parts(23, 5, 7), two_parts(35, 5, 7)          # 23 is Sylvester's g(5, 7); 35 = 7*5 = 0*5 + 5*7
(0, 2)
>>> few_parts(10, [1, 2, 3])
14
"""
from __future__ import annotations

from math import gcd

from .floor_sums import staircase
from ..foundation.numbers import value_text

__all__ = ["few_parts", "two_parts", "three_parts"]


def few_parts(n: int, parts) -> int:
    """p_A(n) for a list A of at most three positive integers."""
    parts = sorted(parts)
    if n < 0:
        return 0
    if not parts:
        return int(n == 0)
    if len(parts) == 1:
        return int(n % parts[0] == 0)
    if len(parts) == 2:
        return two_parts(n, *parts)
    if len(parts) == 3:
        return three_parts(n, *parts)
    raise ValueError("few_parts takes at most three parts")


def two_parts(n: int, a: int, b: int) -> int:
    """p_{a,b}(n): x with a x <= n and a x = n (mod b) are x = r (mod b), r = n a^-1 mod b."""
    if n < 0:
        return 0
    g = gcd(a, b)
    if n % g:
        return 0
    n, a, b = n // g, a // g, b // g
    r = n * pow(a, -1, b) % b
    # (n//a - r)//b + 1 counts r, r + b, ... up to n//a; it is 0 when r > n//a, as r < b
    return (n // a - r) // b + 1


def three_parts(n: int, a: int, b: int, c: int) -> int:
    """p_{a,b,c}(n) by Popoviciu's formula summed over the multiples of c (module docstring)."""
    if n < 0:
        return 0
    g0 = gcd(gcd(a, b), c)
    if n % g0:
        return 0
    n, a, b, c = n // g0, a // g0, b // g0, c // g0
    g = gcd(a, b)                       # coprime to c now
    j0 = n * pow(c, -1, g) % g          # c j = n (mod g)
    top = n // c
    if j0 > top:
        return 0
    count = (top - j0) // g + 1         # t = 0 .. count - 1, j = j0 + g t
    big_n = (n - c * j0) // g           # the two-part argument is big_n - c t
    a, b = a // g, b // g
    beta = pow(b, -1, a)                # b beta = 1 (mod a); 0 when a = 1
    alpha = pow(a, -1, b)
    total_m = count * big_n - c * (count * (count - 1) // 2)    # sum of big_n - c t
    # ab p(m) = m - b (beta m mod a) - a (alpha m mod b) + ab, and x m mod q = x m - q floor(x m/q)
    floors_a = staircase(count, -beta * c, beta * big_n, a)
    floors_b = staircase(count, -alpha * c, alpha * big_n, b)
    numerator = (total_m * (1 - b * beta - a * alpha) + a * b * (floors_a + floors_b)
                 + a * b * count)
    value, rest = divmod(numerator, a * b)
    if rest:
        raise ArithmeticError(f"three_parts({', '.join(map(value_text, (n, a, b, c)))}) came out fractional: a bug")
    return value
