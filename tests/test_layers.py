"""The package's layers: imports go only down, there is no import circle, and the trusted
kernel's size is what DEVELOPERS.md says.

The layers, lowest first (DEVELOPERS.md, "Layers"):
foundation < mathematics < language < kernel < replay < interfaces.
A module may import from its own layer and the layers below it; the kernel reads the
language's dataclasses (expressions, statements) but not its parser.
"""
from __future__ import annotations

import ast
import re
from pathlib import Path

PACKAGE = Path(__file__).resolve().parents[1] / "checker"
LAYERS = ("foundation", "mathematics", "language", "kernel", "replay", "interfaces")
# what a verdict depends on: the kernel and the functions it evaluates
TRUSTED = ("kernel", "mathematics")
# modules a layer may not import although they lie below it
FORBIDDEN = {"kernel": {"checker.language.parsing", "checker.language.plain_reader"},
             "mathematics": {"checker.language"}}


def _modules() -> dict:
    """{dotted name: path} for every module of the package."""
    out = {}
    for path in PACKAGE.rglob("*.py"):
        parts = path.relative_to(PACKAGE.parent).with_suffix("").parts
        name = ".".join(parts[:-1] if parts[-1] == "__init__" else parts)
        out[name] = path
    return out


def _imports(name: str, path: Path) -> set:
    """The package modules that `name` imports anywhere in its text (functions included)."""
    package = name if path.name == "__init__.py" else name.rsplit(".", 1)[0]
    found = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.ImportFrom):
            if node.level:
                base = package.split(".")
                base = base[: len(base) - node.level + 1]
                target = ".".join(base + ([node.module] if node.module else []))
            else:
                target = node.module or ""
            names = [target] + [f"{target}.{a.name}" for a in node.names]
        elif isinstance(node, ast.Import):
            names = [a.name for a in node.names]
        else:
            continue
        found.update(n for n in names if n == "checker" or n.startswith("checker."))
    return found


def _resolved(targets: set, modules: dict) -> set:
    """Imported names turned into modules (`from checker.kernel import rules` names a module)."""
    return {t for t in targets if t in modules} | {t.rsplit(".", 1)[0] for t in targets
                                                   if t not in modules and t.rsplit(".", 1)[0] in modules}


def _layer(name: str):
    parts = name.split(".")
    return parts[1] if len(parts) > 1 and parts[1] in LAYERS else None


def _graph() -> dict:
    modules = _modules()
    return {name: _resolved(_imports(name, path), modules) - {name} for name, path in modules.items()}


def test_only_init_and_main_at_the_root():
    # common practice: a package's root holds its public surface and its entry point
    root = sorted(p.name for p in PACKAGE.glob("*.py"))
    assert root == ["__init__.py", "__main__.py"]
    assert sorted(p.name for p in PACKAGE.iterdir() if p.is_dir() and p.name != "__pycache__") == sorted(LAYERS)


def test_imports_only_go_down():
    wrong = []
    for name, targets in _graph().items():
        layer = _layer(name)
        if layer is None:
            continue
        for t in targets:
            other = _layer(t)
            if other is None and t == "checker":
                wrong.append(f"{name} imports the package root")
            elif other is not None and LAYERS.index(other) > LAYERS.index(layer):
                wrong.append(f"{name} ({layer}) imports {t} ({other})")
            elif any(t == f or t.startswith(f + ".") for f in FORBIDDEN.get(layer, ())):
                wrong.append(f"{name} ({layer}) imports {t}")
    assert wrong == []


def test_no_import_circle():
    graph = _graph()
    state: dict = {}
    circles = []

    def visit(node, path):
        state[node] = "open"
        for nxt in sorted(graph.get(node, ())):
            if nxt == "checker" or _layer(nxt) is None and nxt.count(".") == 1:
                continue        # the layer packages' empty __init__ files
            if state.get(nxt) == "open":
                circles.append(" -> ".join(path[path.index(nxt):] + [nxt]))
            elif nxt not in state:
                visit(nxt, path + [nxt])
        state[node] = "done"

    for name in sorted(graph):
        if name not in state and name != "checker":
            visit(name, [name])
    assert circles == []


def _trusted_lines() -> int:
    return sum(len(p.read_text(encoding="utf-8").splitlines())
               for layer in TRUSTED for p in (PACKAGE / layer).glob("*.py"))


def test_developers_md_states_the_trusted_size():
    """DEVELOPERS.md gives the line count of the trusted layers; it must stay within 10 %."""
    text = (PACKAGE.parent / "DEVELOPERS.md").read_text(encoding="utf-8")
    stated = re.search(r"trusted layers hold about ([\d,]+) lines", text)
    assert stated, "DEVELOPERS.md must say 'trusted layers hold about N lines'"
    claimed = int(stated.group(1).replace(",", ""))
    actual = _trusted_lines()
    assert abs(claimed - actual) <= actual // 10, f"DEVELOPERS.md says {claimed}, the tree has {actual}"
