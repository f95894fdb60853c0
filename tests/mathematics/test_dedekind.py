"""Dedekind sums against python-flint, the definition, and published laws."""
import random
from fractions import Fraction
from math import gcd

import flint
import pytest
from hypothesis import given, settings, strategies as st

from checker.mathematics.dedekind import (dedekind, dedekind_along_euclid, dedekind_by_definition,
                                          dedekind_equals, twelve_k_dedekind,
                                          generalized_dedekind_by_reciprocity,
                              dedekind_rademacher, generalized_dedekind,
                              generalized_dedekind_by_definition, reciprocity_descent,
                              reciprocity_term)
from checker.mathematics.elementary import sawtooth
from checker.mathematics.bernoulli import periodic_bernoulli
from checker.foundation.errors import DomainError
from conftest import exact, flint_fraction


def random_coprime_pair(rng, digits):
    while True:
        k = rng.randrange(10 ** (digits - 1), 10 ** digits) if digits > 1 else rng.randrange(2, 10)
        h = rng.randrange(-k, 2 * k)
        if gcd(h, k) == 1:
            return h, k


@pytest.mark.parametrize("digits", [1, 2, 3, 5, 10, 20, 50, 100])
def test_dedekind_matches_python_flint(digits):
    # python-flint fmpq.dedekind_sum as an independent reference
    rng = random.Random(digits)
    for _ in range(600):
        h, k = random_coprime_pair(rng, digits)
        exact(dedekind(h, k), flint_fraction(flint.fmpq.dedekind_sum(h, k)))


def test_dedekind_matches_python_flint_beyond_lehmer_threshold():
    # python-flint; sizes where the batched (Lehmer) quotient path is used
    rng = random.Random(7)
    for digits in (150, 300, 1000):
        for _ in range(40):
            h, k = random_coprime_pair(rng, digits)
            exact(dedekind(h, k), flint_fraction(flint.fmpq.dedekind_sum(h, k)))


@pytest.mark.parametrize("use_gmpy2", [True, False])
def test_both_inverse_paths_against_python_flint(monkeypatch, use_gmpy2):
    # python-flint; the modular inverse from gmpy2, or from the cofactors carried along
    import checker.mathematics.dedekind as module
    if not use_gmpy2:
        monkeypatch.setattr(module, "_gmp_invert", None)
    elif module._load_gmp() is None:
        pytest.skip("gmpy2 is not installed")
    rng = random.Random(17)
    for digits in (1, 3, 30, 140, 141, 400, 1200):
        for _ in range(30):
            h, k = random_coprime_pair(rng, digits)
            exact(dedekind(h, k), flint_fraction(flint.fmpq.dedekind_sum(h, k)))


def test_dedekind_non_coprime_and_all_h_against_flint():
    # python-flint accepts any h and k >= 1
    for k in range(1, 80):
        for h in range(-90, 90):
            exact(dedekind(h, k), flint_fraction(flint.fmpq.dedekind_sum(h, k)))


def test_published_values():
    # Rademacher & Grosswald, Dedekind Sums (1972): s(1, k) = (k-1)(k-2)/(12k)
    for k in range(1, 500):
        exact(dedekind(1, k), Fraction((k - 1) * (k - 2), 12 * k))
    # Rademacher & Grosswald, ch. 3: s(2, k) = (k-1)(k-5)/(24k) for odd k
    for k in range(1, 500, 2):
        exact(dedekind(2, k), Fraction((k - 1) * (k - 5), 24 * k))
    exact(dedekind(5, 17), Fraction(1, 17))   # from memory, re-derived by the definition below
    exact(dedekind_by_definition(5, 17), Fraction(1, 17))


def test_twelve_hk_congruence():
    # Rademacher & Grosswald, ch. 3: 12 h k s(h, k) = h^2 + 1 (mod k) for coprime h, k
    rng = random.Random(3)
    for _ in range(3000):
        h, k = random_coprime_pair(rng, rng.randint(1, 40))
        v = 12 * h * k * dedekind(h, k)
        assert v.denominator == 1
        assert (v.numerator - h * h - 1) % k == 0


@given(st.integers(-300, 300), st.integers(1, 150))
def test_fast_equals_definition(h, k):
    # the definition summed term by term
    assert dedekind(h, k) == dedekind_by_definition(h, k)


@given(st.integers(-10**30, 10**30), st.integers(1, 10**30))
def test_odd_in_h(h, k):
    # s(-h, k) = -s(h, k)   (Rademacher & Grosswald, ch. 3)
    assert dedekind(-h, k) == -dedekind(h, k)


