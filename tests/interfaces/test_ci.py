"""quasicert in a CI job: terminals, pipes, empty inputs, tables everywhere, reports one can act on.

Subprocess tests set PYTHONPATH to this checkout so that its package is the one tested.
"""
from __future__ import annotations

import io
import json
import os
import subprocess
import sys
from fractions import Fraction
from importlib.metadata import entry_points
from pathlib import Path

import pytest

from checker import Certificate, check_file, check_text
from checker.interfaces.cli import main
from checker.interfaces.tables import check_table

ROOT = Path(__file__).resolve().parents[2]
UNSOUND = ROOT / "tests" / "unsound"
ENV = dict(os.environ, PYTHONPATH=str(ROOT))

pytest_plugins = ["pytester"]

# s(5, 17) = 1/17 and s(1, 3) = 1/18: s(1, k) = (k - 1)(k - 2)/(12k), Rademacher & Grosswald (1972)
GOOD_ROWS = "function,h,k,value\ndedekind,5,17,1/17\ndedekind,1,3,1/18\n"


def run(argv, stdin=None):
    out, err = io.StringIO(), io.StringIO()
    code = main(argv, out=out, err=err)
    return code, out.getvalue(), err.getvalue()


def cli(*args, input=None, cwd=None):
    return subprocess.run([sys.executable, "-m", "checker", *args], capture_output=True, text=True,
                          env=ENV, input=input, cwd=cwd or ROOT, timeout=300)


# -- a real terminal -----------------------------------------------------------

def _on_terminal(args, cwd):
    """Run quasicert with stdout and stderr on a pseudo-terminal; (exit code, everything shown)."""
    import pty
    import select
    leader, follower = pty.openpty()
    proc = subprocess.Popen([sys.executable, "-m", "checker", *args], stdout=follower, stderr=follower,
                            stdin=subprocess.DEVNULL, env=ENV, cwd=cwd)
    os.close(follower)
    shown = b""
    while True:
        ready, _, _ = select.select([leader], [], [], 120)
        if not ready:
            proc.kill()
            break
        try:
            chunk = os.read(leader, 4096)
        except OSError:          # the terminal closed with the process
            break
        if not chunk:
            break
        shown += chunk
    os.close(leader)
    return proc.wait(timeout=60), shown.decode("utf-8", "replace")


@pytest.mark.parametrize("name, text", [
    ("t.csv", GOOD_ROWS * 1 + "".join(f"dedekind,{h},101,{Fraction(0)}\n" for h in [0])),
    ("t.jsonl", '{"function": "dedekind", "args": [5, 17], "value": "1/17"}\n'),
])
def test_a_table_on_a_terminal(tmp_path, name, text):
    (tmp_path / name).write_text(text)
    code, shown = _on_terminal(["check", name], tmp_path)
    assert "internal error" not in shown and "Traceback" not in shown
    assert code == 0 and "all verified" in shown


def test_a_long_table_with_a_wrong_row_on_a_terminal(tmp_path):
    rows = "".join(f"dedekind,1,{k},{Fraction((k - 1) * (k - 2), 12 * k)}\n" for k in range(1, 5000))
    (tmp_path / "t.csv").write_text("function,h,k,value\n" + rows + "dedekind,5,17,1/16\n")
    code, shown = _on_terminal(["check", "t.csv"], tmp_path)
    assert "internal error" not in shown and code == 1
    assert "t.csv:5001:15: failed: row at line 5001: dedekind(5, 17) is not 1/16" in shown


def test_folders_on_a_terminal(tmp_path):
    (tmp_path / "a.qcert").write_text("claim dedekind(5, 17) = 1/17\n")
    (tmp_path / "b.csv").write_text(GOOD_ROWS)
    code, shown = _on_terminal(["check", "."], tmp_path)
    assert code == 0 and "internal error" not in shown


# -- never green on nothing --------------------------------------------------

