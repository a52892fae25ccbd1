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

import math
import numbers
import os
import posixpath
import re
import zipfile
from pathlib import Path
from typing import Any, Mapping
from xml.etree import ElementTree

import numpy as np

from .atomic import atomic_path

__all__ = ["CellError", "insert_cached_values", "write_with_cached_values", "formula_cells",
           "sheet_parts"]

_NS_MAIN = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
_NS_REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
_NS_PKG_REL = "http://schemas.openxmlformats.org/package/2006/relationships"

# One cell element, optionally namespace-prefixed: <c .../> or <c ...>body</c>.
_CELL_RE = re.compile(
    r"<(?P<p>[A-Za-z_][\w.-]*:)?c\b(?P<attrs>[^>]*?)(?:/>|>(?P<body>.*?)</(?P=p)?c>)", re.S)
_ATTR_RE = re.compile(r'\s+([\w:.-]+)\s*=\s*("[^"]*"|\'[^\']*\')')
_INVALID_XML_CHARS = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ufffe\uffff]")
_ERROR_CODE_RE = re.compile(r"^(?:#[A-Z0-9/_]+[!?]|#N/A)$")


class CellError(str):
    """A spreadsheet error code to store as a cached value (``t="e"``), e.g. ``CellError("#N/A")``.

    Raises
    ------
    ValueError
        When the text is not an error code of the form ``#NAME?``, ``#DIV/0!``, ``#N/A``.
    """

    def __new__(cls, code: str) -> "CellError":
        if not isinstance(code, str) or not _ERROR_CODE_RE.match(code):
            raise ValueError(f"code={code!r} must be a spreadsheet error code such as '#VALUE!'")
        return super().__new__(cls, code)


def _escape(text: str) -> str:
    # A carriage return would be normalised to a line feed by every XML parser: keep it as &#13;.
    return (text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
            .replace("\r", "&#13;"))


def _encode(key: tuple[str, str], value: Any) -> tuple[str | None, str]:
    """Return (t attribute or None, <v> text) for a cached value; refuse what a cell cannot hold."""
    if isinstance(value, CellError):
        return "e", _escape(str(value))
    if isinstance(value, (bool, np.bool_)):
        return "b", "1" if bool(value) else "0"
    if isinstance(value, str):
        if _INVALID_XML_CHARS.search(value):
            raise ValueError(f"cached value for {key[0]}!{key[1]} holds a control character "
                             "that a workbook cannot store")
        if len(value) > 32767:
            raise ValueError(f"cached value for {key[0]}!{key[1]} is longer than 32767 characters")
        return "str", _escape(value)
    if isinstance(value, numbers.Integral):
        return None, str(int(value))
    if isinstance(value, numbers.Real):
        x = float(value)
        if not math.isfinite(x):
            raise ValueError(f"cached value for {key[0]}!{key[1]} is {x!r}; NaN and inf cannot be "
                             "stored in a cell")
        return None, repr(x)
    raise ValueError(f"cached value for {key[0]}!{key[1]} has type {type(value).__name__}; "
                     "expected float, int, bool, str or CellError")


def _normalise_key(key: Any) -> tuple[str, str]:
    if not (isinstance(key, tuple) and len(key) == 2 and all(isinstance(k, str) for k in key)):
        raise ValueError(f"key {key!r} must be a (sheet title, cell) pair such as "
                         "('Calculation', 'C5')")
    sheet, coord = key
    coord_n = str(coord).replace("$", "").upper()
    if not re.fullmatch(r"[A-Z]{1,3}[1-9]\d{0,6}", coord_n):
        raise ValueError(f"cell {coord!r} on sheet {sheet!r} is not a single cell reference")
    return str(sheet), coord_n


