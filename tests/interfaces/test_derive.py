"""Round trip: derived certificates verify; a corrupted derived step is caught at that step."""
import io
import random
from fractions import Fraction

import flint

from checker import check_text
from checker.interfaces.cli import main
from checker.interfaces.derive import derive_dedekind
from conftest import flint_fraction


def test_round_trip_500_random_pairs_up_to_200_digits():
    rng = random.Random(2026)
    for i in range(500):
        digits = rng.randint(1, 200)
        k = rng.randint(1, 10 ** digits)
        h = rng.randint(-10 ** digits, 10 ** digits)
        report = check_text(derive_dedekind(h, k), f"pair {i}")
        assert report.ok, (h, k, report.failure.message)


def test_derived_value_matches_python_flint():
    # python-flint fmpq.dedekind_sum as the outside reference for the chain's last line
    rng = random.Random(5)
    for _ in range(50):
        k = rng.randint(1, 10 ** 60)
        h = rng.randint(-10 ** 60, 10 ** 60)
        last = derive_dedekind(h, k).strip().splitlines()[-1]
        value = last.split("=", 1)[1].split("by")[0].strip()
        num, _, den = value.partition("/")
        assert Fraction(int(num), int(den or 1)) == flint_fraction(flint.fmpq.dedekind_sum(h, k))


def _corrupt(text: str, line_index: int, rng) -> str:
    lines = text.split("\n")
    line = lines[line_index]
    digits = [i for i, ch in enumerate(line.split("by")[0]) if ch.isdigit()]
    i = rng.choice(digits)
    new = str((int(line[i]) + rng.randint(1, 9)) % 10)
    lines[line_index] = line[:i] + new + line[i + 1:]
    return "\n".join(lines)


def test_corrupted_derived_step_is_caught_at_that_step():
    rng = random.Random(8)
    tried = 0
    for _ in range(300):
        k = rng.randint(2, 10 ** 40)
        h = rng.randint(1, k)
        text = derive_dedekind(h, k)
        lines = text.split("\n")
        steps = [i for i, ln in enumerate(lines) if ln.startswith("  = ")]
        target = rng.choice(steps)
        bad = _corrupt(text, target, rng)
        if bad == text:
            continue
        tried += 1
        report = check_text(bad)
        assert not report.ok
        # 1-based line of the corrupted step (or the chain line above, if the start was hit)
        assert report.failure.line == target + 1, (h, k, target, report.failure.message)
    assert tried > 250


def test_thousand_digit_derive_is_accepted():
    rng = random.Random(1)
    k = rng.randint(10 ** 999, 10 ** 1000)
    h = rng.randint(1, k)
    report = check_text(derive_dedekind(h, k))
    assert report.ok and report.checked > 1000


def test_cli_derive_then_check(tmp_path):
    out = io.StringIO()
    assert main(["derive", "dedekind(123456789, 987654321)"], out=out) == 0
    path = tmp_path / "d.qcert"
    path.write_text(out.getvalue())
    out2 = io.StringIO()
    assert main(["check", str(path)], out=out2) == 0
    assert main(["derive", "dedekind(2, 3)", "-o", str(tmp_path / "e.qcert")]) == 0
    assert check_text((tmp_path / "e.qcert").read_text()).ok


def test_derive_refuses_what_it_cannot_write():
    err = io.StringIO()
    assert main(["derive", "bernoulli(4)"], out=io.StringIO(), err=err) == 2
    assert err.getvalue().startswith("the expression, column 1: error: derive writes certificates for dedekind(h, k), "
                                     "fourier_dedekind(n, A, b), partitions(n, A), lattice_points(t, P), lattice_points_in(t, P) and "
                                     "frobenius(A); not for bernoulli")
    assert main(["derive", "dedekind(1, 0)"], out=io.StringIO(), err=err) == 2
