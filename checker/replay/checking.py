"""Replaying a certificate statement by statement.

This module walks the statements, keeps the names and the verified
equalities, asks the kernel for each judgement and writes what it finds into
a Report.  The judgements themselves are ``kernel``'s; the words are here.
"""
from __future__ import annotations

import dataclasses
import difflib
import gc
import secrets
import threading
import time
from contextlib import contextmanager
from fractions import Fraction
from pathlib import Path

from ..language import statements as st
from ..language.expressions import Neg, Num, Product
from ..foundation.errors import (BudgetExceeded, CertificateError, CheckerBug, OutOfTime, SyntaxProblem,
                                 UnreadableFile, unwritable_number)
from ..kernel.evaluation import Evaluator
from ..kernel.functions import REGISTRY
from ..kernel.verdicts import check_step, compare, compare_to_quotient, congruent, known_rule, nf_value
from ..foundation.limits import DEFAULT_LIMITS, Limits, time_limit
from ..kernel.normal import Normaliser, text as nf_text
from ..foundation.numbers import value_text
from ..language.parsing import parse_certificate
from .library import checked_before, read_certificate_text, remember_checked, use_lemmas
from .report import Failure, Report
from .step_details import cited_rules, lemma_statements, rule_details, short, unknown_rule
from ..kernel.rules import RULES, WHOLE_LINE_RULES

__all__ = ["check_text", "check_file", "check_certificate"]

_RELATION_WORDS = {"=": "=", "!=": "!=", "<": "<", "<=": "<=", ">": ">", ">=": ">="}


class _Stop(Exception):
    """Raised to end a replay at the first failure."""


class _Facts:
    """Verified equalities by label; a claim's normal forms are made only when a step uses it."""

    def __init__(self, normaliser):
        self.normaliser = normaliser
        self.ready: dict = {}
        self.pending: dict = {}

    def add_nodes(self, label, lhs, rhs):
        self.pending[label] = (lhs, rhs)

    def add_normal_forms(self, label, lhs_nf, rhs_nf):
        self.ready[label] = (lhs_nf, rhs_nf)

    def __contains__(self, label):
        if label in self.pending:
            lhs, rhs = self.pending.pop(label)
            try:
                self.ready[label] = (self.normaliser.normal(lhs), self.normaliser.normal(rhs))
            except OutOfTime:
                raise               # the whole check stops, not this value
            except CertificateError:
                pass     # true, but not in a form a step can use
        return label in self.ready

    def __getitem__(self, label):
        return self.ready[label]


def check_text(text: str, name: str = "<text>", limits: Limits = DEFAULT_LIMITS,
               keep_going: bool = False, paranoid: bool = False, seed: int | None = None) -> Report:
    """Check a certificate given as text; never raises for anything the text contains.

    `seed` fixes the instances of the lemmas' numeric second opinion (the same seed gives the
    same instances); by default they are drawn from an unpredictable source, new each run."""
    return _check(text, name, limits, keep_going, paranoid, seed)[0]


def _check(text, name, limits, keep_going, paranoid, seed=None):
    """(the Report, the replay that made it, or None when the text did not parse)."""
    start = time.perf_counter()
    report = Report(name=name, text=text)
    with _trees_spared() as parsed:
        try:
            cert = parse_certificate(text, name, limits)
        except CertificateError as e:
            report.failures.append(_from_error(e, exit_code=2))
            report.seconds = time.perf_counter() - start
            return report, None
        parsed()
        replay = _Replay(cert, report, limits, keep_going, paranoid, seed)
        replay.run()
    report.seconds = time.perf_counter() - start
    return report, replay


_spared_lock = threading.Lock()
_spared_depth = 0


@contextmanager
def _trees_spared():
    """Keeps the cycle collector off a certificate's trees while it is parsed and checked.

    The trees are acyclic (reference counts free them), but the collector would walk them
    again and again as the replay allocates: 40 % of the time of 10,000 one-line claims.  It
    is paused while the text is parsed; calling the yielded function then sets everything
    that exists aside (gc.freeze) and resumes it, so that the replay's own garbage is still
    collected; at the end all goes back.  Only the outermost check of a process does this,
    and only when the collector is on and nobody else has set objects aside."""
    global _spared_depth
    with _spared_lock:
        _spared_depth += 1
        mine = _spared_depth == 1 and gc.isenabled() and gc.get_freeze_count() == 0
    state = {"paused": mine, "frozen": False}
    if mine:
        gc.disable()

    def parsed():
        if state["paused"]:
            gc.freeze()
            state["frozen"], state["paused"] = True, False
            gc.enable()

    try:
        yield parsed
    finally:
        if state["paused"]:
            gc.enable()
        if state["frozen"]:
            gc.unfreeze()
        with _spared_lock:
            _spared_depth -= 1


