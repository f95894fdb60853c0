"""Lattice points in dilates of rational polytopes of any dimension; Ehrhart quasi-polynomials and h*.

For a rational polytope P of dimension e whose vertices have least common
denominator D, L_P(t) = #(tP intersected with Z^d) is, for integers t >= 0, a
quasi-polynomial of degree e with period dividing D: one polynomial of degree
<= e for each residue of t modulo D (Ehrhart 1962, 1967; Stanley, *Enumerative
Combinatorics I*, 2nd ed., 4.6.8).  L_P(0) = 1 for a non-empty P.  The empty
polytope has no lattice points in any dilate, t = 0 included (0 P = {} when P
= {}): its count is the zero function.  Ehrhart-Macdonald reciprocity
(Macdonald 1971) extends the constituents to negative t:
L_P(-t) = (-1)^e #(t relint P intersected with Z^d) for t >= 1.

Counting at one t.  The lattice points of the affine hull of tP are
t s + Z-span(b_1, ..., b_e) when t w is integral and none otherwise, where the
unimodular matrix of the Hermite normal form (see `integer_lattices`) gives
s, w and the basis b, LLL-reduced to keep boxes tight.  In these coordinates
tP is a full-dimensional polytope tQ in R^e; for e <= 2 it is counted by floor
sums (any t), otherwise by depth-first enumeration: coordinate k ranges over
the integers allowed by every inequality once coordinates after k take their
most favourable values in the bounding box, so the last coordinate's range is
exact and nothing is counted twice.

Large t.  With the counts at the e + 1 dilates of smallest |t| in each residue
class (negative t by reciprocity, as interior counts), Lagrange interpolation
gives every constituent, hence L_P at any t (Ehrhart's theorem makes this
exact).  With a large D, one dilate is counted instead by Barvinok's signed
decomposition into unimodular cones (`cones`; cost polynomial in the input size
for fixed dimension, the same for every t), chosen by cost estimate in `count`.
The Ehrhart series is sum_t L_P(t) z^t = h*(z) / (1 - z^D)^(e+1) with
deg h* < D (e + 1); Stanley (1980) proved the coefficients of h* are >= 0.

The unit cube [0, 1]^3 has (t + 1)^3 points; the standard 2-simplex in R^3 has
C(t + 2, 2) (Ehrhart 1967):

>>> from .polyhedra import describe
>>> cube = describe([(-1, 0, 0, 0), (1, 0, 0, 1), (0, -1, 0, 0), (0, 1, 0, 1), (0, 0, -1, 0), (0, 0, 1, 1)], [])
>>> count(cube, 10**9) == (10**9 + 1)**3
True
>>> triangle = describe([(-1, 0, 0, 0), (0, -1, 0, 0), (0, 0, -1, 0)], [(1, 1, 1, 1)])
>>> count(triangle, 10), constituents(triangle)
(66, ((Fraction(1, 1), Fraction(3, 2), Fraction(1, 2)),))
>>> hstar(cube)      # the Eulerian numbers 1, 4, 1 (Stanley EC1, 4.6.15); length D (e + 1) = 4
[1, 4, 1, 0]
"""
from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from math import comb, floor as _floor, gcd
from typing import Callable, Optional

from ..foundation.errors import CheckerBug
from ..foundation.limits import DEFAULT_LIMITS, Limits
from .polygons import polygon_count
from .integer_lattices import hermite_columns, lll_reduce
from .polyhedra import Polyhedron, describe, nullspace
from .cones import ConeSum, decomposition_cost

__all__ = ["count", "constituents", "hstar", "evaluate", "budget", "Frame", "frame", "cone_sum", "count_by_cones",
           "restricted_partitions", "restricted_partitions_cost"]

Spend = Optional[Callable[[int], None]]


def budget(limits: Optional[Limits], what: str) -> Callable[[int], None]:
    """A spending counter against the `terms` limit: refuses with BudgetExceeded once it is exceeded."""
    limits = limits or DEFAULT_LIMITS
    used = [0]

    def spend(n: int) -> None:
        used[0] += n
        if used[0] > limits.terms:
            limits.require("terms", used[0], what)
    return spend


