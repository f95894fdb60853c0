"""The `quasicert` command.  The only place that prints and exits.

    quasicert check [PATH ...]      replay certificates (default: the bundled ones)
    quasicert eval EXPR ...         print exact values, one per line
    quasicert derive EXPR           write a certificate for a value
    quasicert latex PATH            a checked certificate as LaTeX
    quasicert functions | rules     list the language's functions or rules
"""
from __future__ import annotations

import argparse
import sys
from typing import Sequence

from ..foundation.errors import CertificateError, UsageError
from ..foundation.limits import DEFAULT_LIMITS, Limits
from ..foundation.numbers import value_text

__all__ = ["main"]

EXIT_OK, EXIT_FAILED, EXIT_ERROR = 0, 1, 2


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


def _print_error(err: CertificateError, text: str, label: str, out) -> None:
    where = f"{label}:{err.line}:{err.column}" if err.line else label
    print(f"{where}: {err.kind}: {err.message}", file=out)
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
            _print_error(e, text, f"expression {i}", err)
            status = EXIT_ERROR
    return status


def _cmd_functions(out) -> int:
    from ..kernel.functions import REGISTRY
    width = max(len(f"{s.name}({s.signature})") for s in REGISTRY.values())
    for spec in REGISTRY.values():
        head = f"{spec.name}({spec.signature})"
        print(f"{head.ljust(width)}  {spec.definition}", file=out)
    return EXIT_OK


def _cmd_rules(out) -> int:
    from ..kernel.rules import RULES, WHOLE_LINE_RULES
    for rule in RULES.values():
        if not rule.laws:
            print(f"{rule.name}\n    {rule.statement}\n    needs: {rule.conditions}\n    source: {rule.source}",
                  file=out)
            continue
        print(rule.name, file=out)
        for call, statement, conditions, source in rule.laws:
            print(f"    on {call}: {statement}\n        needs: {conditions}\n        source: {source}", file=out)
    for name, (statement, conditions, source) in WHOLE_LINE_RULES.items():
        head = "claim LABEL" if name == "claim" else name
        print(f"{head}\n    {statement}\n    needs: {conditions}", file=out)
    print("lemma NAME(E1, ...)\n    previous line - next line = c * (lhs - rhs) of the lemma at the values E1, ...\n"
          "    needs: the lemma was proved above or came by `use`; its assumptions hold for the values",
          file=out)
    print("\nIn lemmas reduce, reciprocity (of s and s_p), negate, inverse, common_factor, three_term and "
          "bridge take parameters:\ntheir side conditions are derived from the lemma's assumptions (gcd, signs, "
          "residues, divisibility)\nand refused, naming the condition, when they cannot be; the other laws need "
          "numbers.", file=out)
    return EXIT_OK


def certificate_paths(paths: Sequence[str]) -> list:
    """Files named, and the *.qcert files below folders named, in a stable order."""
    from pathlib import Path
    found = []
    for p in paths:
        path = Path(p)
        if path.is_dir():
            found.extend(sorted(q for q in path.rglob("*.qcert") if q.is_file()))   # tables only by name
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
    path, limits, keep_going, paranoid = args
    from ..replay.checking import check_file
    from .tables import TABLE_SUFFIXES, check_table
    if path.suffix.lower() in TABLE_SUFFIXES:
        return check_table(path, limits)
    return check_file(path, limits, keep_going=keep_going, paranoid=paranoid)


def _progress_bar(total, out, unit: str = "file"):
    """A tqdm bar (rate and time left) when the output is a terminal, nothing otherwise."""
    isatty = getattr(out, "isatty", None)
    if not (isatty and isatty()) or (total is not None and total < 2):
        return None
    try:
        from tqdm import tqdm
    except ImportError:
        return None
    return tqdm(total=total, unit=unit, leave=False, file=sys.stderr)


