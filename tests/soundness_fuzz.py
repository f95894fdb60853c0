"""A soundness fuzzer: random questions to the trusted kernel, each answer checked by brute force.

Four kinds of query, each with an oracle outside the code under test:

- assumptions: a random set of facts about integer parameters k, h (bounds, congruences,
  coprimality) and a random polynomial question (residues, integral, at_least, nonzero,
  coprime, divides, floor_of).  Whenever `Assumptions` answers "proved", the claim is checked
  at every integer point of a box that satisfies the facts (evaluated directly with Python
  ints); one point where it fails is a finding.
- chains: a random line of calls, numbers, + - * / ^ and a second line made from it by an
  identity that holds only where both are defined (x/x, x^0, 0*x, x - x, ...) or by a random
  change; when `check_text` verifies `chain A = B by arithmetic`, both lines are evaluated as
  trees by the evaluator (which refuses 0 in a denominator) and must be equal.
- identities: random quasi-polynomials in n (powers, floor, mod, sawtooth, periodic); when an
  identity is verified, the sides are compared at 150 further values of n.
- lemmas: random `gcd(P, Q) = 1` and `mod(P, m) = r` statements about k under random facts, proved by
  `arithmetic`; when one is verified, it is checked by brute force over k.

`run(queries, seed)` returns the findings (each a string naming the query); the suite runs a
small fixed budget (tests/kernel/test_soundness_fuzz.py), and

    python3 -m tests.soundness_fuzz 100000 [SEED]

runs a large one and prints queries, time and findings.
"""
from __future__ import annotations

import random
import sys
import time
from fractions import Fraction
from itertools import product
from math import gcd

from checker import check_text
from checker.foundation.errors import CertificateError
from checker.kernel.assumptions import Assumptions
from checker.kernel.evaluation import Evaluator
from checker.kernel.rational_functions import RationalFunction, as_polynomial, poly_eval
from checker.kernel.symbolic import floor_of
from checker.language.parsing import parse_expression

K = RationalFunction.variable("k")
H = RationalFunction.variable("h")
BOX = range(-40, 91)          # k; a content prime p <= 13 divides some k here, several times
H_BOX = range(-20, 21)        # h, when there are two parameters
SMALL_PRIMES = (2, 3, 5, 7, 11, 13)


# -- random polynomials in k (and h), as values and as text ---------------------------------

def _linear(rnd, names):
    """a*x + b (or a*x + c*y + b): a value and its text."""
    x = rnd.choice(names)
    a = rnd.choice([1, 1, -1, 2, 3])
    b = rnd.randint(-4, 4)
    value, text = a * _var(x) + b, f"({a}*{x} + {b})"
    if len(names) > 1 and rnd.random() < 0.3:
        y = [n for n in names if n != x][0]
        c = rnd.choice([1, -1, 2])
        value, text = value + c * _var(y), f"({a}*{x} + {c}*{y} + {b})"
    return value, text


def _var(x):
    return K if x == "k" else H


def random_polynomial(rnd, names):
    """A product of a content and linear factors, some repeated (the shape that once lost
    its content), or a sum of such products."""
    content = rnd.choice([1, 1, 2, 3, 5, 6, 7, 10, 11, 13, 30, -1, -3])
    value, text = Fraction(content), str(content)
    for _ in range(rnd.randint(1, 3)):
        f, t = _linear(rnd, names)
        e = rnd.choice([1, 1, 2, 3])
        value = value * f ** e
        text += f"*{t}^{e}"
    if rnd.random() < 0.25:
        v2, t2 = _linear(rnd, names)
        value, text = value + v2, f"{text} + {t2}"
    return value, text


_COMPILED: dict = {}


def _at(value, point) -> Fraction:
    """value at an integer point, by plain integer arithmetic (numerator and denominator)."""
    if not isinstance(value, RationalFunction):
        return Fraction(value)
    f = _COMPILED.get(value)
    if f is None:
        if len(_COMPILED) > 20_000:
            _COMPILED.clear()
        f = _COMPILED[value] = (_integer_function(value.num), _integer_function(value.den))
    num, den = f[0](point), f[1](point)
    if den[0] == 0:
        raise ZeroDivisionError
    return Fraction(num[0] * den[1], num[1] * den[0])


