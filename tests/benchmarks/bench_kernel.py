"""Kernel speed, as ratios against references timed in the same run.

Run on demand:  python tests/benchmarks/bench_kernel.py
Needs the test extras (python-flint, mpmath).
"""
from __future__ import annotations

import os
import random
import sys
import time
from math import gcd

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", ".."))

import flint  # noqa: E402

from checker.mathematics.dedekind import dedekind  # noqa: E402
from checker.mathematics.fourier_dedekind import fourier_dedekind  # noqa: E402
from checker.mathematics.partitions import PartitionQuasiPolynomial, partitions, partitions_by_table  # noqa: E402
from timing import best_of  # noqa: E402

CPU = time.process_time        # this process's CPU time: steadier than wall time on a shared machine


def coprime_pairs(rng, digits, count):
    pairs = []
    while len(pairs) < count:
        k = rng.randrange(10 ** (digits - 1), 10 ** digits)
        h = rng.randrange(1, k)
        if gcd(h, k) == 1:
            pairs.append((h, k))
    return pairs


def bench_dedekind():
    import checker.mathematics.dedekind as module
    print("dedekind(h, k) against python-flint fmpq.dedekind_sum (goal: 3x, 3x, 6x, 6x at 20, 100, 1000, "
          "10000 digits; 6x at 3000)")
    saved = module._load_gmp()
    for mode in ("with gmpy2", "pure Python"):
        if mode == "with gmpy2" and saved is None:
            continue
        module._gmp_invert = saved if mode == "with gmpy2" else None
        rng = random.Random(1)
        for digits, count in ((20, 2000), (100, 1000), (1000, 100), (3000, 15), (10000, 4)):
            pairs = coprime_pairs(rng, digits, count)
            # interleaved rounds, median ratio: the machine's noise hits both sides alike
            ratios, ours_t, ref_t = [], [], []
            for _ in range(9):
                ours = best_of(lambda: [dedekind(h, k) for h, k in pairs], 1, CPU)
                ref = best_of(lambda: [flint.fmpq.dedekind_sum(h, k) for h, k in pairs], 1, CPU)
                ratios.append(ours / ref)
                ours_t.append(ours)
                ref_t.append(ref)
            ratios.sort()
            print(f"  {mode:11s} {digits:5d} digits: {min(ours_t) / count * 1e6:9.1f} us vs "
                  f"{min(ref_t) / count * 1e6:7.1f} us   median ratio {ratios[4]:5.1f}x "
                  f"(range {ratios[0]:.1f}-{ratios[-1]:.1f})")
    module._gmp_invert = saved


def mpmath_fourier_dedekind(n, parts, b):
    sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "mathematics"))
    sys.path.insert(0, os.path.join(os.path.dirname(__file__), ".."))
    from test_fourier_dedekind import mpmath_definition
    return mpmath_definition(n, parts, b, dps=20)


def bench_fourier_dedekind():
    print("fourier_dedekind (exact) against summing the definition with mpmath at 20 digits")
    b = 10007
    ours = best_of(lambda: fourier_dedekind(12345, [3, 5, 7], b), 3)
    ref = best_of(lambda: mpmath_fourier_dedekind(12345, [3, 5, 7], b), 1)
    print(f"  m = 3, b = {b}: {ours * 1e3:8.2f} ms (goal < 500 ms); mpmath {ref * 1e3:8.1f} ms;"
          f" ratio {ours / ref:6.3f}x")
    b = 10**49 + 9
    ours = best_of(lambda: fourier_dedekind(10**30 + 1, [3, 7], b), 20)
    ref = best_of(lambda: dedekind(3, b), 20)
    print(f"  m = 2, b of 50 digits: {ours * 1e3:8.3f} ms (goal < 10 ms); one dedekind at that size"
          f" {ref * 1e3:.3f} ms; ratio {ours / ref:5.1f}x")


def bench_partitions():
    print("partitions(n, A): quasi-polynomial against the coefficient table")
    parts = [3, 5, 7, 11, 13]
    n = 10**6
    PartitionQuasiPolynomial._instances.clear()
    ours = best_of(lambda: (PartitionQuasiPolynomial._instances.clear(), partitions(n, parts)), 3)
    ref = best_of(lambda: partitions_by_table(n, parts), 1)
    print(f"  n = 10^6, A = {parts}: {ours * 1e3:8.2f} ms (goal < 1 s); table {ref * 1e3:8.1f} ms;"
          f" ratio {ours / ref:6.4f}x")
    rng = random.Random(3)
    cases = [[997, 991, 983, 977, 971], [1000, 999, 998, 997, 996], sorted(rng.sample(range(2, 1001), 5))]
    for parts in cases:
        ours = best_of(lambda: (PartitionQuasiPolynomial._instances.clear(), partitions(10**30, parts)), 1)
        print(f"  n = 10^30, A = {parts}: {ours * 1e3:9.1f} ms from scratch (goal < 2 s)")


def bench_frobenius():
    from checker.mathematics.frobenius import frobenius, frobenius_by_table
    print("frobenius with 2 and 3 generators (goal: 100-digit generators in < 10 ms)")
    rng = random.Random(5)
    a = [rng.randrange(10**99, 10**100) | 1 for _ in range(3)]
    while gcd(gcd(a[0], a[1]), a[2]) != 1:
        a[2] += 2
    three = best_of(lambda: frobenius(a), 20)
    two = best_of(lambda: frobenius([a[0], a[0] + 1]), 20)
    small = [99991, 100003, 100019]
    table = best_of(lambda: frobenius_by_table(small), 1)
    ours_small = best_of(lambda: frobenius(small), 20)
    print(f"  3 generators of 100 digits: {three * 1e3:.3f} ms; 2 generators (Sylvester) {two * 1e3:.4f} ms")
    print(f"  3 generators near 10^5: {ours_small * 1e3:.3f} ms against the round-robin table "
          f"{table * 1e3:.0f} ms; ratio {ours_small / table:.5f}x")


if __name__ == "__main__":
    bench_frobenius()
    bench_dedekind()
    bench_fourier_dedekind()
    bench_partitions()