def check_certificate(cert: st.Certificate, limits: Limits = DEFAULT_LIMITS,
                      keep_going: bool = False, seed: int | None = None) -> Report:
    report = Report(name=cert.name, text=cert.text)
    start = time.perf_counter()
    _Replay(cert, report, limits, keep_going, seed=seed).run()
    report.seconds = time.perf_counter() - start
    return report


def check_file(path, limits: Limits = DEFAULT_LIMITS, keep_going: bool = False,
               paranoid: bool = False, seed: int | None = None) -> Report:
    """Check one certificate file."""
    path = Path(path)
    try:
        text = read_certificate_text(path, limits)
    except CertificateError as e:
        report = Report(name=str(path))
        report.failures.append(_from_error(e, exit_code=2))
        return report
    # a file checked once in a process is not checked again: neither when a later
    # certificate uses it nor when it comes again after a `use` already checked it
    earlier = checked_before(path, text, limits) if not (keep_going or paranoid) else None
    if earlier is not None:
        return dataclasses.replace(earlier, name=str(path), failures=list(earlier.failures),
                                   notes=list(earlier.notes), seconds=0.0)
    report, replay = _check(text, str(path), limits, keep_going, paranoid, seed)
    if replay is not None and not replay.using:
        remember_checked(path, text, limits, report, replay)
    return report


def _literal_quotient(node, integer_bits: int):
    """(p, q) with q > 0 when the node is a literal n, -n, n/m or -n/m with m != 0 whose
    evaluation could meet no limit (no number over integer_bits); else None, and the
    evaluator reads the node (and says what is wrong with it)."""
    kind = type(node)
    q = 1
    if kind is Product:
        factors = node.factors
        if len(factors) != 2:
            return None
        (_, node), (divide, divisor) = factors
        if not divide or type(divisor) is not Num:
            return None
        q = divisor.value
        if q == 0 or q.bit_length() > integer_bits:
            return None
        kind = type(node)
    if kind is Num:
        p = node.value
    elif kind is Neg and type(node.operand) is Num:
        p = -node.operand.value
    else:
        return None
    return (p, q) if p.bit_length() <= integer_bits else None


def _from_error(e: CertificateError, exit_code: int | None = None, source_note=None) -> Failure:
    if exit_code is None:
        exit_code = e.exit_code if isinstance(e, CheckerBug) else \
            2 if isinstance(e, (BudgetExceeded, SyntaxProblem)) else 1
    return Failure(e.line, e.column, e.message, kind=e.kind, end_column=e.end_column,
                   exit_code=exit_code, source_note=source_note)


