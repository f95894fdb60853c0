"""Slow, independent implementations of the kernel functions, for cross-checks in tests.

Each follows the definition as directly as possible and shares no fast path
with the kernel: Dedekind sums term by term, p_A(n) by a recursion over the
largest part, Fourier-Dedekind sums by the definition's finite sum in the
ring of functions on Z/b (the plain convolution of geometric-series
coefficients, shared with --paranoid), Frobenius numbers by scanning
representability, the Jacobi symbol by Euler's criterion on each prime factor.
"""
from __future__ import annotations

import contextlib
from dataclasses import replace
from fractions import Fraction
from functools import lru_cache

from checker import functions
from checker.mathematics.dedekind import dedekind_by_definition, generalized_dedekind_by_definition
from checker.mathematics.second_opinion import fourier_dedekind_by_convolution, frobenius_by_scan


def _fourier(n, parts, b):
    return fourier_dedekind_by_convolution(int(n), [int(a) for a in parts], int(b))


def _frobenius(parts):
    return frobenius_by_scan([int(a) for a in parts])


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


def jacobi_by_euler(a, n):
    """(a/n) = prod over p^e || n of (a^((p-1)/2) mod p)^e, mapped to -1, 0, 1 (Euler's criterion)."""
    import sympy
    a, n = int(a), int(n)
    if n < 1 or n % 2 == 0 or n > 10**12:
        return functions.jacobi(a, n)          # the kernel's refusal, word for word; no factoring of huge n
    result = 1
    for p, e in sympy.factorint(n).items():
        r = pow(a % p, (p - 1) // 2, p)
        result *= (0 if r == 0 else 1 if r == 1 else -1) ** e
    return Fraction(result)


REFERENCE = {
    "jacobi": jacobi_by_euler,
    "dedekind": dedekind_by_definition,
    "generalized_dedekind": generalized_dedekind_by_definition,
    "partitions": partitions_by_recursion,
    "fourier_dedekind": _fourier,
    "frobenius": _frobenius,
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


def fourier_dedekind_by_roots_of_unity(n, parts, b, dps=50):
    """(1/b) sum_{j=1}^{b-1} xi^(jn) / prod (1 - xi^(j a)), xi = exp(2 pi i/b), in mpmath at `dps`
    digits (a complex number): the definition, independent of the kernel's exact tables."""
    import mpmath
    with mpmath.workdps(dps):
        total = mpmath.mpc(0)
        for j in range(1, b):
            term = mpmath.expjpi(mpmath.mpf(2 * j * n) / b)
            for a in parts:
                term /= 1 - mpmath.expjpi(mpmath.mpf(2 * j * a) / b)
            total += term
        return total / b
