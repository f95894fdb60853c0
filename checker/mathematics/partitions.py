"""Restricted partition functions p_A(n) and their quasi-polynomial extension P_A(n).

For positive integers A = [a_1, ..., a_d] (repeats allowed),

    p_A(n) = #{(m_1, ..., m_d) in Z_{>=0}^d : m_1 a_1 + ... + m_d a_d = n},

the coefficient of x^n in 1/prod_i (1 - x^(a_i)); p_A(n) = 0 for n < 0.  It
agrees for n > -(a_1 + ... + a_d) with a quasi-polynomial P_A of degree d - 1
and period lcm(A) (Bell, Amer. J. Math. 65 (1943); Sylvester (1857) for the
waves W_b; Gessel, Electron. J. Combin. 4(2) (1997) #R11; Stanley, Enumerative
Combinatorics vol. 1, ch. 4), obtained from the partial fractions of the generating function:

    P_A(n) = sum over b dividing some a_i of W_b(n),
    W_b(n) = -sum_{xi primitive b-th root of 1} Res_{z=xi} z^(-n-1) / prod_i (1 - z^(a_i)).

W_1 is the polynomial part (a Bernoulli-Barnes-type polynomial, built from
Bernoulli numbers).  For b > 1 let I = {i : b | a_i}, e = |I|: W_b is a
quasi-polynomial of period b and degree e - 1, and for pairwise coprime A the
W_b with b | a_j add up to the Fourier-Dedekind sum s_{-n}(A \\ a_j; a_j).  At
z = xi e^t the factors with b | a_i give Bernoulli series in t, the others
give power series whose coefficients are polynomials in u_i = 1/(1 - xi^(a_i));
each u_i is an element of the group algebra Q[Z/b] (see fourier_dedekind),
and the sum over primitive roots is a Ramanujan sum.  So everything is exact
rational arithmetic.

`partitions` itself takes the cheapest of five methods by their estimates (`plan`): the
formula for at most three parts (few_parts: Popoviciu's formula and floor sums, O(log) at any
size), the sum over the multiples of the largest parts down to three, the Fourier-Dedekind
decomposition for pairwise coprime parts (O(m sum A)), the waves above, and the coefficient
table (O(n d)); when all of them are dear, Barvinok's cones of the simplex are tried first,
metered against an allowance of the cheapest one's cost (see "choosing a method" below).

OEIS A001399 (partitions into parts 1, 2, 3) and Sylvester's coin problem:

>>> partitions(10, [1, 2, 3])
Fraction(14, 1)
>>> partitions(10**40, [4, 9, 11, 13]) == partitions_by_quasipolynomial(10**40, [4, 9, 11, 13])
True
>>> partitions(10**30, [10**9 + 7, 10**9 + 9, 10**9 + 21]) == partitions_by_fourier_dedekind(10**30, [10**9 + 7, 10**9 + 9, 10**9 + 21])
True
>>> plan(10**30, (10**9 + 7, 10**9 + 9, 10**9 + 21)).method
'few parts'
>>> partitions_extended(-1, [1, 2])        # P(-1) = 0 below the threshold -(1+2)
Fraction(0, 1)
"""
from __future__ import annotations

from fractions import Fraction
from itertools import accumulate
from math import factorial, gcd, prod

from .bernoulli import bernoulli_numbers
from .elementary import as_integer, as_positive
from ..foundation.errors import BudgetExceeded, DomainError
from ..foundation.numbers import rough_int, value_text
from ..foundation.limits import DEFAULT_LIMITS, Limits, check_time
from .few_parts import few_parts
from .fourier_dedekind import cyclic_convolution, fourier_dedekind


__all__ = ["partitions", "partitions_extended", "partitions_by_table",
           "partitions_by_quasipolynomial", "partitions_by_fourier_dedekind", "polynomial_part",
           "PartitionQuasiPolynomial", "check_parts", "plan", "plans", "partitions_cost", "Plan"]


def _rough(k: int) -> str:
    return rough_int(k, 10**12)      # counts in messages: exact up to 10^12