@pytest.mark.parametrize("name, text", [
    ("empty.qcert", ""), ("comments.qcert", "# nothing here\n\n# nor here\n"),
    ("only-let.qcert", "title \"t\"\nlet A = [1, 2]\n"),
    ("header.csv", "function,h,k,value\n"), ("zero.csv", ""), ("blank.jsonl", "\n\n"), ("zero.jsonl", ""),
])
def test_checking_nothing_fails_with_its_own_exit_code(tmp_path, name, text):
    path = tmp_path / name
    path.write_text(text)
    code, out, _ = run(["check", str(path)])
    assert code == 4 and "nothing was checked" in out
    assert run(["check", "--allow-empty", str(path)])[0] == 0
    report = check_file(path)
    assert not report.ok and report.exit_code == 4
    assert check_file(path, allow_empty=True).ok


def test_an_empty_folder_fails(tmp_path):
    code, _, err = run(["check", str(tmp_path)])
    assert code == 4 and "nothing to check" in err
    assert run(["check", "--allow-empty", str(tmp_path)])[0] == 0


def test_empty_text_in_python_and_in_the_builder():
    assert check_text("# nothing\n").exit_code == 4
    assert check_text("", allow_empty=True).ok
    assert Certificate("no statements").check().exit_code == 4


def test_a_folder_checks_its_tables(tmp_path):
    (tmp_path / "a.qcert").write_text("claim dedekind(5, 17) = 1/17\n")
    (tmp_path / "sub").mkdir()
    (tmp_path / "sub" / "b.csv").write_text("function,h,k,value\ndedekind,5,17,1/16\n")
    (tmp_path / "sub" / "c.jsonl").write_text('{"expression": "dedekind(1, 3)", "value": "1/18"}\n')
    code, out, _ = run(["check", "--no-time", str(tmp_path)])
    assert code == 1
    assert "b.csv:2:15: failed: row at line 2: dedekind(5, 17) is not 1/16" in out
    assert out.splitlines()[-1] == ("quasicert: 1 of 3 not verified: 1 certificate and 2 tables, "
                                    "2 claims, steps and rows verified, 1 failure")


def test_check_file_reads_tables(tmp_path):
    path = tmp_path / "t.csv"
    path.write_text(GOOD_ROWS + "dedekind,2,5,1\n")      # s(2, 5) = 0: Rademacher & Grosswald, s(h, k) = 0 for h^2 = -1 mod k
    report = check_file(path)
    assert report.checked == 2 and [f.line for f in report.failures] == [4]
    assert report.failure.exact == 0 and report.failure.claimed == 1


# -- a failing row, as reported ----------------------------------------------------

def test_a_failing_csv_row_is_reported_where_the_wrong_value_starts(tmp_path):
    path = tmp_path / "t.csv"
    path.write_text('function,h,k,value\ndedekind, 5, 17,"2/32"\n')
    code, out, _ = run(["check", "--no-time", str(path)])
    assert code == 1
    assert out.splitlines()[:7] == [
        f"{path}:2:18: failed: row at line 2: dedekind(5, 17) is not 2/32",
        '    dedekind, 5, 17,"2/32"',
        "                     ^^^^",
        "  the row claims: 2/32",
        "  which is:       1/16",
        "  exact value:    1/17",
        "  difference (claimed - exact): 1/272",
    ]


def test_every_failing_row_is_listed_in_json_and_sarif(tmp_path):
    path = tmp_path / "t.jsonl"
    path.write_text('{"function": "dedekind", "args": [5, 17], "value": "1/16"}\n'
                    '{"function": "dedekind", "args": [1, 3], "value": "1/18"}\n'
                    '{"expression": "dedekind(1, 3)",  "value": 0}\n')
    code, out, _ = run(["check", "--format", "json", str(path)])
    failures = json.loads(out)["certificates"][0]["failures"]
    assert code == 1 and [(f["line"], f["column"]) for f in failures] == [(1, 53), (3, 44)]
    assert failures[0]["claimed"] == "1/16" and failures[0]["exact"] == "1/17"
    assert failures[1]["row"] == '{"expression": "dedekind(1, 3)",  "value": 0}'
    code, out, _ = run(["check", "--format", "sarif", str(path)])
    results = json.loads(out)["runs"][0]["results"]
    regions = [r["locations"][0]["physicalLocation"]["region"] for r in results]
    assert regions == [{"startLine": 1, "startColumn": 53, "endColumn": 57},
                       {"startLine": 3, "startColumn": 44, "endColumn": 45}]
    assert results[0]["properties"]["exact"] == "1/17"


