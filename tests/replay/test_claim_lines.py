"""Many one-line claims: a wrong one among 10,000 right ones is reported at its place, with the
claimed and the right value, and the quick comparison with a literal p/q (cross-multiplication,
no gcd) says what the comparison of two Fractions says.  Right values from python-flint's
fmpq.dedekind_sum (an outside reference)."""
from __future__ import annotations

import gc
import random
from fractions import Fraction

import flint
import pytest
from hypothesis import given, strategies as st

from checker import check_text
from checker.kernel.verdicts import compare, compare_to_quotient
from checker.replay import checking

RELATIONS = ["=", "!=", "<", "<=", ">", ">="]


def _flint_dedekind(h: int, k: int) -> Fraction:
    s = flint.fmpq.dedekind_sum(h, k)                   # python-flint
    return Fraction(int(s.p), int(s.q))


def _text(v: Fraction) -> str:
    return str(v.numerator) if v.denominator == 1 else f"{v.numerator}/{v.denominator}"


def _claims(count: int, seed: int) -> tuple[list[str], list[tuple[int, int]]]:
    rng = random.Random(seed)
    pairs = []
    for _ in range(count):
        k = rng.randint(10**19, 10**20)
        pairs.append((rng.randint(1, k), k))
    return [f"claim c{i}: dedekind({h}, {k}) = {_text(_flint_dedekind(h, k))}"
            for i, (h, k) in enumerate(pairs)], pairs


def test_a_wrong_claim_among_10000_right_ones_is_reported_at_its_line_and_column():
    lines, pairs = _claims(10_000, 1)
    wrong = 6_123
    h, k = pairs[wrong]
    right = _flint_dedekind(h, k)
    claimed = right + Fraction(1, k)                 # off by 1/k: same size, a different value
    lines[wrong] = f"claim c{wrong}: dedekind({h}, {k}) = {_text(claimed)}"
    report = check_text("\n".join(lines) + "\n")
    assert not report.ok and report.checked == wrong
    f = report.failure
    column = lines[wrong].index(" = ") + 4
    assert (f.line, f.column, f.end_column) == (wrong + 1, column, len(lines[wrong]) + 1)
    assert f.kind == "failed" and f.message == f"claim 'c{wrong}' is false: the two sides differ"
    assert (f.claimed, f.exact) == (claimed, right)
    assert f.details == [f"left side:  {_text(right)}", f"right side: {_text(claimed)}   (claimed)",
                         f"difference (right - left): {_text(claimed - right)}"]


def test_the_first_wrong_claim_is_the_one_reported_and_keep_going_reports_all_in_order():
    lines, pairs = _claims(2_000, 2)
    for i in (1_500, 40, 900):
        h, k = pairs[i]
        lines[i] = f"claim c{i}: dedekind({h}, {k}) = -{_text(_flint_dedekind(h, k))}"
    text = "\n".join(lines) + "\n"
    first = check_text(text)
    assert [f.line for f in first.failures] == [41] and first.checked == 40
    every = check_text(text, keep_going=True)
    assert [f.line for f in every.failures] == [41, 901, 1501] and every.checked == 2_000 - 3
    for f, i in zip(every.failures, (40, 900, 1500)):
        assert f.exact == _flint_dedekind(*pairs[i]) and f.claimed == -f.exact != 0


def _generic(monkeypatch):
    """The replay without the quick comparison with p/q: both sides evaluated as Fractions."""
    monkeypatch.setattr(checking, "_literal_quotient", lambda node, bits: None)


def _summary(report):
    return report.checked, [(f.line, f.column, f.end_column, f.kind, f.message, f.details, f.claimed,
                             f.exact, f.exit_code) for f in report.failures]


