"""Lattice points in dilates of rational polygons and polytopes.

For a rational polytope P (convex hull of rational points, or a bounded set
{x : a_i . x <= b_i} with rational a_i, b_i) and an integer t >= 0, the count
L_P(t) = #(tP intersected with Z^d) is a quasi-polynomial in t of degree
dim P whose period divides the least common denominator of the vertices
(Ehrhart, C. R. Acad. Sci. Paris 254 (1962); Stanley, Enumerative
Combinatorics vol. 1, ch. 4).

Polygons are counted column by column: over each edge of the upper and lower
boundary the column tops are floor((p x + q)/r), summed by the Euclid-like
floor-sum algorithm, so t = 10^30 costs a few dozen arithmetic steps.  In three
and four dimensions the polytope is cut into slices of fixed first
coordinate (bounds by Fourier-Motzkin elimination) down to polygons.

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
from itertools import combinations
from math import floor as _floor, gcd

from .elementary import as_integer, as_rational
from ..foundation.errors import DomainError
from .floor_sums import staircase

__all__ = ["lattice_points", "lattice_points_inequalities", "polygon_count", "convex_hull",
           "vertex_denominator", "check_points", "check_inequalities"]


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


def _cross(o, a, b):
    return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0])


def convex_hull(points):
    """Vertices of the convex hull in counter-clockwise order (Andrew's monotone chain)."""
    pts = sorted(set(points))
    if len(pts) <= 2:
        return pts
    lower, upper = [], []
    for p in pts:
        while len(lower) >= 2 and _cross(lower[-2], lower[-1], p) <= 0:
            lower.pop()
        lower.append(p)
    for p in reversed(pts):
        while len(upper) >= 2 and _cross(upper[-2], upper[-1], p) <= 0:
            upper.pop()
        upper.append(p)
    return lower[:-1] + upper[:-1]


def _chains(points):
    """Lower and upper boundary as lists of points with increasing x."""
    pts = sorted(set(points))
    lower, upper = [], []
    for p in pts:
        while len(lower) >= 2 and _cross(lower[-2], lower[-1], p) <= 0:
            lower.pop()
        lower.append(p)
    for p in pts:
        while len(upper) >= 2 and _cross(upper[-2], upper[-1], p) >= 0:
            upper.pop()
        upper.append(p)
    return lower, upper


def _ceil(x: Fraction) -> int:
    return -((-x.numerator) // x.denominator)


def _sum_floor_line(p0, p1, lo: int, hi: int) -> int:
    """sum_{x=lo}^{hi} floor(y(x)) on the line through p0, p1 (p0.x != p1.x)."""
    if hi < lo:
        return 0
    (x0, y0), (x1, y1) = p0, p1
    slope = (y1 - y0) / (x1 - x0)
    icept = y0 - slope * x0
    # y = (sn x)/sd + cn/cd = (sn cd x + cn sd)/(sd cd)
    sn, sd = slope.numerator, slope.denominator
    cn, cd = icept.numerator, icept.denominator
    p, q, r = sn * cd, cn * sd, sd * cd
    return staircase(hi - lo + 1, p, p * lo + q, r)


def _sum_boundary(chain, lo: int, hi: int, upper: bool) -> int:
    """sum over integer x in [lo, hi] of floor(U(x)) (upper) or -ceil(L(x)) (lower)."""
    total = 0
    pieces = [(a, b) for a, b in zip(chain, chain[1:]) if a[0] != b[0]]
    start = lo
    for i, (a, b) in enumerate(pieces):
        last = i == len(pieces) - 1
        end = _floor(b[0]) if last else _ceil(b[0]) - 1     # [a.x, b.x) except the last, closed
        end = min(end, hi)
        if end >= start:
            if upper:
                total += _sum_floor_line(a, b, start, end)
            else:   # -ceil(y) = floor(-y)
                total += _sum_floor_line((a[0], -a[1]), (b[0], -b[1]), start, end)
            start = end + 1
    return total


def polygon_count(points) -> int:
    """Lattice points in the convex hull of rational points in the plane (boundary included)."""
    lower, upper = _chains(points)
    xmin, xmax = lower[0][0], lower[-1][0]
    lo, hi = _ceil(xmin), _floor(xmax)
    if hi < lo:
        return 0
    if xmin == xmax:   # a vertical segment or a point
        ys = [p[1] for p in lower + upper]
        return max(0, _floor(max(ys)) - _ceil(min(ys)) + 1)
    return _sum_boundary(upper, lo, hi, True) + _sum_boundary(lower, lo, hi, False) + (hi - lo + 1)


def vertex_denominator(points) -> int:
    """Least common denominator of the coordinates: the Ehrhart period divides it."""
    from math import lcm
    return lcm(*[c.denominator for p in points for c in p])


def lattice_points(t, points) -> Fraction:
    """#(t P intersected with Z^2) for the convex hull P of rational points and integer t >= 0."""
    t = as_integer(t, "the dilation factor of lattice_points")
    if t < 0:
        raise DomainError(f"the dilation factor must be >= 0, not {t}")
    pts = check_points(points)
    return Fraction(polygon_count([(t * x, t * y) for x, y in pts]))


# -- polytopes given by inequalities ---------------------------------------

def check_inequalities(rows, what="lattice_points_in"):
    if not isinstance(rows, (list, tuple)) or not rows:
        raise DomainError(f"{what} needs a list of inequalities [a1, ..., ad, b] meaning a.x <= b")
    out = []
    dim = None
    for r in rows:
        if not isinstance(r, (list, tuple)) or len(r) < 3:
            raise DomainError(f"each inequality in {what} is a list [a1, ..., ad, b] with d >= 2")
        if dim is None:
            dim = len(r) - 1
        if len(r) - 1 != dim:
            raise DomainError(f"the inequalities in {what} have different lengths")
        out.append(tuple(as_rational(c, f"a coefficient in {what}") for c in r))
    if dim > 4:
        raise DomainError(f"{what} counts in dimensions 2 to 4, not {dim}")
    return dim, out


def _eliminate_last(rows):
    """Fourier-Motzkin: inequalities in x1..x_{d-1} implied by rows (a.x <= b) in x1..x_d."""
    pos, neg, zero = [], [], []
    for r in rows:
        c = r[-2]
        (pos if c > 0 else neg if c < 0 else zero).append(r)
    out = [r[:-2] + (r[-1],) for r in zero]
    for p in pos:
        for n in neg:
            # combine to cancel the last variable: (-n_c) p + (p_c) n
            a, b = -n[-2], p[-2]
            out.append(tuple(a * x + b * y for x, y in zip(p[:-2], n[:-2])) + (a * p[-1] + b * n[-1],))
    return _dedupe(out)


def _dedupe(rows):
    seen, out = set(), []
    for r in rows:
        scale = max((abs(c) for c in r[:-1]), default=0)
        if scale == 0:
            if r[-1] < 0:
                return [(*(Fraction(0),) * (len(r) - 1), Fraction(-1))]  # infeasible
            continue
        key = tuple(c / scale for c in r)
        if key not in seen:
            seen.add(key)
            out.append(r)
    return out


def _range_first(rows):
    """Integer range of x1 over the polytope, or None if it is empty."""
    system = rows
    while len(system[0]) > 2:
        system = _eliminate_last(system)
        if not system:
            raise DomainError("the inequalities do not bound a polytope")
    lo, hi = None, None
    for a, b in system:
        if a > 0:
            hi = b / a if hi is None else min(hi, b / a)
        elif a < 0:
            lo = b / a if lo is None else max(lo, b / a)
        elif b < 0:
            return None
    if lo is None or hi is None:
        raise DomainError("the inequalities do not bound a polytope")
    lo_i, hi_i = _ceil(lo), _floor(hi)
    return (lo_i, hi_i) if lo_i <= hi_i else None


def _polygon_vertices(rows):
    """Vertices of {(x, y) : a x + b y <= c} (bounded), by intersecting boundary lines."""
    pts = []
    for (a1, b1, c1), (a2, b2, c2) in combinations(rows, 2):
        det = a1 * b2 - a2 * b1
        if det == 0:
            continue
        x = (c1 * b2 - c2 * b1) / det
        y = (a1 * c2 - a2 * c1) / det
        if all(a * x + b * y <= c for a, b, c in rows):
            pts.append((x, y))
    return pts


def _count(rows) -> int:
    d = len(rows[0]) - 1
    if d == 2:
        if any(a == 0 and b == 0 and c < 0 for a, b, c in rows):
            return 0
        pts = _polygon_vertices([r for r in rows if r[0] or r[1]])
        if not pts:
            return 0
        return polygon_count(pts)
    span = _range_first(rows)
    if span is None:
        return 0
    total = 0
    for x in range(span[0], span[1] + 1):
        sliced = [r[1:-1] + (r[-1] - r[0] * x,) for r in rows]
        total += _count(sliced)
    return total


def lattice_points_inequalities(t, rows, limits_terms: int | None = None) -> Fraction:
    """#(t P intersected with Z^d) for P = {x : a.x <= b}, d = 2, 3 or 4, integer t >= 0."""
    t = as_integer(t, "the dilation factor of lattice_points_in")
    if t < 0:
        raise DomainError(f"the dilation factor must be >= 0, not {t}")
    dim, rows = check_inequalities(rows)
    dilated = [r[:-1] + (r[-1] * t,) for r in rows]
    if dim == 2:
        pts = _polygon_vertices(dilated)
        if not pts:
            _range_first(dilated)      # raises if unbounded
            return Fraction(0)
        _range_first(dilated)
        return Fraction(polygon_count(pts))
    return Fraction(_count(dilated))


def _solve(rows):
    """The unique solution of the square system sum_j a_ij x_j = b_i, or None."""
    m = [list(r) for r in rows]
    n = len(m)
    for col in range(n):
        pivot = next((r for r in range(col, n) if m[r][col] != 0), None)
        if pivot is None:
            return None
        m[col], m[pivot] = m[pivot], m[col]
        for r in range(n):
            if r != col and m[r][col] != 0:
                f = m[r][col] / m[col][col]
                m[r] = [x - f * y for x, y in zip(m[r], m[col])]
    return [m[i][-1] / m[i][i] for i in range(n)]


def polytope_vertices(rows):
    """Vertices of {x : a.x <= b}: feasible solutions of d tight inequalities."""
    d = len(rows[0]) - 1
    found = set()
    for subset in combinations(rows, d):
        x = _solve(subset)
        if x is not None and all(sum(a * v for a, v in zip(r[:-1], x)) <= r[-1] for r in rows):
            found.add(tuple(x))
    return sorted(found)


def inequality_vertex_denominator(rows) -> int:
    """Least common denominator of the vertices of {x : a.x <= b}."""
    from math import lcm
    vertices = polytope_vertices(rows)
    if not vertices:
        return 1
    return lcm(*[c.denominator for v in vertices for c in v])


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
    u, v = _bezout(a, b)                    # a u + b v = 1
    xs, ys = u * c, v * c
    # the k with the point between p and q: project on the direction (b, -a)
    def k_of(x, y):
        return ((x - xs) * b - (y - ys) * a) / (a * a + b * b)
    k0, k1 = sorted((k_of(x0, y0), k_of(x1, y1)))
    return max(0, _floor(k1) - _ceil(k0) + 1)


def _bezout(a: int, b: int):
    old_r, r, old_s, s, old_t, t = a, b, 1, 0, 0, 1
    while r:
        q = old_r // r
        old_r, r = r, old_r - q * r
        old_s, s = s, old_s - q * s
        old_t, t = t, old_t - q * t
    if old_r < 0:
        old_s, old_t = -old_s, -old_t
    return old_s, old_t


def interior_lattice_points(t, points) -> Fraction:
    """Lattice points strictly inside t times the convex hull of rational points (a polygon)."""
    t = as_integer(t, "the dilation factor of interior_lattice_points")
    if t < 0:
        raise DomainError(f"the dilation factor must be >= 0, not {t}")
    pts = check_points(points, "interior_lattice_points")
    hull = convex_hull([(t * x, t * y) for x, y in pts])
    if len(hull) < 3:
        return Fraction(0)
    boundary = sum(_segment_lattice_points(hull[i], hull[(i + 1) % len(hull)]) for i in range(len(hull)))
    corners = sum(1 for x, y in hull if x.denominator == 1 and y.denominator == 1)
    return Fraction(polygon_count(hull) - (boundary - corners))
