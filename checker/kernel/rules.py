"""The rules a chain step may cite, each a published identity with its side conditions.

A rule acts on one atom (a function call at concrete arguments) and returns
the normal forms it may be replaced by; it refuses, with the reason, when a
side condition fails.  Rules never look at values: the kernel compares the
result with the next line as normal forms, and separately compares values.
Where a rule leaves a choice (which inverse, which common factor, which two
companion sums of the three-term law), the candidates are read off the atoms
of the next line, so the writer's choice is checked, not guessed.

>>> from fractions import Fraction as F
>>> from checker.kernel.normal import text
>>> [text(r) for r in RULES["reciprocity"].rewrite(("dedekind", (F(5), F(17))), set(), None)]
['1/17 - dedekind(17, 5)']
"""
from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from math import comb, gcd
from typing import Callable

from ..mathematics.bernoulli import bernoulli
from ..mathematics.dedekind import reciprocity_term
from ..foundation.errors import RuleRefused
from .normal import NF, add, atom_nf, atom_text, constant, mul, scale
from ..foundation.numbers import value_text

__all__ = ["Rule", "RULES", "WHOLE_LINE_RULES"]


@dataclass(frozen=True)
class Rule:
    name: str
    statement: str            # the identity, as the README prints it
    conditions: str           # side conditions, in words
    source: str               # where the identity is published
    rewrite: Callable         # (atom, target_atoms, limits) -> list[NF]


# Rules that act on a whole line rather than on one call (handled by the kernel).
WHOLE_LINE_RULES = {
    "arithmetic": ("the next line is the same polynomial in the function calls",
                   "none", "exact rational arithmetic"),
    "value": ("every function call that disappears is replaced by its exact value",
              "at least one call disappears", "the kernel's exact functions"),
    "claim": ("previous line - next line = c * (lhs - rhs) of an earlier verified equality",
              "the claim or chain was verified above; c is a nonzero rational", "the certificate itself"),
}


def _refuse(msg: str):
    raise RuleRefused(msg)


def _integers(atom, names):
    name, args = atom
    out = []
    for label, a in zip(names, args):
        if not isinstance(a, Fraction) or a.denominator != 1:
            _refuse(f"{name} needs an integer {label}, not {value_text(a)}")
        out.append(a.numerator)
    return out


def _call(name, *args) -> NF:
    args = tuple(a if isinstance(a, tuple) else Fraction(a) for a in args)
    if name == "sawtooth" and args[0].denominator == 1:
        return {}
    return atom_nf((name, args))


def _dedekind_args(atom):
    h, k = _integers(atom, ("h", "k"))
    if k < 1:
        _refuse(f"dedekind(h, k) needs k >= 1, not {k}")
    return h, k


def _only(atom, *names):
    if atom[0] not in names:
        _refuse(f"it does not apply to {atom[0]}")


# -- reduce -----------------------------------------------------------------

def _reduce(atom, target, limits):
    name, args = atom
    if name == "dedekind":
        h, k = _dedekind_args(atom)
        # h mod k, or any other h' = h (mod k) that the next line uses
        choices = {x for x, y in _target_dedekind(target) if y == k and (x - h) % k == 0 and x != h}
        if not 0 <= h < k:
            choices.add(h % k)
        if not choices:
            _refuse(f"dedekind({h}, {k}) is already reduced (0 <= h < k), and the next line has no "
                    f"dedekind(h', {k}) with h' = {h} (mod {k})")
        return [_call("dedekind", x, k) for x in sorted(choices)]
    if name == "generalized_dedekind":
        p, h, k = _integers(atom, ("order", "h", "k"))
        if k < 1:
            _refuse(f"generalized_dedekind needs k >= 1, not {k}")
        return [_call(name, p, h % k, k)]
    if name == "fourier_dedekind":
        (n, b) = _integers((name, (args[0], args[2])), ("n", "b"))
        parts = args[1]
        if not isinstance(parts, tuple) or b < 1:
            _refuse("fourier_dedekind(n, [a1..am], b) needs a list and b >= 1")
        reduced = tuple(Fraction(_integers((name, (a,)), ("entry",))[0] % b) for a in parts)
        return [_call(name, n % b, reduced, b)]
    _refuse(f"it does not apply to {name}")


# -- reciprocity -------------------------------------------------------------

def _apostol_right_side(p: int, h: int, k: int) -> Fraction:
    total = sum(comb(p + 1, j) * (-1) ** j * bernoulli(j) * bernoulli(p + 1 - j) * h ** j * k ** (p + 1 - j)
                for j in range(p + 2))
    return total + p * bernoulli(p + 1)


