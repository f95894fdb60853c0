"""Rational cones: Barvinok's signed decomposition and lattice-point counts by generating functions.

Definitions.  For integer vectors u_1, ..., u_e spanning R^e, the simplicial
cone cone(u) = {sum c_i u_i : c_i >= 0} has *index* |det(u_1, ..., u_e)|; it is
*unimodular* when the index is 1 (the u_i are a basis of Z^e).  The generating
function of a set S is f(S; x) = sum of x^m over the lattice points m of S.
For a unimodular cone with generators w_j and a rational apex p, the lattice
points of p + cone(w) are q + N w_1 + ... + N w_e with q = sum ceil(l_j) w_j,
p = sum l_j w_j, so f = x^q / prod (1 - x^(w_j)).

The method (Barvinok 1994, "A polynomial time algorithm for counting integral
points in polyhedra when the dimension is fixed"; the short-vector step as in
Dyer & Kannan 1997, by LLL):

1. Brion's theorem (Brion 1988): for a rational polytope Q, f(tQ) is the sum
   over the vertices v of f(t v + K_v), K_v the tangent cone at v, as rational
   functions.  A polyhedron that contains a line has f = 0.
2. The polar of K_v = {y : a . y <= 0, a tight at v} is cone(tight a).  It is
   triangulated (pulling from one generator, facets by `polyhedra.extreme_rays`)
   and every simplicial piece is decomposed, with signs, into unimodular cones:
   for cone(u) of index N > 1 an LLL-reduced basis of the lattice
   {c : sum c_i u_i in Z^e} proposes a short c, reduced to |c_i| <= 1/2
   (so every child has index <= N/2; with LLL usually far less, depth about
   log log N); w = sum c_i u_i, negated if no c_i > 0, and then
   [cone(u)] = sum_i sign(c_i) [cone(u with u_i replaced by w)] modulo
   lower-dimensional cones (walking from a point x along -w, every facet
   crossed is counted +1 leaving, -1 entering; the walk ends outside because
   -w is not in the cone).  Polarity is a valuation that turns
   lower-dimensional cones into cones with lines (Lawrence 1991, Varchenko
   1988), so they are dropped, and the polar of a unimodular cone is
   unimodular: w_j = -(column j of G^-1) for the rows G = (u_1; ...; u_e).
3. The count |tQ cap Z^e| = f(tQ; 1) is the constant term in s after
   x = exp(s l), for an integer l with l . w != 0 for every generator
   (checked exactly): 1/(1 - e^(b s)) = -td(b s)/(b s), td(z) = z/(e^z - 1) =
   sum B_k z^k / k!, so each cone gives eps (-1)^e / prod b_j times the
   coefficient of s^e in e^(a s) prod td(b_j s), a = l . q, b_j = l . w_j.

Every apex q depends on t through ceil(-t u_j . v), a quasi-linear function
valid for every integer t, so `ConeSum.count(t)` is the Ehrhart
quasi-polynomial of Q at any integer t (for t < 0: (-1)^e times the interior
count of |t| Q, by Ehrhart-Macdonald reciprocity, Macdonald 1971).

The triangle with vertices (0, 0), (1, 0), (0, 1) has binomial(t + 2, 2)
points (Ehrhart 1967); the square [0, 1/2]^2 has (floor(t/2) + 1)^2:

>>> triangle = ConeSum.of([((-1, 0), 0), ((0, -1), 0), ((1, 1), 1)],
...                       [(0, 0), (1, 0), (0, 1)])
>>> [triangle.count(t) for t in (0, 1, 2, 10**20)] == [1, 3, 6, (10**20 + 1) * (10**20 + 2) // 2]
True
>>> half = Fraction(1, 2)
>>> square = ConeSum.of([((-1, 0), 0), ((0, -1), 0), ((1, 0), half), ((0, 1), half)],
...                     [(0, 0), (half, 0), (0, half), (half, half)])
>>> [square.count(t) for t in range(5)], square.count(-3)     # L(-3) = interior of 3Q: 1 point
([1, 1, 4, 4, 9], 1)
"""
from __future__ import annotations

from fractions import Fraction
from math import comb, factorial, gcd, isqrt
from typing import Callable, Optional

from ..foundation.errors import CheckerBug
from ..foundation.limits import check_time
from .bernoulli import bernoulli
from .integer_lattices import lll_reduce
from .polyhedra import extreme_rays, rank
from ..foundation.numbers import value_text

