"""A fast reader for the plain part of the language, built from the grammar's own tables.

Lark's LALR parser is the definition of the language (``grammar/*.lark``), but it
handles some 50,000 tokens a second here.  Most certificates are plain: titles,
sources, `let`, claims, congruences and chains of named rules over expressions.
This module reads exactly those, by recursive descent, with one regular
expression made of the grammar's terminals in Lark's own order, and builds the
same dataclasses with the same positions as the Transformer in ``parsing``.

It never decides anything the grammar might decide otherwise: whatever it does
not recognise (another statement, a keyword standing where a name could be, a
syntax error, a budget about to be exceeded) makes it give up, and the caller
hands the whole text to Lark, which then gives the same tree or the error.
The keywords and terminals come from the grammar through ``tables``; the
shape of the rules it reads is pinned by ``SHAPE``, and when the grammar's rules
no longer have that shape the reader switches itself off.
``tests/language/test_plain_reader.py`` compares both readers on the bundled,
broken and fuzzed certificates.
"""
from __future__ import annotations

import re

from . import expressions as ex
from . import statements as st
from ..foundation.numbers import gmp_mpz, text_int

__all__ = ["PlainReader", "GiveUp", "SHAPE", "RELATIONS", "NumberCall"]

RELATIONS = {"=": "=", "<": "<", ">": ">", "<=": "<=", ">=": ">=", "!=": "!=",
             "\u2264": "<=", "\u2265": ">=", "\u2260": "!="}

# The rules this reader implements, with every keyword written KW (so a renamed
# keyword keeps the shape) and Lark's numbered helper rules without their numbers.
SHAPE = [
    '__arguments_star: COMMA expr',
    '__arguments_star: __arguments_star COMMA expr',
    '__chain_plus: __chain_plus step !',
    '__chain_plus: step !',
    '__product_star: MULOP unary',
    '__product_star: __product_star MULOP unary',
    '__step_star: COMMA rule !',
    '__step_star: __step_star COMMA rule !',
    '__sum_star: ADDOP product',
    '__sum_star: __sum_star ADDOP product',
    'arguments: expr',
    'arguments: expr __arguments_star',
    'atom: INT -> number ?',
    'atom: LPAR expr RPAR ?',
    'atom: NAME -> name ?',
    'atom: call ?',
    'atom: finite_sum ?',
    'atom: list ?',
    'call: NAME LPAR RPAR !',
    'call: NAME LPAR arguments RPAR !',
    'chain: KW expr __chain_plus !',
    'chain: KW label expr __chain_plus !',
    'claim: KW expr CONGRUENT expr modulus -> congruence !',
    'claim: KW expr relation expr !',
    'claim: KW label expr CONGRUENT expr modulus -> congruence !',
    'claim: KW label expr relation expr !',
    'expr: sum ?',
    'finite_sum: KW LPAR NAME KW expr KW expr COLON expr RPAR !',
    'finite_sum: former_sum_start expr __ANON expr COMMA expr RPAR -> former_sum !',
    'label: NAME COLON',
    'let: KW NAME EQUALS expr !',
    'modulus: KW expr',
    'modulus: OPEN_MOD expr RPAR',
    'list: LSQB RSQB !',
    'list: LSQB arguments RSQB !',
    'power: atom ?',
    'power: atom CIRCUMFLEX unary -> power ?',
    'product: unary ?',
    'product: unary __product_star ?',
    'relation: EQUALS',
    'relation: GREATER',
    'relation: GREATER_EQUAL',
    'relation: LESS',
    'relation: LESS_EQUAL',
    'relation: NOT_EQUAL',
    'rule: KW NAME -> use_claim',
    'rule: KW NAME LPAR RPAR -> use_lemma',
    'rule: KW NAME LPAR arguments RPAR -> use_lemma',
    'rule: NAME',
    'source: KW STRING !',
    'statement: chain ?',
    'statement: claim ?',
    'statement: let ?',
    'statement: source ?',
    'statement: title ?',
    'step: EQUALS expr KW rule !',
    'step: EQUALS expr KW rule __step_star !',
    'sum: product ?',
    'sum: product __sum_star ?',
    'title: KW STRING !',
    'unary: MINUS unary -> neg ?',
    'unary: PLUS unary ?',
    'unary: power ?',
]


class GiveUp(Exception):
    """This text is for Lark to read."""


_END = "$END"
_NO_ROLES = frozenset()


def _may_span_lines(regex: str) -> bool:
    """Lark's test of a terminal that may contain a newline, a little wider."""
    return "\n" in regex or "\\n" in regex or "\\s" in regex or "[^" in regex or "." in regex


