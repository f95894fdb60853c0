"""Normal forms: how two lines of a chain are compared before any value is computed.

A normal form is a finite sum  sum_m c_m * m  with nonzero rational c_m over
monomials m = prod atom^e (integer e, possibly negative).  An atom is a call
of a non-arithmetic function (``dedekind``, ``bernoulli``, ...) at concrete
arguments: ``("dedekind", (5, 17))``.  Arithmetic functions (floor, mod, gcd,
...) and everything else are exact rational arithmetic, evaluated on sight.
Two expressions have the same normal form exactly when they are equal as
polynomials in their atoms: that is what "the rule produces the next line"
means, independently of the values of the atoms.

Representation: ``dict[Monomial, coefficient]`` with ``Monomial`` a frozenset of
``(atom, exponent)`` pairs; the empty frozenset is the constant monomial.  A
coefficient is a Fraction or a ``Ratio`` (``ratios``: the long numbers written
in a line stay unreduced pairs, compared by cross-multiplication; a 2000-digit
constant is never reduced on its way through a chain step), equal and hashed
alike for the same number, so dicts compare by value either way.

>>> from checker.language.parsing import parse_expression
>>> from checker.kernel.evaluation import Evaluator
>>> n = Normaliser(Evaluator())
>>> a = n.normal(parse_expression("2*dedekind(1, 3) - 1/4 + dedekind(1, 3)"))
>>> text(a)
'-1/4 + 3*dedekind(1, 3)'
"""
from __future__ import annotations

from fractions import Fraction

from ..language import expressions as ex
from ..foundation.errors import BudgetExceeded, CertificateError, DomainError
from ..foundation.limits import check_time
from .functions import REGISTRY
from ..foundation.numbers import atom_text, rough_int, value_text
from .evaluation import binding
from .ratios import Ratio, ratio

__all__ = ["Normaliser", "NF", "constant", "add", "sub", "mul", "scale", "power",
           "substitute", "atoms", "text", "atom_text", "is_zero"]

NF = dict
ONE = frozenset()
LONG_BITS = 256         # numbers past this size stay unreduced Ratios; shorter ones reduce cheaply
_ONE_F, _MINUS_ONE_F = Fraction(1), Fraction(-1)     # immutable, so shared (each Fraction() costs)


def constant(c) -> NF:
    return {ONE: c if isinstance(c, (Fraction, Ratio)) else Fraction(c)} if c else {}


def atom_nf(atom) -> NF:
    return {frozenset({(atom, 1)}): _ONE_F}


def add(x: NF, y: NF) -> NF:
    out = dict(x)
    _add_into(out, y)
    return out


def _add_into(out: NF, y: NF) -> None:
    for m, c in y.items():
        v = out.get(m)
        v = c if v is None else v + c        # no 0 + c: each Fraction sum costs gcds of long numbers
        if v:
            out[m] = v
        else:
            out.pop(m, None)


def scale(x: NF, c: Fraction) -> NF:
    if not c:
        return {}
    if c == 1:
        return dict(x)
    if c == -1:
        return {m: -v for m, v in x.items()}
    return {m: v * c for m, v in x.items()}


def sub(x: NF, y: NF) -> NF:
    return add(x, scale(y, _MINUS_ONE_F))


def _mono_mul(m1: frozenset, m2: frozenset) -> frozenset:
    if not m1:
        return m2
    if not m2:
        return m1
    exps = dict(m1)
    for a, e in m2:
        v = exps.get(a, 0) + e
        if v:
            exps[a] = v
        else:
            exps.pop(a)
    return frozenset(exps.items())


def mul(x: NF, y: NF, limit: int | None = None) -> NF:
    if limit is not None and len(x) * len(y) > limit:
        raise BudgetExceeded(f"expanding this product makes {len(x) * len(y)} terms, over the limit "
                             f"terms = {limit}")
    out: NF = {}
    for m1, c1 in x.items():
        check_time()
        for m2, c2 in y.items():
            m = _mono_mul(m1, m2)
            c = c1 if c2 == 1 else c2 if c1 == 1 else c1 * c2
            v = out.get(m)
            v = c if v is None else v + c
            if v:
                out[m] = v
            else:
                out.pop(m, None)
    return out


