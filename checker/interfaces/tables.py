"""Tables of claims: CSV and JSON Lines files of values that another program computed.

CSV, with a header row, in one of two layouts:

    expression,value                    dedekind(5, 17),1/17
    function,h,k,value                  dedekind,5,17,1/17

In the second layout the argument columns are named after the function's
parameters (`quasicert functions` lists them: h, k for dedekind; a list
parameter by its letter, A for partitions, P for the lattice-point counts) or
arg1, arg2, ... for tables that mix functions.  A header that names them in
another order (`function,k,h,value`) is refused row by row, never read.

JSON Lines, one object a line, with exactly these keys:

    {"expression": "dedekind(5, 17)", "value": "1/17"}
    {"function": "dedekind", "args": [5, 17], "value": "1/17"}

A row means one thing or it is refused: both "expression" and "function",
an unknown key, a key given twice, a digit of another script (only ASCII
0-9 are digits), a line break other than the row's own, a decimal (0.5 and
1e3 are not exact values; JSON floats likewise).  Values are integers or
fractions p/q.  A UTF-8 byte-order mark at the start is skipped.

Rows of a function and literal integers take a short path (the value is
compared by cross-multiplication, without building the claimed fraction);
anything else goes through the expression parser.  The file is read as a
stream; a failing row is located at the character where its wrong field
starts and carries the row as written.
"""
from __future__ import annotations

import csv
import io
import json
import os
import re
import unicodedata
from fractions import Fraction
from pathlib import Path
from contextlib import nullcontext
from typing import Iterator

from ..foundation.errors import CertificateError, DomainError, OutOfTime, UnreadableFile
from ..foundation.limits import DEFAULT_LIMITS, Limits, check_time, current_deadline, time_limit
from ..foundation.numbers import text_int, value_text
from ..kernel.evaluation import Evaluator
from ..kernel.functions import REGISTRY
from ..mathematics.dedekind import dedekind_equals
from ..replay.report import Failure, Report

__all__ = ["TABLE_SUFFIXES", "is_table", "check_table", "default_jobs", "table_rows", "check_rows",
           "parameter_names"]

from .table_files import TABLE_SUFFIXES, is_table

_INT = re.compile(r"[ \t]*(-?[0-9]+)[ \t]*", re.ASCII)
_NUMBER = re.compile(r"[ \t]*(-?[0-9]+)(?:[ \t]*/[ \t]*([0-9]+))?[ \t]*", re.ASCII)
_LIST = re.compile(r"[ \t]*\[[ \t]*(-?[0-9]+(?:[ \t]*/[ \t]*[0-9]+)?"
                   r"(?:[ \t]*,[ \t]*-?[0-9]+(?:[ \t]*/[ \t]*[0-9]+)?)*)?[ \t]*\][ \t]*", re.ASCII)
_DECIMAL = re.compile(r"[ \t]*[-+]?(?:[0-9]*\.[0-9]+|[0-9]+\.[0-9]*|[0-9]+(?=[eE]))(?:[eE][-+]?[0-9]+)?[ \t]*",
                      re.ASCII)
_NON_FINITE = re.compile(r"[ \t]*[-+]?(?:inf|infinity|nan)[ \t]*", re.IGNORECASE)
_CALL = re.compile(r"\s*([A-Za-z_][A-Za-z_0-9]*)\s*\((.*)\)\s*$", re.ASCII | re.DOTALL)
# anything outside printable ASCII and tab gets the slow, careful look
_UNUSUAL = re.compile(r"[^\x20-\x7e\t]")
_LINE_BREAKS = "\n\r\x0b\x0c\x1c\x1d\x1e\x85\u2028\u2029"   # what str.splitlines splits on


class _RowError(Exception):
    """A row that cannot be read; `where` names the field (see _locate)."""

    def __init__(self, where, message: str, exit_code: int = 1):
        self.where, self.message, self.exit_code = where, message, exit_code


# -- reading numbers ---------------------------------------------------------

def _big_int(text: str) -> int:
    return int(text) if len(text) < 4000 else (-1 if text[0] == "-" else 1) * text_int(text.lstrip("-"))


def _odd_characters(text: str, where) -> None:
    """Refuse digits of other scripts and line breaks inside a field."""
    for ch in text:
        if ch in _LINE_BREAKS:
            raise _RowError(where, f"a line-break character ({_char_name(ch)}) inside a row; a row is one line")
        if not ch.isascii() and (ch.isnumeric() or unicodedata.category(ch) == "Nd"):
            raise _RowError(where, f"'{ch}' ({_char_name(ch)}) is not an ASCII digit; only 0-9 are read as digits")
        if unicodedata.category(ch) in ("Cc", "Cf") and ch != "\t":
            raise _RowError(where, f"an invisible control character ({_char_name(ch)}) inside a row")


def _char_name(ch: str) -> str:
    return f"U+{ord(ch):04X} {unicodedata.name(ch, 'unnamed')}"


def _not_exact(text: str) -> str | None:
    """The refusal for a decimal or non-finite number, else None."""
    if _DECIMAL.fullmatch(text):
        shown = text.strip()
        hint = ""
        if len(shown) <= 40:
            try:
                hint = f" ({shown} is exactly {value_text(Fraction(shown))})"
            except (ValueError, ZeroDivisionError):
                hint = ""
        return (f"'{shown}' is a decimal number; quasicert reads exact values only: write an integer or a "
                f"fraction p/q{hint}")
    if _NON_FINITE.fullmatch(text):
        return f"'{text.strip()}' is not a number; write an integer or a fraction p/q"
    return None


