"""Reading text into expression trees and certificates.

The grammar lives in ``grammar/*.lark`` (shipped inside the package as
``checker.grammar``).  Lark parses; a Transformer run inside the parser only builds
the dataclasses of ``expressions`` and ``statements``; nothing here checks
mathematics.  Every Lark error becomes a ``SyntaxProblem`` whose message names
what was expected in words, at a 1-based line and column.
"""
from __future__ import annotations

import gc
import hashlib
import json
import os
import re
from functools import lru_cache
from pathlib import Path

from . import expressions as ex
from . import statements as st
from .plain_reader import RELATIONS, GiveUp, PlainReader
from ..foundation.resources import resource_dir
from ..foundation.errors import BudgetExceeded, CertificateError, SyntaxProblem
from ..foundation.limits import DEFAULT_LIMITS, Limits
from ..foundation.numbers import text_int

__all__ = ["parse_expression", "parse_certificate", "grammar_text", "grammar_tables", "read_number_call"]

# Lark is imported only when a text needs it: most texts are read by the plain
# reader, whose tables are kept on disk beside Lark's own cache of the grammar.
_TABLES_VERSION = "1+modulus"
_FAST_RULES = {"expr", "sum", "product", "unary", "power", "atom", "call", "list", "finite_sum",
               "arguments", "title", "source", "let", "claim", "relation", "chain", "step", "rule",
               "label", "modulus", "__sum_star", "__product_star", "__arguments_star", "__chain_plus",
               "__step_star"}
_FAST_STATEMENTS = ("title", "source", "let", "claim", "chain")


@lru_cache(maxsize=1)
def grammar_text() -> str:
    folder = resource_dir("checker.grammar", "grammar")
    return (folder / "expression.lark").read_text(encoding="utf-8") + "\n" + \
        (folder / "certificate.lark").read_text(encoding="utf-8")


def _cache_dir() -> Path | None:
    base = os.environ.get("QUASICERT_CACHE") or os.environ.get("XDG_CACHE_HOME") or \
        os.path.join(os.path.expanduser("~"), ".cache")
    folder = Path(base) / "quasicert"
    try:
        folder.mkdir(parents=True, exist_ok=True)
    except OSError:
        return None
    return folder


def _digest() -> str:
    return hashlib.sha256((_TABLES_VERSION + grammar_text()).encode()).hexdigest()[:24]


@lru_cache(maxsize=1)
def grammar_tables() -> dict:
    """What the plain reader needs from the grammar: terminals, keywords and the rules' shape.

    Derived from Lark's analysis of grammar/*.lark, and kept on disk under a digest
    of the grammar text, so that a process that needs no Lark never analyses it."""
    folder = _cache_dir()
    path = folder / f"tables-{_digest()}.json" if folder else None
    if path is not None:
        try:
            tables = json.loads(path.read_text(encoding="utf-8"))
            if isinstance(tables, dict) and tables.get("digest") == _digest():
                return tables
        except (OSError, ValueError):
            pass
    tables = _tables_from_lark(_lark_grammar())
    if path is not None:
        try:
            partial = path.with_suffix(f".{os.getpid()}.part")
            partial.write_text(json.dumps(tables), encoding="utf-8")
            os.replace(partial, path)
        except OSError:
            pass
    return tables


def _lark_grammar():
    """Lark's analysis of the grammar, without callbacks (for the tables)."""
    from lark import Lark
    return Lark(grammar_text(), parser="lalr", start=["expr", "certificate"], maybe_placeholders=True,
                **_lark_cache("plain"))


def _lark_cache(what: str) -> dict:
    folder = _cache_dir()
    return {"cache": str(folder / f"lark-{what}-{_digest()}.pickle")} if folder else {}


