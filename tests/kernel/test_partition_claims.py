"""Claims and identities about p_A(n) with large parts, through the checker (values from independent routes)."""
from fractions import Fraction

from checker import check_text
from checker.mathematics.partitions import partitions_by_fourier_dedekind
from reference import partitions_by_recursion

MILLION = [999983, 1000003, 999979]           # pairwise coprime (primes, from memory; the test checks gcds)
BILLION = [10**9 + 7, 10**9 + 9, 10**9 + 21]


def test_claims_with_parts_of_a_million_and_a_billion():
    for parts in (MILLION, BILLION):
        n = 10**30 + 17
        # the Fourier-Dedekind decomposition (Gessel 1997): an independent route to the value
        value = partitions_by_fourier_dedekind(n, parts)
        report = check_text(f"claim partitions({n}, {parts}) = {value}\n")
        assert report.ok, report.failure
        report = check_text(f"claim partitions({n}, {parts}) = {value + 1}\n")
        assert not report.ok and report.failure.exact == Fraction(value)


def test_paranoid_second_opinion_with_large_parts():
    n = 10**30 + 17
    value = partitions_by_fourier_dedekind(n, BILLION)
    report = check_text(f"claim partitions({n}, {BILLION}) = {value}\n", paranoid=True)
    assert report.ok, report.failure


def test_four_parts_of_a_billion_by_recursion():
    # n = 3000 * 10^9 + 31000 with parts 10^9 + (7, 9, 21, 33): every solution has x1 + x2 + x3 + x4 = 3000
    # (the excess 7 x1 + 9 x2 + 21 x3 + 33 x4 is at most 33 * 3000 < 10^9) and excess 31000, so the
    # count is a short loop over x3, x4 (from the definition)
    parts = [10**9 + 7, 10**9 + 9, 10**9 + 21, 10**9 + 33]
    n = 3000 * 10**9 + 31000
    expected = 0
    for x3 in range(10000 // 14 + 1):            # 2 x2 = 10000 - 14 x3 - 26 x4 >= 0 bounds x3, x4
        for x4 in range(10000 // 26 + 1):
            s, r = 3000 - x3 - x4, 31000 - 21 * x3 - 33 * x4
            twice_x2 = r - 7 * s                 # 7 x1 + 9 x2 = r with x1 = s - x2
            if twice_x2 >= 0 and twice_x2 % 2 == 0 and twice_x2 // 2 <= s:
                expected += 1
    assert expected > 1000
    assert check_text(f"claim partitions({n}, {parts}) = {expected}\n").ok
    report = check_text(f"claim partitions({n}, {parts}) = {expected - 1}\n")
    assert not report.ok and report.failure.exact == expected


def test_identity_of_a_three_part_closed_form():
    # OEIS A000115 (parts 1, 2, 5): a(n) = round((n + 4)^2 / 20), from memory; the identity is
    # checked on its constituents
    report = check_text("identity for n >= 0: partitions(n, [1, 2, 5]) = floor(((n + 4)^2 + 10)/20)\n")
    assert report.ok, report.failure


def test_small_claims_against_the_reference():
    for parts, n in (([3, 3, 4], 40), ([6, 10, 15], 91), ([1, 1, 1, 2], 12), ([2, 4, 8], 31)):
        value = partitions_by_recursion(n, parts)
        assert check_text(f"claim partitions({n}, {parts}) = {value}\n").ok
