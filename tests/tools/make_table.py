"""Simulate another program's output: a table of Dedekind-sum values, some of them wrong.

    python tests/tools/make_table.py OUT.csv ROWS [--digits D] [--wrong-every K] [--jsonl]

Every K-th row (1-based) gets a wrong value (the true one plus 1/k); the
generator prints the line numbers of the wrong rows to standard error, so a
test can compare them with quasicert's report.
"""
from __future__ import annotations

import argparse
import json
import os
import random
import sys

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", ".."))

from fractions import Fraction  # noqa: E402

from checker.mathematics.dedekind import dedekind  # noqa: E402
from checker.foundation.numbers import value_text  # noqa: E402


def rows(count, digits, wrong_every, seed=0):
    rng = random.Random(seed)
    for i in range(1, count + 1):
        k = rng.randint(10 ** (digits - 1), 10 ** digits)
        h = rng.randint(-k, k)
        v = dedekind(h, k)
        wrong = wrong_every and i % wrong_every == 0
        if wrong:
            v += Fraction(1, k)
        yield i, h, k, v, wrong


def write(path, count, digits=20, wrong_every=0, jsonl=False, seed=0):
    wrong_lines = []
    with open(path, "w", encoding="utf-8") as fh:
        if not jsonl:
            fh.write("function,h,k,value\n")
        for i, h, k, v, wrong in rows(count, digits, wrong_every, seed):
            if jsonl:
                fh.write(json.dumps({"function": "dedekind", "args": [h, k], "value": value_text(v)}) + "\n")
            else:
                fh.write(f"dedekind,{h},{k},{value_text(v)}\n")
            if wrong:
                wrong_lines.append(i if jsonl else i + 1)
    return wrong_lines


if __name__ == "__main__":
    p = argparse.ArgumentParser()
    p.add_argument("out")
    p.add_argument("rows", type=int)
    p.add_argument("--digits", type=int, default=20)
    p.add_argument("--wrong-every", type=int, default=0)
    p.add_argument("--jsonl", action="store_true")
    a = p.parse_args()
    lines = write(a.out, a.rows, a.digits, a.wrong_every, a.jsonl)
    print(" ".join(map(str, lines)), file=sys.stderr)
