# SPDX-License-Identifier: MIT
"""Firm calc-sheet templates and the default title block.

Firms file calculations on their own calc-sheet template. swaytune fills a template's title block
through **workbook-scoped defined names** (our own names; a firm adds them once to its template,
in Excel with Formulas > Name Manager, in LibreOffice with Sheet > Named Ranges):

====================  ==================  ==================================================
field key             defined name        content (always written as plain text)
====================  ==================  ==================================================
``project_number``    TB_PROJECT_NUMBER   project or job number
``title``             TB_TITLE            calculation title
``calculated_by``     TB_CALCULATED_BY    initials or name of the engineer who calculated
``checked_by``        TB_CHECKED_BY       initials or name of the checker
``date``              TB_DATE             date (a ``datetime.date`` is written as YYYY-MM-DD)
``revision``          TB_REVISION         revision mark
====================  ==================  ==================================================

Each name points at one cell (or a range, whose top-left cell is used; a cell inside a merged
block is written through the block's top-left cell). Only the named cells' values change: the
firm's sheets, styles, column widths, merged cells, print set-up and other names are kept. User
text is never a formula: text starting with ``=`` stays text (``data_type 's'``).

Without a template, :func:`add_default_title_block` writes a plain title block of our own.
"""
from __future__ import annotations

import datetime as dt
import math
import os
from pathlib import Path
from typing import Any, Mapping

from openpyxl import load_workbook
from openpyxl.styles import Alignment, Border, Font, PatternFill, Side
from openpyxl.utils.cell import absolute_coordinate, coordinate_to_tuple, quote_sheetname
from openpyxl.workbook.defined_name import DefinedName

from ..project.reader import ILLEGAL_TEXT, MAX_TEXT

__all__ = ["TITLE_BLOCK_NAMES", "FIELD_LABELS", "open_template", "template_fields",
           "unfilled_fields", "add_default_title_block", "set_text"]

#: Field key -> workbook-scoped defined name marking its cell in a firm's template.
TITLE_BLOCK_NAMES: dict[str, str] = {
    "project_number": "TB_PROJECT_NUMBER",
    "title": "TB_TITLE",
    "calculated_by": "TB_CALCULATED_BY",
    "checked_by": "TB_CHECKED_BY",
    "date": "TB_DATE",
    "revision": "TB_REVISION",
}

#: Field key -> label shown in the default title block.
FIELD_LABELS: dict[str, str] = {
    "project_number": "Project no.",
    "title": "Title",
    "calculated_by": "Calculated by",
    "checked_by": "Checked by",
    "date": "Date",
    "revision": "Revision",
}



def _field_text(key: str, value: Any) -> str:
    """Text for a title-block field; refuse what a cell cannot hold."""
    if isinstance(value, dt.datetime):
        text = value.date().isoformat() if value.time() == dt.time() else value.isoformat(" ")
    elif isinstance(value, dt.date):
        text = value.isoformat()
    elif isinstance(value, float):
        if not math.isfinite(value):
            raise ValueError(f"{key}={value!r} must be text or a finite number")
        text = f"{value:g}"
    elif isinstance(value, (str, int)) and not isinstance(value, bool):
        text = str(value)
    else:
        raise ValueError(f"{key}={value!r} must be text, a number or a date")
    if ILLEGAL_TEXT.search(text):
        raise ValueError(f"{key}={text!r} holds a control character a cell cannot store")
    if len(text) > MAX_TEXT:
        raise ValueError(f"{key} is {len(text)} characters long; a cell holds at most "
                         f"{MAX_TEXT}")
    return text


def set_text(cell: Any, text: str) -> None:
    """Write ``text`` into an openpyxl cell as plain text, even when it starts with '='."""
    cell.value = text
    cell.data_type = "s"


def _check_keys(fields: Mapping[str, Any]) -> None:
    unknown = sorted(set(fields) - set(TITLE_BLOCK_NAMES))
    if unknown:
        raise ValueError(f"unknown title-block field(s) {unknown}; valid fields are "
                         f"{list(TITLE_BLOCK_NAMES)}")


def _target_cell(wb: Any, name: str) -> Any | None:
    """The cell a defined name marks (workbook scope first, then any sheet scope), or None."""
    dn = wb.defined_names.get(name)
    if dn is None:
        for ws in wb.worksheets:
            if name in ws.defined_names:
                dn = ws.defined_names[name]
                break
    if dn is None:
        return None
    try:
        dests = list(dn.destinations)
    except Exception:   # malformed reference text
        dests = []
    if not dests or dests[0][0] not in wb.sheetnames:
        raise ValueError(f"defined name {name} refers to {dn.attr_text!r}, which is not a cell of "
                         "this workbook")
    sheet, ref = dests[0]
    ws = wb[sheet]
    first = ref.replace("$", "").split(":")[0]
    cell = ws[first]
    for rng in ws.merged_cells.ranges:
        if cell.coordinate in rng:
            return ws.cell(rng.min_row, rng.min_col)
    return cell


