"""Quasi-polynomial identities, derived quasi-polynomials, lattice points and Frobenius witnesses."""
import random
from fractions import Fraction
from math import comb, gcd

import pytest
from hypothesis import assume, given, settings, strategies as st

from checker import check_text
from checker.interfaces.derive import derive_frobenius, derive_partitions
from checker.kernel.evaluation import Evaluator
from checker.language.parsing import parse_certificate
from checker.mathematics.polytopes import convex_hull, lattice_points, lattice_points_inequalities, polygon_count
from checker.language.statements import Identity
from conftest import sympy_series


def derived_rhs(parts):
    """The right side of the derived identity, as a function of n."""
    text = derive_partitions(parts)
    cert = parse_certificate(text)
    ident = next(s for s in cert.statements if isinstance(s, Identity))
    ev = Evaluator({"A": tuple(Fraction(a) for a in parts)})

    def value(n):
        ev.env["n"] = Fraction(n)
        return ev.number(ident.rhs)
    return text, value


@pytest.mark.parametrize("parts, oeis", [([1, 2], "A008619"), ([1, 2, 3], "A001399"), ([1, 5, 10, 25], "A001299")])
def test_derived_quasipolynomials_against_oeis(parts, oeis):
    # OEIS sequences regenerated from the generating function with sympy (first 200 terms)
    text, rhs = derived_rhs(parts)
    assert check_text(text).ok
    for n, v in enumerate(sympy_series(parts, 200)):
        assert rhs(n) == v, (oeis, n)


def test_oeis_closed_forms_as_identities():
    # OEIS A008619: floor(n/2) + 1; A001399: round((n+3)^2/12) = floor(((n+3)^2 + 6)/12)
    text = ("identity for n >= 0: partitions(n, [1, 2]) = floor(n/2) + 1\n"
            "identity for n >= 0: partitions(n, [1, 2, 3]) = floor(((n + 3)^2 + 6)/12)\n")
    report = check_text(text)
    assert report.ok and report.checked == 2


def test_popoviciu_two_parts():
    # Popoviciu (1953): for coprime a, b and n >= 0,
    # p_{a,b}(n) = n/(ab) - {b' n/a} - {a' n/b} + 1, with b b' = 1 mod a and a a' = 1 mod b
    rng = random.Random(1953)
    for _ in range(25):
        a, b = rng.randint(2, 40), rng.randint(2, 40)
        if gcd(a, b) != 1:
            continue
        bi, ai = pow(b, -1, a), pow(a, -1, b)
        text = f"identity for n >= 0: partitions(n, [{a}, {b}]) = n/({a}*{b}) - frac({bi}*n/{a}) - frac({ai}*n/{b}) + 1\n"
        assert check_text(text).ok, (a, b)


def test_sylvester_witnesses():
    # Sylvester (1884): g(a, b) = ab - a - b
    for a, b in [(3, 5), (7, 11), (12, 25), (31, 37)]:
        text = derive_frobenius([a, b])
        assert f"frobenius([{a}, {b}]) = {a * b - a - b}:" in text
        assert check_text(text).ok


def test_witness_for_6_9_20():
    # {6, 9, 20}: 43 (OEIS A065003)
    text = derive_frobenius([6, 9, 20])
    assert "frobenius([6, 9, 20]) = 43:" in text and check_text(text).ok


def test_ehrhart_reciprocity_of_partition_functions():
    # reciprocity of rational generating functions (Stanley, Adv. Math. 14 (1974); Popoviciu (1953)
    # for two parts): P_A(-n) = (-1)^(d-1) P_A(n - sum A)
    text = ("identity for all n: partitions_extended(-n, [4, 9, 11]) = partitions_extended(n - 24, [4, 9, 11])\n"
            "identity for all n: partitions_extended(-n, [2, 3, 3, 5]) = -partitions_extended(n - 13, [2, 3, 3, 5])\n")
    assert check_text(text).ok