def check_parts(parts, what: str = "partitions", allow_empty: bool = False) -> tuple[int, ...]:
    if not isinstance(parts, (list, tuple)):
        raise DomainError(f"the second argument of {what} must be a list of positive integers")
    if not parts and not allow_empty:
        raise DomainError(f"the list of parts in {what} must not be empty")
    return tuple(as_positive(a, f"each part in {what}") for a in parts)


def partitions(n, parts, limits: Limits | None = None) -> Fraction:
    """p_A(n) by the cheapest method that applies (see `plan`).

    With no parts, p_A(n) is 1 at n = 0 and 0 elsewhere: the generating function
    is the empty product 1 (Stanley, *Enumerative Combinatorics I*, 1.8).  `limits`
    (default DEFAULT_LIMITS): the budget that Barvinok's cones spend within as they run.
    """
    n = as_integer(n, "the first argument of partitions")
    parts = check_parts(parts, allow_empty=True)
    return Fraction(plan(n, parts).run(limits))


def partitions_extended(n, parts, limits: Limits | None = None) -> Fraction:
    """P_A(n): the quasi-polynomial that equals p_A(n) for n > -sum(A), at any integer n.

    Below the threshold, reciprocity P_A(-n) = (-1)^(d-1) P_A(n - sum A) (Stanley, Adv.
    Math. 14 (1974)) turns it into p_A at a nonnegative argument, so every method of
    `plan` serves here too."""
    n = as_integer(n, "the first argument of partitions_extended")
    parts = check_parts(parts, "partitions_extended")
    if n <= -sum(parts):
        return (-1) ** (len(parts) - 1) * Fraction(plan(-n - sum(parts), parts).run(limits))
    return Fraction(plan(n, parts).run(limits))


def table_cost(n: int, parts: tuple[int, ...]) -> int:
    return (n + 1) * len(parts)


_QP_PART_LIMIT = 10**7   # beyond this, listing a part's divisors is itself too slow


