"""The rules of ``rules`` for calls whose arguments contain parameters.

Same identities, same names; each side condition is derived from the
lemma's assumptions by ``Assumptions`` (coprimality, signs, residues,
divisibility) and the rule refuses, naming the condition, when it cannot be.
Calls with numbers only are left to ``rules``.

>>> from checker.kernel.assumptions import Assumptions
>>> from checker.kernel.rational_functions import RationalFunction as R
>>> from checker.kernel.symbolic import line_text
>>> k = R.variable("k")
>>> facts = Assumptions(("k",)); _ = facts.add_bound(k - 1); _ = facts.add_congruence(k - 1, 2)
>>> [line_text(x) for x in rewrite(facts, None, "reciprocity", ("dedekind", (Fraction(2), k)), set())]
['(k^2 - 6*k + 5)/(24*k) - dedekind(k, 2)']
"""
from __future__ import annotations

from fractions import Fraction
from math import comb

from ..mathematics.bernoulli import bernoulli
from ..foundation.errors import RuleRefused
from .normal import add, atom_nf, mul, scale
from .rational_functions import RationalFunction
from .rules import RULES
from .symbolic import atom_label, atom_problem, fixed_sawtooth, is_symbolic, value_label

__all__ = ["rewrite"]


def rewrite(facts, limits, name: str, atom, target: set) -> list:
    """The normal forms `atom` may become by the rule `name` (raises RuleRefused)."""
    if not is_symbolic(atom[1]):
        return RULES[name].rewrite(atom, target, limits)
    why = atom_problem(facts, atom)
    if why:
        raise RuleRefused(f"{atom_label(atom)} is not known to be defined: {why}")
    handler = _RULES.get(name)
    if handler is None:
        raise RuleRefused(f"{name} has no form for calls with parameters")
    return handler(facts, limits, atom, target)


def _refuse(message: str):
    raise RuleRefused(message)


def _require(reason):
    if reason:
        raise RuleRefused(reason)


def _only(atom, *names):
    if atom[0] not in names:
        _refuse(f"it does not apply to {atom[0]}")


def _call(name, *args) -> dict:
    return atom_nf((name, tuple(args)))


def _c(v) -> dict:
    return {frozenset(): v} if v else {}


def _dedekind_targets(target, k=None):
    for a in sorted(target, key=atom_label):
        if a[0] == "dedekind" and (k is None or a[1][1] == k):
            yield a[1]


# -- reduce ---------------------------------------------------------------------

def _reduce(facts, limits, atom, target):
    name, args = atom
    if name == "dedekind":
        h, k = args
        pos = 0
    elif name == "generalized_dedekind":
        p, h, k = args
        pos = 1
    else:
        _refuse(f"it does not apply to {name} with parameters")
    choices, reasons = [], []
    for other in sorted(target, key=atom_label):
        if other[0] != name or other == atom or other[1][pos + 1] != k or other[1][:pos] != args[:pos]:
            continue
        x = other[1][pos]
        why = facts.divides(k, h - x)
        if why:
            reasons.append(why)
        else:
            choices.append(x)
    if not choices and not isinstance(k, RationalFunction):
        rs = facts.value_residues(h, int(k))
        if rs is not None and len(rs) == 1:
            choices.append(Fraction(rs.pop()))
    if not choices:
        if reasons:
            _refuse(reasons[0])
        _refuse(f"the next line has no {name} with an argument congruent to {value_label(h)} "
                f"modulo {value_label(k)}, and the assumptions do not fix {value_label(h)} mod "
                f"{value_label(k)}")
    return [_call(name, *args[:pos], x, k) for x in choices]


# -- reciprocity -----------------------------------------------------------------

def _positive_coprime(facts, h, k):
    _require(facts.at_least(h, 1) and f"reciprocity needs h >= 1: {facts.at_least(h, 1)}")
    _require(facts.at_least(k, 1) and f"reciprocity needs k >= 1: {facts.at_least(k, 1)}")
    _require(facts.coprime(h, k) and f"reciprocity needs coprime h and k: {facts.coprime(h, k)}")


def _reciprocity(facts, limits, atom, target):
    name, args = atom
    if name == "dedekind":
        h, k = args
        _positive_coprime(facts, h, k)
        term = (h / k + k / h + 1 / (h * k)) / 12 - Fraction(1, 4)
        return [add(_c(term), scale(_call("dedekind", k, h), Fraction(-1)))]
    if name == "generalized_dedekind":
        p, h, k = args
        if p.denominator != 1 or p < 1 or p.numerator % 2 == 0:
            _refuse(f"Apostol's reciprocity needs an odd order p >= 1, not {value_label(p)}")
        p = p.numerator
        _positive_coprime(facts, h, k)
        lead = (p + 1) * h * k ** p
        total = Fraction(p) * bernoulli(p + 1)
        for j in range(p + 2):
            total = total + comb(p + 1, j) * (-1) ** j * bernoulli(j) * bernoulli(p + 1 - j) \
                * h ** j * k ** (p + 1 - j)
        other = scale(_call(name, Fraction(p), k, h), -(p + 1) * k * h ** p / lead)
        return [add(_c(total / lead), other)]
    if name in ("fourier_dedekind", "dedekind_rademacher"):
        _refuse(f"reciprocity for {name} has no form for calls with parameters (its side conditions, "
                "pairwise coprimality and the range of n, are not derived); give the arguments numbers")
    _refuse(f"it does not apply to {name}")


# -- negate, inverse, common factor -------------------------------------------------

def _negate(facts, limits, atom, target):
    name, args = atom
    if name == "dedekind":
        h, k = args
        return [scale(_call("dedekind", -h, k), Fraction(-1))]
    if name == "generalized_dedekind":
        p, h, k = args
        return [scale(_call(name, p, -h, k), Fraction((-1) ** p.numerator))]
    _refuse(f"it does not apply to {name}")


