# SPDX-License-Identifier: MIT
"""Helpers shared by the batch-recalculation tests (tests/test_recalc_*.py).

Copying a built workbook, editing it as an engineer would in a spreadsheet program (openpyxl
round trip), reading its cell values, finding a defined name's cell and comparing numbers cell
by cell. The ``built`` fixture (the example workbooks and a den_hartog one) is in conftest.py.
"""
from __future__ import annotations

import hashlib
import shutil
from pathlib import Path

import openpyxl
import pytest
from openpyxl.workbook.defined_name import DefinedName

from workbook_builder import cli
from workbook_builder.recalc import read_workbook
from workbook_builder.xlsx import libreoffice

__all__ = ["ROOT", "SOFFICE", "needs_soffice", "sha256_of", "copy_to", "cell_values",
           "assert_numbers_equal", "set_cells", "cell_of", "main_recalc"]

ROOT = Path(__file__).resolve().parent.parent
SOFFICE = libreoffice.find_soffice()
needs_soffice = pytest.mark.skipif(SOFFICE is None, reason="LibreOffice (soffice) not installed")


def sha256_of(path: Path) -> str:
    """SHA-256 of a file's bytes (hex)."""
    return hashlib.sha256(Path(path).read_bytes()).hexdigest()


def copy_to(src: Path, dest_dir: Path, name: str | None = None) -> Path:
    """Copy ``src`` into ``dest_dir`` (created), under ``name`` or its own name."""
    dest_dir.mkdir(parents=True, exist_ok=True)
    dest = dest_dir / (name or src.name)
    shutil.copyfile(src, dest)
    return dest


def cell_values(path: Path) -> dict[tuple[str, str], object]:
    """(sheet, cell) -> value of every non-empty cell (cached values of formula cells)."""
    wb = openpyxl.load_workbook(path, data_only=True)
    try:
        return {(ws.title, c.coordinate): c.value for ws in wb.worksheets
                for row in ws.iter_rows() for c in row if c.value is not None}
    finally:
        wb.close()


def assert_numbers_equal(a: dict, b: dict, rel: float = 1e-12, sheets=None) -> int:
    """Every numeric cell of ``b`` equals ``a`` (relative ``rel``); return the count compared."""
    n = 0
    for key, vb in b.items():
        if sheets is not None and key[0] not in sheets:
            continue
        if isinstance(vb, bool) or not isinstance(vb, (int, float)):
            continue
        va = a.get(key)
        assert isinstance(va, (int, float)), f"{key}: {va!r} vs {vb!r}"
        assert va == pytest.approx(vb, rel=rel, abs=1e-300), f"{key}: {va!r} vs {vb!r}"
        n += 1
    return n


def set_cells(path: Path, edits: dict[tuple[str, str], object], out: Path | None = None,
              delete_names: tuple[str, ...] = (), add_names: dict | None = None) -> Path:
    """Edit a workbook as an engineer would in a spreadsheet program (openpyxl round trip)."""
    wb = openpyxl.load_workbook(path)
    for (sheet, coord), value in edits.items():
        wb[sheet][coord] = value
    for name in delete_names:
        del wb.defined_names[name]
    for name, text in (add_names or {}).items():
        wb.defined_names.add(DefinedName(name, attr_text=text))
    out = out or path
    wb.save(out)
    return out


def cell_of(path: Path, name: str) -> tuple[str, str]:
    """(sheet, cell) a defined name of the workbook points at."""
    data = read_workbook(path)
    return data.book.name_cell(name)


def main_recalc(args):
    """``swaytune recalc ARGS``: the exit status."""
    return cli.main(["recalc", *args])
