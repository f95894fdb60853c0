"""The `quasicert` command.  The only place that prints and exits.

    quasicert check [PATH ...]      replay certificates (default: the bundled ones)
    quasicert eval EXPR ...         print exact values, one per line
    quasicert derive EXPR           write a certificate for a value
    quasicert latex PATH            a checked certificate as LaTeX
    quasicert functions | rules     list the language's functions or rules
"""
from __future__ import annotations

import argparse
import os
import re
import sys
from typing import Sequence

from ..foundation.errors import CertificateError, UsageError
from ..foundation.limits import DEFAULT_LIMITS, Limits
from ..foundation.numbers import value_text

__all__ = ["main"]

EXIT_OK, EXIT_FAILED, EXIT_ERROR = 0, 1, 2
EXIT_BROKEN_PIPE = 141       # 128 + SIGPIPE, what a shell reports for a writer whose reader went away


def _quiet_closed_pipe(out) -> None:
    """The reader of our output has gone (`| head`): stop quietly, also at interpreter exit."""
    import os
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, (out if hasattr(out, "fileno") else sys.stdout).fileno())
    except (OSError, ValueError, AttributeError):    # io.UnsupportedOperation is both of the first two
        pass


def _limits_from(pairs: Sequence[str]) -> Limits:
    overrides = {}
    for pair in pairs or ():
        name, _, amount = pair.partition("=")
        if not amount.isdigit():
            raise UsageError(f"--limit wants NAME=N with a whole number N, not '{pair}'")
        overrides[name.strip()] = int(amount)
    try:
        return DEFAULT_LIMITS.with_overrides(overrides)
    except KeyError as e:
        from dataclasses import fields
        if len(e.args) > 1 and e.args[1]:
            raise UsageError(f"the limit {e.args[0]} is now called {e.args[1]}: write --limit "
                             f"{e.args[1]}=N") from None
        names = ", ".join(f.name.replace("_", "-") for f in fields(Limits))
        raise UsageError(f"there is no limit called {e.args[0]}; the limits are {names}") from None


def _split_eval_args(args: Sequence[str]) -> tuple[list[str], list[str]]:
    """Expressions and --limit values; a leading minus sign starts an expression, not an option."""
    exprs, limits = [], []
    it = iter(args)
    for a in it:
        if a == "--":
            exprs.extend(it)
            break
        if a == "--limit":
            limits.append(next(it, ""))
        elif a.startswith("--limit="):
            limits.append(a[len("--limit="):])
        elif a in ("-h", "--help"):
            raise SystemExit(_usage_eval())
        else:
            exprs.append(a)
    return exprs, limits


def _usage_eval() -> str:
    return ("usage: quasicert eval [--limit NAME=N] EXPR [EXPR ...]\n"
            "Prints the exact value of each expression on its own line (p/q in lowest terms).")


_UNKNOWN_NAME = re.compile(r"unknown name '([^']*)'(?: \(did you mean '[^']*'\?\))?: give it a value with `let` first")


def _print_error(err: CertificateError, text: str, label: str, out) -> None:
    """`argument 4, column 12: syntax error: ...` and the marked text, for an expression typed
    on the command line (where `let` does not exist)."""
    where = label
    if err.line:
        where += (f", line {err.line}" if "\n" in text else "") + f", column {err.column}"
    message = _UNKNOWN_NAME.sub(lambda m: f"unknown name '{m.group(1)}': an expression on the command line "
                                f"has numbers, lists and function calls, no names", err.message)
    print(f"{where}: {err.kind}: {message}", file=out)
    ctx = err.context(text)
    if ctx:
        print(ctx, file=out)


def _cmd_eval(args: Sequence[str], out, err) -> int:
    from ..replay.values import evaluate
    exprs, limit_pairs = _split_eval_args(args)
    limits = _limits_from(limit_pairs)
    if not exprs:
        raise UsageError("eval needs at least one expression, e.g. quasicert eval \"dedekind(5, 17)\"")
    status = EXIT_OK
    for i, text in enumerate(exprs, 1):
        try:
            print(value_text(evaluate(text, limits=limits)), file=out)
        except CertificateError as e:
            _print_error(e, text, f"argument {i}", err)
            status = EXIT_ERROR
    return status


def _cmd_functions(out) -> int:
    from ..kernel.functions import REGISTRY
    width = max(len(f"{s.name}({s.signature})") for s in REGISTRY.values())
    for spec in REGISTRY.values():
        head = f"{spec.name}({spec.signature})"
        print(f"{head.ljust(width)}  {spec.definition}", file=out)
    return EXIT_OK


