"""What a check found, and how it is shown to a person.

``Report`` and ``Failure`` are plain data; ``render_failure`` and
``summary_line`` turn them into text.  Nothing here decides a verdict.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction
from typing import Optional

from ..foundation.numbers import abbreviate_numbers

__all__ = ["Failure", "Report", "render_failure", "render_report", "summary_line"]


@dataclass
class Failure:
    line: Optional[int]
    column: Optional[int]
    message: str                      # the headline, one sentence
    details: list = field(default_factory=list)   # further lines, plain text
    kind: str = "failed"              # failed | refused | error | limit | syntax error
    end_column: Optional[int] = None
    claimed: Optional[Fraction] = None
    exact: Optional[Fraction] = None
    source_note: Optional[str] = None
    exit_code: int = 1
    row: Optional[str] = None         # a table's failing row as written (certificates: None)


@dataclass
class Report:
    name: str
    text: str = ""
    title: Optional[str] = None
    checked: int = 0                  # claims and steps verified
    failures: list = field(default_factory=list)
    seconds: float = 0.0
    notes: list = field(default_factory=list)     # how verified statements were decided
    seed: Optional[int] = None        # of the lemmas' second opinion (--seed reproduces a run)

    @property
    def ok(self) -> bool:
        return not self.failures

    @property
    def failure(self) -> Optional[Failure]:
        return self.failures[0] if self.failures else None

    @property
    def exit_code(self) -> int:
        return max((f.exit_code for f in self.failures), default=0)

    def __str__(self) -> str:
        return render_report(self, verbose=True)


def _marked_line(text: str, f: Failure) -> list[str]:
    if not f.line or not f.column:
        return []
    if f.row is not None:
        src = f.row.rstrip("\r\n")
    else:
        lines = text.splitlines()
        if f.line > len(lines):
            return []
        src = lines[f.line - 1].rstrip()
    start = f.column - 1
    end = f.end_column - 1 if f.end_column and f.end_column > f.column else start + 1
    # long lines (derived certificates) are cut around the mark
    if len(src) > 160:
        lo = max(0, start - 40)
        hi = min(len(src), max(end, start + 1) + 40, lo + 160)
        prefix = "..." if lo > 0 else ""
        suffix = "..." if hi < len(src) else ""
        shown = prefix + src[lo:hi] + suffix
        start = start - lo + len(prefix)
        end = min(end, hi) - lo + len(prefix)
        src = shown
    width = max(1, min(end, len(src)) - start)
    return [f"    {src}", f"    {' ' * start}{'^' * width}"]


def render_failure(report: Report, f: Failure) -> str:
    """The failure as people read it; numbers of more than 60 digits are abbreviated."""
    where = f"{report.name}:{f.line}:{f.column}" if f.line else report.name
    out = [f"{where}: {f.kind}: {abbreviate_numbers(f.message)}"]
    out += _marked_line(report.text, f)
    out += [f"  {abbreviate_numbers(d)}" for d in f.details]
    if f.source_note:
        out.append(f"  source: {f.source_note}")
    return "\n".join(out)


def render_report(report: Report, verbose: bool = False) -> str:
    """Every failure as `render_failure` shows it, then (if verbose or none failed) a verdict line."""
    lines = [render_failure(report, f) for f in report.failures]
    if verbose or not report.failures:
        status = "verified" if report.ok else "FAILED"
        title = f" ({report.title})" if report.title else ""
        lines.append(f"{report.name}{title}: {status}, {report.checked} "
                     f"claim{'s' if report.checked != 1 else ''} and steps checked")
    return "\n".join(lines)


def _is_table(name: str) -> bool:
    return name.lower().endswith((".csv", ".jsonl")) or name == "<stdin>.csv"


def _count(n: int, word: str) -> str:
    return f"{n} {word}{'s' if n != 1 else ''}"


def summary_line(reports: list[Report], seconds: float | None) -> str:
    files = len(reports)
    good = sum(1 for r in reports if r.ok)
    checked = sum(r.checked for r in reports)
    failures = sum(len(r.failures) for r in reports)
    tables = sum(1 for r in reports if _is_table(r.name))
    head = "all verified" if good == files else f"{files - good} of {files} not verified"
    if not tables:
        what = f"{_count(files, 'certificate')}, {checked} claim{'s' if checked != 1 else ''} and steps verified"
    elif tables == files:
        what = f"{_count(files, 'table')}, {_count(checked, 'row')} verified"
    else:
        what = (f"{_count(files - tables, 'certificate')} and {_count(tables, 'table')}, "
                f"{checked} claims, steps and rows verified")
    return (f"quasicert: {head}: {what}, {_count(failures, 'failure')}"
            + (f", {seconds:.2f} s" if seconds is not None else ""))