def test_pick_and_ehrhart_for_lattice_polygons():
    # Pick's theorem: #(P and Z^2) = A + B/2 + 1; the Ehrhart polynomial is A t^2 + (B/2) t + 1
    rng = random.Random(7)
    for _ in range(30):
        pts = [(rng.randint(-6, 6), rng.randint(-6, 6)) for _ in range(rng.randint(3, 6))]
        hull = convex_hull([(Fraction(x), Fraction(y)) for x, y in pts])
        if len(hull) < 3:
            continue
        area = abs(sum(hull[i][0] * hull[(i + 1) % len(hull)][1] - hull[(i + 1) % len(hull)][0] * hull[i][1]
                       for i in range(len(hull)))) / 2
        boundary = sum(gcd(int(abs(hull[i][0] - hull[(i + 1) % len(hull)][0])),
                           int(abs(hull[i][1] - hull[(i + 1) % len(hull)][1]))) for i in range(len(hull)))
        assert lattice_points(1, pts) == area + Fraction(boundary, 2) + 1
        verts = "[" + ", ".join(f"[{x}, {y}]" for x, y in pts) + "]"
        text = f"identity for t >= 0: lattice_points(t, {verts}) = {area}*t^2 + {Fraction(boundary, 2)}*t + 1\n"
        assert check_text(text).ok


@pytest.mark.parametrize("d", [2, 3, 4])
def test_standard_simplex(d):
    # the standard simplex has Ehrhart polynomial binomial(t + d, d) (Ehrhart, C. R. Acad. Sci. Paris 254 (1962))
    rows = [[-1 if j == i else 0 for j in range(d)] + [0] for i in range(d)] + [[1] * d + [1]]
    for t in range(0, 12):
        assert lattice_points_inequalities(t, rows) == comb(t + d, d)
    text = f"identity for t >= 0: lattice_points_in(t, {rows}) = binomial(t + {d}, {d})\n"
    assert check_text(text).ok


def test_sympy_series_random_parts():
    # sympy series coefficients of 1/prod(1 - x^a) on random A, against the derived quasi-polynomial
    rng = random.Random(3)
    for _ in range(4):
        parts = [rng.randint(1, 12) for _ in range(rng.randint(1, 3))]
        _, rhs = derived_rhs(parts)
        for n, v in enumerate(sympy_series(parts, 40)):
            assert rhs(n) == v, (parts, n)


@settings(max_examples=25, deadline=None)
@given(st.lists(st.integers(1, 30), min_size=1, max_size=4))
def test_derived_quasipolynomial_equals_dynamic_programming(parts):
    # internal cross-check of two computations: the waves against the coefficient table, 1000 values
    _, rhs = derived_rhs(parts)
    values = _table(parts, 1000)
    for n in range(1000):
        assert rhs(n) == values[n], (parts, n)


def _table(parts, size):
    t = [1] + [0] * (size - 1)
    for a in parts:
        for i in range(a, size):
            t[i] += t[i - a]
    return t


def _brute(pts):
    hull = convex_hull(pts)
    xs = [p[0] for p in pts]
    ys = [p[1] for p in pts]
    import math
    count = 0
    for x in range(math.floor(min(xs)), math.ceil(max(xs)) + 1):
        for y in range(math.floor(min(ys)), math.ceil(max(ys)) + 1):
            if len(hull) < 3:
                continue
            count += all((hull[(i + 1) % len(hull)][0] - hull[i][0]) * (y - hull[i][1]) -
                         (hull[(i + 1) % len(hull)][1] - hull[i][1]) * (x - hull[i][0]) >= 0
                         for i in range(len(hull)))
    return count


rational = st.fractions(min_value=-12, max_value=12, max_denominator=7)


