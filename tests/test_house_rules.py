"""The house rules of DEVELOPERS.md that a machine can check: formatting and lint, kernels
that read no tables, and the size budget (no module over 600 lines, no function over 80).

The size budget is a ratchet: the modules and functions still over it are listed below as
a known gap (issue "put the house in order"); a new one over the budget fails, and so does
a listed one that has been brought within it and not taken off the list.
"""

from __future__ import annotations

import ast
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
PACKAGE = ROOT / "feedcheck"
MAX_MODULE_LINES = 600
MAX_FUNCTION_LINES = 80

# known gap: still over the budget (split them; then take them off this list)
OVER_BUDGET: set[str] = set()  # empty: every module and function is within the budget


def _over_budget() -> set[str]:
    out = set()
    for path in sorted(PACKAGE.rglob("*.py")):
        rel = path.relative_to(PACKAGE).as_posix()
        text = path.read_text(encoding="utf-8")
        if text.count("\n") > MAX_MODULE_LINES:
            out.add(rel)
        for node in ast.walk(ast.parse(text)):
            is_function = isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef))
            if is_function and node.end_lineno - node.lineno + 1 > MAX_FUNCTION_LINES:
                out.add(f"{rel}:{node.name}")
    return out


def test_no_new_module_or_function_over_budget():
    found = _over_budget()
    assert found - OVER_BUDGET == set(), "over the size budget; split it"
    assert OVER_BUDGET - found == set(), "within the budget now: take it off OVER_BUDGET"


def test_kernels_import_no_table_loader():
    """feedcheck/calc/ kernels take table records as parameters (DEVELOPERS.md)."""
    for path in sorted((PACKAGE / "calc").glob("*.py")):
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            if isinstance(node, ast.ImportFrom):
                mod = node.module or ""
                assert not mod.endswith(("tables", "rulebook")), (path.name, mod)
                assert not any(a.name in ("tables", "rulebook") for a in node.names), path.name


@pytest.mark.parametrize("args", [["check", "."], ["format", "--check", "."]])
def test_ruff_is_clean(args):
    ruff = shutil.which("ruff") or str(Path(sys.executable).parent / "ruff")
    if not Path(ruff).exists():
        pytest.fail("ruff is not installed (it is in the test extra of pyproject.toml)")
    r = subprocess.run([ruff, *args], cwd=ROOT, capture_output=True, text=True)
    assert r.returncode == 0, r.stdout + r.stderr