def _plain_int(text: str):
    """The int written in ASCII digits with an optional minus sign, else None (a short path, no regex)."""
    if len(text) < 4000 and text.isascii():
        digits = text[1:] if text[:1] == "-" else text
        if digits.isdigit():
            return int(text)
    return None


def _number(text: str):
    """An int or Fraction for `n` or `p/q` in ASCII digits, else None."""
    m = _NUMBER.fullmatch(text)
    if not m:
        return None
    num = _big_int(m.group(1))
    if m.group(2) is None:
        return num
    den = _big_int(m.group(2))
    if den == 0:
        raise _RowError(None, "division by zero")
    return Fraction(num, den)


def _no_comment(text: str, where) -> None:
    """A table field holds no comment: in the language `#` hides the rest of the text, which a
    reader of the table still sees (`5 # 3` would be read as 5)."""
    if "#" in text:
        raise _RowError(where, "a '#' starts a comment in quasicert's language, and a table field holds none "
                               "(the checker would skip what a reader of the table sees): remove the '#' "
                               "and what follows it")


def _literal(text: str, ev: Evaluator, where):
    """A number, a list of numbers, or (through the parser) any expression of the language."""
    _no_comment(text, where)
    if _UNUSUAL.search(text):
        _odd_characters(text, where)
    try:
        v = _number(text)
    except _RowError as e:
        raise _RowError(where, e.message) from None
    if v is not None:
        return v
    refusal = _not_exact(text)
    if refusal:
        raise _RowError(where, refusal)
    if _LIST.fullmatch(text):
        inner = text.strip()[1:-1].strip()
        try:
            return tuple(Fraction(_number(x)) for x in inner.split(",")) if inner else ()
        except _RowError as e:
            raise _RowError(where, e.message) from None
    from ..language.parsing import parse_expression
    try:
        return ev.value(parse_expression(text, ev.limits))
    except CertificateError as e:
        raise _RowError(where, e.message, 2 if e.kind == "limit" else 1) from None


def _json_value(v, where, what):
    if isinstance(v, bool):
        raise _RowError(where, f"{what} must be an integer or a string like \"3/17\", not {json.dumps(v)}")
    if isinstance(v, float):
        raise _RowError(where, f"{what} is the JSON float {json.dumps(v)}; floats are not exact values: write an "
                               "integer or a string like \"3/17\"")
    if isinstance(v, int):
        return v
    if isinstance(v, str):
        return v
    if isinstance(v, list):
        return tuple(_json_value(x, where, what) for x in v)
    raise _RowError(where, f"{what} must be a number, a string or a list, not {json.dumps(v)}")


# -- parameter names ---------------------------------------------------------

def _split_top(text: str, opening="([", closing=")]") -> list[str]:
    """Top-level comma split (lists and calls inside keep their commas)."""
    parts, depth, start = [], 0, 0
    for i, ch in enumerate(text):
        if ch in opening:
            depth += 1
        elif ch in closing:
            depth -= 1
        elif ch == "," and depth == 0:
            parts.append(text[start:i])
            start = i + 1
    last = text[start:]
    if last.strip() or parts:
        parts.append(last)
    return parts


def parameter_names(function: str) -> tuple[list[str], bool]:
    """The names a CSV header may give the arguments of `function`, and whether more may follow.

    From the signature `quasicert functions` prints: `h, k` gives h, k; a list
    parameter is named by its letter (`[a1, ..., ad]` gives A), a list of points
    or inequalities by P.

    >>> parameter_names("dedekind"), parameter_names("partitions")
    ((['h', 'k'], False), (['n', 'a'], False))
    """
    sig = REGISTRY[function].signature
    if " [, " in sig:                      # an optional last parameter: "n [, x]"
        sig = sig.replace(" [, ", ", ")[:-1]
    names, more = [], False
    for part in _split_top(sig):
        p = part.strip()
        if p == "...":
            more = True
        elif p.startswith("[["):
            names.append("p" if "lattice" in function else p[2].lower())
        elif p.startswith("["):
            names.append(p[1].lower())
        else:
            names.append(p.lower())
    return names, more


def _header_refusal(function: str, given: tuple) -> str | None:
    """None when the header's argument names fit `function`, else why not."""
    spec = REGISTRY[function]
    count = len(given)
    if list(given) == [f"arg{i}" for i in range(1, count + 1)]:
        return None
    names, more = parameter_names(function)
    low, high = spec.arity
    if low <= count <= high:
        want = names[:count] if count <= len(names) else None
        if more and count > len(names):
            want = names + [chr(ord(names[-1]) + i) for i in range(1, count - len(names) + 1)]
        if want is not None and list(given) == want:
            return None
    shown = ", ".join(names) + (", ..." if more else "")
    return (f"the header names the arguments of {function} '{', '.join(given)}', but its parameters are "
            f"({shown}); name the columns after them, in this order, or arg1, arg2, ...")


# -- reading rows ------------------------------------------------------------
# A row is (line, kind, payload, text, fmt): kind "expression" (text, value),
# "function" (name, args, value) or "bad" (where, message, exit code); text is
# the row as written and fmt "csv" or "jsonl", for locating fields later.
#
# The file is read as bytes in blocks that end at a line end (and, in CSV, where
# the count of '"' so far is even, so that no quoted record is cut); each block
# is decoded on its own, so a byte that is not UTF-8 is reported at its offset
# in the file and its line.  Lines end as Python's universal newlines end them
# (\n, \r\n, \r), the same in one process and in N.