@given(st.integers(1, 10**40), st.integers(2, 10**40))
def test_inverse_invariance(h, k):
    # s(h', k) = s(h, k) when h h' = 1 (mod k)   (Rademacher & Grosswald, ch. 3)
    if gcd(h, k) == 1:
        assert dedekind(pow(h, -1, k), k) == dedekind(h, k)


@given(st.integers(1, 10**60), st.integers(1, 10**60))
def test_reciprocity(h, k):
    # Dedekind reciprocity law
    if gcd(h, k) == 1:
        assert dedekind(h, k) + dedekind(k, h) == Fraction(-1, 4) + (Fraction(h, k) + Fraction(k, h) + Fraction(1, h * k)) / 12
        assert reciprocity_term(h, k) == dedekind(h, k) + dedekind(k, h)


@given(st.integers(1, 10**80), st.integers(1, 10**80))
def test_along_euclid_agrees_with_fast_path(h, k):
    values = dedekind_along_euclid(h, k)
    for (a, b), t in list(values.items())[:30]:
        assert Fraction(t, 12 * b) == dedekind(a, b)
    h, k = h % k, k
    if gcd(h, k) == 1 and k > 1:       # python-flint's fmpq.dedekind_sum, every pair
        for (a, b), t in values.items():
            assert Fraction(t, 12 * b) == Fraction(int(flint.fmpq.dedekind_sum(a, b).p),
                                                   int(flint.fmpq.dedekind_sum(a, b).q))


def test_along_euclid_watches_the_clock(monkeypatch):
    # a pass over 10^4 digits runs for seconds (minutes without gmpy2): it meets the `seconds` limit
    import checker.mathematics.dedekind as module
    from checker.foundation.errors import OutOfTime
    def out_of_time():
        raise OutOfTime("out of time")
    monkeypatch.setattr(module, "check_time", out_of_time)
    fib = [1, 1]
    while len(fib) < 2100:
        fib.append(fib[-1] + fib[-2])
    with pytest.raises(OutOfTime):               # from memory: 2098 steps from (F(2099), F(2100))
        dedekind_along_euclid(fib[-2], fib[-1])
    assert dedekind_along_euclid(fib[20], fib[21])[(fib[20], fib[21])] is not None   # 20 steps: no look


def _dr_definition(h, k, x, y):
    return sum(sawtooth(h * (j + y) / k + x) * sawtooth((j + y) / Fraction(k)) for j in range(k))


fractions_small = st.fractions(min_value=-3, max_value=3, max_denominator=7)


@given(st.integers(-20, 20), st.integers(1, 25), fractions_small, fractions_small)
def test_dedekind_rademacher_matches_definition(h, k, x, y):
    # Rademacher (1964), definition of s(h, k; x, y), summed with Fractions
    assert dedekind_rademacher(h, k, x, y) == _dr_definition(h, k, Fraction(x), Fraction(y))


def test_dedekind_rademacher_reduces_to_dedekind():
    # Rademacher (1964): s(h, k; 0, 0) = s(h, k)
    for k in range(1, 40):
        for h in range(-5, 40):
            assert dedekind_rademacher(h, k, 0, 0) == dedekind(h, k)


@given(st.integers(1, 6), st.integers(-30, 30), st.integers(1, 30))
def test_generalized_dedekind_matches_definition(p, h, k):
    # Apostol (1950): s_p(h, k) = sum_{j mod k} (j/k) Bbar_p(hj/k), with Fractions
    expected = sum(Fraction(j, k) * periodic_bernoulli(p, Fraction(h * j, k)) for j in range(k))
    assert generalized_dedekind(p, h, k) == expected
    assert generalized_dedekind_by_definition(p, h, k) == expected


def test_generalized_first_order_is_dedekind():
    # Apostol (1950): s_1(h, k) = s(h, k)
    for k in range(1, 40):
        for h in range(0, 40):
            assert generalized_dedekind(1, h, k) == dedekind(h, k)


