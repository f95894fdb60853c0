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