def _random_claims(rng, count):
    out = []
    for i in range(count):
        h, k = rng.randint(-50, 50), rng.choice([rng.randint(1, 60), 0, -3])
        lhs = rng.choice([f"dedekind({h}, {k})", f"dedekind({h}, {k}) * 12", f"[{h}]", f"{h}/7", f"nothing({h})",
                          f"dedekind({h})", f"generalized_dedekind(3, {h}, {abs(k) + 1})"])
        value = Fraction(rng.randint(-30, 30), rng.randint(1, 40))
        rhs = rng.choice([_text(value), f"{value.numerator}/0", f"-{abs(value.numerator)}/{value.denominator}",
                          f"{value.numerator}/{value.denominator * 2}", "0", "-0", f"{2**70}/3",
                          f"-{value.denominator}", f"{value.numerator} / {value.denominator}"])
        label = rng.choice(["", f"c{i}: ", f"c{i % 5}: "])
        out.append(f"claim {label}{lhs} {rng.choice(RELATIONS)} {rhs}")
    return "\n".join(out) + "\n"


@pytest.mark.parametrize("seed", range(6))
def test_the_quick_comparison_reports_what_the_general_one_reports(seed, monkeypatch):
    """Right, wrong and refused claims, with every relation: the same verdicts, failures,
    positions, words and values with and without the quick comparison."""
    rng = random.Random(seed)
    texts = [_random_claims(rng, 40) for _ in range(5)]
    variants = [dict(keep_going=True), dict(keep_going=True, paranoid=True), dict(keep_going=False)]
    from checker.foundation.limits import Limits
    variants.append(dict(keep_going=True, limits=Limits(integer_bits=40)))
    quick = [_summary(check_text(t, **v)) for t in texts for v in variants]
    _generic(monkeypatch)
    assert quick == [_summary(check_text(t, **v)) for t in texts for v in variants]


@given(st.fractions(), st.sampled_from(RELATIONS), st.integers(-10**30, 10**30), st.integers(1, 10**30))
def test_compare_to_quotient_is_the_comparison_of_fractions(lhs, relation, p, q):
    assert compare_to_quotient(lhs, relation, p, q) == compare(lhs, relation, Fraction(p, q))


@given(st.fractions(), st.sampled_from(RELATIONS), st.integers(1, 10**6), st.integers(1, 10**6))
def test_compare_to_quotient_with_an_unreduced_quotient(lhs, relation, g, q):
    p = lhs.numerator * g * q
    assert compare_to_quotient(lhs, relation, p, lhs.denominator * g * q) == compare(lhs, relation, lhs)


def test_compare_to_quotient_refuses_a_denominator_that_is_not_positive():
    for q in (0, -2):
        with pytest.raises(ValueError):
            compare_to_quotient(Fraction(1, 2), "=", -1, q)


def test_the_collector_is_left_as_it_was(tmp_path):
    """The replay keeps the cycle collector off the parsed trees; afterwards it is as before."""
    lib = tmp_path / "lib.qcert"
    lib.write_text("lemma one(k) for k >= 1: k/k = 1\n  chain k/k\n    = 1 by arithmetic\nend\n", encoding="utf-8")
    user = tmp_path / "user.qcert"
    user.write_text('use "lib.qcert"\nclaim dedekind(1, 3) = 1/18\n', encoding="utf-8")
    texts = ["claim c: dedekind(1, 3) = 1/18\n", "claim c: dedekind(1, 3) = 1/17\n", "claim c: (\n"]
    assert gc.isenabled() and gc.get_freeze_count() == 0
    for text in texts:
        check_text(text)
        assert gc.isenabled() and gc.get_freeze_count() == 0
    assert checking.check_file(user).ok
    assert gc.isenabled() and gc.get_freeze_count() == 0
    gc.disable()
    try:
        check_text(texts[0])
        assert not gc.isenabled() and gc.get_freeze_count() == 0
    finally:
        gc.enable()
    gc.freeze()                       # somebody else's objects set aside stay so
    try:
        frozen = gc.get_freeze_count()
        check_text(texts[1])
        assert gc.get_freeze_count() > frozen // 2 and gc.isenabled()      # not unfrozen (some may be freed)
    finally:
        gc.unfreeze()
