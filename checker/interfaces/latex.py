"""A checked certificate as LaTeX: the calculation in the form it is published.

Each chain becomes an align* environment with the rule of each step as a
note on the right, claims and identities become displayed equations, and a
statement that failed the check is marked.  The output needs only amsmath
and amssymb.
"""
from __future__ import annotations

import re

from ..language import expressions as ex
from ..language import statements as st
from ..replay.checking import check_certificate
from ..language.parsing import parse_certificate
from ..foundation.numbers import int_text

__all__ = ["certificate_latex", "expression_latex"]

_SPECIAL = {"\\": r"\textbackslash{}", "{": r"\{", "}": r"\}", "#": r"\#", "$": r"\$", "%": r"\%",
            "&": r"\&", "_": r"\_", "~": r"\textasciitilde{}", "^": r"\textasciicircum{}"}


def _text(s: str) -> str:
    return "".join(_SPECIAL.get(ch, ch) for ch in s)


def _name(n: str) -> str:
    base = n.rstrip("'")
    primes = "'" * (len(n) - len(base))
    body = base if len(base) == 1 else r"\mathit{" + base.replace("_", r"\_") + "}"
    return body + primes


_FLOW = [False]          # True while a long statement is typeset as text that may break
_GROUP = 10              # digits between break points of a long number


def _digits(text: str) -> str:
    """A long run of digits with a break point every few digits (math and text mode alike)."""
    if len(text) <= 2 * _GROUP:
        return text
    head = len(text) % _GROUP or _GROUP
    groups = [text[:head]] + [text[i:i + _GROUP] for i in range(head, len(text), _GROUP)]
    return r"\allowbreak ".join(groups)


def _breakable(text: str) -> str:
    """Plain text with long numbers made breakable."""
    return re.sub(r"[0-9]{21,}", lambda m: _digits(m.group(0)), text)


def _number(value: int) -> str:
    if value.bit_length() >= 200_000:
        return r"\langle\text{a number of " + str(_digit_count(value)) + r" digits}\rangle"
    return _digits(int_text(value))


def _digit_count(n: int) -> int:
    """The number of decimal digits of |n|, without writing it (str() refuses past 4,300 digits)."""
    n = abs(n)
    d = max(1, int((n.bit_length() - 1) * 0.30102999566398120))     # log10(2): at most one too few
    while 10 ** d <= n:
        d += 1
    return d


def _left(delimiter: str) -> str:
    """An opening delimiter that grows (display) or that a line may break after (flowing text)."""
    return delimiter if _FLOW[0] else r"\left" + delimiter


def _right(delimiter: str) -> str:
    return delimiter if _FLOW[0] else r"\right" + delimiter


def _atomic(node) -> bool:
    return isinstance(node, (ex.Num, ex.Name, ex.Call, ex.ListExpr))


def _paren(node) -> str:
    s = expression_latex(node)
    if _atomic(node):
        return s
    # \left ... \right makes one unbreakable box: plain parentheses in text that must break
    return "(" + s + ")" if _FLOW[0] else r"\left(" + s + r"\right)"


def _args(args) -> str:
    # a comma is punctuation, where math never breaks unless allowed to
    return (r", \allowbreak " if _FLOW[0] else ", ").join(expression_latex(a) for a in args)


def _set(node) -> str:
    if isinstance(node, ex.ListExpr):
        return r"\{" + _args(node.items) + r"\}"
    return expression_latex(node)


