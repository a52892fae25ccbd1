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
import io
import re
import unicodedata
from dataclasses import replace
from pathlib import Path
from typing import Any

from .model import Project, ProjectError
from .reader import ILLEGAL_TEXT, parse_project
from .schema import floor_keys, input_keys, simulation_keys

__all__ = ["load_cases", "output_names"]

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


def _cell_value(kind: str, unit: str | None, cell: str) -> Any:
    """The value of one cell, as the project reader takes it for a column of ``kind``."""
    if kind == "text":
        return cell.strip()
    if kind == "flag":
        return {"true": True, "false": False}.get(cell.strip().lower(), cell.strip())
    value = _number(cell)
    return {"value": value, "unit": unit} if unit else value


def _columns(path: Path, header: list[str]) -> list[tuple[str, str | None, str]]:
    """(key, unit, kind) of every header cell, kind ``text``, ``flag`` or ``number`` as the
    declarations say; colliding keys and units on texts refused."""
    columns: list[tuple[str, str | None, str]] = []
    seen: dict[str, int] = {}
    for i, cell in enumerate(header, start=1):
        m = _HEADER_UNIT_RE.match(cell)
        if not m:
            raise ProjectError(f"{path}:1: column {i} header {cell!r} must be a dotted key "
                               "with an optional [unit]")
        key, unit = m.group(1), m.group(2)
        for other, j in seen.items():
            if key == other or key.startswith(other + ".") or other.startswith(key + "."):
                raise ProjectError(f"{path}:1: columns {j} ({other}) and {i} ({key}) set the "
                                   "same input; keep one of them")
        q = input_keys().get(key) or simulation_keys().get(key)
        if key == "case" or key.startswith("project.") or (q is not None
                                                            and q.kind == "choice"):
            kind = "text"
        else:
            kind = "flag" if q is not None and q.kind == "flag" else "number"
        if unit and kind != "number":
            raise ProjectError(f"{path}:1: column {i} ({key}) is text, not a number: it takes "
                               f"no unit [{unit}]")
        if q is None and key not in floor_keys():
            unit = None             # an unknown key: the reader refuses it by name
        seen[key] = i
        columns.append((key, unit, kind))
    return columns


def output_names(projects: list[Project], suffix: str = ".xlsx",
                 limit: int = 100) -> list[str]:
    """A distinct, portable file name for each case (``tower A`` -> ``tower_A.xlsx``).

    Names are ASCII letters, digits, ``.``, ``_`` and ``-``; a name longer than ``limit``
    characters is shortened and given a short hash of the case name.

    Raises
    ------
    ProjectError
        When two cases would get the same file name (compared without regard to letter case,
        as some file systems do), naming both.
    """
    out, taken = [], {}
    for p in projects:
        text = unicodedata.normalize("NFKD", p.case).encode("ascii", "ignore").decode()
        name = re.sub(r"[^A-Za-z0-9._-]+", "_", text).strip("._") or "case"
        if len(name) > limit:
            tag = hashlib.sha256(p.case.encode("utf-8")).hexdigest()[:8]
            name = f"{name[:limit - 9]}_{tag}"
        key = name.lower()
        if key in taken:
            raise ProjectError(f"{p.source_name}: cases {taken[key]!r} and {p.case!r} would "
                               f"both be written to {name}{suffix}; rename one of them "
                               "(nothing was written)")
        taken[key] = p.case
        out.append(name + suffix)
    return out


def load_cases(path: str | Path) -> list[Project]:
    """Read a CSV table of cases: one project per row.

    Raises
    ------
    ProjectError
        Naming the file, the line and the column of the first invalid entry.
    """
    path = Path(path)
    try:
        with path.open(encoding="utf-8-sig", newline="") as fh:   # keep CR LF inside cells
            text = fh.read()
    except FileNotFoundError:
        raise ProjectError(f"{path}: case table not found") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise ProjectError(f"{path}: cannot read the case table: {exc}") from None
    try:
        # newline="" keeps a quoted line break inside a cell; only CR and LF end a row (not
        # U+2028 or NEL, which str.splitlines would split on)
        reader = csv.reader(io.StringIO(text, newline=""))
        rows, starts, start = [], [], 1
        for row in reader:
            rows.append(row)
            starts.append(start)                  # a row may span lines (quoted breaks)
            start = reader.line_num + 1
    except csv.Error as exc:
        raise ProjectError(f"{path}:{reader.line_num}: not a valid CSV table: {exc}") from None
    if not rows or not any(c.strip() for c in rows[0]):
        raise ProjectError(f"{path}:1: the case table has no header row")
    columns = _columns(path, rows[0])
    projects = []
    seen: set[str] = set()
    for index, (number, row) in enumerate(zip(starts[1:], rows[1:]), start=1):
        if not any(c.strip() for c in row):
            continue
        if len(row) > len(columns):
            raise ProjectError(f"{path}:{number}: row has {len(row)} cells, the header has "
                               f"{len(columns)}")
        data: dict[str, Any] = {}
        case = ""
        lines: dict[str, int] = {}
        for (key, unit, kind), cell in zip(columns, row):
            if not cell.strip():
                continue
            lines[key] = number
            if key == "case":
                case = cell.strip()
                continue
            *tables, last = key.split(".")
            node = data
            for table in tables:        # no column is a prefix of another (see _columns)
                node = node.setdefault(table, {})
            node[last] = _cell_value(kind, unit, cell)
        case = case or str(data.get("project", {}).get("number", "")) or f"case_{index}"
        bad = ILLEGAL_TEXT.search(case)
        if bad:
            raise ProjectError(f"{path}:{number}: column case: holds the character "
                               f"U+{ord(bad.group()):04X}, which a workbook cell cannot store")
        if case in seen:
            raise ProjectError(f"{path}:{number}: case name {case!r} is used twice")
        seen.add(case)
        project = parse_project(data, source=path.name, lines=lines, row_label="column ",
                                case=case)
        digest = hashlib.sha256("\x1f".join(row).encode("utf-8")).hexdigest()
        projects.append(replace(project, source_sha256=digest))
    if not projects:
        raise ProjectError(f"{path}: the case table has no rows")
    return projects
