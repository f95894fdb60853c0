"""Every rule both ways: valid instances are accepted (and keep the exact value),
invalid ones are refused with the side condition that failed."""
from fractions import Fraction
from math import gcd

import pytest
from hypothesis import assume, given, strategies as st

from checker import check_text
from checker.mathematics.dedekind import dedekind, reciprocity_term
from checker.foundation.errors import RuleRefused
from checker.kernel.evaluation import Evaluator
from checker.kernel.verdicts import nf_value
from checker.foundation.limits import DEFAULT_LIMITS
from checker.kernel.normal import text as nf_text
from checker.kernel.rules import RULES

F = Fraction
small = st.integers(-200, 200)
positive = st.integers(1, 200)


def rewrite(rule, atom, target=()):
    return RULES[rule].rewrite(atom, set(target), DEFAULT_LIMITS)


def value(nf):
    return nf_value(nf, Evaluator().call)


def refusal(rule, atom, target=()):
    with pytest.raises(RuleRefused) as info:
        rewrite(rule, atom, target)
    return info.value.message


def chain(start, line, rules):
    return check_text(f"chain {start}\n  = {line}    by {rules}\n")


# -- valid instances keep the exact value -------------------------------------

@given(small, positive)
def test_reduce_keeps_value(h, k):
    assume(not 0 <= h < k)
    (r,) = rewrite("reduce", ("dedekind", (F(h), F(k))))
    assert value(r) == dedekind(h, k)     # definition: s depends on h mod k only
    assert chain(f"dedekind({h}, {k})", f"dedekind({h % k}, {k})", "reduce").ok


@given(positive, positive)
def test_reciprocity_keeps_value(h, k):
    assume(gcd(h, k) == 1)
    (r,) = rewrite("reciprocity", ("dedekind", (F(h), F(k))))
    assert value(r) == dedekind(h, k)     # Dedekind reciprocity
    assert chain(f"dedekind({h}, {k})", f"{reciprocity_term(h, k)} - dedekind({k}, {h})", "reciprocity").ok


@given(small, positive)
def test_negate_keeps_value(h, k):
    (r,) = rewrite("negate", ("dedekind", (F(h), F(k))))
    assert value(r) == dedekind(h, k)
    assert chain(f"dedekind({h}, {k})", f"-dedekind({-h}, {k})", "negate").ok


@given(small, st.integers(2, 200), st.integers(-3, 3))
def test_inverse_keeps_value(h, k, shift):
    assume(gcd(h, k) == 1)
    inv = pow(h, -1, k) + shift * k
    assert chain(f"dedekind({h}, {k})", f"dedekind({inv}, {k})", "inverse").ok


@given(small, positive, st.integers(2, 9))
def test_common_factor_both_directions(h, k, g):
    assert chain(f"dedekind({g * h}, {g * k})", f"dedekind({h}, {k})", "common_factor").ok
    assert chain(f"dedekind({h}, {k})", f"dedekind({g * h}, {g * k})", "common_factor").ok


# pairwise coprime triples, drawn directly (filtering three random integers trips Hypothesis's
# health check now and then)
_TRIPLES = [(a, b, c) for a in range(1, 41) for b in range(1, 41) for c in range(1, 41)
            if gcd(a, b) == gcd(b, c) == gcd(a, c) == 1]


@given(st.sampled_from(_TRIPLES))
def test_three_term_keeps_value(triple):
    a, b, c = triple
    x = b * pow(c, -1, a) % a if a > 1 else 0
    y = c * pow(a, -1, b) % b if b > 1 else 0
    z = a * pow(b, -1, c) % c if c > 1 else 0
    assume(len({(x, a), (y, b), (z, c)}) == 3)
    rhs = F(-1, 4) + F(a * a + b * b + c * c, 12 * a * b * c)
    report = chain(f"dedekind({x}, {a})", f"{rhs} - dedekind({y}, {b}) - dedekind({z}, {c})", "three_term")
    assert report.ok, report.failure.details


@given(small, st.integers(1, 60))
def test_definition_keeps_value(h, k):
    (r,) = rewrite("definition", ("dedekind", (F(h), F(k))))
    assert value(r) == dedekind(h, k)


@given(st.sampled_from([1, 3, 5]), st.integers(1, 15), st.integers(1, 15))
def test_apostol_reciprocity_keeps_value(p, h, k):
    assume(gcd(h, k) == 1)
    from checker.mathematics.dedekind import generalized_dedekind
    (r,) = rewrite("reciprocity", ("generalized_dedekind", (F(p), F(h), F(k))))
    assert value(r) == generalized_dedekind(p, h, k)


