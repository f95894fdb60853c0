"""The trusted kernel: the only code that says "verified".

It decides three kinds of judgement, on normal forms and exact values that it
is handed (parsing, reporting and file handling live elsewhere):

- a relation between two exact values (=, <, <=, >, >=, !=) or a congruence;
- a chain step, checked twice: (1) the cited rules, applied to calls of the
  previous line, give the next line as a normal form; (2) the two lines have
  the same exact value;
- the use of an earlier verified equality: previous - next = c (lhs - rhs);
- a Frobenius witness: g is not representable and g+1, ..., g+min(A) are;
- that the cases of a lemma's case split cover every residue class allowed.
  (Identities between quasi-polynomials are decided in ``quasipolynomial``.)
"""
from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction

from ..foundation.errors import CertificateError, RuleRefused
from ..foundation.numbers import rough_int, value_text
from .normal import NF, atom_text, atoms, constant, scale, sub, substitute
from .ratios import Ratio
from .rules import RULES, WHOLE_LINE_RULES

__all__ = ["compare", "compare_to_quotient", "congruent", "StepVerdict", "check_step", "nf_value", "known_rule",
           "frobenius_witness_problem", "representation_problem", "uncovered_residues",
           "conclusion_problem"]

_MAX_CANDIDATES = 256


def compare(lhs: Fraction, relation: str, rhs: Fraction) -> bool:
    """The truth of `lhs relation rhs` for exact values."""
    if relation == "=":
        return lhs == rhs
    if relation == "!=":
        return lhs != rhs
    if relation == "<":
        return lhs < rhs
    if relation == "<=":
        return lhs <= rhs
    if relation == ">":
        return lhs > rhs
    if relation == ">=":
        return lhs >= rhs
    raise ValueError(relation)


def compare_to_quotient(lhs: Fraction, relation: str, p: int, q: int) -> bool:
    """The truth of `lhs relation p/q` for an exact value and integers p and q > 0, with no gcd:
    a/b against p/q with b, q > 0 is a*q against p*b (multiplying by b*q > 0 keeps the order).

    >>> compare_to_quotient(Fraction(1, 3), "=", 2, 6), compare_to_quotient(Fraction(-1, 3), "<", -1, 4)
    (True, True)
    """
    if q <= 0:
        raise ValueError("the denominator must be positive")
    return compare(lhs.numerator * q, relation, p * lhs.denominator)     # exact on ints as on Fractions


def congruent(lhs: Fraction, rhs: Fraction, modulus: Fraction) -> bool:
    """lhs = rhs (mod m): (lhs - rhs)/m is an integer.  m must be a nonzero integer."""
    if modulus == 0 or modulus.denominator != 1:
        raise ValueError("modulus")
    return ((lhs - rhs) / modulus).denominator == 1


def nf_value(x: NF, call, limits=None):
    """The exact value of a normal form (a Fraction or an unreduced Ratio: compare it, do not
    read its numerator); `call(name, args)` gives an atom's value."""
    total = Fraction(0)
    for m, c in x.items():
        term = c
        for (name, args), e in m:   # (1 * v and v ** 1 are skipped below: each costs gcds of long numbers)
            v = call(name, args)
            if isinstance(v, tuple):
                raise CertificateError(f"{name} gives a list where a number is needed")
            if v == 0 and e < 0:
                raise CertificateError(f"{atom_text((name, args))} is 0 and stands in a denominator")
            if limits is not None and abs(e) > 1 and v not in (0, 1, -1):
                size = max(v.numerator.bit_length(), v.denominator.bit_length())
                limits.require("integer_bits", (size - 1) * abs(e) + 1,
                               f"the power {abs(e)} of {atom_text((name, args))}")
            factor = v if e == 1 else v ** e
            term = factor if term == 1 else -factor if term == -1 else term * factor
        total = term if not total else total + term
    return total if isinstance(total, (Fraction, Ratio)) else Fraction(total)


def known_rule(name: str) -> bool:
    return name in RULES or name in WHOLE_LINE_RULES


@dataclass
class StepVerdict:
    rule_ok: bool
    refusals: list = field(default_factory=list)     # (atom, reason) pairs
    candidates: list = field(default_factory=list)   # what the rules could produce
    problem: str = ""                                # a whole-line rule's reason


class _Candidates:
    """The distinct lines a rule gives, in the order produced, at most _MAX_CANDIDATES of them.

    Filled as they are made, so that a line of many calls whose rule offers many choices each
    (reduce or descent towards the many calls of the next line) stops at the cap instead of
    building every product of the choices first: the same list as cutting it afterwards."""

    def __init__(self):
        self.items, self._seen = [], set()

    def full(self) -> bool:
        return len(self.items) >= _MAX_CANDIDATES

    def add(self, x: NF) -> None:
        key = frozenset(x.items())
        if key not in self._seen and not self.full():
            self._seen.add(key)
            self.items.append(x)


def _apply_atom_rule(rewrite, x: NF, target_atoms: set, refusals: list, limit, out: _Candidates) -> None:
    for atom in _in_order(atoms(x)):
        if out.full():
            return
        try:
            replacements = rewrite(atom, target_atoms)
        except RuleRefused as e:
            refusals.append((atom, e.message))
            continue
        for r in replacements:
            if out.full():
                return
            y = substitute(x, atom, r, limit)
            if y is not None:
                out.add(y)


def _in_order(calls: set) -> list:
    """The calls in the order of their text (one call needs no text: a 1000-digit argument
    costs a quadratic conversion to decimal)."""
    return list(calls) if len(calls) < 2 else sorted(calls, key=atom_text)


