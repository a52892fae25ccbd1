# SPDX-License-Identifier: MIT
"""Reading a swaytune workbook through its plan: format, options, inputs as typed.

A workbook carries its plan's options (document property ``SwaytunePlan``) and version
(hidden name ``SWAYTUNE_FORMAT``); :func:`read_workbook` rebuilds the plan from them and reads
every input only through the plan's defined names — the value as entered
(``<name>_entered``), its unit (``<name>_unit``), the floor table's named ranges — never
through label text or a fixed column, so a firm may reword or translate every label. Workbooks
of an older layout (swaytune 0.1) are refused with the way to rebuild them.
"""
from __future__ import annotations

import hashlib
import math
import os
import re
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Mapping

from functions.quantities import (FLOOR_TABLE, OPTIONAL_TABLES, by_name, design_inputs,
                                  input_relation_errors)

from .. import __version__
from ..plan import (FORMAT_NAME, PLAN_PROPERTY, PLAN_VERSION, SIMULATION_PROPERTY, Plan,
                    PlanOptions, make_plan)
from ..plan.inputs import entered_name, factor_name, unit_name
from ..plan.summary import TITLE_BLOCK
from ..plan.reference import (last_run_name, last_run_unit_name, recorded_inputs,
                              recorded_results)
from ..project.model import Floors, InputValue, Project, settings_from_text
from ..project.units import DEFAULT_UNITS, unit_for
from ..xlsx.files import MARKER_NAME, MARKER_PROPERTY
from ..xlsx.formulas import Evaluator, FormulaError, is_error
from ..xlsx.package import Book, Cell, PackageError, PartCache, assert_defusedxml, open_package

__all__ = ["RecalcError", "Issue", "WorkbookData", "read_workbook", "PART_CACHE",
           "SIMULATION_PROPERTY", "NamedCells", "INFO_NAMES"]

#: Parsed worksheets and shared strings by their exact bytes, shared by the workbooks of a
#: batch (variants of one workbook hold many identical parts).
PART_CACHE = PartCache()


class RecalcError(ValueError):
    """A workbook that cannot be recalculated; the message says why (shown in the summary)."""


@dataclass(frozen=True)
class Issue:
    """Something found in one workbook.

    ``kind`` is one of ``formula_edited``, ``formula_replaced`` (a builder formula overwritten
    by a value), ``formula_added`` (a formula where the builder writes a value),
    ``engine_mismatch`` (a formula's value differs from the engine's), ``stale_engine_value``
    (engine values recalc does not recompute, computed for other inputs), ``error_value``,
    ``unit_factor``, ``verdict_mismatch``, ``layout`` and ``note``. ``old`` is what the builder
    writes (or the engine's value), ``new`` what the file holds.
    """

    kind: str
    where: str
    message: str
    old: str = ""
    new: str = ""

    def __str__(self) -> str:
        return f"{self.where}: {self.message}"


@dataclass
class WorkbookData:
    """What :func:`read_workbook` finds in a swaytune workbook."""

    path: Path
    book: Book
    plan: Plan
    project: Project
    typed: dict[str, tuple[Any, str]]          # input name -> (value as typed, unit symbol)
    value_cells: dict[str, tuple[str, str]]    # input name -> (sheet, cell) of the typed value
    generator: str
    issues: list[Issue] = field(default_factory=list)
    #: input name -> (value as typed, unit) at the last engine run (Record sheet)
    last_inputs: dict[str, tuple[Any, str]] = field(default_factory=dict)
    #: result defined name -> engine value [SI] at the last engine run (Record sheet)
    last_results: dict[str, Any] = field(default_factory=dict)
    #: why the overrides need another layout (a tuning method, an input without a row, ...)
    relayout: list[str] = field(default_factory=list)

    @property
    def design_kwargs(self) -> dict[str, Any]:
        """Keyword arguments of ``functions.design.DesignInputs`` (SI; modal mass from floors)."""
        return self.project.design_kwargs()


