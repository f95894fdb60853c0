"""Fourier-Dedekind sums with small pairwise coprime entries: the reciprocity law against the direct
table over Z/b, and against mpmath's roots-of-unity sum, timed in the same run.

Run on demand:  python tests/benchmarks/bench_fourier_dedekind.py
Needs the test extras (mpmath).
"""
from __future__ import annotations

import os
import sys
import time

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", ".."))
sys.path.insert(0, os.path.join(os.path.dirname(__file__), ".."))

import mpmath  # noqa: E402

from checker.mathematics.fourier_dedekind import fourier_dedekind  # noqa: E402
from checker.mathematics.fourier_dedekind_reciprocity import by_reciprocity, reciprocity_cost  # noqa: E402
from reference import fourier_dedekind_by_roots_of_unity  # noqa: E402
from timing import best_of  # noqa: E402

PARTS = [3, 7, 11]


def mpmath_sum(n, parts, b):
    return fourier_dedekind_by_roots_of_unity(n, parts, b, 30)


def main():
    print(f"s_5({PARTS}; b): reciprocity (cost estimate {reciprocity_cost(PARTS, 10**30 + 57)} steps "
          "for any b) against the direct table over Z/b (O(3 b))")
    for b in (10**3 + 9, 10**4 + 7, 10**5 + 3, 10**6 + 3):
        assert by_reciprocity(5, PARTS, b) == fourier_dedekind(5, PARTS, b)
        fast = best_of(lambda: by_reciprocity(5, PARTS, b))
        direct = best_of(lambda: fourier_dedekind(5, PARTS, b), repeat=1)
        print(f"  b = {b:>8}: reciprocity {fast * 1e3:8.3f} ms, direct {direct * 1e3:10.1f} ms, ratio {direct / fast:10.0f}")
    b = 10**3 + 9
    slow = best_of(lambda: mpmath_sum(5, PARTS, b), repeat=1)
    fast = best_of(lambda: by_reciprocity(5, PARTS, b))
    print(f"  b = {b}: mpmath's sum of {b - 1} roots of unity takes {slow / fast:.0f} times as long as reciprocity")
    b = 10**30 + 57
    big = best_of(lambda: by_reciprocity(5, PARTS, b))
    small = best_of(lambda: by_reciprocity(5, PARTS, 10**3 + 9))
    print(f"  b = 10^30 + 57: reciprocity {big * 1e3:.3f} ms, {big / small:.1f} times b = 1009 "
          "(the cost does not grow with b)")


if __name__ == "__main__":
    main()