def _tables_from_lark(lark) -> dict:
    terminals = sorted(lark.terminals, key=lambda t: (-t.priority, -t.pattern.max_width,
                                                      -len(t.pattern.value), t.name))
    regexes = [t for t in terminals if t.pattern.type == "re"]
    embedded = {}
    for t in terminals:          # string terminals that a regex terminal also matches (Lark's "unless")
        if t.pattern.type != "str":
            continue
        for r in regexes:
            m = re.match(r.pattern.to_regexp(), t.pattern.value)
            if r.priority == t.priority and m and m.group(0) == t.pattern.value:
                embedded[t.pattern.value] = t.name
    names = {t.name: t for t in terminals}
    keyword_terms = {name for name in embedded.values()
                     if re.fullmatch(names["NAME"].pattern.to_regexp(), names[name].pattern.value)}

    def symbol(s):
        if s.name in keyword_terms:
            return "KW"
        return re.sub(r"_\d+$", "", s.name) if s.name.startswith("__") else s.name

    shape, rules = [], {}
    for r in lark.rules:
        origin = symbol(r.origin)
        rules.setdefault((r.origin.name, r.alias), []).append([s.name for s in r.expansion])
        if origin in _FAST_RULES or (origin == "statement" and r.expansion[0].name in _FAST_STATEMENTS):
            marks = ("!" if r.options.keep_all_tokens else "") + ("?" if r.options.expand1 else "")
            shape.append(f"{origin}: {' '.join(symbol(s) for s in r.expansion)}"
                         + (f" -> {r.alias}" if r.alias else "") + (f" {marks}" if marks else ""))

    def literal(rule, alias, index):
        for expansion in rules.get((rule, alias), []):
            if len(expansion) > index and expansion[index] in keyword_terms:
                return names[expansion[index]].pattern.value
        return None

    keywords = {name: literal(name, None, 0) for name in _FAST_STATEMENTS}
    keywords.update(mod=literal("modulus", None, 0), by=literal("step", None, 2),
                    use_claim=literal("rule", "use_claim", 0),
                    relations=[e[0] for e in rules.get(("relation", None), [])])
    return {"digest": _digest(), "shape": sorted(shape), "keywords": keywords,
            "terminals": [[t.name, t.pattern.to_regexp(), t.pattern.value if t.pattern.type == "str" else None]
                          for t in terminals],
            "ignore": sorted(lark.ignore_tokens), "embedded": embedded,
            "terminal_names": [t.name for t in lark.terminals]}


@lru_cache(maxsize=1)
def _plain_reader() -> PlainReader:
    return PlainReader(grammar_tables())


@lru_cache(maxsize=8)
def _parser(limits: Limits = DEFAULT_LIMITS):
    global Token
    from lark import Lark, Token
    # the Transformer runs inside the parser (one pass, no tree): much faster
    # on long certificates, and nothing recursive is left for deep nesting
    build = _Build(limits)
    callbacks = {name: build.count_token for name in grammar_tables()["terminal_names"]}
    return Lark(grammar_text(), parser="lalr", start=["expr", "certificate"],
                maybe_placeholders=True, transformer=build, lexer_callbacks=callbacks,
                **_lark_cache("transform"))


Token = None         # lark.Token, bound when Lark is first imported (by _parser)


def _tpos(tok) -> ex.Pos:
    return ex.Pos(tok.line, tok.column, tok.end_line, tok.end_column)


def _pos_of(item):
    if isinstance(item, Token):
        return _tpos(item)
    return getattr(item, "pos", None)


def _span(children) -> ex.Pos:
    """From the first to the last positioned child."""
    first = last = None
    for c in children:
        p = _pos_of(c) if not isinstance(c, list) else (_span(c) if c else None)
        if p is None or p.line == 0:
            continue
        if first is None:
            first = p
        last = p
    if first is None:
        return ex.NOWHERE
    return ex.Pos(first.line, first.column, last.end_line, last.end_column)


_RELATIONS = RELATIONS


