import os
import sys
from fractions import Fraction

from hypothesis import HealthCheck, settings

sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.abspath(__file__))))

settings.register_profile("default", deadline=None, suppress_health_check=[HealthCheck.too_slow])
settings.load_profile("default")


def exact(value, expected):
    """Assert type and value: kernel functions return Fractions, never floats."""
    assert isinstance(value, Fraction), f"{value!r} is a {type(value).__name__}, not a Fraction"
    assert value == expected, f"{value} != {expected}"


def flint_fraction(q):
    return Fraction(int(q.p), int(q.q))


def sympy_series(parts, count):
    """sympy: coefficients of 1/prod(1 - x^a) below x^count, as the product of truncated
    geometric series 1 + x^a + x^(2a) + ... (sympy's series() is too slow at 200 terms)."""
    import sympy
    x = sympy.symbols("x")
    poly = sympy.Poly(1, x)
    for a in parts:
        geometric = sympy.Poly(sum(x ** (a * k) for k in range((count - 1) // a + 1)), x)
        poly = sympy.Poly((poly * geometric).as_expr(), x)
        poly = sympy.Poly(sum(poly.coeff_monomial(x ** k) * x ** k for k in range(count)), x)
    return [int(poly.coeff_monomial(x ** k)) for k in range(count)]