_BLOCK_BYTES = 1 << 18
_LINE_END = re.compile("(\r\n|\r|\n)")


def table_rows(path) -> Iterator[tuple]:
    """The rows of a table file, in order, as tuples (see above)."""
    path = Path(path)
    reader = _Reader(path.suffix.lower(), DEFAULT_LIMITS)
    try:
        raw = open(path, "rb")
    except OSError as e:
        raise UnreadableFile(f"cannot read the file: {e.strerror}") from None
    with raw:
        for offset, data in _blocks(raw, 0, None, reader.fmt == "csv"):
            first = reader.lines + 1
            try:
                bodies, ends = reader.lines_of(offset, data)
            except _NotUtf8 as e:
                yield from reader.rows(e.bodies, e.ends, first)
                raise e.error() from None
            yield from reader.rows(bodies, ends, first)


def _blocks(raw, start: int, end, quotes: bool):
    """(offset, bytes) of raw from `start` to `end` (None: the end of the file), in pieces that end at a
    line end where, if `quotes`, the number of '"' since `start` is even; the last piece takes the rest."""
    pending, offset = b"", start
    while True:
        want = _BLOCK_BYTES if end is None else min(_BLOCK_BYTES, end - offset - len(pending))
        chunk = raw.read(want) if want > 0 else b""
        if not chunk:
            if pending:
                yield offset, pending
            return
        data = pending + chunk if pending else chunk
        cut = _last_line_end(data)
        if cut and quotes and data.count(b'"', 0, cut) % 2:
            cut = 0                 # inside a quoted record: read on until the quotes close
        if not cut:
            pending = data
            continue
        yield offset, data[:cut] if cut < len(data) else data
        offset += cut
        pending = data[cut:]


def _last_line_end(data: bytes) -> int:
    """The offset just after the last line end of data that is surely one (0 if none)."""
    cut = data.rfind(b"\n") + 1
    if not cut:
        cut = data.rfind(b"\r") + 1
        if cut == len(data):        # a \r last: the \n of \r\n may follow in the next piece
            cut = 0
    return cut


def _header(number: int, body: str, fields) -> tuple:
    """(layout, argument names, width) from the header record, or a CertificateError."""
    if isinstance(fields, Exception) or not body.strip():
        raise CertificateError("the first line must be a header: 'expression,value' or "
                               "'function,<argument names>,value'", number, 1)
    names = [h.strip().lower() for h in fields]
    if names == ["expression", "value"]:
        layout = "expression"
    elif len(names) >= 2 and names[0] == "function" and names[-1] == "value":
        layout = "function"
    else:
        raise CertificateError("the header must be 'expression,value' or 'function,<argument names>,value', "
                               f"not '{body}'", number, 1)
    return layout, tuple(names[1:-1]), len(names)


# Rows a mathematics function can verify from integers alone, without building the exact
# value: (function, its integer test).  A row takes this path only if it is written
# NAME,INT,...,INT,P[/Q] in ASCII digits; anything else, and every row the test does not
# accept, goes the general way, which also words the failure.
_INTEGER_TESTS = {"dedekind": dedekind_equals}


class _Reader:
    """Turns decoded lines into rows, CSV or JSON Lines; keeps the header and the line count."""

    def __init__(self, suffix: str, limits: Limits, header=None, offset: int = 0):
        if suffix not in TABLE_SUFFIXES:
            raise UnreadableFile(f"a table must end in .csv or .jsonl, not '{suffix}'")
        self.fmt = suffix[1:]
        self.limits = limits
        self.lines = 0                   # lines read so far
        self.at_start = offset == 0      # a byte-order mark may come first
        self.header = None
        self.fast = None
        self.refusals: dict = {}
        if header is not None:
            self.set_header(header)

    def set_header(self, header):
        self.header = header
        layout, params, width = header
        self.fast = None
        if layout == "function":
            for name, test in _INTEGER_TESTS.items():
                if REGISTRY[name].arity == (width - 2, width - 2) and _header_refusal(name, params) is None:
                    ints = ",".join(["(-?[0-9]+)"] * (width - 2))
                    self.fast = (re.compile(f"{re.escape(name)},{ints},(-?[0-9]+)(?:/([0-9]+))?",
                                            re.ASCII).fullmatch, test)

    def lines_of(self, offset: int, data: bytes) -> tuple[list, object]:
        """(lines without their ends, their ends: one string for all, or a list) of a block."""
        try:
            text = data.decode("utf-8")
        except UnicodeDecodeError as e:
            # the whole lines before the bad byte are rows; then the table ends with the error
            good = _last_line_end(data[:e.start])
            bodies, ends = self.lines_of(offset, data[:good]) if good else ([], "\n")
            raise _NotUtf8(offset + e.start, self.lines + 1, bodies, ends) from None
        if self.at_start:
            self.at_start = False
            if text.startswith("\ufeff"):
                text = text[1:]
        if "\r" not in text:
            bodies, ends = text.split("\n"), "\n"
        elif text.count("\r") == text.count("\r\n") == text.count("\n"):
            bodies, ends = text.split("\r\n"), "\r\n"
        else:
            parts = _LINE_END.split(text)
            bodies, ends = parts[0::2], parts[1::2] + [""]
        if bodies[-1] == "":
            bodies.pop()                 # the text ended with a line end
        elif isinstance(ends, str):
            ends = [ends] * (len(bodies) - 1) + [""]
        self.lines += len(bodies)
        return bodies, ends

    def rows(self, bodies: list, ends, first: int):
        """The rows of a block of lines (blank and header lines give none), line numbers from `first`."""
        i, n = 0, len(bodies)
        while i < n:
            row, i = self.record(bodies, ends, i, first)
            if row is not None:
                yield row

    def record(self, bodies: list, ends, i: int, first: int) -> tuple:
        """(the row that starts at line i of the block or None, the index after it)."""
        body, number = bodies[i], first + i
        i += 1
        if self.fmt == "jsonl":
            return _jsonl_row(number, body), i
        if '"' in body:
            uniform = ends if isinstance(ends, str) else None
            text = body + (uniform or ends[i - 1])
            while text.count('"') % 2 and i < len(bodies):
                text += bodies[i] + (uniform or ends[i])
                i += 1
            body = text.rstrip("\r\n")
            try:
                fields = next(csv.reader([body], strict=True), [])
            except csv.Error as e:
                fields = e
        else:
            fields = body.split(",")
        if self.header is None:
            self.set_header(_header(number, body, fields))
            return None, i
        return self.csv_row(number, body, fields), i

    def csv_row(self, line: int, body: str, row):
        if isinstance(row, Exception):
            return line, "bad", (None, f"not a CSV row: {row}", 1), body, "csv"
        if len(row) == 1 and not row[0].strip():
            return None
        layout, _, width = self.header
        if len(row) != width:
            return line, "bad", (None, f"the row has {len(row)} columns, the header {width}", 1), body, "csv"
        if layout == "expression":
            return line, "expression", (row[0], row[1]), body, "csv"
        name = row[0].strip()
        if name in REGISTRY:
            if name not in self.refusals:
                self.refusals[name] = _header_refusal(name, self.header[1])
            if self.refusals[name]:
                return line, "bad", (0, self.refusals[name], 1), body, "csv"
        return line, "function", (name, row[1:-1], row[-1]), body, "csv"


