"""The plain reader against Lark: where the plain reader gives a tree, Lark gives the same one.

The grammar (grammar/*.lark, read by Lark) defines the language; the plain reader is a
fast path for plain certificates.  Differential tests over the bundled, broken,
derived and fuzzed certificates (# common practice: differential testing of two
parsers of one grammar); when the plain reader gives up, Lark reads the text.
"""
from __future__ import annotations

import random
from pathlib import Path

import pytest
from hypothesis import given, settings, strategies as st

from checker.foundation.errors import CertificateError
from checker.foundation.limits import DEFAULT_LIMITS, Limits
from checker.foundation.resources import resource_dir
from checker.interfaces.derive import derive_dedekind
from checker.language import parsing
from checker.language.parsing import parse_with_lark, read_plain

ROOT = Path(__file__).resolve().parents[2]
BUNDLED = sorted(resource_dir("checker.certificates", "certificates").glob("*.qcert"))
BROKEN = sorted((ROOT / "tests" / "broken").glob("*.qcert"))


def _text(path):
    try:
        return path.read_text(encoding="utf-8")
    except UnicodeDecodeError:
        return None


CORPUS = [t for t in (_text(p) for p in BUNDLED + BROKEN) if t is not None]
CORPUS += [derive_dedekind(h, k) for h, k in ((5, 17), (12345678901, 98765432109876), (3, 10**30 + 7))]
CORPUS += ["", "# only a comment\n", "claim 1 = 1", "claim a: 2 <= 3\nclaim b: 3 \u2265 2\nclaim c: 1 \u2260 2",
           "let x = -(2)^-3 \u00b7 4 \u00d7 5 \u2212 +6\nclaim x == 3 mod 7\n",
           "chain c: dedekind(3, 7)\n  = dedekind(3, 7) by reduce, claim a\n  = dedekind(3, 7) by negate\n"]

# pieces the fuzzer inserts: every kind of terminal, keywords in odd places, unicode forms
PIECES = ["claim", "chain", "let", "title", "source", "by", "mod", "sum", "lemma", "use", "then", "end",
          "identity", "for", "all", "period", "witness", "given", "split", "residue", "degree",
          "x", "h'", "k''", "_a1", "dedekind", "12", "0", "9" * 30, "(", ")", "[", "]", ",", ":", "..",
          "=", "==", "<", "<=", ">", ">=", "!=", "\u2264", "\u2265", "\u2260", "\u2261", "+", "-", "\u2212",
          "*", "/", "\u00b7", "\u00d7", "^", '"a text"', '"', "#c\n", "\n", " ", "\t", "\r\n", "\u00e9", "$",
          "claim x:", "by reduce", "= 1 by value", "total", "from", "to", "(mod", "by definition"]


def _same(text, start="certificate", limits=DEFAULT_LIMITS):
    """Assert the two readers agree; True when the plain reader read the text itself."""
    plain = read_plain(text, start, limits)
    if plain is None:
        return False
    try:
        lark = parse_with_lark(text, start, limits)
    except CertificateError as e:                     # pragma: no cover - a failure shows the text
        pytest.fail(f"plain reader accepted what Lark refuses ({e.message}):\n{text!r}")
    assert plain == lark, text
    return True


def _mutants(text, rng, count):
    for _ in range(count):
        t = text
        for _ in range(rng.randint(1, 3)):
            i = rng.randint(0, len(t))
            j = min(len(t), i + rng.randint(0, 6))
            move = rng.random()
            if move < 0.4:
                t = t[:i] + rng.choice(PIECES) + t[i:]
            elif move < 0.7:
                t = t[:i] + t[j:]
            elif move < 0.85:
                t = t[:i] + rng.choice(PIECES) + t[j:]
            else:
                t = t[:i] + t[i:j] + t[i:j] + t[j:]
        yield t


def test_the_reader_is_on_for_this_grammar():
    assert parsing._plain_reader().enabled


@pytest.mark.parametrize("text", CORPUS, ids=range(len(CORPUS)))
def test_corpus(text):
    _same(text)


def test_plain_certificates_are_read_without_lark():
    read = [p.name for p in BUNDLED if _same(p.read_text(encoding="utf-8"))]
    assert {"closed-forms.qcert", "reciprocity-instances.qcert", "three-term-law.qcert"} <= set(read)
    assert all(_same(t) for t in CORPUS[-9:-6])          # the derived chains


def test_fuzzed_corpus():
    rng = random.Random(15)
    plain = 0
    for text in CORPUS:
        for mutant in _mutants(text, rng, 60):
            plain += _same(mutant)
    assert plain > 300               # the fuzzer reaches texts the plain reader reads


def test_fuzzed_expressions():
    rng = random.Random(16)
    seeds = ["dedekind(3, 7)", "-2^-3^2", "(1 + 2)*[3, 4]", "f(x, y')/g()", "1 \u2212 2 \u00b7 3 \u00d7 4",
             "+-+1", "a^b^c", "x*y/z - -w"]
    plain = 0
    for text in seeds:
        for mutant in _mutants(text, rng, 150):
            plain += _same(mutant, "expr")
    assert plain > 200


@pytest.mark.parametrize("limits", [Limits(nesting=3), Limits(tokens=40), Limits(literal_digits=3),
                                    Limits(list_length=1)], ids=["nesting", "tokens", "digits", "list"])
def test_budgets_are_lark_s(limits):
    """Near a budget the plain reader gives up, and Lark's refusal (with its position) stands."""
    texts = ["claim f(g(h(k(1)))) = 1\n", "claim " + " + ".join(["1"] * 30) + " = 30\n",
             "claim 12345 = 12345\n", "claim [1, 2] = [1, 2]\n"]
    for text in texts:
        _same(text, limits=limits)
        try:
            lark = parse_with_lark(text, "certificate", limits)
        except CertificateError as e:
            with pytest.raises(CertificateError) as caught:
                parsing.parse_certificate(text, limits=limits)
            assert (caught.value.message, caught.value.line, caught.value.column) == (e.message, e.line, e.column)
        else:
            assert parsing.parse_certificate(text, limits=limits).statements == tuple(lark)


@settings(max_examples=300, deadline=None)
@given(st.lists(st.sampled_from(PIECES), max_size=25))
def test_token_soups(pieces):
    text = " ".join(pieces)
    _same(text)
    _same(text, "expr")


def test_long_line_and_deep_nesting():
    line = "claim " + "+".join(["1"] * 20_000) + " = 20000\n"
    assert _same(line)
    deep = "claim " + "(" * 150 + "1" + ")" * 150 + " = 1\n"
    _same(deep)                      # too deep for recursion here: Lark reads it
    nested = "claim " + "-" * 190 + "1 = 1\n"
    _same(nested)
