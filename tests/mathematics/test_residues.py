"""The Jacobi symbol, inverses modulo m and rounding against sympy and python-flint."""
from fractions import Fraction
from math import gcd

import flint
import pytest
import sympy
from hypothesis import given, strategies as st

from checker import evaluate
from checker.foundation.errors import DomainError
from checker.mathematics.dedekind import dedekind
from checker.mathematics.elementary import round_half_up
from checker.mathematics.residues import jacobi, reciprocal_mod
from conftest import flint_fraction


@given(st.integers(-10**40, 10**40), st.integers(0, 10**40))
def test_jacobi_against_sympy(a, half):
    # sympy.jacobi_symbol
    n = 2 * half + 1
    assert jacobi(a, n) == sympy.jacobi_symbol(a % n, n)


def test_jacobi_refuses_even_or_nonpositive_n():
    for n, message in ((4, "the Jacobi symbol (a/n) needs an odd n, not 4"),
                       (0, "the second argument of jacobi must be a positive integer, not 0")):
        with pytest.raises(DomainError) as info:
            jacobi(3, n)
        assert info.value.message == message


@given(st.integers(-10**30, 10**30), st.integers(1, 10**30))
def test_reciprocal_mod_against_sympy(a, m):
    # sympy.mod_inverse
    if gcd(a, m) != 1:
        with pytest.raises(DomainError):
            reciprocal_mod(a, m)
        return
    r = reciprocal_mod(a, m)
    assert 0 <= r < m and (m == 1 or r == sympy.mod_inverse(a, m))


@given(st.fractions(max_denominator=50))
def test_round_half_up(x):
    # common practice: floor(x + 1/2); Python's round (halves to even) agrees off the halves
    r = round_half_up(x)
    assert isinstance(r, Fraction) and r - Fraction(1, 2) <= x < r + Fraction(1, 2)
    if (2 * x).denominator != 1 or (2 * x).numerator % 2 == 0:
        assert r == round(x)


@given(st.integers(1, 10**25), st.integers(-10**25, 10**25))
def test_dedekind_sum_congruence_with_the_jacobi_symbol(half, h):
    # Rademacher & Grosswald (1972), ch. 5: 12 k s(h, k) = k + 1 - 2 (h/k) (mod 8) for odd k, gcd(h, k) = 1;
    # s(h, k) from python-flint, (h/k) from sympy
    k = 2 * half + 1
    if gcd(h, k) != 1:
        return
    s = flint_fraction(flint.fmpq.dedekind_sum(h, k))
    assert s == dedekind(h, k)
    assert (12 * k * s - (k + 1 - 2 * sympy.jacobi_symbol(h % k, k))) % 8 == 0


def test_the_functions_in_the_language():
    # from memory: (2/15) = (2/3)(2/5) = (-1)(-1); 5 * 7 = 35 = 1 (mod 17)
    assert evaluate("jacobi(2, 15)") == 1
    assert evaluate("reciprocal_mod(5, 17)") == 7
    assert evaluate("round(-5/2) + round(5/2)") == 1


@given(st.integers(-10**6, 10**6), st.integers(0, 10**5))
def test_jacobi_against_eulers_criterion(a, half):
    # the slow reference of tests/reference.py (Euler's criterion on each prime factor, via sympy.factorint)
    from reference import jacobi_by_euler
    n = 2 * half + 1
    assert jacobi(a, n) == jacobi_by_euler(a, n)
