"""Tables of claims: rows per second against the loop a user would write instead, two processes,
and peak memory as the table grows.

Run on demand:  python tests/benchmarks/bench_tables.py
Each measurement runs in a fresh process.  The references, on the same file in the same run:
the user's own loop (csv reader + python-flint's fmpq.dedekind_sum, comparing with the claimed
fmpq), and quasicert's kernel alone on pre-parsed integers.
"""
from __future__ import annotations

import json
import os
import subprocess
import sys
import tempfile

HERE = os.path.dirname(__file__)
ROOT = os.path.join(HERE, "..", "..")
sys.path.insert(0, os.path.join(HERE, "..", "tools"))

from make_table import write  # noqa: E402

PROBE = r"""
import json, resource, sys, time
sys.path.insert(0, sys.argv[1])
from checker.interfaces.tables import check_table
t = time.perf_counter()
r = check_table(sys.argv[2], jobs=int(sys.argv[3]))
dt = time.perf_counter() - t
print(json.dumps({"seconds": dt, "kib": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss,
                  "checked": r.checked, "failures": len(r.failures)}))
"""

KERNEL = r"""
import csv, sys, time
sys.path.insert(0, sys.argv[1])
from checker.mathematics.dedekind import dedekind
rows = list(csv.reader(open(sys.argv[2])))[1:]
pairs = [(int(h), int(k)) for _, h, k, _ in rows]
t = time.perf_counter()
for h, k in pairs:
    dedekind(h, k)
print(time.perf_counter() - t)
"""


FLINT_LOOP = r"""
import csv, sys, time
import flint
t = time.perf_counter()
wrong = 0
with open(sys.argv[1], newline="") as fh:
    rows = csv.reader(fh)
    next(rows)
    for function, h, k, value in rows:
        p, _, q = value.partition("/")
        if flint.fmpq.dedekind_sum(int(h), int(k)) != flint.fmpq(int(p), int(q or 1)):
            wrong += 1
print(time.perf_counter() - t)
"""


def best_of(runs, fn):
    return min(fn() for _ in range(runs))


def probe(path, jobs):
    out = subprocess.run([sys.executable, "-c", PROBE, ROOT, path, str(jobs)], capture_output=True, text=True)
    return json.loads(out.stdout)


if __name__ == "__main__":
    with tempfile.TemporaryDirectory() as tmp:
        sizes = (100_000, 1_000_000)
        for rows in sizes:
            path = os.path.join(tmp, f"t{rows}.csv")
            write(path, rows, digits=20, wrong_every=1000)
            if rows == sizes[0]:
                # interleaved, best of three each: the machine is shared
                ours, flint_loop, two = [], [], []
                for _ in range(3):
                    ours.append(probe(path, 1)["seconds"])
                    flint_loop.append(float(subprocess.run([sys.executable, "-c", FLINT_LOOP, path],
                                                           capture_output=True, text=True).stdout))
                    two.append(probe(path, 2)["seconds"])
                kernel = float(subprocess.run([sys.executable, "-c", KERNEL, ROOT, path],
                                              capture_output=True, text=True).stdout)
                one, ref, par = min(ours), min(flint_loop), min(two)
                print(f"{rows} rows of 20-digit dedekind: quasicert {rows / one:,.0f} rows/s on one core; "
                      f"the python-flint loop {rows / ref:,.0f} rows/s; ratio quasicert/flint loop "
                      f"{ref / one:.2f} (1.00 = as fast)")
                print(f"  --jobs 2: {rows / par:,.0f} rows/s (ratio to one process {one / par:.2f}, to the flint "
                      f"loop {ref / par:.2f}); kernel alone {rows / kernel:,.0f} rows/s")
            else:
                one = probe(path, 1)
                print(f"{rows} rows: {one['seconds']:.1f} s, peak memory {one['kib'] / 1024:.0f} MiB, "
                      f"{one['failures']} wrong rows reported")
