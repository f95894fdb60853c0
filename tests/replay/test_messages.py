"""Messages that carry the fix: each refusal a new user meets names what to write instead.

The texts asserted here are quasicert's own wording (common practice: a test pins the words a
person reads); the mathematics behind each case is named where it matters.
"""
from __future__ import annotations

import io
import json

import pytest

from checker import check_text
from checker.foundation.numbers import int_text
from checker.interfaces.cli import main
from checker.replay.report import render_report


def failure(text):
    report = check_text(text)
    assert not report.ok, "expected a refusal"
    return report.failures[0]


# -- old spellings: refused, naming the new one -------------------------------------------------

def test_given_is_refused_with_the_new_header():
    f = failure("lemma one(k):\n  given k >= 1\n  then dedekind(1, k) = (k - 1)*(k - 2)/(12*k)\nend\n")
    assert f.kind == "syntax error" and (f.line, f.column) == (2, 3)
    assert f.message == ("`given` is no longer a word of the language: write the assumptions after the "
                         "parameters, as in `lemma NAME(k) for k >= 1, k == 1 mod 2: A = B`, then the "
                         "chains and `end`")


def test_then_is_refused_with_the_new_header():
    f = failure("lemma one(k):\n  then dedekind(1, k) = (k - 1)*(k - 2)/(12*k)\nend\n")
    assert (f.line, f.column) == (2, 3)
    assert f.message.startswith("`then` is no longer a word of the language: the statement follows the colon")


def test_old_finite_sum_is_refused_with_the_new_spelling():
    f = failure("claim sum(j = 0 .. 16, sawtooth(j/17) * sawtooth(5*j/17)) = 1/17\n")
    assert (f.line, f.column) == (1, 7)
    assert f.message == "a finite sum is written total(j from A to B: BODY), not sum(j = A .. B, BODY)"
    # s(5, 17) = 1/17 (Rademacher & Grosswald, Dedekind Sums (1972), table; from memory), by its definition
    assert check_text("claim total(j from 0 to 16: sawtooth(j/17) * sawtooth(5*j/17)) = 1/17\n").ok


def test_unfold_is_refused_with_definition():
    f = failure("chain dedekind(1, 3)\n  = total(j from 0 to 2: sawtooth(j/3)^2) by unfold\n")
    assert f.message == "step 1 of the chain at line 1: the rule 'unfold' is now called definition: write `by definition`"
    assert check_text("chain dedekind(1, 3)\n  = total(j from 0 to 2: sawtooth(j/3)^2) by definition\n").ok


def test_floor_sum_is_refused_with_staircase():
    f = failure("claim floor_sum(10, 3, 0, 4) = 30\n")
    assert f.message == "the function floor_sum is now called staircase (same arguments)"
    # 0 + 0 + 1 + 2 + 3 + 3 + 4 + 5 + 6 + 6 = 30 (by hand: floor(3i/4) for i = 0..9)
    assert check_text("claim staircase(10, 3, 0, 4) = 30\n").ok


def test_old_limit_name_is_refused_with_the_new_one():
    err = io.StringIO()
    assert main(["eval", "--limit", "unfold-terms=5", "1"], out=io.StringIO(), err=err) == 2
    assert "the limit unfold-terms is now called definition-terms: write --limit definition-terms=N" in err.getvalue()


# -- syntax errors in our own words ---------------------------------------------------------------

def test_missing_by_names_the_word():
    f = failure("chain dedekind(5, 17)\n  = dedekind(5, 17) by reduce\n  = 1/17\n")
    assert (f.line, f.column) == (3, 9)         # just after the line that lacks it
    assert f.message == ("this step lacks `by` and the rule that gives it: a step reads `= EXPR by RULE` "
                         "(for example `= 1/17 by value`)")


def test_congruence_without_mod_names_the_word():
    f = failure("claim 17 == 2\nclaim 1 = 1\n")
    assert (f.line, f.column) == (1, 14)
    assert f.message == ("`==` states a congruence, which needs `mod M` after its right side (`A == B mod M`, "
                         "or `A ≡ B (mod M)`); an equality is written with one `=`")


