"""Round trip: derived certificates verify; a corrupted derived step is caught at that step."""
import io
import random
import re
from fractions import Fraction

import flint

from checker import check_text
from checker.interfaces.cli import main
from checker.interfaces.derive import derive_dedekind
from conftest import flint_fraction


def _round_trip(seed: int, count: int, most_digits: int, per_line_choices) -> None:
    rng = random.Random(seed)
    for i in range(count):
        digits = rng.randint(1, most_digits)
        k = rng.randint(1, 10 ** digits)
        h = rng.randint(-10 ** digits, 10 ** digits)
        per_line = rng.choice(per_line_choices)
        report = check_text(derive_dedekind(h, k, per_line=per_line), f"pair {i}")
        assert report.ok, (h, k, per_line, report.failure.message)


def test_round_trip_500_random_pairs_up_to_200_digits():
    _round_trip(2026, 500, 200, [None])


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
    report = check_text(derive_dedekind(h, k, per_line=1))
    assert report.ok and report.checked > 1000
    report = check_text(derive_dedekind(h, k))
    assert report.ok and 95 < report.checked < 105


def test_round_trip_with_several_steps_a_line():
    _round_trip(2027, 300, 120, [2, 3, 7, 50, 10 ** 6])


def test_each_grouped_line_keeps_the_value_by_python_flint():
    # every line  c +- s(a, b)  equals s(h, k): both sums from python-flint's fmpq.dedekind_sum
    rng = random.Random(44)
    for _ in range(30):
        k = rng.randint(2, 10 ** rng.randint(2, 150))
        h = rng.randint(1, k - 1)
        whole = flint_fraction(flint.fmpq.dedekind_sum(h, k))
        text = derive_dedekind(h, k, per_line=rng.choice([2, 5, 13]))
        for line in text.splitlines()[3:-1]:
            m = re.fullmatch(r"  = (?:(-?\d+(?:/\d+)?) ([+-]) )?(-?)dedekind\((\d+), (\d+)\)    by .*", line)
            c = Fraction(m.group(1)) if m.group(1) else Fraction(0)
            sign = -1 if (m.group(2) == "-" or m.group(3) == "-") else 1
            a, b = int(m.group(4)), int(m.group(5))
            assert c + sign * flint_fraction(flint.fmpq.dedekind_sum(a, b)) == whole, line
        assert text.splitlines()[-1] == f"  = {whole}    by value"


def test_a_long_chain_is_written_in_about_a_hundred_lines():
    rng = random.Random(1)
    k = rng.randint(10 ** 999, 10 ** 1000)
    h = rng.randint(1, k)
    lines = derive_dedekind(h, k).splitlines()
    steps = [ln for ln in lines if ln.startswith("  = ")]
    assert 95 <= len(steps) <= 102 and sum("by descent" in ln for ln in steps) >= 95
    assert len("\n".join(lines)) < 600_000                # a line a step: about 8 MB
    short = derive_dedekind(123456789, 987654321).splitlines()
    assert not any("descent" in ln for ln in short)        # 16 steps: one a line, as before


