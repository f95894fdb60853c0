"""Bernoulli numbers, Bernoulli polynomials and the periodic Bernoulli functions.

Convention: t / (e^t - 1) = sum_n B_n t^n / n!, so B_1 = -1/2 (sympy now
uses B_1 = +1/2; quasicert does not).  The Bernoulli polynomial is
B_n(x) = sum_j C(n, j) B_j x^(n-j).  The periodic Bernoulli function is
Bbar_n(x) = B_n({x}) for n != 1, and Bbar_1(x) = ((x)), the sawtooth, which is
B_1({x}) off the integers and 0 on them (the mean of its one-sided limits).

Values from Abramowitz & Stegun, Table 23.2:

>>> bernoulli(12)
Fraction(-691, 2730)
>>> bernoulli(1), bernoulli(3)
(Fraction(-1, 2), Fraction(0, 1))
>>> bernoulli_polynomial(2, Fraction(1, 2))
Fraction(-1, 12)
>>> periodic_bernoulli(1, 5), periodic_bernoulli(2, Fraction(7, 2))
(Fraction(0, 1), Fraction(-1, 12))
"""
from __future__ import annotations

from fractions import Fraction
from math import comb

from .elementary import as_integer, as_rational, frac, sawtooth
from ..foundation.errors import DomainError
from ..foundation.limits import check_time
from ..foundation.numbers import value_text

__all__ = ["bernoulli", "bernoulli_polynomial", "periodic_bernoulli", "bernoulli_numbers"]

_cache: list[Fraction] = [Fraction(1), Fraction(-1, 2)]


def _tangent_numbers(count: int) -> list[int]:
    """T_1..T_count with tan x = sum T_k x^(2k-1)/(2k-1)!: integers only.

    Brent & Harvey, "Fast computation of Bernoulli, tangent and secant
    numbers" (2013), algorithm TangentNumbers: O(count^2) integer steps.
    """
    t = [0] * (count + 1)
    if count >= 1:
        t[1] = 1
    for k in range(2, count + 1):
        t[k] = (k - 1) * t[k - 1]
    for k in range(2, count + 1):
        check_time()
        for j in range(k, count + 1):
            t[j] = (j - k) * t[j - 1] + (j - k + 2) * t[j]
    return t


def _extend_cache(n: int) -> None:
    if n < len(_cache):
        return
    half = max(n // 2 + 1, 2 * (len(_cache) // 2) + 8)
    tangent = _tangent_numbers(half)
    values = [Fraction(1), Fraction(-1, 2)]
    for m in range(2, 2 * half + 1):
        if m % 2:
            values.append(Fraction(0))
        else:
            k = m // 2
            two = 1 << m  # 2^(2k)
            sign = 1 if k % 2 else -1
            values.append(Fraction(sign * m * tangent[k], two * (two - 1)))
    _cache[:] = values


def bernoulli_numbers(n: int) -> list[Fraction]:
    """[B_0, ..., B_n]."""
    _extend_cache(n)
    return _cache[: n + 1]


def bernoulli(n, x=None) -> Fraction:
    """B_n, or with a second argument the Bernoulli polynomial B_n(x)."""
    if x is not None:
        return bernoulli_polynomial(n, x)
    n = as_integer(n, "the index of a Bernoulli number")
    if n < 0:
        raise DomainError(f"the index of a Bernoulli number must be >= 0, not {value_text(n)}")
    if n > 1 and n % 2:
        return Fraction(0)      # B_n = 0 for odd n > 1, at any size (from the odd function x/(e^x - 1) + x/2)
    _extend_cache(n)
    return _cache[n]


def bernoulli_polynomial(n, x) -> Fraction:
    """B_n(x) = sum_{j=0}^{n} C(n, j) B_j x^(n-j), exactly, for rational x."""
    n = as_integer(n, "the degree of a Bernoulli polynomial")
    if n < 0:
        raise DomainError(f"the degree of a Bernoulli polynomial must be >= 0, not {value_text(n)}")
    x = as_rational(x, "the argument of a Bernoulli polynomial")
    bs = bernoulli_numbers(n)
    # Clear denominators: q^n B_n(p/q) = sum C(n,j) B_j p^(n-j) q^j.
    p, q = x.numerator, x.denominator
    total = Fraction(0)
    ppow = 1
    for j in range(n, -1, -1):
        b = bs[j]
        if b:
            total += b * (comb(n, j) * ppow * q ** j)
        ppow *= p
    return total / q ** n


def periodic_bernoulli(n, x) -> Fraction:
    """Bbar_n(x): B_n({x}) for n != 1, and the sawtooth ((x)) for n = 1."""
    n = as_integer(n, "the index of a periodic Bernoulli function")
    if n < 0:
        raise DomainError(f"the index of a periodic Bernoulli function must be >= 0, not {value_text(n)}")
    x = as_rational(x, "the argument of a periodic Bernoulli function")
    if n == 1:
        return sawtooth(x)
    return bernoulli_polynomial(n, frac(x))