class PlainReader:
    """Reads plain certificates and expressions; `tables` come from ``parsing.grammar_tables``."""

    def __init__(self, tables: dict):
        self.enabled = sorted(tables["shape"]) == sorted(SHAPE)
        terminals = tables["terminals"]            # [name, regex, literal or None], in Lark's order
        self.ignore = frozenset(tables["ignore"])
        embedded = tables["embedded"]               # literal string terminals a regex terminal covers
        self.kinds = []
        parts = []
        for name, regex, literal in terminals:
            if literal is not None and literal in embedded:
                continue
            parts.append(f"(?P<T{len(self.kinds)}>{regex})")
            self.kinds.append(name)
        self.master = re.compile("|".join(parts))
        self.group_kind = {f"T{i}": k for i, k in enumerate(self.kinds)}
        self.small = {name: re.compile(regex) for name, regex, literal in terminals}
        self.by_literal = {literal: name for name, _, literal in terminals if literal is not None}
        self.embedded = embedded                    # literal -> terminal name
        self.keywords = frozenset(lit for lit in embedded if self.small["NAME"].fullmatch(lit))
        kw = tables["keywords"]
        self.statement = {kw[r]: r for r in ("title", "source", "let", "claim", "chain")}
        self.kw = kw
        self._roles: dict = {}
        # terminals whose lexemes are never anything else (long numbers and names, mostly)
        self.plain_roles = {k: frozenset((k,)) for k in ("NAME", "INT", "STRING") if k in self.small}
        self.multiline = frozenset(name for name, regex, _ in terminals if _may_span_lines(regex))
        self.number_call_pattern = self._number_call_pattern() if self.enabled else None
        self.claim_line, self.claim_argument = _claim_line_patterns(self) if self.enabled else (None, None)
        self.sum_term = _sum_term_pattern(self) if self.enabled else None
        self.step_line = _step_line_pattern(self) if self.enabled else None

    def _number_call_pattern(self):
        """NAME(INT, ..., INT) on one line, blanks (spaces, tabs) around any token: `call` and
        `arguments` of the grammar with numbers for arguments, from the grammar's own NAME,
        INT (which must be ASCII digits) and blanks; None when those do not read as here.
        The pattern lets digits, blanks and commas through between the parentheses, and
        `number_call` checks that they are INTs separated by commas."""
        if self.small["INT"].pattern != "[0-9]+" or \
                not any(self.small[name].fullmatch(" \t") for name in self.ignore) or \
                any(self.small["NAME"].fullmatch(literal) for literal in "(),"):
            return None
        blank = "[ \t]*"
        return re.compile(f"{blank}({self.small['NAME'].pattern}){blank}\\(([0-9 \t,]*)\\){blank}")

    # -- tokens ----------------------------------------------------------------
    def _start(self, text: str, limits):
        self.text = text
        self.limits = limits
        self.pos = 0
        self.size = len(text)
        self.tokens = limits.tokens
        self.line = 1
        self.line_start = 0
        self.count = 0
        self._next()

    def _next(self):
        """Move to the next significant token: kind, lexeme, roles, line, column."""
        text, match, ignore, kinds = self.text, self.master.match, self.ignore, self.group_kind
        while True:
            pos = self.pos
            if pos >= self.size:
                self.kind, self.lex, self.roles = _END, "", _NO_ROLES
                self.tline, self.tcol = self.line, pos - self.line_start + 1
                return
            m = match(text, pos)
            if m is None:
                raise GiveUp()
            lex = m.group()
            kind = kinds[m.lastgroup]
            self.count += 1
            if self.count > self.tokens:
                raise GiveUp()
            self.pos = m.end()
            if kind in ignore:
                if "\n" in lex:
                    self.line += lex.count("\n")
                    self.line_start = pos + lex.rindex("\n") + 1
                continue
            if kind in self.multiline and "\n" in lex:
                raise GiveUp()                 # a token over two lines: Lark's business
            self.kind, self.lex, self.tline, self.tcol = kind, lex, self.line, pos - self.line_start + 1
            self.tstart = pos
            roles = self.plain_roles.get(kind)
            if roles is None or lex in self.embedded:
                roles = self._roles_of(kind, lex)
            self.roles = roles
            return

    def _roles_of(self, kind, lex) -> frozenset:
        """Every terminal the lexeme can be: Lark's contextual lexer picks among them by state."""
        key = (kind, lex)
        roles = self._roles.get(key)
        if roles is None:
            found = {n for n, rx in self.small.items() if rx.fullmatch(lex)}
            found.add(kind)
            if lex in self.embedded:
                found.add(self.embedded[lex])
            roles = frozenset(found)
            if len(self._roles) < 10_000:
                self._roles[key] = roles
        return roles

    def _is(self, role: str) -> bool:
        """Can the current token be read as the terminal `role`?"""
        return role in self.roles

    def _literal(self, literal: str) -> bool:
        return self._is(self.by_literal[literal]) if literal in self.by_literal else False

    def _pos(self) -> ex.Pos:
        return ex.Pos(self.tline, self.tcol, self.tline, self.tcol + len(self.lex))

    def _expect_literal(self, literal: str) -> ex.Pos:
        if not self._literal(literal):
            raise GiveUp()
        p = self._pos()
        self._next()
        return p

    def _plain_name(self) -> bool:
        """A NAME that Lark reads as a name here (a keyword never is, to be safe)."""
        return self.kind == "NAME" and self.lex not in self.keywords

    # -- entry points ------------------------------------------------------------
    def number_call(self, text: str, limits):
        """The NumberCall the whole text is (NAME(INT, ..., INT) on one line), or None.

        Only what Lark reads as exactly that Call, within every budget: a keyword for NAME,
        a number over `literal-digits`, a text that might exceed `tokens` or `nesting`,
        anything else is None (and the text goes the usual way).  Its characters are
        letters, digits, _ ' ( ) , space and tab only, none that `parsing` refuses."""
        pattern = self.number_call_pattern
        m = pattern.fullmatch(text) if pattern is not None else None
        if m is None:
            return None
        name, inside = m.groups()
        if name in self.keywords or len(text) > limits.tokens or limits.nesting < 1:
            return None
        if len(inside) <= _SHORT_NUMBER and len(inside) <= limits.literal_digits:
            try:     # int() takes [ \t]*[0-9]+[ \t]* (all the pattern lets through) and nothing else
                parts = inside.split(",")
                # two numbers (a Dedekind sum) without map's machinery: a tenth of a short read
                values = (int(parts[0]), int(parts[1])) if len(parts) == 2 else tuple(map(int, parts))
                return NumberCall((name, values, m))
            except ValueError:          # an empty argument, or blanks between digits
                return None
        values, number = [], self.small["INT"]
        for digits in inside.split(","):
            digits = digits.strip(" \t")
            if len(digits) > limits.literal_digits or not number.fullmatch(digits):
                return None
            values.append(text_int(digits))
        return NumberCall((name, tuple(values), m))

    def expression(self, text: str, limits):
        if not self.enabled:
            raise GiveUp()
        self._start(text, limits)
        node, _ = self._expr()
        if self.kind != _END:
            raise GiveUp()
        return node

    def certificate(self, text: str, limits) -> list:
        if not self.enabled:
            raise GiveUp()
        self._start(text, limits)
        out = []
        claim = self.kw["claim"] if self.claim_line is not None and limits.nesting >= 2 else None
        while self.kind != _END:
            if self.kind != "NAME" or self.lex not in self.statement:
                raise GiveUp()
            if self.lex == claim:
                claims = self._claims_on_lines()
                if claims:
                    out += claims
                    continue
            out.append(getattr(self, "_" + self.statement[self.lex])())
        return out

    # -- statements --------------------------------------------------------------
    def _string_statement(self, cls):
        first = self._pos()
        self._next()
        if self.kind != "STRING":
            raise GiveUp()
        node = cls(self.lex[1:-1], _span(first, self._pos()))
        self._next()
        return node

    def _title(self):
        return self._string_statement(st.Title)

    def _source(self):
        return self._string_statement(st.Source)

    def _let(self):
        first = self._pos()
        self._next()
        if not self._plain_name():
            raise GiveUp()
        name = self.lex
        self._next()
        if not self._is("EQUALS"):
            raise GiveUp()
        self._next()
        value, _ = self._expr()
        return st.Let(name, value, _span(first, value.pos))

    def _label_then_expr(self):
        """[label] expr: a NAME followed by ':' is a label."""
        if self._plain_name():
            name, pos = self.lex, self._pos()
            self._next()
            if self._is("COLON"):
                self._next()
                return name, self._expr()[0]
            return None, self._expr(first=self._name_or_call(name, pos))[0]
        return None, self._expr()[0]

    def _claim(self):
        first = self._pos()
        self._next()
        label, lhs = self._label_then_expr()
        if self._is("CONGRUENT"):
            self._next()
            rhs, _ = self._expr()
            if self.kind != "NAME" or self.lex != self.kw["mod"]:
                raise GiveUp()
            self._next()
            modulus, _ = self._expr()
            return st.Congruence(label, lhs, rhs, modulus, _span(first, modulus.pos))
        relation = RELATIONS.get(self.lex) if self.kind in self.relations else None
        if relation is None:
            raise GiveUp()
        self._next()
        rhs, _ = self._expr()
        return st.Claim(label, lhs, relation, rhs, _span(first, rhs.pos))

    def _claims_on_lines(self) -> list:
        """The claims `claim [LABEL:] f(n, ..., n) REL [-]p[/q]`, each on one line, from here on;
        [] (nothing consumed) when the first has another shape.

        One regular expression reads a line.  It is made of the grammar's own terminals with
        blanks between them, and each token ends where the lexer ends it (a name or a number is
        followed by a character that cannot continue it), so it reads the tokens the lexer
        reads.  A line is taken only when the token after it starts a statement (the next line
        is such a claim, or the lexer says so) or ends the text, so that nothing that follows
        (`/ 2` on the next line, say) could belong to the claim."""
        text, match, limit = self.text, self.claim_line.match, self.tokens
        out = []
        m = match(text, self.tstart)
        while m is not None:
            made = self._claim_from(m)
            if made is None or self.count + made[1] > limit:
                break
            claim, tokens = made
            end = m.end()
            newline = 1 if text.startswith("\n", end) else 2 if text.startswith("\r\n", end) else 0
            if newline:
                following = match(text, end + newline)
                if following is not None:
                    # the next token is the keyword that starts the next line: read it
                    out.append(claim)
                    self.count += tokens + 2
                    self.line += 1
                    end += newline
                    self.tline, self.line_start, self.tstart, self.tcol = self.line, end, end, 1
                    self.pos = end + len(self.lex)
                    m = following
                    continue
            saved = (self.pos, self.count, self.kind, self.lex, self.roles, self.tline, self.tcol,
                     self.tstart, self.line, self.line_start)
            self.pos = end
            self.count += tokens
            self._next()
            if self.kind == _END or (self.kind == "NAME" and self.lex in self.statement):
                out.append(claim)
            else:
                (self.pos, self.count, self.kind, self.lex, self.roles, self.tline, self.tcol,
                 self.tstart, self.line, self.line_start) = saved
            break
        return out

    def _claim_from(self, m):
        """(the Claim of a line matched by `claim_line`, an upper bound of its tokens after the
        keyword), or None when the line is for the token reader (a keyword as a name, a number
        over the digit budget, a relation it does not know)."""
        (_, (l0, l1), (n0, n1), _, (s0, _), (a0, a1), (t0, _), (b0, b1), (e0, e1), (_, c1), (r0, r1),
         (m0, _), (p0, p1), (q0, q1)) = m.regs
        text, digits = self.text, self.limits.literal_digits
        name = text[n0:n1]
        label = text[l0:l1] if l0 >= 0 else None
        relation = RELATIONS.get(text[r0:r1])
        if relation is None or name in self.keywords or (label is not None and label in self.keywords) \
                or max(p1 - p0, q1 - q0, a1 - a0, b1 - b0) > digits:
            return None
        line, start = self.tline, self.line_start - 1
        # the first two arguments have groups of their own; more are found in their span
        args = [_literal(text, s0, a0, a1, line, start)]
        negative = s0 >= 0
        if b0 >= 0:
            args.append(_literal(text, t0, b0, b1, line, start))
            negative += t0 >= 0
            if e1 > e0:
                for a in self.claim_argument.finditer(text, e0, e1):
                    (_, (s0, _), (a0, a1)) = a.regs
                    if a1 - a0 > digits:
                        return None
                    args.append(_literal(text, s0, a0, a1, line, start))
                    negative += s0 >= 0
        call = _call(name, tuple(args), _at(line, n0 - start, c1 - start))
        rhs = _literal(text, m0, p0, p1, line, start)
        if q0 >= 0:
            divisor = _num(_integer(text[q0:q1]), line, q0 - start, q1 - start)
            rhs = _product(((False, rhs), (True, divisor)), _at(line, rhs.pos.column, q1 - start))
        # label and colon, name ( arguments, their minus signs and commas ) relation [-]p [/ q]
        # after the keyword, and the runs of blanks between all of them: at most one in each gap
        # and at most one a blank (more than the lexer counts only gives up sooner near the budget)
        tokens = (2 if l0 >= 0 else 0) + 2 * len(args) + negative + 4 + (m0 >= 0) + (2 if q0 >= 0 else 0)
        start, end = m.start(), m.end()
        blanks = min(tokens, text.count(" ", start, end) + text.count("\t", start, end))
        claim = _claim(label, call, relation, rhs, _at(line, self.tcol, rhs.pos.end_column))
        return claim, tokens + blanks

    @property
    def relations(self):
        return self.kw["relations"]

    def _chain(self):
        first = self._pos()
        self._next()
        label, start = self._label_then_expr()
        steps, on_line = [], self.step_line is not None
        while self._is("EQUALS"):
            step = self._step_on_line() if on_line and self.lex == "=" else None
            steps.append(self._step() if step is None else step)
        if not steps:
            raise GiveUp()
        return st.Chain(label, start, tuple(steps), _span(first, steps[-1].pos))

    def _step(self):
        first = self._pos()
        self._next()
        expr, _ = self._expr()
        if self.kind != "NAME" or self.lex != self.kw["by"]:
            raise GiveUp()
        self._next()
        rules = [self._rule()]
        while self._is("COMMA"):
            self._next()
            rules.append(self._rule())
        return st.Step(expr, tuple(rules), _span(first, rules[-1].pos))

    def _step_on_line(self):
        """The step `= [-]p[/q] +|- NAME(a, b) by RULE, ..., RULE` (the lines of a derived chain)
        read by one regular expression from the current `=`, or None (nothing consumed) when the
        line has another shape, is near a budget, or its rules go on after the line.

        The pattern is made of the grammar's terminals with blanks between them; each token ends
        where the lexer ends it (a number or a name is followed by a character that cannot
        continue it), so it reads the tokens the lexer reads.  The step is taken only when the
        token after it is not a comma (which would add a rule from the next line)."""
        m = self.step_line.match(self.text, self.tstart)
        if m is None:
            return None
        text, keywords, limits = self.text, self.keywords, self.limits
        regs = m.regs
        (_, _, (s0, _), (p0, p1), _, (q0, q1), (o0, o1), (n0, n1), _, (a0, a1), _, (b0, b1), (_, c1),
         (y0, y1), (r0, r1)) = regs
        name, rules = text[n0:n1], _RULE_NAMES.findall(text, r0, r1)
        if name in keywords or text[y0:y1] != self.kw["by"] or any(r in keywords for r in rules) or \
                max(p1 - p0, q1 - q0, a1 - a0, b1 - b0) > limits.literal_digits or \
                max((s0 >= 0) + (q0 >= 0), 1) + 1 > limits.nesting:
            return None
        # the tokens after `=` (a group each, the rules' commas besides) and each run of blanks
        # between them (one ignored token each, as the lexer counts): a gap between two groups
        tokens, end = 2 * len(rules) - 1 + len(_BLANKS.findall(text, r0, r1)), regs[1][1]
        for first, last in regs[2:14]:
            if first >= 0:
                tokens += 1 + (first > end)
                end = last
        tokens += r0 > end
        if self.count + tokens > self.tokens:
            return None
        saved = (self.pos, self.count, self.kind, self.lex, self.roles, self.tline, self.tcol,
                 self.tstart, self.line, self.line_start)
        self.pos = m.end()
        self.count += tokens
        self._next()
        if "COMMA" in self.roles:          # `, rule` on the next line: the token reader reads it
            (self.pos, self.count, self.kind, self.lex, self.roles, self.tline, self.tcol,
             self.tstart, self.line, self.line_start) = saved
            return None
        line, start = saved[5], saved[9] - 1
        constant = _literal(text, s0, p0, p1, line, start)
        if q0 >= 0:
            divisor = _num(_integer(text[q0:q1]), line, q0 - start, q1 - start)
            constant = _product(((False, constant), (True, divisor)), _at(line, constant.pos.column, q1 - start))
        call = _call(name, (_num(_integer(text[a0:a1]), line, a0 - start, a1 - start),
                            _num(_integer(text[b0:b1]), line, b0 - start, b1 - start)),
                     _at(line, n0 - start, c1 - start))
        total = _sum(((1, constant), (1 if text[o0:o1] == "+" else -1, call)),
                     _at(line, constant.pos.column, c1 - start))
        refs, at = [], r0
        for rule in rules:
            at = text.index(rule, at)
            refs.append(_rule_ref(rule, _at(line, at - start, at + len(rule) - start)))
            at += len(rule)
        return _step(total, tuple(refs), _at(line, saved[6], refs[-1].pos.end_column))

    def _rule(self):
        if self._plain_name():
            ref = st.RuleRef(self.lex, None, self._pos())
            self._next()
            return ref
        if self.kind == "NAME" and self.lex == self.kw["use_claim"]:
            self._next()
            if not self._plain_name():
                raise GiveUp()
            ref = st.RuleRef("claim", self.lex, self._pos())
            self._next()
            return ref
        raise GiveUp()

    # -- expressions ---------------------------------------------------------------
    # Each returns (node, depth); depth as the Transformer counts it: names and
    # numbers 0, any other node one more than its deepest child.
    def _made(self, node, depth):
        if depth > self.limits.nesting:
            raise GiveUp()
        return node, depth

    def _expr(self, first=None):
        return self._sum(first)

    def _sum(self, first=None):
        head = self._product(first)
        if not "ADDOP" in self.roles:
            return head
        terms, depth = [(1, head[0])], head[1]
        while "ADDOP" in self.roles:
            if self.sum_term is not None:
                self._number_terms(terms)
            sign = 1 if self.lex == "+" else -1
            self._next()
            term = self._product()
            terms.append((sign, term[0]))
            depth = max(depth, term[1])
        return self._made(ex.Sum(tuple(terms), _span(head[0].pos, terms[-1][1].pos)), depth + 1)

    def _number_terms(self, terms: list):
        """Terms `+ n` or `- n` (n a literal) followed by another `+` or `-` on the same line,
        from the current token on, each read by one regular expression (the 1 + 1 + ... of a
        long line); the current token is then the `+` or `-` after the last one read."""
        text, match, digits = self.text, self.sum_term.match, self.limits.literal_digits
        line, start, pos = self.tline, self.line_start - 1, self.tstart
        m = match(text, pos)
        if m is None:
            return
        count = self.count - 1        # the current `+` or `-` is counted again with its term
        while m is not None:
            (_, (o0, o1), (n0, n1)) = m.regs
            tokens = 2 + (n0 > o1) + (m.end() > n1)      # + [blanks] n [blanks], as the lexer counts
            if n1 - n0 > digits or count + tokens > self.tokens:
                break                 # the token reader reads this term, and gives up
            count += tokens
            terms.append((1 if text[o0:o1] == "+" else -1, _lean_num(_integer(text[n0:n1]), line, n0 - start, n1 - start)))
            pos = m.end()
            m = match(text, pos)
        self.pos, self.count = pos, count
        self._next()                  # the `+` or `-` at pos

    def _product(self, first=None):
        head = self._unary(first)
        if not "MULOP" in self.roles:
            return head
        factors, depth = [(False, head[0])], head[1]
        while "MULOP" in self.roles:
            divide = self.lex == "/"
            self._next()
            factor = self._unary()
            factors.append((divide, factor[0]))
            depth = max(depth, factor[1])
        return self._made(ex.Product(tuple(factors), _span(head[0].pos, factors[-1][1].pos)), depth + 1)

    def _unary(self, first=None):
        if first is None:
            if "MINUS" in self.roles:
                where = self._pos()
                self._next()
                operand, depth = self._unary()
                return self._made(ex.Neg(operand, _span(where, operand.pos)), depth + 1)
            if "PLUS" in self.roles:
                self._next()
                return self._unary()
        base = self._atom() if first is None else first
        if not "CIRCUMFLEX" in self.roles:
            return base
        self._next()
        exponent = self._unary()
        return self._made(ex.Power(base[0], exponent[0], _span(base[0].pos, exponent[0].pos)),
                          max(base[1], exponent[1]) + 1)

    def _atom(self):
        kind = self.kind
        if kind == "INT":
            if len(self.lex) > self.limits.literal_digits:
                raise GiveUp()
            node = ex.Num(text_int(self.lex), self._pos())
            self._next()
            return node, 0
        if self._plain_name():
            name, pos = self.lex, self._pos()
            self._next()
            return self._name_or_call(name, pos)
        if "LPAR" in self.roles:
            self._next()
            inner = self._expr()
            if not "RPAR" in self.roles:
                raise GiveUp()
            self._next()
            return inner
        if "LSQB" in self.roles:
            first = self._pos()
            self._next()
            items, depth = self._arguments("RSQB")
            if len(items) > self.limits.list_length:
                raise GiveUp()
            last = self._pos()
            self._next()
            return self._made(ex.ListExpr(tuple(items), _span(first, last)), depth + 1)
        raise GiveUp()

    def _name_or_call(self, name, pos):
        """The NAME just read: a call when "(" follows, else a name."""
        if "LPAR" in self.roles:
            return self._call(name, pos)
        return ex.Name(name, pos), 0

    def _call(self, name, pos):
        self._next()
        args, depth = self._arguments("RPAR")
        last = self._pos()
        self._next()
        return self._made(ex.Call(name, tuple(args), _span(pos, last)), depth + 1)

    def _arguments(self, closing: str):
        """expr ("," expr)* up to the closing terminal (left current); (items, deepest)."""
        items, depth = [], 0
        if self._is(closing):
            return items, depth
        while True:
            node, d = self._expr()
            items.append(node)
            depth = max(depth, d)
            if self._is(closing):
                return items, depth
            if not "COMMA" in self.roles:
                raise GiveUp()
            self._next()


