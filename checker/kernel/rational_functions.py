"""Rational functions in integer parameters: the values of a lemma's lines.

A polynomial is a dict ``monomial -> Fraction`` (nonzero coefficients only),
a monomial a sorted tuple of ``(parameter name, exponent)`` pairs; ``()`` is
the constant monomial.  A rational function N/D is kept in lowest terms with
the leading coefficient of D equal to 1 (leading in the order of
``_leading``), which makes the pair (N, D) canonical: two rational functions
are equal exactly when their pairs are.  Greatest common divisors and exact
division of polynomials come from sympy's ``Poly`` over QQ (symbolic algebra
only: sympy never sees certificate text, only coefficients and names).

Arithmetic that gives a constant returns a ``Fraction``, so a value is a
Fraction or a non-constant ``RationalFunction``, never a constant one.

>>> k = RationalFunction.variable("k")
>>> print((k * k - 1) / (k - 1))
k + 1
>>> print((k - 1) * (k - 5) / (24 * k))
(k^2 - 6*k + 5)/(24*k)
>>> (k + 1) - k
Fraction(1, 1)
"""
from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from math import gcd as _gcd
from typing import Union

from ..foundation.limits import check_time
from ..foundation.numbers import value_text
from .ratios import Ratio

__all__ = ["RationalFunction", "Value", "poly_text", "names_of", "is_integer_polynomial",
           "poly_eval", "as_polynomial"]

_ZERO = Fraction(0)


# -- polynomials as dicts ------------------------------------------------------

def _mono_mul(a: tuple, b: tuple) -> tuple:
    if not a:
        return b
    if not b:
        return a
    exps = dict(a)
    for n, e in b:
        exps[n] = exps.get(n, 0) + e
    return tuple(sorted(exps.items()))


def p_add(p: dict, q: dict, sign: int = 1) -> dict:
    """p + q (p - q with sign -1): the sum of normal forms, which polynomials are too."""
    from .normal import add, sub
    return add(p, q) if sign > 0 else sub(p, q)


def p_mul(p: dict, q: dict) -> dict:
    out: dict = {}
    for m1, c1 in p.items():
        check_time()              # products of big polynomials are the slow part of a lemma
        for m2, c2 in q.items():
            m = _mono_mul(m1, m2)
            v = out.get(m, _ZERO) + c1 * c2
            if v:
                out[m] = v
            else:
                out.pop(m, None)
    return out


def p_scale(p: dict, c) -> dict:
    return {m: v * c for m, v in p.items()} if c else {}


def p_constant(p: dict):
    """The value of a constant polynomial, or None."""
    if not p:
        return _ZERO
    if len(p) == 1 and () in p:
        return p[()]
    return None


def _degree(m: tuple) -> int:
    return sum(e for _, e in m)


def _leading(p: dict) -> tuple:
    """The leading monomial: highest total degree, then lexicographic (graded lex order)."""
    return max(p, key=lambda m: (_degree(m), m))


def poly_eval(p: dict, values: dict) -> Fraction:
    """p at integer or rational values of its parameters (exact)."""
    total = _ZERO
    for m, c in p.items():
        term = c
        for n, e in m:
            term *= Fraction(values[n]) ** e
        total += term
    return total


def names_of(p: dict) -> set:
    return {n for m in p for n, _ in m}


def is_integer_polynomial(p: dict) -> bool:
    return all(c.denominator == 1 for c in p.values())


def _term_text(m: tuple, c: Fraction, first: bool) -> str:
    body = "*".join(n if e == 1 else f"{n}^{e}" for n, e in m)
    mag = abs(c)
    if not body:
        core = _fraction_text(mag)
    elif mag == 1:
        core = body
    else:
        core = f"{_fraction_text(mag)}*{body}"
    if first:
        return ("-" if c < 0 else "") + core
    return (" - " if c < 0 else " + ") + core


def _fraction_text(c: Fraction) -> str:
    return value_text(c)       # every digit, past 4,300 too


def poly_text(p: dict) -> str:
    """The polynomial in the certificate language, highest degree first."""
    if not p:
        return "0"
    order = sorted(p, key=lambda m: (-_degree(m), m))
    return "".join(_term_text(m, p[m], i == 0) for i, m in enumerate(order))


# -- sympy only for gcd and exact division --------------------------------------

def _symbols(names: tuple):
    import sympy
    return tuple(sympy.Symbol(n) for n in names)


def _to_sympy(p: dict, names: tuple):
    import sympy
    from sympy import QQ, Poly
    data = {tuple(dict(m).get(n, 0) for n in names): sympy.Rational(c.numerator, c.denominator)
            for m, c in p.items()}
    return Poly.from_dict(data or {tuple(0 for _ in names): 0}, *_symbols(names), domain=QQ)


