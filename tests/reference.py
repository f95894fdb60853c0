"""Slow, independent implementations of the kernel functions, for cross-checks in tests.

Each follows the definition as directly as possible and shares no fast path
with the kernel: Dedekind sums term by term, p_A(n) by a recursion over the
largest part, Fourier-Dedekind sums by the definition's finite sum in the
cyclotomic field (exact, via sympy's minimal-polynomial arithmetic would be
slow, so it is the plain convolution over Z/b of the geometric-series
coefficients), Frobenius numbers by scanning representability.
"""
from __future__ import annotations

import contextlib
from dataclasses import replace
from fractions import Fraction
from functools import lru_cache
from math import gcd

from checker import functions
from checker.dedekind import dedekind_by_definition, generalized_dedekind_by_definition


def partitions_by_recursion(n, parts):
    parts = tuple(sorted(int(a) for a in parts))

    @lru_cache(maxsize=None)
    def p(m, i):
        if m == 0:
            return 1
        if m < 0 or i < 0:
            return 0
        return p(m - parts[i], i) + p(m, i - 1)

    n = int(n)
    return Fraction(p(n, len(parts) - 1)) if n >= 0 else Fraction(0)


def fourier_dedekind_by_convolution(n, parts, b):
    n, b = int(n), int(b)
    parts = [int(a) for a in parts]
    if b == 1:
        return Fraction(0)
    if not parts:
        return Fraction((b if n % b == 0 else 0) - 1, b)
    # 1/(1 - w) = sum_r (b - 1 - 2r)/(2b) w^r for w^b = 1, w != 1
    acc = [Fraction(0)] * b
    acc[0] = Fraction(1)
    for a in parts:
        f = [Fraction(0)] * b
        for r in range(b):
            f[a * r % b] += Fraction(b - 1 - 2 * r, 2 * b)
        acc = [sum(acc[u] * f[(t - u) % b] for u in range(b)) for t in range(b)]
    # (1/b) sum_{j=1}^{b-1} xi^(j(n + s)) = [n + s = 0] - 1/b
    return acc[(-n) % b] - sum(acc) / b


def frobenius_by_scan(parts):
    parts = [int(a) for a in parts]
    if min(parts) == 1:
        return Fraction(-1)
    bound = min(parts) * max(parts)
    reachable = [False] * (bound + 1)
    reachable[0] = True
    for m in range(1, bound + 1):
        reachable[m] = any(m >= a and reachable[m - a] for a in parts)
    return Fraction(max(m for m in range(bound + 1) if not reachable[m]))


REFERENCE = {
    "dedekind": dedekind_by_definition,
    "generalized_dedekind": generalized_dedekind_by_definition,
    "partitions": partitions_by_recursion,
    "fourier_dedekind": fourier_dedekind_by_convolution,
    "frobenius": frobenius_by_scan,
}


@contextlib.contextmanager
def reference_functions():
    """Swap the kernel's fast functions for the slow references while inside."""
    saved = dict(functions.REGISTRY)
    try:
        for name, impl in REFERENCE.items():
            functions.REGISTRY[name] = replace(saved[name], impl=impl)
        yield
    finally:
        functions.REGISTRY.clear()
        functions.REGISTRY.update(saved)
