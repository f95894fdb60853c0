"""The fast path for NAME(INT, ..., INT) against Lark, and `evaluate` through it against the tree path.

`read_number_call` reads the commonest text of `quasicert eval` and `checker.evaluate`
without the grammar; `evaluate` then calls the function without building the tree
(it builds it only when an error needs a position).  Differential tests
(# common practice: differential testing of two parsers of one grammar): where the fast
path reads a text, Lark's tree must be its tree, positions included; and `evaluate`
must give the value, or the same CertificateError (kind, message, line, columns), as
parsing with Lark and evaluating the tree.
"""
from __future__ import annotations

import random
from fractions import Fraction

import flint
import pytest
from hypothesis import given, settings, strategies as st

from checker import evaluate
from checker.foundation.errors import CertificateError
from checker.foundation.limits import DEFAULT_LIMITS, Limits, time_limit
from checker.kernel.evaluation import Evaluator
from checker.language import parsing
from checker.language.parsing import parse_expression, parse_with_lark, read_number_call
from conftest import flint_fraction

NAMES = ["dedekind", "gcd", "lcm", "binomial", "mod", "floor", "bernoulli", "frobenius", "partitions",
         "generalized_dedekind", "dedekind_rademacher", "fourier_dedekind", "jacobi", "reciprocal_mod",
         "staircase", "nonrepresentable", "s", "f", "h'", "k''", "_a1", "Dedekind", "x1y",
         "total", "sum", "claim", "by", "from", "to", "let", "end", "use", "constituents", "periodic"]
NUMBERS = ["0", "1", "2", "7", "17", "0007", "12345678901234567890", "9" * 60, "10" * 200,
           "1_000", "-3", "+3", "\u2212" "3", "\u0663", "\uff11", "\u00b2", "1.5", "1e3", "0x1f", ""]
BLANKS = ["", "", "", " ", "  ", "\t", "\n", "\r\n", "\f", "\v", "\u00a0", "\u2003", "#c\n", "\r", "\u200e"]


def _outcome(fn):
    try:
        return ("value", fn())
    except CertificateError as e:
        return ("error", type(e).__name__, e.message, e.line, e.column, e.end_column)


def _by_the_tree(text, limits):
    """Without the fast path: the grammar's tree (Lark's), evaluated node by node."""
    parsing._refuse_misleading(text)
    tree = parse_with_lark(text, "expr", limits)
    with time_limit(limits.seconds):
        return Evaluator(None, limits).number(tree)


def _agree(text, limits=DEFAULT_LIMITS):
    """Both ways agree on `text`; True when the fast path read it."""
    call = read_number_call(text, limits)
    if call is not None:
        assert parse_with_lark(text, "expr", limits) == call.tree(), text
        assert parse_expression(text, limits) == call.tree(), text
    assert _outcome(lambda: evaluate(text, limits=limits)) == _outcome(lambda: _by_the_tree(text, limits)), text
    return call is not None


def _random_text(rng):
    """Mostly one odd piece in a well-formed call, sometimes many."""
    odds = rng.choice([0.02, 0.1, 0.5])

    def pick(good, every):
        return rng.choice(every if rng.random() < odds else good)

    blanks, numbers = ["", "", " ", "\t"], NUMBERS[:9]
    parts = [pick(blanks, BLANKS), pick(NAMES[:-9], NAMES), pick(blanks, BLANKS), pick(["("], ["(", "[", ""])]
    for i in range(rng.choice([1, 2, 2, 2, 3, 4]) if rng.random() > odds else 0):
        if i:
            parts.append(pick([","], [",", ", ", ",,", ";", " "]))
        parts += [pick(blanks, BLANKS), pick(numbers, NUMBERS), pick(blanks, BLANKS)]
    parts += [pick([")"], [")", "", "))", "]", ")("]), pick(blanks, BLANKS + ["x", "+1", "(2)"])]
    return "".join(parts)


def test_generated_texts():
    rng = random.Random(15)
    read = 0
    for _ in range(2500):
        read += _agree(_random_text(rng))
    assert read > 150          # the fast path itself was tested, not only the way around it


@pytest.mark.parametrize("text, expected", [
    ("dedekind(5, 17)", Fraction(1, 17)),                  # Rademacher & Grosswald's tables
    ("dedekind(1,7)", Fraction(5, 14)),                     # s(1, k) = (k-1)(k-2)/(12k)
    (" \tdedekind ( 0005 ,\t17 ) ", Fraction(1, 17)),
    ("gcd(12, 18, 27)", Fraction(3)),                       # from memory
    ("binomial(10, 3)", Fraction(120)),                     # from memory
])
def test_values(text, expected):
    assert read_number_call(text) is not None
    assert evaluate(text) == expected
    assert _agree(text)


