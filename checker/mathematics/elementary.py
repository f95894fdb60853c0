"""Elementary exact functions: floor, ceiling, fractional part, residues, sawtooth.

The sawtooth function is the building block of Dedekind sums:

    ((x)) = x - floor(x) - 1/2   if x is not an integer,
    ((x)) = 0                    if x is an integer.

It is odd and has period 1 (Rademacher & Grosswald, *Dedekind Sums*, 1972, ch. 1).

>>> sawtooth(Fraction(1, 3))
Fraction(-1, 6)
>>> sawtooth(Fraction(-1, 3))
Fraction(1, 6)
>>> mod(-7, 3), floor(Fraction(-7, 2)), binomial(10, 3)
(Fraction(2, 1), Fraction(-4, 1), Fraction(120, 1))
"""
from __future__ import annotations

import math
from fractions import Fraction

from ..foundation.errors import DomainError
from ..foundation.numbers import value_text

__all__ = ["sawtooth", "floor", "ceil", "frac", "round_half_up", "mod", "gcd", "lcm", "binomial",
           "as_integer", "as_rational", "as_positive"]

HALF = Fraction(1, 2)


def as_rational(x, what: str = "argument") -> Fraction:
    """Accept an int or a Fraction; refuse anything else (floats included)."""
    if isinstance(x, Fraction):
        return x
    if isinstance(x, int) and not isinstance(x, bool):
        return Fraction(x)
    raise DomainError(f"{what} must be a rational number, not {_describe(x)}")


def as_integer(x, what: str = "argument") -> int:
    """The int value of an integral int or Fraction; refuse non-integers."""
    if isinstance(x, int) and not isinstance(x, bool):
        return x
    if isinstance(x, Fraction):
        if x.denominator == 1:
            return x.numerator
        raise DomainError(f"{what} must be an integer, not {value_text(x)}")
    raise DomainError(f"{what} must be an integer, not {_describe(x)}")


def as_positive(x, what: str = "argument") -> int:
    n = as_integer(x, what)
    if n < 1:
        raise DomainError(f"{what} must be a positive integer, not {value_text(n)}")
    return n


def _describe(x) -> str:
    if isinstance(x, (list, tuple)):
        return "a list"
    if isinstance(x, float):
        return "a floating-point number (quasicert is exact: write a fraction)"
    return type(x).__name__


def sawtooth(x) -> Fraction:
    """((x)): x - floor(x) - 1/2 off the integers, 0 on them."""
    x = as_rational(x)
    if x.denominator == 1:
        return Fraction(0)
    return Fraction(x.numerator % x.denominator, x.denominator) - HALF


def floor(x) -> Fraction:
    """The largest integer <= x."""
    x = as_rational(x)
    return Fraction(x.numerator // x.denominator)


def ceil(x) -> Fraction:
    """The smallest integer >= x."""
    x = as_rational(x)
    return Fraction(-((-x.numerator) // x.denominator))


def round_half_up(x) -> Fraction:
    """The integer nearest to x, halves rounded up: floor(x + 1/2).

    One convention for every x (so round(-5/2) = -2, unlike rounding halves to
    even or away from zero); published closed forms of p_A(n) use this form.

    >>> round_half_up(Fraction(5, 2)), round_half_up(Fraction(-5, 2)), round_half_up(Fraction(7, 3))
    (Fraction(3, 1), Fraction(-2, 1), Fraction(2, 1))
    """
    x = as_rational(x) + HALF
    return Fraction(x.numerator // x.denominator)


def frac(x) -> Fraction:
    """{x} = x - floor(x), in [0, 1)."""
    x = as_rational(x)
    return Fraction(x.numerator % x.denominator, x.denominator)


def mod(a, m) -> Fraction:
    """a mod m: the integer r with 0 <= r < |m| and r = a (mod m); a, m integers, m != 0."""
    a = as_integer(a, "the first argument of mod")
    m = as_integer(m, "the modulus")
    if m == 0:
        raise DomainError("the modulus must not be 0")
    return Fraction(a % abs(m))


def gcd(*args) -> Fraction:
    """Greatest common divisor of integers (non-negative; gcd() of zeros is 0)."""
    return Fraction(math.gcd(*[as_integer(a, "each argument of gcd") for a in _flatten(args)]))


def lcm(*args) -> Fraction:
    """Least common multiple of integers (non-negative)."""
    return Fraction(math.lcm(*[as_integer(a, "each argument of lcm") for a in _flatten(args)]))


def binomial(n, j) -> Fraction:
    """n choose j for rational n and integer j: n(n-1)...(n-j+1)/j!, 0 for j < 0."""
    j = as_integer(j, "the lower index of binomial")
    n = as_rational(n, "the upper index of binomial")
    if j < 0:
        return Fraction(0)
    if n.denominator == 1 and n >= 0:
        return Fraction(math.comb(n.numerator, j))
    if n.denominator == 1:
        # upper negation: C(-m, j) = (-1)^j C(m + j - 1, j)
        m = -n.numerator
        return Fraction((-1) ** j * math.comb(m + j - 1, j))
    num, den = Fraction(1), 1
    for i in range(j):
        num *= n - i
        den *= i + 1
    return num / den


def _flatten(args):
    for a in args:
        if isinstance(a, (list, tuple)):
            yield from a
        else:
            yield a
