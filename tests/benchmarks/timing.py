"""The one timing helper of the benchmarks: the best of a few runs (the least disturbed by other work)."""
import time


def best_of(fn, repeat=5, clock=time.perf_counter):
    """The shortest time of `repeat` calls of fn(), in seconds: wall time, or with
    clock=time.process_time this process's CPU time (steadier on a loaded machine; not for
    work done in child processes)."""
    best = float("inf")
    for _ in range(repeat):
        start = clock()
        fn()
        best = min(best, clock() - start)
    return best
