"""Turning exact values into text and back, for integers of any size.

Python refuses int <-> str conversions beyond 4300 digits by default (a
guard against slow quadratic conversion); quasicert has its own size budget,
so it converts long numbers in pieces instead of lifting the global limit.

>>> value_text(Fraction(-3, 17)), value_text(Fraction(4))
('-3/17', '4')
>>> text_int("9" * 5000) == 10**5000 - 1
True
"""
from __future__ import annotations

import re
from fractions import Fraction  # noqa: F401  (the doctests use it)

__all__ = ["abbreviate_numbers", "atom_text", "gmp_mpz", "int_text", "rough_int", "text_int", "value_text"]

_DIRECT_BITS = 12_000     # about 3600 digits: below Python's 4300-digit guard
_DIRECT_DIGITS = 4_000


def int_text(n: int) -> str:
    """Decimal text of any integer."""
    if n < 0:
        return "-" + int_text(-n)
    if n.bit_length() <= _DIRECT_BITS:
        return str(n)
    k = (n.bit_length() * 3 // 10) // 2        # about half the digits
    high, low = divmod(n, 10 ** k)
    return int_text(high) + int_text(low).rjust(k, "0")


def rough_int(n: int, exact_below: int = 10**15) -> str:
    """An integer for a message: itself when |n| < exact_below, else its order of magnitude
    (about 10^e; about 2^b past 10,000 bits, where even counting its digits costs).

    >>> rough_int(12345), rough_int(-10**40 - 1), rough_int(3**20000)
    ('12345', 'about -10^40', 'about 2^31699')
    """
    if abs(n) < exact_below:
        return str(n)
    sign = "-" if n < 0 else ""
    if n.bit_length() >= 10000:
        return f"about {sign}2^{abs(n).bit_length() - 1}"
    return f"about {sign}10^{len(str(abs(n))) - 1}"


def text_int(s: str) -> int:
    """The integer written by a string of decimal digits."""
    if len(s) > _GMP_DIGITS and _DIGITS.match(s):
        mpz = _mpz if _mpz is not _NOT_LOADED else gmp_mpz()
        if mpz is not None:      # GMP reads long decimals in subquadratic time, Python's int() does not
            return int(mpz(s))
    if len(s) <= _DIRECT_DIGITS:
        return int(s)
    k = len(s) // 2
    return text_int(s[:-k]) * 10 ** k + text_int(s[-k:])


_GMP_DIGITS = 400
_DIGITS = re.compile(r"[0-9]+\Z")      # what int() reads alike (it also takes signs, spaces, _)
_NOT_LOADED = object()
_mpz = _NOT_LOADED


def gmp_mpz():
    """gmpy2's mpz, imported on first need (its import costs start-up time), or None without
    gmpy2; the one switch for long integers in GMP (tests turn it off to run on Python's ints)."""
    global _mpz
    if _mpz is _NOT_LOADED:
        try:
            from gmpy2 import mpz as _mpz
        except ImportError:            # pragma: no cover - depends on the machine
            _mpz = None
    return _mpz


def value_text(v) -> str:
    """An exact value as quasicert prints it: p/q in lowest terms, or a list."""
    if isinstance(v, (list, tuple)):
        return "[" + ", ".join(value_text(x) for x in v) + "]"
    if isinstance(v, int):
        return int_text(v)
    if not hasattr(v, "denominator"):       # a rational function of a lemma's parameters
        return str(v)
    if v.denominator == 1:
        return int_text(v.numerator)
    return f"{int_text(v.numerator)}/{int_text(v.denominator)}"


_LONG_NUMBER = re.compile(r"\d{61,}")


def abbreviate_numbers(text: str, ends: int = 20) -> str:
    """`text` with every number of more than 60 digits shown by its first and last digits and its
    digit count, for reports read by people (JSON and SARIF keep every digit).

    >>> abbreviate_numbers("claimed " + "1" * 30 + "2" * 30 + "3" * 30)
    'claimed 11111111111111111111...33333333333333333333 (90 digits)'
    """
    return _LONG_NUMBER.sub(lambda m: f"{m.group()[:ends]}...{m.group()[-ends:]} ({len(m.group()):,} digits)",
                            text)


def atom_text(atom) -> str:
    """A call of a normal form, (name, argument values), as text: `dedekind(5, 17)`."""
    name, args = atom
    return f"{name}({', '.join(value_text(a) for a in args)})"
