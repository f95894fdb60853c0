"""The `quasicert` command.  The only place that prints and exits.

    quasicert check [PATH ...]      replay certificates (default: the bundled ones)
    quasicert eval EXPR ...         print exact values, one per line
    quasicert derive EXPR           write a certificate for a value
    quasicert functions | rules     list the language's functions or rules
"""
from __future__ import annotations

import argparse
import sys
from typing import Sequence

from .errors import CertificateError, UsageError
from .limits import DEFAULT_LIMITS, Limits
from .numbers import value_text

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
    from .evaluation import evaluate
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
    from .functions import REGISTRY
    width = max(len(f"{s.name}({s.signature})") for s in REGISTRY.values())
    for spec in REGISTRY.values():
        head = f"{spec.name}({spec.signature})"
        print(f"{head.ljust(width)}  {spec.definition}", file=out)
    return EXIT_OK


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="quasicert", description=(
        "Replays certificates about Dedekind-type sums, Bernoulli numbers and restricted "
        "partition functions with exact arithmetic, and points at the first wrong step."))
    sub = p.add_subparsers(dest="command", metavar="COMMAND")
    sub.add_parser("eval", help="print the exact value of expressions", add_help=False)
    sub.add_parser("functions", help="list the functions of the language")
    return p


def main(argv: Sequence[str] | None = None, out=None, err=None) -> int:
    """Run the command; returns the exit code (0 verified, 1 a claim failed, 2 unusable input)."""
    out = out or sys.stdout
    err = err or sys.stderr
    argv = list(sys.argv[1:] if argv is None else argv)
    try:
        if argv and argv[0] == "eval":
            return _cmd_eval(argv[1:], out, err)
        ns, rest = _parser().parse_known_args(argv)
        if ns.command == "functions":
            return _cmd_functions(out)
        _parser().print_help(file=err)
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


def entry() -> None:
    sys.exit(main())
