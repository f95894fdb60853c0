"""Normal forms of lines with integer parameters (the lines of a lemma).

The same normal forms as ``normal`` (polynomials in function calls), with
coefficients and call arguments that may be rational functions of the
parameters (``rational_functions``).  A call whose arguments are all numbers
is the same atom as in a numeric chain.  Floor, ceiling, frac, mod and the
sawtooth of a symbolic argument are simplified only where the assumptions
fix the residue; binomial(n, j) and bernoulli(j, x) with a number j become
their polynomials.  Every divisor and every call is checked to be defined for
all allowed values of the parameters, so that equal normal forms mean equal
values at every instance.

>>> from checker.language.parsing import parse_expression
>>> from checker.kernel.evaluation import Evaluator
>>> from checker.kernel.assumptions import Assumptions
>>> from checker.kernel.rational_functions import RationalFunction as R
>>> k = R.variable("k")
>>> facts = Assumptions(("k",)); _ = facts.add_bound(k - 1); _ = facts.add_congruence(k - 1, 2)
>>> n = SymbolicNormaliser(Evaluator(), facts, {"k": k})
>>> line_text(n.normal(parse_expression("floor(k/2) + sawtooth(k/2) - dedekind(k + 2, 2)")))
'(k - 1)/2 - dedekind(k + 2, 2)'
"""
from __future__ import annotations

from fractions import Fraction

from ..language import expressions as ex
from ..mathematics.bernoulli import bernoulli
from ..foundation.errors import BudgetExceeded, CertificateError, DomainError
from .functions import REGISTRY
from .normal import ONE, add, atom_nf, atom_text, mul, power, scale, sub
from ..foundation.numbers import rough_int, value_text
from .rational_functions import RationalFunction, p_add, p_scale

__all__ = ["SymbolicNormaliser", "line_text", "atom_label", "is_symbolic", "value_label",
           "atom_problem", "floor_of", "fixed_sawtooth"]

_ONE_POLY = {(): Fraction(1)}


def is_symbolic(v) -> bool:
    if isinstance(v, tuple):
        return any(is_symbolic(x) for x in v)
    return isinstance(v, RationalFunction)


value_label = value_text          # numbers, lists and rational functions alike
atom_label = atom_text


def line_text(x: dict) -> str:
    """A readable rendering of a symbolic normal form (constant term first)."""
    if not x:
        return "0"
    parts = []
    for m in sorted(x, key=lambda m: (len(m), sorted((atom_label(a), e) for a, e in m))):
        c = x[m]
        body = "*".join(atom_label(a) + (f"^{e}" if e != 1 else "")
                        for a, e in sorted(m, key=lambda ae: atom_label(ae[0])))
        if isinstance(c, RationalFunction):
            sign, coef = ("-", str(-c)) if str(c).startswith("-") else ("+", str(c))
            if len(c.num) > 1 and body and not coef.startswith("("):
                coef = f"({coef})"
            parts.append((sign, coef + ("*" + body if body else "")))
            continue
        mag = abs(c)
        term = value_text(mag) if not body else body if mag == 1 else f"{value_text(mag)}*{body}"
        parts.append(("-" if c < 0 else "+", term))
    out = ("-" if parts[0][0] == "-" else "") + parts[0][1]
    for sign, term in parts[1:]:
        out += f" {sign} {term}"
    return out


def _const(v) -> dict:
    return {ONE: v} if v else {}


def _split_hint(x) -> str:
    """For x = (polynomial in one parameter with rational coefficients), the split by the common
    denominator M of its coefficients fixes floor(x): that split in words, else ''."""
    if not isinstance(x, RationalFunction) or len(x.names) != 1 or not x.is_polynomial:
        return ""
    from math import lcm
    m = 1
    for c in x.num.values():
        m = lcm(m, Fraction(c).denominator)
    if m < 2 or m > 10_000:
        return ""
    (var,) = tuple(x.names)
    cases = ", ".join(f"`residue {r}:`" for r in range(min(m, 3))) + (", ..." if m > 3 else "")
    return (f"; to fix it, split the proof by the residue of {var}: `split {var} mod {m}`, then {cases} "
            f"each with its chain (classes the assumptions exclude are left out)")


