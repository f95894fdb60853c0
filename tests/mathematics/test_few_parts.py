"""p_A(n) with large parts: the three-part formula, the recursion and the Fourier-Dedekind path,
each against brute force, sympy's series, OEIS closed forms and the other methods."""
import random
from fractions import Fraction
from math import gcd

import pytest
from hypothesis import given, settings, strategies as st

from checker.foundation.errors import BudgetExceeded
from checker.foundation.limits import DEFAULT_LIMITS
from checker.kernel.functions import REGISTRY
from checker.mathematics.few_parts import few_parts, three_parts, two_parts
from checker.mathematics.partitions import (PartitionQuasiPolynomial, partitions, partitions_by_fourier_dedekind,
                                            partitions_by_table, partitions_extended, plan, plans)
from conftest import exact, sympy_series
from reference import partitions_by_recursion


def brute_three(n, a, b, c):
    """#{(x, y, z) >= 0 : a x + b y + c z = n} by two loops and a divisibility test (from the definition)."""
    if n < 0:
        return 0
    return sum(1 for z in range(n // c + 1) for y in range((n - c * z) // b + 1) if (n - c * z - b * y) % a == 0)


@settings(max_examples=300)
@given(st.lists(st.integers(1, 12), max_size=6), st.integers(-6, 90))
def test_every_method_agrees_with_brute_force(parts, n):
    # small A with repeats, part 1, gcd(A) > 1, n < 0, n = 0 and A = [] included
    expected = partitions_by_recursion(n, parts)
    exact(partitions(n, parts), expected)
    for p in plans(n, tuple(parts)):
        assert p.run() == expected, (p.method, parts, n)


@settings(max_examples=100)
@given(st.lists(st.integers(1, 6), min_size=1, max_size=4).map(lambda xs: [4 * x for x in xs]), st.integers(0, 120))
def test_common_divisor_of_the_parts(parts, n):
    # every part divisible by 4: p_A(n) = 0 unless 4 | n
    exact(partitions(n, parts), partitions_by_recursion(n, parts))
    if n % 4:
        exact(partitions(n, parts), Fraction(0))


@settings(max_examples=200)
@given(st.integers(1, 10**9), st.integers(1, 10**9), st.integers(1, 10**9), st.integers(0, 40), st.data())
def test_three_large_parts_against_loops(a, b, c, k, data):
    # parts up to 10^9, n up to 40 times the middle part: the two loops stay short
    scale = data.draw(st.sampled_from([1, 2, 6]))
    a, b, c = a * scale, b * scale, c * scale
    small, mid, large = sorted((a, b, c))
    n = data.draw(st.integers(0, k * mid + 7))
    assert three_parts(n, a, b, c) == brute_three(n, small, mid, large)
    assert few_parts(n, [c, a, b]) == three_parts(n, a, b, c)


def test_two_parts_popoviciu():
    # Popoviciu (1953): p_{a,b}(n) = n/(ab) - {b' n/a} - {a' n/b} + 1 for coprime a, b
    rng = random.Random(4)
    for _ in range(300):
        a, b = rng.randint(1, 10**12), rng.randint(1, 10**12)
        if gcd(a, b) != 1:
            continue
        bi, ai = pow(b, -1, a) if a > 1 else 0, pow(a, -1, b) if b > 1 else 0
        n = rng.randint(0, 10**40)
        frac = lambda x: x - (x.numerator // x.denominator)
        expected = Fraction(n, a * b) - frac(Fraction(bi * n, a)) - frac(Fraction(ai * n, b)) + 1
        assert two_parts(n, a, b) == expected


def test_oeis_closed_forms_at_huge_n():
    for n in list(range(300)) + [10**40 + r for r in range(60)]:
        # OEIS A001399 (parts 1, 2, 3): round((n + 3)^2 / 12)
        exact(partitions(n, [1, 2, 3]), Fraction(((n + 3) ** 2 + 6) // 12))
        # OEIS A000115 (parts 1, 2, 5): round((n + 4)^2 / 20), from memory; sympy agrees below
        exact(partitions(n, [1, 2, 5]), Fraction(((n + 4) ** 2 + 10) // 20))
        # OEIS A008619 (parts 1, 2): floor(n/2) + 1
        exact(partitions(n, [2, 1]), Fraction(n // 2 + 1))
    assert sympy_series([1, 2, 5], 80) == [((n + 4) ** 2 + 10) // 20 for n in range(80)]


def test_oeis_first_terms():
    # OEIS A001400 (parts 1, 2, 3, 4), first terms from memory
    a001400 = [1, 1, 2, 3, 5, 6, 9, 11, 15, 18, 23, 27, 34, 39, 47, 54, 64, 72, 84, 94, 108]
    # OEIS A000008 (change with coins 1, 2, 5, 10), first terms from memory
    a000008 = [1, 1, 2, 2, 3, 4, 5, 6, 7, 8, 11, 12, 15, 16, 19, 22, 25, 28, 31, 34, 40]
    for n in range(21):
        exact(partitions(n, [1, 2, 3, 4]), Fraction(a001400[n]))
        exact(partitions(n, [1, 2, 5, 10]), Fraction(a000008[n]))
    # and the continuation from sympy's series, by the recursion over the part 4
    series = sympy_series([1, 2, 3, 4], 200)
    for n in range(4, 200, 7):
        assert plan_named("recursion", n, [1, 2, 3, 4]).run() == series[n]


def plan_named(method, n, parts):
    found = [p for p in plans(n, tuple(parts)) if p.method == method]
    assert found, (method, parts, n)
    return found[0]


@pytest.mark.parametrize("parts", [[3, 5, 7, 11], [4, 9, 11, 13, 17], [1, 6, 25, 7], [2, 3, 5, 7, 11, 13]])
def test_fourier_dedekind_path_against_waves_and_series(parts):
    # pairwise coprime parts: the decomposition against sympy's series and against the waves at huge n
    series = sympy_series(parts, 120)
    for n in range(120):
        assert partitions_by_fourier_dedekind(n, parts) == series[n], n
    waves = PartitionQuasiPolynomial.of(tuple(sorted(parts)))
    for n in [10**30, 10**30 + 1, 10**40 + 12345]:
        assert partitions_by_fourier_dedekind(n, parts) == waves.value(n)


def test_three_parts_of_a_billion_two_ways():
    # Popoviciu summed by floor sums against the Fourier-Dedekind decomposition (two-term sums
    # by Dedekind-Rademacher-type floor sums): independent routes to the same p_A(n)
    rng = random.Random(8)
    for _ in range(30):
        parts = [rng.randrange(10**9, 2 * 10**9) for _ in range(3)]
        if any(gcd(parts[i], parts[j]) != 1 for i in range(3) for j in range(i)):
            continue
        for n in [10**30 + rng.randrange(10**9), rng.randrange(10**12), 0, sum(parts)]:
            assert three_parts(n, *parts) == partitions_by_fourier_dedekind(n, parts)


def test_recursion_against_fourier_dedekind_near_ten_thousand():
    # 4 and 5 pairwise coprime parts near 10^4 at n = 400,000: the recursion over the largest
    # parts (three-part values) against the Fourier-Dedekind decomposition (the benchmark does 10^6)
    for parts in ([9973, 10007, 9967, 10009], [101, 9973, 10007, 9967, 10037]):
        n = 4 * 10**5 + 12345
        rec = plan_named("recursion", n, parts)
        assert rec.terms < 10**5
        assert rec.run() == partitions_by_fourier_dedekind(n, parts)


def test_plan_takes_the_fast_paths():
    assert plan(10**30, (10**9 + 7, 10**9 + 9, 10**9 + 21)).method == "few parts"
    assert plan(10**12, (10**9 + 7, 10**9 + 9, 10**9 + 21, 10**9 + 33)).method in ("recursion", "cones")
    assert plan(10**30, (3, 5, 7, 11, 13)).method in ("Fourier-Dedekind", "waves")
    assert plan(50, (1, 2, 3, 4, 5)).method == "table"
    # parts above n are never used, and a common divisor is divided out
    assert plan(10, (3, 4, 10**30)).parts == (3, 4)
    assert plan(10, (4, 6, 8, 12)).parts == (2, 3, 4)
    assert plan(11, (4, 6)).method == "zero"


def test_extended_below_the_threshold_by_reciprocity():
    # P_A(n) for n <= -sum(A) from p_A at -n - sum(A) (Stanley, Adv. Math. 14 (1974)); the waves agree
    for parts in ([3, 5, 7], [2, 2, 3], [4, 9, 11, 13], [1]):
        waves = PartitionQuasiPolynomial.of(tuple(sorted(parts)))
        for n in list(range(-sum(parts) - 40, 3)) + [-10**30]:
            exact(partitions_extended(n, parts), waves.value(n))
    big = [10**9 + 7, 10**9 + 9, 10**9 + 21]
    n = 10**30
    exact(partitions_extended(-n - sum(big), big), Fraction(three_parts(n, *big)))


def test_budget_refuses_with_the_estimate():
    spec = REGISTRY["partitions"]
    big = tuple(Fraction(10**9 + 2 * k + 1) for k in range(13))
    with pytest.raises(BudgetExceeded) as info:
        spec.call((Fraction(10**30), big), DEFAULT_LIMITS)
    message = info.value.message
    # the cheapest estimate names its method (13 parts of 10^9: more than the cones are offered for,
    # and every other method is over the budget), refused before any work
    assert message.startswith("p_A(n) by a table of ") and "for 13 parts" in message
    assert "parts up to 1000000025" in message
    assert "over the limit terms = 3000000" in message and "--limit terms=N" in message
    # three parts of any size cost nothing worth counting
    value = spec.call((Fraction(10**30), big[:3]), DEFAULT_LIMITS)
    assert value == three_parts(10**30, 10**9 + 1, 10**9 + 3, 10**9 + 5)


NEAR_A_MILLION = (999983, 1000003, 999979, 1000033, 1000037)


def _forbid(monkeypatch, *names):
    """Make the named methods of the partitions module raise, to show that a computation did not use them."""
    import checker.mathematics.partitions as module

    def refuse(*args, **kwargs):
        raise AssertionError("this method should not have run")
    for name in names:
        monkeypatch.setattr(module, name, refuse)


def test_cones_compute_five_parts_near_a_million_within_the_default_budget(monkeypatch):
    from checker.mathematics import ehrhart
    n = 10**30
    # independent value: the Fourier-Dedekind decomposition (Gessel 1997; shares nothing with the cones)
    expected = partitions_by_fourier_dedekind(n, sorted(NEAR_A_MILLION))
    ehrhart._CONES.clear()
    assert plan(n, NEAR_A_MILLION).method == "cones"
    # the Fourier-Dedekind method alone would cost 2 10^7 terms, over the default budget; the cones
    # are metered and need a small part of it
    assert plan_named("Fourier-Dedekind", n, NEAR_A_MILLION).terms > DEFAULT_LIMITS.terms
    _forbid(monkeypatch, "partitions_by_fourier_dedekind", "partitions_by_table", "_by_recursion")
    value = REGISTRY["partitions"].call((Fraction(n), tuple(map(Fraction, NEAR_A_MILLION))), DEFAULT_LIMITS)
    assert value == expected


def test_six_parts_near_a_billion_by_the_cones():
    from checker.mathematics import ehrhart
    parts = tuple(10**9 + k for k in (0, 1, 3, 7, 9, 13))
    assert plan(10**30, parts).method == "cones"
    value = REGISTRY["partitions"].call((Fraction(10**30), tuple(map(Fraction, parts))), DEFAULT_LIMITS)
    assert value > 0
    # the same decomposition serves every n: at n = 3 10^10 + 7 against the recursion over the three
    # largest parts (Popoviciu's formula for the rest), which shares nothing with the cones
    n = 3 * 10**10 + 7
    assert ehrhart.restricted_partitions(n, parts) == plan_named("recursion", n, parts).run()


def test_cones_over_their_allowance_give_way_and_leave_nothing_behind(monkeypatch):
    from checker.mathematics import ehrhart
    from checker.mathematics.cones import TooCostly, allowance
    # four pairwise coprime parts near 10^6 at n = 10^30: the cones need about 10^6 steps, the Fourier-Dedekind
    # sums 4.8 10^7 (1.2 10^7 terms).  With a budget of 1000 terms more than those, the cones get an allowance
    # of 30000 steps, stop there, and the Fourier-Dedekind sums answer
    parts, n = NEAR_A_MILLION[:4], 10**30
    first, fourier = plan(n, parts), plan_named("Fourier-Dedekind", n, parts)
    assert first.method == "cones" and first.steps == fourier.steps
    tight = DEFAULT_LIMITS.with_overrides({"terms": fourier.terms + 1000})
    simplex = ehrhart._simplex_of_parts(tuple(sorted(parts)))
    ehrhart._CONES.clear()
    with pytest.raises(TooCostly):
        ehrhart.restricted_partitions(n, sorted(parts), allowance(100))
    assert simplex not in ehrhart._CONES                 # nothing half-built is kept
    value = REGISTRY["partitions"].call((Fraction(n), tuple(map(Fraction, parts))), tight)
    assert simplex not in ehrhart._CONES                 # the cones stopped again: the Fourier-Dedekind sums answered
    # independent value: the cones themselves, unmetered, built afresh (Barvinok; shares nothing with Gessel's
    # decomposition), which must not have been disturbed by the attempts that stopped
    assert value == ehrhart.restricted_partitions(n, sorted(parts))
    assert simplex in ehrhart._CONES
    # a budget of 100 terms: no other method fits, and the cones refuse once they spend it
    with pytest.raises(BudgetExceeded):
        REGISTRY["partitions"].call((Fraction(n), tuple(map(Fraction, parts))),
                                    DEFAULT_LIMITS.with_overrides({"terms": 100}))
    ehrhart._CONES.clear()


def test_cones_refuse_clearly_when_no_method_fits_the_budget():
    from checker.mathematics import ehrhart
    # five parts at random near 10^9 (the hostile input of tests/replay): the decomposition takes some
    # 15 s; with a budget of 30000 terms the cones stop after 9 10^5 steps and refuse, and nothing is kept
    parts = (760802823, 806340495, 811423016, 1066917336, 5554647846)
    small = DEFAULT_LIMITS.with_overrides({"terms": 30000})
    ehrhart._CONES.clear()
    with pytest.raises(BudgetExceeded) as info:
        REGISTRY["partitions"].call((Fraction(10**30), tuple(map(Fraction, parts))), small)
    message = info.value.message
    assert message.startswith("p_A(n) for 5 parts up to 5554647846 by Barvinok's signed cones")
    assert "needs more than 30000 steps" in message and "the cheapest other method, by a table" in message
    assert "over the limit terms = 30000" in message and "--limit terms=N" in message
    assert ehrhart._simplex_of_parts(tuple(sorted(parts))) not in ehrhart._CONES


def test_cones_against_recursion_and_fourier_dedekind():
    from checker.mathematics.ehrhart import restricted_partitions     # what the "cones" plan runs
    # Barvinok's cones of the simplex {x >= 0 : a.x = n} against two methods that share nothing with them
    for parts, n in (((10**9 + 7, 10**9 + 9, 10**9 + 21, 10**9 + 33), 10**12 + 12345),
                     ((9973, 10007, 9967, 10009), 4 * 10**5 + 12345)):
        assert restricted_partitions(n, parts) == plan_named("recursion", n, parts).run()
    for parts in ((9973, 10007, 9967, 10009), (101, 9973, 10007, 9967, 10037)):
        for n in (10**30 + 7, 10**6 + 1, sum(parts)):
            assert restricted_partitions(n, parts) == partitions_by_fourier_dedekind(n, parts)
    # four parts of a billion at n = 10^30 fit the default budget, by the cones
    assert plan(10**30, (10**9 + 7, 10**9 + 9, 10**9 + 21, 10**9 + 33)).method == "cones"