__all__ = ["ConeSum", "TooCostly", "allowance", "triangulate", "unimodular_decomposition", "polar_unimodular",
           "decomposition_cost"]

Spend = Optional[Callable[[int], None]]


class TooCostly(Exception):
    """The decomposition spent more steps than the allowance it was given (a cheaper method may exist).

    Internal: whoever gives an allowance catches it, then runs another method or refuses with a
    BudgetExceeded; nothing half-built is kept (the cone caches are filled only after a whole
    decomposition)."""

    def __init__(self, spent: int, allowed: int):
        super().__init__(f"the cones spent {spent} steps, over their allowance of {allowed}")
        self.spent, self.allowed = spent, allowed


def allowance(steps: int, then: Spend = None) -> Callable[[int], None]:
    """A spend that raises TooCostly once more than `steps` have been spent (and passes each charge on to `then`).

    `spent()` on the returned function tells how many were spent so far."""
    used = [0]

    def spend(k: int) -> None:
        used[0] += k
        if used[0] > steps:
            raise TooCostly(used[0], steps)
        if then:
            then(k)
    spend.spent = lambda: used[0]
    return spend


def _cone_steps(gens) -> int:
    """The steps charged for one cone of the decomposition: e^2, times (1 + bits/32)^2 for its largest entry.

    LLL and the adjugate work on Fractions whose size grows with the entries: measured 0.5-1 ms a
    cone below 32 bits and 2.3-16 times that for entries of 32 to 128 bits (dimensions 3 and 4), so
    the charge follows the time and an allowance stops a decomposition of huge parts as promptly as
    one of small parts."""
    bits = max(abs(x) for g in gens for x in g).bit_length()
    return len(gens) ** 2 * ((bits + 32) ** 2 >> 10)


def _dot(u, v):
    return sum(a * b for a, b in zip(u, v))


