"""derive for Fourier-Dedekind sums: the certificates verify, end at the right value, and a changed
number in a step is caught at that step."""
import random
from fractions import Fraction
from math import gcd

import mpmath
from hypothesis import given, settings, strategies as st

from checker import check_text
from checker.interfaces.derive import derive_fourier_dedekind
from reference import fourier_dedekind_by_roots_of_unity


def mp_sum(n, parts, b):
    return fourier_dedekind_by_roots_of_unity(n, parts, b, 40).real




def last_value(text):
    line = [ln for ln in text.splitlines() if ln.startswith("  = ")][-1]
    return Fraction(line[4:].split("by")[0].strip())


@settings(max_examples=60)
@given(st.integers(-50, 50), st.integers(1, 80), st.data())
def test_derived_certificates_verify_and_agree_with_mpmath(n, b, data):
    coprime = st.integers(-40, 40).filter(lambda a: gcd(a, b) == 1)
    parts = data.draw(st.lists(coprime, min_size=1, max_size=4))
    text = derive_fourier_dedekind(n, parts, b)
    report = check_text(text)
    assert report.ok, (text, report.failure)
    first_chain_end = text.split("\n\n")[0]
    with mpmath.workdps(40):
        assert abs(mpmath.mpf(last_value(first_chain_end).numerator) / last_value(first_chain_end).denominator
                   - mp_sum(n, parts, b)) < mpmath.mpf(10) ** -25


def test_huge_moduli():
    for n, parts, b in ((5, [3, 7, 11], 10**30 + 57), (0, [5, 7], 10**40 + 1), (0, [1, 3], 10**50)):
        assert check_text(derive_fourier_dedekind(n, parts, b)).ok


def test_a_changed_number_is_caught_at_its_step():
    rng = random.Random(16)
    text = derive_fourier_dedekind(0, [5, 7], 101)
    lines = text.split("\n")
    steps = [i for i, ln in enumerate(lines) if ln.startswith("  = ")]
    caught = 0
    for i in steps:
        body = lines[i].split("by")[0]
        digits = [j for j, ch in enumerate(body) if ch.isdigit()]
        j = rng.choice(digits)
        changed = lines[:]
        changed[i] = lines[i][:j] + str((int(lines[i][j]) + 1) % 10) + lines[i][j + 1:]
        report = check_text("\n".join(changed))
        if not report.ok:
            caught += 1
            assert report.failure.line <= i + 2      # at the changed step (or the next, for a valid other inverse)
    assert caught >= len(steps) - 1
