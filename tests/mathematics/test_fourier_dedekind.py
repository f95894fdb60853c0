"""Fourier-Dedekind sums against a high-precision evaluation of the defining sum."""
import random
from fractions import Fraction
from math import gcd

import mpmath
import pytest
from hypothesis import given, strategies as st

from checker.foundation.errors import DomainError
from checker.mathematics.fourier_dedekind import _pair_value, cyclic_convolution, fourier_dedekind, pair_table
from checker.mathematics.partitions import polynomial_part
from checker.mathematics.dedekind import dedekind
from reference import fourier_dedekind_by_roots_of_unity


def mpmath_definition(n, parts, b, dps=60):
    return fourier_dedekind_by_roots_of_unity(n, parts, b, dps)




def close(value, reference, tol=mpmath.mpf(10) ** -40):
    with mpmath.workdps(60):
        return abs(mpmath.mpf(value.numerator) / value.denominator - reference) < tol


def random_instance(rng, bmax, mmax):
    b = rng.randint(1, bmax)
    m = rng.randint(0, mmax)
    parts = []
    while len(parts) < m:
        a = rng.randint(-50, 50)
        if gcd(a, b) == 1:
            parts.append(a)
    return rng.randint(-100, 100), parts, b


def test_against_mpmath_random():
    # mpmath high-precision evaluation of the defining sum
    rng = random.Random(11)
    for _ in range(600):
        n, parts, b = random_instance(rng, 40, 6)
        v = fourier_dedekind(n, parts, b)
        assert isinstance(v, Fraction)
        assert close(v, mpmath_definition(n, parts, b)), (n, parts, b, v)


@pytest.mark.parametrize("b", [101, 257])
def test_against_mpmath_moderate_b(b):
    # mpmath; b large enough that m = 3, 4, 5 use the table and convolution paths
    rng = random.Random(b)
    for m in (3, 4, 5):
        parts = [a for a in rng.sample(range(1, 5 * b), 60) if gcd(a, b) == 1][:m]
        n = rng.randint(-10**6, 10**6)
        assert close(fourier_dedekind(n, parts, b), mpmath_definition(n, parts, b))


def test_two_parameter_case_is_a_dedekind_sum():
    # the cotangent form of s(h, k) (Rademacher & Grosswald 1972, ch. 2) gives
    # s_0(a, 1; b) = -s(a, b) + (b - 1)/(4b)  [from memory; checked with mpmath below]
    for b in range(2, 60):
        for a in range(1, b):
            if gcd(a, b) == 1:
                v = fourier_dedekind(0, [a, 1], b)
                assert v == -dedekind(a, b) + Fraction(b - 1, 4 * b)
    assert close(fourier_dedekind(0, [5, 1], 17), mpmath_definition(0, [5, 1], 17))


@given(st.integers(2, 60), st.data())
def test_pair_table_matches_pointwise_formula(b, data):
    # internal consistency: the O(b) recurrence equals the O(log b) floor-sum formula
    a1 = data.draw(st.integers(1, 200).filter(lambda a: gcd(a, b) == 1))
    a2 = data.draw(st.integers(1, 200).filter(lambda a: gcd(a, b) == 1))
    alpha2 = pow(a2, -1, b)
    table = pair_table(a1, alpha2, b)
    assert table == [_pair_value(a1, alpha2, b, u) for u in range(b)]


@given(st.lists(st.integers(-10**6, 10**6), min_size=1, max_size=30), st.data())
def test_cyclic_convolution_matches_naive(x, data):
    b = len(x)
    y = data.draw(st.lists(st.integers(-10**6, 10**6), min_size=b, max_size=b))
    assert cyclic_convolution(x, y, b) == [sum(x[u] * y[(t - u) % b] for u in range(b)) for t in range(b)]


def pairwise_coprime(parts):
    return all(gcd(a, c) == 1 for i, a in enumerate(parts) for c in parts[i + 1:])


@given(st.lists(st.integers(1, 40), min_size=2, max_size=5).filter(pairwise_coprime))
def test_reciprocity_for_fourier_dedekind_sums(parts):
    # reciprocity for Fourier-Dedekind sums (Gessel, Electron. J. Combin. 4(2) (1997) #R11): for pairwise coprime A,
    # sum_j s_0(A without a_j; a_j) = 1 - (polynomial part of p_A at 0)
    total = sum(fourier_dedekind(0, parts[:j] + parts[j + 1:], parts[j]) for j in range(len(parts)))
    assert total == 1 - polynomial_part(parts)[0]


def test_not_coprime_is_refused():
    with pytest.raises(DomainError) as info:
        fourier_dedekind(1, [3, 4], 6)
    assert info.value.message.startswith("fourier_dedekind needs every entry coprime to 6, but entry 1 is 3")


def test_large_modulus_two_parameters():
    # mpmath cannot sum 10^49 terms; compare with the Dedekind-sum relation above instead,
    # whose fast path is itself checked against python-flint
    b = 10**49 + 9
    assert fourier_dedekind(0, [3, 1], b) == -dedekind(3, b) + Fraction(b - 1, 4 * b)
