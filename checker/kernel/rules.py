"""The rules a chain step may cite, each a published identity with its side conditions.

A rule acts on one atom (a function call at concrete arguments) and returns
the normal forms it may be replaced by; it refuses, with the reason, when a
side condition fails.  Rules never look at values: the kernel compares the
result with the next line as normal forms, and separately compares values.
Where a rule leaves a choice (which inverse, which common factor, which two
companion sums of the three-term law), the candidates are read off the atoms
of the next line, so the writer's choice is checked, not guessed.

>>> from fractions import Fraction as F
>>> from checker.kernel.normal import text
>>> [text(r) for r in RULES["reciprocity"].rewrite(("dedekind", (F(5), F(17))), set(), None)]
['1/17 - dedekind(17, 5)']
"""
from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from itertools import islice, product
from math import comb, gcd
from typing import Callable

from ..mathematics.bernoulli import bernoulli, periodic_bernoulli
from ..mathematics.dedekind import reciprocity_descent, reciprocity_term
from ..mathematics.elementary import sawtooth
from ..mathematics.fourier_dedekind_reciprocity import (bridge_constant, coprimality_problem, poly_at,
                                                        polynomial_part_cost, reciprocity_range_problem)
from ..foundation.errors import RuleRefused
from ..foundation.limits import check_time
from .normal import LONG_BITS, NF, add, atom_nf, atom_text, constant, mul, scale
from .ratios import Ratio, long_integer
from ..foundation.numbers import value_text

__all__ = ["Rule", "RULES", "WHOLE_LINE_RULES"]


@dataclass(frozen=True)
class Rule:
    name: str
    statement: str            # the identity, as the README prints it
    conditions: str           # side conditions, in words
    source: str               # where the identity is published
    rewrite: Callable         # (atom, target_atoms, limits) -> list[NF]
    laws: tuple = ()          # for a name that covers several laws: (call, identity, conditions, source)


# Rules that act on a whole line rather than on one call (handled by the kernel).
WHOLE_LINE_RULES = {
    "arithmetic": ("the next line is the same polynomial in the function calls",
                   "none", "exact rational arithmetic"),
    "value": ("every function call that disappears is replaced by its exact value",
              "at least one call disappears", "the kernel's exact functions"),
    "claim": ("previous line - next line = c * (lhs - rhs) of an earlier verified equality",
              "the claim or chain was verified above; c is a nonzero rational", "the certificate itself"),
}


def _t(x) -> str:
    """A number (or a list of them) in a message: every digit, at any length (str() of an int
    past 4300 digits raises ValueError)."""
    return value_text(list(x) if isinstance(x, (list, tuple)) else x)


def _refuse(msg: str):
    raise RuleRefused(msg)


def _integers(atom, names):
    name, args = atom
    out = []
    for label, a in zip(names, args):
        if not isinstance(a, Fraction) or a.denominator != 1:
            _refuse(f"{name} needs an integer {label}, not {value_text(a)}")
        out.append(a.numerator)
    return out


def _call(name, *args) -> NF:
    args = tuple(a if isinstance(a, tuple) else Fraction(a) for a in args)
    if name == "sawtooth" and args[0].denominator == 1:
        return {}
    return atom_nf((name, args))


def _dedekind_args(atom):
    h, k = _integers(atom, ("h", "k"))
    if k < 1:
        _refuse(f"dedekind(h, k) needs k >= 1, not {_t(k)}")
    return h, k


def _only(atom, *names):
    if atom[0] not in names:
        _refuse(f"it does not apply to {atom[0]}")


# -- reduce -----------------------------------------------------------------

def _reduce(atom, target, limits):
    name, args = atom
    if name == "dedekind":
        h, k = _dedekind_args(atom)
        # h mod k, or any other h' = h (mod k) that the next line uses
        choices = {x for x, y in _target_dedekind(target) if y == k and (x - h) % k == 0 and x != h}
        if not 0 <= h < k:
            choices.add(h % k)
        if not choices:
            _refuse(f"dedekind({_t(h)}, {_t(k)}) is already reduced (0 <= h < k), and the next line has no "
                    f"dedekind(h', {_t(k)}) with h' = {_t(h)} (mod {_t(k)})")
        return [_call("dedekind", x, k) for x in sorted(choices)]
    if name == "generalized_dedekind":
        p, h, k = _integers(atom, ("order", "h", "k"))
        if k < 1:
            _refuse(f"generalized_dedekind needs k >= 1, not {_t(k)}")
        return [_call(name, p, h % k, k)]
    if name == "fourier_dedekind":
        (n, b) = _integers((name, (args[0], args[2])), ("n", "b"))
        parts = args[1]
        if not isinstance(parts, tuple) or b < 1:
            _refuse("fourier_dedekind(n, [a1..am], b) needs a list and b >= 1")
        reduced = tuple(Fraction(_integers((name, (a,)), ("entry",))[0] % b) for a in parts)
        return [_call(name, n % b, reduced, b)]
    _refuse(f"it does not apply to {name}")


