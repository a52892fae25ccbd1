# SPDX-License-Identifier: MIT
"""The reference sheets: Names (every defined name), Cautions, Record.

The Names sheet lists every defined name of the plan with the cell it refers to, what it holds,
its unit and its value; the Cautions sheet the cautions every output carries; the Record sheet
the program, the source file and how to rebuild the workbook, and the values of the last engine
run: every input as typed with its unit and the key results, which recalculation compares the
workbook with to report the user's edits (:func:`last_run_name`).
"""
from __future__ import annotations

from functions.chain import steps
from functions.quantities import HELPERS, PART_RESULTS, design_inputs, design_results

from .calculation import unit_format, value_format
from .model import Plan
from .options import PlanOptions
from .sheet import Looks, SheetLayout

__all__ = ["CAUTIONS", "names_sheet", "cautions_sheet", "record_sheet", "RECORD_ROWS",
           "last_run_name", "last_run_unit_name", "recorded_inputs", "recorded_results"]

#: Cautions printed in every workbook and by the command line.
CAUTIONS = (
    "This workbook is a preliminary design aid. It is not a design of a damper.",
    "Every result must be checked by a licensed (chartered / professional) engineer.",
    "Check the design against the local codes and standards that apply to the project.",
    "Use wind-tunnel data (or a code calculation the authority accepts) for the response "
    "without the damper and for the comfort criterion.",
    "The damper itself (hangers, bearings, dampers, buffers, tuning adjustment) must follow the "
    "manufacturer's design, with its own tests and tolerances.",
    "The rules used here are simplified: resonant response of one mode, white-noise force, "
    "linear viscous damping, equal peak factors, rigid support of the damper.",
    "Measure the built structure's frequency and damping and retune the damper to them.",
)

#: Rows of the Record sheet: (label, source key, defined name).
RECORD_ROWS = (
    ("Program", "program", "record_program"),
    ("Engine", "engine", "record_engine"),
    ("Source file", "source", "record_source"),
    ("Case", "case", "record_case"),
    ("Source SHA-256", "sha256", "record_sha256"),
    ("Unit system of the project", "units", "record_units"),
    ("Tuning method", "tuning_method", "record_tuning_method"),
    ("Nonlinear simulation", "simulation", "record_simulation"),
    ("Build time", "build_time", ""),
    ("Rebuild with", "rebuild", "record_rebuild"),
)


def names_sheet(plan: Plan) -> SheetLayout:
    """The Names sheet: every defined name of ``plan`` (drawn after the other sheets)."""
    sh = SheetLayout("Names")
    sh.label(1, 1, "Defined names (workbook scope)", Looks.TITLE)
    sh.label(2, 1, "Every input and result has a name; formulas use the names, so "
                   "=structural_damping*(acceleration/acceleration_limit)^2 reads as the "
                   "equation.", Looks.WRAP)
    sh.merge(2, 1, 2, 5)
    sh.header(4, ["Name", "Refers to", "Quantity", "Unit", "Value"])
    row = 5
    quantities = {q.cell_name for q in design_inputs() + design_results() + HELPERS}
    entries = [(cell.name, sheet, cell.ref, cell.label, cell.unit, cell.kind != "text")
               for sheet, cell in plan.cells() if cell.name]
    entries += [(name, sheet, rng, "range of values", "", False)
                for name, (sheet, rng) in plan.range_names().items()]
    for name, sheet, ref, label, unit, single in sorted(entries):
        sh.label(row, 1, name, "box")
        sh.label(row, 2, f"{sheet}!{ref}", "box")
        sh.label(row, 3, label or "helper cell", "wrap box")
        sh.label(row, 4, unit, "box")
        if single:
            fmt = value_format(name) if name in quantities else (
                unit_format(unit) if unit else "General")
            sh.formula(row, 5, f"={name}", fmt=fmt, style="box")
        else:
            sh.blank(row, 5, "box")
        row += 1
    # the longest name whole (about one width unit per character, and a margin)
    longest = max(len(e[0]) for e in entries)
    sh.widths([max(30.0, longest + 4.0), 18, 52, 8, 16])
    sh.page(title_rows="1:4", freeze="A5")
    return sh