@settings(max_examples=300)
@given(st.lists(st.tuples(rational, rational), min_size=3, max_size=3))
def test_triangle_counts_against_brute_force(pts):
    # brute-force enumeration of the bounding box
    assume(len(convex_hull(pts)) == 3)
    assert polygon_count(pts) == _brute(pts)


@settings(max_examples=40, deadline=None)
@given(st.lists(st.integers(1, 20), min_size=1, max_size=3), st.data())
def test_a_wrong_coefficient_is_rejected_at_the_first_counterexample(parts, data):
    text, rhs = derived_rhs(parts)
    # perturb the constant term of the polynomial part by delta: the first counterexample is the start
    delta = data.draw(st.sampled_from([Fraction(1), Fraction(-1, 3), Fraction(5, 7)]))
    start = -sum(parts) + 1
    bad = text.replace("  partitions(n, A) = ", f"  partitions(n, A) = {delta} + ", 1)
    report = check_text(bad)
    assert not report.ok
    assert report.failure.message == f"identity 'derived' fails at n = {start}"


@settings(max_examples=40, deadline=None)
@given(st.lists(st.integers(2, 15), min_size=1, max_size=3), st.data())
def test_a_wrong_periodic_value_is_caught_at_its_first_residue(parts, data):
    text, _ = derived_rhs(parts)
    lines = text.split("\n")
    wave_lines = [i for i, line in enumerate(lines) if line.strip().startswith("+ periodic(n, [")]
    assume(wave_lines)
    i = data.draw(st.sampled_from(wave_lines))
    line = lines[i]
    inner = line[line.index("[") + 1: line.index("]")]
    values = inner.split(", ")
    k = data.draw(st.integers(0, len(values) - 1))
    values[k] = f"({values[k]}) + 1"
    lines[i] = line[: line.index("[") + 1] + ", ".join(values) + line[line.index("]"):]
    report = check_text("\n".join(lines))
    assert not report.ok
    b = len(values)
    start = -sum(parts) + 1
    power = 0 if line.rstrip().endswith(")") else int(line.rsplit("^", 1)[1]) if "^" in line.rsplit(")", 1)[1] else 1
    first = next(n for n in range(start, start + b) if n % b == k and (power == 0 or n != 0))
    assert report.failure.message == f"identity 'derived' fails at n = {first}"


@pytest.mark.parametrize("text, message", [
    ("identity for n >= 0: 1/n = 0\n", "n stands in a denominator, so this is not a quasi-polynomial in n"),
    ("identity for n >= 1: dedekind(1, n) = 0\n", "the second argument of dedekind must not depend on n in an "
     "identity, which needs a quasi-polynomial in n; a closed form for every n is proved with a lemma instead: "
     "lemma NAME(n) for n >= 1: A = B, then its chains and `end`"),
    ("identity for n >= 0: 2^n = 1\n",
     "n stands in an exponent of a base other than 1 or -1, so this is not a quasi-polynomial in n"),
    ("identity for n >= 0: n^n = 1\n", "n stands in an exponent, so this is not a quasi-polynomial in n"),
    ("identity for n >= 0: frobenius([n, 3]) = 0\n", "quasicert does not know frobenius to be a quasi-polynomial in n"),
    ("identity for all n: partitions(n, [1, 2]) = floor(n/2) + 1\n",
     "this side is a quasi-polynomial in n only from n = -2 on, so an identity for all n cannot be decided; "
     "state it for n >= some bound"),
    ("identity for n >= 0: sawtooth(n^2/2 + 2^n) = 0\n",
     "n stands in an exponent of a base other than 1 or -1, so this is not a quasi-polynomial in n"),
])
def test_refusals_name_the_reason(text, message):
    report = check_text(text)
    assert not report.ok and report.failure.message == message