# -- reciprocity -------------------------------------------------------------

_COPRIME_PAIRS: dict = {}       # pairs (a, b) with gcd(a, b) = 1, each proved by a gcd below
_COPRIME_PAIRS_SIZE = 64


def _require_coprime(h: int, k: int, who: str = "reciprocity needs") -> None:
    """Refuse unless gcd(h, k) = 1 (h, k >= 1); `who` opens the refusal.

    A chain applies reciprocity to (h, k), then to (k mod h, h), ...: since
    gcd(k mod h, h) = gcd(h, k), each gcd proved here also proves the next pair,
    which is kept (as the exact pair of integers) so that its own gcd is not computed again."""
    if _COPRIME_PAIRS.get((h, k)) is True:
        return
    g = gcd(h, k)
    if g != 1:
        _refuse(f"{who} coprime h and k, but gcd({_t(h)}, {_t(k)}) = {_t(g)}")
    _remember_coprime(k % h, h)


def _remember_coprime(a: int, b: int) -> None:
    if len(_COPRIME_PAIRS) >= _COPRIME_PAIRS_SIZE:
        _COPRIME_PAIRS.clear()
    _COPRIME_PAIRS[(a, b)] = True


def _apostol_right_side(p: int, h: int, k: int) -> Fraction:
    total = sum(comb(p + 1, j) * (-1) ** j * bernoulli(j) * bernoulli(p + 1 - j) * h ** j * k ** (p + 1 - j)
                for j in range(p + 2))
    return total + p * bernoulli(p + 1)


def _reciprocity(atom, target, limits):
    name = atom[0]
    if name == "dedekind":
        h, k = _dedekind_args(atom)
        if h < 1:
            _refuse(f"reciprocity needs h >= 1 and k >= 1, but h = {_t(h)} (use reduce or negate first)")
        _require_coprime(h, k)
        if max(h.bit_length(), k.bit_length()) <= LONG_BITS:
            right = reciprocity_term(h, k)
        else:   # an unreduced pair: the next line's constant is compared with it by
            # cross-multiplication, so a gcd of its long terms would be wasted
            x, y = long_integer(h), long_integer(k)
            right = Ratio(x * x + y * y + 1 - 3 * x * y, 12 * x * y)
        return [add(constant(right), scale(_call("dedekind", k, h), Fraction(-1)))]
    if name == "generalized_dedekind":
        p, h, k = _integers(atom, ("order", "h", "k"))
        if p < 1 or p % 2 == 0:
            _refuse(f"Apostol's reciprocity needs an odd order p >= 1, not {_t(p)}")
        if h < 1 or k < 1:
            _refuse(f"reciprocity needs h >= 1 and k >= 1, not h = {_t(h)}, k = {_t(k)}")
        g = gcd(h, k)
        if g != 1:
            _refuse(f"reciprocity needs coprime h and k, but gcd({_t(h)}, {_t(k)}) = {_t(g)}")
        # (p+1)(h k^p s_p(h,k) + k h^p s_p(k,h)) = R
        lead = Fraction((p + 1) * h * k ** p)
        other = scale(_call(name, p, k, h), Fraction(-(p + 1) * k * h ** p) / lead)
        return [add(constant(_apostol_right_side(p, h, k) / lead), other)]
    if name == "dedekind_rademacher":
        return [_rademacher_reciprocity(atom)]
    if name == "fourier_dedekind":
        return _fourier_reciprocity(atom, target, limits)
    _refuse(f"it does not apply to {name}")


# -- descent: reciprocity and reduce, repeated ---------------------------------

