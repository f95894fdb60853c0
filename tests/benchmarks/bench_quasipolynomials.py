"""Quasi-polynomial identities, derive, and lattice counts: times and ratios in one run.

Run on demand:  python tests/benchmarks/bench_quasipolynomials.py
"""
from __future__ import annotations

import os
import sys
import time
from fractions import Fraction

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", ".."))

from checker import check_text  # noqa: E402
from checker.interfaces.derive import derive_partitions  # noqa: E402
from checker.mathematics.floor_sums import staircase  # noqa: E402
from checker.mathematics.partitions import PartitionQuasiPolynomial, partitions_by_table  # noqa: E402
from checker.mathematics.polytopes import lattice_points  # noqa: E402


def timed(fn, repeat=1):
    best = None
    for _ in range(repeat):
        t = time.perf_counter()
        out = fn()
        dt = time.perf_counter() - t
        best = dt if best is None else min(best, dt)
    return best, out


def bench_identity(parts):
    from math import lcm
    text = derive_partitions(parts)
    check_text("claim 1 = 1\n")
    PartitionQuasiPolynomial._instances.clear()
    seconds, report = timed(lambda: check_text(text))
    assert report.ok, report.failure
    L, d = lcm(*parts), len(parts)
    # reference: the table of p_A alone over the (D+1) L points a period-based check would need
    ref, _ = timed(lambda: partitions_by_table(d * L, parts))
    points = report.notes[0].split(";")[1].strip()
    print(f"  identity for A = {parts} (lcm {L}, d = {d}): {seconds:.2f} s (goal < 5 s), {points}; "
          f"a table of the {d * L} values a period-based check needs: {ref:.2f} s")


def bench_derive(parts):
    PartitionQuasiPolynomial._instances.clear()
    seconds, text = timed(lambda: derive_partitions(parts))
    PartitionQuasiPolynomial._instances.clear()
    ref, _ = timed(lambda: PartitionQuasiPolynomial.of(tuple(parts)).value(10**30))
    print(f"  derive partitions(n, {parts}): {seconds:.2f} s (goal < 2 s), {len(text) / 1e3:.0f} kB; "
          f"building P_A and one value at 10^30: {ref:.2f} s; ratio {seconds / ref:.1f}x")
    return text


def bench_lattice():
    pts = [[0, 0], [Fraction(7, 3), Fraction(1, 2)], [1, Fraction(9, 4)], [Fraction(-5, 6), Fraction(4, 5)]]
    seconds, _ = timed(lambda: lattice_points(10**30, pts), repeat=20)
    ref, _ = timed(lambda: staircase(10**30, 7 * 10**29 + 3, 5, 3 * 10**28 + 7), repeat=20)
    print(f"  lattice points of a rational quadrilateral at t = 10^30: {seconds * 1e3:.3f} ms (goal < 10 ms); "
          f"one floor sum of that size {ref * 1e3:.3f} ms; ratio {seconds / ref:.1f}x")


if __name__ == "__main__":
    print("identities (derived quasi-polynomial of p_A checked by quasicert check)")
    for parts in ([16, 9, 5, 7], [11, 13, 7, 9], [8, 9, 10, 14], [2, 3, 5, 7]):
        bench_identity(parts)
    print("derive for d <= 4, parts <= 100")
    for parts in ([97, 98, 99, 100], [60, 72, 84, 96], [3, 50, 77, 100]):
        text = bench_derive(parts)
    t, report = timed(lambda: check_text(text))
    print(f"  and checking the last one: {t:.2f} s, {report.notes[0].split(';')[1].strip()}")
    print("lattice points")
    bench_lattice()