class _NotUtf8(Exception):
    """A block with a byte that is not UTF-8: its whole lines before it, and where it is."""

    def __init__(self, byte: int, line: int, bodies: list, ends):
        self.byte, self.line, self.bodies, self.ends = byte, line, bodies, ends

    def error(self) -> UnreadableFile:
        return UnreadableFile(f"the file is not UTF-8 text: byte {self.byte} (counted from 0) cannot be decoded; "
                              "nothing from this line on was checked", self.line, 1)


_KEYS = ({"expression", "value"}, {"function", "args", "value"}, {"function", "value"})


def _pairs_once(pairs):
    keys = [k for k, _ in pairs]
    for k in keys:
        if keys.count(k) > 1:
            raise _RowError(k, f"the key \"{k}\" is given {keys.count(k)} times; a row must mean one thing")
    return dict(pairs)


def _jsonl_row(line: int, text: str):
    """The row of one JSON Lines line (None if blank)."""
    if not text.strip():
        return None
    try:
        obj = json.loads(text, object_pairs_hook=_pairs_once)
    except _RowError as e:
        return line, "bad", (e.where, e.message, 1), text, "jsonl"
    except json.JSONDecodeError as e:
        return line, "bad", (("@", e.colno), f"not JSON: {e.msg}", 1), text, "jsonl"
    except (ValueError, RecursionError) as e:
        return line, "bad", (None, f"not JSON that quasicert reads: {e}", 1), text, "jsonl"
    try:
        return (line, *_json_row(obj), text, "jsonl")
    except _RowError as e:
        return line, "bad", (e.where, e.message, 1), text, "jsonl"


def _json_row(obj):
    if not isinstance(obj, dict):
        raise _RowError(None, "each line must be a JSON object with \"value\" and \"expression\" or \"function\"")
    keys = set(obj)
    if "expression" in keys and "function" in keys:
        raise _RowError("function", "the row has both \"expression\" and \"function\"; a row must mean one "
                                    "thing: give one of them")
    if keys not in _KEYS:
        unknown = sorted(keys - {"expression", "function", "args", "value"})
        if unknown:
            raise _RowError(unknown[0], f"unknown key \"{unknown[0]}\"; a row has \"value\" and either "
                                        "\"expression\" or \"function\" with \"args\"")
        if "value" not in keys:
            raise _RowError(None, "the row has no \"value\"")
        if "args" in keys:
            raise _RowError("args", "\"args\" belongs to \"function\", not to \"expression\"")
        raise _RowError(None, "the row needs \"expression\" or \"function\"")
    value = _json_value(obj["value"], "value", "the value")
    if isinstance(value, tuple):
        raise _RowError("value", "the value must be a number, not a list")
    if "expression" in obj:
        if not isinstance(obj["expression"], str):
            raise _RowError("expression", "\"expression\" must be a string")
        return "expression", (obj["expression"], value)
    if not isinstance(obj["function"], str):
        raise _RowError("function", "\"function\" must be a string")
    args = obj.get("args", [])
    if not isinstance(args, list):
        raise _RowError("args", "\"args\" must be a list")
    return "function", (obj["function"], [_json_value(a, ("args", i), "an argument") for i, a in enumerate(args)],
                         value)


# -- locating a field in the row as written ------------------------------------

