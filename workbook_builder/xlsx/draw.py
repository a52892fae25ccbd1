# SPDX-License-Identifier: MIT
"""Drawing a plan with openpyxl: cells, looks, names, rules, charts, protection, print.

:func:`draw` turns a :class:`workbook_builder.plan.model.Plan` and the values of its sourced
cells into an openpyxl workbook (or adds its sheets to a firm's template). Every formula is
checked against the allow-list of worksheet functions first
(:func:`workbook_builder.xlsx.formulas.check_formula`); user text and every text value are
written as text, never as a formula, whatever they start with; NaN and inf are refused.
Input cells are unlocked, every sheet is protected without a password.
"""
from __future__ import annotations

import math
import textwrap
from typing import Any, Mapping

from openpyxl import Workbook
from openpyxl.comments import Comment
from openpyxl.formatting.rule import CellIsRule
from openpyxl.styles import Alignment, Border, Font, PatternFill, Protection, Side
from openpyxl.utils import absolute_coordinate, get_column_letter, quote_sheetname
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.worksheet.datavalidation import DataValidation
from openpyxl.worksheet.pagebreak import Break

from ..plan.model import Plan, SheetPlan
from .charts import add_chart, fill_chart_caches
from .files import set_property
from .formulas import check_formula
from .page_setup import PageHeader, set_print_layout

__all__ = ["draw", "DrawError", "set_property", "fit_rows"]


class DrawError(RuntimeError):
    """A plan that cannot be drawn consistently (a value a cell cannot hold)."""


_THIN = Side(style="thin", color="A6A6A6")
_TB = Side(style="thin", color="808080")
#: Every look's font names the workbook's body font, so that applications do not fall back to
#: their own default (a serif face) for styled cells.
_FONT = "Calibri"
_FONTS = {
    "title": Font(name=_FONT, bold=True, size=14), "heading": Font(name=_FONT, bold=True, size=13),
    "bold": Font(name=_FONT, size=11, bold=True), "italic": Font(name=_FONT, size=11, italic=True),
    "caution": Font(name=_FONT, size=11, bold=True, color="C00000"),
    "warning": Font(name=_FONT, size=11, italic=True, color="C00000"),
    "head": Font(name=_FONT, size=11, bold=True, color="FFFFFF"),
    "table_head": Font(name=_FONT, size=11, bold=True),
    "section": Font(name=_FONT, size=11, bold=True),
    "tb_label": Font(name=_FONT, bold=True, size=9, color="404040"),
    "secondary": Font(name=_FONT, size=11, color="6F6F6F"),
}
_FILLS = {
    "head": PatternFill("solid", fgColor="44546A"), "section": PatternFill("solid", fgColor="D9E1F2"),
    "section_fill": PatternFill("solid", fgColor="D9E1F2"),
    "input": PatternFill("solid", fgColor="FFF2CC"), "engine": PatternFill("solid", fgColor="E2EFDA"),
    "table_head": PatternFill("solid", fgColor="DDEBF7"),
    "tb_label": PatternFill("solid", fgColor="F2F2F2"),
}
_OK_FILL = PatternFill("solid", fgColor="C6EFCE")
_BAD_FILL = PatternFill("solid", fgColor="FFC7CE")


def _look(cell: Any, style: str) -> None:
    tokens = style.split()
    for t in tokens:
        if t in _FONTS:
            cell.font = _FONTS[t]
        if t in _FILLS:
            cell.fill = _FILLS[t]
    if "box" in tokens or "head" in tokens:
        cell.border = Border(left=_THIN, right=_THIN, top=_THIN, bottom=_THIN)
    if "tb_label" in tokens or "tb_value" in tokens:
        cell.border = Border(left=_TB, right=_TB, top=_TB, bottom=_TB)
    if "table_head" in tokens:
        cell.border = Border(bottom=_THIN)
    if "wrap" in tokens or "head" in tokens:
        cell.alignment = Alignment(wrap_text=True, vertical="top")
    elif "table_head" in tokens:
        cell.alignment = Alignment(wrap_text=True, vertical="center")
    elif "tb_value" in tokens:
        cell.alignment = Alignment(vertical="center")
    elif "top" in tokens or "box" in tokens:
        cell.alignment = Alignment(vertical="top")      # table rows read from their top


def _write(cell: Any, value: Any, where: str) -> None:
    if isinstance(value, str):
        cell.value = value
        cell.data_type = "s"          # text stays text, even when it starts with '='
    elif value is None:
        cell.value = None
    else:
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            value = float(value)      # numpy scalars -> Python float
        if not math.isfinite(value):
            raise DrawError(f"{where}: {value!r} cannot be written (NaN and inf are refused)")
        cell.value = value


