"""Writing certificates that anyone can re-check with `quasicert check`.

For a Dedekind sum s(h, k) the certificate is the Euclid-like chain:
cancel a common factor, reduce h modulo k, then alternately apply
reciprocity and reduce (cited together on one line) until s(0, 1) = 0.  Each
line is  c + e * dedekind(a, b)  with c an exact rational in lowest terms, so
the lines stay about as long as the numbers themselves.  A long chain puts
several of those steps on one line (the rule `descent`), about a hundred
lines in all: a line per step would make a 1000-digit pair an 8 MB file.
"""
from __future__ import annotations

from fractions import Fraction
from math import gcd

from ..foundation.errors import DomainError
from ..kernel.evaluation import Evaluator
from ..kernel.ratios import long_integer
from ..mathematics.dedekind import reciprocity_descent
from ..language.expressions import Call
from ..foundation.limits import DEFAULT_LIMITS, Limits
from ..foundation.numbers import rough_int, value_text
from ..language.parsing import parse_expression

__all__ = ["derive", "derive_dedekind", "derive_fourier_dedekind"]


def _line(c: Fraction, sign: int, h: int, k: int) -> str:
    call = f"dedekind({value_text(h)}, {value_text(k)})"
    if c == 0:
        return call if sign > 0 else f"-{call}"
    return f"{value_text(c)} {'+' if sign > 0 else '-'} {call}"


#: a chain of more steps than this puts several on a line, so that it has about this many lines
AUTOMATIC_LINES = 100