def _call(node: ex.Call) -> str:
    a, name = node.args, node.name
    n = len(a)
    if name == "dedekind" and n == 2:
        return f"s({_args(a)})"
    if name == "dedekind_rademacher" and n == 4:
        return f"s({_args(a[:2])}; {_args(a[2:])})"
    if name == "generalized_dedekind" and n == 3:
        return f"s_{{{expression_latex(a[0])}}}({_args(a[1:])})"
    if name == "fourier_dedekind" and n == 3:
        return f"s_{{{expression_latex(a[0])}}}({_set(a[1])}; {expression_latex(a[2])})"
    if name == "sawtooth" and n == 1:
        return r"\left(\!\left(" + expression_latex(a[0]) + r"\right)\!\right)"
    if name == "floor" and n == 1:
        return r"\bigl\lfloor " + expression_latex(a[0]) + r" \bigr\rfloor"   # no group: a line may break inside
    if name == "ceil" and n == 1:
        return r"\bigl\lceil " + expression_latex(a[0]) + r" \bigr\rceil"
    if name == "frac" and n == 1:
        return r"\left\{ " + expression_latex(a[0]) + r" \right\}"
    if name == "mod" and n == 2:
        return f"\\left({expression_latex(a[0])} \\bmod {expression_latex(a[1])}\\right)"
    if name == "gcd":
        return r"\gcd(" + _args(a) + ")"
    if name == "binomial" and n == 2:
        return r"\binom{" + expression_latex(a[0]) + "}{" + expression_latex(a[1]) + "}"
    if name == "bernoulli":
        head = f"B_{{{expression_latex(a[0])}}}"
        return head if n == 1 else f"{head}({_args(a[1:])})"
    if name == "periodic_bernoulli" and n == 2:
        return f"\\bar{{B}}_{{{expression_latex(a[0])}}}({expression_latex(a[1])})"
    if name == "partitions" and n == 2:
        return f"p_{{{_set(a[1])}}}({expression_latex(a[0])})"
    if name == "partitions_extended" and n == 2:
        return f"P_{{{_set(a[1])}}}({expression_latex(a[0])})"
    if name == "frobenius" and n == 1:
        return f"g({_set(a[0])})"
    if name in ("lattice_points", "interior_lattice_points") and n == 2:
        hull = _hull(a[1])
        inside = r"\operatorname{int} " if name.startswith("interior") else ""
        return r"\#" + _left("(") + _paren(a[0]) + r"\," + inside + hull + r" \cap \mathbb{Z}^{2}" + _right(")")
    if name == "lattice_points_in" and n == 2:
        dim = len(a[1].items[0].items) - 1 if isinstance(a[1], ex.ListExpr) and a[1].items and \
            isinstance(a[1].items[0], ex.ListExpr) else "d"
        return (r"\#" + _left("(") + _paren(a[0]) + r"\," + _halfspaces(a[1]) + r" \cap \mathbb{Z}^{" + str(dim)
                + "}" + _right(")"))
    return r"\operatorname{" + name.replace("_", r"\_") + "}(" + _args(a) + ")"


def _letters(node) -> bool:
    """A name, or a power of one: k, h', k^2."""
    return isinstance(node, ex.Name) or (isinstance(node, ex.Power) and isinstance(node.base, ex.Name))


def _juxtapose(a, b) -> str:
    """What stands between two factors: nothing (2k, hk, (k - 1)(k - 5)), a thin space (2 s(h, k)), or a dot."""
    if isinstance(b, (ex.Num, ex.Neg)) or (isinstance(b, ex.Power) and isinstance(b.base, ex.Num)):
        return r" \cdot "
    if isinstance(b, ex.Sum) or (_letters(b) and isinstance(a, (ex.Num, ex.Name, ex.Power, ex.Sum))):
        return ""
    if isinstance(b, ex.Call) and isinstance(a, (ex.Num, ex.Name, ex.Power, ex.Sum, ex.Call)):
        return r"\,"
    return r" \cdot "


def _point(node) -> str:
    if isinstance(node, ex.ListExpr):
        return "(" + _args(node.items) + ")"
    return expression_latex(node)


def _hull(node) -> str:
    if isinstance(node, ex.ListExpr):
        return r"\operatorname{conv}\{" + ", ".join(_point(p) for p in node.items) + r"\}"
    return expression_latex(node)


def _halfspaces(node) -> str:
    """[[a1, ..., ad, b], ...] as {x : a.x <= b, ...}."""
    if not (isinstance(node, ex.ListExpr) and node.items and all(isinstance(r, ex.ListExpr) for r in node.items)):
        return expression_latex(node)
    dim = len(node.items[0].items) - 1
    rows = []
    for row in node.items:
        *coefficients, bound = row.items
        terms = []
        for i, c in enumerate(coefficients, 1):
            if isinstance(c, ex.Num) and c.value == 0:
                continue
            var = f"x_{{{i}}}"
            if isinstance(c, ex.Num) and c.value == 1:
                terms.append(("+", var))
            elif isinstance(c, ex.Neg) and isinstance(c.operand, ex.Num) and c.operand.value == 1:
                terms.append(("-", var))
            elif isinstance(c, ex.Neg):
                terms.append(("-", _paren(c.operand) + var))
            else:
                terms.append(("+", _paren(c) + var))
        lhs = "".join((t if k == 0 and sg == "+" else (("-" + t) if k == 0 else f" {sg} {t}"))
                      for k, (sg, t) in enumerate(terms)) or "0"
        rows.append(f"{lhs} \\le {expression_latex(bound)}")
    return r"\{x \in \mathbb{R}^{" + str(dim) + "} : " + ",\\ ".join(rows) + r"\}"


