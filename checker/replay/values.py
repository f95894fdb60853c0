"""The exact value of an expression given as text: parse it, then evaluate it in the kernel."""
from __future__ import annotations

from fractions import Fraction

from ..foundation.errors import unwritable_number
from ..foundation.limits import DEFAULT_LIMITS, Limits, time_limit
from ..kernel.evaluation import Evaluator, value_of_number_call
from ..language.parsing import parse_expression, read_number_call

__all__ = ["evaluate", "evaluate_value"]


def evaluate_value(text: str, env: dict | None = None, limits: Limits = DEFAULT_LIMITS):
    """Value of an expression text: a Fraction, or a tuple for a list (within `seconds`)."""
    with time_limit(limits.seconds):
        return Evaluator(env, limits).value(parse_expression(text, limits))


def evaluate(text: str, env: dict | None = None, limits: Limits = DEFAULT_LIMITS) -> Fraction:
    """The exact value of an expression text, as a Fraction.

    >>> evaluate("dedekind(5, 17)")                # Rademacher & Grosswald's tables
    Fraction(1, 17)
    >>> evaluate("-2^2"), evaluate("2^3^2")
    (Fraction(-4, 1), Fraction(512, 1))
    """
    try:
        call = read_number_call(text, limits)
        if call is not None:        # NAME(INT, ..., INT): no tree unless an error wants its position
            return value_of_number_call(call, limits)
        expr = parse_expression(text, limits)
        with time_limit(limits.seconds):
            return Evaluator(env, limits).number(expr)
    except ValueError as e:
        error = unwritable_number(e)
        if error is None:
            raise
        raise error from None
