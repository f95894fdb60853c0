"""Certificates that a polytope's vertex list and facet list are complete, checked exactly.

Facets.  Let S be a finite set of rational points, G = conv S of dimension k,
and L a list of rows a . x <= b (with equations N).  `check_hull` proves
G = {x : N x = h, a . x <= b for a in L} from three facts: every point of S
satisfies every row, N cuts out exactly the affine hull of S, and the rows
of L that are facets of G are all the facets of G; a polytope is the
intersection of its affine hull with its facets (Minkowski-Weyl; Ziegler,
*Lectures on Polytopes*, Lecture 2).  Each face is known by the points of S on it
(a bit mask); the facets of a j-face are its proper faces cut out by rows of
L with dimension j - 1, and that list is proved complete by one of:

* simple vertices: at every point v of the face, j listed facets meet only
  in v and any j - 1 of them meet in another point w; the w - v are then a
  basis on which the j facets are the coordinate half-spaces, so no other
  facet passes through v, and every facet has a vertex;
* ridge closure: every ridge of each listed facet (whose own facet list is
  proved complete one dimension down) lies in exactly two listed facets; the
  facet-ridge graph of a polytope of dimension >= 2 is connected (it is the
  graph of the polar, Balinski 1961), so a list closed under ridges is all.

A segment has exactly two facets, its ends.

Vertices.  For P = {x : A x <= b, E x = f} and a list V, `check_vertex_list`
proves P = conv V: each v in V lies in P with tight rows of rank d (a vertex),
P lies in the affine hull of V (at once when E alone cuts out a space of
dimension dim V; otherwise by Farkas multipliers y >= 0, z with
y A + z E = n and y b + z f = n . v for each side of each equation n of the
hull, found among the rows tight at a vertex), and the rows of P that are
facets of conv V are all the facets of conv V (`check_hull`), so P is inside
conv V; in particular P is bounded.
Emptiness carries y >= 0, z with y A + z E = 0 and y b + z f < 0 (Farkas 1902);
unboundedness a point of P and a direction r != 0 with A r <= 0, E r = 0.

Dimensions are lower bounds from ranks modulo a prime, which never exceed the
rank over Q: a proper face of a j-face with rank j - 1 modulo p is a facet,
and S's rank modulo p equal to d minus the rank of N modulo p is exact.  An
unlucky prime only refuses.  Every failure raises CheckerBug: quasicert
refuses rather than counts with a wrong list.

The square's four vertices and four facets:

>>> square = [(0, 0), (1, 0), (0, 1), (1, 1)]
>>> rows = [(-1, 0, 0), (1, 0, 1), (0, -1, 0), (0, 1, 1)]
>>> check_hull(square, rows, [], True)
>>> check_hull(square, rows[:3], [], True)
Traceback (most recent call last):
...
checker.foundation.errors.CheckerBug: the facet list of a polytope is incomplete on a face through (0, 0): this is a bug in quasicert, please report it
"""
from __future__ import annotations

from fractions import Fraction
from math import lcm

from ..foundation.errors import CheckerBug
from ..foundation.numbers import value_text
from ..foundation.limits import check_time

__all__ = ["check_hull", "check_vertex_list", "check_empty", "check_unbounded", "nonnegative_combination"]

PRIME = (1 << 61) - 1


def _dot(u, v):
    return sum(a * b for a, b in zip(u, v))


def _refuse(message: str):
    raise CheckerBug.found(message)


def _text(v) -> str:
    return "(" + ", ".join(value_text(x) for x in v) + ")"


def _rank_mod_p(vectors, enough=None) -> int:
    """Rank modulo PRIME of integer vectors (at most their rank over Q), or `enough` once it is reached."""
    return len(_pivots_mod_p(vectors, enough))


def _pivots_mod_p(vectors, enough=None) -> dict:
    """Echelon rows modulo PRIME, keyed by pivot column (each row 1 there, 0 at earlier pivots)."""
    pivots: dict = {}
    for v in vectors:
        if len(pivots) == enough:
            break
        v = [x % PRIME for x in v]
        for c, row in pivots.items():        # in the order they came: earlier pivots stay 0
            f = v[c]
            if f:
                v = [(x - f * y) % PRIME for x, y in zip(v, row)]
        c = next((i for i, x in enumerate(v) if x), None)
        if c is not None:
            inv = pow(v[c], -1, PRIME)
            pivots[c] = [x * inv % PRIME for x in v]
    return pivots


def _scaled_points(pts):
    """The points times their common denominator: integers with the same affine relations."""
    den = lcm(*[c.denominator for p in pts for c in p])
    return [tuple(int(c * den) for c in p) for p in pts]