def _csv_spans(text: str) -> list[tuple[int, int]]:
    """(start, end) of each field's content, quotes excluded, 0-based."""
    spans, i, n = [], 0, len(text)
    while True:
        if i < n and text[i] == '"':
            j = i + 1
            while j < n:
                if text[j] == '"':
                    if j + 1 < n and text[j + 1] == '"':
                        j += 2
                        continue
                    break
                j += 1
            spans.append((i + 1, j))
            i = text.find(",", j)
        else:
            comma = text.find(",", i)
            spans.append((i, n if comma < 0 else comma))
            i = comma
        if i < 0 or i >= n:
            return spans
        i += 1


def _json_spans(text: str) -> dict:
    """{key: (start, end)} of the values of a one-line JSON object, and ("args", i) for list items."""
    decoder = json.JSONDecoder()
    ws = re.compile(r"[ \t\n\r]*")
    spans = {}
    i = ws.match(text, 0).end()
    if i >= len(text) or text[i] != "{":
        return spans
    i += 1
    try:
        while True:
            i = ws.match(text, i).end()
            if text[i] == "}":
                return spans
            key, i = json.decoder.scanstring(text, i + 1)
            i = ws.match(text, i).end() + 1          # the colon
            i = ws.match(text, i).end()
            start = i
            if key == "args" and text[i] == "[":
                i += 1
                index = 0
                while True:
                    i = ws.match(text, i).end()
                    if text[i] == "]":
                        i += 1
                        break
                    _, end = decoder.raw_decode(text, i)
                    spans[("args", index)] = (i, end)
                    index += 1
                    i = ws.match(text, end).end()
                    if text[i] == ",":
                        i += 1
            else:
                _, i = decoder.raw_decode(text, i)
            spans.setdefault(key, (start, i))
            i = ws.match(text, i).end()
            if text[i] == ",":
                i += 1
    except (IndexError, ValueError):
        return spans


def _locate(text: str, fmt: str, where) -> tuple[int, int | None]:
    """1-based (column, end column) of a field: an index (CSV) or a key (JSON Lines); (1, None) if unknown."""
    if where is None:
        return 1, None
    if isinstance(where, tuple) and where[0] == "@":
        return where[1], None
    if fmt == "csv":
        spans = _csv_spans(text)
        if not isinstance(where, int) or not -len(spans) <= where < len(spans):
            return 1, None
        start, end = spans[where]
    else:
        spans = _json_spans(text)
        if where not in spans:
            return 1, None
        start, end = spans[where]
        if end - start >= 2 and text[start] == '"':
            start, end = start + 1, end - 1
    while start < end and text[start] in " \t":
        start += 1
    while end > start and text[end - 1] in " \t":
        end -= 1
    return start + 1, (end + 1 if end > start else None)


# -- checking rows -----------------------------------------------------------

def _written(v) -> str:
    if isinstance(v, str):
        return v.strip()
    if isinstance(v, tuple):
        return "[" + ", ".join(_written(x) for x in v) + "]"
    return value_text(Fraction(v))


class _Wrong(Exception):
    """A row whose claimed value differs from the exact one."""

    def __init__(self, where, call: str, written: str, claimed, exact):
        self.where, self.call, self.written, self.claimed, self.exact = where, call, written, claimed, exact


def _claimed(value, ev: Evaluator, where):
    if isinstance(value, (int, Fraction)):
        return value
    v = _literal(value, ev, where)
    if isinstance(v, tuple):
        raise _RowError(where, "the value is a list; a number is needed")
    return v


def _compare(exact, value, ev: Evaluator, where, call: str) -> None:
    """Nothing if the row's value equals `exact`; raises _Wrong or _RowError otherwise."""
    if isinstance(exact, tuple):
        raise _RowError(0, f"{call} is a list, not a number")
    if isinstance(value, str):
        head, slash, tail = value.partition("/")
        num, den = _plain_int(head), _plain_int(tail) if slash else 1
        # cross-multiplied: no gcd for the claimed fraction
        if num is not None and den and den > 0 and num * exact.denominator == exact.numerator * den:
            return
    claimed = _claimed(value, ev, where)
    if claimed != exact:
        raise _Wrong(where, call, _written(value), Fraction(claimed), exact)


def _function_row(payload, ev: Evaluator, fmt: str):
    name, arg_texts, value = payload
    csv_row = fmt == "csv"
    spec = REGISTRY.get(name)
    if spec is None:
        from ..kernel.evaluation import _unknown_function
        raise _RowError(0 if csv_row else "function", _unknown_function(name))
    args = None
    if csv_row:
        # the common row, all arguments plain integers: one test for all of them; int() then refuses
        # a misplaced minus, an empty field and numbers over Python's digit limit (the long path reads those)
        joined = "".join(arg_texts)
        if joined.isascii() and joined.replace("-", "").isdigit():
            try:
                args = list(map(int, arg_texts))
            except ValueError:
                args = None
    if args is None:
        args = _arguments(arg_texts, ev, csv_row)
    try:
        # no memo: the rows of a table rarely repeat, and a memo of millions would grow without end
        exact = spec.call(tuple(args), ev.limits)
    except CertificateError as e:
        raise _RowError(0 if csv_row else "function", f"{_call_text(name, arg_texts)}: {e.message}",
                        2 if e.kind == "limit" else 1) from None
    if isinstance(value, str) and not isinstance(exact, tuple) and value.isascii():
        # the short path of _compare, inline: most rows of a long table are plain and right
        head, slash, tail = value.partition("/")
        if head.lstrip("-").isdigit() and head[1:2] != "-" and (not slash or tail.isdigit()):
            try:
                num, den = int(head), int(tail) if slash else 1
            except ValueError:
                num, den = 0, 0
            if den and num * exact.denominator == exact.numerator * den:
                return
    _compare(exact, value, ev, len(arg_texts) + 1 if csv_row else "value", _call_text(name, arg_texts))