def _rule_entries() -> list[tuple]:
    """(name, statement, side conditions, source, laws or None) for each rule a step may cite."""
    from ..kernel.rules import RULES, WHOLE_LINE_RULES
    entries = [(r.name, r.statement, r.conditions, r.source, r.laws) for r in RULES.values()]
    for name, (statement, conditions, source) in WHOLE_LINE_RULES.items():
        entries.append(("claim LABEL" if name == "claim" else name, statement, conditions, source, None))
    entries.append(("lemma NAME(E1, ...)",
                    "previous line - next line = c * (lhs - rhs) of the lemma at the values E1, ...",
                    "the lemma was proved above or came by `use`; its assumptions hold for the values", None,
                    None))
    return entries


def _cmd_rules(out, name: str | None = None) -> int:
    entries = _rule_entries()
    if name:
        chosen = [e for e in entries if e[0].split()[0] == name.strip()]
        if not chosen:
            names = ", ".join(e[0].split()[0] for e in entries)
            raise UsageError(f"there is no rule called '{name}'; the rules are {names}")
        entries = chosen
    for head, statement, conditions, source, laws in entries:
        if laws:
            print(head, file=out)
            for call, law, needs, origin in laws:
                print(f"    on {call}: {law}\n        needs: {needs}\n        source: {origin}", file=out)
            continue
        print(f"{head}\n    {statement}\n    needs: {conditions}"
              + (f"\n    source: {source}" if source else ""), file=out)
    if not name:
        print("\nIn lemmas reduce, reciprocity (of s and s_p), negate, inverse, common_factor, three_term and "
              "bridge take parameters:\ntheir side conditions are derived from the lemma's assumptions (gcd, "
              "signs, residues, divisibility)\nand refused, naming the condition, when they cannot be; the other "
              "laws need numbers.", file=out)
    return EXIT_OK


INPUT_SUFFIXES = (".qcert", ".csv", ".jsonl")


def certificate_paths(paths: Sequence[str]) -> list:
    """Files named, and the certificates and tables (*.qcert, *.csv, *.jsonl) below folders named."""
    from pathlib import Path
    found = []
    for p in paths:
        path = Path(p)
        if p == "-":
            found.append(path)
        elif path.is_dir():
            # hidden folders (.git, .venv) hold other programs' files, not claims to check
            found.extend(sorted(q for q in path.rglob("*") if q.suffix.lower() in INPUT_SUFFIXES and q.is_file()
                                and not any(part.startswith(".") for part in q.relative_to(path).parts)))
        elif path.exists():
            found.append(path)
        else:
            raise UsageError(f"no such file or folder: {p}")
    return found


def bundled_certificates() -> list:
    from ..foundation.resources import resource_dir
    folder = resource_dir("checker.certificates", "certificates")
    return sorted(q for q in folder.rglob("*.qcert") if q.is_file())


def _check_one(args):
    """Check one path (a certificate or a table); module level so that processes can run it."""
    path, limits, keep_going, paranoid, allow_empty, seed, jobs = args
    from .files import check_file
    return check_file(path, limits, keep_going=keep_going, paranoid=paranoid, allow_empty=allow_empty,
                      seed=seed, jobs=jobs)


def _check_stdin(kind: str, limits, keep_going, paranoid, allow_empty, seed=None):
    """Standard input, read as a certificate or (with --as csv/jsonl) a table."""
    from .files import check_text, require_something
    from .tables import check_table
    stream = sys.stdin
    if kind in ("csv", "jsonl"):
        if hasattr(stream, "reconfigure"):
            stream.reconfigure(encoding="utf-8", newline="")
        return require_something(check_table(f"-.{kind}", limits, stream=stream, name="<stdin>"), allow_empty)
    data = stream.buffer.read() if hasattr(stream, "buffer") else stream.read().encode("utf-8")
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as e:
        from ..replay.report import Failure, Report
        report = Report(name="<stdin>")
        report.failures.append(Failure(None, None, f"standard input is not UTF-8 text (byte {e.start})",
                                       kind="unreadable", exit_code=EXIT_ERROR))
        return report
    return check_text(text, "<stdin>", limits, keep_going, paranoid, allow_empty, seed)