def test_sarif_columns_count_characters_not_fields(tmp_path):
    path = tmp_path / "t.csv"
    path.write_text("function,h,k,value\ndedekind,5,17,1/17\n\"dedekind\",\"5\",\"٥\",1\n")
    code, out, _ = run(["check", "--format", "sarif", str(path)])
    region = json.loads(out)["runs"][0]["results"][0]["locations"][0]["physicalLocation"]["region"]
    assert region["startLine"] == 3 and region["startColumn"] == len('"dedekind","5","') + 1


def test_every_failure_of_a_certificate_in_json_by_default():
    broken = ROOT / "tests" / "broken" / "lemma-false-closed-form.qcert"
    everything = check_file(broken, keep_going=True).failures
    code, out, _ = run(["check", "--format", "json", str(broken)])
    assert len(json.loads(out)["certificates"][0]["failures"]) == len(everything)


@pytest.mark.parametrize("name, text, message", [
    ("t.csv", "function,h,k,value\ndedekind,5,17,0.0588\n",
     "row at line 2: '0.0588' is a decimal number; quasicert reads exact values only: write an integer or a "
     "fraction p/q (0.0588 is exactly 147/2500)"),
    ("t.csv", "expression,value\n\"dedekind(5, 17)\",1e-3\n",
     "row at line 2: '1e-3' is a decimal number; quasicert reads exact values only: write an integer or a "
     "fraction p/q (1e-3 is exactly 1/1000)"),
    ("t.csv", "function,h,k,value\ndedekind,5.0,17,1/17\n",
     "row at line 2: '5.0' is a decimal number; quasicert reads exact values only: write an integer or a "
     "fraction p/q (5.0 is exactly 5)"),
    ("t.jsonl", '{"function": "dedekind", "args": [5, 17], "value": 0.0588}\n',
     'row at line 1: the value is the JSON float 0.0588; floats are not exact values: write an integer or a '
     'string like "3/17"'),
    ("t.jsonl", '{"function": "dedekind", "args": [5, 17], "value": "0.0588"}\n',
     "row at line 1: '0.0588' is a decimal number; quasicert reads exact values only: write an integer or a "
     "fraction p/q (0.0588 is exactly 147/2500)"),
    ("t.csv", "function,h,k,value\ndedekind,5,17,NaN\n",
     "row at line 2: 'NaN' is not a number; write an integer or a fraction p/q"),
])
def test_decimals_are_refused_clearly(tmp_path, name, text, message):
    path = tmp_path / name
    path.write_text(text)
    report = check_table(path)
    assert [f.message for f in report.failures] == [message]


@pytest.mark.parametrize("name, text", [
    ("t.csv", "\ufefffunction,h,k,value\ndedekind,5,17,1/17\n"),
    ("t.jsonl", '\ufeff{"function": "dedekind", "args": [5, 17], "value": "1/17"}\n'),
    ("t.qcert", "\ufeffclaim dedekind(5, 17) = 1/17\n"),
])
def test_a_byte_order_mark_is_accepted(tmp_path, name, text):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    code, out, _ = run(["check", str(path)])
    assert code == 0, out


def test_a_bom_does_not_shift_columns(tmp_path):
    path = tmp_path / "t.qcert"
    path.write_text("\ufeffclaim dedekind(5, 17) = 1/16\n", encoding="utf-8")
    assert (check_file(path).failure.line, check_file(path).failure.column) == (1, 25)


