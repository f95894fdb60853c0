"""Polytopes of any dimension: vertices, facets, emptiness, boundedness, lattice counts, Ehrhart and h*.

Every count is compared with brute-force enumeration or a published value (named beside it).
"""
from __future__ import annotations

import itertools
from fractions import Fraction
from math import comb

import pytest
from hypothesis import HealthCheck, given, settings, strategies as st

from checker.foundation.errors import BudgetExceeded, DomainError
from checker.foundation.limits import Limits
from checker.mathematics import ehrhart
from checker.mathematics.ehrhart import _direct, _frame_of, constituents, count, evaluate, hstar
from checker.mathematics.integer_lattices import determinant, hermite_columns, kernel_basis, lll_reduce
from checker.mathematics.polyhedra import convex_hull_polyhedron, describe, hull_description
from checker.mathematics.polytopes import (interior_lattice_points, lattice_points, lattice_points_inequalities,
                                           polytope_of_inequalities, polytope_of_vertices)


# -- independent references ---------------------------------------------------

def brute(rows, eqs, t, radius, strict=False):
    """Lattice points x in [-radius, radius]^d with a.x <= t b (a.x < t b when strict), e.x = t f.

    A row 0 <= b with b >= 0 holds everywhere and bounds nothing, so it stays non-strict.
    """
    d = len((rows or eqs)[0]) - 1
    n = 0
    for x in itertools.product(range(-radius, radius + 1), repeat=d):
        ok = all((sum(a * b for a, b in zip(r[:d], x)) < t * r[d]) if strict and any(r[:d]) else
                 (sum(a * b for a, b in zip(r[:d], x)) <= t * r[d]) for r in rows)
        if ok and all(sum(a * b for a, b in zip(r[:d], x)) == t * r[d] for r in eqs):
            n += 1
    return n


def fourier_motzkin_feasible(rows, eqs):
    """Is {a.x <= b, e.x = f} non-empty?  Fourier-Motzkin elimination over the rationals (reference)."""
    system = [tuple(Fraction(c) for c in r) for r in rows]
    for r in eqs:
        system += [tuple(Fraction(c) for c in r), tuple(-Fraction(c) for c in r)]
    d = len(system[0]) - 1
    for k in range(d):
        pos = [r for r in system if r[k] > 0]
        neg = [r for r in system if r[k] < 0]
        out = [r for r in system if r[k] == 0]
        for p in pos:
            for q in neg:
                out.append(tuple(-q[k] * x + p[k] * y for x, y in zip(p, q)))
        system = list(set(tuple(c / max(abs(x) for x in r[:-1]) if any(r[:-1]) else c for c in r)
                           for r in out))
    return all(r[-1] >= 0 for r in system)


def bounded_reference(rows, eqs):
    """For a non-empty set: bounded iff no nonzero r with a.r <= 0, e.r = 0, in each of the 2d orthants' tests.

    Equivalently x_k is bounded above and below for every k; decided by Fourier-Motzkin feasibility of
    {a.r <= 0, e.r = 0, +-r_k = 1}.
    """
    d = len((rows or eqs)[0]) - 1
    homogeneous = [tuple(r[:d]) + (0,) for r in rows]
    heqs = [tuple(r[:d]) + (0,) for r in eqs]
    for k in range(d):
        for sign in (1, -1):
            unit = tuple(sign * int(j == k) for j in range(d)) + (1,)
            if fourier_motzkin_feasible(homogeneous, heqs + [unit]):
                return False
    return True


def box(d, lo, hi):
    rows = []
    for i in range(d):
        rows.append(tuple(int(j == i) for j in range(d)) + (hi,))
        rows.append(tuple(-int(j == i) for j in range(d)) + (-lo,))
    return rows


# -- random polytopes against brute force ---------------------------------------

coefficient = st.integers(-3, 3)
rhs = st.fractions(min_value=-3, max_value=5, max_denominator=3)


