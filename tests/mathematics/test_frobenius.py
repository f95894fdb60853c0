"""Frobenius numbers against Sylvester's formula and brute force."""
import random
from fractions import Fraction
from math import gcd

import pytest

from checker.foundation.errors import DomainError
from checker.mathematics.frobenius import frobenius, nonrepresentable_count
from conftest import exact


def test_sylvester_two_parts():
    # Sylvester (1884): g(a, b) = ab - a - b, and (a-1)(b-1)/2 non-representable integers
    for a in range(1, 60):
        for b in range(1, 60):
            if gcd(a, b) == 1:
                exact(frobenius([a, b]), Fraction(a * b - a - b))
                exact(nonrepresentable_count([a, b]), Fraction((a - 1) * (b - 1), 2))


def test_six_nine_twenty():
    # {6, 9, 20}: Frobenius number 43 (OEIS A065003)
    exact(frobenius([6, 9, 20]), Fraction(43))
    exact(frobenius([20, 9, 6]), Fraction(43))


def representable(n, parts, _cache={}):
    key = tuple(parts)
    if key not in _cache:
        ok = [False] * 1000
        ok[0] = True
        for m in range(1, 1000):
            ok[m] = any(m >= a and ok[m - a] for a in parts)
        _cache[key] = ok
    return _cache[key][n]


def test_brute_force_random():
    # brute force: the largest n < 600 with p_A(n) = 0
    rng = random.Random(4)
    for _ in range(300):
        parts = [rng.randint(2, 30) for _ in range(rng.randint(2, 4))]
        g = 0
        for a in parts:
            g = gcd(g, a)
        if g != 1:
            continue
        missing = [n for n in range(1000) if not representable(n, parts)]
        exact(frobenius(parts), Fraction(max(missing)))
        exact(nonrepresentable_count(parts), Fraction(len(missing)))


def test_one_in_the_set():
    # common practice: with a part 1 everything is representable, g = -1 by convention
    exact(frobenius([1, 7]), Fraction(-1))
    exact(nonrepresentable_count([1, 7]), Fraction(0))


def test_common_divisor_refused():
    with pytest.raises(DomainError) as info:
        frobenius([4, 6, 10])
    assert "common divisor 2" in info.value.message
