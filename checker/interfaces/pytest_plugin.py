"""A pytest plugin: certificates and tables of claims as test items.

Installed with quasicert (entry point ``pytest11``) and off until asked for,
by the option ``--qcert`` or the ini setting ``qcert = true``.  A ``*.qcert``
file gives one item per claim, chain, identity, witness, lemma or use; a
table (``*.csv``, ``*.jsonl``) one item that lists every failing row
(``qcert_tables = false`` leaves tables alone).

A verdict is never given outside the checked statements: when the file
cannot be read or parsed, when a limit stopped the check, or when a failure
lies outside every statement, every item of the file fails with it; a file
that checks nothing fails as one item.
"""
from __future__ import annotations

import pytest

from ..language import statements as st
from ..replay.report import render_failure
from .files import check_file
from .table_files import TABLE_SUFFIXES

_CHECKED = (st.Claim, st.Congruence, st.Chain, st.Identity, st.Witness, st.Lemma, st.Use)


def pytest_addoption(parser):
    group = parser.getgroup("quasicert")
    group.addoption("--qcert", action="store_true", default=False,
                    help="collect *.qcert certificates and *.csv / *.jsonl tables of claims as tests (quasicert)")
    parser.addini("qcert", "collect *.qcert certificates as tests (quasicert)", type="bool", default=False)
    parser.addini("qcert_tables", "with qcert, also collect *.csv and *.jsonl tables of claims", type="bool",
                  default=True)


def _enabled(config) -> bool:
    return bool(config.getoption("--qcert") or config.getini("qcert"))


def pytest_collect_file(parent, file_path):
    if not _enabled(parent.config):
        return None
    if file_path.suffix == ".qcert":
        return CertificateFile.from_parent(parent, path=file_path)
    if file_path.suffix.lower() in TABLE_SUFFIXES and parent.config.getini("qcert_tables"):
        return TableFile.from_parent(parent, path=file_path)
    return None


class CertificateFailed(Exception):
    pass


class _Checked(pytest.File):
    """A file checked once, on the first item that asks."""

    def report(self):
        if not hasattr(self, "_report"):
            self._report = check_file(self.path, keep_going=True)
        return self._report


class CertificateFile(_Checked):
    def collect(self):
        from ..foundation.errors import CertificateError
        from ..language.parsing import parse_certificate
        from ..replay.library import read_certificate_text
        try:
            text = read_certificate_text(self.path)
            cert = parse_certificate(text.removeprefix("\ufeff"), str(self.path))
        except CertificateError:
            yield StatementItem.from_parent(self, name="read", first=1, last=10**9)
            return
        ranges = []
        for s in cert.statements:
            if isinstance(s, _CHECKED):
                kind = type(s).__name__.lower()
                label = s.name if isinstance(s, st.Lemma) else s.target if isinstance(s, st.Use) else s.label
                name = f"line {s.pos.line} {kind}" + (f" {label}" if label else "")
                ranges.append((s.pos.line, s.pos.end_line))
                yield StatementItem.from_parent(self, name=name, first=s.pos.line, last=s.pos.end_line)
        self.ranges = ranges
        if not ranges:
            yield StatementItem.from_parent(self, name="nothing to check", first=1, last=10**9)

    def outside(self, report) -> list:
        """Failures no statement item answers for: the whole file's run fails with them."""
        ranges = getattr(self, "ranges", [])
        return [f for f in report.failures
                if f.exit_code >= 2 or f.line is None or not any(a <= f.line <= b for a, b in ranges)]


class TableFile(_Checked):
    def collect(self):
        yield StatementItem.from_parent(self, name="rows", first=1, last=10**9)

    def outside(self, report) -> list:
        return []


class StatementItem(pytest.Item):
    def __init__(self, *, first: int, last: int, **kwargs):
        super().__init__(**kwargs)
        self.first, self.last = first, last

    def runtest(self):
        report = self.parent.report()
        mine = [f for f in report.failures if f.line is not None and self.first <= f.line <= self.last]
        whole = [f for f in self.parent.outside(report) if f not in mine]
        if mine or whole:
            text = "\n".join(render_failure(report, f) for f in mine)
            if whole:
                text += ("\n" if text else "") + "the check of this file failed outside this statement:\n" + \
                    "\n".join(render_failure(report, f) for f in whole)
            raise CertificateFailed(text)

    def repr_failure(self, excinfo):
        if isinstance(excinfo.value, CertificateFailed):
            return str(excinfo.value)
        return super().repr_failure(excinfo)

    def reportinfo(self):
        return self.path, self.first - 1, f"{self.path.name}: {self.name}"