def _descent(atom, target, limits):
    """s(h, k) = n/(12 k b) +- s(a, b) for each pair (a, b) of the next line that reciprocity and
    reduce, applied in turn, reach from (h, k)."""
    _only(atom, "dedekind")
    h, k = _dedekind_args(atom)
    if h < 1:
        _refuse(f"descent needs h >= 1 and k >= 1, but h = {_t(h)} (use reduce or negate first)")
    _require_coprime(h, k, "descent repeats reciprocity, which needs")
    wanted = {(x, y) for x, y in _target_dedekind(target) if y >= 1 and (x, y) != (h, k)}
    found = _walk(h, k, wanted)
    if not found:
        _refuse(f"the next line has no dedekind(a, b) at a pair that reciprocity and reduce reach from "
                f"({_t(h)}, {_t(k)}); they go {_first_pairs(h, k)}")
    out = []
    for a, b, n, sign in found:
        if a >= 1:                        # gcd(a, b) = gcd(h, k): the next line may use it
            _remember_coprime(a, b)
        d = 12 * k * b
        c = Ratio(long_integer(n), long_integer(d)) if d.bit_length() > LONG_BITS else Fraction(n, d)
        out.append(add(constant(c), scale(_call("dedekind", a, b), Fraction(sign))))
    return out


_WALKS: dict = {}       # (h, k, wanted) -> the walk's pairs: a failed step's suggestions ask again
_WALKS_SIZE = 8


def _walk(h: int, k: int, wanted: set) -> list:
    """reciprocity_descent(h, k, wanted), kept for the next identical request (a pure function of
    them; a walk of 60,000-digit numbers takes a second, and the suggestions for a failed step
    ask for it again with each rule list they try)."""
    if not wanted:
        return []
    key = (h, k, frozenset(wanted))
    found = _WALKS.get(key)
    if found is None:
        found = reciprocity_descent(h, k, wanted)
        if len(_WALKS) >= _WALKS_SIZE:
            _WALKS.clear()
        _WALKS[key] = found
    return found


def _first_pairs(h: int, k: int, count: int = 3) -> str:
    pairs = []
    while h and len(pairs) < count:
        h, k = k % h, h
        pairs.append(f"({value_text(h)}, {value_text(k)})")
    return ", ".join(pairs) + (", ..." if h else "")


def _rademacher_reciprocity(atom) -> NF:
    """s(h, k; x, y) = R - s(k, h; y, x) (Rademacher, Acta Arith. 9 (1964)), where
    R = ((x))((y)) + (h/k Bbar_2(y) + Bbar_2(h y + k x)/(h k) + k/h Bbar_2(x))/2 unless x and y
    are both integers, and R = -1/4 + (h/k + k/h + 1/(h k))/12 (Dedekind's law) when they are."""
    h, k = _integers(atom, ("h", "k"))
    x, y = atom[1][2], atom[1][3]
    if isinstance(x, tuple) or isinstance(y, tuple):
        _refuse("dedekind_rademacher(h, k, x, y) needs rational x and y")
    if h < 1 or k < 1:
        _refuse(f"reciprocity needs h >= 1 and k >= 1, not h = {_t(h)}, k = {_t(k)}")
    g = gcd(h, k)
    if g != 1:
        _refuse(f"reciprocity needs coprime h and k, but gcd({_t(h)}, {_t(k)}) = {_t(g)}")
    if x.denominator == 1 and y.denominator == 1:
        right = reciprocity_term(h, k)
    else:
        b2 = lambda v: periodic_bernoulli(2, v)          # noqa: E731
        right = sawtooth(x) * sawtooth(y) + (Fraction(h, k) * b2(y) + b2(h * y + k * x) / (h * k)
                                             + Fraction(k, h) * b2(x)) / 2
    return add(constant(right), scale(_call("dedekind_rademacher", k, h, y, x), Fraction(-1)))


# -- Fourier-Dedekind sums: reciprocity, the decomposition of p_A, the bridge ------

def _fd_args(atom):
    """(n, parts, b) of a fourier_dedekind call, as ints."""
    name, args = atom
    if not isinstance(args[1], tuple):
        _refuse("fourier_dedekind(n, [a1, ..., am], b) needs a list")
    n, b = _integers((name, (args[0], args[2])), ("n", "b"))
    parts = _integers((name, args[1]), ["entry"] * len(args[1]))
    return n, parts, b


def _parts_args(atom):
    """(n, parts) of a partitions or partitions_extended call, as ints."""
    name, args = atom
    if not isinstance(args[1], tuple):
        _refuse(f"{name}(n, [a1, ..., ad]) needs a list of parts")
    (n,) = _integers((name, args[:1]), ("n",))
    return n, _integers((name, args[1]), ["part"] * len(args[1]))


