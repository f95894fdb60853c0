"""Identities, claims and derive for lattice points in polytopes of any dimension; the unsound reproducers."""
from __future__ import annotations

import itertools
from pathlib import Path

import pytest

from checker import check_file, check_text
from checker.interfaces.derive import derive

UNSOUND = Path(__file__).resolve().parent.parent / "unsound"


def verified(text: str) -> bool:
    report = check_text(text)
    return report.ok


def failure(text: str):
    report = check_text(text)
    assert not report.ok
    return report.failure


POLYTOPE_REPRODUCERS = sorted(p for p in UNSOUND.glob("*.qcert")
                              if "polytope" in p.read_text(errors="replace") or "lattice_points" in p.read_text(errors="replace"))


@pytest.mark.parametrize("path", POLYTOPE_REPRODUCERS, ids=[p.stem for p in POLYTOPE_REPRODUCERS])
def test_polytope_reproducers_are_refused(path):
    first = path.read_text(encoding="utf-8").splitlines()[0]
    assert first.startswith("# must fail: ")
    report = check_file(str(path))
    assert not report.ok, f"{path.name} was verified"


def test_the_issue_reproducers_name_their_reason():
    # issue 11, family 5: the empty polytope has 0 points in every dilate; the sides differ at n = 0
    f = failure("identity for n >= 0: lattice_points_in(n, [[1, 0, -1], [-1, 0, -1], [0, 1, 0], [0, -1, 0]])"
                " = (n - 1)*(n - 2)/2\n")
    assert "fails at n = 0" in f.message
    # family 6: unbounded in the second coordinate, refused with the direction
    f = failure("claim lattice_points_in(1, [[-1, 0, 0], [1, 0, 1], [0, -1, 0]]) = 2\n")
    assert "unbounded" in f.message and "[0, 1]" in f.message


def test_empty_polytope_is_the_zero_function_in_identities():
    assert verified("identity for n >= 0: lattice_points_in(n, [[1, 0, -1], [-1, 0, -1], [0, 1, 0], [0, -1, 0]]) = 0\n")
    assert verified("identity for t >= 0, period 1, degree 0: lattice_points_in(t, [[1, 1], [-1, 1]], [[1, 3]]) = 0\n")


def test_identities_in_higher_dimensions():
    cube6 = [[int(j == i) for j in range(6)] + [1] for i in range(6)] + \
            [[-int(j == i) for j in range(6)] + [0] for i in range(6)]
    # hypercube binomial formula
    assert verified(f"identity for t >= 0: lattice_points_in(t, {cube6}) = (t + 1)^6\n")
    assert not verified(f"identity for t >= 0: lattice_points_in(t, {cube6}) = (t + 1)^6 + binomial(t, 6)\n")
    simplex5 = [[0] * 5] + [[int(j == i) for j in range(5)] for i in range(5)]
    assert verified(f"identity for t >= 0: lattice_points(t, {simplex5}) = binomial(t + 5, 5)\n")
    # Ehrhart-Macdonald reciprocity for the simplex: interior points C(t - 1, 5) (Macdonald 1971)
    assert verified(f"identity for t >= 1: interior_lattice_points(t, {simplex5}) = binomial(t - 1, 5)\n")


def test_lower_dimensional_identities_by_equations():
    # the triangle x + y + z = 1 in the positive orthant: C(t + 2, 2) (Stanley EC1 4.6)
    text = ("identity for t >= 0, degree 2: lattice_points_in(t, [[-1, 0, 0, 0], [0, -1, 0, 0], [0, 0, -1, 0]],"
            " [[1, 1, 1, 1]]) = binomial(t + 2, 2)\n")
    assert verified(text)
    # a claimed degree of 1 is checked, not trusted
    assert not verified(text.replace("degree 2", "degree 1"))


