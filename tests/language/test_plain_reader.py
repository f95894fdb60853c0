"""The plain reader against Lark: where the plain reader gives a tree, Lark gives the same one.

The grammar (grammar/*.lark, read by Lark) defines the language; the plain reader is a
fast path for plain certificates.  Differential tests over the bundled, broken,
derived and fuzzed certificates (# common practice: differential testing of two
parsers of one grammar); when the plain reader gives up, Lark reads the text.
"""
from __future__ import annotations

import random
import re
from pathlib import Path

import pytest
from hypothesis import given, settings, strategies as st

from checker.foundation.errors import CertificateError
from checker.foundation.limits import DEFAULT_LIMITS, Limits
from checker.foundation.resources import resource_dir
from checker.interfaces.derive import derive_dedekind
from checker.language import parsing
from checker.language.parsing import parse_with_lark, read_plain
from checker.language.plain_reader import GiveUp, PlainReader

ROOT = Path(__file__).resolve().parents[2]
BUNDLED = sorted(resource_dir("checker.certificates", "certificates").glob("*.qcert"))
BROKEN = sorted((ROOT / "tests" / "broken").glob("*.qcert"))


def _text(path):
    try:
        return path.read_text(encoding="utf-8")
    except UnicodeDecodeError:
        return None


CORPUS = [t for t in (_text(p) for p in BUNDLED + BROKEN) if t is not None]
SMALL_DERIVED = [derive_dedekind(h, k) for h, k in ((5, 17), (12345678901, 98765432109876), (3, 10**30 + 7))]
CORPUS += SMALL_DERIVED
DERIVED = [derive_dedekind(h, k, per_line=1)
           for h, k in ((1, 2), (2, 1), (6, 4), (8 ** 90 + 1, 7 ** 120), (3 ** 700, 2 ** 1500 + 1))]
DERIVED.append(derive_dedekind(3 ** 700, 2 ** 1500 + 1))       # several steps a line: `by descent`
CORPUS += ["", "# only a comment\n", "claim 1 = 1", "claim a: 2 <= 3\nclaim b: 3 \u2265 2\nclaim c: 1 \u2260 2",
           "let x = -(2)^-3 \u00b7 4 \u00d7 5 \u2212 +6\nclaim x == 3 mod 7\n",
           "chain c: dedekind(3, 7)\n  = dedekind(3, 7) by reduce, claim a\n  = dedekind(3, 7) by negate\n"]



def _claim_lines(rng, count):
    """Claims of the shape the plain reader reads a line at a time, and near misses: keywords as
    names, unicode forms, blanks, other line ends, and what may follow (another statement, a
    continuation of the right side on the next line, a comment, the end of the text)."""
    out = []
    for _ in range(count):
        blank = lambda: rng.choice(["", " ", " ", "  ", "\t"])                       # noqa: E731
        label = rng.choice([None, None, "c", "c12", "h'", "_x", "c", "c12", "claim", "total", "mod", "by"])
        name = rng.choice(["dedekind", "dedekind", "f", "g_2", "x'", "dedekind", "f", "sum", "total", "use"])
        args = [rng.choice(["", "", "-", "\u2212", "- "]) + rng.choice(["0", "7", "12345678901234567890", "9" * 30])
                for _ in range(rng.choice([1, 2, 2, 2, 3, 5]))]
        relation = rng.choice(["=", "=", "<", ">", "<=", ">=", "!=", "\u2264", "\u2265", "\u2260", "==", "\u2261"])
        rhs = rng.choice(["", "", "-", "\u2212", "- ", "+"]) + rng.choice(["0", "5", "98765432109876543210"])
        if rng.random() < 0.6:
            rhs += blank() + rng.choice(["/", "/", "*", "\u00b7"]) + blank() + rng.choice(["12", "0", "-3", "7"])
        head = "claim" + rng.choice([" ", " ", "\t", "  "]) + (f"{label}{blank()}:{blank()}" if label else "")
        line = (head + name + blank() + "(" + blank() + (blank() + "," + blank()).join(args) + blank() + ")"
                + blank() + relation + blank() + rhs)
        ends = ["\n", "\r\n", " \n", " # note\n", "\n\n", "", " ", "\n# c\n"]
        misses = ["\n  /5\n", "\n+ 1\n", "\n^2\n", "x\n", " mod 3\n", " (mod 3)\n", "'\n"]
        out.append(line + ("\n" if rng.random() < 0.6 else rng.choice(ends if rng.random() < 0.7 else misses)))
    return out


