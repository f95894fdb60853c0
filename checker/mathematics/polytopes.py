"""Lattice points in dilates of rational polygons and polytopes of any dimension.

For a rational polytope P (convex hull of rational points, or a bounded set
{x : a_i . x <= b_i, e_j . x = f_j} with rational data) and an integer t >= 0,
the count L_P(t) = #(tP intersected with Z^d) is a quasi-polynomial in t of
degree dim P whose period divides the least common denominator of the vertices
(Ehrhart 1962; Stanley, *Enumerative Combinatorics I*, 4.6.8).  Conventions:
0 P = {0} for a non-empty P, so L_P(0) = 1; the empty polytope has 0 points in
every dilate, t = 0 included; an unbounded set is refused, naming a direction
in which it is unbounded.

Polygons given by points are counted column by column: over each edge of the
upper and lower boundary the column tops are floor((p x + q)/r), summed by the
Euclid-like floor-sum algorithm, so t = 10^30 costs a few dozen arithmetic
steps.  Everything else goes through `polyhedra` (exact vertices, facets,
emptiness and boundedness) and `ehrhart` (counting and interpolation).

Pick's theorem (Pick 1899) for the unit square, and the standard triangle, whose
t-th dilate holds binomial(t + 2, 2) points (common practice):

>>> lattice_points(1, [[0, 0], [1, 0], [1, 1], [0, 1]])
Fraction(4, 1)
>>> lattice_points(10, [[0, 0], [1, 0], [0, 1]]) == (10 + 1) * (10 + 2) // 2
True
>>> lattice_points(2, [[0, 0], [1, 2], [Fraction(3, 2), 0]])   # by columns: 1 + 3 + 5 + 1
Fraction(10, 1)
"""
from __future__ import annotations

from fractions import Fraction
from math import floor as _floor, gcd

from .elementary import as_integer, as_rational
from ..foundation.errors import DomainError
from ..foundation.numbers import value_text
from .polygons import convex_hull, polygon_count, _ceil
from .ehrhart import budget, count
from .integer_lattices import extended_gcd
from .polyhedra import Polyhedron, convex_hull_polyhedron, describe

__all__ = ["lattice_points", "lattice_points_inequalities", "interior_lattice_points", "polygon_count",
           "convex_hull", "vertex_denominator", "check_points", "check_vertices", "check_inequalities",
           "polytope_of_inequalities", "polytope_of_vertices", "interior_points_of"]


def check_points(points, what="lattice_points") -> list[tuple[Fraction, ...]]:
    if not isinstance(points, (list, tuple)) or not points:
        raise DomainError(f"{what} needs a non-empty list of points [[x, y], ...]")
    out = []
    dim = None
    for p in points:
        if not isinstance(p, (list, tuple)):
            raise DomainError(f"each point in {what} must be a list of coordinates, like [1/2, 3]")
        if dim is None:
            dim = len(p)
        if len(p) != dim:
            raise DomainError(f"the points in {what} have different numbers of coordinates")
        out.append(tuple(as_rational(c, f"a coordinate in {what}") for c in p))
    if dim != 2:
        raise DomainError(f"{what} takes the vertices of a polygon (2 coordinates each); "
                          "give a polytope of dimension 3 or 4 by inequalities to lattice_points_in")
    return out


def vertex_denominator(points) -> int:
    """Least common denominator of the coordinates: the Ehrhart period divides it."""
    from math import lcm
    return lcm(*[c.denominator for p in points for c in p])


def lattice_points(t, points, limits=None) -> Fraction:
    """#(t P intersected with Z^d) for the convex hull P of rational points and integer t >= 0.

    In the plane by floor sums over the hull's edges; in other dimensions through the facets
    of the hull (`polyhedra`) and `ehrhart.count`.
    """
    t = _dilation(t, "lattice_points")
    pts = check_vertices(points)
    if len(pts[0]) == 2:
        return Fraction(polygon_count([(t * x, t * y) for x, y in pts]))
    poly = polytope_of_vertices(pts, limits)
    return Fraction(count(poly, t, budget(limits, f"counting lattice points at t = {value_text(t)}")))


# -- polytopes of any dimension ------------------------------------------------

MAX_DIMENSION = 30


def check_inequalities(rows, what="lattice_points_in", equations=False):
    """Rows [a1, ..., ad, b] (a.x <= b, or a.x = b for equations) as tuples of Fractions: (d, rows)."""
    kind = "equations [a1, ..., ad, b] meaning a.x = b" if equations else \
        "inequalities [a1, ..., ad, b] meaning a.x <= b"
    if not isinstance(rows, (list, tuple)):
        raise DomainError(f"{what} needs a list of {kind}")
    out = []
    dim = None
    for r in rows:
        if not isinstance(r, (list, tuple)) or len(r) < 2:
            raise DomainError(f"each row in {what} is a list [a1, ..., ad, b] with d >= 1")
        if dim is None:
            dim = len(r) - 1
        if len(r) - 1 != dim:
            raise DomainError(f"the rows in {what} have different lengths")
        out.append(tuple(as_rational(c, f"a coefficient in {what}") for c in r))
    if dim is not None and dim > MAX_DIMENSION:
        raise DomainError(f"{what} counts in dimensions up to {MAX_DIMENSION}, not {dim}")
    return dim, out


