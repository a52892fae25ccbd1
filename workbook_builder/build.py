# SPDX-License-Identifier: MIT
"""Workbook assembly: project -> engine -> sheets, names, checks, cached values.

:func:`build_workbook` makes the openpyxl workbook and the cached value of every formula cell
(by evaluating the formula text with :class:`workbook_builder.xlsx.formulas.Evaluator`);
:func:`write_workbook` saves it atomically with those cached values, refusing to overwrite a
file swaytune did not make. The physics comes from the engine (``functions.design``); the
workbook's own formulas are checked against it on the Checks sheet.

Sheets, in order: Summary (title block, key results, verdicts), Inputs, Calculation, Pendulum
(swing-correction helper cells), Checks, Charts (when available), Nonlinear (when the project
asks for the time-domain simulation, :func:`run_simulation`), Names, Cautions, Record.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from openpyxl import Workbook
from openpyxl.formatting.rule import CellIsRule
from openpyxl.styles import Alignment, Border, Font, PatternFill, Protection, Side
from openpyxl.utils import absolute_coordinate, get_column_letter, quote_sheetname
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.worksheet.datavalidation import DataValidation

from . import __version__
from .calcsheet import (AGM_STEPS, CROSS_CHECK_TOLERANCE, FIXED_POINT_ITERATIONS, INPUT_NAMES,
                        EngineValue, Step, design_checks, mass_ratio_mode, sections)
from .xlsx.cached import write_with_cached_values
from .xlsx.files import guard_hand_edits, guard_overwrite, mark_workbook, set_digest
from .xlsx.formulas import Evaluator, check_formula, is_error
from .xlsx.page_setup import set_print_layout
from .xlsx.template import add_default_title_block, open_template
from .project import INPUT_SPECS, Project
from .units import SI_UNIT, US_DISPLAY
# The engine calls (re-exported: part of this module's public API since the first release).
from .engine import (PEAK_DURATION, SIMULATION_PROPERTY, SimulationRun,  # noqa: F401
                     engine_value, read_simulation_settings, run_engine, run_simulation,
                     simulation_settings_text)

__all__ = ["BuildError", "BuiltWorkbook", "build_workbook", "write_workbook", "CAUTIONS",
           "SHEETS", "run_engine", "run_simulation", "SimulationRun", "FORMAT_VERSION",
           "FORMAT_NAME", "SIMULATION_PROPERTY", "EngineCell", "ENGINE_KINDS", "engine_cells",
           "engine_value", "lay_out", "simulation_settings_text", "read_simulation_settings"]

#: Layout format of the workbooks this builder writes, stored in every workbook as the
#: workbook-scoped defined name ``SWAYTUNE_FORMAT``. RAISE IT BY ONE ON EVERY LAYOUT CHANGE
#: (a sheet, row, column, defined name or formula moved, added, removed or rewritten): batch
#: recalculation (:mod:`workbook_builder.recalc`) refuses a workbook of a newer format and
#: reports an older one, whose formulas may differ from the builder's without a hand edit.
#: History: 1 = layout of swaytune 0.1 before the mark existed; 2 = the mark itself and the
#: SwaytuneSimulation document property.
FORMAT_VERSION = 2
#: Defined name (workbook scope, hidden) holding :data:`FORMAT_VERSION`.
FORMAT_NAME = "SWAYTUNE_FORMAT"
#: Kinds of engine-only cells (:class:`EngineCell`): a design-chain value or input snapshot
#: (``engine``), a chart table value (``chart``), a time-domain simulation value or setting of
#: the Nonlinear sheet (``simulation``).
ENGINE_KINDS = ("engine", "chart", "simulation")

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

SHEETS = ("Summary", "Inputs", "Calculation", "Pendulum", "Checks", "Charts", "Nonlinear",
          "Names", "Cautions", "Record")

#: Shown for an engine value that is not defined (NaN: e.g. no detuning beyond 180 deg).
_NOT_DEFINED = "not defined"

_UNIT_FORMATS = {
    "kg": "#,##0", "N/m": "#,##0", "N s/m": "#,##0", "m": "0.0000", "Hz": "0.00000",
    "-": "0.000000", "deg": "0.000", "m/s^2": "0.00000", "t": "#,##0.0", "lb": "#,##0",
    "kip": "#,##0.0", "mm": "0.0", "ft": "0.000", "in": "0.00", "ft/s^2": "0.00000",
    "milli-g": "0.00", "%": "0.000", "kip/ft": "#,##0.00", "kip s/ft": "#,##0.00",
}
_SCI = "0.000E+00"
_FULL = "0.00000000000E+00"

_BOLD = Font(bold=True)
_TITLE = Font(bold=True, size=14)
_HEAD = Font(bold=True, color="FFFFFF")
_HEAD_FILL = PatternFill("solid", fgColor="44546A")
_SECTION_FILL = PatternFill("solid", fgColor="D9E1F2")
_INPUT_FILL = PatternFill("solid", fgColor="FFF2CC")
_ENGINE_FILL = PatternFill("solid", fgColor="E2EFDA")
_WRAP = Alignment(wrap_text=True, vertical="top")
_TOP = Alignment(vertical="top")
_THIN = Side(style="thin", color="A6A6A6")
_BOX = Border(left=_THIN, right=_THIN, top=_THIN, bottom=_THIN)
_OK_FILL = PatternFill("solid", fgColor="C6EFCE")
_BAD_FILL = PatternFill("solid", fgColor="FFC7CE")


class BuildError(RuntimeError):
    """The workbook could not be built consistently (e.g. a formula evaluates to an error)."""


@dataclass(frozen=True)
class EngineCell:
    """A cell the builder fills with an engine value (a constant, not a formula).

    ``kind`` is one of :data:`ENGINE_KINDS`; ``key`` says which value: the engine field or
    defined input name for ``engine`` (see :func:`engine_value`), ``(table key, row index,
    column index)`` of :func:`workbook_builder.charts.chart_tables` for ``chart``, a short
    description for ``simulation``. ``value`` is what the builder wrote (float or text).
    """

    sheet: str
    cell: str
    kind: str
    key: Any
    value: Any


@dataclass
class BuiltWorkbook:
    """A built workbook with the cached values of its formula cells and the engine result."""

    workbook: Workbook
    values: dict[tuple[str, str], Any]
    result: Any
    project: Project
    names: dict[str, tuple[str, str]] = field(default_factory=dict)   # name -> (sheet, cell)
    cross_checks: list[tuple[str, float, float, float]] = field(default_factory=list)
    design_verdicts: list[tuple[str, str]] = field(default_factory=list)
    engine_checks: list[tuple[str, bool]] = field(default_factory=list)
    simulation: Any = None        # SimulationRun when the Nonlinear sheet was built
    nonlinear_verdicts: list[tuple[str, str]] = field(default_factory=list)
    #: Every engine-only cell the builder wrote, in writing order (see :func:`engine_cells`).
    engine_cells: list[EngineCell] = field(default_factory=list)

    def value(self, name: str) -> Any:
        """Value (cached value of a formula, or the constant) of the cell named ``name``."""
        key = self.names[name]
        if key in self.values:
            return self.values[key]
        return self.workbook[key[0]][key[1]].value


# --------------------------------------------------------------------------- cell helpers
class _Sheet:
    """Thin writer over a worksheet that records defined names and checks formulas."""

    def __init__(self, builder: "_Builder", ws):
        self.b = builder
        self.ws = ws

    def put(self, row: int, col: int, value: Any, *, fmt: str | None = None, font=None,
            fill=None, align=None, border: bool = False, unlocked: bool = False,
            as_text: bool = False):
        cell = self.ws.cell(row=row, column=col)
        if isinstance(value, str) and value.startswith("=") and not as_text:
            check_formula(value)
            cell.value = value
        elif isinstance(value, str):
            cell.value = value
            cell.data_type = "s"          # text stays text, even when it starts with '='
        elif value is None:
            pass
        else:
            if isinstance(value, bool) or not isinstance(value, (int, float)):
                value = float(value)      # numpy scalars -> Python float
            if not math.isfinite(value):
                raise BuildError(f"{self.ws.title}!{cell.coordinate}: {value!r} cannot be "
                                 "written (NaN and inf are refused)")
            cell.value = value
        if fmt:
            cell.number_format = fmt
        if font:
            cell.font = font
        if fill:
            cell.fill = fill
        if align:
            cell.alignment = align
        if border:
            cell.border = _BOX
        if unlocked:
            cell.protection = Protection(locked=False)
        return cell

    def text(self, row: int, col: int, text: str, **kw):
        """Write user text: always text, never a formula (even when it starts with '=')."""
        return self.put(row, col, "" if text is None else str(text), as_text=True, **kw)

    def header(self, row: int, labels: list[str]) -> None:
        for i, label in enumerate(labels, start=1):
            self.put(row, i, label, font=_HEAD, fill=_HEAD_FILL, align=_WRAP, border=True)

    def name(self, name: str, row: int, col: int) -> None:
        self.b.define(name, self.ws.title, row, col)

    def widths(self, widths: list[float]) -> None:
        for i, w in enumerate(widths, start=1):
            self.ws.column_dimensions[get_column_letter(i)].width = w


def _fit_rows(ws, line_height: float = 13.0) -> None:
    """Set row heights so wrapped text shows in full (applications do not fit them on load).

    Characters per line are estimated from the column width (about 1.1 characters of body text
    per width unit, a cautious figure for proportional fonts).
    """
    widths = {}
    for letter, dim in ws.column_dimensions.items():
        widths[letter] = dim.width or 8.43
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
            n = sum(max(1, math.ceil(len(part) / chars)) for part in value.split("\n"))
            lines = max(lines, n)
        if lines > 1:
            r = row[0].row
            ws.row_dimensions[r].height = max(line_height * lines + 3,
                                              ws.row_dimensions[r].height or 0)


def _fmt(unit: str) -> str:
    return _UNIT_FORMATS.get(unit, "General")


# --------------------------------------------------------------------------- builder
class _Builder:
    def __init__(self, project: Project, result, template: str | Path | None,
                 simulation: SimulationRun | None = None):
        self.project = project
        self.result = result
        self.simulation = simulation
        self.template = template
        self.names: dict[str, tuple[str, str]] = {}
        self.name_info: list[tuple[str, str, str, str]] = []   # name, sheet, label, unit
        self.our_sheets: list[str] = []
        self.engine_values: dict[str, float] = {}
        self.cross: list[tuple[str, str, str, float]] = []      # name, label, symbol, engine
        self.flag_cells: list[str] = []
        self.flag_labels: list[str] = []
        self.engine_cells: list[EngineCell] = []
        self.cross_engine: dict[str, str] = {}                  # name -> engine field
        self.helper_labels: dict[str, tuple[str, str]] = {
            "fixed_point_length": ("Pendulum length after the last fixed-point iteration", "m"),
            "fixed_point_change": ("Relative change of the length in the last iteration "
                                   "(rounded to 1e-15)", "-"),
            "agm_at_swing": ("AGM(1, cos(theta/2)) at the design swing", "-"),
            "all_design_checks": ("Verdict of all design checks", ""),
            "all_cross_checks": ("Verdict of all engine cross-checks", ""),
            "fixed_point_converged": ("Verdict: fixed point converged", ""),
            "modal_mass_from_floors": ("Modal mass from the floor table", "kg"),
            "building_height": ("Building height (floor table)", "m"),
            "mode_exponent": ("Mode shape exponent (floor table)", "-"),
        }
        self.method = project.tuning_method
        self.mode = mass_ratio_mode(project)

    # names --------------------------------------------------------------------------------
    def define(self, name: str, sheet: str, row: int, col: int, label: str = "",
               unit: str = "") -> None:
        if name in self.names:
            raise BuildError(f"defined name {name!r} declared twice")
        coord = absolute_coordinate(f"{get_column_letter(col)}{row}")
        self.wb.defined_names.add(DefinedName(name, attr_text=f"{quote_sheetname(sheet)}!{coord}"))
        self.names[name] = (sheet, f"{get_column_letter(col)}{row}")

    def sheet(self, title: str) -> _Sheet:
        ws = self.wb.create_sheet(title)
        self.our_sheets.append(title)
        return _Sheet(self, ws)

    def ref(self, name: str) -> str:
        sheet, coord = self.names[name]
        return f"{quote_sheetname(sheet)}!{absolute_coordinate(coord)}"

    # engine values ------------------------------------------------------------------------
    def engine_value(self, name: str) -> float:
        """Engine value of a result field or an input (SI), for snapshots and cross-checks."""
        return engine_value(self.project, self.result, name)

    def engine_cell(self, cell, kind: str, key: Any) -> None:
        """Record a cell just written with an engine value (:class:`EngineCell`)."""
        self.engine_cells.append(EngineCell(cell.parent.title, cell.coordinate, kind, key,
                                            cell.value))

    # --------------------------------------------------------------------------------------
    def build(self) -> Workbook:
        fields = self.title_fields()
        if self.template is not None:
            self.wb = open_template(self.template, fields)
            summary = self.sheet("Summary")
            next_row = self.structure_rows(summary, 1)
        else:
            self.wb = Workbook()
            ws = self.wb.active
            ws.title = "Summary"
            self.our_sheets.append("Summary")
            summary = _Sheet(self, ws)
            next_row = self.title_block(summary, fields)
        self.inputs_sheet(self.sheet("Inputs"))
        self.calculation_sheet(self.sheet("Calculation"))
        self.pendulum_sheet(self.sheet("Pendulum"))
        nonlinear = self.sheet("Nonlinear") if self.simulation is not None else None
        if nonlinear is not None:       # written before Checks: it adds a flag and verdicts
            self.nonlinear_sheet(nonlinear)
        self.checks_sheet(self.sheet("Checks"))
        self.summary_sheet(summary, next_row)
        self.charts()
        if nonlinear is not None:       # placed after Charts, in the order of SHEETS
            sheets = self.wb._sheets
            sheets.remove(nonlinear.ws)
            after = "Charts" if "Charts" in self.wb.sheetnames else "Checks"
            sheets.insert(sheets.index(self.wb[after]) + 1, nonlinear.ws)
            self.our_sheets.remove("Nonlinear")
            self.our_sheets.insert(self.our_sheets.index(after) + 1, "Nonlinear")
        self.names_sheet(self.sheet("Names"))
        self.cautions_sheet(self.sheet("Cautions"))
        self.record_sheet(self.sheet("Record"))
        mark_workbook(self.wb, __version__)
        if FORMAT_NAME in self.wb.defined_names:      # a template's stale mark
            del self.wb.defined_names[FORMAT_NAME]
        self.wb.defined_names.add(DefinedName(FORMAT_NAME, attr_text=str(FORMAT_VERSION),
                                              hidden=True))
        if self.project.simulation is not None:
            from openpyxl.packaging.custom import StringProperty
            props = self.wb.custom_doc_props
            for prop in list(props.props):
                if prop.name == SIMULATION_PROPERTY:
                    props.props.remove(prop)
            props.append(StringProperty(name=SIMULATION_PROPERTY,
                                        value=simulation_settings_text(self.project.simulation)))
        self.wb.properties.creator = f"swaytune {__version__}"
        self.wb.properties.title = self.project.info.get("title") or "Pendulum damper design"
        self.wb.calculation.fullCalcOnLoad = True
        return self.wb

    def title_fields(self) -> dict[str, str]:
        info = self.project.info
        return {
            "project_number": info.get("number", ""),
            "title": info.get("title", "") or "Pendulum tuned mass damper - preliminary design",
            "calculated_by": info.get("calculated_by", ""),
            "checked_by": info.get("checked_by", ""),
            "date": info.get("date", ""),
            "revision": info.get("revision", ""),
        }

    def title_block(self, sh: _Sheet, fields: dict[str, str]) -> int:
        add_default_title_block(sh.ws, fields, heading="Pendulum tuned mass damper - "
                                                       "preliminary design")
        return self.structure_rows(sh, 7)

    def structure_rows(self, sh: _Sheet, row: int) -> int:
        for label, key in (("Structure", "structure"), ("Client", "client")):
            if self.project.info.get(key):
                sh.put(row, 1, label, font=_BOLD)
                sh.text(row, 2, self.project.info[key], align=_WRAP)
                sh.ws.merge_cells(start_row=row, start_column=2, end_row=row, end_column=4)
                row += 1
        return row + 1

    # Inputs ---------------------------------------------------------------------------------
    def inputs_sheet(self, sh: _Sheet) -> None:
        p = self.project
        sh.put(1, 1, "Inputs", font=_TITLE)
        sh.put(2, 1, "Yellow cells are the inputs (unlocked); every other cell is protected "
                     "without a password. Values are converted to SI with exact factors.",
               align=_WRAP)
        sh.ws.merge_cells("A2:I2")
        sh.header(4, ["Input", "Symbol", "Value", "Unit", "Factor to SI", "Value (SI)",
                      "SI unit", "Valid range (in Unit)", "Where the value usually comes from"])
        row = 5
        for spec in INPUT_SPECS:
            if spec.name == "modal_mass" and p.floors is not None:
                sh.put(row, 1, spec.label, align=_WRAP, border=True)
                sh.put(row, 2, spec.symbol, border=True)
                sh.put(row, 3, "from the floor table below", border=True)
                sh.put(row, 6, "=modal_mass_from_floors", fmt=_fmt("kg"), border=True)
                sh.put(row, 7, "kg", border=True)
                sh.put(row, 9, spec.note, align=_WRAP, border=True)
                sh.name("modal_mass", row, 6)
                row += 1
                continue
            item = p.inputs.get(spec.name)
            if item is None:
                continue
            unit = item.unit
            sh.put(row, 1, spec.label, align=_WRAP, border=True)
            sh.put(row, 2, spec.symbol, border=True)
            c = sh.put(row, 3, item.value, fmt="General", fill=_INPUT_FILL, border=True,
                       unlocked=True)
            sh.put(row, 4, unit.symbol, border=True)
            sh.put(row, 5, unit.factor, fmt="General", border=True)
            si_unit = SI_UNIT[spec.kind] if spec.kind != "fraction" else "-"
            sh.put(row, 6, f"={c.coordinate}*E{row}", fmt=_fmt(si_unit), border=True)
            sh.put(row, 7, si_unit, border=True)
            sh.put(row, 8, spec.interval(unit.factor), border=True)
            note = item.note + ("" if item.given else " (default)")
            sh.text(row, 9, note, align=_WRAP, border=True)
            self._validation(sh, c.coordinate, spec, unit.factor)
            sh.name(INPUT_NAMES[spec.name], row, 6)
            self.name_info.append((INPUT_NAMES[spec.name], "Inputs", spec.label, si_unit))
            row += 1
        # tuning method (text input, list validation)
        sh.put(row, 1, "Tuning method", border=True)
        sh.put(row, 3, p.tuning_method, border=True)
        sh.put(row, 9, "Set in the project file; the Calculation sheet is laid out for it "
                       "(rebuild to change).", align=_WRAP, border=True)
        row += 2
        if p.floors is not None:
            row = self.floor_table(sh, row)
        note_row = row
        sh.put(note_row, 1, "Notes", font=_BOLD)
        sh.text(note_row + 1, 1, p.info.get("notes", ""), align=_WRAP)
        sh.ws.merge_cells(start_row=note_row + 1, start_column=1, end_row=note_row + 1,
                          end_column=9)
        sh.widths([34, 9, 12, 9, 12, 14, 8, 16, 52])
        self.protect(sh, "Inputs", "1:4", landscape=True)

    def _validation(self, sh: _Sheet, coord: str, spec, factor: float) -> None:
        lo, hi = spec.low / factor, spec.high / factor
        conds = [f"ABS({coord})>=0"]
        if math.isfinite(lo):
            conds.append(f"{coord}{'>' if spec.low_open else '>='}{lo!r}")
        if math.isfinite(hi):
            conds.append(f"{coord}{'<' if spec.high_open else '<='}{hi!r}")
        formula = f"AND({','.join(conds)})"
        check_formula(formula)
        dv = DataValidation(type="custom", formula1=formula, allow_blank=False,
                            showErrorMessage=True, errorTitle="Value out of range",
                            error=f"{spec.label}: a number in {spec.interval(factor)}",
                            showInputMessage=True, promptTitle=spec.symbol,
                            prompt=f"Valid range {spec.interval(factor)}"[:255])
        dv.add(coord)
        sh.ws.add_data_validation(dv)

    def _positive_validation(self, sh: _Sheet, rng: str, label: str) -> None:
        first = rng.split(":")[0]
        formula = f"AND(ABS({first})>=0,{first}>0)"
        check_formula(formula)
        dv = DataValidation(type="custom", formula1=formula, allow_blank=False,
                            showErrorMessage=True, errorTitle="Value out of range",
                            error=f"{label}: a number > 0")
        dv.add(rng)
        sh.ws.add_data_validation(dv)

    def floor_table(self, sh: _Sheet, row: int) -> int:
        fl = self.project.floors
        sh.put(row, 1, "Floor table: modal mass from a power-law mode shape (z/h)^k "
                       "(EN 1991-1-4 Annex F, F.3)", font=_BOLD, fill=_SECTION_FILL)
        sh.ws.merge_cells(start_row=row, start_column=1, end_row=row, end_column=9)
        row += 1
        items = [("Building height", "h", fl.building_height, fl.height_unit, "building_height",
                  "length"),
                 ("Mode shape exponent" + (f" ({fl.structure_type})" if fl.structure_type
                                           else ""), "k", fl.exponent, None, "mode_exponent",
                  None)]
        for label, sym, value, unit, name, kind in items:
            sh.put(row, 1, label, border=True)
            sh.put(row, 2, sym, border=True)
            c = sh.put(row, 3, value, fill=_INPUT_FILL, border=True, unlocked=True)
            self._positive_validation(sh, c.coordinate, label)
            if unit is not None:
                sh.put(row, 4, unit.symbol, border=True)
                sh.put(row, 5, unit.factor, border=True)
                sh.put(row, 6, f"={c.coordinate}*E{row}", fmt=_fmt("m"), border=True)
                sh.put(row, 7, "m", border=True)
            else:
                sh.put(row, 4, "-", border=True)
                sh.put(row, 6, f"={c.coordinate}", border=True)
                sh.put(row, 7, "-", border=True)
            sh.name(name, row, 6)
            row += 1
        sh.put(row, 1, "Damper at floor (1-based)", border=True)
        c = sh.put(row, 3, fl.damper_level, border=True)
        row += 1
        head = row
        sh.header(head, ["Floor", "", f"Height [{fl.height_unit.symbol}]",
                         f"Mass [{fl.mass_unit.symbol}]", "Height (SI) [m]", "Mass (SI) [kg]",
                         "phi = (z/h)^k", "m phi^2 [kg]", ""])
        first = head + 1
        for i, (h, m) in enumerate(zip(fl.heights, fl.masses), start=1):
            r = head + i
            sh.put(r, 1, i, border=True)
            sh.put(r, 3, h, fill=_INPUT_FILL, border=True, unlocked=True)
            sh.put(r, 4, m, fill=_INPUT_FILL, border=True, unlocked=True)
            sh.put(r, 5, f"=C{r}*{fl.height_unit.factor!r}", fmt=_fmt("m"), border=True)
            sh.put(r, 6, f"=D{r}*{fl.mass_unit.factor!r}", fmt=_fmt("kg"), border=True)
            sh.put(r, 7, f"=POWER(E{r}/building_height,mode_exponent)", fmt=_fmt("-"),
                   border=True)
            sh.put(r, 8, f"=F{r}*G{r}^2", fmt=_fmt("kg"), border=True)
        last = head + len(fl.heights)
        self._positive_validation(sh, f"C{first}:D{last}", "Floor height and mass")
        row = last + 1
        d = head + fl.damper_level
        sh.put(row, 1, "Modal mass, mode normalised to 1 at the damper", font=_BOLD, border=True)
        sh.put(row, 2, "M*", border=True)
        sh.put(row, 6, f"=SUMPRODUCT(H{first}:H{last})/G{d}^2", fmt=_fmt("kg"), border=True)
        sh.put(row, 7, "kg", border=True)
        sh.put(row, 9, "sum m_i phi_i^2 / phi_damper^2", border=True)
        sh.name("modal_mass_from_floors", row, 6)
        return row + 2

    # Calculation ----------------------------------------------------------------------------
    def calculation_sheet(self, sh: _Sheet) -> None:
        sh.put(1, 1, "Calculation", font=_TITLE)
        sh.put(2, 1, "Every value is a worksheet formula of the inputs, in checking order. "
                     "Green cells are engine values (no closed form), computed when the "
                     "workbook was built; their flag says when the inputs have changed since.",
               align=_WRAP)
        sh.ws.merge_cells("A2:G2")
        us = self.project.units == "US"
        sh.header(4, ["Step", "Quantity", "Symbol", "Value", "Unit", "Equation",
                      "Source / note"] + (["Value (US)", "US unit"] if us else []))
        row = 5
        for sec in sections(self.method, self.mode):
            sh.put(row, 1, sec.title, font=_BOLD, fill=_SECTION_FILL)
            for col in range(2, 8):
                sh.put(row, col, None, fill=_SECTION_FILL)
            row += 1
            if sec.note:
                sh.put(row, 2, sec.note, align=_WRAP)
                sh.ws.merge_cells(start_row=row, start_column=2, end_row=row, end_column=7)
                row += 1
            number = 0
            items = list(sec.items)
            for idx, item in enumerate(items):
                number += 1
                step_no = f"{sec.title.split()[0]}.{number}"
                sh.put(row, 1, step_no, align=_TOP)
                sh.put(row, 2, item.label, align=_WRAP, border=True)
                sh.put(row, 3, item.symbol, border=True, align=_TOP)
                sh.put(row, 5, item.unit, border=True, align=_TOP)
                sh.put(row, 6, item.expression, align=_WRAP, border=True)
                sh.put(row, 7, item.source, align=_WRAP, border=True)
                fmt = _fmt(item.unit) if not item.name.startswith("var_") else "General"
                if isinstance(item, EngineValue):
                    value = self.engine_value(item.engine)
                    c = sh.put(row, 4, value, fmt=fmt, fill=_ENGINE_FILL, border=True,
                               align=_TOP)
                    self.engine_cell(c, "engine", item.engine)
                    self.engine_values[item.name] = value
                else:
                    sh.put(row, 4, item.formula, fmt=fmt, border=True, align=_TOP)
                sh.name(item.name, row, 4)
                self.name_info.append((item.name, "Calculation", item.label, item.unit))
                if us and item.unit in US_DISPLAY:
                    us_unit, factor = US_DISPLAY[item.unit]
                    sh.put(row, 8, f"=D{row}/{factor!r}", fmt=_fmt(us_unit), border=True,
                           align=_TOP)
                    sh.put(row, 9, us_unit, border=True, align=_TOP)
                if item.engine:
                    self.cross.append((item.name, item.label, item.symbol,
                                       self.engine_value(item.engine)))
                    self.cross_engine[item.name] = item.engine
                row += 1
                nxt = items[idx + 1] if idx + 1 < len(items) else None
                if isinstance(item, EngineValue) and not (
                        isinstance(nxt, EngineValue) and nxt.depends_on == item.depends_on):
                    what = "mass ratio" if item.name == "mass_ratio" else "tuning optimum"
                    row = self.engine_flag(sh, row, item.depends_on, what)
            row += 1
        sh.widths([7, 40, 9, 15, 8, 34, 44] + ([13, 9] if us else []))
        self.protect(sh, "Calculation", "1:4", landscape=True)

    def engine_flag(self, sh: _Sheet, row: int, depends_on: tuple[str, ...],
                    what: str, *, label_col: int = 2, value_col: int = 4,
                    note_col: int = 6, note_to: int | None = None, kind: str = "engine") -> int:
        conds = []
        v = get_column_letter(value_col)
        for dep in depends_on:
            snap = self.engine_value(dep)
            sh.put(row, label_col, f"Engine value computed for {dep} =", align=_WRAP)
            c = sh.put(row, value_col, snap, fmt="General", fill=_ENGINE_FILL, border=True,
                       align=_TOP)
            self.engine_cell(c, kind, dep)
            sh.put(row, note_col, "value at build time", align=_WRAP)
            if note_to:
                sh.ws.merge_cells(start_row=row, start_column=note_col, end_row=row,
                                  end_column=note_to)
            conds.append(f"ABS({dep}-{v}{row})<=1E-12*ABS({v}{row})")
            row += 1
        n = len(self.flag_cells) + 1
        sh.put(row, label_col, "Inputs changed since the engine value was computed?",
               font=_BOLD, align=_WRAP)
        sh.put(row, value_col, f'=IF(AND({",".join(conds)}),"current","INPUTS CHANGED: '
                               'rebuild")', border=True, font=_BOLD, align=_TOP)
        sh.put(row, note_col, "rebuild the workbook to refresh the engine value", align=_WRAP)
        if note_to:
            sh.ws.merge_cells(start_row=row, start_column=note_col, end_row=row,
                              end_column=note_to)
        sh.name(f"engine_flag_{n}", row, value_col)
        self.flag_cells.append(f"engine_flag_{n}")
        self.flag_labels.append(what)
        self.helper_labels[f"engine_flag_{n}"] = (f"Flag: engine value of the {what} current?",
                                                  "")
        return row + 1

    # Nonlinear -----------------------------------------------------------------------------
    def _simulation_dependencies(self) -> tuple[str, ...]:
        """Inputs the simulation depends on (through the design and the load calibration)."""
        deps = ["structure_frequency", "modal_mass", "structural_damping", "acceleration"]
        if self.mode == "required":
            deps.append("acceleration_limit")
        deps += [n for n in ("chosen_mass_ratio", "chosen_damper_mass") if n in self.names]
        return tuple(deps + ["gravity"])

    def _engine_row(self, sh: _Sheet, row: int, label: str, value: Any, unit: str,
                    note: str = "", name: str | None = None, fmt: str | None = None) -> int:
        """A row of the Nonlinear sheet: label, engine value (green), unit, note."""
        sh.put(row, 1, label, align=_WRAP, border=True)
        if isinstance(value, float) and not math.isfinite(value):
            value = _NOT_DEFINED          # the engine says why in its notes (shown below)
        if isinstance(value, str) and not value.startswith("="):
            self.engine_cell(sh.text(row, 2, value, border=True, align=_TOP), "simulation",
                             label)
        elif isinstance(value, str):
            sh.put(row, 2, value, fmt=fmt or _fmt(unit), border=True, align=_TOP)
        else:
            self.engine_cell(sh.put(row, 2, value, fmt=fmt or _fmt(unit), fill=_ENGINE_FILL,
                                    border=True, align=_TOP), "simulation", label)
        sh.put(row, 3, unit, border=True, align=_TOP)
        sh.put(row, 4, note, align=_WRAP, border=True)
        sh.ws.merge_cells(start_row=row, start_column=4, end_row=row, end_column=6)
        if name:
            sh.name(name, row, 2)
            self.name_info.append((name, "Nonlinear", label, unit))
        return row + 1

    def _section(self, sh: _Sheet, row: int, title: str, note: str = "") -> int:
        sh.put(row, 1, title, font=_BOLD, fill=_SECTION_FILL)
        for col in range(2, 7):
            sh.put(row, col, None, fill=_SECTION_FILL)
        row += 1
        if note:
            sh.put(row, 1, note, align=_WRAP)
            sh.ws.merge_cells(start_row=row, start_column=1, end_row=row, end_column=6)
            row += 1
        return row

    def nonlinear_sheet(self, sh: _Sheet) -> None:
        from .charts import add_time_history_charts
        run = self.simulation
        sim, st = run.result, run.settings
        sh.put(1, 1, "Nonlinear check: the pendulum damper simulated in time", font=_TITLE)
        sh.put(2, 1, "Green cells are ENGINE VALUES (functions.simulation.simulate) computed "
                     "when the workbook was built: a time-domain integration of the exact "
                     "pendulum equation has no worksheet formula. The flag at the end of table 1 "
                     "says whether the inputs have changed since; rebuild the workbook to "
                     "refresh them.", align=_WRAP)
        sh.ws.merge_cells("A2:F2")
        sh.put(3, 1, "Preliminary design aid: the model is one building mode with a rigid "
                     "hanger and a linear dashpot; check it against the manufacturer's design.",
               align=_WRAP, font=Font(italic=True, color="C00000"))
        sh.ws.merge_cells("A3:F3")
        sh.header(4, ["Quantity", "Value", "Unit", "Note", "", ""])
        sh.ws.merge_cells("D4:F4")
        row = self._section(sh, 5, "1  Load and damper simulated")
        random = st.load == "random"
        if random:
            what = (f"white noise through a low-pass filter (corner at the mode's frequency), "
                    f"seed {st.seed}")
            calib = (f"chosen so that the building WITHOUT the damper has the expected peak "
                     f"acceleration a x load factor: RMS x peak factor over "
                     f"{PEAK_DURATION:g} s")
        else:
            what = "sine at the mode's frequency (resonance of the bare building)"
            calib = ("chosen so that the steady peak acceleration of the building WITHOUT the "
                     "damper is a x load factor")
        row = self._engine_row(sh, row, "Load (project file, [simulation] load)", st.load,
                               "", what)
        row = self._engine_row(sh, row, "Force RMS" if random else "Force amplitude",
                               run.force, "N", calib, "sim_force", fmt="#,##0")
        row = self._engine_row(sh, row, "Load factor (force / calibrated force)",
                               st.load_factor, "-", "project file, [simulation] load_factor",
                               fmt="0.00")
        if random:
            row = self._engine_row(sh, row, "Peak factor g (Davenport)", run.peak_factor, "-",
                                   f"functions.damper.peak_factor(f_s, {PEAK_DURATION:g} s)",
                                   fmt="0.000")
        row = self._engine_row(sh, row, "Corner frequency of the force spectrum" if random
                               else "Forcing frequency", run.load_frequency, "Hz",
                               "the mode's frequency f_s")
        row = self._engine_row(sh, row, "Hanger length simulated (design pendulum length)",
                               run.length, "m", "Calculation sheet, step 5.2: in tune at the "
                               "design swing", "sim_length")
        row = self._engine_row(sh, row, "Damper mass", run.damper_mass, "kg",
                               "Calculation sheet, step 2")
        row = self._engine_row(sh, row, "Small-angle frequency of that hanger",
                               run.hanger_frequency, "Hz", "f_L = sqrt(g/L) / (2 pi): above "
                               "f_d, equal to it at the design swing")
        row = self._engine_row(sh, row, "Damper damping on the hanger's small-angle frequency",
                               run.damper_damping, "-", "zeta_d f_d / f_L: the dashpot c_d "
                               "designed on the Calculation sheet")
        row = self._engine_row(sh, row, "Record length (after the warm-up)", sim.time[-1],
                               "s", "project file, [simulation] duration", fmt="0.0")
        row = self._engine_row(sh, row, "Warm-up simulated and discarded", sim.warmup, "s",
                               "lets the start-up transient die out", fmt="0.0")
        row = self._engine_row(sh, row, "Output time step", sim.time_step, "s",
                               f"{sim.substeps} Runge-Kutta steps per output step",
                               fmt="0.0000")
        row = self._engine_row(sh, row, "Estimated relative integration error",
                               sim.integration_error, "-", "step doubling (Richardson), "
                               "relative to the peaks", fmt=_SCI)
        row = self.engine_flag(sh, row, self._simulation_dependencies(),
                               "nonlinear simulation", label_col=1, value_col=2, note_col=4,
                               note_to=6, kind="simulation")
        row += 1

        row = self._section(sh, row, "2  Response over the record",
                            "Exact pendulum: sin(theta), cos(theta) and theta'^2 terms kept; "
                            "linearised: the same damper with sin(theta) = theta (the linear "
                            "design's model); without damper: the bare building under the same "
                            "force.")
        sh.header(row, ["Quantity", "Exact pendulum", "Linearised", "Without damper", "Unit",
                        ""])
        row += 1
        nl, lin, bare = sim.nonlinear, sim.linear, sim.without_damper
        table = [("RMS building displacement", "displacement_rms", "m", True),
                 ("Peak building displacement", "displacement_peak", "m", True),
                 ("RMS building acceleration", "acceleration_rms", "m/s^2", True),
                 ("Peak building acceleration", "acceleration_peak", "m/s^2", True),
                 ("RMS swing angle", "angle_rms_deg", "deg", False),
                 ("Peak swing angle", "swing_deg", "deg", False),
                 ("RMS stroke (mass relative to the floor)", "stroke_rms", "m", False),
                 ("Peak stroke", "stroke_peak", "m", False),
                 ("Effective damping identified from the response", "effective_damping", "-",
                  True)]
        first_table_row = row
        for label, attr, unit, has_bare in table:
            sh.put(row, 1, label, align=_WRAP, border=True)
            for col, resp in ((2, nl), (3, lin), (4, bare)):
                value = getattr(resp, attr)
                if col == 4 and not has_bare:
                    sh.put(row, col, "-", border=True)
                elif isinstance(value, float) and not math.isfinite(value):
                    self.engine_cell(sh.put(row, col, "not identified", border=True),
                                     "simulation", f"{label} ({col})")
                else:
                    self.engine_cell(sh.put(row, col, value, fmt=_fmt(unit), fill=_ENGINE_FILL,
                                            border=True), "simulation", f"{label} ({col})")
            sh.put(row, 5, unit, border=True)
            row += 1
        self.names_for_table(sh, first_table_row)
        if sim.theory is not None:
            th = sim.theory
            sh.put(row, 1, "RMS building acceleration, frequency domain (linear theory)",
                   align=_WRAP, border=True)
            sh.put(row, 2, "-", border=True)
            self.engine_cell(sh.put(row, 3, th.acceleration_rms, fmt=_fmt("m/s^2"),
                                    fill=_ENGINE_FILL, border=True), "simulation",
                             "acceleration_rms (theory)")
            self.engine_cell(sh.put(row, 4, th.acceleration_rms_without_damper,
                                    fmt=_fmt("m/s^2"), fill=_ENGINE_FILL, border=True),
                             "simulation", "acceleration_rms_without_damper (theory)")
            sh.put(row, 5, "m/s^2", border=True)
            row += 1
            sh.put(row, 1, "Expected scatter of an RMS over this record (1 standard "
                           "deviation)", align=_WRAP, border=True)
            sh.put(row, 2, "-", border=True)
            self.engine_cell(sh.put(row, 3, th.acceleration_rms_scatter, fmt="0.0%",
                                    fill=_ENGINE_FILL, border=True), "simulation",
                             "acceleration_rms_scatter (theory)")
            sh.put(row, 4, "-", border=True)
            sh.put(row, 5, "-", border=True)
            row += 1
        row += 1

        row = self._section(sh, row, "3  Detuning check and verdict",
                            "A pendulum's frequency falls as it swings further (exact period, "
                            "A&S 17.6). The hanger is cut to be in tune at the design swing; "
                            "here the simulated swing is compared with it.")
        row = self._engine_row(sh, row, "Peak swing simulated (exact pendulum)",
                               nl.swing_deg, "deg", "largest |theta| over the record",
                               "sim_swing_deg")
        row = self._engine_row(sh, row, "Design swing (Calculation sheet)", "=swing_angle_deg",
                               "deg", "at the design stroke")
        row = self._engine_row(sh, row, "Frequency of the hanger at the simulated peak swing",
                               sim.damper_frequency_at_swing, "Hz", "exact period "
                               "(functions.pendulum.pendulum_frequency)", "sim_frequency_at_swing")
        row = self._engine_row(sh, row, "Detuning at the simulated peak swing, exact-period "
                               "prediction", sim.detuning, "-", "f(theta) / f(0) - 1 "
                               "(functions.pendulum.amplitude_detuning)", "sim_detuning")
        row = self._engine_row(sh, row, "Detuning measured from the simulated swing",
                               sim.simulated_detuning, "-", "equivalent linearisation of m g L "
                               "sin(theta) over the record: for a random swing it reflects the "
                               "typical, not the peak, swing", "sim_measured_detuning")
        row = self._engine_row(sh, row, "Measured minus predicted detuning",
                               f'=IFERROR(sim_measured_detuning-sim_detuning,"{_NOT_DEFINED}")',
                               "-",
                               "0 for a steady harmonic swing (to order theta^4)")
        row = self._engine_row(sh, row, "Swing whose exact period gives the measured detuning",
                               sim.equivalent_swing_deg, "deg",
                               "functions.pendulum.amplitude_for_error")
        row = self._engine_row(sh, row, "Mistuning at the simulated peak swing against the "
                               "damper frequency f_d", "=IFERROR(sim_frequency_at_swing/"
                               f'damper_frequency-1,"{_NOT_DEFINED}")', "-",
                               "0 at the design swing; the hanger "
                               "runs fast at smaller swings and slow at larger ones")
        row = self._engine_row(sh, row, "Largest departure, exact pendulum against "
                               "linearised", sim.departure, "-", sim.departure_quantity,
                               "sim_departure")
        sh.put(row, 1, "Accepted departure", align=_WRAP, border=True)
        self.engine_cell(sh.put(row, 2, st.tolerance, fmt="0.000", border=True), "simulation",
                         "tolerance (project file)")
        sh.put(row, 3, "-", border=True)
        sh.put(row, 4, "project file, [simulation] tolerance", align=_WRAP, border=True)
        sh.ws.merge_cells(start_row=row, start_column=4, end_row=row, end_column=6)
        sh.name("sim_tolerance", row, 2)
        self.name_info.append(("sim_tolerance", "Nonlinear", "Accepted departure", "-"))
        row += 1
        sh.put(row, 1, "Verdict: nonlinear response within the tolerance and swing <= 90 deg",
               font=_BOLD, align=_WRAP, border=True)
        sh.put(row, 2, '=IFERROR(IF(AND(sim_departure<=sim_tolerance,sim_swing_deg<=90),"OK",'
                       '"NOT OK"),"NOT OK")', font=_BOLD, border=True)
        self._verdict_colours(sh, f"B{row}")
        sh.name("sim_verdict", row, 2)
        self.helper_labels["sim_verdict"] = ("Verdict of the nonlinear simulation", "")
        row += 1
        sh.put(row, 1, "Engine's verdict", align=_TOP, border=True)
        self.engine_cell(sh.text(row, 2, sim.verdict, align=_WRAP, border=True), "simulation",
                         "verdict")
        sh.ws.merge_cells(start_row=row, start_column=2, end_row=row, end_column=6)
        row += 1
        for note in sim.notes:
            sh.put(row, 1, "Engine note", align=_TOP, border=True)
            self.engine_cell(sh.text(row, 2, note, align=_WRAP, border=True), "simulation",
                             "note")
            sh.ws.merge_cells(start_row=row, start_column=2, end_row=row, end_column=6)
            row += 1
        row += 1
        sh.put(row, 1, "Charts: engine values (the whole record with one point in every few "
                       "output samples; every sample around the peak swing); the tables they "
                       "plot are in columns H:P (not printed).", align=_WRAP)
        sh.ws.merge_cells(start_row=row, start_column=1, end_row=row, end_column=6)
        chart_row = row + 1
        from openpyxl.worksheet.pagebreak import Break
        sh.ws.row_breaks.append(Break(id=row))
        last = add_time_history_charts(sh.ws, sim, chart_row=chart_row, data_row=1, data_col=8)
        for cells in sh.ws.iter_rows(min_col=8):
            for c in cells:
                if isinstance(c.value, (int, float)) and not isinstance(c.value, bool):
                    self.engine_cell(c, "simulation", "time history")
        sh.widths([40, 15, 15, 15, 9, 22, 3, 10, 14, 14, 14, 14, 3, 10, 14, 14])
        _fit_rows(sh.ws)
        sh.ws.protection.sheet = True
        set_print_layout(sh.ws, self.project.paper, landscape=False, title_rows="1:1",
                         print_area=f"A1:F{last}")

    def names_for_table(self, sh: _Sheet, first: int) -> None:
        """Defined names of the exact-pendulum column of the response table."""
        for offset, (name, label, unit) in enumerate((
                ("sim_displacement_rms", "Simulated RMS building displacement", "m"),
                ("sim_displacement_peak", "Simulated peak building displacement", "m"),
                ("sim_acceleration_rms", "Simulated RMS building acceleration", "m/s^2"),
                ("sim_acceleration_peak", "Simulated peak building acceleration", "m/s^2"),
                ("sim_swing_rms_deg", "Simulated RMS swing angle", "deg"),
                (None, "", ""),
                ("sim_stroke_rms", "Simulated RMS stroke", "m"),
                ("sim_stroke_peak", "Simulated peak stroke", "m"),
                ("sim_effective_damping", "Effective damping identified from the simulation",
                 "-"))):
            if name is None:
                continue
            sh.name(name, first + offset, 2)
            self.name_info.append((name, "Nonlinear", label, unit))

    # Pendulum ------------------------------------------------------------------------------
    def pendulum_sheet(self, sh: _Sheet) -> None:
        sh.put(1, 1, "Pendulum length in tune at its own design swing", font=_TITLE)
        sh.put(2, 1, "Fixed point L(k+1) = L_0 AGM(1, cos(theta_k/2))^2 with theta_k = "
                     "asin(s / L_k): a pendulum of length L has the exact period "
                     "T_0 / AGM(1, cos(theta/2)) at swing theta (A&S 17.6; Villarino 2012). "
                     "AGM: a(n+1) = (a(n) + b(n))/2, b(n+1) = sqrt(a(n) b(n)), a(0) = 1.",
               align=_WRAP)
        sh.ws.merge_cells("A2:Q2")
        cols = ["k", "L_k [m]", "theta_k [deg]", "b0 = cos(theta/2)"]
        for n in range(1, AGM_STEPS + 1):
            cols += [f"a{n}", f"b{n}"]
        cols += ["AGM", "L_(k+1) [m]", "|L_(k+1) - L_k| / L_k"]
        sh.header(4, cols)
        first = 5
        agm_col = 5 + 2 * AGM_STEPS
        for k in range(FIXED_POINT_ITERATIONS):
            r = first + k
            sh.put(r, 1, k)
            prev = "small_angle_length" if k == 0 else f"{get_column_letter(agm_col + 1)}{r - 1}"
            sh.put(r, 2, f"={prev}", fmt="0.000000000000")
            sh.put(r, 3, f"=DEGREES(ASIN(stroke/B{r}))", fmt="0.000000")
            self._agm_row(sh, r, f"C{r}")
            L = get_column_letter(agm_col + 1)
            sh.put(r, agm_col + 1, f"=small_angle_length*{get_column_letter(agm_col)}{r}^2",
                   fmt="0.000000000000")
            # rounded to 1e-15 so that last-bit noise of a platform's maths library does not
            # show (one unit in the last place is about 1.1e-16 relative)
            sh.put(r, agm_col + 2, f"=ROUND(ABS({L}{r}-B{r})/B{r},15)", fmt=_SCI)
        last = first + FIXED_POINT_ITERATIONS - 1
        sh.name("fixed_point_length", last, agm_col + 1)
        sh.name("fixed_point_change", last, agm_col + 2)
        r = last + 2
        sh.put(r, 1, "At the design swing theta = swing_angle_deg:", font=_BOLD)
        r += 1
        sh.put(r, 1, "final")
        sh.put(r, 2, "=pendulum_length", fmt="0.000000000000")
        sh.put(r, 3, "=swing_angle_deg", fmt="0.000000")
        self._agm_row(sh, r, f"C{r}")
        sh.name("agm_at_swing", r, agm_col)
        sh.put(r + 2, 1, "Small-angle error e = 1/AGM - 1 and detuning 1/(1 + e) - 1 are on "
                         "the Calculation sheet (section 5).")
        widths = [6, 16, 13, 13] + [12] * (2 * AGM_STEPS) + [16, 16, 12]
        sh.widths(widths)
        self.protect(sh, "Pendulum", "1:4", landscape=True)

    def _agm_row(self, sh: _Sheet, r: int, theta: str) -> None:
        sh.put(r, 4, f"=COS(RADIANS({theta})/2)", fmt="0.000000000")
        a_prev, b_prev = "1", f"D{r}"
        col = 5
        for _ in range(AGM_STEPS):
            a_col, b_col = get_column_letter(col), get_column_letter(col + 1)
            sh.put(r, col, f"=({a_prev}+{b_prev})/2", fmt="0.000000000")
            sh.put(r, col + 1, f"=SQRT({a_prev}*{b_prev})", fmt="0.000000000")
            a_prev, b_prev = f"{a_col}{r}", f"{b_col}{r}"
            col += 2
        sh.put(r, col, f"=({a_prev}+{b_prev})/2", fmt="0.000000000000")

    # Checks ---------------------------------------------------------------------------------
    def checks_sheet(self, sh: _Sheet) -> None:
        sh.put(1, 1, "Checks", font=_TITLE)
        sh.header(3, ["Design check", "Rule", "Value", "Limit", "Lower limit", "Unit",
                      "Verdict"])
        row = 4
        self.design_verdict_cells: list[tuple[str, str]] = []
        for chk in design_checks():
            sh.put(row, 1, chk.label, align=_WRAP, border=True)
            sh.put(row, 2, chk.rule, border=True)
            sh.put(row, 3, chk.value_formula, fmt=_fmt(chk.unit), border=True)
            sh.put(row, 4, chk.limit_formula, fmt=_fmt(chk.unit), border=True)
            sh.put(row, 5, chk.lower_formula or None, fmt=_fmt(chk.unit), border=True)
            sh.put(row, 6, chk.unit, border=True)
            sh.put(row, 7, chk.verdict_formula, font=_BOLD, border=True)
            self.design_verdict_cells.append((chk.label, f"G{row}"))
            row += 1
        self._verdict_colours(sh, f"G4:G{row - 1}")
        all_row = row
        cells = ",".join(f'{c}="OK"' for _, c in self.design_verdict_cells)
        sh.put(row, 1, "All design checks", font=_BOLD, border=True)
        sh.put(row, 7, f'=IF(AND({cells}),"OK","NOT OK")', font=_BOLD, border=True)
        self._verdict_colours(sh, f"G{row}")
        sh.name("all_design_checks", row, 7)
        row += 3

        sh.put(row, 1, "Cross-check of every formula result against the engine (functions/, "
                       "computed when the workbook was built)", font=_BOLD)
        row += 1
        sh.header(row, ["Quantity", "Symbol", "Workbook formula", "Engine value",
                        "Relative difference (rounded to 1e-12)", "Tolerance", "Verdict"])
        row += 1
        first = row
        for name, label, symbol, engine in self.cross:
            sh.put(row, 1, label, align=_WRAP, border=True)
            sh.put(row, 2, symbol, border=True)
            sh.put(row, 3, f"={name}", fmt=_FULL, border=True)
            self.engine_cell(sh.put(row, 4, engine, fmt=_FULL, fill=_ENGINE_FILL, border=True),
                             "engine", self.cross_engine[name])
            sh.put(row, 5, f"=ROUND(IF(D{row}=0,ABS(C{row}),ABS(C{row}/D{row}-1)),12)", fmt=_SCI,
                   border=True)
            sh.put(row, 6, CROSS_CHECK_TOLERANCE, fmt=_SCI, border=True)
            sh.put(row, 7, f'=IF(E{row}<=F{row},"OK","NOT OK")', font=_BOLD, border=True)
            row += 1
        last = row - 1
        self._verdict_colours(sh, f"G{first}:G{last}")
        cells = ",".join(f'G{r}="OK"' for r in range(first, last + 1))
        sh.put(row, 1, "All cross-checks", font=_BOLD, border=True)
        sh.put(row, 7, f'=IF(AND({cells}),"OK","NOT OK")', font=_BOLD, border=True)
        self._verdict_colours(sh, f"G{row}")
        sh.name("all_cross_checks", row, 7)
        row += 2
        sh.put(row, 1, "Pendulum fixed point converged (last relative change <= 1e-12)",
               border=True,
               align=_WRAP)
        sh.put(row, 3, "=fixed_point_change", fmt=_SCI, border=True)
        sh.put(row, 7, '=IF(fixed_point_change<=1E-12,"OK","NOT OK")',
               font=_BOLD, border=True)
        self._verdict_colours(sh, f"G{row}")
        sh.name("fixed_point_converged", row, 7)
        row += 1
        for flag, what in zip(self.flag_cells, self.flag_labels):
            sh.put(row, 1, f"Engine value of the {what} current (inputs unchanged since "
                           "the build)", border=True, align=_WRAP)
            sh.put(row, 7, f'=IF({flag}="current","OK","NOT OK")', font=_BOLD, border=True)
            self._verdict_colours(sh, f"G{row}")
            row += 1
        self.nonlinear_verdict_cells: list[tuple[str, str]] = []
        if self.simulation is not None:
            row = self.nonlinear_checks(sh, row + 2)
        self.all_checks_row = all_row
        sh.widths([40, 25, 20, 20, 12, 10, 10])
        self.protect(sh, "Checks", "1:3", landscape=False)

    def nonlinear_checks(self, sh: _Sheet, row: int) -> int:
        """Detuning check and verdict of the time-domain simulation (Nonlinear sheet)."""
        sh.put(row, 1, "Nonlinear check: time-domain simulation (engine values computed when "
                       "the workbook was built; see the Nonlinear sheet)", font=_BOLD)
        row += 1
        sh.header(row, ["Check", "Rule", "Value", "Limit", "Lower limit", "Unit", "Verdict"])
        row += 1
        first = row
        rows = [
            ("Nonlinear response within the tolerance of the linearised damper",
             "departure <= tolerance", "=sim_departure", "=sim_tolerance", "-",
             "=sim_verdict", "Nonlinear simulation: response within the tolerance"),
            ("Detuning at the simulated peak swing within the accepted value",
             "|df/f| <= |df/f|_max", f'=IFERROR(ABS(sim_detuning),"{_NOT_DEFINED}")',
             "=max_detuning", "-",
             '=IFERROR(IF(ABS(sim_detuning)<=max_detuning,"OK","NOT OK"),"NOT OK")',
             "Nonlinear simulation: detuning at the simulated swing"),
            ("Simulated peak swing within the accepted angle", "theta_sim <= theta_max",
             "=sim_swing_deg", "=max_swing_deg", "deg",
             '=IF(sim_swing_deg<=max_swing_deg,"OK","NOT OK")',
             "Nonlinear simulation: simulated swing"),
        ]
        self.nonlinear_summary_labels: list[str] = []
        for label, rule, value, limit, unit, verdict, short in rows:
            self.nonlinear_summary_labels.append(short)
            sh.put(row, 1, label, align=_WRAP, border=True)
            sh.put(row, 2, rule, border=True)
            sh.put(row, 3, value, fmt=_fmt(unit), border=True)
            sh.put(row, 4, limit, fmt=_fmt(unit), border=True)
            sh.put(row, 5, None, border=True)
            sh.put(row, 6, unit, border=True)
            sh.put(row, 7, verdict, font=_BOLD, border=True)
            self.nonlinear_verdict_cells.append((label, f"G{row}"))
            row += 1
        self._verdict_colours(sh, f"G{first}:G{row - 1}")
        sh.put(row, 1, "For information: detuning measured from the simulated swing, and the "
                       "exact-period prediction at the peak swing", align=_WRAP, border=True)
        sh.put(row, 2, "measured / predicted", border=True)
        sh.put(row, 3, "=sim_measured_detuning", fmt=_fmt("-"), border=True)
        sh.put(row, 4, "=sim_detuning", fmt=_fmt("-"), border=True)
        sh.put(row, 5, None, border=True)
        sh.put(row, 6, "-", border=True)
        sh.put(row, 7, "info", border=True)
        return row + 1

    def _verdict_colours(self, sh: _Sheet, rng: str) -> None:
        sh.ws.conditional_formatting.add(rng, CellIsRule(operator="equal", formula=['"OK"'],
                                                         fill=_OK_FILL))
        sh.ws.conditional_formatting.add(rng, CellIsRule(operator="equal",
                                                         formula=['"NOT OK"'], fill=_BAD_FILL))

    # Summary --------------------------------------------------------------------------------
    def summary_sheet(self, sh: _Sheet, row: int) -> None:
        p = self.project
        if self.template is not None:
            sh.put(row, 1, "Pendulum tuned mass damper - preliminary design", font=_TITLE)
            row += 2
        sh.put(row, 1, "Key results", font=_BOLD, fill=_SECTION_FILL)
        sh.put(row, 2, None, fill=_SECTION_FILL)
        sh.put(row, 3, None, fill=_SECTION_FILL)
        row += 1
        keys = [("required_damping", "Total damping needed", "-"),
                ("mass_ratio", "Mass ratio", "-"), ("damper_mass", "Damper mass", "kg"),
                ("damper_frequency", "Damper frequency", "Hz"),
                ("damper_damping", "Damper damping (own frequency)", "-"),
                ("effective_damping", "Effective damping with the damper", "-"),
                ("acceleration_with_damper", "Peak acceleration with the damper", "m/s^2"),
                ("stroke", "Peak stroke", "m"), ("pendulum_length", "Pendulum length", "m"),
                ("swing_angle_deg", "Swing angle", "deg"), ("detuning", "Detuning at the swing",
                                                              "-"),
                ("stiffness", "Spring stiffness", "N/m"), ("dashpot", "Dashpot constant",
                                                           "N s/m")]
        us = p.units == "US"
        for name, label, unit in keys:
            sh.put(row, 1, label, border=True)
            sh.put(row, 2, f"={name}", fmt=_fmt(unit), border=True)
            sh.put(row, 3, unit, border=True)
            if us and unit in US_DISPLAY:
                us_unit, factor = US_DISPLAY[unit]
                sh.put(row, 4, f"=B{row}/{factor!r}", fmt=_fmt(us_unit), border=True)
                sh.put(row, 5, us_unit, border=True)
            row += 1
        row += 1
        sh.put(row, 1, "Verdicts", font=_BOLD, fill=_SECTION_FILL)
        sh.put(row, 2, None, fill=_SECTION_FILL)
        sh.put(row, 3, None, fill=_SECTION_FILL)
        row += 1
        start = row
        for label, cell in self.design_verdict_cells:
            sh.put(row, 1, label, border=True)
            sh.put(row, 2, f"=Checks!{cell}", border=True, font=_BOLD)
            row += 1
        rows = [("All design checks", "=all_design_checks"),
                ("Workbook formulas agree with the engine", "=all_cross_checks"),
                ("Pendulum fixed point converged", "=fixed_point_converged")]
        rows += [(short, f"=Checks!{cell}") for short, (_, cell) in
                 zip(getattr(self, "nonlinear_summary_labels", []), self.nonlinear_verdict_cells)]
        rows += [(f"Engine value of the {what} current (inputs unchanged)",
                  f'=IF({flag}="current","OK","NOT OK")')
                 for flag, what in zip(self.flag_cells, self.flag_labels)]
        for label, formula in rows:
            sh.put(row, 1, label, border=True, font=_BOLD, align=_WRAP)
            sh.put(row, 2, formula, border=True, font=_BOLD)
            row += 1
        self._verdict_colours(sh, f"B{start}:B{row - 1}")
        row += 1
        sh.put(row, 1, "Tuning method", font=_BOLD)
        sh.put(row, 2, p.tuning_method)
        row += 1
        sh.put(row, 1, "Source file", font=_BOLD)
        sh.text(row, 2, p.source_name + (f" (case {p.case})" if p.case else ""))
        row += 2
        sh.put(row, 1, "CAUTION", font=Font(bold=True, color="C00000"))
        row += 1
        for text in CAUTIONS[:5]:
            sh.put(row, 1, text, align=_WRAP)
            sh.ws.merge_cells(start_row=row, start_column=1, end_row=row, end_column=3)
            row += 1
        sh.put(row, 1, "See the Cautions sheet.")
        sh.widths([42, 30, 14, 12, 9])
        self.protect(sh, "Summary", None, landscape=False)

    # Charts ---------------------------------------------------------------------------------
    def charts(self) -> None:
        try:
            from .charts import add_charts_sheet
        except ImportError:
            return
        from .charts import chart_tables
        before = set(self.wb.sheetnames)
        positions: dict[str, tuple[int, int]] = {}
        ws = add_charts_sheet(self.wb, self.result, paper=self.project.paper,
                              positions=positions)
        for key, table in chart_tables(self.result).items():
            r0, c0 = positions[key]
            for i, values in enumerate(table.rows):
                for j, v in enumerate(values):
                    if not isinstance(v, str):
                        self.engine_cell(ws.cell(r0 + i, c0 + j), "chart", (key, i, j))
        for title in self.wb.sheetnames:
            if title not in before:
                self.our_sheets.append(title)
                self.wb[title].protection.sheet = True

    # Names ----------------------------------------------------------------------------------
    def names_sheet(self, sh: _Sheet) -> None:
        sh.put(1, 1, "Defined names (workbook scope)", font=_TITLE)
        sh.put(2, 1, "Every input and result has a name; formulas use the names, so "
                     "=structural_damping*(acceleration/acceleration_limit)^2 reads as the "
                     "equation.", align=_WRAP)
        sh.ws.merge_cells("A2:E2")
        sh.header(4, ["Name", "Refers to", "Quantity", "Unit", "Value"])
        row = 5
        labels = dict(self.helper_labels)
        labels.update({n: (label, unit) for n, _, label, unit in self.name_info})
        for name in sorted(self.names):
            sheet, coord = self.names[name]
            label, unit = labels.get(name, ("helper cell", ""))
            sh.put(row, 1, name, border=True)
            sh.put(row, 2, f"{sheet}!{coord}", border=True)
            sh.put(row, 3, label, align=_WRAP, border=True)
            sh.put(row, 4, unit, border=True)
            sh.put(row, 5, f"={name}", fmt=_fmt(unit) if unit else "General", border=True)
            row += 1
        sh.widths([26, 18, 52, 8, 22])
        self.protect(sh, "Names", "1:4", landscape=False)

    # Cautions and record ---------------------------------------------------------------------
    def cautions_sheet(self, sh: _Sheet) -> None:
        sh.put(1, 1, "Cautions", font=_TITLE)
        for i, text in enumerate(CAUTIONS, start=3):
            sh.put(i, 1, f"{i - 2}.", align=_TOP)
            sh.put(i, 2, text, align=_WRAP)
        r = len(CAUTIONS) + 4
        sh.put(r, 2, "Sources of the methods are given beside each step of the Calculation "
                     "sheet. Values marked 'common practice, no source' are rules of the trade, "
                     "not requirements of a standard.", align=_WRAP)
        sh.widths([5, 95])
        self.protect(sh, "Cautions", None, landscape=False)

    def record_sheet(self, sh: _Sheet) -> None:
        import functions
        p = self.project
        sh.put(1, 1, "Record", font=_TITLE)
        rows = [
            ("Program", f"swaytune {__version__} (workbook builder)"),
            ("Engine", f"functions {getattr(functions, '__version__', '?')}"),
            ("Source file", p.source_name),
            ("Case", p.case or "-"),
            ("Source SHA-256", p.source_sha256),
            ("Unit system of the project", p.units),
            ("Tuning method", p.tuning_method),
            ("Nonlinear simulation", self._simulation_record()),
            ("Build time", "see the document properties (created)"),
            ("Rebuild with", f"swaytune build {p.source_name} -o <workbook>.xlsx"),
        ]
        for i, (k, v) in enumerate(rows, start=3):
            sh.put(i, 1, k, font=_BOLD, border=True)
            sh.text(i, 2, v, border=True, align=_WRAP)
        sh.widths([28, 80])
        self.protect(sh, "Record", None, landscape=False)

    def _simulation_record(self) -> str:
        st = self.project.simulation
        if st is None or not st.enabled:
            return "not requested" if st is None else "switched off ([simulation] enabled = false)"
        return (f"{st.load} load, duration {st.duration:g} s, seed {st.seed}, tolerance "
                f"{st.tolerance:g}, load factor {st.load_factor:g} (functions.simulation.simulate, "
                "default integration settings)")

    # layout ---------------------------------------------------------------------------------
    def protect(self, sh: _Sheet, title: str, title_rows: str | None, landscape: bool) -> None:
        _fit_rows(sh.ws)
        sh.ws.protection.sheet = True
        set_print_layout(sh.ws, self.project.paper, landscape=landscape, title_rows=title_rows)


def build_workbook(project: Project, *, template: str | Path | None = None,
                   result=None, simulation: SimulationRun | None = None) -> BuiltWorkbook:
    """Build the workbook for a project and compute the cached value of every formula.

    Parameters
    ----------
    project : Project
        A validated project (:func:`workbook_builder.project.load_project`) [-].
    template : path, optional
        A firm's calc-sheet template whose title block is marked by defined names [-].
    result : DesignResult, optional
        The engine result, when already computed [-].
    simulation : SimulationRun, optional
        The time-domain simulation, when already computed; otherwise it is run
        (:func:`run_simulation`) when the project asks for it [-].

    Returns
    -------
    built : BuiltWorkbook
        Workbook, cached values, engine result and cross-check figures [-].

    Raises
    ------
    ValueError
        When the engine cannot compute the design for these inputs.
    BuildError
        When a formula of ours evaluates to an error (a bug, never silently written).
    """
    result = run_engine(project) if result is None else result
    if simulation is None and project.simulate:
        simulation = run_simulation(project, result)
    b = _Builder(project, result, template, simulation)
    wb = b.build()
    ev = Evaluator(wb, sheets=b.our_sheets)
    values: dict[tuple[str, str], Any] = {}
    errors = []
    for sheet, cells in ev.values().items():
        for coord, v in cells.items():
            if is_error(v):
                errors.append(f"{sheet}!{coord}={v}")
                continue
            if isinstance(v, float) and not math.isfinite(v):
                errors.append(f"{sheet}!{coord}={v}")
                continue
            values[(sheet, coord)] = v
    if errors:
        raise BuildError("formula(s) evaluate to an error: " + ", ".join(errors[:10]))
    built = BuiltWorkbook(wb, values, result, project, dict(b.names), simulation=simulation,
                          engine_cells=list(b.engine_cells))
    for name, label, symbol, engine in b.cross:
        v = built.value(name)
        rel = abs(v) if engine == 0 else abs(v / engine - 1)
        built.cross_checks.append((name, v, engine, rel))
    for label, cell in b.design_verdict_cells:
        built.design_verdicts.append((label, values[("Checks", cell)]))
    for label, cell in b.nonlinear_verdict_cells:
        built.nonlinear_verdicts.append((label, values[("Checks", cell)]))
    built.engine_checks = [(c.name, bool(c.ok)) for c in getattr(result, "checks", ())]
    return built


def lay_out(project: Project, result=None, *, simulation: SimulationRun | None = None,
            template: str | Path | None = None) -> tuple[Workbook, list[EngineCell]]:
    """Lay out a project's workbook in memory: no formula evaluated, nothing saved.

    Returns the openpyxl workbook (formulas, names, labels, styles as :func:`build_workbook`
    makes them, without cached values) and every engine-only cell written into it.

    Raises
    ------
    ValueError
        When the engine (or the simulation, when the project asks for it) cannot compute the
        design for these inputs.
    """
    result = run_engine(project) if result is None else result
    if simulation is None and project.simulate:
        simulation = run_simulation(project, result)
    b = _Builder(project, result, template, simulation)
    return b.build(), list(b.engine_cells)


def engine_cells(project: Project, result=None, *, simulation: SimulationRun | None = None,
                 template: str | Path | None = None) -> list[EngineCell]:
    """Every engine-only cell the builder writes for a project, with its value.

    Batch recalculation uses this list to know which constants are engine values, instead of
    finding them by their labels (see :func:`lay_out`).

    Raises
    ------
    ValueError
        See :func:`lay_out`.
    """
    return lay_out(project, result, simulation=simulation, template=template)[1]


def write_workbook(project: Project, out: str | Path, *, force: bool = False,
                   template: str | Path | None = None) -> BuiltWorkbook:
    """Build and save a project's workbook to ``out`` with cached values, atomically.

    Raises
    ------
    OverwriteRefused
        When ``out`` exists and was not made by swaytune, or was changed after swaytune built
        it (unless ``force``).
    ValueError, BuildError
        See :func:`build_workbook`.
    """
    guard_overwrite(out, force=force)
    guard_hand_edits(out, force=force)
    built = build_workbook(project, template=template)
    set_digest(built.workbook)
    # Without a template every formula cell is ours and must get its cached value.
    write_with_cached_values(built.workbook, out, built.values, require_all=template is None)
    return built