# -- tables that mean two things (issue 11, family 9) --------------------------------

UNSOUND_TABLES = sorted(p for p in UNSOUND.glob("*") if p.suffix in (".csv", ".jsonl"))


def test_every_unsound_table_is_listed_in_the_readme():
    readme = (UNSOUND / "README.md").read_text()
    assert UNSOUND_TABLES and all(f"| `{p.name}` |" in readme for p in UNSOUND_TABLES)


@pytest.mark.parametrize("path", UNSOUND_TABLES, ids=lambda p: p.name)
def test_unsound_tables_fail(path):
    report = check_file(path)
    assert not report.ok and report.checked == 0
    assert all(f.kind in ("error", "failed") and f.line for f in report.failures)


@pytest.mark.parametrize("name, words", [
    ("csv-header-names-ignored.csv", "its parameters are (h, k)"),
    ("csv-bengali-digits.csv", "U+09EB BENGALI DIGIT FIVE) is not an ASCII digit"),
    ("csv-fullwidth-digits.csv", "FULLWIDTH DIGIT FIVE) is not an ASCII digit"),
    ("csv-bengali-digits-in-call.csv", "is not an ASCII digit"),
    ("jsonl-expression-and-function.jsonl", "both \"expression\" and \"function\""),
    ("jsonl-duplicate-value-key.jsonl", "the key \"value\" is given 2 times"),
    ("jsonl-duplicate-args-key.jsonl", "the key \"args\" is given 2 times"),
    ("jsonl-unknown-key.jsonl", "unknown key \"arguments\""),
])
def test_unsound_tables_say_why(name, words):
    assert words in check_file(UNSOUND / name).failure.message


@pytest.mark.parametrize("header, ok", [
    ("function,h,k,value", True), ("function,H,K,value", True), ("function,arg1,arg2,value", True),
    ("function,k,h,value", False), ("function,a,b,value", False), ("function,arg1,value", False),
])
def test_header_names_are_checked_against_the_parameters(tmp_path, header, ok):
    path = tmp_path / "t.csv"
    width = header.count(",") - 1
    path.write_text(header + "\n" + ("dedekind,5,17,1/17\n" if width == 2 else "dedekind,5,1/17\n"))
    assert check_table(path).ok == ok


def test_header_names_of_list_parameters_and_mixed_tables(tmp_path):
    # p_{1,2,3}(10) = 14 (OEIS A001399), g(6, 9, 20) = 43 (OEIS A065003)
    path = tmp_path / "t.csv"
    path.write_text('function,n,A,value\npartitions,10,"[1, 2, 3]",14\n')
    assert check_table(path).ok
    path.write_text('function,arg1,value\nfrobenius,"[6, 9, 20]",43\nnonrepresentable,"[3, 5]",4\n')
    assert check_table(path).ok
    path.write_text('function,h,k,value\npartitions,10,"[1, 2, 3]",14\n')
    assert "its parameters are (n, a)" in check_table(path).failure.message


# -- the pytest plugin (issue 11, family 8) ------------------------------------------

def _plugin_args():
    names = {ep.name for ep in entry_points(group="pytest11")}
    return [] if "quasicert" in names else ["-p", "checker.interfaces.pytest_plugin"]


@pytest.mark.parametrize("name", ["pytest-not-utf8.qcert", "pytest-lone-cr-shift.qcert",
                                  "pytest-let-failure.qcert"])
def test_plugin_fails_a_file_whose_failure_lies_outside_its_items(pytester, name):
    pytester.path.joinpath(name).write_bytes((UNSOUND / name).read_bytes())
    result = pytester.runpytest(*_plugin_args(), "--qcert", "-p", "no:cacheprovider")
    outcomes = result.parseoutcomes()
    assert outcomes.get("failed", 0) >= 1 and outcomes.get("passed", 0) == 0