@given(st.integers(-50, 50), st.lists(st.integers(-30, 30), min_size=0, max_size=3), st.integers(1, 12))
def test_reduce_fourier_dedekind_keeps_value(n, parts, b):
    assume(all(gcd(a, b) == 1 for a in parts))
    from checker.mathematics.fourier_dedekind import fourier_dedekind
    atom = ("fourier_dedekind", (F(n), tuple(F(a) for a in parts), F(b)))
    (r,) = rewrite("reduce", atom)
    assert value(r) == fourier_dedekind(n, parts, b)


# -- invalid instances are refused with the reason ----------------------------

@given(positive, positive)
def test_reciprocity_refuses_non_coprime(h, k):
    g = gcd(h, k)
    assume(g > 1)
    assert refusal("reciprocity", ("dedekind", (F(h), F(k)))) == \
        f"reciprocity needs coprime h and k, but gcd({h}, {k}) = {g}"


@given(st.integers(-200, 0), positive)
def test_reciprocity_refuses_non_positive(h, k):
    assert refusal("reciprocity", ("dedekind", (F(h), F(k)))) == \
        f"reciprocity needs h >= 1 and k >= 1, but h = {h} (use reduce or negate first)"


def test_reciprocity_refuses_even_apostol_order():
    assert refusal("reciprocity", ("generalized_dedekind", (F(2), F(3), F(5)))) == \
        "Apostol's reciprocity needs an odd order p >= 1, not 2"


@given(small, st.integers(2, 200))
def test_inverse_refuses_non_coprime(h, k):
    g = gcd(h, k)
    assume(g > 1)
    assert refusal("inverse", ("dedekind", (F(h), F(k)))) == f"inverse needs h coprime to k, but gcd({h}, {k}) = {g}"


@given(st.integers(0, 100), st.integers(2, 100))
def test_reduce_refuses_an_unreduced_target(h, k):
    h %= k
    msg = refusal("reduce", ("dedekind", (F(h), F(k))), [("dedekind", (F(h + 1), F(k)))])
    assert msg.startswith(f"dedekind({h}, {k}) is already reduced")


def test_common_factor_refuses_without_factor():
    assert refusal("common_factor", ("dedekind", (F(5), F(17)))).startswith(
        "dedekind(5, 17) has no common factor to cancel")


def test_three_term_refuses_non_coprime_triples():
    target = [("dedekind", (F(1), F(4))), ("dedekind", (F(1), F(6)))]
    msg = refusal("three_term", ("dedekind", (F(1), F(5))), target)
    assert msg == "the three-term law needs pairwise coprime a, b, c, but gcd(4, 6) = 2"


def test_three_term_refuses_with_only_one_companion():
    # found by the operator/rule mutation test: one other sum used to crash the rule
    msg = refusal("three_term", ("dedekind", (F(3), F(5))), [("dedekind", (F(6), F(7)))])
    assert msg.endswith("but the next line has no two other dedekind sums")


def test_three_term_refuses_wrong_first_argument():
    target = [("dedekind", (F(5), F(7))), ("dedekind", (F(2), F(9)))]
    msg = refusal("three_term", ("dedekind", (F(3), F(5))), target)
    assert msg == "with a, b, c = 5, 7, 9 the law needs s(c a*, b) with first argument = 6 (mod 7), not 5"


def test_definition_refuses_over_budget():
    from checker.foundation.errors import BudgetExceeded
    with pytest.raises(BudgetExceeded) as info:
        rewrite("definition", ("dedekind", (F(1), F(10**6))))
    assert info.value.message.startswith("writing dedekind(h, 1000000) out by its definition needs 1000000 terms, over the limit definition-terms")


def test_rules_refuse_wrong_functions_and_non_integers():
    assert refusal("reciprocity", ("bernoulli", (F(2),))) == "it does not apply to bernoulli"
    assert refusal("reduce", ("dedekind", (F(1, 2), F(3)))) == "dedekind needs an integer h, not 1/2"
    assert refusal("negate", ("dedekind", (F(1), F(0)))) == "dedekind(h, k) needs k >= 1, not 0"


# -- wrong targets and wrong constants ---------------------------------------

@given(positive, positive, st.integers(1, 50))
def test_reciprocity_with_a_wrong_constant_fails_the_step(h, k, delta):
    assume(gcd(h, k) == 1)
    wrong = reciprocity_term(h, k) + F(delta, 7)
    report = chain(f"dedekind({h}, {k})", f"{wrong} - dedekind({k}, {h})", "reciprocity")
    assert not report.ok
    assert "value check: failed too" in report.failure.details
    assert report.failure.details[0] == f"reciprocity gives: {nf_text(rewrite('reciprocity', ('dedekind', (F(h), F(k))))[0])}"


