"""Replaying lemmas: statements for all integer values of parameters under assumptions.

A lemma is accepted when
1. every step of its chains follows by the cited rules, with the rules' side
   conditions derived from the assumptions (``kernel.check_step`` with
   ``symbolic_rules`` and ``assumptions``), and the last chain (of each residue
   class) goes from the left side to the right side of the statement;
2. a split covers every residue class the assumptions allow
   (``kernel.uncovered_residues``);
3. a numeric second opinion agrees: the statement and every line of every
   chain, evaluated exactly by the kernel at many instances (``instances``).
   A disagreement after 1 and 2 passed is a bug of quasicert (exit 3).

This module orchestrates and words the report; the judgements are the
kernel's and the assumptions' own.
"""
from __future__ import annotations

import difflib
import hashlib
from dataclasses import dataclass
from fractions import Fraction

from ..language import expressions as ex
from ..language import statements as st
from ..kernel.assumptions import Assumptions
from ..foundation.errors import BudgetExceeded, CertificateError, DomainError, OutOfTime, RuleRefused
from ..kernel.functions import REGISTRY
from .instances import Sampler, names_in
from ..kernel.verdicts import check_step, conclusion_problem, known_rule, uncovered_residues
from ..foundation.numbers import rough_int, value_text
from ..kernel.rational_functions import RationalFunction
from .report import Failure
from .step_details import cited_rules, lemma_statements, rule_details, short, unknown_rule
from ..kernel.rules import RULES, WHOLE_LINE_RULES
from ..kernel.normal import sub
from ..kernel.symbolic import SymbolicNormaliser, is_symbolic, line_text, value_label
from ..kernel.symbolic_rules import rewrite as symbolic_rewrite

__all__ = ["LemmaInfo", "LemmaCheck", "instantiate", "Scope", "lemma_facts"]


_SHOWN_INSTANCES = 3


@dataclass(frozen=True)
class LemmaInfo:
    """A verified lemma, ready to be used."""
    name: str
    params: tuple
    conditions: tuple            # statements.Condition
    condition_texts: tuple       # as written, for messages
    lhs: ex.Expr
    rhs: ex.Expr
    origin: str                  # the certificate it was proved in
    line: int


class Scope:
    """Verified equalities by label: this lemma's chains, then the certificate's."""

    def __init__(self, outer, local: dict | None = None):
        self.outer = outer
        self.local = dict(local or {})

    def __contains__(self, label):
        return label in self.local or label in self.outer

    def __getitem__(self, label):
        return self.local[label] if label in self.local else self.outer[label]


def condition_kind(cond: st.Condition) -> str:
    if cond.relation == "=" and isinstance(cond.lhs, ex.Call) and cond.lhs.name == "gcd" \
            and len(cond.lhs.args) == 2:
        return "gcd"
    return cond.relation


def condition_values(norm: SymbolicNormaliser, cond: st.Condition):
    """(kind, lhs, rhs, modulus) as values; gcd(a, b) = 1 becomes ('gcd', a, b, None)."""
    kind = condition_kind(cond)
    if kind == "gcd":
        one = norm.scalar(cond.rhs)
        if one != 1:
            raise DomainError("an equality assumption must be gcd(a, b) = 1").at(cond.rhs)
        return kind, norm.scalar(cond.lhs.args[0]), norm.scalar(cond.lhs.args[1]), None
    if kind in ("=", "!="):
        raise DomainError("an assumption is a bound (<, <=, >, >=), a congruence (a == b mod m) or "
                          "gcd(a, b) = 1").at(cond)
    modulus = norm.scalar(cond.modulus) if cond.modulus is not None else None
    return kind, norm.scalar(cond.lhs), norm.scalar(cond.rhs), modulus


def lemma_facts(norm: SymbolicNormaliser, facts: Assumptions, conditions) -> None:
    """Add each condition to `facts` (raises CertificateError at the condition)."""
    for cond in conditions:
        kind, lhs, rhs, modulus = condition_values(norm, cond)
        why = facts.assume(kind, lhs, rhs, modulus)
        if why:
            raise DomainError(f"this assumption cannot be used: {why}").at(cond)