def _integer_function(poly: dict):
    """point -> (N, L) with poly(point) = N/L, L the common denominator of the coefficients."""
    L = 1
    for c in poly.values():
        L = L * c.denominator // gcd(L, c.denominator)
    terms = [(int(c * L), mono) for mono, c in poly.items()]

    def at(point):
        total = 0
        for c, mono in terms:
            for x, e in mono:
                c *= point[x] ** e
            total += c
        return total, L
    return at


# -- assumptions -------------------------------------------------------------------------------

def random_facts(rnd, names):
    """(Assumptions, predicate on points): a few facts, the same ones as a Python test."""
    facts = Assumptions(tuple(names))
    tests = []
    for _ in range(rnd.randint(0, 3)):
        kind = rnd.choice(["bound", "bound", "congruence", "coprime", "relation"])
        x = rnd.choice(names)
        if kind == "bound":
            c = rnd.randint(-5, 8)
            if rnd.random() < 0.7:
                facts.assume(">=", _var(x), Fraction(c))
                tests.append(lambda p, x=x, c=c: p[x] >= c)
            else:
                c += 20
                facts.assume("<=", _var(x), Fraction(c))
                tests.append(lambda p, x=x, c=c: p[x] <= c)
        elif kind == "congruence":
            m = rnd.choice([2, 3, 4, 5, 6, 8, 9, 12])
            r = rnd.randrange(m)
            facts.assume("==", _var(x), Fraction(r), Fraction(m))
            tests.append(lambda p, x=x, r=r, m=m: (p[x] - r) % m == 0)
        elif kind == "coprime":
            a, ta = _linear(rnd, names) if rnd.random() < 0.5 else (Fraction(rnd.choice(SMALL_PRIMES)), "")
            facts.assume("gcd", a, _var(x))
            tests.append(lambda p, a=a, x=x: gcd(int(_at(a, p)), p[x]) == 1)
        elif len(names) > 1:
            facts.assume("<", _var("h"), _var("k"))
            tests.append(lambda p: p["h"] < p["k"])
    return facts, (lambda p: all(t(p) for t in tests))


def _points(names, allowed):
    boxes = [BOX if x == "k" else H_BOX for x in names]
    for values in product(*boxes):
        p = dict(zip(names, values))
        if allowed(p):
            yield p