class _Build:
    """Parser callbacks -> dataclasses.  Builds only; never judges.

    Depth is tracked as nodes are made, so an expression nested beyond the
    budget is refused before anything recursive walks it.
    """

    __visit_tokens__ = False           # what Lark's Transformer says: callbacks for rules only

    def __init__(self, limits: Limits):
        self.limits = limits
        self.depth: dict = {}
        self.tokens = 0

    def count_token(self, tok):
        """Refuse texts of more tokens than the budget: parser memory grows with them."""
        self.tokens += 1
        if self.tokens > self.limits.tokens:
            raise BudgetExceeded(f"the text has more than {self.limits.tokens} tokens, the limit tokens = "
                                 f"{self.limits.tokens} (raise it with --limit tokens=N)",
                                 tok.line, tok.column)
        return tok

    def _made(self, node, children):
        d = 1
        for c in children:
            if isinstance(c, list):
                for x in c:
                    d = max(d, self.depth.get(id(x), 0) + 1)
            else:
                d = max(d, self.depth.get(id(c), 0) + 1)
        self.depth[id(node)] = d
        if d > self.limits.nesting:
            raise BudgetExceeded(
                f"the expression is nested {d} levels deep, over the limit nesting = "
                f"{self.limits.nesting}", node.pos.line, node.pos.column)
        return node

    # -- expressions -------------------------------------------------------
    def number(self, children):
        tok = children[0]
        if len(tok) > self.limits.literal_digits:
            raise BudgetExceeded(
                f"an integer literal of {len(tok)} digits is over the limit literal-digits = "
                f"{self.limits.literal_digits}", tok.line, tok.column)
        return ex.Num(text_int(str(tok)), _tpos(tok))

    def name(self, children):
        tok = children[0]
        return ex.Name(str(tok), _tpos(tok))

    def call(self, children):
        tok = children[0]
        args = children[2] or []
        return self._made(ex.Call(str(tok), tuple(args), _span(children)), args)

    def arguments(self, children):
        return [c for c in children if not isinstance(c, Token)]

    def list(self, children):
        items = children[1] or []
        if len(items) > self.limits.list_length:
            raise BudgetExceeded(f"a list of {len(items)} entries is over the limit list-length = "
                                 f"{self.limits.list_length}", children[0].line, children[0].column)
        return self._made(ex.ListExpr(tuple(items), _span(children)), items)

    def finite_sum(self, children):
        parts = [c for c in children if not isinstance(c, Token) or c.type == "NAME"]
        var, lower, upper, body = parts
        return self._made(ex.FiniteSum(str(var), lower, upper, body, _span(children)), [lower, upper, body])

    def former_sum_start(self, children):
        tok, var = children[0], children[2]
        raise SyntaxProblem(f"a finite sum is written total({var} from A to B: BODY), not "
                            f"sum({var} = A .. B, BODY)", tok.line, tok.column, tok.column + 3)

    def neg(self, children):
        return self._made(ex.Neg(children[1], _span(children)), [children[1]])

    def power(self, children):
        return self._made(ex.Power(children[0], children[1], _span(children)), children)

    def sum(self, children):
        terms = [(1, children[0])]
        for op, term in zip(children[1::2], children[2::2]):
            terms.append((1 if op == "+" else -1, term))
        return self._made(ex.Sum(tuple(terms), _span(children)), children[0::2])

    def product(self, children):
        factors = [(False, children[0])]
        for op, factor in zip(children[1::2], children[2::2]):
            factors.append((op == "/", factor))
        return self._made(ex.Product(tuple(factors), _span(children)), children[0::2])

    # -- statements --------------------------------------------------------
    def certificate(self, children):
        self.depth.clear()
        return list(children)

    def title(self, children):
        return st.Title(str(children[1])[1:-1], _span(children))

    def source(self, children):
        return st.Source(str(children[1])[1:-1], _span(children))

    def let(self, children):
        return st.Let(str(children[1]), children[3], _span(children))

    def label(self, children):
        return str(children[0])

    def relation(self, children):
        return _RELATIONS[str(children[0])]

    def claim(self, children):
        _kw, label, lhs, relation, rhs = children
        return st.Claim(label, lhs, relation, rhs, _span(children))

    def congruence(self, children):
        _kw, label, lhs, _sym, rhs, modulus = children
        return st.Congruence(label, lhs, rhs, modulus, _span(children))

    def modulus(self, children):
        return next(c for c in children if not isinstance(c, Token))

    def chain(self, children):
        _kw, label, start, *steps = children
        return st.Chain(label, start, tuple(steps), _span(children))

    def step(self, children):
        expr = children[1]
        rules = [c for c in children[3:] if isinstance(c, st.RuleRef)]
        return st.Step(expr, tuple(rules), _span(children))

    def identity(self, children):
        label = children[1]
        var, lower = children[3]
        period = degree = None
        for c in children[4:]:
            if isinstance(c, tuple) and c[0] in ("period", "degree"):
                if (period if c[0] == "period" else degree) is not None:
                    # two claims of one kind: keeping either would leave the other unchecked
                    raise SyntaxProblem(f"the {c[0]} is claimed twice; claim it once").at(c[1])
                if c[0] == "period":
                    period = c[1]
                else:
                    degree = c[1]
        lhs, rhs = children[-3], children[-1]
        return st.Identity(label, var, lower, period, degree, lhs, rhs, _span(children))

    def from_bound(self, children):
        return (str(children[0]), children[2])

    def every_integer(self, children):
        return (str(children[0]), None)

    def claimed_period(self, children):
        return ("period", children[0])

    def claimed_degree(self, children):
        return ("degree", children[0])

    def witness(self, children):
        label, lhs, rhs = children[1], children[2], children[4]
        reps = tuple(c for c in children[6:] if isinstance(c, st.Representation))
        return st.Witness(label, lhs, rhs, reps, _span(children))

    def representation(self, children):
        return st.Representation(children[0], children[2], _span(children))

    def rule(self, children):
        return st.RuleRef(str(children[0]), None, _tpos(children[0]))

    def use_claim(self, children):
        return st.RuleRef("claim", str(children[0]), _tpos(children[0]))

    def use_lemma(self, children):
        name, args = children[0], children[1] or []
        return st.RuleRef("lemma", str(name), _tpos(name), tuple(args))

    # -- lemmas --------------------------------------------------------------
    def lemma(self, children):
        name = str(children[1])
        params = children[3]
        conditions = tuple(children[5] or ())
        lhs, rhs = children[7], children[9]
        body = children[10:]
        chains = tuple(c for c in body if isinstance(c, st.Chain))
        split = next((c for c in body if isinstance(c, st.Split)), None)
        return st.Lemma(name, params, conditions, lhs, rhs, chains, split, _span(children))

    def parameters(self, children):
        return tuple(str(c) for c in children)

    def assumptions(self, children):
        return [c for c in children if isinstance(c, st.Condition)]

    def former_lemma_word(self, children):
        tok = children[0]
        if tok == "given":
            message = ("`given` is no longer a word of the language: write the assumptions after the "
                       "parameters, as in `lemma NAME(k) for k >= 1, k == 1 mod 2: A = B`, then the chains "
                       "and `end`")
        else:
            message = ("`then` is no longer a word of the language: the statement follows the colon, as in "
                       "`lemma NAME(k) for k >= 1: A = B`, then the chains and `end`")
        raise SyntaxProblem(message, tok.line, tok.column, tok.end_column)

    def plain_condition(self, children):
        lhs, relation, rhs = children
        return st.Condition(lhs, relation, rhs, None, _span(children))

    def congruence_condition(self, children):
        lhs, _sym, rhs, modulus = children
        return st.Condition(lhs, "==", rhs, modulus, _span(children))

    def split(self, children):
        var, modulus = str(children[1]), children[3]
        cases = tuple(c for c in children[4:] if isinstance(c, st.Case))
        return st.Split(var, modulus, cases, _span(children))

    def case(self, children):
        chains = tuple(c for c in children[3:] if isinstance(c, st.Chain))
        return st.Case(children[1], chains, _span(children))

    def use(self, children):
        return st.Use(str(children[1])[1:-1], _span(children))


