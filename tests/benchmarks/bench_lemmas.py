"""Lemma speed: the bundled lemma library, its symbolic part and its numeric second opinion.

Run on demand:  python tests/benchmarks/bench_lemmas.py
The reference, timed in the same run, is python-flint evaluating the closed form
s(2, k) = (k-1)(k-5)/(24k) at the same 150 instances as the second opinion uses
(the cost of checking a lemma on instances with the fastest library at hand).
"""
from __future__ import annotations

import os
import re
import sys
import time

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", ".."))

import flint  # noqa: E402

from checker import check_file, check_text  # noqa: E402
from checker.replay import checking, instances, library  # noqa: E402
from checker.kernel.evaluation import Evaluator  # noqa: E402
from checker.foundation.resources import resource_dir  # noqa: E402
from checker.language.parsing import parse_certificate  # noqa: E402

LIBRARY = resource_dir("checker.certificates", "certificates") / "dedekind-lemmas.qcert"

# the worked example of the README, as the library states it
TWO = re.search(r"^lemma two_over_odd.*?^end$", LIBRARY.read_text(), flags=re.S | re.M).group(0) + "\n"


def timed(fn, repeat=5):
    best = None
    for _ in range(repeat):
        t = time.perf_counter()
        out = fn()
        dt = time.perf_counter() - t
        best = dt if best is None or dt < best else best
    return best, out


def main():
    check_text("claim 1 = 1\n")          # build the parser, import sympy
    # a file is checked once per process: forget it before each timing
    whole, report = timed(lambda: (library._VERIFIED.clear(), check_file(LIBRARY))[1], 3)
    assert report.ok
    print(f"library: {len([n for n in report.notes if 'lemma' in n])} lemmas, {report.checked} steps, "
          f"{whole:.2f} s")

    lemma = parse_certificate(TWO).statements[0]
    sampler = instances.Sampler(Evaluator(), lemma.params, lemma.conditions)
    found = sampler.small() + sampler.large()
    ks = [int(e["k"]) for e in found]

    one, _ = timed(lambda: check_text(TWO))
    # the same lemma for k = 1 only: the symbolic replay with a second opinion at one instance
    symbolic, _ = timed(lambda: check_text(TWO.replace("k >= 1", "k >= 1, k <= 1")))
    reference, _ = timed(lambda: [(flint.fmpq.dedekind_sum(2, k), flint.fmpq(k - 1) * (k - 5) / (24 * k))
                                  for k in ks])
    print(f"two_over_odd: whole check {one * 1000:.1f} ms; symbolic replay about {symbolic * 1000:.1f} ms; "
          f"second opinion about {(one - symbolic) * 1000:.1f} ms at {len(ks)} instances")
    print(f"python-flint, the statement alone at the same {len(ks)} instances: {reference * 1000:.2f} ms; "
          f"ratio of the second opinion (every line of the proof, exact) to it: "
          f"{(one - symbolic) / reference:.1f}x")


def bundled_check():
    """`quasicert check` of the bundled folder: how often each file is replayed, and the time
    against checking each file in a fresh memo (the old behaviour replayed used files again)."""
    folder = resource_dir("checker.certificates", "certificates")
    files = sorted(folder.glob("*.qcert"))
    seen = []
    original = checking._Replay.run

    def counting(self):
        seen.append(os.path.basename(self.report.name))
        return original(self)
    checking._Replay.run = counting
    try:
        library._VERIFIED.clear()
        start = time.perf_counter()
        assert all(check_file(f).ok for f in files)
        once = time.perf_counter() - start
        replays = {name: seen.count(name) for name in set(seen)}
        seen.clear()
        start = time.perf_counter()
        for f in files:
            library._VERIFIED.clear()
            check_file(f)
        each = time.perf_counter() - start
    finally:
        checking._Replay.run = original
    twice = sorted(n for n, c in replays.items() if c > 1)
    print(f"bundled check of {len(files)} files: {once:.2f} s; replayed more than once: {twice or 'none'}; "
          f"every file on a fresh memo {each:.2f} s; ratio {once / each:.2f}x")
    note = next(n for n in check_file(LIBRARY).notes if "apostol" in n)
    print(f"Apostol's s_3 lemma: {note.split(': ', 1)[1]}")


if __name__ == "__main__":
    bundled_check()
    main()
