# SPDX-License-Identifier: MIT
"""The Inputs sheet: one row per input quantity, the floor table, the notes.

Each numeric input is a row: label, symbol, the value as entered (yellow, unlocked, validated
against its declared range in the entered unit), the unit, its exact factor to SI, the SI value
(a formula, named by the quantity's defined name, which every other formula reads), the SI
unit, the valid range and where the value usually comes from. Batch recalculation reads an
input only through the names ``<name>_entered`` and ``<name>_unit``; the labels may be reworded.
"""
from __future__ import annotations

import math

from functions.quantities import FLOOR_TABLE, OPTIONAL_TABLES, Quantity, by_name, design_inputs

from .options import PlanOptions
from .sheet import Looks, SheetLayout, ref

__all__ = ["inputs_sheet", "entered_name", "unit_name", "factor_name", "FLOOR_NAMES",
           "input_comment"]

#: Defined names of the floor table (besides those of its scalar quantities).
FLOOR_NAMES = ("floor_heights_entered", "floor_masses_entered", "floor_height_unit",
               "floor_mass_unit", "floor_height_factor", "floor_mass_factor", "damper_floor",
               "mode_shape_type", "modal_mass_from_floors")


def entered_name(cell_name: str) -> str:
    """Defined name of an input's value as entered."""
    return f"{cell_name}_entered"


def unit_name(cell_name: str) -> str:
    """Defined name of an input's unit."""
    return f"{cell_name}_unit"


def factor_name(cell_name: str) -> str:
    """Defined name of an input's factor to SI."""
    return f"{cell_name}_factor"


def input_comment(q: Quantity) -> str:
    """The cell note of an input: what it is, where it usually comes from, its valid range."""
    what = (q.description or q.label).rstrip(".")
    where = q.note or "Given in the project file."
    return f"{what} [{q.unit}]. {where} Valid range {q.interval()} {q.unit}."


def _range_rule(coord: str, q: Quantity, factor_cell: str) -> str:
    """Data-validation formula: a number in the declared range, in the entered unit."""
    conds = [f"ABS({coord})>=0"]
    if math.isfinite(q.low):
        conds.append(f"{coord}*{factor_cell}{'>' if q.low_open else '>='}{q.low!r}")
    if math.isfinite(q.high):
        conds.append(f"{coord}*{factor_cell}{'<' if q.high_open else '<='}{q.high!r}")
    return f"AND({','.join(conds)})"


def _input_row(sh: SheetLayout, row: int, q: Quantity) -> None:
    n = q.cell_name
    sh.label(row, 1, q.label, "wrap box")
    sh.label(row, 2, q.symbol, "box")
    c = sh.input(row, 3, ("input", q.name), name=entered_name(n), label=f"{q.label} (as "
                 "entered)", comment=input_comment(q))
    sh.value(row, 4, source=("unit", q.name), style="box", name=unit_name(n),
             label=f"Unit of {q.label.lower()}")
    sh.value(row, 5, source=("factor", q.name), fmt="General", style="box",
             name=factor_name(n), label=f"Factor to SI of {q.label.lower()}")
    sh.formula(row, 6, f"={c.ref}*{ref(row, 5)}", fmt=q.fmt, style="box", name=n, unit=q.unit,
               label=q.label)
    sh.label(row, 7, q.unit, "box")
    sh.value(row, 8, source=("range", q.name), style="box")
    sh.text(row, 9, ("note", q.name), "wrap box")
    sh.validation(c.ref, _range_rule(c.ref, q, ref(row, 5)),
                  f"{q.label}: a number in the valid range (column H)",
                  prompt_title=q.symbol or q.name, prompt=f"{q.label}: valid range in column H")


def _choice_row(sh: SheetLayout, row: int, q: Quantity) -> None:
    sh.label(row, 1, q.label, "wrap box")
    sh.label(row, 2, q.symbol, "box")
    sh.value(row, 3, source=("input", q.name), style="box", name=q.cell_name, label=q.label)
    sh.label(row, 8, ", ".join(q.choices), "wrap box")
    sh.label(row, 9, q.note, "wrap box")


def quantity_of_floors(name: str) -> Quantity:
    """A scalar of the floor table by glossary name (functions.quantities.FLOOR_TABLE)."""
    return by_name(FLOOR_TABLE)[name]


