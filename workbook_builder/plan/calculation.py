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
from functions.quantities import WORKING_VALUES, Quantity, quantity

from ..project.units import us_display
from .options import PlanOptions
from .sheet import Looks, SheetLayout, ref

__all__ = ["calculation_sheet", "engine_flag", "engine_flags", "snapshot_name",
           "UNIT_FORMATS", "unit_format", "value_format", "Columns", "calculation_columns",
           "FLAG_LABEL", "FLAG_GUARDS", "result_comment", "SIMULATION_FLAG", "step_numbers"]

#: Display format of a value by unit where no quantity declares one (US columns, checks).
UNIT_FORMATS = {
    "kg": "#,##0", "N/m": "#,##0", "N s/m": "#,##0", "m": "0.0000", "Hz": "0.00000",
    "-": "0.000000", "deg": "0.000", "m/s^2": "0.00000", "t": "#,##0.0", "lb": "#,##0",
    "kip": "#,##0.0", "kip (weight)": "#,##0.0", "kip s^2/ft": "#,##0.00", "mm": "0.0",
    "ft": "0.000", "in": "0.00", "ft/s^2": "0.0000", "milli-g": "0.00", "%": "0.000",
    "kip/ft": "#,##0.00", "kip s/ft": "#,##0.00", "s": "0.0", "N": "#,##0",
    "m/s": "0.0000", "ft/s": "0.0000", "J": "#,##0", "kip ft": "#,##0.0", "years": "0.0",
    "kg/m^3": "#,##0", "lb/ft^3": "#,##0.0", "m^3": "0.000", "ft^3": "#,##0.0", "W": "#,##0",
    "kN": "#,##0.0", "kN/m": "#,##0", "kip/in": "#,##0.00",
}

#: The question an engine-value flag answers ("current" or "INPUTS CHANGED: rebuild").
FLAG_LABEL = "Engine value current? (its inputs unchanged since it was computed)"


def unit_format(unit: str) -> str:
    """Number format for a value in ``unit`` (General when none is set)."""
    return UNIT_FORMATS.get(unit, "General")


def value_format(name: str) -> str:
    """Number format of a named design quantity (its declaration's), else scientific with
    5 significant digits."""
    try:
        fmt = quantity(name).fmt
    except KeyError:
        return "0.0000E+00"
    return fmt if fmt != "General" else "0.0000E+00"


class Columns:
    """Columns of the Calculation sheet: the SI layout, or the US one with the US value first
    and the SI value (the named cell every formula reads) beside it."""

    def __init__(self, us: bool) -> None:
        self.us = us
        self.step, self.label, self.symbol = 1, 2, 3
        if us:
            self.shown, self.shown_unit, self.value, self.unit = 4, 5, 6, 7
            self.equation, self.source = 8, 9
        else:
            self.shown = self.shown_unit = 0
            self.value, self.unit, self.equation, self.source = 4, 5, 6, 7

    @property
    def last(self) -> int:
        return self.source

    def header(self) -> list[str]:
        if self.us:
            return ["Step", "Quantity", "Symbol", "Value (US)", "US unit", "Value (SI)",
                    "SI unit", "Equation", "Source / note"]
        return ["Step", "Quantity", "Symbol", "Value", "Unit", "Equation", "Source / note"]

    def widths(self) -> list[float]:
        if self.us:
            return [6, 36, 9, 12, 12, 12, 7, 32, 40]
        return [6, 40, 9, 12, 7, 34, 44]


def calculation_columns(options: PlanOptions) -> Columns:
    """The Calculation sheet's columns for ``options``."""
    return Columns(options.us)


#: The flag of the Nonlinear sheet's engine values (its snapshots are named after it).
SIMULATION_FLAG = "engine_flag_simulation"


def snapshot_name(flag: str, dependency: str) -> str:
    """Defined name of the snapshot of ``dependency`` beside an engine-value flag."""
    return f"{flag}_{dependency}"


#: What each flag of the calculation's engine values guards (``functions.chain.Step.flag``).
FLAG_GUARDS = {
    "engine_flag_mass_ratio": "mass ratio", "engine_flag_tuning": "tuning optimum",
    "engine_flag_band": "worst case over the band",
    "engine_flag_band_mass": "mass ratio for the band",
    "engine_flag_robust": "robust tuning", "engine_flag_robust_worst":
        "worst case of the robust tuning", "engine_flag_as_built": "as-built tuning optimum",
    "engine_flag_tuning_2": "direction 2 tuning",
    "engine_flag_spring_2": "direction 2 frequency",
    "engine_flag_frequency_error_2": "direction 2 frequency error",
    "engine_flag_mass_ratio_2": "direction 2 required mass",
    "engine_flag_band_2": "direction 2 worst case over the band",
}


def engine_flags(options: PlanOptions) -> list[tuple[str, str]]:
    """``(flag name, what it guards)`` of every engine-value flag of a workbook, in order."""
    flags = [(name, FLAG_GUARDS[name]) for name in chain.engine_flag_names(
        options.tuning_method, options.mass_ratio_mode, options.parts)]
    if options.simulation is not None:
        flags.append((SIMULATION_FLAG, "nonlinear simulation"))
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
        sh.engine(row, value_col, ("snapshot", group, dep), fmt=value_format(dep),
                  style="box top", name=name, label=f"Snapshot of {dep} for the {flag}")
        sh.label(row, note_col, _SNAPSHOT_NOTE, Looks.WRAP)
        if note_to:
            sh.merge(row, note_col, row, note_to)
        conds.append(f"ABS({dep}-{name})<=1E-12*ABS({name})")
        row += 1
    sh.label(row, label_col, FLAG_LABEL, "bold wrap")
    sh.check(row, value_col, f'=IF(AND({",".join(conds)}),"current","INPUTS CHANGED: '
                             'rebuild")', name=flag, style="bold box top",
             label=f"Flag: engine value current? ({flag})")
    sh.label(row, note_col, _REFRESH_NOTE, Looks.WRAP)
    if note_to:
        sh.merge(row, note_col, row, note_to)
    return row + 1


