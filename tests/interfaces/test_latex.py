"""LaTeX output: every bundled certificate, each step present, failures marked, compiled if TeX exists."""
import shutil
import subprocess
from pathlib import Path

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
    # one rule note per step: in an align* or, for wide chains, at the end of a paragraph
    assert doc.count(r" && \text{(") + doc.count(r"\hfill\mbox{\small(") == len(steps)
    for step in steps:
        if any(r.name == "lemma" for r in step.rules):
            assert f"lemma {step.rules[-1].label.replace('_', chr(92) + '_')}(" in doc
            continue
        rules = ", ".join(r.name.replace("_", " ") if r.name != "claim" else f"claim {r.label}" for r in step.rules)
        assert f"({rules.replace('_', chr(92) + '_')})" in doc
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


BROKEN = sorted((Path(__file__).parents[1] / "broken").glob("*.qcert"))


def _derived_long_chain() -> str:
    from checker.interfaces.derive import derive
    return derive("dedekind(123456789012345678901234567891, 987654321098765432109876543211)")


@pytest.mark.skipif(shutil.which("pdflatex") is None, reason="no TeX engine installed")
def test_latex_compiles_without_running_off_the_page(tmp_path):
    import re
    from checker.replay.library import read_certificate_text
    from checker.foundation.errors import CertificateError
    texts = [(p.stem, p.read_text()) for p in bundled_certificates()]
    for p in BROKEN:
        try:
            texts.append((p.stem, read_certificate_text(p)))
        except CertificateError:
            continue                      # a file that cannot be read has no LaTeX (not-utf8.qcert)
    texts.append(("long-chain", _derived_long_chain()))
    compiled = 0
    for stem, text in texts:
        try:
            doc = certificate_latex(text, stem + ".qcert")
        except CertificateError:
            continue                      # a syntax error has no LaTeX either
        tex = tmp_path / (stem + ".tex")
        tex.write_text(doc)
        out = subprocess.run(["pdflatex", "-interaction=nonstopmode", "-halt-on-error", tex.name],
                             cwd=tmp_path, capture_output=True, text=True, timeout=120)
        assert out.returncode == 0, (stem, out.stdout[-2000:])
        log = (tmp_path / (stem + ".log")).read_text(errors="replace")
        too_wide = [float(x) for x in re.findall(r"Overfull \\hbox \(([0-9.]+)pt too wide", log)]
        assert max(too_wide, default=0) < 15, (stem, too_wide)      # common practice: a few points pass unseen
        compiled += 1
    assert compiled >= len(bundled_certificates()) + 10


def test_a_false_lemma_is_not_typeset_as_a_lemma():
    path = Path(__file__).parents[1] / "broken" / "lemma-false-closed-form.qcert"
    doc = certificate_latex(path.read_text(), path.name)
    assert r"\paragraph{Claimed lemma (two\_over\_odd), not verified.}" in doc
    assert r"\emph{Proof.}" not in doc and r"\square" not in doc and r"\emph{Attempted proof.}" in doc
    assert "at k = 3 the previous line is -1/18 and this line is -1/9" in doc     # the counterexample


def test_a_false_claim_shows_the_exact_value():
    # s(5, 17) = 1/17: Rademacher & Grosswald's table of Dedekind sums (from memory), and python-flint
    doc = certificate_latex("claim dedekind(5, 17) = 1/16\n")
    assert r"\fbox{\text{does not hold}}" in doc
    assert "left side:  1/17" in doc and "right side: 1/16" in doc
    assert r"Exact value $\frac{1}{17}$, claimed $\frac{1}{16}$." in doc


def test_long_numbers_may_break_and_wide_chains_flow():
    doc = certificate_latex(_derived_long_chain())
    assert r"1234567890\allowbreak 1234567890\allowbreak 1234567891" in doc
    assert r"\begin{align*}" not in doc and r"\raggedright" in doc


def test_products_read_as_a_mathematician_writes_them():
    from checker.language.parsing import parse_expression
    from checker.interfaces.latex import expression_latex
    cases = {"(k - 1)*(k - 5)/(24*k)": r"\frac{\left(k - 1\right)\left(k - 5\right)}{24k}",
             "12*k*dedekind(h, k)": r"12k\,s(h, k)", "3*4": r"3 \cdot 4", "h*k^2": "hk^{2}",
             "lattice_points(t, [[0, 0], [1/2, 0], [0, 1/3]])":
                 r"\#\left(t\,\operatorname{conv}\{(0, 0), (\frac{1}{2}, 0), (0, \frac{1}{3})\} \cap \mathbb{Z}^{2}\right)"}
    for text, latex in cases.items():
        assert expression_latex(parse_expression(text)) == latex


def test_fragment_has_no_preamble():
    doc = certificate_latex("claim dedekind(5, 17) = 1/17\n", fragment=True)
    assert r"\documentclass" not in doc and r"\begin{document}" not in doc and r"\end{document}" not in doc
    assert r"\[ s(5, 17) = \frac{1}{17} \]" in doc


def test_parentheses_of_a_subtracted_sum_are_kept():
    # common practice: a - (b + c) must not print as a - b + c
    from checker.interfaces.latex import expression_latex
    from checker.language.parsing import parse_expression
    assert expression_latex(parse_expression("1 - (2 + 3)")) == r"1 - \left(2 + 3\right)"
    assert expression_latex(parse_expression("1 - (2 - 3) + (4 + 5)")) == \
        r"1 - \left(2 - 3\right) + \left(4 + 5\right)"
