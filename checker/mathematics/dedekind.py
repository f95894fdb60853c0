"""Dedekind sums and two of their generalisations.

The Dedekind sum, for an integer k >= 1 and any integer h:

    s(h, k) = sum_{j=0}^{k-1} ((j/k)) ((h j/k)),

with ((x)) the sawtooth function.  It depends on h mod k only, s(-h, k) =
-s(h, k), and s(g h, g k) = s(h, k).  For coprime h, k >= 1 Dedekind's
reciprocity law reads

    s(h, k) + s(k, h) = -1/4 + (h/k + k/h + 1/(h k)) / 12.

Iterating it along Euclid's algorithm gives, for 0 < h < k coprime with
quotients q_1, ..., q_n of the remainder sequence k, h, r_2, ..., 1, 0, and
h h* = 1 (mod k):

    12 k s(h, k) = k (q_1 - q_2 + ... +- q_n) + h + h* - k (3 if n is odd else 1),

the integer form of the formula of Barkan, Hickerson and Knuth (Knuth, TAOCP
vol. 2, section 3.3.3; Hickerson, 1977).  Only the quotients are needed, so the
cost is that of one Euclid run; Lehmer's idea (the leading bits predict many
quotients at once) keeps the big-number work to a few multiplications a batch.

Rademacher & Grosswald, *Dedekind Sums* (1972), give s(1, k) = (k-1)(k-2)/(12k):

>>> dedekind(1, 7), Fraction(6 * 5, 12 * 7)
(Fraction(5, 14), Fraction(5, 14))
>>> dedekind(5, 17)
Fraction(1, 17)
>>> dedekind_rademacher(1, 3, 0, 0) == dedekind(1, 3)
True
>>> generalized_dedekind(1, 5, 17) == dedekind(5, 17)
True
"""
from __future__ import annotations

from fractions import Fraction
from math import comb, gcd

from .bernoulli import bernoulli_numbers
from .elementary import as_integer, as_positive, as_rational
from ..foundation.errors import DomainError
from ..foundation.limits import check_time
from ..foundation.numbers import value_text

__all__ = [
    "dedekind", "twelve_k_dedekind", "dedekind_equals", "dedekind_by_definition", "dedekind_along_euclid",
    "reciprocity_descent",
    "reciprocity_term", "dedekind_rademacher", "generalized_dedekind",
    "generalized_dedekind_by_definition", "generalized_dedekind_by_reciprocity",
]