def fit_rows(ws: Any, line_height: float = 13.0) -> None:
    """Set row heights so wrapped text shows in full (applications do not fit them on load).

    Characters per line are estimated from the column width (about 1.1 characters of body text
    per width unit, a cautious figure for proportional fonts); lines break between words, as
    the applications wrap them.
    """
    widths = {letter: dim.width or 8.43 for letter, dim in ws.column_dimensions.items()}
    merged = {}
    for rng in ws.merged_cells.ranges:
        merged[(rng.min_row, rng.min_col)] = sum(
            widths.get(get_column_letter(c), 8.43) for c in range(rng.min_col, rng.max_col + 1))
    for row in ws.iter_rows():
        lines = 1
        for cell in row:
            value = cell.value
            if not isinstance(value, str) or cell.data_type == "f":
                continue
            if not (cell.alignment is not None and cell.alignment.wrap_text):
                continue
            width = merged.get((cell.row, cell.column), widths.get(cell.column_letter, 8.43))
            chars = max(1, int(width * 1.1))
            lines = max(lines, sum(max(1, len(textwrap.wrap(part, chars)))
                                   for part in value.split("\n")))
        if lines > 1:
            r = row[0].row
            ws.row_dimensions[r].height = max(line_height * lines + 3,
                                              ws.row_dimensions[r].height or 0)


def _define(wb: Any, name: str, sheet: str, cell_range: str) -> None:
    """Define (or replace, e.g. a template's stale copy) a workbook-scoped name."""
    if name in wb.defined_names:
        del wb.defined_names[name]
    parts = cell_range.split(":")
    target = ":".join(absolute_coordinate(p) for p in parts)
    wb.defined_names.add(DefinedName(name, attr_text=f"{quote_sheetname(sheet)}!{target}"))


#: Author of the cell notes.
NOTE_AUTHOR = "swaytune"


def _comment(text: str) -> Comment:
    """A cell note sized to its text (about 40 characters a line)."""
    note = Comment(text, NOTE_AUTHOR)
    note.width = 300
    note.height = 20 + 15 * (len(text) // 40 + 1)
    return note


def _sheet(wb: Any, sp: SheetPlan, values: Mapping[tuple[str, str], Any], paper: str,
           header: PageHeader | None) -> None:
    ws = wb.create_sheet(sp.title)
    for i, width in enumerate(sp.widths, start=1):
        ws.column_dimensions[get_column_letter(i)].width = width
    for c in sp.cells.values():
        cell = ws[c.ref]
        where = f"{sp.title}!{c.ref}"
        if c.kind in ("formula", "check"):
            check_formula(c.content)
            cell.value = c.content
        elif c.source:
            _write(cell, values[(sp.title, c.ref)], where)
        else:
            _write(cell, c.content, where)
        if c.fmt:
            cell.number_format = c.fmt
        if c.style:
            _look(cell, c.style)
        if c.kind == "input":
            cell.protection = Protection(locked=False)
        if c.comment:
            cell.comment = _comment(c.comment)
        if c.name:
            _define(wb, c.name, sp.title, c.ref)
    for name, cell_range in sp.ranges.items():
        _define(wb, name, sp.title, cell_range)
    for rng in sp.merges:
        ws.merge_cells(rng)
    for v in sp.validations:
        check_formula(v.formula)
        dv = DataValidation(type="custom", formula1=v.formula, allow_blank=False,
                            showErrorMessage=True, errorTitle="Value out of range",
                            error=v.error[:255], showInputMessage=bool(v.prompt),
                            promptTitle=v.prompt_title[:32] or None, prompt=v.prompt or None)
        dv.add(v.ref)
        ws.add_data_validation(dv)
    for rng in sp.verdict_ranges:
        ws.conditional_formatting.add(rng, CellIsRule(operator="equal", formula=['"OK"'],
                                                      fill=_OK_FILL))
        ws.conditional_formatting.add(rng, CellIsRule(operator="equal", formula=['"NOT OK"'],
                                                      fill=_BAD_FILL))
    for row, points in sp.heights.items():
        ws.row_dimensions[row].height = points
    fit_rows(ws)
    for spec in sp.charts:
        add_chart(ws, spec)
    if sp.charts:
        fill_chart_caches(ws)
    for row in sp.row_breaks:
        ws.row_breaks.append(Break(id=row))
    if sp.freeze:
        ws.freeze_panes = sp.freeze
    ws.protection.sheet = True
    set_print_layout(ws, paper, landscape=sp.landscape, title_rows=sp.title_rows,
                     print_area=sp.print_area, pages=sp.pages, header=header)


def draw(plan: Plan, values: Mapping[tuple[str, str], Any], *, template: Any = None,
         header: PageHeader | None = None) -> Any:
    """Draw ``plan`` with the values of its sourced cells; return the openpyxl workbook.

    ``template`` is a firm's workbook already opened (its title block filled); the plan's
    sheets are added after its own. ``header`` is the project's identification printed at the
    top of every page.

    Raises
    ------
    DrawError
        For a value a cell cannot hold (NaN, inf).
    workbook_builder.xlsx.formulas.FormulaError
        For a formula outside the allow-list (a bug of the plan, never written).
    """
    wb = template if template is not None else Workbook()
    if template is None:
        wb.remove(wb.active)
    for sp in plan.sheets:
        _sheet(wb, sp, values, plan.options.paper, header)
    return wb

