"""Tables of claims: rows per second against the loop a user would write instead, and peak memory.

Run on demand:  python tests/benchmarks/bench_tables.py [ROWS]
Each measurement runs in a fresh process, on the same file, interleaved, best of three.  The
reference is the user's own loop (csv reader + python-flint's fmpq.dedekind_sum, comparing with
the claimed fmpq); beside it quasicert in one process (--jobs 1, the honest single-core figure),
with its default number of workers (what `quasicert check t.csv` does), with --jobs 2, and the
kernel alone on pre-parsed integers.  A ratio is flint loop time / quasicert time: 1.00 = as fast.
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
from checker.interfaces.tables import check_table, default_jobs
import os
jobs = None if sys.argv[3] == "default" else int(sys.argv[3])
t = time.perf_counter()
r = check_table(sys.argv[2], jobs=jobs)
dt = time.perf_counter() - t
print(json.dumps({"seconds": dt, "kib": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss,
                  "children_kib": resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss,
                  "checked": r.checked, "failures": len(r.failures),
                  "default_jobs": default_jobs(os.path.getsize(sys.argv[2]))}))
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


def probe(path, jobs):
    out = subprocess.run([sys.executable, "-c", PROBE, ROOT, path, str(jobs)], capture_output=True, text=True)
    return json.loads(out.stdout)


def flint_loop(path):
    return float(subprocess.run([sys.executable, "-c", FLINT_LOOP, path], capture_output=True, text=True).stdout)


def compare(path, rows):
    """Interleaved, best of three each: the machine may be shared."""
    times = {"flint": [], "one": [], "default": [], "two": []}
    default_jobs = None
    for _ in range(3):
        times["flint"].append(flint_loop(path))
        times["one"].append(probe(path, 1)["seconds"])
        d = probe(path, "default")
        default_jobs = d["default_jobs"]
        times["default"].append(d["seconds"])
        times["two"].append(probe(path, 2)["seconds"])
    best = {k: min(v) for k, v in times.items()}
    ref = best["flint"]
    print(f"{rows:,} rows of 20-digit dedekind; the python-flint loop {rows / ref:,.0f} rows/s")
    for key, what in (("one", "one process (--jobs 1)"), ("default", f"default ({default_jobs} process"
                                                                      f"{'es' if default_jobs > 1 else ''})"),
                      ("two", "--jobs 2")):
        print(f"  quasicert {what}: {rows / best[key]:,.0f} rows/s, ratio to the flint loop "
              f"{ref / best[key]:.2f}")
    return best


if __name__ == "__main__":
    first = int(sys.argv[1]) if len(sys.argv) > 1 else 100_000
    with tempfile.TemporaryDirectory() as tmp:
        path = os.path.join(tmp, "t.csv")
        write(path, first, digits=20, wrong_every=1000)
        compare(path, first)
        kernel = float(subprocess.run([sys.executable, "-c", KERNEL, ROOT, path], capture_output=True,
                                      text=True).stdout)
        print(f"  kernel alone (dedekind on pre-parsed ints): {first / kernel:,.0f} rows/s")
        for rows in (10_000, 30_000):
            small = os.path.join(tmp, f"s{rows}.csv")
            write(small, rows, digits=20, wrong_every=1000)
            one = min(probe(small, 1)["seconds"] for _ in range(3))
            two = min(probe(small, 2)["seconds"] for _ in range(3))
            print(f"  {rows:,} rows: --jobs 2 / --jobs 1 time {two / one:.2f} (below 1.00 two processes pay)")
        big = os.path.join(tmp, "t6.csv")
        write(big, 1_000_000, digits=20, wrong_every=1000)
        for jobs in (1, "default"):
            r = probe(big, jobs)
            print(f"1,000,000 rows, jobs {jobs}: {r['seconds']:.1f} s, peak memory {r['kib'] / 1024:.0f} MiB "
                  f"(each worker at most {r['children_kib'] / 1024:.0f} MiB), {r['failures']} wrong rows "
                  "reported")