_SHORT_NUMBER = 300      # int() reads these directly; longer ones go through text_int


class NumberCall(tuple):
    """NAME(INT, ..., INT) as read from a text: (name, numbers, match), and the tree on demand."""

    __slots__ = ()

    @property
    def name(self) -> str:
        return self[0]

    @property
    def values(self) -> tuple:
        return self[1]

    def tree(self) -> ex.Call:
        """The Call with its Num arguments, at the positions Lark gives (one line, columns from 1)."""
        name, values, m = self
        name_at, inside_at, close_at = m.start(1), m.start(2), m.end(2)
        numbers = []
        for value, found in zip(values, re.finditer("[^ \t,]+", m.group(2))):
            column = inside_at + found.start() + 1
            numbers.append(ex.Num(value, ex.Pos(1, column, 1, column + found.end() - found.start())))
        return ex.Call(name, tuple(numbers), ex.Pos(1, name_at + 1, 1, close_at + 2))


_CLAIM_GROUPS = ["label", "name", "args", "minus1", "first", "minus2", "second", "more", "close", "relation",
                 "minus", "p", "q"]


def _claim_line_patterns(reader):
    """The patterns of `_claims_on_lines`, made of the grammar's terminals; (None, None)
    when the grammar's punctuation is not what they assume."""
    small, by_literal = reader.small, reader.by_literal
    punctuation = {"COLON": ":", "LPAR": "(", "RPAR": ")", "COMMA": ","}
    if any(by_literal.get(lit) != name for name, lit in punctuation.items()) or \
            any(k not in small for k in ("NAME", "INT", "MINUS", "MULOP")) or \
            not small["MULOP"].fullmatch("/") or small["MINUS"].fullmatch("/"):
        return None, None
    # in the lexer's order, so that `<=` is tried before `<`
    relations = [kind for kind in reader.kinds if kind in reader.kw["relations"]]
    name, number, minus = small["NAME"].pattern, small["INT"].pattern, small["MINUS"].pattern
    blank = "[ \t]*"
    argument = f"(?:(?:{minus}){blank})?(?:{number})"
    relation = "|".join(f"(?:{small[r].pattern})" for r in relations)
    line = re.compile(
        f"{re.escape(reader.kw['claim'])}[ \\t]+(?:(?P<label>{name}){blank}:{blank})?"
        f"(?P<name>{name}){blank}\\({blank}"
        f"(?P<args>(?:(?P<minus1>{minus}){blank})?(?P<first>{number})"
        f"(?:{blank},{blank}(?:(?P<minus2>{minus}){blank})?(?P<second>{number})"
        f"(?P<more>(?:{blank},{blank}{argument})*))?)"
        f"{blank}(?P<close>\\)){blank}(?P<relation>{relation}){blank}(?:(?P<minus>{minus}){blank})?"
        f"(?P<p>{number})(?:{blank}/{blank}(?P<q>{number}))?")
    if list(line.groupindex) != _CLAIM_GROUPS or line.groups != len(_CLAIM_GROUPS):
        return None, None            # a terminal with a group of its own: the numbers would shift
    return line, re.compile(f"(?:({minus}){blank})?({number})")


