"""Restricted partition functions against OEIS, sympy series and closed forms."""
import random
from fractions import Fraction
from math import gcd

import pytest
from hypothesis import given, settings, strategies as st

from checker.foundation.errors import DomainError
from checker.mathematics.fourier_dedekind import fourier_dedekind
from checker.mathematics.partitions import (PartitionQuasiPolynomial, partitions, partitions_by_quasipolynomial,
                                partitions_by_table, partitions_extended, polynomial_part)
from conftest import exact, sympy_series


@pytest.mark.parametrize("parts", [[1, 2], [2, 3, 5], [4, 9, 11], [3, 3, 4], [6, 10, 15], [1, 1, 1, 2], [7]])
def test_against_sympy_series(parts):
    coeffs = sympy_series(parts, 60)
    for n, c in enumerate(coeffs):
        exact(partitions_by_table(n, parts), Fraction(c))
        exact(partitions_by_quasipolynomial(n, parts), Fraction(c))


def test_against_sympy_series_random_parts():
    # sympy series of random A, both evaluation paths
    rng = random.Random(5)
    for _ in range(5):
        parts = [rng.randint(1, 9) for _ in range(rng.randint(1, 3))]
        for n, c in enumerate(sympy_series(parts, 30)):
            assert partitions_by_quasipolynomial(n, parts) == c, (parts, n)


def test_oeis_a008619():
    # OEIS A008619 (partitions into parts 1 and 2): a(n) = floor(n/2) + 1
    for n in list(range(0, 300)) + [10**40, 10**40 + 1]:
        exact(partitions(n, [1, 2]), Fraction(n // 2 + 1))


def test_oeis_a001399():
    # OEIS A001399 (partitions into parts 1, 2, 3): a(n) = round((n + 3)^2 / 12)
    first = [1, 1, 2, 3, 4, 5, 7, 8, 10, 12, 14, 16, 19, 21, 24, 27, 30, 33, 37, 40]  # from memory
    for n, v in enumerate(first):
        exact(partitions(n, [1, 2, 3]), Fraction(v))
    for n in list(range(0, 300)) + [10**40 + r for r in range(12)]:
        exact(partitions(n, [1, 2, 3]), Fraction(((n + 3) ** 2 + 6) // 12))


def test_oeis_a001299():
    # OEIS A001299 (change with coins 1, 5, 10, 25); first terms and a(100) = 242 from memory
    first = [1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 4, 4, 4, 4, 4, 6, 6, 6, 6, 6, 9, 9, 9, 9, 9, 13]
    for n, v in enumerate(first):
        exact(partitions(n, [1, 5, 10, 25]), Fraction(v))
    exact(partitions(100, [1, 5, 10, 25]), Fraction(242))
    exact(partitions_by_quasipolynomial(100, [1, 5, 10, 25]), Fraction(242))


@settings(max_examples=60)
@given(st.lists(st.integers(1, 30), min_size=1, max_size=4), st.data())
def test_quasipolynomial_equals_table(parts, data):
    # both evaluation paths agree, also below 0 down to the threshold -sum(A)
    q = PartitionQuasiPolynomial.of(tuple(parts))
    table_top = 400
    values = [partitions_by_table(n, parts) for n in range(table_top)]
    for n in range(-sum(parts) + 1, table_top):
        assert q.value(n) == (values[n] if n >= 0 else 0), (parts, n)


def test_large_n_against_exact_closed_form_two_parts():
    # Popoviciu (1953): p_{a,b}(n) = n/(ab) - {b' n / a} - {a' n / b} + 1 with b b' = 1 mod a, a a' = 1 mod b
    rng = random.Random(2)
    for _ in range(200):
        a, b = rng.randint(1, 60), rng.randint(1, 60)
        if gcd(a, b) != 1:
            continue
        bi = pow(b, -1, a) if a > 1 else 0
        ai = pow(a, -1, b) if b > 1 else 0
        for n in [rng.randint(0, 10**30), rng.randint(0, 500)]:
            frac = lambda x: x - (x.numerator // x.denominator)
            expected = Fraction(n, a * b) - frac(Fraction(bi * n, a)) - frac(Fraction(ai * n, b)) + 1
            exact(partitions(n, [a, b]), expected)


def test_decomposition_into_fourier_dedekind_sums():
    # partial fractions of 1/prod(1 - x^a) (Gessel, Electron. J. Combin. 4(2) (1997) #R11; Sylvester
    # (1857) for the waves): for pairwise coprime A,
    # p_A(n) = polynomial part + sum_j s_{-n}(A without a_j; a_j)
    parts = [4, 9, 11, 13]
    poly = polynomial_part(parts)
    for n in [0, 1, 17, 1000, 10**12 + 7]:
        value = sum(c * n ** j for j, c in enumerate(poly))
        value += sum(fourier_dedekind(-n, parts[:j] + parts[j + 1:], parts[j]) for j in range(4))
        exact(partitions(n, parts), value)


def test_polynomial_part_of_two_coprime_parts():
    # Popoviciu (1953): the polynomial part for A = {a, b} is n/(ab) + 1/(2a) + 1/(2b)
    exact(polynomial_part([3, 7])[1], Fraction(1, 21))
    exact(polynomial_part([3, 7])[0], Fraction(1, 6) + Fraction(1, 14))


def test_reciprocity_of_the_extension():
    # reciprocity of rational generating functions (Stanley, Adv. Math. 14 (1974)):
    # P_A(-n) = (-1)^(d-1) P_A(n - sum A)
    rng = random.Random(9)
    for _ in range(40):
        parts = [rng.randint(1, 15) for _ in range(rng.randint(1, 4))]
        for n in range(-20, 40):
            assert partitions_extended(-n, parts) == (-1) ** (len(parts) - 1) * partitions_extended(n - sum(parts), parts)


def test_huge_n_is_instant_and_consistent():
    # both sides from the quasi-polynomial; the value must be an integer
    v = partitions(10**40, [4, 9, 11, 13])
    assert v.denominator == 1 and v > 0


def test_bad_parts():
    with pytest.raises(DomainError) as info:
        partitions(5, [2, 0])
    assert info.value.message == "each part in partitions must be a positive integer, not 0"
    exact(partitions(-3, [1, 2]), Fraction(0))


def test_no_parts_is_the_empty_product():
    # Stanley EC1, 1.8: prod over no parts of 1/(1 - x^a) is 1, so p_{}(n) = [n = 0]
    exact(partitions(0, []), Fraction(1))
    exact(partitions(5, []), Fraction(0))
    exact(partitions(-1, []), Fraction(0))