def steps_per_line(steps: int, lines: int = AUTOMATIC_LINES) -> int:
    """Steps of reciprocity and reduce on each line of a chain of `steps` steps: one while they
    fit in `lines` lines, else as few as keep the chain within them."""
    return max(1, -(-steps // lines))


def derive_dedekind(h: int, k: int, label: str = "derived", per_line: int | None = None) -> str:
    """A certificate whose chain computes s(h, k) by reciprocity and reduction, `per_line` steps of
    them on a line (None: `steps_per_line`)."""
    if k < 1:
        raise DomainError(f"dedekind(h, k) needs k >= 1, not {value_text(k)}")
    out = [f'title "s({value_text(h)}, {value_text(k)}) by reciprocity and reduction"',
           "# written by quasicert derive; check it with: quasicert check FILE",
           f"chain {label}: dedekind({value_text(h)}, {value_text(k)})"]
    out += _euclid_lines(h, k, per_line=per_line)
    return "\n".join(out) + "\n"


def _euclid_lines(h: int, k: int, offset: Fraction = Fraction(0), outer: int = 1,
                  per_line: int | None = None) -> list[str]:
    """The steps from the line  offset + outer * s(h, k)  down to its value, `per_line` steps of
    reciprocity and reduce on a line (None: `steps_per_line`)."""
    def line(c, sign, a, b):
        return _line(offset + outer * c, outer * sign, a, b)

    out = []
    g = gcd(h, k)
    if g > 1:
        h, k = h // g, k // g
        out.append(f"  = {line(Fraction(0), 1, h, k)}    by common_factor")
    if not 0 <= h < k:
        h %= k
        out.append(f"  = {line(Fraction(0), 1, h, k)}    by reduce")
    # the pairs met by reciprocity followed by reduce: (h, k) -> (k mod h, h), kept only at the
    # lines (all of them take about 0.6 b^2 bits for b-bit numbers: 2 GB at 50,000 digits)
    steps = _walk_length(h, k)
    per_line = steps_per_line(steps) if per_line is None else per_line
    if per_line < 1:
        raise DomainError(f"a chain line takes at least one step, not {per_line}")
    at = list(range(per_line, steps, per_line)) + ([steps] if steps else [])
    pairs = _pairs_at(h, k, at)
    # s(h, k) = n / (12 k b) + (-1)^i s(a, b) at the i-th pair (a, b): the constants of the rule
    # descent, summed in integers along the walk (reciprocity_descent)
    constants = {(a, b): n for a, b, n, _ in reciprocity_descent(h, k, set(pairs))} if steps else {}
    for i, (a, b) in zip(at, pairs):
        sign = -1 if i % 2 else 1
        c = Fraction(constants[(a, b)], 12 * k * b)     # s(h, k) - sign * s(a, b)
        taken = i - (i - 1) // per_line * per_line
        rules = "reciprocity, reduce" if taken == 1 else "descent"
        out.append(f"  = {line(c, sign, a, b)}    by {rules}")
    total = constants[(0, 1)] if steps else 0    # 12 k s(h, k): the last pair is (0, 1)
    value = offset + outer * Fraction(total, 12 * k)
    out.append(f"  = {value_text(value)}    by value")
    return out


def _walk_length(h: int, k: int) -> int:
    """The steps (a, b) -> (b mod a, a) from (h, k) down to a = 0."""
    a, b = long_integer(h), long_integer(k)
    steps = 0
    while a:
        a, b = b % a, a
        steps += 1
    return steps


def _pairs_at(h: int, k: int, indices: list) -> list:
    """The pairs that the steps (a, b) -> (b mod a, a) reach from (h, k) after each of the
    increasing step counts `indices`."""
    a, b = long_integer(h), long_integer(k)
    out, step = [], 0
    for i in indices:
        while step < i:
            a, b = b % a, a
            step += 1
        out.append((int(a), int(b)))
    return out


def _fd_text(n, parts, b) -> str:
    return f"fourier_dedekind({value_text(n)}, {_list_text(parts)}, {value_text(b)})"


def _pairwise_coprime(values) -> bool:
    return all(v >= 1 for v in values) and all(gcd(x, y) == 1 for i, x in enumerate(values)
                                                for y in values[i + 1:])


def derive_fourier_dedekind(n: int, parts, b: int, label: str = "derived", per_line: int | None = None) -> str:
    """A certificate for s_n(A; b): reduce modulo b; for two entries and n = 0 (mod b) the bridge to
    a Dedekind sum and its Euclid-like chain (and, for pairwise coprime [a, c, b], the reciprocity
    law with both companions bridged); for pairwise coprime entries and b the reciprocity law,
    which costs O(sum of the entries) however large b is; otherwise the value."""
    from ..mathematics.fourier_dedekind import fourier_dedekind
    from ..mathematics.fourier_dedekind_reciprocity import bridge_constant, poly_at
    if b < 1:
        raise DomainError(f"fourier_dedekind(n, A, b) needs b >= 1, not {value_text(b)}")
    fourier_dedekind(n % b, [a % b for a in parts], 1)     # only the argument checks
    for a in parts:
        if gcd(a, b) != 1:
            raise DomainError(f"fourier_dedekind needs every entry coprime to {value_text(b)}, but "
                              f"gcd({value_text(a)}, {value_text(b)}) = {value_text(gcd(a, b))}")
    out = [f'title "{_fd_text(n, parts, b)} by its laws"',
           "# written by quasicert derive; check it with: quasicert check FILE",
           f"chain {label}: {_fd_text(n, parts, b)}"]
    m, reduced = n % b, [a % b for a in parts]
    if (m, reduced) != (n, list(parts)):
        out.append(f"  = {_fd_text(m, reduced, b)}    by reduce")
    whole = reduced + [b]
    if len(reduced) == 2 and m == 0:
        a, c = reduced
        x = a * pow(c, -1, b) % b if b > 1 else 0
        const = bridge_constant(b)
        out.append(f"  = {_line(const, -1, x, b)}    by bridge")
        out += _euclid_lines(x, b, const, -1, per_line)
        if _pairwise_coprime(whole) and b > 1:
            A = sorted(whole)
            sums = " + ".join(_fd_text(0, sorted(whole[:j] + whole[j + 1:]), x) for j, x in enumerate(whole))
            out += ["", f"# the reciprocity law for the pairwise coprime A = {_list_text(A)}: the three sums add up to",
                    "# 1 minus the polynomial part of p_A at 0 (Zagier 1973; Gessel 1997)",
                    f"claim {label}_law_at_0: {sums} = 1 - partitions_polynomial_part(0, {_list_text(A)})",
                    "# the same value by that law, each companion bridged"]
            out += _law_chain(m, reduced, b, label + "_law", bridge=True)
        return "\n".join(out) + "\n"
    if b > 1 and reduced and _pairwise_coprime(whole):
        out += _law_chain(m, reduced, b, None)
        return "\n".join(out) + "\n"
    out.append(f"  = {value_text(_fd_value(m, reduced, b))}    by value")
    return "\n".join(out) + "\n"


def _fd_value(n: int, parts, b: int) -> Fraction:
    """s_n(parts; b) through the kernel, so that its budget is met before any work."""
    return Evaluator().call("fourier_dedekind", (Fraction(n), tuple(Fraction(a) for a in parts), Fraction(b)))


def _law_chain(m: int, reduced, b: int, label, bridge: bool = False) -> list[str]:
    """Lines applying reciprocity for A = reduced + [b] at n = m, then values (or bridges)."""
    from ..mathematics.fourier_dedekind import fourier_dedekind
    from ..mathematics.fourier_dedekind_reciprocity import bridge_constant, poly_at
    from ..foundation.limits import DEFAULT_LIMITS
    from ..mathematics.fourier_dedekind_reciprocity import polynomial_part_cost
    whole = reduced + [b]
    DEFAULT_LIMITS.require("terms", polynomial_part_cost(len(whole), b.bit_length()),
                           f"the polynomial part of p_A for {len(whole)} parts")
    out = [] if label is None else [f"chain {label}: {_fd_text(m, reduced, b)}"]
    head = "1 - " if m == 0 else "-"
    poly = f"partitions_polynomial_part({value_text(-m)}, {_list_text(sorted(whole))})"
    companions = []
    for j, a in enumerate(whole[:-1]):
        if a > 1:
            rest = sorted(whole[:j] + whole[j + 1:])
            companions.append((a, rest))
    out.append(f"  = {head}{poly}" + "".join(f" - {_fd_text(m, rest, a)}" for a, rest in companions)
               + "    by reciprocity")
    total = (1 if m == 0 else 0) - poly_at(-m, whole)
    if not bridge:
        value = total - sum(_fd_value(m, rest, a) for a, rest in companions)
        out.append(f"  = {value_text(value)}    by value")
        return out
    terms, rules = [], []
    for a, (p, q) in ((a, rest) for a, rest in companions):
        x = p * pow(q, -1, a) % a
        total -= bridge_constant(a)
        terms.append(f" + dedekind({value_text(x)}, {value_text(a)})")
        rules.append("bridge")
    out.append(f"  = {value_text(total)}" + "".join(terms) + f"    by {', '.join(rules + ['value'])}")
    if not terms:                  # every companion was modulo 1: the line is already the value
        return out
    value = total + sum(_dedekind_value(p * pow(q, -1, a) % a, a) for a, (p, q) in companions)
    out.append(f"  = {value_text(value)}    by value")
    return out


def _dedekind_value(h: int, k: int) -> Fraction:
    from ..mathematics.dedekind import dedekind
    return dedekind(h, k)


def _polynomial_text(coeffs, var: str) -> str:
    """sum_j c_j var^j as text, highest power first, zero terms left out."""
    terms = []
    for j in range(len(coeffs) - 1, -1, -1):
        c = coeffs[j]
        if c == 0:
            continue
        mag = value_text(abs(c))
        body = mag if j == 0 else (f"{mag}*{var}" if j == 1 else f"{mag}*{var}^{j}")
        if j > 0 and abs(c) == 1:
            body = var if j == 1 else f"{var}^{j}"
        terms.append(("-" if c < 0 else "+", body))
    if not terms:
        return "0"
    out = ("-" if terms[0][0] == "-" else "") + terms[0][1]
    for sign, body in terms[1:]:
        out += f" {sign} {body}"
    return out


def _list_text(values) -> str:
    return "[" + ", ".join(value_text(v) for v in values) + "]"


def derive_partitions(parts, var: str = "n", label: str = "derived", limits: Limits = DEFAULT_LIMITS) -> str:
    """A certificate stating P_A as polynomial part plus periodic waves, and the identity with p_A."""
    from math import gcd
    from ..mathematics.partitions import PartitionQuasiPolynomial, check_parts, quasipolynomial_cost
    parts = check_parts(list(parts))
    # the waves' cost, as p_A(n) by the waves is charged; a period b is also a list of b entries
    limits.require("terms", quasipolynomial_cost(tuple(parts)) // 20 if parts else 0,
                   f"writing the quasi-polynomial of p_A for parts up to {rough_int(max(parts, default=0))}")
    qp = PartitionQuasiPolynomial.of(tuple(parts))
    terms = [_polynomial_text(qp.polynomial, var)]
    for wave in qp.waves[1:]:
        b, top = wave[0], wave[1]
        rows = [PartitionQuasiPolynomial._wave_polynomial(wave, r) for r in range(b)]
        for j in range(top + 1):
            values = [row[j] for row in rows]
            if any(values):
                power = "" if j == 0 else (f"*{var}" if j == 1 else f"*{var}^{j}")
                terms.append(f"periodic({var}, {_list_text(values)}){power}")
    a_text = _list_text(parts)
    start = -sum(parts) + 1
    out = [f'title "p_A({var}) for A = {a_text} as a quasi-polynomial"',
           "# written by quasicert derive; check it with: quasicert check FILE",
           "# P_A = polynomial part + one wave of period b for each b > 1 dividing a part;",
           f"# it equals p_A({var}) for {var} > -(sum of the parts)",
           f"let A = {a_text}",
           f"identity {label}: for {var} >= {value_text(start)}:",
           f"  partitions({var}, A) = " + "\n    + ".join(terms)]
    if len(set(parts)) == len(parts) and all(gcd(a, c) == 1 for i, a in enumerate(parts) for c in parts[i + 1:]):
        fd = [f"fourier_dedekind(-{var}, {_list_text(parts[:i] + parts[i + 1:])}, {value_text(a)})"
              for i, a in enumerate(parts) if a > 1]
        out += ["# pairwise coprime parts: the waves are Fourier-Dedekind sums",
                f"identity {label}_sums: for {var} >= {value_text(start)}:",
                f"  partitions({var}, A) = {_polynomial_text(qp.polynomial, var)}"
                + "".join(f"\n    + {t}" for t in fd)]
    return "\n".join(out) + "\n"


def _smallest_period(table) -> int:
    """The least p dividing len(table) with table[r] = table[r mod p] for every r."""
    n = len(table)
    for p in range(1, n + 1):
        if n % p == 0 and all(table[r] == table[r % p] for r in range(n)):
            return p
    return n


def derive_ehrhart(call_text: str, poly, table, var: str = "t", label: str = "derived") -> str:
    """The Ehrhart quasi-polynomial of a call as an identity by constituents, its period collapse noted."""
    D = poly.denominator
    period = _smallest_period(table)
    table = table[:period]
    d_text, p_text = value_text(D), value_text(period)
    lines = [f'title "Ehrhart quasi-polynomial of {call_text}"',
             "# written by quasicert derive; check it with: quasicert check FILE"]
    if poly.empty:
        lines.append("# the polytope is empty: no lattice points in any dilate, t = 0 included")
    else:
        lines.append(f"# dimension {poly.dimension}, vertex denominator {d_text}: the period divides {d_text} (Ehrhart)")
        if period < D:
            lines.append(f"# period collapse: the constituents repeat with period {p_text}, not {d_text}")
        lines.append(f"# one constituent polynomial (constant term first) per residue of {var} mod {p_text}")
    text = "[" + ", ".join(_list_text(row) for row in table) + "]"
    lines += [f"identity {label}: for {var} >= 0, period {p_text}, degree {max(len(r) for r in table) - 1}:",
              f"  {call_text} = constituents({var}, {text})"]
    return "\n".join(lines) + "\n"


def derive_frobenius(parts, label: str = "derived") -> str:
    """A witness: p_A(g) = 0 and a representation of each of g + 1, ..., g + min(A)."""
    import heapq
    from ..mathematics.frobenius import frobenius
    from ..mathematics.partitions import check_parts
    parts = sorted(set(check_parts(list(parts), "frobenius")))
    g = frobenius(parts).numerator
    a1 = parts[0]
    # least representable number in each residue class mod a1, with the part added last
    best = [None] * a1
    last = [None] * a1
    best[0] = 0
    heap = [(0, 0)]
    while heap:
        w, r = heapq.heappop(heap)
        if w != best[r]:
            continue
        for a in parts[1:]:
            w2, r2 = w + a, (r + a) % a1
            if best[r2] is None or w2 < best[r2]:
                best[r2], last[r2] = w2, a
                heapq.heappush(heap, (w2, r2))

    def representation(m):
        counts = {a: 0 for a in parts}
        r = m % a1
        rest = m - best[r]
        counts[a1] += rest // a1
        while r:
            a = last[r]
            counts[a] += 1
            r = (r - a) % a1
        terms = [(f"{value_text(c)}*{value_text(a)}" if c != 1 else value_text(a)) for a, c in counts.items() if c]
        return " + ".join(terms) if terms else "0"

    reps = [f"  {value_text(m)} = {representation(m)}" for m in range(g + 1, g + a1 + 1)]
    return "\n".join([
        f'title "Frobenius number of {_list_text(parts)}"',
        "# written by quasicert derive; check it with: quasicert check FILE",
        f"# {value_text(g)} is not representable, and every integer from {value_text(g + 1)} to {value_text(g + a1)} "
        "is, hence every larger one",
        f"witness {label}: frobenius({_list_text(parts)}) = {value_text(g)}:",
        ",\n".join(reps)]) + "\n"


def _refuse_names(expr) -> None:
    """derive of a call with a name in it: numbers are needed, and a lemma is the tool for
    a statement about every value of a parameter."""
    from ..language import expressions as ex
    stack = [expr]
    while stack:
        node = stack.pop()
        if isinstance(node, ex.Name):
            raise DomainError(f"derive needs numbers here, and '{node.name}' is a name: derive "
                              f"{expr.name} at numbers (e.g. quasicert derive \"dedekind(5, 17)\"); a "
                              f"statement for every {node.name} is written as a lemma, as in "
                              "certificates/dedekind-lemmas.qcert").at(node)
        stack.extend(ex.children(node))


def derive(text: str, per_line: int | None = None, limits: Limits = DEFAULT_LIMITS) -> str:
    """A certificate for a call: dedekind(h, k), partitions(n, A), lattice_points(t, P), frobenius(A).
    A Dedekind chain takes `per_line` steps of reciprocity and reduce on a line (None: automatic);
    costly requests are refused beyond `limits`."""
    expr = parse_expression(text, limits)
    if not isinstance(expr, Call):
        raise DomainError("derive writes certificates for one function call, "
                          "e.g. quasicert derive \"dedekind(5, 17)\"").at(expr)
    from ..language import expressions as ex
    ev = Evaluator(None, limits)
    if expr.name != "frobenius" and expr.name not in ("partitions", "lattice_points", "lattice_points_in"):
        _refuse_names(expr)
    if expr.name == "dedekind" and len(expr.args) == 2:
        h, k = [ev.value(a) for a in expr.args]
        if not (isinstance(h, Fraction) and isinstance(k, Fraction) and h.denominator == 1 == k.denominator):
            raise DomainError("dedekind(h, k) needs integers h and k").at(expr)
        return derive_dedekind(h.numerator, k.numerator, per_line=per_line)
    lattice = expr.name in ("lattice_points", "lattice_points_in") and len(expr.args) in (2, 3)
    if (expr.name == "partitions" and len(expr.args) == 2) or lattice:
        var = expr.args[0]
        if not isinstance(var, ex.Name):
            raise DomainError(f"give {expr.name} a variable as its first argument, e.g. "
                              f"{expr.name}(n, ...), to derive its quasi-polynomial").at(var)
        arg = ev.value(expr.args[1])
        if expr.name == "partitions":
            return derive_partitions(arg, var.name, limits=ev.limits)
        from ..mathematics.ehrhart import budget, constituents
        from ..mathematics.polytopes import polytope_of_inequalities, polytope_of_vertices
        if expr.name == "lattice_points":
            if len(expr.args) != 2:
                raise DomainError("lattice_points takes two arguments").at(expr)
            poly = polytope_of_vertices(arg, ev.limits)
        else:
            eqs = ev.value(expr.args[2]) if len(expr.args) == 3 else ()
            poly = polytope_of_inequalities(arg, eqs, ev.limits)
        table = constituents(poly, budget(ev.limits, "the Ehrhart quasi-polynomial"))
        return derive_ehrhart(text.strip(), poly, table, var.name)
    if expr.name == "fourier_dedekind" and len(expr.args) == 3:
        n, parts, b = [ev.value(a) for a in expr.args]
        if not (isinstance(n, Fraction) and isinstance(b, Fraction) and isinstance(parts, tuple)
                and all(isinstance(v, Fraction) and v.denominator == 1 for v in (n, b) + parts)):
            raise DomainError("fourier_dedekind(n, [a1, ..., am], b) needs integers").at(expr)
        return derive_fourier_dedekind(n.numerator, [a.numerator for a in parts], b.numerator,
                                       per_line=per_line)
    if expr.name == "frobenius" and len(expr.args) == 1:
        return derive_frobenius(ev.value(expr.args[0]))
    raise DomainError("derive writes certificates for dedekind(h, k), fourier_dedekind(n, A, b), partitions(n, A), "
                      f"lattice_points(t, P), lattice_points_in(t, P) and frobenius(A); not for {expr.name}").at(expr)
