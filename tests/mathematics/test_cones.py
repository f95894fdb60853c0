"""Barvinok's signed decomposition (`mathematics.cones`, `ehrhart.count_by_cones`) against outside references.

Every count by cones is compared with brute-force enumeration of a box, with the existing engine
(enumeration and Ehrhart interpolation), with closed forms from the literature, and, for large
vertex denominators, with restricted partition counts and with a sum of polygon counts by floor sums.
"""
from __future__ import annotations

import itertools
import random
from fractions import Fraction
from math import comb

import pytest
from hypothesis import HealthCheck, given, settings, strategies as st

from checker.foundation.errors import BudgetExceeded, CheckerBug
from checker.foundation.limits import Limits
from checker.mathematics import ehrhart
from checker.mathematics.cones import ConeSum, _inverse, polar_unimodular, triangulate, unimodular_decomposition
from checker.mathematics.integer_lattices import determinant
from checker.mathematics.ehrhart import _direct, _frame_of, constituents, count, count_by_cones, evaluate
from checker.mathematics.partitions import partitions, partitions_by_table
from checker.mathematics.polygons import polygon_count
from checker.mathematics.polyhedra import describe
from checker.mathematics.polytopes import lattice_points_inequalities, polytope_of_inequalities, polytope_of_vertices


# -- independent references ---------------------------------------------------

from test_polytopes import box, brute  # noqa: E402  (enumeration of a box; the sibling test module)


def knapsack_simplex(a):
    """{x >= 0 : a . x <= 1}: its t-th dilate has p_{1, a}(t) points (a slack part 1)."""
    d = len(a)
    return [tuple(-int(j == i) for j in range(d)) + (0,) for i in range(d)] + [tuple(a) + (1,)]


# -- random polytopes: cones = brute force = the existing engine -------------------

coefficient = st.integers(-3, 3)
rhs = st.fractions(min_value=-3, max_value=5, max_denominator=4)


@st.composite
def polytopes(draw):
    d = draw(st.integers(1, 4))
    rows = draw(st.lists(st.tuples(*[coefficient] * d, rhs), max_size=4 if d < 4 else 2))
    rows = [tuple(r) for r in rows] + box(d, -draw(st.integers(0, 1)), draw(st.integers(0, 2)))
    eqs = draw(st.lists(st.tuples(*[st.integers(-2, 2)] * d, st.fractions(-2, 2, max_denominator=3)),
                        max_size=1 if d > 1 else 0))
    return d, rows, [tuple(e) for e in eqs]