def test_plugin_fails_every_item_when_a_limit_stops_the_check(pytester):
    # 2^10000000 has more bits than the limit integer-bits (1,000,000): no verdict for that file
    pytester.makefile(".qcert", limited="claim dedekind(5, 17) = 1/17\nclaim 2^10000000 > 0\nclaim 1 = 1\n")
    result = pytester.runpytest(*_plugin_args(), "--qcert", "-p", "no:cacheprovider")
    result.assert_outcomes(failed=3)
    result.stdout.fnmatch_lines(["*the check of this file failed outside this statement*"])


def test_plugin_fails_an_empty_certificate(pytester):
    pytester.makefile(".qcert", empty="# nothing\n")
    result = pytester.runpytest(*_plugin_args(), "--qcert", "-p", "no:cacheprovider")
    result.assert_outcomes(failed=1)
    result.stdout.fnmatch_lines(["*nothing was checked*"])


def test_plugin_collects_tables(pytester):
    pytester.path.joinpath("good.csv").write_text(GOOD_ROWS)
    pytester.path.joinpath("bad.jsonl").write_text('{"function": "dedekind", "args": [5, 17], "value": "1/16"}\n'
                                                   '{"function": "dedekind", "args": [1, 3], "value": 5}\n')
    result = pytester.runpytest(*_plugin_args(), "--qcert", "-p", "no:cacheprovider", "-v")
    result.assert_outcomes(passed=1, failed=1)
    result.stdout.fnmatch_lines(["*bad.jsonl:1:*dedekind(5, 17) is not 1/16*",
                                 "*bad.jsonl:2:*dedekind(1, 3) is not 5*"])
    result = pytester.runpytest(*_plugin_args(), "--qcert", "-p", "no:cacheprovider", "-o", "qcert_tables=false")
    assert result.ret == pytest.ExitCode.NO_TESTS_COLLECTED


# -- command-line conventions ------------------------------------------------------

def test_version():
    from checker import __version__
    code, out, _ = run(["--version"])
    assert code == 0 and out == f"quasicert {__version__}\n"
    assert cli("--version").stdout == f"quasicert {__version__}\n"


def test_standard_input():
    done = cli("check", "-", input="claim dedekind(5, 17) = 1/16\n")
    assert done.returncode == 1 and done.stdout.startswith("<stdin>:1:25: failed:")
    done = cli("check", "--as", "csv", "-", input=GOOD_ROWS)
    assert done.returncode == 0, done.stdout + done.stderr
    done = cli("check", "--as", "jsonl", "-", input="")
    assert done.returncode == 4
    done = cli("latex", "-", input="claim dedekind(5, 17) = 1/17\n")
    assert done.returncode == 0 and r"s(5, 17) = \frac{1}{17}" in done.stdout


def test_a_closed_pipe_is_quiet():
    # `quasicert rules | head -1`: the reader goes away after one line
    done = subprocess.run(f"{sys.executable} -m checker functions | head -1; "
                          f"{sys.executable} -m checker check --list-each certificates | head -1",
                          shell=True, capture_output=True, text=True, env=ENV, cwd=ROOT, timeout=300)
    assert done.stderr == "" and len(done.stdout.splitlines()) == 2


@pytest.mark.parametrize("command", [["derive", "dedekind(5, 17)"], ["latex", "certificates/postage-audit.qcert"]])
def test_no_silent_overwrite(tmp_path, command):
    target = tmp_path / "out.txt"
    target.write_text("precious\n")
    code, _, err = run([*command[:1], str(ROOT / command[1]) if command[0] == "latex" else command[1],
                        "-o", str(target)])
    assert code == 2 and target.read_text() == "precious\n" and "--force" in err
    code, _, _ = run([*command[:1], str(ROOT / command[1]) if command[0] == "latex" else command[1],
                      "-o", str(target), "--force"])
    assert code == 0 and target.read_text() != "precious\n"