def cautions_sheet() -> SheetLayout:
    sh = SheetLayout("Cautions")
    sh.label(1, 1, "Cautions", Looks.TITLE)
    for i, text in enumerate(CAUTIONS, start=3):
        sh.label(i, 1, f"{i - 2}.", Looks.TOP)
        sh.label(i, 2, text, Looks.WRAP)
    r = len(CAUTIONS) + 4
    sh.label(r, 2, "Sources of the methods are given beside each step of the Calculation "
                   "sheet. Values marked 'common practice, no source' are rules of the trade, "
                   "not requirements of a standard.", Looks.WRAP)
    sh.widths([5, 95])
    sh.page()
    return sh


def last_run_name(cell_name: str) -> str:
    """Defined name of a value at the last engine run (an input as typed, or a result in SI)."""
    return f"{cell_name}_last_run"


def last_run_unit_name(cell_name: str) -> str:
    """Defined name of the unit an input was typed in at the last engine run."""
    return f"{cell_name}_unit_last_run"


def recorded_inputs(options: PlanOptions) -> list:
    """The input quantities whose typed value the Record sheet keeps (one per input row)."""
    return [q for q in design_inputs() if q.kind != "choice" and q.name in options.inputs]


def part_key_results(options: PlanOptions) -> list:
    """The key results of the optional parts of the calculation ``options`` holds, in
    checking order."""
    keys = {q.cell_name: q for q in PART_RESULTS if q.summary}
    return [keys[s.name] for s in steps(options.tuning_method, options.mass_ratio_mode,
                                        options.parts) if s.name in keys]


def recorded_results(options: PlanOptions) -> list:
    """The result quantities whose engine value the Record sheet keeps: the key results, and
    the modal mass when a floor table gives it (an edited floor shows as its change)."""
    out = [q for q in design_results() if q.summary] + part_key_results(options)
    if options.floors:
        out.insert(0, next(q for q in design_inputs() if q.name == "modal_mass"))
    return out


def record_sheet(options: PlanOptions) -> SheetLayout:
    sh = SheetLayout("Record")
    sh.label(1, 1, "Record", Looks.TITLE)
    for i, (label, key, name) in enumerate(RECORD_ROWS, start=3):
        sh.label(i, 1, label, "bold box")
        sh.text(i, 2, ("record", key), "box wrap", name=name)
    row = len(RECORD_ROWS) + 4
    sh.section(row, "Values at the last engine run (build or swaytune recalc)", 3)
    sh.label(row + 1, 1, "swaytune recalc compares the inputs with these values to report what "
                         "was edited since, and rewrites them; they are not inputs.", Looks.WRAP)
    sh.merge(row + 1, 1, row + 1, 3)
    sh.header(row + 2, ["Quantity", "Value", "Unit"])
    row += 3
    for q in recorded_inputs(options):
        sh.label(row, 1, f"{q.label} (input, as typed)", "box wrap")
        sh.engine(row, 2, ("typed", q.name), fmt="General", name=last_run_name(q.cell_name),
                  label=f"{q.label} as typed at the last engine run")
        sh.value(row, 3, source=("unit", q.name), style="box",
                 name=last_run_unit_name(q.cell_name),
                 label=f"Unit of {q.label.lower()} at the last engine run")
        row += 1
    for q in recorded_results(options):
        sh.label(row, 1, f"{q.label} (result)", "box wrap")
        sh.engine(row, 2, ("cell", q.cell_name), fmt=value_format(q.cell_name),
                  name=last_run_name(q.cell_name), unit=q.unit,
                  label=f"{q.label} at the last engine run")
        sh.label(row, 3, q.unit, "box")
        row += 1
    sh.widths([44, 60, 10])
    sh.page(pages=1)            # one page: the table's header is on it
    return sh