def _version_tuple(text: str) -> tuple[int, ...]:
    nums = re.findall(r"\d+", text.split("+")[0])
    return tuple(int(n) for n in nums[:3]) if nums else (0,)


def _generator(book: Book) -> str:
    text = book.custom_props.get(MARKER_PROPERTY, "")
    if not text:
        dn = book.defined_names.get(MARKER_NAME)
        if dn is not None:
            text = dn.attr_text.strip().strip('"')
    if not text.startswith("swaytune"):
        raise RecalcError("not a swaytune workbook (no swaytune marker): only workbooks made by "
                          "'swaytune build' can be recalculated")
    made = text.split(None, 1)[1] if " " in text else ""
    if made and _version_tuple(made) > _version_tuple(__version__):
        raise RecalcError(f"made by {text}, newer than this swaytune {__version__}; its "
                          "format may differ: upgrade swaytune to recalculate it")
    return text


def workbook_format(book: Book) -> int:
    """The workbook's layout format (1 when it has no mark: swaytune 0.1 before the mark)."""
    dn = book.defined_names.get(FORMAT_NAME)
    if dn is None:
        return 1
    try:
        return int(float(dn.attr_text.strip().strip('"')))
    except ValueError:
        raise RecalcError(f"format mark {FORMAT_NAME}={dn.attr_text!r} is not a "
                          "number") from None


#: Which swaytune wrote the released layout formats before the current one.
_MADE_BY = {1: "swaytune 0.1", 2: "swaytune 0.1", 3: "swaytune 0.2.0", 4: "swaytune 0.3.0",
            5: "swaytune 0.3.0 or 0.4.0"}


def _plan(book: Book) -> Plan:
    number = workbook_format(book)
    if number > PLAN_VERSION:
        raise RecalcError(f"workbook format {number} is newer than this swaytune "
                          f"({__version__}) reads (format {PLAN_VERSION}); upgrade swaytune to "
                          "recalculate it")
    text = book.custom_props.get(PLAN_PROPERTY)
    if number < PLAN_VERSION or text is None:
        raise RecalcError(
            f"workbook of layout format {number} ({_MADE_BY.get(number, 'an earlier swaytune')}"
            f"): this swaytune reads workbooks of format {PLAN_VERSION} through the names of "
            "their plan. Rebuild it "
            "from its project file, named on its Record sheet: swaytune build PROJECT.toml -o "
            "NEW.xlsx (inputs edited in the workbook must be carried over to the project "
            "file)")
    try:
        options = PlanOptions.from_json(text)
    except ValueError as exc:
        raise RecalcError(f"the plan of this workbook cannot be read ({exc}): the layout is "
                          "damaged; rebuild it from its project file") from None
    return make_plan(options)


def _cell_text(cell: Cell) -> str:
    v = cell.value
    if v is None:
        return ""
    if isinstance(v, float) and v.is_integer():
        return str(int(v))
    return str(v)


def _number(book: Book, sheet: str, cell: Cell, what: str) -> float:
    """Numeric value of a typed cell (a constant, or a formula the user typed there)."""
    v = cell.value
    if cell.data_type == "f":
        try:
            v = Evaluator(book, sheets=[]).cell(sheet, cell.row, cell.column)
        except FormulaError as exc:
            raise RecalcError(f"{what} ({sheet}!{cell.coordinate}): formula cannot be "
                              f"evaluated: {exc}") from None
        if is_error(v):
            raise RecalcError(f"{what} ({sheet}!{cell.coordinate}) evaluates to {v}")
    if isinstance(v, bool) or not isinstance(v, (int, float)):
        shown = "empty" if v in (None, "") else repr(v)
        raise RecalcError(f"{what} ({sheet}!{cell.coordinate}) is {shown}, not a number")
    v = float(v)
    if not math.isfinite(v):
        raise RecalcError(f"{what} ({sheet}!{cell.coordinate}) is {v!r}, not a finite number")
    return v


