"""Lattice points in polytopes of any dimension: times, and ratios against brute force in the same run.

Run on demand:  python tests/benchmarks/bench_polytopes.py  (only the proofs' cost: ... proofs)

Each case is timed cold (the memo of analysed polytopes and quasi-polynomials cleared first). The
reference is plain enumeration of a box at a small dilate, timed here, so the ratio says how much
the full Ehrhart quasi-polynomial (every t) costs against counting one small dilate naively.
"""
from __future__ import annotations

import contextlib
import itertools
import os
import sys
import time
from fractions import Fraction

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", ".."))

from checker.foundation.limits import Limits  # noqa: E402
from checker.mathematics import ehrhart, polyhedra, polytopes  # noqa: E402
from checker.mathematics.ehrhart import budget, constituents, count, count_by_cones, evaluate  # noqa: E402
from checker.mathematics.polytopes import polytope_of_inequalities, polytope_of_vertices  # noqa: E402
from tests.benchmarks.timing import best_of  # noqa: E402


def cold(fn):
    ehrhart._QUASI.clear()
    ehrhart._CONES.clear()
    ehrhart._FRAMES.clear()
    polytopes._POLYTOPES.clear()
    t = time.perf_counter()
    out = fn()
    return time.perf_counter() - t, out


def brute(rows, eqs, t, lo, hi):
    d = len(rows[0]) - 1
    n = 0
    for x in itertools.product(range(lo, hi + 1), repeat=d):
        if all(sum(a * b for a, b in zip(r[:d], x)) <= t * r[d] for r in rows) and \
                all(sum(a * b for a, b in zip(r[:d], x)) == t * r[d] for r in eqs):
            n += 1
    return n


def report(name, goal, seconds, ref_name, ref_seconds, detail=""):
    print(f"  {name}: {seconds * 1e3:.1f} ms (goal < {goal}); {ref_name}: {ref_seconds * 1e3:.1f} ms; "
          f"ratio {seconds / ref_seconds:.2f}x {detail}")


def unit_cube(d):
    return [[int(j == i) for j in range(d)] + [1] for i in range(d)] + \
           [[-int(j == i) for j in range(d)] + [0] for i in range(d)]


def simplex(d):
    return [[-int(j == i) for j in range(d)] + [0] for i in range(d)] + [[1] * d + [1]]


