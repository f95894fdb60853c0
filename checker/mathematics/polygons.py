"""Lattice points in rational polygons, by floor sums over the edges.

Over each edge of the upper and lower boundary of a polygon the column tops
are floor((p x + q)/r); their sum over a range of x is a floor sum, computed by
the Euclid-like algorithm in `floor_sums`, so the cost is logarithmic in the
size of the polygon (a polygon scaled by 10^30 costs a few dozen steps).

Pick's theorem for the unit square (Pick 1899):

>>> polygon_count([(0, 0), (1, 0), (1, 1), (0, 1)])
4
"""
from __future__ import annotations

from fractions import Fraction
from math import floor as _floor

from ..foundation.errors import CheckerBug
from .floor_sums import staircase

__all__ = ["polygon_count", "convex_hull"]


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
    hull = lower[:-1] + upper[:-1]
    _check_polygon(pts, hull)
    return hull


def _check_polygon(pts, hull):
    """Every point lies left of or on every edge of the counter-clockwise hull, whose corners are
    distinct points: each edge line then supports the point set, and a corner left out would lie
    strictly right of the edge that skips it."""
    if len(set(hull)) != len(hull) or not set(hull) <= set(pts) or \
            any(_cross(a, b, p) < 0 for a, b in zip(hull, hull[1:] + hull[:1]) for p in pts):
        raise CheckerBug("the convex hull of a polygon was computed wrongly: this is a bug in quasicert, "
                         "please report it")


def _check_chains(pts, lower, upper):
    """The chains run from the least to the greatest x through points of the set with x never
    decreasing, and every point lies on or above each lower edge line and on or below each upper one;
    so over [min x, max x] they are the lower and upper boundary of the hull (each piece lies inside
    the hull, and the hull lies on its side of every piece's line)."""
    xs = [p[0] for p in pts]
    ok = True
    for chain, side in ((lower, 1), (upper, -1)):
        ok = ok and set(chain) <= set(pts) and chain[0][0] == min(xs) and chain[-1][0] == max(xs) and \
            all(a[0] <= b[0] for a, b in zip(chain, chain[1:])) and \
            all(side * _cross(a, b, p) >= 0 for a, b in zip(chain, chain[1:]) if a[0] != b[0] for p in pts)
    if not ok:
        raise CheckerBug("the boundary of a polygon was computed wrongly: this is a bug in quasicert, "
                         "please report it")


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
    _check_chains(pts, lower, upper)
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
    points = [(Fraction(x), Fraction(y)) for x, y in points]      # exact, whatever came in
    lower, upper = _chains(points)
    xmin, xmax = lower[0][0], lower[-1][0]
    lo, hi = _ceil(xmin), _floor(xmax)
    if hi < lo:
        return 0
    if xmin == xmax:   # a vertical segment or a point
        ys = [p[1] for p in lower + upper]
        return max(0, _floor(max(ys)) - _ceil(min(ys)) + 1)
    return _sum_boundary(upper, lo, hi, True) + _sum_boundary(lower, lo, hi, False) + (hi - lo + 1)