def _apply_value(x: NF, target: NF, call, refusals: list) -> list[NF]:
    gone = atoms(x) - atoms(target)
    if not gone:
        refusals.append((None, "value replaces function calls by their values, but every call of "
                               "the previous line is still in the next"))
        return []
    y = x
    for atom in _in_order(gone):
        try:
            v = call(*atom)
        except RuleRefused as e:
            refusals.append((atom, e.message))
            return []
        if isinstance(v, tuple):
            refusals.append((atom, "this call gives a list, not a number"))
            return []
        y = substitute(y, atom, constant(v))
        if y is None:
            refusals.append((atom, "its value 0 would stand in a denominator"))
            return []
    return [y]


def _apply_claim(x: NF, target: NF, fact, multiplier_problem=None, what: str = "the claim") -> tuple[bool, str]:
    lhs, rhs = fact
    diff = sub(x, target)
    claim = sub(lhs, rhs)
    if not diff:
        return False, f"this step does not change the previous line, so it does not use {what}"
    if not claim:
        return False, f"{what} is the identity 0 = 0 and cannot change a line"
    m = next(iter(claim))
    c = diff.get(m, Fraction(0)) / claim[m]
    if c and scale(claim, c) == diff:
        # with parameters, c must be defined wherever the lines are
        why = multiplier_problem(c) if multiplier_problem else ""
        if why:
            return False, why
        return True, ""
    return False, ("the difference between the previous line and this one is not a multiple of "
                   f"(left side - right side) of {what}")


def check_step(prev: NF, nxt: NF, rules: list, call, facts: dict, limits,
               rewrite=None, multiplier_problem=None) -> StepVerdict:
    """Judgement (1): do the cited rules, in order, turn `prev` into `nxt`?

    `rules` is a list of (name, label) pairs; `facts` maps labels to verified
    equalities (lhs NF, rhs NF); `call` evaluates an atom exactly.  For lines
    with parameters, `rewrite(name, atom, target_atoms)` applies a rule with the
    side conditions derived from the assumptions, and `multiplier_problem(c)`
    says why a multiple c of an equality may be undefined ('' when it is not).
    """
    if rewrite is None:
        def rewrite(name, atom, target):
            return RULES[name].rewrite(atom, target, limits)
    limit = limits.terms if limits else None
    verdict = StepVerdict(False)
    current = [prev]
    target_atoms = atoms(nxt)
    for index, (name, label) in enumerate(rules):
        if name == "claim":
            if index != len(rules) - 1:
                verdict.problem = "`claim LABEL` and `lemma NAME(...)` must be the last rule of a step"
                return verdict
            if label not in facts:
                verdict.problem = f"there is no verified equality labelled '{label}' above this step"
                return verdict
            for x in current:
                what = label if label.startswith("lemma ") else f"claim {label}"
                ok, why = _apply_claim(x, nxt, facts[label], multiplier_problem, what)
                if ok:
                    verdict.rule_ok = True
                    return verdict
                verdict.problem = why
            return verdict
        produced = _Candidates()
        for x in current:
            if produced.full():
                break
            if name == "arithmetic":
                produced.add(x)
            elif name == "value":
                for y in _apply_value(x, nxt, call, verdict.refusals):
                    produced.add(y)
            else:
                _apply_atom_rule(lambda a, t: rewrite(name, a, t), x, target_atoms,
                                 verdict.refusals, limit, produced)
        current = produced.items
        if not current:
            return verdict
    verdict.candidates = current
    verdict.rule_ok = any(c == nxt for c in current)
    return verdict


def conclusion_problem(start: NF, end: NF, lhs: NF, rhs: NF) -> str:
    """'' when a chain from `start` to `end` proves lhs = rhs: the same normal forms."""
    if start != lhs:
        return "start"
    if end != rhs:
        return "end"
    return ""


def uncovered_residues(facts, var: str, m: int, residues) -> list:
    """The classes var = r (mod m) that the assumptions allow and no case covers.

    `facts.possible_residues` may keep a class the assumptions in fact exclude,
    never the other way round, so an empty answer means the cases cover every case.
    """
    given = set(residues)
    return [r for r in facts.possible_residues(var, m) if r not in given]


def representation_problem(terms, parts, m) -> str:
    """Why `terms` (a list of factor lists, each a product) is not a representation of m
    as a sum of non-negative multiples of parts; '' when it is."""
    total = 0
    for factors in terms:
        if any(f < 0 for f in factors):
            return "a representation adds non-negative multiples of parts; a factor is negative"
        if not any(f in parts for f in factors):
            return (f"the term {'*'.join(map(value_text, factors))} has no factor among the parts "
                    f"{value_text(list(parts))}")
        product = 1
        for f in factors:
            product *= f
        total += product
    if total != m:
        return f"the terms add up to {value_text(total)}, not {value_text(m)}"
    return ""


def frobenius_witness_problem(parts, g: int, represented: set, ways_for_g) -> str:
    """'' when the witness proves that g is the Frobenius number of `parts`.

    p_A(g) = 0, and every integer in g+1 .. g+min(A) is represented; adding
    multiples of min(A) then represents every larger integer.
    """
    if ways_for_g != 0:
        return (f"{value_text(g)} is representable ({rough_int(int(ways_for_g))} way{'s' if ways_for_g != 1 else ''}), "
                "so it is not the Frobenius number")
    smallest = min(parts)
    missing = sorted(set(range(g + 1, g + smallest + 1)) - represented)
    if missing:
        shown = ", ".join(value_text(m) for m in missing[:8])
        return (f"the witness must represent every integer from {value_text(g + 1)} to {value_text(g + smallest)}; "
                f"missing: {shown}")
    return ""