def assumption_query(rnd) -> tuple[str, str | None]:
    """(description, finding or None)."""
    names = ["k"] if rnd.random() < 0.6 else ["k", "h"]
    facts, allowed = random_facts(rnd, names)
    P, tp = random_polynomial(rnd, names)
    kind = rnd.choice(["residues", "integral", "at_least", "nonzero", "coprime", "coprime", "divides",
                       "floor"])
    pts = list(_points(names, allowed))
    what = f"{kind} of {tp} under {facts.classes, facts.nonnegative, facts.coprime_pairs}"
    try:
        if kind == "residues":
            m = rnd.choice([2, 3, 4, 5, 7, 8, 9, 12])
            poly = as_polynomial(P)
            rs = facts.residues(poly, m) if poly is not None else None
            if rs is None:
                return what, None
            bad = next((p for p in pts if int(_at(P, p)) % m not in rs), None)
        elif kind == "integral":
            L = rnd.choice([2, 3, 4, 6])
            v = P / L
            if facts.integral(v) is not None:
                return what, None
            bad = next((p for p in pts if _at(v, p).denominator != 1), None)
        elif kind == "at_least":
            c = rnd.randint(-3, 5)
            if facts.at_least(P, c) is not None:
                return what, None
            bad = next((p for p in pts if _at(P, p) < c), None)
        elif kind == "nonzero":
            if facts.nonzero(P) is not None:
                return what, None
            bad = next((p for p in pts if _at(P, p) == 0), None)
        elif kind == "coprime":
            r = rnd.random()
            x = rnd.choice(names)
            Q, tq = ((_var(x), x) if r < 0.3 else _linear(rnd, names) if r < 0.7 else
                     random_polynomial(rnd, names))
            what += f" and {tq}"
            if facts.coprime(P, Q) is not None:
                return what, None
            bad = next((p for p in pts if gcd(int(_at(P, p)), int(_at(Q, p))) != 1), None)
        elif kind == "divides":
            M = rnd.choice([Fraction(rnd.choice([2, 3, 4, 6, 7])), _linear(rnd, names)[0]])
            if facts.divides(M, P) is not None:
                return what, None
            bad = next((p for p in pts if (_at(M, p) == 0 and _at(P, p) != 0) or
                        (_at(M, p) != 0 and (_at(P, p) / _at(M, p)).denominator != 1)), None)
        else:
            m = rnd.choice([2, 3, 4, 6])
            v = P / m
            f = floor_of(facts, v)
            if f is None:
                return what, None
            bad = next((p for p in pts if _at(f, p) != _at(v, p).numerator // _at(v, p).denominator), None)
    except (CertificateError, ZeroDivisionError):
        return what, None
    PROVED[0] += 1
    return what, (None if bad is None else f"{what}: proved, but false at {bad}")


# -- chains ---------------------------------------------------------------------------------

CALLS = ["dedekind(1, 2)", "dedekind(1, 3)", "dedekind(5, 17)", "dedekind(2, 4)", "sawtooth(1/2)",
         "sawtooth(1/3)", "bernoulli(3)", "bernoulli(2)", "dedekind(3, 0)", "dedekind(1/2, 3)",
         "partitions(-1, [1])", "frobenius([2, 3])"]
NUMBERS = ["0", "1", "2", "-1", "1/2", "3"]


def random_expression(rnd, depth=0) -> str:
    if depth > 2 or rnd.random() < 0.3:
        return rnd.choice(CALLS + NUMBERS)
    a, b = random_expression(rnd, depth + 1), random_expression(rnd, depth + 1)
    op = rnd.choice(["+", "-", "*", "/", "^"])
    if op == "^":
        return f"({a})^({rnd.choice([-2, -1, 0, 0, 1, 2, 3])})"
    return f"({a}) {op} ({b})"


def twin(rnd, a: str) -> str:
    """A second line: equal to `a` wherever both are defined, or a random change."""
    x = rnd.choice(CALLS + NUMBERS)
    forms = [f"({a}) * ({x}) / ({x})", f"({a}) + ({x}) - ({x})", f"({a}) * ({x})^0",
             f"({a}) + 0*({x})", f"({a}) * ({x})^(-1) * ({x})", f"({a})^1", f"({x})^0 * ({a})",
             f"({a}) + ({x})^0 - 1", random_expression(rnd), f"({a}) + 1/2"]
    return rnd.choice(forms)


def _tree_value(text: str):
    """The value of the text as a tree (undefined: None); the oracle for chain lines."""
    try:
        return Evaluator().number(parse_expression(text))
    except CertificateError:
        return None


def chain_query(rnd) -> tuple[str, str | None]:
    a = random_expression(rnd)
    b = twin(rnd, a)
    rules = rnd.choice(["arithmetic", "arithmetic", "value"])
    text = f"chain {a}\n  = {b} by {rules}\n"
    report = check_text(text)
    if not report.ok:
        return text, None
    PROVED[0] += 1
    va, vb = _tree_value(a), _tree_value(b)
    if va is None or vb is None or va != vb:
        return text, f"verified, but the lines are {va} and {vb}: {text!r}"
    return text, None


def claim_query(rnd) -> tuple[str, str | None]:
    a = random_expression(rnd)
    b = twin(rnd, a)
    text = f"claim {a} = {b}\n"
    if not check_text(text).ok:
        return text, None
    PROVED[0] += 1
    va, vb = _tree_value(a), _tree_value(b)
    if va is None or vb is None or va != vb:
        return text, f"verified, but the sides are {va} and {vb}: {text!r}"
    return text, None


# -- identities --------------------------------------------------------------------------------

def random_quasi(rnd, depth=0) -> str:
    choices = [lambda: "n", lambda: str(rnd.randint(-3, 3)), lambda: f"n^{rnd.randint(0, 3)}",
               lambda: f"floor(n/{rnd.randint(1, 4)})", lambda: f"mod(n, {rnd.randint(1, 4)})",
               lambda: f"sawtooth(n/{rnd.randint(1, 4)})", lambda: f"(n - {rnd.randint(0, 3)})^0",
               lambda: f"periodic(n, [{', '.join(str(rnd.randint(-2, 2)) for _ in range(rnd.randint(1, 3)))}])"]
    if depth > 1 or rnd.random() < 0.4:
        return rnd.choice(choices)()
    a, b = random_quasi(rnd, depth + 1), random_quasi(rnd, depth + 1)
    return f"({a}) {rnd.choice(['+', '-', '*'])} ({b})"


def _at_n(tree, n: int):
    ev = Evaluator({"n": Fraction(n)})
    try:
        return ev.number(tree)
    except CertificateError:
        return None


def identity_query(rnd) -> tuple[str, str | None]:
    a = random_quasi(rnd)
    b = rnd.choice([random_quasi(rnd), f"({a}) + 0", f"({a}) * n^0", f"{a}"])
    lower = rnd.choice([None, 0, 1, -3])
    head = "for all n" if lower is None else f"for n >= {lower}"
    text = f"identity {head}: {a} = {b}\n"
    if not check_text(text).ok:
        return text, None
    PROVED[0] += 1
    start = -60 if lower is None else lower
    ta, tb = parse_expression(a), parse_expression(b)
    for n in range(start, start + 150):
        va, vb = _at_n(ta, n), _at_n(tb, n)
        if va is None or va != vb:
            return text, f"verified, but at n = {n} the sides are {va} and {vb}: {text!r}"
    return text, None


# -- lemmas ----------------------------------------------------------------------------------

def lemma_query(rnd) -> tuple[str, str | None]:
    facts_text, tests = [], []
    for _ in range(rnd.randint(1, 2)):
        kind = rnd.choice(["bound", "congruence"])
        if kind == "bound":
            c = rnd.randint(0, 4)
            facts_text.append(f"k >= {c}")
            tests.append(lambda k, c=c: k >= c)
        else:
            m = rnd.choice([2, 3, 4, 6])
            r = rnd.randrange(m)
            facts_text.append(f"k == {r} mod {m}")
            tests.append(lambda k, r=r, m=m: (k - r) % m == 0)
    P, tp = random_polynomial(rnd, ["k"])
    if rnd.random() < 0.5:
        Q, tq = _linear(rnd, ["k"])
        stmt, check = f"gcd({tp}, {tq}) = 1", lambda k: gcd(int(P.at({"k": k}) if isinstance(P, RationalFunction) else P),
                                                              int(Q.at({"k": k}) if isinstance(Q, RationalFunction) else Q)) == 1
        lhs = f"gcd({tp}, {tq})"
    else:
        m = rnd.choice([2, 3, 4, 5])
        r = rnd.randrange(m)
        lhs = f"mod({tp}, {m})"
        stmt = f"{lhs} = {r}"
        check = (lambda k, m=m, r=r: int(P.at({"k": k}) if isinstance(P, RationalFunction) else P) % m == r)
    rhs = stmt.rsplit("=", 1)[1].strip()
    text = (f"lemma f(k) for {', '.join(facts_text)}:\n  {stmt}\n"
            f"  chain {lhs}\n    = {rhs} by arithmetic\nend\n")
    if not check_text(text, seed=rnd.randrange(2**32)).ok:
        return text, None
    PROVED[0] += 1
    for k in range(-200, 400):
        if all(t(k) for t in tests) and not check(k):
            return text, f"lemma verified, but false at k = {k}: {text!r}"
    return text, None


PROVED = [0]      # queries whose answer was "proved" or "verified" (the ones the oracle checks)

QUERIES = [(assumption_query, 5), (chain_query, 2), (claim_query, 1), (identity_query, 1), (lemma_query, 1)]


def run(queries: int, seed: int = 11) -> tuple[list, dict]:
    """(findings, {kind: count}) after `queries` random queries drawn with `seed`."""
    rnd = random.Random(seed)
    kinds = [q for q, w in QUERIES for _ in range(w)]
    findings, counts = [], {}
    for _ in range(queries):
        q = rnd.choice(kinds)
        before = PROVED[0]
        _what, finding = q(rnd)
        name = q.__name__.replace("_query", "")
        asked, proved = counts.get(name, (0, 0))
        counts[name] = (asked + 1, proved + PROVED[0] - before)
        if finding:
            findings.append(finding)
    return findings, counts


if __name__ == "__main__":
    total = int(sys.argv[1]) if len(sys.argv) > 1 else 10_000
    seed = int(sys.argv[2]) if len(sys.argv) > 2 else 11
    start = time.perf_counter()
    found, counts = run(total, seed)
    print(f"queries: {total} (seed {seed}); asked/proved by kind: {counts}; time: {time.perf_counter() - start:.1f} s; "
          f"findings: {len(found)}")
    for f in found[:50]:
        print(" -", f)
