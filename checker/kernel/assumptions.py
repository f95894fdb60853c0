"""What a lemma assumes about its integer parameters, and what follows from it.

Assumptions are kept as four kinds of facts about integer parameters:

- bounds: P >= 0 for integer polynomials P (``k >= 3`` is k - 3 >= 0,
  ``h < k`` is k - h - 1 >= 0); one-parameter ones also give x in [lo, hi];
- residue classes: x = r (mod m) for a parameter x and a constant m;
- coprimality: gcd(A, B) = 1 for integer polynomials A, B;
- divisibility: M | P for integer polynomials (``h*h' == 1 mod k`` is
  k | h*h' - 1, and gives gcd(h, k) = gcd(h', k) = 1).

The derivations below are small and sound; each answers None when it has
proved its conclusion for every integer value of the parameters that
satisfies the facts, or a sentence saying what it could not show.  None of
them ever assumes what it cannot derive.

- ``residues(P, m)``: the residues P can have modulo m, by trying every
  residue class of its parameters that the facts allow;
- ``integral(v)``, ``at_least(P, c)`` (interval bounds, plus one or two bound
  facts with nonnegative multipliers), ``nonzero(P)`` (factor by factor);
- ``coprime(A, B)``: a known pair, a constant against residues modulo its
  primes, factor by factor, or one Euclid step gcd(A, B) = gcd(A(x = -R), B)
  for B = x + R (or -x + R), which is exact because A - A(x = -R) is a multiple
  of B with integer coefficients;
- ``divides(M, P)``: residues for a constant M, exact division with an
  integer-valued quotient, or P - c F for a fact M' | F with M | M'.

>>> from checker.kernel.rational_functions import RationalFunction as R
>>> k = R.variable("k")
>>> facts = Assumptions(("k",))
>>> facts.add_bound(k - 1), facts.add_congruence(k - 1, 2)     # k >= 1, k odd: no problems
('', '')
>>> facts.coprime(2, k) is None, facts.coprime(k - 1, k) is None, facts.residues(k * k, 8)
(True, True, {1})
>>> facts.coprime(3, k)
'the assumptions do not give gcd(3, k) = 1: k can be 0 (mod 3)'
"""
from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction
from itertools import product
from math import gcd

from ..foundation.limits import check_time
from ..foundation.numbers import value_text
from .rational_functions import (RationalFunction, as_polynomial, exact_quotient,
                                 integer_factorization, is_integer_polynomial, names_of, p_add,
                                 p_constant, p_scale, poly_text)

__all__ = ["Assumptions"]

_MAX_RESIDUE_TUPLES = 100_000
_MAX_MODULUS = 100_000
_EUCLID_DEPTH = 8


def _poly(v) -> dict | None:
    return as_polynomial(v)


def _text(p: dict) -> str:
    return poly_text(p)


def _integer_form(p: dict) -> tuple[dict, int]:
    """(N, L) with p = N/L, N an integer polynomial, L >= 1."""
    L = 1
    for c in p.values():
        L = L * c.denominator // gcd(L, c.denominator)
    return p_scale(p, L), L


def _variable_of(p: dict):
    """(x, a, b) when p = a*x + b for one parameter x, else None."""
    names = names_of(p)
    if len(names) != 1:
        return None
    (x,) = names
    a = p.get(((x, 1),))
    if a is None or len(p) > (2 if () in p else 1):
        return None
    return x, a, p.get((), Fraction(0))


# -- extended numbers for interval bounds (None never stands for a number) ------

_NEG, _POS = "-inf", "+inf"


def _ext_mul(a, b):
    if a in (_NEG, _POS) or b in (_NEG, _POS):
        sa = _sign(a)
        sb = _sign(b)
        if sa == 0 or sb == 0:
            return Fraction(0)
        return _POS if sa * sb > 0 else _NEG
    return a * b


def _sign(a) -> int:
    if a == _POS:
        return 1
    if a == _NEG:
        return -1
    return (a > 0) - (a < 0)


def _ext_key(a):
    return (-1, 0) if a == _NEG else (1, 0) if a == _POS else (0, a)


def _ext_add(a, b):
    if a in (_NEG, _POS):
        return a if b not in (_NEG, _POS) or b == a else None
    if b in (_NEG, _POS):
        return b
    return a + b


def _interval_power(lo, hi, e: int):
    if e % 2:
        return _ext_pow(lo, e), _ext_pow(hi, e)
    if lo != _NEG and lo >= 0:
        return _ext_pow(lo, e), _ext_pow(hi, e)
    if hi != _POS and hi <= 0:
        return _ext_pow(hi, e), _ext_pow(lo, e)
    top = _POS if lo == _NEG or hi == _POS else max(-lo, hi) ** e
    return Fraction(0), top


