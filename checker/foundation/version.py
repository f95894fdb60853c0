"""The version of quasicert (also in pyproject.toml)."""
__version__ = "0.1.0"