def _coprime_parts(parts, what):
    why = coprimality_problem(parts)
    if why:
        _refuse(f"{what} needs pairwise coprime positive parts A = {_t(list(parts))}: {why}")


def _same_multiset(xs, ys) -> bool:
    return sorted(xs) == sorted(ys)


def _lists_as_written(name, first, parts, last, target, pos) -> list:
    """Every way the next line writes the list of parts in a call `name` (same multiset, same other
    arguments), else the list in increasing order.  `pos` is the position of the list among the
    arguments; `first`/`last` the other arguments (last None: not compared)."""
    found = []
    for a in sorted(target, key=atom_text):
        if a[0] != name or len(a[1]) != pos + 1 + (last is not None) or not isinstance(a[1][pos], tuple):
            continue
        if a[1][0] != first or (last is not None and a[1][2] != last):
            continue
        written = a[1][pos]
        if all(isinstance(x, Fraction) and x.denominator == 1 for x in written) \
                and _same_multiset([x.numerator for x in written], parts):
            found.append(written)
    return found or [tuple(Fraction(x) for x in sorted(parts))]


def _companions(n, A, skip, target):
    """The sums s_n(A without a_j; a_j) for j != skip: a list of (modulus, [NF, ...]), one NF for
    each way the next line writes that sum, and for the list in the order of A."""
    out = []
    for j, a in enumerate(A):
        if j == skip:
            continue
        rest = A[:j] + A[j + 1:]
        forms = _lists_as_written("fourier_dedekind", Fraction(n), rest, Fraction(a), target, 1)
        in_order = tuple(Fraction(x) for x in rest)       # A without a_j, in the order A is written
        if in_order not in forms:
            forms.append(in_order)
        out.append((a, [_call("fourier_dedekind", n, written, a) for written in forms]))
    return out


_MAX_WRITINGS = 64      # ways to pick the written companions (repeated parts only)


def _polynomial_part_forms(m, A, target, limits, also=()) -> list[NF]:
    """poly_A(m) as a call partitions_polynomial_part(m, A) (its list as the next line writes it, else
    increasing, or as in `also`), and as its value."""
    if limits is not None:
        limits.require("terms", polynomial_part_cost(len(A), max(A).bit_length()),
                       f"the polynomial part of p_A for {len(A)} parts")
    forms = _lists_as_written("partitions_polynomial_part", Fraction(m), A, None, target, 1)
    forms += [w for w in also if w not in forms]
    return [_call("partitions_polynomial_part", m, written) for written in forms] + [constant(poly_at(m, A))]


def _with_and_without_unit_moduli(base: NF, companions, sign: Fraction, atom=None) -> list[NF]:
    """base + sign * (sum of companions), for each choice of their writings; the same without the
    sums modulo 1 (they are 0); and, when the call being replaced is itself among its companions
    (repeated parts 1), the law solved for it: (base + sign * (the others)) / m, m its multiplicity."""
    out = []
    own = atom_nf(atom) if atom is not None else None
    for choice in islice(product(*[forms for _, forms in companions]), _MAX_WRITINGS):
        full, short, others, m = dict(base), dict(base), dict(base), 1
        for (a, _), nf in zip(companions, choice):
            full = add(full, scale(nf, sign))
            if a != 1:
                short = add(short, scale(nf, sign))
            if nf == own:
                m += 1
            else:
                others = add(others, scale(nf, sign))
        out.extend([full, short])
        if m > 1:
            out.append(scale(others, Fraction(1, m)))
    return _unique_nfs(out)


def _unique_nfs(xs):
    out = []
    for x in xs:
        if x not in out:
            out.append(x)
    return out


def _fourier_reciprocity(atom, target, limits) -> list[NF]:
    """sum_j s_n(A without a_j; a_j) = 1 - poly_A(0) (n = 0) or -poly_A(-n) (1 <= n < sum A),
    for pairwise coprime positive A; here A = parts + [b]."""
    n, parts, b = _fd_args(atom)
    if not parts:
        _refuse("reciprocity for fourier_dedekind(n, A, b) needs at least one entry in A (d >= 2 parts)")
    A = parts + [b]
    _coprime_parts(A, "reciprocity for Fourier-Dedekind sums")
    why = reciprocity_range_problem(n, A)
    if why:
        _refuse(why)
    out = []
    for poly in _polynomial_part_forms(-n, A, target, limits):
        base = add(constant(Fraction(1 if n == 0 else 0)), scale(poly, Fraction(-1)))
        out.extend(_with_and_without_unit_moduli(base, _companions(n, A, len(A) - 1, target), Fraction(-1), atom))
    return out


