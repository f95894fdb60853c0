"""Residues modulo an integer: the Jacobi symbol and the inverse of a unit.

The Jacobi symbol (a/n), for odd n >= 1 and any integer a, is the product
of the Legendre symbols (a/p) over the prime factors p of n, with
multiplicity; (a/1) = 1 and (a/n) = 0 when gcd(a, n) > 1.  It is computed
without factoring n, by quadratic reciprocity for the Jacobi symbol and the
supplementary laws (2/n) = (-1)^((n^2-1)/8), (-1/n) = (-1)^((n-1)/2)
(Rademacher & Grosswald, *Dedekind Sums* (1972), ch. 5, where it meets the
Dedekind sum in 12 k s(h, k) = k + 1 - 2 (h/k) (mod 8) for odd k).

Legendre symbols mod 7 (2 and 4 are squares, 3 is not), and (2/15) = (2/3)(2/5):

>>> [jacobi(a, 7) for a in range(7)]
[0, 1, 1, -1, 1, -1, -1]
>>> jacobi(2, 15)
1
>>> reciprocal_mod(5, 17), reciprocal_mod(-1, 10)
(7, 9)
"""
from __future__ import annotations

from math import gcd

from .elementary import as_integer, as_positive
from ..foundation.errors import DomainError
from ..foundation.numbers import value_text

__all__ = ["jacobi", "reciprocal_mod"]


def jacobi(a, n) -> int:
    """The Jacobi symbol (a/n): 1, -1 or 0; n odd and >= 1."""
    a = as_integer(a, "the first argument of jacobi")
    n = as_positive(n, "the second argument of jacobi")
    if n % 2 == 0:
        raise DomainError(f"the Jacobi symbol (a/n) needs an odd n, not {value_text(n)}")
    return _jacobi(a % n, n)


def _jacobi(a: int, n: int) -> int:
    result = 1
    while a:
        while a % 2 == 0:
            a //= 2
            if n % 8 in (3, 5):          # (2/n) = -1
                result = -result
        a, n = n, a                      # reciprocity: sign -1 when both are 3 mod 4
        if a % 4 == 3 and n % 4 == 3:
            result = -result
        a %= n
    return result if n == 1 else 0


def reciprocal_mod(a, m) -> int:
    """The a' in [0, m) with a a' = 1 (mod m); gcd(a, m) = 1, m >= 1 (0 for m = 1)."""
    a = as_integer(a, "the first argument of reciprocal_mod")
    m = as_positive(m, "the modulus of reciprocal_mod")
    g = gcd(a, m)
    if g != 1:
        raise DomainError(f"{value_text(a)} has no inverse modulo {value_text(m)}: gcd = {value_text(g)}")
    return pow(a, -1, m) if m > 1 else 0
