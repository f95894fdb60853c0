"""The laws of Fourier-Dedekind sums as rules (reciprocity, decomposition, bridge, Rademacher's
reciprocity for s(h, k; x, y)): accepted where they hold, refused with the reason where a side
condition fails, and the laws themselves checked against outside references."""
from fractions import Fraction
from math import gcd

import flint
import mpmath
import pytest
import sympy
from hypothesis import given, settings, strategies as st

from checker import check_text
from checker.kernel.functions import fourier_dedekind as fourier_dedekind_fast
from checker.mathematics.fourier_dedekind import fourier_dedekind
from checker.mathematics.fourier_dedekind_reciprocity import by_reciprocity, poly_at, reciprocity_total
from conftest import flint_fraction, sympy_series
from reference import fourier_dedekind_by_roots_of_unity as mp_sum   # mpmath, 50 digits




def mp_close(value: Fraction, reference) -> bool:
    with mpmath.workdps(50):
        return abs(mpmath.mpf(value.numerator) / value.denominator - reference) < mpmath.mpf(10) ** -35


def sympy_polynomial_part(parts, n):
    # sympy: poly_A(n) = -Res_{z=1} z^(-n-1) / prod(1 - z^a)
    z = sympy.symbols("z")
    value = -sympy.residue(z ** (-n - 1) / sympy.prod([1 - z ** a for a in parts]), z, 1)
    return Fraction(int(sympy.numer(value)), int(sympy.denom(value)))


def pairwise_coprime(parts):
    return all(gcd(a, c) == 1 for i, a in enumerate(parts) for c in parts[i + 1:])


def lst(parts):
    return "[" + ", ".join(str(a) for a in parts) + "]"


def fd_call(n, parts, b):
    return f"fourier_dedekind({n}, {lst(parts)}, {b})"


# -- the laws against outside references -----------------------------------------------

@pytest.mark.parametrize("parts, n", [([3, 5, 7], 0), ([3, 5, 7], 4), ([2, 3, 5], 9), ([1, 4, 9], 0),
                                      ([2, 3, 5, 7], 6)])
def test_reciprocity_law_against_mpmath_and_sympy(parts, n):
    # left: each sum by mpmath's roots-of-unity sum; right: the polynomial part as a residue in sympy
    with mpmath.workdps(50):
        left = sum(mp_sum(n, parts[:j] + parts[j + 1:], a) for j, a in enumerate(parts)).real
    right = (1 if n == 0 else 0) - sympy_polynomial_part(parts, -n)
    assert reciprocity_total(n, parts) == right
    assert mp_close(right, left)


def test_decomposition_against_sympy_series_and_mpmath():
    # sympy: p_A(n) as series coefficients; mpmath: the sums; the kernel's polynomial part
    parts = [3, 4, 5]
    counts = sympy_series(parts, 60)
    for n in range(0, 60, 7):
        with mpmath.workdps(50):
            sums = sum(mp_sum(-n, parts[:j] + parts[j + 1:], a) for j, a in enumerate(parts)).real
            assert abs(poly_at(n, parts) + sums - counts[n]) < mpmath.mpf(10) ** -35


def test_bridge_against_python_flint_and_mpmath():
    # python-flint: s(a c', b); mpmath: s_0(a, c; b)
    for b in (7, 30, 101):
        for a in range(-4, 9):
            for c in range(1, 9):
                if gcd(a, b) == 1 and gcd(c, b) == 1:
                    s = flint_fraction(flint.fmpq.dedekind_sum(a * pow(c, -1, b), b))
                    bridged = -s + Fraction(b - 1, 4 * b)
                    assert fourier_dedekind(0, [a, c], b) == bridged
                    if b < 40:
                        assert mp_close(bridged, mp_sum(0, [a, c], b).real)


