"""Identities with floor, ceil, round, frac, sawtooth and mod of quasi-polynomials, and powers of -1."""
from fractions import Fraction
from math import floor, lcm

from hypothesis import given, settings, strategies as st

from checker import check_text
from conftest import sympy_series

P1234 = "floor(((n + 4)^3 + 3*(n + 4)^2 - 9*(n + 4)*mod(n + 4, 2))/144 + 1/2)"


def test_published_closed_form_of_p1234():
    # OEIS A001400 (partitions into at most 4 parts); first terms from memory, more from sympy's series
    first = [1, 1, 2, 3, 5, 6, 9, 11, 15, 18, 23, 27, 34, 39, 47, 54, 64, 72, 84, 94]
    assert sympy_series([1, 2, 3, 4], 20) == first
    report = check_text(f"identity for n >= 0: partitions(n, [1, 2, 3, 4]) = {P1234}\n")
    assert report.ok, report.failure


def _closed_form(n, a=9, b=3, d=144, half=Fraction(1, 2)):
    m = n + 4
    return floor(Fraction(m ** 3 + b * m ** 2 - a * m * (m % 2), d) + half)


def test_a_changed_closed_form_fails_at_its_first_counterexample():
    # sympy: p_{1,2,3,4}(n) as series coefficients; the changed forms evaluated in Python's Fractions
    counts = sympy_series([1, 2, 3, 4], 200)
    for old, new, kwargs in (("144", "145", {"d": 145}), ("9*(n", "8*(n", {"a": 8}),
                             ("3*(n + 4)^2", "2*(n + 4)^2", {"b": 2})):
        report = check_text(f"identity for n >= 0: partitions(n, [1, 2, 3, 4]) = {P1234.replace(old, new)}\n")
        first = next(n for n in range(200) if _closed_form(n, **kwargs) != counts[n])
        assert not report.ok and report.failure.message == f"the identity fails at n = {first}"
    # halves to thirds is no slip: the form still holds (the fractional parts stay away from 1/2 and 2/3)
    assert all(_closed_form(n, half=Fraction(1, 3)) == counts[n] for n in range(200))
    assert check_text(f"identity for n >= 0: partitions(n, [1, 2, 3, 4]) = {P1234.replace('1/2)', '1/3)')}\n").ok


def _interpolate(points):
    """Coefficients of the polynomial through the points (Lagrange, in Fractions)."""
    coeffs = [Fraction(0)] * len(points)
    for i, (xi, yi) in enumerate(points):
        basis, denom = [Fraction(1)], Fraction(1)
        for j, (xj, _) in enumerate(points):
            if j != i:
                basis = [Fraction(0)] + basis
                for k in range(len(basis) - 1):
                    basis[k] -= xj * basis[k + 1]
                denom *= xi - xj
        for k in range(len(points)):
            coeffs[k] += yi * basis[k] / denom
    return coeffs


def _constituents_text(rows):
    return "[" + ", ".join("[" + ", ".join(str(c) for c in row) + "]" for row in rows) + "]"


@settings(max_examples=25)
@given(st.lists(st.fractions(-3, 3, max_denominator=6), min_size=1, max_size=3),
       st.lists(st.fractions(-2, 2, max_denominator=4), min_size=1, max_size=4),
       st.sampled_from(["floor", "ceil", "round", "frac", "sawtooth"]), st.data())
