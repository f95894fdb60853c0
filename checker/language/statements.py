"""Certificate statements: plain frozen dataclasses carrying source positions."""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Optional, Union

from .expressions import NOWHERE, Expr, Pos

__all__ = ["Title", "Source", "Let", "Claim", "Congruence", "RuleRef", "Step",
           "Chain", "Identity", "Representation", "Witness", "Condition", "Case", "Split",
           "Lemma", "Use", "Statement", "Certificate"]


@dataclass(frozen=True)
class Title:
    text: str
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Source:
    text: str
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Let:
    name: str
    expr: Expr
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Claim:
    """lhs RELATION rhs; relation is one of = < <= > >= !="""
    label: Optional[str]
    lhs: Expr
    relation: str
    rhs: Expr
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Congruence:
    """lhs == rhs mod modulus: (lhs - rhs)/modulus is an integer."""
    label: Optional[str]
    lhs: Expr
    rhs: Expr
    modulus: Expr
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class RuleRef:
    """A rule named in a step: `reciprocity`, `claim LABEL` (name 'claim', label set) or
    `lemma NAME(args)` (name 'lemma', label the lemma's name, args its values)."""
    name: str
    label: Optional[str] = None
    pos: Pos = NOWHERE
    args: tuple = ()


@dataclass(frozen=True)
class Step:
    expr: Expr
    rules: tuple
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Chain:
    label: Optional[str]
    start: Expr
    steps: tuple
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Identity:
    """for var >= lower (or for all var when lower is None): lhs = rhs."""
    label: Optional[str]
    var: str
    lower: Optional[Expr]
    period: Optional[Expr]
    degree: Optional[Expr]
    lhs: Expr
    rhs: Expr
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Representation:
    number: Expr
    combination: Expr
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Witness:
    """frobenius(A) = g, with representations of g+1, ..., g+min(A)."""
    label: Optional[str]
    lhs: Expr
    rhs: Expr
    representations: tuple
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Condition:
    """An assumption of a lemma: lhs RELATION rhs, or lhs == rhs mod modulus (relation '==')."""
    lhs: Expr
    relation: str
    rhs: Expr
    modulus: Optional[Expr] = None
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Case:
    """One residue class of a case split, with the chains that prove it."""
    residue: Expr
    chains: tuple
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Split:
    """cases VAR mod MODULUS, then one Case per residue class."""
    var: str
    modulus: Expr
    cases: tuple
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Lemma:
    """For all integer params satisfying the conditions: lhs = rhs, proved by chains
    (the last one goes from lhs to rhs) or by a case split whose cases do."""
    name: str
    params: tuple
    conditions: tuple
    lhs: Expr
    rhs: Expr
    chains: tuple
    split: Optional[Split]
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Use:
    """use "NAME": the lemmas of a bundled certificate, or of a file beside this one."""
    target: str
    pos: Pos = NOWHERE


Statement = Union[Title, Source, Let, Claim, Congruence, Chain, Identity, Witness, Lemma, Use]


@dataclass(frozen=True)
class Certificate:
    statements: tuple
    name: str = "<text>"
    text: str = field(default="", repr=False, compare=False)
