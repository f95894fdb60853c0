"""Certificate speed: parsing and checking large generated certificates.

Run on demand:  python tests/benchmarks/bench_certificates.py   (`... chain` for the chain alone)
Ratios are against evaluating the same values directly with the kernel in
the same run (the cost of the language and the double check on top of the
mathematics).
"""
from __future__ import annotations

import gc
import os
import random
import sys
import time

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", ".."))

from checker import check_text  # noqa: E402
from checker.mathematics.dedekind import dedekind  # noqa: E402
from checker.interfaces.derive import derive_dedekind  # noqa: E402
from checker.foundation.numbers import value_text  # noqa: E402
from checker.language.parsing import parse_certificate  # noqa: E402
from timing import best_of  # noqa: E402


def timed(fn):
    t = time.perf_counter()
    out = fn()
    return time.perf_counter() - t, out


def bench_many_claims(count=10_000, repeat=5):
    """check_text of `count` one-line claims against the kernel's values of the same pairs
    (pre-parsed ints), best of `repeat` each, alternating; and the parse alone."""
    rng = random.Random(1)
    pairs = []
    for _ in range(count):
        k = rng.randint(10**19, 10**20)
        pairs.append((rng.randint(1, k), k))
    text = "\n".join(f"claim c{i}: dedekind({h}, {k}) = {value_text(dedekind(h, k))}"
                     for i, (h, k) in enumerate(pairs)) + "\n"
    check_text("claim 1 = 1\n")                      # build the parser once
    report = check_text(text)
    assert report.ok and report.checked == count
    check = kernel = parse = float("inf")
    for _ in range(repeat):
        check = min(check, best_of(lambda: check_text(text), 1))
        kernel = min(kernel, best_of(lambda: [dedekind(h, k) for h, k in pairs], 1))
        gc.disable()              # as check_text reads: the collector paused, the trees set aside
        try:
            parse = min(parse, best_of(lambda: parse_certificate(text), 1))
        finally:
            gc.enable()
    print(f"{count} claims of 20-digit dedekind values: {check:.2f} s; kernel alone {kernel:.3f} s; "
          f"ratio {check / kernel:.1f}x (goal <= 5x), of which parsing {parse / kernel:.1f}x")


def bench_derive(digits):
    rng = random.Random(digits)
    k = rng.randint(10 ** (digits - 1), 10 ** digits)
    h = rng.randint(1, k)
    write, text = timed(lambda: derive_dedekind(h, k))
    check, report = timed(lambda: check_text(text))
    kernel, _ = timed(lambda: dedekind(h, k))
    assert report.ok
    print(f"derive dedekind at {digits} digits: write {write:.3f} s (goal well under 1 s), "
          f"{len(text) / 1e6:.1f} MB, {report.checked} lines; check {check:.2f} s; "
          f"one kernel evaluation {kernel * 1e3:.2f} ms; check/kernel {check / kernel:.0f}x")


def bench_chain(digits=1000, repeat=5, per_line=None):
    """Checking a derived chain (every step: the rule gives the next line, and the values agree)
    against one kernel evaluation of the same s(h, k), best of `repeat` each (issue 15: <= 200x).
    `per_line` steps of reciprocity and reduce on a line; None: as `quasicert derive` writes it
    (about 100 lines, `descent`), 1: a line per step (`reciprocity, reduce`, 8 MB at 1000 digits)."""
    rng = random.Random(digits)
    k = rng.randint(10 ** (digits - 1), 10 ** digits)
    h = rng.randint(1, k)
    text = derive_dedekind(h, k, per_line=per_line)
    form = "as derive writes it" if per_line is None else f"{per_line} step{'s' if per_line > 1 else ''} a line"
    report = check_text(text)
    assert report.ok, report.failures
    def kernel_20():
        for _ in range(20):
            dedekind(h, k)

    for clock, what in ((time.perf_counter, "wall"), (time.process_time, "CPU")):
        check = best_of(lambda: check_text(text), repeat, clock)
        parse = best_of(lambda: parse_certificate(text, "chain"), repeat, clock)
        kernel = best_of(kernel_20, repeat, clock) / 20
        print(f"check a derived {digits}-digit chain, {form} ({report.checked} lines, {len(text) / 1e6:.1f} MB), "
              f"{what} time: {check * 1e3:.0f} ms, of which reading {parse * 1e3:.0f} ms; one kernel "
              f"evaluation {kernel * 1e3:.3f} ms; check/kernel {check / kernel:.0f}x (goal <= 200x), "
              f"reading alone {parse / kernel:.0f}x")


if __name__ == "__main__":
    if sys.argv[1:] == ["chain"]:
        bench_chain()
        bench_chain(per_line=1)
        sys.exit()
    bench_many_claims()
    for digits in (20, 200, 1000, 10000):
        bench_derive(digits)
    bench_chain()
    bench_chain(per_line=1)