def test_latex_never_overwrites_its_input(tmp_path):
    cert = tmp_path / "c.qcert"
    cert.write_text("claim dedekind(5, 17) = 1/17\n")
    code, _, err = run(["latex", str(cert), "-o", str(cert), "--force"])
    assert code == 2 and cert.read_text() == "claim dedekind(5, 17) = 1/17\n" and "the input itself" in err


def test_rules_name_prints_one_rule():
    code, out, _ = run(["rules", "reciprocity"])
    assert code == 0 and out.splitlines()[0] == "reciprocity"
    assert "needs: h >= 1, k >= 1, gcd(h, k) = 1" in out and "source: Dedekind" in out
    assert "reduce" not in out.splitlines()[0] and "three_term" not in out
    code, out, err = run(["rules", "reciprocation"])
    assert code == 2 and "there is no rule called 'reciprocation'" in err


# -- the builder and the Report ---------------------------------------------------

def test_builder_takes_exact_numbers_of_other_libraries():
    flint = pytest.importorskip("flint")
    gmpy2 = pytest.importorskip("gmpy2")
    cert = Certificate("values from several libraries")
    cert.value("dedekind", flint.fmpz(5), gmpy2.mpz(17), result=flint.fmpq(1, 17))
    cert.value("dedekind", 1, 3, result=gmpy2.mpq(1, 18))
    cert.value("dedekind", 1, 7, result="5/14")              # s(1, 7) = 30/84, Rademacher & Grosswald
    cert.claim("partitions(10, [1, 2, 3])", flint.fmpz(14))  # OEIS A001399
    assert cert.check().ok and cert.check().checked == 4
    assert "claim dedekind(5, 17) = 1/17" in cert.text()
    for bad in (0.5, "0.5", "1/0", "৫", True, object()):
        with pytest.raises((TypeError, ValueError)):
            Certificate().claim("dedekind(1, 3)", bad)


def test_builder_writes_chains_and_witnesses():
    # g(4, 9, 11) = 14 (brute force in tests/mathematics/test_frobenius.py)
    cert = Certificate().chain("dedekind(7, 17)", [("dedekind(5, 17)", "inverse"), (Fraction(1, 17), "value")],
                               label="s7")
    cert.witness([4, 9, 11], 14, {15: "4 + 11", 16: "4*4", 17: "2*4 + 9", 18: "2*9"})
    report = cert.check()
    assert report.ok and report.checked >= 3
    bad = Certificate().chain("dedekind(7, 17)", [("1/16", "value")]).check()
    assert not bad.ok and bad.failure.exact == Fraction(1, 17)


def test_a_report_prints_as_its_text():
    report = check_text("claim dedekind(5, 17) = 1/16\n", "c.qcert")
    assert str(report).splitlines()[0] == "c.qcert:1:25: failed: the claim is false: the two sides differ"
    assert str(check_text("claim 1 = 1\n", "ok.qcert")) == "ok.qcert: verified, 1 claim and steps checked"


def test_check_text_and_the_builder_agree_on_stopping():
    text = "claim one: dedekind(1, 3) = 1\nclaim two: dedekind(5, 17) = 2\n"
    cert = Certificate().claim("dedekind(1, 3)", 1, label="one").claim("dedekind(5, 17)", 2, label="two")
    assert cert.text() == text
    assert len(check_text(text).failures) == len(cert.check().failures) == 1
    assert len(check_text(text, keep_going=True).failures) == len(cert.check(keep_going=True).failures) == 2


def test_a_long_single_check_shows_a_progress_line_on_a_terminal():
    import time
    from checker.interfaces.cli import _Ticker

    class Terminal(io.StringIO):
        def isatty(self):
            return True
    shown = Terminal()
    with _Ticker(shown, "slow.qcert", after=0.05):
        time.sleep(1.3)
    assert "quasicert: checking slow.qcert, 0 s" in shown.getvalue() or \
        "quasicert: checking slow.qcert, 1 s" in shown.getvalue()
    assert shown.getvalue().endswith("\r\033[K")                       # the line is cleared afterwards
    piped = io.StringIO()
    with _Ticker(piped, "slow.qcert", after=0.05):
        time.sleep(0.2)
    assert piped.getvalue() == ""                                      # nothing when piped


