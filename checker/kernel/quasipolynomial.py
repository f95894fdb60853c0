"""Deciding identities between quasi-polynomials in one integer variable.

A function f on the integers is a quasi-polynomial of degree <= D and period
dividing L from the threshold T on when, for each residue r mod L, f agrees
with a polynomial of degree <= D on {n >= T : n = r (mod L)}.  Equivalently
f(n) = sum over L-th roots of unity z of P_z(n) z^n with deg P_z <= D
(Stanley, *Enumerative Combinatorics I*, 4.4).  If only the roots in a set Z
occur, f satisfies the linear recurrence with characteristic polynomial
prod_{z in Z} (x - z)^(D+1), of order K = (D + 1)|Z| and nonzero constant
term, so f vanishes from T on as soon as it vanishes at T, ..., T + K - 1.
quasicert tracks Z as a set of orders ("frequencies"): a sum of
quasi-polynomials has the union, a product the pairwise lcms, p_A(n) the
parts a_i (the poles of its generating function), a function of period b the
single order b.  K is at most (D + 1) L, and often far smaller: for p_A with
parts near 100 it is a few thousand where L is near 10^8.

``shape`` infers (D, L, T) for an expression from structural rules (sums take
the larger degree and the lcm of periods, products add degrees, p_A(an + c)
has degree d - 1 and period lcm(A) once an + c > -(a_1 + ... + a_d), a
sawtooth of (p n + q) has degree 0 and the denominator of p as period, ...).
An expression with n where no rule applies (n in a denominator, n as a
modulus, n inside a function not known to be quasi-polynomial) is refused
with the reason.  ``check_identity`` then compares both sides at every point
below the threshold and at (D + 1) L consecutive points from it.

>>> from checker.language.parsing import parse_expression
>>> from checker.kernel.evaluation import Evaluator
>>> s = shape(parse_expression("partitions(n, [1, 2]) - floor(n/2)"), "n", Evaluator())
>>> (s.degree, s.period, s.threshold)
(1, 2, -2)
"""
from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from math import comb, gcd, lcm
from typing import Optional

from ..language import expressions as ex
from ..foundation.errors import CertificateError, DomainError
from ..foundation.limits import check_time
from ..foundation.numbers import rough_int, value_text
from ..mathematics.partitions import check_parts
from ..mathematics.polytopes import polytope_of_inequalities, polytope_of_vertices
from .evaluation import binding
from .functions import REGISTRY

__all__ = ["Shape", "shape", "check_identity", "IdentityResult", "NotQuasiPolynomial"]


class NotQuasiPolynomial(DomainError):
    """An expression that quasicert cannot show to be a quasi-polynomial in the variable."""


@dataclass(frozen=True)
class Shape:
    degree: int
    period: int
    threshold: Optional[int] = None     # None: a quasi-polynomial on all integers
    orders: frozenset = None            # the roots of unity z^n that may occur, by order

    def __post_init__(self):
        if self.orders is None:
            object.__setattr__(self, "orders", frozenset({self.period}))


_MAX_ORDERS = 64


def _product_orders(a: frozenset, b: frozenset) -> frozenset:
    out = frozenset(lcm(x, y) for x in a for y in b)
    if len(out) > _MAX_ORDERS:
        return frozenset({lcm(*out)})
    return out


def _sum_orders(a: frozenset, b: frozenset) -> frozenset:
    out = a | b
    if len(out) > _MAX_ORDERS:
        return frozenset({lcm(*out)})
    return out


