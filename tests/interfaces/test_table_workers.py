"""A table checked by N worker processes on byte ranges gives the report of one process.

Each test checks one table with --jobs 1 and with several workers and compares everything a user
sees: lines, columns, messages, details, rows as written, counts; the fast path of plain rows is
compared with python-flint (test-only) row by row.
"""
from __future__ import annotations

import io
import os
import signal
import subprocess
import sys
import time
from fractions import Fraction
from importlib.metadata import entry_points
from pathlib import Path

import flint
import pytest
from hypothesis import given, settings, strategies as st

from checker.foundation.limits import DEFAULT_LIMITS
from checker.interfaces import tables
from checker.interfaces.cli import main
from checker.interfaces.tables import check_table, default_jobs

ROOT = Path(__file__).resolve().parents[2]
ENV = dict(os.environ, PYTHONPATH=str(ROOT))
sys.path.insert(0, str(ROOT / "tests" / "tools"))
from make_table import write  # noqa: E402

pytest_plugins = ["pytester"]

# a 20-digit row and its value, by python-flint (test-only)
H, K = 8158284048214965091, 17758176404715800194
S = Fraction(int(flint.fmpq.dedekind_sum(H, K).p), int(flint.fmpq.dedekind_sum(H, K).q))
ROW = f"dedekind,{H},{K},{S.numerator}/{S.denominator}\n"


def seen(report):
    """Everything of a report a user can see, except the time."""
    return report.checked, [(f.line, f.column, f.end_column, f.message, f.details, f.kind, f.row, f.exit_code,
                             f.claimed, f.exact) for f in report.failures]


def same_in_workers(path, limits=DEFAULT_LIMITS, jobs=(2, 3)):
    one = check_table(path, limits, jobs=1)
    for n in jobs:
        assert seen(check_table(path, limits, jobs=n)) == seen(one), n
    return one


def test_one_wrong_row_is_found_at_its_row_and_column_in_one_and_in_n_workers(tmp_path):
    path = tmp_path / "t.csv"
    wrong = write(path, 20_000, digits=20, wrong_every=0)
    lines = path.read_text().splitlines(keepends=True)
    line = 12_345
    name, h, k, value = lines[line - 1].rstrip("\n").split(",")
    bad = Fraction(value) + Fraction(1, 3)
    lines[line - 1] = f"{name},{h},{k},{bad.numerator}/{bad.denominator}\n"
    path.write_text("".join(lines))
    assert wrong == []
    for jobs in (1, 2, 3, None):
        report = check_table(path, jobs=jobs)
        assert report.checked == 19_999 and len(report.failures) == 1
        f = report.failures[0]
        assert (f.line, f.column) == (line, len(f"{name},{h},{k},") + 1)
        assert f.message == f"row at line {line}: dedekind({h}, {k}) is not {bad.numerator}/{bad.denominator}"
        assert f.claimed - f.exact == Fraction(1, 3)


def test_every_wrong_row_in_file_order_whatever_the_workers(tmp_path):
    path = tmp_path / "t.csv"
    wrong = write(path, 20_000, digits=20, wrong_every=97)
    one = same_in_workers(path, jobs=(2, 3, 7))
    assert [f.line for f in one.failures] == wrong