def _reciprocity(atom, target, limits):
    name = atom[0]
    if name == "dedekind":
        h, k = _dedekind_args(atom)
        if h < 1:
            _refuse(f"reciprocity needs h >= 1 and k >= 1, but h = {h} (use reduce or negate first)")
        g = gcd(h, k)
        if g != 1:
            _refuse(f"reciprocity needs coprime h and k, but gcd({h}, {k}) = {g}")
        return [add(constant(reciprocity_term(h, k)), scale(_call("dedekind", k, h), Fraction(-1)))]
    if name == "generalized_dedekind":
        p, h, k = _integers(atom, ("order", "h", "k"))
        if p < 1 or p % 2 == 0:
            _refuse(f"Apostol's reciprocity needs an odd order p >= 1, not {p}")
        if h < 1 or k < 1:
            _refuse(f"reciprocity needs h >= 1 and k >= 1, not h = {h}, k = {k}")
        g = gcd(h, k)
        if g != 1:
            _refuse(f"reciprocity needs coprime h and k, but gcd({h}, {k}) = {g}")
        # (p+1)(h k^p s_p(h,k) + k h^p s_p(k,h)) = R
        lead = Fraction((p + 1) * h * k ** p)
        other = scale(_call(name, p, k, h), Fraction(-(p + 1) * k * h ** p) / lead)
        return [add(constant(_apostol_right_side(p, h, k) / lead), other)]
    _refuse(f"it does not apply to {name}")


# -- negate ------------------------------------------------------------------

def _negate(atom, target, limits):
    name = atom[0]
    if name == "dedekind":
        h, k = _dedekind_args(atom)
        return [scale(_call("dedekind", -h, k), Fraction(-1))]
    if name == "generalized_dedekind":
        p, h, k = _integers(atom, ("order", "h", "k"))
        if k < 1 or p < 1:
            _refuse("generalized_dedekind(p, h, k) needs p >= 1 and k >= 1")
        return [scale(_call(name, p, -h, k), Fraction((-1) ** p))]
    _refuse(f"it does not apply to {name}")


# -- inverse -----------------------------------------------------------------

def _target_dedekind(target):
    # sorted: set order of atoms varies between runs, messages must not
    for a in sorted(target, key=atom_text):
        if a[0] == "dedekind" and all(isinstance(x, Fraction) and x.denominator == 1 for x in a[1]):
            yield a[1][0].numerator, a[1][1].numerator


def _inverse(atom, target, limits):
    _only(atom, "dedekind")
    h, k = _dedekind_args(atom)
    g = gcd(h, k)
    if g != 1:
        _refuse(f"inverse needs h coprime to k, but gcd({h}, {k}) = {g}")
    choices = {pow(h, -1, k) if k > 1 else 0}
    for x, y in _target_dedekind(target):
        if y == k and (x * h - 1) % k == 0:
            choices.add(x)
    return [_call("dedekind", x, k) for x in sorted(choices)]


# -- common factor -----------------------------------------------------------

