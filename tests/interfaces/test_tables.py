"""Tables of claims: another program's output, checked row by row, locally, in processes and on Dask."""
import io
import json
import subprocess
import sys
from pathlib import Path

from fractions import Fraction

import pytest

from checker.interfaces.cli import main
from checker.interfaces.tables import check_table

HERE = Path(__file__).parent.parent
sys.path.insert(0, str(HERE / "tools"))
from make_table import write  # noqa: E402


@pytest.fixture(scope="module")
def big_table(tmp_path_factory):
    # 100,000 rows of 20-digit Dedekind sums, every 997th value wrong (tests/tools/make_table.py)
    path = tmp_path_factory.mktemp("tables") / "values.csv"
    wrong = write(path, 100_000, digits=20, wrong_every=997)
    return path, wrong


def test_every_wrong_row_is_reported_and_no_correct_one(big_table):
    path, wrong = big_table
    report = check_table(path)
    assert [f.line for f in report.failures] == wrong
    assert report.checked == 100_000 - len(wrong)
    f = report.failures[0]
    row = path.read_text().splitlines()[wrong[0] - 1]
    name, h, k, value = row.split(",")
    assert f.row == row and f.column == len(f"{name},{h},{k},") + 1      # the character where the value starts
    assert f.end_column == len(row) + 1
    assert f.message == f"row at line {wrong[0]}: dedekind({h}, {k}) is not {value}"
    assert isinstance(f.claimed, Fraction) and f.claimed == Fraction(value)
    assert f.claimed - f.exact == Fraction(1, int(k))                  # tests/tools/make_table.py adds 1/k
    assert f.details[0] == f"the row claims: {value}"


def test_two_processes_give_the_same_report(big_table):
    path, wrong = big_table
    one, two = check_table(path), check_table(path, jobs=2)
    assert [(f.line, f.column, f.message, f.details) for f in two.failures] == \
        [(f.line, f.column, f.message, f.details) for f in one.failures]
    assert two.checked == one.checked


def test_the_dask_path_gives_the_same_report(big_table):
    distributed = pytest.importorskip("dask.distributed")
    from checker.interfaces.distributed import check_table_on
    path, wrong = big_table
    with distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=True,
                                  dashboard_address=None) as cluster, distributed.Client(cluster) as client:
        report = check_table_on(client, path, batch_rows=10_000)
    assert [f.line for f in report.failures] == wrong
    assert report.checked == 100_000 - len(wrong)


def test_jsonl_and_cli(tmp_path):
    path = tmp_path / "values.jsonl"
    wrong = write(path, 3000, digits=30, wrong_every=250, jsonl=True)
    out = io.StringIO()
    code = main(["check", "--format", "json", str(path)], out=out, err=io.StringIO())
    assert code == 1
    doc = json.loads(out.getvalue())
    assert [f["line"] for f in doc["certificates"][0]["failures"]] == wrong
    out2 = io.StringIO()
    assert main(["check", "--jobs", "2", "--format", "json", str(path)], out=out2, err=io.StringIO()) == 1
    assert out2.getvalue() == out.getvalue()


@pytest.mark.parametrize("text, message", [
    ("function,h,k,value\ndedekind,5,17,1/17\ndedekind,5,0,0\n",
     "row at line 3: dedekind(5, 0): the second argument of dedekind must be a positive integer, not 0"),
    ("function,h,k,value\ndedekind,5,17\n", "row at line 2: the row has 3 columns, the header 4"),
    ("function,h,k,value\ndedekin,5,17,0\n",
     "row at line 2: unknown function 'dedekin' (did you mean dedekind or fourier_dedekind?); `quasicert functions` lists them"),
    ("expression,value\ndedekind(5, 17) + 1,18/17\nfloor(7/2),4\n",
     "row at line 3: floor(7/2) is not 4"),
    ("h,k\n1,2\n", "the header must be 'expression,value' or 'function,<argument names>,value', not 'h,k'"),
])
def test_bad_rows(tmp_path, text, message):
    path = tmp_path / "t.csv"
    path.write_text(text)
    report = check_table(path)
    assert report.failures[-1].message == message


def test_a_comment_in_a_table_field_is_refused(tmp_path):
    # tests/unsound/csv-comment-inside-call.csv: `#` hides the rest of a field from the checker but
    # not from a reader of the table, so no field may hold one (expression rows, function
    # arguments and values alike); s(5, 17) = 1/17 (Rademacher & Grosswald's table, from memory)
    path = tmp_path / "t.csv"
    path.write_text('expression,value\n"dedekind(5 #(, 1), 17)",1/17\n"dedekind(5, 17) # s(5, 17)",1/17\n'
                    '"dedekind(5, 17)",1/17\n')
    report = check_table(path)
    assert [f.line for f in report.failures] == [2, 3]
    assert all("a '#' starts a comment" in f.message for f in report.failures)
    path = tmp_path / "f.csv"
    path.write_text("function,h,k,value\ndedekind,5 # 3,17,1/17\ndedekind,5,17,1/17 # 0\ndedekind,5,17,1/17\n")
    report = check_table(path)
    assert [f.line for f in report.failures] == [2, 3]
    assert all("a '#' starts a comment" in f.message for f in report.failures)


def test_generator_script_runs():
    out = subprocess.run([sys.executable, str(HERE / "tools" / "make_table.py"), "/dev/null", "30",
                          "--wrong-every", "10"], capture_output=True, text=True)
    assert out.returncode == 0 and out.stderr.split() == ["11", "21", "31"]