def _arguments(arg_texts, ev: Evaluator, csv_row: bool) -> list:
    """The arguments of a row, each read on its own (a CSV field or a JSON value)."""
    args = []
    for i, a in enumerate(arg_texts):
        if isinstance(a, str):
            # inline short path: ASCII digits with at most a leading minus (int() alone would also
            # take spaces, '+', '_' and the digits of other scripts)
            if a.isascii() and a.lstrip("-").isdigit() and a[1:2] != "-":
                try:
                    args.append(int(a))
                    continue
                except ValueError:
                    pass            # over Python's digit limit: the long path reads it
            args.append(_literal(a, ev, i + 1 if csv_row else ("args", i)))
        elif isinstance(a, tuple):
            args.append(tuple(x if isinstance(x, int) else _literal(x, ev, ("args", i)) for x in a))
        else:
            args.append(a)
    return args


def _call_text(name: str, arg_texts) -> str:
    """The row's call as a reader writes it: dedekind(5, 17)."""
    return f"{name}({', '.join(_written(a) for a in arg_texts)})"


def _expression_row(payload, ev: Evaluator, fmt: str):
    text, value = payload
    where_expr, where_value = (0, 1) if fmt == "csv" else ("expression", "value")
    if _UNUSUAL.search(text):
        _odd_characters(text, where_expr)
    _no_comment(text, where_expr)       # read piece by piece, `f(5 #(, 1), 17)` would lose its `#`
    # one call only: "f(a) + g(b)" also matches the pattern, with the unbalanced inside "a) + g(b"
    m = _CALL.match(text)
    spec = REGISTRY.get(m.group(1)) if m and _balanced(m.group(2)) else None
    exact = None
    if spec is not None:
        try:
            args = tuple(_literal(a, ev, where_expr) for a in _split_top(m.group(2)))
            exact = spec.call(args, ev.limits)
        except (CertificateError, _RowError):
            exact = None     # the parser below gives the message, with its position
    if exact is None:
        from ..language.parsing import parse_expression
        try:
            exact = ev.number(parse_expression(text, ev.limits))
        except CertificateError as e:
            raise _RowError(where_expr, f"{text.strip()}: {e.message}", 2 if e.kind == "limit" else 1) from None
    _compare(exact, value, ev, where_value, " ".join(text.split()))


def _balanced(text: str) -> bool:
    depth = 0
    for ch in text:
        if ch in "([":
            depth += 1
        elif ch in ")]":
            depth -= 1
            if depth < 0:
                return False
    return depth == 0


def _failure(line, text, fmt, where, message, details=(), kind="error", claimed=None, exact=None,
             exit_code=1) -> Failure:
    column, end = _locate(text, fmt, where)
    return Failure(line, column, f"row at line {line}: {message}", list(details), kind=kind, end_column=end,
                   claimed=claimed, exact=exact, exit_code=exit_code, row=text.rstrip("\r\n"))


def _row_problem(row, ev: Evaluator):
    """None when the row holds, else the arguments of _failure that describe it (line first)."""
    line, kind, payload, text, fmt = row
    try:
        if kind == "function":
            _function_row(payload, ev, fmt)
        elif kind == "expression":
            _expression_row(payload, ev, fmt)
        else:
            where, message, code = payload
            raise _RowError(where, message, code)
        return None
    except _Wrong as w:
        details = [f"the row claims: {w.written}"]
        if value_text(w.claimed) != w.written:
            details.append(f"which is:       {value_text(w.claimed)}")
        details += [f"exact value:    {value_text(w.exact)}",
                    f"difference (claimed - exact): {value_text(w.claimed - w.exact)}"]
        return (line, text, fmt, w.where, f"{w.call} is not {_short(w.written)}", details, "failed", w.claimed,
                w.exact, 1)
    except _RowError as e:
        return (line, text, fmt, e.where, e.message, (), "limit" if e.exit_code == 2 else "error", None, None,
                e.exit_code)
    except CertificateError as e:
        return (line, text, fmt, None, e.message, (), e.kind, None, None, 2 if e.kind == "limit" else 1)


def check_rows(rows, limits: Limits = DEFAULT_LIMITS) -> tuple[int, list]:
    """(rows verified, failures) for an iterable of rows from `table_rows`."""
    ev = Evaluator({}, limits)
    ok, failures = 0, []
    for row in rows:
        problem = _row_problem(row, ev)
        if problem is None:
            ok += 1
        else:
            failures.append(_failure(*problem))
    return ok, failures


def _short(text: str, width: int = 60) -> str:
    return text if len(text) <= width else f"{text[:width // 2 - 2]}...{text[-(width // 2 - 2):]} " \
                                           f"({len(text)} characters)"


def _batches(rows, size):
    batch = []
    for row in rows:
        batch.append(row)
        if len(batch) == size:
            yield batch
            batch = []
    if batch:
        yield batch


# -- checking a table: one process, or N processes on byte ranges -----------------------