def _claims_text(rng, count):
    others = ["chain dedekind(1, 5)\n  = 0 by value\n", "let y = 1 + 2 + 3 - 4\n", 'title "t"\n', "claim y = 2\n"]
    return "".join(line if rng.random() < 0.85 else rng.choice(others) for line in _claim_lines(rng, count))


CLAIM_TEXTS = [_claims_text(random.Random(seed), 12) for seed in range(4)]


def _chain_text(rng, count):
    """A chain whose steps have the shape of a derived chain's (read a line at a time), and near
    misses: keywords as names or rules, unicode minus signs, blanks, other line ends, comments,
    a missing or doubled bracket, and rules or terms going on on the next line."""
    blank = lambda: rng.choice(["", " ", " ", "    ", "\t"])                        # noqa: E731

    def pick(good, misses):
        return rng.choice(good) if rng.random() < 0.85 else rng.choice(misses)
    lines = ["chain " + rng.choice(["d: ", "", "by: "]) + "dedekind(3, 7)"]
    for _ in range(count):
        sign = rng.choice(["", "", "-", "\u2212", "- "])
        p = rng.choice(["0", "5", "12345678901234567890", "9" * 40])
        q = pick(["", "/" + blank() + rng.choice(["7", "12", "98765432109876543210"])], ["*3", "\u00b7 2", "/-3", "/ /2"])
        op = pick(["+", "-", "\u2212"], ["+ -", "*", "++"])
        name = pick(["dedekind", "f'", "g_2"], ["total", "sum", "by", "claim", "3"])
        args = pick(["3, 7", "12345678901234567890,98765432109876543210", " 0 , 1 ", "0\t,1"],
                    ["-3, 7", "3", "3, 7, 9", "(3), 7", "3, 7)", "3 7", ""])
        rules = pick(["reciprocity, reduce", "reduce", "a,b ,c", "r'", "x, y'"],
                     ["reduce,", "claim x", "reciprocity, claim x", "lemma f(1)", "by", "mod", "reduce reduce"])
        by = pick(["by", "\tby", "by  "], ["bye", "by\u00e9", "byreduce", "by\n"])
        line = (f"  ={blank()}{sign}{p}{blank()}{q}{blank()}{op}{blank()}{name}{blank()}({args}){blank()}"
                f"{by} {blank()}{rules}")
        if rng.random() < 0.3:
            line += rng.choice([" # note", "\r", " ", "\n, reduce", "\n,reduce", "\n(1)", "\n/ 2", "\n+ 1",
                                "\n\n", "\f", "\n# c", ", ", "\n  = 1 by value", "'", "\u00e9"])
        lines.append(line)
    ends = ["\n", "\n", "\r\n", "", "\nclaim 1 = 1\n", "\n  = 0 by value\n", "\nlet x = 1\n"]
    return "\n".join(lines) + rng.choice(ends)


CLAIM_TEXTS += ["".join(f"claim c{i}: dedekind({3 * i + 1}, {10 ** 19 + 7 * i}) = {i - 5}/{i + 12}\n" for i in range(12)),
                "claim 1 + 2 - 3 + 40 - 5 = 35\nlet t = 2 + 3 * 4 - 1 + (5 - 6) - 7 + 8\nclaim t = 10 + 1 \u2212 2 - 3\n"]
CORPUS += CLAIM_TEXTS + [_chain_text(random.Random(seed), 8) for seed in range(4)]

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


def _token_by_token(text, limits=DEFAULT_LIMITS):
    """The plain reader without its line-at-a-time claims, chain steps and literal sum terms."""
    reader = object.__new__(PlainReader)
    reader.__dict__.update(parsing._plain_reader().__dict__)
    reader.claim_line = reader.sum_term = reader.step_line = None
    try:
        return reader.certificate(text, limits)
    except GiveUp:
        return None


@pytest.fixture
def lines_read(monkeypatch):
    """Counts the claims the plain reader reads a line at a time."""
    count = [0]
    made = PlainReader._claim_from

    def counted(self, m):
        found = made(self, m)
        count[0] += found is not None
        return found
    monkeypatch.setattr(PlainReader, "_claim_from", counted)
    return count


def _compare_line_reader(make_text, count, used):
    """Texts from make_text(): where Lark and the plain reader agree (`_same`), the token reader gives
    the same tree; where a line reader (counted in `used`) read a line of a text that went to Lark,
    the plain reader gives up on the whole text, so Lark alone decides. Returns the texts read."""
    read = 0
    for _ in range(count):
        text = make_text()
        before = used[0]
        if _same(text):
            read += 1
            assert _token_by_token(text) == read_plain(text, "certificate"), text
        elif used[0] > before:
            assert read_plain(text, "certificate") is None
    return read