def quasipolynomial_cost(parts: tuple[int, ...]) -> int:
    d = len(parts)
    if max(parts) > _QP_PART_LIMIT:
        return 1 << 256
    key = tuple(sorted(parts))
    hit = _QP_COSTS.get(key)
    if hit is None:
        if len(_QP_COSTS) > 1024:
            _QP_COSTS.clear()
        # the cyclic products are big-integer products, so a step grows with the modulus:
        # measured about 60, 100, 180 ns per unit at parts near 10^3, 10^4, 3 10^4
        growth = _cube_root(max(parts) // 1000) + 1
        hit = _QP_COSTS[key] = 20 * growth * sum(b * (d + 1) * sum(1 for a in parts if a % b == 0) ** 2
                                                 for b in _divisors_of_parts(parts))
    return hit


def _cube_root(m: int) -> int:
    r = 0
    while (r + 1) ** 3 <= m:
        r += 1
    return r


_QP_COSTS: dict = {}     # values only, keyed by the sorted parts: it cannot go stale


# -- choosing a method ------------------------------------------------------------------------
#
# Every method computes the same p_A(n); `plan` reduces the question first (parts larger than n
# are never used; a common divisor g of A leaves p_{A/g}(n/g) or 0) and then takes the method
# with the least estimated work.  `steps` are comparable work units (about 40-100 ns each here:
# one entry of the table); `terms` is what the budget `terms` is charged: the length of the
# method's enumeration.  A polytope engine is one of them: the lattice points of the simplex
# {x >= 0 : a.x = n} by Barvinok's signed cones (`ehrhart.restricted_partitions`), log-sized in
# n and the parts for a fixed number of parts.  No estimate of its work is good enough to choose
# by (the one in `cones.decomposition_cost` errs by a factor 1000 on parts close together, and
# 3 times low on some random ones), so it is not estimated but metered: when every other method
# would cost _CONES_WORTH steps or more, the cones run first with an allowance of what the
# cheapest other method would cost (or, if that one is over the budget, of what the budget admits),
# and if they spend it they stop (TooCostly) and that method runs instead, or the budget refuses.
# The total work is then at most twice the other method's, and no value ever rests on an estimate.

class Plan:
    """One way to compute p_A(n): the method's name, its estimates, and how to run it.

    `run(limits)`: the metered plan ("cones") spends within the limits' `terms`; the others
    were charged their `terms` up front by the caller."""

    __slots__ = ("method", "n", "parts", "steps", "terms", "what", "_run")

    def __init__(self, method, n, parts, steps, terms, what, run):
        self.method, self.n, self.parts = method, n, parts
        self.steps, self.terms, self.what, self._run = steps, terms, what, run

    def run(self, limits: Limits | None = None) -> int:
        return int(self._run(limits or DEFAULT_LIMITS))


def plan(n: int, parts) -> Plan:
    """The method `partitions` runs (parts a tuple of positive ints): the cones when offered, else the cheapest."""
    found = plans(n, parts)
    return next((p for p in found if p.method == "cones"), None) or min(found, key=lambda p: p.steps)


def plans(n: int, parts) -> list[Plan]:
    """Every method that applies to p_A(n), after the reductions; at least one.

    The cones are offered for 4 to _CONES_MOST_PARTS parts when every other method costs
    _CONES_WORTH steps or more; their plan runs the cheapest of the others when the cones
    spend their allowance."""
    n, parts = _reduce(n, tuple(parts))
    if n is None:
        return [Plan("zero", 0, (), 1, 0, "p_A(n) = 0", lambda limits: 0)]
    found = [p for p in (make(n, parts) for make in _METHODS) if p is not None]
    cheapest = min(found, key=lambda p: p.steps, default=None)
    if 3 < len(parts) <= _CONES_MOST_PARTS and (cheapest is None or cheapest.steps >= _CONES_WORTH):
        found.append(_cones_plan(n, parts, cheapest))
    return found


#: steps (0.3-1 s); below it the cones are not tried: an attempt that stops at its allowance doubles the
#: time, as for five parts near 10^6 at n = 3 10^8 (the recursion's 4.5 10^6 steps, 0.23 s; the cones need 5.4 10^6)
_CONES_WORTH = 10**7
#: beyond this the cones are not offered: the simplex's set-up is not metered (0.1 s at 12 parts,
#: 1.6 s at 30, 33 s at 60, measured) and from 10 parts near 10^9 the decomposition outgrows the budget
_CONES_MOST_PARTS = 12
#: the cones are charged one term per this many steps of their metered work (the waves: 20), so the
#: default budget admits about 9 10^7 steps of cone work (3 10^5 cone steps of 10-15 us) before it
#: refuses: five random parts near 10^9 are refused after 4.4 to 6.8 s, measured on a loaded machine
_CONE_STEPS_PER_TERM = 30


def partitions_cost(n: int, parts) -> tuple[int, str]:
    """(terms, what) of the method `partitions` runs: what the budget is charged before the work.

    The cones are charged nothing up front: they meter their own work against the budget as they
    run (see `_cones_plan`), and refuse once it is spent."""
    p = plan(n, parts)
    return p.terms, f"p_A(n) {p.what}"


def _reduce(n: int, parts: tuple[int, ...]):
    """(n, parts) with the parts > n dropped and A divided by its gcd; (None, None) if p_A(n) = 0."""
    if n < 0:
        return None, None
    parts = tuple(sorted(a for a in parts if a <= n))
    g = 0
    for a in parts:
        g = gcd(g, a)
    if g > 1:
        if n % g:
            return None, None
        n, parts = n // g, tuple(a // g for a in parts)
    return n, parts


def _bits(n: int, parts) -> int:
    return n.bit_length() + max(parts, default=1).bit_length()


def _few_plan(n, parts):
    if len(parts) > 3:
        return None
    # Popoviciu's formula and two floor sums: about 150 table steps at 100 bits (measured)
    return Plan("few parts", n, parts, 2 * _bits(n, parts), _bits(n, parts),
                f"for {len(parts)} parts by Popoviciu's formula and floor sums",
                lambda limits: few_parts(n, parts))


def _table_plan(n, parts):
    if not parts:
        return None
    cost = table_cost(n, parts)
    return Plan("table", n, parts, cost, cost, f"by a table of {_rough(n + 1)} coefficients for {len(parts)} parts",
                lambda limits: partitions_by_table(n, parts))


def _waves_plan(n, parts):
    if not parts:
        return None
    cost = quasipolynomial_cost(parts)
    return Plan("waves", n, parts, cost, cost // 20,
                f"by the waves of P_A for parts up to {_rough(max(parts))}",
                lambda limits: PartitionQuasiPolynomial.of(parts).value(n))


def recursion_leaves(n: int, big) -> int:
    """An upper bound for #{x in Z_{>=0}^k : sum big_i x_i <= n} and the prefixes' counts.

    The unit cubes x + [0,1)^k are disjoint and lie in the simplex sum big_i y_i <=
    n + sum big, of volume (n + sum big)^k / (k! prod big); the prefixes are the inner
    nodes of the recursion."""
    total, size, volume_den = 1, n, 1
    for i, a in enumerate(big, 1):
        size += a
        volume_den *= a * i
        total += -(-size ** i // volume_den)
        if total.bit_length() > 256:
            break                    # far beyond any budget already
    return total


def _recursion_plan(n, parts):
    if len(parts) <= 3:
        return None
    small, big = parts[:3], parts[:2:-1]           # recurse over the largest parts
    leaves = recursion_leaves(n, big)
    return Plan("recursion", n, parts, leaves * 2 * _bits(n, parts), leaves,
                f"by summing over multiples of the {len(big)} largest parts: up to {_rough(leaves)} "
                "three-part values", lambda limits: _by_recursion(n, small, big))


def _fourier_plan(n, parts):
    m = len(parts)
    if m < 2 or any(gcd(parts[i], parts[j]) != 1 for i in range(m) for j in range(i)):
        return None
    if m <= 3:
        # sums of one or two terms are closed forms and floor sums: O(log), a second opinion to Popoviciu
        return Plan("Fourier-Dedekind", n, parts, 20 * _bits(n, parts), _bits(n, parts),
                    f"for {m} pairwise coprime parts by Fourier-Dedekind sums of at most two terms",
                    lambda limits: partitions_by_fourier_dedekind(n, parts))
    entries = sum(parts) * (m - 1)
    return Plan("Fourier-Dedekind", n, parts, 4 * entries + m ** 4, entries,
                f"for {m} pairwise coprime parts by {m} Fourier-Dedekind sums modulo parts up to {_rough(max(parts))}",
                lambda limits: partitions_by_fourier_dedekind(n, parts))


def _cones_plan(n, parts, cheapest):
    """Barvinok's cones, metered, with `cheapest` (the cheapest other plan, or None) behind them.

    steps: an upper bound of the cones' own work, the allowance they get at most (the cheapest
    other method's steps, or what the default budget admits); terms: 0 up front, the cones charge
    the budget as they run."""
    admitted = _CONE_STEPS_PER_TERM * DEFAULT_LIMITS.terms
    steps = admitted if cheapest is None else min(cheapest.steps, admitted)
    what = (f"for {len(parts)} parts up to {_rough(max(parts))} by Barvinok's signed cones of the "
            "simplex {x >= 0 : a.x = n}")
    return Plan("cones", n, parts, steps, 0, what, lambda limits: _cones_then(n, parts, cheapest, what, limits))


def _cones_then(n, parts, cheapest, what, limits: Limits) -> int:
    """p_A(n) by the cones within an allowance; past it, by `cheapest` if the budget admits it, else refused.

    Allowance: the cheapest other method's steps when the budget admits that method (and what the
    budget has left beside its charge), else all that the budget admits of cone work."""
    from .cones import TooCostly, allowance
    from .ehrhart import CONE_STEP, restricted_partitions
    admitted = _CONE_STEPS_PER_TERM * limits.terms
    fallback = cheapest if cheapest is not None and cheapest.terms <= limits.terms else None
    if fallback is not None:
        steps = min(fallback.steps, _CONE_STEPS_PER_TERM * (limits.terms - fallback.terms))
    else:
        steps = admitted
    try:
        return restricted_partitions(n, parts, allowance(steps // CONE_STEP))
    except TooCostly:
        pass
    if fallback is None:
        cheapest_text = "" if cheapest is None else \
            f"; the cheapest other method, {cheapest.what}, needs {_rough(cheapest.terms)}"
        raise BudgetExceeded(
            f"p_A(n) {what} (n = {_rough(n)}) needs more than {limits.terms} steps: the cones stopped "
            f"there{cheapest_text}; over the limit terms = {limits.terms} (raise it with --limit terms=N)")
    return fallback.run(limits)


_METHODS = (_few_plan, _table_plan, _waves_plan, _recursion_plan, _fourier_plan)


def _by_recursion(n: int, small, big) -> int:
    """sum over x with sum big_i x_i <= n of p_small(n - sum big_i x_i), by an explicit stack."""
    total, stack, done = 0, [(n, 0)], 0
    depth = len(big)
    while stack:
        rest, i = stack.pop()
        if i == depth:
            total += few_parts(rest, small)
            done += 1
            if not done & 1023:
                check_time()
            continue
        a = big[i]
        stack.extend((rest - j * a, i + 1) for j in range(rest // a + 1))
    return total


def partitions_by_fourier_dedekind(n, parts) -> int:
    """p_A(n) = W_1(n) + sum_j s_{-n}(A without a_j; a_j) for pairwise coprime A and n > -sum A.

    The partial fractions of 1/prod(1 - x^a) (Gessel, Electron. J. Combin. 4(2) (1997)
    #R11; Sylvester's waves): for pairwise coprime parts every pole but z = 1 is simple
    and belongs to one part, and the poles at the a_j-th roots of unity add up to the
    Fourier-Dedekind sum modulo a_j."""
    value = Fraction(0)
    for c in reversed(polynomial_part(parts)):
        value = value * n + c
    for j, a in enumerate(parts):
        check_time()
        value += fourier_dedekind(-n, parts[:j] + parts[j + 1:], a)
    if value.denominator != 1:
        raise ArithmeticError(f"the Fourier-Dedekind decomposition of p_A({value_text(n)}) came out fractional: a bug")
    return value.numerator


def partitions_by_table(n, parts) -> Fraction:
    """p_A(n) by the coefficient table of prod 1/(1 - x^a): O(n d) additions."""
    n = as_integer(n)
    if n < 0:
        return Fraction(0)
    table = [1] + [0] * n
    for a in parts:
        if a > n:
            continue
        # c[i] += c[i - a] along each residue class is a running sum
        check_time()
        for r in range(a):
            table[r::a] = accumulate(table[r::a])
    return Fraction(table[n])


def partitions_by_quasipolynomial(n, parts) -> Fraction:
    """p_A(n) from P_A, for n >= 0 (0 for n < 0)."""
    n = as_integer(n)
    if n < 0:
        return Fraction(0)
    return PartitionQuasiPolynomial.of(tuple(parts)).value(n)


def polynomial_part(parts) -> list[Fraction]:
    """Coefficients c_0, ..., c_{d-1} of the polynomial part W_1(n) = sum c_j n^j.

    Only the pole at z = 1 is expanded: d products of power series of length d,
    on numbers of the size of the parts, so parts like 10^30 cost no more than
    small ones (the number of parts d is what costs).
    For A = [a, b] it is n/(ab) + 1/(2a) + 1/(2b) (Popoviciu, 1953):

    >>> polynomial_part([3, 5])
    [Fraction(4, 15), Fraction(1, 15)]
    """
    parts = tuple(sorted(check_parts(parts, "polynomial_part")))
    hit = _POLYNOMIAL_PARTS.get(parts)
    if hit is None:
        if len(_POLYNOMIAL_PARTS) > 256:
            _POLYNOMIAL_PARTS.clear()
        hit = _POLYNOMIAL_PARTS[parts] = tuple(
            PartitionQuasiPolynomial._wave_polynomial(_wave(parts, 1), 0))
    return list(hit)


_POLYNOMIAL_PARTS: dict = {}     # values only: the key is the sorted parts, so it cannot go stale


def _divisors(m: int) -> list[int]:
    small, large = [], []
    i = 1
    while i * i <= m:
        if m % i == 0:
            small.append(i)
            if i * i != m:
                large.append(m // i)
        i += 1
    return small + large[::-1]


def _divisors_of_parts(parts) -> list[int]:
    found = set()
    for a in set(parts):
        found.update(_divisors(a))
    return sorted(found)


def _moebius(m: int) -> int:
    result, p = 1, 2
    while p * p <= m:
        if m % p == 0:
            m //= p
            if m % p == 0:
                return 0
            result = -result
        p += 1
    return -result if m > 1 else result


def _ramanujan_sums(b: int) -> list[int]:
    """c_b(m) = sum over primitive b-th roots xi of xi^m, for m in Z/b."""
    by_gcd = {g: sum(_moebius(b // d) * d for d in _divisors(g)) for g in _divisors(b)}
    return [by_gcd[gcd(m, b)] for m in range(b)]


def _phi_polynomials(count: int) -> list[list[int]]:
    """phi_0..phi_{count-1}: d^k/ds^k 1/(1 - w e^s) at s = 0 is phi_k(u), u = 1/(1 - w).

    phi_0 = u and phi_{k+1} = (u^2 - u) phi_k'(u), since dU/ds = U^2 - U.
    """
    polys = [[0, 1]]
    for _ in range(1, count):
        p = polys[-1]
        deriv = [j * p[j] for j in range(1, len(p))]
        nxt = [0] * (len(deriv) + 2)
        for j, c in enumerate(deriv):
            nxt[j + 2] += c
            nxt[j + 1] -= c
        polys.append(nxt)
    return polys


class _Cyclic:
    """An element of Q[Z/b]: integer entries over one common denominator."""

    __slots__ = ("b", "nums", "den")

    def __init__(self, b, nums, den):
        self.b, self.nums, self.den = b, nums, den

    @classmethod
    def constant(cls, b, value: Fraction) -> "_Cyclic":
        nums = [0] * b
        nums[0] = value.numerator
        return cls(b, nums, value.denominator)

    def __mul__(self, other: "_Cyclic") -> "_Cyclic":
        if self.b == 1:
            return _Cyclic(1, [self.nums[0] * other.nums[0]], self.den * other.den)._tidy()
        return _Cyclic(self.b, cyclic_convolution(self.nums, other.nums, self.b),
                       self.den * other.den)._tidy()

    def __add__(self, other: "_Cyclic") -> "_Cyclic":
        g = gcd(self.den, other.den)
        fs, fo = other.den // g, self.den // g
        return _Cyclic(self.b, [x * fs + y * fo for x, y in zip(self.nums, other.nums)],
                       self.den * fs)._tidy()

    def scaled(self, factor: Fraction) -> "_Cyclic":
        return _Cyclic(self.b, [x * factor.numerator for x in self.nums],
                       self.den * factor.denominator)._tidy()

    def _tidy(self) -> "_Cyclic":
        g = self.den
        for x in self.nums:
            if g == 1:
                break
            g = gcd(g, x)
        if g > 1:
            self.nums = [x // g for x in self.nums]
            self.den //= g
        return self

    def pair(self, weights: list[int], shift: int) -> Fraction:
        """sum_s X(s) weights[(s - shift) mod b]."""
        b = self.b
        total = sum(x * weights[(s - shift) % b] for s, x in enumerate(self.nums) if x)
        return Fraction(total, self.den)


class PartitionQuasiPolynomial:
    """P_A for one multiset A, with the waves W_b precomputed."""

    _instances: dict = {}

    @classmethod
    def of(cls, parts: tuple[int, ...]) -> "PartitionQuasiPolynomial":
        key = tuple(sorted(parts))
        inst = cls._instances.get(key)
        if inst is None:
            if len(cls._instances) > 64:
                cls._instances.clear()
            inst = cls._instances[key] = cls(key)
        return inst

    def __init__(self, parts: tuple[int, ...]):
        self.parts = parts
        self.degree = len(parts) - 1
        self.period = 1
        for a in parts:
            self.period = self.period * a // gcd(self.period, a)
        self.waves = []
        for b in _divisors_of_parts(parts):
            check_time()
            self.waves.append(self._wave(b))
        # the polynomial part in powers of n
        b1 = self.waves[0]
        self.polynomial = self._wave_polynomial(b1, 0)

    def _wave(self, b: int):
        return _wave(self.parts, b)

    @staticmethod
    def _wave_polynomial(wave, residue: int) -> list[Fraction]:
        """Coefficients in n of W_b(n) for n = residue (mod b)."""
        b, top, cyc, scale, ram = wave
        inner = [cyc[k].pair(ram, residue) for k in range(top + 1)]
        coeffs = []
        for j in range(top + 1):
            coeffs.append(scale * Fraction((-1) ** j, factorial(j)) * inner[top - j])
        return coeffs

    def value(self, n: int) -> Fraction:
        total = Fraction(0)
        for wave in self.waves:
            coeffs = self._wave_polynomial(wave, n % wave[0])
            acc = Fraction(0)
            for c in reversed(coeffs):
                acc = acc * n + c
            total += acc
        return total

    def constituent(self, residue: int) -> list[Fraction]:
        """The polynomial that P_A(n) equals for n = residue (mod period)."""
        out = [Fraction(0)] * (self.degree + 1)
        for wave in self.waves:
            for j, c in enumerate(self._wave_polynomial(wave, residue % wave[0])):
                out[j] += c
        return out


def _wave(parts: tuple[int, ...], b: int):
    """W_b as (b, degree, cyclic series, scale, Ramanujan sums): see the module docstring."""
    inside = [a for a in parts if a % b == 0]
    outside = [a for a in parts if a % b]
    e = len(inside)
    top = e - 1
    bs = bernoulli_numbers(top)
    # rational series prod_{b | a} beta(a t), beta(s) = s/(e^s - 1)
    series = [Fraction(1)] + [Fraction(0)] * top
    for a in inside:
        factor = [bs[k] * Fraction(a ** k, factorial(k)) for k in range(top + 1)]
        series = _series_mul_rational(series, factor, top)
    cyc = [_Cyclic.constant(b, c) for c in series]
    phis = _phi_polynomials(top + 1)
    for a in outside:
        bp = b // gcd(b, a)
        nums = [0] * b
        for r in range(bp):
            nums[a * r % b] += bp - 1 - 2 * r
        u = _Cyclic(b, nums, 2 * bp)._tidy()
        powers = [u]
        for _ in range(top):
            powers.append(powers[-1] * u)
        factor = []
        for k in range(top + 1):
            coeff = None
            for j, c in enumerate(phis[k]):
                if c:
                    term = powers[j - 1].scaled(Fraction(c * a ** k, factorial(k)))
                    coeff = term if coeff is None else coeff + term
            factor.append(coeff)
        cyc = _series_mul_cyclic(cyc, factor, top)
    scale = Fraction(-((-1) ** e), prod(inside))
    return b, top, cyc, scale, _ramanujan_sums(b)


def _series_mul_rational(x, y, top):
    out = [Fraction(0)] * (top + 1)
    for i, xi in enumerate(x):
        if xi:
            for j in range(top + 1 - i):
                out[i + j] += xi * y[j]
    return out


def _series_mul_cyclic(x, y, top):
    out = [None] * (top + 1)
    for i in range(top + 1):
        for j in range(top + 1 - i):
            term = x[i] * y[j]
            out[i + j] = term if out[i + j] is None else out[i + j] + term
    return out
