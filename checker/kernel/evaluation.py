"""Exact evaluation of expression trees.

Values are Fractions, or tuples of them for lists.  Every problem is a
CertificateError pointing at the sub-expression that caused it; every costly
step is measured against the Limits first.  No text is ever executed: the
tree comes from the grammar, and names resolve only to values bound by the
certificate or to the functions of ``checker.kernel.functions``.

x^0 = 1 for every x, 0^0 included: the combinatorial convention (Knuth, "Two notes on
notation", Amer. Math. Monthly 99, 1992), the one that normal forms (x^0 = 1 as a monomial),
identity shapes (degree 0) and lemmas (k^0 = 1) use too.
"""
from __future__ import annotations

import difflib
from fractions import Fraction

from ..language import expressions as ex
from ..mathematics.dedekind import dedekind_along_euclid
from ..foundation.errors import BudgetExceeded, CertificateError, CheckerBug, DomainError
from .functions import REGISTRY
from .ratios import Ratio, long_integer
from ..foundation.limits import DEFAULT_LIMITS, Limits, call_within, check_time, time_limit
from ..foundation.numbers import atom_text, rough_int, value_text
from ..mathematics.second_opinion import second_opinion

__all__ = ["Evaluator", "binding", "value_of_number_call"]

_MEMO_SIZE = 400_000
_LIST_FOR_NUMBER = "a list stands where a number is needed"
_TOO_DEEP = "the expression is nested too deeply to evaluate"
_EUCLID_MEMO_BITS = 256     # from this size on, one pass fills every pair of a reciprocity chain
# ... and up to this one: a pass keeps every pair of Euclid's walk, about 0.6 b^2 bits for b-bit
# numbers (2 GB at 50,000 digits, 30 GB at the 200,000 digits a literal may have), while a chain
# within the file-size limit has few lines once its numbers are this long (a line a step stops
# near 3,000 digits; derive writes about 100), and the kernel's O(log k) algorithm serves them
_EUCLID_PASS_MAX_BITS = 1 << 15