# Characters that some editor, terminal or Python's str.splitlines shows or counts as a line
# break, apart from \n (and \r\n): a comment or a quoted text would end there for a reader and
# not for the grammar, which ends both at \n only, so that a statement written after one would
# be silently skipped.  Bidirectional controls reorder what a reader sees ("Trojan source"), and
# other control characters (escape sequences) can move a terminal's cursor or hide text.
# quasicert refuses them before parsing, wherever they stand; positions count \n alone.
_MISLEADING = re.compile("\r(?!\n)|[\x01-\x08\x0b-\x0c\x0e-\x1f\x7f-\x9f\u2028\u2029"
                         "\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]")
_MISLEADING_NAMES = {
    "\r": "a carriage return (\\r) not followed by \\n", "\x0b": "a vertical tab (\\v)",
    "\x0c": "a form feed (\\f)", "\x1c": "U+001C FILE SEPARATOR", "\x1d": "U+001D GROUP SEPARATOR",
    "\x1e": "U+001E RECORD SEPARATOR", "\x85": "U+0085 NEXT LINE", "\u2028": "U+2028 LINE SEPARATOR",
    "\u2029": "U+2029 PARAGRAPH SEPARATOR",
}


def _position(text: str, i: int) -> tuple[int, int]:
    """1-based line and column of text[i], lines ended by \n (as the parser counts them)."""
    return text.count("\n", 0, i) + 1, i - (text.rfind("\n", 0, i) + 1) + 1