def instantiate(evaluator, info: LemmaInfo, ref: st.RuleRef, facts: Assumptions, env: dict):
    """The lemma's (lhs, rhs) normal forms at the values of `ref.args`, after checking that
    the values satisfy its assumptions; raises CertificateError saying which does not."""
    if len(ref.args) != len(info.params):
        raise DomainError(f"lemma {info.name} has {len(info.params)} parameter"
                          f"{'s' if len(info.params) != 1 else ''} ({', '.join(info.params)}), "
                          f"but {len(ref.args)} value{'s are' if len(ref.args) != 1 else ' is'} given").at(ref)
    here = SymbolicNormaliser(evaluator, facts, env)
    values = tuple(here.scalar(a) for a in ref.args)
    binding = dict(zip(info.params, values))
    inst = SymbolicNormaliser(evaluator, facts, binding)
    shown = ", ".join(f"{p} = {value_label(v)}" for p, v in binding.items())
    for (p, v), node in zip(binding.items(), ref.args):
        # a lemma speaks of integers: its statement says nothing at other values
        why = facts.integral(v)
        if why:
            raise RuleRefused(f"lemma {info.name} holds for integer {p} only, and {p} = {value_label(v)} "
                              f"is not {'an integer' if not facts.params else 'known to be an integer'}: "
                              f"{why}", node.pos.line, node.pos.column)
    for cond, text in zip(info.conditions, info.condition_texts):
        try:
            kind, lhs, rhs, modulus = condition_values(inst, cond)
            why = facts.implies(kind, lhs, rhs, modulus)
        except OutOfTime:
            raise               # the whole check stops, not this value
        except CertificateError as e:
            why = e.message
        if why and not facts.params:
            raise RuleRefused(f"lemma {info.name} needs {text}, which is false for {shown}",
                              ref.pos.line, ref.pos.column)
        if why:
            raise RuleRefused(f"lemma {info.name} needs {text}, which does not follow for {shown}: {why}",
                              ref.pos.line, ref.pos.column)
    try:
        return inst.normal(info.lhs), inst.normal(info.rhs)
    except OutOfTime:
        raise               # the whole check stops, not this value
    except CertificateError as e:
        raise RuleRefused(f"lemma {info.name} at {shown}: {e.message}", ref.pos.line, ref.pos.column) from None