def _step_line_pattern(reader):
    """The pattern of `_step_on_line`, made of the grammar's terminals; None when the grammar's
    punctuation is not what it assumes (a group for each token: = [-] p [/ q] +|- name ( a , b ) by,
    and one for the rules with their commas)."""
    small, by_literal = reader.small, reader.by_literal
    punctuation = {"EQUALS": "=", "LPAR": "(", "RPAR": ")", "COMMA": ","}
    if any(by_literal.get(lit) != name for name, lit in punctuation.items()) or \
            any(k not in small for k in ("NAME", "INT", "MINUS", "ADDOP", "MULOP")) or \
            not small["MULOP"].fullmatch("/") or small["MINUS"].fullmatch("/") or \
            small["ADDOP"].fullmatch("/") or not small["ADDOP"].fullmatch("+") or \
            _RULE_NAMES.pattern != small["NAME"].pattern:
        return None
    name, number, minus, addop = (small[k].pattern for k in ("NAME", "INT", "MINUS", "ADDOP"))
    blank = "[ \t]*"
    line = re.compile(
        f"(=){blank}(?:({minus}){blank})?({number})(?:{blank}(/){blank}({number}))?{blank}({addop}){blank}"
        f"({name}){blank}(\\(){blank}({number}){blank}(,){blank}({number}){blank}(\\)){blank}"
        f"({name})[ \\t]+({name}(?:{blank},{blank}{name})*)")
    return line if line.groups == 14 else None


