"""The functions a certificate may call, under their names in the language.

Each name below is also a plain Python callable on ints and Fractions that
returns a Fraction, so programs can use the kernel without writing text:

>>> from checker import functions
>>> functions.dedekind(5, 17), functions.frobenius([6, 9, 20])
(Fraction(1, 17), Fraction(43, 1))

``REGISTRY`` maps each name to a ``FunctionSpec``: its arity, a one-line
definition, whether the normaliser treats it as plain arithmetic (evaluated
on sight) or as an atom that rules act upon, and a cost estimate that is
checked against the budget before any work is done.
"""
from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from math import gcd as math_gcd
from typing import Callable, Optional

from ..mathematics.bernoulli import bernoulli, bernoulli_polynomial, periodic_bernoulli
from ..mathematics.dedekind import dedekind, dedekind_rademacher, generalized_dedekind
from ..mathematics.elementary import binomial, ceil, floor, frac, gcd, lcm, mod, round_half_up, sawtooth
from ..foundation.errors import CertificateError, DomainError
from ..mathematics.floor_sums import staircase as _floor_sum
from ..mathematics.fourier_dedekind import fourier_dedekind as _fourier_dedekind_direct
from ..mathematics.fourier_dedekind_reciprocity import by_reciprocity, polynomial_part_cost, reciprocity_cost
from ..mathematics.residues import jacobi as _jacobi, reciprocal_mod as _reciprocal_mod
from ..mathematics.frobenius import frobenius, nonrepresentable_count as nonrepresentable
from ..foundation.limits import Limits
from ..foundation.numbers import rough_int, value_text
from ..mathematics.periodic import constituents, periodic
from ..mathematics.ehrhart import budget as _budget, hstar as _hstar
from ..mathematics.elementary import as_integer as _as_integer
from ..mathematics.polytopes import (interior_lattice_points, lattice_points, lattice_points_inequalities,
                                     polytope_of_inequalities, polytope_of_vertices)
from ..mathematics.partitions import (partitions, partitions_extended, polynomial_part as _polynomial_part,
                                     partitions_cost, check_parts)

__all__ = [
    "REGISTRY", "FunctionSpec", "FORMER_NAMES", "LITERATURE_NAMES",
    "sawtooth", "floor", "ceil", "frac", "mod", "gcd", "lcm", "binomial", "round", "jacobi", "reciprocal_mod",
    "bernoulli", "bernoulli_polynomial", "periodic_bernoulli",
    "dedekind", "dedekind_rademacher", "generalized_dedekind", "fourier_dedekind",
    "partitions", "partitions_extended", "partitions_polynomial_part",
    "frobenius", "nonrepresentable", "staircase", "periodic", "constituents",
    "lattice_points", "lattice_points_in", "interior_lattice_points", "hstar", "hstar_in",
]


#: function names of earlier versions -> the name now (same arguments)
FORMER_NAMES = {"floor_sum": "staircase"}

#: short names of the literature -> (how it is written there, the call here)
LITERATURE_NAMES = {
    "s": ("s(h, k)", "dedekind(h, k)"),
    "S": ("s(h, k)", "dedekind(h, k)"),
    "s_p": ("s_p(h, k)", "generalized_dedekind(p, h, k)"),
    "sp": ("s_p(h, k)", "generalized_dedekind(p, h, k)"),
    "s_n": ("s_n(a_1, ..., a_m; b)", "fourier_dedekind(n, [a_1, ..., a_m], b)"),
    "p": ("p_A(n)", "partitions(n, A)"),
    "p_A": ("p_A(n)", "partitions(n, A)"),
    "P_A": ("P_A(n)", "partitions_extended(n, A)"),
    "B": ("B_n", "bernoulli(n)"),
    "B_n": ("B_n", "bernoulli(n)"),
    "g": ("g(A)", "frobenius(A)"),
    "L": ("L_P(t)", "lattice_points(t, P)"),
    "L_P": ("L_P(t)", "lattice_points(t, P)"),
    "binom": ("C(n, j)", "binomial(n, j)"),
    "C": ("C(n, j)", "binomial(n, j)"),
}