@pytest.mark.parametrize("text", [
    "dedekind(1, 0)", "dedekind(5)", "dedekind(1, 2, 3)", "dedekind_(5, 17)", "s(5, 17)", "floor_sum(1, 2, 3, 4)",
    "bernoulli(100000)", "frobenius(6)", "partitions(5, 3)", "  binomial(1)", "reciprocal_mod(2, 4)",
    "jacobi(3, 4)", "constituents(1)", "dedekind\t(1,\t\t0)   ",
])
def test_errors_are_the_tree_s(text):
    assert read_number_call(text) is not None
    with pytest.raises(CertificateError):
        evaluate(text)
    assert _agree(text)


@pytest.mark.parametrize("text", [
    "dedekind(1_000, 7)", "dedekind(\u0663, 7)", "dedekind(\uff11, 7)", "dedekind(-1, 7)", "dedekind(+1, 7)",
    "dedekind(1, 7) + 0", "dedekind(1, 7)\n", "dedekind(1,\n7)", "dedekind(1, 7) # c", "dedekind(1, 7,)",
    "dedekind(, 7)", "dedekind(1 2, 7)", "dedekind( , 7)", "dedekind()", "total(1, 2)", "sum(1, 2)", "by(1)", "(dedekind(1, 7))", "dedekind(1, 7)(2)",
    "dedekind(1, 7\u200e)", "dedekind(1,\r7)", "d\u00e9dekind(1, 7)", "dedekind((1), 7)", "f(g(1))", "mod(1, 0)",
])
def test_other_texts_go_the_usual_way(text):
    assert read_number_call(text) is None
    _agree(text)


@pytest.mark.parametrize("limits", [Limits(literal_digits=3), Limits(tokens=5), Limits(tokens=15),
                                    Limits(nesting=0), Limits(nesting=1), Limits(integer_bits=8),
                                    Limits(seconds=0), Limits(terms=10)])
def test_budgets(limits):
    rng = random.Random(limits.tokens + limits.literal_digits)
    texts = ["dedekind(5, 17)", "dedekind(12345, 1000003)", "gcd(1, 2, 3, 4, 5, 6, 7)", "binomial(300, 150)",
             "dedekind(1, " + "9" * 400 + ")", "partitions(100, 7)"] + [_random_text(rng) for _ in range(300)]
    for text in texts:
        _agree(text, limits)


def test_huge_numbers_and_long_texts():
    k = 10**4000 + 1                         # beyond int()'s default digit limit for text
    h = 3**5000 % k
    text = f"dedekind({h}, {k})"
    assert read_number_call(text).values == (h, k)
    assert evaluate(text) == flint_fraction(flint.fmpq.dedekind_sum(h, k))   # python-flint
    assert _agree(text)
    assert _agree("gcd(" + ", ".join(["6"] * 3000) + ")")
    assert not _agree("gcd(" + "1, " * 3000 + ")")
    assert not _agree("dedekind(" + "(" * 300 + "1" + ")" * 300 + ", 7)")


@settings(max_examples=300, deadline=None)
@given(st.text(alphabet="dek(1,7) \t\n_x'#-0", max_size=30))
def test_hypothesis_soup(text):
    _agree(text)


@settings(max_examples=200, deadline=None)
@given(st.integers(0, 10**60), st.integers(0, 10**60), st.sampled_from(["", " ", "\t", "  "]))
def test_hypothesis_dedekind_values(h, k, blank):
    # python-flint's fmpq.dedekind_sum, through the text
    text = f"dedekind({blank}{h},{blank}{k}{blank})"
    assert _agree(text)
    if k >= 1:
        assert evaluate(text) == flint_fraction(flint.fmpq.dedekind_sum(h, k))


def test_the_int_path_is_only_for_functions_without_cost_or_limits():
    # `takes_ints` skips the Fractions and spec.call: allowed only where spec.call would add nothing
    from checker.kernel.functions import REGISTRY, _spec
    with_ints = [spec for spec in REGISTRY.values() if spec.takes_ints]
    assert [spec.name for spec in with_ints] == ["dedekind"]
    for spec in with_ints:
        assert not spec.limited and spec.cost(Fraction(10**9), Fraction(10**9)) is None
    with pytest.raises(ValueError):
        _spec("x", "n", "", abs, (1, 1), cost=lambda n: ("terms", 1, "x"), takes_ints=True)


@settings(max_examples=200, deadline=None)
@given(st.integers(0, 10**45), st.one_of(st.integers(0, 300), st.integers(0, 10**45)),
       st.one_of(st.integers(1, 30), st.integers(1, 10**30)),
       st.sampled_from([DEFAULT_LIMITS, Limits(integer_bits=40), Limits(seconds=0)]))