_RULE_NAMES = re.compile(r"[A-Za-z_][A-Za-z_0-9]*'*")
_BLANKS = re.compile("[ \t]+")


def _sum_term_pattern(reader):
    """`+ n` or `- n` followed, after blanks, by `+` or `-` (so n is a whole term); None when
    the grammar's ADDOP could be something the pattern does not know."""
    small = reader.small
    if "ADDOP" not in small or "INT" not in small or not small["ADDOP"].fullmatch("+"):
        return None
    addop, number = small["ADDOP"].pattern, small["INT"].pattern
    term = re.compile(f"(?P<op>{addop})[ \t]*(?P<n>{number})[ \t]*(?={addop})")
    return term if term.groups == 2 else None


# The one-line claims build their nodes field by field: the same frozen dataclasses, equal to
# what the constructors make (the differential test compares them), at half the cost of the
# constructors, for a dict of fields per node (about 60 bytes more).  The terms of a long sum,
# whose memory counts more than their speed, are made with the constructors' own assignments
# (object.__setattr__, the node's fields kept inline) without the constructors' lookups.
_new = object.__new__
_set = object.__setattr__


def _lean_num(value: int, line: int, column: int, end_column: int) -> ex.Num:
    p = _new(ex.Pos)
    _set(p, "line", line)
    _set(p, "column", column)
    _set(p, "end_line", line)
    _set(p, "end_column", end_column)
    n = _new(ex.Num)
    _set(n, "value", value)
    _set(n, "pos", p)
    return n