class LemmaCheck:
    """Checks one lemma statement inside a certificate replay."""

    def __init__(self, replay, stmt: st.Lemma):
        self.replay = replay
        self.stmt = stmt
        self.evaluator = replay.evaluator
        self.limits = replay.limits
        self.env = {p: RationalFunction.variable(p) for p in stmt.params}
        self.steps = 0

    # -- the whole lemma ------------------------------------------------------
    def run(self) -> LemmaInfo | None:
        stmt = self.stmt
        self._check_names()
        facts = Assumptions(stmt.params)
        lemma_facts(SymbolicNormaliser(self.evaluator, facts, self.env), facts, stmt.conditions)
        self.sampler = Sampler(self.evaluator, stmt.params, stmt.conditions,
                               seed=_lemma_seed(getattr(self.replay, "seed", None), stmt))
        self._instances = None
        scope = Scope(self.replay.facts)
        final = stmt.split is None
        proofs = []
        for i, chain in enumerate(stmt.chains):
            result = self._chain(chain, facts, scope, None)
            if result is None:
                return None
            if final and i == len(stmt.chains) - 1:
                proofs.append((chain, result, facts, None))
        if stmt.split is None:
            if not stmt.chains:
                raise CertificateError("a lemma needs a proof: chains, or a split into residue classes").at(stmt)
        else:
            proofs = self._cases(stmt.split, facts, scope)
            if proofs is None:
                return None
        for chain, (start, end), case_facts, case in proofs:
            if not self._proves(chain, start, end, case_facts, case):
                return None
        if not self._second_opinion():
            return None
        texts = tuple(self._text_of(c) for c in stmt.conditions)
        info = LemmaInfo(stmt.name, stmt.params, stmt.conditions, texts, stmt.lhs, stmt.rhs,
                         self.replay.report.name, stmt.pos.line)
        return info

    def _text_of(self, node) -> str:
        p = node.pos
        lines = self.replay.report.text.splitlines()
        if p.line and p.line == p.end_line and p.line <= len(lines):
            return lines[p.line - 1][p.column - 1:p.end_column - 1]
        return "an assumption"

    def _check_names(self):
        stmt = self.stmt
        seen = set()
        for p in stmt.params:
            if p in seen:
                raise CertificateError(f"the parameter '{p}' is declared twice").at(stmt)
            seen.add(p)
            if p in REGISTRY or p in self.evaluator.env:
                raise CertificateError(f"the parameter '{p}' already names a function or a value; "
                                       "use a fresh name").at(stmt)
        for node in [stmt.lhs, stmt.rhs] + [c for cond in stmt.conditions
                                             for c in (cond.lhs, cond.rhs, cond.modulus) if c]:
            stray = sorted(names_in(node) - set(stmt.params))
            if stray:
                raise CertificateError(f"'{stray[0]}' is not a parameter of lemma {stmt.name}: its "
                                       "statement and assumptions may use only its parameters").at(node)

    # -- chains -----------------------------------------------------------------
    def _chain(self, chain: st.Chain, facts, scope: Scope, case):
        if chain.label and chain.label in scope.local:
            raise CertificateError(f"the label '{chain.label}' is already used in this lemma").at(chain)
        norm = SymbolicNormaliser(self.evaluator, facts, self.env)
        start = prev = norm.normal(chain.start)
        for index, step in enumerate(chain.steps, 1):
            self.replay._on_time(step)
            where = (f"lemma {self.stmt.name}{_case_words(case)}, step {index} of the chain at line "
                     f"{chain.pos.line}")
            norm.positions = {}
            nxt = norm.normal(step.expr)
            rules, extra = self._rules(step, where, facts)
            if rules is None:
                return None
            local = Scope(scope, extra)
            verdict = check_step(prev, nxt, rules, self._atom_value, local, self.limits,
                                 rewrite=lambda name, atom, target: symbolic_rewrite(facts, self.limits, name,
                                                                                      atom, target),
                                 multiplier_problem=lambda c: _multiplier_problem(facts, c))
            if not verdict.rule_ok:
                failure = self._step_failure(where, step, rules, verdict, prev, nxt, norm.positions, case)
                failure.details[:0] = lemma_statements(step, local, self.replay.report.text, line_text)
                self.replay._fail(failure)
                return None
            self.steps += 1
            prev = nxt
        if chain.label:
            scope.local[chain.label] = (start, prev)
        return start, prev

    def _rules(self, step, where, facts):
        rules, extra = [], {}
        for ref in step.rules:
            if ref.name == "lemma":
                info = self.replay.lemmas.get(ref.label)
                if info is None:
                    self.replay._fail(_unknown_lemma(ref, where, self.replay.lemmas))
                    return None, None
                try:
                    extra[f"lemma {ref.label}"] = instantiate(self.evaluator, info, ref, facts, self.env)
                except OutOfTime:
                    raise               # the whole check stops, not this value
                except CertificateError as e:
                    self.replay._fail(Failure(ref.pos.line, ref.pos.column,
                                              f"{where} does not follow: {e.message}", kind="failed",
                                              end_column=ref.pos.end_column))
                    return None, None
                rules.append(("claim", f"lemma {ref.label}"))
                continue
            if not known_rule(ref.name):
                self.replay._fail(unknown_rule(ref, where))
                return None, None
            rules.append((ref.name, ref.label))
        return rules, extra

    def _atom_value(self, name, args):
        if is_symbolic(args):
            raise RuleRefused("value needs numbers: this call has parameters in its arguments")
        return self.evaluator.call(name, args)

    def _step_failure(self, where, step, rules, verdict, prev, nxt, positions, case) -> Failure:
        cited = cited_rules(rules)
        pos = step.expr.pos
        line, column = pos.line, pos.column
        end = pos.end_column if pos.end_line == pos.line else None
        details, closest, mark = rule_details(cited, verdict, nxt, positions, line_text)
        if mark is not None:
            line, column, end = mark
        if closest is not None:
            details.append(f"this line is: {short(line_text(nxt))}")
            if not set(_atoms(nxt)) ^ set(_atoms(closest)):
                details.append(f"difference (this line - what the rule gives): "
                               f"{short(line_text(sub(nxt, closest)))}, not 0")
        details += self._numeric_step(step, case)
        return Failure(line, column, f"{where} does not follow by {cited}", details, kind="failed",
                       end_column=end)

    def _numeric_step(self, step, case) -> list:
        """A counterexample to the step at the lemma's instances, if there is one among the first."""
        prev_node = self._previous_line(step)
        if prev_node is None:
            return []
        tried = 0
        for env in self.instances(case)[:40]:
            tried += 1
            try:
                a = self.sampler._value(prev_node, env)
                b = self.sampler._value(step.expr, env)
            except OutOfTime:
                return ["numerically: not tried, the time limit passed"]
            except BudgetExceeded:
                continue
            except CertificateError as e:
                return [f"numerically: at {_env_text(env)} a line cannot be evaluated: {e.message}"]
            if a != b:
                return [f"numerically the step is false too: at {_env_text(env)} the previous line is "
                        f"{value_text(a)} and this line is {value_text(b)}"]
        if tried:
            return [f"numerically the two lines agree at {tried} instances: the step may be true, "
                    "but it does not follow by the rules cited"]
        return []

    def _previous_line(self, step):
        for chain in self._all_chains():
            if step in chain.steps:
                i = chain.steps.index(step)
                return chain.start if i == 0 else chain.steps[i - 1].expr
        return None

    def _all_chains(self):
        yield from self.stmt.chains
        if self.stmt.split:
            for case in self.stmt.split.cases:
                yield from case.chains

    # -- the conclusion and case splits -----------------------------------------
    def _proves(self, chain, start, end, facts, case) -> bool:
        norm = SymbolicNormaliser(self.evaluator, facts, self.env)
        lhs, rhs = norm.normal(self.stmt.lhs), norm.normal(self.stmt.rhs)
        problem = conclusion_problem(start, end, lhs, rhs)
        if not problem:
            return True
        have, want, node = (start, lhs, chain.start) if problem == "start" else (end, rhs, chain.steps[-1].expr)
        which = "start at the left side" if problem == "start" else "end at the right side"
        p = node.pos
        self.replay._fail(Failure(
            p.line, p.column, f"lemma {self.stmt.name}{_case_words(case)}: the last chain must {which} of the statement",
            [f"the chain {'starts' if problem == 'start' else 'ends'} at: {short(line_text(have))}",
             f"the statement has: {short(line_text(want))}"], kind="failed",
            end_column=p.end_column if p.end_line == p.line else None))
        return False

    def _cases(self, split: st.Split, facts, scope):
        stmt = self.stmt
        if split.var not in stmt.params:
            raise CertificateError(f"split on a parameter of lemma {stmt.name}, not on "
                                   f"'{split.var}'").at(split)
        m = self.evaluator.number(split.modulus)
        if m.denominator != 1 or m < 2:
            raise CertificateError("a split needs a whole modulus >= 2").at(split.modulus)
        m = m.numerator
        if m > 10_000:
            raise CertificateError(f"a split modulo {value_text(m)} has too many classes to check here (at most 10000)").at(split.modulus)
        residues = []
        for case in split.cases:
            r = self.evaluator.number(case.residue)
            if r.denominator != 1:
                raise CertificateError("a residue is a whole number").at(case.residue)
            r = r.numerator % m
            if r in residues:
                raise CertificateError(f"the residue {split.var} = {r} (mod {m}) is given twice").at(case)
            if r not in facts.possible_residues(split.var, m):
                raise CertificateError(f"the residue {split.var} = {r} (mod {m}) cannot happen under the "
                                       "assumptions; leave it out").at(case)
            residues.append(r)
        missing = uncovered_residues(facts, split.var, m, residues)
        if missing:
            shown = ", ".join(str(r) for r in missing[:10])
            p = split.pos
            self.replay._fail(Failure(p.line, p.column, f"lemma {stmt.name}: the residues given do not cover "
                                      f"{split.var} = {shown} (mod {m}), which the assumptions allow",
                                      [f"residues given: {', '.join(map(str, residues))}"], kind="failed"))
            return None
        proofs = []
        for case, r in zip(split.cases, residues):
            case_facts = facts.with_class(split.var, r, m)
            local = Scope(scope.outer, scope.local)
            result = None
            for chain in case.chains:
                result = self._chain(chain, case_facts, local, (split.var, r, m))
                if result is None:
                    return None
            proofs.append((case.chains[-1], result, case_facts, (split.var, r, m)))
        return proofs

    # -- the numeric second opinion -------------------------------------------------
    def instances(self, case=None) -> list:
        """The instances of the lemma, or those of one case (var, r, m)."""
        if self._instances is None:
            self._instances = self.sampler.small() + self.sampler.large()
        if case is None:
            return self._instances
        var, r, m = case
        return [e for e in self._instances if (e[var] - r) % m == 0]

    def _second_opinion(self) -> bool:
        stmt = self.stmt
        found = self.instances()
        if not found:
            p = stmt.pos
            self.replay._fail(Failure(p.line, p.column, f"lemma {stmt.name}: no values of "
                                      f"{', '.join(stmt.params)} satisfying the assumptions were found "
                                      f"(tried {self.sampler.tried}); a lemma about nothing proves nothing",
                                      kind="failed"))
            return False
        checks = [(None, chain, None) for chain in stmt.chains]
        if stmt.split:
            m = self.evaluator.number(stmt.split.modulus).numerator
            for case in stmt.split.cases:
                r = self.evaluator.number(case.residue).numerator % m
                checks += [((stmt.split.var, r, m), chain, case) for chain in case.chains]
        used = []
        for env in found:
            self.replay._on_time(stmt)
            try:
                bad = self._instance_problem(env, checks)
            except OutOfTime:
                raise               # the whole check stops, not this value
            except BudgetExceeded:
                continue                 # too costly at this instance: not evidence either way
            if bad:
                return self._bug(*bad)
            used.append(env)
        if not used:
            p = stmt.pos
            self.replay._fail(Failure(p.line, p.column, f"lemma {stmt.name}: none of the {len(found)} "
                                      "instances found can be evaluated within the limits, so there is no "
                                      "second opinion", kind="limit", exit_code=2))
            return False
        self.count = len(used)
        self.summary = _instance_summary(used, stmt.params)
        if len(used) < len(found):
            self.summary += f"; {len(found) - len(used)} more over the limits, skipped"
        return True

    def _instance_problem(self, env, checks):
        """(node, message, details) for the first disagreement at `env`, or None."""
        stmt = self.stmt
        bad = self._disagreement(env, stmt.lhs, stmt.rhs)
        if bad:
            return (stmt.rhs, f"lemma {stmt.name} passed its symbolic check but its two sides differ "
                    f"at {_env_text(env)}", bad)
        for cls, chain, _case in checks:
            if cls and (env[cls[0]] - cls[1]) % cls[2]:
                continue
            lines = [chain.start] + [s.expr for s in chain.steps]
            for a, b in zip(lines, lines[1:]):
                bad = self._disagreement(env, a, b)
                if bad:
                    return (b, f"lemma {stmt.name}: a step passed its symbolic check but is false at "
                            f"{_env_text(env)}", bad)
        return None

    def _disagreement(self, env, a, b) -> list:
        try:
            va, vb = self.sampler._value(a, env), self.sampler._value(b, env)
        except OutOfTime:
            raise               # the whole check stops, not this value
        except BudgetExceeded:
            raise
        except CertificateError as e:
            return [f"a line cannot be evaluated there: {e.message}"]
        if va == vb:
            return []
        return [f"left:  {value_text(va)}", f"right: {value_text(vb)}"]

    def _bug(self, node, message, details) -> bool:
        p = node.pos
        seed = getattr(self.replay, "seed", None)
        again = [f"the instances were drawn with --seed {seed}; the same seed draws them again"] \
            if seed is not None else []
        self.replay._fail(Failure(p.line, p.column, message,
                                  details + again +
                                  ["the symbolic replay accepted this, so this is a bug in "
                                   "quasicert: please report it with this certificate"],
                                  kind="checker bug", exit_code=3))
        return False