_LEADING_BITS = 300          # bits of the leading parts simulated per batch (tuned by bench_kernel.py)
_GMP_BITS = 160              # from this size on gmpy2 is imported for its inverse (~20 ms, once)
_STOP = 1 << (_LEADING_BITS // 2 + 4)    # where a batch stops: rarely refused by the check
_BATCH_BITS = _LEADING_BITS + 64         # batches while the smaller number is longer than this
_BARE_BATCH_BITS = 1400                  # the same without cofactors: the tail, now cheaper than a
                                         # batch's bookkeeping, does up to here (bench_kernel.py)


def reciprocity_term(h: int, k: int) -> Fraction:
    """-1/4 + (h/k + k/h + 1/(hk))/12, the right side of Dedekind reciprocity."""
    return Fraction(h * h + k * k + 1 - 3 * h * k, 12 * h * k)


_NOT_LOADED = object()
_gmp_invert = _NOT_LOADED             # optional: GMP's modular inverse is much faster on long numbers
_gmp_mpz = None                       # gmpy2.mpz, loaded with it: the batches' long products


def _load_gmp():
    """gmpy2's inverse, imported on first need (its import costs a start-up ~0.1 s).

    Setting `_gmp_invert` to None switches gmpy2 off (the long products too)."""
    global _gmp_invert, _gmp_mpz
    if _gmp_invert is _NOT_LOADED:
        try:
            from gmpy2 import invert as _gmp_invert, mpz as _gmp_mpz
        except ImportError:            # pragma: no cover - depends on the machine
            _gmp_invert = None
    return _gmp_invert


def _euclid(r0: int, r1: int, want_inverse: bool) -> tuple[int, int, int, int]:
    """(q_1 - q_2 + q_3 - ..., n, g, u) for Euclid's algorithm on r0 > r1 > 0.

    n has the parity of the number of quotients (only the parity is used), g =
    gcd(r0, r1) is the last nonzero remainder.  With want_inverse, u r1 = g (mod r0),
    from the cofactors carried along (r_i = u_i r1 mod r0); otherwise u = 0.
    """
    alt, n = 0, 0
    u0, u1 = 0, 1
    if r1.bit_length() > (_BATCH_BITS if want_inverse else _BARE_BATCH_BITS):
        alt, n, r0, r1, u0, u1 = _batches(r0, r1, want_inverse)
        if not r1:                     # a long gcd, reached by an exact step
            return alt, n, r0, (u0 if want_inverse else 0)
    if n % 2:
        alt = -alt
    if want_inverse:
        alt, odd, g, u = _tail_with_inverse(r0, r1, u0, u1, alt)
    else:
        alt, odd, g = _tail(r0, r1, alt)
        u = 0
    return (-alt if n % 2 else alt), n + odd, g, u


# The small tail, two quotients a turn: `ahead` sums the quotients of odd index,
# `behind` those of even index.  A quotient is 1 about four times in ten
# (Gauss-Kuzmin), so each step subtracts first and divides only when the
# difference is still >= the divisor; the division's quotient then lacks the 1
# already subtracted, which the sums make up at the end (the 1s of an even number
# of quotients cancel in the alternating sum; an odd number leaves one +1).  The
# remainder can only vanish after a division: a step r0 > r1 > 0 with quotient 1
# leaves r0 - r1 > 0.  Once only the larger quotients divide, divmod (one long
# division) beats `//` and a product (5-8 % at 20-300 digits, bench_kernel.py).

def _tail(r0: int, r1: int, alt: int) -> tuple[int, int, int]:
    """(alt + q_1 - q_2 + ..., parity of the number of quotients, gcd) for Euclid on r0 > r1 > 0."""
    ahead, behind, split = alt, 0, divmod
    while True:
        r0 -= r1
        if r0 >= r1:
            q, r0 = split(r0, r1)
            ahead += q
            if not r0:
                return ahead - behind + 1, 1, r1
        r1 -= r0
        if r1 >= r0:
            q, r1 = split(r1, r0)
            behind += q
            if not r1:
                return ahead - behind, 0, r0


def _tail_with_inverse(r0: int, r1: int, u0: int, u1: int, alt: int) -> tuple[int, int, int, int]:
    """As _tail, with the cofactors: (alt + q_1 - q_2 + ..., parity, gcd, u), u the cofactor
    of the gcd (r_i = u_i r1 mod r0 for the pair given at the start)."""
    ahead, behind, split = alt, 0, divmod
    while True:
        r0 -= r1
        if r0 >= r1:
            q, r0 = split(r0, r1)
            ahead += q
            u0 -= (q + 1) * u1
            if not r0:
                return ahead - behind + 1, 1, r1, u1
        else:
            u0 -= u1
        r1 -= r0
        if r1 >= r0:
            q, r1 = split(r1, r0)
            behind += q
            u1 -= (q + 1) * u0
            if not r1:
                return ahead - behind, 0, r0, u0
        else:
            u1 -= u0


def _batches(r0: int, r1: int, want_inverse: bool) -> tuple:
    """Euclid's algorithm on r0 > r1 > 0 while r1 is long, many quotients a batch (Lehmer 1938).

    Returns (q_1 - q_2 + ..., n, r0, r1, u0, u1) with n of the parity of the number of quotients
    taken, (r0, r1) the remainder pair reached (r1 of at most _BATCH_BITS bits, _BARE_BATCH_BITS
    without the inverse; r1 = 0 when an exact step reached a long gcd) and, with
    want_inverse, r_i = u_i * r1_given (mod r0_given).  A batch runs Euclid on the leading
    _LEADING_BITS bits (x0, y0) while the remainder stays above _STOP; its quotients q_i >= 1 are
    only proposed: they are used after the new pair (n0, n1) = M^-1 (r0, r1), M the product of
    the matrices [[q_i, 1], [1, 0]], is checked in exact arithmetic to satisfy n0 > n1 > 0.  Then
    r0/r1 = [q_1; q_2, ..., q_m, n0/n1] with every q_i >= 1 and 1 < n0/n1 < infinity, so the
    remainders M gives decrease strictly and each q_i is the floor of its quotient: Euclid's own
    (a continued fraction with such a tail is unique).  Otherwise one exact step is taken
    instead.  The long products run on gmpy2's mpz when gmpy2 is in use.
    """
    mpz = _gmp_mpz if _load_gmp() is not None else None
    if mpz is not None:
        r0, r1 = mpz(r0), mpz(r1)
    alt, n = 0, 0
    u0, u1 = 0, 1
    size, stop, split = _LEADING_BITS, _STOP, divmod
    above = _BATCH_BITS if want_inverse else _BARE_BATCH_BITS
    while r1.bit_length() > above:
        shift = r0.bit_length() - size
        x0 = x = int(r0 >> shift)
        y0 = y = int(r1 >> shift)
        if y > stop:
            # x = a x0 + b y0 and y = c x0 + d y0 throughout; two quotients a turn,
            # `ahead` summing those of odd index, `behind` those of even index; a quotient
            # is 1 four times in ten (Gauss-Kuzmin), so subtract first and divide if needed
            a, c = 1, 0
            ahead = behind = 0
            while True:
                x -= y
                if x < y:
                    a -= c
                    ahead += 1
                else:
                    q, x = split(x, y)
                    q += 1
                    a -= q * c
                    ahead += q
                if x <= stop:
                    x, y, a, c = y, x, c, a          # an odd number of quotients
                    odd = True
                    break
                y -= x
                if y < x:
                    c -= a
                    behind += 1
                else:
                    q, y = split(y, x)
                    q += 1
                    c -= q * a
                    behind += q
                if y <= stop:
                    odd = False
                    break
            b = (x - a * x0) // y0                   # exact: x - a x0 = b y0
            d = (y - c * x0) // y0
            n0, n1 = a * r0 + b * r1, c * r0 + d * r1
            if n0 > n1 > 0:                          # the proof that the batch's quotients are Euclid's
                s = ahead - behind
                alt += s if n % 2 == 0 else -s
                n += 1 if odd else 2
                r0, r1 = n0, n1
                if want_inverse:
                    u0, u1 = a * u0 + b * u1, c * u0 + d * u1
                continue
        q, r2 = divmod(r0, r1)                       # one exact step (a huge quotient, or a refused batch)
        q = int(q)
        alt += q if n % 2 == 0 else -q
        n += 1
        r0, r1 = r1, r2
        u0, u1 = u1, u0 - q * u1
    return alt, n, int(r0), int(r1), u0, u1


def _reduced_pair(h: int, k: int) -> tuple[int, int]:
    h %= k
    g = gcd(h, k)
    return h // g, k // g


def dedekind(h, k) -> Fraction:
    """s(h, k) for integers h and k >= 1, in O(log k) arithmetic steps."""
    numerator, k = twelve_k_dedekind(h, k)
    return Fraction(numerator, 12 * k)


def twelve_k_dedekind(h, k) -> tuple[int, int]:
    """(N, k') with s(h, k) = N / (12 k'), k' = k / gcd(h, k): the integer form, nothing reduced.

    N = k' (q_1 - q_2 + ... +- q_n) + h' + h'* - k' (3 if n is odd else 1) for
    h' = (h mod k) / gcd(h, k) (the formula above); N = 0 when k' = 1.

    >>> twelve_k_dedekind(5, 17), twelve_k_dedekind(10, 34)
    ((12, 17), (12, 17))
    """
    h = as_integer(h, "the first argument of dedekind")
    k = as_positive(k, "the second argument of dedekind")
    h %= k
    if not h:
        return 0, 1
    invert = _gmp_invert
    if invert is _NOT_LOADED:
        # once loaded, GMP's inverse (0.4 us at 20 digits) beats carrying the cofactors
        # (1.2 us) at every size; a short one-off value does not pay for the import
        invert = _load_gmp() if k.bit_length() > _GMP_BITS else None
    if invert is None:
        without_inverse, k, inverse = _without_inverse(h, k, True)
        return without_inverse + inverse % k, k
    without_inverse, k, h = _without_inverse(h, k, False)
    return without_inverse + int(invert(h, k)), k


def _without_inverse(h: int, k: int, want_inverse: bool) -> tuple[int, int, int]:
    """(12 k' s(h, k) - h'*, k', u) for 0 < h < k, with h' = h / g, k' = k / g, g = gcd(h, k),
    h'* the inverse of h' modulo k' in [0, k'); u = h'* (mod k') if want_inverse, else u = h'.

    One Euclid run gives the gcd too: the quotients of (k, h) are those of (k', h')
    (every remainder is g times the reduced one), and the cofactor u of g, u h = g
    (mod k), is one of h' modulo k'.
    """
    alt, n, g, u = _euclid(k, h, want_inverse)
    if g != 1:
        h //= g
        k //= g
    return k * (alt - (3 if n % 2 else 1)) + h, k, (u if want_inverse else h)


def dedekind_equals(h: int, k: int, p: int, q: int) -> bool:
    """Whether s(h, k) = p/q, for ints h, k >= 1, p and q != 0: no fraction built or reduced.

    With h', k' as in twelve_k_dedekind, s(h, k) = p/q exactly when 12 k' p / q
    is an integer N and N minus the part of the formula without h'* is the
    inverse of h' modulo k' in [1, k'): that inverse is unique there, so this
    is N = 12 k' s(h, k), and the modular inverse is checked by one product
    instead of being computed.

    >>> dedekind_equals(5, 17, 1, 17), dedekind_equals(5, 17, -2, -34), dedekind_equals(5, 17, 1, 16)
    (True, True, False)
    """
    if type(h) is not int or type(k) is not int or type(p) is not int or type(q) is not int:
        raise TypeError("dedekind_equals takes ints")
    if k < 1 or q == 0:
        raise DomainError("dedekind_equals needs k >= 1 and q != 0")
    if q < 0:
        p, q = -p, -q
    h %= k
    if not h:                                   # k' = 1: s = 0
        return p == 0
    without_inverse, k, h = _without_inverse(h, k, False)
    scaled, rest = divmod(12 * k * p, q)        # the claimed 12 k' s(h, k)
    if rest:
        return False
    inverse = scaled - without_inverse
    return 0 < inverse < k and inverse * h % k == 1


def dedekind_by_definition(h, k) -> Fraction:
    """s(h, k) summed term by term from the definition: O(k), for testing."""
    h = as_integer(h, "the first argument of dedekind")
    k = as_positive(k, "the second argument of dedekind")
    total = 0
    for j in range(1, k):
        r = h * j % k
        if r:
            total += (2 * j - k) * (2 * r - k)
    return Fraction(total, 4 * k * k)


def dedekind_along_euclid(h: int, k: int) -> dict[tuple[int, int], tuple[int, int]]:
    """12 k s(h, k) at every pair met by reduce/reciprocity from (h, k), keyed by (h mod k, k).

    Values are the integers t = 12 k s(h, k) (an integer by the formula above),
    so that nothing is reduced that nobody asked for: s = t / (12 k).  One pass
    down Euclid's algorithm and one back up with reciprocity in integer form,

        h t(h, k) + k t(k mod h, h) = h^2 + k^2 + 1 - 3 h k,

    each division exact (an inexact one would be a bug, and raises).
    """
    h, k = _reduced_pair(h, k)
    pairs = []
    while k > 1:
        pairs.append((h, k))
        h, k = k % h, h
        if not len(pairs) & 1023:
            check_time()
    values = {(0, 1): 0}
    below = 0                       # t at the pair below, 12 h s(k mod h, h)
    for index, (h, k) in enumerate(reversed(pairs), 1):
        if not index & 1023:
            check_time()
        below, rest = divmod(h * h + k * k + 1 - 3 * h * k - k * below, h)
        if rest:
            raise ArithmeticError(f"12 k s(h, k) is not an integer at ({value_text(h)}, {value_text(k)})")
        values[(h, k)] = below
    return values


def reciprocity_descent(h: int, k: int, wanted=None) -> list[tuple[int, int, int, int]]:
    """The pairs met by reciprocity and reduction from s(h, k), top down, with their constants.

    For h, k >= 1 coprime, (a_0, b_0) = (h, k) and (a_(i+1), b_(i+1)) = (b_i mod a_i, a_i);
    reciprocity followed by reduce gives s(a_i, b_i) = T_i - s(a_(i+1), b_(i+1)) with
    T_i = (a_i^2 + b_i^2 + 1 - 3 a_i b_i) / (12 a_i b_i) (Dedekind's law), so

        s(h, k) = n_i / (12 k b_i) + (-1)^i s(a_i, b_i),   n_i = 12 k b_i (T_0 - T_1 + ... +- T_(i-1)).

    Returns (a_i, b_i, n_i, (-1)^i) for each i >= 1 whose pair is in `wanted` (every i when
    it is None), walking down to (0, 1) or past the smallest b of `wanted`.  With
    q_i = b_i div a_i, T_i = q_i/12 - 1/4 + a_i/(12 b_i) + a_(i+1)/(12 b_(i+1)) + 1/(12 a_i b_i):
    the middle terms telescope, and so does the last, by the cofactors W_0 = 0, W_1 = 1,
    W_(i+1) = W_(i-1) - q_(i-1) W_i (as in the extended Euclidean algorithm), which satisfy
    W_i / (k b_i) = sum_(j<i) (-1)^j / (a_j b_j).  Hence, with Q_i = q_0 - q_1 + ... +- q_(i-1),

        n_i = k b_i (Q_i - 3 [i odd]) + h b_i - (-1)^i k a_i + W_i,

    integers only: the walk costs one Euclidean algorithm with one cofactor.

    >>> reciprocity_descent(5, 17)
    [(2, 5, 60, -1), (1, 2, 24, 1), (0, 1, 12, -1)]
    >>> Fraction(60, 12 * 17 * 5) - dedekind(2, 5) == dedekind(5, 17) == Fraction(1, 17)
    True
    """
    if h < 1 or k < 1:
        raise DomainError(f"the descent from s(h, k) needs h >= 1 and k >= 1, not h = {value_text(h)}, "
                          f"k = {value_text(k)}")
    floor = min((y for _, y in wanted), default=k + h + 1) if wanted is not None else 0
    long = max(h.bit_length(), k.bit_length()) > _GMP_BITS and _load_gmp() is not None
    a, b = (_gmp_mpz(h), _gmp_mpz(k)) if long else (h, k)
    sign, alternating, w_last, w, q_last = 1, 0, 1, 0, 0
    out, steps = [], 0
    while a and b >= floor:
        q, r = divmod(b, a)
        alternating += sign * q
        w_last, w, q_last = w, w_last - q_last * w, q
        a, b, sign = r, a, -sign
        if wanted is None or (a, b) in wanted:
            n = k * b * (alternating - (3 if sign < 0 else 0)) + h * b - sign * k * a + w
            out.append((int(a), int(b), int(n), sign))
        steps += 1
        if not steps & 1023:
            check_time()
    return out


def _saw2(num: int, den: int) -> int:
    """2*den*((num/den)) as an integer."""
    r = num % den
    return 2 * r - den if r else 0


def dedekind_rademacher(h, k, x, y) -> Fraction:
    """s(h, k; x, y) = sum_{j mod k} ((h (j + y)/k + x)) (((j + y)/k)).

    Rademacher's two-parameter sum (Rademacher, "Some remarks on certain
    generalized Dedekind sums", Acta Arith. 9, 1964) for integers h, k >= 1
    and rationals x, y; s(h, k; 0, 0) = s(h, k).  Summed exactly in O(k).
    """
    h = as_integer(h, "the first argument of dedekind_rademacher")
    k = as_positive(k, "the second argument of dedekind_rademacher")
    x = as_rational(x, "the third argument of dedekind_rademacher")
    y = as_rational(y, "the fourth argument of dedekind_rademacher")
    q1, q2 = x.denominator, y.denominator
    p1, p2 = x.numerator, y.numerator
    den = k * q1 * q2
    total = 0
    for j in range(k):
        if not j & 4095:
            check_time()
        base = (j * q2 + p2) * q1          # (j + y) * q1 * q2
        total += _saw2(h * base + p1 * k * q2, den) * _saw2(base, den)
    return Fraction(total, 4 * den * den)


def _bernoulli_polynomial_scaled(p: int, k: int) -> tuple[list[int], int]:
    """Integer coefficients c and D with D k^p B_p(r/k) = sum_j c[j] r^j."""
    bs = bernoulli_numbers(p)
    d = 1
    for b in bs:
        d = d * b.denominator // gcd(d, b.denominator)
    coeffs = [0] * (p + 1)
    for j in range(p + 1):   # B_p(x) = sum_j C(p, j) B_j x^(p-j)
        b = bs[j]
        coeffs[p - j] = comb(p, j) * b.numerator * (d // b.denominator) * k ** j
    return coeffs, d


def generalized_dedekind_by_definition(p, h, k) -> Fraction:
    """Apostol's s_p(h, k) = sum_{j=0}^{k-1} (j/k) Bbar_p(h j/k), term by term."""
    p = as_integer(p, "the order of a generalized Dedekind sum")
    if p < 1:
        raise DomainError(f"the order of a generalized Dedekind sum must be >= 1, not {value_text(p)}")
    h = as_integer(h, "the second argument of generalized_dedekind")
    k = as_positive(k, "the third argument of generalized_dedekind")
    coeffs, d = _bernoulli_polynomial_scaled(p, k)
    at_zero = 0 if p == 1 else coeffs[0]   # Bbar_1(0) = 0, Bbar_p(0) = B_p
    total = 0
    for j in range(1, k):
        if not j & 255:
            check_time()
        r = h * j % k
        if r == 0:
            value = at_zero
        else:
            value = 0
            for c in reversed(coeffs):
                value = value * r + c
        total += j * value
    return Fraction(total, d * k ** (p + 1))


def generalized_dedekind(p, h, k) -> Fraction:
    """Apostol's generalized Dedekind sum s_p(h, k) = sum_{j mod k} (j/k) Bbar_p(hj/k).

    Apostol, "Generalized Dedekind sums and transformation formulae of
    certain Lambert series", Duke Math. J. 17 (1950); s_1 = s.  For odd p and
    coprime h, k his reciprocity law gives the value along Euclid's algorithm
    in O(p log k) steps; otherwise (and for small k, where the sum is cheap and
    independent of the law the `reciprocity` rule uses) the sum itself, O(k p).
    """
    p = as_integer(p, "the order of a generalized Dedekind sum")
    h = as_integer(h, "the second argument of generalized_dedekind")
    k = as_positive(k, "the third argument of generalized_dedekind")
    if p >= 1 and p % 2 == 1 and k > _SUM_BELOW and gcd(h, k) == 1:
        return generalized_dedekind_by_reciprocity(p, h, k)
    return generalized_dedekind_by_definition(p, h, k)


_SUM_BELOW = 64          # up to this k the O(k p) sum is as fast


def generalized_dedekind_by_reciprocity(p: int, h: int, k: int) -> Fraction:
    """s_p(h, k) for odd p >= 1 and coprime h, k >= 1 by Apostol's reciprocity law (1950):

        (p + 1) (h k^p s_p(h, k) + k h^p s_p(k, h))
            = sum_{j=0}^{p+1} C(p+1, j) (-1)^j B_j B_{p+1-j} h^j k^{p+1-j} + p B_{p+1},

    with s_p(h, k) depending on h mod k only, down Euclid's chain to s_p(0, 1) = 0.
    """
    if p < 1 or p % 2 == 0 or k < 1 or gcd(h, k) != 1:
        raise DomainError("Apostol's reciprocity needs an odd order and coprime arguments")
    b = bernoulli_numbers(p + 1)
    coefficients = [comb(p + 1, j) * (-1) ** j * b[j] * b[p + 1 - j] for j in range(p + 2)]
    denominator = 1
    for c in coefficients:
        denominator = denominator * c.denominator // gcd(denominator, c.denominator)
    ints = [int(c * denominator) for c in coefficients]          # exact: c * lcm is whole
    constant = p * b[p + 1] * denominator
    pairs = []
    h %= k
    while k > 1:
        pairs.append((h, k))
        h, k = k % h, h
    value = Fraction(0)                                           # s_p(0, 1)
    for h, k in reversed(pairs):
        right = _homogeneous(ints, h, k)                          # sum_j C_j h^j k^(p+1-j)
        law = (Fraction(right) + constant) / (denominator * (p + 1))
        value = (law - k * h ** p * value) / (h * k ** p)
    return value


def _homogeneous(ints: list, h: int, k: int) -> int:
    """sum_j ints[j] h^j k^(len-1-j)."""
    n = len(ints) - 1
    h_powers = [1]
    for _ in range(n):
        h_powers.append(h_powers[-1] * h)
    total, k_power = 0, 1
    for j in range(n, -1, -1):
        total += ints[j] * h_powers[j] * k_power
        k_power *= k
    return total
