"""The expression language: precedence, exactness, positions of errors, budgets."""
import io
from fractions import Fraction

import pytest
from hypothesis import given, strategies as st

from checker import BudgetExceeded, CertificateError, DomainError, SyntaxProblem, evaluate, evaluate_value
from checker.interfaces.cli import main
from checker.foundation.limits import Limits
from conftest import exact


@pytest.mark.parametrize("text, value", [
    ("-2^2", Fraction(-4)),                 # common practice: unary minus binds looser than ^
    ("2^3^2", Fraction(512)),               # common practice: ^ is right-associative
    ("-3/17", Fraction(-3, 17)),
    ("1 - 2 - 3", Fraction(-4)),
    ("12 / 4 / 3", Fraction(1)),
    ("2 * 3 / 4 * 5", Fraction(15, 2)),
    ("(1 + 2) * 3", Fraction(9)),
    ("2^-2", Fraction(1, 4)),
    ("(-2)^3", Fraction(-8)),
    ("\u22123 \u00b7 2", Fraction(-6)),
    ("mod(-7, 3) + floor(-7/2) + ceil(7/2) + frac(-1/3)", Fraction(2 - 4 + 4) + Fraction(2, 3)),
    ("gcd(12, 18) * lcm([4, 6])", Fraction(6 * 12)),
    ("binomial(10, 3) + binomial(-2, 3)", Fraction(120 - 4)),
    ("total(j from 1 to 100: j)", Fraction(5050)),
    ("total(j from 0 to 16: sawtooth(j/17) * sawtooth(5*j/17))", Fraction(1, 17)),
    ("dedekind(5, 17)", Fraction(1, 17)),
    ("partitions(10, [1, 2, 3])", Fraction(14)),
    ("frobenius([6, 9, 20])", Fraction(43)),
    ("bernoulli(12)", Fraction(-691, 2730)),
    ("bernoulli(2, 1/2)", Fraction(-1, 12)),
    ("staircase(10, 3, 0, 4)", Fraction(30)),
])
def test_values(text, value):
    exact(evaluate(text), value)


def test_lists_are_values():
    assert evaluate_value("[1, 2/3, -4]") == (Fraction(1), Fraction(2, 3), Fraction(-4))
    assert evaluate("partitions(n, A)", env={"n": Fraction(10), "A": (Fraction(1), Fraction(2), Fraction(3))}) == 14


@given(st.integers(-10**6, 10**6), st.integers(1, 10**6), st.integers(-10**6, 10**6), st.integers(1, 10**6))
def test_arithmetic_is_exact(a, b, c, d):
    # common practice: Fractions in lowest terms
    assert evaluate(f"{a}/{b} + {c}/{d}") == Fraction(a, b) + Fraction(c, d)
    assert evaluate(f"({a}/{b}) * ({c}/{d})") == Fraction(a, b) * Fraction(c, d)


