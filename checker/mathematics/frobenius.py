"""Frobenius numbers and the count of non-representable integers.

For positive integers A with gcd 1, the Frobenius number g(A) is the largest
integer that is not a non-negative integer combination of A (g = -1 when some
a_i = 1), and the genus is the number of such non-representable integers.
Both follow from the residue table n_r = least representable integer that is
r mod a_1 (a_1 = min A): g = max_r n_r - a_1 and genus = sum_r floor(n_r / a_1)
(Brauer & Shockley 1962; Selmer 1977).  The table is built by the round-robin
method of Boecker & Liptak (Algorithmica 48, 2007) in O(d a_1) steps.

Sylvester (1884): g(a, b) = ab - a - b and genus (a-1)(b-1)/2.  Three
generators take O(log a_1) steps: Johnson's reduction (S. M. Johnson, Canad.
J. Math. 12, 1960), g(a, b, c) = d g(a/d, b/d, c) + (d - 1) c for d = gcd(a, b),
down to pairwise coprime generators, then Rodseth's formula from a
negative-remainder continued fraction (O. J. Rodseth, J. reine angew. Math.
301, 1978).  Four or more generators use the round-robin table.  The set
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
from ..foundation.numbers import value_text

__all__ = ["frobenius", "frobenius_by_table", "nonrepresentable_count", "residue_table", "fast_generators"]


def residue_table(parts) -> list[int]:
    """[n_0, ..., n_{a-1}] with n_r the least representable integer = r (mod a), a = min A."""
    parts = check_parts(parts, "frobenius")
    g = 0
    for a in parts:
        g = gcd(g, a)
    if g != 1:
        raise DomainError(f"the parts have common divisor {value_text(g)}, so infinitely many integers "
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
    distinct = fast_generators(parts)
    if distinct is None:
        return frobenius_by_table(parts)
    return Fraction(_frobenius_few(distinct))


def frobenius_by_table(parts) -> Fraction:
    """g(A) from the round-robin residue table: O(d min(A)) steps, for any number of generators."""
    table = residue_table(parts)
    return Fraction(max(table) - len(table))


def fast_generators(parts):
    """The distinct generators when there are at most three (gcd checked), else None."""
    parts = check_parts(parts, "frobenius")
    distinct = sorted(set(parts))
    if len(distinct) > 3:
        return None
    g = 0
    for a in distinct:
        g = gcd(g, a)
    if g != 1:
        raise DomainError(f"the parts have common divisor {value_text(g)}, so infinitely many integers "
                          "are not representable and no Frobenius number exists")
    return distinct


def _frobenius_few(parts: list) -> int:
    """g of at most three distinct generators with gcd 1."""
    parts = sorted(set(parts))
    if parts[0] == 1:
        return -1
    if len(parts) == 2:
        a, b = parts
        return a * b - a - b                    # Sylvester
    for i, j, k in ((0, 1, 2), (0, 2, 1), (1, 2, 0)):
        d = gcd(parts[i], parts[j])
        if d > 1:                               # Johnson's reduction
            c = parts[k]
            return d * _frobenius_few([parts[i] // d, parts[j] // d, c]) + (d - 1) * c
    return _rodseth(*parts)


def _rodseth(a1: int, a2: int, a3: int) -> int:
    """g(a1, a2, a3) for pairwise coprime generators > 1 (Rodseth 1978).

    s0 with a2 s0 = a3 (mod a1); the negative-remainder expansion
    s_{i-1} = q_{i+1} s_i - s_{i+1} (s_{-1} = a1), P_{i+1} = q_{i+1} P_i - P_{i-1}
    (P_{-1} = 0, P_0 = 1) makes s_i / P_i decrease from s_{-1}/P_{-1} = oo to 0;
    with v >= -1 the index where s_{v+1}/P_{v+1} <= a3/a2 < s_v/P_v,
    g = -a1 + a2 (s_v - 1) + a3 (P_{v+1} - 1) - min(a2 s_{v+1}, a3 P_v).
    Runs of quotients 2 are taken in one step each, so the loop is O(log a1) turns
    (the runs match the partial quotients of the ordinary continued fraction).
    """
    s_prev, s = a1, (pow(a2, -1, a1) * a3) % a1      # s_{v}, s_{v+1} from v = -1 (s_{-1}/P_{-1} = oo)
    p_prev, p = 0, 1
    while s * a2 > a3 * p:                             # until s_{v+1}/P_{v+1} <= a3/a2
        ds, dp = s_prev - s, p - p_prev
        if ds <= s:
            # a run of quotients 2: s and P move by the constant steps -ds and +dp,
            # for s // ds steps; jump to the run's end or to where the test turns
            t = min(s // ds, -(-(s * a2 - a3 * p) // (ds * a2 + dp * a3)))
            s_prev, s = s - (t - 1) * ds, s - t * ds
            p_prev, p = p + (t - 1) * dp, p + t * dp
            continue
        q = -(-s_prev // s)                            # ceiling, so 0 <= s_{v+2} < s_{v+1}
        s_prev, s, p_prev, p = s, q * s - s_prev, p, q * p - p_prev
    return -a1 + a2 * (s_prev - 1) + a3 * (p - 1) - min(a2 * s, a3 * p_prev)


def nonrepresentable_count(parts) -> Fraction:
    """How many positive integers are not non-negative combinations of A."""
    table = residue_table(parts)
    a1 = len(table)
    return Fraction(sum(n // a1 for n in table))
