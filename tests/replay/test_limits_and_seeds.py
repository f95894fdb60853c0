"""The seconds limit holds inside one statement; the second opinion's instances are unpredictable
unless a seed is given; line ends other than \\n are refused at their position."""
import io
import time
from pathlib import Path

import pytest

from checker import check_text
from checker.foundation.limits import DEFAULT_LIMITS
from checker.interfaces.cli import main
from checker.replay.instances import Sampler
from checker.kernel.evaluation import Evaluator
from checker.language.parsing import parse_certificate

FAST = DEFAULT_LIMITS.with_overrides({"seconds": 1})


@pytest.mark.parametrize("text", [
    # each value within budget, many of them: the limit must stop the identity, the sum, the lemma
    "identity for all n: generalized_dedekind(300, n, 3000) = generalized_dedekind(300, n + 3000, 3000)\n",
    "claim total(j from 1 to 1000: generalized_dedekind(300, j, 3000)) = 0\n",
    "lemma slow(k) for k >= 1, k <= 1000:\n"
    "  generalized_dedekind(100, 1, 20000 + k) - generalized_dedekind(100, 1, 20000 + k) + k = k\n"
    "  chain generalized_dedekind(100, 1, 20000 + k) - generalized_dedekind(100, 1, 20000 + k) + k\n"
    "    = k by arithmetic\nend\n",
])
def test_the_seconds_limit_stops_a_single_long_statement(text):
    start = time.monotonic()
    report = check_text(text, limits=FAST)
    assert time.monotonic() - start < 30          # a generous bound on a loaded machine, not a timing
    f = report.failure
    assert f is not None and f.kind == "limit" and f.exit_code == 2
    assert "limit seconds = 1" in f.message and f.line is not None


def _lemma_instances(seed):
    cert = parse_certificate("lemma f(k) for k >= 1:\n  k = k\n  chain k\n    = k by arithmetic\nend\n")
    lemma = cert.statements[0]
    sampler = Sampler(Evaluator(), lemma.params, lemma.conditions, seed=seed)
    return [e["k"] for e in sampler.large()]


def test_second_opinion_instances_are_unpredictable_but_reproducible():
    assert _lemma_instances(5) == _lemma_instances(5)
    assert _lemma_instances(None) != _lemma_instances(None)      # 30 random values of up to 30 digits
    report = check_text("lemma f(k) for k >= 1:\n  k = k\n  chain k\n    = k by arithmetic\nend\n")
    assert report.ok and isinstance(report.seed, int)
    assert check_text("claim 1 = 1\n", seed=42).seed == 42


def test_cli_seed_option():
    out = io.StringIO()
    assert main(["check", "--seed", "7", "--no-time", str(Path(__file__).parent.parent / "broken" / "unknown-rule.qcert")],
                out=out, err=io.StringIO()) == 1
    out = io.StringIO()
    assert main(["check", "--seed", "x"], out=out, err=io.StringIO()) == 2


@pytest.mark.parametrize("mark", ["\r", "\x0b", "\x0c", "\x1c", "\x1d", "\x1e", "\x85", "\u2028", "\u2029",
                                  "\u202e", "\u2066", "\x1b", "\x7f", "\x9b", "\x01"])
def test_line_breaks_the_grammar_does_not_know_are_refused_where_they_stand(mark):
    text = f"claim dedekind(5, 17) = 1/17\nclaim 1 = 1   # note{mark}claim dedekind(1, 3) = 5\n"
    f = check_text(text).failure
    assert f is not None and f.kind == "syntax error"
    assert (f.line, f.column) == (2, 21)


def test_crlf_line_ends_are_read_as_line_ends():
    report = check_text("claim dedekind(5, 17) = 1/17   # note\r\nclaim dedekind(1, 3) = 5\r\n")
    f = report.failure
    assert f is not None and (f.line, f.kind) == (2, "failed")     # s(1, 3) = 1/18 (python-flint)


def _deadline_seen_by(run):
    """(what run gives, the deadline its function saw, the deadline afterwards)."""
    from checker.foundation.limits import current_deadline
    seen = []
    result = run(lambda: seen.append(current_deadline()) or "done")
    return result, seen[0] if seen else None, current_deadline()


def test_call_within_is_time_limit_then_check_time():
    # the number-call fast path's clock: the same deadline as `with time_limit(s): check_time(); fn()`,
    # a sooner outer one kept, the check before fn, the outer deadline restored afterwards
    from checker.foundation.errors import OutOfTime
    from checker.foundation.limits import call_within, check_time, current_deadline, time_limit

    def by_the_block(seconds):
        def run(fn):
            with time_limit(seconds):
                check_time()
                return fn()
        return run

    def by_call_within(seconds):
        return lambda fn: call_within(seconds, fn, ())

    assert current_deadline() is None
    for seconds in (600, 5):
        result, seen, after = _deadline_seen_by(by_call_within(seconds))
        assert (result, seen[1], after) == ("done", seconds, None)
        with time_limit(30):
            outer = current_deadline()
            for run in (by_the_block, by_call_within):
                result, seen, after = _deadline_seen_by(run(seconds))
                assert result == "done" and after == outer
                assert seen[1] == min(seconds, 30) and (seen == outer) == (seconds >= 30)
    for outer, inner in ((600, 0), (0, 600)):       # its own limit passed, or the outer one
        messages = []
        for run in (by_the_block, by_call_within):
            with time_limit(outer):
                with pytest.raises(OutOfTime) as caught:
                    run(inner)(lambda: pytest.fail("ran after the deadline"))
                messages.append(caught.value.message)
        assert messages[0] == messages[1] and messages[0].startswith("the check has run for more than 0 s")
    assert current_deadline() is None