def _b2(x):
    # sympy: B_2({x}) with sympy's Bernoulli polynomial
    f = x - (x.numerator // x.denominator)
    v = sympy.bernoulli(2, sympy.Rational(f.numerator, f.denominator))
    return Fraction(int(sympy.numer(v)), int(sympy.denom(v)))


def _rademacher_by_definition(h, k, x, y):
    # the definition, term by term with Python's Fractions: sum_{j mod k} ((h(j+y)/k + x)) (((j+y)/k))
    def saw(t):
        return Fraction(0) if t.denominator == 1 else t - (t.numerator // t.denominator) - Fraction(1, 2)
    return sum(saw(h * (j + y) / k + x) * saw((j + y) / k) for j in range(k))


@given(st.integers(1, 12), st.integers(1, 12), st.fractions(-3, 3, max_denominator=6),
       st.fractions(-3, 3, max_denominator=6))
def test_rademacher_reciprocity_rule_against_the_definition(h, k, x, y):
    # Rademacher, Acta Arith. 9 (1964); B_2 from sympy, the sums from their definition
    text = f"chain dedekind_rademacher({h}, {k}, {x}, {y})\n  = C - dedekind_rademacher({k}, {h}, {y}, {x})   by reciprocity\n"
    if gcd(h, k) != 1:
        report = check_text(text.replace("C", "0"))
        assert not report.ok and f"reciprocity needs coprime h and k, but gcd({h}, {k}) = {gcd(h, k)}" in \
            "\n".join(report.failure.details)
        return
    if x.denominator == 1 and y.denominator == 1:
        c = Fraction(-1, 4) + (Fraction(h, k) + Fraction(k, h) + Fraction(1, h * k)) / 12
    else:
        saw = lambda t: Fraction(0) if t.denominator == 1 else t - (t.numerator // t.denominator) - Fraction(1, 2)  # noqa: E731
        c = saw(x) * saw(y) + (Fraction(h, k) * _b2(y) + _b2(h * y + k * x) / (h * k) + Fraction(k, h) * _b2(x)) / 2
    assert _rademacher_by_definition(h, k, x, y) + _rademacher_by_definition(k, h, y, x) == c
    assert check_text(text.replace("C", f"({c})")).ok
    assert not check_text(text.replace("C", f"({c + Fraction(1, 7)})")).ok


# -- reciprocity as a rule, both ways ----------------------------------------------------

coprime_parts = st.lists(st.integers(1, 13), min_size=2, max_size=4).filter(pairwise_coprime)


def reciprocity_step(parts, n, index, poly_as_call=True):
    b = parts[index]
    rest = parts[:index] + parts[index + 1:]
    head = "1 - " if n == 0 else "-"
    poly = f"partitions_polynomial_part({-n}, {lst(parts)})" if poly_as_call else f"({poly_at(-n, parts)})"
    companions = "".join(f" - {fd_call(n, parts[:j] + parts[j + 1:], a)}" for j, a in enumerate(parts) if j != index)
    return f"chain {fd_call(n, rest, b)}\n  = {head}{poly}{companions}   by reciprocity\n"


@given(coprime_parts, st.data())
def test_reciprocity_accepted_for_pairwise_coprime_parts_in_range(parts, data):
    n = data.draw(st.integers(0, sum(parts) - 1))
    index = data.draw(st.integers(0, len(parts) - 1))
    report = check_text(reciprocity_step(parts, n, index, data.draw(st.booleans())))
    assert report.ok, report.failure.message


@given(coprime_parts, st.data())
def test_reciprocity_refused_outside_the_range(parts, data):
    n = data.draw(st.one_of(st.integers(-30, -1), st.integers(sum(parts), sum(parts) + 30)))
    index = data.draw(st.integers(0, len(parts) - 1))
    report = check_text(reciprocity_step(parts, n, index))
    assert not report.ok
    b = parts[index]
    A = parts[:index] + parts[index + 1:] + [b]
    assert (f"reciprocity cannot be applied to {fd_call(n, parts[:index] + parts[index + 1:], b)}: the reciprocity "
            f"law for A = {A} holds for 0 <= n <= {sum(parts) - 1} (the sum of the parts minus 1), not at n = {n}") \
        in report.failure.details


def test_reciprocity_refused_for_parts_not_coprime_and_wrong_companions():
    report = check_text("chain fourier_dedekind(0, [4, 6], 5)\n"
                        "  = 1 - partitions_polynomial_part(0, [4, 5, 6]) - fourier_dedekind(0, [4, 5], 3)   by reciprocity\n")
    assert ("reciprocity cannot be applied to fourier_dedekind(0, [4, 6], 5): reciprocity for Fourier-Dedekind sums "
            "needs pairwise coprime positive parts A = [4, 6, 5]: the parts must be pairwise coprime, but "
            "gcd(4, 6) = 2") in report.failure.details
    wrong = reciprocity_step([3, 5, 7], 0, 0).replace("fourier_dedekind(0, [3, 7], 5)", "fourier_dedekind(0, [3, 4], 5)")
    report = check_text(wrong)
    assert not report.ok and report.failure.message == "step 1 of the chain at line 1 does not follow by reciprocity"
    # an empty list: d = 1 is not the law
    report = check_text("chain fourier_dedekind(0, [], 5)\n  = 1 - partitions_polynomial_part(0, [5])   by reciprocity\n")
    assert not report.ok


def test_reciprocity_companions_in_any_order_and_modulus_one_optional():
    # the example, with the lists as written, and A = [1, 3, 5] with and without s(...; 1)
    assert check_text("chain fourier_dedekind(0, [5, 7], 3)\n  = 1 - partitions_polynomial_part(0, [3, 5, 7]) "
                      "- fourier_dedekind(0, [7, 3], 5) - fourier_dedekind(0, [5, 3], 7)   by reciprocity\n").ok
    base = "chain fourier_dedekind(0, [1, 5], 3)\n  = 1 - partitions_polynomial_part(0, [1, 3, 5])"
    assert check_text(base + " - fourier_dedekind(0, [1, 3], 5)   by reciprocity\n").ok
    assert check_text(base + " - fourier_dedekind(0, [3, 5], 1) - fourier_dedekind(0, [1, 3], 5)   by reciprocity\n").ok


# -- the decomposition, both ways -----------------------------------------------------------

@given(coprime_parts, st.integers(-60, 200), st.booleans())
def test_decomposition_forward_and_backward(parts, n, extended):
    name = "partitions_extended" if extended else "partitions"
    sums = " + ".join(fd_call(-n, parts[:j] + parts[j + 1:], a) for j, a in enumerate(parts))
    right = f"partitions_polynomial_part({n}, {lst(parts)}) + {sums}"
    forward = check_text(f"chain {name}({n}, {lst(parts)})\n  = {right}   by decomposition\n")
    backward = check_text(f"chain {right}\n  = {name}({n}, {lst(parts)})   by decomposition\n")
    if extended or n > -sum(parts):
        assert forward.ok and backward.ok, (forward.failure, backward.failure)
    else:
        reason = (f"the decomposition of p_A(n) holds for n > -(a1 + ... + ad) = {-sum(parts)}, not at n = {n} "
                  "(partitions_extended obeys it everywhere)")
        assert not forward.ok and any(reason in d for d in forward.failure.details)
        assert not backward.ok


def test_decomposition_refuses_parts_not_coprime():
    report = check_text("chain partitions(10, [2, 4])\n  = partitions_polynomial_part(10, [2, 4])   by decomposition\n")
    assert ("decomposition cannot be applied to partitions(10, [2, 4]): the decomposition of p_A needs pairwise "
            "coprime positive parts A = [2, 4]: the parts must be pairwise coprime, but gcd(2, 4) = 2") \
        in report.failure.details


# -- the bridge, both ways --------------------------------------------------------------------

@given(st.integers(1, 60), st.integers(-80, 80), st.integers(-80, 80), st.integers(-80, 80))
def test_bridge_accepts_exactly_the_inverses(b, a, c, x):
    if gcd(a, b) != 1 or gcd(c, b) != 1:
        return
    const = Fraction(b - 1, 4 * b)
    forward = check_text(f"chain fourier_dedekind(0, [{a}, {c}], {b})\n  = {const} - dedekind({x}, {b})   by bridge\n")
    backward = check_text(f"chain dedekind({x}, {b})\n  = {const} - fourier_dedekind(0, [{a}, {c}], {b})   by bridge\n")
    fits = (x * c - a) % b == 0 or (x * a - c) % b == 0
    assert forward.ok == fits and backward.ok == fits


def test_bridge_refusals_name_the_condition():
    cases = [
        ("chain fourier_dedekind(1, [2, 3], 7)\n  = 3/14 - dedekind(3, 7)   by bridge\n",
         "the bridge is for s_0 (n = 0 mod b), but n = 1 is not 0 mod 7"),
        ("chain fourier_dedekind(0, [2, 3, 4], 7)\n  = 3/14 - dedekind(3, 7)   by bridge\n",
         "the bridge needs a list of two entries [a, c], not 3"),
        ("chain dedekind(3, 7)\n  = 3/14 - fourier_dedekind(0, [2, 5], 7)   by bridge\n",
         "dedekind(3, 7) is not s(a c', b) for [a, c] = [2, 5]: 3*5 is not 2 mod 7 (nor 3*2 = 5)"),
    ]
    for text, reason in cases:
        report = check_text(text)
        assert not report.ok and any(reason in d for d in report.failure.details), report.failure.details


def test_bridge_in_a_lemma_needs_its_conditions_derived():
    good = ('use "dedekind-lemmas"\nlemma ones(b) for b >= 1:\n  fourier_dedekind(0, [1, 1], b) = '
            '(b - 1)*(5 - b)/(12*b)\n  chain fourier_dedekind(0, [1, 1], b)\n    = (b - 1)/(4*b) - dedekind(1, b)   by bridge\n'
            '    = (b - 1)/(4*b) - (b - 1)*(b - 2)/(12*b)   by lemma one_over_k(b)\n'
            '    = (b - 1)*(5 - b)/(12*b)   by arithmetic\nend\n')
    assert check_text(good).ok
    # a c' with c = 3: the writer must give an x with 3 x = 2 (mod b), which no fixed x is for all b
    bad = ('lemma two_three(b) for b >= 1, gcd(b, 6) = 1:\n  fourier_dedekind(0, [2, 3], b) = 0\n'
           '  chain fourier_dedekind(0, [2, 3], b)\n    = (b - 1)/(4*b) - dedekind(2, b)   by bridge\nend\n')
    report = check_text(bad)
    assert not report.ok
    assert any("the bridge needs s(a c', b) with c c' = 1 (mod b): the assumptions do not give" in d
               for d in report.failure.details), report.failure.details


# -- reciprocity as an algorithm ------------------------------------------------------------

def test_huge_modulus_by_reciprocity_matches_the_law_computed_independently():
    # the value for b = 10^30 + 57 is the law's right side with every piece from an outside source:
    # the polynomial part as a sympy residue, the small-modulus sums from mpmath
    b = 10**30 + 57
    value = fourier_dedekind_fast(5, [3, 7, 11], b)
    parts = [3, 7, 11, b]
    # sympy: poly_A(-5) = -Res_{t=0} e^(5t) / prod(1 - e^(a t)) with the part b a symbol N, then N = b
    # (a residue in z would expand z^b)
    t, N = sympy.symbols("t N")
    f = sympy.exp(5 * t) * t ** 4 / ((1 - sympy.exp(3 * t)) * (1 - sympy.exp(7 * t)) * (1 - sympy.exp(11 * t))
                                      * (1 - sympy.exp(N * t)))
    residue = sympy.expand(sympy.series(f, t, 0, 4).removeO()).coeff(t, 3)
    exact_poly = -residue.subs(N, b)
    poly = Fraction(int(sympy.numer(exact_poly)), int(sympy.denom(exact_poly)))
    with mpmath.workdps(80):
        small = sum(mp_sum(5, [x % a for x in parts if x != a], a) for a in (3, 7, 11)).real
        expected = -mpmath.mpf(poly.numerator) / poly.denominator - small
        assert abs(mpmath.mpf(value.numerator) / value.denominator - expected) < mpmath.mpf(10) ** -50
    assert check_text(f"claim fourier_dedekind(5, [3, 7, 11], 10^30 + 57) = {value}\n").ok


@settings(max_examples=60)
@given(st.lists(st.integers(-40, 40), min_size=1, max_size=4), st.integers(2, 400), st.integers(-500, 500))
def test_reciprocity_evaluation_agrees_with_the_direct_table(parts, b, n):
    # internal consistency of two algorithms; mpmath below for a few
    if any(gcd(a, b) != 1 for a in parts) or not pairwise_coprime([a % b for a in parts] + [b]):
        return
    assert by_reciprocity(n, parts, b) == fourier_dedekind(n, parts, b)
    if b < 60:
        assert mp_close(by_reciprocity(n, parts, b), mp_sum(n, parts, b).real)
