"""Budgets that keep a hostile or careless certificate from hanging the checker.

Every costly request is measured against these numbers before the work
starts; a request over budget is refused with ``BudgetExceeded`` naming the
limit and the option that raises it.
"""
from __future__ import annotations

import time
from contextvars import ContextVar
from dataclasses import dataclass, fields, replace

from .errors import BudgetExceeded, OutOfTime
from .numbers import rough_int

__all__ = ["Limits", "DEFAULT_LIMITS", "FORMER_NAMES", "time_limit", "check_time", "call_within", "current_deadline"]

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
    #: wall-clock seconds for one certificate (checked between statements and steps, and inside
    #: evaluations: every function call, every term of a sum, every point of an identity)
    seconds: int = 600
    #: total degree of a polynomial in a lemma's parameters (numerators and denominators)
    lemma_degree: int = 200

    def require(self, name: str, needed: int, what: str) -> None:
        """Refuse when `needed` exceeds the limit called `name`."""
        allowed = getattr(self, name)
        if needed > allowed:
            unit = _UNITS.get(name, "")
            raise BudgetExceeded(
                f"{what} needs {rough_int(needed)}{unit}, over the limit {name.replace('_', '-')} = {allowed}"
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


DEFAULT_LIMITS = Limits()


# -- the clock: the `seconds` limit inside long computations ------------------------------
#
# A check runs inside `time_limit(seconds)`; long loops (sums, identities, the numeric second
# opinion, the O(k) sums of the mathematics layer) call `check_time()`, which raises OutOfTime
# once the deadline has passed.  A context variable, so that threads and nested checks each
# see their own deadline (a nested one never extends the outer one).

_DEADLINE: ContextVar = ContextVar("quasicert_deadline", default=None)


class time_limit:
    """Run the body with a deadline `seconds` from now (or at the monotonic time `at`).

    A class rather than a generator: it opens every evaluation, and costs a third as much."""

    __slots__ = ("seconds", "at", "token")

    def __init__(self, seconds: float, at: float | None = None):
        self.seconds, self.at = seconds, at

    def __enter__(self):
        seconds = self.seconds
        deadline = (time.monotonic() + seconds) if self.at is None else self.at
        outer = _DEADLINE.get()
        if outer is not None and outer[0] <= deadline:
            deadline, seconds = outer
        self.token = _DEADLINE.set((deadline, seconds))

    def __exit__(self, *exc_info):
        _DEADLINE.reset(self.token)
        return False


def current_deadline():
    """(monotonic deadline, its seconds) of the current check, or None: to hand to a worker process."""
    return _DEADLINE.get()


def check_time() -> None:
    """Raise OutOfTime when the current check has run past its `seconds` limit."""
    current = _DEADLINE.get()
    if current is not None and time.monotonic() > current[0]:
        raise _out_of_time(current[1])


def call_within(seconds: float, fn, args: tuple):
    """fn(*args) as `with time_limit(seconds): check_time(); return fn(*args)` runs it: the same
    deadline (an outer one if sooner), the same check first, in about half the time (not the
    context manager's three calls: it opens every evaluation of a number call)."""
    deadline = time.monotonic() + seconds
    outer = _DEADLINE.get()
    current = outer if outer is not None and outer[0] <= deadline else (deadline, seconds)
    token = _DEADLINE.set(current)
    try:
        if time.monotonic() > current[0]:
            raise _out_of_time(current[1])
        return fn(*args)
    finally:
        _DEADLINE.reset(token)


def _out_of_time(seconds) -> OutOfTime:
    return OutOfTime(f"the check has run for more than {_seconds(seconds)} s, the limit seconds = "
                     f"{_seconds(seconds)} (raise it with --limit seconds=N); it stopped here, "
                     "and nothing from here on was checked")


def _seconds(s) -> str:
    return str(int(s)) if float(s).is_integer() else f"{s:g}"