class _Part:
    """What the check of a byte range found: rows verified, problems in order, lines read.

    A problem is ("row", arguments of _failure) or ("table", line, column, message, kind): the
    second ends the table (a header, a byte that is not UTF-8, the `seconds` limit).  Lines are
    counted from the range's start, so that N ranges add up to the file's numbering.
    """

    def __init__(self):
        self.ok, self.problems, self.lines, self.stopped, self.quotes = 0, [], 0, False, 0

    def failures(self, offset: int) -> list:
        out = []
        for p in self.problems:
            if p[0] == "row":
                line, *rest = p[1]
                out.append(_failure(line + offset, *rest))
            else:
                _, line, column, message, kind = p
                out.append(Failure(None if line is None else line + offset, column, message, kind=kind,
                                   exit_code=2))
        return out


def _check_range(raw, reader: _Reader, start: int, end, progress=None) -> _Part:
    """Check the rows of raw's bytes [start, end) (end None: to the end) with `reader`."""
    part = _Part()
    ev = Evaluator({}, reader.limits)
    csv_format = reader.fmt == "csv"
    try:
        for offset, data in _blocks(raw, start, end, csv_format):
            if csv_format:
                part.quotes += data.count(b'"')
            first = reader.lines + 1
            try:
                bodies, ends = reader.lines_of(offset, data)
            except _NotUtf8 as e:
                _check_lines(reader, e.bodies, e.ends, first, ev, part)
                raise e.error() from None
            rows = _check_lines(reader, bodies, ends, first, ev, part)
            if progress:
                progress(rows)
    except _Stop:
        part.stopped = True
    except CertificateError as e:
        part.problems.append(("table", e.line, e.column, e.message, e.kind))
        part.stopped = True
    part.lines = reader.lines
    return part


class _Stop(Exception):
    """The `seconds` limit was reached in a row (already reported)."""


def _check_lines(reader: _Reader, bodies: list, ends, first: int, ev: Evaluator, part: _Part) -> int:
    """Check the rows of a block of lines into `part`; the number of rows."""
    i, n, rows = 0, len(bodies), 0
    problems = part.problems
    if reader.header is None and reader.fmt == "csv" and n:
        _, i = reader.record(bodies, ends, 0, first)      # the header
    try:
        check_time()                                      # once a block: plain rows take microseconds
    except OutOfTime as e:
        problems.append(("table", first + i, 1, e.message, "limit"))
        raise _Stop() from None
    while i < n:
        if reader.fast is not None:
            # the plain rows of a function with an integer test: one regex match and the test
            match, test = reader.fast
            start = i
            while i < n:
                m = match(bodies[i])
                if m is None:
                    break
                h, k, p, q = m.groups()
                try:
                    if not test(int(h), int(k), int(p), int(q) if q else 1):
                        break
                except (ValueError, DomainError):      # over int()'s digit limit, k or q zero
                    break
                i += 1
            rows += i - start
            part.ok += i - start
            if i == n:
                break
        row, i = reader.record(bodies, ends, i, first)
        if row is None:
            continue
        rows += 1
        problem = _row_problem(row, ev)
        if problem is None:
            part.ok += 1
            continue
        problems.append(("row", problem))
        if problem[6] == "limit":
            try:
                check_time()
            except OutOfTime:
                raise _Stop() from None
    return rows


def _fork_context():
    """multiprocessing's fork context where the system has it (workers start in milliseconds), else None."""
    import multiprocessing
    return multiprocessing.get_context("fork") if "fork" in multiprocessing.get_all_start_methods() else None


def _worker_context():
    """How workers start: forked where possible, else as the platform's default (a new interpreter)."""
    import multiprocessing
    return _fork_context() or multiprocessing.get_context()


#: bytes of table per worker process before a second process pays (see default_jobs)
BYTES_PER_WORKER = 1 << 20
BYTES_PER_WORKER_SPAWNED = 32 << 20


