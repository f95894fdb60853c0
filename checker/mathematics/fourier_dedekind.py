"""Fourier-Dedekind sums, exactly, without complex numbers.

For an integer b >= 1, integers a_1..a_m each coprime to b, and any integer n:

    s_n(a_1, ..., a_m; b) = (1/b) sum_{j=1}^{b-1} xi^(j n) / prod_i (1 - xi^(j a_i)),

xi = exp(2 pi i / b) (sums of this kind over the b-th roots of unity: Gessel,
Electron. J. Combin. 4(2) (1997) #R11, who writes restricted partition counts
with them; the sums of Zagier, Math. Ann. 202 (1973), are of the same kind).
The sum is rational.

How it is computed.  For a b-th root of unity w != 1,
1/(1 - w) = sum_{r=0}^{b-1} c(r) w^r with c(r) = (b - 1 - 2r)/(2b), because
sum_r r w^r = b/(w - 1).  Substituting w = xi^(j a_i) turns each factor into a
function on Z/b, f_i(s) = c(s a_i^-1 mod b), the product into a cyclic
convolution F = f_1 * ... * f_m, and summing xi^(j(n+s)) over j leaves
s_n = F(-n mod b) (the total of F is 0 once m >= 1).  Two factors at a time
are a Dedekind-Rademacher-type sum: one value costs O(log b) by floor sums,
the whole table over Z/b costs O(b) by a first-order recurrence.  More tables
are combined by one exact convolution (Kronecker substitution into a big
integer product).

Worked by hand: with w = exp(2 pi i/3), 1/(1 - w) = 1/2 + i/(2 sqrt 3), so
s_0(1, 1; 3) = (1/3)(1/(1-w)^2 + 1/(1-w^2)^2) = (1/3)(1/3) = 1/9:

>>> fourier_dedekind(0, [1, 1], 3)
Fraction(1, 9)
>>> fourier_dedekind(0, [1], 2)                       # (1/2)(1/(1-(-1)))
Fraction(1, 4)
"""
from __future__ import annotations

from fractions import Fraction
from math import gcd

from .elementary import as_integer, as_positive
from ..foundation.errors import DomainError
from ..foundation.limits import check_time
from .floor_sums import floor_sums
from ..foundation.numbers import value_text

__all__ = ["fourier_dedekind", "pair_table"]


def _check(n, parts, b):
    n = as_integer(n, "the first argument of fourier_dedekind")
    if not isinstance(parts, (list, tuple)):
        raise DomainError("the second argument of fourier_dedekind must be a list of integers")
    parts = [as_integer(a, "each entry of the list in fourier_dedekind") for a in parts]
    b = as_positive(b, "the third argument of fourier_dedekind")
    for i, a in enumerate(parts, 1):
        if gcd(a, b) != 1:
            raise DomainError(
                f"fourier_dedekind needs every entry coprime to {value_text(b)}, but entry {i} is {value_text(a)} "
                f"(gcd {value_text(gcd(a, b))}): a term 1/(1 - xi^(j a)) would divide by zero")
    return n, parts, b


def fourier_dedekind(n, parts, b) -> Fraction:
    """s_n(a_1, ..., a_m; b), exactly (see the module docstring)."""
    n, parts, b = _check(n, parts, b)
    if b == 1:
        return Fraction(0)
    m = len(parts)
    t = (-n) % b
    if m == 0:
        return Fraction((b if t == 0 else 0) - 1, b)
    inverses = [pow(a, -1, b) for a in parts]
    if m == 1:
        return Fraction(_single(inverses[0], b, t), 2 * b)
    if m == 2:
        return Fraction(_pair_value(parts[0], inverses[1], b, t), 4 * b * b)
    tables = []
    for i in range(0, m - 1, 2):
        tables.append(pair_table(parts[i], inverses[i + 1], b))
    if m % 2:
        alpha = inverses[-1]
        tables.append([_single(alpha, b, s) for s in range(b)])
    return Fraction(_convolve_at(tables, b, t), (2 * b) ** m)


def _single(alpha: int, b: int, s: int) -> int:
    """2b f(s) = b - 1 - 2 (alpha s mod b)."""
    return b - 1 - 2 * (alpha * s % b)


def _h_value(gamma: int, v: int, b: int) -> int:
    """H(v) = sum_{r=0}^{b-1} r ((v - gamma r) mod b), by floor sums in O(log b)."""
    g = (-gamma) % b
    linear = v * (b * (b - 1) // 2) + g * ((b - 1) * b * (2 * b - 1) // 6)
    return linear - b * floor_sums(g, v, b, b - 1)[1]


def _pair_value(a1: int, alpha2: int, b: int, u: int) -> int:
    """(4b^2) (f_1 * f_2)(u) = 4 H(alpha2 u) - b (b-1)^2, with gamma = a1 alpha2."""
    return 4 * _h_value(a1 * alpha2 % b, alpha2 * u % b, b) - b * (b - 1) ** 2


def pair_table(a1: int, alpha2: int, b: int) -> list[int]:
    """[(4b^2)(f_1 * f_2)(u) for u in Z/b], in O(b) by the recurrence

    H(v+1) = H(v) + b(b-1)/2 - b ((v+1) gamma^-1 mod b).
    """
    gamma = a1 * alpha2 % b
    gamma_inv = pow(gamma, -1, b)
    step = b * (b - 1) // 2
    h = [0] * b
    value = _h_value(gamma, 0, b)
    h[0] = value
    r = 0
    for v in range(1, b):
        if not v & 65535:
            check_time()
        r += gamma_inv
        if r >= b:
            r -= b
        value += step - b * r
        h[v] = value
    shift = b * (b - 1) ** 2
    return [4 * h[alpha2 * u % b] - shift for u in range(b)]


def _convolve_at(tables: list[list[int]], b: int, t: int) -> int:
    """(T_1 * ... * T_r)(t) over Z/b."""
    acc = tables[0]
    for table in tables[1:-1]:
        acc = cyclic_convolution(acc, table, b)
    last = tables[-1]
    return sum(acc[u] * last[(t - u) % b] for u in range(b))


def cyclic_convolution(x: list[int], y: list[int], b: int) -> list[int]:
    """z[t] = sum_u x[u] y[t-u mod b], exactly, by one big-integer product."""
    mx, my = max(map(abs, x)), max(map(abs, y))
    bound = max(mx, my, mx * my * b)    # every packed input and every output coefficient
    width = (bound.bit_length() + 2 + 7) // 8          # bytes per coefficient
    bits = 8 * width
    product = _pack(x, width) * _pack(y, width)
    length = 2 * b - 1
    offset = int.from_bytes((1 << (bits - 1)).to_bytes(width, "little") * length, "little")
    raw = (product + offset).to_bytes(width * length + 1, "little")
    half = 1 << (bits - 1)
    out = [0] * b
    for i in range(length):
        out[i % b] += int.from_bytes(raw[i * width:(i + 1) * width], "little") - half
    return out


def _pack(values: list[int], width: int) -> int:
    pos = b"".join((v if v > 0 else 0).to_bytes(width, "little") for v in values)
    neg = b"".join((-v if v < 0 else 0).to_bytes(width, "little") for v in values)
    return int.from_bytes(pos, "little") - int.from_bytes(neg, "little")
