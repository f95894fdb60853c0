"""Writing certificates that anyone can re-check with `quasicert check`.

For a Dedekind sum s(h, k) the certificate is the Euclid-like chain:
cancel a common factor, reduce h modulo k, then alternately apply
reciprocity and reduce (cited together on one line) until s(0, 1) = 0.  Each
line is  c + e * dedekind(a, b)  with c an exact rational in lowest terms, so
the lines stay about as long as the numbers themselves.
"""
from __future__ import annotations

from fractions import Fraction
from math import gcd

from .errors import DomainError
from .evaluation import Evaluator
from .expressions import Call
from .numbers import value_text
from .parsing import parse_expression

__all__ = ["derive", "derive_dedekind"]


def _line(c: Fraction, sign: int, h: int, k: int) -> str:
    call = f"dedekind({value_text(h)}, {value_text(k)})"
    if c == 0:
        return call if sign > 0 else f"-{call}"
    return f"{value_text(c)} {'+' if sign > 0 else '-'} {call}"


def derive_dedekind(h: int, k: int, label: str = "derived") -> str:
    """A certificate whose chain computes s(h, k) by reciprocity and reduction."""
    if k < 1:
        raise DomainError(f"dedekind(h, k) needs k >= 1, not {k}")
    out = [f'title "s({value_text(h)}, {value_text(k)}) by reciprocity and reduction"',
           "# written by quasicert derive; check it with: quasicert check FILE",
           f"chain {label}: dedekind({value_text(h)}, {value_text(k)})"]
    g = gcd(h, k)
    if g > 1:
        h, k = h // g, k // g
        out.append(f"  = dedekind({value_text(h)}, {value_text(k)})    by common_factor")
    if not 0 <= h < k:
        h %= k
        out.append(f"  = dedekind({value_text(h)}, {value_text(k)})    by reduce")
    # the pairs met by reciprocity followed by reduce: (h, k) -> (k mod h, h)
    chain = [(h, k)]
    while chain[-1][0]:
        a, b = chain[-1]
        chain.append((b % a, a))
    # T(a, b) = 12 b s(a, b), from the bottom (0, 1) up: reciprocity gives
    # a T(a, b) = a^2 + b^2 + 1 - 3ab - b T(b mod a, a), an exact integer division
    twelve = {}
    below = 0
    for a, b in reversed(chain):
        below = 0 if a == 0 else (a * a + b * b + 1 - 3 * a * b - b * below) // a
        twelve[(a, b)] = below
    k0 = chain[0][1]
    total = twelve[chain[0]]                      # 12 k0 s(h, k)
    sign = 1
    for a, b in chain[1:]:
        sign = -sign
        # the line c + sign * s(a, b) keeps the value: c = s(h, k) - sign * s(a, b)
        c = Fraction(total * b - sign * k0 * twelve[(a, b)], 12 * k0 * b)
        out.append(f"  = {_line(c, sign, a, b)}    by reciprocity, reduce")
    value = Fraction(total, 12 * k0)
    out.append(f"  = {value_text(value)}    by value")
    return "\n".join(out) + "\n"


def derive(text: str) -> str:
    """A certificate for the value of an expression (a single supported call)."""
    expr = parse_expression(text)
    if not isinstance(expr, Call):
        raise DomainError("derive writes certificates for one function call, "
                          "e.g. quasicert derive \"dedekind(5, 17)\"").at(expr)
    ev = Evaluator()
    args = [ev.value(a) for a in expr.args]
    if expr.name == "dedekind" and len(args) == 2:
        h, k = args
        if not (isinstance(h, Fraction) and isinstance(k, Fraction) and h.denominator == 1 == k.denominator):
            raise DomainError("dedekind(h, k) needs integers h and k").at(expr)
        return derive_dedekind(h.numerator, k.numerator)
    raise DomainError(f"derive knows how to write certificates for dedekind(h, k); "
                      f"not yet for {expr.name}").at(expr)