def default_jobs(size: int) -> int:
    """Worker processes for a table of `size` bytes: one per BYTES_PER_WORKER (a MiB, some 10,000
    rows of 20-digit Dedekind sums, 50 ms of work against a few ms to start a forked process), at
    most one per processor this process may use.  Where processes cannot be forked (Windows, and
    macOS by default) they start a new interpreter, and one per 32 MiB."""
    try:
        cpus = len(os.sched_getaffinity(0))
    except (AttributeError, OSError):
        cpus = os.cpu_count() or 1
    per = BYTES_PER_WORKER if _fork_context() is not None else BYTES_PER_WORKER_SPAWNED
    return max(1, min(cpus, size // per))


def check_table(path, limits: Limits = DEFAULT_LIMITS, jobs: int | None = None, progress=None, stream=None,
                name: str | None = None) -> Report:
    """Check every row of a CSV or JSON Lines table; the report lists each wrong row, in file order.

    `jobs` worker processes each read and check a range of the file's lines (None: default_jobs of
    the file's size; 1: this process only); the report is the same for any number.  `stream` (an
    open file, e.g. standard input) is read instead of `path`, whose suffix then only says the
    format, in this process.  An empty table (no rows) gives a report with nothing checked and
    no failure: the callers decide (see checker.interfaces.files.require_something).
    """
    import time
    path = Path(path)
    report = Report(name=name or str(path))
    start = time.perf_counter()
    with time_limit(limits.seconds):
        try:
            reader = _Reader(path.suffix.lower(), limits)
        except CertificateError as e:
            report.failures.append(Failure(e.line, e.column, e.message, kind=e.kind, exit_code=2))
            report.seconds = time.perf_counter() - start
            return report
        part = None
        if stream is None:
            part = _check_in_processes(path, reader, limits, jobs, progress)
        if part is None:
            part = _check_one_process(path, reader, stream, progress)
    report.checked = part.ok
    report.failures.extend(part.failures(0))
    report.seconds = time.perf_counter() - start
    return report


def _check_one_process(path: Path, reader: _Reader, stream, progress) -> _Part:
    if stream is not None:
        raw = getattr(stream, "buffer", None)
        if raw is None:                       # a text stream without bytes beneath (tests, notebooks)
            raw = io.BytesIO(stream.read().encode("utf-8"))
        return _check_range(raw, reader, 0, None, progress)
    try:
        raw = open(path, "rb")
    except OSError as e:
        part = _Part()
        part.problems.append(("table", None, None, f"cannot read the file: {e.strerror}", "unreadable"))
        return part
    with raw:
        return _check_range(raw, reader, 0, None, progress)


def _check_in_processes(path: Path, reader: _Reader, limits: Limits, jobs, progress):
    """The table checked by worker processes on byte ranges, or None when one process should do it."""
    try:
        size = path.stat().st_size
    except OSError:
        return None
    if jobs is None:
        jobs = default_jobs(size)
    if jobs <= 1:
        return None
    try:
        ranges, header = _split(path, reader, size, jobs)
    except (OSError, CertificateError, UnicodeDecodeError):
        return None                           # the one process reports it
    if len(ranges) < 2:
        return None
    parts = _run_workers(path, reader.fmt, header, limits, ranges, progress)
    if parts is None or any(p.quotes % 2 for p in parts[:-1]):
        # a quoted CSV record spans two ranges (or a worker could not run): one process reads it
        return None
    whole = _Part()
    offset = 1 if header is not None else 0
    for p in parts:
        whole.ok += p.ok
        whole.problems.extend(_shifted(p.problems, offset))
        offset += p.lines
        if p.stopped:
            break
    return whole


def _shifted(problems: list, offset: int) -> list:
    out = []
    for p in problems:
        if p[0] == "row":
            line, *rest = p[1]
            out.append(("row", (line + offset, *rest)))
        else:
            _, line, column, message, kind = p
            out.append(("table", None if line is None else line + offset, column, message, kind))
    return out


def _split(path: Path, reader: _Reader, size: int, jobs: int):
    """Byte ranges at line starts, one per worker, after the header; and the header (CSV)."""
    with open(path, "rb") as raw:
        begin, header = 0, None
        if reader.fmt == "csv":
            first = raw.readline()
            if b'"' in first or b"\r" in first.rstrip(b"\r\n") or not first.endswith(b"\n"):
                return [], None               # a header the one process must read
            text = first.decode("utf-8").removeprefix("\ufeff").rstrip("\r\n")
            header = _header(1, text, text.split(","))
            begin = len(first)
        points = [begin]
        for i in range(1, jobs):
            raw.seek(max(begin, begin + (size - begin) * i // jobs - 1))
            raw.readline()                    # to the next line start
            at = raw.tell()
            if points[-1] < at < size:
                points.append(at)
        points.append(size)
    return list(zip(points, points[1:])), header


def _run_workers(path: Path, fmt: str, header, limits: Limits, ranges: list, progress):
    """The _Part of each range, checked in processes; None if they cannot be started."""
    from multiprocessing.connection import wait
    context = _worker_context()
    deadline = current_deadline()                        # the same instant for every worker
    workers, links = [], {}
    try:
        for index, (begin, end) in enumerate(ranges):
            receiving, sending = context.Pipe(duplex=False)
            worker = context.Process(target=_worker, args=(str(path), fmt, header, limits, begin, end, deadline,
                                                           sending), daemon=True)
            worker.start()
            sending.close()
            workers.append(worker)
            links[receiving] = index
    except OSError:
        for worker in workers:
            worker.terminate()
        return None
    parts = [None] * len(ranges)
    try:
        while links:
            for link in wait(list(links)):
                try:
                    message = link.recv()
                except EOFError:
                    raise RuntimeError(f"a worker process of the table check ended without a result "
                                       f"(exit code {workers[links[link]].exitcode})") from None
                if message[0] == "rows":
                    if progress:
                        progress(message[1])
                    continue
                index = links.pop(link)
                link.close()
                if message[0] == "crash":
                    raise message[1]
                parts[index] = message[1]
    finally:
        if None in parts:                                 # an interrupt or an error: stop the others
            for worker in workers:
                if worker.is_alive():
                    worker.terminate()
        for worker in workers:
            worker.join()
    return parts


def _worker(path: str, fmt: str, header, limits: Limits, begin: int, end: int, deadline, link) -> None:
    """One worker process: check the rows of [begin, end), send progress and the _Part."""
    import signal
    signal.signal(signal.SIGINT, signal.SIG_IGN)      # Ctrl-C is the parent's to handle
    try:
        reader = _Reader("." + fmt, limits, header, offset=begin)
        with time_limit(deadline[1], at=deadline[0]) if deadline else nullcontext():
            with open(path, "rb") as raw:
                raw.seek(begin)
                part = _check_range(raw, reader, begin, end, lambda n: link.send(("rows", n)))
        link.send(("done", part))
    except BaseException as e:                         # a bug: the parent raises it
        try:
            link.send(("crash", e))
        except Exception:
            link.send(("crash", RuntimeError(f"{type(e).__name__}: {e}")))
    finally:
        link.close()


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