def monomial_inverse(x: NF) -> NF | None:
    """1/x when x is a single monomial, else None."""
    if len(x) != 1:
        return None
    (m, c), = x.items()
    return {frozenset((a, -e) for a, e in m): 1 / c}


def power(x: NF, e: int, limit: int | None = None) -> NF | None:
    if e < 0:
        inv = monomial_inverse(x)
        if inv is None:
            return None
        x, e = inv, -e
    if e == 1:
        return dict(x)
    result = constant(Fraction(1))
    base = x
    while e:
        if e & 1:
            result = mul(result, base, limit)
        e >>= 1
        if e:
            base = mul(base, base, limit)
    return result


def atoms(x: NF) -> set:
    return {a for m in x for a, _ in m}


def is_zero(x: NF) -> bool:
    return not x


def substitute(x: NF, atom, replacement: NF, limit: int | None = None) -> NF | None:
    """x with every occurrence of `atom` replaced by `replacement` (None if a negative
    power of a sum would be needed)."""
    out: NF = {}
    for m, c in x.items():
        e = next((f for a, f in m if a == atom), 0)
        if not e:                # a monomial without the atom stays as it is (no new frozenset to hash)
            _add_into(out, {m: c})
            continue
        p = power(replacement, e, limit)
        if p is None:
            return None
        _add_into(out, mul({frozenset(f for f in m if f[0] != atom): c}, p, limit))
    return out


def _sort_key(m: frozenset):
    return (sum(abs(e) for _, e in m), sorted((atom_text(a), e) for a, e in m))


def text(x: NF) -> str:
    """A readable rendering of a normal form (constant first)."""
    if not x:
        return "0"
    parts = []
    for m in sorted(x, key=_sort_key):
        c = x[m]
        factors = []
        for a, e in sorted(m, key=lambda ae: atom_text(ae[0])):
            factors.append(atom_text(a) + (f"^{e}" if e != 1 else ""))
        body = "*".join(factors)
        sign = "-" if c < 0 else "+"
        mag = abs(c)
        if not body:
            term = value_text(mag)
        elif mag == 1:
            term = body
        else:
            term = f"{value_text(mag)}*{body}"
        parts.append((sign, term))
    first_sign, first = parts[0]
    out = ("-" if first_sign == "-" else "") + first
    for sign, term in parts[1:]:
        out += f" {sign} {term}"
    return out


