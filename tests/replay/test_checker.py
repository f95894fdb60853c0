"""The replaying checker: bundled certificates verify, broken ones fail at the right place."""
import io
import re
from fractions import Fraction
from pathlib import Path

import pytest

from checker import check_file, check_text, evaluate
from checker.interfaces.cli import bundled_certificates, main

BROKEN = sorted((Path(__file__).parent.parent / "broken").glob("*.qcert"))
EXIT_BY_KIND = {"failed": 1, "error": 1, "syntax error": 2, "limit": 2, "unreadable": 2}


def run(argv):
    out, err = io.StringIO(), io.StringIO()
    return main(argv, out=out, err=err), out.getvalue(), err.getvalue()


def expectation(path: Path):
    first = path.read_bytes().split(b"\n", 1)[0].decode()
    m = re.match(r"# expect: (\d+):(\d+) (.+)$", first)
    assert m, f"{path.name} lacks its '# expect: LINE:COL KIND' header"
    return int(m.group(1)), int(m.group(2)), m.group(3)


def test_bundled_certificates_verify():
    paths = bundled_certificates()
    assert len(paths) >= 8
    for path in paths:
        report = check_file(path)
        assert report.ok, (path, report.failures and report.failures[0].message)
        assert report.checked > 0


def test_cli_check_without_arguments_checks_the_bundled_ones():
    code, out, err = run(["check"])
    assert code == 0, out
    assert out.strip().splitlines()[-1].startswith("quasicert: all verified: ")


@pytest.mark.parametrize("path", BROKEN, ids=lambda p: p.name)
def test_broken_certificates_fail_at_the_right_place(path):
    line, column, kind = expectation(path)
    report = check_file(path)
    assert not report.ok
    f = report.failure
    assert (f.line, f.column, f.kind) == (line, column, kind)
    code, out, _ = run(["check", str(path)])
    assert code == EXIT_BY_KIND[kind]
    assert out.startswith(f"{path}:{line}:{column}: {kind}: ")
    assert "Traceback" not in out


# Values in these tests: Dedekind sums as computed by python-flint (fmpq.dedekind_sum) and checked
# against it in test_dedekind.py, e.g. s(5, 17) = 1/17, s(4, 7) = 1/14, s(3, 4) = -1/8.


def test_report_of_a_wrong_claim_gives_claimed_exact_and_difference():
    report = check_text("claim q: dedekind(5, 17) = 1/16\n", "draft.qcert")
    f = report.failure
    assert (f.line, f.column) == (1, 28)
    assert f.claimed == Fraction(1, 16) and f.exact == Fraction(1, 17)
    assert f.details == ["left side:  1/17", "right side: 1/16   (claimed)",
                         "difference (right - left): 1/272"]
    code, out, _ = run(["check", str(Path(__file__).parent.parent / "broken" / "wrong-claim-value.qcert")])
    lines = out.splitlines()
    assert lines[1].strip() == "claim quoted: dedekind(5, 17) = 1/16"
    assert lines[2].strip() == "^^^^"


def test_step_report_says_which_check_failed():
    text = ("chain dedekind(4, 7)\n"
            "  = dedekind(2, 7)    by reduce\n")
    f = check_text(text).failure
    assert f.message == "step 1 of the chain at line 1 does not follow by reduce"
    assert "value check: passed (both lines are 1/14)" in f.details
    text = ("chain dedekind(5, 17)\n"
            "  = 1/17 - dedekind(3, 4)    by reciprocity, reduce\n")
    f = check_text(text).failure
    assert "value check: failed too" in f.details
    assert "reciprocity, reduce gives: 1/17 - dedekind(2, 5)" in f.details
    assert (f.line, f.column) == (2, 12)          # the wrong call is marked


def test_refusal_names_the_side_condition():
    f = check_text("chain dedekind(6, 9)\n  = 1 - dedekind(9, 6)  by reciprocity\n").failure
    assert f.details[0] == ("reciprocity cannot be applied to dedekind(6, 9): reciprocity needs "
                            "coprime h and k, but gcd(6, 9) = 3")


def test_every_failure_mode_lists_all_failing_steps():
    text = ("claim dedekind(1, 3) = 1\n"
            "claim dedekind(1, 3) = 1/18\n"
            "chain dedekind(5, 17)\n"
            "  = 1/17 - dedekind(2, 5)   by reciprocity, reduce\n"
            "  = 1/17 + dedekind(2, 5)   by reciprocity, reduce\n"
            "  = 1/17 + dedekind(1, 2)   by reciprocity, reduce\n")
    first = check_text(text)
    assert len(first.failures) == 1
    every = check_text(text, keep_going=True)
    # line 6 is judged against line 5 as written, which it does not follow from either
    assert [f.line for f in every.failures] == [1, 5, 6]
    assert every.checked == 2