class NamedCells:
    """Cells of a workbook by the plan's defined names; a missing name is a damaged layout.
    Each named range is looked up once."""

    def __init__(self, book: Book):
        self.book = book
        self._ranges: dict[str, tuple[str, list[Cell]]] = {}

    def loc(self, name: str) -> tuple[str, str]:
        loc = self.book.name_cell(name)
        if loc is None:
            raise RecalcError(f"missing defined name {name}: the workbook's layout is damaged "
                              "(rebuild it from its project file)")
        return loc

    def cell(self, name: str) -> tuple[str, Cell]:
        sheet, coord = self.loc(name)
        return sheet, self.book[sheet].get(coord)

    def range_cells(self, name: str) -> tuple[str, list[Cell]]:
        if name not in self._ranges:
            found = self.book.name_range(name)
            if found is None:
                raise RecalcError(f"missing defined name {name}: the workbook's layout is "
                                  "damaged (rebuild it from its project file)")
            self._ranges[name] = found
        return self._ranges[name]


def _read_floors(names: NamedCells, book: Book, n: int) -> Floors:
    units = {}
    for key, kind in (("floor_height_unit", "length"), ("floor_mass_unit", "mass")):
        sheet, cell = names.cell(key)
        try:
            units[key] = unit_for(kind, _cell_text(cell).strip())
        except ValueError as exc:
            raise RecalcError(f"{key} ({sheet}!{cell.coordinate}): {exc}") from None
    lists = []
    for key in ("floor_heights_entered", "floor_masses_entered"):
        sheet, cells = names.range_cells(key)
        if len(cells) != n:
            raise RecalcError(f"{key} holds {len(cells)} cells, the plan {n}: the layout is "
                              "damaged (rebuild it from its project file)")
        values = [_number(book, sheet, c, f"floor {i + 1} {key.split('_')[1][:-1]}")
                  for i, c in enumerate(cells)]
        if any(v <= 0 for v in values):
            raise RecalcError("input(s) outside their valid range: floor heights and masses "
                              "must be > 0")
        lists.append(tuple(values))
    scalars = by_name(FLOOR_TABLE)
    got = {}
    for q in (scalars["building_height"], scalars["exponent"]):
        sheet, cell = names.cell(entered_name(q.cell_name))
        v = _number(book, sheet, cell, q.name)
        si = v * (units["floor_height_unit"].factor if q.name == "building_height" else 1.0)
        if not q.contains(si):
            raise RecalcError(f"input(s) outside their valid range: {q.name}={v:g} must be in "
                              f"{q.interval()} [{q.unit}] ({sheet}!{cell.coordinate})")
        got[q.name] = v
    if max(lists[0]) > got["building_height"]:
        raise RecalcError("input(s) outside their valid range: the building height must not "
                          "be below the highest floor")
    sheet, cell = names.cell("damper_floor")
    level = _number(book, sheet, cell, "damper floor")
    if level != int(level) or not 1 <= level <= n:
        raise RecalcError(f"input(s) outside their valid range: damper floor {level:g} must be "
                          f"in [1, {n}]")
    _, type_cell = names.cell("mode_shape_type")
    stype = _cell_text(type_cell).strip() or None
    return Floors(lists[0], lists[1], units["floor_height_unit"], units["floor_mass_unit"],
                  got["building_height"], got["exponent"], stype, int(level))


def _last_run(names: NamedCells, options: PlanOptions
              ) -> tuple[dict[str, tuple[Any, str]], dict[str, Any]]:
    """Inputs as typed (with units) and key results at the last engine run (Record sheet)."""
    inputs = {}
    for q in recorded_inputs(options):
        _, vcell = names.cell(last_run_name(q.cell_name))
        _, ucell = names.cell(last_run_unit_name(q.cell_name))
        inputs[q.name] = (vcell.value, _cell_text(ucell).strip())
    results = {q.cell_name: names.cell(last_run_name(q.cell_name))[1].value
               for q in recorded_results(options)}
    return inputs, results