def result_comment(q: Quantity, source: str = "") -> str:
    """The cell note of a result: what it is, and where it comes from."""
    what = (q.description or q.label).rstrip(".")
    return f"{what} [{q.unit}]." + (f" Source: {source}." if source else "")


def _step_row(sh: SheetLayout, row: int, cols: Columns, number: str, step: chain.Step) -> None:
    q = quantity(step.name)
    sh.label(row, cols.step, number, Looks.TOP)
    sh.label(row, cols.label, q.label, "wrap box")
    sh.label(row, cols.symbol, q.symbol, "box top")
    sh.label(row, cols.unit, q.unit, "box top" + (" secondary" if cols.us else ""))
    sh.label(row, cols.equation, step.expression, "wrap box")
    sh.label(row, cols.source, step.source, "wrap box")
    style = "box top" + (" secondary" if cols.us else "")
    comment = result_comment(q, step.source)
    if step.is_engine_value:
        sh.engine(row, cols.value, ("cell", step.name), fmt=q.fmt, style=style,
                  name=step.name, unit=q.unit, label=q.label, comment=comment)
    else:
        sh.formula(row, cols.value, step.formula, fmt=q.fmt, style=style, name=step.name,
                   unit=q.unit, label=q.label, comment=comment)
    if cols.us:
        us_unit, factor = us_display(q.unit, q.cell_name)
        value = ref(row, cols.value)
        shown = f"={value}/{factor!r}" if factor != 1.0 else f"={value}"
        sh.formula(row, cols.shown, shown, fmt=q.fmt if factor == 1.0 else
                   unit_format(us_unit), style="box top")
        sh.label(row, cols.shown_unit, us_unit, "box top")


def _numbers(sec: chain.Section) -> dict[str, str]:
    """Step numbers of a section's steps ("5.2": section 5, step 2)."""
    return {step.name: f"{sec.title.split()[0]}.{k}" for k, step in enumerate(sec.steps, 1)}


def step_numbers(options: PlanOptions) -> dict[str, str]:
    """Defined name -> number of its step on the Calculation sheet ("5.2")."""
    return {name: number
            for sec in chain.sections(options.tuning_method, options.mass_ratio_mode,
                                      options.parts)
            for name, number in _numbers(sec).items()}


def calculation_sheet(options: PlanOptions) -> SheetLayout:
    """The Calculation sheet for ``options``."""
    sh = SheetLayout("Calculation")
    cols = calculation_columns(options)
    sh.label(1, 1, "Calculation", Looks.TITLE)
    sh.label(2, 1, "Every value is a worksheet formula of the inputs, in checking order. Green "
                   "cells are engine values (no closed form), computed when the workbook was "
                   "built or last recalculated by swaytune; their flag says when the inputs have "
                   "changed since." + (" US customary values first, the SI value (which the "
                                       "formulas read) beside them." if cols.us else ""),
             Looks.WRAP)
    sh.merge(2, 1, 2, cols.last)
    sh.header(4, cols.header())
    flags = dict(engine_flags(options))
    row = 5
    working: list[tuple[str, chain.Step]] = []
    for sec in chain.sections(options.tuning_method, options.mass_ratio_mode, options.parts):
        sh.section(row, sec.title, cols.last)
        row += 1
        if sec.note:
            sh.label(row, 2, sec.note, Looks.WRAP)
            sh.merge(row, 2, row, cols.last)
            row += 1
        steps = list(sec.steps)
        numbers = _numbers(sec)
        deferred = [s for s in steps if s.name in WORKING_VALUES]
        if deferred:
            first, last = numbers[deferred[0].name], numbers[deferred[-1].name]
            sh.label(row, cols.step, f"{first}-{last.split('.')[1]}", Looks.TOP)
            sh.label(row, cols.label, "Working values " + ", ".join(
                quantity(s.name).symbol for s in deferred) + ": see 'Working values' at the "
                "end of this sheet (a page of its own)", "wrap box italic")
            sh.merge(row, cols.label, row, cols.last)
            row += 1
            working += [(numbers[s.name], s) for s in deferred]
        for number, step in enumerate(steps, start=1):
            if step.name in WORKING_VALUES:
                continue
            _step_row(sh, row, cols, numbers[step.name], step)
            row += 1
            nxt = steps[number] if number < len(steps) else None
            if step.is_engine_value and not (nxt is not None and nxt.is_engine_value
                                             and nxt.reads == step.reads):
                assert step.flag in flags, step.flag
                row = engine_flag(sh, row, step.flag, step.reads, "design",
                                  value_col=cols.value, note_col=cols.equation)
        row += 1
    if working:
        sh.plan.row_breaks.append(row - 1)
        sh.section(row, "Working values of section 4 (terms of the white-noise variance, "
                        "Newland 1993, App. 1)", cols.last)
        row += 1
        for number, step in working:
            _step_row(sh, row, cols, number, step)
            row += 1
    sh.widths(cols.widths())
    sh.page(landscape=True, title_rows="1:4", freeze="A5")
    return sh
