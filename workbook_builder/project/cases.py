# SPDX-License-Identifier: MIT
"""Case tables (CSV): one project per row, validated like a project file.

The header cells are the project file's dotted keys (``mode.frequency``), a number's column
optionally with a unit in brackets (``mode.modal_mass [t]``); each row is one project, named by
its ``case`` column (else ``project.number``, else ``case_<n>``). Empty cells leave the input
out (its default, or not given). A floor table needs the TOML form. Which columns hold numbers,
texts, choices or true/false follows from the declarations (:mod:`functions.quantities`).
Errors name the file, the line and the column.
"""
from __future__ import annotations

import csv
import hashlib
import re
from dataclasses import replace
from pathlib import Path
from typing import Any

from .model import Project, ProjectError
from .reader import parse_project
from .schema import floor_keys, input_keys, simulation_keys

__all__ = ["load_cases"]

_HEADER_UNIT_RE = re.compile(r"^\s*([A-Za-z0-9_.]+)\s*(?:\[\s*([^\]]+?)\s*\])?\s*$")


def _number(text: str) -> Any:
    text = text.strip()
    try:
        return int(text)
    except ValueError:
        pass
    try:
        return float(text)
    except ValueError:
        return text


def _cell_value(key: str, unit: str | None, cell: str) -> Any:
    """The value of one cell as the project reader takes it for ``key``."""
    q = input_keys().get(key) or simulation_keys().get(key)
    if key.startswith("project.") or (q is not None and q.kind == "choice"):
        return cell.strip()
    if q is not None and q.kind == "flag":
        return {"true": True, "false": False}.get(cell.strip().lower(), cell.strip())
    value = _number(cell)
    known = q is not None or key in floor_keys()
    return {"value": value, "unit": unit} if unit and known else value


def load_cases(path: str | Path) -> list[Project]:
    """Read a CSV table of cases: one project per row.

    Raises
    ------
    ProjectError
        Naming the file, the line and the column of the first invalid entry.
    """
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8-sig")
    except FileNotFoundError:
        raise ProjectError(f"{path}: case table not found") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise ProjectError(f"{path}: cannot read the case table: {exc}") from None
    rows = list(csv.reader(text.splitlines()))
    if not rows or not any(c.strip() for c in rows[0]):
        raise ProjectError(f"{path}:1: the case table has no header row")
    columns = []
    for i, cell in enumerate(rows[0]):
        m = _HEADER_UNIT_RE.match(cell)
        if not m:
            raise ProjectError(f"{path}:1: column {i + 1} header {cell!r} must be a dotted key "
                               "with an optional [unit]")
        columns.append((m.group(1), m.group(2)))
    projects = []
    seen: set[str] = set()
    for number, row in enumerate(rows[1:], start=2):
        if not any(c.strip() for c in row):
            continue
        if len(row) > len(columns):
            raise ProjectError(f"{path}:{number}: row has {len(row)} cells, the header has "
                               f"{len(columns)}")
        data: dict[str, Any] = {}
        case = ""
        lines: dict[str, int] = {}
        for (key, unit), cell in zip(columns, row):
            if not cell.strip():
                continue
            lines[key] = number
            if key == "case":
                case = cell.strip()
                continue
            parts = key.split(".")
            node = data
            for p in parts[:-1]:
                node = node.setdefault(p, {})
                if not isinstance(node, dict):
                    raise ProjectError(f"{path}:{number}: column {key} conflicts with another")
            node[parts[-1]] = _cell_value(key, unit, cell)
        case = case or str(data.get("project", {}).get("number", "")) or f"case_{number - 1}"
        if case in seen:
            raise ProjectError(f"{path}:{number}: case name {case!r} is used twice")
        seen.add(case)
        project = parse_project(data, source=path.name, lines=lines, row_label="column ",
                                case=case)
        digest = hashlib.sha256(",".join(row).encode("utf-8")).hexdigest()
        projects.append(replace(project, source_sha256=digest, case=case, lines=lines))
    if not projects:
        raise ProjectError(f"{path}: the case table has no rows")
    return projects
