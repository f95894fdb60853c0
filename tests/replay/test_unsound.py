"""Every false statement that quasicert once verified, or that a reviewer built to slip through,
kept as a file in tests/unsound/: each must fail.

- `*.qcert` files start with the line `# must fail: REASON` and are checked with `check_file`;
  an optional second line `# limits: NAME=N, ...` lowers budgets (hangs are kept with `seconds=3`);
- tables (`*.csv`, `*.jsonl`) are checked with `check_table` and listed with their reason in
  tests/unsound/README.md (a table has no comment line of its own);
- every other file (README.md aside) is a mistake: the test says which checker it lacks.

Each file must fail by the mechanism that closes its hole: a failure of kind "checker bug"
(the numeric second opinion caught what the symbolic check accepted) means the hole is still open.
The command must fail too (nonzero exit status, no traceback).
"""
import io
import re
from pathlib import Path

import pytest

from checker import check_file
from checker.foundation.limits import DEFAULT_LIMITS
from checker.interfaces.cli import main

FOLDER = Path(__file__).parent.parent / "unsound"
TABLES = (".csv", ".jsonl")
# families about how text is read: their refusal is a syntax error, or unreadable text, by design
_READ_AS_TEXT = ("line-end", "bidi", "pytest-", "csv-", "jsonl-", "identity-duplicate")
FILES = sorted(p for p in FOLDER.iterdir() if p.is_file() and p.name not in ("README.md",)) \
    if FOLDER.is_dir() else []


def _readme_entries() -> str:
    readme = FOLDER / "README.md"
    return readme.read_text(encoding="utf-8") if readme.exists() else ""


def _limit_pairs(path: Path) -> list:
    """NAME=N pairs of a `# limits:` second line, if there is one."""
    lines = path.read_bytes().split(b"\n", 2)
    if path.suffix != ".qcert" or len(lines) < 2:
        return []
    m = re.match(r"# limits: (.+)$", lines[1].decode("utf-8", "replace").strip())
    return [p.strip() for p in m.group(1).split(",")] if m else []


def _report(path: Path):
    pairs = _limit_pairs(path)
    limits = DEFAULT_LIMITS.with_overrides({k: int(v) for k, v in (p.split("=") for p in pairs)})
    if path.suffix.lower() in TABLES:
        from checker.interfaces.tables import check_table
        return check_table(path, limits)
    return check_file(path, limits)


def test_the_folder_holds_reproducers():
    assert len([p for p in FILES if p.suffix == ".qcert"]) >= 8


@pytest.mark.parametrize("path", FILES, ids=lambda p: p.name)
def test_each_reproducer_is_labelled(path):
    if path.suffix == ".qcert":
        first = path.read_bytes().split(b"\n", 1)[0].decode("utf-8", "replace")
        assert re.match(r"# must fail: \S", first), f"{path.name} lacks its '# must fail: REASON' line"
    elif path.suffix.lower() in TABLES:
        assert f"`{path.name}`" in _readme_entries(), \
            f"{path.name} is not listed with its reason in tests/unsound/README.md"
    else:
        pytest.fail(f"{path.name}: no checker for this kind of file; use .qcert, .csv or .jsonl")


@pytest.mark.parametrize("path", FILES, ids=lambda p: p.name)
def test_each_reproducer_fails(path):
    if path.suffix != ".qcert" and path.suffix.lower() not in TABLES:
        pytest.skip("not a certificate or a table (see the labelling test)")
    report = _report(path)
    assert not report.ok, f"{path.name} is verified, but it is false"
    kinds = [f.kind for f in report.failures]
    if not path.name.startswith(_READ_AS_TEXT):
        # a reproducer must fail by its mathematics, not because the language moved under it
        assert "syntax error" not in kinds, (
            f"{path.name} fails only as a syntax error: {report.failures[0].message}")
    assert "checker bug" not in kinds, (
        f"{path.name}: only the numeric second opinion caught it; the symbolic check accepted it")
    out, err = io.StringIO(), io.StringIO()
    argv = ["check", str(path), "--no-time"] + [a for p in _limit_pairs(path) for a in ("--limit", p)]
    code = main(argv, out=out, err=err)
    assert code != 0, out.getvalue()
    assert "Traceback" not in out.getvalue() + err.getvalue()
