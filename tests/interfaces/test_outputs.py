"""JSON and SARIF reports, the pytest plugin, and the builder API."""
import io
import json
from fractions import Fraction
from importlib.metadata import entry_points
from pathlib import Path

import jsonschema
import pytest

from checker import Certificate
from checker.interfaces.cli import main

HERE = Path(__file__).parent.parent
BROKEN = sorted((HERE / "broken").glob("*.qcert"))

pytest_plugins = ["pytester"]


def run(argv):
    out = io.StringIO()
    code = main(argv, out=out, err=io.StringIO())
    return code, out.getvalue()


JSON_REPORT_SCHEMA = {   # quasicert's own layout, as documented in the README
    "type": "object",
    "required": ["quasicert", "certificates", "summary"],
    "properties": {
        "certificates": {"type": "array", "items": {
            "type": "object",
            "required": ["file", "verdict", "checked", "failures"],
            "properties": {
                "verdict": {"enum": ["verified", "failed", "undecided", "checker bug"]},
                "checked": {"type": "integer"},
                "failures": {"type": "array", "items": {
                    "type": "object", "required": ["line", "column", "kind", "message"],
                    "properties": {"claimed": {"type": "string"}, "exact": {"type": "string"}}}},
            }}},
    },
}


def test_json_report_validates_and_carries_exact_values():
    code, out = run(["check", "--format", "json", *map(str, BROKEN)])
    assert code == 2
    doc = json.loads(out)
    jsonschema.validate(doc, JSON_REPORT_SCHEMA)
    by_file = {Path(c["file"]).name: c for c in doc["certificates"]}
    wrong = by_file["wrong-claim-value.qcert"]
    assert wrong["verdict"] == "failed"
    assert wrong["failures"][0]["claimed"] == "1/16" and wrong["failures"][0]["exact"] == "1/17"
    assert (wrong["failures"][0]["line"], wrong["failures"][0]["column"]) == (6, 33)
    assert doc["summary"]["certificates"] == len(BROKEN)


def test_sarif_report_validates():
    code, out = run(["check", "--format", "sarif", *map(str, BROKEN)])
    log = json.loads(out)
    # the SARIF 2.1.0 schema (rtm.5) from the npm package @microsoft/jest-sarif, see tests/data/README.md
    official = json.loads((HERE / "data" / "sarif-2.1.0-rtm.5.json").read_text())
    jsonschema.Draft4Validator(official).validate(log)
    broken = dict(log, version="2.0")
    with pytest.raises(jsonschema.ValidationError):      # the schema does reject a wrong log
        jsonschema.Draft4Validator(official).validate(broken)
    schema = json.loads((HERE / "data" / "sarif-2.1.0-subset.schema.json").read_text())
    jsonschema.validate(log, schema)
    results = log["runs"][0]["results"]
    # every failure of every file, without --every-failure
    from checker import check_file
    assert len(results) == sum(len(check_file(p, keep_going=True).failures) for p in BROKEN) > len(BROKEN)
    assert log["runs"][0]["columnKind"] == "unicodeCodePoints"
    first = next(r for r in results if r["locations"][0]["physicalLocation"]["artifactLocation"]["uri"].endswith("wrong-claim-value.qcert"))
    assert first["ruleId"] == "qc-failed" and first["level"] == "error"
    assert first["locations"][0]["physicalLocation"]["region"] == {"startLine": 6, "startColumn": 33, "endColumn": 37}


def test_machine_readable_outputs_are_deterministic():
    outs = {run(["check", "--format", f, "--every-failure", *map(str, BROKEN)])[1] for f in ("json",) for _ in range(2)}
    assert len(outs) == 1


def test_reports_are_the_same_with_two_processes():
    one = run(["check", "--every-failure", "--no-time", *map(str, BROKEN)])
    two = run(["check", "--every-failure", "--no-time", "--jobs", "2", *map(str, BROKEN)])
    assert one == two


def test_bundled_certificates_in_json():
    code, out = run(["check", "--format", "json"])
    assert code == 0
    assert all(c["verdict"] == "verified" for c in json.loads(out)["certificates"])


def _plugin_args():
    names = {ep.name for ep in entry_points(group="pytest11")}
    return [] if "quasicert" in names else ["-p", "checker.interfaces.pytest_plugin"]


def test_pytest_plugin_collects_certificates(pytester):
    pytester.makefile(".qcert", good="claim dedekind(5, 17) = 1/17\nchain dedekind(7, 17)\n  = dedekind(5, 17) by inverse\n")
    pytester.makefile(".qcert", bad="claim one: dedekind(1, 3) = 1/18\nclaim two: dedekind(5, 17) = 1/16\n")
    result = pytester.runpytest(*_plugin_args(), "--qcert", "-v")
    result.assert_outcomes(passed=3, failed=1)
    result.stdout.fnmatch_lines(["*bad.qcert:2:30: failed: claim 'two' is false: the two sides differ*"])
    result.stdout.fnmatch_lines(["*right side: 1/16   (claimed)*"])


def test_pytest_plugin_collects_lemmas_and_uses(pytester):
    pytester.makefile(".qcert", lemmas='use "dedekind-lemmas"\n'
                      "lemma wrong(k) for k >= 1:\n  dedekind(k, 3) = dedekind(1, 3)\n"
                      "  chain dedekind(k, 3) = dedekind(1, 3) by reduce\nend\n")
    result = pytester.runpytest(*_plugin_args(), "--qcert", "-v")
    result.assert_outcomes(passed=1, failed=1)
    result.stdout.fnmatch_lines(["*line 1 use dedekind-lemmas PASSED*", "*line 2 lemma wrong FAILED*"])
    result.stdout.fnmatch_lines(["*the assumptions do not give k - 1 = 0 (mod 3)*"])


def test_pytest_plugin_is_opt_in(pytester):
    pytester.makefile(".qcert", bad="claim 1 = 2\n")
    result = pytester.runpytest(*_plugin_args())
    assert result.ret == pytest.ExitCode.NO_TESTS_COLLECTED
    pytester.makeini("[pytest]\nqcert = true\n")
    result = pytester.runpytest(*_plugin_args())
    result.assert_outcomes(failed=1)


def test_builder_writes_and_checks_in_memory():
    # p_{4,9,11}(100) = 16 and g(4, 9, 11) = 14: sympy series coefficients and brute force,
    # as in test_partitions.py and test_frobenius.py
    cert = Certificate("output of another program")
    cert.source("run 42").let("A", [4, 9, 11])
    cert.value("dedekind", 5, 17, result=Fraction(1, 17))
    cert.claim("partitions(100, A)", 16, label="p100")
    cert.claim("frobenius(A)", 15)                       # wrong: it is 14
    cert.identity("partitions(n, [1, 2])", "floor(n/2) + 1")
    report = cert.check(keep_going=True)
    assert not report.ok and report.checked == 3
    assert cert.check().checked == 2                    # like check_text: stops at the first failure
    assert report.failure.exact == 14 and report.failure.claimed == 15
    assert cert.text().splitlines()[:3] == ['title "output of another program"', 'source "run 42"',
                                            "let A = [4, 9, 11]"]
    with pytest.raises(TypeError):
        Certificate().claim("dedekind(1, 3)", 0.5)


def test_progress_bar_only_on_a_terminal():
    from checker.interfaces.cli import _progress_bar

    class Terminal(io.StringIO):
        def isatty(self):
            return True
    assert _progress_bar(5, io.StringIO()) is None          # piped output: silent
    bar = _progress_bar(5, Terminal())
    assert bar is not None and bar.total == 5              # tqdm on a terminal
    bar.close()