class Normaliser:
    """Expression tree -> normal form, with function arguments evaluated exactly."""

    def __init__(self, evaluator):
        self.evaluator = evaluator
        self.limits = evaluator.limits
        self.positions: dict = {}      # atom -> first Pos where it was written

    def normal(self, node: ex.Expr) -> NF:
        method = getattr(self, "_" + type(node).__name__)
        try:
            return method(node)
        except CertificateError as e:
            raise e.at(node)

    def _Num(self, node):
        v = node.value
        return constant(ratio(v) if v.bit_length() > LONG_BITS else Fraction(v))

    def _Name(self, node):
        return constant(self.evaluator.number(node))

    def _Neg(self, node):
        return scale(self.normal(node.operand), _MINUS_ONE_F)

    def _Sum(self, node):
        total: NF = {}
        for sign, term in node.terms:
            t = self.normal(term)
            total = add(total, t) if sign > 0 else sub(total, t)
            self._check_size(total, term)
        return total

    def _Product(self, node):
        quotient = _literal_quotient(node.factors)
        if quotient is not None:
            return constant(quotient)
        acc = constant(_ONE_F)
        for divide, factor in node.factors:
            f = self.normal(factor)
            if divide:
                if not f:
                    raise DomainError("division by zero: this divisor is 0").at(factor)
                inv = monomial_inverse(f)
                if inv is None:
                    raise DomainError(
                        "this divisor is a sum involving function calls, which a step cannot "
                        "compare symbolically; replace the calls by their values first").at(factor)
                self._require_nonzero(f, factor)
                f = inv
            acc = mul(acc, f, self.limits.terms)
        return acc

    def _Power(self, node):
        e = self.evaluator.number(node.exponent)
        if e.denominator != 1:
            raise DomainError(f"the exponent must be an integer, not {value_text(e)}").at(node.exponent)
        base = self.normal(node.base)
        if len(base) <= 1 and ONE in base or not base:
            return constant(self.evaluator.number(node))
        if abs(e.numerator) > 10_000:
            raise BudgetExceeded(f"a power {value_text(e.numerator)} of an expression with function calls is "
                                 "too large to expand").at(node)
        out = power(base, e.numerator, self.limits.terms)
        if out is None:
            raise DomainError("a negative power of a sum involving function calls cannot be "
                              "compared symbolically").at(node)
        if e < 0:
            self._require_nonzero(base, node.base)
        return out

    def _require_nonzero(self, divisor: NF, node) -> None:
        """A monomial may stand in a denominator only when none of its calls is 0: otherwise
        the line is undefined, and cancelling the call (x/x = 1) would hide it."""
        for m in divisor:
            for atom, _ in m:
                if self.evaluator.call(*atom, node) == 0:
                    raise DomainError(f"{atom_text(atom)} is 0, so this divides by zero").at(node)

    def _Call(self, node):
        spec = REGISTRY.get(node.name)
        if spec is None or spec.arithmetic:
            return constant(self.evaluator.number(node))
        args = tuple(self.evaluator.value(a) for a in node.args)
        atom = (node.name, args)
        simple = _trivial_value(atom)
        if simple is not None:
            return constant(simple)
        # every call of a line must be defined, also one that the normal form drops
        # (0*x, x - x, x^0): the exact value of the line would hide an undefined call
        value = self.evaluator.exact_call(node.name, args, node)
        if isinstance(value, tuple):
            raise DomainError(f"{node.name} gives a list where a number is needed").at(node)
        self.positions.setdefault(atom, node.pos)
        return atom_nf(atom)

    def _ListExpr(self, node):
        raise DomainError("a list stands where a number is needed").at(node)

    def _FiniteSum(self, node):
        ev = self.evaluator
        lower = ev.number(node.lower)
        upper = ev.number(node.upper)
        if lower.denominator != 1 or upper.denominator != 1:
            raise DomainError("the ends of a sum must be integers").at(node)
        count = max(0, upper.numerator - lower.numerator + 1)
        self.limits.require("definition_terms", count, f"a sum of {rough_int(count)} terms")
        total: NF = {}
        for _ in binding(ev.env, node.var, range(lower.numerator, upper.numerator + 1)):
            total = add(total, self.normal(node.body))
        return total

    def _check_size(self, x: NF, node):
        if len(x) > self.limits.terms:
            raise BudgetExceeded(f"the expression has {len(x)} terms, over the limit terms = "
                                 f"{self.limits.terms}").at(node)


def _literal_quotient(factors):
    """The value of `p/q` or `-p/q` with literals p and q != 0 (the constant of each line of a
    derived chain), the number the general product gives, without its two products of normal
    forms; None for any other product (a zero divisor included: the general path refuses it)."""
    if len(factors) != 2 or factors[0][0] or not factors[1][0]:
        return None
    first, divisor = factors[0][1], factors[1][1]
    negative = type(first) is ex.Neg
    if negative:
        first = first.operand
    if type(first) is not ex.Num or type(divisor) is not ex.Num or not divisor.value:
        return None
    n, d = -first.value if negative else first.value, divisor.value
    if max(n.bit_length(), d.bit_length()) > LONG_BITS:
        return Ratio(n, d)
    return Fraction(n, d)


def _trivial_value(atom):
    """Values fixed by the definition alone: ((n)) = 0 at integers."""
    name, args = atom
    if name == "sawtooth" and len(args) == 1 and isinstance(args[0], Fraction) and args[0].denominator == 1:
        return Fraction(0)
    return None