def _from_sympy(poly, names: tuple) -> dict:
    from sympy import QQ
    out = {}
    for exps, c in poly.terms():
        r = QQ.to_sympy(c)
        if r:
            out[tuple((n, e) for n, e in zip(names, exps) if e)] = Fraction(int(r.p), int(r.q))
    return out


def _gcd_and_quotients(p: dict, q: dict):
    """(p/g, q/g) for g = gcd(p, q)."""
    names = tuple(sorted(names_of(p) | names_of(q)))
    P, Q = _to_sympy(p, names), _to_sympy(q, names)
    g = P.gcd(Q)
    return _from_sympy(P.exquo(g), names), _from_sympy(Q.exquo(g), names)


def exact_quotient(p: dict, q: dict):
    """p/q when q divides p as polynomials over Q, else None."""
    if not q:
        return None
    c = p_constant(q)
    if c is not None:
        return p_scale(p, 1 / c)
    names = tuple(sorted(names_of(p) | names_of(q)))
    quotient, remainder = _to_sympy(p, names).div(_to_sympy(q, names))
    if not remainder.is_zero:
        return None
    return _from_sympy(quotient, names)


@lru_cache(maxsize=4096)
def _factor_cached(key: tuple) -> tuple:
    p = dict(key)
    names = tuple(sorted(names_of(p)))
    if not names:
        return ()
    _content, factors = _to_sympy(p, names).factor_list()
    return tuple((tuple(sorted(_from_sympy(f, names).items())), m) for f, m in factors)


_FACTOR_DEGREE = 40      # beyond this, factoring may take long: the polynomial stands for itself


def factors(p: dict) -> list:
    """The non-constant irreducible factors of p over Q, each once (constants dropped); above
    degree 40, p itself (a sound answer wherever factors are used: one piece, not split)."""
    if p and max(_degree(m) for m in p) > _FACTOR_DEGREE:
        return [] if p_constant(p) is not None else [p]
    return [dict(f) for f, _ in _factor_cached(tuple(sorted(p.items())))]


def integer_factorization(p: dict):
    """(c, [(f, e), ...]) with p = c * prod f^e exactly, each f a primitive integer polynomial of
    positive degree (irreducible up to degree 40; above, p's primitive part stands for itself),
    e its multiplicity; c is then rational (an integer when p is an integer polynomial, by
    Gauss's lemma).  The product is multiplied out and compared with p, so a factorization that
    lost a factor or a multiplicity is never returned: None instead."""
    if not p or p_constant(p) is not None:
        return (p_constant(p), [])
    if max(_degree(m) for m in p) > _FACTOR_DEGREE:
        pieces = [(p, 1)]
    else:
        pieces = [(dict(f), e) for f, e in _factor_cached(tuple(sorted(p.items())))]
    out, product = [], {(): Fraction(1)}
    for f, e in pieces:
        f = _primitive_integer(f)
        out.append((f, e))
        for _ in range(e):
            product = p_mul(product, f)
    content = exact_quotient(p, product)
    c = p_constant(content) if content is not None else None
    if not c or p_mul(product, {(): c}) != p:
        return None
    return c, out


def _primitive_integer(p: dict) -> dict:
    """p scaled to integer coefficients without a common factor, leading coefficient > 0."""
    L, g = 1, 0
    for c in p.values():
        L = L * c.denominator // _gcd(L, c.denominator)
    q = p_scale(p, Fraction(L))
    for c in q.values():
        g = _gcd(g, int(c))
    q = p_scale(q, Fraction(1, g))
    return q if q[_leading(q)] > 0 else p_scale(q, Fraction(-1))


# -- rational functions ----------------------------------------------------------