def _progress_bar(total, out, unit: str = "file"):
    """A tqdm bar (rate and time left) when the output is a terminal, nothing otherwise."""
    isatty = getattr(out, "isatty", None)
    if not (isatty and isatty()) or (total is not None and total < 2):
        return None
    try:
        from tqdm import tqdm
    except ImportError:
        return None
    return tqdm(total=total, unit=unit, leave=False, file=out)


class _Ticker:
    """On a terminal, a line 'checking NAME, 12 s' rewritten each second while one long check runs."""

    def __init__(self, out, name: str, after: float = 2.0):
        import threading
        isatty = getattr(out, "isatty", None)
        self.live = bool(isatty and isatty())
        self.out, self.name, self.after = out, name, after
        self.stop = threading.Event()
        self.thread = threading.Thread(target=self._run, daemon=True) if self.live else None
        self.shown = False

    def _run(self):
        import time
        start = time.monotonic()
        if self.stop.wait(self.after):
            return
        while not self.stop.is_set():
            print(f"\rquasicert: checking {self.name}, {time.monotonic() - start:.0f} s ",
                  end="", file=self.out, flush=True)
            self.shown = True
            self.stop.wait(1.0)

    def __enter__(self):
        if self.thread:
            self.thread.start()
        return self

    def __exit__(self, *exc):
        if self.thread:
            self.stop.set()
            self.thread.join()
            if self.shown:
                print("\r\033[K", end="", file=self.out, flush=True)
        return False


def _cmd_check(ns, out, err) -> int:
    import time
    from ..replay.report import render_failure, summary_line
    from .files import EXIT_EMPTY
    from .tables import check_table, is_table
    limits = _limits_from(ns.limit)
    paths = certificate_paths(ns.paths) if ns.paths else bundled_certificates()
    if ns.jobs is not None and ns.jobs < 1:
        raise UsageError("--jobs wants a whole number >= 1")
    if not paths:
        if ns.allow_empty:
            print("quasicert: nothing to check (no *.qcert, *.csv or *.jsonl found); --allow-empty accepts it",
                  file=err)
            return EXIT_OK
        print("quasicert: nothing to check: no *.qcert, *.csv or *.jsonl file found (exit 4; --allow-empty "
              "accepts it)", file=err)
        return EXIT_EMPTY
    if sum(1 for p in paths if str(p) == "-") > 1:
        raise UsageError("standard input (-) can be read once only")
    machine = ns.format != "text"
    keep_going = ns.every_failure or machine          # JSON and SARIF carry every failure
    start = time.perf_counter()
    spread = ns.jobs is not None and ns.jobs > 1 and len(paths) > 1 and not any(str(p) == "-" for p in paths)
    # files spread over processes check their tables in their own process; otherwise a table gets
    # --jobs workers, or its default number (checker.interfaces.tables.default_jobs)
    jobs = [(p, limits, keep_going, ns.paranoid, ns.allow_empty, ns.seed, 1 if spread else ns.jobs) for p in paths]
    bar = _progress_bar(len(paths), err)
    reports = []
    if len(paths) == 1 and str(paths[0]) != "-" and is_table(paths[0]):
        from .files import require_something
        rows_bar = _progress_bar(None, err, "row")
        reports = [require_something(check_table(paths[0], limits, ns.jobs,
                                                 rows_bar.update if rows_bar is not None else None),
                                     ns.allow_empty)]
        if rows_bar is not None:
            rows_bar.close()
    elif spread:
        from concurrent.futures import ProcessPoolExecutor
        from .tables import bounded_map
        with ProcessPoolExecutor(ns.jobs) as pool:
            for r in bounded_map(pool, _check_one, jobs, 4 * ns.jobs):
                reports.append(r)
                if bar is not None:
                    bar.update()
    else:
        for j in jobs:
            with _Ticker(err if bar is None else None, str(j[0])):
                if str(j[0]) == "-":
                    reports.append(_check_stdin(ns.as_format, limits, keep_going, ns.paranoid, ns.allow_empty,
                                                ns.seed))
                else:
                    reports.append(_check_one(j))
            if bar is not None:
                bar.update()
    if bar is not None:
        bar.close()
    if machine:
        from .formats import reports_json, reports_sarif
        out.write(reports_json(reports) if ns.format == "json" else reports_sarif(reports))
        return max((r.exit_code for r in reports), default=EXIT_OK)
    for report in reports:
        for f in report.failures:
            print(render_failure(report, f), file=out)
        if ns.list_each:
            status = "verified" if report.ok else "not verified"
            print(f"{report.name}: {status} ({report.checked} checked)", file=out)
            for note in report.notes:
                print(f"  {note}", file=out)
    print(summary_line(reports, None if ns.no_time else time.perf_counter() - start), file=out)
    return max((r.exit_code for r in reports), default=EXIT_OK)


