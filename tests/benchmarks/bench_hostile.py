"""Time and peak memory of the worst hostile inputs, each in a fresh process.

Run on demand:  python tests/benchmarks/bench_hostile.py
The reference is a trivial certificate checked the same way in the same run.
"""
from __future__ import annotations

import json
import os
import subprocess
import sys
import tempfile

ROOT = os.path.join(os.path.dirname(__file__), "..", "..")

CASES = {
    "trivial (reference)": "claim 1 = 1\n",
    "one-megabyte line": "claim " + "+".join(["1"] * 500_000) + " = 500000\n",
    "10,000 nested parentheses": "claim " + "(" * 10_000 + "1" + ")" * 10_000 + " = 1\n",
    "3 million open parentheses": "claim " + "(" * 3_000_000 + "1\n",
    "exponent tower 10^10^10": "claim 10^10^10 = 1\n",
    "largest allowed power 2^999999": "claim 2^999999 > 1\n",
    "dedekind(1, 10^9) by definition": "chain dedekind(1, 10^9)\n  = 0 by definition\n",
    "partition table at the budget": "claim partitions(1000000, [1, 2, 3]) > 0\n",
    "3.5 MB of claims": "claim 12345678901234567890 * 3 = 37037036703703703670\n" * 60_000,
}

PROBE = r"""
import json, resource, sys, time
sys.path.insert(0, sys.argv[2])
from checker import check_file
t = time.perf_counter()
r = check_file(sys.argv[1])
dt = time.perf_counter() - t
rss = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
print(json.dumps({"seconds": dt, "kib": rss, "ok": r.ok,
                  "kind": r.failure.kind if r.failure else None}))
"""


def main():
    base = None
    for name, text in CASES.items():
        with tempfile.NamedTemporaryFile("w", suffix=".qcert", delete=False) as fh:
            fh.write(text)
        out = subprocess.run([sys.executable, "-c", PROBE, fh.name, ROOT], capture_output=True, text=True)
        os.unlink(fh.name)
        m = json.loads(out.stdout)
        if base is None:
            base = m
        verdict = "verified" if m["ok"] else m["kind"]
        print(f"{name:32s} {verdict:10s} {m['seconds']:7.2f} s  peak {m['kib'] / 1024:7.1f} MiB "
              f"({m['kib'] / base['kib']:.1f}x the trivial case)")


if __name__ == "__main__":
    main()
