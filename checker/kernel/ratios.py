"""Exact rational numbers kept as unreduced numerator/denominator pairs.

A ``Ratio`` n/d (d > 0) is the rational number n/d.  Sums and products are
formed without a gcd: (a/b) + (c/d) = (ad + bc)/(bd), and two Ratios are equal
exactly when a d = b c (cross-multiplication), which needs no lowest terms.
Its hash is that of the same number as a ``Fraction`` (Python's numeric hash,
n * d^-1 modulo 2^61 - 1, the same for every multiple of the pair), so
Ratios, Fractions and ints mix in dicts and sets.  A Ratio is put in lowest
terms only when its numerator or denominator is asked for (to show it), or
when its terms have grown past three times their size at the last reduction,
so that a long sum costs at most a constant factor more than a reduced one.

Why: the normal forms of a long Dedekind chain carry 2000-digit constants, and
reducing them at every operation cost most of the time of checking it (a gcd
of long numbers is quadratic in CPython, a product of them is not).  Long
terms are gmpy2's ``mpz`` when gmpy2 is installed (GMP multiplies them much
faster), Python ints otherwise; both are exact, and the answers are the same.

>>> from fractions import Fraction
>>> x = Ratio(6, 4) + Ratio(1, 2)
>>> x == 2, x == Fraction(2), hash(x) == hash(2), x.numerator, x.denominator
(True, True, True, 2, 1)
>>> str(Ratio(-10, 4) * Fraction(1, 3))
'-5/6'
"""
from __future__ import annotations

import numbers
import sys
from fractions import Fraction
from math import gcd as _int_gcd

from ..foundation.numbers import gmp_mpz, value_text

__all__ = ["Ratio", "ratio", "long_integer"]

_P = sys.hash_info.modulus
_GMP_BITS = 1024           # below this, Python's own ints are as fast as a call into GMP
_SLACK_BITS = 256          # a Ratio of a few words is never reduced for its size alone

def long_integer(n):
    """n as gmpy2's mpz when it is long and gmpy2 is there (imported on first need), else n
    itself: the same number, with faster products and quotients."""
    return _long(n) if n.bit_length() > _GMP_BITS else n


def _long(n):
    """n as an mpz when gmpy2 is there (imported on first need), else n."""
    mpz = gmp_mpz()
    return mpz(n) if mpz is not None else n


def _gcd(a, b):
    if type(a) is int and type(b) is int:
        return _int_gcd(a, b)
    from gmpy2 import gcd
    return gcd(a, b)


def _integer(x):
    """An int or mpz as it is; anything else is refused (a bool, a float, a Fraction)."""
    if type(x) is int or type(x).__name__ == "mpz":
        return x
    if isinstance(x, int) and not isinstance(x, bool):
        return int(x)
    raise TypeError("a Ratio is made of two integers")


def _bits(n, d) -> int:
    return max(n.bit_length(), d.bit_length())


def _make(n, d, limit):
    """n/d (d > 0, not checked here), reduced first when it outgrew `limit` bits."""
    r = object.__new__(Ratio)
    r._n, r._d = n, d
    if limit is None or _bits(n, d) > limit:
        r._reduce()
    else:
        r._limit = limit
    return r


def _parts(x):
    """(numerator, denominator, limit) of an int, Fraction or Ratio; None for anything else."""
    if type(x) is Ratio:
        return x._n, x._d, x._limit
    if isinstance(x, int):
        return x, 1, 3 * x.bit_length() + _SLACK_BITS
    if isinstance(x, Fraction):
        n, d = x.numerator, x.denominator
        return n, d, 3 * _bits(n, d) + _SLACK_BITS
    return None


