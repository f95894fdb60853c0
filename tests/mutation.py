"""Mutants of a certificate: one number or one sign changed inside a claim or step.

Shared by the mutation tests.  A mutant is (text, unit, description) where
unit names the statement or step it falls in and the last line at which the
checker must have stopped.
"""
from __future__ import annotations

import re
from dataclasses import dataclass

from checker.language import statements as st
from checker.language.parsing import parse_certificate


@dataclass(frozen=True)
class Unit:
    kind: str          # claim, congruence, start, step
    first_line: int
    last_line: int     # the checker must fail at or before this line
    relation: str = "="
    last_in_chain: bool = False


@dataclass(frozen=True)
class Mutant:
    text: str
    unit: Unit
    line: int
    column: int
    what: str


def _units(text: str) -> list[Unit]:
    units = []
    for s in parse_certificate(text).statements:
        if isinstance(s, st.Claim):
            units.append(Unit("claim", s.pos.line, s.pos.end_line, s.relation))
        elif isinstance(s, st.Congruence):
            units.append(Unit("congruence", s.pos.line, s.pos.end_line))
        elif isinstance(s, st.Identity):
            units.append(Unit("identity", s.pos.line, s.pos.end_line))
        elif isinstance(s, st.Witness):
            units.append(Unit("witness", s.pos.line, s.pos.end_line))
        elif isinstance(s, st.Chain):
            first = s.steps[0]
            units.append(Unit("start", s.pos.line, first.pos.end_line))
            for i, step in enumerate(s.steps):
                units.append(Unit("step", step.pos.line, step.pos.end_line,
                                  last_in_chain=i == len(s.steps) - 1))
    return units


def _code_spans(line: str):
    """Column ranges of a line outside comments and quoted texts."""
    out, i, start, quoted = [], 0, 0, False
    while i < len(line):
        ch = line[i]
        if ch == '"':
            if not quoted:
                out.append((start, i))
            quoted = not quoted
            start = i + 1
        elif ch == "#" and not quoted:
            out.append((start, i))
            return out
        i += 1
    if not quoted:
        out.append((start, len(line)))
    return out


_NUMBER = re.compile(r"(?<![A-Za-z_0-9])\d+")


RULE_NAMES = ["reduce", "reciprocity", "negate", "inverse", "common_factor", "three_term",
              "definition", "value", "arithmetic", "decomposition", "bridge"]
_RULE = re.compile(r"\b(" + "|".join(RULE_NAMES) + r")\b")
_OPERATOR_SWAPS = {"*": "/", "/": "*", "^": "*"}


def mutants(text: str, deltas=(1, -1), operators=False, rules=False):
    lines = text.split("\n")
    by_line = {}
    for unit in _units(text):
        for ln in range(unit.first_line, unit.last_line + 1):
            by_line.setdefault(ln, unit) if unit.kind != "start" else by_line.setdefault(ln, unit)
    # a chain's start line belongs to the start unit; its step lines to their steps
    for unit in _units(text):
        if unit.kind in ("step", "claim", "congruence", "identity", "witness"):
            for ln in range(unit.first_line, unit.last_line + 1):
                by_line[ln] = unit
        elif unit.kind == "start":
            by_line[unit.first_line] = unit
    for ln, unit in sorted(by_line.items()):
        src = lines[ln - 1]
        for lo, hi in _code_spans(src):
            segment = src[lo:hi]
            for m in _NUMBER.finditer(segment):
                n = int(m.group())
                for d in deltas:
                    if n + d < 0:
                        continue
                    col = lo + m.start()
                    new = src[:col] + str(n + d) + src[lo + m.end():]
                    yield Mutant(_replace_line(lines, ln, new), unit, ln, col + 1, f"{n} -> {n + d}")
            for i, ch in enumerate(segment):
                col = lo + i
                if ch in "+-":
                    flipped = "-" if ch == "+" else "+"
                    new = src[:col] + flipped + src[col + 1:]
                    yield Mutant(_replace_line(lines, ln, new), unit, ln, col + 1, f"'{ch}' -> '{flipped}'")
                elif operators and ch in _OPERATOR_SWAPS:
                    new = src[:col] + _OPERATOR_SWAPS[ch] + src[col + 1:]
                    yield Mutant(_replace_line(lines, ln, new), unit, ln, col + 1,
                                 f"'{ch}' -> '{_OPERATOR_SWAPS[ch]}'")
            if rules and unit.kind == "step" and " by " in segment:
                by = lo + segment.rindex(" by ")
                for m in _RULE.finditer(src, by):
                    for other in RULE_NAMES:
                        if other != m.group():
                            new = src[:m.start()] + other + src[m.end():]
                            yield Mutant(_replace_line(lines, ln, new), unit, ln, m.start() + 1,
                                         f"rule {m.group()} -> {other}")


def _replace_line(lines, ln, new):
    out = list(lines)
    out[ln - 1] = new
    return "\n".join(out)