def test_claimed_period_and_degree_are_verified_not_trusted():
    good = "identity for n >= 0, period 2, degree 1: partitions(n, [1, 2]) = floor(n/2) + 1\n"
    assert check_text(good).ok
    bad = "identity for n >= 0, period 3: partitions(n, [1, 2]) = floor(n/2) + 1\n"
    f = check_text(bad).failure
    assert f.message.startswith("the identity: the left side does not have period 3 and degree <= 1")
    bad = "identity for n >= 0, degree 0: partitions(n, [1, 2]) = floor(n/2) + 1\n"
    assert not check_text(bad).ok


@pytest.mark.parametrize("text, message", [
    ("witness frobenius([6, 9, 20]) = 43: 44 = 4*6 + 20, 45 = 5*9, 46 = 6 + 2*20, 47 = 3*9 + 20, 48 = 8*6\n",
     "the witness must represent every integer from 44 to 49; missing: 49"),
    ("witness frobenius([6, 9, 20]) = 43: 44 = 4*6 + 20, 45 = 5*9, 46 = 6 + 2*20, 47 = 3*9 + 20, 48 = 8*6, 49 = 9 + 20\n",
     "the witness for frobenius is wrong: 49 = ...: the terms add up to 29, not 49"),
    ("witness frobenius([6, 9, 20]) = 42: 43 = 6 + 37\n",
     "the witness for frobenius is wrong: 43 = ...: the term 37 has no factor among the parts [6, 9, 20]"),
    ("witness frobenius([6, 9, 20]) = 44: 45 = 5*9, 46 = 6 + 2*20, 47 = 3*9 + 20, 48 = 8*6, 49 = 9 + 2*20, 50 = 5*6 + 20\n",
     "44 is representable (2 ways), so it is not the Frobenius number"),
])
def test_wrong_witnesses(text, message):
    f = check_text(text).failure
    assert f is not None and f.message == message


def _brute_interior(t, pts):
    import math
    pts = [(t * x, t * y) for x, y in pts]
    hull = convex_hull(pts)
    if len(hull) < 3:
        return 0
    xs = [p[0] for p in pts]
    ys = [p[1] for p in pts]
    return sum(all((hull[(i + 1) % len(hull)][0] - hull[i][0]) * (y - hull[i][1]) -
                   (hull[(i + 1) % len(hull)][1] - hull[i][1]) * (x - hull[i][0]) > 0 for i in range(len(hull)))
               for x in range(math.floor(min(xs)), math.ceil(max(xs)) + 1)
               for y in range(math.floor(min(ys)), math.ceil(max(ys)) + 1))


@settings(max_examples=200)
@given(st.lists(st.tuples(rational, rational), min_size=3, max_size=4), st.integers(0, 3))
def test_interior_counts_against_brute_force(pts, t):
    # brute-force enumeration with strict inequalities
    from checker.mathematics.polytopes import interior_lattice_points
    assert interior_lattice_points(t, pts) == _brute_interior(t, pts)


def test_ehrhart_macdonald_reciprocity_for_random_rational_triangles():
    # Ehrhart-Macdonald reciprocity (Macdonald, J. London Math. Soc. (2) 4 (1971)): L_interior(t) = L_P(-t) for t >= 1,
    # with L_P's quasi-polynomial written out by derive
    from checker.interfaces.derive import derive
    rng = random.Random(11)
    for _ in range(8):
        pts = [[f"{rng.randint(-6, 6)}/{rng.randint(1, 3)}", f"{rng.randint(-6, 6)}/{rng.randint(1, 3)}"]
               for _ in range(3)]
        verts = "[" + ", ".join(f"[{x}, {y}]" for x, y in pts) + "]"
        parsed = [(Fraction(x), Fraction(y)) for x, y in pts]
        if len(convex_hull(parsed)) < 3:
            continue
        text = derive(f"lattice_points(t, {verts})")
        assert check_text(text).ok
        table = text.split("constituents(t, ", 1)[1].rsplit(")", 1)[0]
        reciprocity = f"identity for t >= 1: interior_lattice_points(t, {verts}) = constituents(-t, {table})\n"
        assert check_text(reciprocity).ok, verts