@given(positive, st.integers(2, 100))
def test_reduce_to_a_wrong_residue_fails_the_step(h, k):
    report = chain(f"dedekind({h + k}, {k})", f"dedekind({(h + 1) % k + k * 3}, {k})", "reduce")
    assume((h + 1 - h) % k)
    assert not report.ok


# -- descent -------------------------------------------------------------------

def _expanded(h, k, steps):
    """The line that `reciprocity, reduce` cited `steps` times in a row gives from s(h, k)."""
    from checker.kernel.verdicts import check_step
    from checker.kernel.normal import atom_nf
    start = atom_nf(("dedekind", (F(h), F(k))))
    a, b = h, k
    for _ in range(steps):
        a, b = b % a, a
    target = atom_nf(("dedekind", (F(a), F(b))))
    verdict = check_step(start, target, [("reciprocity", None), ("reduce", None)] * steps,
                         None, {}, DEFAULT_LIMITS)
    (line,) = verdict.candidates
    return line, (a, b)


@given(st.integers(2, 10 ** 12).flatmap(lambda k: st.tuples(st.integers(1, k - 1), st.just(k))),
       st.integers(1, 12))
def test_descent_is_reciprocity_and_reduce_repeated(pair, steps):
    # h < k: from h >= k on, the first step is reciprocity alone (s(k, h) is already reduced)
    h, k = pair
    assume(gcd(h, k) == 1)
    a, b, walk = h, k, 0
    while a and walk < steps:
        a, b, walk = b % a, a, walk + 1
    line, pair = _expanded(h, k, walk)
    target = {("dedekind", (F(pair[0]), F(pair[1])))}
    (got,) = rewrite("descent", ("dedekind", (F(h), F(k))), target)
    assert got == line
    assert value(got) == dedekind(h, k)


def test_descent_refusals():
    s = ("dedekind", (F(5), F(17)))
    assert "no dedekind(a, b) at a pair" in refusal("descent", s, [("dedekind", (F(1), F(3)))])
    assert "they go (2, 5), (1, 2), (0, 1)" in refusal("descent", s, [("dedekind", (F(1), F(3)))])
    assert "no dedekind(a, b)" in refusal("descent", s, [s])          # zero steps are no descent
    assert "gcd(4, 10) = 2" in refusal("descent", ("dedekind", (F(4), F(10))), [("dedekind", (F(2), F(4)))])
    assert "h >= 1" in refusal("descent", ("dedekind", (F(-5), F(17))), [("dedekind", (F(2), F(5)))])
    assert "k >= 1" in refusal("descent", ("dedekind", (F(5), F(0))), [])
    assert "does not apply to generalized_dedekind" in refusal(
        "descent", ("generalized_dedekind", (F(1), F(5), F(17))), [])


def test_descent_in_a_chain_and_in_a_lemma():
    # s(5, 17) = 1/17 (Rademacher & Grosswald's tables), s(1, 2) = 0
    assert chain("dedekind(5, 17)", "1/17 + dedekind(1, 2)", "descent").ok
    report = check_text("lemma one(k) for k >= 2: dedekind(1, k) = (k - 1)*(k - 2)/(12*k)\n"
                        "  chain dedekind(1, k)\n"
                        "    = (k - 1)*(k - 2)/(12*k) - dedekind(0, 1)    by descent\n"
                        "end\n")
    assert not report.ok and "descent has no form for calls with parameters" in " ".join(report.failure.details)


@pytest.mark.parametrize("rule", ["descent", "reduce"])
def test_many_calls_with_many_choices_stop_at_the_candidate_cap(rule, monkeypatch):
    # Each of 40 calls of the previous line may become any of 40 calls of the next line (by
    # descent: Fibonacci pairs (F(n), F(n+1)) descend through every smaller one; by reduce:
    # 1 + 5 i = 1 + 5 j (mod 5)).  The 1600 lines of 80 calls that this offers once took
    # memory cubic in the number of calls (a 130 KB certificate: about 10 GB); the lines are
    # now kept as they are made, up to the cap, the same first ones as before.
    from checker.kernel import verdicts
    from checker.kernel.normal import atom_nf, add
    fib = [0, 1]
    while len(fib) < 100:
        fib.append(fib[-1] + fib[-2])
    if rule == "descent":        # from memory: s(F(n), F(n+1)) -> s(F(n-1), F(n)) by one step
        before = [(fib[n], fib[n + 1]) for n in range(45, 85)]
        after = [(fib[m], fib[m + 1]) for m in range(2, 42)]
    else:
        before = [(1 + 5 * i, 5) for i in range(40)]
        after = [(1 + 5 * j, 5) for j in range(40, 80)]
    def line(pairs):
        out = {}
        for h, k in pairs:
            out = add(out, atom_nf(("dedekind", (F(h), F(k)))))
        return out
    made = []
    real = verdicts.substitute
    monkeypatch.setattr(verdicts, "substitute", lambda *a: made.append(1) or real(*a))
    verdict = verdicts.check_step(line(before), line(after), [(rule, None)], None, {}, DEFAULT_LIMITS)
    assert not verdict.rule_ok
    assert len(verdict.candidates) == verdicts._MAX_CANDIDATES
    assert len(made) <= verdicts._MAX_CANDIDATES


