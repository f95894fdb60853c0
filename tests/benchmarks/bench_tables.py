"""Tables of claims: rows per second, two processes, and peak memory as the table grows.

Run on demand:  python tests/benchmarks/bench_tables.py
Each measurement runs in a fresh process; the reference is the kernel alone on the same rows.
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


def probe(path, jobs):
    out = subprocess.run([sys.executable, "-c", PROBE, ROOT, path, str(jobs)], capture_output=True, text=True)
    return json.loads(out.stdout)


if __name__ == "__main__":
    with tempfile.TemporaryDirectory() as tmp:
        sizes = (100_000, 1_000_000)
        for rows in sizes:
            path = os.path.join(tmp, f"t{rows}.csv")
            write(path, rows, digits=20, wrong_every=1000)
            one = probe(path, 1)
            if rows == sizes[0]:
                kernel = float(subprocess.run([sys.executable, "-c", KERNEL, ROOT, path],
                                              capture_output=True, text=True).stdout)
                two = probe(path, 2)
                print(f"{rows} rows of 20-digit dedekind: {rows / one['seconds']:,.0f} rows/s on one core "
                      f"(goal 50,000); kernel alone {rows / kernel:,.0f} rows/s (ratio {one['seconds'] / kernel:.1f}x); "
                      f"--jobs 2 {rows / two['seconds']:,.0f} rows/s")
            print(f"{rows} rows: {one['seconds']:.1f} s, peak memory {one['kib'] / 1024:.0f} MiB, "
                  f"{one['failures']} wrong rows reported")