class Evaluator:
    """Evaluates trees in an environment of named values, with a memo of function values."""

    def __init__(self, env: dict | None = None, limits: Limits = DEFAULT_LIMITS,
                 paranoid: bool = False):
        self.env = dict(env or {})
        self.limits = limits
        self.memo: dict = {}
        self.paranoid = paranoid
        self.second_opinions = 0       # values computed twice, in paranoid mode
        self.chain_wanted = False      # set while a chain is replayed: s along Euclid at once
        self._along_euclid: dict = {}  # (h, k) -> 12 k s(h, k), integers, reduced only when asked

    # -- public -------------------------------------------------------------
    def value(self, node: ex.Expr):
        """Fraction or tuple of Fractions."""
        method = getattr(self, "_" + type(node).__name__)
        try:
            return method(node)
        except CertificateError as e:
            raise e.at(node)
        except RecursionError:
            raise BudgetExceeded(_TOO_DEEP).at(node) from None

    def number(self, node: ex.Expr) -> Fraction:
        v = self.value(node)
        if isinstance(v, tuple):
            raise DomainError(_LIST_FOR_NUMBER).at(node)
        return v

    def number_of_call(self, name: str, numbers: tuple, tree) -> Fraction:
        """number(Call(name, (Num(n), ...))) without building the tree first.

        The steps `number` takes on that node (each argument a Fraction, then `call`, a
        list refused) and the same errors, `tree()` making the node only when an error
        needs its position; the value is not looked up in the memo nor remembered.  A
        function whose spec `takes_ints` (no cost, no limits) gets the ints themselves, after
        the same arity check and clock, when `_compute` would do nothing else for it."""
        try:
            spec = REGISTRY.get(name)
            if spec is None:
                raise DomainError(_unknown_function(name))
            low, high = spec.arity
            if spec.takes_ints and low <= len(numbers) <= high and not self.paranoid \
                    and not self.chain_wanted and not self._along_euclid:
                check_time()
                v = spec.impl(*numbers)
                self._check_size(v)
            else:
                v = self._compute(name, spec, tuple(map(Fraction, numbers)))
        except CertificateError as e:
            raise e.at(tree())
        except RecursionError:
            raise BudgetExceeded(_TOO_DEEP).at(tree()) from None
        if isinstance(v, tuple):
            raise DomainError(_LIST_FOR_NUMBER).at(tree())
        return v

    def call(self, name: str, args: tuple, node=None):
        """Value of a function at concrete arguments, memoised."""
        spec = REGISTRY.get(name)
        if spec is None:
            raise DomainError(_unknown_function(name)).at(node)
        key = (name, _canonical(name, args))
        memo = self.memo
        hit = memo.get(key)
        if hit is not None:
            return hit
        result = self._compute(name, spec, args)
        if len(memo) > _MEMO_SIZE:
            memo.clear()
        memo[key] = result
        return result

    def _compute(self, name: str, spec, args: tuple):
        """Value of a function at concrete arguments, not looked up in the memo."""
        check_time()
        if name == "partitions" and len(args) == 2:
            value = self._from_partition_table(args)
            if value is not None:
                return value
        if name == "dedekind" and not self.paranoid and (self.chain_wanted or self._along_euclid):
            value = self._from_euclid_pass(args)
            if value is not None:
                return value
        result = spec.call(args, self.limits)
        self._check_size(result)
        if self.paranoid:
            self._second_opinion(name, args, result)
        return result

    def exact_call(self, name: str, args: tuple, node=None):
        """call(name, args) for comparing lines of a chain: a Dedekind value from the chain's
        Euclid pass comes as the unreduced Ratio t/(12 k) (lines are compared by
        cross-multiplication, so its gcd would be wasted); every other value as call gives it."""
        if name == "dedekind" and not self.paranoid and name in REGISTRY:
            found = self._euclid_twelve(args)
            if found is not None:
                t, k = found
                return Ratio(t, 12 * k)
        return self.call(name, args, node)

    def _second_opinion(self, name, args, result):
        other = second_opinion(name, args)
        if other is None:
            return
        value, method = other
        self.second_opinions += 1
        if value != result:
            raise CheckerBug(f"{atom_text((name, args))} is {value_text(result)} by the kernel but "
                             f"{value_text(value)} by {method}: this is a bug in quasicert, "
                             "please report it with this certificate")

    # -- nodes --------------------------------------------------------------
    def _Num(self, node):
        return Fraction(node.value)

    def _Name(self, node):
        if node.name in self.env:
            return self.env[node.name]
        if node.name in REGISTRY:
            raise DomainError(f"'{node.name}' is a function: call it as "
                              f"{node.name}({REGISTRY[node.name].signature})")
        near = difflib.get_close_matches(node.name, list(self.env), n=1)
        hint = f" (did you mean '{near[0]}'?)" if near else ""
        raise DomainError(f"unknown name '{node.name}'{hint}: give it a value with `let` first")

    def _Neg(self, node):
        return -self.number(node.operand)

    def _Sum(self, node):
        # an int while every term is an integer (a Fraction sum costs gcds); the same
        # running totals, so the same size checks, as the Fraction loop below
        total, terms, limit = 0, node.terms, self.limits.integer_bits
        for index, (sign, term) in enumerate(terms):
            v = term.value if type(term) is ex.Num else self.number(term)
            if type(v) is not int:
                if v.denominator != 1:
                    break
                v = v.numerator
            total = total + v if sign > 0 else total - v
            if max(total.bit_length(), 1) > limit:
                self._check_size(Fraction(total), term)
        else:
            return Fraction(total)
        total = Fraction(total) + v if sign > 0 else Fraction(total) - v     # the first non-integer term
        self._check_size(total, term)
        for sign, term in terms[index + 1:]:
            v = self.number(term)
            total = total + v if sign > 0 else total - v
            self._check_size(total, term)
        return total

    def _Product(self, node):
        factors = node.factors
        if len(factors) == 2 and type(factors[0][1]) is ex.Num and type(factors[1][1]) is ex.Num:
            # the common literal p/q or p*q: one Fraction instead of three
            a, (divide, b) = factors[0][1].value, factors[1]
            if not divide:
                return Fraction(a * b.value)
            if b.value == 0:
                raise DomainError("division by zero: this divisor is 0").at(b)
            return Fraction(a, b.value)
        acc = Fraction(1)
        for divide, factor in node.factors:
            v = self.number(factor)
            if divide:
                if v == 0:
                    raise DomainError("division by zero: this divisor is 0").at(factor)
                acc = acc / v
            else:
                acc = acc * v
            self._check_size(acc, factor)
        return acc

    def _Power(self, node):
        base = self.number(node.base)
        exponent = self.number(node.exponent)
        if exponent.denominator != 1:
            raise DomainError(f"the exponent must be an integer, not {value_text(exponent)} "
                              "(a fractional power is not rational in general)").at(node.exponent)
        e = exponent.numerator
        if base == 0 and e < 0:
            raise DomainError("0 to a negative power is a division by zero").at(node)
        if e == 0:
            return Fraction(1)       # x^0 = 1 for every x, 0^0 included (the one convention)
        if base in (0, 1):
            return base
        if base == -1:
            return Fraction(1 if e % 2 == 0 else -1)
        size = max(base.numerator.bit_length(), base.denominator.bit_length())
        # a lower bound on the result's size, within a factor 2: refuse before computing
        needed = (size - 1) * abs(e) + 1 if abs(e) < (1 << 64) else 1 << 64
        self.limits.require("integer_bits", needed, f"the power {_short(base)}^{_short(exponent)}")
        result = base ** e
        self._check_size(result, node)
        return result

    def _Call(self, node):
        # a literal argument as _Num reads it, without the dispatch (claims are mostly f(n, m))
        args = tuple([Fraction(a.value) if type(a) is ex.Num else self.value(a) for a in node.args])
        return self.call(node.name, args, node)

    def _ListExpr(self, node):
        cache = self.__dict__.setdefault("_literal_lists", {})
        hit = cache.get(id(node))
        if hit is not None and hit[0] is node:
            return hit[1]
        value = tuple(self.value(item) for item in node.items)
        if _literal(node):
            # identities evaluate the same table at many points: build it once
            cache[id(node)] = (node, value)
        return value

    def _FiniteSum(self, node):
        lower = _integer(self.number(node.lower), "the lower end of a sum", node.lower)
        upper = _integer(self.number(node.upper), "the upper end of a sum", node.upper)
        count = upper - lower + 1
        self.limits.require("terms", max(count, 0), f"a sum of {rough_int(max(count, 0))} terms")
        total = Fraction(0)
        for _ in binding(self.env, node.var, range(lower, upper + 1)):
            check_time()
            total += self.number(node.body)
            self._check_size(total, node)
        return total

    # -- helpers ------------------------------------------------------------
    def _check_size(self, v, node=None):
        if isinstance(v, Fraction):
            numerator, denominator = v.as_integer_ratio()    # one call, not two properties and max
            limit = self.limits.integer_bits
            if numerator.bit_length() > limit or denominator.bit_length() > limit:
                raise _too_large(v, self.limits).at(node)

    def _remember(self, key, value):
        if len(self.memo) > _MEMO_SIZE:
            self.memo.clear()
        self.memo[key] = value

    def _from_partition_table(self, args):
        """p_A(n) from a table kept for A and grown as needed (identities ask for n = 0, 1, 2, ...)."""
        from ..mathematics.partitions import check_parts
        n, parts = args
        if not (isinstance(n, Fraction) and n.denominator == 1 and isinstance(parts, tuple)):
            return None
        try:
            parts = check_parts(parts)
        except CertificateError:
            return None
        n = n.numerator
        if n < 0:
            return Fraction(0)
        tables = self.__dict__.setdefault("_partition_tables", {})
        table = tables.get(parts)
        if table is None or n >= len(table):
            size = max(n + 1, 2 * len(table) if table else 0)
            if size * len(parts) > min(self.limits.terms, 4_000_000) or size > 1_000_000:
                return None          # the kernel's own choice (quasi-polynomial) is cheaper
            table = _table(parts, size)
            tables[parts] = table
        return Fraction(table[n])

    def _from_euclid_pass(self, args):
        """s(h, k) from one integer pass along Euclid's chain, made when a chain wants many values.

        One value alone is the kernel's O(log k) algorithm; a chain of reciprocity
        steps asks for s at every pair of the Euclid chain, which one pass gives
        as integers 12 k s(h, k); only the values asked for become Fractions."""
        found = self._euclid_twelve(args)
        return None if found is None else Fraction(int(found[0]), 12 * int(found[1]))

    def _euclid_twelve(self, args):
        """(t, k') with s(h, k) = t / (12 k') from the Euclid pass, or None (see _from_euclid_pass)."""
        if not (self.chain_wanted or self._along_euclid) or len(args) != 2 \
                or not all(isinstance(a, Fraction) and a.denominator == 1 for a in args):
            return None
        h, k = args[0].numerator, args[1].numerator
        if k < 1 or not _EUCLID_MEMO_BITS <= k.bit_length() <= _EUCLID_PASS_MAX_BITS:
            return None
        # the pass's keys are coprime pairs (h mod k, k), so a key met as it is needs no gcd
        pair = (h % k, k)
        t = self._along_euclid.get(pair)
        if t is None:
            pair = _reduced(h, k)
            t = self._along_euclid.get(pair)
        if t is None:
            if not self.chain_wanted:
                return None
            if len(self._along_euclid) > _MEMO_SIZE:
                self._along_euclid.clear()
            try:
                # long_integer: the same integers, GMP's arithmetic when gmpy2 is there
                self._along_euclid.update(dedekind_along_euclid(*map(long_integer, pair)))
            except ArithmeticError as e:          # an inexact division: the recurrence is wrong
                raise CheckerBug(f"{e}: this is a bug in quasicert, please report it") from None
            t = self._along_euclid[pair]
        return t, pair[1]


