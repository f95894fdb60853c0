"""A pytest plugin: *.qcert files as test items, one per claim, chain, identity or witness.

Installed with quasicert (entry point ``pytest11``) and off until asked for,
by the option ``--qcert`` or the ini setting ``qcert = true``.  A project that
computes Dedekind sums or partition counts can keep certificates beside its
tests; each failing statement fails its own item with quasicert's report.
"""
from __future__ import annotations

import pytest

from ..language import statements as st
from ..replay.checking import check_file
from ..replay.report import render_failure

_CHECKED = (st.Claim, st.Congruence, st.Chain, st.Identity, st.Witness, st.Lemma, st.Use)


def pytest_addoption(parser):
    group = parser.getgroup("quasicert")
    group.addoption("--qcert", action="store_true", default=False,
                    help="collect *.qcert certificates as tests (quasicert)")
    parser.addini("qcert", "collect *.qcert certificates as tests (quasicert)", type="bool", default=False)


def _enabled(config) -> bool:
    return bool(config.getoption("--qcert") or config.getini("qcert"))


def pytest_collect_file(parent, file_path):
    if file_path.suffix == ".qcert" and _enabled(parent.config):
        return CertificateFile.from_parent(parent, path=file_path)
    return None


class CertificateFile(pytest.File):
    def collect(self):
        from ..language.parsing import parse_certificate
        from ..foundation.errors import CertificateError
        text = self.path.read_text(encoding="utf-8", errors="replace")
        try:
            cert = parse_certificate(text, str(self.path))
        except CertificateError:
            yield StatementItem.from_parent(self, name="parse", first=1, last=10**9)
            return
        for s in cert.statements:
            if isinstance(s, _CHECKED):
                kind = type(s).__name__.lower()
                label = s.name if isinstance(s, st.Lemma) else s.target if isinstance(s, st.Use) else s.label
                name = f"line {s.pos.line} {kind}" + (f" {label}" if label else "")
                yield StatementItem.from_parent(self, name=name, first=s.pos.line, last=s.pos.end_line)

    def report(self):
        if not hasattr(self, "_report"):
            self._report = check_file(self.path, keep_going=True)
        return self._report


class CertificateFailed(Exception):
    pass


class StatementItem(pytest.Item):
    def __init__(self, *, first: int, last: int, **kwargs):
        super().__init__(**kwargs)
        self.first, self.last = first, last

    def runtest(self):
        report = self.parent.report()
        mine = [f for f in report.failures
                if f.line is None or self.first <= f.line <= self.last]
        if mine:
            raise CertificateFailed("\n".join(render_failure(report, f) for f in mine))

    def repr_failure(self, excinfo):
        if isinstance(excinfo.value, CertificateFailed):
            return str(excinfo.value)
        return super().repr_failure(excinfo)

    def reportinfo(self):
        return self.path, self.first - 1, f"{self.path.name}: {self.name}"
