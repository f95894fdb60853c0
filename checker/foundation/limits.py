"""Budgets that keep a hostile or careless certificate from hanging the checker.

Every costly request is measured against these numbers before the work
starts; a request over budget is refused with ``BudgetExceeded`` naming the
limit and the option that raises it.
"""
from __future__ import annotations

from dataclasses import dataclass, fields, replace

from .errors import BudgetExceeded

__all__ = ["Limits", "DEFAULT_LIMITS", "FORMER_NAMES"]

#: limits renamed since an earlier version: old name -> new name
FORMER_NAMES = {"unfold_terms": "definition_terms"}


@dataclass(frozen=True)
class Limits:
    #: size of any integer the checker builds (numerator or denominator), in bits
    integer_bits: int = 1_000_000
    #: length of any enumeration: O(k) sums, dynamic programming tables, residue tables
    terms: int = 3_000_000
    #: terms a `definition` step may write out
    definition_terms: int = 20_000
    #: largest index of a Bernoulli number or polynomial
    bernoulli_index: int = 4_000
    #: length of a list literal
    list_length: int = 1_000
    #: digits of one integer literal in the text
    literal_digits: int = 200_000
    #: nesting depth of an expression (calls and operators inside one another)
    nesting: int = 200
    #: size of one certificate file
    file_bytes: int = 16 * 1024 * 1024
    #: tokens in one text (the parser's memory grows with them, about 300 bytes each)
    tokens: int = 2_000_000
    #: wall-clock seconds for one certificate (checked between statements and steps)
    seconds: int = 600
    #: total degree of a polynomial in a lemma's parameters (numerators and denominators)
    lemma_degree: int = 200

    def require(self, name: str, needed: int, what: str) -> None:
        """Refuse when `needed` exceeds the limit called `name`."""
        allowed = getattr(self, name)
        if needed > allowed:
            unit = _UNITS.get(name, "")
            raise BudgetExceeded(
                f"{what} needs {_short(needed)}{unit}, over the limit {name.replace('_', '-')} = {allowed}"
                f" (raise it with --limit {name.replace('_', '-')}=N)")

    def with_overrides(self, overrides: dict[str, int]) -> "Limits":
        known = {f.name for f in fields(self)}
        clean = {}
        for key, value in overrides.items():
            attr = key.replace("-", "_")
            if attr not in known:
                raise KeyError(key, FORMER_NAMES.get(attr, "").replace("_", "-"))
            clean[attr] = value
        return replace(self, **clean)


_UNITS = {"integer_bits": " bits", "terms": " steps", "definition_terms": " terms",
          "bernoulli_index": "", "list_length": " entries", "literal_digits": " digits",
          "nesting": " levels", "file_bytes": " bytes",
          "seconds": " seconds", "tokens": " tokens", "lemma_degree": ""}


def _short(n: int) -> str:
    return str(n) if n < 10**15 else f"about 10^{len(str(n)) - 1}" if n.bit_length() < 10000 else f"about 2^{n.bit_length()}"


DEFAULT_LIMITS = Limits()