def value_of_number_call(call, limits: Limits = DEFAULT_LIMITS) -> Fraction:
    """`Evaluator(None, limits).number_of_call(name, numbers, call.tree)` inside
    `time_limit(limits.seconds)`, for a NumberCall (name, numbers, ...): the same value or error.

    What `evaluate` does with most texts.  A function whose spec `takes_ints` is called
    here as number_of_call calls it on a fresh Evaluator (never paranoid, no chain): the
    arity, the clock, the size of the value, each error at the call's position; without
    building the Evaluator and without the context manager, which cost 0.7 us a call
    together, a seventh of a 20-digit Dedekind sum.  Every other call goes through
    number_of_call itself."""
    name, numbers, _ = call
    spec = REGISTRY.get(name)
    if spec is None or not spec.takes_ints or not spec.arity[0] <= len(numbers) <= spec.arity[1]:
        with time_limit(limits.seconds):
            return Evaluator(None, limits).number_of_call(name, numbers, call.tree)
    try:
        v = call_within(limits.seconds, spec.impl, numbers)
    except CertificateError as e:
        raise e.at(call.tree())
    except RecursionError:
        raise BudgetExceeded(_TOO_DEEP).at(call.tree()) from None
    if isinstance(v, Fraction):
        numerator, denominator = v.as_integer_ratio()        # as _check_size
        limit = limits.integer_bits
        if numerator.bit_length() > limit or denominator.bit_length() > limit:
            raise _too_large(v, limits).at(call.tree())
    elif isinstance(v, tuple):
        raise DomainError(_LIST_FOR_NUMBER).at(call.tree())
    return v