def _decomposition(atom, target, limits):
    name = atom[0]
    if name in ("partitions", "partitions_extended"):
        return _decompose(atom, target, limits)
    if name == "fourier_dedekind":
        return _compose(atom, target, limits)
    _refuse(f"it does not apply to {name} (only to partitions, partitions_extended and fourier_dedekind)")


def _decompose(atom, target, limits):
    """p_A(n) = poly_A(n) + sum_j s_{-n}(A without a_j; a_j): pairwise coprime A, n > -(sum A)
    (every n for partitions_extended)."""
    n, A = _parts_args(atom)
    if not A:
        _refuse("the list of parts must not be empty")
    _coprime_parts(A, "the decomposition of p_A")
    if atom[0] == "partitions" and n <= -sum(A):
        _refuse(f"the decomposition of p_A(n) holds for n > -(a1 + ... + ad) = {_t(-sum(A))}, not at n = {_t(n)} "
                "(partitions_extended obeys it everywhere)")
    out = []
    for poly in _polynomial_part_forms(n, A, target, limits):
        out.extend(_with_and_without_unit_moduli(poly, _companions(-n, A, None, target), Fraction(1)))
    return out


def _compose(atom, target, limits):
    """The decomposition read backwards: s_{-n}(A without b; b) = p_A(n) - poly_A(n) - the other sums,
    for a call partitions(n, A) or partitions_extended(n, A) in the next line."""
    m, parts, b = _fd_args(atom)
    A = parts + [b]
    out, reasons = [], []
    for a in sorted(target, key=atom_text):
        if a[0] not in ("partitions", "partitions_extended") or a[1][0] != Fraction(-m) \
                or not isinstance(a[1][1], tuple):
            continue
        written = a[1][1]
        if not (all(isinstance(x, Fraction) and x.denominator == 1 for x in written)
                and _same_multiset([x.numerator for x in written], A)):
            continue
        try:
            n, whole = _parts_args(a)
            _coprime_parts(whole, "the decomposition of p_A")
            if a[0] == "partitions" and n <= -sum(whole):
                _refuse(f"the decomposition of p_A(n) holds for n > {_t(-sum(whole))}, not at n = {_t(n)}")
        except RuleRefused as e:
            reasons.append(e.message)
            continue
        # A as the partitions call writes it; the sum being replaced is one modulo b (the first:
        # with repeated parts 1 the others modulo b are its companions, written either way)
        j = whole.index(b)
        for poly in _polynomial_part_forms(n, whole, target, limits, (written,)):
            base = add(atom_nf(a), scale(poly, Fraction(-1)))
            out.extend(_with_and_without_unit_moduli(base, _companions(m, whole, j, target), Fraction(-1), atom))
    if not out:
        _refuse(reasons[0] if reasons else
                f"read backwards, the decomposition turns {atom_text(atom)} into p_A(n) minus the rest, "
                f"but the next line has no partitions({_t(-m)}, A) with A = {_t(sorted(A))} in some order")
    return out


def _bridge(atom, target, limits):
    name = atom[0]
    if name == "fourier_dedekind":
        return _bridge_forward(atom, target)
    if name == "dedekind":
        return _bridge_backward(atom, target)
    _refuse(f"it does not apply to {name} (only to fourier_dedekind(0, [a, c], b) and dedekind)")


def _bridge_problem(n, parts, b) -> str:
    if len(parts) != 2:
        return f"the bridge needs a list of two entries [a, c], not {len(parts)}"
    if b < 1:
        return f"the bridge needs b >= 1, not {_t(b)}"
    if n % b:
        return f"the bridge is for s_0 (n = 0 mod b), but n = {_t(n)} is not 0 mod {_t(b)}"
    for x in parts:
        if gcd(x, b) != 1:
            return f"the bridge needs a and c coprime to b, but gcd({_t(x)}, {_t(b)}) = {_t(gcd(x, b))}"
    return ""


def _bridge_fits(x, a, c, b) -> bool:
    """x = a c' or x = c a' (mod b), with c c' = a a' = 1 (mod b)."""
    return (x * c - a) % b == 0 or (x * a - c) % b == 0