def test_unexpected_token_is_worded_without_a_parser_generators_phrases():
    f = failure("claim [1, 2 = 3]\n")
    assert f.message == "'=' cannot come here: the text needs ',' or ']' at this place"
    assert "unexpected" not in f.message and "expected" not in f.message


def test_long_alternatives_are_told_by_kind():
    f = failure("claim 1 1\n")
    assert f.message == ("'1' cannot come here: the text needs a relation (= < <= > >= !=), an operator "
                         "(+ - * / ^) or '==' at this place")


# -- congruences in the usual notation ----------------------------------------------------------

def test_mod_in_parentheses_in_claims():
    assert check_text("claim 7 ≡ 1 (mod 3)\nlet k = 10\nclaim k ≡ 1 (mod 3)\nclaim 7 == 1 (mod 3)\n").ok
    f = failure("claim 7 ≡ 2 (mod 3)\n")
    assert "the sides are not congruent modulo 3" in f.message


def test_mod_in_parentheses_in_lemma_assumptions():
    # s(2, k) = (k - 1)(k - 5)/(24k) for odd k (Rademacher & Grosswald, Dedekind Sums (1972), ch. 3)
    text = ("lemma two_odd(k) for k >= 1, k ≡ 1 (mod 2):\n  dedekind(2, k) = (k - 1)*(k - 5)/(24*k)\n"
            "  chain dedekind(2, k)\n"
            "    = (2/k + k/2 + 1/(2*k))/12 - 1/4 - dedekind(k, 2)   by reciprocity\n"
            "    = (2/k + k/2 + 1/(2*k))/12 - 1/4 - dedekind(1, 2)   by reduce\n"
            "    = (k - 1)*(k - 5)/(24*k)                            by value\nend\n")
    assert check_text(text).ok


def test_a_modulus_after_an_equality_says_to_write_a_congruence():
    f = failure("claim 7 = 1 (mod 3)\n")
    assert f.message == ("a modulus belongs to a congruence, written `A == B mod M` or `A ≡ B (mod M)`; "
                         "with `=` the claim is an equality")
    assert (f.line, f.column) == (1, 13)


def test_a_call_of_mod_is_not_taken_for_the_notation():
    assert check_text("claim gcd(mod (7, 3), 2) = 1\nclaim 5 == mod(8, 3) mod 3\n").ok


# -- suggestions --------------------------------------------------------------------------------

@pytest.mark.parametrize("call, written, meant", [
    ("s(5, 17)", "s(h, k)", "dedekind(h, k)"),
    ("s_p(3, 1, 7)", "s_p(h, k)", "generalized_dedekind(p, h, k)"),
    ("p_A(10, [1, 2])", "p_A(n)", "partitions(n, A)"),
])
def test_literature_names_suggest_the_function(call, written, meant):
    f = failure(f"claim {call} = 0\n")
    assert f.message == f"unknown function '{call.split('(')[0]}': for {written} write {meant}; `quasicert functions` lists them"


def test_algebra_suggests_arithmetic():
    f = failure("chain (1 + 2)*3\n  = 9 by algebra\n")
    assert f.message == "step 1 of the chain at line 1: unknown rule 'algebra' (did you mean arithmetic?)"


def test_use_suggests_the_bundled_name():
    f = failure('use "dedekind_lemmas"\n')
    assert '(did you mean "dedekind-lemmas"?)' in f.message
    f = failure('use "dedekind-lemma"\n')
    assert f.message.startswith("there is no bundled certificate 'dedekind-lemma' (did you mean \"dedekind-lemmas\"?)")