def test_the_default_uses_workers_for_large_tables_only(tmp_path, monkeypatch):
    cpus = 4
    monkeypatch.setattr(os, "sched_getaffinity", lambda pid: {0, 1, 2, 3}, raising=False)
    assert default_jobs(1000) == 1 and default_jobs(0) == 1
    assert default_jobs(10 ** 12) == cpus
    started = []
    real = tables._run_workers
    monkeypatch.setattr(tables, "_run_workers", lambda *a: started.append(len(a[4])) or real(*a))
    path = tmp_path / "t.csv"
    path.write_text("function,h,k,value\n" + ROW * 100)
    check_table(path)
    assert started == []                           # a small table: this process alone
    monkeypatch.setattr(tables, "BYTES_PER_WORKER", 1000)
    assert check_table(path).checked == 100 and started == [min(cpus, path.stat().st_size // 1000)]


@st.composite
def _rows(draw):
    """A row as another program may write it, and its true verdict by python-flint."""
    digits = draw(st.sampled_from([1, 2, 20, 60]))
    k = draw(st.integers(1, 10 ** digits))
    h = draw(st.integers(-(10 ** digits), 10 ** digits))
    if draw(st.booleans()):
        g = draw(st.integers(2, 1000))
        h, k = h * g, k * g
    true = Fraction(int(flint.fmpq.dedekind_sum(h % k, k).p), int(flint.fmpq.dedekind_sum(h % k, k).q))
    value = true + draw(st.sampled_from([0, 0, 0, Fraction(1, 12 * k), Fraction(-1, 2), 1]))
    m = draw(st.sampled_from([1, 1, 3, -1]))
    p, q = value.numerator * m, value.denominator * m
    form = draw(st.sampled_from(["p/q", "p/q", "spaces", "zeros", "negative q"]))
    if q == 1 and m == 1 and draw(st.booleans()):
        text = f"{p}"
    elif form == "spaces":
        text = f" {p} / {q} "
    elif form == "zeros" and q > 0:
        text = f"{p}/00{q}"
    elif form == "negative q" or q < 0:
        text = f"{-p}/{-q}" if q < 0 else f"{p}/{q}"
    else:
        text = f"{p}/{q}"
    return f"dedekind,{h},{k},{text}", Fraction(p, q) == true


@given(st.lists(_rows(), min_size=1, max_size=25))
@settings(max_examples=60, deadline=None)
def test_plain_rows_agree_with_flint_in_one_and_in_two_workers(tmp_path_factory, rows):
    path = tmp_path_factory.mktemp("t") / "t.csv"
    path.write_text("function,h,k,value\n" + "".join(r + "\n" for r, _ in rows))
    expected = [i + 2 for i, (_, right) in enumerate(rows) if not right]
    for jobs in (1, 2):
        report = check_table(path, jobs=jobs)
        assert [f.line for f in report.failures] == expected
        assert report.checked == len(rows) - len(expected)


def test_a_row_that_raises_and_bad_rows_in_workers(tmp_path):
    path = tmp_path / "t.csv"
    body = ROW * 3000 + "dedekind,5,0,0\n" + ROW * 10 + "dedekind,5,17\n" + "dedekin,5,17,0\n" + \
        "dedekind,5.0,17,1/17\n" + ROW * 3000 + "dedekind,5,17,1/16\n"
    path.write_text("function,h,k,value\n" + body)
    one = same_in_workers(path, jobs=(2, 4))
    assert [f.line for f in one.failures] == [3002, 3013, 3014, 3015, 6016]
    assert one.failures[0].message == ("row at line 3002: dedekind(5, 0): the second argument of dedekind must "
                                       "be a positive integer, not 0")


def test_json_lines_in_workers(tmp_path):
    path = tmp_path / "t.jsonl"
    wrong = write(path, 4000, digits=30, wrong_every=333, jsonl=True)
    with path.open("a") as fh:
        fh.write('{"function": "dedekind", "args": [5, 17], "value": 0.0588}\n')
    one = same_in_workers(path)
    assert [f.line for f in one.failures] == wrong + [4001]


def test_the_seconds_limit_stops_the_table_at_the_same_row(tmp_path):
    limits = DEFAULT_LIMITS.with_overrides({"seconds": 0})
    path = tmp_path / "t.csv"
    path.write_text("function,h,k,value\n" + ROW * 5000)
    one = same_in_workers(path, limits)
    assert one.checked == 0 and [(f.line, f.kind, f.exit_code) for f in one.failures] == [(2, "limit", 2)]
    assert "the limit seconds = 0" in one.failures[0].message


def test_a_slow_row_stops_the_table_in_one_and_in_two_workers(tmp_path):
    # the rows after the one that reached the limit are not checked, whichever process had them
    # the slow row would take some 20 s; the limit stops it after 1 s
    limits = DEFAULT_LIMITS.with_overrides({"seconds": 1, "terms": 10 ** 9})
    path = tmp_path / "t.csv"
    path.write_text("expression,value\n" + '"dedekind(5, 17)",1/16\n' + '"dedekind(1, 3)",1/18\n' * 200
                    + '"dedekind_rademacher(1, 50000000, 0, 0)",0\n' + '"dedekind(1, 3)",1/18\n' * 200
                    + '"dedekind(5, 17)",1/16\n')
    for jobs in (1, 2):
        report = check_table(path, limits, jobs=jobs)
        assert [(f.line, f.kind) for f in report.failures] == [(2, "failed"), (203, "limit")], (jobs, report.failures)
        assert report.checked == 200
        assert "the limit seconds = 1" in report.failures[1].message


def test_a_quoted_record_across_the_middle_and_other_line_ends(tmp_path):
    # a record whose quotes span many lines where the file would be cut: the one-process reading
    path = tmp_path / "t.csv"
    rows = '"dedekind(5, 17)",1/17\n' * 300
    path.write_text("expression,value\n" + rows + '"dedekind(1,' + "\n" * 400 + ' 3)",1/18\n' + rows
                    + '"dedekind(5, 17)",1/16\n')
    one = same_in_workers(path)
    assert [f.line for f in one.failures] == [302, 1003]
    for end in ("\r\n", "\r"):
        path.write_bytes(("expression,value\n" + rows + '"dedekind(5, 17)",1/16\n' + rows)
                         .replace("\n", end).encode())
        one = same_in_workers(path)
        assert [f.line for f in one.failures] == [302] and one.checked == 600


def test_a_byte_that_is_not_utf8_ends_the_table_at_its_line(tmp_path):
    path = tmp_path / "t.csv"
    head = ("function,h,k,value\n" + ROW * 2000 + "dedekind,5,17,1/16\n").encode()
    path.write_bytes(head + b"dedekind,5,17,1/17 \xe9\n" + ROW.encode() * 2000)
    one = same_in_workers(path)
    assert one.checked == 2000
    assert [f.line for f in one.failures] == [2002, 2003]
    assert one.failures[1].message.startswith(f"the file is not UTF-8 text: byte {len(head) + 19}")


def _big(tmp_path, groups=300):
    """999 right rows of 20 digits and a wrong one, `groups` times (300: 27 MB)."""
    path = tmp_path / "big.csv"
    path.write_text("function,h,k,value\n" + (ROW * 999 + "dedekind,5,17,1/16\n") * groups)
    return path


def _many_wrong(tmp_path):
    """30,000 rows (2.7 MB: two workers by default on an idle machine), 6,000 of them wrong."""
    path = tmp_path / "wrong.csv"
    path.write_text("function,h,k,value\n" + (ROW * 4 + "dedekind,5,17,1/16\n") * 6000)
    return path


def test_ctrl_c_stops_the_workers_and_says_so(tmp_path):
    path = _big(tmp_path)
    proc = subprocess.Popen([sys.executable, "-m", "checker", "check", "--jobs", "2", str(path)],
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, env=ENV, start_new_session=True)
    time.sleep(1.5)                              # started, workers busy
    os.killpg(proc.pid, signal.SIGINT)           # as a terminal does: the whole process group
    out, err = proc.communicate(timeout=60)
    assert proc.returncode == 130 and err.decode().strip().splitlines()[-1] == "quasicert: interrupted"
    assert b"Traceback" not in err
    with pytest.raises(ProcessLookupError):      # no worker is left behind
        os.killpg(proc.pid, 0)


def test_a_closed_pipe_ends_quietly_with_workers(tmp_path):
    path = _many_wrong(tmp_path)
    results = []
    for jobs in ("1", "2"):
        shell = f'"{sys.executable}" -m checker check --jobs {jobs} "{path}" | head -n 2; ' \
                'echo "status ${PIPESTATUS[0]}"'
        done = subprocess.run(["bash", "-c", shell], capture_output=True, text=True, env=ENV, timeout=300)
        results.append((done.stdout, done.stderr))
    assert results[0] == results[1]
    assert results[0][1] == "" and results[0][0].splitlines()[-1] == "status 141"


def test_the_command_on_a_large_table_by_default(tmp_path):
    path = _many_wrong(tmp_path)
    outs = []
    for extra in ([], ["--jobs", "1"], ["--jobs", "3"]):
        out = io.StringIO()
        assert main(["check", "--no-time", *extra, str(path)], out=out, err=io.StringIO()) == 1
        outs.append(out.getvalue())
    assert outs[0] == outs[1] == outs[2] and outs[0].count("is not 1/16") == 6000


def test_the_pytest_plugin_with_workers(pytester, monkeypatch):
    monkeypatch.setattr(tables, "BYTES_PER_WORKER", 1000)     # so that this small table is split
    monkeypatch.setattr(os, "sched_getaffinity", lambda pid: {0, 1}, raising=False)
    started = []
    real = tables._run_workers
    monkeypatch.setattr(tables, "_run_workers", lambda *a: started.append(1) or real(*a))
    pytester.path.joinpath("bad.csv").write_text("function,h,k,value\n" + ROW * 200 + "dedekind,5,17,1/16\n"
                                                 + ROW * 200 + "dedekind,1,3,5\n")
    names = {ep.name for ep in entry_points(group="pytest11")}
    plugin = [] if "quasicert" in names else ["-p", "checker.interfaces.pytest_plugin"]
    result = pytester.runpytest_inprocess(*plugin, "--qcert", "-p", "no:cacheprovider")
    result.assert_outcomes(failed=1)
    result.stdout.fnmatch_lines(["*bad.csv:202:*dedekind(5, 17) is not 1/16*",
                                 "*bad.csv:403:*dedekind(1, 3) is not 5*"])
    assert started


def test_workers_started_as_new_interpreters_where_fork_is_missing(tmp_path, monkeypatch):
    # Windows and macOS start workers with 'spawn': the worker function and its arguments travel by pickle
    import multiprocessing
    path = tmp_path / "t.csv"
    wrong = write(path, 3000, digits=20, wrong_every=700)
    monkeypatch.setattr(tables, "_fork_context", lambda: None)
    monkeypatch.setattr(tables, "_worker_context", lambda: multiprocessing.get_context("spawn"))
    assert default_jobs(20 << 20) == 1                         # a new interpreter costs more: 32 MiB a worker
    one = same_in_workers(path, jobs=(2,))
    assert [f.line for f in one.failures] == wrong


def test_workers_on_a_terminal(tmp_path):
    from test_ci import _on_terminal              # a pseudo-terminal: the progress bar is drawn
    path = _many_wrong(tmp_path)
    code, shown = _on_terminal(["check", "--jobs", "2", str(path)], tmp_path)
    assert code == 1 and "Traceback" not in shown and "internal error" not in shown
    assert f"{path}:6:15: failed: row at line 6: dedekind(5, 17) is not 1/16" in shown
    assert "1 table, 24000 rows verified, 6000 failures" in shown