def test_labels_and_names_are_given_once():
    f = check_text("claim a: 1 = 1\nclaim a: 2 = 2\n").failure
    assert f.message == "the label 'a' is already used at line 1"
    f = check_text("let x = 1\nlet x = 2\n").failure
    assert f.message == "'x' already has a value; names are given once"
    f = check_text("let dedekind = 1\n").failure
    assert f.message == "'dedekind' is the name of a function and cannot be given a value"


def test_claims_can_be_used_only_after_they_are_verified():
    text = ("claim q: dedekind(5, 17) = 1/16\n"
            "chain dedekind(5, 17)\n  = 1/16  by claim q\n")
    report = check_text(text, keep_going=True)
    assert [f.line for f in report.failures] == [1, 3]
    assert report.failures[1].details[0] == "there is no verified equality labelled 'q' above this step"


def test_source_notes_are_repeated_in_reports():
    f = check_text('source "draft 3, (2.4)"\nclaim dedekind(5, 17) = 0\n').failure
    assert f.source_note == "draft 3, (2.4)"


def test_title_is_kept():
    assert check_text('title "Audit"\nclaim 1 = 1\n').title == "Audit"


def test_unreadable_paths_are_usage_errors():
    code, out, err = run(["check", "/no/such/file.qcert"])
    assert code == 2 and err.startswith("quasicert: no such file or folder")


def test_a_folder_is_searched_recursively(tmp_path):
    (tmp_path / "a").mkdir()
    (tmp_path / "a" / "one.qcert").write_text("claim 1 + 1 = 2\n")
    (tmp_path / "two.qcert").write_text("claim 2 * 2 = 4\n")
    (tmp_path / "ignored.txt").write_text("claim 1 = 2\n")
    code, out, _ = run(["check", str(tmp_path)])
    assert code == 0
    assert "2 certificates, 2 claims and steps verified" in out


def test_a_wrong_euclid_pass_is_a_checker_bug(monkeypatch):
    # the integer pass along Euclid's chain checks its own divisions; a planted failure
    # must be reported as a bug of quasicert (exit 3), never as a crash or a verdict
    import checker.kernel.evaluation as evaluation
    from checker.interfaces.derive import derive_dedekind

    def broken(h, k):
        raise ArithmeticError("12 k s(h, k) is not an integer at (1, 2)")
    text = derive_dedekind(3**200 + 1, 10**100 + 7)
    monkeypatch.setattr(evaluation, "dedekind_along_euclid", broken)
    report = check_text(text)
    assert not report.ok and report.failure.kind == "checker bug" and report.exit_code == 3


def test_no_euclid_pass_for_numbers_past_its_size(monkeypatch):
    # the pass keeps every pair of Euclid's walk: about 0.6 b^2 bits for b-bit numbers (2 GB at
    # 50,000 digits, 30 GB at the 200,000 a literal may have); past 2^15 bits the chain's few
    # lines take the kernel's own algorithm, with the same values
    import checker.kernel.evaluation as evaluation
    from checker.interfaces.derive import derive_dedekind
    from checker.mathematics.dedekind import dedekind
    from checker.foundation.numbers import int_text
    passes = []
    real = evaluation.dedekind_along_euclid
    monkeypatch.setattr(evaluation, "dedekind_along_euclid", lambda h, k: passes.append(k) or real(h, k))
    h, k = 3 ** 21000 + 1, 2 ** 33000 + 1                # 33,001 bits
    s = dedekind(h, k)
    text = (f"chain dedekind({int_text(h)}, {int_text(k)})\n"
            f"  = {int_text(s.numerator)}/{int_text(s.denominator)}    by value\n")
    assert check_text(text).ok and not passes
    assert check_text(derive_dedekind(3 ** 600 + 1, 2 ** 1500 + 1)).ok and passes   # within it: one pass


def test_one_long_value_and_a_chain_agree_with_python_flint():
    # python-flint's fmpq.dedekind_sum: one value by the kernel, and every value of a derived chain
    import flint
    from checker.interfaces.derive import derive_dedekind
    h, k = 7**150 + 2, 10**120 + 9
    s = flint.fmpq.dedekind_sum(h, k)
    assert evaluate(f"dedekind({h}, {k})") == Fraction(int(s.p), int(s.q))
    assert check_text(derive_dedekind(h, k)).ok
