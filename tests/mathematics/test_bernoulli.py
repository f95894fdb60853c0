"""Bernoulli numbers and polynomials against Abramowitz & Stegun and python-flint."""
from fractions import Fraction

import flint
import pytest
from hypothesis import given, strategies as st

from checker.mathematics.bernoulli import bernoulli, bernoulli_polynomial, periodic_bernoulli
from checker.mathematics.elementary import sawtooth
from checker.foundation.errors import DomainError
from conftest import exact, flint_fraction

# Abramowitz & Stegun, Table 23.2 (B_1 = -1/2 convention, as in A&S 23.1.1)
AS_TABLE_23_2 = {
    0: Fraction(1), 1: Fraction(-1, 2), 2: Fraction(1, 6), 4: Fraction(-1, 30),
    6: Fraction(1, 42), 8: Fraction(-1, 30), 10: Fraction(5, 66), 12: Fraction(-691, 2730),
    14: Fraction(7, 6), 16: Fraction(-3617, 510), 18: Fraction(43867, 798),
    20: Fraction(-174611, 330),
}


@pytest.mark.parametrize("n, value", sorted(AS_TABLE_23_2.items()))
def test_abramowitz_stegun(n, value):
    exact(bernoulli(n), value)


def test_odd_indices_vanish():
    # A&S 23.1.19: B_{2n+1} = 0 for n >= 1
    for n in range(3, 200, 2):
        exact(bernoulli(n), Fraction(0))


def test_against_python_flint_up_to_1000():
    # python-flint fmpq.bernoulli
    for n in list(range(0, 200)) + [257, 500, 999, 1000]:
        exact(bernoulli(n), flint_fraction(flint.fmpq.bernoulli(n)))


@given(st.integers(0, 40), st.fractions(min_value=-5, max_value=5, max_denominator=50))
def test_polynomials_against_python_flint(n, x):
    # python-flint fmpq_poly.bernoulli_poly
    poly = flint.fmpq_poly.bernoulli_poly(n)
    expected = flint_fraction(poly(flint.fmpq(x.numerator, x.denominator)))
    exact(bernoulli_polynomial(n, x), expected)
    exact(bernoulli(n, x), expected)


def test_polynomial_values():
    # A&S 23.1.21 and 23.1.22: B_n(1/2) = -(1 - 2^(1-n)) B_n, B_n(0) = B_n
    for n in range(0, 30):
        exact(bernoulli_polynomial(n, Fraction(1, 2)), -(1 - Fraction(2) ** (1 - n)) * bernoulli(n))
        exact(bernoulli_polynomial(n, 0), bernoulli(n))


@given(st.integers(0, 12), st.fractions(min_value=-20, max_value=20, max_denominator=30))
def test_periodic_function(n, x):
    # definition: period 1; n = 1 is the sawtooth
    exact(periodic_bernoulli(n, x + 1), periodic_bernoulli(n, x))
    if n == 1:
        exact(periodic_bernoulli(1, x), sawtooth(x))
    elif x.denominator == 1 and n >= 2:
        exact(periodic_bernoulli(n, x), bernoulli(n))


def test_negative_index_refused():
    with pytest.raises(DomainError) as info:
        bernoulli(-1)
    assert info.value.message == "the index of a Bernoulli number must be >= 0, not -1"