_PLAIN_ASCII = bytes(range(0x20, 0x7f)) + b"\t\n"


def _refuse_misleading(text: str) -> None:
    if text.isascii() and not text.encode("ascii").translate(None, _PLAIN_ASCII):
        return       # printable ASCII, tabs and \n only (the common case): a byte scan, ~10x the search's speed
    if "\x00" in text:
        raise SyntaxProblem("the text contains a NUL character", *_position(text, text.index("\x00")))
    m = _MISLEADING.search(text)
    if m is None:
        return
    ch = m.group()
    line, column = _position(text, m.start())
    if ch in _MISLEADING_NAMES:
        raise SyntaxProblem(f"the text contains {_MISLEADING_NAMES[ch]}, which editors show as a line "
                            "break but quasicert does not read as one (a comment or quoted text would "
                            "go on past it); end lines with \\n only", line, column, column + 1)
    if ch < "\xa0":
        raise SyntaxProblem(f"the text contains the control character U+{ord(ch):04X}, which a terminal "
                            "or an editor may act on instead of showing it (moving the cursor, hiding "
                            "text); quasicert refuses it", line, column, column + 1)
    raise SyntaxProblem(f"the text contains the bidirectional control U+{ord(ch):04X}, which changes the "
                        "order in which the text is shown; quasicert refuses it", line, column, column + 1)


def _parse(text: str, start: str, limits: Limits):
    _refuse_misleading(text)
    result = read_plain(text, start, limits)
    if result is not None:
        return result
    return parse_with_lark(text, start, limits)


def read_number_call(text: str, limits: Limits = DEFAULT_LIMITS):
    """The text as a NumberCall (NAME(INT, ..., INT), its tree on demand), or None.

    A text it accepts holds no character that `_refuse_misleading` refuses, and Lark
    reads it as the NumberCall's tree (tests/language/test_number_call.py)."""
    return _plain_reader().number_call(text, limits)


def read_plain(text: str, start: str, limits: Limits = DEFAULT_LIMITS):
    """The plain reader's tree for `text`, or None when the text is for Lark."""
    shared = _plain_reader()
    if not shared.enabled:
        return None
    if start == "expr":
        call = shared.number_call(text, limits)
        if call is not None:
            return call.tree()
    reader = object.__new__(PlainReader)  # its own position (parses may run in threads), shared tables
    reader.__dict__.update(shared.__dict__)
    # The reader builds trees and nothing else: no object it makes is in a reference cycle,
    # so the cycle collector, which would walk the growing trees again and again (two thirds
    # of the time on 10,000 claims), can rest while it reads.
    collecting = gc.isenabled()
    gc.disable()
    try:
        return reader.expression(text, limits) if start == "expr" else reader.certificate(text, limits)
    except (GiveUp, RecursionError):
        return None
    finally:
        if collecting:
            gc.enable()


def parse_with_lark(text: str, start: str, limits: Limits = DEFAULT_LIMITS):
    """The grammar's own parse (Lark's LALR parser with the Transformer inside)."""
    from lark.exceptions import UnexpectedInput, VisitError
    parser = _parser(limits)
    parser.options.transformer.tokens = 0
    try:
        result = parser.parse(text, start=start)
    except UnexpectedInput as e:
        raise _syntax_problem(e, text, start == "expr") from None
    except VisitError as e:
        if isinstance(e.orig_exc, CertificateError):
            raise e.orig_exc from None
        raise
    finally:
        parser.options.transformer.depth.clear()
        parser.options.transformer.tokens = 0
    return result


def parse_expression(text: str, limits: Limits = DEFAULT_LIMITS) -> ex.Expr:
    """Parse one expression (the language of `quasicert eval`)."""
    return _parse(text, "expr", limits)