class _Replay:
    def __init__(self, cert: st.Certificate, report: Report, limits: Limits, keep_going: bool,
                 paranoid: bool = False, seed: int | None = None):
        self.cert = cert
        self.report = report
        # the second opinion's instances: unpredictable unless a seed is given (then reproducible)
        self.seed = seed if seed is not None else secrets.randbits(48)
        report.seed = self.seed
        self.limits = limits
        self.keep_going = keep_going
        self.evaluator = Evaluator({}, limits, paranoid)
        self.deadline = time.monotonic() + limits.seconds
        self.normaliser = Normaliser(self.evaluator)
        self.facts = _Facts(self.normaliser)   # verified equalities only
        self.labels: dict = {}         # label -> line where it was given
        self.source_note = None
        self.lemmas: dict = {}         # name -> lemmas.LemmaInfo, verified
        self.using: tuple = ()         # certificates being checked for `use`, outermost first
        self.library: dict = {}        # resolved path -> (lemmas or the failure, files read)
        self.read: dict = {}           # files read for `use`, path -> digest

    def nested(self, cert: st.Certificate, report: Report) -> "_Replay":
        """A replay of a certificate that this one uses, sharing its limits, deadline and library."""
        replay = _Replay(cert, report, self.limits, False, seed=self.seed)
        replay.library = self.library
        replay.deadline = self.deadline
        return replay

    # -- driving -------------------------------------------------------------
    def run(self):
        with time_limit(self.limits.seconds, at=self.deadline):
            self._run()

    def _run(self):
        handlers = {}
        try:
            for stmt in self.cert.statements:
                try:
                    self._on_time(stmt)
                    kind = type(stmt)
                    handler = handlers.get(kind)
                    if handler is None:
                        handler = handlers[kind] = getattr(self, "_" + kind.__name__)
                    handler(stmt)
                except _Stop:
                    raise
                except CertificateError as e:
                    self._fail(_from_error(e.at(stmt), source_note=self.source_note))
                except ValueError as e:
                    error = unwritable_number(e)
                    if error is None:
                        raise
                    self._fail(_from_error(error.at(stmt), source_note=self.source_note))
        except _Stop:
            pass

    def _on_time(self, node):
        if time.monotonic() > self.deadline:
            pos = node.pos
            self.report.failures.append(Failure(
                pos.line, pos.column, f"the check has run for more than {self.limits.seconds} s, the "
                f"limit seconds = {self.limits.seconds} (raise it with --limit seconds=N); "
                "nothing from here on was checked", kind="limit", exit_code=2))
            raise _Stop()

    def _fail(self, failure: Failure):
        if failure.source_note is None:
            failure.source_note = self.source_note
        self.report.failures.append(failure)
        if not self.keep_going:
            raise _Stop()

    def _ok(self):
        self.report.checked += 1

    def _value(self, node) -> Fraction:
        return self.evaluator.number(node)

    def _call(self, name, args):
        return self.evaluator.call(name, args)

    def _claim_label(self, label, stmt) -> bool:
        if label is None:
            return True
        if label in self.labels:
            self._fail(Failure(stmt.pos.line, stmt.pos.column,
                               f"the label '{label}' is already used at line {self.labels[label]}",
                               kind="error"))
            return False
        self.labels[label] = stmt.pos.line
        return True

    # -- statements ----------------------------------------------------------
    def _Title(self, stmt):
        if self.report.title is None:
            self.report.title = stmt.text

    def _Source(self, stmt):
        self.source_note = stmt.text

    def _Let(self, stmt):
        if stmt.name in self.evaluator.env:
            self._fail(Failure(stmt.pos.line, stmt.pos.column,
                               f"'{stmt.name}' already has a value; names are given once", kind="error"))
            return
        if stmt.name in REGISTRY:
            self._fail(Failure(stmt.pos.line, stmt.pos.column,
                               f"'{stmt.name}' is the name of a function and cannot be given a value",
                               kind="error"))
            return
        self.evaluator.env[stmt.name] = self.evaluator.value(stmt.expr)

    def _Claim(self, stmt):
        if not self._claim_label(stmt.label, stmt):
            return
        quotient = _literal_quotient(stmt.rhs, self.limits.integer_bits)
        if quotient is not None:
            # the common claim f(...) = p/q: the value compared with p/q by cross-multiplication
            lhs = self._value(stmt.lhs)
            holds = compare_to_quotient(lhs, stmt.relation, *quotient)
            rhs = None
        else:
            lhs = self._value(stmt.lhs)
            rhs = self._value(stmt.rhs)
            holds = compare(lhs, stmt.relation, rhs)
        if holds:
            self._ok()
            if stmt.relation == "=" and stmt.label:
                self._remember_equality(stmt.label, stmt.lhs, stmt.rhs)
            return
        if rhs is None:
            rhs = Fraction(*quotient)
        name = f"claim '{stmt.label}'" if stmt.label else "the claim"
        rel = stmt.relation
        if rel == "=":
            details = [f"left side:  {value_text(lhs)}",
                       f"right side: {value_text(rhs)}   (claimed)",
                       f"difference (right - left): {value_text(rhs - lhs)}"]
            message = f"{name} is false: the two sides differ"
        else:
            details = [f"left side:  {value_text(lhs)}", f"right side: {value_text(rhs)}"]
            message = f"{name} is false: left {rel} right does not hold"
        pos = stmt.rhs.pos
        self._fail(Failure(pos.line, pos.column, message, details, kind="failed",
                           end_column=pos.end_column if pos.end_line == pos.line else None,
                           claimed=rhs, exact=lhs))

    def _Congruence(self, stmt):
        if not self._claim_label(stmt.label, stmt):
            return
        lhs = self._value(stmt.lhs)
        rhs = self._value(stmt.rhs)
        m = self._value(stmt.modulus)
        if m == 0 or m.denominator != 1:
            raise CertificateError(f"the modulus must be a nonzero integer, not {value_text(m)}").at(stmt.modulus)
        if congruent(lhs, rhs, m):
            self._ok()
            return
        name = f"claim '{stmt.label}'" if stmt.label else "the congruence"
        pos = stmt.rhs.pos
        q = (lhs - rhs) / m
        self._fail(Failure(pos.line, pos.column, f"{name} is false: the sides are not congruent modulo {value_text(m)}",
                           [f"left side:  {value_text(lhs)}", f"right side: {value_text(rhs)}",
                            f"(left - right)/{value_text(m)} = {value_text(q)}, not an integer"],
                           end_column=pos.end_column if pos.end_line == pos.line else None,
                           claimed=rhs, exact=lhs))

    def _Identity(self, stmt):
        from ..kernel.quasipolynomial import check_identity
        if not self._claim_label(stmt.label, stmt):
            return
        if stmt.var in self.evaluator.env or stmt.var in REGISTRY:
            raise CertificateError(f"the variable '{stmt.var}' already names a value or a function; "
                                   "use a fresh name").at(stmt)
        lower = None if stmt.lower is None else self._whole(stmt.lower, "the lower bound")
        period = None if stmt.period is None else self._whole(stmt.period, "a claimed period")
        degree = None if stmt.degree is None else self._whole(stmt.degree, "a claimed degree")
        r = check_identity(stmt.lhs, stmt.rhs, stmt.var, lower, self.evaluator, self.limits, period, degree)
        v = stmt.var
        summary = (f"degree <= {value_text(r.degree)}, period dividing {value_text(r.period)}"
                   + (f", a quasi-polynomial from {v} = {value_text(r.threshold)} on" if r.threshold is not None else ""))
        if r.ok:
            self._ok()
            self.report.notes.append(
                f"line {stmt.pos.line}: identity holds: {summary}; {r.points} values compared "
                f"({v} = {value_text(r.start)}..{value_text(r.start + r.points - 1)})")
            return
        name = f"identity '{stmt.label}'" if stmt.label else "the identity"
        pos = stmt.rhs.pos
        if r.problem:
            pos = stmt.lhs.pos if r.problem_side == "left" else pos     # the side the message names
            self._fail(Failure(pos.line, pos.column, f"{name}: {r.problem}", [f"inferred: {summary}"],
                               end_column=pos.end_column if pos.end_line == pos.line else None))
            return
        self._fail(Failure(pos.line, pos.column, f"{name} fails at {v} = {value_text(r.counterexample)}",
                           [f"left side:  {value_text(r.left)}", f"right side: {value_text(r.right)}",
                            f"difference (right - left): {value_text(r.right - r.left)}",
                            f"inferred: {summary}; the first {v} where the sides differ among "
                            f"{v} = {value_text(r.start)}..{value_text(r.start + r.points - 1)}"],
                           end_column=pos.end_column if pos.end_line == pos.line else None,
                           claimed=r.right, exact=r.left))

    def _whole(self, node, what) -> int:
        v = self._value(node)
        if v.denominator != 1:
            raise CertificateError(f"{what} must be an integer, not {value_text(v)}").at(node)
        return v.numerator

    def _Witness(self, stmt):
        from ..mathematics.frobenius import frobenius as kernel_frobenius
        from ..kernel.verdicts import frobenius_witness_problem, representation_problem
        from ..mathematics.partitions import check_parts
        if not self._claim_label(stmt.label, stmt):
            return
        lhs = stmt.lhs
        if not (hasattr(lhs, "name") and lhs.name == "frobenius" and len(lhs.args) == 1):
            raise CertificateError("a witness states frobenius([a1, ..., ad]) = g").at(lhs)
        parts = check_parts(self.evaluator.value(lhs.args[0]), "frobenius")
        g = self._whole(stmt.rhs, "the Frobenius number")
        represented = set()
        for rep in stmt.representations:
            m = self._whole(rep.number, "a represented number")
            why = representation_problem(_products(rep.combination), parts, m)
            if why:
                p = rep.pos
                self._fail(Failure(p.line, p.column, f"the witness for frobenius is wrong: {value_text(m)} = ...: {why}",
                                   end_column=p.end_column if p.end_line == p.line else None))
                return
            represented.add(m)
        ways = self._call("partitions", (Fraction(g), tuple(Fraction(a) for a in parts)))
        problem = frobenius_witness_problem(parts, g, represented, ways)
        pos = stmt.rhs.pos
        if problem:
            self._fail(Failure(pos.line, pos.column, problem, claimed=Fraction(g)))
            return
        # the witness proves it; the kernel's own value must agree (second judgement)
        exact = kernel_frobenius(parts)
        if exact != g:
            self._fail(Failure(pos.line, pos.column, f"the witness holds but the kernel computes "
                               f"{value_text(exact)}: a checker bug, please report it", kind="checker bug",
                               exit_code=3))
            return
        self._ok()

    def _Lemma(self, stmt):
        from .lemmas import LemmaCheck
        if stmt.name in self.lemmas:
            other = self.lemmas[stmt.name]
            raise CertificateError(f"a lemma named '{stmt.name}' is already given ({other.origin}, line "
                                   f"{other.line})").at(stmt)
        check = LemmaCheck(self, stmt)
        info = check.run()
        if info is None:
            return
        self.lemmas[stmt.name] = info
        self.report.checked += check.steps + 1
        v = ", ".join(stmt.params)
        cases = f" in {len(stmt.split.cases)} residue classes" if stmt.split else ""
        self.report.notes.append(
            f"line {stmt.pos.line}: lemma {stmt.name} holds for all integers {v} satisfying its "
            f"assumptions: {check.steps} step{'s' if check.steps != 1 else ''} replayed symbolically{cases}; numeric second opinion "
            f"at {check.count} instances ({check.summary})")

    def _Use(self, stmt):
        for info in use_lemmas(self, stmt):
            if info.name in self.lemmas and self.lemmas[info.name] is not info:
                other = self.lemmas[info.name]
                raise CertificateError(f"the lemma '{info.name}' from {info.origin} clashes with the "
                                       f"lemma of that name from {other.origin} (line {other.line})").at(stmt)
            self.lemmas[info.name] = info
        self._ok()

    def _remember_equality(self, label, lhs_node, rhs_node):
        self.facts.add_nodes(label, lhs_node, rhs_node)

    def _Chain(self, stmt):
        if not self._claim_label(stmt.label, stmt):
            return
        self.evaluator.chain_wanted = True      # its steps walk Euclid's chain: one pass gives all values
        try:
            self._chain_steps(stmt)
        finally:
            self.evaluator.chain_wanted = False

    def _chain_steps(self, stmt):
        prev_nf = self.normaliser.normal(stmt.start)
        prev_value = nf_value(prev_nf, self.evaluator.exact_call, self.limits)
        start_nf, all_ok = prev_nf, True
        for index, step in enumerate(stmt.steps, 1):
            self._on_time(step)
            ok, next_nf, next_value = self._step(stmt, index, step, prev_nf, prev_value)
            all_ok = all_ok and ok
            if next_nf is None:          # the line itself could not be read as a normal form
                return
            prev_nf, prev_value = next_nf, next_value
        if all_ok and stmt.label:
            self.facts.add_normal_forms(stmt.label, start_nf, prev_nf)

    def _step(self, chain, index, step, prev_nf, prev_value):
        where = f"step {index} of the chain at line {chain.pos.line}"
        facts = self.facts
        for ref in step.rules:
            if ref.name == "lemma":
                facts = self._lemma_fact(ref, where, facts)
                if facts is None:
                    return False, None, None
                continue
            if not known_rule(ref.name):
                self._fail(unknown_rule(ref, where))
                return False, None, None
        self.normaliser.positions = {}
        next_nf = self.normaliser.normal(step.expr)
        positions = self.normaliser.positions
        next_value = nf_value(next_nf, self.evaluator.exact_call, self.limits)
        rules = [(r.name, r.label) if r.name != "lemma" else ("claim", f"lemma {r.label}")
                 for r in step.rules]
        verdict = check_step(prev_nf, next_nf, rules, self._call, facts, self.limits)
        values_ok = next_value == prev_value
        if verdict.rule_ok and values_ok:
            self._ok()
            return True, next_nf, next_value
        failure = self._step_failure(where, step, rules, verdict, values_ok, prev_nf, next_nf,
                                     prev_value, next_value, positions)
        if not verdict.rule_ok:
            failure.details[:0] = lemma_statements(step, facts, self.report.text, nf_text)
            if values_ok:
                failure.details += self._better_rules(prev_nf, next_nf, rules, facts)
        self._fail(failure)
        return False, next_nf, next_value

    def _better_rules(self, prev_nf, next_nf, rules, facts) -> list:
        """A rule list that gives the next line: one other rule, or the cited ones with one more
        (`reciprocity, reduce` where `reciprocity` was written).  Only a suggestion: a certificate
        that takes it is checked like any other."""
        cited = [r for r in rules if r[0] != "claim"]
        last = [r for r in rules if r[0] == "claim"]
        # descent (many steps of reciprocity and reduce) last: the one step it may stand for reads better
        names = [n for n in list(RULES) + ["value", "arithmetic"] if n != "descent"]
        tries = [[(n, None)] + last for n in names if [(n, None)] != cited]
        for n in names:
            for i in range(len(cited) + 1):
                tries.append(cited[:i] + [(n, None)] + cited[i:] + last)
        tries.append([("descent", None)] + last)
        for candidate in tries:
            try:
                if check_step(prev_nf, next_nf, candidate, self._call, facts, self.limits).rule_ok:
                    return [f"this line does follow by {cited_rules(candidate)}"]
            except OutOfTime:          # the step has failed already: out of time, stop suggesting
                return []
            except CertificateError:
                continue
        return []

    def _lemma_fact(self, ref, where, facts):
        """The facts with the lemma `ref` instantiated at numbers, or None after a failure."""
        from ..kernel.assumptions import Assumptions
        from .lemmas import Scope, instantiate
        info = self.lemmas.get(ref.label)
        if info is None:
            from .lemmas import _unknown_lemma
            self._fail(_unknown_lemma(ref, where, self.lemmas))
            return None
        try:
            fact = instantiate(self.evaluator, info, ref, Assumptions(()), {})
        except OutOfTime:
            raise               # the whole check stops, not this value
        except CertificateError as e:
            self._fail(Failure(ref.pos.line, ref.pos.column, f"{where} does not follow: {e.message}",
                               kind="failed", end_column=ref.pos.end_column))
            return None
        return Scope(facts, {f"lemma {ref.label}": fact})

    def _step_failure(self, where, step, rules, verdict, values_ok, prev_nf, next_nf,
                      prev_value, next_value, positions) -> Failure:
        prev_value, next_value = Fraction(prev_value), Fraction(next_value)    # in lowest terms, to be shown
        cited = cited_rules(rules)
        pos = step.expr.pos
        line, column, end = pos.line, pos.column, pos.end_column if pos.end_line == pos.line else None
        details = []
        if not verdict.rule_ok:
            message = f"{where} does not follow by {cited}"
            more, closest, mark = rule_details(cited, verdict, next_nf, positions, nf_text)
            details += more
            if mark is not None:
                line, column, end = mark
            if values_ok:
                details.append(f"value check: passed (both lines are {value_text(prev_value)})")
            else:
                details.append("value check: failed too")
        else:
            message = f"{where}: the rule gives this line but the values differ (a checker bug: please report it)"
        if not values_ok:
            details += [f"exact value (previous line): {value_text(prev_value)}",
                        f"claimed value (this line):   {value_text(next_value)}",
                        f"difference (claimed - exact): {value_text(next_value - prev_value)}"]
        return Failure(line, column, message, details, kind="failed", end_column=end,
                       claimed=next_value, exact=prev_value)


def _products(node) -> list:
    """A sum of products of whole numbers, as lists of factors (signs become negative factors).

    Anything else (a name, a call, a division) is written as [-1] so that the
    kernel refuses it with a reason.
    """
    from ..language import expressions as ex
    terms = node.terms if isinstance(node, ex.Sum) else ((1, node),)
    out = []
    for sign, term in terms:
        factors = term.factors if isinstance(term, ex.Product) else ((False, term),)
        if sign < 0 or any(divide or not isinstance(f, ex.Num) for divide, f in factors):
            out.append([-1])
        else:
            out.append([f.value for _, f in factors])
    return out