def floor_of(facts, v):
    """floor(v) when the assumptions fix it, else None.

    v = N/D with integer polynomials N, D >= 1: floor(v) = q for an integer-valued
    q with 0 <= N - q D <= D - 1.  Candidates for q: N div D over Q and its
    neighbours; each is proved or dropped.
    """
    if not isinstance(v, RationalFunction):
        return Fraction(v.numerator // v.denominator)
    num, den = _integer_parts(v)
    dv = RationalFunction.of(den, _ONE_POLY)
    if facts.at_least(dv, 1) is not None:
        return None
    c = den.get((), None) if len(den) == 1 else None
    if c is not None:                       # a constant denominator: the residue of N mod D
        r = facts.residue(num, int(c))
        if r is None:
            return None
        return RationalFunction.of(p_add(num, {(): Fraction(r)}, -1), den)
    quotient = _polynomial_quotient(num, den)
    if quotient is None:
        return None
    for shift in (0, -1, 1):
        q = RationalFunction.of(quotient, _ONE_POLY) + shift
        if facts.integral(q) is not None:
            continue
        rest = RationalFunction.of(num, _ONE_POLY) - q * dv
        if facts.at_least(rest, 0) is None and facts.at_least(dv - 1 - rest, 0) is None:
            return q
    return None


def fixed_sawtooth(facts, x):
    """((x)) when the assumptions fix it (0 at integers), else None."""
    f = floor_of(facts, x)
    if f is None:
        return None
    rest = x - f
    if rest == 0:
        return Fraction(0)
    if facts.at_least(rest, 0) is None and facts.nonzero(_numerator(rest)) is None:
        return rest - Fraction(1, 2)
    return None


def _integer_parts(v: RationalFunction):
    """(N, D) integer polynomials with v = N/D."""
    L = 1
    from math import gcd
    for c in list(v.num.values()) + list(v.den.values()):
        L = L * c.denominator // gcd(L, c.denominator)
    return p_scale(v.num, L), p_scale(v.den, L)


def _polynomial_quotient(num: dict, den: dict):
    """The quotient of num by den over Q when den divides num up to a remainder of lower
    degree in one parameter; None when sympy cannot give one."""
    from .rational_functions import _from_sympy, _to_sympy, names_of
    names = tuple(sorted(names_of(num) | names_of(den)))
    q, _r = _to_sympy(num, names).div(_to_sympy(den, names))
    return _from_sympy(q, names)


def atom_problem(facts, atom) -> str:
    """'' when the call is defined for every allowed value of the parameters, else why not."""
    name, args = atom
    if not is_symbolic(args):
        return ""
    if name in ("dedekind", "dedekind_rademacher"):
        h, k = args[0], args[1]
        return _first(facts.integral(h), facts.integral(k), facts.at_least(k, 1))
    if name == "generalized_dedekind":
        p, h, k = args
        if is_symbolic(p) or p.denominator != 1 or p < 1:
            return "the order p of generalized_dedekind must be a whole number >= 1"
        return _first(facts.integral(h), facts.integral(k), facts.at_least(k, 1))
    if name == "fourier_dedekind":
        n, parts, b = args
        if not isinstance(parts, tuple):
            return "the second argument of fourier_dedekind must be a list"
        reasons = [facts.integral(n), facts.integral(b), facts.at_least(b, 1)]
        for a in parts:
            reasons += [facts.integral(a), facts.coprime(a, b)]
        return _first(*reasons)
    if name in ("sawtooth",):
        return ""
    if name == "periodic_bernoulli":
        return "the order n of periodic_bernoulli(n, x) must be a number" if is_symbolic(args[0]) else ""
    return f"quasicert does not reason about {name} with symbolic arguments; give them numbers"


def _first(*reasons) -> str:
    return next((r for r in reasons if r), "")


class SymbolicNormaliser:
    """Expression tree -> symbolic normal form, under a lemma's assumptions.

    `env` maps parameter names to their values (a RationalFunction variable, or
    whatever a lemma is instantiated with); other names are the certificate's
    `let` values, looked up in the evaluator.
    """

    def __init__(self, evaluator, facts, env: dict):
        self.evaluator = evaluator
        self.facts = facts
        self.env = dict(env)
        self.limits = evaluator.limits
        self.positions: dict = {}

    def normal(self, node) -> dict:
        method = getattr(self, "_" + type(node).__name__)
        try:
            return method(node)
        except CertificateError as e:
            raise e.at(node)
        except ZeroDivisionError:
            raise DomainError("division by zero").at(node) from None

    def scalar(self, node):
        """The value of a sub-expression that has no function calls left in it."""
        x = self.normal(node)
        if any(m != ONE for m in x):
            raise DomainError("a function call stands where a number or a parameter expression "
                              "is needed").at(node)
        return x.get(ONE, Fraction(0))

    def argument(self, node):
        if isinstance(node, ex.ListExpr):
            return tuple(self.argument(i) for i in node.items)
        return self.scalar(node)

    # -- nodes --------------------------------------------------------------
    def _Num(self, node):
        return _const(Fraction(node.value))

    def _Name(self, node):
        if node.name in self.env:
            return _const(self.env[node.name])
        return _const(self.evaluator.number(node))

    def _Neg(self, node):
        return scale(self.normal(node.operand), Fraction(-1))

    def _Sum(self, node):
        total: dict = {}
        for sign, term in node.terms:
            t = self.normal(term)
            total = add(total, t) if sign > 0 else sub(total, t)
            if len(total) > self.limits.terms:
                raise BudgetExceeded(f"the expression has {len(total)} terms, over the limit terms = "
                                     f"{self.limits.terms}").at(term)
        return total

    def _Product(self, node):
        acc = _const(Fraction(1))
        for divide, factor in node.factors:
            f = self.normal(factor)
            if divide:
                f = self._inverse(f, factor)
            self.limits.require("lemma_degree", _degree_of(acc) + _degree_of(f), "this product")
            acc = mul(acc, f, self.limits.terms)
        return acc

    def _inverse(self, f: dict, node) -> dict:
        if not f:
            raise DomainError("division by zero: this divisor is 0").at(node)
        if len(f) != 1 or ONE not in f:
            raise DomainError("a lemma line may divide only by numbers and parameter expressions, "
                              "not by function calls").at(node)
        c = f[ONE]
        if isinstance(c, RationalFunction):
            why = self.facts.nonzero(RationalFunction.of(c.num, _ONE_POLY))
            if why:
                raise DomainError(f"this divisor may be 0: {why}").at(node)
        return {ONE: 1 / c}

    def _Power(self, node):
        e = self.scalar(node.exponent)
        if isinstance(e, RationalFunction) or e.denominator != 1:
            raise DomainError("the exponent must be a whole number").at(node.exponent)
        e = e.numerator
        if abs(e) > 10_000:
            raise BudgetExceeded(f"a power {value_text(e)} is too large to expand in a lemma").at(node)
        base = self.normal(node.base)
        if e < 0:
            base, e = self._inverse(base, node.base), -e
        self.limits.require("lemma_degree", e * _degree_of(base), f"the power {e} here")
        out = power(base, e, self.limits.terms)
        return out

    def _ListExpr(self, node):
        raise DomainError("a list stands where a number is needed").at(node)

    def _FiniteSum(self, node):
        lower, upper = self.scalar(node.lower), self.scalar(node.upper)
        if is_symbolic(lower) or is_symbolic(upper) or lower.denominator != 1 or upper.denominator != 1:
            raise DomainError("the ends of a sum in a lemma must be whole numbers").at(node)
        count = max(0, upper.numerator - lower.numerator + 1)
        self.limits.require("definition_terms", count, f"a sum of {rough_int(count)} terms")
        saved = self.env.get(node.var, None)
        total: dict = {}
        try:
            for j in range(lower.numerator, upper.numerator + 1):
                self.env[node.var] = Fraction(j)
                total = add(total, self.normal(node.body))
        finally:
            if saved is None:
                self.env.pop(node.var, None)
            else:
                self.env[node.var] = saved
        return total

    def _Call(self, node):
        spec = REGISTRY.get(node.name)
        if spec is None:
            return _const(self.evaluator.number(node))     # the evaluator's message
        args = tuple(self.argument(a) for a in node.args)
        if not is_symbolic(args):
            if spec.arithmetic:
                return _const(self.evaluator.call(node.name, args, node))
            if node.name == "sawtooth" and len(args) == 1 and not isinstance(args[0], tuple) \
                    and args[0].denominator == 1:
                return {}
            # defined? (the value is memoised; a bad call is the user's error, found here)
            self.evaluator.call(node.name, args, node)
            atom = (node.name, args)
            self.positions.setdefault(atom, node.pos)
            return atom_nf(atom)
        simplified = self._symbolic_call(node, args)
        if simplified is not None:
            return simplified
        atom = (node.name, args)
        why = atom_problem(self.facts, atom)
        if why:
            raise DomainError(f"{atom_label(atom)} is not defined for every allowed value: {why}").at(node)
        self.positions.setdefault(atom, node.pos)
        return atom_nf(atom)

    # -- symbolic arguments ------------------------------------------------
    def _symbolic_call(self, node, args):
        name = node.name
        if not REGISTRY[name].arity[0] <= len(args) <= REGISTRY[name].arity[1]:
            raise DomainError(f"{name} takes {REGISTRY[name].signature}").at(node)
        if name in ("floor", "ceil", "frac"):
            x = args[0]
            f = floor_of(self.facts, x) if name != "ceil" else _neg_or_none(floor_of(self.facts, -x))
            if f is None:
                raise DomainError(f"{name}({value_label(x)}) is not fixed by the assumptions "
                                  f"(they do not determine the residue it depends on)"
                                  f"{_split_hint(x)}").at(node)
            return _const(x - f if name == "frac" else f)
        if name == "mod":
            a, m = args
            why = _first(self.facts.integral(a), self.facts.integral(m), self.facts.at_least(m, 1))
            if why:
                raise DomainError(f"mod({value_label(a)}, {value_label(m)}) needs integers and "
                                  f"m >= 1 here: {why}").at(node)
            f = floor_of(self.facts, a / m)
            if f is None:
                raise DomainError(f"mod({value_label(a)}, {value_label(m)}) is not fixed by the "
                                  f"assumptions{_split_hint(a / m)}").at(node)
            return _const(a - f * m)
        if name == "sawtooth" or (name == "periodic_bernoulli" and args[0] == 1):
            v = fixed_sawtooth(self.facts, args[-1])
            return None if v is None else _const(v)
        if name == "gcd" and len(args) == 2:
            why = self.facts.coprime(args[0], args[1])
            if why is None:
                return _const(Fraction(1))
            raise DomainError(f"gcd({value_label(args[0])}, {value_label(args[1])}) is not fixed by the "
                              f"assumptions (only gcd = 1 can be derived): {why}").at(node)
        if name == "binomial":
            n, j = args
            if is_symbolic(j) or j.denominator != 1:
                raise DomainError("binomial(n, j) with parameters needs a whole number j").at(node)
            out = Fraction(0) if j < 0 else Fraction(1)
            for i in range(max(0, j.numerator)):
                out = out * (n - i) / (i + 1)
            return _const(out)
        if name == "bernoulli" and len(args) == 2:
            n, x = args
            if is_symbolic(n) or n.denominator != 1 or n < 0:
                raise DomainError("bernoulli(n, x) with parameters needs a whole number n >= 0").at(node)
            n = n.numerator
            self.limits.require("bernoulli_index", n, f"bernoulli({value_text(n)}, x)")
            from math import comb
            total = Fraction(0)
            for j in range(n + 1):
                total = total + comb(n, j) * bernoulli(j) * x ** (n - j)
            return _const(total)
        if REGISTRY[name].arithmetic:
            raise DomainError(f"{name} of parameter expressions is not simplified by quasicert; "
                              "give its arguments numbers").at(node)
        return None


def _degree_of(x: dict) -> int:
    """The largest degree in the parameters among the coefficients and call arguments of x."""
    top = 0
    for m, c in x.items():
        if isinstance(c, RationalFunction):
            top = max(top, c.degree)
        for atom, _ in m:
            for a in atom[1]:
                for v in (a if isinstance(a, tuple) else (a,)):
                    if isinstance(v, RationalFunction):
                        top = max(top, v.degree)
    return top


def _neg_or_none(v):
    return None if v is None else -v


def _numerator(v):
    return RationalFunction.of(v.num, _ONE_POLY) if isinstance(v, RationalFunction) else v
