"""`use "NAME"`: lemmas proved in another certificate.

NAME is either a bundled certificate (``use "dedekind-lemmas"`` reads
certificates/dedekind-lemmas.qcert shipped with quasicert) or a file beside
the using certificate (``use "my-lemmas.qcert"``, ``use "lemmas/forms.qcert"``).
Certificates come from strangers, so a file name may not be absolute, may not
climb out with `..`, and must stay inside the using certificate's folder after
symbolic links are followed.  The used certificate is checked in full first
(its failures make the `use` fail); each file is checked once per run; cycles
and chains deeper than 16 are refused.
"""
from __future__ import annotations

import hashlib
import re
from pathlib import Path, PurePosixPath

from ..foundation.errors import CertificateError, UnreadableFile
from ..foundation.limits import DEFAULT_LIMITS, Limits
from ..foundation.resources import resource_dir
from ..language.parsing import parse_certificate
from .report import Report

__all__ = ["use_lemmas", "resolve_use", "read_certificate_text", "remember_checked", "checked_before"]

_MAX_DEPTH = 16
# one check per text and limits in a process: the same file, unchanged, proves the same lemmas
_VERIFIED: dict = {}
_BUNDLED_NAME = re.compile(r"[a-z0-9][a-z0-9-]{0,63}")


def resolve_use(using: str, target: str) -> Path:
    """The file `target` names, seen from the certificate `using` (a path or '<text>')."""
    if not target.endswith(".qcert"):
        if not _BUNDLED_NAME.fullmatch(target):
            raise CertificateError(f"'{target}' is not a bundled certificate name (lower-case letters, digits "
                                   f"and '-'){_bundled_hint(target)}; a file beside this one ends in .qcert")
        path = resource_dir("checker.certificates", "certificates") / f"{target}.qcert"
        if not path.is_file():
            raise CertificateError(f"there is no bundled certificate '{target}'{_bundled_hint(target)}; "
                                   "`quasicert check` with no path lists and checks them")
        return path.resolve()
    parts = PurePosixPath(target).parts
    if "\\" in target or target.startswith("/") or ".." in parts or not parts or ":" in target:
        raise CertificateError(f"use takes a file in this certificate's folder or below it, written "
                               f"with '/' and without '..', not '{target}'")
    if using.startswith("<"):
        raise CertificateError("a certificate given as text has no folder: it can use bundled "
                               "certificates only")
    base = Path(using).resolve().parent
    path = (base / Path(*parts)).resolve()
    if base != path and base not in path.parents:
        raise CertificateError(f"'{target}' leads outside this certificate's folder")
    return path


def _bundled_hint(target: str) -> str:
    """` (did you mean "NAME"?)` for the bundled certificate closest to `target`, or ''."""
    import difflib
    folder = resource_dir("checker.certificates", "certificates")
    names = sorted(p.stem for p in folder.glob("*.qcert"))
    plain = re.sub(r"[^a-z0-9]+", "-", target.lower()).strip("-")
    near = [plain] if plain in names else difflib.get_close_matches(plain, names, n=1)
    return f' (did you mean "{near[0]}"?)' if near else ""


def read_certificate_text(path: Path, limits: Limits = DEFAULT_LIMITS) -> str:
    """The file's text, or a CertificateError saying why it cannot be read."""
    try:
        size = path.stat().st_size
    except OSError as e:
        raise UnreadableFile(f"cannot read the file: {e.strerror}") from None
    limit = limits.file_bytes
    if size > limit:
        raise UnreadableFile(f"the file has {size} bytes, over the limit file-bytes = {limit} "
                             "(raise it with --limit file-bytes=N)")
    try:
        data = path.read_bytes()
    except OSError as e:
        raise UnreadableFile(f"cannot read the file: {e.strerror}") from None
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError as e:
        line = data.count(b"\n", 0, e.start) + 1
        column = e.start - (data.rfind(b"\n", 0, e.start) + 1) + 1
        raise UnreadableFile(f"the file is not UTF-8 text (byte 0x{data[e.start]:02x} here)",
                               line, column) from None


def use_lemmas(replay, stmt) -> list:
    """The lemmas of the certificate `stmt.target` names, checked first (once per run)."""
    try:
        path = resolve_use(replay.report.name, stmt.target)
    except CertificateError as e:
        raise e.at(stmt)
    key = str(path)
    here = _key_of(replay.report.name)
    chain = replay.using + ((here,) if here else ())
    if key in chain:
        loop = " uses ".join(Path(k).name for k in chain[chain.index(key):] + (key,))
        raise CertificateError(f"use makes a cycle: {loop}").at(stmt)
    if len(chain) >= _MAX_DEPTH:
        raise CertificateError(f"use is nested more than {_MAX_DEPTH} certificates deep").at(stmt)
    known = replay.library.get(key)
    if known is None:
        known = _checked(replay, path, key, chain)
        replay.library[key] = known
    result, read = known
    replay.read.update(read)
    if isinstance(result, list):
        return result
    where = f"{stmt.target}:{result.line}:{result.column}" if getattr(result, "line", None) else stmt.target
    message = getattr(result, "message", str(result))
    raise CertificateError(f"{stmt.target} does not check, so its lemmas cannot be used: {where}: "
                           f"{message}").at(stmt)


def _checked(replay, path: Path, key: str, chain: tuple):
    """(the lemmas or the first failure, {path: digest} of every file the check read).

    A process-wide memo skips re-checking an unchanged file, but only while every file
    its check read, the ones it uses included, still has the digest it had then."""
    try:
        text = read_certificate_text(path, replay.limits)
        cert = parse_certificate(text, key, replay.limits)
    except (UnreadableFile, CertificateError) as e:
        return e, {}
    remembered = (key, _digest_text(text), replay.limits)
    hit = _VERIFIED.get(remembered)
    if hit is not None and all(_digest_file(p) == d for p, d in hit[1].items()):
        return hit[:2]
    report = Report(name=key, text=text)
    nested = replay.nested(cert, report)
    nested.using = chain
    nested.run()
    return _remember(remembered, report, nested)


def _remember(remembered, report, replay):
    """Keep what a full check of one file found: its lemmas or first failure, the files read, the report."""
    result = report.failures[0] if report.failures else list(replay.lemmas.values())
    known = (result, {remembered[0]: remembered[1], **replay.read}, report)
    if len(_VERIFIED) > 64:
        _VERIFIED.clear()
    _VERIFIED[remembered] = known
    return known[:2]


def remember_checked(path, text: str, limits: Limits, report, replay) -> None:
    """A file checked on its own (`quasicert check FILE`) serves a later `use` of it in the process."""
    key = _key_of(str(path))
    if key and not (replay.keep_going and report.failures):
        _remember((key, _digest_text(text), limits), report, replay)


def checked_before(path, text: str, limits: Limits):
    """The report of an earlier full check of this unchanged file in this process, or None."""
    key = _key_of(str(path))
    hit = _VERIFIED.get((key, _digest_text(text), limits)) if key else None
    if hit is None or not all(_digest_file(p) == d for p, d in hit[1].items()):
        return None
    return hit[2]


def _digest_text(text: str) -> str:
    return hashlib.sha256(text.encode()).hexdigest()


def _digest_file(path: str) -> str:
    try:
        return _digest_text(Path(path).read_bytes().decode("utf-8", "replace"))
    except OSError:
        return ""


def _key_of(name: str) -> str:
    if name.startswith("<"):
        return ""
    try:
        return str(Path(name).resolve())
    except OSError:
        return ""
