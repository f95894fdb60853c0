"""p_A(n) with large parts: the method `plan` chooses, its time, and the old path (coefficient table or
waves of the quasi-polynomial) measured in the same run where it can run at all.

    python3 tests/benchmarks/bench_partitions.py [--quick]

Goals (issue 15, issue 17): parts up to 10^6 in < 1 s; parts of 10^9 and more where the waves cannot run.
"""
import os
import sys

sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__)))))
sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))

from checker.mathematics import ehrhart, partitions as module  # noqa: E402
from checker.mathematics.partitions import PartitionQuasiPolynomial, partitions, partitions_by_table, plan  # noqa: E402
from timing import best_of  # noqa: E402

NEAR_10_4 = [9973, 10007, 9967, 10009, 10037]
NEAR_10_6 = [999983, 1000003, 999979, 1000033, 1000037]
NEAR_10_9 = [10**9 + 7, 10**9 + 9, 10**9 + 21, 10**9 + 33, 10**9 + 87]


def cold(fn):
    """Run fn with the caches of the waves and of the cones emptied first (a cold build, as in a fresh process)."""
    def run():
        PartitionQuasiPolynomial._instances.clear()
        module._QP_COSTS.clear()
        ehrhart._CONES.clear()
        return fn()
    return run


def ours(n, parts, repeat=3):
    method = plan(n, tuple(parts)).method
    return best_of(cold(lambda: partitions(n, parts)), repeat), method


def show(label, n, parts, reference=None, ref_name="", repeat=3):
    t, method = ours(n, parts, repeat)
    line = f"  {label:<32} n = {fmt(n):<9} {t * 1e3:10.3f} ms  [{method}]"
    if reference is not None:
        r = best_of(cold(reference), 1)
        line += f"; {ref_name} {r * 1e3:10.1f} ms; ratio {t / r:.2e}x"
    print(line, flush=True)


def fmt(n):
    s = str(n)
    lead, zeros = s.rstrip("0"), len(s) - len(s.rstrip("0"))
    if len(s) < 7 or len(lead) > 1:
        return s if len(s) < 7 else f"~10^{len(s) - 1}"
    return f"10^{zeros}" if lead == "1" else f"{lead}*10^{zeros}"


def waves(n, parts):
    return lambda: PartitionQuasiPolynomial(tuple(sorted(parts))).value(n)


def main(quick=False):
    print("p_A(n) with large parts (goal: parts up to 10^6 in < 1 s; 10^9 where the waves cannot run)")
    print(" three parts: Popoviciu's formula summed by floor sums, O(log)")
    show("3 parts near 3*10^4", 10**30, [30011, 30013, 30029], waves(10**30, [30011, 30013, 30029]), "waves")
    show("3 parts near 10^6", 10**7, NEAR_10_6[:3], lambda: partitions_by_table(10**7, NEAR_10_6[:3]), "table")
    for n in (10**12, 10**30):
        show("3 parts near 10^6", n, NEAR_10_6[:3])
    show("3 parts near 10^9", 10**30, NEAR_10_9[:3])
    show("3 parts near 10^30", 10**100, [10**30 + 1, 10**30 + 3, 10**30 + 7])
    print(" four and five parts: recursion over the largest parts while n / part is small, Fourier-Dedekind"
          " sums modulo each part otherwise; Barvinok's cones of the simplex first (metered, giving way past"
          " the other method's cost) when every other method costs 10^7 steps or more")
    for k in (4, 5):
        show(f"{k} parts near 10^4", 10**30, NEAR_10_4[:k], waves(10**30, NEAR_10_4[:k]), "waves")
    show("4 parts near 10^6", 10**7, NEAR_10_6[:4], lambda: partitions_by_table(10**7, NEAR_10_6[:4]), "table")
    for n in (4 * 10**7, 10**9):
        show("4 parts near 10^6", n, NEAR_10_6[:4])
    for n in (10**8, 3 * 10**8):
        show("5 parts near 10^6", n, NEAR_10_6)
    show("4 parts near 10^9", 10**12, NEAR_10_9[:4])
    show("4 parts near 10^9", 10**13, NEAR_10_9[:4], repeat=1)
    show("5 parts near 10^9", 10**11, NEAR_10_9, repeat=1)
    if not quick:
        for k in (4, 5):
            show(f"{k} parts near 10^6", 10**30, NEAR_10_6[:k], repeat=1)


if __name__ == "__main__":
    main(quick="--quick" in sys.argv)
