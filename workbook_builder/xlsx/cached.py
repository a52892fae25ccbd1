# SPDX-License-Identifier: MIT
"""Cached values for formula cells of a saved .xlsx.

openpyxl writes every formula cell as ``<c r="B1"><f>A1*2</f><v/></c>``: no cached value. A viewer
that does not recalculate (file previewers, ``openpyxl`` with ``data_only=True``, LibreOffice set
to never recalculate) then shows empty cells. This module post-processes the saved package and
writes the value the engine computed into each formula cell's ``<v>`` element, with the cell type
the value needs:

=========================  ===========  ==========================================
Python value               ``t=``       ``<v>`` text
=========================  ===========  ==========================================
``bool``                   ``"b"``      ``1`` / ``0``
``int`` / ``float``        (none: n)    shortest repr that round-trips (``repr``)
``str``                    ``"str"``    the text, XML-escaped
:class:`CellError`         ``"e"``      the error code, e.g. ``#VALUE!``
=========================  ===========  ==========================================

The formula text, every other cell and every other part of the package are copied unchanged
(same member order and compression). The workbook keeps ``fullCalcOnLoad``, so Excel still
recalculates on opening. NaN and inf are refused (a cell cannot hold them). The file is replaced
atomically (temporary file in the same directory, then :func:`os.replace`).
"""
from __future__ import annotations

import os
import re
import zipfile
from pathlib import Path
from typing import Any, Mapping

from openpyxl import load_workbook

from .files import atomic_path
from .package import sheet_parts
from .rewrite import CellError, encode_value, write_package

__all__ = ["CellError", "insert_cached_values", "write_with_cached_values", "formula_cells",
           "sheet_parts"]


def _normalise_key(key: Any) -> tuple[str, str]:
    if not (isinstance(key, tuple) and len(key) == 2 and all(isinstance(k, str) for k in key)):
        raise ValueError(f"key {key!r} must be a (sheet title, cell) pair such as "
                         "('Calculation', 'C5')")
    sheet, coord = key
    coord_n = str(coord).replace("$", "").upper()
    if not re.fullmatch(r"[A-Z]{1,3}[1-9]\d{0,6}", coord_n):
        raise ValueError(f"cell {coord!r} on sheet {sheet!r} is not a single cell reference")
    return str(sheet), coord_n


def insert_cached_values(src: str | os.PathLike, values: Mapping[tuple[str, str], Any],
                         dest: str | os.PathLike | None = None, *,
                         require_all: bool = False) -> Path:
    """Write cached values into the formula cells of a saved .xlsx; return the written path.

    ``values`` maps ``(sheet title, "C5")`` to the value (``$`` signs and lower case allowed).
    ``dest`` defaults to ``src`` (rewritten in place, atomically). With ``require_all`` every
    formula cell of the workbook must receive a value.

    Raises
    ------
    ValueError
        For an unknown sheet, a key naming a cell that is not a formula cell, a value a cell cannot
        hold (NaN, inf, other types), or (``require_all``) a formula cell left without a value.
    """
    src_path = Path(src)
    normalised: dict[tuple[str, str], Any] = {}
    for key, value in values.items():
        norm = _normalise_key(key)
        encode_value(norm, value)            # refuse what a cell cannot hold, before reading
        normalised[norm] = value
    every: list[str] = []
    if require_all:
        with zipfile.ZipFile(src_path) as zin:
            every = list(sheet_parts(zin))
    return write_package(src_path, dest if dest is not None else src_path, cached=normalised,
                         require_all=every, compresslevel=None)


def write_with_cached_values(wb: Any, path: str | os.PathLike,
                             values: Mapping[tuple[str, str], Any], *,
                             require_all: bool = False) -> Path:
    """Save an openpyxl workbook to ``path`` with cached values in its formula cells.

    The workbook is saved to a temporary file next to ``path``, the values are inserted (see
    :func:`insert_cached_values`) and the result replaces ``path`` atomically; on any error
    ``path`` is left as it was.

    Raises
    ------
    ValueError
        See :func:`insert_cached_values`.
    """
    target = Path(path)
    with atomic_path(target) as tmp:
        wb.save(tmp)
        insert_cached_values(tmp, values, tmp, require_all=require_all)
    return target


def formula_cells(path: str | os.PathLike) -> dict[tuple[str, str], str]:
    """Map ``(sheet title, cell)`` to the formula text (with leading '=') of every formula cell."""
    wb = load_workbook(path, data_only=False)
    try:
        out: dict[tuple[str, str], str] = {}
        for ws in wb.worksheets:
            for row in ws.iter_rows():
                for cell in row:
                    if cell.data_type == "f":
                        v = cell.value
                        out[(ws.title, cell.coordinate)] = v if isinstance(v, str) else str(v.text)
        return out
    finally:
        wb.close()