def template_fields(wb: Any) -> dict[str, tuple[str, str]]:
    """Map each field key the workbook marks to its (sheet title, cell) target."""
    out = {}
    for key, name in TITLE_BLOCK_NAMES.items():
        cell = _target_cell(wb, name)
        if cell is not None:
            out[key] = (cell.parent.title, cell.coordinate)
    return out


def unfilled_fields(wb: Any, fields: Mapping[str, Any]) -> list[str]:
    """Field keys given a value that the workbook does not mark with a defined name."""
    marked = template_fields(wb)
    return [k for k, v in fields.items() if v is not None and k not in marked]


def open_template(path: str | os.PathLike, fields: Mapping[str, Any], *,
                  strict: bool = False) -> Any:
    """Load a firm's .xlsx calc-sheet template and fill its title block; return the workbook.

    ``fields`` maps field keys (see :data:`TITLE_BLOCK_NAMES`) to values; None leaves a field as
    the template has it. A field the template does not mark is skipped, or, with ``strict``,
    raises (list them with :func:`unfilled_fields`).

    Raises
    ------
    FileNotFoundError
        When ``path`` does not exist.
    ValueError
        For a file that is not an .xlsx workbook, an unknown field key, a value a cell cannot hold,
        a defined name that does not point at a cell, or (``strict``) an unmarked field.
    """
    p = Path(path)
    if not p.is_file():
        raise FileNotFoundError(f"template workbook not found: {p}")
    _check_keys(fields)
    texts = {k: _field_text(k, v) for k, v in fields.items() if v is not None}
    try:
        wb = load_workbook(p)
    except Exception as exc:   # zipfile.BadZipFile, KeyError, InvalidFileException ...
        raise ValueError(f"template {p} is not a readable .xlsx workbook: {exc}") from exc
    missing = unfilled_fields(wb, texts)
    if strict and missing:
        raise ValueError(f"template {p.name} has no defined name for field(s) "
                         + ", ".join(f"{k} ({TITLE_BLOCK_NAMES[k]})" for k in missing))
    for key, text in texts.items():
        cell = _target_cell(wb, TITLE_BLOCK_NAMES[key])
        if cell is not None:
            set_text(cell, text)
    return wb


def add_default_title_block(ws: Any, fields: Mapping[str, Any], top_left: str = "A1", *,
                            heading: str = "Tuned mass damper calculation",
                            define_names: bool = False) -> dict[str, str]:
    """Write a clean title block on ``ws`` starting at ``top_left``; return field -> cell.

    Layout (4 columns x 5 rows)::

        heading
        Project no.    <project_number>   Revision     <revision>
        Title          <title, merged over three columns>
        Calculated by  <calculated_by>    Checked by   <checked_by>
        Date           <date>             Sheet        <sheet title>

    Values are plain text. With ``define_names`` the value cells get the workbook-scoped names of
    :data:`TITLE_BLOCK_NAMES`, so the workbook itself can serve as a template (only one sheet
    per workbook can carry them).

    Raises
    ------
    ValueError
        For an unknown field key, a value a cell cannot hold, or names already defined.
    """
    _check_keys(fields)
    texts = {k: _field_text(k, v) for k, v in fields.items() if v is not None}
    row, col = coordinate_to_tuple(top_left.replace("$", ""))
    thin = Side(style="thin", color="808080")
    box = Border(left=thin, right=thin, top=thin, bottom=thin)
    label_font = Font(bold=True, size=9, color="404040")
    label_fill = PatternFill("solid", fgColor="F2F2F2")

    head = ws.cell(row, col, heading)
    head.data_type = "s"
    head.font = Font(bold=True, size=13)
    layout = [
        (("project_number", 1, 0), ("revision", 1, 2)),
        (("title", 2, 0),),
        (("calculated_by", 3, 0), ("checked_by", 3, 2)),
        (("date", 4, 0), ("__sheet__", 4, 2)),
    ]
    cells: dict[str, str] = {}
    for line in layout:
        for key, dr, dc in line:
            r, c = row + dr, col + dc
            label = ws.cell(r, c, "Sheet" if key == "__sheet__" else FIELD_LABELS[key])
            label.font, label.fill, label.border = label_font, label_fill, box
            value = ws.cell(r, c + 1)
            set_text(value, ws.title if key == "__sheet__" else texts.get(key, ""))
            value.border = box
            value.alignment = Alignment(vertical="center", wrap_text=key == "title")
            if key == "title":
                for extra in (c + 2, c + 3):
                    ws.cell(r, extra).border = box
                ws.merge_cells(start_row=r, start_column=c + 1, end_row=r, end_column=c + 3)
            if key != "__sheet__":
                cells[key] = value.coordinate
    if define_names:
        wb = ws.parent
        clash = [TITLE_BLOCK_NAMES[k] for k in cells if TITLE_BLOCK_NAMES[k] in wb.defined_names]
        if clash:
            raise ValueError(f"defined name(s) {clash} already exist in this workbook")
        for key, coord in cells.items():
            ref = f"{quote_sheetname(ws.title)}!{absolute_coordinate(coord)}"
            wb.defined_names.add(DefinedName(TITLE_BLOCK_NAMES[key], attr_text=ref))
    return cells