class _Faces:
    """Faces of conv S as bit masks of S, with affine dimensions from ranks modulo PRIME."""

    def __init__(self, points, spend=None):
        self.spend = spend
        self.given = points
        ints = _scaled_points(points)
        # coordinates on which the projection of the affine hull is one to one (modulo PRIME, hence over Q)
        keep = sorted(_pivots_mod_p([[a - b for a, b in zip(p, ints[0])] for p in ints[1:]]))
        self.points = [tuple(p[c] for c in keep) for p in ints]
        self.facets: list = []
        self._rank: dict = {}
        self._enough: dict = {}
        self._complete: dict = {}

    def rank(self, mask: int, enough=None) -> int:
        """The rank modulo PRIME of the points in mask (affine; -1 for none), or `enough` once reached."""
        r = self._rank.get(mask)
        if r is None or (r == self._enough.get(mask) and (enough is None or enough > r)):
            idx = [i for i in range(len(self.points)) if mask >> i & 1]
            p0 = self.points[idx[0]] if idx else ()
            r = _rank_mod_p([[a - b for a, b in zip(self.points[i], p0)] for i in idx[1:]], enough) \
                if idx else -1
            self._rank[mask] = r
            self._enough[mask] = enough
        return r

    def facets_of(self, face: int, j: int) -> list:
        """The facets of the j-face (j >= 1), proved complete (CheckerBug otherwise)."""
        known = self._complete.get(face)
        if known is not None:
            return known
        check_time()
        if self.spend:           # about the work below: a pass over the rows, a rank of the face's points
            self.spend(len(self.facets) + bin(face).count("1") * j + 1)
        found = sorted({face & m for m in self.facets if face & m != face})
        found = [m for m in found if self.rank(m, j - 1) >= j - 1]
        if j == 1:
            if len(found) != 2:
                self._incomplete(face)
        elif not all(self._simple(face, [h for h in found if h >> v & 1], j, 1 << v)
                     for v in range(len(self.points)) if face >> v & 1):
            if len(found) <= j:
                self._incomplete(face)
            # by induction a ridge is listed under exactly the listed facets that hold it
            times: dict = {}
            for h in found:
                for ridge in self.facets_of(h, j - 1):
                    times[ridge] = times.get(ridge, 0) + 1
            if any(n != 2 for n in times.values()):
                self._incomplete(face)
        self._complete[face] = found
        return found

    def _simple(self, face, found, j, bit) -> bool:
        if len(found) != j:
            return False
        if j == 1:
            return found[0] == bit
        meet = face
        for m in found:
            meet &= m
        if meet != bit:
            return False
        for i in range(j):
            rest = face
            for k, m in enumerate(found):
                if k != i:
                    rest &= m
            if rest == bit:
                return False
        return True

    def _incomplete(self, face):
        v = next(i for i in range(len(self.points)) if face >> i & 1)
        _refuse(f"the facet list of a polytope is incomplete on a face through {_text(self.given[v])}")


def _incidences(pts, inequalities, equations):
    """Scaled integer points and, per inequality, the mask of points where it is tight; refuses a violation."""
    d = len(pts[0])
    if not all(type(x) is int for r in list(inequalities) + list(equations) for x in r):
        _refuse("the rows of a polytope reached its proof without being made integers")
    den = lcm(*[c.denominator for p in pts for c in p])
    ints = _scaled_points(pts)
    masks = []
    for r in list(inequalities) + list(equations):
        mask = 0
        for i, p in enumerate(ints):
            s = r[d] * den - _dot(r[:d], p)
            if s < 0 or (s and len(masks) >= len(inequalities)):
                _refuse(f"the point {_text(pts[i])} violates the computed row {_text(r)}")
            if s == 0:
                mask |= 1 << i
        masks.append(mask)
    return masks[:len(inequalities)]


def check_hull(points, inequalities, equations, every_row_a_facet: bool, spend=None) -> None:
    """Prove conv(points) = {x : a . x <= b (inequalities), a . x = b (equations)}; integer rows (a..., b).

    With every_row_a_facet, each inequality must moreover define a facet.
    """
    pts = sorted({tuple(Fraction(c) for c in p) for p in points})
    _prove_hull(pts, _incidences(pts, inequalities, equations), inequalities, equations, every_row_a_facet, spend)


def _prove_hull(pts, masks, inequalities, equations, every_row_a_facet, spend):
    d = len(pts[0])
    faces = _Faces(pts, spend)
    full = (1 << len(pts)) - 1
    k = faces.rank(full)
    if k != d - _rank_mod_p([r[:d] for r in equations]):
        _refuse("the computed equations do not cut out the affine hull of the points")
    facets = []
    for r, mask in zip(inequalities, masks):
        if mask != full and faces.rank(mask, k - 1) == k - 1:
            facets.append(mask)
        elif every_row_a_facet and k > 0:
            _refuse(f"the computed row {_text(r)} is not a facet of the hull")
    faces.facets = facets
    if k > 0:
        faces.facets_of(full, k)


