"""Words for a chain step that does not follow: the rules as cited and what they would give.

Shared by the replay of numeric chains (``checking``) and of lemmas (``lemmas``).
"""
from __future__ import annotations

import difflib

from ..foundation.numbers import atom_text
from ..kernel.normal import atoms
from ..kernel.rules import RULES, WHOLE_LINE_RULES
from .report import Failure

__all__ = ["cited_rules", "rule_details", "closest_candidate", "short", "unknown_rule", "lemma_statements",
           "source_text"]

#: rule names of earlier versions -> the name now
FORMER_RULES = {"unfold": "definition"}

#: words a writer may reach for -> the rule that does it here
RULE_SYNONYMS = {
    "algebra": "arithmetic", "simplify": "arithmetic", "expand": "arithmetic", "ring": "arithmetic",
    "compute": "value", "evaluate": "value", "eval": "value", "calculation": "value",
    "def": "definition", "defn": "definition", "expand_definition": "definition",
    "periodicity": "reduce", "mod": "reduce", "reduction": "reduce",
    "symmetry": "negate", "odd": "negate", "inversion": "inverse",
    "gcd": "common_factor", "cancel": "common_factor", "rademacher": "three_term",
    "euclid": "descent", "euclidean": "descent", "continued_fraction": "descent",
}


def lemma_statements(step, facts, text: str, render) -> list:
    """For each lemma a failed step cites: what it says at the values cited, as a detail line."""
    out = []
    for ref in step.rules:
        key = f"lemma {ref.label}"
        if ref.name != "lemma" or key not in facts:
            continue
        lhs, rhs = facts[key]
        args = ", ".join(source_text(text, a) for a in ref.args)
        out.append(f"lemma {ref.label}({args}) says: {short(render(lhs))} = {short(render(rhs))}")
    return out


def source_text(text: str, node) -> str:
    """The text of a node as written, when it stands on one line."""
    p = node.pos
    lines = text.splitlines()
    if p.line and p.line == p.end_line and p.line <= len(lines):
        return lines[p.line - 1][p.column - 1:p.end_column - 1]
    return "..."


def unknown_rule(ref, where: str) -> Failure:
    """The refusal of a rule name that is not one, with the rule that was most likely meant."""
    if ref.name in FORMER_RULES:
        new = FORMER_RULES[ref.name]
        message = f"{where}: the rule '{ref.name}' is now called {new}: write `by {new}`"
    else:
        near = [RULE_SYNONYMS[ref.name.lower()]] if ref.name.lower() in RULE_SYNONYMS else \
            difflib.get_close_matches(ref.name, list(RULES) + list(WHOLE_LINE_RULES), n=1)
        hint = f" (did you mean {near[0]}?)" if near else ""
        message = f"{where}: unknown rule '{ref.name}'{hint}"
    return Failure(ref.pos.line, ref.pos.column, message, ["`quasicert rules` lists the rules"],
                   kind="error", end_column=ref.pos.end_column)


def cited_rules(rules) -> str:
    """The rules of a step as written: `reduce, claim q`, `lemma two_over_odd`."""
    return ", ".join(n if n != "claim" else (l if l.startswith("lemma ") else f"claim {l}") for n, l in rules)


def rule_details(cited: str, verdict, nxt, positions: dict, render):
    """(detail lines, the closest line the rules give, the position of the first call of `nxt`
    that they do not give or None) for a step whose rules do not give the next line."""
    details = [verdict.problem] if verdict.problem else []
    for atom, reason in verdict.refusals[:4]:
        target = f" to {atom_text(atom)}" if atom else ""
        details.append(f"{cited} cannot be applied{target}: {reason}")
    closest = closest_candidate(verdict.candidates, nxt)
    mark = None
    if closest is not None:
        details.append(f"{cited} gives: {short(render(closest))}")
        wrong = [a for a in atoms(nxt) - atoms(closest) if a in positions]
        if wrong:
            p = positions[sorted(wrong, key=lambda a: (positions[a].line, positions[a].column))[0]]
            mark = (p.line, p.column, p.end_column if p.end_line == p.line else None)
    return details, closest, mark


def closest_candidate(candidates, target):
    """The candidate normal form that differs from `target` in the fewest terms."""
    best, score = None, None
    for c in candidates:
        s = len(set(c.items()) ^ set(target.items()))
        if score is None or s < score:
            best, score = c, s
    return best


def short(s: str, width: int = 300) -> str:
    """`s`, or its two ends around a count of what was left out when it is longer than `width`."""
    return s if len(s) <= width else s[: width // 2] + f" ...({len(s) - width} characters)... " + s[-width // 2:]