def sheet_parts(zf: zipfile.ZipFile) -> dict[str, str]:
    """Map each worksheet title to its part name inside the package (``xl/worksheets/...``)."""
    book = ElementTree.fromstring(zf.read("xl/workbook.xml"))
    rels = ElementTree.fromstring(zf.read("xl/_rels/workbook.xml.rels"))
    targets = {r.get("Id"): r.get("Target") for r in rels.findall(f"{{{_NS_PKG_REL}}}Relationship")}
    out: dict[str, str] = {}
    for sheet in book.iter(f"{{{_NS_MAIN}}}sheet"):
        target = targets.get(sheet.get(f"{{{_NS_REL}}}id"))
        if target is None:
            continue
        part = target.lstrip("/") if target.startswith("/") else posixpath.normpath(
            posixpath.join("xl", target))
        out[sheet.get("name")] = part
    return out


def _attrs(text: str) -> list[tuple[str, str]]:
    return [(m.group(1), m.group(2)) for m in _ATTR_RE.finditer(text)]


def _rewrite_sheet(xml: str, values: dict[str, tuple[str | None, str]], sheet: str,
                   require_all: bool, pending: set[str]) -> str:
    missing: list[str] = []

    def repl(m: re.Match) -> str:
        body = m.group("body")
        p = m.group("p") or ""
        if body is None or not re.search(rf"<{re.escape(p)}f[\s/>]", body):
            return m.group(0)
        attrs = _attrs(m.group("attrs"))
        ref = next((v[1:-1] for k, v in attrs if k == "r"), None)
        if ref is None:
            return m.group(0)
        if ref not in values:
            if require_all:
                missing.append(ref)
            return m.group(0)
        pending.discard(ref)
        t, text = values[ref]
        f_match = re.search(rf"<{re.escape(p)}f\b[^>]*?(?:/>|>.*?</{re.escape(p)}f>)", body, re.S)
        kept = [(k, v) for k, v in attrs if k != "t"]
        if t is not None:
            kept.append(("t", f'"{t}"'))
        attr_text = "".join(f" {k}={v}" for k, v in kept)
        # Keep everything but old values/inline strings (e.g. <extLst>) after the formula.
        rest = re.sub(rf"<{re.escape(p)}(?:v|is)\b[^>]*?(?:/>|>.*?</{re.escape(p)}(?:v|is)>)",
                      "", body[f_match.end():], flags=re.S)
        return (f"<{p}c{attr_text}>{body[:f_match.end()]}<{p}v>{text}</{p}v>{rest}</{p}c>")

    new = _CELL_RE.sub(repl, xml)
    if missing:
        shown = ", ".join(missing[:10]) + (" ..." if len(missing) > 10 else "")
        raise ValueError(f"no cached value given for {len(missing)} formula cell(s) on sheet "
                         f"{sheet!r}: {shown}")
    return new


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
    encoded: dict[str, dict[str, tuple[str | None, str]]] = {}
    for key, value in values.items():
        sheet, coord = _normalise_key(key)
        encoded.setdefault(sheet, {})[coord] = _encode((sheet, coord), value)
    with zipfile.ZipFile(src_path) as zin:
        parts = sheet_parts(zin)
        members = [(info, zin.read(info.filename)) for info in zin.infolist()]
    unknown = sorted(set(encoded) - set(parts))
    if unknown:
        raise ValueError(f"unknown sheet(s) {unknown}; the workbook has {sorted(parts)}")
    part_to_sheet = {parts[s]: s for s in parts if s in encoded or require_all}
    problems: list[str] = []
    out_members = []
    for info, data in members:
        sheet = part_to_sheet.get(info.filename)
        if sheet is not None:
            pending = set(encoded.get(sheet, {}))
            xml = _rewrite_sheet(data.decode("utf-8"), encoded.get(sheet, {}), sheet,
                                 require_all, pending)
            if pending:
                problems.append(f"sheet {sheet!r}: {', '.join(sorted(pending)[:10])}")
            data = xml.encode("utf-8")
        out_members.append((info, data))
    if problems:
        raise ValueError("cached value given for cell(s) that are not formula cells: "
                         + "; ".join(problems))
    with atomic_path(dest if dest is not None else src_path) as tmp:
        with zipfile.ZipFile(tmp, "w") as zout:
            for info, data in out_members:
                zout.writestr(info, data)
    return Path(dest if dest is not None else src_path)


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
    from openpyxl import load_workbook

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
