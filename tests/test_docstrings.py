# SPDX-License-Identifier: MIT
"""Every public engine function documents each parameter and return with its unit.

The template (DEVELOPERS.md, "Adding an engine function"): summary line under 64 characters ending with a period, a ``.. math::``
block, ``Parameters`` and ``Returns`` whose entries end with a unit in brackets, ``Raises``,
``Examples`` with a doctest and numbered ``References``.
"""
from __future__ import annotations

import importlib
import inspect
import pkgutil
import re

import pytest

import functions

# Modules of the engine whose public functions follow the template. The validation helpers, the
# declarations (quantities, worksheet twins, the chain's steps) and the spreadsheet layer (udf,
# catalogue: thin wrappers documented for the function wizard) are not engine functions.
SKIP_MODULES = {"functions._validation", "functions.udf", "functions.catalogue",
                "functions.quantities", "functions.relations", "functions.worksheet",
                "functions.chain", "functions.closed_forms", "functions.quantity",
                "functions.quantities_supply", "functions.steps", "functions.chain_supply"}

UNIT = re.compile(r"\[[^\[\]]+\]\.?$")
ENTRY = re.compile(r"^(\*{0,2}[A-Za-z_][A-Za-z0-9_]*)\s*:\s*(.+)$")


def engine_functions():
    found = []
    for info in pkgutil.iter_modules(functions.__path__, "functions."):
        if info.name in SKIP_MODULES:
            continue
        module = importlib.import_module(info.name)
        for name in getattr(module, "__all__", []):
            obj = getattr(module, name)
            if inspect.isfunction(obj):
                found.append(pytest.param(obj, id=f"{info.name}.{name}"))
    return found


def sections(doc: str) -> dict[str, list[str]]:
    """Split a numpy-style docstring into {section title: lines} (dedented)."""
    lines = inspect.cleandoc(doc).splitlines()
    out: dict[str, list[str]] = {"": []}
    current = ""
    i = 0
    while i < len(lines):
        if i + 1 < len(lines) and re.fullmatch(r"-{3,}", lines[i + 1].strip()) and lines[i].strip():
            current = lines[i].strip()
            out[current] = []
            i += 2
            continue
        out[current].append(lines[i])
        i += 1
    return out


def entries(lines: list[str]) -> dict[str, str]:
    """Entries ``name : type`` at column 0 with their indented description joined."""
    result: dict[str, str] = {}
    name = None
    for line in lines:
        if line and not line[0].isspace():
            m = ENTRY.match(line.strip())
            name = m.group(1).lstrip("*") if m else None
            if name:
                result[name] = ""
        elif name and line.strip():
            result[name] = (result[name] + " " + line.strip()).strip()
    return result


FUNCS = engine_functions()


def test_there_are_engine_functions():
    assert len(FUNCS) >= 10


@pytest.mark.parametrize("func", FUNCS)
def test_docstring_follows_template(func):
    doc = func.__doc__
    assert doc, "no docstring"
    summary = inspect.cleandoc(doc).splitlines()[0]
    assert len(summary) < 64 and summary.endswith("."), f"summary line: {summary!r}"
    assert ".. math::" in doc, "no governing equation"
    parts = sections(doc)
    for title in ("Parameters", "Returns", "Examples", "References"):
        assert title in parts, f"section {title} missing"
    assert ">>>" in "\n".join(parts["Examples"]), "no doctest example"
    assert re.search(r"^\s*1\.", "\n".join(parts["References"]), re.M), "references not numbered"

    params = entries(parts["Parameters"])
    signature = [p for p in inspect.signature(func).parameters]
    assert list(params) == signature, f"documented {list(params)} but signature is {signature}"
    for name, text in params.items():
        assert UNIT.search(text), f"parameter {name!r} has no unit in brackets: {text!r}"

    returns = entries(parts["Returns"])
    assert returns, "Returns has no entry"
    for name, text in returns.items():
        assert UNIT.search(text), f"return {name!r} has no unit in brackets: {text!r}"


def test_entries_parser_flags_a_missing_unit():
    # the checker itself must be able to fail
    parsed = entries(["length : float", "    Pendulum length.", "g : float", "    Gravity [m/s^2]."])
    assert not UNIT.search(parsed["length"]) and UNIT.search(parsed["g"])
