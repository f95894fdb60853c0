"""The expression tree: plain frozen dataclasses that remember where they stand.

Built by the parser, read by the evaluator and the normaliser; nothing here
computes.  Sums and products are n-ary (a flat list of signed terms or of
factors), so a long sum is a wide tree, not a deep one.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Union

__all__ = ["Pos", "Num", "Name", "Neg", "Sum", "Product", "Power", "Call",
           "ListExpr", "FiniteSum", "Expr", "NOWHERE", "children"]


@dataclass(frozen=True)
class Pos:
    line: int
    column: int
    end_line: int
    end_column: int


NOWHERE = Pos(0, 0, 0, 0)


@dataclass(frozen=True)
class Num:
    value: int
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Name:
    name: str
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Neg:
    operand: "Expr"
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Sum:
    """terms: ((+1 or -1, expr), ...)"""
    terms: tuple
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Product:
    """factors: ((divide?, expr), ...); the first factor is never a divisor."""
    factors: tuple
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Power:
    base: "Expr"
    exponent: "Expr"
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class Call:
    name: str
    args: tuple
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class ListExpr:
    items: tuple
    pos: Pos = NOWHERE


@dataclass(frozen=True)
class FiniteSum:
    """sum(var = lower .. upper, body)"""
    var: str
    lower: "Expr"
    upper: "Expr"
    body: "Expr"
    pos: Pos = NOWHERE


Expr = Union[Num, Name, Neg, Sum, Product, Power, Call, ListExpr, FiniteSum]


def children(node) -> tuple:
    """The sub-expressions of a node, in order."""
    if isinstance(node, Neg):
        return (node.operand,)
    if isinstance(node, Sum):
        return tuple(t for _, t in node.terms)
    if isinstance(node, Product):
        return tuple(f for _, f in node.factors)
    if isinstance(node, Power):
        return (node.base, node.exponent)
    if isinstance(node, Call):
        return node.args
    if isinstance(node, ListExpr):
        return node.items
    if isinstance(node, FiniteSum):
        return (node.lower, node.upper, node.body)
    return ()