def test_right_value_wrong_rule_suggests_the_rules_that_give_the_line():
    # s(5, 17) = -1/4 + (5/17 + 17/5 + 1/85)/12 - s(17, 5) (Dedekind reciprocity), and s(17, 5) = s(2, 5)
    f = failure("chain dedekind(5, 17)\n  = -1/4 + (5/17 + 17/5 + 1/85)/12 - dedekind(2, 5)    by reciprocity\n")
    assert "value check: passed (both lines are 1/17)" in f.details
    assert f.details[-1] == "this line does follow by reciprocity, reduce"
    # 4 * 2 = 1 (mod 7): s(4, 7) = s(2, 7) by inverse (Rademacher & Grosswald, ch. 3)
    f = failure("chain dedekind(4, 7)\n  = dedekind(2, 7)    by reduce\n")
    assert f.details[-1] == "this line does follow by inverse"


def test_suggestions_stop_when_the_time_is_up(monkeypatch):
    # the search for a better rule tries dozens of rule lists; once the check is out of time it
    # reports the failed step as it is (it used to swallow the timeout and try every list)
    from checker.foundation.errors import OutOfTime
    from checker.replay import checking
    real, calls = checking.check_step, []
    def step(*args, **kwargs):
        calls.append(args[2])
        if len(calls) > 1:
            raise OutOfTime("out of time")
        return real(*args, **kwargs)
    monkeypatch.setattr(checking, "check_step", step)
    f = failure("chain dedekind(4, 7)\n  = dedekind(2, 7)    by reduce\n")
    assert f.message.endswith("does not follow by reduce") and len(calls) == 2
    assert not any(d.startswith("this line does follow") for d in f.details)


def test_no_suggestion_when_the_value_is_wrong():
    # s(1, 5) = 1/5 while s(2, 5) = 0 (closed form s(1, k) = (k - 1)(k - 2)/(12k); s(2, 5) by hand)
    f = failure("chain dedekind(5, 17)\n  = -1/4 + (5/17 + 17/5 + 1/85)/12 - dedekind(1, 5)    by reciprocity\n")
    assert "value check: failed too" in f.details
    assert not any("does follow by" in d for d in f.details)


def test_unfixed_mod_suggests_a_split():
    f = failure("lemma any(k) for k >= 1:\n  dedekind(3, k) = dedekind(3, k)\n"
                "  chain dedekind(3, k) + mod(k, 3) = dedekind(3, k) + mod(k, 3) by arithmetic\nend\n")
    assert f.message == ("mod(k, 3) is not fixed by the assumptions; to fix it, split the proof by the "
                         "residue of k: `split k mod 3`, then `residue 0:`, `residue 1:`, `residue 2:` each "
                         "with its chain (classes the assumptions exclude are left out)")


def test_a_cited_lemma_with_mod_is_used_where_the_residue_is_fixed():
    # two_over_k states s(2, k) with mod(k, 2); for odd k that is the closed form of two_over_odd
    text = ('use "dedekind-lemmas"\n'
            "lemma odd_again(k) for k >= 1, k ≡ 1 (mod 2):\n  dedekind(2, k) = (k - 1)*(k - 5)/(24*k)\n"
            "  chain dedekind(2, k)\n    = (k - 1)*(k - 5)/(24*k)   by lemma two_over_k(k)\nend\n")
    assert check_text(text).ok
    f = failure(text.replace(", k ≡ 1 (mod 2)", ""))
    assert "mod(k, 2) is not fixed by the assumptions" in f.message


def test_identity_that_depends_on_n_points_to_lemma():
    f = failure("identity for n >= 1: dedekind(1, n) = (n - 1)*(n - 2)/(12*n)\n")
    assert f.message == ("the second argument of dedekind must not depend on n in an identity, which needs a "
                         "quasi-polynomial in n; a closed form for every n is proved with a lemma instead: "
                         "lemma NAME(n) for n >= 1: A = B, then its chains and `end`")


def test_wrong_lemma_step_shows_what_the_lemma_says():
    # s(1, 10) = 9*8/120 = 3/5 (closed form s(1, k) = (k - 1)(k - 2)/(12k), Rademacher & Grosswald, ch. 3)
    f = failure('use "dedekind-lemmas"\nchain dedekind(1, 10) = 71/120 by lemma one_over_k(10)\n')
    assert f.message == "step 1 of the chain at line 2 does not follow by lemma one_over_k"
    assert f.details[0] == "lemma one_over_k(10) says: dedekind(1, 10) = 3/5"
    assert f.details[1].endswith("of lemma one_over_k") and "claim" not in f.details[1]


