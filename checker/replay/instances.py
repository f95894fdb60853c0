"""Parameter values that satisfy a lemma's conditions, for its numeric second opinion.

Not part of the trusted base: it only proposes values, and every proposed
tuple is filtered by evaluating the conditions exactly.  Parameters are
chosen in the order they are declared; for each, the conditions that are
linear in it once the earlier ones have values give a range and a residue
class, so that `k = 1 mod 4`, `h < k` and `h*h' == 1 mod k` are met directly
instead of by luck.  Small instances come first (every tuple of the first
values, in order of their total index), then random ones of 2 to 30 digits, drawn from an
unpredictable source each run (a seed, `--seed N`, draws the same ones again).
"""
from __future__ import annotations

import random
import secrets
from dataclasses import dataclass
from fractions import Fraction
from math import gcd

from ..language import expressions as ex
from ..foundation.errors import CertificateError, OutOfTime
from ..kernel.verdicts import compare, congruent

__all__ = ["Sampler", "names_in"]

SMALL = 120
LARGE = 30
_SMALL_TRIES = 20_000
_LARGE_TRIES = 600
_MAX_PLANS = 50_000
_SMALL_PLANS = 4_000        # parameter choices worked out before the small search gives up


def names_in(node) -> set:
    out, stack = set(), [node]
    while stack:
        n = stack.pop()
        if isinstance(n, ex.Name):
            out.add(n.name)
        elif isinstance(n, ex.FiniteSum):
            out |= (names_in(n.lower) | names_in(n.upper) | (names_in(n.body) - {n.var}))
            continue
        stack.extend(ex.children(n))
    return out


@dataclass
class _Plan:
    lo: int | None
    hi: int | None
    r: int
    m: int
    multiple_of: int | None = None      # x must divide this number (x the modulus of a congruence)