@st.composite
def bounded_polytopes(draw):
    d = draw(st.integers(1, 3))
    rows = draw(st.lists(st.tuples(*[coefficient] * d, rhs), max_size=5))
    rows = [tuple(r) for r in rows] + box(d, -draw(st.integers(0, 2)), draw(st.integers(0, 2)))
    eqs = draw(st.lists(st.tuples(*[st.integers(-2, 2)] * d, st.fractions(-2, 2, max_denominator=2)),
                        max_size=1 if d > 1 else 0))
    return d, rows, [tuple(e) for e in eqs]


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(bounded_polytopes())
def test_counts_agree_with_brute_force(case):
    d, rows, eqs = case
    poly = polytope_of_inequalities(rows, eqs)
    assert poly.empty == (not fourier_motzkin_feasible(rows, eqs))
    for t in range(4):
        expected = brute(rows, eqs, t, 2 * t) if t else (0 if poly.empty else 1)
        assert lattice_points_inequalities(t, rows, eqs) == expected
    if not poly.empty and poly.dimension == d:
        # interior counts (strict inequalities) by enumeration and by reciprocity agree with brute force
        for t in range(1, 4):
            assert count(poly, t, interior=True) == brute(rows, eqs, t, 2 * t, strict=True)


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(bounded_polytopes())
def test_quasipolynomial_agrees_with_enumeration_beyond_its_samples(case):
    d, rows, eqs = case
    poly = polytope_of_inequalities(rows, eqs)
    if poly.empty or poly.denominator > 6:
        return
    table = constituents(poly)
    assert len(table) == poly.denominator and all(len(c) == poly.dimension + 1 for c in table)
    fr = _frame_of(poly)
    reach = poly.denominator * (poly.dimension + 1)
    for t in range(reach, reach + poly.denominator + 1):
        assert evaluate(table, t) == _direct(poly, fr, t, False, None)
    # Ehrhart-Macdonald reciprocity (Macdonald 1971): L(-t) = (-1)^e #(t relint P)
    for t in range(reach, reach + 2):
        assert evaluate(table, -t) == (-1) ** poly.dimension * _direct(poly, fr, t, True, None)
    # Stanley (1980): the h*-coefficients are non-negative integers, and they sum to L at ... h*(1) > 0
    h = hstar(poly)
    assert all(c >= 0 for c in h) and h[0] == 1 and sum(h) >= 1


@st.composite
def any_polyhedra(draw):
    d = draw(st.integers(1, 3))
    rows = draw(st.lists(st.tuples(*[coefficient] * d, rhs), min_size=1, max_size=6))
    eqs = draw(st.lists(st.tuples(*[st.integers(-2, 2)] * d, st.integers(-2, 2)), max_size=1))
    return [tuple(r) for r in rows], [tuple(e) for e in eqs]


@settings(max_examples=150, deadline=None)
@given(any_polyhedra())
def test_emptiness_and_boundedness_are_decided_exactly(case):
    rows, eqs = case
    feasible = fourier_motzkin_feasible(rows, eqs)
    bounded = not feasible or bounded_reference(rows, eqs)
    if bounded:
        poly = describe(rows, eqs)
        assert poly.empty == (not feasible)
        if poly.empty:
            assert all(lattice_points_inequalities(t, rows, eqs) == 0 for t in range(3))
    else:
        with pytest.raises(DomainError, match="unbounded"):
            describe(rows, eqs)
        with pytest.raises(DomainError, match="unbounded"):
            lattice_points_inequalities(1, rows, eqs)


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.integers(1, 3).flatmap(lambda d: st.lists(
    st.tuples(*[st.fractions(-2, 2, max_denominator=2)] * d), min_size=1, max_size=6)))
def test_vertex_input_agrees_with_brute_force(points):
    d = len(points[0])
    poly = polytope_of_vertices(points)
    assert set(poly.vertices) <= set(points)
    ineqs, eqs = hull_description(points)
    for t in range(3):
        expected = brute(ineqs, eqs, t, 2 * t) if t else 1
        assert lattice_points(t, points) == expected
    if d != 2:
        inside = brute(ineqs, eqs, 2, 4, strict=True) if poly.dimension == d else 0
        assert interior_lattice_points(2, points) == inside


