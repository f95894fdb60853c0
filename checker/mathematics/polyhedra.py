"""Rational polyhedra: vertices from inequalities, facets from vertices, emptiness, boundedness.

A polyhedron P = {x in R^d : a_i . x <= b_i, e_j . x = f_j} with rational data
is the set where the homogenised cone C = {(x, s) : a_i . x <= b_i s,
e_j . x = f_j s, s >= 0} meets s = 1.  Once the lineality space
L = {x : a_i . x = 0, e_j . x = 0} is cut away (x orthogonal to L), C is
pointed and is the set of non-negative combinations of its extreme rays
(Minkowski-Weyl; Ziegler, *Lectures on Polytopes*, 1.1).  The rays with s > 0
are the vertices (scaled to s = 1), those with s = 0 the directions in which P
is unbounded.  Hence, exactly:

* P is empty when no extreme ray has s > 0;
* a non-empty P is bounded when L = 0 and every extreme ray has s > 0.

The extreme rays are found by the double description method (Motzkin,
Raiffa, Thompson & Thrall 1953; Fukuda & Prodon 1996): constraints are added
one at a time, and two rays are combined only when they are adjacent, tested
combinatorially (no third ray is tight wherever both are).  Everything is
integer arithmetic.  The converse direction, from a list of points to the
facets of their convex hull, is the same computation on the polar cone
{(a, b) : a . p_i <= b for every point p_i}.  Both results are proved complete
each time they are computed (`polyhedral_certificates`): a bug in the enumeration
is refused as a CheckerBug, never turned into a count.

The unit square by inequalities, and the facets of a triangle:

>>> [tuple(map(int, v)) for v in describe([(-1, 0, 0), (1, 0, 1), (0, -1, 0), (0, 1, 1)], []).vertices]
[(0, 0), (0, 1), (1, 0), (1, 1)]
>>> sorted(hull_description([(0, 0), (1, 0), (0, 1)])[0])
[(-1, 0, 0), (0, -1, 0), (1, 1, 1)]
>>> describe([(1, 0, -1), (-1, 0, -1), (0, 1, 0), (0, -1, 0)], []).empty   # x <= -1 and x >= 1
True
"""
from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from math import gcd, lcm
from typing import Callable, Optional

from ..foundation.errors import DomainError
from ..foundation.numbers import value_text
from .polyhedral_certificates import check_empty, check_hull, check_unbounded, check_vertex_list

__all__ = ["Polyhedron", "describe", "hull_description", "extreme_rays", "nullspace", "rank",
           "integer_row"]

Spend = Optional[Callable[[int], None]]


