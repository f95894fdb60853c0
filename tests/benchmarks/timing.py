"""The one timing helper of the benchmarks: the best of a few runs (the least disturbed by other work)."""
import time


def best_of(fn, repeat=5):
    """The shortest wall time of `repeat` calls of fn(), in seconds."""
    best = float("inf")
    for _ in range(repeat):
        start = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - start)
    return best
