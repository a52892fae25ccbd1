# SPDX-License-Identifier: MIT
"""Workbooks holding a plan's cells as they are, for evaluating its formulas in the tests.

The plan tests check the planned formulas with the builder's formula evaluator
(workbook_builder.xlsx.formulas.Evaluator) without going through the drawer
(workbook_builder.xlsx.draw, tested on its own): :func:`plan_workbook` puts the formulas and
constants of some planned sheets into an openpyxl workbook with their defined names and named
ranges, the values of sourced cells from a lookup the test supplies, and a sheet ``V`` of
named values standing in for the cells of the sheets left out.
"""
from __future__ import annotations

from typing import Any, Callable, Iterable, Mapping

from openpyxl import Workbook
from openpyxl.utils import absolute_coordinate
from openpyxl.workbook.defined_name import DefinedName

from workbook_builder.plan.model import SheetPlan
from workbook_builder.xlsx.formulas import Evaluator

__all__ = ["plan_workbook", "set_values", "evaluator"]

VALUES = "V"


def _define(wb: Workbook, name: str, sheet: str, cell_range: str) -> None:
    target = ":".join(absolute_coordinate(p) for p in cell_range.split(":"))
    wb.defined_names.add(DefinedName(name, attr_text=f"'{sheet}'!{target}"))


def plan_workbook(sheets: Iterable[SheetPlan], value: Callable[[tuple], Any] | None = None,
                  named: Mapping[str, Any] | None = None) -> Workbook:
    """A workbook with the planned cells of ``sheets`` and the named values ``named``.

    Formula and check cells hold their formula, label and value cells their constant, sourced
    cells ``value(source)`` (left empty without ``value``). Every planned defined name and
    named range is defined; ``named`` puts each value in column A of sheet ``V`` under its name.
    """
    wb = Workbook()
    ws_values = wb.active
    ws_values.title = VALUES
    for sp in sheets:
        ws = wb.create_sheet(sp.title)
        for c in sp.cells.values():
            if c.kind in ("formula", "check"):
                ws[c.ref] = c.content
            elif c.source:
                if value is not None:
                    ws[c.ref] = value(c.source)
            else:
                ws[c.ref] = c.content
            if c.name:
                _define(wb, c.name, sp.title, c.ref)
        for name, rng in sp.ranges.items():
            _define(wb, name, sp.title, rng)
    for row, (name, v) in enumerate((named or {}).items(), start=1):
        ws_values.cell(row, 1, v)
        _define(wb, name, VALUES, f"A{row}")
    return wb


def set_values(wb: Workbook, named: Mapping[str, Any]) -> None:
    """Change the named values of sheet ``V`` (names given to :func:`plan_workbook`)."""
    for name, v in named.items():
        sheet, coord = next(iter(wb.defined_names[name].destinations))
        wb[sheet][coord.replace("$", "")].value = v


def evaluator(wb: Workbook, cache: dict | None = None) -> Evaluator:
    """A fresh evaluator (values change between evaluations; parsed formulas are shared)."""
    return Evaluator(wb, parse_cache=cache)