def expression_latex(node) -> str:
    """LaTeX for an expression tree.

    >>> from checker.language.parsing import parse_expression
    >>> expression_latex(parse_expression("dedekind(5, 17) - 1/17"))
    's(5, 17) - \\\\frac{1}{17}'
    """
    if isinstance(node, ex.Num):
        return _number(node.value)
    if isinstance(node, ex.Name):
        return _name(node.name)
    if isinstance(node, ex.Neg):
        inner = node.operand
        return "-" + (_paren(inner) if isinstance(inner, ex.Sum) else expression_latex(inner))
    if isinstance(node, ex.Sum):
        out = []
        for i, (sign, term) in enumerate(node.terms):
            t = expression_latex(term)
            # a sum inside a sum came from parentheses: 1 - (2 + 3) is not 1 - 2 + 3
            if i == 0:
                out.append(t if sign > 0 else "-" + (_paren(term) if isinstance(term, (ex.Neg, ex.Sum)) else t))
            else:
                out.append((" + " if sign > 0 else " - ") + (_paren(term) if isinstance(term, (ex.Neg, ex.Sum)) else t))
        return "".join(out)
    if isinstance(node, ex.Product):
        num = [f for d, f in node.factors if not d]
        den = [f for d, f in node.factors if d]
        sign = ""
        if num and isinstance(num[0], ex.Neg):          # -1/4, not (-1)/4
            sign, num = "-", [num[0].operand] + num[1:]

        def join(fs, in_fraction):
            if in_fraction and len(fs) == 1:
                return expression_latex(fs[0])
            if not fs:
                return "1"
            out = [_paren(fs[0]) if isinstance(fs[0], (ex.Sum, ex.Neg)) else expression_latex(fs[0])]
            for a, b in zip(fs, fs[1:]):
                out.append(_juxtapose(a, b))
                out.append(_paren(b) if isinstance(b, (ex.Sum, ex.Neg)) else expression_latex(b))
            return "".join(out)
        if den:
            top, bottom = join(num, True), join(den, True)
            if _FLOW[0] and len(top) + len(bottom) > 24:       # a fraction bar cannot break
                wrap = (lambda fs, t: t if len(fs) == 1 and _atomic(fs[0]) else "(" + t + ")")
                return sign + wrap(num, top) + "/" + wrap(den, bottom)
            return sign + r"\frac{" + top + "}{" + bottom + "}"
        return sign + join(num, False)
    if isinstance(node, ex.Power):
        return _paren(node.base) + "^{" + expression_latex(node.exponent) + "}"
    if isinstance(node, ex.Call):
        return _call(node)
    if isinstance(node, ex.ListExpr):
        return _left("[") + _args(node.items) + _right("]")
    if isinstance(node, ex.FiniteSum):
        return (r"\sum_{" + _name(node.var) + "=" + expression_latex(node.lower) + "}^{"
                + expression_latex(node.upper) + "} " + _paren(node.body))
    return r"\text{?}"


_REL = {"=": "=", "<": "<", "<=": r"\le", ">": ">", ">=": r"\ge", "!=": r"\ne"}
_FAIL = r"\qquad\fbox{\text{does not hold}}"
_WIDE = 64          # characters of math beyond which a line is set as breakable text


_INNER_FRAC = re.compile(r"\\frac\{([^{}]*)\}\{([^{}]*)\}")


def _width(latex: str) -> int:
    """Roughly how many characters wide some LaTeX math is (a fraction as wide as its wider part)."""
    plain = re.sub(r"\\(left|right|allowbreak)\b|\\[,!]", "", latex)
    while True:
        shorter = _INNER_FRAC.sub(lambda m: "x" * max(_width(m.group(1)), _width(m.group(2))), plain)
        if shorter == plain:
            break
        plain = shorter
    return len(re.sub(r"\\[a-zA-Z]+|[{}]", "", plain))


def _math(node, flow: bool = False) -> str:
    _FLOW[0] = flow
    try:
        return expression_latex(node)
    finally:
        _FLOW[0] = False


def _rule_latex(r) -> str:
    if r.name == "claim":
        return f"claim {r.label}"
    if r.name == "lemma":
        return f"lemma {r.label}(" + ", ".join(_plain(a) for a in r.args) + ")"
    return r.name.replace("_", " ")


def _plain(node) -> str:
    return "$" + expression_latex(node) + "$"


def _why(failures) -> list:
    """The report of failing statements, for the reader: message, exact values, counterexample."""
    out = []
    for f in failures:
        lines = [f.message] + [d for d in f.details if d.strip()]
        exact = ""
        if f.exact is not None and f.claimed is not None:
            exact = (r"\par\noindent Exact value $" + _fraction(f.exact) + r"$, claimed $" + _fraction(f.claimed)
                     + "$.")
        out.append(r"\par\begingroup\raggedright" + exact + r"\par\noindent{\small\emph{Not verified:} "
                   + r"\\ ".join(_breakable(_text(ln)) for ln in lines) + r"}\par\endgroup")
    return out


