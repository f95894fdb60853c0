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
t, cpu = time.perf_counter(), time.process_time()
r = check_table(sys.argv[2], jobs=jobs)
dt, dcpu = time.perf_counter() - t, time.process_time() - cpu
children = resource.getrusage(resource.RUSAGE_CHILDREN)
print(json.dumps({"seconds": dt, "cpu": dcpu + children.ru_utime + children.ru_stime,
                  "kib": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss,
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
t, cpu = time.perf_counter(), time.process_time()
wrong = 0
with open(sys.argv[1], newline="") as fh:
    rows = csv.reader(fh)
    next(rows)
    for function, h, k, value in rows:
        p, _, q = value.partition("/")
        if flint.fmpq.dedekind_sum(int(h), int(k)) != flint.fmpq(int(p), int(q or 1)):
            wrong += 1
print(time.perf_counter() - t, time.process_time() - cpu)
"""


def probe(path, jobs):
    out = subprocess.run([sys.executable, "-c", PROBE, ROOT, path, str(jobs)], capture_output=True, text=True)
    return json.loads(out.stdout)


def flint_loop(path):
    out = subprocess.run([sys.executable, "-c", FLINT_LOOP, path], capture_output=True, text=True).stdout
    wall, cpu = map(float, out.split())
    return {"seconds": wall, "cpu": cpu}


def compare(path, rows):
    """Interleaved, best of three each: the machine may be shared.  Wall time is what a user waits;
    processor time (all processes of a run) shows the work, less disturbed by other load."""
    runs = {"flint": [], "one": [], "default": [], "two": []}
    workers = set()
    for _ in range(3):
        runs["flint"].append(flint_loop(path))
        runs["one"].append(probe(path, 1))
        runs["default"].append(probe(path, "default"))
        workers.add(runs["default"][-1]["default_jobs"])
        runs["two"].append(probe(path, 2))
    best = {k: min(r["seconds"] for r in v) for k, v in runs.items()}
    cpu = {k: min(r["cpu"] for r in v) for k, v in runs.items()}
    ref = best["flint"]
    print(f"{rows:,} rows of 20-digit dedekind; the python-flint loop {rows / ref:,.0f} rows/s; load average "
          f"{os.getloadavg()[0]:.1f} on {os.cpu_count()} processors")
    shown = "/".join(map(str, sorted(workers)))
    for key, what in (("one", "one process (--jobs 1)"), ("default", f"default ({shown} processes)"),
                      ("two", "--jobs 2")):
        print(f"  quasicert {what}: {rows / best[key]:,.0f} rows/s, ratio to the flint loop "
              f"{ref / best[key]:.2f} (processor time: {cpu['flint'] / cpu[key]:.2f})")
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