def test_apostol_reciprocity_odd_orders():
    # Apostol (1950), Theorem 1: for odd p and coprime h, k >= 1,
    # (p+1)(h k^p s_p(h,k) + k h^p s_p(k,h)) = sum_{j=0}^{p+1} C(p+1,j)(-1)^j B_j B_{p+1-j} h^j k^{p+1-j} + p B_{p+1}
    from math import comb
    from checker.mathematics.bernoulli import bernoulli
    for p in (1, 3, 5):
        for h in range(1, 12):
            for k in range(1, 12):
                if gcd(h, k) != 1:
                    continue
                lhs = (p + 1) * (h * k ** p * generalized_dedekind(p, h, k) + k * h ** p * generalized_dedekind(p, k, h))
                rhs = sum(comb(p + 1, j) * (-1) ** j * bernoulli(j) * bernoulli(p + 1 - j) * h ** j * k ** (p + 1 - j)
                          for j in range(p + 2)) + p * bernoulli(p + 1)
                assert lhs == rhs, (p, h, k)


@pytest.mark.parametrize("args, message", [
    ((1, 0), "the second argument of dedekind must be a positive integer, not 0"),
    ((1, -3), "the second argument of dedekind must be a positive integer, not -3"),
    ((Fraction(1, 2), 3), "the first argument of dedekind must be an integer, not 1/2"),
    ((1.5, 3), "the first argument of dedekind must be an integer, not a floating-point number (quasicert is exact: write a fraction)"),
])
def test_domain_errors(args, message):
    with pytest.raises(DomainError) as info:
        dedekind(*args)
    assert info.value.message == message


# -- Apostol's s_p by his reciprocity law ---------------------------------------

def _sympy_apostol(p, h, k):
    # the definition with sympy's Bernoulli polynomials: sum_j (j/k) Bbar_p(h j/k), Bbar_p(x) = B_p({x})
    import sympy
    total = sympy.Integer(0)
    for j in range(k):
        x = sympy.Rational(h * j % k, k)
        value = 0 if (p == 1 and x == 0) else sympy.bernoulli(p, x)
        total += sympy.Rational(j, k) * value
    return Fraction(int(total.p), int(total.q))


def test_apostol_reciprocity_values_against_sympy():
    # sympy's Bernoulli polynomials summed term by term (an outside source of the definition)
    rng = random.Random(150)
    for _ in range(60):
        p, k = rng.choice([1, 3, 5, 7]), rng.randint(65, 160)
        h = rng.randint(-3 * k, 3 * k)
        if gcd(h, k) == 1:
            assert generalized_dedekind_by_reciprocity(p, h, k) == _sympy_apostol(p, h, k)


@given(st.sampled_from([1, 3, 5, 9, 11]), st.integers(-10**4, 10**4), st.integers(1, 700))
def test_apostol_reciprocity_against_the_sum(p, h, k):
    # the old O(k p) path, term by term
    if gcd(h, k) == 1:
        assert generalized_dedekind_by_reciprocity(p, h, k) == generalized_dedekind_by_definition(p, h, k)
        assert generalized_dedekind(p, h, k) == generalized_dedekind_by_definition(p, h, k)


@given(st.integers(1, 10**40), st.integers(1, 10**40))
def test_apostol_order_one_is_dedekind(h, k):
    # s_1 = s (Apostol 1950), against python-flint's fmpq.dedekind_sum
    if gcd(h, k) == 1:
        assert generalized_dedekind(1, h, k) == flint_fraction(flint.fmpq.dedekind_sum(h, k))


def test_apostol_even_order_and_common_factor_use_the_sum():
    # no reciprocity law for even p or gcd(h, k) > 1: the definition itself
    assert generalized_dedekind(2, 5, 101) == generalized_dedekind_by_definition(2, 5, 101)
    assert generalized_dedekind(3, 10, 100) == generalized_dedekind_by_definition(3, 10, 100)
    with pytest.raises(DomainError):
        generalized_dedekind_by_reciprocity(2, 5, 101)


# -- the batched (Lehmer) quotients: every proposal is checked before use ----------------

def _both_gmpy2_modes():
    import checker.mathematics.dedekind as module
    return [None, module._load_gmp()] if module._load_gmp() is not None else [None]


def _from_quotients(quotients):
    """The coprime pair (h, k) whose Euclid quotients of k / h are the given ones (the last >= 2)."""
    num, den = 1, 0                    # k / h = [q_1; q_2, ..., q_m]
    for q in reversed(quotients):
        num, den = q * num + den, num
    return den, num


