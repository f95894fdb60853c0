"""The proofs that vertex and facet lists are complete: wrong lists refused, right ones always proved.

Mutants of correct lists (a vertex removed, a bogus one added, a facet dropped, loosened or tilted)
must each be refused; on random polytopes and on the degenerate families (octahedron, pyramids,
Birkhoff polytopes, cross-polytopes, the 24-cell) the proof must succeed and agree with a
brute-force reference that knows nothing of the double description.
"""
from __future__ import annotations

import itertools
from fractions import Fraction
from math import comb, factorial

import pytest
from hypothesis import HealthCheck, given, settings, strategies as st

from checker.foundation.errors import CheckerBug, DomainError
from checker.mathematics import polyhedra
from checker.mathematics.polyhedra import (_affine_hull, convex_hull_polyhedron, describe, hull_description,
                                           integer_row, nullspace, rank)
from checker.mathematics.polyhedral_certificates import (check_empty, check_hull, check_unbounded,
                                                         check_vertex_list, nonnegative_combination)
from checker.mathematics.polytopes import lattice_points, lattice_points_inequalities


# -- the polytopes --------------------------------------------------------------------

def cube(d):
    return [tuple(int(j == i) for j in range(d)) + (1,) for i in range(d)] + \
           [tuple(-int(j == i) for j in range(d)) + (0,) for i in range(d)]


def cube_points(d):
    return [tuple(p) for p in itertools.product((0, 1), repeat=d)]


def cross_points(d):
    return [tuple(s * int(j == i) for j in range(d)) for i in range(d) for s in (1, -1)]


def cross(d):
    return [tuple(signs) + (1,) for signs in itertools.product((1, -1), repeat=d)]


def pyramid_points(d):
    """A pyramid over the (d-1)-cube: its apex lies on 2(d-1) facets."""
    return [p + (0,) for p in cube_points(d - 1)] + [(Fraction(1, 2),) * (d - 1) + (1,)]