def test_function_of_a_quasipolynomial_both_ways(coeffs, wave, name, data):
    # expected constituents: the function's exact values (Python's Fractions, the definitions of floor,
    # ceiling, rounding halves up, fractional part, sawtooth) interpolated on each residue class
    poly_text = " + ".join(f"({c})*n^{j}" for j, c in enumerate(coeffs))
    inner = f"{poly_text} + periodic(n, [{', '.join(str(v) for v in wave)}])"

    def f(n):
        v = sum(c * n ** j for j, c in enumerate(coeffs)) + wave[n % len(wave)]
        fl = Fraction(floor(v))
        return {"floor": fl, "ceil": -Fraction(floor(-v)), "round": Fraction(floor(v + Fraction(1, 2))),
                "frac": v - fl, "sawtooth": Fraction(0) if v == fl else v - fl - Fraction(1, 2)}[name]

    period = lcm(len(wave), *[c.denominator for c in coeffs], *[v.denominator for v in wave])
    degree = len(coeffs) - 1 if name in ("floor", "ceil", "round") else 0
    rows = [_interpolate([(r + period * i, f(r + period * i)) for i in range(degree + 1)]) for r in range(period)]
    good = check_text(f"identity for n >= 0: {name}({inner}) = constituents(n, {_constituents_text(rows)})\n")
    assert good.ok, good.failure
    r = data.draw(st.integers(0, period - 1))
    rows[r][0] += Fraction(1, 7)
    bad = check_text(f"identity for n >= 0: {name}({inner}) = constituents(n, {_constituents_text(rows)})\n")
    assert not bad.ok and bad.failure.message == f"the identity fails at n = {r}"


@given(st.integers(-5, 5), st.integers(-5, 5), st.integers(1, 7))
def test_powers_of_minus_one_and_mod_of_integer_valued_quasipolynomials(a, b, m):
    # common practice: (-1)^E depends on E mod 2, mod(E, m) on E mod m; values by Python's % operator
    e = f"({a})*n*(n + 1)/2 + ({b})*mod(n, 3)"

    def ev(n):
        return a * n * (n + 1) // 2 + b * (n % 3)
    period = 12 * m
    signs = ", ".join(str((-1) ** (ev(n) % 2)) for n in range(period))
    residues = ", ".join(str(ev(n) % m) for n in range(period))
    assert check_text(f"identity for all n: (-1)^({e}) = periodic(n, [{signs}])\n").ok
    assert check_text(f"identity for all n: mod({e}, {m}) = periodic(n, [{residues}])\n").ok
    wrong = residues.split(", ")
    wrong[-1] = str((int(wrong[-1]) + 1) % max(m, 2)) if m > 1 else "1"
    assert not check_text(f"identity for all n: mod({e}, {m}) = periodic(n, [{', '.join(wrong)}])\n").ok


def test_refusals_for_other_exponentials_and_non_integer_exponents():
    report = check_text("identity for n >= 0: 2^n = 1\n")
    assert report.failure.message == ("n stands in an exponent of a base other than 1 or -1, so this is not a "
                                      "quasi-polynomial in n")
    report = check_text("identity for n >= 0: (-1)^(n/2) = 1\n")
    assert not report.ok and "the exponent must be an integer" in report.failure.message
    assert check_text("identity for all n: 1^(n^2 + 3) + (-1)^(2*n) = 2\n").ok


def test_one_to_a_non_integer_quasipolynomial_is_undefined_somewhere():
    # tests/unsound/undefined-unit-power-*.qcert: 1^(1/2) has no value in the language, so these fail
    for exponent in ("n/2", "dedekind(n, 3)", "floor(n/3)/2", "n*(n + 1)/4"):
        report = check_text(f"identity for n >= 0: 1^({exponent}) = 1\n")
        assert not report.ok and "the exponent must be an integer" in report.failure.message, exponent
    for exponent in ("n*(n + 1)/2", "floor(n/3)", "12*dedekind(n, 3)*3"):     # integers for every n
        assert check_text(f"identity for n >= 0: 1^({exponent}) = 1\n").ok, exponent


def test_zero_to_the_zero_is_one():
    # common practice, and the project's one convention: 0^0 = 1 (it was 0 in the evaluator)
    assert check_text("claim 0^0 = 1\nclaim 0^3 = 0\n").ok
    assert not check_text("claim 0^0 = 0\n").ok
    assert check_text("identity for all n: n^0 = 1\n").ok