def integer_row(row) -> tuple[int, ...]:
    """The row scaled by a positive rational to coprime integers (the zero row stays zero)."""
    den = lcm(*[Fraction(c).denominator for c in row]) if row else 1
    ints = [int(Fraction(c) * den) for c in row]
    g = gcd(*ints) if ints else 0
    return tuple(c // g for c in ints) if g > 1 else tuple(ints)


def _echelon(rows, n):
    """Reduced row echelon form over the rationals: (rows, pivot columns)."""
    m = [[Fraction(x) for x in r] for r in rows]
    pivots = []
    r = 0
    for c in range(n):
        p = next((i for i in range(r, len(m)) if m[i][c] != 0), None)
        if p is None:
            continue
        m[r], m[p] = m[p], m[r]
        inv = 1 / m[r][c]
        m[r] = [x * inv for x in m[r]]
        for i in range(len(m)):
            if i != r and m[i][c] != 0:
                f = m[i][c]
                m[i] = [x - f * y for x, y in zip(m[i], m[r])]
        pivots.append(c)
        r += 1
        if r == len(m):
            break
    return m[:r], pivots


def rank(rows, n: int) -> int:
    return len(_echelon(rows, n)[1]) if rows else 0


def nullspace(rows, n: int) -> list[tuple[int, ...]]:
    """A basis of {x in Q^n : r . x = 0 for every row r}, as primitive integer vectors."""
    if not rows:
        return [tuple(int(i == j) for j in range(n)) for i in range(n)]
    red, pivots = _echelon(rows, n)
    free = [c for c in range(n) if c not in pivots]
    out = []
    for f in free:
        v = [Fraction(0)] * n
        v[f] = Fraction(1)
        for row, p in zip(red, pivots):
            v[p] = -row[f]
        out.append(integer_row(v))
    return out


def _dot(u, v):
    return sum(a * b for a, b in zip(u, v))


def _primitive(v) -> tuple[int, ...]:
    g = gcd(*v)
    return tuple(x // g for x in v) if g > 1 else tuple(v)


def extreme_rays(constraints, n: int, spend: Spend = None):
    """The extreme rays of the pointed cone {x in R^n : c . x <= 0 for each integer row c}.

    Returns a list of primitive integer vectors.  Raises ValueError when the
    rows have rank < n (the cone is not pointed).
    """
    rows = [tuple(int(x) for x in c) for c in constraints]
    basis, chosen = [], []
    for i, c in enumerate(rows):
        if any(c) and rank(basis + [c], n) > len(basis):
            basis.append(c)
            chosen.append(i)
            if len(basis) == n:
                break
    if len(basis) < n:
        raise ValueError("the cone is not pointed")
    # the simplicial cone {x : B x <= 0} has the rays -B^(-1) e_j, tight at every row but j
    rays, tight = [], []
    for j in range(n):
        aug = [list(basis[i]) + [Fraction(-int(i == j))] for i in range(n)]
        red, _ = _echelon(aug, n + 1)
        rays.append(integer_row([row[n] for row in red]))
        tight.append(sum(1 << chosen[i] for i in range(n) if i != j))
    chosen_set = set(chosen)
    for i, c in enumerate(rows):
        if i in chosen_set:
            continue
        values = [_dot(c, r) for r in rays]
        plus = [k for k, v in enumerate(values) if v > 0]
        minus = [k for k, v in enumerate(values) if v < 0]
        keep = [k for k, v in enumerate(values) if v <= 0]
        if not plus:
            # every ray satisfies the constraint; record where it is tight
            tight = [t | (1 << i) if v == 0 else t for t, v in zip(tight, values)]
            continue
        if spend:
            spend(len(plus) * len(minus) * len(rays) // 8 + 1)
        new_rays = [rays[k] for k in keep]
        new_tight = [tight[k] | (1 << i) if values[k] == 0 else tight[k] for k in keep]
        for p in plus:
            for q in minus:
                common = tight[p] & tight[q]
                if common.bit_count() < n - 2:
                    continue
                if any(k != p and k != q and common & tight[k] == common for k in range(len(rays))):
                    continue
                vp, vq = values[p], values[q]
                new_rays.append(_primitive([vp * y - vq * x for x, y in zip(rays[p], rays[q])]))
                new_tight.append(common | (1 << i))
        rays, tight = new_rays, new_tight
    return rays


@dataclass(frozen=True)
class Polyhedron:
    """A rational polyhedron in R^d, analysed: its vertices, dimension and denominator.

    `inequalities` are integer rows (a_1, ..., a_d, b) meaning a . x <= b,
    `equations` integer rows meaning a . x = b; `vertices` are exact.  `empty`
    polyhedra have no vertices and dimension -1.  Unbounded input never makes a
    Polyhedron: `describe` refuses it.
    """
    ambient: int
    inequalities: tuple
    equations: tuple
    vertices: tuple
    dimension: int
    denominator: int

    @property
    def empty(self) -> bool:
        return not self.vertices


def _describe_cone(ineqs, eqs, d):
    """Constraints of the homogenised cone, made pointed by cutting away the lineality space."""
    lineality = nullspace([r[:d] for r in ineqs + eqs], d) if ineqs or eqs else nullspace([], d)
    cone = [r[:d] + (-r[d],) for r in ineqs]
    for r in eqs:
        cone += [r[:d] + (-r[d],), tuple(-x for x in r[:d]) + (r[d],)]
    for v in lineality:
        cone += [tuple(v) + (0,), tuple(-x for x in v) + (0,)]
    cone.append((0,) * d + (-1,))
    return cone, lineality


def describe(inequalities, equations, spend: Spend = None) -> Polyhedron:
    """Analyse {x : a . x <= b (inequalities), a . x = b (equations)}; rows (a_1, ..., a_d, b).

    Raises DomainError, naming a direction, when the set is non-empty and unbounded.
    """
    rows = list(inequalities) + list(equations)
    d = len(rows[0]) - 1
    ineqs, eqs = [], []
    infeasible = False
    for r in inequalities:
        r = integer_row(r)
        if any(r[:d]):
            ineqs.append(r)
        elif r[d] < 0:
            infeasible = True          # 0 <= negative
    for r in equations:
        r = integer_row(r)
        if next((x for x in r if x), 0) < 0:
            r = tuple(-x for x in r)       # one sign per equation, so that duplicates meet
        if any(r[:d]):
            eqs.append(r)
        elif r[d] != 0:
            infeasible = True          # 0 = nonzero
    ineqs, eqs = sorted(set(ineqs)), sorted(set(eqs))
    if infeasible:
        return Polyhedron(d, tuple(ineqs), tuple(eqs), (), -1, 1)
    cone, lineality = _describe_cone(ineqs, eqs, d)
    rays = extreme_rays(cone, d + 1, spend)
    vertices = sorted({tuple(Fraction(x, r[d]) for x in r[:d]) for r in rays if r[d] > 0})
    if not vertices:
        check_empty(ineqs, eqs, d)
        return Polyhedron(d, tuple(ineqs), tuple(eqs), (), -1, 1)
    directions = [r[:d] for r in rays if r[d] == 0]
    if lineality or directions:
        v = vertices[0]
        if lineality:
            check_unbounded(ineqs, eqs, v, lineality[0], True)
            raise DomainError(f"the polytope is unbounded: it contains the whole line through "
                              f"{_point(v)} in the direction {_point(lineality[0])}")
        check_unbounded(ineqs, eqs, v, directions[0], False)
        raise DomainError(f"the polytope is unbounded: it contains the half-line from "
                          f"{_point(v)} in the direction {_point(directions[0])}")
    check_vertex_list(ineqs, eqs, vertices, _affine_hull(vertices, d), spend)
    return _analysed(d, ineqs, eqs, vertices)


def _affine_hull(points, d) -> list[tuple[int, ...]]:
    """Integer equations n . x = n . p0 whose solutions are the affine hull of the points."""
    p0 = points[0]
    normals = nullspace([[a - b for a, b in zip(p, p0)] for p in points[1:]], d) if len(points) > 1 \
        else nullspace([], d)
    return [integer_row(list(nv) + [_dot(nv, p0)]) for nv in normals]


def _analysed(d, ineqs, eqs, vertices) -> Polyhedron:
    v0 = vertices[0]
    dim = rank([[a - b for a, b in zip(v, v0)] for v in vertices[1:]], d)
    den = lcm(*[c.denominator for v in vertices for c in v])
    return Polyhedron(d, tuple(ineqs), tuple(eqs), tuple(vertices), dim, den)


def _point(v) -> str:
    return "[" + ", ".join(value_text(x) for x in v) + "]"


def hull_description(points, spend: Spend = None):
    """(inequalities, equations) of the convex hull of rational points, as integer rows (a..., b).

    The rows are proved to be exactly the hull (`polyhedral_certificates.check_hull`): every
    point satisfies them, each inequality is a facet, and the facet list is complete.
    """
    pts = [tuple(Fraction(c) for c in p) for p in points]
    d = len(pts[0])
    equations = _affine_hull(pts, d)
    inequalities = []
    if len(equations) < d:
        cone = [integer_row(list(p) + [-1]) for p in pts]
        for nv in equations:
            cone += [tuple(nv[:d]) + (0,), tuple(-x for x in nv[:d]) + (0,)]
        for r in extreme_rays(cone, d + 1, spend):
            if any(r[:d]):
                inequalities.append(tuple(r))
    inequalities, equations = sorted(set(inequalities)), sorted(set(equations))
    check_hull(pts, inequalities, equations, True, spend)
    return inequalities, equations


def convex_hull_polyhedron(points, spend: Spend = None) -> Polyhedron:
    """The convex hull of rational points, analysed.

    Its rows are proved to cut out exactly the hull, so its vertices are the points whose
    tight rows have rank d (a point of a polyhedron is a vertex exactly then).
    """
    ineqs, eqs = hull_description(points, spend)
    d = len(points[0])
    given = sorted({tuple(Fraction(c) for c in p) for p in points})
    vertices = [p for p in given
                if rank([r[:d] for r in eqs] + [r[:d] for r in ineqs if _dot(r[:d], p) == r[d]], d) == d]
    return _analysed(d, ineqs, eqs, vertices)