def lattice_points_in(t, rows, equations=(), limits=None) -> Fraction:
    """#(tP intersected with Z^d) for P = {x : a.x <= b, a'.x = b'} given as rows [a1, ..., ad, b].

    The empty P has 0 points in every dilate (t = 0 too); an unbounded P is refused.
    """
    return lattice_points_inequalities(t, rows, equations, limits)


def _hstar_coefficient(j, poly, limits) -> Fraction:
    j = _as_integer(j, "the index of an h*-coefficient")
    if j < 0:
        raise DomainError(f"the index of an h*-coefficient must be >= 0, not {value_text(j)}")
    coefficients = _hstar(poly, _budget(limits, "the Ehrhart quasi-polynomial behind h*"))
    return Fraction(coefficients[j] if j < len(coefficients) else 0)


def hstar(j, points, limits=None) -> Fraction:
    """h*_j of the convex hull P of rational points: sum_t L_P(t) z^t = h*(z)/(1 - z^D)^(dim P + 1)."""
    return _hstar_coefficient(j, polytope_of_vertices(points, limits, "hstar"), limits)


def hstar_in(j, rows, equations=(), limits=None) -> Fraction:
    """h*_j of P = {x : a.x <= b, a'.x = b'}, as `hstar`."""
    return _hstar_coefficient(j, polytope_of_inequalities(rows, equations, limits, "hstar_in"), limits)


def round(x) -> Fraction:      # noqa: A001 - the language's name; Python's round is not used here
    """The integer nearest to x, halves rounded up: floor(x + 1/2)."""
    return round_half_up(x)


def jacobi(a, n) -> Fraction:
    """The Jacobi symbol (a/n) for odd n >= 1, as a Fraction."""
    return Fraction(_jacobi(a, n))


def reciprocal_mod(a, m) -> Fraction:
    """The a' in [0, m) with a a' = 1 (mod m), as a Fraction."""
    return Fraction(_reciprocal_mod(a, m))


def _fourier_cheaper_by_reciprocity(n, parts, b):
    """The parts and b when reciprocity is cheaper than the direct table, else None."""
    if not (isinstance(parts, (list, tuple)) and len(parts) >= 3 and isinstance(b, Fraction)
            and b.denominator == 1 and b > 1 and isinstance(n, Fraction) and n.denominator == 1
            and all(isinstance(a, Fraction) and a.denominator == 1 for a in parts)):
        return None
    ints = [a.numerator for a in parts]
    if any(math_gcd(a, b.numerator) != 1 for a in ints):
        return None
    cost = reciprocity_cost(ints, b.numerator)
    if cost is None or cost >= len(ints) * b.numerator:
        return None
    return ints, b.numerator


def fourier_dedekind(n, parts, b) -> Fraction:
    """s_n(a_1, ..., a_m; b): directly, or by the reciprocity law when the a_i mod b are
    small and pairwise coprime and b is large (see fourier_dedekind_reciprocity)."""
    args = tuple(Fraction(x) if isinstance(x, int) else x for x in (n, b))
    parts_f = tuple(Fraction(a) if isinstance(a, int) else a for a in parts) \
        if isinstance(parts, (list, tuple)) else parts
    fast = _fourier_cheaper_by_reciprocity(args[0], parts_f, args[1])
    if fast is None:
        return _fourier_dedekind_direct(n, parts, b)
    return by_reciprocity(args[0].numerator, *fast)


def staircase(count, a, b, m) -> Fraction:
    """sum_{i=0}^{count-1} floor((a i + b)/m), for count >= 0 and m >= 1."""
    from ..mathematics.elementary import as_integer, as_positive
    count = as_integer(count, "the first argument of staircase")
    if count < 0:
        raise DomainError(f"the number of terms of staircase must be >= 0, not {value_text(count)}")
    return Fraction(_floor_sum(count, as_integer(a, "the second argument of staircase"),
                               as_integer(b, "the third argument of staircase"),
                               as_positive(m, "the fourth argument of staircase")))