def _cmd_latex(ns, out, err) -> int:
    from pathlib import Path
    from ..replay.library import read_certificate_text
    from .latex import certificate_latex
    if ns.path == "-":
        text, name = sys.stdin.read(), "<stdin>"
    else:
        path = Path(ns.path)
        if not path.exists():
            raise UsageError(f"no such file: {ns.path}")
        _refuse_overwrite(ns.output, ns.force, path)
        text, name = "", str(path)
        try:
            text = read_certificate_text(path)
        except CertificateError as e:
            _print_error(e, text, str(path), err)
            return EXIT_ERROR
    _refuse_overwrite(ns.output, ns.force)
    try:
        document = certificate_latex(text.removeprefix("\ufeff"), name, fragment=ns.fragment)
    except CertificateError as e:
        _print_error(e, text, name, err)
        return EXIT_ERROR
    return _emit(document, ns.output, out)


def _refuse_overwrite(output, force: bool, source=None) -> None:
    """-o FILE never replaces the input, and replaces another existing file only with --force."""
    from pathlib import Path
    if not output or output == "-":
        return
    target = Path(output)
    if source is not None and target.exists() and target.resolve() == Path(source).resolve():
        raise UsageError(f"{output} is the input itself; write the output elsewhere")
    if target.exists() and not force:
        raise UsageError(f"{output} exists; quasicert does not replace files unless --force is given")


def _emit(text: str, output, out) -> int:
    """Write a command's document to -o FILE, or to the screen."""
    if output and output != "-":
        try:
            with open(output, "w", encoding="utf-8") as fh:
                fh.write(text)
        except OSError as e:
            raise UsageError(f"cannot write {output}: {e.strerror}") from None
    else:
        out.write(text)
    return EXIT_OK


