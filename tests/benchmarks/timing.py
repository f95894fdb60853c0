"""The one timing helper of the benchmarks: the best of a few runs (the least disturbed by other work)."""
import time


def best_of(fn, repeat=5, clock=time.perf_counter):
    """The shortest wall time of `repeat` calls of fn(), in seconds (with clock=time.process_time,
    the shortest CPU time of this process: on a machine shared by many jobs, the steadier figure)."""
    best = float("inf")
    for _ in range(repeat):
        start = clock()
        fn()
        best = min(best, clock() - start)
    return best