@settings(max_examples=120, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(polytopes())
def test_cones_agree_with_brute_force_and_interpolation(case):
    d, rows, eqs = case
    poly = polytope_of_inequalities(rows, eqs)
    fr = None if poly.empty else _frame_of(poly)
    top = 3 if d < 4 else 2
    for t in range(top + 1):
        expected = brute(rows, eqs, t, 2 * t) if t else (0 if poly.empty else 1)
        assert count_by_cones(poly, t) == expected
        if not poly.empty:
            assert expected == _direct(poly, fr, t, False, None)
    if poly.empty:
        return
    if poly.dimension == d:
        for t in range(1, top + 1):
            assert count_by_cones(poly, t, interior=True) == brute(rows, eqs, t, 2 * t, strict=True)
    if poly.denominator <= 4 and d <= 3:
        # the interpolated quasi-polynomial (every constituent) and the cones agree past the samples
        table = constituents(poly)
        for t in range(3 * poly.denominator, 3 * poly.denominator + poly.denominator + 1):
            assert count_by_cones(poly, t) == evaluate(table, t)


@settings(max_examples=80, deadline=None)
@given(st.integers(1, 4).flatmap(lambda e: st.tuples(
    st.lists(st.lists(st.integers(-7, 7), min_size=e, max_size=e), min_size=e, max_size=e),
    st.lists(st.lists(st.integers(-50, 50), min_size=e, max_size=e), min_size=6, max_size=6))))
def test_signed_decomposition_is_the_cone_off_its_boundaries(case):
    """[cone(u)] = sum eps [unimodular cones] at points on no cone's boundary hyperplane (Barvinok 1994)."""
    gens, points = case
    gens = [tuple(g) for g in gens]
    e = len(gens)
    if determinant(gens) == 0:
        return
    pieces = unimodular_decomposition(gens)
    inverses = [_inverse(u) for _, u in pieces] + [_inverse(gens)]

    def signs(inverse, x):
        # x = sum c_i u_i = c G, so c = x adj(G) / det(G): the signs of c, 0 on a boundary hyperplane
        det, adj = inverse
        return [(sum(x[k] * adj[k][i] for k in range(e)) * det > 0) - (sum(x[k] * adj[k][i] for k in range(e)) * det < 0)
                for i in range(e)]

    rng = random.Random(len(pieces))
    for x in points:
        x = [v * 10**6 + rng.randint(-999, 999) for v in x]      # off the hyperplanes, almost surely
        cs = [signs(inv, x) for inv in inverses]
        if any(0 in c for c in cs):
            continue
        inside = sum(eps for (eps, u), c in zip(pieces, cs) if all(v > 0 for v in c))
        assert inside == int(all(v > 0 for v in cs[-1]))
    for eps, u in pieces:
        assert abs(determinant(u)) == 1
        w = polar_unimodular(u)
        assert all(sum(a * b for a, b in zip(u[i], w[j])) == -(i == j) for i in range(e) for j in range(e))


def test_triangulation_of_a_square_pyramid_cone():
    # the cone over a square has 4 rays: two simplicial cones, covering it once off their common facet
    gens = [(1, 0, 1), (0, 1, 1), (-1, 0, 1), (0, -1, 1)]
    pieces = triangulate(gens, 3)
    assert len(pieces) == 2 and all(len(p) == 3 for p in pieces)


# -- published values ---------------------------------------------------------------

def test_reeve_tetrahedra_by_cones():
    # Reeve (1957): conv{0, e1, e2, (1, 1, r)} has L(t) = r/6 t^3 + t^2 + (2 - r/6) t + 1
    for r in (1, 2, 13, 10**6 + 3):
        poly = polytope_of_vertices([[0, 0, 0], [1, 0, 0], [0, 1, 0], [1, 1, r]])
        for t in (0, 1, 2, 7, 10**30):
            assert count_by_cones(poly, t) == Fraction(r, 6) * t ** 3 + t ** 2 + (2 - Fraction(r, 6)) * t + 1
        # Macdonald (1971) reciprocity: (-1)^3 L(-t) interior points; Reeve's have none at t = 1
        assert count_by_cones(poly, 1, interior=True) == 0


def test_hypercubes_simplices_and_octahedra_by_cones():
    for d in (1, 2, 3, 4, 5):
        cube = polytope_of_inequalities(box(d, 0, 1))           # (t + 1)^d (Ehrhart 1967)
        simplex = polytope_of_inequalities(knapsack_simplex([1] * d))   # C(t + d, d) (Stanley EC1 4.6)
        for t in (0, 1, 3, 10**30):
            assert count_by_cones(cube, t) == (t + 1) ** d
            assert count_by_cones(simplex, t) == comb(t + d, d)
    # OEIS A001845 (centered octahedral numbers): the octahedron |x| + |y| + |z| <= 1
    octahedron = polytope_of_inequalities([list(s) + [1] for s in itertools.product((1, -1), repeat=3)])
    assert [count_by_cones(octahedron, t) for t in range(6)] == [1, 7, 25, 63, 129, 231]
    assert count_by_cones(octahedron, 10**20) == (2 * 10**20 + 1) * (2 * 10**40 + 2 * 10**20 + 3) // 3


def test_period_collapse_triangle_by_cones():
    # McAllister & Woods (2005): conv{(0, 0), (1, (D - 1)/D), (D, 0)} has period 1 although its
    # denominator is D: L(t) = (D - 1)/2 t^2 + (D + 1)/2 t + 1 (checked by brute force for small D)
    for D in (2, 3, 5, 10**9 + 7):
        poly = polytope_of_vertices([[0, 0], [1, Fraction(D - 1, D)], [D, 0]])
        for t in (0, 1, 2, 3, 10**25 + 1):
            value = Fraction(D - 1, 2) * t ** 2 + Fraction(D + 1, 2) * t + 1
            assert count_by_cones(poly, t) == value
            if D < 10 and t < 4:
                assert value == sum(1 for x in range(D * t + 1) for y in range(t + 1)
                                    if D * y <= (D - 1) * x and D * y <= D * t - x)


# -- large vertex denominators ----------------------------------------------------------

def test_knapsack_simplices_are_restricted_partitions():
    # {x >= 0 : a . x <= t} holds p_{1, a}(t) points (Sylvester; Stanley EC1 4.6): cross-check with the
    # partition table at sizes it can reach, D = a1 a2 a3 (a4) up to about 10^12
    for a, ts in (([101, 103, 107], (0, 1, 500, 20_000)),
                  ([1009, 1013, 1019, 1021], (3000, 40_000))):
        poly = polytope_of_inequalities(knapsack_simplex(a))
        for t in ts:
            assert count_by_cones(poly, t) == partitions_by_table(t, [1] + a)


def test_restricted_partitions_with_large_parts_by_the_equation():
    # p_A(n) = #{x >= 0 : a . x = n}: a lower-dimensional polytope in lattice coordinates of its hull
    for a, ns in (([3, 5, 7], range(0, 40)), ([97, 89, 83], (0, 1, 83, 5000, 12_345)),
                  ([1009, 1013, 2003, 3001], (10_000, 30_000))):
        d = len(a)
        poly = describe([tuple(-int(j == i) for j in range(d)) + (0,) for i in range(d)], [tuple(a) + (1,)])
        for n in ns:
            assert count_by_cones(poly, n) == partitions_by_table(n, a)


def _slices_by_floor_sums(a, t):
    """#{x >= 0 : a1 x1 + a2 x2 + a3 x3 <= t}: for each x3, the triangle a1 x1 + a2 x2 <= t - a3 x3 by
    floor sums (`polygons.polygon_count`, independent of the cones)."""
    total = 0
    for x3 in range(t // a[2] + 1):
        r = t - a[2] * x3
        total += polygon_count([(Fraction(0), Fraction(0)), (Fraction(r, a[0]), Fraction(0)),
                                (Fraction(0), Fraction(r, a[1]))])
    return total


def test_denominator_near_10_to_the_18():
    a = [10**6 + 3, 10**6 + 33, 10**6 + 37]
    poly = polytope_of_inequalities(knapsack_simplex(a))
    assert poly.denominator == a[0] * a[1] * a[2]
    for t in (10**9 + 7, 3 * 10**8):
        assert count_by_cones(poly, t) == _slices_by_floor_sums(a, t)
    # through the dispatcher, which must pick the cones here (interpolation needs 4 D counts)
    assert lattice_points_inequalities(10**9 + 7, knapsack_simplex(a)) == _slices_by_floor_sums(a, 10**9 + 7)


def test_dispatcher_agrees_with_interpolation_where_both_run():
    rng = random.Random(17)
    for _ in range(6):
        a = [rng.randint(2, 9) for _ in range(3)]
        rows = knapsack_simplex(a) + [(1, -1, 0, Fraction(rng.randint(1, 5), rng.randint(1, 7)))]
        poly = polytope_of_inequalities(rows)
        table = constituents(poly)
        for t in (rng.randint(100, 10**6), 10**30 + rng.randint(0, 10**6)):
            assert count_by_cones(poly, t) == evaluate(table, t)


def test_cone_decomposition_meets_the_budget():
    ehrhart._CONES.clear()
    poly = polytope_of_inequalities(knapsack_simplex([10**12 + 39, 10**12 + 61, 10**12 + 63, 10**12 + 91]))
    with pytest.raises(BudgetExceeded, match="terms"):
        count(poly, 10**30, ehrhart.budget(Limits(terms=500), "counting"))
    ehrhart._CONES.clear()


def test_a_zero_dimensional_and_an_empty_polytope():
    point = describe([(1, 0, Fraction(1, 3)), (-1, 0, Fraction(-1, 3))], [(0, 1, 0)])
    assert [count_by_cones(point, t) for t in range(7)] == [1, 0, 0, 1, 0, 0, 1]
    empty = describe([(1, 0, -1), (-1, 0, -1), (0, 1, 0), (0, -1, 0)], [])
    assert [count_by_cones(empty, t) for t in (0, 1, 10**30)] == [0, 0, 0]


def test_cone_sum_refuses_a_point_that_is_not_a_vertex():
    rows = [((-1, 0), 0), ((0, -1), 0), ((1, 1), 1)]
    with pytest.raises(CheckerBug, match="this is a bug in quasicert"):
        ConeSum.of(rows, [(0, 0), (Fraction(1, 2), 0), (0, 1)])


def test_a_missing_vertex_is_caught_not_counted():
    # Brion's sum without one vertex cone is no Laurent polynomial: its "value at 1" depends on the
    # direction l, so the two directions (or the check at t = 0) disagree and the engine raises
    polys = [polytope_of_vertices([[0, 0, 0], [1, 0, 0], [0, 1, 0], [1, 1, 13]]),
             polytope_of_inequalities(knapsack_simplex([3, 5, 7])),
             polytope_of_inequalities([list(s) + [1] for s in itertools.product((1, -1), repeat=3)]),
             polytope_of_inequalities(box(3, 0, 1) + [(1, 1, 1, Fraction(5, 2))]),
             polytope_of_vertices([[0, 0], [1, Fraction(2, 3)], [3, 0]])]
    for poly in polys:
        fr = _frame_of(poly)
        for i in range(len(fr.vertices)):
            with pytest.raises(CheckerBug):
                partial = ConeSum.of(fr.rows, fr.vertices[:i] + fr.vertices[i + 1:])
                for t in (1, 2, 3, 10**9):
                    partial.count(t)


def test_a_claim_with_a_large_denominator_through_the_language():
    from checker import check_text
    a, t = [10**6 + 3, 10**6 + 33, 10**6 + 37], 10**9 + 7
    text = "claim lattice_points_in({}, [[-1, 0, 0, 0], [0, -1, 0, 0], [0, 0, -1, 0], [{}, {}, {}, 1]]) = {}\n"
    assert check_text(text.format(t, *a, _slices_by_floor_sums(a, t))).ok
    report = check_text(text.format(t, *a, _slices_by_floor_sums(a, t) + 1))
    assert not report.ok and report.failure.exact == _slices_by_floor_sums(a, t)


def test_restricted_partitions_entry_for_large_parts():
    from checker.mathematics.ehrhart import restricted_partitions, restricted_partitions_cost
    ehrhart._CONES.clear()
    assert restricted_partitions_cost([1, 5, 10, 25]) > 0
    # OEIS A001299: ways to make n cents with 1, 5, 10, 25 cents; 242 at n = 100 (from memory)
    assert restricted_partitions(100, [1, 5, 10, 25]) == 242 == partitions_by_table(100, [1, 5, 10, 25])
    assert restricted_partitions_cost([1, 5, 10, 25]) == 0           # the decomposition is kept
    assert [restricted_partitions(n, [3, 5, 7]) for n in range(30)] == [partitions_by_table(n, [3, 5, 7])
                                                                       for n in range(30)]
    # parts near 10^9: brute force over x1, x2 with x3 determined
    a = [10**9 + 7, 10**9 + 9, 10**9 + 21]
    for n in (300 * 10**9 + 7 * 100 + 9 * 100 + 21 * 100, 300 * 10**9 + 7 * 300, 123456789012):
        brute_count = sum(1 for x1 in range(n // a[0] + 1) for x2 in range((n - x1 * a[0]) // a[1] + 1)
                          if (n - x1 * a[0] - x2 * a[1]) % a[2] == 0)
        assert restricted_partitions(n, a) == brute_count


def test_a_six_dimensional_knapsack_simplex_against_the_partition_quasi_polynomial():
    # {x >= 0 : (3, 5, 7, 11, 13, 1009) . x <= t} holds p_{1, 3, 5, 7, 11, 13, 1009}(t) points (Sylvester's
    # waves, `partitions`); D = 3 5 7 11 13 1009
    parts = [3, 5, 7, 11, 13, 1009]
    poly = polytope_of_inequalities(knapsack_simplex(parts))
    for t in (10**6 + 17, 10**30 + 1):
        assert count_by_cones(poly, t) == partitions(t, [1] + parts)


def test_interior_points_at_a_large_denominator_by_reciprocity():
    # the interior of t {x >= 0 : a . x <= 1} holds the x >= 1 with a . x < t, i.e. (x - 1 >= 0)
    # a . (x - 1) <= t - sum(a) - 1: the closed count at t - sum(a) - 1 (Macdonald 1971 made concrete)
    from checker.mathematics.polytopes import interior_points_of
    a = [10**6 + 3, 10**6 + 33, 10**6 + 37]
    poly = polytope_of_inequalities(knapsack_simplex(a))
    for t in (10**9 + 7, 5 * 10**7, sum(a), sum(a) + 1):
        assert interior_points_of(t, poly) == count_by_cones(poly, t, interior=True) \
            == (count_by_cones(poly, t - sum(a) - 1) if t > sum(a) else 0)
    assert count_by_cones(poly, 10**9 + 7, interior=True) == _slices_by_floor_sums(a, 10**9 + 7 - sum(a) - 1)


@settings(max_examples=12, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.lists(st.integers(1000, 99_999), min_size=3, max_size=3),
       st.lists(st.integers(-9, 99_999), min_size=3, max_size=3),
       st.integers(1, 9), st.integers(0, 5 * 10**6))
def test_large_denominators_against_slices_counted_by_floor_sums(a, b, c, t):
    """{x >= 0 : a . x <= 1, b . x <= c/7}, D up to ~10^19: by cones, and slice by slice (x3 fixed) as
    polygons, each counted by floor sums (the 2-dimensional path, which no cone touches)."""
    rows = knapsack_simplex(a) + [tuple(b) + (Fraction(c, 7),)]
    poly = polytope_of_inequalities(rows)
    total = 0
    for x3 in range(t // a[2] + 1):
        plane = [(r[0], r[1], t * r[3] - r[2] * x3) for r in rows]
        section = describe(plane, [])
        total += count(section, 1) if not section.empty else 0
    assert count_by_cones(poly, t) == total