def _ext_pow(a, e):
    if a in (_NEG, _POS):
        return a if e % 2 or a == _POS else _POS
    return a ** e


def _interval_mul(i1, i2):
    corners = [_ext_mul(a, b) for a in i1 for b in i2]
    return min(corners, key=_ext_key), max(corners, key=_ext_key)


@dataclass
class Assumptions:
    params: tuple
    nonnegative: list = field(default_factory=list)   # integer polynomials P >= 0
    lower: dict = field(default_factory=dict)         # x -> least value
    upper: dict = field(default_factory=dict)         # x -> largest value
    classes: dict = field(default_factory=dict)       # x -> [(r, m)]: x = r (mod m)
    coprime_pairs: list = field(default_factory=list) # (A, B): gcd(A, B) = 1
    divisible: list = field(default_factory=list)     # (P, M): M | P

    def copy(self) -> "Assumptions":
        return Assumptions(self.params, list(self.nonnegative), dict(self.lower), dict(self.upper),
                           {x: list(v) for x, v in self.classes.items()}, list(self.coprime_pairs),
                           list(self.divisible))

    # -- stating facts (each returns '' or why the fact cannot be used) -------
    # -- one condition, as a lemma states it ------------------------------------
    def assume(self, kind: str, lhs, rhs, modulus=None) -> str:
        """Add `lhs kind rhs` (kind one of < <= > >= == gcd); '' or why it cannot be used."""
        if kind == "gcd":
            return self.add_coprime(lhs, rhs)
        if kind == "==":
            return self.add_congruence(lhs - rhs, modulus)
        if kind in (">=", ">"):
            return self.add_bound(lhs - rhs, strict=kind == ">")
        if kind in ("<=", "<"):
            return self.add_bound(rhs - lhs, strict=kind == "<")
        return "an assumption is a bound (<, <=, >, >=), a congruence (== ... mod m) or gcd(a, b) = 1"

    def implies(self, kind: str, lhs, rhs, modulus=None) -> str:
        """'' when the facts give `lhs kind rhs` for every allowed value, else why not."""
        if kind == "gcd":
            return self.coprime(lhs, rhs) or ""
        if kind == "==":
            return self.divides(modulus, lhs - rhs) or ""
        if kind in (">=", ">"):
            d = lhs - rhs
        elif kind in ("<=", "<"):
            d = rhs - lhs
        else:
            return "not a condition quasicert can derive"
        if kind in (">", "<"):
            if self.integral(d) is None:
                return self.at_least(d, 1) or ""
            return self.at_least(d, 0) or self.nonzero(d) or ""
        return self.at_least(d, 0) or ""

    def add_bound(self, v, strict: bool = False) -> str:
        """v >= 0 (v > 0 when strict), for a polynomial value v."""
        p = _poly(v)
        if p is None:
            return "a bound must compare polynomials in the parameters"
        p, _ = _integer_form(p)
        if strict:                       # an integer > 0 is >= 1
            p = p_add(p, {(): Fraction(1)}, -1)
        c = p_constant(p)
        if c is not None:
            return "" if c >= 0 else "this assumption is false for every value of the parameters"
        self.nonnegative.append(p)
        one = _variable_of(p)
        if one is not None:
            x, a, b = one           # a x + b >= 0
            if a > 0:
                bound = -((b.numerator) // a.numerator)      # ceil(-b/a), a and b integers
                self.lower[x] = max(self.lower.get(x, bound), bound)
            else:
                bound = b.numerator // (-a.numerator)       # floor(b/(-a))
                self.upper[x] = min(self.upper.get(x, bound), bound)
        return ""

    def add_congruence(self, v, modulus) -> str:
        """v = 0 (mod modulus), for integer polynomials."""
        p, m = _poly(v), _poly(modulus)
        if p is None or m is None or not is_integer_polynomial(p) or not is_integer_polynomial(m):
            return "a congruence must be between integer polynomials in the parameters"
        mc = p_constant(m)
        if mc is not None:
            mc = abs(int(mc))
            if mc == 0:
                return "the modulus of a congruence must not be 0"
            one = _variable_of(p)
            if one is not None:
                x, a, b = one
                g = gcd(int(a), mc)
                if int(b) % g:
                    return "this congruence has no solution"
                step = mc // g
                r = (-int(b) // g) * pow(int(a) // g, -1, step) % step if step > 1 else 0
                self.classes.setdefault(x, []).append((r, step))
                return ""
            self.divisible.append((p, {(): Fraction(mc)}))
            return ""
        self.divisible.append((p, m))
        # F G = -u (mod M) with u = +-1 makes every factor of F G prime to M
        for u in (1, -1):
            q = p_add(p, {(): Fraction(u)})
            for f in _factor_pieces(q):
                self.coprime_pairs.append((f, m))
        return ""

    def add_coprime(self, a, b) -> str:
        pa, pb = _poly(a), _poly(b)
        if pa is None or pb is None or not is_integer_polynomial(pa) or not is_integer_polynomial(pb):
            return "gcd(a, b) = 1 needs integer polynomials a and b"
        self.coprime_pairs.append((pa, pb))
        return ""

    def with_class(self, x: str, r: int, m: int) -> "Assumptions":
        out = self.copy()
        out.classes.setdefault(x, []).append((r % m, m))
        return out

    # -- residues --------------------------------------------------------------
    def possible_residues(self, x: str, m: int) -> list:
        """The residues x can have modulo m under the facts (a superset of the truth)."""
        allowed = []
        for r in range(m):
            if any((r - s) % gcd(m, mm) for s, mm in self.classes.get(x, ())):
                continue
            if any(gcd(gcd(r, m), c) > 1 for c in self._constants_prime_to(x)):
                continue
            allowed.append(r)
        lo, hi = self.lower.get(x), self.upper.get(x)
        if lo is not None and hi is not None and hi - lo + 1 < m:
            allowed = sorted({v % m for v in range(lo, hi + 1)} & set(allowed))
        return allowed

    def _constants_prime_to(self, x: str):
        """Constants c with gcd(c, x) = 1 among the facts."""
        single = ({((x, 1),): Fraction(1)}, {((x, 1),): Fraction(-1)})
        for a, b in self.coprime_pairs:
            for c, other in ((a, b), (b, a)):
                k = p_constant(c)
                if k is not None and other in single:
                    yield abs(int(k))

    def residues(self, p, m: int) -> set | None:
        """Every residue modulo m that the integer polynomial p can take (None: too many cases)."""
        p = _poly(p) if not isinstance(p, dict) else p
        if p is None or not is_integer_polynomial(p) or m < 1 or m > _MAX_MODULUS:
            return None
        reduced = {mono: Fraction(int(c) % m) for mono, c in p.items() if int(c) % m}
        names = sorted(names_of(reduced))
        choices = [self.possible_residues(x, m) for x in names]
        count = 1
        for c in choices:
            count *= len(c)
        if count > _MAX_RESIDUE_TUPLES:
            return None
        out = set()
        for i, values in enumerate(product(*choices)):
            if not i & 1023:
                check_time()
            env = dict(zip(names, values))
            total = 0
            for mono, c in reduced.items():
                term = int(c)
                for n, e in mono:
                    term = term * pow(env[n], e, m) % m
                total += term
            out.add(total % m)
        return out

    def residue(self, p, m: int):
        """The residue of p modulo m when the facts fix it, else None."""
        rs = self.residues(p, m)
        return next(iter(rs)) if rs is not None and len(rs) == 1 else None

    def value_residues(self, v, m: int) -> set | None:
        """The residues modulo m of an integer-valued polynomial value v = N/L: those of N
        modulo m L, divided by L (None when v is not known to be an integer)."""
        p = _poly(v) if not isinstance(v, dict) else v
        if p is None or self.integral(p if not isinstance(p, dict) else _as_value(p)) is not None:
            return None
        n, L = _integer_form(p)
        rs = self.residues(n, m * L)
        return None if rs is None else {t // L for t in rs}

    # -- integers, bounds, zero ------------------------------------------------
    def integral(self, v) -> str | None:
        if isinstance(v, (int, Fraction)):
            return None if Fraction(v).denominator == 1 else f"{value_text(v)} is not an integer"
        p = _poly(v)
        if p is None:
            return f"{value_text(v)} is not a polynomial in the parameters, so it is not known to be an integer"
        n, L = _integer_form(p)
        if L == 1:
            return None
        rs = self.residues(n, L)
        if rs is not None and rs <= {0}:       # (no residue at all: no allowed values)
            return None
        if rs is None:
            return f"the assumptions do not make {value_text(v)} an integer"
        other = min(rs - {0})
        return (f"the assumptions do not make {value_text(v)} an integer: {_text(n)} can be {value_text(other)} "
                f"(mod {value_text(L)})")

    def at_least(self, v, c) -> str | None:
        """v >= c for every allowed value (v a polynomial value, c a rational)."""
        p = _poly(v)
        if p is None:
            return f"{value_text(v)} is not a polynomial in the parameters"
        target = Fraction(c)
        whole = self.integral(v) is None and target.denominator == 1
        if self._bounded_below(p, target, whole, depth=2):
            return None
        return f"the assumptions do not give {_shown(v)} >= {value_text(target)}"

    def _bounded_below(self, p: dict, target: Fraction, whole: bool, depth: int) -> bool:
        lo = self.lower_bound(p)
        if lo != _NEG and (lo >= target or whole and lo > target - 1):
            return True
        if depth == 0:
            return False
        for fact in self.nonnegative:
            for mu in _multipliers(p, fact):
                rest = p_add(p, p_scale(fact, mu), -1)
                if self._bounded_below(rest, target, whole, depth - 1):
                    return True
        return False

    def lower_bound(self, p: dict):
        """A lower bound of p over the box of parameter bounds (or '-inf')."""
        total = Fraction(0)
        for mono, c in p.items():
            interval = (c, c)
            for x, e in mono:
                lo = self.lower.get(x, _NEG)
                hi = self.upper.get(x, _POS)
                lo = Fraction(lo) if lo != _NEG else lo
                hi = Fraction(hi) if hi != _POS else hi
                interval = _interval_mul(interval, _interval_power(lo, hi, e))
            total = _ext_add(total, interval[0])
            if total is None or total == _NEG:
                return _NEG
        return total

    def nonzero(self, v) -> str | None:
        """v != 0 for every allowed value (v a polynomial value)."""
        p = _poly(v)
        if p is None:
            return f"{value_text(v)} is not a polynomial in the parameters"
        c = p_constant(p)
        if c is not None:
            return None if c else "it is 0"
        for f in _factor_pieces(p):
            if self.at_least(RationalFunction.of(f, {(): Fraction(1)}), 1) is None:
                continue
            if self.at_least(RationalFunction.of(p_scale(f, Fraction(-1)), {(): Fraction(1)}), 1) is None:
                continue
            if any(0 not in (self.residues(f, q) or {0}) for q in (2, 3, 4, 5, 7, 8, 9)):
                continue
            return f"the assumptions do not rule out {_text(f)} = 0"
        return None

    # -- coprimality and divisibility --------------------------------------------
    def coprime(self, a, b, depth: int = _EUCLID_DEPTH) -> str | None:
        pa, pb = _poly(a), _poly(b)
        why = f"the assumptions do not give gcd({_shown(a)}, {_shown(b)}) = 1"
        for x, y, other in ((pa, pb, b), (pb, pa, a)):
            if x is not None and y is not None and p_constant(x) in (1, -1):
                # gcd(1, n) = 1 for every integer n, and only for integers: n must be one
                not_whole = self.integral(other)
                return None if not_whole is None else f"{why}: {not_whole}"
        if pa is None or pb is None or not is_integer_polynomial(pa) or not is_integer_polynomial(pb):
            return why + " (both must be integer polynomials)"
        return self._coprime(pa, pb, depth, why)

    def _coprime(self, pa: dict, pb: dict, depth: int, why: str) -> str | None:
        for x, y in ((pa, pb), (pb, pa)):
            c = p_constant(x)
            if c is not None:
                return self._prime_to_constant_value(abs(int(c)), y, why)
        if self._known_coprime(pa, pb):
            return None
        if depth == 0:
            return why
        specific = None          # the first piece that failed, for the message
        for x, y in ((pa, pb), (pb, pa)):
            split = _split(x)
            if len(split) > 1:
                failed = [r for r in (self._coprime(f, y, depth - 1, why) for f in split) if r]
                if not failed:
                    return None
                specific = specific or failed[0]
        for x, y in ((pa, pb), (pb, pa)):
            for reduced in _euclid_steps(x, y):
                if self._coprime(reduced, y, depth - 1, why) is None:
                    return None
        return specific or why

    def _prime_to_constant_value(self, c: int, y: dict, why: str) -> str | None:
        if c == 1:
            return None
        if c == 0:
            return None if p_constant(y) in (1, -1) else why
        if c.bit_length() > 64:
            return f"{why} ({value_text(c)} is too large to factor here)"
        for p in _primes_dividing(c):
            rs = self.residues(y, p)
            if rs is None or 0 in rs:
                names = sorted(names_of(y))
                if len(y) == 1 and len(names) == 1 and rs is not None:
                    return f"{why}: {names[0]} can be 0 (mod {p})"
                if rs is None:
                    factor = f"the prime {p}" if p == c else f"the prime factor {p} of {c}"
                    return f"{why}: {_text(y)} is not known to be prime to {factor}"
                return f"{why}: {_text(y)} can be 0 (mod {p})"
        return None

    def _known_coprime(self, pa: dict, pb: dict) -> bool:
        neg_a, neg_b = p_scale(pa, Fraction(-1)), p_scale(pb, Fraction(-1))
        for x, y in self.coprime_pairs:
            if (x in (pa, neg_a) and y in (pb, neg_b)) or (x in (pb, neg_b) and y in (pa, neg_a)):
                return True
        return False

    def divides(self, m, v) -> str | None:
        """m | v for every allowed value (integer polynomials)."""
        pm, pv = _poly(m), _poly(v)
        why = f"the assumptions do not give {_shown(v)} = 0 (mod {_shown(m)})"
        if pm is None or pv is None:
            return why
        if self._divides_plainly(pm, pv):
            return None
        for fact, modulus in self.divisible:
            if not self._divides_plainly(pm, modulus):
                continue
            for c in _integer_ratios(pv, fact):
                if self._divides_plainly(pm, p_add(pv, p_scale(fact, c), -1)):
                    return None
        return why

    def _divides_plainly(self, pm: dict, pv: dict) -> bool:
        if not pv:
            return True
        c = p_constant(pm)
        if c is not None:
            c = abs(c)
            if c == 0 or c.denominator != 1:
                return False
            return self.value_residues(pv, int(c)) == {0}
        q = exact_quotient(pv, pm)
        return q is not None and self.integral(RationalFunction.of(q, {(): Fraction(1)})) is None


def _as_value(p: dict):
    c = p_constant(p)
    return c if c is not None else RationalFunction.of(p, {(): Fraction(1)})


def _shown(v) -> str:
    if isinstance(v, dict):
        return _text(v)
    return value_text(v)


def _multipliers(p: dict, fact: dict):
    """mu > 0 that cancel a degree-one term of p against the fact."""
    out = []
    for mono, c in fact.items():
        if len(mono) == 1 and mono[0][1] == 1 and mono in p:
            mu = p[mono] / c
            if mu > 0 and mu not in out:
                out.append(mu)
    return out


def _integer_ratios(p: dict, fact: dict):
    out = [Fraction(1), Fraction(-1)]
    if p and fact:
        m = max(fact, key=lambda mono: (sum(e for _, e in mono), mono))
        if m in p:
            r = p[m] / fact[m]
            if r.denominator == 1 and r not in out:
                out.append(r)
    return out


def _factor_pieces(p: dict) -> list:
    """Integer polynomials f with p = c * prod f^e (c a nonzero constant): the primitive
    irreducible factors, or p in integer form when the factorization cannot be had.  p is 0
    at a point exactly when one of them is, and divides what their product divides."""
    found = integer_factorization(p)
    if found is None:
        return [_integer_form(p)[0]]
    return [f for f, _ in found[1]]


def _split(p: dict) -> list:
    """The pieces of the integer polynomial p whose values' common divisors are those of p:
    its content c (when |c| > 1) and each primitive irreducible factor, from p = c prod f^e
    (``integer_factorization`` multiplies it out and checks it); [p] when it cannot be had."""
    found = integer_factorization(p)
    if found is None:
        return [p]
    c, pieces = found
    out = [f for f, _ in pieces]
    if abs(c) != 1:
        out.append({(): abs(c)})
    return out


def _primitive(p: dict) -> dict:
    g = 0
    for c in p.values():
        g = gcd(g, int(c))
    return p_scale(p, Fraction(1, g)) if g > 1 else p


def _euclid_steps(x: dict, y: dict):
    """x reduced modulo y, for y = s*v + R with s = +-1 and R free of the parameter v."""
    for mono, c in y.items():
        if len(mono) != 1 or mono[0][1] != 1 or abs(c) != 1:
            continue
        v = mono[0][0]
        rest = {m: k for m, k in y.items() if m != mono}
        if v in names_of(rest) or v not in names_of(x):
            continue
        # v = -R/s (mod y): substitute into x
        value = p_scale(rest, -1 / c)
        yield _substitute(x, v, value)


def _substitute(p: dict, v: str, value: dict) -> dict:
    from .rational_functions import p_mul
    out: dict = {}
    for mono, c in p.items():
        term = {tuple((n, e) for n, e in mono if n != v): c}
        e = dict(mono).get(v, 0)
        for _ in range(e):
            term = p_mul(term, value)
        out = p_add(out, term)
    return out


def _primes_dividing(c: int) -> list:
    from sympy import factorint
    return sorted(factorint(c))