def _at(line: int, column: int, end_column: int) -> ex.Pos:
    p = _new(ex.Pos)
    d = p.__dict__
    d["line"], d["column"], d["end_line"], d["end_column"] = line, column, line, end_column
    return p


def _integer(digits: str) -> int:
    """The number written by `digits` (ASCII digits only, as INT is): int() is quadratic in their
    count and GMP is not."""
    if len(digits) <= _SHORT_NUMBER:
        return int(digits)
    mpz = gmp_mpz()
    if mpz is not None:
        try:
            return int(mpz(digits))
        except ValueError:          # not for GMP (a grammar whose INT takes more than ASCII digits)
            pass
    return text_int(digits)


def _literal(text: str, minus: int, first: int, end: int, line: int, start: int):
    """The literal text[first:end], under a minus sign at `minus` unless that is -1."""
    node = _num(_integer(text[first:end]), line, first - start, end - start)
    return node if minus < 0 else _neg(node, _at(line, minus - start, end - start))


def _num(value: int, line: int, column: int, end_column: int) -> ex.Num:
    n = _new(ex.Num)
    d = n.__dict__
    d["value"], d["pos"] = value, _at(line, column, end_column)
    return n


def _neg(operand, pos: ex.Pos) -> ex.Neg:
    n = _new(ex.Neg)
    d = n.__dict__
    d["operand"], d["pos"] = operand, pos
    return n


