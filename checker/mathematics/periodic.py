"""Periodic sequences and quasi-polynomials given by their constituents.

    periodic(n, [c_0, ..., c_{L-1}])        = c_(n mod L)
    constituents(n, [[c_00, ..., c_0D], ..., [c_(L-1)0, ...]]) = sum_j c_(r,j) n^j,  r = n mod L

A quasi-polynomial of period L is exactly a polynomial in n whose
coefficients are periodic(n, ...) sequences of period L, and equally a table
of L constituent polynomials (Stanley, *Enumerative Combinatorics I*, 4.4).

>>> periodic(7, [1, 2, 3])
Fraction(2, 1)
>>> half = Fraction(1, 2)
>>> constituents(5, [[0, half], [half, half]])      # ceil(n/2): n/2 at even n, (n+1)/2 at odd n
Fraction(3, 1)
"""
from __future__ import annotations

from fractions import Fraction

from .elementary import as_integer, as_rational
from ..foundation.errors import DomainError

__all__ = ["periodic", "constituents", "check_table"]


def _values(table, what):
    if not isinstance(table, (list, tuple)) or not table:
        raise DomainError(f"the second argument of {what} must be a non-empty list")
    return table


def periodic(n, values) -> Fraction:
    """values[n mod L], L = len(values)."""
    n = as_integer(n, "the first argument of periodic")
    values = _values(values, "periodic")
    v = values[n % len(values)]
    return as_rational(v, "each entry of the list in periodic")


def check_table(table):
    table = _values(table, "constituents")
    for row in table:
        if not isinstance(row, (list, tuple)) or not row:
            raise DomainError("constituents takes a list of coefficient lists [[c0, c1, ...], ...], "
                              "one per residue class")
    return table


def constituents(n, table) -> Fraction:
    """The constituent polynomial of residue class n mod L, evaluated at n."""
    n = as_integer(n, "the first argument of constituents")
    row = check_table(table)[n % len(table)]
    total = Fraction(0)
    for c in reversed(row):
        total = total * n + as_rational(c, "each coefficient in constituents")
    return total