def _cmd_check(ns, out, err) -> int:
    import time
    from ..replay.report import render_failure, summary_line
    from .tables import TABLE_SUFFIXES, check_table
    limits = _limits_from(ns.limit)
    paths = certificate_paths(ns.paths) if ns.paths else bundled_certificates()
    if not paths:
        raise UsageError("no certificates (*.qcert) found")
    if ns.jobs < 1:
        raise UsageError("--jobs wants a whole number >= 1")
    start = time.perf_counter()
    jobs = [(p, limits, ns.every_failure, ns.paranoid) for p in paths]
    bar = _progress_bar(len(paths), out)
    if len(paths) == 1 and paths[0].suffix.lower() in TABLE_SUFFIXES:
        rows_bar = _progress_bar(None, out, "row")
        reports = [check_table(paths[0], limits, ns.jobs, rows_bar.update if rows_bar else None)]
        if rows_bar:
            rows_bar.close()
    elif ns.jobs > 1 and len(paths) > 1:
        from concurrent.futures import ProcessPoolExecutor
        from .tables import bounded_map
        reports = []
        with ProcessPoolExecutor(ns.jobs) as pool:
            for r in bounded_map(pool, _check_one, jobs, 4 * ns.jobs):
                reports.append(r)
                if bar:
                    bar.update()
    else:
        reports = []
        for j in jobs:
            reports.append(_check_one(j))
            if bar:
                bar.update()
    if bar:
        bar.close()
    if ns.format != "text":
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
    path = Path(ns.path)
    if not path.exists():
        raise UsageError(f"no such file: {ns.path}")
    text = ""
    try:
        text = read_certificate_text(path)
        document = certificate_latex(text, str(path))
    except CertificateError as e:
        _print_error(e, text, str(path), err)
        return EXIT_ERROR
    return _emit(document, ns.output, out)


def _emit(text: str, output, out) -> int:
    """Write a command's document to -o FILE, or to the screen."""
    if output:
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
    try:
        text = derive(ns.expression)
    except CertificateError as e:
        _print_error(e, ns.expression, "expression", err)
        return EXIT_ERROR
    return _emit(text, ns.output, out)


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="quasicert", description=(
        "Replays certificates about Dedekind-type sums, Bernoulli numbers and restricted "
        "partition functions with exact arithmetic, and points at the first wrong step."),
        epilog="exit status: 0 all verified, 1 a claim or step is wrong, 2 unreadable input, "
               "a syntax error, a usage error or a limit reached, 3 a bug in quasicert found by --paranoid")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")
    c = sub.add_parser("check", help="replay certificates (default: the bundled ones)")
    c.add_argument("paths", nargs="*", metavar="PATH",
                   help="*.qcert certificates, *.csv or *.jsonl tables of claims, or folders to search for *.qcert")
    c.add_argument("--jobs", type=int, default=1, metavar="N",
                   help="spread files, or the rows of one table, over N processes (same verdicts and order)")
    c.add_argument("--every-failure", action="store_true",
                   help="go on past the first failure and list every failing step")
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
    c.add_argument("--no-time", action="store_true",
                   help="leave the time out of the summary line (byte-identical output)")
    sub.add_parser("eval", help="print the exact value of expressions", add_help=False)
    d = sub.add_parser("derive", help="write a certificate for a value, e.g. \"dedekind(5, 17)\"")
    d.add_argument("expression")
    d.add_argument("-o", "--output", metavar="FILE", help="write to FILE instead of the screen")
    t = sub.add_parser("latex", help="write a checked certificate as a LaTeX document (failures marked)")
    t.add_argument("path")
    t.add_argument("-o", "--output", metavar="FILE", help="write to FILE instead of the screen")
    sub.add_parser("functions", help="list the functions of the language")
    sub.add_parser("rules", help="list the rules a step may cite")
    return p


def main(argv: Sequence[str] | None = None, out=None, err=None) -> int:
    """Run the command; returns the exit code (0 verified, 1 a claim failed, 2 unusable input)."""
    out = out or sys.stdout
    err = err or sys.stderr
    argv = list(sys.argv[1:] if argv is None else argv)
    try:
        if argv and argv[0] == "eval":
            return _cmd_eval(argv[1:], out, err)
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
            return _cmd_rules(out)
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
    except Exception as e:  # a bug of ours: say so plainly instead of a traceback
        print(f"quasicert: internal error, please report it: {type(e).__name__}: {e}", file=err)
        return EXIT_ERROR


def entry() -> None:
    sys.exit(main())
