"""A checked certificate as LaTeX: the calculation in the form it is published.

Each chain becomes an align* environment with the rule of each step as a
note on the right, claims and identities become displayed equations, and a
statement that failed the check is marked.  The output needs only amsmath
and amssymb.
"""
from __future__ import annotations

from ..language import expressions as ex
from ..language import statements as st
from ..replay.checking import check_certificate
from ..language.parsing import parse_certificate

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


def _atomic(node) -> bool:
    return isinstance(node, (ex.Num, ex.Name, ex.Call, ex.ListExpr))


def _paren(node) -> str:
    s = expression_latex(node)
    return s if _atomic(node) else r"\left(" + s + r"\right)"


def _args(args) -> str:
    return ", ".join(expression_latex(a) for a in args)


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
        return r"\left\lfloor " + expression_latex(a[0]) + r" \right\rfloor"
    if name == "ceil" and n == 1:
        return r"\left\lceil " + expression_latex(a[0]) + r" \right\rceil"
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
    return r"\operatorname{" + name.replace("_", r"\_") + "}(" + _args(a) + ")"


def expression_latex(node) -> str:
    """LaTeX for an expression tree.

    >>> from checker.language.parsing import parse_expression
    >>> expression_latex(parse_expression("dedekind(5, 17) - 1/17"))
    's(5, 17) - \\\\frac{1}{17}'
    """
    if isinstance(node, ex.Num):
        return str(node.value) if node.value.bit_length() < 2000 else r"\langle\text{a long number}\rangle"
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
                out.append(t if sign > 0 else "-" + (_paren(term) if isinstance(term, ex.Sum) else t))
            else:
                out.append((" + " if sign > 0 else " - ")
                           + (_paren(term) if isinstance(term, (ex.Neg, ex.Sum)) else t))
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
            parts = [(_paren(f) if isinstance(f, (ex.Sum, ex.Neg)) else expression_latex(f)) for f in fs]
            return r" \cdot ".join(parts) if parts else "1"
        if den:
            return sign + r"\frac{" + join(num, True) + "}{" + join(den, True) + "}"
        return sign + join(num, False)
    if isinstance(node, ex.Power):
        return _paren(node.base) + "^{" + expression_latex(node.exponent) + "}"
    if isinstance(node, ex.Call):
        return _call(node)
    if isinstance(node, ex.ListExpr):
        return r"\left[" + _args(node.items) + r"\right]"
    if isinstance(node, ex.FiniteSum):
        return (r"\sum_{" + _name(node.var) + "=" + expression_latex(node.lower) + "}^{"
                + expression_latex(node.upper) + "} " + _paren(node.body))
    return r"\text{?}"


_REL = {"=": "=", "<": "<", "<=": r"\le", ">": ">", ">=": r"\ge", "!=": r"\ne"}
_FAIL = r"\qquad\fbox{\text{does not hold}}"


def _rule_latex(r) -> str:
    if r.name == "claim":
        return f"claim {r.label}"
    if r.name == "lemma":
        return f"lemma {r.label}(" + ", ".join(_plain(a) for a in r.args) + ")"
    return r.name.replace("_", " ")


def _plain(node) -> str:
    return "$" + expression_latex(node) + "$"


def _chain_latex(s: st.Chain, failed_lines) -> list:
    lines = [r"\begin{align*}"]
    for i, step in enumerate(s.steps):
        head = expression_latex(s.start) if i == 0 else ""
        rules = ", ".join(_rule_latex(r) for r in step.rules)
        mark = _FAIL if any(step.pos.line <= ln <= step.pos.end_line for ln in failed_lines) else ""
        end = r" \\" if i < len(s.steps) - 1 else ""
        lines.append(f"{head} &= {expression_latex(step.expr)} && \\text{{({_rules_text(rules)})}}{mark}{end}")
    lines.append(r"\end{align*}")
    return lines


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