def test_claim_lines_read_at_once_are_the_grammar_s(lines_read):
    """Claims read a line at a time: the trees and positions of Lark and of the token reader."""
    rng = random.Random(151)
    read = _compare_line_reader(lambda: _claims_text(rng, rng.randint(1, 4)), 300, lines_read)
    assert read > 40 and lines_read[0] > 150, (read, lines_read[0])  # the shapes are reached, and read by the line reader


def test_a_long_run_of_claims_is_read_a_line_at_a_time(lines_read):
    text = "".join(f"claim c{i}: dedekind({7 * i + 1}, {10 ** 19 + i}) = -{i}/{i + 1}\n" for i in range(500))
    assert _same(text)
    assert lines_read[0] == 500
    assert read_plain(text, "certificate") == _token_by_token(text)
    crlf = text.replace("\n", "\r\n")
    assert _same(crlf) and read_plain(crlf, "certificate") == _token_by_token(crlf)


@pytest.fixture
def steps_read(monkeypatch):
    """Counts the chain steps the plain reader reads a line at a time."""
    count = [0]
    made = PlainReader._step_on_line

    def counted(self):
        found = made(self)
        count[0] += found is not None
        return found
    monkeypatch.setattr(PlainReader, "_step_on_line", counted)
    return count


def test_derived_chains_are_read_a_line_at_a_time(steps_read):
    """Derived chains of several sizes (up to 450 digits, CRLF too): Lark's trees and positions,
    the token reader's, and every step `= c +|- dedekind(a, b)` read by the line reader (those
    with c = 0 are written without it, and the token reader reads them)."""
    for text in DERIVED:
        for variant in (text, text.replace("\n", "\r\n"), text.replace("    by", "\tby").replace(", ", ",")):
            before = steps_read[0]
            assert _same(variant)
            shaped = sum(1 for line in variant.splitlines() if re.search(r"= -?\d+(/\d+)? [-+] dedekind", line))
            assert steps_read[0] - before == shaped
            assert read_plain(variant, "certificate") == _token_by_token(variant)
    assert steps_read[0] > 3000


def test_chain_steps_read_at_once_are_the_grammar_s(steps_read):
    """Steps of the derived shape and near misses: where the plain reader reads the text, the tree
    and positions are Lark's and the token reader's; where a step read a line at a time is in a
    text for Lark, the plain reader gives up on the whole text."""
    rng = random.Random(154)
    read = _compare_line_reader(lambda: _chain_text(rng, rng.randint(1, 4)), 400, steps_read)
    assert read > 25 and steps_read[0] > 60, (read, steps_read[0])


def test_fuzzed_chains_against_the_token_reader(steps_read):
    rng = random.Random(155)
    plain = 0
    for text in (derive_dedekind(8 ** 20 + 1, 7 ** 30), derive_dedekind(12345678901, 98765432109876)):
        for mutant in _mutants(text, rng, 200):
            if _same(mutant):
                plain += 1
                assert read_plain(mutant, "certificate") == _token_by_token(mutant), mutant
    assert plain > 60 and steps_read[0] > 1000, (plain, steps_read[0])     # mutants read line by line


@pytest.mark.parametrize("limits", [Limits(nesting=2), Limits(nesting=3), Limits(literal_digits=19),
                                    Limits(literal_digits=20), Limits(tokens=150), Limits(tokens=151)],
                         ids=["nesting2", "nesting3", "digits19", "digits20", "tokens150", "tokens151"])
def test_chain_step_budgets_are_lark_s(limits):
    text = ("chain c: dedekind(3, 7)\n  = -1/12345678901234567890 + dedekind(1, 3)    by reciprocity, reduce\n"
            "  = 5 - f(12345678901234567890, 7) by a,b , c\n  = 2/3 + g(0, 1) by r\n  = 1 by value\n")
    _lark_s_verdict(text, limits)


def test_chain_steps_count_tokens_as_the_token_reader_does():
    text = derive_dedekind(12345678901, 98765432109876).replace("    by", " \t by").replace(", reduce", " ,reduce")

    def plain(text, limits):
        return read_plain(text, "certificate", limits)
    fewest = _fewest_tokens(plain, text)
    assert fewest == _fewest_tokens(_token_by_token, text)
    # the plain reader counts ignored tokens that Lark does not: it reads no text that Lark refuses
    lark = _fewest_tokens(lambda t, limits: _lark_or_none(t, limits), text)
    assert lark <= fewest