def _cmd_derive(ns, out, err) -> int:
    from .derive import derive
    if ns.expression.strip().endswith(".qcert") or os.path.isfile(ns.expression):
        raise UsageError(f"derive takes an expression such as \"dedekind(5, 17)\", not a file: it writes a "
                         f"certificate; to check one, run quasicert check {ns.expression}")
    if ns.steps_per_line is not None and ns.steps_per_line < 1:
        raise UsageError("--steps-per-line wants a whole number >= 1")
    _refuse_overwrite(ns.output, ns.force)
    try:
        text = derive(ns.expression, ns.steps_per_line, _limits_from(ns.limit))
    except CertificateError as e:
        _print_error(e, ns.expression, "the expression", err)
        return EXIT_ERROR
    return _emit(text, ns.output, out)


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="quasicert", description=(
        "Replays certificates about Dedekind-type sums, Bernoulli numbers and restricted "
        "partition functions with exact arithmetic, and points at the first wrong step."),
        epilog="exit status: 0 all verified, 1 a claim or step is wrong, 2 unreadable input, "
               "a syntax error, a usage error or a limit reached, 3 a bug in quasicert found by --paranoid "
               "or a lemma's second opinion, 4 nothing was checked (an empty certificate or table, or no "
               "input found; --allow-empty accepts it)")
    from ..foundation.version import __version__
    p.add_argument("--version", action="version", version=f"quasicert {__version__}")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")
    c = sub.add_parser("check", help="replay certificates (default: the bundled ones)")
    c.add_argument("paths", nargs="*", metavar="PATH",
                   help="*.qcert certificates, *.csv or *.jsonl tables of claims, folders (searched for all "
                        "three), or - for standard input")
    c.add_argument("--as", dest="as_format", choices=["qcert", "csv", "jsonl"], default="qcert",
                   help="what standard input (-) holds: a certificate (default) or a table")
    c.add_argument("--allow-empty", action="store_true",
                   help="let a certificate or table that checks nothing (or no input at all) pass; "
                        "by default it fails with exit status 4")
    c.add_argument("--jobs", type=int, default=None, metavar="N",
                   help="spread files, or the rows of a table, over N processes (same verdicts and order); "
                        "by default files are checked in one process, and a table of 2 MiB or more in one "
                        "process per MiB, at most one per processor; --jobs 1 keeps everything in one "
                        "process")
    c.add_argument("--every-failure", action="store_true",
                   help="go on past the first failure and list every failing step (always on for json and "
                        "sarif; tables always list every failing row)")
    c.add_argument("--list-each", action="store_true",
                   help="print one verdict line per file, and how each identity was decided")
    c.add_argument("--limit", action="append", metavar="NAME=N", default=[],
                   help="raise or lower a budget, e.g. --limit terms=10000000")
    c.add_argument("--paranoid", action="store_true",
                   help="compute every function value a second way where sizes allow; "
                        "a disagreement is reported as a bug in quasicert (exit 3)")
    c.add_argument("--format", choices=["text", "json", "sarif"], default="text",
                   help="text for people (default); json, one object per certificate; sarif, the "
                        "SARIF 2.1.0 format that code hosts and editors read")
    c.add_argument("--seed", type=int, default=None, metavar="N",
                   help="draw the instances of the lemmas' numeric second opinion from seed N "
                        "(by default an unpredictable source, new each run); the same N draws the same ones")
    c.add_argument("--no-time", action="store_true",
                   help="leave the time out of the summary line (byte-identical output)")
    sub.add_parser("eval", help="print the exact value of expressions", add_help=False)
    d = sub.add_parser("derive", help="write a certificate for a value, e.g. \"dedekind(5, 17)\"")
    d.add_argument("expression")
    d.add_argument("-o", "--output", metavar="FILE", help="write to FILE instead of the screen")
    d.add_argument("--force", action="store_true", help="replace FILE if it exists")
    d.add_argument("--steps-per-line", type=int, default=None, metavar="N",
                   help="put N steps of reciprocity and reduce on each line of a Dedekind chain (cited as "
                        "descent when N > 1); by default one while the chain fits in about 100 lines")
    d.add_argument("--limit", action="append", metavar="NAME=N", default=[],
                   help="raise or lower a budget, e.g. --limit terms=100000000")
    t = sub.add_parser("latex", help="write a checked certificate as a LaTeX document (failures marked)")
    t.add_argument("path", help="a certificate, or - for standard input")
    t.add_argument("-o", "--output", metavar="FILE", help="write to FILE instead of the screen")
    t.add_argument("--force", action="store_true", help="replace FILE if it exists")
    t.add_argument("--fragment", action="store_true",
                   help="only the body, without preamble, to paste into a document that loads amsmath")
    sub.add_parser("functions", help="list the functions of the language")
    r = sub.add_parser("rules", help="list the rules a step may cite, or one rule with its side conditions")
    r.add_argument("name", nargs="?", help="one rule, e.g. reciprocity")
    return p


def main(argv: Sequence[str] | None = None, out=None, err=None) -> int:
    """Run the command; returns the exit code (0 verified, 1 a claim failed, 2 unusable input)."""
    out = out or sys.stdout
    err = err or sys.stderr
    argv = list(sys.argv[1:] if argv is None else argv)
    try:
        if argv and argv[0] == "eval":
            return _cmd_eval(argv[1:], out, err)
        if argv[:1] == ["--version"]:
            from ..foundation.version import __version__
            print(f"quasicert {__version__}", file=out)
            return EXIT_OK
        parser = _parser()
        ns = parser.parse_args(argv)
        if ns.command == "check":
            return _cmd_check(ns, out, err)
        if ns.command == "derive":
            return _cmd_derive(ns, out, err)
        if ns.command == "latex":
            return _cmd_latex(ns, out, err)
        if ns.command == "functions":
            return _cmd_functions(out)
        if ns.command == "rules":
            return _cmd_rules(out, ns.name)
        parser.print_help(file=err)
        return EXIT_ERROR
    except CertificateError as e:
        print(f"quasicert: {e.message}", file=err)
        return e.exit_code
    except SystemExit as e:
        if isinstance(e.code, str):
            print(e.code, file=out)
            return EXIT_OK
        return EXIT_ERROR if e.code else EXIT_OK
    except KeyboardInterrupt:
        print("quasicert: interrupted", file=err)
        return 130
    except BrokenPipeError:
        _quiet_closed_pipe(out)
        return EXIT_BROKEN_PIPE
    except Exception as e:  # a bug of ours: say so plainly instead of a traceback
        print(f"quasicert: internal error, please report it: {type(e).__name__}: {e}", file=err)
        return EXIT_ERROR


def entry() -> None:
    sys.exit(main())