def _lemma_latex(s: st.Lemma, failed_lines, statement_fails: bool) -> list:
    params = ", ".join(_name(p) for p in s.params)
    conds = ", ".join("$" + _condition_latex(c) + "$" for c in s.conditions)
    out = [r"\paragraph{Lemma (" + _text(s.name) + r").} For all integers $" + params + "$"
           + (" with " + conds if conds else "") + ":",
           r"\[ " + expression_latex(s.lhs) + " = " + expression_latex(s.rhs)
           + (_FAIL if statement_fails else "") + r" \]",
           r"\noindent\emph{Proof.}"]
    for chain in s.chains:
        out.extend(_chain_latex(chain, failed_lines))
    if s.split:
        for case in s.split.cases:
            out.append(r"\noindent Where $" + _name(s.split.var) + r" \equiv " + expression_latex(case.residue)
                       + r" \pmod{" + expression_latex(s.split.modulus) + "}$:")
            for chain in case.chains:
                out.extend(_chain_latex(chain, failed_lines))
    out.append(r"\hfill$\square$")
    return out


def certificate_latex(text: str, name: str = "<text>") -> str:
    """A standalone LaTeX document for a certificate, with failing statements marked."""
    cert = parse_certificate(text, name)
    report = check_certificate(cert, keep_going=True)
    failed_lines = {f.line for f in report.failures if f.line}

    def fails(node) -> bool:
        return any(node.pos.line <= ln <= node.pos.end_line for ln in failed_lines)

    out = [r"\documentclass{article}", r"\usepackage{amsmath,amssymb}", r"\begin{document}"]
    title = report.title or name
    out.append(r"\section*{" + _text(title) + "}")
    verdict = "verified" if report.ok else f"{len(report.failures)} statement(s) do not hold"
    out.append(r"\noindent Checked by quasicert: " + _text(verdict) + r", " + str(report.checked)
               + r" claims and steps verified.")
    for s in cert.statements:
        if isinstance(s, st.Source):
            out.append(r"\paragraph{Source.} " + _text(s.text))
        elif isinstance(s, st.Let):
            out.append(r"\[ " + _name(s.name) + " = " + _set(s.expr) + r" \]")
        elif isinstance(s, st.Claim):
            mark = _FAIL if fails(s) else ""
            out.append(r"\[ " + expression_latex(s.lhs) + f" {_REL[s.relation]} " + expression_latex(s.rhs)
                       + mark + r" \]")
        elif isinstance(s, st.Congruence):
            mark = _FAIL if fails(s) else ""
            out.append(r"\[ " + expression_latex(s.lhs) + r" \equiv " + expression_latex(s.rhs)
                       + r" \pmod{" + expression_latex(s.modulus) + "}" + mark + r" \]")
        elif isinstance(s, st.Chain):
            out.extend(_chain_latex(s, failed_lines))
        elif isinstance(s, st.Lemma):
            out.extend(_lemma_latex(s, failed_lines, fails(s) and not any(
                fails(c) for c in _lemma_chains(s))))
        elif isinstance(s, st.Use):
            out.append(r"\paragraph{Uses} the lemmas of \texttt{" + _text(s.target) + "}.")
        elif isinstance(s, st.Identity):
            mark = _FAIL if fails(s) else ""
            rng = (r"\text{for all integers } " + _name(s.var) if s.lower is None else
                   r"\text{for all integers } " + _name(s.var) + r" \ge " + expression_latex(s.lower))
            out.append(r"\[ " + expression_latex(s.lhs) + " = " + expression_latex(s.rhs)
                       + r" \qquad " + rng + mark + r" \]")
        elif isinstance(s, st.Witness):
            mark = _FAIL if fails(s) else ""
            reps = r", \quad ".join(expression_latex(r.number) + " = " + expression_latex(r.combination)
                                     for r in s.representations)
            out.append(r"\[ " + expression_latex(s.lhs) + " = " + expression_latex(s.rhs) + mark + r" \]")
            out.append(r"since $p(" + expression_latex(s.rhs) + r") = 0$ and \[ " + reps + r" \]")
    out.append(r"\end{document}")
    return "\n".join(out) + "\n"
