"""The package's import graph: every module imports on its own, and no module reaches
itself again through imports (no import circle, lazy imports inside functions included).
"""

from __future__ import annotations

import ast
import subprocess
import sys
from pathlib import Path

import feedcheck

PACKAGE = Path(feedcheck.__file__).parent


def _modules() -> dict[str, Path]:
    out = {}
    for path in sorted(PACKAGE.rglob("*.py")):
        parts = list(path.relative_to(PACKAGE.parent).with_suffix("").parts)
        if parts[-1] == "__init__":
            parts = parts[:-1]
        out[".".join(parts)] = path
    return out


def _imports(name: str, path: Path, known: set[str]) -> set[str]:
    """feedcheck modules that ``name`` imports anywhere in its body."""
    is_pkg = path.name == "__init__.py"
    base = name.split(".") if is_pkg else name.split(".")[:-1]
    found = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            targets = [a.name for a in node.names]
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                head = base[: len(base) - (node.level - 1)]
                mod = ".".join(head + ([node.module] if node.module else []))
            else:
                mod = node.module or ""
            targets = [mod] + [f"{mod}.{a.name}" for a in node.names]
        else:
            continue
        for t in targets:
            # the deepest feedcheck module named (a submodule, or the module holding a name)
            while t and t not in known:
                t = t.rpartition(".")[0]
            if t and t != name and t != "feedcheck":
                found.add(t)
    return found


def _cycle(graph: dict[str, set[str]]) -> list[str] | None:
    state: dict[str, int] = {}  # 1: on the current path, 2: done
    path: list[str] = []

    def visit(n: str) -> list[str] | None:
        state[n] = 1
        path.append(n)
        for m in sorted(graph[n]):
            if state.get(m) == 1:
                return [*path[path.index(m) :], m]
            if m not in state and (found := visit(m)):
                return found
        path.pop()
        state[n] = 2
        return None

    for n in sorted(graph):
        if n not in state and (found := visit(n)):
            return found
    return None


def test_no_import_circle():
    modules = _modules()
    graph = {name: _imports(name, path, set(modules)) for name, path in modules.items()}
    assert _cycle(graph) is None, " -> ".join(_cycle(graph))


def test_cycle_finder_finds_a_circle():
    assert _cycle({"a": {"b"}, "b": {"c"}, "c": {"a"}}) == ["a", "b", "c", "a"]
    assert _cycle({"a": {"b"}, "b": set()}) is None


def test_every_module_imports_alone_in_a_fresh_interpreter():
    code = (
        "import importlib, sys\n"
        "for name in sys.argv[1:]:\n"
        "    for m in [m for m in sys.modules if m.startswith('feedcheck')]:\n"
        "        del sys.modules[m]\n"
        "    importlib.import_module(name)\n"
    )
    names = sorted(_modules())
    out = subprocess.run([sys.executable, "-c", code, *names], capture_output=True, text=True)
    assert out.returncode == 0, out.stderr