def partitions_polynomial_part(n, parts) -> Fraction:
    """The polynomial part of P_A, evaluated at n."""
    from ..mathematics.elementary import as_integer
    n = as_integer(n, "the first argument of partitions_polynomial_part")
    total = Fraction(0)
    for c in reversed(_polynomial_part(parts)):
        total = total * n + c
    return total


Cost = Optional[tuple]   # (limit name, amount needed, what it is for)


@dataclass(frozen=True)
class FunctionSpec:
    name: str
    signature: str
    definition: str
    impl: Callable
    arity: tuple
    arithmetic: bool = False               # normal forms evaluate it on sight
    cost: Callable[..., Cost] = lambda *args: None
    limited: bool = False                  # impl takes limits=... and spends within them itself
    takes_ints: bool = False               # impl gives the same value and errors on ints as on the
                                           # Fractions of the same integers (no cost, not limited)

    def check_arity(self, count: int) -> None:
        low, high = self.arity
        if not low <= count <= high:
            want = str(low) if low == high else f"{low} to {high}"
            raise DomainError(f"{self.name} takes {want} argument{'s' if high != 1 else ''} "
                              f"({self.signature}), not {count}")

    def call(self, args, limits: Limits):
        low, high = self.arity
        if not low <= len(args) <= high:
            self.check_arity(len(args))
        try:
            need = self.cost(*args)
        except CertificateError:
            need = None      # a malformed argument: impl says what is wrong with it
        if need:
            limit, amount, what = need
            limits.require(limit, amount, what)
        if self.limited:
            return self.impl(*args, limits=limits)
        return self.impl(*args)


def _int_or_zero(x) -> int:
    if isinstance(x, Fraction) and x.denominator == 1:
        return abs(x.numerator)
    return 0


def _list_len(x) -> int:
    return len(x) if isinstance(x, (list, tuple)) else 0


def _cost_bernoulli(n, x=None):
    if x is None and isinstance(n, Fraction) and n.denominator == 1 and n > 1 and n.numerator % 2:
        return None      # B_n = 0 for odd n > 1: no work at any size
    return ("bernoulli_index", _int_or_zero(n), f"a Bernoulli number of index {value_text(_int_or_zero(n))}")


def _cost_linear(k, what):
    return ("terms", _int_or_zero(k), what)


def _cost_generalized(p, h, k):
    p, k = _int_or_zero(p), _int_or_zero(k)
    if p > 4000:
        return ("bernoulli_index", p, f"a generalized Dedekind sum of order {value_text(p)}")
    if p % 2 == 1 and k >= 1 and math_gcd(_int_or_zero(h), k) == 1:
        # Apostol's reciprocity along Euclid's chain: O(log k) steps of O(p) products
        return ("terms", p * p * max(1, k.bit_length()), f"Apostol's reciprocity at order {value_text(p)}")
    return ("terms", k * max(p, 1), f"summing {value_text(k)} terms of order {value_text(p)}")


