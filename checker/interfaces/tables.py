"""Tables of claims: CSV and JSON Lines files of values that another program computed.

CSV, with a header row, in one of two layouts:

    expression,value                    dedekind(5, 17),1/17
    function,<any argument names>,value dedekind,5,17,1/17

JSON Lines, one object a line:

    {"expression": "dedekind(5, 17)", "value": "1/17"}
    {"function": "dedekind", "args": [5, 17], "value": "1/17"}

Values are integers or fractions p/q (JSON numbers are accepted when they are
integers; floats are refused, as everywhere in quasicert).  Plain rows (a
function and literal numbers or lists) skip the full parser; anything else
goes through it.  The file is read as a stream, one row at a time.
"""
from __future__ import annotations

import csv
import json
import re
from fractions import Fraction
from pathlib import Path
from typing import Iterator

from ..foundation.errors import CertificateError, UnreadableFile
from ..kernel.evaluation import Evaluator
from ..kernel.functions import REGISTRY
from ..foundation.limits import DEFAULT_LIMITS, Limits
from ..foundation.numbers import text_int, value_text
from ..replay.report import Failure, Report

__all__ = ["TABLE_SUFFIXES", "check_table", "table_rows", "check_rows"]

TABLE_SUFFIXES = (".csv", ".jsonl")

_NUMBER = re.compile(r"\s*(-?\d+)(?:\s*/\s*(\d+))?\s*$")
_LIST = re.compile(r"\s*\[\s*(-?\d+(?:\s*/\s*\d+)?(?:\s*,\s*-?\d+(?:\s*/\s*\d+)?)*)?\s*\]\s*$")
_CALL = re.compile(r"\s*([A-Za-z_][A-Za-z_0-9]*)\s*\((.*)\)\s*$")


class _RowError(Exception):
    def __init__(self, column: int, message: str):
        self.column, self.message = column, message


def _number(text: str):
    m = _NUMBER.match(text)
    if not m:
        return None
    head, tail = m.group(1), m.group(2)
    num = int(head) if len(head) < 4000 else (-1 if head[0] == "-" else 1) * text_int(head.lstrip("-"))
    if tail is None:
        return num
    den = int(tail) if len(tail) < 4000 else text_int(tail)
    if den == 0:
        raise ValueError("division by zero")
    return Fraction(num, den)


def _literal(text: str, ev: Evaluator):
    """A number or a list of numbers without the parser, else the full expression language."""
    v = _number(text)
    if v is not None:
        return v
    if _LIST.match(text):
        inner = text.strip()[1:-1].strip()
        return tuple(Fraction(_number(x)) for x in inner.split(",")) if inner else ()
    from ..language.parsing import parse_expression
    return ev.value(parse_expression(text, ev.limits))


def _split_arguments(text: str) -> list[str]:
    """Top-level comma split (lists inside keep their commas)."""
    parts, depth, start = [], 0, 0
    for i, ch in enumerate(text):
        if ch in "([":
            depth += 1
        elif ch in ")]":
            depth -= 1
        elif ch == "," and depth == 0:
            parts.append(text[start:i])
            start = i + 1
    last = text[start:]
    if last.strip() or parts:
        parts.append(last)
    return parts


def _json_value(v, column, what):
    if isinstance(v, bool) or isinstance(v, float):
        raise _RowError(column, f"{what} must be an integer or a string like \"3/17\", not {json.dumps(v)}")
    if isinstance(v, int):
        return Fraction(v)
    if isinstance(v, str):
        return v
    if isinstance(v, list):
        return tuple(_json_value(x, column, what) for x in v)
    raise _RowError(column, f"{what} must be a number, a string or a list, not {json.dumps(v)}")


def table_rows(path: Path) -> Iterator[tuple]:
    """(line, kind, payload) for each row: kind 'expression' or 'function'."""
    suffix = path.suffix.lower()
    try:
        handle = open(path, encoding="utf-8", newline="")
    except OSError as e:
        raise UnreadableFile(f"cannot read the file: {e.strerror}") from None
    with handle:
        try:
            if suffix == ".csv":
                yield from _csv_rows(handle)
            else:
                yield from _jsonl_rows(handle)
        except UnicodeDecodeError:
            raise UnreadableFile("the file is not UTF-8 text") from None


def _csv_rows(handle):
    reader = csv.reader(handle)
    header = next(reader, None)
    if header is None:
        return
    names = [h.strip().lower() for h in header]
    if names == ["expression", "value"]:
        layout = "expression"
    elif len(names) >= 2 and names[0] == "function" and names[-1] == "value":
        layout = "function"
    else:
        raise CertificateError("the header must be 'expression,value' or 'function,<arguments...>,value', "
                               f"not '{','.join(header)}'", 1, 1)
    for row in reader:
        line = reader.line_num
        if not row or all(not c.strip() for c in row):
            continue
        if len(row) != len(names):
            yield line, "bad", (1, f"the row has {len(row)} columns, the header {len(names)}")
            continue
        if layout == "expression":
            yield line, "expression", (row[0], row[1])
        else:
            yield line, "function", (row[0].strip(), row[1:-1], row[-1])


