"""LaTeX output: every bundled certificate, each step present, failures marked, compiled if TeX exists."""
import shutil
import subprocess

import pytest

from checker.interfaces.cli import bundled_certificates
from checker.interfaces.latex import certificate_latex
from checker.language.parsing import parse_certificate
from checker.language import statements as st


@pytest.mark.parametrize("path", bundled_certificates(), ids=lambda p: p.name)
def test_every_bundled_certificate_has_latex_with_every_step(path):
    text = path.read_text()
    doc = certificate_latex(text, path.name)
    assert doc.startswith(r"\documentclass{article}") and doc.rstrip().endswith(r"\end{document}")
    assert r"\fbox" not in doc                       # all verified, nothing marked
    cert = parse_certificate(text)
    steps = [step for chain in _chains(cert) for step in chain.steps]
    assert doc.count(r" && \text{(") == len(steps)   # one rule note per step
    for step in steps:
        if any(r.name == "lemma" for r in step.rules):
            assert f"lemma {step.rules[-1].label.replace('_', chr(92) + '_')}(" in doc
            continue
        rules = ", ".join(r.name.replace("_", " ") if r.name != "claim" else f"claim {r.label}" for r in step.rules)
        assert f"\\text{{({rules.replace('_', chr(92) + '_')})}}" in doc
    lemmas = [s for s in cert.statements if isinstance(s, st.Lemma)]
    assert doc.count(r"\paragraph{Lemma (") == len(lemmas)


def _chains(cert):
    for s in cert.statements:
        if isinstance(s, st.Chain):
            yield s
        elif isinstance(s, st.Lemma):
            yield from s.chains
            if s.split:
                for case in s.split.cases:
                    yield from case.chains


def test_failing_step_is_marked():
    text = ("chain dedekind(5, 17)\n"
            "  = 1/17 - dedekind(2, 5)   by reciprocity, reduce\n"
            "  = 1/16                    by value\n")
    doc = certificate_latex(text)
    lines = [ln for ln in doc.splitlines() if "&=" in ln]
    assert r"\fbox" not in lines[0] and r"\fbox{\text{does not hold}}" in lines[1]
    assert r"s(5, 17) &= \frac{1}{17} - s(2, 5)" in lines[0]


@pytest.mark.skipif(shutil.which("pdflatex") is None, reason="no TeX engine installed")
def test_latex_compiles(tmp_path):
    for path in bundled_certificates():
        tex = tmp_path / (path.stem + ".tex")
        tex.write_text(certificate_latex(path.read_text(), path.name))
        out = subprocess.run(["pdflatex", "-interaction=nonstopmode", "-halt-on-error", tex.name],
                             cwd=tmp_path, capture_output=True, text=True, timeout=120)
        assert out.returncode == 0, out.stdout[-2000:]


def test_parentheses_of_a_subtracted_sum_are_kept():
    # common practice: a - (b + c) must not print as a - b + c
    from checker.interfaces.latex import expression_latex
    from checker.language.parsing import parse_expression
    assert expression_latex(parse_expression("1 - (2 + 3)")) == r"1 - \left(2 + 3\right)"
    assert expression_latex(parse_expression("1 - (2 - 3) + (4 + 5)")) == \
        r"1 - \left(2 - 3\right) + \left(4 + 5\right)"