def _bridge_forward(atom, target):
    """s_0(a, c; b) = -s(a c', b) + (b - 1)/(4b), c c' = 1 (mod b); the x = a c' of the next line
    is checked (x c = a, or x a = c, mod b), a c' mod b is the default."""
    n, parts, b = _fd_args(atom)
    why = _bridge_problem(n, parts, b)
    if why:
        _refuse(why)
    a, c = parts
    choices = {a * pow(c, -1, b) % b if b > 1 else 0}
    choices.update(x for x, y in _target_dedekind(target) if y == b and _bridge_fits(x, a, c, b))
    return [add(constant(bridge_constant(b)), scale(_call("dedekind", x, b), Fraction(-1)))
            for x in sorted(choices)]


def _bridge_backward(atom, target):
    """s(x, b) = -s_0(a, c; b) + (b - 1)/(4b) for a call fourier_dedekind(0, [a, c], b) of the
    next line with x c = a or x a = c (mod b)."""
    x, b = _dedekind_args(atom)
    out, reasons = [], []
    for other in sorted(target, key=atom_text):
        if other[0] != "fourier_dedekind" or other[1][2] != b or not isinstance(other[1][1], tuple):
            continue
        try:
            n, parts, bb = _fd_args(other)
        except RuleRefused as e:
            reasons.append(e.message)
            continue
        why = _bridge_problem(n, parts, bb)
        if not why and not _bridge_fits(x, parts[0], parts[1], b):
            why = (f"dedekind({_t(x)}, {_t(b)}) is not s(a c', b) for [a, c] = {_t(parts)}: {_t(x)}*{_t(parts[1])} is not "
                   f"{_t(parts[0])} mod {_t(b)} (nor {_t(x)}*{_t(parts[0])} = {_t(parts[1])})")
        if why:
            reasons.append(why)
            continue
        out.append(add(constant(bridge_constant(b)), scale(atom_nf(other), Fraction(-1))))
    if not out:
        _refuse(reasons[0] if reasons else
                f"read backwards, the bridge needs fourier_dedekind(0, [a, c], {_t(b)}) in the next line")
    return out


# -- negate ------------------------------------------------------------------

def _negate(atom, target, limits):
    name = atom[0]
    if name == "dedekind":
        h, k = _dedekind_args(atom)
        return [scale(_call("dedekind", -h, k), Fraction(-1))]
    if name == "generalized_dedekind":
        p, h, k = _integers(atom, ("order", "h", "k"))
        if k < 1 or p < 1:
            _refuse("generalized_dedekind(p, h, k) needs p >= 1 and k >= 1")
        return [scale(_call(name, p, -h, k), Fraction((-1) ** p))]
    _refuse(f"it does not apply to {name}")


# -- inverse -----------------------------------------------------------------

def _target_dedekind(target):
    # sorted: set order of atoms varies between runs, messages must not (one call needs no
    # sorting, nor the text of its long arguments)
    for a in (target if len(target) < 2 else sorted(target, key=atom_text)):
        if a[0] == "dedekind" and all(isinstance(x, Fraction) and x.denominator == 1 for x in a[1]):
            yield a[1][0].numerator, a[1][1].numerator


def _inverse(atom, target, limits):
    _only(atom, "dedekind")
    h, k = _dedekind_args(atom)
    g = gcd(h, k)
    if g != 1:
        _refuse(f"inverse needs h coprime to k, but gcd({_t(h)}, {_t(k)}) = {_t(g)}")
    choices = {pow(h, -1, k) if k > 1 else 0}
    for x, y in _target_dedekind(target):
        if y == k and (x * h - 1) % k == 0:
            choices.add(x)
    return [_call("dedekind", x, k) for x in sorted(choices)]


# -- common factor -----------------------------------------------------------

