"""Writing certificates from a program's own results, and checking them in memory.

>>> from fractions import Fraction
>>> cert = Certificate("values from my Dedekind-sum program")
>>> cert.claim("dedekind(5, 17)", Fraction(1, 17)).claim("partitions(10, [1, 2, 3])", 14)
Certificate('values from my Dedekind-sum program', 2 statements)
>>> cert.check().ok
True
"""
from __future__ import annotations

from fractions import Fraction

from ..replay.checking import check_text
from ..foundation.limits import DEFAULT_LIMITS
from ..foundation.numbers import value_text

__all__ = ["Certificate"]

_RELATIONS = {"=", "<", "<=", ">", ">=", "!="}


def _value(v) -> str:
    if isinstance(v, bool) or not isinstance(v, (int, Fraction, list, tuple)):
        raise TypeError(f"a value must be an int, a Fraction or a list of them, not {type(v).__name__}")
    if isinstance(v, (list, tuple)):
        return "[" + ", ".join(_value(x) for x in v) + "]"
    return value_text(Fraction(v))


def _quote(text: str) -> str:
    return '"' + text.replace('"', "'").replace("\n", " ") + '"'


class Certificate:
    """A certificate built statement by statement; `text()` gives it, `check()` replays it."""

    def __init__(self, title: str | None = None):
        self._lines = []
        self._count = 0
        if title:
            self._lines.append(f"title {_quote(title)}")

    def source(self, note: str) -> "Certificate":
        self._lines.append(f"source {_quote(note)}")
        return self

    def let(self, name: str, value) -> "Certificate":
        self._lines.append(f"let {name} = {_value(value)}")
        return self

    def claim(self, expression: str, value, relation: str = "=", label: str | None = None) -> "Certificate":
        """`expression relation value`, e.g. claim("dedekind(5, 17)", Fraction(1, 17))."""
        if relation not in _RELATIONS:
            raise ValueError(f"relation must be one of {sorted(_RELATIONS)}")
        head = f"claim {label}: " if label else "claim "
        self._lines.append(f"{head}{expression} {relation} {_value(value)}")
        self._count += 1
        return self

    def value(self, function: str, *args, result) -> "Certificate":
        """A claim that function(*args) = result, with the arguments given as values."""
        return self.claim(f"{function}({', '.join(_value(a) for a in args)})", result)

    def identity(self, lhs: str, rhs: str, var: str = "n", start: int | None = 0) -> "Certificate":
        quantifier = f"all {var}" if start is None else f"{var} >= {start}"
        self._lines.append(f"identity for {quantifier}: {lhs} = {rhs}")
        self._count += 1
        return self

    def use(self, name: str) -> "Certificate":
        """The lemmas of a bundled certificate, e.g. use("dedekind-lemmas")."""
        self._lines.append(f"use {_quote(name)}")
        return self

    def lemma(self, name: str, params, assumptions, lhs: str, rhs: str, steps) -> "Certificate":
        """A lemma proved by one chain from lhs: steps are (expression, rule or rules) pairs.

        >>> c = Certificate().lemma("one_over_k", ["k"], ["k >= 1"], "dedekind(1, k)",
        ...     "(k - 1)*(k - 2)/(12*k)", [("(2/k + k)/12 - 1/4 - dedekind(k, 1)", "reciprocity"),
        ...     ("(2/k + k)/12 - 1/4 - dedekind(0, 1)", "reduce"), ("(k - 1)*(k - 2)/(12*k)", "value")])
        >>> c.check().ok
        True
        """
        lines = [f"lemma {name}({', '.join(params)}):"]
        if assumptions:
            lines.append("  given " + ", ".join(assumptions))
        lines.append(f"  then {lhs} = {rhs}")
        lines.append(f"  chain {lhs}")
        for expression, rules in steps:
            cited = rules if isinstance(rules, str) else ", ".join(rules)
            lines.append(f"    = {expression} by {cited}")
        lines.append("end")
        self._lines.extend(lines)
        self._count += 1
        return self

    def text(self) -> str:
        return "\n".join(self._lines) + "\n"

    def check(self, name: str = "<built>", limits=DEFAULT_LIMITS, keep_going: bool = True,
              seed: int | None = None):
        """Check the text; `seed` fixes the instances of the lemmas' numeric second opinion."""
        return check_text(self.text(), name, limits, keep_going, seed=seed)

    def __repr__(self) -> str:
        title = self._lines[0][7:-1] if self._lines and self._lines[0].startswith("title ") else ""
        return f"Certificate({title!r}, {self._count} statements)"
