"""One entry for every input quasicert checks: certificates (.qcert) and tables (.csv, .jsonl).

``check_file`` and ``check_text`` are the public ones (``checker.check_file``):
a path ending in .csv or .jsonl is a table of claims, anything else a
certificate.  Checking nothing is a failure of its own (exit code 4): an empty
or comment-only certificate, a header-only or empty table.  A generator that
crashed before writing a row must not pass a CI run.  ``allow_empty=True``
accepts it.
"""
from __future__ import annotations

from pathlib import Path

from ..foundation.errors import CertificateError
from ..foundation.limits import DEFAULT_LIMITS, Limits
from ..replay.library import read_certificate_text
from ..replay import checking
from ..replay.report import Failure, Report
from .table_files import is_table

__all__ = ["check_file", "check_text", "require_something", "EXIT_EMPTY"]

EXIT_EMPTY = 4
BOM = "\ufeff"     # a UTF-8 byte-order mark, which some editors write first; columns count without it


def require_something(report: Report, allow_empty: bool = False) -> Report:
    """Add the failure 'nothing was checked' to a report that checked nothing and found nothing wrong."""
    if report.checked == 0 and not report.failures and not allow_empty:
        what = ("the table has no rows" if is_table(report.name) else
                "the certificate has no claim, chain, identity, witness, lemma or use")
        report.failures.append(Failure(      # located at the start, where something was expected
            1, 1, f"nothing was checked: {what}; an empty input is refused so that a missing "
            "result cannot pass (--allow-empty accepts it)", kind="empty", exit_code=EXIT_EMPTY))
    return report


def check_file(path, limits: Limits = DEFAULT_LIMITS, keep_going: bool = False, paranoid: bool = False,
               allow_empty: bool = False, seed: int | None = None, jobs: int | None = None) -> Report:
    """Check a certificate or a table file; tables list every failing row (keep_going is for certificates).

    `jobs` is for tables: worker processes (None: by the table's size, see tables.default_jobs)."""
    path = Path(path)
    if is_table(path):
        from .tables import check_table     # imported on first use: its patterns cost start-up
        report = check_table(path, limits, jobs)
    else:
        try:
            text = read_certificate_text(path, limits)
        except CertificateError as e:
            report = Report(name=str(path))
            report.failures.append(Failure(e.line, e.column, e.message, kind=e.kind, exit_code=2))
            return report
        report = checking.check_text(text.removeprefix(BOM), str(path), limits, keep_going, paranoid, seed)
    return require_something(report, allow_empty)


def check_text(text: str, name: str = "<text>", limits: Limits = DEFAULT_LIMITS, keep_going: bool = False,
               paranoid: bool = False, allow_empty: bool = False, seed: int | None = None) -> Report:
    """Check a certificate given as text; never raises for anything the text contains.

    `seed` fixes the instances of the lemmas' numeric second opinion (None: unpredictable)."""
    report = checking.check_text(text.removeprefix(BOM), name, limits, keep_going, paranoid, seed)
    return require_something(report, allow_empty)