def _fraction(value) -> str:
    """An exact rational in LaTeX, with break points in long numerators and denominators."""
    sign = "-" if value < 0 else ""
    p, q = abs(value.numerator), value.denominator
    if q == 1:
        return sign + _number(p)
    if p.bit_length() + q.bit_length() > 200 or len(int_text(p)) + len(int_text(q)) > 40:
        return sign + _number(p) + "/" + _number(q)
    return sign + r"\frac{" + _number(p) + "}{" + _number(q) + "}"


def _chain_latex(s: st.Chain, failures_at) -> list:
    steps = [(expression_latex(step.expr), step) for step in s.steps]
    start = expression_latex(s.start)
    failing = [f for step in s.steps for f in failures_at(step)]
    widest = max(_width(t) + _width(", ".join(_rule_latex(r) for r in step.rules).replace("$", ""))
                 for t, step in steps)
    if _width(start) + widest <= _WIDE - 4:
        lines = [r"\begin{align*}"]
        for i, (tex, step) in enumerate(steps):
            head = start if i == 0 else ""
            rules = ", ".join(_rule_latex(r) for r in step.rules)
            mark = _FAIL if failures_at(step) else ""
            end = r" \\" if i < len(steps) - 1 else ""
            lines.append(f"{head} &= {tex} && \\text{{({_rules_text(rules)})}}{mark}{end}")
        lines.append(r"\end{align*}")
        return lines + _why(failing)
    # long lines: text that may break at operators and inside long numbers, one paragraph a step
    # ragged right: math has no stretch, so a justified line with a long number finds no break
    lines = [r"\par\medskip\begingroup\raggedright\noindent $\displaystyle " + _math(s.start, True) + "$"]
    for step in s.steps:
        rules = ", ".join(_rule_latex(r) for r in step.rules)
        mark = r"\quad\fbox{does not hold}" if failures_at(step) else ""
        lines.append(r"\par\noindent\hangindent=2em\hangafter=0 $\displaystyle = " + _math(step.expr, True) + r"$\hfill\mbox{"
                     + r"\small(" + _rules_text(rules) + ")}" + mark)
    lines.append(r"\par\endgroup\medskip")
    return lines + _why(failing)


def _rules_text(rules: str) -> str:
    # lemma arguments are already math; the rest is text
    parts = rules.split("$")
    return "".join(_text(p) if i % 2 == 0 else f"${p}$" for i, p in enumerate(parts))


def _condition_latex(c: st.Condition) -> str:
    if c.relation == "==":
        return (expression_latex(c.lhs) + r" \equiv " + expression_latex(c.rhs) + r" \pmod{"
                + expression_latex(c.modulus) + "}")
    return expression_latex(c.lhs) + f" {_REL[c.relation]} " + expression_latex(c.rhs)


def _lemma_chains(s: st.Lemma):
    yield from s.chains
    if s.split:
        for case in s.split.cases:
            yield from case.chains


def _lemma_latex(s: st.Lemma, failures_at, own_failures) -> list:
    """A verified lemma as Lemma, Proof, square; a failed one as a claimed lemma with an attempted proof."""
    params = ", ".join(_name(p) for p in s.params)
    conds = ", ".join("$" + _condition_latex(c) + "$" for c in s.conditions)
    failed = bool(own_failures) or any(failures_at(step) for c in _lemma_chains(s) for step in c.steps)
    head = (r"\paragraph{Claimed lemma (" + _text(s.name) + r"), not verified.}" if failed else
            r"\paragraph{Lemma (" + _text(s.name) + r").}")
    out = [head + r" For all integers $" + params + "$" + (" with " + conds if conds else "") + ":",
           _display(s.lhs, "=", s.rhs, _FAIL if own_failures else ""),
           r"\noindent\emph{Attempted proof.}" if failed else r"\noindent\emph{Proof.}"]
    for chain in s.chains:
        out.extend(_chain_latex(chain, failures_at))
    if s.split:
        for case in s.split.cases:
            out.append(r"\noindent Where $" + _name(s.split.var) + r" \equiv " + expression_latex(case.residue)
                       + r" \pmod{" + expression_latex(s.split.modulus) + "}$:")
            for chain in case.chains:
                out.extend(_chain_latex(chain, failures_at))
    out.extend(_why(own_failures))
    if not failed:
        out.append(r"\hfill$\square$")
    return out