def parse_certificate(text: str, name: str = "<text>", limits: Limits = DEFAULT_LIMITS) -> st.Certificate:
    """Parse a whole certificate text."""
    try:
        statements = _parse(text, "certificate", limits)
    except CertificateError as e:
        e.source = e.source or name
        raise
    return st.Certificate(tuple(statements), name, text)


# -- syntax errors in words ------------------------------------------------

_WORDS = {
    "INT": "a number", "NAME": "a name", "STRING": 'a quoted text "..."',
    "ADDOP": "'+' or '-'", "MULOP": "'*' or '/'", "MINUS": "'-'",
    "EQUALS": "'='", "LESS_EQUAL": "'<='", "GREATER_EQUAL": "'>='", "NOT_EQUAL": "'!='",
    "LESS": "'<'", "GREATER": "'>'", "CONGRUENT": "'=='", "OPEN_MOD": "'(mod'",
    "$END": "the end of the text",
}

_STATEMENT_WORDS = {"title", "source", "let", "claim", "chain", "identity", "witness", "lemma", "use"}
_OPERATORS = {"ADDOP", "MULOP", "MINUS", "CIRCUMFLEX"}
_RELATIONS_T = {"EQUALS", "LESS_EQUAL", "GREATER_EQUAL", "NOT_EQUAL", "LESS", "GREATER"}
_EXPRESSION_STARTS = {"INT", "NAME", "LPAR", "LSQB", "TOTAL", "SUM", "PLUS", "MINUS", "ADDOP"}


def _describe_terminal(name: str) -> str:
    if name in _WORDS:
        return _WORDS[name]
    try:
        term = _parser().get_terminal(name)
        pattern = term.pattern
        if pattern.type == "str":
            return f"'{pattern.value}'"
    except (KeyError, AttributeError):
        pass
    return name.lower()


def _expected_words(expected) -> str:
    """What may come at a place, in words; long lists are told by kind, not token by token."""
    names = set(expected)
    groups = []
    if len(names) > 6:
        if names & _EXPRESSION_STARTS and names & (_EXPRESSION_STARTS - {"MINUS", "ADDOP", "PLUS"}):
            groups.append("an expression")
            names -= _EXPRESSION_STARTS
        if len(names & _RELATIONS_T) > 1:
            groups.append("a relation (= < <= > >= !=)")
            names -= _RELATIONS_T
    if len(names & _OPERATORS) > 1:
        groups.append("an operator (+ - * / ^)")
        names -= _OPERATORS
    words = sorted({_describe_terminal(t) for t in names})
    statements = [w for w in words if w.strip("'") in _STATEMENT_WORDS]
    others = groups + [w for w in words if w not in statements]
    if statements:
        others.append("a new statement (" + ", ".join(s.strip("'") for s in statements) + ")")
    if len(others) > 1:
        return ", ".join(others[:-1]) + " or " + others[-1]
    return others[0] if others else "something else"


def _keep(expected, expr_only: bool):
    """Terminals worth naming; an expression alone has no statements or relations."""
    names = {_terminal_name(t) for t in expected}
    if expr_only:
        kept = {t for t in names if t not in _NOT_IN_EXPRESSIONS and _describe_terminal(t) not in ("'..'", "'by'", "'mod'", "':'")}
        return kept or names
    return names


def _terminal_name(t) -> str:
    return t if isinstance(t, str) else getattr(t, "name", str(t))


def _end_position(text: str) -> tuple[int, int]:
    lines = text.split("\n")
    return len(lines), len(lines[-1]) + 1


def _after_previous_word(text: str, line: int, column: int) -> tuple[int, int]:
    """The place just after the last word before (line, column), comments skipped: where a
    missing word belongs."""
    lines = text.split("\n")
    current = lines[line - 1][:column - 1] if line <= len(lines) else ""
    for i in range(min(line, len(lines)), 0, -1):
        src = current if i == line else lines[i - 1]
        if "#" in src and '"' not in src:
            src = src[:src.index("#")]
        src = src.rstrip()
        if src:
            return i, len(src) + 1
    return line, column


