"""quasicert: exact replay of certificates about Dedekind-type sums and lattice-point counts.

Public surface:

- ``check_text(text, name)`` and ``check_file(path)``: replay a certificate,
  or check every row of a table (a path ending in .csv or .jsonl), returning
  a ``Report`` (``.ok``, ``.checked``, ``.failures``; ``str(report)`` is the
  text quasicert prints).  Checking nothing is a failure (``allow_empty=True``
  accepts it).
- ``evaluate(text)``: the exact value of an expression, a Fraction.
- ``functions``: the kernel functions under their names in the language,
  plain callables on ints and Fractions.
- ``CertificateError`` and its subclasses: every error a user can cause.
- ``Limits``: the budgets that bound costly requests.
"""
from .foundation.errors import (BudgetExceeded, CertificateError, DomainError, RuleRefused, SyntaxProblem,
                                UsageError)
from .foundation.limits import DEFAULT_LIMITS, Limits
from .foundation.version import __version__
from .kernel import functions
from .interfaces.files import check_file, check_text
from .replay.report import Failure, Report
from .replay.values import evaluate, evaluate_value
from .interfaces.builder import Certificate

__all__ = [
    "evaluate", "evaluate_value", "functions", "check_text", "check_file", "Report", "Failure",
    "Certificate",
    "CertificateError", "SyntaxProblem", "DomainError", "BudgetExceeded", "RuleRefused", "UsageError",
    "Limits", "DEFAULT_LIMITS", "__version__",
]