def check_vertices(points, what="lattice_points"):
    """Points [[x1, ..., xd], ...] of any dimension d >= 1 as tuples of Fractions."""
    if not isinstance(points, (list, tuple)) or not points:
        raise DomainError(f"{what} needs a non-empty list of points [[x1, ..., xd], ...]")
    out, dim = [], None
    for p in points:
        if not isinstance(p, (list, tuple)) or not p:
            raise DomainError(f"each point in {what} must be a list of coordinates, like [1/2, 3]")
        if dim is None:
            dim = len(p)
        if len(p) != dim:
            raise DomainError(f"the points in {what} have different numbers of coordinates")
        out.append(tuple(as_rational(c, f"a coordinate in {what}") for c in p))
    if dim > MAX_DIMENSION:
        raise DomainError(f"{what} counts in dimensions up to {MAX_DIMENSION}, not {dim}")
    return out


_POLYTOPES: dict = {}


def _remember(key, make):
    poly = _POLYTOPES.get(key)
    if poly is None:
        poly = make()
        if len(_POLYTOPES) > 256:
            _POLYTOPES.clear()
        _POLYTOPES[key] = poly
    return poly


def polytope_of_inequalities(rows, equations=(), limits=None, what="lattice_points_in") -> Polyhedron:
    """{x : a.x <= b for the rows, a.x = b for the equations}, analysed; unbounded input is refused."""
    dim, rows = check_inequalities(rows, what)
    dim_eq, eqs = check_inequalities(equations, what, equations=True)
    if dim is None and dim_eq is None:
        raise DomainError(f"{what} needs at least one inequality or equation")
    if dim is not None and dim_eq is not None and dim != dim_eq:
        raise DomainError(f"the inequalities and the equations of {what} have different numbers of coordinates")
    spend = budget(limits, f"analysing the polytope of {what}")
    return _remember(("in", tuple(rows), tuple(eqs)), lambda: describe(rows, eqs, spend))


def polytope_of_vertices(points, limits=None, what="lattice_points") -> Polyhedron:
    """The convex hull of rational points, analysed (facets checked against every point)."""
    pts = check_vertices(points, what)
    spend = budget(limits, f"the facets of the convex hull in {what}")
    return _remember(("hull", tuple(sorted(set(pts)))), lambda: convex_hull_polyhedron(pts, spend))


def _dilation(t, what):
    t = as_integer(t, f"the dilation factor of {what}")
    if t < 0:
        raise DomainError(f"the dilation factor must be >= 0, not {value_text(t)}")
    return t


def lattice_points_inequalities(t, rows, equations=(), limits=None) -> Fraction:
    """#(t P intersected with Z^d) for P = {x : a.x <= b, a'.x = b'}, any d, integer t >= 0.

    The empty P has 0 points in every dilate, t = 0 included; unbounded P is refused.
    """
    t = _dilation(t, "lattice_points_in")
    poly = polytope_of_inequalities(rows, equations, limits)
    return Fraction(count(poly, t, budget(limits, f"counting lattice points at t = {value_text(t)}")))


def interior_points_of(t, poly: Polyhedron, limits=None) -> Fraction:
    """Lattice points in the interior (in R^d) of t P: 0 unless P is full-dimensional, and 0 at t = 0."""
    if poly.empty or poly.dimension < poly.ambient or t == 0:
        return Fraction(0)
    spend = budget(limits, f"counting interior lattice points at t = {value_text(t)}")
    return Fraction(count(poly, t, spend, interior=True))


def _segment_lattice_points(p, q) -> int:
    """Lattice points on the closed segment between rational points p and q."""
    (x0, y0), (x1, y1) = p, q
    if p == q:
        return 1 if x0.denominator == 1 and y0.denominator == 1 else 0
    # the line a x + b y = c with integers a, b, c
    a, b = y1 - y0, x0 - x1
    c = a * x0 + b * y0
    from math import lcm
    m = lcm(a.denominator, b.denominator, c.denominator)
    a, b, c = int(a * m), int(b * m), int(c * m)
    g = gcd(a, b)
    if c % g:
        return 0
    a, b, c = a // g, b // g, c // g
    # one integer solution by the extended Euclid algorithm, then x = x* + b k, y = y* - a k
    _, u, v = extended_gcd(a, b)            # a u + b v = 1
    xs, ys = u * c, v * c
    # the k with the point between p and q: project on the direction (b, -a)
    def k_of(x, y):
        return ((x - xs) * b - (y - ys) * a) / (a * a + b * b)
    k0, k1 = sorted((k_of(x0, y0), k_of(x1, y1)))
    return max(0, _floor(k1) - _ceil(k0) + 1)




def interior_lattice_points(t, points, limits=None) -> Fraction:
    """Lattice points strictly inside t times the convex hull of rational points (interior in R^d)."""
    t = _dilation(t, "interior_lattice_points")
    pts = check_vertices(points, "interior_lattice_points")
    if len(pts[0]) != 2:
        return interior_points_of(t, polytope_of_vertices(pts, limits, "interior_lattice_points"), limits)
    hull = convex_hull([(t * x, t * y) for x, y in pts])
    if len(hull) < 3:
        return Fraction(0)
    boundary = sum(_segment_lattice_points(hull[i], hull[(i + 1) % len(hull)]) for i in range(len(hull)))
    corners = sum(1 for x, y in hull if x.denominator == 1 and y.denominator == 1)
    return Fraction(polygon_count(hull) - (boundary - corners))
