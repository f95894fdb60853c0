"""Errors a certificate can cause, each carrying the place it points at.

One root, ``CertificateError``; subclasses say in which phase the problem was
found.  Positions are 1-based (line, column), as in Lark's own exceptions; a
problem with no place in a text (a Python caller handing a bad argument to a
kernel function) has ``line = column = None``.  ``exit_code`` lives on the
class and is read in one place, the command line's ``main``.
"""
from __future__ import annotations

__all__ = [
    "unwritable_number",
    "CertificateError",
    "SyntaxProblem",
    "DomainError",
    "BudgetExceeded",
    "OutOfTime",
    "RuleRefused",
    "UnreadableFile",
    "CheckerBug",
    "UsageError",
]


class CertificateError(Exception):
    """Root of every error a user can cause.  Never a traceback for users."""

    exit_code = 2
    kind = "error"

    def __init__(self, message: str, line: int | None = None, column: int | None = None,
                 end_column: int | None = None, source: str | None = None):
        super().__init__(message)
        self.message = message
        self.line = line
        self.column = column
        self.end_column = end_column
        self.source = source  # file name, filled in by whoever knows it

    def at(self, node) -> "CertificateError":
        """Attach the position of an AST node, unless a closer one is known."""
        pos = getattr(node, "pos", node)
        if self.line is None and pos is not None and getattr(pos, "line", 0):
            self.line = pos.line
            self.column = pos.column
            self.end_column = pos.end_column if pos.end_line == pos.line else None
        return self

    def context(self, text: str) -> str:
        """The source line with a caret mark under the offending part."""
        if not self.line or not self.column:
            return ""
        lines = text.splitlines()
        if self.line > len(lines):
            return ""
        src = lines[self.line - 1]
        shown = src if len(src) <= 200 else src[: 200] + " ..."
        width = 1
        if self.end_column and self.end_column > self.column:
            width = self.end_column - self.column
        start = self.column - 1
        if start >= len(shown):
            start = len(shown)
        width = max(1, min(width, len(shown) - start)) if start < len(shown) else 1
        return f"    {shown}\n    {' ' * start}{'^' * width}"

    def where(self) -> str:
        name = self.source or "<text>"
        if self.line:
            return f"{name}:{self.line}:{self.column}"
        return name

    def __str__(self) -> str:
        return self.message


class SyntaxProblem(CertificateError):
    """The text does not follow the certificate language."""

    kind = "syntax error"


class DomainError(CertificateError):
    """A function was asked for a value outside its definition."""

    kind = "error"


def unwritable_number(e: BaseException) -> "DomainError | None":
    """The error to report for Python's refusal to write an int of over 4,300 digits as text
    (CPython 3.11+, ValueError), met while a message about such a number was being written;
    None for any other exception.  quasicert bounds its numbers itself (literal-digits,
    integer-bits) but keeps Python's cap, which guards every other conversion of text."""
    if isinstance(e, ValueError) and "integer string conversion" in str(e):
        return DomainError("a number here has more than 4,300 digits, more than Python converts between text "
                           "and integer at once (a message about it could not be written); nothing here was verified")
    return None


class BudgetExceeded(CertificateError):
    """A request would cost more than the configured limit allows."""

    kind = "limit"


class OutOfTime(BudgetExceeded):
    """The `seconds` limit passed during a check: the whole check stops, not only one value."""


class RuleRefused(CertificateError):
    """A rule's side condition does not hold, so the rule may not be used."""

    kind = "rule refused"
    exit_code = 1


class UnreadableFile(CertificateError):
    """The file cannot be read as UTF-8 text, or is over the size limit."""

    kind = "unreadable"


class CheckerBug(CertificateError):
    """Two independent computations of one value disagree: quasicert itself is wrong."""

    kind = "checker bug"
    exit_code = 3

    @classmethod
    def found(cls, what: str) -> "CheckerBug":
        """The error for an internal check that failed, worded for the person who meets it."""
        return cls(f"{what}: this is a bug in quasicert, please report it")


class UsageError(CertificateError):
    """The command line itself was misused."""

    kind = "usage"