class Sampler:
    """Proposes and filters instances of `params` under `conditions` (statements.Condition)."""

    def __init__(self, evaluator, params: tuple, conditions: tuple, extra=(), seed: int | None = None):
        self.evaluator = evaluator
        self.params = params
        self.conditions = tuple(conditions)
        self.extra = tuple(extra)       # (var, r, m): a case's residue class
        # an unpredictable source unless a seed is given: a false statement must not be able to
        # vanish exactly at the instances drawn (the symbolic check is the proof, this a backstop)
        self.random = random.Random(seed if seed is not None else secrets.randbits(64))
        self.names = [names_in(c.lhs) | names_in(c.rhs) | (names_in(c.modulus) if c.modulus else set())
                      for c in self.conditions]
        self.tried = 0
        self._plans: dict = {}
        self.planned = 0

    # -- exact filtering ----------------------------------------------------
    def _value(self, node, env):
        saved = dict(self.evaluator.env)
        self.evaluator.env.update(env)
        try:
            return self.evaluator.number(node)
        finally:
            self.evaluator.env.clear()
            self.evaluator.env.update(saved)

    def holds(self, cond, env) -> bool:
        try:
            lhs, rhs = self._value(cond.lhs, env), self._value(cond.rhs, env)
            if cond.relation == "==":
                m = self._value(cond.modulus, env)
                return m != 0 and m.denominator == 1 and congruent(lhs, rhs, m)
            return compare(lhs, cond.relation, rhs)
        except OutOfTime:
            raise               # the whole check stops, not this value
        except CertificateError:
            return False

    def allowed(self, env) -> bool:
        if any((env[v] - r) % m for v, r, m in self.extra):
            return False
        return all(self.holds(c, env) for c in self.conditions)

    # -- one parameter at a time ------------------------------------------------
    def _plan(self, x: str, env: dict) -> _Plan | None:
        key = (x, tuple(sorted(env.items())))
        if key not in self._plans:
            if len(self._plans) > _MAX_PLANS:
                self._plans.clear()
            self._plans[key] = self._new_plan(x, env)
        return self._plans[key]

    def _new_plan(self, x: str, env: dict) -> _Plan | None:
        self.planned += 1
        lo = hi = None
        r, m = 0, 1
        multiple = None
        known = set(env) | {x}
        for cond, names in zip(self.conditions, self.names):
            if cond.relation == "==" and isinstance(cond.modulus, ex.Name) and cond.modulus.name == x \
                    and x not in names_in(cond.lhs) | names_in(cond.rhs) and names - {x} <= set(env) | set(self.evaluator.env):
                try:
                    v = self._value(cond.lhs, env) - self._value(cond.rhs, env)
                except OutOfTime:
                    raise               # the whole check stops, not this value
                except CertificateError:
                    continue
                if v.denominator == 1 and v:
                    multiple = abs(v.numerator)
                continue
            if x not in names or not names <= known | set(self.evaluator.env):
                continue
            line = self._linear(cond, x, env)
            if line is None:
                continue
            a, b = line                       # lhs - rhs = a x + b
            if cond.relation == "==":
                try:
                    mod = self._value(cond.modulus, env)
                except OutOfTime:
                    raise               # the whole check stops, not this value
                except CertificateError:
                    continue
                if mod == 0 or mod.denominator != 1 or a.denominator != 1 or b.denominator != 1:
                    continue
                merged = _merge(r, m, int(a), -int(b), abs(int(mod)))
                if merged is None:
                    return None
                r, m = merged
            elif cond.relation in ("<", "<=", ">", ">=") and a:
                strict = cond.relation in ("<", ">")
                sign = 1 if cond.relation in (">", ">=") else -1
                # sign (a x + b) >= 0 (> 0 when strict)
                bound = Fraction(-b, 1) / a
                if (sign > 0) == (a > 0):
                    v = -((-bound).__floor__()) if not strict else bound.__floor__() + 1
                    lo = v if lo is None else max(lo, v)
                else:
                    v = bound.__floor__() if not strict else -((-bound).__floor__()) - 1
                    hi = v if hi is None else min(hi, v)
        for v, rr, mm in self.extra:
            if v == x:
                merged = _merge(r, m, 1, rr, mm)
                if merged is None:
                    return None
                r, m = merged
        return _Plan(lo, hi, r, m, multiple)

    def _linear(self, cond, x, env):
        try:
            values = []
            for t in (0, 1, 7):
                e = dict(env)
                e[x] = Fraction(t)
                values.append(self._value(cond.lhs, e) - self._value(cond.rhs, e))
        except OutOfTime:
            raise               # the whole check stops, not this value
        except CertificateError:
            return None
        a, b = values[1] - values[0], values[0]
        if values[2] != 7 * a + b:
            return None
        return a, b

    @staticmethod
    def _nth(plan: _Plan, i: int, big: bool, rnd) -> int | None:
        r, m = plan.r, plan.m
        if plan.lo is not None:
            first = plan.lo + (r - plan.lo) % m
            v = first + i * m
            return v if plan.hi is None or v <= plan.hi else None
        if plan.hi is not None:
            last = plan.hi - (plan.hi - r) % m
            return last - i * m
        t = (i + 1) // 2 * (-1 if i % 2 else 1)
        if big and rnd.random() < 0.5:
            t = -t
        return r + m * t

    # -- proposals ------------------------------------------------------------
    def small(self, count: int = SMALL) -> list:
        found = []
        for total in range(0, 400):
            for env in self._with_total(0, {}, total):
                self.tried += 1
                if self.allowed(env):
                    found.append(env)
                    if len(found) >= count:
                        return found
                if self.tried >= _SMALL_TRIES or self.planned >= _SMALL_PLANS:
                    return found
        return found

    def _with_total(self, index: int, env: dict, left: int):
        if index == len(self.params):
            if left == 0:
                yield dict(env)
            return
        x = self.params[index]
        plan = self._plan(x, env)
        if plan is None:
            return
        last = index == len(self.params) - 1
        for i in ([left] if last else range(left + 1)):
            v = self._nth(plan, i, False, None)
            if v is None:
                break
            env[x] = Fraction(v)
            yield from self._with_total(index + 1, env, left - i)
            del env[x]

    def large(self, count: int = LARGE) -> list:
        found = []
        for _ in range(_LARGE_TRIES):
            env = {}
            for x in self.params:
                plan = self._plan(x, env)
                if plan is None:
                    break
                if plan.multiple_of is not None:
                    # a modulus: a large divisor of what it must divide
                    d = next((d for d in range(self.random.randint(1, 12), 200) if plan.multiple_of % d == 0), 1)
                    env[x] = Fraction(plan.multiple_of // d)
                    continue
                span = 10 ** self.random.randint(1, 30)
                if plan.lo is not None and plan.hi is not None:
                    span = min(span, (plan.hi - plan.lo) // plan.m + 1)
                v = self._nth(plan, self.random.randrange(max(span, 1)), True, self.random)
                if v is None:
                    break
                env[x] = Fraction(v)
            else:
                if self.allowed(env):
                    found.append(env)
                    if len(found) >= count:
                        break
        return found


def _merge(r: int, m: int, a: int, b: int, mod: int):
    """The class of x with x = r (mod m) and a x = b (mod mod), or None if there is none."""
    g = gcd(a, mod)
    if b % g:
        return None
    step = mod // g
    s = (b // g) * pow(a // g, -1, step) % step if step > 1 else 0
    # combine x = r (mod m) and x = s (mod step)
    g2 = gcd(m, step)
    if (s - r) % g2:
        return None
    lcm = m // g2 * step
    if lcm > 10**40:
        return r, m
    t = ((s - r) // g2) * pow(m // g2, -1, step // g2) % (step // g2) if step // g2 > 1 else 0
    return (r + m * t) % lcm, lcm
