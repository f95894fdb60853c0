"""Machine-readable reports: JSON (quasicert's own layout) and SARIF 2.1.0 (an OASIS standard).

Both are built from Reports only and contain no times, so that the same
input gives byte-identical output.
"""
from __future__ import annotations

import json

from ..foundation.numbers import value_text

__all__ = ["reports_json", "reports_sarif"]

_SARIF_SCHEMA = "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json"


def _verdict(report) -> str:
    if report.ok:
        return "verified"
    return {1: "failed", 2: "undecided", 3: "checker bug", 4: "empty"}.get(report.exit_code, "failed")


def _failure(f) -> dict:
    out = {"line": f.line, "column": f.column, "kind": f.kind, "message": f.message}
    if f.end_column:
        out["end_column"] = f.end_column
    if f.details:
        out["details"] = list(f.details)
    if f.claimed is not None:
        out["claimed"] = value_text(f.claimed)
    if f.exact is not None:
        out["exact"] = value_text(f.exact)
    if f.source_note:
        out["source"] = f.source_note
    if f.row is not None:
        out["row"] = f.row
    return out


def reports_json(reports) -> str:
    """One object per certificate: verdict, counts and each failure with exact values as strings."""
    from ..foundation.version import __version__
    doc = {
        "quasicert": __version__,
        "certificates": [{
            "file": r.name,
            "title": r.title,
            "verdict": _verdict(r),
            "checked": r.checked,
            "failures": [_failure(f) for f in r.failures],
        } for r in reports],
        "summary": {
            "certificates": len(reports),
            "verified": sum(1 for r in reports if r.ok),
            "checked": sum(r.checked for r in reports),
            "failures": sum(len(r.failures) for r in reports),
        },
    }
    return json.dumps(doc, indent=2, ensure_ascii=False) + "\n"


_RULES = {
    "failed": "a claim, step or identity that does not hold",
    "error": "a value that is undefined, or a statement that cannot be read as mathematics",
    "syntax error": "text that is not in the certificate language",
    "limit": "a request over a budget: the check stopped without a verdict",
    "unreadable": "a file that cannot be read as UTF-8 text",
    "checker bug": "two independent computations disagree (--paranoid)",
    "empty": "an input that checks nothing (an empty certificate or table)",
    "rule refused": "a rule cited where its side conditions do not hold",
}


def _rule_id(kind: str) -> str:
    return "qc-" + kind.replace(" ", "-")


def reports_sarif(reports) -> str:
    """A SARIF 2.1.0 log: one run, one result per failure, located by file, line and column."""
    from ..foundation.version import __version__
    results = []
    for r in reports:
        for f in r.failures:
            region = {}
            if f.line:
                region["startLine"] = f.line
                if f.column:
                    region["startColumn"] = f.column
                if f.end_column and f.column and f.end_column > f.column:
                    region["endColumn"] = f.end_column
            location = {"physicalLocation": {"artifactLocation": {"uri": r.name}}}
            if region:
                location["physicalLocation"]["region"] = region
            text = f.message + "".join(f"\n{d}" for d in f.details)
            result = {
                "ruleId": _rule_id(f.kind),
                "level": "warning" if f.kind == "limit" else "error",
                "message": {"text": text},
                "locations": [location],
            }
            values = {k: value_text(v) for k, v in (("claimed", f.claimed), ("exact", f.exact)) if v is not None}
            if f.row is not None:
                values["row"] = f.row
            if values:
                result["properties"] = values
            results.append(result)
    log = {
        "$schema": _SARIF_SCHEMA,
        "version": "2.1.0",
        "runs": [{
            "tool": {"driver": {
                "name": "quasicert",
                "version": __version__,
                "rules": [{"id": _rule_id(k), "shortDescription": {"text": v}} for k, v in _RULES.items()],
            }},
            "columnKind": "unicodeCodePoints",       # columns count characters, as Python strings do
            "results": results,
        }],
    }
    return json.dumps(log, indent=2, ensure_ascii=False) + "\n"