class Ratio:
    """The rational number n/d, d > 0, not necessarily in lowest terms."""

    __slots__ = ("_n", "_d", "_limit")

    def __new__(cls, numerator=0, denominator=1):
        n, d = _integer(numerator), _integer(denominator)
        if d == 0:
            raise ZeroDivisionError(f"Ratio({value_text(n)}, 0)")
        if d < 0:
            n, d = -n, -d
        if n.bit_length() > _GMP_BITS or d.bit_length() > _GMP_BITS:
            n, d = _long(n), _long(d)
        return _make(n, d, 3 * _bits(n, d) + _SLACK_BITS)

    # -- lowest terms, only when asked ------------------------------------------
    def _reduce(self):
        n, d = self._n, self._d
        g = _gcd(n, d)
        if g != 1:
            n, d = n // g, d // g
            self._n, self._d = n, d
        self._limit = 3 * _bits(n, d) + _SLACK_BITS

    @property
    def numerator(self) -> int:
        """The numerator in lowest terms (a Python int)."""
        self._reduce()
        return int(self._n)

    @property
    def denominator(self) -> int:
        """The denominator in lowest terms (a Python int, >= 1)."""
        self._reduce()
        return int(self._d)

    def as_fraction(self) -> Fraction:
        return Fraction(self.numerator, self.denominator)

    # -- comparisons ----------------------------------------------------------
    def __eq__(self, other):
        if type(other) is int:
            return self._n == other if self._d == 1 else self._n == other * self._d
        o = _parts(other)
        if o is None:
            return NotImplemented
        n, d = o[0], o[1]
        if d == self._d:
            return self._n == n
        return self._n * d == n * self._d

    def __ne__(self, other):
        eq = self.__eq__(other)
        return eq if eq is NotImplemented else not eq

    def _cmp(self, other):
        """sign of self - other, or None for a non-number."""
        o = _parts(other)
        if o is None:
            return None
        a, b = self._n * o[1], o[0] * self._d
        return (a > b) - (a < b)

    def __lt__(self, other):
        c = self._cmp(other)
        return NotImplemented if c is None else c < 0

    def __le__(self, other):
        c = self._cmp(other)
        return NotImplemented if c is None else c <= 0

    def __gt__(self, other):
        c = self._cmp(other)
        return NotImplemented if c is None else c > 0

    def __ge__(self, other):
        c = self._cmp(other)
        return NotImplemented if c is None else c >= 0

    def __bool__(self):
        return self._n != 0

    def __hash__(self):
        # Fraction's hash: |n| * d^-1 mod P, signed; the same for every multiple (n g)/(d g)
        # unless P divides g, where lowest terms decide
        d_mod = int(self._d % _P)
        if d_mod == 0:
            return hash(self.as_fraction())
        h = hash(hash(int(abs(self._n) % _P)) * pow(d_mod, -1, _P))
        h = h if self._n >= 0 else -h
        return -2 if h == -1 else h

    # -- arithmetic -------------------------------------------------------------
    def __add__(self, other):
        o = _parts(other)
        if o is None:
            return NotImplemented
        n, d, limit = o
        if d == self._d:
            return _make(self._n + n, d, max(self._limit, limit))
        return _make(self._n * d + n * self._d, self._d * d, max(self._limit, limit))

    __radd__ = __add__

    def __sub__(self, other):
        o = _parts(other)
        return NotImplemented if o is None else self.__add__(_make(-o[0], o[1], o[2]))

    def __rsub__(self, other):
        return (-self).__add__(other)

    def __mul__(self, other):
        o = _parts(other)
        if o is None:
            return NotImplemented
        n, d, limit = o
        return _make(self._n * n, self._d * d, max(self._limit, limit))

    __rmul__ = __mul__

    def __truediv__(self, other):
        o = _parts(other)
        if o is None:
            return NotImplemented
        n, d, limit = o
        if n == 0:
            raise ZeroDivisionError("division by zero")
        if n < 0:
            n, d = -n, -d
        return _make(self._n * d, self._d * n, max(self._limit, limit))

    def __rtruediv__(self, other):
        o = _parts(other)
        if o is None:
            return NotImplemented
        return _make(o[0], o[1], o[2]) / self

    def __neg__(self):
        return _make(-self._n, self._d, self._limit)

    def __pos__(self):
        return self

    def __abs__(self):
        return self if self._n >= 0 else -self

    def __pow__(self, e):
        if not isinstance(e, int):
            return NotImplemented
        if e < 0:
            if self._n == 0:
                raise ZeroDivisionError("0 to a negative power")
            n, d = (self._d, self._n) if self._n > 0 else (-self._d, -self._n)
            e = -e
        else:
            n, d = self._n, self._d
        self_limit = self._limit
        return _make(n ** e, d ** e, max(self_limit, 3 * _bits(n, d) * max(e, 1) + _SLACK_BITS))

    # -- showing (in lowest terms) ------------------------------------------------
    def __str__(self):
        return value_text(self)

    def __repr__(self):
        return f"Ratio({self})"

    def __reduce__(self):                       # pickles as its lowest terms
        return (Ratio, (self.numerator, self.denominator))


numbers.Rational.register(Ratio)       # so that Fraction(r), Fraction == r and the like read it


def ratio(x) -> Ratio:
    """An int, Fraction or Ratio as a Ratio (without a gcd)."""
    if type(x) is Ratio:
        return x
    o = _parts(x)
    if o is None:
        raise TypeError(f"not a rational number: {x!r}")
    n, d, limit = o
    if n.bit_length() > _GMP_BITS or d.bit_length() > _GMP_BITS:
        n, d = _long(n), _long(d)
    return _make(n, d, limit)
