"""One convention per thing, in every layer.

0^0 = 1: the combinatorial convention (D. E. Knuth, "Two notes on notation", Amer. Math.
Monthly 99 (1992) 403-422, from memory; the binomial theorem (x + y)^n = sum C(n, j) x^j y^(n-j)
needs it at x = 0).  The evaluator, the normal forms of
chains, the quasi-polynomial shapes of identities and the symbolic normal forms of lemmas must
all say x^0 = 1 at x = 0, and a line may cancel a call only where the call is defined and, in a
denominator, nonzero.
"""
from fractions import Fraction

import pytest

from checker import check_text, evaluate
from checker.kernel.assumptions import Assumptions
from checker.kernel.evaluation import Evaluator
from checker.kernel.normal import Normaliser, constant
from checker.kernel.quasipolynomial import polynomial, shape
from checker.kernel.rational_functions import RationalFunction
from checker.kernel.symbolic import SymbolicNormaliser
from checker.language.parsing import parse_expression
from checker.mathematics.bernoulli import bernoulli_polynomial


def test_zero_to_the_zero_is_one_in_every_layer():
    assert evaluate("0^0") == 1 and evaluate("(1 - 1)^0") == 1 and evaluate("dedekind(1, 2)^0") == 1
    ev = Evaluator()
    assert Normaliser(ev).normal(parse_expression("0^0")) == constant(Fraction(1))
    assert Normaliser(ev).normal(parse_expression("dedekind(1, 2)^0")) == constant(Fraction(1))
    ev_n = Evaluator({"n": Fraction(0)})
    assert ev_n.number(parse_expression("n^0")) == 1
    assert polynomial(parse_expression("n^0"), "n", Evaluator()) == [1]
    assert shape(parse_expression("n^0"), "n", Evaluator()).degree == 0
    k = RationalFunction.variable("k")
    facts = Assumptions(("k",))
    facts.add_bound(k)                       # k >= 0, so k = 0 is allowed
    sym = SymbolicNormaliser(Evaluator(), facts, {"k": k})
    assert sym.normal(parse_expression("k^0")) == constant(Fraction(1))
    assert sym.normal(parse_expression("(k - k)^0")) == constant(Fraction(1))
    # B_1(x) = x - 1/2 (with B_1 = -1/2): the x^0 term at x = 0
    assert bernoulli_polynomial(1, Fraction(0)) == Fraction(-1, 2)


@pytest.mark.parametrize("text", [
    "identity for n >= 0: n^0 = 1\n",
    "identity for all n: (n^2 - n)^0 = 1\n",
    "claim 0^0 = 1\nchain dedekind(1, 2)^0\n  = 1 by arithmetic\n",
    "lemma one(k) for k >= 0:\n  k^0 = 1\n  chain k^0\n    = 1 by arithmetic\nend\nclaim one_at_zero: 0^0 = 1\n",
])
def test_zero_to_the_zero_statements_verify(text):
    report = check_text(text, seed=1)
    assert report.ok, report.failure


@pytest.mark.parametrize("text, words", [
    ("claim 0^0 = 0\n", "false"),
    ("identity for n >= 0: n^0 = 0\n", "fails at n = 0"),
    ("chain 1\n  = dedekind(1, 2)/dedekind(1, 2) by arithmetic\n", "dedekind(1, 2) is 0"),
    ("chain 1\n  = dedekind(1, 2)^(-2)*dedekind(1, 2)^2 by arithmetic\n", "dedekind(1, 2) is 0"),
    ("chain 0\n  = 0*dedekind(3, 0) by arithmetic\n", "positive integer"),
    ("chain 1\n  = dedekind(1/2, 3)^0 by arithmetic\n", "must be an integer"),
])
def test_undefined_or_inconsistent_lines_are_refused(text, words):
    report = check_text(text)
    assert not report.ok
    assert words in report.failure.message, report.failure.message
    assert report.failure.line == 2 or text.startswith(("claim", "identity"))


def test_a_nonzero_call_may_still_be_cancelled():
    # s(5, 17) = 1/17 (python-flint, see test_dedekind.py) is not 0
    report = check_text("chain 1\n  = dedekind(5, 17)/dedekind(5, 17) by arithmetic\n")
    assert report.ok, report.failure