def _primitive(v) -> tuple:
    g = gcd(*v)
    return tuple(x // g for x in v) if g > 1 else tuple(v)


def _inverse(rows):
    """(det, adjugate) of a square integer matrix given by rows: adj = det * rows^-1, integers.

    Fraction-free Gauss-Jordan elimination (Bareiss 1968) on [G | I]: every division is exact and
    the result is checked, G adj = det I, before use.
    """
    n = len(rows)
    A = [list(map(int, r)) + [int(i == j) for j in range(n)] for i, r in enumerate(rows)]
    prev, sign = 1, 1
    for c in range(n):
        p = next((r for r in range(c, n) if A[r][c] != 0), None)
        if p is None:
            return 0, None
        if p != c:
            A[c], A[p] = A[p], A[c]
            sign = -sign
        pivot, pr = A[c][c], A[c]
        for r in range(n):
            if r != c:
                f, row = A[r][c], A[r]
                A[r] = [(pivot * x - f * y) // prev for x, y in zip(row, pr)]
        prev = pivot
    det = sign * prev
    adj = [[sign * x for x in row[n:]] for row in A]
    for i in range(n):
        for j in range(n):
            if sum(rows[i][k] * adj[k][j] for k in range(n)) != (det if i == j else 0):
                raise CheckerBug.found("the adjugate of an integer matrix is wrong")
    return det, adj


# -- 1. triangulation of a pointed cone -------------------------------------------------------

def triangulate(gens, n: int, spend: Spend = None, _normals=()) -> list[tuple]:
    """Simplicial cones (tuples of generators) whose union is cone(gens), overlapping in lower dimension.

    gens: integer vectors in R^n spanning a pointed cone of full dimension in the subspace
    orthogonal to `_normals`.  Pulling triangulation: cone(gens) is the union of cone(g0, F)
    over the facets F that do not contain g0 = gens[0].
    """
    gens = sorted({_primitive(g) for g in gens if any(g)})
    k = n - len(_normals)
    if len(gens) == k:
        if rank(gens, n) != k:
            raise CheckerBug.found("the generators of a cone do not span it")
        return [tuple(gens)]
    if len(gens) < k:
        raise CheckerBug.found("a cone has fewer generators than its dimension")
    check_time()
    g0 = gens[0]
    rows = list(gens) + [r for s in _normals for r in (s, tuple(-x for x in s))]
    out = []
    for s in extreme_rays(rows, n, spend):
        if _dot(g0, s) == 0:
            continue
        facet = [g for g in gens if _dot(g, s) == 0]
        for simplex in triangulate(facet, n, spend, _normals + (s,)):
            out.append((g0,) + simplex)
    return out


# -- 2. Barvinok's signed decomposition --------------------------------------------------------

def _short_vector(gens, det, adj):
    """w = sum c_i u_i in Z^e, c_i in [-1/2, 1/2], c != 0, short by LLL: (w primitive, signs of c)."""
    n = abs(det)
    # {c : c G in Z^e} (G the rows u_i) is spanned by the rows of G^-1; times n: rows of +-adj(G)
    sign = 1 if det > 0 else -1
    basis = [tuple(sign * x for x in row) for row in adj]
    best = None
    for v in lll_reduce(basis):
        red = [((x + n // 2) % n) - n // 2 for x in v]     # c - round(c), times n: in [-n/2, n/2)
        if not any(red):
            continue
        key = max(abs(x) for x in red)
        if best is None or key < best[0]:
            best = (key, red)
    if best is None:
        raise CheckerBug.found("a cone of index > 1 has no fractional lattice vector")
    red = best[1]
    if not any(x > 0 for x in red):
        red = [-x for x in red]
    w = [sum(red[i] * gens[i][k] for i in range(len(gens))) for k in range(len(gens))]
    if any(x % n for x in w):
        raise CheckerBug.found("the short vector is not a lattice vector")
    w = _primitive(tuple(x // n for x in w))
    return w, red


def unimodular_decomposition(gens, spend: Spend = None, sign: int = 1):
    """Signed unimodular cones (sign, generators) with [cone(gens)] = sum sign [cone] mod lower dimension.

    gens: e linearly independent integer vectors in R^e.
    """
    out = []
    stack = [(sign, tuple(tuple(g) for g in gens))]
    while stack:
        check_time()
        eps, g = stack.pop()
        det, adj = _inverse(g)
        if det == 0:
            raise CheckerBug.found("a simplicial cone with dependent generators")
        if spend:
            spend(_cone_steps(g))
        if abs(det) == 1:
            out.append((eps, g))
            continue
        w, c = _short_vector(g, det, adj)
        for i, ci in enumerate(c):
            if ci:
                stack.append((eps if ci > 0 else -eps, g[:i] + (w,) + g[i + 1:]))
    return out


def polar_unimodular(gens):
    """Generators w_j of the polar {x : u_i . x <= 0} of a unimodular cone(u): u_i . w_j = -delta_ij."""
    det, adj = _inverse(gens)
    if abs(det) != 1:
        raise CheckerBug.found("the polar of a cone that is not unimodular")
    e = len(gens)
    w = [tuple(-det * adj[k][j] for k in range(e)) for j in range(e)]     # -(column j of G^-1)
    for i in range(e):
        for j in range(e):
            if _dot(gens[i], w[j]) != -(i == j):
                raise CheckerBug.found("the polar generators are wrong")
    return w


# -- 3. and 4. the sum of generating functions at one dilate -----------------------------------

def _todd_product(bs, top):
    """Coefficients 0..top of prod_j td(b_j s), td(z) = z / (e^z - 1) = sum B_k z^k / k!."""
    td = [bernoulli(k) / factorial(k) for k in range(top + 1)]
    poly = [Fraction(1)] + [Fraction(0)] * top
    for b in bs:
        factor = [td[k] * b ** k for k in range(top + 1)]
        poly = [sum(poly[i] * factor[m - i] for i in range(m + 1)) for m in range(top + 1)]
    return poly


def _direction(generators, e, m=1):
    """(l, m): an integer l = (1, m, m^2, ...) with l . w != 0 for every generator w, m the first such."""
    gens = set(generators)
    while True:
        check_time()
        ell = tuple(m ** k for k in range(e))
        if all(_dot(ell, w) != 0 for w in gens):
            return ell, m
        m += 1


def _terms(cones, ell, e):
    """For each cone: (u_j . v, b_j = l . w_j, the coefficients c_k of its constant term as a polynomial in a)."""
    terms = []
    for eps, v, u, ws in cones:
        check_time()
        bs = [_dot(ell, w) for w in ws]
        todd = _todd_product(bs, e)
        scale = Fraction(eps * (-1) ** e)
        for b in bs:
            scale /= b
        coeffs = [scale * todd[e - k] / factorial(k) for k in range(e + 1)]
        terms.append((tuple(_dot(uj, v) for uj in u), tuple(bs), tuple(coeffs)))
    return terms


def decomposition_cost(rows, vertices) -> int:
    """An estimate of the steps `ConeSum.of` spends (for choosing a method; the real work is metered).

    Per vertex: the simplices of its dual cone (at most C(k, e) for k tight rows), each
    with about (1 + log2 N)^(e-1) unimodular cones for an index N below the Hadamard bound,
    e^2 steps per cone.  Calibrated on knapsack simplices with random parts near 10^3 .. 10^18
    in dimensions 2 to 4: the decomposition spent 0.2 to 2.1 times this (the exponent e/2 used
    before fell 16 times short for parts near 10^9 in dimension 4).
    """
    total = 0
    for v in vertices:
        tight = [a for a, c in rows if _dot(a, v) == c]
        e = len(v)
        if e == 0:
            continue
        norms = sorted((sum(x * x for x in a) for a in tight), reverse=True)[:e]
        hadamard_sq = 1
        for x in norms:
            hadamard_sq *= x
        bits = 1 + hadamard_sq.bit_length() // 2
        total += comb(len(tight), e) * e ** 2 * bits ** (e - 1)
    return total + 1


class ConeSum:
    """The signed unimodular cones of a full-dimensional rational polytope Q in R^e, ready to count tQ.

    The constant term is taken for two directions l; a complete decomposition gives a Laurent
    polynomial, whose value at 1 does not depend on l, so every count compares the two (a missing
    or wrong cone shows as a disagreement or a non-integer, and raises instead of counting).
    """

    def __init__(self, e, sums, size):
        self.dimension = e
        self.sums = sums                # [(l, terms)] for two directions
        self.size = size

    @classmethod
    def of(cls, rows, vertices, spend: Spend = None) -> "ConeSum":
        """rows (a, c): Q = {y : a . y <= c}, a integer; vertices: all vertices of Q (exact)."""
        vertices = [tuple(Fraction(x) for x in v) for v in vertices]
        e = len(vertices[0])
        if e == 0:
            return cls(0, [], 0)
        cones = []          # (sign, vertex, dual generators u, primal generators w)
        for v in vertices:
            tight = [tuple(a) for a, c in rows if _dot(a, v) == c]
            if rank(tight, e) != e:
                raise CheckerBug.found("a vertex whose tight rows do not have full rank")
            for simplex in triangulate(tight, e, spend):
                for eps, u in unimodular_decomposition(simplex, spend):
                    cones.append((eps, v, u, polar_unimodular(u)))
        generators = [w for _, _, _, ws in cones for w in ws]
        first, m = _direction(generators, e)
        second, _ = _direction(generators, e, m + 1)
        if spend:
            spend(2 * len(cones) * e ** 2)
        made = cls(e, [(first, _terms(cones, first, e)), (second, _terms(cones, second, e))], len(cones))
        if made.count(0) != 1:            # 0 Q = {0}: a cheap check of the whole decomposition
            raise CheckerBug.found("the cone sum does not count the one point of 0 Q")
        return made

    def __len__(self):
        return self.size

    @staticmethod
    def _value(terms, t: int) -> Fraction:
        total = Fraction(0)
        for i, (fs, bs, coeffs) in enumerate(terms):
            if i % 256 == 0:
                check_time()
            a = 0
            for f, b in zip(fs, bs):
                x = -t * f
                a += -((-x.numerator) // x.denominator) * b      # ceil(-t f) b
            value = Fraction(0)
            for c in reversed(coeffs):
                value = value * a + c
            total += value
        return total

    def count(self, t: int, spend: Spend = None) -> int:
        """The Ehrhart quasi-polynomial of Q at the integer t (|tQ cap Z^e| for t >= 0)."""
        if self.dimension == 0:
            return 1
        if spend:
            spend(2 * self.size * self.dimension)
        values = [self._value(terms, t) for _, terms in self.sums]
        if values[0] != values[1] or values[0].denominator != 1:
            raise CheckerBug.found(f"the cone sum at t = {value_text(t)} is not one integer: {value_text(values)}")
        return int(values[0])