def _call(name: str, args: tuple, pos: ex.Pos) -> ex.Call:
    c = _new(ex.Call)
    d = c.__dict__
    d["name"], d["args"], d["pos"] = name, args, pos
    return c


def _product(factors: tuple, pos: ex.Pos) -> ex.Product:
    p = _new(ex.Product)
    d = p.__dict__
    d["factors"], d["pos"] = factors, pos
    return p


def _claim(label, lhs, relation: str, rhs, pos: ex.Pos) -> st.Claim:
    c = _new(st.Claim)
    d = c.__dict__
    d["label"], d["lhs"], d["relation"], d["rhs"], d["pos"] = label, lhs, relation, rhs, pos
    return c


def _sum(terms: tuple, pos: ex.Pos) -> ex.Sum:
    n = _new(ex.Sum)
    d = n.__dict__
    d["terms"], d["pos"] = terms, pos
    return n


def _rule_ref(name: str, pos: ex.Pos) -> st.RuleRef:
    r = _new(st.RuleRef)
    d = r.__dict__
    d["name"], d["label"], d["pos"], d["args"] = name, None, pos, ()
    return r


def _step(expr, rules: tuple, pos: ex.Pos) -> st.Step:
    s = _new(st.Step)
    d = s.__dict__
    d["expr"], d["rules"], d["pos"] = expr, rules, pos
    return s


def _span(first: ex.Pos, last: ex.Pos) -> ex.Pos:
    return ex.Pos(first.line, first.column, last.end_line, last.end_column)