def _cost_fourier(n, parts, b):
    m, bb = _list_len(parts), _int_or_zero(b)
    if m <= 2:
        # floor sums on numbers of this size: about bits^2 word steps
        return ("terms", bb.bit_length() ** 2 // 100, f"a Fourier-Dedekind sum modulo a {bb.bit_length()}-bit b")
    fast = _fourier_cheaper_by_reciprocity(n, parts, b)
    if fast is not None:
        ints, modulus = fast
        return ("terms", reciprocity_cost(ints, modulus),
                f"a Fourier-Dedekind sum by reciprocity: {m} sums modulo the entries (up to "
                f"{rough_int(max(a % modulus for a in ints))}) and a polynomial part")
    return ("terms", bb * m, f"a Fourier-Dedekind sum with {m} parameters modulo {rough_int(bb)}")


def _cost_partitions(n, parts):
    try:
        parts = check_parts(parts, allow_empty=True)
        n = _as_integer(n)
    except CertificateError:
        return None
    terms, what = partitions_cost(n, parts)
    return ("terms", terms, f"{what} (n = {rough_int(n)}, parts up to {rough_int(max(parts, default=0))})")


def _cost_polynomial_part(n, parts):
    try:
        parts = check_parts(parts)
    except CertificateError:
        return None
    bits = max(a.bit_length() for a in parts)
    return ("terms", polynomial_part_cost(len(parts), bits), f"the polynomial part of P_A for {len(parts)} parts")


def _cost_extended(n, parts):
    try:
        parts = check_parts(parts)
        n = _as_integer(n)
    except CertificateError:
        return None
    # below -sum(A) the value is p_A at -n - sum(A), by reciprocity (partitions_extended)
    return _cost_partitions(Fraction(-n - sum(parts) if n <= -sum(parts) else n), parts)


def _cost_frobenius(parts):
    try:
        parts = check_parts(parts, "frobenius")
    except CertificateError:
        return None
    if len(set(parts)) <= 3:
        # Sylvester, or Johnson's reduction and Rodseth's expansion: O(log) steps on these sizes
        return ("integer_bits", 4 * max(parts).bit_length(), "Rodseth's formula for three generators")
    return _cost_residue_table(parts)


def _cost_residue_table(parts):
    try:
        parts = check_parts(parts, "nonrepresentable")
    except CertificateError:
        return None
    return ("terms", min(parts) * len(parts), f"the residue table modulo {rough_int(min(parts))}")


def _cost_binomial(n, j):
    jj = _int_or_zero(j)
    bits = max(1, _int_or_zero(n).bit_length()) if isinstance(n, Fraction) else 1
    if isinstance(n, Fraction) and n.denominator != 1:
        bits = n.numerator.bit_length() + n.denominator.bit_length()
    return ("integer_bits", jj * bits, f"binomial with lower index {value_text(jj)}")


def _cost_floor_sum(count, a, b, m):
    bits = max(_int_or_zero(x).bit_length() for x in (count, a, b, m))
    return ("terms", bits ** 2 // 100, f"a floor sum of {bits}-bit numbers")


def _cost_lcm(*args):
    bits = sum(_int_or_zero(x).bit_length() for a in args for x in (a if isinstance(a, tuple) else (a,)))
    return ("integer_bits", bits, "the least common multiple")


def _spec(name, signature, definition, impl, arity, arithmetic=False, cost=None, limited=False,
          takes_ints=False):
    if takes_ints and (cost is not None or limited):
        raise ValueError(f"{name}: the int path skips cost and limits, so it is for functions without them")
    return FunctionSpec(name, signature, definition, impl, arity, arithmetic,
                        cost or (lambda *args: None), limited, takes_ints)


REGISTRY: dict[str, FunctionSpec] = {s.name: s for s in [
    _spec("floor", "x", "the largest integer <= x", floor, (1, 1), True),
    _spec("ceil", "x", "the smallest integer >= x", ceil, (1, 1), True),
    _spec("frac", "x", "x - floor(x)", frac, (1, 1), True),
    _spec("round", "x", "the integer nearest to x, halves rounded up: floor(x + 1/2)", round,
          (1, 1), True),
    _spec("mod", "a, m", "the residue of a modulo m in [0, |m|)", mod, (2, 2), True),
    _spec("gcd", "a, b, ...", "greatest common divisor", gcd, (1, 1000), True),
    _spec("lcm", "a, b, ...", "least common multiple", lcm, (1, 1000), True, _cost_lcm),
    _spec("binomial", "n, j", "n choose j", binomial, (2, 2), True, _cost_binomial),
    _spec("jacobi", "a, n", "the Jacobi symbol (a/n), n odd and >= 1", jacobi, (2, 2), True,
          lambda a, n: ("integer_bits", _int_or_zero(n).bit_length(), "a Jacobi symbol")),
    _spec("reciprocal_mod", "a, m", "the a' in [0, m) with a a' = 1 (mod m), gcd(a, m) = 1",
          reciprocal_mod, (2, 2), True),
    _spec("staircase", "count, a, b, m", "sum_{i=0}^{count-1} floor((a i + b)/m)", staircase,
          (4, 4), True, _cost_floor_sum),
    _spec("sawtooth", "x", "((x)) = x - floor(x) - 1/2, and 0 at integers", sawtooth, (1, 1)),
    _spec("bernoulli", "n [, x]", "the Bernoulli number B_n (B_1 = -1/2), or the polynomial B_n(x)",
          bernoulli, (1, 2), False, _cost_bernoulli),
    _spec("periodic_bernoulli", "n, x", "B_n({x}); for n = 1 the sawtooth ((x))",
          periodic_bernoulli, (2, 2), False, _cost_bernoulli),
    _spec("dedekind", "h, k", "s(h, k) = sum_{j=0}^{k-1} ((j/k)) ((hj/k))", dedekind, (2, 2),
          takes_ints=True),    # as_integer/as_positive: the same on 5 and Fraction(5)
    _spec("dedekind_rademacher", "h, k, x, y",
          "s(h, k; x, y) = sum_{j mod k} ((h(j+y)/k + x)) (((j+y)/k))",
          dedekind_rademacher, (4, 4), False,
          lambda h, k, x, y: _cost_linear(k, f"a Dedekind-Rademacher sum of {rough_int(_int_or_zero(k))} terms")),
    _spec("generalized_dedekind", "p, h, k", "s_p(h, k) = sum_{j mod k} (j/k) Bbar_p(hj/k)",
          generalized_dedekind, (3, 3), False, _cost_generalized),
    _spec("fourier_dedekind", "n, [a1, ..., am], b",
          "(1/b) sum_{j=1}^{b-1} xi^(jn) / prod_i (1 - xi^(j a_i)), xi = exp(2 pi i/b)",
          fourier_dedekind, (3, 3), False, _cost_fourier),
    _spec("partitions", "n, [a1, ..., ad]",
          "p_A(n): the number of ways to write n as a sum of parts from A (0 for n < 0)",
          partitions, (2, 2), False, _cost_partitions, limited=True),
    _spec("partitions_extended", "n, [a1, ..., ad]",
          "P_A(n): the quasi-polynomial equal to p_A(n) for n > -(a1 + ... + ad)",
          partitions_extended, (2, 2), False, _cost_extended, limited=True),
    _spec("partitions_polynomial_part", "n, [a1, ..., ad]",
          "the polynomial part of P_A at n", partitions_polynomial_part, (2, 2), False,
          _cost_polynomial_part),
    _spec("frobenius", "[a1, ..., ad]", "the largest integer not a non-negative combination of A",
          frobenius, (1, 1), False, _cost_frobenius),
    _spec("nonrepresentable", "[a1, ..., ad]", "how many positive integers are not combinations of A",
          nonrepresentable, (1, 1), False, _cost_residue_table),
    _spec("periodic", "n, [c0, ..., c(L-1)]", "c_(n mod L)", periodic, (2, 2), True),
    _spec("constituents", "n, [[c00, c01, ...], ...]",
          "sum_j c_(r,j) n^j for r = n mod L: a quasi-polynomial by its constituents",
          constituents, (2, 2), True),
    _spec("lattice_points", "t, [[x1, ..., xd], ...]",
          "lattice points in t times the convex hull of rational points (any dimension d)",
          lattice_points, (2, 2), limited=True),
    _spec("interior_lattice_points", "t, [[x1, ..., xd], ...]",
          "lattice points in the interior (in R^d) of t times the convex hull of rational points",
          interior_lattice_points, (2, 2), limited=True),
    _spec("lattice_points_in", "t, [[a1, ..., ad, b], ...] [, [[e1, ..., ed, f], ...]]",
          "lattice points in t P for P = {x : a.x <= b, e.x = f} (bounded; 0 when P is empty)",
          lattice_points_in, (2, 3), limited=True),
    _spec("hstar", "j, [[x1, ..., xd], ...]",
          "h*_j of the convex hull P: sum_t L_P(t) z^t = h*(z)/(1 - z^D)^(dim P + 1)",
          hstar, (2, 2), limited=True),
    _spec("hstar_in", "j, [[a1, ..., ad, b], ...] [, [[e1, ..., ed, f], ...]]",
          "h*_j of P = {x : a.x <= b, e.x = f}, as hstar",
          hstar_in, (2, 3), limited=True),
]}