def test_three_term_watches_the_clock(monkeypatch):
    # its search over pairs of the next line's calls is quadratic in them: it must meet the
    # `seconds` limit inside (400 calls a side ran for minutes past it)
    from checker.foundation.errors import OutOfTime
    from checker.kernel import rules
    def out_of_time():
        raise OutOfTime("out of time")
    monkeypatch.setattr(rules, "check_time", out_of_time)
    target = [("dedekind", (F(1), F(3))), ("dedekind", (F(2), F(5)))]
    with pytest.raises(OutOfTime):
        rewrite("three_term", ("dedekind", (F(1), F(7))), target)


from checker.foundation.numbers import int_text as _d
_H, _K, _G, _G2 = map(_d, (3 ** 9500, 2 ** 16000 + 1, 2 ** 15000, 2 ** 15001))   # 4500-4900 digits


@pytest.mark.parametrize("start, line, rules", [
    (f"dedekind({_H}, {_K})", f"dedekind({_H}, {_K}) + 0", "reduce"),
    (f"dedekind(1, {_K})", "0", "definition"),
    (f"dedekind({_G}, {_G2})", "0", "reciprocity"),
    (f"dedekind(-{_H}, {_K})", "0", "reciprocity"),
    (f"dedekind({_H}, {_K})", "dedekind(5, 1)", "descent"),
    (f"dedekind({_G}, {_G2})", "dedekind(5, 1)", "descent"),
    (f"dedekind(-{_H}, {_K})", "dedekind(5, 1)", "descent"),
    (f"dedekind({_G}, {_G2})", "dedekind(5, 1)", "inverse"),
    (f"dedekind({_H}, {_K})", "dedekind(5, 1)", "common_factor"),
    (f"dedekind({_H}, {_K})", f"dedekind(5, {_G}) + dedekind(1, {_G2})", "three_term"),
    (f"dedekind(1, -{_K})", "0", "reduce"),                        # the value's own refusal
    (f"generalized_dedekind({_G2}, 1, 5)", "0", "reciprocity"),   # the cost's own refusal
], ids=lambda x: x if x.isidentifier() else "")
def test_refusals_about_numbers_past_4300_digits_are_failures_not_crashes(start, line, rules):
    # str() of an int past 4300 digits raises ValueError (CPython's default limit): the messages
    # write numbers with value_text, every digit (the report abbreviates them)
    report = check_text(f"chain {start}\n  = {line}    by {rules}\n")
    assert not report.ok and report.failure.kind in ("failed", "limit", "error"), report.failure


def test_a_failed_descent_walks_once_for_all_its_suggestions(monkeypatch):
    # the suggestions after a failed step try some 40 rule lists, each with descent in it
    from checker.kernel import rules
    calls = []
    real = rules.reciprocity_descent
    monkeypatch.setattr(rules, "reciprocity_descent",
                        lambda h, k, wanted: calls.append((h, k, frozenset(wanted))) or real(h, k, wanted))
    rules._WALKS.clear()
    k = 3 ** 400
    # s(1, 3) = 1/18 by s(1, k) = (k - 1)(k - 2)/(12 k) (Rademacher & Grosswald, ch. 1): the value is right
    c = dedekind(2, k) - F(1, 18)
    report = chain(f"dedekind(2, {k})", f"{c.numerator}/{c.denominator} + dedekind(1, 3)", "descent")
    assert not report.ok and "value check: passed" in " ".join(report.failure.details)
    # (1, 3) is off the walk: refused; each pair the rule lists lead to is walked once (5 walks without the memo)
    assert len(calls) == len(set(calls)) >= 2 and (2, k, frozenset({(1, 3)})) in calls