def _common_factor(atom, target, limits):
    _only(atom, "dedekind")
    h, k = _dedekind_args(atom)
    out = []
    g = gcd(h, k)
    if g > 1:
        out.append(_call("dedekind", h // g, k // g))
    for x, y in _target_dedekind(target):
        if y >= 1 and (x, y) != (h, k) and x * k == h * y and (k % y == 0 or y % k == 0):
            out.append(_call("dedekind", x, y))
    if not out:
        _refuse(f"dedekind({h}, {k}) has no common factor to cancel, and the next line has no "
                "dedekind(g h, g k) to expand it into")
    return out


# -- Rademacher's three-term law --------------------------------------------

def _three_term(atom, target, limits):
    _only(atom, "dedekind")
    x, a = _dedekind_args(atom)
    others = [(y, b) for y, b in _target_dedekind(target) if (y, b) != (x, a)]
    out, reasons = [], []
    for i, (y, b) in enumerate(others):
        for z, c in others:
            if (z, c) == (y, b):
                continue
            why = _three_term_mismatch(x, a, y, b, z, c)
            if why is None:
                rhs = Fraction(-1, 4) + Fraction(a * a + b * b + c * c, 12 * a * b * c)
                out.append(add(constant(rhs), scale(add(_call("dedekind", y, b), _call("dedekind", z, c)),
                                                    Fraction(-1))))
            elif why not in reasons:
                reasons.append(why)
    if not out:
        if len(others) < 2:
            _refuse("the three-term law replaces s(b c*, a) by -1/4 + (a^2+b^2+c^2)/(12abc) - s(c a*, b) "
                    "- s(a b*, c), but the next line has no two other dedekind sums")
        # prefer the ordering in which the rewritten call itself fits the law
        fitting = [r for r in reasons if "s(b c*, a)" not in r]
        _refuse((fitting or reasons)[0])
    return out


def _three_term_mismatch(x, a, y, b, z, c):
    if min(a, b, c) < 1:
        return f"the three-term law needs a, b, c >= 1 (here {a}, {b}, {c})"
    for p, q in ((a, b), (b, c), (a, c)):
        if gcd(p, q) != 1:
            return f"the three-term law needs pairwise coprime a, b, c, but gcd({p}, {q}) = {gcd(p, q)}"
    checks = ((x, a, b, c, "s(b c*, a)"), (y, b, c, a, "s(c a*, b)"), (z, c, a, b, "s(a b*, c)"))
    for value, m, num, inv_of, label in checks:
        if m > 1 and (value - num * pow(inv_of, -1, m)) % m:
            return (f"with a, b, c = {a}, {b}, {c} the law needs {label} with first argument "
                    f"= {num * pow(inv_of, -1, m) % m} (mod {m}), not {value}")
    return None


# -- definition --------------------------------------------------------------

def _by_definition(atom, target, limits):
    name, args = atom
    if name == "dedekind":
        h, k = _dedekind_args(atom)
        limits.require("definition_terms", k, f"writing dedekind(h, {k}) out by its definition")
        total: NF = {}
        for j in range(k):
            total = add(total, mul(_call("sawtooth", Fraction(j, k)), _call("sawtooth", Fraction(h * j, k))))
        return [total]
    if name == "dedekind_rademacher":
        h, k = _integers(atom, ("h", "k"))
        x, y = args[2], args[3]
        if k < 1 or isinstance(x, tuple) or isinstance(y, tuple):
            _refuse("dedekind_rademacher(h, k, x, y) needs k >= 1 and rational x, y")
        limits.require("definition_terms", k, f"writing out a sum of {k} terms")
        total = {}
        for j in range(k):
            total = add(total, mul(_call("sawtooth", h * (j + y) / k + x), _call("sawtooth", (j + y) / k)))
        return [total]
    if name == "generalized_dedekind":
        p, h, k = _integers(atom, ("order", "h", "k"))
        if k < 1 or p < 1:
            _refuse("generalized_dedekind(p, h, k) needs p >= 1 and k >= 1")
        limits.require("definition_terms", k, f"writing out a sum of {k} terms")
        total = {}
        for j in range(1, k):
            total = add(total, scale(_call("periodic_bernoulli", p, Fraction(h * j, k)), Fraction(j, k)))
        return [total]
    _refuse(f"quasicert knows no definition of {name} as a finite sum")


RULES: dict[str, Rule] = {r.name: r for r in [
    Rule("reduce", "s(h, k) = s(h', k) for h' = h (mod k), by default h mod k; also s_p(h, k), and s_n(A; b) modulo b",
         "k >= 1 (b >= 1)", "definition (periodicity of the sawtooth)", _reduce),
    Rule("reciprocity", "s(h, k) = -1/4 + (h/k + k/h + 1/(hk))/12 - s(k, h); Apostol's law for s_p, p odd",
         "h >= 1, k >= 1, gcd(h, k) = 1", "Dedekind (1892); Apostol, Duke Math. J. 17 (1950)", _reciprocity),
    Rule("negate", "s(h, k) = -s(-h, k); s_p(h, k) = (-1)^p s_p(-h, k)", "k >= 1",
         "definition (the sawtooth is odd)", _negate),
    Rule("inverse", "s(h, k) = s(h', k) where h h' = 1 (mod k)", "gcd(h, k) = 1",
         "Rademacher & Grosswald, Dedekind Sums (1972), ch. 3", _inverse),
    Rule("common_factor", "s(g h, g k) = s(h, k)", "g >= 1 divides both arguments",
         "Rademacher & Grosswald, Dedekind Sums (1972), ch. 3", _common_factor),
    Rule("three_term", "s(b c*, a) + s(c a*, b) + s(a b*, c) = -1/4 + (a^2 + b^2 + c^2)/(12 a b c)",
         "a, b, c >= 1 pairwise coprime; c c* = 1 (mod a), a a* = 1 (mod b), b b* = 1 (mod c)",
         "Rademacher, Pacific J. Math. 4 (1954)", _three_term),
    Rule("definition", "s(h, k) = total(j from 0 to k-1: sawtooth(j/k) * sawtooth(h*j/k)); likewise "
         "dedekind_rademacher and generalized_dedekind", "k within the definition-terms limit",
         "the definitions", _by_definition),
]}