def _display(lhs, relation: str, rhs, mark: str = "", tail: str = "") -> str:
    """A displayed relation, or breakable text when it is too wide for a display."""
    left, right = expression_latex(lhs), expression_latex(rhs)
    if _width(left) + _width(right) + _width(tail) <= _WIDE:
        return r"\[ " + left + f" {relation} " + right + tail + mark + r" \]"
    return (r"\par\medskip\begingroup\raggedright\noindent\hangindent=2em\hangafter=1 $\displaystyle " + _math(lhs, True)
            + f" {relation} " + _math(rhs, True) + tail + "$" + mark.replace(r"\qquad", r"\quad").replace(r"\text", "")
            + r"\par\endgroup\medskip")


def certificate_latex(text: str, name: str = "<text>", fragment: bool = False) -> str:
    """A LaTeX document for a certificate, with failing statements marked and explained.

    A failing claim, step or identity is marked "does not hold" and followed by
    quasicert's report (the exact value, or the first counterexample); a lemma
    that fails is set as a claimed lemma with an attempted proof, never as
    "Lemma ... Proof ... square".  Long numbers may break across lines and wide
    statements are set as text that may break.  With `fragment`, only the body:
    no preamble and no document environment, to paste into a document that loads
    amsmath and amssymb.
    """
    cert = parse_certificate(text, name)
    report = check_certificate(cert, keep_going=True)
    located = [f for f in report.failures if f.line]

    def failures_at(node) -> list:
        return [f for f in located if node.pos.line <= f.line <= node.pos.end_line]

    def own(s: st.Lemma) -> list:
        inner = {id(f) for c in _lemma_chains(s) for step in c.steps for f in failures_at(step)}
        return [f for f in failures_at(s) if id(f) not in inner]

    out = [] if fragment else [r"\documentclass{article}", r"\usepackage{amsmath,amssymb}", r"\begin{document}"]
    title = report.title or name.replace("\\", "/").rsplit("/", 1)[-1]
    out.append(r"\section*{" + _breakable(_text(title)) + "}")
    verdict = "verified" if report.ok else f"{len(report.failures)} statement(s) do not hold"
    out.append(r"\noindent Checked by quasicert: " + _text(verdict) + r", " + str(report.checked)
               + r" claims and steps verified.")
    for s in cert.statements:
        if isinstance(s, st.Source):
            out.append(r"\paragraph{Source.} " + _breakable(_text(s.text)))
        elif isinstance(s, st.Let):
            out.append(r"\[ " + _name(s.name) + " = " + _set(s.expr) + r" \]")
        elif isinstance(s, st.Claim):
            out.append(_display(s.lhs, _REL[s.relation], s.rhs, _FAIL if failures_at(s) else ""))
            out.extend(_why(failures_at(s)))
        elif isinstance(s, st.Congruence):
            mark = _FAIL if failures_at(s) else ""
            out.append(r"\[ " + expression_latex(s.lhs) + r" \equiv " + expression_latex(s.rhs)
                       + r" \pmod{" + expression_latex(s.modulus) + "}" + mark + r" \]")
            out.extend(_why(failures_at(s)))
        elif isinstance(s, st.Chain):
            out.extend(_chain_latex(s, failures_at))
        elif isinstance(s, st.Lemma):
            out.extend(_lemma_latex(s, failures_at, own(s)))
        elif isinstance(s, st.Use):
            out.append(r"\paragraph{Uses} the lemmas of \texttt{" + _text(s.target) + "}.")
            out.extend(_why(failures_at(s)))
        elif isinstance(s, st.Identity):
            rng = (r"\text{for all integers } " + _name(s.var) if s.lower is None else
                   r"\text{for all integers } " + _name(s.var) + r" \ge " + expression_latex(s.lower))
            out.append(_display(s.lhs, "=", s.rhs, _FAIL if failures_at(s) else "", r" \qquad " + rng))
            out.extend(_why(failures_at(s)))
        elif isinstance(s, st.Witness):
            mark = _FAIL if failures_at(s) else ""
            reps = r", \quad ".join(expression_latex(r.number) + " = " + expression_latex(r.combination)
                                     for r in s.representations)
            out.append(r"\[ " + expression_latex(s.lhs) + " = " + expression_latex(s.rhs) + mark + r" \]")
            out.append(r"since $p(" + expression_latex(s.rhs) + r") = 0$ and \[ " + reps + r" \]")
            out.extend(_why(failures_at(s)))
    unplaced = [f for f in report.failures if not f.line]
    out.extend(_why(unplaced))
    if not fragment:
        out.append(r"\end{document}")
    return "\n".join(out) + "\n"