def _lark_or_none(text, limits):
    try:
        return parse_with_lark(text, "certificate", limits)
    except CertificateError:
        return None


def test_literal_sum_terms_are_the_grammar_s():
    rng = random.Random(152)
    for _ in range(200):
        terms = [rng.choice(["1", "23", "456", "(1)", "2*3", "-4", "x", "7^2", "8 # c\n"]) for _ in range(rng.randint(1, 8))]
        text = "let x = 2\nclaim " + "".join(rng.choice(["+", "-", " + ", "\t- ", "\u2212", "\n+ "]) + t
                                            for t in terms) + rng.choice([" = 1\n", "\n= 1", " * 2 = 1"])
        if _same(text):
            assert read_plain(text, "certificate") == _token_by_token(text)


def test_plain_certificates_are_read_without_lark():
    read = [p.name for p in BUNDLED if _same(p.read_text(encoding="utf-8"))]
    assert {"closed-forms.qcert", "reciprocity-instances.qcert", "three-term-law.qcert"} <= set(read)
    assert all(_same(t) for t in SMALL_DERIVED + DERIVED)


def test_fuzzed_corpus():
    rng = random.Random(15)
    plain = 0
    for text in CORPUS:
        for mutant in _mutants(text, rng, 60):
            plain += _same(mutant)
    assert plain > 300               # the fuzzer reaches texts the plain reader reads


def test_fuzzed_claim_lines_against_the_token_reader():
    rng = random.Random(153)
    plain = 0
    seeds = [t for t in CLAIM_TEXTS if read_plain(t, "certificate") is not None]
    assert len(seeds) >= 2
    for text in seeds:
        for mutant in _mutants(text, rng, 300):
            if _same(mutant):
                plain += 1
                assert read_plain(mutant, "certificate") == _token_by_token(mutant), mutant
    assert plain > 80, plain          # the mutants the plain reader still reads (line by line or not)


def test_fuzzed_expressions():
    rng = random.Random(16)
    seeds = ["dedekind(3, 7)", "-2^-3^2", "(1 + 2)*[3, 4]", "f(x, y')/g()", "1 \u2212 2 \u00b7 3 \u00d7 4",
             "+-+1", "a^b^c", "x*y/z - -w"]
    plain = 0
    for text in seeds:
        for mutant in _mutants(text, rng, 150):
            plain += _same(mutant, "expr")
    assert plain > 200


def _lark_s_verdict(text, limits):
    """The readers agree under these limits, and parse_certificate gives Lark's tree or Lark's
    refusal (message and position)."""
    _same(text, limits=limits)
    try:
        lark = parse_with_lark(text, "certificate", limits)
    except CertificateError as e:
        with pytest.raises(CertificateError) as caught:
            parsing.parse_certificate(text, limits=limits)
        assert (caught.value.message, caught.value.line, caught.value.column) == (e.message, e.line, e.column)
    else:
        assert parsing.parse_certificate(text, limits=limits).statements == tuple(lark)


@pytest.mark.parametrize("limits", [Limits(nesting=3), Limits(tokens=40), Limits(literal_digits=3),
                                    Limits(list_length=1)], ids=["nesting", "tokens", "digits", "list"])
def test_budgets_are_lark_s(limits):
    """Near a budget the plain reader gives up, and Lark's refusal (with its position) stands."""
    texts = ["claim f(g(h(k(1)))) = 1\n", "claim " + " + ".join(["1"] * 30) + " = 30\n",
             "claim 12345 = 12345\n", "claim [1, 2] = [1, 2]\n"]
    for text in texts:
        _lark_s_verdict(text, limits)


@settings(max_examples=300, deadline=None)
@given(st.lists(st.sampled_from(PIECES), max_size=25))
def test_token_soups(pieces):
    text = " ".join(pieces)
    _same(text)
    _same(text, "expr")


@pytest.mark.parametrize("tokens", range(1, 75))
def test_token_budget_at_claim_lines(tokens):
    """Every token budget around the size of a text of one-line claims and literal sums: the
    plain reader gives the grammar's tree or gives up, and the refusal is Lark's."""
    text = ("claim a: dedekind(1, 5) = 0\nclaim b: f(-2, 3,4) <= -1/3\nclaim b2:dedekind( 1,7 )=1/2\n"
            "claim 1 + 2 + 3 - 4 = 2\n")
    limits = Limits(tokens=tokens)
    _lark_s_verdict(text, limits)