@pytest.mark.parametrize("text, cls, column, message", [
    ("1/0", DomainError, 3, "division by zero: this divisor is 0"),
    ("3 + dedekind(1, 0)", DomainError, 5, "the second argument of dedekind must be a positive integer, not 0"),
    ("dedekin(3, 4)", DomainError, 1, "unknown function 'dedekin' (did you mean dedekind or fourier_dedekind?); `quasicert functions` lists them"),
    ("x + 1", DomainError, 1, "unknown name 'x': give it a value with `let` first"),
    ("dedekind", DomainError, 1, "'dedekind' is a function: call it as dedekind(h, k)"),
    ("dedekind(1)", DomainError, 1, "dedekind takes 2 arguments (h, k), not 1"),
    ("2^(1/2)", DomainError, 4, "the exponent must be an integer, not 1/2 (a fractional power is not rational in general)"),
    ("0^-1", DomainError, 1, "0 to a negative power is a division by zero"),
    ("[1, 2] + 1", DomainError, 1, "a list stands where a number is needed"),
    ("10^10^10", BudgetExceeded, 1, "the power 10^10000000000 needs 30000000001 bits, over the limit integer-bits = 1000000 (raise it with --limit integer-bits=N)"),
    ("bernoulli(10^9)", BudgetExceeded, 1, "a Bernoulli number of index 1000000000 needs 1000000000, over the limit bernoulli-index = 4000 (raise it with --limit bernoulli-index=N)"),
    ("total(j from 0 to 10^9: j)", BudgetExceeded, 1, "a sum of 1000000001 terms needs 1000000001 steps, over the limit terms = 3000000 (raise it with --limit terms=N)"),
    ("1 +", SyntaxProblem, 4, "the text stops too early: it still needs an expression"),
    ("1 + * 2", SyntaxProblem, 5, "'*' cannot come here: the text needs an expression at this place"),
    ("1 $ 2", SyntaxProblem, 3, "the character '$' is not part of the language"),
])
def test_errors_have_positions_and_plain_messages(text, cls, column, message):
    with pytest.raises(cls) as info:
        evaluate(text)
    assert info.value.line == 1
    assert info.value.column == column
    assert info.value.message == message


def test_budgets_are_adjustable():
    with pytest.raises(BudgetExceeded):
        evaluate("2^2000", limits=Limits(integer_bits=1000))
    assert evaluate("2^2000", limits=Limits(integer_bits=3000)) == 2 ** 2000


def test_deep_nesting_and_long_sums():
    # 10,000 nested parentheses and a sum of 100,000 terms: no recursion error
    assert evaluate("(" * 10_000 + "7" + ")" * 10_000) == 7
    assert evaluate("+".join(["1"] * 100_000)) == 100_000
    with pytest.raises(BudgetExceeded) as info:
        evaluate("dedekind(" * 300 + "1, 2" + ")" * 300)
    assert "nested" in info.value.message


def test_huge_literals_and_results_print():
    big = "9" * 6000
    assert evaluate(big) == 10 ** 6000 - 1
    out = io.StringIO()
    assert main(["eval", big + "/2"], out=out) == 0
    assert out.getvalue().strip() == big + "/2"


def run(argv):
    out, err = io.StringIO(), io.StringIO()
    code = main(argv, out=out, err=err)
    return code, out.getvalue(), err.getvalue()


def test_cli_eval_acceptance():
    # values: see the published sources in the kernel tests
    code, out, err = run(["eval", "dedekind(5, 17)", "partitions(10, [1,2,3])", "frobenius([6,9,20])", "bernoulli(12)"])
    assert code == 0 and err == ""
    assert out.splitlines() == ["1/17", "14", "43", "-691/2730"]


def test_cli_eval_leading_minus_is_an_expression():
    code, out, _ = run(["eval", "-3/17", "-2^2"])
    assert code == 0 and out.splitlines() == ["-3/17", "-4"]


def test_cli_eval_error_is_not_a_traceback():
    code, out, err = run(["eval", "1 + 1", "dedekind(1, 0)"])
    assert code == 2
    assert out.splitlines() == ["2"]
    assert err.splitlines()[0] == "argument 2, column 1: error: the second argument of dedekind must be a positive integer, not 0"
    assert "Traceback" not in err
    assert err.splitlines()[2].strip() == "^" * len("dedekind(1, 0)")


def test_cli_eval_limit_option():
    code, out, err = run(["eval", "--limit", "integer-bits=100", "2^200"])
    assert code == 2 and "integer-bits = 100" in err
    code, out, err = run(["eval", "--limit", "no-such=3", "1"])
    assert code == 2 and err.startswith("quasicert: there is no limit called no-such")


def test_python_api_functions():
    from checker import functions
    exact(functions.dedekind(5, 17), Fraction(1, 17))
    exact(functions.partitions(10, [1, 2, 3]), Fraction(14))
    exact(functions.fourier_dedekind(0, [1], 2), Fraction(1, 4))
    with pytest.raises(CertificateError):
        functions.dedekind(1, 0)