def test_wrong_symbolic_lemma_step_shows_what_the_lemma_says():
    f = failure('use "dedekind-lemmas"\nlemma x(k) for k >= 1:\n  dedekind(1, k) = (k - 1)*(k - 2)/(12*k)\n'
                "  chain dedekind(1, k) = (k - 1)*(k - 2)/(12*k) + 1 by lemma one_over_k(k)\nend\n")
    assert f.details[0] == "lemma one_over_k(k) says: dedekind(1, k) = (k^2 - 3*k + 2)/(12*k)"


def test_wrong_claimed_period_marks_the_side_it_names():
    # floor(n/2) has period 2 and degree 1, not period 3 (common practice)
    text = "identity for n >= 0, period 3: floor(n/2) = floor(n/2)\n"
    f = failure(text)
    assert f.message.startswith("the identity: the left side does not have period 3 and degree <= 1")
    assert (f.column, f.end_column) == (32, 42)          # floor(n/2) on the left, not the right
    assert text[f.column - 1:f.end_column - 1] == "floor(n/2)" and text.index("floor") == 31


# -- the command line -----------------------------------------------------------------------------

def test_eval_errors_name_the_argument_and_column():
    err = io.StringIO()
    assert main(["eval", "1", "2", "3", "dedekind(1,"], out=io.StringIO(), err=err) == 2
    assert err.getvalue().splitlines()[0] == ("argument 4, column 12: syntax error: the text stops too early: "
                                              "it still needs an expression")


def test_eval_does_not_suggest_let():
    err = io.StringIO()
    main(["eval", "k + 1"], out=io.StringIO(), err=err)
    assert err.getvalue().splitlines()[0] == ("argument 1, column 1: error: unknown name 'k': an expression on "
                                              "the command line has numbers, lists and function calls, no names")


def test_derive_of_a_file_says_it_takes_an_expression(tmp_path):
    path = tmp_path / "mine.qcert"
    path.write_text("claim 1 = 1\n")
    err = io.StringIO()
    assert main(["derive", str(path)], out=io.StringIO(), err=err) == 2
    assert (f'derive takes an expression such as "dedekind(5, 17)", not a file: it writes a certificate; '
            f"to check one, run quasicert check {path}") in err.getvalue()


def test_derive_with_a_name_points_to_lemmas_not_let():
    err = io.StringIO()
    assert main(["derive", "dedekind(3, k)"], out=io.StringIO(), err=err) == 2
    first = err.getvalue().splitlines()[0]
    assert first == ("the expression, column 13: error: derive needs numbers here, and 'k' is a name: derive "
                     "dedekind at numbers (e.g. quasicert derive \"dedekind(5, 17)\"); a statement for every "
                     "k is written as a lemma, as in certificates/dedekind-lemmas.qcert")
    assert "let" not in err.getvalue()


# -- long numbers --------------------------------------------------------------------------------

def test_long_numbers_are_abbreviated_in_text_but_not_in_json(tmp_path):
    text = "claim 7^13000 = 7^13000 + 1\n"
    report = check_text(text, name="big.qcert")
    shown = render_report(report)
    digits = int_text(7 ** 13000)
    assert f"left side:  {digits[:20]}...{digits[-20:]} ({len(digits):,} digits)" in shown
    assert max(len(line) for line in shown.splitlines()) < 200
    path = tmp_path / "big.qcert"
    path.write_text(text)
    out = io.StringIO()
    main(["check", "--format", "json", str(path)], out=out, err=io.StringIO())
    data = json.loads(out.getvalue())
    record = data[0] if isinstance(data, list) else data
    failure_record = (record.get("failures") or record["certificates"][0]["failures"])[0]
    assert failure_record["exact"] == digits