def birkhoff(n):
    ineqs = [[-int(k == c) for k in range(n * n)] + [0] for c in range(n * n)]
    eqs = [[int(k // n == i) for k in range(n * n)] + [1] for i in range(n)]
    eqs += [[int(k % n == j) for k in range(n * n)] + [1] for j in range(n)]
    return ineqs, eqs


def knapsack(a):
    """{x >= 0 : a . x <= 1}: vertex denominator a1 ... ad for coprime a_i."""
    d = len(a)
    return [[-int(j == i) for j in range(d)] + [0] for i in range(d)] + [list(a) + [1]]


def corner(primes, q):
    """The box prod [0, 1/p_i] cut by sum x_i <= 2/q (q ~ p_i): not a simplex, denominator ~ q prod p_i."""
    d = len(primes)
    rows = [[int(j == i) for j in range(d)] + [Fraction(1, p)] for i, p in enumerate(primes)]
    return rows + [[-int(j == i) for j in range(d)] + [0] for i in range(d)] + [[1] * d + [Fraction(2, q)]]


def cones_cold(rows, t):
    def run():
        cold(lambda: None)
        poly = polytope_of_inequalities(rows)
        return count_by_cones(poly, t)
    return run


def interpolation_cold(rows, t):
    def run():
        cold(lambda: None)
        poly = polytope_of_inequalities(rows)
        return evaluate(constituents(poly, budget(Limits(terms=10**9), "benchmark")), t)
    return run


def large_denominators():
    """Barvinok's cones at t = 10^30 (D ~ 10^6 and ~ 10^12), and against interpolation where it runs."""
    print("large vertex denominators (Barvinok's signed decomposition), t = 10^30, cold, best of 3")
    t = 10**30
    cases = [("3-dim knapsack simplex a = (97, 101, 103)", knapsack([97, 101, 103])),
             ("3-dim box cut by a plane, primes ~ 10^2", corner([101, 103, 107], 109)),
             ("3-dim box cut by a plane, primes ~ 10^4", corner([10007, 10009, 10037], 10039)),
             ("4-dim knapsack simplex a = (29, 31, 37, 41)", knapsack([29, 31, 37, 41])),
             ("4-dim box cut by a hyperplane, primes ~ 10^1.2", corner([11, 13, 17, 19], 23)),
             ("3-dim knapsack simplex a ~ 10^4", knapsack([10007, 10009, 10037])),
             ("3-dim knapsack simplex a ~ 10^12", knapsack([10**12 + 39, 10**12 + 61, 10**12 + 63])),
             ("4-dim knapsack simplex a ~ 10^3", knapsack([1009, 1013, 1019, 1021])),
             ("4-dim box cut by a hyperplane, primes ~ 10^2.5", corner([311, 313, 317, 331], 337)),
             ("4-dim knapsack simplex a ~ 10^12", knapsack([10**12 + 39, 10**12 + 61, 10**12 + 63,
                                                           10**12 + 91]))]
    for name, rows in cases:
        poly = polytope_of_inequalities(rows)
        seconds = best_of(cones_cold(rows, t), 3)
        cones = len(ehrhart.cone_sum(poly))
        print(f"  {name}: D = {poly.denominator:.3g}, {cones} unimodular cones, {seconds * 1e3:.1f} ms; "
              f"interpolation would need {poly.denominator * (poly.dimension + 1):.3g} counts")
    print("against interpolation where both run (t = 10^30)")
    for name, rows in (("3-dim knapsack simplex a = (3, 5, 7), D = 105", knapsack([3, 5, 7])),
                       ("3-dim knapsack simplex a = (5, 7, 11), D = 385", knapsack([5, 7, 11])),
                       ("4-dim knapsack simplex a = (1, 2, 3, 5), D = 30", knapsack([1, 2, 3, 5])),
                       ("4-dim box cut by a hyperplane, D = 30", corner([2, 3, 5, 1], 2))):
        new = best_of(cones_cold(rows, t), 3)
        old = best_of(interpolation_cold(rows, t), 1)
        if cones_cold(rows, t)() != interpolation_cold(rows, t)():
            raise AssertionError(f"{name}: the two methods disagree")
        print(f"  {name}: cones {new * 1e3:.1f} ms, interpolation {old * 1e3:.1f} ms; "
              f"interpolation / cones = {old / new:.0f}x")


def main():
    large_denominators()
    print("large dilates (Ehrhart interpolation)")
    for name, rows in (("4-cube", unit_cube(4)), ("4-simplex", simplex(4))):
        seconds, value = cold(lambda: count(polytope_of_inequalities(rows), 10**30))
        ref, _ = cold(lambda: brute(rows, [], 6, 0, 6))
        report(f"{name} at t = 10^30", "100 ms", seconds, "brute force at t = 6", ref, f"({len(str(value))} digits)")
    seconds, _ = cold(lambda: count(polytope_of_inequalities(unit_cube(4)), 1000))
    ref, _ = cold(lambda: brute(unit_cube(4), [], 6, 0, 6))
    report("4-cube at t = 1000", "5 s", seconds, "brute force at t = 6", ref)

    print("Ehrhart quasi-polynomials (every constituent)")
    d = 6
    cross = [[s * int(j == i) for j in range(d)] for i in range(d) for s in (1, -1)]
    facets = [list(signs) + [1] for signs in itertools.product((1, -1), repeat=d)]
    seconds, _ = cold(lambda: constituents(polytope_of_vertices(cross)))
    ref, _ = cold(lambda: brute(facets, [], 2, -2, 2))
    report("6-dimensional cross-polytope, by its 12 vertices", "5 s", seconds, "brute force at t = 2", ref)

    ineqs, eqs = birkhoff(4)
    seconds, table = cold(lambda: constituents(polytope_of_inequalities(ineqs, eqs)))

    def brute_h4(t):
        n = 0
        for corner in itertools.product(range(t + 1), repeat=9):
            rows = [corner[3 * i:3 * i + 3] for i in range(3)]
            col = [t - sum(r) for r in rows]
            row = [t - sum(rows[i][j] for i in range(3)) for j in range(3)]
            last = t - sum(row)
            n += min(col + row + [last]) >= 0 and last == t - sum(col)
        return n
    ref, _ = cold(lambda: brute_h4(3))
    report("Birkhoff polytope B_4 (dimension 9 in R^16)", "5 s", seconds, "brute-force H_4(3) over 3 x 3 corners",
           ref)

    gens = [(1, 0, 0), (0, 1, 0), (0, 0, 1), (1, 1, 1), (1, -1, 0), (0, 1, -1), (2, 1, -1)]
    points = sorted({tuple(sum(c * g[k] for c, g in zip(cs, gens)) for k in range(3))
                     for cs in itertools.product((0, 1), repeat=len(gens))})
    seconds, table = cold(lambda: constituents(polytope_of_vertices(points)))
    poly = polytope_of_vertices(points)
    ref, _ = cold(lambda: brute(list(poly.inequalities), [], 1, -3, 6))
    report(f"3-dimensional zonotope of 7 generators ({len(poly.vertices)} vertices)", "5 s", seconds,
           "brute force at t = 1", ref)

    # a 4-dimensional tensor-product-like polytope: the product of two rational triangles
    tri = [(0, 0), (Fraction(3, 2), 0), (0, Fraction(4, 3))]
    prod = [list(a) + list(b) for a in tri for b in tri]
    seconds, table = cold(lambda: constituents(polytope_of_vertices(prod)))
    poly = polytope_of_vertices(prod)
    ref, _ = cold(lambda: brute(list(poly.inequalities), [], 3, 0, 4))
    report(f"product of two rational triangles (dimension 4, period {len(table)})", "5 s", seconds,
           "brute force at t = 3", ref)
    rational4 = [[0, 0, 0, 0], [Fraction(1, 2), 0, 0, 0], [0, Fraction(1, 2), 0, 0], [0, 0, 1, 0],
                 [0, 0, 0, Fraction(3, 2)], [Fraction(1, 2), Fraction(1, 2), 1, Fraction(3, 2)]]
    seconds, table = cold(lambda: constituents(polytope_of_vertices(rational4)))
    poly = polytope_of_vertices(rational4)
    ref, _ = cold(lambda: brute(list(poly.inequalities), [], 4, 0, 6))
    report(f"a rational 4-polytope by vertices (denominator {poly.denominator}, period {len(table)})", "5 s",
           seconds, "brute force at t = 4", ref)


@contextlib.contextmanager
def without_proofs():
    """The analysis with the completeness proofs (polyhedral_certificates) replaced by no-ops."""
    names = ("check_vertex_list", "check_hull", "check_empty")
    saved = {n: getattr(polyhedra, n) for n in names}
    for n in names:
        setattr(polyhedra, n, lambda *args, **kwargs: None)
    try:
        yield
    finally:
        for n, f in saved.items():
            setattr(polyhedra, n, f)


def proof_cost():
    """Each case above, analysis alone and analysis with the Ehrhart quasi-polynomial, with the proofs
    and without them, best of 3 cold runs each, in the same run."""
    d = 6
    cross = [[s * int(j == i) for j in range(d)] for i in range(d) for s in (1, -1)]
    ineqs, eqs = birkhoff(4)
    gens = [(1, 0, 0), (0, 1, 0), (0, 0, 1), (1, 1, 1), (1, -1, 0), (0, 1, -1), (2, 1, -1)]
    zonotope = sorted({tuple(sum(c * g[k] for c, g in zip(cs, gens)) for k in range(3))
                       for cs in itertools.product((0, 1), repeat=len(gens))})
    tri = [(0, 0), (Fraction(3, 2), 0), (0, Fraction(4, 3))]
    rational4 = [[0, 0, 0, 0], [Fraction(1, 2), 0, 0, 0], [0, Fraction(1, 2), 0, 0], [0, 0, 1, 0],
                 [0, 0, 0, Fraction(3, 2)], [Fraction(1, 2), Fraction(1, 2), 1, Fraction(3, 2)]]
    cases = [
        ("4-cube by inequalities", lambda: polytope_of_inequalities(unit_cube(4)),
         lambda p: count(p, 10**30)),
        ("4-simplex by inequalities", lambda: polytope_of_inequalities(simplex(4)), lambda p: count(p, 10**30)),
        ("6-cross-polytope by 12 vertices", lambda: polytope_of_vertices(cross), constituents),
        ("Birkhoff B_4 by inequalities", lambda: polytope_of_inequalities(ineqs, eqs), constituents),
        ("3-zonotope by 128 points", lambda: polytope_of_vertices(zonotope), constituents),
        ("product of two rational triangles", lambda: polytope_of_vertices([list(a) + list(b) for a in tri
                                                                            for b in tri]), constituents),
        ("rational 4-polytope by vertices", lambda: polytope_of_vertices(rational4), constituents),
        ("10-cube by inequalities", lambda: polytope_of_inequalities(unit_cube(10)), lambda p: count(p, 10**30)),
    ]
    print("the completeness proofs: with / without, best of 3 cold runs")
    for name, analyse, use in cases:
        def run(whole):
            def go():
                cold(lambda: use(analyse()) if whole else analyse())
            return go
        with_a, with_w = best_of(run(False), 3), best_of(run(True), 3)
        with without_proofs():
            bare_a, bare_w = best_of(run(False), 3), best_of(run(True), 3)
        print(f"  {name}: analysis {with_a * 1e3:.1f} / {bare_a * 1e3:.1f} ms = {with_a / bare_a:.2f}x; "
              f"with the Ehrhart function {with_w * 1e3:.1f} / {bare_w * 1e3:.1f} ms = {with_w / bare_w:.2f}x")


if __name__ == "__main__":
    if sys.argv[1:] == ["proofs"]:
        proof_cost()
    else:
        main()
        proof_cost()
