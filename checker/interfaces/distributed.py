"""Checking a table of claims on a Dask cluster, for tables too large for one machine.

The driver reads the table as a stream and sends batches of rows to the
cluster, at most a few per worker at a time; each worker runs the same
``check_rows`` as a local check, so the verdicts, and their order, are the
local ones.  Needs the optional extra:  pip install "quasicert[dask]".

    from dask.distributed import Client
    from checker.interfaces.distributed import check_table_on
    report = check_table_on(Client("tcp://scheduler:8786"), "values.csv")
"""
from __future__ import annotations

from pathlib import Path

from ..foundation.errors import CertificateError
from ..foundation.limits import DEFAULT_LIMITS, Limits
from ..replay.report import Failure, Report
from .files import require_something
from .tables import _batches, check_rows, table_rows

__all__ = ["check_table_on"]


def check_table_on(client, path, limits: Limits = DEFAULT_LIMITS, batch_rows: int = 20_000,
                   in_flight_per_worker: int = 2, allow_empty: bool = False) -> Report:
    """Check every row of a CSV or JSON Lines table with the workers of a dask.distributed Client.

    Like a local check, a table without rows fails (exit code 4) unless allow_empty.
    """
    from collections import deque
    path = Path(path)
    report = Report(name=str(path))
    workers = max(1, len(client.scheduler_info().get("workers", {})))
    window = workers * in_flight_per_worker
    pending = deque()

    def collect(future):
        ok, failures = future.result()
        report.checked += ok
        report.failures.extend(failures)

    try:
        for batch in _batches(table_rows(path), batch_rows):
            pending.append(client.submit(check_rows, batch, limits, pure=False))
            if len(pending) >= window:
                collect(pending.popleft())
        while pending:
            collect(pending.popleft())
    except CertificateError as e:
        report.failures.append(Failure(e.line, e.column, e.message, kind=e.kind, exit_code=2))
    return require_something(report, allow_empty)