def _adversarial_pairs():
    rng = random.Random(2026)
    pairs = []
    a, b = 1, 2                        # Fibonacci: every quotient 1, the most steps per bit
    for i in range(1, 9000):
        a, b = b, a + b
        if i in (400, 401, 2000, 8999):
            pairs += [(a, b), (b - a, b)]
    for bits in (700, 1500, 5000):     # k = 2^n +- 1: long runs of equal quotients
        for k in (2**bits - 1, 2**bits + 1):
            pairs += [(2, k), (3, k), (2**(bits // 2) + 1, k), (k - 2, k), ((k - 1) // 2, k),
                      (rng.randrange(1, 2**64), k)]
    # huge quotients: in the first place, in the middle of a batch, and many in a row
    pairs.append(_from_quotients([2**3000 + 5, 3, 1, 4, 2]))
    pairs.append(_from_quotients([1] * 300 + [2**700 + 1] + [1] * 300 + [7]))
    pairs.append(_from_quotients([rng.choice([1, 2, 2**140, 2**300 - 1]) for _ in range(40)] + [2]))
    pairs.append(_from_quotients([rng.randrange(1, 2**rng.randrange(1, 200)) for _ in range(200)] + [3]))
    return pairs


@pytest.fixture(params=["pure Python", "gmpy2"])
def gmpy2_mode(request, monkeypatch):
    """Run a test once with the pure-Python kernel and once with gmpy2's inverse (if installed)."""
    import checker.mathematics.dedekind as module
    modes = _both_gmpy2_modes()
    index = ["pure Python", "gmpy2"].index(request.param)
    if index >= len(modes):
        pytest.skip("gmpy2 is not installed")
    monkeypatch.setattr(module, "_gmp_invert", modes[index])


def test_batches_on_adversarial_pairs_against_python_flint(gmpy2_mode):
    # python-flint's fmpq.dedekind_sum; Fibonacci pairs, k = 2^n +- 1, huge quotients
    for h, k in _adversarial_pairs():
        exact(dedekind(h, k), flint_fraction(flint.fmpq.dedekind_sum(h, k)))


def _quotients(x, y, stop=0):
    out = []
    while y > stop:
        out.append(x // y)
        x, y = y, x % y
    return out


def _first_batch_is_wrong(h, k, leading, stop):
    """Whether Euclid on the leading bits of (k, h) proposes a quotient that is not Euclid's own."""
    shift = max(k.bit_length() - leading, 0)
    proposed = _quotients(k >> shift, h >> shift, stop)
    return proposed != _quotients(k, h)[:len(proposed)]


@pytest.mark.parametrize("leading, stop", [(8, 1), (12, 2), (40, 1), (300, 2)])
def test_wrong_batch_proposals_are_refused(monkeypatch, leading, stop):
    # Batches run down to `stop` on a few leading bits, where many proposed quotients are
    # wrong: the exact check must refuse each wrong batch, so the values stay python-flint's
    import checker.mathematics.dedekind as module
    monkeypatch.setattr(module, "_LEADING_BITS", leading)
    monkeypatch.setattr(module, "_STOP", stop)
    monkeypatch.setattr(module, "_BATCH_BITS", leading + 2)
    monkeypatch.setattr(module, "_BARE_BATCH_BITS", leading + 2)
    rng = random.Random(leading)
    pairs = _adversarial_pairs()[:6] + [random_coprime_pair(rng, d) for d in (30, 200, 700) for _ in range(4)]
    pairs = [(h % k, k) for h, k in pairs]
    assert any(_first_batch_is_wrong(h, k, leading, stop) for h, k in pairs)   # the check has work
    for gmp in _both_gmpy2_modes():
        monkeypatch.setattr(module, "_gmp_invert", gmp)
        for h, k in pairs:
            exact(dedekind(h, k), flint_fraction(flint.fmpq.dedekind_sum(h, k)))


@given(st.integers(1, 2**4000), st.integers(2**500, 2**4000), st.booleans())
def test_batches_against_python_flint(h, k, pure):
    # python-flint's fmpq.dedekind_sum, beyond the batch threshold, with and without gmpy2
    import checker.mathematics.dedekind as module
    saved = module._load_gmp()
    module._gmp_invert = None if pure else saved
    try:
        assert dedekind(h, k) == flint_fraction(flint.fmpq.dedekind_sum(h, k))
    finally:
        module._gmp_invert = saved


@given(st.integers(-10**5, 10**5), st.integers(2**10, 3 * 10**4), st.sampled_from([(6, 1), (9, 2), (10, 3)]))
def test_small_batches_against_the_definition(h, k, batch):
    # The definition summed term by term, with batches made small enough to run at these k
    # (and to propose wrong quotients often, which the check must refuse)
    import checker.mathematics.dedekind as module
    saved = (module._LEADING_BITS, module._STOP, module._BATCH_BITS, module._BARE_BATCH_BITS)
    module._LEADING_BITS, module._STOP, module._BATCH_BITS, module._BARE_BATCH_BITS = \
        batch[0], batch[1], batch[0] + 2, batch[0] + 2
    try:
        assert dedekind(h, k) == dedekind_by_definition(h, k)
    finally:
        module._LEADING_BITS, module._STOP, module._BATCH_BITS, module._BARE_BATCH_BITS = saved


# -- the integer test of table rows: dedekind_equals and twelve_k_dedekind ----------------------

def _flint_dedekind(h, k):
    return flint_fraction(flint.fmpq.dedekind_sum(h, k))    # python-flint, test-only reference


_SIZES = st.sampled_from([1, 3, 10, 20, 21, 40, 130, 400, 600])     # 600 digits: batches without the inverse


@st.composite
def _claims(draw):
    """(h, k, p, q): h of any sign, k >= 1 (k = 1 and common factors included), a claim p/q that is
    the value written with any nonzero factor (negative denominators too), or the value moved a little."""
    digits = draw(_SIZES)
    k = draw(st.integers(1, 10 ** digits))
    h = draw(st.integers(-(10 ** digits), 10 ** digits))
    if draw(st.booleans()):
        g = draw(st.integers(1, 10 ** draw(_SIZES)))
        h, k = g * h, g * k                                # not coprime
    value = dedekind_by_definition(h, k) if k < 300 else _flint_dedekind(h % k, k)
    m = draw(st.integers(-10 ** 25, 10 ** 25).filter(bool))
    p, q = value.numerator * m, value.denominator * m
    if draw(st.booleans()):
        how = draw(st.sampled_from(["numerator", "denominator", "zero", "twelve k", "inverse"]))
        if how == "numerator":
            p += draw(st.integers(-3, 3).filter(bool))
        elif how == "denominator":
            q += draw(st.integers(-3, 3).filter(lambda d: d and q + d))
        elif how == "zero":
            p = 0
        elif how == "twelve k":
            p, q = value.numerator * 12 * k + draw(st.integers(-2, 2)), 12 * k   # off by a little over 12k
        else:       # off by a multiple of 1/(12k'): the inverse moved by the modulus
            k2 = value.denominator
            p, q = value.numerator * 12 * k2 // value.denominator + k2 * draw(st.integers(-2, 2)), 12 * k2
    return h, k, p, q


@given(_claims())
@settings(max_examples=400, deadline=None)
def test_dedekind_equals_agrees_with_the_value_and_with_flint(claim):
    h, k, p, q = claim
    truth = _flint_dedekind(h % k, k) if k > 1 else Fraction(0)
    assert truth == dedekind(h, k)
    assert dedekind_equals(h, k, p, q) is (Fraction(p, q) == truth)
    numerator, reduced_k = twelve_k_dedekind(h, k)
    assert Fraction(numerator, 12 * reduced_k) == truth and k % reduced_k == 0


def test_dedekind_equals_small_values_exhaustively():
    # every h mod k for k <= 40 against the definition, the right value and its neighbours 1/(12k) away
    for k in range(1, 41):
        for h in range(-k, 2 * k):
            value = dedekind_by_definition(h, k)
            assert dedekind_equals(h, k, value.numerator, value.denominator)
            assert dedekind_equals(h, k, -value.numerator, -value.denominator)
            for d in (-2, -1, 1, 2):
                wrong = value + Fraction(d, 12 * k)
                assert not dedekind_equals(h, k, wrong.numerator, wrong.denominator)


def test_dedekind_equals_refuses_what_is_not_defined():
    with pytest.raises(DomainError):
        dedekind_equals(5, 0, 0, 1)
    with pytest.raises(DomainError):
        dedekind_equals(5, 17, 1, 0)
    with pytest.raises(TypeError):
        dedekind_equals(5, Fraction(17), 1, 17)


# -- Euclid's run gives the gcd: no separate gcd, the reduced pair from the same quotients -------

def _naive_euclid(r0, r1):
    """(q_1 - q_2 + ..., number of quotients, gcd, u with u r1 = gcd mod r0), one quotient at a time."""
    alt, n, u0, u1, r0_given = 0, 0, 0, 1, r0
    while r1:
        q = r0 // r1
        alt += q if n % 2 == 0 else -q
        n += 1
        r0, r1, u0, u1 = r1, r0 - q * r1, u1, u0 - q * u1
    return alt, n, r0, u0 % r0_given


@given(st.integers(1, 2**1500), st.integers(1, 2**1500), st.integers(1, 2**600), st.booleans(),
       st.sampled_from([None, (8, 1), (40, 2)]))
@settings(deadline=None)
def test_euclid_against_one_quotient_at_a_time(a, b, g, want_inverse, batch):
    # the tail (subtract first, divide for quotients >= 2) and the batches, also made small
    # enough to propose wrong quotients, against the schoolbook run, on pairs with a common factor
    import checker.mathematics.dedekind as module
    r0, r1 = max(a, b) * g + g, min(a, b) * g         # r0 > r1 > 0, gcd a multiple of g
    alt, n, gcd_, u = _naive_euclid(r0, r1)
    saved = (module._LEADING_BITS, module._STOP, module._BATCH_BITS, module._BARE_BATCH_BITS)
    if batch:
        module._LEADING_BITS, module._STOP, module._BATCH_BITS, module._BARE_BATCH_BITS = \
            batch[0], batch[1], batch[0] + 2, batch[0] + 2
    try:
        got = module._euclid(r0, r1, want_inverse)
    finally:
        module._LEADING_BITS, module._STOP, module._BATCH_BITS, module._BARE_BATCH_BITS = saved
    assert (got[0], got[1] % 2, got[2]) == (alt, n % 2, gcd_) and gcd_ == gcd(r0, r1)
    if want_inverse:
        assert got[3] % r0 == u and got[3] * r1 % r0 == gcd_ % r0


def test_common_factors_of_every_size_against_python_flint(gmpy2_mode):
    # python-flint; the gcd comes out of the Euclid run (short, long, h dividing k, reached in
    # a batch's exact step), and the value is that of the reduced pair
    rng = random.Random(41)
    for g_bits, digits in ((1, 5), (40, 20), (200, 100), (700, 30), (1200, 400), (3, 1000)):
        for _ in range(6):
            h, k = random_coprime_pair(rng, digits)
            g = rng.getrandbits(g_bits) | 1
            truth = _flint_dedekind(h % k, k)
            assert dedekind(g * h, g * k) == truth
            assert twelve_k_dedekind(g * h, g * k) == twelve_k_dedekind(h, k)
    for h in (3, 2**400 + 1, 10**150 + 7):               # h divides k: one quotient, gcd h
        for m in (2, 3, 10**50 + 1, 2**800):
            exact(dedekind(h, h * m), _flint_dedekind(1, m))
            exact(dedekind(-h, h * m), -_flint_dedekind(1, m))


# -- reciprocity_descent: the constants of many reciprocity steps at once ------------------------

@given(st.integers(1, 10 ** 40), st.integers(1, 10 ** 40))
def test_descent_constants_are_the_summed_reciprocity_terms(h, k):
    # the definition of the walk: Dedekind's law term by term, in Fractions
    g = gcd(h, k)
    h, k = h // g, k // g
    a, b, total, sign = h, k, Fraction(0), 1
    walk = reciprocity_descent(h, k)
    for x, y, n, s in walk:
        total += sign * reciprocity_term(a, b)
        a, b, sign = b % a, a, -sign
        assert (x, y, s) == (a, b, sign)
        assert Fraction(n, 12 * k * y) == total
    assert walk[-1][:2] == (0, 1)


def test_descent_against_python_flint():
    # s(h, k) = n / (12 k b) + (-1)^i s(a, b) at every pair, both sums from python-flint
    rng = random.Random(77)
    for _ in range(40):
        k = rng.randint(1, 10 ** rng.randint(1, 400))
        h = rng.randint(1, 2 * k)
        if gcd(h, k) != 1:
            continue
        whole = flint_fraction(flint.fmpq.dedekind_sum(h, k))
        walk = reciprocity_descent(h, k)
        for a, b, n, sign in walk[::max(1, len(walk) // 7)] + walk[-1:]:
            assert Fraction(n, 12 * k * b) + sign * flint_fraction(flint.fmpq.dedekind_sum(a, b)) == whole


def test_descent_stops_at_the_wanted_pairs():
    # 17 = 3 * 5 + 2, 5 = 2 * 2 + 1, 2 = 2 * 1: the pairs (2, 5), (1, 2), (0, 1)
    assert reciprocity_descent(5, 17, {(1, 2)}) == [(1, 2, 24, 1)]
    assert reciprocity_descent(5, 17, {(1, 3)}) == []
    assert reciprocity_descent(5, 17, set()) == []
    assert reciprocity_descent(17, 5)[0][:2] == (5, 17)        # h > k: the first step swaps
    with pytest.raises(DomainError):
        reciprocity_descent(0, 5)