def _too_large(v: Fraction, limits: Limits) -> BudgetExceeded:
    bits = max(v.numerator.bit_length(), v.denominator.bit_length())
    return BudgetExceeded(f"an intermediate value has {bits} bits, over the limit "
                          f"integer-bits = {limits.integer_bits}")


_MISSING = object()


def binding(env: dict, var: str, values):
    """Bind `var` to each value in turn (as a Fraction), restoring what it was afterwards."""
    saved = env.get(var, _MISSING)
    try:
        for v in values:
            env[var] = Fraction(v)
            yield v
    finally:
        if saved is _MISSING:
            env.pop(var, None)
        else:
            env[var] = saved


def _literal(node) -> bool:
    """Numbers, fractions, signs and lists of them only: the value cannot change."""
    stack = [node]
    while stack:
        x = stack.pop()
        if not isinstance(x, (ex.Num, ex.ListExpr, ex.Neg, ex.Product, ex.Sum)):
            return False
        stack.extend(ex.children(x))
    return True


def _table(parts, size):
    from itertools import accumulate
    table = [1] + [0] * (size - 1)
    for a in parts:
        for r in range(min(a, size)):
            table[r::a] = accumulate(table[r::a])
    return table


def _canonical(name, args):
    """Memo key: periodic functions depend on their argument modulo the period only."""
    try:
        if name == "dedekind" and len(args) == 2:
            h, k = args
            if k.denominator == 1 and h.denominator == 1 and k.numerator >= 1:
                # ints: equal to and hashed like the Fractions they stand for, and cheaper
                k = k.numerator
                return (h.numerator % k, k)
            return args
        if name == "fourier_dedekind" and len(args) == 3 and isinstance(args[1], tuple) \
                and args[2].denominator == 1 and args[2] >= 1 and args[0].denominator == 1:
            b = args[2]
            return (args[0] % b, args[1], b)
    except (AttributeError, TypeError):
        pass
    return args


def _reduced(h, k):
    from math import gcd
    h %= k
    g = gcd(h, k)
    return h // g, k // g


def _integer(v: Fraction, what: str, node) -> int:
    if v.denominator != 1:
        raise DomainError(f"{what} must be an integer, not {value_text(v)}").at(node)
    return v.numerator


def _short(v: Fraction) -> str:
    s = f"{v.numerator}" if v.denominator == 1 and v.numerator.bit_length() < 200 else "a big number"
    return s if v.denominator == 1 else "a fraction"


def _unknown_function(name: str) -> str:
    from .functions import FORMER_NAMES, LITERATURE_NAMES
    if name in FORMER_NAMES:
        return f"the function {name} is now called {FORMER_NAMES[name]} (same arguments)"
    if name in LITERATURE_NAMES:
        written, call = LITERATURE_NAMES[name]
        return (f"unknown function '{name}': for {written} write {call}; `quasicert functions` "
                "lists them")
    near = difflib.get_close_matches(name, list(REGISTRY), n=2)
    hint = f" (did you mean {' or '.join(near)}?)" if near else ""
    return f"unknown function '{name}'{hint}; `quasicert functions` lists them"