def _lemma_seed(seed, stmt) -> int | None:
    """Each lemma's own stream of random instances, fixed by the run's seed, its name and line."""
    if seed is None:
        return None
    digest = hashlib.sha256(f"{seed}:{stmt.name}:{stmt.pos.line}".encode()).digest()
    return int.from_bytes(digest[:8], "big")


def _case_words(case) -> str:
    return "" if case is None else f" (where {case[0]} = {case[1]} mod {case[2]})"


def _multiplier_problem(facts, c) -> str:
    if isinstance(c, RationalFunction):
        why = facts.nonzero(RationalFunction.of(c.den, {(): Fraction(1)}))
        if why:
            return f"the multiple {c} of the equality may be undefined: {why}"
    return ""


def _unknown_lemma(ref, where, lemmas) -> Failure:
    near = difflib.get_close_matches(ref.label, list(lemmas), n=1)
    hint = f" (did you mean {near[0]}?)" if near else ""
    return Failure(ref.pos.line, ref.pos.column, f"{where}: there is no lemma '{ref.label}' above this "
                   f"step{hint}", ["lemmas come from `lemma` statements above, or from `use`"], kind="error",
                   end_column=ref.pos.end_column)


def _atoms(x: dict):
    return {a for m in x for a, _ in m}


def _env_text(env: dict) -> str:
    return ", ".join(f"{k} = {value_text(v)}" for k, v in env.items())


def _instance_summary(found: list, params: tuple) -> str:
    parts = []
    for p in params:
        vs = [e[p] for e in found]
        parts.append(f"{p} from {_magnitude(min(vs))} to {_magnitude(max(vs))}")
    return "; ".join(parts)


def _magnitude(v: Fraction) -> str:
    n = abs(v.numerator)
    return value_text(v) if n < 10**9 else rough_int(v.numerator, 10**9)