def birkhoff(n):
    ineqs = [tuple(-int(k == c) for k in range(n * n)) + (0,) for c in range(n * n)]
    eqs = [tuple(int(k // n == i) for k in range(n * n)) + (1,) for i in range(n)]
    eqs += [tuple(int(k % n == j) for k in range(n * n)) + (1,) for j in range(n)]
    return ineqs, eqs


def permutation_matrices(n):
    return [tuple(int(p[i] == j) for i in range(n) for j in range(n)) for p in itertools.permutations(range(n))]


def twenty_four_cell():
    pts = set()
    for i, j in itertools.combinations(range(4), 2):
        for si, sj in itertools.product((1, -1), repeat=2):
            v = [0] * 4
            v[i], v[j] = si, sj
            pts.add(tuple(v))
    return sorted(pts)


def frac(points):
    return [tuple(Fraction(c) for c in p) for p in points]


# -- published counts ---------------------------------------------------------------

@pytest.mark.parametrize("d", range(1, 7))
def test_cube_and_cross_polytope_counts(d):
    # the d-cube has 2^d vertices and 2d facets, the d-cross-polytope 2d vertices and 2^d facets
    # (Coxeter, Regular Polytopes, 1973, Table I)
    poly = describe(cube(d), [])
    assert len(poly.vertices) == 2 ** d
    assert len(hull_description(cube_points(d))[0]) == 2 * d
    if d >= 2:
        poly = describe(cross(d), [])
        assert len(poly.vertices) == 2 * d
    assert len(hull_description(cross_points(d))[0]) == 2 ** d


@pytest.mark.parametrize("n", (3, 4))
def test_birkhoff_polytope_counts(n):
    # B_n has the n! permutation matrices as vertices (Birkhoff 1946) and n^2 facets for n >= 3,
    # dimension (n - 1)^2 (Brualdi & Gibson, J. Combin. Theory A 22, 1977)
    ineqs, eqs = birkhoff(n)
    poly = describe(ineqs, eqs)
    assert len(poly.vertices) == factorial(n) and poly.dimension == (n - 1) ** 2
    assert set(poly.vertices) == set(frac(permutation_matrices(n)))
    facets, equations = hull_description(permutation_matrices(n))
    assert len(facets) == n * n and len(equations) == n * n - (n - 1) ** 2


@pytest.mark.parametrize("n", (3, 4, 5))
def test_permutohedron_counts(n):
    # the permutohedron of order n has n! vertices and 2^n - 2 facets (Ziegler, Lectures on Polytopes,
    # Example 0.10)
    points = list(itertools.permutations(range(1, n + 1)))
    facets, equations = hull_description(points)
    assert len(facets) == 2 ** n - 2 and len(equations) == 1
    assert len(describe(facets, equations).vertices) == factorial(n)


def test_twenty_four_cell_counts():
    # the 24-cell has 24 vertices and 24 octahedral facets (Coxeter, Regular Polytopes, Table I)
    facets, _ = hull_description(twenty_four_cell())
    assert len(facets) == 24
    assert len(describe(facets, []).vertices) == 24


# -- mutants are refused ---------------------------------------------------------------

CASES = {
    "square": (cube(2), []),
    "3-cube": (cube(3), []),
    "octahedron": (cross(3), []),
    "4-cross-polytope": (cross(4), []),
    "B_3": birkhoff(3),
    "triangle in R^3": ([(-1, 0, 0, 0), (0, -1, 0, 0), (0, 0, -1, 0)], [(1, 1, 1, 1)]),
    # implicit equations x + y <= 1, x + y >= 1: the affine hull needs Farkas multipliers
    "triangle by implicit equation": ([(-1, 0, 0, 0), (0, -1, 0, 0), (0, 0, -1, 0), (1, 1, 1, 1),
                                       (-1, -1, -1, -1)], []),
    "segment by implicit equations": ([(1, 0, 0), (-1, 0, 0), (0, 1, 1), (0, -1, 0)], []),
}
HULLS = {
    "3-cube": cube_points(3),
    "octahedron": cross_points(3),
    "square pyramid": pyramid_points(3),
    "4-pyramid": pyramid_points(4),
    "B_3": permutation_matrices(3),
    "24-cell": twenty_four_cell(),
    "segment in R^3": [(0, 0, 0), (1, 2, 3)],
}


def vertex_proof(ineqs, eqs, vertices):
    check_vertex_list(ineqs, eqs, vertices, _affine_hull(vertices, len(vertices[0])))


@pytest.mark.parametrize("name", CASES)
def test_vertex_list_mutants_are_refused(name):
    ineqs, eqs = CASES[name]
    ineqs = [integer_row(r) for r in ineqs]
    vertices = list(describe(ineqs, eqs).vertices)
    vertex_proof(ineqs, eqs, vertices)                       # the right list is proved
    for i in range(len(vertices)):                           # each vertex removed
        with pytest.raises(CheckerBug):
            vertex_proof(ineqs, eqs, vertices[:i] + vertices[i + 1:])
    d = len(vertices[0])
    centre = tuple(sum(v[k] for v in vertices) / len(vertices) for k in range(d))
    edge_middle = tuple((a + b) / 2 for a, b in zip(vertices[0], vertices[1]))
    outside = tuple(c + 3 for c in vertices[0])
    for bogus in (centre, edge_middle, outside):             # a bogus one added
        with pytest.raises(CheckerBug):
            vertex_proof(ineqs, eqs, vertices + [bogus])
    moved = tuple(c + Fraction(1, 7) for c in vertices[0])    # one moved
    with pytest.raises(CheckerBug):
        vertex_proof(ineqs, eqs, [moved] + vertices[1:])


def same_half_space(points, f, g):
    """Both rows valid with the same tight points: on the affine hull they are one facet."""
    d = len(points[0])

    def slack(r, p):
        return r[d] - sum(x * y for x, y in zip(r[:d], p))
    return all(slack(f, p) >= 0 and slack(g, p) >= 0 and (slack(f, p) == 0) == (slack(g, p) == 0) for p in points)


@pytest.mark.parametrize("name", HULLS)
def test_facet_list_mutants_are_refused(name):
    points = HULLS[name]
    facets, eqs = hull_description(points)
    check_hull(points, facets, eqs, True)
    d = len(points[0])
    for i, f in enumerate(facets):
        rest = facets[:i] + facets[i + 1:]
        with pytest.raises(CheckerBug):                      # a facet dropped
            check_hull(points, rest, eqs, True)
        with pytest.raises(CheckerBug):                      # a facet loosened: valid, but no facet
            check_hull(points, rest + [f[:d] + (f[d] + 1,)], eqs, True)
        for k in range(d):                                   # a facet tilted
            tilted = f[:k] + (f[k] + 1,) + f[k + 1:]
            if same_half_space(points, f, tilted):          # on a lower-dimensional hull: no mutant
                continue
            with pytest.raises(CheckerBug):
                check_hull(points, rest + [tilted], eqs, True)
    for i in range(len(eqs)):                                # an equation dropped or moved
        with pytest.raises(CheckerBug):
            check_hull(points, facets, eqs[:i] + eqs[i + 1:], True)
        with pytest.raises(CheckerBug):
            check_hull(points, facets, eqs[:i] + [eqs[i][:d] + (eqs[i][d] + 1,)] + eqs[i + 1:], True)


def test_a_lost_point_is_caught_in_the_facet_proof():
    # facets of the octahedron without one apex describe the square pyramid's hull only partly
    points = cross_points(3)
    facets, eqs = hull_description(points)
    with pytest.raises(CheckerBug):
        check_hull(points[1:], facets, eqs, True)


def test_emptiness_and_unboundedness_witnesses():
    empty = [(1, 0, -1), (-1, 0, -1), (0, 1, 0), (0, -1, 0)]       # x <= -1 and x >= 1
    check_empty(empty, [], 2)
    with pytest.raises(CheckerBug):
        check_empty(cube(2), [], 2)                                 # the square is not empty
    check_empty([], [(1, 1, 1), (1, 1, 2)], 2)                      # x + y = 1 and x + y = 2
    half_plane = [(-1, 0, 0), (1, 0, 1), (0, -1, 0)]
    check_unbounded(half_plane, [], (0, 0), (0, 1), False)
    for point, direction, line in (((0, 0), (0, -1), False), ((0, 0), (1, 1), False), ((0, 0), (0, 1), True),
                                   ((5, 0), (0, 1), False), ((0, 0), (0, 0), False)):
        with pytest.raises(CheckerBug):
            check_unbounded(half_plane, [], point, direction, line)


def test_the_proof_is_wired_into_every_computation(monkeypatch):
    # an enumeration that loses a ray is refused as a bug of quasicert, never counted
    real = polyhedra.extreme_rays

    def lossy(constraints, n, spend=None):
        rays = real(constraints, n, spend)
        return rays[1:]
    monkeypatch.setattr(polyhedra, "extreme_rays", lossy)
    with pytest.raises(CheckerBug):
        describe(cube(3), [])
    with pytest.raises(CheckerBug):
        lattice_points_inequalities(2, cube(4)[:-1] + [(0, 0, 0, -1, Fraction(-1, 3))])
    with pytest.raises(CheckerBug):
        hull_description(cube_points(3))
    with pytest.raises(CheckerBug):
        lattice_points(2, [[0, 0, 0], [1, 0, 0], [0, 1, 0], [0, 0, 1], [1, 1, 1]])
    # an enumeration that finds no vertex at all must prove emptiness, and cannot
    monkeypatch.setattr(polyhedra, "extreme_rays", lambda c, n, spend=None: [r for r in real(c, n) if not r[-1]])
    with pytest.raises(CheckerBug):
        describe(cube(2), [])
    # nor may it lose the direction of an unbounded set: the vertex proof then fails
    monkeypatch.setattr(polyhedra, "extreme_rays", lambda c, n, spend=None: [r for r in real(c, n) if r[-1]])
    with pytest.raises(CheckerBug):
        describe([(-1, 0, 0), (1, 0, 1), (0, -1, 0)], [])
    # nor may it invent a recession direction
    monkeypatch.setattr(polyhedra, "extreme_rays", lambda c, n, spend=None: real(c, n) + [(1,) + (0,) * (n - 1)])
    with pytest.raises(CheckerBug):
        describe([(1, 0, 1), (-1, 0, 0), (0, 1, 1), (0, -1, 0)], [])


def test_nonnegative_combination_solves_or_says_none():
    assert nonnegative_combination([(1, 0), (0, 1)], (-1, 0)) is None
    w = nonnegative_combination([(1, 1, 0), (0, 1, 1), (1, 0, 1), (1, 1, 1)], (2, 3, 1))
    assert w is not None and min(w) >= 0
    assert [sum(x * c[i] for x, c in zip(w, [(1, 1, 0), (0, 1, 1), (1, 0, 1), (1, 1, 1)])) for i in range(3)] == [2, 3, 1]


# -- right lists are always proved, and agree with brute force ----------------------------------

def brute_facets(points):
    """Facets of a full-dimensional conv(points) by definition: every hyperplane through d affinely
    independent points with all points on one side (primitive integer rows)."""
    d = len(points[0])
    out = set()
    for subset in itertools.combinations(points, d):
        normals = nullspace([[a - b for a, b in zip(p, subset[0])] + [0] for p in subset[1:]], d + 1)
        normals = [nv[:d] for nv in normals if not nv[d] and any(nv[:d])]
        if len(normals) != 1:
            continue
        a = normals[0]
        b = sum(x * y for x, y in zip(a, subset[0]))
        values = [sum(x * y for x, y in zip(a, p)) for p in points]
        for sign in (1, -1):
            if all(sign * v <= sign * b for v in values):
                out.add(integer_row([sign * x for x in a] + [sign * b]))
    return out


def brute_vertices(points, facets):
    d = len(points[0])
    return {p for p in points
            if rank([f[:d] for f in facets if sum(x * y for x, y in zip(f[:d], p)) == f[d]], d) == d}


@st.composite
def point_sets(draw):
    d = draw(st.integers(1, 5))
    coordinate = st.integers(-2, 2) if d <= 3 else st.integers(0, 1)
    points = draw(st.lists(st.tuples(*[coordinate] * d), min_size=d + 1, max_size=8 if d <= 4 else 9))
    family = draw(st.sampled_from(["random", "cube", "cross", "pyramid"]))
    if family != "random" and d >= 2:
        points += {"cube": cube_points, "cross": cross_points, "pyramid": pyramid_points}[family](d)
    return [tuple(Fraction(c) for c in p) for p in points]


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(point_sets())
def test_right_lists_are_always_proved(points):
    d = len(points[0])
    facets, eqs = hull_description(points)           # the facet proof runs inside
    poly = convex_hull_polyhedron(points)
    again = describe(facets, eqs)                      # the vertex proof runs inside
    assert set(again.vertices) == set(poly.vertices)
    pts = sorted(set(points))
    if rank([[a - b for a, b in zip(p, pts[0])] for p in pts[1:]], d) == d and comb(len(pts), d) <= 400:
        reference = brute_facets(pts)
        assert set(facets) == reference
        assert set(poly.vertices) == brute_vertices(pts, reference)


@st.composite
def boxed_inequalities(draw):
    d = draw(st.integers(1, 4))
    rows = draw(st.lists(st.tuples(*[st.integers(-2, 2)] * d, st.integers(-3, 3)), max_size=5))
    return d, [tuple(r) for r in rows] + cube(d)


@settings(max_examples=80, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(boxed_inequalities())
def test_vertex_proof_succeeds_on_random_polytopes(case):
    d, rows = case
    poly = describe(rows, [])                           # never CheckerBug on a correct enumeration
    if poly.empty:
        return
    # brute force: every feasible point cut out by d independent rows is a vertex, and only those
    ints = [integer_row(r) for r in rows if any(r[:d])]
    found = set()
    for subset in itertools.combinations(ints, d):
        if rank([r[:d] for r in subset], d) < d:
            continue
        kernel = nullspace([list(r[:d]) + [-r[d]] for r in subset], d + 1)
        x = tuple(Fraction(c, kernel[0][d]) for c in kernel[0][:d])
        if all(sum(a * b for a, b in zip(r[:d], x)) <= r[d] for r in ints):
            found.add(x)
    assert set(poly.vertices) == found


def test_unbounded_and_lower_dimensional_inputs_keep_their_verdicts():
    with pytest.raises(DomainError, match="half-line"):
        describe([(-1, 0, 0), (1, 0, 1), (0, -1, 0)], [])
    poly = describe([(-1, 0, 0, 0), (0, -1, 0, 0), (0, 0, -1, 0), (1, 1, 1, 2)], [(1, -1, 0, 0)])
    assert poly.dimension == 2 and len(poly.vertices) == 3


FAMILIES = {
    # name: (points, number of vertices, number of facets), counts from Coxeter's Table I and Ziegler
    "octahedron": (cross_points(3), 6, 8),
    "square pyramid": (pyramid_points(3), 5, 5),
    "pyramid over the 3-cube": (pyramid_points(4), 9, 7),
    "B_3": (permutation_matrices(3), 6, 9),
    "4-cross-polytope": (cross_points(4), 8, 16),
    "5-cross-polytope": (cross_points(5), 10, 32),
    "24-cell": (twenty_four_cell(), 24, 24),
    "segment": ([(0,), (2,)], 2, 2),
}


@st.composite
def embedded_families(draw):
    """A family polytope mapped into R^(e + extra) by a random injective integer map, translated, with
    random points of it added (midpoints and centroids: no new vertices)."""
    name = draw(st.sampled_from(sorted(FAMILIES)))
    points, n_vertices, n_facets = FAMILIES[name]
    e = len(points[0])
    extra = draw(st.integers(0, 1))
    below = draw(st.lists(st.integers(-2, 2), min_size=e * e, max_size=e * e))
    matrix = [[below[i * e + j] if j < i else int(i == j) for j in range(e)] for i in range(e)]   # det 1
    matrix += draw(st.lists(st.lists(st.integers(-2, 2), min_size=e, max_size=e), min_size=extra,
                            max_size=extra))
    order = draw(st.permutations(range(e + extra)))
    matrix = [matrix[i] for i in order]
    shift = draw(st.lists(st.fractions(-2, 2, max_denominator=3), min_size=e + extra, max_size=e + extra))
    image = [tuple(sum(Fraction(m) * c for m, c in zip(row, p)) + s for row, s in zip(matrix, shift))
             for p in points]
    for i, j in draw(st.lists(st.tuples(st.integers(0, len(image) - 1), st.integers(0, len(image) - 1)),
                              max_size=4)):
        image.append(tuple((a + b) / 2 for a, b in zip(image[i], image[j])))
    image.append(tuple(sum(c) / len(points) for c in zip(*image[:len(points)])))
    return image, n_vertices, n_facets


@settings(max_examples=20, deadline=None,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.large_base_example])
@given(embedded_families())
def test_degenerate_and_lower_dimensional_families_are_proved(case):
    points, n_vertices, n_facets = case
    facets, eqs = hull_description(points)                  # the facet proof runs inside
    assert len(facets) == n_facets
    poly = convex_hull_polyhedron(points)
    assert len(poly.vertices) == n_vertices
    assert set(describe(facets, eqs).vertices) == set(poly.vertices)   # the vertex proof runs inside


# -- an adversary choosing wrong lists ------------------------------------------------------------

@st.composite
def sublists(draw):
    d = draw(st.integers(1, 3))
    points = draw(st.lists(st.tuples(*[st.integers(-2, 2)] * d), min_size=d + 1, max_size=7))
    points += draw(st.sampled_from([[], cube_points(d), cross_points(d)]))
    pts = sorted(set(frac(points)))
    keep = draw(st.lists(st.booleans(), min_size=64, max_size=64))
    loosen = draw(st.lists(st.integers(0, 2), min_size=64, max_size=64))
    return pts, keep, loosen


@settings(max_examples=80, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(sublists())
def test_a_proved_facet_list_is_never_short(case):
    # any list of valid rows the proof accepts holds every facet (compared with the brute-force facets)
    pts, keep, loosen = case
    d = len(pts[0])
    if rank([[a - b for a, b in zip(p, pts[0])] for p in pts[1:]], d) < d:
        return
    facets = sorted(brute_facets(pts))
    chosen = [f[:d] + (f[d] + loosen[i],) for i, f in enumerate(facets) if keep[i % 64]]
    try:
        check_hull(pts, chosen, [], False)
    except CheckerBug:
        assert not set(facets) <= set(chosen)
    else:
        assert set(facets) <= set(chosen)


@settings(max_examples=150, deadline=None)
@given(boxed_inequalities(), st.lists(st.booleans(), min_size=64, max_size=64))
def test_a_proved_vertex_list_is_never_short(case, keep):
    d, rows = case
    ints = [integer_row(r) for r in rows if any(r[:d])]
    poly = describe(ints, [])
    if poly.empty:
        return
    chosen = [v for i, v in enumerate(poly.vertices) if keep[i % 64]]
    if not chosen:
        return
    try:
        vertex_proof(ints, [], chosen)
    except CheckerBug:
        assert len(chosen) < len(poly.vertices)
    else:
        assert len(chosen) == len(poly.vertices)


# -- polygons: the hull and the boundary chains of the floor-sum count ----------------------------

def test_polygon_hull_and_chains_mutants_are_refused():
    from checker.mathematics.polygons import _chains, _check_chains, _check_polygon, convex_hull
    pts = frac([(0, 0), (3, 0), (4, 2), (2, 4), (0, 3), (1, 1), (2, 2)])
    hull = convex_hull(pts)
    assert len(hull) == 5                               # the pentagon's five corners (by hand)
    for i in range(len(hull)):                          # a corner left out
        with pytest.raises(CheckerBug):
            _check_polygon(pts, hull[:i] + hull[i + 1:])
    with pytest.raises(CheckerBug):                     # clockwise
        _check_polygon(pts, hull[::-1])
    with pytest.raises(CheckerBug):                     # a corner twice
        _check_polygon(pts, hull + hull[:1])
    lower, upper = _chains(pts)
    for chain, other in ((lower, upper), (upper, lower)):
        for i in range(len(chain)):                     # a point of a chain left out
            if 0 < i < len(chain) - 1 or chain[i][0] != chain[i - 1 if i else 1][0]:
                cut = chain[:i] + chain[i + 1:]
            else:
                continue                                # a vertical end piece: the same boundary
            with pytest.raises(CheckerBug):
                _check_chains(pts, *((cut, other) if chain is lower else (other, cut)))
    with pytest.raises(CheckerBug):                     # the chains exchanged
        _check_chains(pts, upper, lower)


@settings(max_examples=100, deadline=None)
@given(st.lists(st.tuples(st.fractions(-3, 3, max_denominator=3), st.fractions(-3, 3, max_denominator=3)),
                min_size=1, max_size=9))
def test_polygon_proofs_succeed_and_count_like_the_general_engine(points):
    # the plane's floor sums (with their checked chains) against the general engine on the same
    # polygon lifted to z = 0 in R^3 (its own proofs)
    lifted = [p + (0,) for p in points]
    for t in range(3):
        assert lattice_points(t, points) == lattice_points(t, lifted)


@settings(max_examples=200, deadline=None)
@given(st.integers(1, 6).flatmap(lambda d: st.lists(st.lists(st.integers(-3, 3), min_size=d, max_size=d),
                                                    min_size=1, max_size=7)))
def test_rank_modulo_the_prime_is_the_exact_rank_on_small_integers(vectors):
    # the proofs read dimensions as ranks modulo 2^61 - 1 (a lower bound); on small integers they are exact
    from checker.mathematics.polyhedral_certificates import _rank_mod_p
    assert _rank_mod_p(vectors) == rank(vectors, len(vectors[0]))


def test_a_certificate_meets_a_checker_bug_not_a_count(monkeypatch):
    # end to end: with an enumeration that loses a ray, a true polytope claim fails as a checker bug
    # (exit code 3) instead of being verified or refuted with a wrong count
    import checker
    from checker.mathematics import ehrhart, polytopes
    text = "claim lattice_points_in(30, [[-1, 0, 0, 0], [0, -1, 0, 0], [0, 0, -1, 0], [2, 1, 1, 1]]) = 2856\n"
    assert checker.check_text(text).ok       # sum over x = 0 .. 15 of C(32 - 2x, 2) = 2856 (by hand)
    real = polyhedra.extreme_rays
    monkeypatch.setattr(polyhedra, "extreme_rays", lambda c, n, spend=None: real(c, n, spend)[1:])
    for memo in (polytopes._POLYTOPES, ehrhart._QUASI, ehrhart._FRAMES):
        memo.clear()
    report = checker.check_text(text)
    assert not report.ok and report.exit_code == 3


def test_the_proof_spends_the_budget():
    # B_4's enumeration needs about 5,000 terms, its proof about 290,000: a budget between refuses
    from checker.foundation.errors import BudgetExceeded
    from checker.foundation.limits import Limits
    from checker.mathematics.ehrhart import budget
    ineqs, eqs = birkhoff(4)
    with pytest.raises(BudgetExceeded, match="terms"):
        describe(ineqs, eqs, budget(Limits(terms=50_000), "the proof of B_4"))