def test_the_readme_shows_a_real_failing_row_report(tmp_path):
    # s(3, 17) = 5/17 and s(8, 17) = -8/17, also by python-flint's fmpq.dedekind_sum
    readme = (ROOT / "README.md").read_text()
    block = readme.split("```\nsums.csv:4:15", 1)[1].split("```", 1)[0]
    shown = "sums.csv:4:15" + block
    (tmp_path / "sums.csv").write_text("function,h,k,value\ndedekind,5,17,1/17\ndedekind,7,17,1/17\n"
                                       "dedekind,3,17,-1/17\ndedekind,8,17,2/34\ndedekind,4,17,0.0588\n")
    done = cli("check", "--no-time", "sums.csv", cwd=tmp_path)
    assert done.returncode == 1 and done.stdout == shown
    flint = pytest.importorskip("flint")
    assert flint.fmpq.dedekind_sum(3, 17) == flint.fmpq(5, 17) and flint.fmpq.dedekind_sum(8, 17) == flint.fmpq(-8, 17)


@pytest.mark.parametrize("expression, value, ok", [
    ("dedekind(5, 17) + dedekind(1, 3)", "1/17 + 1/18", True),     # two calls, not one call of "5, 17) + ..."
    ("dedekind(5, 17) + dedekind(1, 3)", "1/17", False),
    ("dedekind(5, 17)*0 + dedekind(1, 3)", "1/18", True),
    ("dedekind((5), 17)", "1/17", True),
])
def test_expression_rows_are_read_as_the_language_reads_them(tmp_path, expression, value, ok):
    path = tmp_path / "t.jsonl"
    path.write_text(json.dumps({"expression": expression, "value": value}) + "\n")
    assert check_table(path).ok == ok


def test_a_folder_leaves_hidden_folders_alone(tmp_path):
    (tmp_path / "a.qcert").write_text("claim dedekind(5, 17) = 1/17\n")
    (tmp_path / ".venv").mkdir()
    (tmp_path / ".venv" / "data.csv").write_text("x,y\n1,2\n")
    assert run(["check", str(tmp_path)])[0] == 0


def test_plugin_fails_a_certificate_with_a_syntax_error(pytester):
    pytester.makefile(".qcert", broken="claim dedekind(5, 17) = 1/17\nclaim dedekind(1, 3) = = 5\n")
    result = pytester.runpytest(*_plugin_args(), "--qcert", "-p", "no:cacheprovider")
    outcomes = result.parseoutcomes()
    assert outcomes.get("failed", 0) >= 1 and outcomes.get("passed", 0) == 0


def test_jobs_give_the_same_report_for_a_folder_with_tables(tmp_path):
    for i in range(3):
        (tmp_path / f"c{i}.qcert").write_text(f"claim dedekind({i + 1}, 17) = 1/17\n")
        (tmp_path / f"t{i}.csv").write_text(f"function,h,k,value\ndedekind,{i + 1},17,1/17\n")
    one = run(["check", "--format", "json", str(tmp_path)])
    two = run(["check", "--format", "json", "--jobs", "2", str(tmp_path)])
    assert one[0] == two[0] == 1 and one[1] == two[1]


def test_sarif_of_a_table_validates(tmp_path):
    # the SARIF 2.1.0 schema (rtm.5), see tests/data/README.md
    import jsonschema
    path = tmp_path / "t.csv"
    path.write_text("function,h,k,value\ndedekind,5,17,1/16\ndedekind,5,17,0.5\n")
    log = json.loads(run(["check", "--format", "sarif", str(path)])[1])
    official = json.loads((ROOT / "tests" / "data" / "sarif-2.1.0-rtm.5.json").read_text())
    jsonschema.Draft4Validator(official).validate(log)
    assert [r["ruleId"] for r in log["runs"][0]["results"]] == ["qc-failed", "qc-error"]