# -- published values -------------------------------------------------------------

def unit_cube(d):
    return box(d, 0, 1)


def standard_simplex(d):
    return [tuple(-int(j == i) for j in range(d)) + (0,) for i in range(d)] + [(1,) * d + (1,)]


def test_hypercubes_and_simplices_up_to_dimension_ten():
    # hypercube binomial formula (t + 1)^d, and the simplex count C(t + d, d) (Ehrhart 1967; Stanley EC1 4.6)
    for d in (5, 6, 10):
        assert lattice_points_inequalities(10**30, unit_cube(d)) == (10**30 + 1) ** d
        assert lattice_points_inequalities(7, standard_simplex(d)) == comb(7 + d, d)
    assert lattice_points_inequalities(10**9, unit_cube(3)) == (10**9 + 1) ** 3
    assert lattice_points_inequalities(10**30, standard_simplex(4)) == comb(10**30 + 4, 4)
    # [0, 1]^d has h* = Eulerian numbers (Stanley EC1, Prop. 1.4.4 and 4.6.15): d = 6: 1, 57, 302, 302, 57, 1
    assert hstar(polytope_of_inequalities(unit_cube(6)))[:6] == [1, 57, 302, 302, 57, 1]


def test_cross_polytope_in_six_dimensions():
    # OEIS A001848 (crystal ball sequence of Z^6, from memory): 1, 13, 85, 377, 1289; equal to the
    # Delannoy sum sum_k 2^k C(6, k) C(t, k) (Ehrhart 1967) at every t
    d = 6
    vertices = [[s * int(j == i) for j in range(d)] for i in range(d) for s in (1, -1)]
    facets = [list(signs) + [1] for signs in itertools.product((1, -1), repeat=d)]
    assert [lattice_points(t, vertices) for t in range(5)] == [1, 13, 85, 377, 1289]
    for t in (5, 17, 10**20):
        delannoy = sum(2 ** k * comb(d, k) * comb(t, k) for k in range(d + 1))
        assert lattice_points(t, vertices) == delannoy == lattice_points_inequalities(t, facets)