def _ceil(x: Fraction) -> int:
    return -((-x.numerator) // x.denominator)


def _dot(u, v):
    return sum(a * b for a, b in zip(u, v))


@dataclass(frozen=True)
class Frame:
    """Lattice coordinates on the affine hull: x = t*shift + sum_j y_j basis_j, needing t*step integral.

    `rows` are (a, c) with a integer: the polytope tP is {y : a . y <= t c} there;
    `low`, `high` bound each coordinate y_j over Q = 1P.
    """
    step: tuple
    shift: tuple
    basis: tuple
    rows: tuple
    low: tuple
    high: tuple
    vertices: tuple          # the vertices of Q, in y coordinates


def _solve_square(M, rhs):
    n = len(M)
    A = [[Fraction(x) for x in row] + [Fraction(b)] for row, b in zip(M, rhs)]
    for c in range(n):
        p = next(r for r in range(c, n) if A[r][c] != 0)
        A[c], A[p] = A[p], A[c]
        for r in range(n):
            if r != c and A[r][c]:
                f = A[r][c] / A[c][c]
                A[r] = [x - f * y for x, y in zip(A[r], A[c])]
    return [A[i][n] / A[i][i] for i in range(n)]


def frame(poly: Polyhedron) -> Frame:
    """The lattice coordinates of a non-empty polytope's affine hull (Hermite normal form, then LLL)."""
    d, e = poly.ambient, poly.dimension
    v0 = poly.vertices[0]
    normals = nullspace([[a - b for a, b in zip(v, v0)] for v in poly.vertices[1:]], d) \
        if len(poly.vertices) > 1 else nullspace([], d)
    m = len(normals)
    if m:
        H, U = hermite_columns(normals)
        rhs = [_dot(nv, v0) for nv in normals]
        step = []
        for i in range(m):       # H lower triangular: forward substitution
            step.append((rhs[i] - sum(H[i][j] * step[j] for j in range(i))) / H[i][i])
    else:
        U, step = [[int(i == j) for j in range(d)] for i in range(d)], []
    shift = tuple(sum((U[i][j] * step[j] for j in range(m)), Fraction(0)) for i in range(d))
    basis = tuple(lll_reduce([tuple(U[i][j] for i in range(d)) for j in range(m, d)]))
    rows = []
    for r in poly.inequalities:
        a = tuple(_dot(r[:d], b) for b in basis)
        c = r[d] - _dot(r[:d], shift)
        if any(a):
            g = gcd(*a)
            rows.append((tuple(x // g for x in a), c / g))
    # coordinates of the vertices: solve the Gram system G y = B^T (v - shift)
    gram = [[_dot(b1, b2) for b2 in basis] for b1 in basis]
    ys = []
    for v in poly.vertices:
        diff = [x - s for x, s in zip(v, shift)]
        y = tuple(_solve_square(gram, [_dot(b, diff) for b in basis])) if e else ()
        if any(sum((yj * b[i] for yj, b in zip(y, basis)), Fraction(0)) != diff[i] for i in range(d)):
            raise CheckerBug.found("a vertex is not on the computed affine hull")
        ys.append(y)
    low = tuple(min(y[j] for y in ys) for j in range(e))
    high = tuple(max(y[j] for y in ys) for j in range(e))
    return Frame(tuple(step), shift, basis, tuple(rows), low, high, tuple(ys))


_FRAMES: dict = {}
_QUASI: dict = {}


def _frame_of(poly):
    f = _FRAMES.get(poly)
    if f is None:
        if len(_FRAMES) > 256:
            _FRAMES.clear()
        f = _FRAMES[poly] = frame(poly)
    return f


def _components(rows, e):
    """Groups of coordinates that no row links: the polytope is their product."""
    parent = list(range(e))

    def root(i):
        while parent[i] != i:
            parent[i] = parent[parent[i]]
            i = parent[i]
        return i
    for a, _ in rows:
        used = [j for j in range(e) if a[j]]
        for j in used[1:]:
            parent[root(j)] = root(used[0])
    groups: dict = {}
    for j in range(e):
        groups.setdefault(root(j), []).append(j)
    return list(groups.values())


def _enumerate(rows, rhs, lo, hi, spend: Spend) -> int:
    """#{y in Z^e : lo <= y <= hi, a_i . y <= rhs_i}: a product over independent groups of coordinates."""
    e = len(lo)
    if e == 0:
        return 1 if all(r >= 0 for r in rhs) else 0
    if any(r < 0 for (a, _), r in zip(rows, rhs) if not any(a)):
        return 0
    total = 1
    for group in _components(rows, e):
        picked = [i for i, (a, _) in enumerate(rows) if any(a[j] for j in group)]
        sub_rows = [(tuple(rows[i][0][j] for j in group), None) for i in picked]
        total *= _enumerate_connected(sub_rows, [rhs[i] for i in picked], [lo[j] for j in group],
                                      [hi[j] for j in group], spend)
        if total == 0:
            return 0
    return total


def _enumerate_connected(rows, rhs, lo, hi, spend: Spend) -> int:
    """#{y in Z^e : lo <= y <= hi, a_i . y <= rhs_i}: depth first, the last coordinate by its range."""
    e = len(lo)
    m = len(rows)
    # rest[k][i]: the least value of sum_{j >= k} a_ij y_j over the box
    rest = [[0] * m for _ in range(e + 1)]
    for k in range(e - 1, -1, -1):
        for i, (a, _) in enumerate(rows):
            rest[k][i] = rest[k + 1][i] + min(a[k] * lo[k], a[k] * hi[k])
    by_level = [[(i, a[k]) for i, (a, _) in enumerate(rows) if a[k]] for k in range(e)]
    nodes = [0]

    def walk(k, slack):
        low, high = lo[k], hi[k]
        after = rest[k + 1]
        for i, a in by_level[k]:
            room = slack[i] - after[i]
            if a > 0:
                q = room // a
                if q < high:
                    high = q
            else:
                q = -(room // -a)
                if q > low:
                    low = q
            if low > high:
                return 0
        if k == e - 1:
            return high - low + 1
        nodes[0] += high - low + 1
        if nodes[0] > 4096:
            if spend:
                spend(nodes[0])
            nodes[0] = 0
        total = 0
        level = by_level[k]
        for y in range(low, high + 1):
            inner = list(slack)
            for i, a in level:
                inner[i] -= a * y
            total += walk(k + 1, inner)
        return total

    return walk(0, list(rhs))


def _interval(lo: Fraction, hi: Fraction) -> int:
    return max(0, _floor(hi) - _ceil(lo) + 1)


def _direct(poly: Polyhedron, fr: Frame, t: int, interior: bool, spend: Spend) -> int:
    """Lattice points of tP (interior: of its relative interior), t >= 0, by enumeration."""
    if poly.empty:
        return 0
    if any((t * w).denominator != 1 for w in fr.step):
        return 0
    e = poly.dimension
    if t == 0:
        return 1 if e == 0 or not interior else 0
    if e == 0:
        return 1
    if not interior and e <= 2:
        pts = [tuple(t * c for c in y) for y in fr.vertices]
        if e == 1:
            return _interval(t * fr.low[0], t * fr.high[0])
        return polygon_count(pts)
    rhs = [(_ceil(t * c) - 1) if interior else _floor(t * c) for _, c in fr.rows]
    lo = [_ceil(t * x) for x in fr.low]
    hi = [_floor(t * x) for x in fr.high]
    if interior:
        lo = [x if Fraction(x) != t * l else x + 1 for x, l in zip(lo, fr.low)]
        hi = [x if Fraction(x) != t * h else x - 1 for x, h in zip(hi, fr.high)]
    if any(a > b for a, b in zip(lo, hi)):
        return 0
    return _enumerate(fr.rows, rhs, lo, hi, spend)


def _cost(fr: Frame, t: int) -> int:
    """Estimated enumeration nodes at t: the box's points above the last coordinate."""
    total, prod = 0, 1
    for lo, hi in list(zip(fr.low, fr.high))[:-1]:
        prod *= abs(t) * (hi - lo) + 1
        total += prod
    return int(total) + 1


def _samples(residue: int, period: int, degree: int, reciprocity: bool) -> list[int]:
    """The degree + 1 integers t = residue (mod period) of least |t| (t >= 0 only, or t != 0 below 0)."""
    ups = [residue + i * period for i in range(degree + 1)]
    if not reciprocity:
        return ups
    first = (-residue) % period or period
    downs = [-(first + i * period) for i in range(degree + 1)]
    merged = sorted(ups + downs, key=lambda t: (abs(t), t < 0))
    return merged[:degree + 1]


def _interpolate(points):
    """Coefficients (constant first) of the polynomial through the points, exactly (Lagrange)."""
    n = len(points)
    coeffs = [Fraction(0)] * n
    for i, (xi, yi) in enumerate(points):
        basis = [Fraction(1)]
        denom = Fraction(1)
        for j, (xj, _) in enumerate(points):
            if j != i:
                basis = [Fraction(0)] + basis
                for k in range(len(basis) - 1):
                    basis[k] -= xj * basis[k + 1]
                denom *= xi - xj
        for k in range(n):
            coeffs[k] += yi * basis[k] / denom
    return coeffs


def constituents(poly: Polyhedron, spend: Spend = None) -> tuple:
    """The Ehrhart quasi-polynomial: for r = 0 .. D-1, the coefficients of L_P(t) for t = r (mod D).

    The empty polytope gives ((0,),).  Exact by Ehrhart's theorem and
    Ehrhart-Macdonald reciprocity from counts at the dilates of least |t|.
    """
    if poly.empty:
        return ((Fraction(0),),)
    known = _QUASI.get(poly)
    if known is not None:
        return known
    fr = _frame_of(poly)
    e, D = poly.dimension, poly.denominator
    if spend:
        spend(D * (e + 1))
    table = []
    for r in range(D):
        points = []
        for t in _samples(r, D, e, e >= 3):
            if t >= 0:
                value = _direct(poly, fr, t, False, spend)
            else:
                value = (-1) ** e * _direct(poly, fr, -t, True, spend)
            points.append((Fraction(t), Fraction(value)))
        table.append(tuple(_interpolate(points)))
    result = tuple(table)
    if len(_QUASI) > 256:
        _QUASI.clear()
    _QUASI[poly] = result
    return result


def evaluate(table, t: int) -> Fraction:
    """The quasi-polynomial given by constituents at t."""
    total = Fraction(0)
    for c in reversed(table[t % len(table)]):
        total = total * t + c
    return total


def count(poly: Polyhedron, t: int, spend: Spend = None, interior: bool = False) -> int:
    """#(tP intersected with Z^d) for t >= 0 (interior: of t relint P, t >= 1), choosing the cheaper way."""
    if poly.empty:
        return 0
    fr = _frame_of(poly)
    e, D = poly.dimension, poly.denominator
    if t == 0 or (e <= 2 and not interior):
        return _direct(poly, fr, t, interior, spend)
    known = _QUASI.get(poly)
    if known is None:
        # interpolation needs D (e + 1) counts at dilates up to about D (e + 1) / 2 + D
        reach = D * (e + 1) // 2 + D
        direct = _cost(fr, t)
        interpolation = D * (e + 1) * _cost(fr, reach)
        if poly in _CONES or min(direct, interpolation) > max(CONES_FROM, CONE_STEP * decomposition_cost(
                fr.rows, fr.vertices)):
            return count_by_cones(poly, t, _as_terms(spend), interior)
        if t <= reach or direct <= interpolation:
            return _direct(poly, fr, t, interior, spend)
        known = constituents(poly, spend)
    if interior:
        return int((-1) ** e * evaluate(known, -t))
    return int(evaluate(known, t))


#: below this many estimated steps, enumeration or interpolation is used (cheap, no decomposition)
CONES_FROM = 50_000
#: one step of `cones.decomposition_cost` takes about as long as this many enumeration steps
#: (measured on knapsack simplices and cubes in dimensions 3-5: 250 to 500)
CONE_STEP = 300
#: the cones' steps are charged to `terms` at this many terms each: a cone step takes 10-15 us (measured on
#: knapsack simplices of dimension 3 to 13 and on cubes, its charge growing with the size of the entries), so
#: the default budget stops a decomposition after about 6 10^5 cone steps, 7 to 9 s, where one term a step let
#: it run 36 s and more; the 1024 cones of the 10-cube (3.3 10^5 steps, 4.8 s) still fit
CONE_TERMS = 5
_CONES: dict = {}


def _as_terms(spend: Spend) -> Spend:
    """The spend of a cone decomposition against the `terms` budget: CONE_TERMS terms per cone step."""
    if spend is None:
        return None
    return lambda steps: spend(steps * CONE_TERMS)


def cone_sum(poly: Polyhedron, spend: Spend = None) -> ConeSum:
    """The signed unimodular cones of a non-empty polytope, in the lattice coordinates of its hull."""
    known = _CONES.get(poly)
    if known is None:
        fr = _frame_of(poly)
        known = ConeSum.of(fr.rows, fr.vertices, spend)
        if len(_CONES) > 256:
            _CONES.clear()
        _CONES[poly] = known
    return known


def count_by_cones(poly: Polyhedron, t: int, spend: Spend = None, interior: bool = False) -> int:
    """#(tP cap Z^d) (interior: of t relint P) by Barvinok's decomposition, any integer t >= 0.

    Polynomial in the input size for fixed dimension: the decomposition does not depend
    on t, and each dilate costs one pass over the unimodular cones (see `cones`).
    """
    if t < 0:
        raise ValueError("count_by_cones counts dilates t >= 0")
    if poly.empty:
        return 0
    fr = _frame_of(poly)
    if any((t * w).denominator != 1 for w in fr.step):
        return 0
    e = poly.dimension
    if t == 0:
        return 1 if e == 0 or not interior else 0
    sums = cone_sum(poly, spend)
    return (-1) ** e * sums.count(-t, spend) if interior else sums.count(t, spend)


def restricted_partitions(n: int, parts, spend: Spend = None) -> int:
    """p_A(n) = #{x in Z^k : x >= 0, a . x = n} for positive integer parts a, by Barvinok's cones.

    The n-th dilate of the simplex {x >= 0 : a . x = 1} (Ehrhart 1967), counted in lattice
    coordinates of its hyperplane; the cost grows with log a_i, not with a_i or n.
    """
    parts = [int(a) for a in parts]
    if not parts or any(a <= 0 for a in parts):
        raise ValueError("restricted_partitions needs positive parts")
    if n < 0:
        return 0
    simplex = _simplex_of_parts(tuple(parts))
    return count_by_cones(simplex, n, spend)


def restricted_partitions_cost(parts, per_value: bool = False):
    """Estimated cost of `restricted_partitions` (any n), in the plain steps of a table like O(n d).

    The decomposition's own estimate (`cones.decomposition_cost`) times CONE_STEP; 0 once cached.
    With per_value, (that, the cost of one value from the cached cones): one pass over the
    unimodular cones, measured at a tenth to a twentieth of their decomposition.
    """
    simplex = _simplex_of_parts(tuple(int(a) for a in parts))
    fr = _frame_of(simplex)
    whole = CONE_STEP * decomposition_cost(fr.rows, fr.vertices)
    decomposition = 0 if simplex in _CONES else whole
    return (decomposition, whole // 10) if per_value else decomposition


_SIMPLICES: dict = {}


def _simplex_of_parts(parts):
    known = _SIMPLICES.get(parts)
    if known is None:
        k = len(parts)
        known = describe([tuple(-int(j == i) for j in range(k)) + (0,) for i in range(k)], [parts + (1,)])
        if len(_SIMPLICES) > 256:
            _SIMPLICES.clear()
        _SIMPLICES[parts] = known
    return known


def hstar(poly: Polyhedron, spend: Spend = None) -> list[int]:
    """Coefficients h*_0, h*_1, ... of the numerator of sum_t L_P(t) z^t = h*(z) / (1 - z^D)^(e+1).

    The list has length D (e + 1) (trailing zeros kept); [] for the empty polytope.
    """
    if poly.empty:
        return []
    table = constituents(poly, spend)
    e, D = poly.dimension, poly.denominator
    n = D * (e + 1)
    values = [evaluate(table, t) for t in range(n)]
    out = []
    for j in range(n):
        h = sum((-1) ** k * comb(e + 1, k) * values[j - k * D] for k in range(e + 2) if j - k * D >= 0)
        out.append(int(h))
    return out
