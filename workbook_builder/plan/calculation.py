# SPDX-License-Identifier: MIT
"""The Calculation sheet: every step of the design chain in checking order.

One row per step of :func:`functions.chain.sections`: label, symbol and unit from the step's
quantity (:mod:`functions.quantities`), the value (the step's native worksheet formula, or the
engine's value where no closed form exists), the equation as an engineer writes it and its
source. An engine value is followed by the inputs it was computed for (snapshots) and a flag
that says whether they have changed since (:func:`engine_flag`).
"""
from __future__ import annotations

from functions import chain
from functions.quantities import quantity

from ..project.units import US_DISPLAY
from .options import PlanOptions
from .sheet import Looks, SheetLayout

__all__ = ["calculation_sheet", "engine_flag", "engine_flags", "snapshot_name",
           "UNIT_FORMATS", "unit_format"]

#: Display format of a value by unit where no quantity declares one (US columns, checks).
UNIT_FORMATS = {
    "kg": "#,##0", "N/m": "#,##0", "N s/m": "#,##0", "m": "0.0000", "Hz": "0.00000",
    "-": "0.000000", "deg": "0.000", "m/s^2": "0.00000", "t": "#,##0.0", "lb": "#,##0",
    "kip": "#,##0.0", "mm": "0.0", "ft": "0.000", "in": "0.00", "ft/s^2": "0.00000",
    "milli-g": "0.00", "%": "0.000", "kip/ft": "#,##0.00", "kip s/ft": "#,##0.00", "s": "0.0",
    "N": "#,##0",
}


def unit_format(unit: str) -> str:
    """Number format for a value in ``unit`` (General when none is set)."""
    return UNIT_FORMATS.get(unit, "General")


def snapshot_name(flag: str, dependency: str) -> str:
    """Defined name of the snapshot of ``dependency`` beside an engine-value flag."""
    return f"{flag}_{dependency}"


def engine_flags(options: PlanOptions) -> list[tuple[str, str]]:
    """``(flag name, what it guards)`` of every engine-value flag of a workbook, in order."""
    flags = []
    if options.mass_ratio_mode == "required":
        flags.append(("engine_flag_mass_ratio", "mass ratio"))
    if options.tuning_method in ("h2", "hinf"):
        flags.append(("engine_flag_tuning", "tuning optimum"))
    if options.simulation is not None:
        flags.append(("engine_flag_simulation", "nonlinear simulation"))
    return flags


#: When an engine value was computed, and how to refresh it (batch recalculation recomputes the
#: design chain and reruns the time-domain simulation).
_SNAPSHOT_NOTE = "value when built or last recalculated by swaytune"
_REFRESH_NOTE = "run swaytune recalc (or rebuild the workbook) to refresh the engine value"


def engine_flag(sh: SheetLayout, row: int, flag: str, depends_on: tuple[str, ...],
                group: str, *, label_col: int = 2, value_col: int = 4, note_col: int = 6,
                note_to: int | None = None) -> int:
    """Snapshot rows and the flag of one group of engine values; return the next row.

    ``group`` is ``design`` or ``simulation`` (both recomputed by batch recalculation). The
    flag reads "current" while every input equals its snapshot (relative 1e-12).
    """
    conds = []
    for dep in depends_on:
        sh.label(row, label_col, f"Engine value computed for {dep} =", Looks.WRAP)
        name = snapshot_name(flag, dep)
        sh.engine(row, value_col, ("snapshot", group, dep), fmt="General", style="box top",
                  name=name, label=f"Snapshot of {dep} for the {flag}")
        sh.label(row, note_col, _SNAPSHOT_NOTE, Looks.WRAP)
        if note_to:
            sh.merge(row, note_col, row, note_to)
        conds.append(f"ABS({dep}-{name})<=1E-12*ABS({name})")
        row += 1
    sh.label(row, label_col, "Inputs changed since the engine value was computed?",
             "bold wrap")
    sh.check(row, value_col, f'=IF(AND({",".join(conds)}),"current","INPUTS CHANGED: '
                             'rebuild")', name=flag, style="bold box top",
             label=f"Flag: engine value current? ({flag})")
    sh.label(row, note_col, _REFRESH_NOTE, Looks.WRAP)
    if note_to:
        sh.merge(row, note_col, row, note_to)
    return row + 1


def calculation_sheet(options: PlanOptions) -> SheetLayout:
    """The Calculation sheet for ``options``."""
    sh = SheetLayout("Calculation")
    us = options.us
    sh.label(1, 1, "Calculation", Looks.TITLE)
    sh.label(2, 1, "Every value is a worksheet formula of the inputs, in checking order. Green "
                   "cells are engine values (no closed form), computed when the workbook was "
                   "built or last recalculated by swaytune; their flag says when the inputs have "
                   "changed since.", Looks.WRAP)
    sh.merge(2, 1, 2, 7)
    sh.header(4, ["Step", "Quantity", "Symbol", "Value", "Unit", "Equation", "Source / note"]
              + (["Value (US)", "US unit"] if us else []))
    flags = dict(engine_flags(options))
    row = 5
    for sec in chain.sections(options.tuning_method, options.mass_ratio_mode):
        sh.section(row, sec.title, 7)
        row += 1
        if sec.note:
            sh.label(row, 2, sec.note, Looks.WRAP)
            sh.merge(row, 2, row, 7)
            row += 1
        steps = list(sec.steps)
        for number, step in enumerate(steps, start=1):
            q = quantity(step.name)
            sh.label(row, 1, f"{sec.title.split()[0]}.{number}", Looks.TOP)
            sh.label(row, 2, q.label, "wrap box")
            sh.label(row, 3, q.symbol, "box top")
            sh.label(row, 5, q.unit, "box top")
            sh.label(row, 6, step.expression, "wrap box")
            sh.label(row, 7, step.source, "wrap box")
            if step.is_engine_value:
                sh.engine(row, 4, ("cell", step.name), fmt=q.fmt, style="box top",
                          name=step.name, unit=q.unit, label=q.label)
            else:
                sh.formula(row, 4, step.formula, fmt=q.fmt, style="box top", name=step.name,
                           unit=q.unit, label=q.label)
            if us and q.unit in US_DISPLAY:
                us_unit, factor = US_DISPLAY[q.unit]
                sh.formula(row, 8, f"=D{row}/{factor!r}", fmt=unit_format(us_unit),
                           style="box top")
                sh.label(row, 9, us_unit, "box top")
            row += 1
            nxt = steps[number] if number < len(steps) else None
            if step.is_engine_value and not (nxt is not None and nxt.is_engine_value
                                             and nxt.reads == step.reads):
                flag = "engine_flag_mass_ratio" if step.name == "mass_ratio" else \
                    "engine_flag_tuning"
                assert flag in flags, flag
                row = engine_flag(sh, row, flag, step.reads, "design")
        row += 1
    sh.widths([7, 40, 9, 15, 8, 34, 44] + ([13, 9] if us else []))
    sh.page(landscape=True, title_rows="1:4", freeze="A5")
    return sh
