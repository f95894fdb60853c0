"""The language's cost on top of the mathematics, as ratios measured in the same run.

Run on demand:  python tests/benchmarks/bench_evaluation.py
- evaluate("dedekind(h, k)") against functions.dedekind(h, k), 20 to 10000 digits (goal <= 1.5x);
- start-up: `python -m checker eval 1` against `python -c pass` (goal <= 6x).
"""
from __future__ import annotations

import os
import random
import subprocess
import sys
import time
from math import gcd

ROOT = os.path.join(os.path.dirname(__file__), "..", "..")
sys.path.insert(0, ROOT)

from checker import evaluate, functions  # noqa: E402
from timing import best_of  # noqa: E402

CPU = time.process_time        # this process's CPU time: steadier than wall time on a shared machine

if hasattr(sys, "set_int_max_str_digits"):
    sys.set_int_max_str_digits(0)


def pair(rng, digits):
    while True:
        k = rng.randrange(10 ** (digits - 1), 10 ** digits)
        h = rng.randrange(1, k)
        if gcd(h, k) == 1:
            return h, k


def bench_evaluate():
    print('evaluate("dedekind(h, k)") against functions.dedekind(h, k) (goal <= 1.5x)')
    rng = random.Random(15)
    evaluate("1")                                    # load the parser once
    for digits, count in ((20, 2000), (100, 1000), (1000, 40), (3000, 6), (10000, 2)):
        pairs = [pair(rng, digits) for _ in range(count)]
        texts = [f"dedekind({h}, {k})" for h, k in pairs]
        ratios = []
        for _ in range(5):
            ours = best_of(lambda: [evaluate(t) for t in texts], 1, CPU)
            ref = best_of(lambda: [functions.dedekind(h, k) for h, k in pairs], 1, CPU)
            ratios.append(ours / ref)
        ratios.sort()
        print(f"  {digits:5d} digits: {ref / count * 1e6:10.1f} us a value; median ratio {ratios[2]:5.2f}x "
              f"(range {ratios[0]:.2f}-{ratios[-1]:.2f})")


def bench_startup():
    print("start-up: python -m checker eval 1 against python -c pass (goal <= 6x)")
    env = dict(os.environ, PYTHONPATH=ROOT)

    def run(args):
        return best_of(lambda: subprocess.run([sys.executable, *args], env=env, cwd=ROOT, check=True,
                                              stdout=subprocess.DEVNULL), 7)
    ours = run(["-m", "checker", "eval", "1"])
    ref = run(["-c", "pass"])
    print(f"  eval 1: {ours * 1e3:.0f} ms; python -c pass: {ref * 1e3:.0f} ms; ratio {ours / ref:.1f}x")


if __name__ == "__main__":
    bench_evaluate()
    bench_startup()
