"""Second, independent computations of function values, for `quasicert check --paranoid`.

Each method follows the definition (or a different published route) and
shares no fast path with the kernel's main method.  Where both apply, the
paranoid evaluator computes a value twice and reports any disagreement as a
bug in quasicert, not as a failure of the certificate.  Sizes are capped so
that the second opinion never costs much more than the first.
"""
from __future__ import annotations

from fractions import Fraction
from math import gcd

from .dedekind import dedekind_by_definition
from .elementary import as_integer
from .partitions import check_parts, plan, plans

__all__ = ["second_opinion", "fourier_dedekind_by_convolution", "frobenius_by_scan"]

_SMALL = 20_000


def _int(x):
    return isinstance(x, Fraction) and x.denominator == 1


def _dedekind(h, k):
    if _int(k) and 1 <= k <= _SMALL and _int(h):
        return dedekind_by_definition(h, k)
    return None


def _partitions(n, parts):
    if not _int(n) or not isinstance(parts, tuple):
        return None
    parts = check_parts(parts, allow_empty=True)
    # the kernel took `plan` (the cones when offered, else the cheapest); the cheapest other method, if it
    # is not too dear, is the second opinion
    found = plans(n.numerator, parts)
    first = plan(n.numerator, parts)
    others = sorted((p for p in found if p.method != first.method), key=lambda p: p.steps)
    if not others or others[0].steps > max(10**7, 4 * first.steps):
        return None
    return Fraction(others[0].run())


def _fourier_dedekind(n, parts, b):
    if not (_int(n) and _int(b) and isinstance(parts, tuple)) or not 1 <= b <= 150 or len(parts) > 6:
        return None
    parts = [as_integer(a) for a in parts]
    if any(gcd(a, b.numerator) != 1 for a in parts):
        return None
    return fourier_dedekind_by_convolution(n.numerator, parts, b.numerator)


def fourier_dedekind_by_convolution(n: int, parts, b: int) -> Fraction:
    """s_n(A; b) by direct convolution of the geometric-series coefficients over Z/b: O(m b^2)."""
    if b == 1:
        return Fraction(0)
    if not parts:
        return Fraction((b if n % b == 0 else 0) - 1, b)
    # direct convolution of the geometric-series coefficients over Z/b
    acc = [Fraction(0)] * b
    acc[0] = Fraction(1)
    for a in parts:
        f = [Fraction(0)] * b
        for r in range(b):
            f[a * r % b] += Fraction(b - 1 - 2 * r, 2 * b)
        acc = [sum(acc[u] * f[(t - u) % b] for u in range(b)) for t in range(b)]
    return acc[(-n) % b] - sum(acc) / b


def _bernoulli(n, x=None):
    if x is not None or not _int(n) or not 0 <= n <= 300:
        return None
    # Akiyama-Tanigawa, which gives B_1 = +1/2: flip it
    n = n.numerator
    a = [Fraction(1, m + 1) for m in range(n + 1)]
    for m in range(n + 1):
        for j in range(m, 0, -1):
            a[j - 1] = j * (a[j - 1] - a[j])
        if m == n:
            break
    value = a[0]
    return -value if n == 1 else value


def _frobenius(parts):
    if not isinstance(parts, tuple):
        return None
    parts = [as_integer(a) for a in parts]
    if not parts or min(parts) < 1 or min(parts) * max(parts) > 10**6:
        return None
    g = 0
    for a in parts:
        g = gcd(g, a)
    if g != 1:
        return None
    return frobenius_by_scan(parts)


def frobenius_by_scan(parts) -> Fraction:
    """The largest non-representable integer by marking representable ones up to min * max."""
    if min(parts) == 1:
        return Fraction(-1)
    bound = min(parts) * max(parts)
    reachable = bytearray(bound + 1)
    reachable[0] = 1
    for m in range(1, bound + 1):
        reachable[m] = any(m >= a and reachable[m - a] for a in parts)
    return Fraction(max(m for m in range(bound + 1) if not reachable[m]))


_METHODS = {
    "dedekind": (_dedekind, "the definition, term by term"),
    "partitions": (_partitions, "the next cheapest of table, waves, three-part formula, recursion and Fourier-Dedekind sums"),
    "fourier_dedekind": (_fourier_dedekind, "a direct convolution over Z/b"),
    "bernoulli": (_bernoulli, "the Akiyama-Tanigawa recurrence"),
    "frobenius": (_frobenius, "a scan of representable integers"),
}


def second_opinion(name: str, args: tuple):
    """(value, method) by an independent method, or None when none applies at this size."""
    entry = _METHODS.get(name)
    if entry is None:
        return None
    method, words = entry
    try:
        value = method(*args)
    except (TypeError, ValueError):
        return None
    if value is None:
        return None
    return value, words