def check_vertex_list(inequalities, equations, vertices, hull_equations, spend=None) -> None:
    """Prove {x : rows} = conv(vertices), each a vertex; integer rows; hull_equations propose the affine hull."""
    pts = sorted({tuple(Fraction(c) for c in v) for v in vertices})
    d = len(pts[0])
    masks = _incidences(pts, inequalities, equations)
    tight_count = []
    for i, v in enumerate(pts):
        tight = [r[:d] for r in equations] + [r[:d] for r, m in zip(inequalities, masks) if m >> i & 1]
        if _rank_mod_p(tight) != d:
            _refuse(f"a computed vertex {_text(v)} is not a vertex")
        tight_count.append(len(tight))
    ints = _scaled_points(pts)
    if _rank_mod_p([[a - b for a, b in zip(p, ints[0])] for p in ints[1:]]) + \
            _rank_mod_p([r[:d] for r in equations]) == d:
        # the equations alone cut out a space of the vertices' dimension: it is their affine hull
        hull_equations = equations
    else:
        _prove_on_hull(pts, masks, tight_count, inequalities, equations, hull_equations)
    _prove_hull(pts, masks, inequalities, hull_equations, False, spend)


def _prove_on_hull(pts, masks, tight_count, inequalities, equations, hull_equations):
    """Farkas multipliers from the rows tight at one vertex: the polytope lies on each hull equation."""
    d = len(pts[0])
    _incidences(pts, [], hull_equations)
    i0 = tight_count.index(min(tight_count))
    tight = [r for r, m in zip(inequalities, masks) if m >> i0 & 1]
    for n in hull_equations:
        for sign in (1, -1):
            target = tuple(sign * x for x in n[:d]) + (sign * n[d],)
            if not _derived(target, tight, equations, d):
                _refuse(f"the polytope is not proved to lie on the hyperplane {_text(n)}")


def _derived(target, inequalities, equations, d) -> bool:
    """Farkas: target = sum y_i ineq_i + sum z_j eq_j (y >= 0) on a, with right side at most target's b."""
    rows = list(inequalities) + list(equations)
    columns = rows + [tuple(-x for x in r) for r in equations] + [(0,) * d + (1,)]
    w = nonnegative_combination(columns, target)
    if w is None or min(w) < 0:
        return False
    z = [(wi, r) for wi, r in zip(w, rows)] + [(-wi, r) for wi, r in zip(w[len(rows):], equations)]
    return all(sum(wi * r[i] for wi, r in z) == target[i] for i in range(d)) and \
        sum(wi * r[d] for wi, r in z) <= target[d]


def check_empty(inequalities, equations, d) -> None:
    """Prove {x : rows} empty by Farkas multipliers: y >= 0, z with y A + z E = 0 and y b + z f = -1."""
    if not _derived((0,) * d + (-1,), inequalities, equations, d):
        _refuse("the polytope was found empty without a proof")


def check_unbounded(inequalities, equations, point, direction, whole_line: bool) -> None:
    """Prove the point lies in {x : rows} and the direction (a nonzero vector) is a recession direction."""
    d = len(point)
    ok = any(direction) and all(_dot(r[:d], point) <= r[d] for r in inequalities) and \
        all(_dot(r[:d], point) == r[d] and _dot(r[:d], direction) == 0 for r in equations) and \
        all(_dot(r[:d], direction) == 0 if whole_line else _dot(r[:d], direction) <= 0 for r in inequalities)
    if not ok:
        _refuse(f"the polytope was found unbounded in the direction {_text(direction)} without a proof")


def nonnegative_combination(columns, target):
    """Weights w >= 0 with sum_i w_i columns_i = target, or None (phase one of the simplex method, Bland's rule).

    Only a proposal: every caller verifies the weights exactly.

    >>> nonnegative_combination([(1, 0), (0, 1), (1, 1)], (2, 3))
    [Fraction(2, 1), Fraction(3, 1), Fraction(0, 1)]
    """
    m, n = len(target), len(columns)
    rows = []
    for r in range(m):
        s = -1 if target[r] < 0 else 1
        rows.append([Fraction(s * c[r]) for c in columns] + [Fraction(int(k == r)) for k in range(m)]
                    + [Fraction(s * target[r])])
    basis = [n + r for r in range(m)]
    cost = [-sum(row[j] for row in rows) for j in range(n)] + [Fraction(0)] * m + [-sum(row[-1] for row in rows)]
    while True:
        check_time()
        enter = next((j for j in range(n + m) if cost[j] < 0), None)
        if enter is None:
            break
        best = None
        for r, row in enumerate(rows):
            if row[enter] > 0:
                ratio = row[-1] / row[enter]
                if best is None or ratio < best[0] or (ratio == best[0] and basis[r] < basis[best[1]]):
                    best = (ratio, r)
        if best is None:
            return None
        r = best[1]
        pivot = rows[r][enter]
        rows[r] = [x / pivot for x in rows[r]]
        for i in range(m):
            if i != r and rows[i][enter]:
                f = rows[i][enter]
                rows[i] = [x - f * y for x, y in zip(rows[i], rows[r])]
        f = cost[enter]
        cost = [x - f * y for x, y in zip(cost, rows[r])]
        basis[r] = enter
    if cost[-1] != 0:
        return None
    w = [Fraction(0)] * n
    for r, b in enumerate(basis):
        if b < n:
            w[b] = rows[r][-1]
    return w