class RationalFunction:
    """N/D in lowest terms, D with leading coefficient 1; never a constant."""

    __slots__ = ("num", "den", "_key")

    def __init__(self, num: dict, den: dict):
        self.num = num
        self.den = den
        self._key = (tuple(sorted(num.items())), tuple(sorted(den.items())))

    # -- making --------------------------------------------------------------
    @staticmethod
    def variable(name: str) -> "RationalFunction":
        return RationalFunction({((name, 1),): Fraction(1)}, {(): Fraction(1)})

    @staticmethod
    def of(num: dict, den: dict) -> "Value":
        """The canonical value of num/den (den nonzero)."""
        if not den:
            raise ZeroDivisionError("a rational function with denominator 0")
        if not num:
            return _ZERO
        c = p_constant(den)
        if c is None:
            num, den = _gcd_and_quotients(num, den)
            c = p_constant(den)
        if c is not None:
            num = p_scale(num, 1 / c)
            k = p_constant(num)
            return k if k is not None else RationalFunction(num, {(): Fraction(1)})
        lead = den[_leading(den)]
        return RationalFunction(p_scale(num, 1 / lead), p_scale(den, 1 / lead))

    # -- reading -------------------------------------------------------------
    @property
    def is_polynomial(self) -> bool:
        return self.den == {(): Fraction(1)}

    @property
    def degree(self) -> int:
        """The largest total degree in the numerator and the denominator."""
        return max(_degree(m) for m in list(self.num) + list(self.den))

    @property
    def names(self) -> set:
        return names_of(self.num) | names_of(self.den)

    def at(self, values: dict) -> Fraction:
        d = poly_eval(self.den, values)
        if d == 0:
            raise ZeroDivisionError("the denominator vanishes here")
        return poly_eval(self.num, values) / d

    def __str__(self) -> str:
        # clear the numerator's denominators for reading: (k^2 - 6*k + 5)/(24*k)
        scale_by = 1
        for c in self.num.values():
            scale_by = scale_by * c.denominator // _gcd(scale_by, c.denominator)
        num = p_scale(self.num, scale_by)
        den = p_scale(self.den, scale_by)
        if p_constant(den) == 1:
            return poly_text(num)
        if len(num) > 1 and num[_leading(num)] < 0:      # -(k - 1)/(12*k), not (-k + 1)/(12*k)
            return "-" + str(RationalFunction(p_scale(self.num, Fraction(-1)), self.den))
        n, d = poly_text(num), poly_text(den)
        if len(num) > 1:
            n = f"({n})"
        if len(den) > 1 or p_constant(den) is None and (den[next(iter(den))] != 1 or
                                                        any(len(m) > 1 or m[0][1] > 1 for m in den)):
            d = f"({d})"
        return f"{n}/{d}"

    def __repr__(self) -> str:
        return f"RationalFunction({self})"

    def __hash__(self) -> int:
        return hash(self._key)

    def __eq__(self, other) -> bool:
        return isinstance(other, RationalFunction) and self._key == other._key

    def __bool__(self) -> bool:
        return True

    # -- arithmetic (results are canonical; constants come back as Fractions) --
    def __add__(self, other):
        o_num, o_den = _parts(other)
        if o_num is None:
            return NotImplemented
        if self.den == o_den:
            return RationalFunction.of(p_add(self.num, o_num), self.den)
        return RationalFunction.of(p_add(p_mul(self.num, o_den), p_mul(o_num, self.den)),
                                   p_mul(self.den, o_den))

    __radd__ = __add__

    def __neg__(self):
        return RationalFunction(p_scale(self.num, Fraction(-1)), self.den)

    def __sub__(self, other):
        return self + (-other)

    def __rsub__(self, other):
        return (-self) + other

    def __mul__(self, other):
        o_num, o_den = _parts(other)
        if o_num is None:
            return NotImplemented
        return RationalFunction.of(p_mul(self.num, o_num), p_mul(self.den, o_den))

    __rmul__ = __mul__

    def __truediv__(self, other):
        o_num, o_den = _parts(other)
        if o_num is None:
            return NotImplemented
        if not o_num:
            raise ZeroDivisionError("division by zero")
        return RationalFunction.of(p_mul(self.num, o_den), p_mul(self.den, o_num))

    def __rtruediv__(self, other):
        o_num, o_den = _parts(other)
        if o_num is None:
            return NotImplemented
        return RationalFunction.of(p_mul(o_num, self.den), p_mul(o_den, self.num))

    def __pow__(self, e: int):
        if not isinstance(e, int):
            return NotImplemented
        if e < 0:
            return RationalFunction.of(self.den, self.num) ** (-e)
        num, den = {(): Fraction(1)}, {(): Fraction(1)}
        for _ in range(e):
            num, den = p_mul(num, self.num), p_mul(den, self.den)
        return RationalFunction(num, den) if e else Fraction(1)


Value = Union[Fraction, RationalFunction]     # what a parameter expression evaluates to


def _parts(x):
    if isinstance(x, RationalFunction):
        return x.num, x.den
    if isinstance(x, Ratio):             # a chain's unreduced constant, met in a lemma's line
        x = x.as_fraction()
    if isinstance(x, (int, Fraction)):
        x = Fraction(x)
        return ({(): x} if x else {}), {(): Fraction(1)}
    return None, None


def as_polynomial(x):
    """The polynomial dict of a value whose denominator is constant, else None."""
    if isinstance(x, RationalFunction):
        return x.num if x.is_polynomial else None
    return {(): Fraction(x)} if x else {}