def root_count(orders: frozenset) -> int:
    """|Z| for Z the roots of unity whose order divides some element of `orders`."""
    if all(b <= 10**6 for b in orders):
        divisors = set()
        for b in orders:
            i = 1
            while i * i <= b:
                if b % i == 0:
                    divisors.update((i, b // i))
                i += 1
        return sum(_phi(e) for e in divisors)
    return min(sum(orders), lcm(*orders))


def _phi(m: int) -> int:
    result, p, x = m, 2, m
    while p * p <= x:
        if x % p == 0:
            while x % p == 0:
                x //= p
            result -= result // p
        p += 1
    if x > 1:
        result -= result // x
    return result


def _join_threshold(a, b):
    if a is None:
        return b
    if b is None:
        return a
    return max(a, b)


def _combine(a: Shape, b: Shape, degree: int, product: bool = False) -> Shape:
    orders = _product_orders(a.orders, b.orders) if product else _sum_orders(a.orders, b.orders)
    return Shape(degree, lcm(a.period, b.period), _join_threshold(a.threshold, b.threshold), orders)


CONSTANT = Shape(0, 1)


def mentions(node, var: str) -> bool:
    stack = [node]
    while stack:
        x = stack.pop()
        if isinstance(x, ex.Name) and x.name == var:
            return True
        stack.extend(ex.children(x))
    return False


def polynomial(node, var: str, ev) -> Optional[list]:
    """Coefficients [c0, c1, ...] when `node` is a plain polynomial in var, else None."""
    if not mentions(node, var):
        v = ev.value(node)
        return [v] if isinstance(v, Fraction) else None
    if isinstance(node, ex.Name):
        return [Fraction(0), Fraction(1)]
    if isinstance(node, ex.Neg):
        p = polynomial(node.operand, var, ev)
        return None if p is None else [-c for c in p]
    if isinstance(node, ex.Sum):
        total = [Fraction(0)]
        for sign, term in node.terms:
            p = polynomial(term, var, ev)
            if p is None:
                return None
            total = _padd(total, [sign * c for c in p])
        return total
    if isinstance(node, ex.Product):
        acc = [Fraction(1)]
        for divide, factor in node.factors:
            if divide:
                if mentions(factor, var):
                    return None
                v = ev.number(factor)
                if v == 0:
                    raise DomainError("division by zero: this divisor is 0").at(factor)
                acc = [c / v for c in acc]
            else:
                p = polynomial(factor, var, ev)
                if p is None:
                    return None
                acc = _pmul(acc, p)
        return acc
    if isinstance(node, ex.Power) and not mentions(node.exponent, var):
        e = ev.number(node.exponent)
        if e.denominator != 1 or e < 0 or e > 64:
            return None
        base = polynomial(node.base, var, ev)
        if base is None:
            return None
        acc = [Fraction(1)]
        for _ in range(e.numerator):
            acc = _pmul(acc, base)
        return acc
    return None


def _padd(a, b):
    out = [Fraction(0)] * max(len(a), len(b))
    for i, c in enumerate(a):
        out[i] += c
    for i, c in enumerate(b):
        out[i] += c
    return _trim(out)


def _pmul(a, b):
    out = [Fraction(0)] * (len(a) + len(b) - 1)
    for i, x in enumerate(a):
        if x:
            for j, y in enumerate(b):
                out[i + j] += x * y
    return _trim(out)


def _trim(p):
    while len(p) > 1 and p[-1] == 0:
        p.pop()
    return p


def _refuse(node, why):
    raise NotQuasiPolynomial(why).at(node)


def _linear(node, var, ev, integer: bool, what: str):
    """(p, q) with node = p*var + q; integers when `integer`."""
    p = polynomial(node, var, ev)
    if p is None or len(p) > 2:
        _refuse(node, f"{what} must be linear in {var} (like 3*{var} + 1) for quasicert to know its period")
    a = p[1] if len(p) > 1 else Fraction(0)
    b = p[0]
    if integer and (a.denominator != 1 or b.denominator != 1):
        _refuse(node, f"{what} must be an integer for every {var}: write it as a {var} + c with integers a, c")
    return a, b


def _constant(node, var, ev, what):
    if mentions(node, var):
        _refuse(node, f"{what} must not depend on {var} in an identity, which needs a quasi-polynomial in "
                      f"{var}; a closed form for every {var} is proved with a lemma instead: "
                      f"lemma NAME({var}) for {var} >= 1: A = B, then its chains and `end`")
    return ev.value(node)


def _whole_constant(node, var, ev, what) -> int:
    v = _constant(node, var, ev, what)
    if not isinstance(v, Fraction) or v.denominator != 1:
        raise DomainError(f"{what} must be an integer").at(node)
    return v.numerator


def shape(node, var: str, ev) -> Shape:
    """(degree bound, period, threshold) of an expression as a quasi-polynomial in var."""
    if not mentions(node, var):
        return CONSTANT
    if isinstance(node, ex.Name):
        return Shape(1, 1)
    if isinstance(node, ex.Neg):
        return shape(node.operand, var, ev)
    if isinstance(node, ex.Sum):
        out = CONSTANT
        for _, term in node.terms:
            s = shape(term, var, ev)
            out = _combine(out, s, max(out.degree, s.degree))
        return out
    if isinstance(node, ex.Product):
        out = CONSTANT
        for divide, factor in node.factors:
            if divide and mentions(factor, var):
                _refuse(factor, f"{var} stands in a denominator, so this is not a quasi-polynomial in {var}")
            s = shape(factor, var, ev)
            out = _combine(out, s, out.degree + s.degree, product=True)
        return out
    if isinstance(node, ex.Power):
        if mentions(node.exponent, var):
            return _unit_power(node, var, ev)
        e = ev.number(node.exponent)
        if e.denominator != 1 or e < 0:
            _refuse(node, f"a negative or fractional power of an expression in {var} is not a quasi-polynomial")
        s = shape(node.base, var, ev)
        return _power_shape(s, e.numerator)
    if isinstance(node, ex.Call):
        spec = REGISTRY.get(node.name)
        if spec is not None:
            try:
                spec.check_arity(len(node.args))
            except CertificateError as e:
                raise e.at(node)
        rule = _CALL_RULES.get(node.name)
        if rule is None:
            _refuse(node, f"quasicert does not know {node.name} to be a quasi-polynomial in {var}")
        return rule(node, var, ev)
    if isinstance(node, ex.FiniteSum):
        _refuse(node, f"a finite sum whose terms or ends depend on {var} is not supported in identities")
    _refuse(node, f"a list that depends on {var} is not a number")


def _unit_power(node, var, ev) -> Shape:
    """c^E for c = 1 or -1 and an integer-valued quasi-polynomial E: (-1)^E = 1 - 2 mod(E, 2)
    has the period of E mod 2; 1^E = 1.  Any other base with var in the exponent is refused."""
    if mentions(node.base, var):
        _refuse(node.exponent, f"{var} stands in an exponent, so this is not a quasi-polynomial in {var}")
    c = ev.value(node.base)
    if c not in (1, -1):
        _refuse(node.exponent, f"{var} stands in an exponent of a base other than 1 or -1, so this is "
                               f"not a quasi-polynomial in {var}")
    s = shape(node.exponent, var, ev)
    if c == 1:
        # 1^E is 1 only where E is an integer (a fractional power is undefined): the period of {E}
        # makes the identity's points cover a whole period of it, so a non-integer E is met there
        if s.degree == 0:
            return Shape(0, s.period, s.threshold)
        return Shape(0, _fraction_period(node.exponent, s, var, ev, "the exponent of 1"), s.threshold)
    period = _residue_period(node.exponent, s, 2, var, ev, "the exponent of -1")
    return Shape(0, period, s.threshold)


def _power_shape(s: Shape, e: int) -> Shape:
    orders = frozenset({1})
    for _ in range(min(e, 8)):
        orders = _product_orders(orders, s.orders)
    if e > 8:
        orders = frozenset({lcm(*orders)})
    return Shape(s.degree * e, s.period, s.threshold, orders)


# -- the rules for function calls -------------------------------------------

def _interpolate(xs: list, ys: list) -> list:
    """Coefficients c_0, ..., c_D (in powers of x) of the polynomial through the points, exactly
    (Newton's divided differences, then expanded)."""
    table = list(ys)
    newton = [table[0]]
    for level in range(1, len(xs)):
        table = [(table[i + 1] - table[i]) / (xs[i + level] - xs[i]) for i in range(len(table) - 1)]
        newton.append(table[0])
    coeffs = [Fraction(0)]
    for k in range(len(newton) - 1, -1, -1):      # Horner: c <- c (x - xs[k]) + newton[k]
        shifted = [Fraction(0)] + coeffs
        for i, c in enumerate(coeffs):
            shifted[i] -= xs[k] * c
        shifted[0] += newton[k]
        coeffs = shifted
    return _trim(coeffs)


def _constituent_denominator(arg, s: Shape, var, ev, divisor: int = 1) -> int:
    """The lcm M of the denominators of the coefficients (in powers of var) of every constituent
    of arg/divisor.

    The shape rules say arg is a quasi-polynomial of degree <= D and period L from its threshold
    on, so each constituent is fixed by D + 1 of its values, interpolated exactly here.  Then
    M * arg(n)/divisor is an integer polynomial on each residue class mod L, hence its residue mod
    M, and with it {arg(n)/divisor}, has period lcm(L, M) (Stanley, EC I, 4.4, for the form)."""
    D, L = s.degree, s.period
    start = 0 if s.threshold is None else s.threshold
    count = (D + 1) * L
    ev.limits.require("terms", count, f"interpolating the {rough_int(L)} constituents of degree {rough_int(D)} "
                                      "inside a floor")
    values = _values(arg, var, range(start, start + count), ev)
    M = 1
    for r in range(L):
        xs = [Fraction(start + r + L * i) for i in range(D + 1)]
        ys = [values[r + L * i] / divisor for i in range(D + 1)]
        for c in _interpolate(xs, ys):
            M = lcm(M, c.denominator)
    return M


def _fraction_period(arg, s: Shape, var, ev, what, divisor: int = 1) -> int:
    """The period of {arg/divisor} as a function of var (from arg's threshold on)."""
    p = polynomial(arg, var, ev)
    if p is not None:
        return lcm(*[(c / divisor).denominator for c in p])
    return lcm(s.period, _constituent_denominator(arg, s, var, ev, divisor))


def _residue_period(arg, s: Shape, m: int, var, ev, what) -> int:
    """The period of arg mod m, for integer values of arg: that of {arg/m}."""
    return _fraction_period(arg, s, var, ev, what, m)


def _periodic_of_linear(node, var, ev, arg, what, integer=False) -> Shape:
    """A function of period 1 (frac, sawtooth, Bbar_p) applied to `arg`: it depends on {arg} only."""
    s = shape(arg, var, ev)
    if s.degree == 0:
        return Shape(0, s.period, s.threshold)
    return Shape(0, _fraction_period(arg, s, var, ev, what), s.threshold)


def _floor_like(node, var, ev):
    """floor(Q) = Q - {Q} and ceil(Q) = Q + {-Q}: Q's degree, and {Q}'s period as a new order."""
    (arg,) = node.args
    s = shape(arg, var, ev)
    if s.degree == 0:
        return Shape(0, s.period, s.threshold)
    period = _fraction_period(arg, s, var, ev, f"the argument of {node.name}")
    return Shape(s.degree, lcm(s.period, period), s.threshold, _sum_orders(s.orders, frozenset({1, period})))


def _frac_like(node, var, ev):
    return _periodic_of_linear(node, var, ev, node.args[-1], f"the argument of {node.name}")


def _residue_like(node, var, ev):
    """mod(x, m) and gcd(x, m): period |m| in x, for integer polynomials x."""
    if len(node.args) != 2:
        _refuse(node, f"{node.name} in an identity takes two arguments")
    x, m = node.args
    m = _constant(m, var, ev, f"the modulus of {node.name}")
    if not isinstance(m, Fraction) or m.denominator != 1 or m == 0:
        _refuse(node, f"the second argument of {node.name} must be a nonzero integer")
    s = shape(x, var, ev)
    if s.degree == 0:
        return Shape(0, s.period, s.threshold)
    p = polynomial(x, var, ev)
    if p is not None and all(c.denominator == 1 for c in p):
        return Shape(0, abs(m.numerator))
    # an integer-valued quasi-polynomial x: x mod m = |m| {x/|m|}, and gcd(x, m) depends on it only
    return Shape(0, _residue_period(x, s, abs(m.numerator), var, ev, f"the first argument of {node.name}"),
                 s.threshold)


def _modulus(node, arg, var, ev, what):
    k = _constant(arg, var, ev, what)
    if not isinstance(k, Fraction) or k.denominator != 1 or k < 1:
        _refuse(node, f"{what} must be a positive integer")
    return k.numerator


def _dedekind(node, var, ev):
    if len(node.args) != 2:
        _refuse(node, "dedekind takes two arguments")
    k = _modulus(node, node.args[1], var, ev, "the second argument of dedekind")
    _linear(node.args[0], var, ev, True, "the first argument of dedekind")
    return Shape(0, k)


def _generalized(node, var, ev):
    if len(node.args) != 3:
        _refuse(node, "generalized_dedekind takes three arguments")
    _constant(node.args[0], var, ev, "the order of generalized_dedekind")
    k = _modulus(node, node.args[2], var, ev, "the third argument of generalized_dedekind")
    _linear(node.args[1], var, ev, True, "the second argument of generalized_dedekind")
    return Shape(0, k)


def _fourier(node, var, ev):
    if len(node.args) != 3:
        _refuse(node, "fourier_dedekind takes three arguments")
    _constant(node.args[1], var, ev, "the list of fourier_dedekind")
    b = _modulus(node, node.args[2], var, ev, "the modulus of fourier_dedekind")
    _linear(node.args[0], var, ev, True, "the first argument of fourier_dedekind")
    return Shape(0, b)


def _parts_of(node, arg, var, ev):
    parts = _constant(arg, var, ev, f"the list of parts of {node.name}")
    try:
        return check_parts(parts, node.name, allow_empty=node.name == "partitions")
    except CertificateError as e:
        raise e.at(arg)


def _partitions(node, var, ev):
    if len(node.args) != 2:
        _refuse(node, "partitions takes two arguments")
    parts = _parts_of(node, node.args[1], var, ev)
    a, c = _linear(node.args[0], var, ev, True, "the first argument of partitions")
    if a <= 0:
        _refuse(node.args[0], f"the first argument of partitions must grow with {var} (a {var} + c with a >= 1)")
    # p_A(m) = P_A(m) once m > -(a_1 + ... + a_d): a n + c > -S  <=>  n >= floor((-S - c)/a) + 1
    total = sum(parts)
    threshold = (-total - c.numerator) // a.numerator + 1
    period = lcm(*parts)
    # the poles of 1/prod(1 - x^a_i) are roots of unity of order dividing some a_i;
    # n -> a n + c raises each to the power a
    if not parts:
        return Shape(0, 1, threshold)     # p_{}(m) = [m = 0]: the zero function once a n + c >= 1
    orders = frozenset(p // gcd(p, a.numerator) for p in parts)
    return Shape(len(parts) - 1, period // gcd(period, a.numerator), threshold, orders)


def _partitions_everywhere(node, var, ev):
    if len(node.args) != 2:
        _refuse(node, f"{node.name} takes two arguments")
    parts = _parts_of(node, node.args[1], var, ev)
    a, _ = _linear(node.args[0], var, ev, True, f"the first argument of {node.name}")
    if node.name == "partitions_polynomial_part" or not a:
        return Shape(len(parts) - 1, 1)
    period = lcm(*parts)
    orders = frozenset(p // gcd(p, abs(a.numerator)) for p in parts)
    return Shape(len(parts) - 1, period // gcd(period, a.numerator), None, orders)


def _bernoulli(node, var, ev):
    if len(node.args) == 1:
        _refuse(node, f"a Bernoulli number with an index depending on {var} is not a quasi-polynomial")
    j = _whole_constant(node.args[0], var, ev, "the degree of a Bernoulli polynomial")
    if j < 0:
        raise DomainError("the degree of a Bernoulli polynomial must be >= 0").at(node.args[0])
    s = shape(node.args[1], var, ev)
    return _power_shape(s, j)


def _periodic_bernoulli(node, var, ev):
    _constant(node.args[0], var, ev, "the index of periodic_bernoulli")
    return _periodic_of_linear(node, var, ev, node.args[1], "the argument of periodic_bernoulli")


def _binomial(node, var, ev):
    j = _whole_constant(node.args[1], var, ev, "the lower index of binomial")
    s = shape(node.args[0], var, ev)
    return _power_shape(s, max(j, 0))


def _periodic(node, var, ev):
    values = _constant(node.args[1], var, ev, "the list of periodic")
    if not isinstance(values, tuple) or not values:
        _refuse(node, "periodic needs a non-empty list")
    a, _ = _linear(node.args[0], var, ev, True, "the first argument of periodic")
    L = len(values)
    return Shape(0, L // gcd(L, a.numerator) if a else 1)


def _constituents(node, var, ev):
    table = _constant(node.args[1], var, ev, "the table of constituents")
    if not isinstance(table, tuple) or not table or not all(isinstance(r, tuple) and r for r in table):
        _refuse(node, "constituents needs a list of coefficient lists")
    a, _ = _linear(node.args[0], var, ev, True, "the first argument of constituents")
    L = len(table)
    period = L // gcd(L, a.numerator) if a else 1
    return Shape(max(len(r) for r in table) - 1, period)


def _dilation_is(node, var, ev):
    p = polynomial(node.args[0], var, ev)
    if p != [Fraction(0), Fraction(1)]:
        _refuse(node.args[0], f"the dilation factor must be {var} itself")


def _lattice(node, var, ev):
    """L_P(t) has degree dim P and period dividing the vertex denominator D (Ehrhart 1962), from t = 0 on;
    the interior count (in R^d) the same from t = 1 on when P is full-dimensional, and 0 otherwise."""
    pts = _constant(node.args[1], var, ev, f"the vertices of {node.name}")
    try:
        poly = polytope_of_vertices(pts, ev.limits, node.name)
    except CertificateError as e:
        raise e.at(node.args[1])
    _dilation_is(node, var, ev)
    if node.name == "interior_lattice_points":
        if poly.dimension < poly.ambient:
            return Shape(0, 1, 0)            # no interior in R^d: 0 in every dilate
        return Shape(poly.dimension, poly.denominator, 1)
    return Shape(poly.dimension, poly.denominator, 0)


def _lattice_in(node, var, ev):
    """As `_lattice`; the empty polytope has the zero function (0 points in every dilate, t = 0 too)."""
    rows = _constant(node.args[1], var, ev, f"the inequalities of {node.name}")
    eqs = _constant(node.args[2], var, ev, f"the equations of {node.name}") if len(node.args) > 2 else ()
    try:
        poly = polytope_of_inequalities(rows, eqs, ev.limits, node.name)
    except CertificateError as e:
        raise e.at(node.args[1])
    _dilation_is(node, var, ev)
    if poly.empty:
        return Shape(0, 1, 0)
    return Shape(poly.dimension, poly.denominator, 0)


def _hstar_coefficient(node, var, ev):
    _refuse(node, f"quasicert does not know {node.name} with {var} in its arguments to be a quasi-polynomial in {var}")


_CALL_RULES = {
    "floor": _floor_like, "ceil": _floor_like, "round": _floor_like,
    "frac": _frac_like, "sawtooth": _frac_like,
    "mod": _residue_like, "gcd": _residue_like,
    "dedekind": _dedekind, "generalized_dedekind": _generalized, "fourier_dedekind": _fourier,
    "partitions": _partitions, "partitions_extended": _partitions_everywhere,
    "partitions_polynomial_part": _partitions_everywhere,
    "bernoulli": _bernoulli, "periodic_bernoulli": _periodic_bernoulli, "binomial": _binomial,
    "periodic": _periodic, "constituents": _constituents,
    "lattice_points": _lattice, "lattice_points_in": _lattice_in, "interior_lattice_points": _lattice,
    "hstar": _hstar_coefficient, "hstar_in": _hstar_coefficient,
}


# -- deciding an identity ----------------------------------------------------

@dataclass
class IdentityResult:
    ok: bool
    degree: int
    period: int
    start: int                       # first value checked
    points: int                      # how many values were compared
    threshold: Optional[int]
    counterexample: Optional[int] = None
    left: Optional[Fraction] = None
    right: Optional[Fraction] = None
    problem: str = ""                # a claimed period or degree that does not hold
    problem_side: str = ""           # "left" or "right": the side that the problem is about


def _values(node, var, ns, ev):
    out = []
    for _ in binding(ev.env, var, ns):
        check_time()
        out.append(ev.number(node))
    return out


def _check_claimed(node, side, var, s: Shape, start, ev, period, degree, limits, first=None):
    """Does `node` have period dividing `period` and degree <= `degree` from `first` on?

    From the threshold `start` on, the (degree+1)-th difference with step `period` is a
    quasi-polynomial of degree <= s.degree and period s.period: zero iff zero at that many
    points.  Below the threshold (from `first`, the identity's lower end) nothing is known of
    the shape, so each of those differences is computed.
    """
    first = start if first is None else min(first, start)
    count = (s.degree + 1) * root_count(s.orders) + (start - first)
    span = (degree + 1) * period
    limits.require("terms", count + span, f"verifying the claimed period and degree of the {side} side")
    values = _values(node, var, range(first, first + count + span), ev)
    for i in range(count):
        diff = sum((-1) ** j * comb(degree + 1, j) * values[i + j * period] for j in range(degree + 2))
        if diff:
            return (f"the {side} side does not have period {value_text(period)} and degree <= {value_text(degree)}: at "
                    f"{var} = {value_text(first + i)} its difference of order {value_text(degree + 1)} with step "
                    f"{value_text(period)} is {value_text(diff)}")
    return ""


def check_identity(lhs, rhs, var: str, lower: Optional[int], ev, limits,
                   claimed_period: Optional[int] = None, claimed_degree: Optional[int] = None) -> IdentityResult:
    """Decide `lhs = rhs for all var >= lower` (all integers when lower is None)."""
    left, right = shape(lhs, var, ev), shape(rhs, var, ev)
    degree = max(left.degree, right.degree)
    period = lcm(left.period, right.period)
    orders = _sum_orders(left.orders, right.orders)
    threshold = _join_threshold(left.threshold, right.threshold)
    if lower is None and threshold is not None:
        side = lhs if left.threshold is not None else rhs
        raise NotQuasiPolynomial(
            f"this side is a quasi-polynomial in {var} only from {var} = {value_text(threshold)} on, so an identity "
            f"for all {var} cannot be decided; state it for {var} >= some bound").at(side)
    start = 0 if lower is None else lower if threshold is None else max(lower, threshold)
    below = 0 if lower is None else start - lower
    limits.require("terms", below,
                   f"checking the {rough_int(below)} values below the threshold {var} = {value_text(start)}")
    # the difference satisfies a recurrence of order (D+1)|Z|, which is <= (D+1) L
    block = (degree + 1) * min(root_count(orders), period)
    limits.require("terms", block + below, f"an identity of degree {rough_int(degree)} and period {rough_int(period)}")
    ns = range(start - below, start + block)
    result = IdentityResult(True, degree, period, ns[0] if ns else start, len(ns), threshold)
    for n in binding(ev.env, var, ns):
        check_time()
        a, b = ev.number(lhs), ev.number(rhs)
        if a != b:
            result.ok, result.counterexample, result.left, result.right = False, n, a, b
            return result
    if claimed_period is not None or claimed_degree is not None:
        p = claimed_period if claimed_period is not None else period
        d = claimed_degree if claimed_degree is not None else degree
        if p < 1 or d < 0:
            raise DomainError("a claimed period must be >= 1 and a claimed degree >= 0")
        for node, s, side in ((lhs, left, "left"), (rhs, right, "right")):
            problem = _check_claimed(node, side, var, s, start, ev, p, d, limits,
                                     first=start - below)
            if problem:
                result.ok, result.problem, result.problem_side = False, problem, side
                return result
    return result