def _common_factor(atom, target, limits):
    _only(atom, "dedekind")
    h, k = _dedekind_args(atom)
    out = []
    g = gcd(h, k)
    if g > 1:
        out.append(_call("dedekind", h // g, k // g))
    for x, y in _target_dedekind(target):
        if y >= 1 and (x, y) != (h, k) and x * k == h * y and (k % y == 0 or y % k == 0):
            out.append(_call("dedekind", x, y))
    if not out:
        _refuse(f"dedekind({_t(h)}, {_t(k)}) has no common factor to cancel, and the next line has no "
                "dedekind(g h, g k) to expand it into")
    return out


# -- Rademacher's three-term law --------------------------------------------

def _three_term(atom, target, limits):
    _only(atom, "dedekind")
    x, a = _dedekind_args(atom)
    others = [(y, b) for y, b in _target_dedekind(target) if (y, b) != (x, a)]
    out, reasons = [], []
    for i, (y, b) in enumerate(others):
        check_time()                  # pairs of the next line's calls: quadratic in them
        for z, c in others:
            if (z, c) == (y, b):
                continue
            why = _three_term_mismatch(x, a, y, b, z, c)
            if why is None:
                rhs = Fraction(-1, 4) + Fraction(a * a + b * b + c * c, 12 * a * b * c)
                out.append(add(constant(rhs), scale(add(_call("dedekind", y, b), _call("dedekind", z, c)),
                                                    Fraction(-1))))
            elif why not in reasons:
                reasons.append(why)
    if not out:
        if len(others) < 2:
            _refuse("the three-term law replaces s(b c*, a) by -1/4 + (a^2+b^2+c^2)/(12abc) - s(c a*, b) "
                    "- s(a b*, c), but the next line has no two other dedekind sums")
        # prefer the ordering in which the rewritten call itself fits the law
        fitting = [r for r in reasons if "s(b c*, a)" not in r]
        _refuse((fitting or reasons)[0])
    return out


def _three_term_mismatch(x, a, y, b, z, c):
    if min(a, b, c) < 1:
        return f"the three-term law needs a, b, c >= 1 (here {_t(a)}, {_t(b)}, {_t(c)})"
    for p, q in ((a, b), (b, c), (a, c)):
        if gcd(p, q) != 1:
            return f"the three-term law needs pairwise coprime a, b, c, but gcd({_t(p)}, {_t(q)}) = {_t(gcd(p, q))}"
    checks = ((x, a, b, c, "s(b c*, a)"), (y, b, c, a, "s(c a*, b)"), (z, c, a, b, "s(a b*, c)"))
    for value, m, num, inv_of, label in checks:
        if m > 1 and (value - num * pow(inv_of, -1, m)) % m:
            return (f"with a, b, c = {_t(a)}, {_t(b)}, {_t(c)} the law needs {label} with first argument "
                    f"= {_t(num * pow(inv_of, -1, m) % m)} (mod {_t(m)}), not {_t(value)}")
    return None


# -- definition --------------------------------------------------------------

def _by_definition(atom, target, limits):
    name, args = atom
    if name == "dedekind":
        h, k = _dedekind_args(atom)
        limits.require("definition_terms", k, f"writing dedekind(h, {_t(k)}) out by its definition")
        total: NF = {}
        for j in range(k):
            total = add(total, mul(_call("sawtooth", Fraction(j, k)), _call("sawtooth", Fraction(h * j, k))))
        return [total]
    if name == "dedekind_rademacher":
        h, k = _integers(atom, ("h", "k"))
        x, y = args[2], args[3]
        if k < 1 or isinstance(x, tuple) or isinstance(y, tuple):
            _refuse("dedekind_rademacher(h, k, x, y) needs k >= 1 and rational x, y")
        limits.require("definition_terms", k, f"writing out a sum of {_t(k)} terms")
        total = {}
        for j in range(k):
            total = add(total, mul(_call("sawtooth", h * (j + y) / k + x), _call("sawtooth", (j + y) / k)))
        return [total]
    if name == "generalized_dedekind":
        p, h, k = _integers(atom, ("order", "h", "k"))
        if k < 1 or p < 1:
            _refuse("generalized_dedekind(p, h, k) needs p >= 1 and k >= 1")
        limits.require("definition_terms", k, f"writing out a sum of {_t(k)} terms")
        total = {}
        for j in range(1, k):
            total = add(total, scale(_call("periodic_bernoulli", p, Fraction(h * j, k)), Fraction(j, k)))
        return [total]
    _refuse(f"quasicert knows no definition of {name} as a finite sum")


RULES: dict[str, Rule] = {r.name: r for r in [
    Rule("reduce", "s(h, k) = s(h', k) for h' = h (mod k), by default h mod k; also s_p(h, k), and s_n(A; b) modulo b",
         "k >= 1 (b >= 1)", "definition (periodicity of the sawtooth)", _reduce),
    Rule("reciprocity", "each sum plus its reciprocal partner(s) is an explicit constant (four laws below)",
         "positive, coprime arguments; see each law", "see each law", _reciprocity, (
             ("dedekind(h, k)", "s(h, k) = -1/4 + (h/k + k/h + 1/(hk))/12 - s(k, h)",
              "h >= 1, k >= 1, gcd(h, k) = 1", "Dedekind (1892); Rademacher & Grosswald (1972), ch. 2"),
             ("generalized_dedekind(p, h, k)",
              "(p+1)(h k^p s_p(h,k) + k h^p s_p(k,h)) = sum_j C(p+1,j)(-1)^j B_j B_(p+1-j) h^j k^(p+1-j) + p B_(p+1)",
              "p odd, h >= 1, k >= 1, gcd(h, k) = 1", "Apostol, Duke Math. J. 17 (1950)"),
             ("dedekind_rademacher(h, k, x, y)",
              "s(h, k; x, y) + s(k, h; y, x) = ((x))((y)) + (h/k Bbar_2(y) + Bbar_2(hy + kx)/(hk) + k/h Bbar_2(x))/2 "
              "when x, y are not both integers; = -1/4 + (h/k + k/h + 1/(hk))/12 when they are",
              "h >= 1, k >= 1, gcd(h, k) = 1; x, y rational", "Rademacher, Acta Arith. 9 (1964)"),
             ("fourier_dedekind(n, A', b)",
              "with A = A' + [b] = [a_1, ..., a_d]: sum_j s_n(A without a_j; a_j) = 1 - poly_A(0) at n = 0, "
              "-poly_A(-n) for 1 <= n <= a_1 + ... + a_d - 1 (poly_A = partitions_polynomial_part(., A))",
              "d >= 2; A positive and pairwise coprime; n in that range; the other d - 1 sums are read from "
              "the next line (lists in any order, else increasing; sums modulo 1 may be left out)",
              "Zagier, Math. Ann. 202 (1973); Gessel, Electron. J. Combin. 4(2) (1997) #R11"),
         )),
    Rule("descent", "s(h, k) = T(h, k) - T(k mod h, h) + ... +- s(a, b): reciprocity and reduce applied in turn "
         "from (h, k) down to the pair (a, b) of the next line, T(h, k) = -1/4 + (h/k + k/h + 1/(hk))/12",
         "h >= 1, k >= 1, gcd(h, k) = 1; the steps reach (a, b) from (h, k)",
         "Dedekind (1892); Rademacher & Grosswald (1972), ch. 3 (Euclid's algorithm on the pair)", _descent),
    Rule("negate", "s(h, k) = -s(-h, k); s_p(h, k) = (-1)^p s_p(-h, k)", "k >= 1",
         "definition (the sawtooth is odd)", _negate),
    Rule("inverse", "s(h, k) = s(h', k) where h h' = 1 (mod k)", "gcd(h, k) = 1",
         "Rademacher & Grosswald, Dedekind Sums (1972), ch. 3", _inverse),
    Rule("common_factor", "s(g h, g k) = s(h, k)", "g >= 1 divides both arguments",
         "Rademacher & Grosswald, Dedekind Sums (1972), ch. 3", _common_factor),
    Rule("three_term", "s(b c*, a) + s(c a*, b) + s(a b*, c) = -1/4 + (a^2 + b^2 + c^2)/(12 a b c)",
         "a, b, c >= 1 pairwise coprime; c c* = 1 (mod a), a a* = 1 (mod b), b b* = 1 (mod c)",
         "Rademacher, Pacific J. Math. 4 (1954)", _three_term),
    Rule("decomposition", "p_A(n) = poly_A(n) + sum_j s_{-n}(A without a_j; a_j), poly_A = "
         "partitions_polynomial_part(., A); either side may replace the other",
         "A positive and pairwise coprime; n > -(a_1 + ... + a_d) for partitions (any n for "
         "partitions_extended); read backwards, the partitions call stands in the next line",
         "Gessel, Electron. J. Combin. 4(2) (1997) #R11 (partial fractions of 1/prod(1 - z^a_i))",
         _decomposition),
    Rule("bridge", "s_0(a, c; b) = -s(a c', b) + (b - 1)/(4b) with c c' = 1 (mod b); read backwards too",
         "b >= 1, gcd(a, b) = gcd(c, b) = 1, n = 0 (mod b), exactly two entries; the first argument x of "
         "s(x, b) in the next line is checked: x c = a or x a = c (mod b)",
         "Rademacher & Grosswald, Dedekind Sums (1972), ch. 2 (the cotangent form of s(h, k))", _bridge),
    Rule("definition", "s(h, k) = total(j from 0 to k-1: sawtooth(j/k) * sawtooth(h*j/k)); likewise "
         "dedekind_rademacher and generalized_dedekind", "k within the definition-terms limit",
         "the definitions", _by_definition),
]}
