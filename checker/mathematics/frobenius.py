"""Frobenius numbers and the count of non-representable integers.

For positive integers A with gcd 1, the Frobenius number g(A) is the largest
integer that is not a non-negative integer combination of A (g = -1 when some
a_i = 1), and the genus is the number of such non-representable integers.
Both follow from the residue table n_r = least representable integer that is
r mod a_1 (a_1 = min A): g = max_r n_r - a_1 and genus = sum_r floor(n_r / a_1)
(Brauer & Shockley 1962; Selmer 1977).  The table is built by the round-robin
method of Boecker & Liptak (Algorithmica 48, 2007) in O(d a_1) steps.

Sylvester (1884): g(a, b) = ab - a - b and genus (a-1)(b-1)/2.  The set
{6, 9, 20} has g = 43 (OEIS A065003):

>>> frobenius([6, 9, 20]), frobenius([5, 7]), nonrepresentable_count([5, 7])
(Fraction(43, 1), Fraction(23, 1), Fraction(12, 1))
"""
from __future__ import annotations

from fractions import Fraction
from math import gcd

from ..foundation.errors import DomainError
from ..foundation.limits import check_time
from .partitions import check_parts

__all__ = ["frobenius", "nonrepresentable_count", "residue_table"]


def residue_table(parts) -> list[int]:
    """[n_0, ..., n_{a-1}] with n_r the least representable integer = r (mod a), a = min A."""
    parts = check_parts(parts, "frobenius")
    g = 0
    for a in parts:
        g = gcd(g, a)
    if g != 1:
        raise DomainError(f"the parts have common divisor {g}, so infinitely many integers "
                          "are not representable and no Frobenius number exists")
    a1 = min(parts)
    inf = None
    table = [inf] * a1
    table[0] = 0
    for a in sorted(set(parts)):
        if a == a1:
            continue
        d = gcd(a1, a)
        for r in range(d):
            check_time()
            # start each cycle of +a at its least known entry
            best = None
            for q in range(r, a1, d):
                if table[q] is not None and (best is None or table[q] < best):
                    best = table[q]
            if best is None:
                continue
            for _ in range(a1 // d - 1):
                best += a
                p = best % a1
                if table[p] is not None and table[p] < best:
                    best = table[p]
                table[p] = best
    return table


def frobenius(parts) -> Fraction:
    """The largest integer not representable by A (gcd(A) must be 1); -1 if 1 is in A."""
    table = residue_table(parts)
    return Fraction(max(table) - len(table))


def nonrepresentable_count(parts) -> Fraction:
    """How many positive integers are not non-negative combinations of A."""
    table = residue_table(parts)
    a1 = len(table)
    return Fraction(sum(n // a1 for n in table))
