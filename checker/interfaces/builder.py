"""Writing certificates from a program's own results, and checking them in memory.

>>> from fractions import Fraction
>>> cert = Certificate("values from my Dedekind-sum program")
>>> cert.claim("dedekind(5, 17)", Fraction(1, 17)).claim("partitions(10, [1, 2, 3])", 14)
Certificate('values from my Dedekind-sum program', 2 statements)
>>> cert.check().ok
True

Values may be ints, Fractions, python-flint's fmpz and fmpq, gmpy2's mpz and
mpq, strings "p/q" of ASCII digits, or lists of them; floats are refused (not
exact).  `chain` writes a chain of steps and `witness` a Frobenius-number
witness:

>>> c = Certificate().chain("dedekind(7, 17)", [("dedekind(5, 17)", "inverse"), ("1/17", "value")])
>>> c.witness([3, 5], 7, {8: "3 + 5", 9: "3*3", 10: "2*5"}).check().ok
True
>>> print(Certificate().claim("dedekind(1, 3)", "1/17").check())   # a Report prints as its text
<built>:1:24: failed: the claim is false: the two sides differ
    claim dedekind(1, 3) = 1/17
                           ^^^^
  left side:  1/18
  right side: 1/17   (claimed)
  difference (right - left): 1/306
<built>: FAILED, 0 claims and steps checked
"""
from __future__ import annotations

import re
from fractions import Fraction

from .files import check_text
from ..foundation.limits import DEFAULT_LIMITS
from ..foundation.numbers import value_text

__all__ = ["Certificate", "exact"]

_RELATIONS = {"=", "<", "<=", ">", ">=", "!="}


_RATIO = re.compile(r"\s*(-?[0-9]+)\s*(?:/\s*([0-9]+)\s*)?", re.ASCII)


def exact(v) -> Fraction:
    """An exact rational from an int, a Fraction, python-flint's fmpz/fmpq, gmpy2's mpz/mpq or "p/q".

    >>> exact("-6/8"), exact(3)
    (Fraction(-3, 4), Fraction(3, 1))
    """
    if isinstance(v, bool) or isinstance(v, float):
        raise TypeError(f"a value must be exact (an int, a Fraction, \"p/q\"), not the {type(v).__name__} {v!r}")
    if isinstance(v, (int, Fraction)):
        return Fraction(v)
    if isinstance(v, str):
        m = _RATIO.fullmatch(v)
        if not m or m.group(2) == "0" or (m.group(2) and not int(m.group(2))):
            raise ValueError(f"a value given as text must be an integer or p/q in ASCII digits, not {v!r}")
        return Fraction(int(m.group(1)), int(m.group(2) or 1))
    kind = type(v).__module__.split(".")[0] + "." + type(v).__name__
    if kind in ("flint.fmpz", "gmpy2.mpz", "flint.fmpq", "gmpy2.mpq"):
        # both libraries give exact numerator and denominator as integers
        p, q = v.numerator, v.denominator
        if callable(p):                   # python-flint: methods p() and q()
            p, q = v.p, v.q
        return Fraction(int(p), int(q))
    raise TypeError(f"a value must be an int, a Fraction, a flint or gmpy2 integer or rational, or \"p/q\", "
                    f"not {type(v).__name__}")


def _value(v) -> str:
    if isinstance(v, (list, tuple)):
        return "[" + ", ".join(_value(x) for x in v) + "]"
    return value_text(exact(v))


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
        quantifier = f"all {var}" if start is None else f"{var} >= {_value(start)}"
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
        conditions = f" for {', '.join(assumptions)}" if assumptions else ""
        lines = [f"lemma {name}({', '.join(params)}){conditions}:", f"  {lhs} = {rhs}"]
        lines.append(f"  chain {lhs}")
        for expression, rules in steps:
            cited = rules if isinstance(rules, str) else ", ".join(rules)
            lines.append(f"    = {expression} by {cited}")
        lines.append("end")
        self._lines.extend(lines)
        self._count += 1
        return self

    def chain(self, start: str, steps, label: str | None = None) -> "Certificate":
        """A chain from `start`: steps are (expression or value, rule or list of rules) pairs.

        Each rule is a name (`reduce`, `reciprocity`, `value`, ...), `claim LABEL`
        or `lemma NAME(E, ...)`, as `quasicert rules` lists them.
        """
        lines = [f"chain {label}: {start}" if label else f"chain {start}"]
        for expression, rules in steps:
            shown = expression if isinstance(expression, str) and not _RATIO.fullmatch(expression) \
                else _value(expression)
            cited = rules if isinstance(rules, str) else ", ".join(rules)
            lines.append(f"  = {shown}    by {cited}")
        self._lines.extend(lines)
        self._count += 1
        return self

    def witness(self, parts, frobenius_number, representations, label: str | None = None) -> "Certificate":
        """frobenius(parts) = G with each of G+1, ..., G+min(parts) written as a combination of the parts.

        `representations` maps each number to its combination, e.g. {8: "3 + 5", 9: "3*3"}.
        """
        reps = ", ".join(f"{_value(n)} = {combo}" for n, combo in sorted(representations.items(),
                                                                           key=lambda item: exact(item[0])))
        head = f"witness {label}: " if label else "witness "
        self._lines.append(f"{head}frobenius({_value(list(parts))}) = {_value(frobenius_number)}: {reps}")
        self._count += 1
        return self

    def text(self) -> str:
        return "\n".join(self._lines) + "\n"

    def check(self, name: str = "<built>", limits=DEFAULT_LIMITS, keep_going: bool = False,
              allow_empty: bool = False, seed: int | None = None):
        """The Report of replaying the text; like checker.check_text, it stops at the first failure
        unless keep_going, and an empty certificate fails unless allow_empty. `seed` fixes the
        instances of the lemmas' numeric second opinion."""
        return check_text(self.text(), name, limits, keep_going, allow_empty=allow_empty, seed=seed)

    def __repr__(self) -> str:
        title = self._lines[0][7:-1] if self._lines and self._lines[0].startswith("title ") else ""
        return f"Certificate({title!r}, {self._count} statements)"