def test_int_path_against_the_fraction_path(h, k, g, limits):
    # the same value or error (kind, message, columns) from ints and from the Fractions the tree
    # path makes, with common factors, k = 0 and k = 1; paranoid evaluation keeps the Fraction
    # path and its second opinion
    for text in (f"dedekind({h * g}, {k * g})", f"dedekind({h}, {k})", f"dedekind({h}, 1)", f"dedekind({h}, 0)"):
        _agree(text, limits)
        call = read_number_call(text, limits)
        paranoid = Evaluator(None, limits, paranoid=True)
        fast = _outcome(lambda: _timed(limits, lambda: Evaluator(None, limits).number_of_call(*call[:2], call.tree)))
        slow = _outcome(lambda: _timed(limits, lambda: paranoid.number_of_call(*call[:2], call.tree)))
        assert fast == slow, text
        if fast[0] == "value" and limits is DEFAULT_LIMITS:
            assert paranoid.second_opinions == (1 <= call.values[1] <= 20_000)   # the definition's range
            assert fast[1] == flint_fraction(flint.fmpq.dedekind_sum(*call.values))   # python-flint


def _timed(limits, fn):
    with time_limit(limits.seconds):
        return fn()


ARGUMENTS = ["0", "7", "0007", "12345678901234567890", "9" * 149, "", " ", "\t", "1 2", "-3", "+3", "\u2212" "3",
             "\u0663", "\uff11", "\u00b2", "1_000", "1e3", "0x1f", "1.5", "(1)", "x", "[1]", "3#c\n"]


def test_two_arguments_piece_by_piece():
    # every pair of argument pieces, and each separator and trailing piece, in the two-argument call
    # (the reader's own branch for it); the reader takes exactly the ASCII-digit pairs, and each text
    # agrees with Lark and the tree path (_agree)
    digits = {"0", "7", "0007", "12345678901234567890", "9" * 149}
    for first in ARGUMENTS:
        for second in ARGUMENTS:
            text = f"dedekind({first}, {second})"
            assert _agree(text) == (first.strip() in digits and second.strip() in digits), text
    for between in [",", " , ", ",\t", "\t,", ",,", ", ,", ";", ", #c\n", ",\n", "\u060c", "\uff0c"]:
        assert _agree(f"dedekind(5{between}17)") == (between.strip(" \t") == ","), between
    for before, after in [("", " "), ("\t", "\t"), ("", "x"), ("", " # c"), ("", "\n"), ("", "(3)"), ("", "+1"),
                          ("", ")"), ("", ","), ("-", ""), ("+", ""), ("(", ")"), ("# c\n", ""), ("\ufeff", "")]:
        assert _agree(f"{before}dedekind(5, 17){after}") == (before + after in ("", " ", "\t\t")), (before, after)


@pytest.mark.parametrize("limits", [DEFAULT_LIMITS, Limits(literal_digits=149), Limits(literal_digits=150),
                                    Limits(integer_bits=500)])
def test_two_arguments_near_the_short_read(limits):
    # the arguments' text up to 300 characters goes to int() at once, longer ones digit run by digit
    # run; both ways read the same numbers and refuse the same texts, at the literal-digits limit too
    for length in (148, 149, 150):
        for blanks in ("", " ", "  ", " \t "):
            h, k = "7" * length, "9" * length
            text = f"dedekind({h},{blanks}{k})"
            read = _agree(text, limits)
            assert read == (length <= limits.literal_digits), (length, blanks)
            if read:
                assert read_number_call(text, limits).values == (int(h), int(k))
                if limits is DEFAULT_LIMITS:
                    assert evaluate(text) == flint_fraction(flint.fmpq.dedekind_sum(int(h), int(k)))  # python-flint


def test_the_int_path_s_own_checks(monkeypatch):
    # a function that takes ints, called from a text: the value gets the size check and the list
    # check of the tree path, at the call's position, and runs under the `seconds` deadline
    from dataclasses import replace
    from checker.foundation.limits import current_deadline
    from checker.kernel import functions
    seen = []

    def recording(h, k):
        seen.append(current_deadline())
        return Fraction(h, k) if k else (Fraction(h),)
    monkeypatch.setitem(functions.REGISTRY, "dedekind", replace(functions.REGISTRY["dedekind"], impl=recording))
    assert _outcome(lambda: evaluate(" dedekind(3, 0)")) == \
        ("error", "DomainError", "a list stands where a number is needed", 1, 2, 16)
    assert _outcome(lambda: evaluate("dedekind(1, 1024)", limits=Limits(integer_bits=10))) == \
        ("error", "BudgetExceeded", "an intermediate value has 11 bits, over the limit integer-bits = 10", 1, 1, 18)
    assert evaluate("dedekind(1, 1023)", limits=Limits(integer_bits=10)) == Fraction(1, 1023)
    for text in (" dedekind(3, 0)", "dedekind(1, 1024)"):
        assert _agree(text, Limits(integer_bits=10))
    assert seen and all(deadline is not None for deadline in seen)
    assert current_deadline() is None