def _floor_table(sh: SheetLayout, row: int, floors: int) -> int:
    sh.label(row, 1, "Floor table: modal mass from a power-law mode shape (z/h)^k "
                     "(EN 1991-1-4 Annex F, F.3)", Looks.SECTION)
    for col in range(2, 10):
        sh.blank(row, col, Looks.FILL)
    row += 1
    sh.label(row, 1, "Units of the floor heights and masses", "box")
    sh.value(row, 3, source=("floors", "height_unit"), style="box", name="floor_height_unit",
             label="Unit of the floor heights")
    sh.value(row, 4, source=("floors", "mass_unit"), style="box", name="floor_mass_unit",
             label="Unit of the floor masses")
    sh.value(row, 5, source=("floors", "height_factor"), fmt="General", style="box",
             name="floor_height_factor", label="Factor to SI of the floor heights")
    sh.value(row, 6, source=("floors", "mass_factor"), fmt="General", style="box",
             name="floor_mass_factor", label="Factor to SI of the floor masses")
    sh.label(row, 9, "heights (C), masses (D); factors to m and kg (E, F)", "wrap box")
    row += 1
    for q, factor_cell in ((quantity_of_floors("building_height"), "floor_height_factor"),
                           (quantity_of_floors("exponent"), "")):
        sh.label(row, 1, q.label, "box")
        sh.label(row, 2, q.symbol, "box")
        c = sh.input(row, 3, ("floors", q.name), name=entered_name(q.cell_name),
                     label=f"{q.label} (as entered)", comment=input_comment(q))
        factor = f"*{factor_cell}" if factor_cell else ""
        sh.formula(row, 6, f"={c.ref}{factor}", fmt=q.fmt, style="box", name=q.cell_name,
                   unit=q.unit, label=q.label)
        sh.label(row, 7, q.unit, "box")
        sh.validation(c.ref, _range_rule(c.ref, q, factor_cell or "1"),
                      f"{q.label}: a number in {q.interval()} [{q.unit}]")
        if q.name == "exponent":
            sh.text(row, 9, ("floors", "structure_type"), "wrap box", name="mode_shape_type")
        row += 1
    sh.label(row, 1, "Damper at floor (1-based)", "box")
    sh.value(row, 3, source=("floors", "damper_level"), style="box", name="damper_floor",
             label="Floor of the damper")
    row += 1
    head = row
    sh.header(head, ["Floor", "", "Height (entered)", "Mass (entered)", "Height (SI) [m]",
                     "Mass (SI) [kg]", "phi = (z/h)^k", "m phi^2 [kg]", ""])
    first, last = head + 1, head + floors
    for i in range(1, floors + 1):
        r = head + i
        sh.value(r, 1, i, style="box")
        sh.input(r, 3, ("floors", "height", i - 1))
        sh.input(r, 4, ("floors", "mass", i - 1))
        sh.formula(r, 5, f"=C{r}*floor_height_factor", fmt="0.0000", style="box")
        sh.formula(r, 6, f"=D{r}*floor_mass_factor", fmt="#,##0", style="box")
        sh.formula(r, 7, f"=POWER(E{r}/building_height,mode_exponent)", fmt="0.000000",
                   style="box")
        sh.formula(r, 8, f"=F{r}*G{r}^2", fmt="#,##0", style="box")
    sh.name_range("floor_heights_entered", f"C{first}:C{last}")
    sh.name_range("floor_masses_entered", f"D{first}:D{last}")
    sh.validation(f"C{first}:D{last}", f"AND(ABS(C{first})>=0,C{first}>0)",
                  "Floor height and mass: a number > 0")
    row = last + 1
    sh.label(row, 1, "Modal mass, mode normalised to 1 at the damper", "bold box wrap")
    sh.label(row, 2, "M*", "box")
    sh.formula(row, 6, f"=SUMPRODUCT(H{first}:H{last})/INDEX(G{first}:G{last},"
                       "damper_floor)^2", fmt="#,##0", style="box",
               name="modal_mass_from_floors", unit="kg", label="Modal mass from the floor table")
    sh.label(row, 7, "kg", "box")
    sh.label(row, 9, "sum m_i phi_i^2 / phi_damper^2", "box")
    return row + 2


def inputs_sheet(options: PlanOptions) -> SheetLayout:
    """The Inputs sheet for ``options``."""
    sh = SheetLayout("Inputs")
    sh.label(1, 1, "Inputs", Looks.TITLE)
    sh.label(2, 1, "Yellow cells are the inputs (unlocked); every other cell is protected "
                   "without a password. Values are converted to SI with exact factors.",
             Looks.WRAP)
    sh.merge(2, 1, 2, 9)
    sh.header(4, ["Input", "Symbol", "Value", "Unit", "Factor to SI", "Value (SI)", "SI unit",
                  "Valid range (in Unit)", "Where the value usually comes from"])
    row = 5
    for q in design_inputs():
        if q.kind == "choice":
            if q.section in OPTIONAL_TABLES and q.section not in options.parts:
                continue                # a choice of an optional table not given: no row
            _choice_row(sh, row, q)
        elif q.name in options.inputs:
            _input_row(sh, row, q)
        elif q.name == "modal_mass" and options.floors:
            sh.label(row, 1, q.label, "wrap box")
            sh.label(row, 2, q.symbol, "box")
            sh.label(row, 3, "from the floor table below", "box")
            sh.formula(row, 6, "=modal_mass_from_floors", fmt=q.fmt, style="box",
                       name=q.cell_name, unit=q.unit, label=q.label)
            sh.label(row, 7, q.unit, "box")
            sh.label(row, 9, q.note, "wrap box")
        else:
            continue
        row += 1
    row += 1
    if options.floors:
        # the floor table starts a page of its own under its own header (the input table's
        # header is then not repeated: it would stand over the floor table's other columns)
        sh.plan.row_breaks.append(row - 1)
        row = _floor_table(sh, row, options.floors)
    sh.label(row, 1, "Notes", Looks.BOLD)
    sh.text(row + 1, 1, ("info", "notes"), Looks.WRAP, name="project_notes")
    sh.merge(row + 1, 1, row + 1, 9)
    sh.widths([34, 9, 12, 9, 12, 14, 8, 16, 52])
    sh.page(landscape=True, title_rows=None if options.floors else "1:4", freeze="C5")
    return sh