def test_grouped_chain_mutants_are_rejected_at_their_line():
    rng = random.Random(301)
    k = rng.randint(10 ** 299, 10 ** 300)
    h = rng.randint(1, k)
    lines = derive_dedekind(h, k, per_line=6).split("\n")
    steps = [i for i, ln in enumerate(lines) if ln.startswith("  = ") and "dedekind(" in ln]
    assert check_text("\n".join(lines)).ok and len(steps) > 80
    for index in (steps[1], steps[len(steps) // 2], steps[-3]):
        line = lines[index]
        call, a, b = _pair(line)
        num = line.split(" = ", 1)[1].split("/")[0]
        flipped = line.replace(" - dedekind", " + dedekind") if " - dedekind" in line else \
            line.replace(" + dedekind", " - dedekind")
        mutants = {"sign": flipped,
                   "numerator + 1": line.replace(f"{num}/", f"{int(num) + 1}/", 1),
                   "a + 1": line.replace(call, f"dedekind({a + 1}, {b})"),
                   "swapped pair": line.replace(call, f"dedekind({b}, {a})"),
                   # the pair one step further down, the constant left as it was
                   "one step further": line.replace(call, f"dedekind({b % a}, {a})"),
                   "rule: one step": line.replace("by descent", "by reciprocity, reduce"),
                   "rule: value": line.replace("by descent", "by value")}
        for what, mutated in mutants.items():
            assert mutated != line, what
            report = check_text("\n".join(lines[:index] + [mutated] + lines[index + 1:]))
            assert not report.ok and report.failure.line == index + 1, (what, report.failure)


def test_cli_steps_per_line(tmp_path):
    out = io.StringIO()
    assert main(["derive", "dedekind(1234567891, 9876543211)", "--steps-per-line", "3"], out=out) == 0
    text = out.getvalue()
    # 7 steps (9876543211 = 8 * 1234567891 + 3, ...): lines after 3, 6 and 7 of them
    assert text.count("by descent") == 2 and text.count("by reciprocity, reduce") == 1
    assert check_text(text).ok
    err = io.StringIO()
    assert main(["derive", "dedekind(5, 17)", "--steps-per-line", "0"], out=io.StringIO(), err=err) == 2
    assert "--steps-per-line wants a whole number >= 1" in err.getvalue()


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


# -- mutants of a derived 300-digit chain: one changed step, rejected at that step ----------------

def _chain_300():
    rng = random.Random(300)
    k = rng.randint(10 ** 299, 10 ** 300)
    h = rng.randint(1, k)
    text = derive_dedekind(h, k, per_line=1)
    lines = text.split("\n")
    return lines, [i for i, ln in enumerate(lines) if ln.startswith("  = ") and "dedekind(" in ln]


def _pair(line):
    m = re.search(r"dedekind\((\d+), (\d+)\)", line)
    return m.group(0), int(m.group(1)), int(m.group(2))


def _mutants(line, previous):
    """(what, mutated line, index offset of the step that must fail: 0 this one, 1 the next)."""
    call, a, b = _pair(line)
    _, _, b_prev = _pair(previous)          # the pair above is (a', b'), this one (b' mod a', a')
    flipped = line.replace(" - dedekind", " + dedekind") if " - dedekind" in line else \
        line.replace(" + dedekind", " - dedekind")
    head, _, number = line.partition(" = ")[2].partition(" ")[0].rpartition("/")
    out = [("sign", flipped, 0),
           ("rule: reciprocity only", line.replace("by reciprocity, reduce", "by reciprocity"), 0),
           ("rule: reduce only", line.replace("by reciprocity, reduce", "by reduce"), 0),
           ("rule: swapped order", line.replace("by reciprocity, reduce", "by reduce, reciprocity"), 0),
           ("rule: value", line.replace("by reciprocity, reduce", "by value"), 0),
           ("swapped pair", line.replace(call, f"dedekind({b}, {a})"), 0),
           ("numerator + 1", line.replace(f"{head}/", f"{int(head) + 1}/", 1), 0),
           ("denominator + 1", line.replace(f"/{number} ", f"/{int(number) + 1} ", 1), 0),
           ("a + 1", line.replace(call, f"dedekind({a + 1}, {b})"), 0),
           ("non-coprime pair (2a, 2b)", line.replace(call, f"dedekind({2 * a}, {2 * b})"), 0)]
    # an off-by-one quotient in the reduction, h' = b' - (q -+ 1) a' = a +- a': the line is true
    # and `reduce` allows any h' = h (mod k), so the next step, which no longer follows, must fail
    # (with q = 1, a + a' is b' itself: reciprocity alone gives it, so this step fails)
    out.append(("quotient - 1", line.replace(call, f"dedekind({a + b}, {b})"), 0 if a + b == b_prev else 1))
    out.append(("quotient + 1", line.replace(call, f"dedekind({a - b}, {b})"), 1))
    return out


def test_every_mutant_of_a_300_digit_chain_is_rejected_at_its_step():
    lines, steps = _chain_300()
    assert check_text("\n".join(lines)).ok and len(steps) > 500
    for index in (steps[1], steps[len(steps) // 2], steps[-3]):
        for what, mutated, offset in _mutants(lines[index], lines[index - 1]):
            assert mutated != lines[index], what
            bad = lines[:index] + [mutated] + lines[index + 1:]
            report = check_text("\n".join(bad))
            expected = index + 1 + offset                  # 1-based line of the step that must fail
            assert not report.ok, (what, index)
            failure = report.failure
            assert failure.line == expected, (what, index, failure.line, failure.message)
            # the column is that of the line's expression or of the call that does not follow
            call_column = bad[expected - 1].index("dedekind(") + 1
            assert failure.column in (5, call_column), (what, failure.column)
            assert f"step {steps.index(expected - 1) + 1} of the chain" in failure.message, what


def test_reciprocity_at_a_non_coprime_pair_is_refused_for_that_reason():
    # the constant of the law at (2a, 2b), written as if it held there; s(2a, 2b) = s(a, b)
    lines, steps = _chain_300()
    _, a, b = _pair(lines[steps[5]])
    h, k = 2 * a, 2 * b
    right = Fraction(h * h + k * k + 1 - 3 * h * k, 12 * h * k)
    text = (f"chain c: dedekind({h}, {k})\n"
            f"  = {right.numerator}/{right.denominator} - dedekind({k}, {h})    by reciprocity\n")
    report = check_text(text)
    assert not report.ok and (report.failure.line, report.failure.column) == (2, 5)
    assert "coprime" in " ".join(report.failure.details), report.failure.details


def test_the_pure_python_path_checks_and_rejects_alike(monkeypatch):
    # without gmpy2 the long terms stay Python ints: the same verdicts, the same failing step
    from checker.foundation import numbers
    monkeypatch.setattr(numbers, "_mpz", None)
    lines, steps = _chain_300()
    assert check_text("\n".join(lines)).ok
    index = steps[len(steps) // 2]
    for what, mutated, offset in _mutants(lines[index], lines[index - 1])[:8]:
        report = check_text("\n".join(lines[:index] + [mutated] + lines[index + 1:]))
        assert not report.ok and report.failure.line == index + 1 + offset, what


def _reader_mutants(line, call, a, b):
    """(what, replacement lines, accepted?): changes that a reader reading a step in one piece might
    read otherwise than the grammar does."""
    head = line[:line.index(" by ")]
    out = [("misspelt rule", [line.replace("reciprocity,", "reciprocty,")], False),
           ("rule: claim without a label", [line.replace(", reduce", ", claim")], False),
           ("rule: a keyword", [line.replace(", reduce", ", mod")], False),
           ("missing bracket", [line.replace(call, call[:-1])], False),
           ("doubled bracket", [line.replace(call, call + ")")], False),
           ("no 'by'", [line.replace(" by ", "  ")], False),
           ("'bye'", [line.replace(" by ", " bye ")], False),
           ("'by' glued to the rule", [line.replace(" by ", " byreciprocity")], False),
           ("'*' for '/'", [line.replace("/", "*", 1)], False),
           ("a divisor on the next line", [line, "  / 2"], False),
           ("a term on the next line", [line, "  + 1"], False),
           ("a third argument", [line.replace(call, f"dedekind({a}, {b}, 1)")], False),
           ("a negative argument", [line.replace(call, f"dedekind(-{a}, {b})")], False),
           ("a wrong rule on the next line", [line + ",", "  value"], False),
           ("'=' twice", [line.replace("  = ", "  == ", 1)], False),
           ("rules split over two lines", [line.replace(", reduce", ","), "    reduce"], True),
           ("the comma on the next line", [line.replace(", reduce", ""), "    , reduce"], True),
           ("a comment after the rules", [line + "  # a note"], True),
           ("unicode minus", [line.replace(" - dedekind", " \u2212 dedekind")], True),
           ("tabs and no blanks", [head.replace(" ", "\t").replace("\t=\t", " =") + "\tby reciprocity,reduce"], True),
           ("CR LF", [line + "\r"], True)]
    return out


def test_mutants_a_line_reader_could_misread_get_the_grammar_s_verdict(monkeypatch):
    """Each mutant of a step of the 300-digit chain: the same verdict (failing line, column and
    message) with and without the plain reader's one-line steps, and rejected where it must be."""
    from checker.language.plain_reader import PlainReader
    lines, steps = _chain_300()
    index = steps[len(steps) // 2]
    call, a, b = _pair(lines[index])
    assert " - dedekind" in lines[index] or " + dedekind" in lines[index]

    def verdict(text):
        report = check_text(text)
        f = report.failure
        return report.ok, None if f is None else (f.line, f.column, f.message)
    token_reader = {}
    for what, mutated, accepted in _reader_mutants(lines[index], call, a, b):
        token_reader[what] = mutated, accepted
    fast = {what: verdict("\n".join(lines[:index] + m + lines[index + 1:])) for what, (m, _) in token_reader.items()}
    monkeypatch.setattr(PlainReader, "_step_on_line", lambda self: None)
    for what, (mutated, accepted) in token_reader.items():
        slow = verdict("\n".join(lines[:index] + mutated + lines[index + 1:]))
        assert fast[what] == slow, what
        assert slow[0] is accepted, (what, slow)
        if not accepted:
            assert slow[1][0] in (index + 1, index + 2), (what, slow)


def test_derive_of_partitions_with_a_huge_part_is_refused_by_its_budget():
    # writing P_A lists each wave of period b: a 5,000-digit part ran on with no end in sight
    err = io.StringIO()
    assert main(["derive", f"partitions(n, [{'7' * 5000}, 2])"], out=io.StringIO(), err=err) == 2
    assert "limit: writing the quasi-polynomial of p_A for parts up to about 2^16609" in err.getvalue()
    err = io.StringIO()
    assert main(["derive", "partitions(n, [1000003, 2, 3])"], out=io.StringIO(), err=err) == 2
    assert "over the limit terms = 3000000 (raise it with --limit terms=N)" in err.getvalue()
    out = io.StringIO()
    assert main(["derive", "partitions(n, [4, 9, 11])", "--limit", "terms=10"], out=io.StringIO(), err=err) == 2
    assert main(["derive", "partitions(n, [4, 9, 11])", "--limit", "terms=100000"], out=out) == 0
    assert check_text(out.getvalue()).ok