def _jsonl_rows(handle):
    for line, text in enumerate(handle, 1):
        if not text.strip():
            continue
        try:
            obj = json.loads(text)
        except json.JSONDecodeError as e:
            yield line, "bad", (e.colno, f"not JSON: {e.msg}")
            continue
        if not isinstance(obj, dict) or "value" not in obj:
            yield line, "bad", (1, "each line must be an object with \"value\" and \"expression\" or \"function\"")
            continue
        try:
            value = _json_value(obj["value"], 1, "value")
            if "expression" in obj:
                yield line, "expression", (str(obj["expression"]), value)
            elif "function" in obj:
                args = obj.get("args", [])
                if not isinstance(args, list):
                    raise _RowError(1, "\"args\" must be a list")
                yield line, "function", (str(obj["function"]), [_json_value(a, 1, "an argument") for a in args],
                                         value)
            else:
                yield line, "bad", (1, "each line needs \"expression\" or \"function\"")
        except _RowError as e:
            yield line, "bad", (e.column, e.message)


def _check_row(kind, payload, ev: Evaluator):
    """None when the row holds, else (column, message, claimed, exact)."""
    if kind == "bad":
        column, message = payload
        return column, message, None, None
    if kind == "expression":
        text, claimed_text = payload
        m = _CALL.match(text)
        spec = REGISTRY.get(m.group(1)) if m else None
        if spec is not None:
            try:
                args = tuple(_literal(a, ev) for a in _split_arguments(m.group(2)))
            except (CertificateError, ValueError, TypeError):
                args = None
            exact = ev.call(spec.name, args) if args is not None else None
            if exact is None:
                from ..language.parsing import parse_expression
                exact = ev.number(parse_expression(text, ev.limits))
        else:
            from ..language.parsing import parse_expression
            exact = ev.number(parse_expression(text, ev.limits))
        value_column = 2
    else:
        name, arg_texts, claimed_text = payload
        if name not in REGISTRY:
            from ..kernel.evaluation import _unknown_function
            return 1, _unknown_function(name), None, None
        args = []
        for i, a in enumerate(arg_texts, 2):
            try:
                args.append(a if isinstance(a, Fraction) or isinstance(a, tuple) else _literal(a, ev))
            except CertificateError as e:
                return i, f"argument {i - 1}: {e.message}", None, None
            except ValueError as e:
                return i, f"argument {i - 1}: {e}", None, None
        # no memo: the rows of a table rarely repeat, and a memo of millions would grow without end
        exact = REGISTRY[name].call(tuple(args), ev.limits)
        value_column = len(arg_texts) + 2
    try:
        claimed = claimed_text if isinstance(claimed_text, (int, Fraction)) else _literal(claimed_text, ev)
    except CertificateError as e:
        return value_column, f"the value: {e.message}", None, None
    except ValueError as e:
        return value_column, f"the value: {e}", None, None
    if isinstance(exact, tuple) or isinstance(claimed, tuple):
        return value_column, "a list stands where a number is needed", None, None
    if claimed == exact:
        return None
    return value_column, "the claimed value is wrong", Fraction(claimed), exact


def check_rows(rows, limits: Limits = DEFAULT_LIMITS) -> tuple[int, list]:
    """(rows verified, failures) for an iterable of (line, kind, payload)."""
    ev = Evaluator({}, limits)
    ok, failures = 0, []
    for line, kind, payload in rows:
        try:
            problem = _check_row(kind, payload, ev)
        except CertificateError as e:
            failures.append(Failure(line, 1, f"row at line {line}: {e.message}", kind=e.kind,
                                    exit_code=2 if e.kind == "limit" else 1))
            continue
        if problem is None:
            ok += 1
            continue
        column, message, claimed, exact = problem
        details = []
        if claimed is not None:
            details = [f"claimed: {value_text(claimed)}", f"exact:   {value_text(exact)}",
                       f"difference (claimed - exact): {value_text(claimed - exact)}"]
        failures.append(Failure(line, column, f"row at line {line}, column {column}: {message}", details,
                                kind="failed" if claimed is not None else "error",
                                claimed=claimed, exact=exact))
    return ok, failures


def _batches(rows, size):
    batch = []
    for row in rows:
        batch.append(row)
        if len(batch) == size:
            yield batch
            batch = []
    if batch:
        yield batch


def _check_batch(args):
    batch, limits = args
    return check_rows(batch, limits)


def check_table(path, limits: Limits = DEFAULT_LIMITS, jobs: int = 1, progress=None) -> Report:
    """Check every row of a CSV or JSON Lines table; the report lists each wrong row."""
    import time
    path = Path(path)
    report = Report(name=str(path))
    start = time.perf_counter()
    try:
        rows = table_rows(path)
        if jobs <= 1:
            for batch in _batches(rows, 2000):
                ok, failures = check_rows(batch, limits)
                report.checked += ok
                report.failures.extend(failures)
                if progress:
                    progress(len(batch))
        else:
            from concurrent.futures import ProcessPoolExecutor
            with ProcessPoolExecutor(jobs) as pool:
                work = ((batch, limits) for batch in _batches(rows, 5000))
                for ok, failures in bounded_map(pool, _check_batch, work, 2 * jobs):
                    report.checked += ok
                    report.failures.extend(failures)
                    if progress:
                        progress(ok + len(failures))
    except CertificateError as e:
        report.failures.append(Failure(e.line, e.column, e.message, kind=e.kind, exit_code=2))
    report.seconds = time.perf_counter() - start
    return report


def bounded_map(pool, fn, items, window: int):
    """pool.map in input order with at most `window` tasks in flight (memory stays flat)."""
    from collections import deque
    pending = deque()
    for item in items:
        pending.append(pool.submit(fn, item))
        if len(pending) >= window:
            yield pending.popleft().result()
    while pending:
        yield pending.popleft().result()