def test_magic_squares_claims():
    # H_3(t) = C(t + 2, 2) + 3 C(t + 3, 4) (MacMahon; Stanley EC1 4.6.21)
    n = 3
    ineqs = [[-int(k == c) for k in range(n * n)] + [0] for c in range(n * n)]
    eqs = [[int(k // n == i) for k in range(n * n)] + [1] for i in range(n)] + \
          [[int(k % n == j) for k in range(n * n)] + [1] for j in range(n)]
    assert verified(f"identity for t >= 0: lattice_points_in(t, {ineqs}, {eqs}) = binomial(t + 2, 2) + 3*binomial(t + 3, 4)\n")


def test_hstar_claims():
    # h* of [0, 1]^3 is the Eulerian numbers 1, 4, 1 (Stanley EC1 4.6.15); of the permutohedron Pi_4
    # ... h* of Reeve's tetrahedron with r = 13 is 1 + 12 z^2 (Reeve 1957)
    cube = [list(p) for p in itertools.product([0, 1], repeat=3)]
    assert verified(f"claim hstar(0, {cube}) = 1\nclaim hstar(1, {cube}) = 4\nclaim hstar(2, {cube}) = 1\n"
                    f"claim hstar(3, {cube}) = 0\nclaim hstar(50, {cube}) = 0\n")
    reeve = [[0, 0, 0], [1, 0, 0], [0, 1, 0], [1, 1, 13]]
    assert verified(f"claim hstar(1, {reeve}) = 0\nclaim hstar(2, {reeve}) = 12\n")
    assert verified("claim hstar_in(1, [[-1, 0, 0], [0, -1, 0], [1, 1, 1]]) = 0\n")
    assert not verified(f"claim hstar(1, {cube}) = 3\n")


def test_conventions_from_the_issue():
    # Stanley EC1 1.8: the empty product; B_n = 0 for odd n > 1 (common practice), at any size
    assert verified("claim partitions(0, []) = 1\nclaim partitions(7, []) = 0\nclaim bernoulli(1000001) = 0\n")
    assert verified("identity for n >= 1: partitions(n, []) = 0\n")
    cube3 = [[int(j == i) for j in range(3)] + [1] for i in range(3)] + \
            [[-int(j == i) for j in range(3)] + [0] for i in range(3)]
    assert verified(f"claim lattice_points_in(10^9, {cube3}) = (10^9 + 1)^3\n")


def test_derive_writes_constituents_with_the_period_collapse():
    # McAllister & Woods (2005): denominator 3, period 1
    text = derive("lattice_points(t, [[0, 0, 0], [1, 2/3, 0], [3, 0, 0]])")
    assert "period collapse" in text and "constituents(t, [[1, 2, 1]])" in text
    assert check_text(text).ok
    text = derive("lattice_points_in(t, [[-1, 0, 0, 0], [0, -1, 0, 0], [0, 0, -1, 0]], [[2, 2, 2, 1]])")
    assert "period 2" in text and check_text(text).ok
    text = derive("lattice_points_in(t, [[1, 0, -1], [-1, 0, -1]])")
    assert "empty" in text and check_text(text).ok


def test_derive_of_the_birkhoff_polytope_b4_checks():
    # H_4's polynomial (OEIS A001496 values at t = 0..9, from memory) written and re-checked
    n = 4
    ineqs = [[-int(k == c) for k in range(n * n)] + [0] for c in range(n * n)]
    eqs = [[int(k // n == i) for k in range(n * n)] + [1] for i in range(n)] + \
          [[int(k % n == j) for k in range(n * n)] + [1] for j in range(n)]
    text = derive(f"lattice_points_in(t, {ineqs}, {eqs})")
    assert "dimension 9" in text
    assert check_text(text).ok
    assert check_text(f"claim lattice_points_in(9, {ineqs}, {eqs}) = 2309384\n").ok


def test_polytope_errors_carry_positions():
    f = failure("claim lattice_points_in(1, [[1, 0, 1], [1, 1]]) = 0\n")
    assert f.line == 1 and "different lengths" in f.message
    f = failure("claim lattice_points_in(1, [[0, 0, -1, 0], [0, 0, 1, 1]]) = 2\n")
    assert f.line == 1 and "whole line" in f.message
    f = failure("claim lattice_points_in(-1, [[1, 1], [-1, 1]]) = 0\n")
    assert ">= 0" in f.message