def _inverse(facts, limits, atom, target):
    _only(atom, "dedekind")
    h, k = atom[1]
    choices, reasons = [], []
    for x, y in _dedekind_targets(target, k):
        if (x, y) == (h, k):
            continue
        why = facts.divides(k, x * h - 1)
        if why:
            reasons.append(why)
        else:
            choices.append(x)
    if not choices:
        _refuse(reasons[0] if reasons else
                f"the next line has no dedekind(h', {value_label(k)}) with h' {value_label(h)} = 1 "
                f"(mod {value_label(k)})")
    return [_call("dedekind", x, k) for x in choices]


def _common_factor(facts, limits, atom, target):
    _only(atom, "dedekind")
    h, k = atom[1]
    out, reasons = [], []
    for x, y in _dedekind_targets(target):
        if (x, y) == (h, k) or x * k != h * y:
            continue
        for big, small in ((k, y), (y, k)):
            g = big / small
            why = facts.integral(g) or facts.at_least(g, 1)
            if why:
                reasons.append(f"common_factor needs a whole factor g >= 1: {why}")
            else:
                out.append(_call("dedekind", x, y))
                break
    if not out:
        _refuse(reasons[0] if reasons else
                f"the next line has no dedekind(h/g, k/g) or dedekind(g h, g k) for {atom_label(atom)}")
    return out


# -- the three-term law --------------------------------------------------------------

def _three_term(facts, limits, atom, target):
    _only(atom, "dedekind")
    x, a = atom[1]
    others = [t for t in _dedekind_targets(target) if t != (x, a)]
    reasons = []
    for y, b in others:
        for z, c in others:
            if (z, c) == (y, b):
                continue
            why = _three_term_problem(facts, x, a, y, b, z, c)
            if not why:
                term = Fraction(-1, 4) + (a * a + b * b + c * c) / (12 * a * b * c)
                return [add(_c(term), scale(add(_call("dedekind", y, b), _call("dedekind", z, c)),
                                            Fraction(-1)))]
            reasons.append(why)
    if not reasons:
        _refuse("the three-term law needs two other dedekind sums in the next line")
    _refuse(reasons[0])


def _three_term_problem(facts, x, a, y, b, z, c) -> str:
    for v in (a, b, c):
        why = facts.at_least(v, 1)
        if why:
            return f"the three-term law needs a, b, c >= 1: {why}"
    for p, q in ((a, b), (b, c), (a, c)):
        why = facts.coprime(p, q)
        if why:
            return f"the three-term law needs pairwise coprime a, b, c: {why}"
    # s(b c*, a): x c = b (mod a), and likewise around
    for first, m, num, inv_of, label in ((x, a, b, c, "s(b c*, a)"), (y, b, c, a, "s(c a*, b)"),
                                         (z, c, a, b, "s(a b*, c)")):
        why = facts.divides(m, first * inv_of - num)
        if why:
            return f"the three-term law needs {label}: {why}"
    return ""


# -- the bridge from Fourier-Dedekind sums to Dedekind sums ---------------------------

def _bridge(facts, limits, atom, target):
    """s_0(a, c; b) = -s(x, b) + (b - 1)/(4b) for x c = a or x a = c (mod b), both derived."""
    _only(atom, "fourier_dedekind")
    n, parts, b = atom[1]
    if not isinstance(parts, tuple) or len(parts) != 2:
        _refuse("the bridge needs a list of two entries [a, c]")
    a, c = parts
    for why in (facts.at_least(b, 1), facts.divides(b, n)):
        _require(why and f"the bridge needs b >= 1 and n = 0 (mod b): {why}")
    for x in (a, c):
        why = facts.coprime(x, b)
        _require(why and f"the bridge needs a and c coprime to b: {why}")
    choices, reasons = [], []
    for x, y in _dedekind_targets(target, b):
        why = facts.divides(b, x * c - a)
        if why and facts.divides(b, x * a - c) is None:
            why = None
        if why:
            reasons.append(f"the bridge needs s(a c', b) with c c' = 1 (mod b): {why}")
        else:
            choices.append(x)
    for unit, other in ((c, a), (a, c)):      # c = +-1: c' = c, so a c' = a c needs no inverse
        if not isinstance(unit, RationalFunction) and unit in (1, -1):
            choices.append(other * unit)
    if not choices:
        _refuse(reasons[0] if reasons else
                "the bridge needs dedekind(a c', b) in the next line, with c c' = 1 (mod b)")
    term = (b - 1) / (4 * b)
    return [add(_c(term), scale(_call("dedekind", x, b), Fraction(-1))) for x in choices]


# -- definition ----------------------------------------------------------------------

def _by_definition(facts, limits, atom, target):
    _only(atom, "dedekind")
    h, k = atom[1]
    if isinstance(k, RationalFunction):
        _refuse("definition needs a number k: a sum of k terms cannot be written out for a parameter k")
    k = k.numerator
    limits.require("definition_terms", k, f"writing dedekind(h, {value_label(k)}) out by its definition")
    total: dict = {}
    for j in range(1, k):
        other = fixed_sawtooth(facts, h * Fraction(j, k))
        second = _call("sawtooth", h * Fraction(j, k)) if other is None else _c(other)
        total = add(total, mul(_call("sawtooth", Fraction(j, k)), second))
    return [total]


_RULES = {
    "reduce": _reduce,
    "reciprocity": _reciprocity,
    "negate": _negate,
    "inverse": _inverse,
    "common_factor": _common_factor,
    "three_term": _three_term,
    "definition": _by_definition,
    "bridge": _bridge,
}