def birkhoff(n):
    ineqs = [[-int(k == c) for k in range(n * n)] + [0] for c in range(n * n)]
    eqs = [[int(k // n == i) for k in range(n * n)] + [1] for i in range(n)]
    eqs += [[int(k % n == j) for k in range(n * n)] + [1] for j in range(n)]
    return ineqs, eqs


def test_magic_squares_birkhoff_polytopes():
    # H_3(t) = C(t + 2, 2) + 3 C(t + 3, 4) (MacMahon; Stanley EC1 4.6.21), OEIS A002817 shifted
    ineqs, eqs = birkhoff(3)
    for t in range(8):
        assert lattice_points_inequalities(t, ineqs, eqs) == comb(t + 2, 2) + 3 * comb(t + 3, 4)
    # H_4(t), OEIS A001496 (from memory): 1, 24, 282, 2008, 10147, 40176, 132724, 381424, 981541, 2309384;
    # t <= 2 re-counted by brute force over the free 3 x 3 corner below
    ineqs, eqs = birkhoff(4)
    published = [1, 24, 282, 2008, 10147, 40176, 132724, 381424, 981541, 2309384]
    assert [lattice_points_inequalities(t, ineqs, eqs) for t in range(10)] == published
    for t in range(3):
        brute_count = 0
        for corner in itertools.product(range(t + 1), repeat=9):
            m = [list(corner[3 * i:3 * i + 3]) for i in range(3)]
            last_col = [t - sum(r) for r in m]
            last_row = [t - sum(m[i][j] for i in range(3)) for j in range(3)]
            corner_value = t - sum(last_row)
            if min(last_col + last_row + [corner_value]) >= 0 and corner_value == t - sum(last_col):
                brute_count += 1
        assert brute_count == published[t]
    poly = polytope_of_inequalities(ineqs, eqs)
    assert poly.dimension == 9 and poly.denominator == 1


def test_permutohedron_counts_forests():
    # Stanley (1980, Example 3.1; EC1 exercise 4.64): the permutohedron conv{permutations of (1, 2, 3, 4)}
    # has Ehrhart polynomial sum_k f_k t^k, f_k = forests on 4 labelled vertices with k edges: 1, 6, 15, 16
    points = [list(p) for p in itertools.permutations([1, 2, 3, 4])]
    poly = polytope_of_vertices(points)
    assert poly.dimension == 3 and poly.ambient == 4
    assert constituents(poly) == ((1, 6, 15, 16),)
    assert lattice_points(10**12, points) == 16 * 10**36 + 15 * 10**24 + 6 * 10**12 + 1


def test_reeve_tetrahedra():
    # Reeve (1957): conv{0, e1, e2, (1, 1, r)} has L(t) = r/6 t^3 + t^2 + (2 - r/6) t + 1
    for r in (1, 2, 13):
        poly = polytope_of_vertices([[0, 0, 0], [1, 0, 0], [0, 1, 0], [1, 1, r]])
        assert constituents(poly) == ((1, 2 - Fraction(r, 6), 1, Fraction(r, 6)),)
        assert hstar(poly)[:4] == [1, 0, r - 1, 0]      # Reeve's tetrahedra: h* = 1 + (r - 1) z^2


def test_period_collapse_of_a_rational_triangle():
    # McAllister & Woods (2005): conv{(0, 0), (1, (D - 1)/D), (D, 0)} has denominator D but period 1,
    # L(t) = (D - 1)/2 t^2 + (D + 1)/2 t + 1; lifted to R^3 (z = 0) it goes through the general engine
    for D in (2, 3, 5):
        points = [[0, 0, 0], [1, Fraction(D - 1, D), 0], [D, 0, 0]]
        poly = polytope_of_vertices(points)
        assert poly.denominator == D
        table = constituents(poly)
        assert all(row == (1, Fraction(D + 1, 2), Fraction(D - 1, 2)) for row in table)


def test_lower_dimensional_and_half_integral():
    # x + y + z = 1/2 in the positive orthant: points only in even dilates, C(t/2 + 2, 2) there
    ineqs = [tuple(-int(j == i) for j in range(3)) + (0,) for i in range(3)]
    poly = polytope_of_inequalities(ineqs, [(2, 2, 2, 1)])
    assert poly.dimension == 2 and poly.denominator == 2
    for t in range(12):
        assert lattice_points_inequalities(t, ineqs, [(2, 2, 2, 1)]) == (comb(t // 2 + 2, 2) if t % 2 == 0 else 0)
    # a segment in R^7 from 0 to (1, 2, ..., 7)/2: floor(t/2) + 1 points
    points = [[0] * 7, [Fraction(i, 2) for i in range(1, 8)]]
    assert [lattice_points(t, points) for t in range(6)] == [1, 1, 2, 2, 3, 3]
    assert lattice_points(10**40 + 1, points) == 5 * 10**39 + 1
    # a single rational point: the dilates containing a lattice point
    assert [lattice_points(t, [[Fraction(1, 3), 0, 0]]) for t in range(7)] == [1, 0, 0, 1, 0, 0, 1]


def test_vertex_conversion_with_repeated_and_inner_points():
    square = [[0, 0, 0], [1, 0, 0], [0, 1, 0], [1, 1, 0], [0, 0, 0], [Fraction(1, 2), Fraction(1, 2), 0]]
    poly = convex_hull_polyhedron(square)
    assert len(poly.vertices) == 4 and poly.dimension == 2
    assert [lattice_points(t, square) for t in range(5)] == [(t + 1) ** 2 for t in range(5)]


def test_empty_polytopes_have_no_points_in_any_dilate():
    empty = [(1, 0, -1), (-1, 0, -1), (0, 1, 0), (0, -1, 0)]        # x <= -1 and x >= 1
    assert [lattice_points_inequalities(t, empty) for t in (0, 1, 2, 3, 10**30)] == [0] * 5
    assert hstar(polytope_of_inequalities(empty)) == []
    assert lattice_points_inequalities(0, [(0, 0, 1)], [(1, 1, 1), (1, 1, 2)]) == 0
    assert lattice_points_inequalities(0, [(0, 0, -1)]) == 0                         # 0 <= -1


def test_unbounded_input_is_refused_with_a_direction():
    with pytest.raises(DomainError, match=r"half-line from \[0, 0\] in the direction \[0, 1\]"):
        lattice_points_inequalities(1, [(-1, 0, 0), (1, 0, 1), (0, -1, 0)])
    with pytest.raises(DomainError, match="whole line"):
        lattice_points_inequalities(1, [(0, 0, -1, 0), (0, 0, 1, 1)])
    with pytest.raises(DomainError, match="unbounded"):
        lattice_points_inequalities(1, [], [(1, 1, 0)])


def test_costly_requests_are_refused_not_hung():
    tight = Limits(terms=1000)
    # D = 997 * 991: enumeration and interpolation are far over budget, Barvinok's cones are not (about 820
    # cone steps, charged ehrhart.CONE_TERMS = 5 terms each since the cones are metered to stop promptly).
    # Points of [0, 1003]^4 with sum <= 1009, by inclusion-exclusion (common practice).
    corner = box(4, 0, Fraction(1, 997)) + [(1, 1, 1, 1, Fraction(1, 991))]
    assert lattice_points_inequalities(10**6, corner, limits=Limits(terms=5000)) == comb(1013, 4) - 4 * comb(9, 4)
    ehrhart._CONES.clear()
    with pytest.raises(BudgetExceeded, match="terms"):
        lattice_points_inequalities(10**6, corner, limits=Limits(terms=200))
    with pytest.raises(BudgetExceeded, match="terms"):
        lattice_points_inequalities(10**6, corner, limits=tight)
    assert polytope_of_inequalities(corner) not in ehrhart._CONES      # a stopped decomposition leaves nothing
    with pytest.raises(BudgetExceeded, match="terms"):
        lattice_points_inequalities(60, unit_cube(6) + [(1, -1, 1, -1, 1, -1, Fraction(1, 7))], limits=tight)


def test_bad_input_is_a_domain_error():
    with pytest.raises(DomainError):
        lattice_points_inequalities(-1, unit_cube(3))
    with pytest.raises(DomainError):
        lattice_points_inequalities(1, [(1, 0, 1), (1, 1)])
    with pytest.raises(DomainError):
        lattice_points(1, [[0, 0, 0], [1, 1]])
    with pytest.raises(DomainError):
        lattice_points_inequalities(1, [])


# -- lattices -----------------------------------------------------------------------

@settings(max_examples=60, deadline=None)
@given(st.integers(1, 3).flatmap(lambda m: st.lists(
    st.lists(st.integers(-6, 6), min_size=m + 2, max_size=m + 2), min_size=m, max_size=m)))
def test_hermite_form_is_unimodular_and_triangular(C):
    from checker.mathematics.polyhedra import rank
    if rank(C, len(C[0])) < len(C):
        return
    H, U = hermite_columns(C)
    d = len(C[0])
    assert abs(determinant(U)) == 1
    product = [[sum(C[i][k] * U[k][j] for k in range(d)) for j in range(d)] for i in range(len(C))]
    assert all(product[i][j] == (H[i][j] if j < len(C) else 0) for i in range(len(C)) for j in range(d))
    assert all(H[i][j] == 0 for i in range(len(C)) for j in range(i + 1, len(C)))
    for v in kernel_basis(C):
        assert all(sum(a * b for a, b in zip(row, v)) == 0 for row in C)


def test_lll_keeps_the_lattice():
    # python-flint's LLL (a reference library) gives a basis of the same lattice: equal |det|
    basis = [(1, 1, 1), (-1, 0, 2), (3, 5, 6)]
    reduced = lll_reduce(basis)
    assert abs(determinant(reduced)) == abs(determinant(basis))
    flint = pytest.importorskip("flint")
    ref = flint.fmpz_mat([list(v) for v in basis]).lll()
    assert sorted(sum(x * x for x in v) for v in reduced) == \
        sorted(sum(int(ref[i, j]) ** 2 for j in range(3)) for i in range(3))