def read_workbook(path: str | os.PathLike, *, overrides: Mapping[str, Any] | None = None
                  ) -> WorkbookData:
    """Read a swaytune workbook: plan, inputs as typed (with units), project.

    Parameters
    ----------
    path : path-like
        The workbook (.xlsx) [-].
    overrides : mapping, optional
        Glossary name -> :class:`workbook_builder.recalc.inputs.Override` (from
        :func:`workbook_builder.recalc.inputs.parse_overrides`); replaces the typed value,
        converted to the unit shown beside the input. An override the layout has no place for
        (another tuning method, an input without a row, an input left out) is listed in
        ``relayout`` [-].

    Returns
    -------
    data : WorkbookData
        Plan, project (inputs in SI and as typed), the cells of the typed values, the values of
        the last engine run, issues [-].

    Raises
    ------
    RecalcError
        For a file that is not a readable swaytune workbook (the message says why), an older
        or newer format, missing defined names, an unknown unit or a unit changed since the
        last engine run (naming the cell), a value that is not a number or is outside its
        valid range.
    """
    assert_defusedxml()
    path = Path(path)
    try:
        book = open_package(path, cache=PART_CACHE)
    except PackageError as exc:
        raise RecalcError(str(exc)) from None
    generator = _generator(book)
    plan = _plan(book)
    options = plan.options
    missing = [n for n in list(plan.names()) + list(plan.range_names())
               if n not in book.defined_names]
    if missing:
        raise RecalcError(f"missing defined name(s) {', '.join(missing[:8])}"
                          f"{' ...' if len(missing) > 8 else ''}: the workbook's layout is "
                          "damaged (rebuild it from its project file)")
    names = NamedCells(book)
    last_inputs, last_results = _last_run(names, options)
    changes = dict(overrides or {})
    issues: list[Issue] = []
    relayout: list[str] = []
    typed: dict[str, tuple[Any, str]] = {}
    value_cells: dict[str, tuple[str, str]] = {}
    inputs: dict[str, InputValue] = {}
    bad: list[str] = []
    for q in design_inputs():
        o = changes.pop(q.name, None)
        if q.kind == "choice":
            if q.section in OPTIONAL_TABLES and q.section not in options.parts:
                if o is not None and o.si is not None:
                    inputs[q.name] = InputValue(q, o.si, None, o.si, q.note, True)
                    relayout.append(f"{q.name} given (the workbook has no row for it)")
                continue
            sheet, cell = names.cell(q.cell_name)
            value = _cell_text(cell).strip()
            if value != options.choice(q.name):
                raise RecalcError(f"{q.name} {value!r} ({sheet}!{cell.coordinate}) differs "
                                  f"from {options.choice(q.name)!r}, which the workbook is "
                                  "laid out for: it was changed after the build; rebuild the "
                                  "workbook")
            if o is not None and o.si != value:
                relayout.append(f"{q.name} {value} -> {o.si}")
                value = o.si
            inputs[q.name] = InputValue(q, value, None, value, q.note, True)
            continue
        if q.name not in options.inputs:
            if o is not None and o.si is not None:
                unit = unit_for(q.kind, o.unit or DEFAULT_UNITS[options.units][q.kind])
                value = o.typed_in(unit.symbol)
                if q.kind == "count" and value.is_integer():
                    value = int(value)
                typed[q.name] = (value, unit.symbol)
                inputs[q.name] = InputValue(q, value, unit, value * unit.factor, q.note, True)
                relayout.append(f"{q.name} given (the workbook has no row for it)")
            continue
        if o is not None and o.si is None:
            relayout.append(f"{q.name} left out")
            continue
        sheet, vcell = names.cell(entered_name(q.cell_name))
        usheet, ucell = names.cell(unit_name(q.cell_name))
        symbol = _cell_text(ucell).strip()
        before = last_inputs.get(q.name, (None, symbol))[1]
        if symbol != before:
            raise RecalcError(
                f"the unit of {q.label.lower()} ({usheet}!{ucell.coordinate}) was changed from "
                f"{before!r} to {symbol!r}; units are set when the workbook is built: type the "
                f"value in {before}, or change the unit in the project file and rebuild it "
                "(swaytune build)")
        try:
            unit = unit_for(q.kind, symbol)
        except ValueError as exc:
            raise RecalcError(f"input {q.name} ({usheet}!{ucell.coordinate}): {exc}") from None
        if o is not None:
            value = o.typed_in(unit.symbol)
        else:
            value = _number(book, sheet, vcell, f"input {q.name}")
        fsheet, fcell = names.cell(factor_name(q.cell_name))
        if not (isinstance(fcell.value, float) and
                math.isclose(fcell.value, unit.factor, rel_tol=1e-15, abs_tol=0.0)):
            issues.append(Issue("unit_factor", f"{fsheet}!{fcell.coordinate}",
                                f"factor to SI {fcell.value!r} does not match unit "
                                f"{unit.symbol!r} ({unit.factor!r}); the engine uses "
                                f"{unit.factor!r}", repr(unit.factor), repr(fcell.value)))
        si = value * unit.factor
        if q.kind == "count":           # a whole number, as the project file takes it
            if float(value).is_integer():
                value = si = int(value)
            else:
                bad.append(f"{q.name}={value!r} must be a whole number in {q.interval()} "
                           f"({sheet}!{vcell.coordinate})")
                continue
        if not q.contains(si):
            bad.append(f"{q.name}={value:g} {unit.symbol} must be in "
                       f"{q.interval(unit.factor)} [{unit.symbol}] ({sheet}!{vcell.coordinate})")
        typed[q.name] = (value, unit.symbol)
        value_cells[q.name] = (sheet, vcell.coordinate)
        inputs[q.name] = InputValue(q, value, unit, si, q.note, True)
    for _, message in input_relation_errors({n: iv.si for n, iv in inputs.items()}):
        bad.append(message)
    if bad:
        raise RecalcError("input(s) outside their valid range: " + "; ".join(bad))
    floors = _read_floors(names, book, options.floors) if options.floors else None
    if floors is not None and "modal_mass" in inputs:
        floors = None                   # a modal mass given replaces the floor table
    simulation = None
    text = book.custom_props.get(SIMULATION_PROPERTY)
    if text is not None:
        try:
            simulation = settings_from_text(text)
        except ValueError as exc:
            issues.append(Issue("note", SIMULATION_PROPERTY, f"cannot be read ({exc})"))
    source = path.name
    if book.name_cell("record_source") is not None:
        source = _cell_text(names.cell("record_source")[1]) or path.name
    project = Project(source_name=source,
                      source_sha256=hashlib.sha256(path.name.encode()).hexdigest(),
                      info=_info(book), units=options.units, paper=options.paper,
                      inputs=inputs, floors=floors, simulation=simulation)
    return WorkbookData(path, book, plan, project, typed, value_cells, generator, issues,
                        last_inputs, last_results, relayout)


#: Project information key -> its defined name in the workbook (title block, notes).
INFO_NAMES = {**{key: name for *_, key, name in TITLE_BLOCK},
              "structure": "project_structure", "client": "project_client",
              "notes": "project_notes"}


def _info(book: Book) -> dict[str, str]:
    """The project information the workbook shows (for a workbook rebuilt from it)."""
    out = {}
    for key, name in INFO_NAMES.items():
        loc = book.name_cell(name)
        if loc is not None:
            text = _cell_text(book[loc[0]].get(loc[1]))
            if text:
                out[key] = text
    return out
