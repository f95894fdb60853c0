"""Integer lattices: Hermite normal form, integer kernels and LLL reduction.

A square integer matrix U is *unimodular* when det U = +-1; then x -> U x maps
Z^d onto Z^d.  For an integer m x d matrix C of rank m there is a unimodular U
with C U = [H | 0], H lower triangular and nonsingular (the column-style
Hermite normal form; Hermite 1851, Cohen, *A Course in Computational Algebraic
Number Theory*, 2.4.2).  The last d - m columns of U are then a basis of the
lattice {x in Z^d : C x = 0}, and C x = c has an integer solution exactly when
H^(-1) c is an integer vector.

Every operation below is an integer column operation (adding an integer
multiple of one column to another, swapping, negating), so unimodularity holds
by construction, whatever the input; LLL (Lenstra, Lenstra & Lovasz 1982) only
chooses which such operations to make, to get short, nearly orthogonal basis
vectors that make enumeration boxes tight.

>>> C = [[1, 1, 1]]
>>> H, U = hermite_columns(C)
>>> H, [[sum(C[0][k] * U[k][j] for k in range(3)) for j in range(3)]]
([[1]], [[1, 0, 0]])
>>> kernel_basis([[1, 1, 1]])       # the plane x + y + z = 0
[(-1, 1, 0), (0, -1, 1)]
"""
from __future__ import annotations

from fractions import Fraction

__all__ = ["hermite_columns", "kernel_basis", "lll_reduce", "determinant", "extended_gcd"]


def extended_gcd(a: int, b: int):
    """(g, u, v) with a u + b v = g = gcd(a, b) >= 0."""
    old_r, r, old_s, s, old_t, t = a, b, 1, 0, 0, 1
    while r:
        q = old_r // r
        old_r, r = r, old_r - q * r
        old_s, s = s, old_s - q * s
        old_t, t = t, old_t - q * t
    if old_r < 0:
        old_r, old_s, old_t = -old_r, -old_s, -old_t
    return old_r, old_s, old_t


def hermite_columns(C):
    """(H, U): U unimodular d x d, C U = [H | 0] with H m x m lower triangular, C of full row rank m.

    Raises ValueError when the rows of C are linearly dependent.
    """
    m, d = len(C), (len(C[0]) if C else 0)
    work = [list(map(int, row)) for row in C]
    U = [[int(i == j) for j in range(d)] for i in range(d)]

    def column_op(j, k, a, b, c, e):
        """(col j, col k) <- (a col j + b col k, c col j + e col k), with a e - b c = +-1."""
        for M in (work, U):
            for row in M:
                x, y = row[j], row[k]
                row[j], row[k] = a * x + b * y, c * x + e * y

    for i in range(m):
        for k in range(i + 1, d):
            x, y = work[i][i], work[i][k]
            if y == 0:
                continue
            g, u, v = extended_gcd(x, y)
            # [x y] [[u, -y/g], [v, x/g]] = [g 0]; determinant u x/g + v y/g = 1
            column_op(i, k, u, v, -y // g, x // g)
        if work[i][i] == 0:
            raise ValueError("the rows are linearly dependent")
        if work[i][i] < 0:
            _negate_column(work, U, i)
    H = [row[:m] for row in work]
    return H, U


def _negate_column(work, U, j):
    for M in (work, U):
        for row in M:
            row[j] = -row[j]


def kernel_basis(C):
    """A basis (as tuples) of the lattice {x in Z^d : C x = 0}, C an integer matrix of full row rank."""
    m = len(C)
    d = len(C[0])
    _, U = hermite_columns(C)
    return [tuple(U[i][j] for i in range(d)) for j in range(m, d)]


def determinant(M) -> Fraction:
    """Exact determinant by Gaussian elimination over the rationals."""
    A = [[Fraction(x) for x in row] for row in M]
    n = len(A)
    det = Fraction(1)
    for c in range(n):
        p = next((r for r in range(c, n) if A[r][c] != 0), None)
        if p is None:
            return Fraction(0)
        if p != c:
            A[c], A[p] = A[p], A[c]
            det = -det
        det *= A[c][c]
        for r in range(c + 1, n):
            if A[r][c]:
                f = A[r][c] / A[c][c]
                A[r] = [x - f * y for x, y in zip(A[r], A[c])]
    return det


def _dot(u, v):
    return sum(a * b for a, b in zip(u, v))


def lll_reduce(basis, delta=Fraction(3, 4)):
    """An LLL-reduced basis of the lattice spanned by the (independent) integer vectors `basis`.

    Only integer steps b_k -= q b_j and swaps are made, so the result spans the same lattice.

    >>> lll_reduce([(1, 1, 1), (-1, 0, 2), (3, 5, 6)])
    [(0, 1, 0), (1, 0, 1), (-1, 0, 2)]
    """
    b = [list(v) for v in basis]
    n = len(b)
    if n <= 1:
        return [tuple(v) for v in b]

    def gram_schmidt():
        star, mu = [], [[Fraction(0)] * n for _ in range(n)]
        norms = []
        for i in range(n):
            v = [Fraction(x) for x in b[i]]
            for j in range(i):
                mu[i][j] = _dot(b[i], star[j]) / norms[j]
                v = [x - mu[i][j] * y for x, y in zip(v, star[j])]
            star.append(v)
            norms.append(_dot(v, v))
        return mu, norms

    mu, norms = gram_schmidt()
    k = 1
    steps = 0
    while k < n and steps < 10_000:
        steps += 1
        for j in range(k - 1, -1, -1):
            q = round(mu[k][j])
            if q:
                b[k] = [x - q * y for x, y in zip(b[k], b[j])]
                # b_k -= q b_j changes only row k of mu (b_j's own row has mu[j][j] = 1)
                row, rj = mu[k], mu[j]
                for i in range(j):
                    row[i] -= q * rj[i]
                row[j] -= q
        m = mu[k][k - 1]
        if norms[k] >= (delta - m ** 2) * norms[k - 1]:
            k += 1
        else:
            # swapping b_k and b_(k-1) changes rows k-1, k and columns k-1, k only (the usual update
            # formulas, exact in Fractions; Cohen, *A Course in Computational Algebraic Number Theory*, 2.6.3)
            b[k], b[k - 1] = b[k - 1], b[k]
            new = norms[k] + m * m * norms[k - 1]
            mu[k][k - 1] = m * norms[k - 1] / new
            norms[k] = norms[k - 1] * norms[k] / new
            norms[k - 1] = new
            for j in range(k - 1):
                mu[k][j], mu[k - 1][j] = mu[k - 1][j], mu[k][j]
            for i in range(k + 1, n):
                t = mu[i][k]
                mu[i][k] = mu[i][k - 1] - m * t
                mu[i][k - 1] = t + mu[k][k - 1] * mu[i][k]
            k = max(k - 1, 1)
    return [tuple(v) for v in b]