def _missing_word(names: set, text: str, line: int, column: int):
    """A SyntaxProblem naming the one word a statement lacks (`by`, `mod`), or None."""
    if "BY" in names:
        line, column = _after_previous_word(text, line, column)
        return SyntaxProblem("this step lacks `by` and the rule that gives it: a step reads "
                             "`= EXPR by RULE` (for example `= 1/17 by value`)", line, column)
    if "MOD" in names and "OPEN_MOD" in names:
        line, column = _after_previous_word(text, line, column)
        return SyntaxProblem("`==` states a congruence, which needs `mod M` after its right side "
                             "(`A == B mod M`, or `A ≡ B (mod M)`); an equality is written with one `=`",
                             line, column)
    return None


_LANGUAGE_CHARACTERS = set("+-*/^()[],.=<>!:#\"_'\u2212\u00b7\u00d7\u2264\u2265\u2260\u2261 \t\r\n")
_NOT_IN_EXPRESSIONS = {"EQUALS", "LESS_EQUAL", "GREATER_EQUAL", "NOT_EQUAL", "LESS", "GREATER",
                       "CONGRUENT", "BY", "MOD", "TITLE", "SOURCE", "LET", "CLAIM", "CHAIN", "COLON",
                       "IDENTITY", "WITNESS", "FOR", "ALL", "PERIOD", "DEGREE", "LEMMA", "USE",
                       "THEN", "GIVEN", "SPLIT", "RESIDUE", "END", "OPEN_MOD", "FROM", "TO"}


def _acceptable(e: UnexpectedToken) -> set:
    """The terminals the parser would really take here.  The LALR tables merge the
    lookaheads of similar states (so `by` seems possible after any expression); trying
    each terminal on a copy of the parser state tells them apart."""
    try:
        return set(e.interactive_parser.accepts()) or set(e.expected)
    except Exception:      # noqa: BLE001 - the plain list is still a correct superset
        return set(e.expected)


def _syntax_problem(e, text: str, expr_only: bool = False) -> SyntaxProblem:
    from lark.exceptions import UnexpectedCharacters, UnexpectedEOF, UnexpectedToken
    if isinstance(e, UnexpectedEOF) or getattr(e, "line", -1) in (-1, None):
        line, column = _end_position(text)
        expected = _keep(getattr(e, "expected", None) or [], expr_only)
        return _missing_word(expected, text, line, column) or \
            SyntaxProblem(f"the text stops too early: it still needs {_expected_words(expected)}", line, column)
    if isinstance(e, UnexpectedCharacters):
        ch = text[e.pos_in_stream] if e.pos_in_stream < len(text) else ""
        shown = f"'{ch}'" if ch.isprintable() and ch != " " else f"U+{ord(ch):04X}" if ch else "?"
        allowed = [t for t in (getattr(e, "allowed", None) or ()) if t not in _NOT_IN_EXPRESSIONS or not expr_only]
        if ch and not (ch.isalnum() or ch in _LANGUAGE_CHARACTERS):
            msg = f"the character {shown} is not part of the language"
        elif allowed:
            msg = f"the character {shown} cannot come here: the text needs {_expected_words(allowed)} at this place"
        else:
            msg = f"the character {shown} cannot come here"
        return SyntaxProblem(msg, e.line, e.column, e.column + 1)
    if isinstance(e, UnexpectedToken):
        tok = e.token
        expected = _keep(_acceptable(e), expr_only)
        if tok.type == "$END":
            line, column = _end_position(text)
            return _missing_word(expected, text, line, column) or \
                SyntaxProblem(f"the text stops too early: it still needs {_expected_words(expected)}", line, column)
        missing = _missing_word(expected, text, e.line, e.column)
        if missing is not None:
            return missing
        if tok.type in ("MOD", "OPEN_MOD") and tok.type not in expected and not expr_only:
            return SyntaxProblem("a modulus belongs to a congruence, written `A == B mod M` or `A ≡ B (mod M)`; "
                                 "with `=` the claim is an equality", e.line, e.column,
                                 tok.end_column if tok.end_line == tok.line else None)
        shown = str(tok)
        if len(shown) > 30:
            shown = shown[:27] + "..."
        return SyntaxProblem(f"'{shown}' cannot come here: the text needs {_expected_words(expected)} at this place",
                             e.line, e.column, (tok.end_column if tok.end_line == tok.line else None))
    return SyntaxProblem(str(e), getattr(e, "line", None), getattr(e, "column", None))