def _fewest_tokens(read, text):
    """The smallest token budget at which `read` reads the text."""
    low, high = 1, 10 * len(text)
    while low < high:
        middle = (low + high) // 2
        low, high = (low, middle) if read(text, Limits(tokens=middle)) is not None else (middle + 1, high)
    return low


def test_the_line_readers_count_tokens_as_the_token_reader_does():
    """A long sum and a run of claims need the budget the token reader needs, no more (an
    overcount once sent the one-megabyte line 1+1+...+1 to Lark); for the sum that is the
    budget Lark needs too, and one fewer is Lark's refusal."""
    terms = "claim " + "+".join(["1"] * 1000) + " = 1000\n"
    claims = "".join(f"claim c{i}: dedekind({i}, 7)\t= -{i} / 12\n" for i in range(20)) + "claim 1 + 2 - 3 = 0\n"

    def plain(text, limits):
        return read_plain(text, "certificate", limits)
    for text in (terms, claims):
        assert _fewest_tokens(plain, text) == _fewest_tokens(_token_by_token, text)
    assert _fewest_tokens(plain, terms) == 2006          # claim, 1999, =, 1000 and 4 runs of blanks
    parse_with_lark(terms, "certificate", Limits(tokens=2006))
    with pytest.raises(CertificateError, match="more than 2005 tokens"):
        parse_with_lark(terms, "certificate", Limits(tokens=2005))


@pytest.mark.parametrize("limits", [Limits(nesting=1), Limits(nesting=2), Limits(literal_digits=2),
                                    Limits(literal_digits=20)], ids=["nesting1", "nesting2", "digits2", "digits20"])
def test_claim_line_budgets_are_lark_s(limits):
    text = ("claim c: dedekind(-12345678901234567890, 7) = -1/12\nclaim d: f(1, 2, -3, 4) = 5/6\n"
            "claim 1 + 22 + 333 = 356\n")
    _lark_s_verdict(text, limits)


def test_long_line_and_deep_nesting():
    line = "claim " + "+".join(["1"] * 20_000) + " = 20000\n"
    assert _same(line)
    deep = "claim " + "(" * 150 + "1" + ")" * 150 + " = 1\n"
    _same(deep)                      # too deep for recursion here: Lark reads it
    nested = "claim " + "-" * 190 + "1 = 1\n"
    _same(nested)


_BLANK = st.sampled_from(["", " ", "\t", "  ", " ", "", "\f", "\r"])


def _mostly(good, misses):
    """Mostly one of `good` (the derived shape), sometimes a near miss."""
    return st.sampled_from(good * 6 + misses)


_STEP = st.tuples(_mostly(["", "-", "\u2212"], ["+", "--"]), st.from_regex(r"[0-9]{1,25}", fullmatch=True),
                  _mostly(["", "/7", "/12345678901234567890"], ["/ 0", "/-2", "*3", "/"]),
                  _mostly(["+", "-", "\u2212"], ["", "*", "+-"]),
                  _mostly(["dedekind", "f'", "x1"], ["by", "claim", "lemma", "sum", "1"]),
                  _mostly(["3, 7", "0,1", "12345678901234567890, 7"], ["-3, 7", "3", "", "3, 7, 9", "3 7"]),
                  _mostly(["by"], ["bye", "By", "", "b y"]),
                  _mostly(["reduce", "reciprocity, reduce", "a ,b,c", "r'"], ["claim x", "reduce,", "mod", "lemma f()"]),
                  _BLANK, _BLANK, _mostly(["\n"], ["\r\n", " # c\n", "\n, reduce\n", "\n/ 2\n", "", "\n(1)\n"]))


@settings(max_examples=300, deadline=None)
@given(st.lists(_STEP, min_size=1, max_size=4))
def test_chain_steps_against_the_token_reader(steps):
    """Generated steps of the derived shape and its neighbours: the one-line reader gives the token
    reader's tree (with positions), and both Lark's; near a miss, the token reader decides."""
    text = "chain c: dedekind(3, 7)\n"
    for sign, p, q, op, name, args, by, rules, b1, b2, end in steps:
        text += f"  ={b1}{sign}{p}{q}{b2}{op} {name}({args}){b1}{by} {b2}{rules}{end}"
    if _same(text):
        assert read_plain(text, "certificate") == _token_by_token(text), text
