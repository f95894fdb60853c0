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
import re
import unicodedata
from fractions import Fraction
from pathlib import Path
from typing import Iterator

from ..foundation.errors import CertificateError, UnreadableFile
from ..foundation.limits import DEFAULT_LIMITS, Limits
from ..foundation.numbers import text_int, value_text
from ..kernel.evaluation import Evaluator
from ..kernel.functions import REGISTRY
from ..replay.report import Failure, Report

__all__ = ["TABLE_SUFFIXES", "is_table", "check_table", "table_rows", "check_rows", "parameter_names"]

TABLE_SUFFIXES = (".csv", ".jsonl")

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


def is_table(path) -> bool:
    return Path(path).suffix.lower() in TABLE_SUFFIXES


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


def _literal(text: str, ev: Evaluator, where):
    """A number, a list of numbers, or (through the parser) any expression of the language."""
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

def table_rows(path) -> Iterator[tuple]:
    """The rows of a table file (or of standard input for path '-', with `suffix`)."""
    path = Path(path)
    suffix = path.suffix.lower()
    try:
        handle = open(path, encoding="utf-8", newline="")
    except OSError as e:
        raise UnreadableFile(f"cannot read the file: {e.strerror}") from None
    with handle:
        yield from stream_rows(handle, suffix)


def stream_rows(handle, suffix: str) -> Iterator[tuple]:
    try:
        if suffix == ".csv":
            yield from _csv_rows(handle)
        elif suffix == ".jsonl":
            yield from _jsonl_rows(handle)
        else:
            raise UnreadableFile(f"a table must end in .csv or .jsonl, not '{suffix}'")
    except UnicodeDecodeError as e:
        raise UnreadableFile(f"the file is not UTF-8 text (byte {e.start} of a block cannot be decoded)") from None


def _physical_lines(handle):
    """(line number, text) with a leading byte-order mark dropped; line ends kept."""
    for number, text in enumerate(handle, 1):
        if number == 1 and text.startswith("\ufeff"):
            text = text[1:]
        yield number, text


def _csv_records(handle):
    """(first line, record text, fields); a quoted field may span lines."""
    lines = _physical_lines(handle)
    for number, text in lines:
        if '"' not in text:
            body = text.rstrip("\r\n")
            yield number, body, body.split(",")
            continue
        while text.count('"') % 2:
            nxt = next(lines, None)
            if nxt is None:
                break
            text += nxt[1]
        body = text.rstrip("\r\n")
        try:
            fields = next(csv.reader([body], strict=True), [])
        except csv.Error as e:
            yield number, body, e
            continue
        yield number, body, fields


def _csv_rows(handle):
    records = _csv_records(handle)
    first = next(records, None)
    if first is None:
        return
    line, body, header = first
    if isinstance(header, Exception) or not body.strip():
        raise CertificateError("the first line must be a header: 'expression,value' or "
                               "'function,<argument names>,value'", line, 1)
    names = [h.strip().lower() for h in header]
    if names == ["expression", "value"]:
        layout = "expression"
    elif len(names) >= 2 and names[0] == "function" and names[-1] == "value":
        layout = "function"
    else:
        raise CertificateError("the header must be 'expression,value' or 'function,<argument names>,value', "
                               f"not '{body}'", line, 1)
    params = tuple(names[1:-1])
    width = len(names)
    refusals: dict = {}
    for line, body, row in records:
        if isinstance(row, Exception):
            yield line, "bad", (None, f"not a CSV row: {row}", 1), body, "csv"
            continue
        if len(row) == 1 and not row[0].strip():
            continue
        if len(row) != width:
            yield line, "bad", (None, f"the row has {len(row)} columns, the header {width}", 1), body, "csv"
            continue
        if layout == "expression":
            yield line, "expression", (row[0], row[1]), body, "csv"
            continue
        name = row[0].strip()
        if name in REGISTRY:
            if name not in refusals:
                refusals[name] = _header_refusal(name, params)
            if refusals[name]:
                yield line, "bad", (0, refusals[name], 1), body, "csv"
                continue
        yield line, "function", (name, row[1:-1], row[-1]), body, "csv"


_KEYS = ({"expression", "value"}, {"function", "args", "value"}, {"function", "value"})


def _pairs_once(pairs):
    keys = [k for k, _ in pairs]
    for k in keys:
        if keys.count(k) > 1:
            raise _RowError(k, f"the key \"{k}\" is given {keys.count(k)} times; a row must mean one thing")
    return dict(pairs)


def _jsonl_rows(handle):
    for line, text in _physical_lines(handle):
        if not text.strip():
            continue
        try:
            obj = json.loads(text, object_pairs_hook=_pairs_once)
        except _RowError as e:
            yield line, "bad", (e.where, e.message, 1), text, "jsonl"
            continue
        except json.JSONDecodeError as e:
            yield line, "bad", (("@", e.colno), f"not JSON: {e.msg}", 1), text, "jsonl"
            continue
        except (ValueError, RecursionError) as e:
            yield line, "bad", (None, f"not JSON that quasicert reads: {e}", 1), text, "jsonl"
            continue
        try:
            yield (line, *_json_row(obj), text, "jsonl")
        except _RowError as e:
            yield line, "bad", (e.where, e.message, 1), text, "jsonl"


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
    # one call only: "f(a) + g(b)" also matches the pattern, with the unbalanced inside "a) + g(b";
    # and no comment: read piece by piece, `f(5 #(, 1), 17)` would lose the `#` that ends the text
    m = _CALL.match(text) if "#" not in text else None
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


def check_rows(rows, limits: Limits = DEFAULT_LIMITS) -> tuple[int, list]:
    """(rows verified, failures) for an iterable of rows from `table_rows`."""
    ev = Evaluator({}, limits)
    ok, failures = 0, []
    for line, kind, payload, text, fmt in rows:
        try:
            if kind == "function":
                _function_row(payload, ev, fmt)
            elif kind == "expression":
                _expression_row(payload, ev, fmt)
            else:
                where, message, code = payload
                raise _RowError(where, message, code)
            ok += 1
        except _Wrong as w:
            details = [f"the row claims: {w.written}"]
            if value_text(w.claimed) != w.written:
                details.append(f"which is:       {value_text(w.claimed)}")
            details += [f"exact value:    {value_text(w.exact)}",
                        f"difference (claimed - exact): {value_text(w.claimed - w.exact)}"]
            failures.append(_failure(line, text, fmt, w.where, f"{w.call} is not {_short(w.written)}", details,
                                     "failed", w.claimed, w.exact))
        except _RowError as e:
            failures.append(_failure(line, text, fmt, e.where, e.message, exit_code=e.exit_code,
                                     kind="limit" if e.exit_code == 2 else "error"))
        except CertificateError as e:
            failures.append(_failure(line, text, fmt, None, e.message, kind=e.kind,
                                     exit_code=2 if e.kind == "limit" else 1))
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


def _check_batch(args):
    batch, limits = args
    return check_rows(batch, limits)


def check_table(path, limits: Limits = DEFAULT_LIMITS, jobs: int = 1, progress=None, stream=None,
                name: str | None = None) -> Report:
    """Check every row of a CSV or JSON Lines table; the report lists each wrong row.

    `stream` (an open text file, e.g. standard input) is read instead of `path`,
    whose suffix then only says the format.  An empty table (no rows) gives a
    report with nothing checked and no failure: the callers decide (see
    checker.interfaces.files.require_something).
    """
    import time
    path = Path(path)
    report = Report(name=name or str(path))
    start = time.perf_counter()
    try:
        rows = stream_rows(stream, path.suffix.lower()) if stream is not None else table_rows(path)
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
