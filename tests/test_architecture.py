# SPDX-License-Identifier: MIT
"""The shape of the house (DEVELOPERS.md, "Architecture"): small modules, no import circle,
imports at the top, a test module per module, physics only in the engine, references inside
the project."""
from __future__ import annotations

import ast
import re
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
PACKAGES = ("functions", "workbook_builder")
MAX_LINES = 800


def _modules() -> dict[str, Path]:
    mods = {}
    for pkg in PACKAGES:
        for p in sorted((ROOT / pkg).rglob("*.py")):
            parts = list(p.relative_to(ROOT).with_suffix("").parts)
            if parts[-1] == "__init__":
                parts = parts[:-1]
            mods[".".join(parts)] = p
    return mods


MODULES = _modules()


def _imports(name: str, path: Path) -> set[str]:
    """Modules of the two packages that ``name`` imports (anywhere in the file)."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    package = name.split(".") if path.name == "__init__.py" else name.split(".")[:-1]
    out = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom):
            base = node.module or ""
            if node.level:
                pk = package[:len(package) - (node.level - 1)]
                base = ".".join(pk + ([base] if base else []))
            for alias in node.names:
                full = f"{base}.{alias.name}"
                target = full if full in MODULES else (base if base in MODULES else None)
                if target and target != name and not (
                        path.name == "__init__.py" and target.startswith(name + ".")):
                    out.add(target)
        elif isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name in MODULES and alias.name != name:
                    out.add(alias.name)
    return out


def test_no_module_over_800_lines():
    files = list(MODULES.values()) + sorted((ROOT / "tests").glob("*.py")) + sorted(
        (ROOT / "benchmarks").glob("*.py"))
    big = {str(p.relative_to(ROOT)): n for p in files
           if (n := p.read_text(encoding="utf-8").count("\n")) > MAX_LINES}
    assert not big, f"split these (one room, one idea): {big}"


def test_no_import_circle():
    graph = {m: _imports(m, p) for m, p in MODULES.items()}
    circles = []

    def visit(node, stack, seen):
        for nxt in graph[node]:
            if nxt in stack:
                circles.append(stack[stack.index(nxt):] + [nxt])
            elif nxt not in seen:
                seen.add(nxt)
                visit(nxt, stack + [nxt], seen)

    for m in graph:
        visit(m, [m], {m})
    assert not circles, f"import circles: {circles[:3]}"


def test_the_checker_finds_a_circle():
    # the checker itself must be able to fail: a -> b -> a
    graph = {"a": {"b"}, "b": {"a"}}
    assert any(m in graph[n] and n in graph[m] for m in graph for n in graph)


@pytest.mark.parametrize("name", sorted(MODULES))
def test_imports_at_the_top_of_the_module(name):
    """No import inside a function, except one marked 'lazy import' for measured start-up."""
    path = MODULES[name]
    text = path.read_text(encoding="utf-8")
    lines = text.splitlines()
    for node in ast.walk(ast.parse(text)):
        if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef)):
            for inner in ast.walk(node):
                if isinstance(inner, (ast.Import, ast.ImportFrom)):
                    where = lines[inner.lineno - 1] + lines[inner.lineno - 2]
                    assert "lazy import" in where, f"{path.name}:{inner.lineno}: import inside " \
                                                   f"{node.name}()"


def _test_module(name: str) -> Path:
    parts = name.split(".")[1:]
    return ROOT / "tests" / f"test_{'_'.join(p.lstrip('_') for p in parts)}.py"


@pytest.mark.parametrize("name", [m for m, p in MODULES.items()
                                  if p.name not in ("__init__.py", "__main__.py")])
def test_every_module_has_its_test_module(name):
    assert _test_module(name).is_file(), f"{name}: no {_test_module(name).name}"


def test_the_builder_does_no_physics():
    """workbook_builder computes nothing of its own: no trigonometry, roots or special
    functions of numpy/scipy/math outside the engine (it calls functions/ for every number;
    its native formulas are tested against the engine). The formula evaluator, which
    implements the worksheet functions SQRT, SIN, ... to give formulas their cached values,
    is the one exception."""
    physics = re.compile(r"\b(?:np|numpy|math)\.(?:sin|cos|tan|arcsin|asin|arccos|sqrt|exp|log|"
                         r"pi|radians|degrees)\b|scipy\.(?:special|integrate|optimize|linalg)")
    found = []
    for name, path in MODULES.items():
        if not name.startswith("workbook_builder") or name == "workbook_builder.xlsx.formulas":
            continue
        for i, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
            code = line.split("#")[0]
            if physics.search(code):
                found.append(f"{path.relative_to(ROOT)}:{i}: {line.strip()}")
    assert not found, "\n".join(found)


def test_references_point_inside_the_project():
    """Docstrings, comments and docs cite files of the project only."""
    outside = re.compile(r"GUIDE\.md|REFERENCES\.md|DESIGN_API\.md|\.\./shared|/work/shared")
    files = [p for p in ROOT.rglob("*") if p.suffix in (".py", ".md", ".toml") and
             ".venv" not in p.parts and ".git" not in p.parts]
    hits = [str(p.relative_to(ROOT)) for p in files
            if p.name != "test_architecture.py" and outside.search(p.read_text(encoding="utf-8"))]
    assert not hits, hits
