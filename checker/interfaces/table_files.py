"""Which files are tables: kept apart from `tables` so that recognising one costs no import of the
table checker (its patterns are compiled at import, a noticeable part of start-up)."""
from __future__ import annotations

from pathlib import Path

__all__ = ["TABLE_SUFFIXES", "is_table"]

TABLE_SUFFIXES = (".csv", ".jsonl")


def is_table(path) -> bool:
    """Whether a path names a table (CSV or JSON Lines), by its suffix.

    >>> is_table("results/run-7.CSV"), is_table("claims.qcert")
    (True, False)
    """
    return Path(path).suffix.lower() in TABLE_SUFFIXES
