# SPDX-License-Identifier: MIT
"""Batch recalculation of swaytune workbooks from Python and the command line.

``python -m workbook_builder recalc PATH... [-o OUTDIR] [--in-place] [--jobs N]`` reads each
workbook's inputs from its defined names (the value the user typed in the yellow cell and the
unit written beside it), recomputes every result with the engine (``functions.design``) and
writes an updated workbook:

* formulas are left exactly as they are in the file (a user's edit is reported, never fixed);
* every formula cell of swaytune's sheets gets a fresh cached value, computed from the formula
  text in the file (so a viewer that does not recalculate shows what the formula computes);
* engine-only values (results without a closed form, the input snapshots beside them, the engine
  column of the cross-checks, the chart tables and chart data caches) are refreshed, in the
  cells the builder lists (:func:`workbook_builder.build.engine_cells`);
* everything else in the package (styles, charts, a firm's own sheets) is copied unchanged.

The time-domain simulation of the Nonlinear sheet is not rerun (its table sizes depend on its
result): once the inputs change, its flag says so and the workbook is reported NOT OK with
"REBUILD NEEDED" (``swaytune build`` from the project file; the [simulation] settings are
stored in the workbook, so the builder's layout is still compared as text).

The output goes to OUTDIR, or replaces the original only with ``--in-place``, which keeps a
backup and writes atomically (temporary file in the same folder, then :func:`os.replace`). A
file that fails (not a workbook, corrupted, truncated, password-protected, a newer format,
missing names, an input outside its valid range, a formula swaytune cannot evaluate) fails
alone with its reason and nothing is written for it.

Each workbook is checked: every formula is compared with the one the builder writes for the
same layout (:func:`workbook_builder.build.build_workbook`), and every result's formula value
with the engine's. The batch writes a summary workbook and CSV (one row per workbook: key
inputs and results, every check verdict, what changed since the last calculation, issues).

The package is read by :mod:`workbook_builder.xlsx.package` (standard library zip reader and
XML parser; DTDs and entity declarations refused, limits on member sizes; untrusted files are
never opened with a parser that resolves entities; :func:`assert_defusedxml` checks that
openpyxl itself runs with defusedxml) and written by :mod:`workbook_builder.xlsx.rewrite`. The
builder's layout and the comparison of formulas are in :mod:`workbook_builder.recalc_layout`,
the batch summary in :mod:`workbook_builder.recalc_summary`. A workbook's format mark
(``SWAYTUNE_FORMAT``, :data:`workbook_builder.build.FORMAT_VERSION`) newer than the builder's
is refused, an older one (or none: format 1) is reported.

Preliminary design aid: results must be checked by a licensed engineer against local codes,
wind-tunnel data and the manufacturer's design.
"""
from __future__ import annotations

import contextlib
import datetime as _dt
import gc
import hashlib
import math
import os
import re
import shutil
import signal
import sys
import threading
import time
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Iterable, Mapping, Sequence

from openpyxl.utils import get_column_letter

from . import __version__
from .build import FORMAT_NAME
from .recalc_summary import SUMMARY_STEM, print_report, summary_row, write_summary
from .xlsx.files import MARKER_NAME, MARKER_PROPERTY, OverwriteRefused, guard_overwrite
from .xlsx.formulas import Evaluator, FormulaError, is_error
from .xlsx.package import Book, Cell, PackageError, PartCache, Sheet, open_package, split_coord
from .xlsx.rewrite import CellError, _range_keys, write_package
from .xlsx.template import FIELD_LABELS, TITLE_BLOCK_NAMES

__all__ = [
    "RecalcError", "Issue", "RecalcResult", "BatchSummary", "WorkbookData",
    "read_workbook", "read_inputs", "recalc_workbook", "write_results", "recalc_many",
    "write_summary", "main_recalc", "assert_defusedxml", "collect_paths", "FORMAT_NAME",
    "SUMMARY_STEM",
]


def _current_format() -> int:
    """Format number the builder writes now (:data:`workbook_builder.build.FORMAT_VERSION`)."""
    from . import build
    return int(build.FORMAT_VERSION)


#: Relative tolerance below which a value counts as unchanged since the last calculation [-].
CHANGE_TOLERANCE = 1e-12


class RecalcError(ValueError):
    """A workbook that cannot be recalculated; the message says why (shown in the summary)."""


def assert_defusedxml() -> None:
    """Check that defusedxml is installed and that openpyxl uses it.

    Raises
    ------
    RuntimeError
        When defusedxml is missing or openpyxl was imported without it.
    """
    try:
        import defusedxml.ElementTree  # noqa: F401
    except ImportError as exc:  # pragma: no cover - a declared dependency
        raise RuntimeError("defusedxml is not installed; it is required to read untrusted "
                           "workbooks safely (pip install defusedxml)") from exc
    import openpyxl.xml
    if not getattr(openpyxl.xml, "DEFUSEDXML", False):  # pragma: no cover
        raise RuntimeError("openpyxl is not using defusedxml (OPENPYXL_DEFUSEDXML set to "
                           "False?); refusing to read untrusted workbooks")


# =============================================================================== data types
@dataclass(frozen=True)
class Issue:
    """Something found in one workbook.

    ``kind`` is one of ``formula_edited``, ``formula_replaced`` (a builder formula overwritten by
    a value), ``formula_added`` (a formula where the builder writes a value), ``engine_mismatch``
    (a formula's value differs from the engine's), ``stale_engine_value`` (engine values recalc
    does not recompute, computed for other inputs), ``error_value``, ``unit_factor``,
    ``verdict_mismatch``, ``layout`` and ``note``. ``old`` is what the builder writes (or the
    engine's value), ``new`` what the file holds.
    """

    kind: str
    where: str
    message: str
    old: str = ""
    new: str = ""

    def __str__(self) -> str:
        return f"{self.where}: {self.message}"


@dataclass
class RecalcResult:
    """Outcome of recalculating one workbook.

    ``status`` is ``"OK"`` (recalculated, every check OK), ``"NOT OK"`` (recalculated, some
    check NOT OK) or ``"FAILED"`` (nothing written; ``error`` says why).
    """

    path: Path
    output: Path | None = None
    error: str | None = None
    inputs: dict[str, Any] = field(default_factory=dict)       # DesignInputs kwargs (SI)
    typed: dict[str, tuple[Any, str]] = field(default_factory=dict)   # as typed, with unit
    results: dict[str, Any] = field(default_factory=dict)      # named cells, new values
    previous: dict[str, Any] = field(default_factory=dict)     # named cells, old cached values
    changes: list[tuple[str, Any, Any]] = field(default_factory=list)
    checks: list[tuple[str, str]] = field(default_factory=list)   # (check, "OK"/"NOT OK")
    issues: list[Issue] = field(default_factory=list)
    backup: Path | None = None
    seconds: float = 0.0
    design: Any = None                                          # engine DesignResult

    @property
    def failed(self) -> bool:
        return self.error is not None

    @property
    def checks_ok(self) -> bool:
        return not self.failed and all(v == "OK" for _, v in self.checks)

    @property
    def status(self) -> str:
        if self.failed:
            return "FAILED"
        return "OK" if self.checks_ok else "NOT OK"


@dataclass
class BatchSummary:
    """Outcome of a batch: one :class:`RecalcResult` per input, in input order."""

    results: list[RecalcResult]
    summary_xlsx: Path | None = None
    summary_csv: Path | None = None
    interrupted: bool = False
    seconds: float = 0.0

    @property
    def failed(self) -> list[RecalcResult]:
        return [r for r in self.results if r.failed]

    @property
    def not_ok(self) -> list[RecalcResult]:
        return [r for r in self.results if not r.failed and not r.checks_ok]

    @property
    def exit_status(self) -> int:
        """0 when every workbook was recalculated and every check is OK, else 1 (130: Ctrl-C)."""
        if self.interrupted:
            return 130
        return 1 if (self.failed or self.not_ok) else 0

    def table(self) -> list[dict[str, Any]]:
        """One flat row per workbook (the CSV rows), for a notebook or a DataFrame."""
        return [summary_row(r) for r in self.results]


def _open_package(path: Path) -> Book:
    """:func:`workbook_builder.xlsx.package.open_package`, its errors as RecalcError."""
    try:
        return open_package(path, cache=PART_CACHE)
    except PackageError as exc:
        raise RecalcError(str(exc)) from None


# =============================================================================== reading
@dataclass
class WorkbookData:
    """What :func:`read_workbook` finds in a swaytune workbook."""

    path: Path
    book: Book
    project: Any                       # workbook_builder.project.Project
    typed: dict[str, tuple[Any, str]]  # input name -> (value as typed, unit symbol)
    value_cells: dict[str, tuple[str, str]]   # input name -> (sheet, cell) of the typed value
    generator: str
    template: bool
    issues: list[Issue] = field(default_factory=list)

    @property
    def design_kwargs(self) -> dict[str, Any]:
        """Keyword arguments of ``functions.design.DesignInputs`` (SI; modal mass from floors)."""
        from .engine import _engine_modal_mass   # noqa: PLC0415 - the builder's own rule
        return self.project.design_kwargs(_engine_modal_mass(self.project))


def _version_tuple(text: str) -> tuple[int, ...]:
    nums = re.findall(r"\d+", text.split("+")[0])
    return tuple(int(n) for n in nums[:3]) if nums else (0,)


def _workbook_format(book: Book) -> int | None:
    """The workbook's format mark (:data:`workbook_builder.build.FORMAT_VERSION`), or None."""
    dn = book.defined_names.get(FORMAT_NAME)
    if dn is None:
        return None
    try:
        return int(float(dn.attr_text.strip().strip('"')))
    except ValueError:
        raise RecalcError(f"format mark {FORMAT_NAME}={dn.attr_text!r} is not a "
                          "number") from None


def _check_generator(book: Book) -> str:
    text = book.custom_props.get(MARKER_PROPERTY, "")
    if not text:
        dn = book.defined_names.get(MARKER_NAME)
        if dn is not None:
            text = dn.attr_text.strip().strip('"')
    if not text.startswith("swaytune"):
        raise RecalcError("not a swaytune workbook (no swaytune marker): only workbooks made by "
                          "'swaytune build' can be recalculated")
    number = _workbook_format(book)
    if number is not None:
        current = _current_format()
        if number > current:
            raise RecalcError(f"workbook format {number} is newer than this swaytune "
                              f"({__version__}) reads (format {current}); upgrade "
                              "swaytune to recalculate it")
    made = text.split(None, 1)[1] if " " in text else ""
    if made and _version_tuple(made) > _version_tuple(__version__):
        raise RecalcError(f"made by {text}, newer than this swaytune {__version__}; its "
                          "format may differ: upgrade swaytune to recalculate it")
    return text


def _header_columns(sheet: Sheet, wanted: Sequence[str]) -> tuple[int, dict[str, int]] | None:
    """Find a row holding every header in ``wanted``; return (row, {header: column})."""
    rows: dict[int, dict[str, int]] = {}
    for (r, c), cell in sheet.cells.items():
        if isinstance(cell.value, str) and cell.data_type == "s" and cell.value in wanted:
            rows.setdefault(r, {})[cell.value] = c
    for r in sorted(rows):
        if all(w in rows[r] for w in wanted):
            return r, rows[r]
    return None


def _row_with_label(sheet: Sheet, label: str, column: int = 1) -> int | None:
    for (r, c), cell in sorted(sheet.cells.items()):
        if c == column and cell.data_type == "s" and isinstance(cell.value, str) \
                and cell.value.strip() == label:
            return r
    return None


def _text(cell: Cell) -> str:
    v = cell.value
    if v is None:
        return ""
    if isinstance(v, float) and v.is_integer():
        return str(int(v))
    return str(v)


def _number(book: Book, cell: Cell, sheet: str, what: str) -> float:
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


def _expected_names(method: str, mode: str) -> list[str]:
    """Names a workbook must define: every result the engine cross-checks.

    Helper names (``var_*``, the Pendulum sheet's) are not required: the file's own formulas
    are evaluated whatever they are, and the comparison with the builder's layout reports any
    difference.
    """
    from .calcsheet import all_steps
    return [item.name for item in all_steps(method, mode) if item.engine]


def read_workbook(path: str | os.PathLike, *, overrides: Mapping[str, float] | None = None
                  ) -> WorkbookData:
    """Read a swaytune workbook: layout, inputs as typed (with units), project.

    Parameters
    ----------
    path : path-like
        The workbook (.xlsx) [-].
    overrides : mapping, optional
        Input name (``functions.design`` field such as ``"frequency"``, or its defined name
        such as ``"structure_frequency"``) -> value in the unit shown beside the input in the
        workbook; replaces the typed value (used for parameter studies) [-].

    Returns
    -------
    data : WorkbookData
        Project (inputs in SI and as typed), the cells of the typed values, issues [-].

    Raises
    ------
    RecalcError
        For a file that is not a readable swaytune workbook (the message says why), a newer
        format, missing defined names, an unknown unit, a value that is not a number or is
        outside its valid range.
    """
    assert_defusedxml()
    from .calcsheet import INPUT_NAMES
    from .project import INPUT_SPECS, TUNING_METHODS, InputValue, Project
    from .units import DEFAULT_UNITS, unit_for

    path = Path(path)
    book = _open_package(path)
    generator = _check_generator(book)
    issues: list[Issue] = []
    if "Inputs" not in book:
        raise RecalcError("missing sheet 'Inputs': the workbook's layout is damaged")
    inputs_ws = book["Inputs"]
    head = _header_columns(inputs_ws, ("Value", "Unit", "Factor to SI", "Value (SI)"))
    if head is None:
        raise RecalcError("the Inputs sheet has no header row (Value, Unit, Factor to SI, "
                          "Value (SI)): the layout is damaged")
    _, cols = head
    overrides = dict(overrides or {})
    by_defined = {v: k for k, v in INPUT_NAMES.items()}
    for key in list(overrides):
        if key in by_defined:
            overrides[by_defined[key]] = overrides.pop(key)
    unknown = sorted(set(overrides) - set(INPUT_NAMES))
    if unknown:
        raise RecalcError(f"unknown input(s) {unknown}; use one of {sorted(INPUT_NAMES)}")

    missing = [INPUT_NAMES[s.name] for s in INPUT_SPECS
               if not s.optional and book.name_cell(INPUT_NAMES[s.name]) is None]
    if missing:
        raise RecalcError(f"missing defined name(s) {', '.join(missing)}: the workbook's "
                          "layout is damaged (rebuild it from its project file)")
    floors_mode = False
    mm_cell = book.named("modal_mass")
    if mm_cell is not None and mm_cell.data_type == "f" and \
            "modal_mass_from_floors" in mm_cell.value.lower():
        floors_mode = True

    typed: dict[str, tuple[Any, str]] = {}
    value_cells: dict[str, tuple[str, str]] = {}
    inputs: dict[str, Any] = {}
    bad: list[str] = []
    for spec in INPUT_SPECS:
        name = INPUT_NAMES[spec.name]
        if spec.name == "modal_mass" and floors_mode:
            continue
        loc = book.name_cell(name)
        if loc is None:
            if spec.name in overrides:
                raise RecalcError(f"input {spec.name} is not in this workbook (its layout has "
                                  "no cell for it)")
            continue
        sheet, coord = loc
        if sheet != "Inputs":
            raise RecalcError(f"defined name {name} points at {sheet}!{coord}, not at the "
                              "Inputs sheet: the layout is damaged")
        row, _ = split_coord(coord)
        vcell = inputs_ws.cell(row, cols["Value"])
        unit_text = _text(inputs_ws.cell(row, cols["Unit"])).strip()
        try:
            unit = unit_for(spec.kind, unit_text)
        except ValueError as exc:
            raise RecalcError(f"input {spec.name} (Inputs!{get_column_letter(cols['Unit'])}{row}): "
                              f"{exc}") from None
        what = f"input {spec.name}"
        if spec.name in overrides:
            value = float(overrides.pop(spec.name))
            if not math.isfinite(value):
                raise RecalcError(f"{what}: override {value!r} is not a finite number")
        else:
            value = _number(book, vcell, "Inputs", what)
        fcell = inputs_ws.cell(row, cols["Factor to SI"])
        if not (isinstance(fcell.value, float) and
                math.isclose(fcell.value, unit.factor, rel_tol=1e-15, abs_tol=0.0)):
            issues.append(Issue("unit_factor", f"Inputs!{fcell.coordinate}",
                                f"factor to SI {fcell.value!r} does not match unit "
                                f"{unit.symbol!r} ({unit.factor!r}); the engine uses "
                                f"{unit.factor!r}", repr(unit.factor), repr(fcell.value)))
        si = value * unit.factor
        if not spec.contains(si):
            bad.append(f"{spec.name}={value:g} {unit.symbol} must be in "
                       f"{spec.interval(unit.factor)} [{unit.symbol}] "
                       f"(Inputs!{vcell.coordinate})")
        typed[spec.name] = (value, unit.symbol)
        value_cells[spec.name] = ("Inputs", vcell.coordinate)
        inputs[spec.name] = InputValue(spec, value, unit, si, spec.note, True, None)
    if overrides:
        raise RecalcError(f"input(s) {sorted(overrides)} are not in this workbook")
    if "mass_ratio" in inputs and "damper_mass" in inputs:
        raise RecalcError("both chosen_mass_ratio and chosen_damper_mass are defined: the "
                          "layout is damaged")
    lo, hi = inputs.get("mass_ratio_min"), inputs.get("mass_ratio_max")
    if lo is not None and hi is not None and lo.si >= hi.si:
        bad.append(f"mass_ratio_max={hi.si:g} must be above mass_ratio_min={lo.si:g} [-]")
    if bad:
        raise RecalcError("input(s) outside their valid range: " + "; ".join(bad))

    row = _row_with_label(inputs_ws, "Tuning method")
    method = _text(inputs_ws.cell(row, cols["Value"])).strip() if row else ""
    if method not in TUNING_METHODS:
        raise RecalcError(f"tuning method {method!r} (Inputs sheet) must be one of "
                          f"{list(TUNING_METHODS)}")
    floors = _read_floors(book, inputs_ws) if floors_mode else None

    # Identification (title block, structure/client rows, record) for the reference layout.
    info: dict[str, str] = {}
    summary = book.sheets.get("Summary")
    labels = {}
    if summary is not None:
        for (r, c), cell in summary.cells.items():
            if cell.data_type == "s" and isinstance(cell.value, str) and r <= 12:
                labels.setdefault(cell.value.strip(), (r, c))
    for key, dname in TITLE_BLOCK_NAMES.items():
        cell = book.named(dname)
        if cell is None and FIELD_LABELS.get(key) in labels:
            r, c = labels[FIELD_LABELS[key]]
            cell = summary.cell(r, c + 1)
        info[{"project_number": "number"}.get(key, key)] = "" if cell is None else _text(cell)
    template = bool(book.sheets) and next(iter(book.sheets)) != "Summary"
    for label, key in (("Structure", "structure"), ("Client", "client")):
        r = _row_with_label(summary, label) if summary is not None else None
        info[key] = _text(summary.cell(r, 2)) if r else ""
    note_row = _row_with_label(inputs_ws, "Notes")
    info["notes"] = _text(inputs_ws.cell(note_row + 1, 1)) if note_row else ""
    record = book.sheets.get("Record")
    system = "SI"
    source_name = path.name
    if record is not None:
        r = _row_with_label(record, "Unit system of the project")
        if r and _text(record.cell(r, 2)) in DEFAULT_UNITS:
            system = _text(record.cell(r, 2))
        r = _row_with_label(record, "Source file")
        if r and _text(record.cell(r, 2)):
            source_name = _text(record.cell(r, 2))
    calc = book.sheets.get("Calculation")
    if calc is not None and _header_columns(calc, ("Value (US)",)) is not None:
        system = "US"
    project = Project(source_name=source_name,
                      source_sha256=hashlib.sha256(path.name.encode()).hexdigest(), info=info,
                      units=system, paper="Letter" if system == "US" else "A4", inputs=inputs,
                      tuning_method=method, floors=floors, case="",
                      simulation=_simulation_settings(book, issues))

    from .calcsheet import mass_ratio_mode
    mode = mass_ratio_mode(project)
    missing = [n for n in _expected_names(method, mode) if book.name_cell(n) is None]
    if floors_mode:
        missing += [n for n in ("modal_mass_from_floors", "building_height", "mode_exponent")
                    if book.name_cell(n) is None]
    if missing:
        raise RecalcError(f"missing defined name(s) {', '.join(missing)} for tuning method "
                          f"{method!r}: the layout is damaged, laid out for another method or "
                          "made by another swaytune version (rebuild it from its project file)")
    _check_layout_method(book, method, mode)
    return WorkbookData(path, book, project, typed, value_cells, generator, template, issues)


def _simulation_settings(book: Book, issues: list[Issue]):
    """The [simulation] table stored by the builder (document property), or None."""
    from .engine import SIMULATION_PROPERTY, read_simulation_settings
    text = book.custom_props.get(SIMULATION_PROPERTY)
    if text is None:
        if "Nonlinear" in book.sheets:
            issues.append(Issue("note", "Nonlinear", f"no {SIMULATION_PROPERTY} document "
                                "property (a workbook of format 1): the Nonlinear sheet's "
                                "settings are unknown, so its layout is not compared"))
        return None
    try:
        return read_simulation_settings(text)
    except ValueError as exc:
        issues.append(Issue("note", SIMULATION_PROPERTY, f"cannot be read ({exc}); the "
                            "Nonlinear sheet's layout is not compared"))
        return None


def _check_layout_method(book: Book, method: str, mode: str) -> None:
    """Refuse a tuning method whose layout differs from the file's (engine value vs formula)."""
    from .calcsheet import EngineValue, all_steps
    for item in all_steps(method, mode):
        cell = book.named(item.name)
        if cell is None:
            continue
        is_engine = isinstance(item, EngineValue)
        if is_engine and cell.data_type == "f" and item.name == "tuning_ratio":
            raise RecalcError(f"tuning method {method!r} needs engine values, but the "
                              "Calculation sheet is laid out with closed-form formulas: the "
                              "method was changed after the build; rebuild the workbook")
        if not is_engine and item.name == "tuning_ratio" and cell.data_type != "f":
            raise RecalcError(f"tuning method {method!r} has a closed form, but the "
                              "Calculation sheet holds an engine value for it: the method was "
                              "changed after the build; rebuild the workbook")


_BRACKET_UNIT_RE = re.compile(r"\[([^\]]+)\]\s*$")


def _read_floors(book: Book, ws: Sheet):
    from functions.structure import MODE_SHAPE_EXPONENTS
    from .project import Floors
    from .units import unit_for

    head = _header_columns_prefix(ws, "Floor")
    if head is None:
        raise RecalcError("the Inputs sheet has a modal mass from floors but no floor table "
                          "header ('Floor'): the layout is damaged")
    hrow = head
    htext = _text(ws.cell(hrow, 3))
    mtext = _text(ws.cell(hrow, 4))
    try:
        hu = unit_for("length", _BRACKET_UNIT_RE.search(htext).group(1).strip())
        mu = unit_for("mass", _BRACKET_UNIT_RE.search(mtext).group(1).strip())
    except (AttributeError, ValueError) as exc:
        raise RecalcError(f"floor table header {htext!r} / {mtext!r}: units cannot be "
                          f"read ({exc})") from None
    heights, masses = [], []
    r = hrow + 1
    while isinstance(ws.cell(r, 1).value, float):
        heights.append(_number(book, ws.cell(r, 3), "Inputs", f"floor {len(heights) + 1} "
                                                              "height"))
        masses.append(_number(book, ws.cell(r, 4), "Inputs", f"floor {len(masses) + 1} mass"))
        r += 1
    if not heights:
        raise RecalcError("the floor table has no floors")
    if any(h <= 0 for h in heights) or any(m <= 0 for m in masses):
        raise RecalcError("input(s) outside their valid range: floor heights and masses must "
                          "be > 0")

    def typed_of(name: str) -> float:
        sheet, coord = book.name_cell(name)
        row, _ = split_coord(coord)
        return _number(book, book[sheet].cell(row, 3), sheet, name)

    h = typed_of("building_height")
    exponent = typed_of("mode_exponent")
    if h <= 0 or max(heights) > h:
        raise RecalcError(f"input(s) outside their valid range: building height {h:g} must be "
                          "> 0 and not below the highest floor")
    if not 0 < exponent <= 5:
        raise RecalcError(f"input(s) outside their valid range: mode shape exponent "
                          f"{exponent:g} must be in (0, 5] [-]")
    lr = _row_with_label(ws, "Damper at floor (1-based)")
    level = int(_number(book, ws.cell(lr, 3), "Inputs", "damper floor")) if lr else len(heights)
    if not 1 <= level <= len(heights):
        raise RecalcError(f"input(s) outside their valid range: damper floor {level} must be "
                          f"in [1, {len(heights)}]")
    label_row = _row_with_label_prefix(ws, "Mode shape exponent")
    stype = None
    if label_row:
        m = re.search(r"\(([^)]+)\)\s*$", _text(ws.cell(label_row, 1)))
        if m and m.group(1) in MODE_SHAPE_EXPONENTS:
            stype = m.group(1)
    return Floors(tuple(heights), tuple(masses), hu, mu, h, exponent, stype, level)


def _header_columns_prefix(ws: Sheet, label: str) -> int | None:
    for (r, c), cell in sorted(ws.cells.items()):
        if c == 1 and cell.data_type == "s" and cell.value == label:
            nxt = ws.cell(r, 3)
            if isinstance(nxt.value, str) and nxt.value.startswith("Height"):
                return r
    return None


def _row_with_label_prefix(ws: Sheet, prefix: str) -> int | None:
    for (r, c), cell in sorted(ws.cells.items()):
        if c == 1 and cell.data_type == "s" and isinstance(cell.value, str) \
                and cell.value.startswith(prefix):
            return r
    return None


def read_inputs(path: str | os.PathLike) -> dict[str, Any]:
    """Read a workbook's inputs as keyword arguments of the engine's design chain.

    .. math::

        x_{SI} = x_{typed} \\cdot \\mathrm{factor}(\\mathrm{unit})

    Parameters
    ----------
    path : path-like
        A workbook made by ``swaytune build`` [-].

    Returns
    -------
    inputs : dict
        ``functions.design.DesignInputs`` fields in SI units (``frequency`` [Hz],
        ``modal_mass`` [kg], ``acceleration`` [m/s^2], ...), ``tuning_method``; the modal
        mass of a floor table is computed from the floors [-].

    Raises
    ------
    RecalcError
        See :func:`read_workbook`.

    Examples
    --------
    >>> import tempfile, pathlib
    >>> from workbook_builder.project import parse_project
    >>> from workbook_builder.build import write_workbook
    >>> project = parse_project({"mode": {"frequency": 0.2, "modal_mass":
    ...     {"value": 9000, "unit": "t"}, "structural_damping": 0.01},
    ...     "wind": {"acceleration": 0.25, "acceleration_limit": 0.15},
    ...     "damper": {"mass_ratio": 0.02, "clearance": 1.5}}, source="demo.toml")
    >>> out = pathlib.Path(tempfile.mkdtemp()) / "demo.xlsx"
    >>> _ = write_workbook(project, out)
    >>> kw = read_inputs(out)
    >>> kw["modal_mass"], kw["mass_ratio"], kw["tuning_method"]
    (9000000.0, 0.02, 'h2')
    """
    return read_workbook(path).design_kwargs



# =============================================================================== engine values
def _engine_constants(data: WorkbookData, result, layout) -> tuple[
        dict[tuple[str, str], float], list[Issue]]:
    """New values of the engine-only cells the builder lists (:func:`build.engine_cells`).

    Values of the design chain (``engine``) and of the chart tables (``chart``) are
    recomputed; the time-domain simulation of the Nonlinear sheet (``simulation``) is not
    rerun, so those cells, and the snapshots its flag compares, keep their values. A cell
    the builder fills with an engine value but that holds a formula in the file is reported
    and kept; a cell whose row is laid out differently (other labels) or that holds text
    fails the workbook, since the engine values cannot be located.
    """
    from .engine import engine_value
    from .charts import chart_tables
    book = data.book
    out: dict[tuple[str, str], float] = {}
    issues: list[Issue] = []
    tables = None
    for ec in layout.engine_cells:
        if ec.kind == "simulation":
            continue
        ws = book.sheets.get(ec.sheet)
        where = f"{ec.sheet}!{ec.cell}"
        if ws is None:
            raise RecalcError(f"missing sheet {ec.sheet!r}, where the builder writes engine "
                              "values: the layout is damaged (rebuild it from its project file)")
        r, c = split_coord(ec.cell)
        expected = layout.row_labels.get((ec.sheet, r), {})
        if any(ws.cell(r, col).value != text for col, text in expected.items()):
            raise RecalcError(f"{where}: row {r} of sheet {ec.sheet!r} is laid out differently "
                              "from the builder's layout for these inputs (another swaytune "
                              "version?), so its engine value cannot be located: rebuild the "
                              "workbook from its project file")
        cell = ws.cells.get((r, c))
        if cell is not None and cell.data_type == "f":
            issues.append(Issue("formula_added", where, "engine value replaced by a formula; "
                                "kept as it is (not refreshed)", "engine value", cell.value))
            continue
        if cell is None or cell.data_type != "n":
            shown = "empty" if cell is None else repr(cell.value)
            raise RecalcError(f"{where} is {shown} where the builder writes an engine value: "
                              "the layout differs (another swaytune version?); rebuild the "
                              "workbook from its project file")
        if ec.kind == "engine":
            out[(ec.sheet, ec.cell)] = engine_value(data.project, result, ec.key)
        else:
            if tables is None:
                tables = chart_tables(result)
            key, i, j = ec.key
            out[(ec.sheet, ec.cell)] = float(tables[key].rows[i][j])
    return out, issues


def _mode(data: WorkbookData) -> str:
    from .calcsheet import mass_ratio_mode
    return mass_ratio_mode(data.project)


# =============================================================================== evaluation
#: Formula text -> syntax tree, shared by the evaluators of a batch (the same formulas in
#: every workbook; see ``xlsx.formulas.Evaluator(parse_cache=...)``).
PARSE_CACHE: dict[str, Any] = {}
#: Parsed worksheets and shared strings by their exact bytes, shared by the workbooks of a
#: batch (variants of one workbook hold many identical parts; see ``xlsx.package.PartCache``).
PART_CACHE = PartCache()


def clear_caches() -> None:
    """Forget the parsed formulas and parts and the builder's layouts (a cold start)."""
    from .recalc_layout import clear_caches as clear_layouts
    PARSE_CACHE.clear()
    PART_CACHE.clear()
    _range_keys.cache_clear()
    clear_layouts()


def _our_sheets(book: Book) -> list[str]:
    from .build import SHEETS
    return [s for s in book.sheetnames if s in SHEETS]


# =============================================================================== writing
def write_results(source: str | os.PathLike, dest: str | os.PathLike, *,
                  constants: Mapping[tuple[str, str], float] | None = None,
                  cached: Mapping[tuple[str, str], Any] | None = None,
                  chart_values: Mapping[tuple[str, str], Any] | None = None) -> Path:
    """Write an updated copy of a workbook: new constants, cached values, chart caches.

    Every other part of the package is copied unchanged (formulas included). The file is
    written next to ``dest`` and moved onto it atomically (:func:`os.replace`); on any error
    ``dest`` is left as it was and no temporary file remains. The output gets the permissions
    of the file it replaces, or those of a new file (0644 under the usual umask 022).

    Parameters
    ----------
    source : path-like
        The workbook to copy [-].
    dest : path-like
        The file to write (may equal ``source``: replaced atomically) [-].
    constants : mapping, optional
        ``(sheet, "D12") -> number`` for constant (non-formula) cells [-].
    cached : mapping, optional
        ``(sheet, "D12") -> value`` cached values of formula cells (float, bool, str or
        :class:`workbook_builder.xlsx.cached.CellError`; encoded as
        :func:`workbook_builder.xlsx.cached.insert_cached_values` does) [-].
    chart_values : mapping, optional
        ``(sheet, "A5") -> value`` of the cells charts plot; their number caches are rebuilt
        from these [-].

    Returns
    -------
    dest : Path
        The written file [-].

    Raises
    ------
    RecalcError
        When a cell to change does not exist (or is a formula cell for ``constants``, a
        value cell for ``cached``), or a value cannot be stored (NaN, inf).
    """
    try:
        return write_package(source, dest, constants=constants, cached=cached,
                             chart_values=chart_values)
    except PackageError as exc:
        raise RecalcError(str(exc)) from None


# =============================================================================== recalculation
def _close(a: Any, b: Any, rel: float = CHANGE_TOLERANCE) -> bool:
    if isinstance(a, bool) or isinstance(b, bool):
        return a == b
    if isinstance(a, (int, float)) and isinstance(b, (int, float)):
        return a == b or math.isclose(a, b, rel_tol=rel, abs_tol=0.0)
    return a == b


def _plain(v: Any) -> Any:
    if is_error(v):
        return str(v)
    return v


def _output_path(path: Path, outdir: Path | None, in_place: bool,
                 output: str | os.PathLike | None) -> Path | None:
    if output is not None:
        return Path(output)
    if in_place:
        return path
    if outdir is not None:
        return Path(outdir) / path.name
    return None


def _backup_path(path: Path) -> Path:
    stamp = _dt.datetime.now().strftime("%Y%m%d-%H%M%S")
    cand = path.with_name(f"{path.name}.{stamp}.bak")
    n = 1
    while cand.exists():
        cand = path.with_name(f"{path.name}.{stamp}-{n}.bak")
        n += 1
    return cand


def recalc_workbook(path: str | os.PathLike, outdir: str | os.PathLike | None = None,
                    in_place: bool = False, backup: bool = True, *,
                    output: str | os.PathLike | None = None,
                    inputs: Mapping[str, float] | None = None,
                    compare_layout: bool = True, force: bool = False) -> RecalcResult:
    """Recalculate one workbook with the engine and write the updated copy.

    Parameters
    ----------
    path : path-like
        A workbook made by ``swaytune build`` [-].
    outdir : path-like, optional
        Folder for the updated copy (same file name); created if needed [-].
    in_place : bool, optional
        Replace ``path`` itself, atomically (explicit opt-in) [-].
    backup : bool, optional
        With ``in_place``, first copy the original to ``<name>.<time>.bak`` [-].
    output : path-like, optional
        Exact output file (instead of ``outdir``) [-].
    inputs : mapping, optional
        Input overrides, in the unit shown in the workbook (see :func:`read_workbook`) [-].
    compare_layout : bool, optional
        Compare every formula with the builder's (detects hand edits) [-].
    force : bool, optional
        Overwrite an existing output that swaytune did not make [-].

    Returns
    -------
    result : RecalcResult
        Status, inputs, new and old values, changes, check verdicts, issues; ``error`` holds
        the reason when the workbook failed (nothing is written then) [-].

    Raises
    ------
    ValueError
        Only for contradictory arguments (``in_place`` with ``outdir``/``output``, an output
        equal to the input without ``in_place``); a bad workbook is reported in the result.

    Examples
    --------
    A parameter study from a notebook: vary the structure's frequency over a list, write one
    recalculated variant per value and collect a table (invented scenario).

    >>> import tempfile, pathlib
    >>> from workbook_builder.project import parse_project
    >>> from workbook_builder.build import write_workbook
    >>> folder = pathlib.Path(tempfile.mkdtemp())
    >>> project = parse_project({"mode": {"frequency": 0.2, "modal_mass":
    ...     {"value": 9000, "unit": "t"}, "structural_damping": 0.01},
    ...     "wind": {"acceleration": 0.25, "acceleration_limit": 0.15},
    ...     "damper": {"mass_ratio": 0.02, "clearance": 1.5}}, source="study.toml")
    >>> _ = write_workbook(project, folder / "base.xlsx")
    >>> table = []
    >>> for f in (0.15, 0.20, 0.25):
    ...     r = recalc_workbook(folder / "base.xlsx", output=folder / f"f_{f:.2f}.xlsx",
    ...                         inputs={"frequency": f})
    ...     table.append((f, round(r.results["pendulum_length"], 3), r.status))
    >>> for row in table:
    ...     print(row)
    (0.15, 11.383, 'OK')
    (0.2, 6.403, 'OK')
    (0.25, 4.098, 'OK')

    The pendulum length is the engine's (``functions.design.design_damper``) for each frequency:

    >>> from functions.design import design_damper
    >>> kw = read_inputs(folder / "f_0.25.xlsx")
    >>> round(design_damper(**kw).pendulum_length, 3)
    4.098
    """
    t0 = time.perf_counter()
    path = Path(path)
    if in_place and (outdir is not None or output is not None):
        raise ValueError("in_place=True cannot be combined with outdir or output")
    dest = _output_path(path, Path(outdir) if outdir is not None else None, in_place, output)
    if dest is not None and not in_place and _same_file(dest, path):
        raise ValueError(f"the output {dest} is the input itself; use in_place=True (keeps a "
                         "backup) or another output folder")
    res = RecalcResult(path=path)
    try:
        with _gc_paused():
            _recalc(res, path, dest, in_place, backup, inputs, compare_layout, force)
    except RecalcError as exc:
        res.error = str(exc)
        res.output = None
    except Exception as exc:  # noqa: BLE001 - one bad file must not stop a batch
        if isinstance(exc, OverwriteRefused):
            res.error = str(exc)
        else:
            res.error = f"unexpected error ({type(exc).__name__}): {exc}"
        res.output = None
    res.seconds = time.perf_counter() - t0
    return res


_GC_LOCK = threading.Lock()
_GC_STATE = {"depth": 0, "was_enabled": False}


@contextlib.contextmanager
def _gc_paused():
    """Pause the cyclic garbage collector while one workbook is recalculated.

    A workbook allocates many small objects while the batch's caches (layouts, parsed parts)
    hold many long-lived ones, so automatic collections would traverse those caches again and
    again (about a fifth of the time). Reference counting still frees almost everything; the
    collector is switched back on (if it was on) when the workbook is done, and collects any
    cycles then. Nested and concurrent calls are counted: the last one out restores it.
    """
    with _GC_LOCK:
        if _GC_STATE["depth"] == 0:
            _GC_STATE["was_enabled"] = gc.isenabled()
            gc.disable()
        _GC_STATE["depth"] += 1
    try:
        yield
    finally:
        with _GC_LOCK:
            _GC_STATE["depth"] -= 1
            if _GC_STATE["depth"] == 0 and _GC_STATE["was_enabled"]:
                gc.enable()


def _same_file(a: Path, b: Path) -> bool:
    try:
        return a.resolve() == b.resolve()
    except OSError:
        return False


def _recalc(res: RecalcResult, path: Path, dest: Path | None, in_place: bool, backup: bool,
            overrides, compare_layout: bool, force: bool) -> None:
    from .engine import run_engine
    from .calcsheet import CROSS_CHECK_TOLERANCE, all_steps, design_checks

    data = read_workbook(path, overrides=overrides)
    book = data.book
    res.issues.extend(data.issues)
    res.typed = dict(data.typed)
    try:
        result = run_engine(data.project)
    except ValueError as exc:
        raise RecalcError(f"the engine cannot compute the design for these inputs: "
                          f"{str(exc).split(': ', 1)[-1]}") from None
    res.design = result
    res.inputs = data.design_kwargs
    res.inputs["modal_mass"] = float(result.inputs.modal_mass)

    # Old cached values of every named cell (the last calculation).
    named = {}
    for name in book.defined_names:
        loc = book.name_cell(name)
        if loc is not None:
            named[name] = loc
    previous = {}
    for name, (sheet, coord) in named.items():
        c = book[sheet].get(coord)
        previous[name] = c.cached if c.data_type == "f" else c.value

    # Apply overrides and refresh engine-only constants in the in-memory book.
    constants: dict[tuple[str, str], float] = {}
    if overrides:
        for spec_name, (sheet, coord) in data.value_cells.items():
            if spec_name in data.typed:
                cell = book[sheet].get(coord)
                new = float(data.typed[spec_name][0])
                if cell.data_type != "n" or cell.value != new:
                    if cell.data_type == "f":
                        raise RecalcError(f"input {spec_name} ({sheet}!{coord}) holds a "
                                          "formula; an override would replace it")
                    constants[(sheet, coord)] = new
    from .recalc_layout import formula_issues, reference_layout
    layout = reference_layout(data, result)
    if layout is None:
        raise RecalcError("the builder cannot lay out a workbook for these inputs, so the "
                          "engine values of this one cannot be located; check the inputs")
    engine_consts, engine_issues = _engine_constants(data, result, layout)
    res.issues.extend(engine_issues)
    constants.update(engine_consts)
    for (sheet, coord), v in constants.items():
        r, c = split_coord(coord)
        old = book[sheet].cells.get((r, c))
        book[sheet].cells[(r, c)] = Cell(r, c, float(v), "n", float(v),
                                          old.cached_type if old else "n")

    # Evaluate every formula of swaytune's sheets, as written in the file.
    sheets = _our_sheets(book)
    ev = Evaluator(book, sheets=sheets, parse_cache=PARSE_CACHE)
    try:
        values = ev.values()
    except (FormulaError, RecursionError) as exc:
        raise RecalcError(f"a formula cannot be evaluated by swaytune ({exc}); recalculate "
                          "this workbook in a spreadsheet application instead") from None
    cached: dict[tuple[str, str], Any] = {}
    for sheet, cells in values.items():
        for coord, v in cells.items():
            if is_error(v):
                cached[(sheet, coord)] = CellError(str(v))
                res.issues.append(Issue("error_value", f"{sheet}!{coord}",
                                        f"formula evaluates to {v}", "", str(v)))
            elif isinstance(v, float) and not math.isfinite(v):
                cached[(sheet, coord)] = CellError("#NUM!")
                res.issues.append(Issue("error_value", f"{sheet}!{coord}",
                                        "formula evaluates to a non-finite number", "", "#NUM!"))
            elif v is None:
                cached[(sheet, coord)] = 0.0
            else:
                cached[(sheet, coord)] = v

    # Other sheets (a firm's template) may show our names: refresh what the evaluator can
    # compute, leave the rest as it is.
    others = [t for t in book.sheets if t not in sheets]
    if others:
        stale = 0
        for title in others:
            for cell in list(book[title].cells.values()):
                if cell.data_type != "f":
                    continue
                try:
                    v = ev.cell(title, cell.row, cell.column)   # reuses our values
                except (FormulaError, RecursionError):
                    stale += 1
                    continue
                if is_error(v) or v is None or (isinstance(v, float) and not math.isfinite(v)):
                    stale += 1
                    continue
                cached[(title, cell.coordinate)] = v
        if stale:
            res.issues.append(Issue("note", ", ".join(others), f"{stale} formula cell(s) on "
                                    "sheets not made by swaytune keep their old cached value "
                                    "(not evaluated here); a spreadsheet program recalculates "
                                    "them on opening"))

    def now(name: str) -> Any:
        sheet, coord = named[name]
        key = (sheet, coord)
        if key in cached:
            return _plain(cached[key])
        return book[sheet].get(coord).value

    res.results = {name: now(name) for name in named if not name.startswith("TB_")}
    res.previous = {name: previous[name] for name in res.results}
    for name, new in res.results.items():
        old = previous.get(name)
        if not _close(old, new):
            res.changes.append((name, old, new))

    # Engine cross-check of every result formula (the engine's value against the formula's).
    steps = all_steps(data.project.tuning_method, _mode(data))
    for item in steps:
        if not item.engine:
            continue
        v = res.results.get(item.name)
        e = float(getattr(result, item.engine))
        if not isinstance(v, (int, float)) or isinstance(v, bool):
            rel = math.inf
        else:
            rel = abs(v) if e == 0 else abs(v / e - 1)
        if not rel <= CROSS_CHECK_TOLERANCE:
            loc = named[item.name]
            res.issues.append(Issue("engine_mismatch", f"{loc[0]}!{loc[1]} ({item.name})",
                                    f"the formula gives {v!r}, the engine {e!r} (relative "
                                    f"difference {rel:.3g} > {CROSS_CHECK_TOLERANCE:g})",
                                    repr(e), repr(v)))

    # Verdicts: design checks as the workbook computes them, the engine's, the workbook's own
    # cross-check, fixed point and engine-value flags.
    checks_ws = book.sheets.get("Checks")
    engine_ok = {c.name: bool(c.ok) for c in result.checks}
    keyword_to_engine = {"acceleration": "acceleration", "stroke": "stroke", "swing": "swing",
                         "detuning": "detuning", "mass ratio": "mass_ratio"}
    for chk in design_checks():
        r = _row_with_label(checks_ws, chk.label) if checks_ws is not None else None
        wb_verdict = None
        if r is not None:
            key = ("Checks", f"G{r}")
            wb_verdict = _plain(cached.get(key, checks_ws.cell(r, 7).value))
        eng = engine_ok.get(keyword_to_engine.get(chk.engine_keyword, ""), None)
        label = chk.label
        verdict = wb_verdict if wb_verdict in ("OK", "NOT OK") else "NOT OK"
        res.checks.append((label, verdict))
        if eng is not None and (verdict == "OK") != eng:
            res.issues.append(Issue("verdict_mismatch", f"Checks!G{r}" if r else label,
                                    f"the workbook says {verdict}, the engine "
                                    f"{'OK' if eng else 'NOT OK'}", "OK" if eng else "NOT OK",
                                    str(verdict)))
    for name, label in (("all_cross_checks", "Workbook formulas agree with the engine"),
                        ("fixed_point_converged", "Pendulum fixed point converged")):
        if name not in res.results:
            res.issues.append(Issue("layout", name, f"defined name {name} is missing: the "
                                    f"verdict '{label}' cannot be read"))
            continue
        v = res.results.get(name)
        res.checks.append((label, v if v in ("OK", "NOT OK") else "NOT OK"))
    flags = sorted(n for n in res.results if n.startswith("engine_flag_"))
    for n in flags:
        current = res.results[n] == "current"
        res.checks.append((f"Engine value current ({n})", "OK" if current else "NOT OK"))
        if not current:
            loc = named[n]
            res.issues.append(Issue("stale_engine_value", f"{loc[0]}!{loc[1]} ({n})",
                                    "REBUILD NEEDED: engine values that recalc does not "
                                    "recompute were computed for other inputs (the Nonlinear "
                                    "sheet's time-domain simulation: recalc does not rerun it, "
                                    "its layout depends on the result); rebuild the workbook "
                                    "from its project file with the new inputs (swaytune "
                                    "build PROJECT.toml -o NEW.xlsx; replacing this file "
                                    "needs --force because its inputs were edited)", "current",
                                    str(res.results[n])))
    if any(i.kind == "engine_mismatch" for i in res.issues) and \
            ("Workbook formulas agree with the engine", "OK") in res.checks:
        res.checks.append(("Every result formula agrees with the engine", "NOT OK"))

    # Format: an older layout is reported (a newer one was refused when reading).
    fmt = _workbook_format(book)
    if fmt is None or fmt < _current_format():
        shown = "has no format mark (format 1)" if fmt is None else f"has format {fmt}"
        res.issues.append(Issue("note", "format", f"the workbook {shown}, older than the "
                                f"current builder's format {_current_format()}: formula "
                                "differences reported below may come from the builder, not "
                                "from a hand edit; rebuild from the project file to update "
                                "the layout", str(_current_format()), str(fmt or 1)))

    # Hand edits: every formula against the builder's for the same layout.
    if compare_layout:
        typed_cells = set(data.value_cells.values())
        res.issues.extend(formula_issues(data, layout, typed_cells))

    # Write.
    if dest is None:
        return
    if not in_place:
        guard_overwrite(dest, force=force)
    chart_values = {k: v for k, v in constants.items() if k[0] == "Charts"}
    if chart_values and "Charts" in book:
        for (r, c), cell in book["Charts"].cells.items():
            chart_values.setdefault(("Charts", cell.coordinate), cell.value)
    if in_place and backup:
        bpath = _backup_path(path)
        shutil.copy2(path, bpath)
        res.backup = bpath
    write_results(path, dest, constants=constants, cached=cached,
                  chart_values=chart_values or None)
    res.output = dest



# =============================================================================== batches
def collect_paths(paths: Iterable[str | os.PathLike],
                  exclude: str | os.PathLike | None = None) -> list[tuple[Path, Path]]:
    """Expand files and folders into (workbook, path relative to its root) pairs.

    Folders are searched recursively for ``*.xlsx``; hidden files, spreadsheet lock files
    (``~$*``), temporary files, batch summaries (``recalc_summary*``) and anything under
    ``exclude`` (the output folder) are skipped. Files named explicitly are always taken (so a
    wrong file fails with its reason).
    """
    out: list[tuple[Path, Path]] = []
    seen: set[Path] = set()
    skip = Path(exclude).resolve() if exclude is not None else None
    for p in paths:
        p = Path(p)
        if p.is_dir():
            for f in sorted(p.rglob("*")):
                if not f.is_file() or f.suffix.lower() not in (".xlsx", ".xlsm"):
                    continue
                if skip is not None and skip in f.resolve().parents:
                    continue
                rel = f.relative_to(p)
                if any(part.startswith((".", "~$")) for part in rel.parts):
                    continue
                if f.name.startswith(SUMMARY_STEM):
                    continue
                key = f.resolve()
                if key not in seen:
                    seen.add(key)
                    out.append((f, rel))
        else:
            key = p.resolve() if p.exists() else p
            if key not in seen:
                seen.add(key)
                out.append((p, Path(p.name)))
    return out


def _worker_init() -> None:
    # Workers ignore Ctrl-C: the parent stops handing out work and lets the running ones
    # finish their (atomic) writes.
    signal.signal(signal.SIGINT, signal.SIG_IGN)


def _task(args) -> RecalcResult:
    path, output, in_place, backup, compare, force = args
    if in_place:
        return recalc_workbook(path, in_place=True, backup=backup, compare_layout=compare,
                               force=force)
    return recalc_workbook(path, output=output, compare_layout=compare, force=force)


class _Progress:
    def __init__(self, total: int, enabled: bool, stream=None):
        self.total = total
        self.stream = stream or sys.stderr
        self.enabled = enabled and total > 0
        self.tty = bool(getattr(self.stream, "isatty", lambda: False)())
        self.done = 0
        self.t0 = time.perf_counter()
        self.step = max(1, total // 10)

    def update(self, res: RecalcResult) -> None:
        self.done += 1
        if not self.enabled:
            return
        width = 30
        filled = int(width * self.done / self.total)
        elapsed = time.perf_counter() - self.t0
        eta = elapsed / self.done * (self.total - self.done)
        line = (f"[{'#' * filled}{'.' * (width - filled)}] {self.done}/{self.total} "
                f"{elapsed:5.1f}s elapsed, ~{eta:4.1f}s left  {res.path.name}: {res.status}")
        if self.tty:
            self.stream.write("\r" + line[:120].ljust(120))
            if self.done == self.total:
                self.stream.write("\n")
        elif self.done % self.step == 0 or self.done == self.total:
            self.stream.write(line + "\n")
        self.stream.flush()


def recalc_many(paths: Iterable[str | os.PathLike], outdir: str | os.PathLike | None = None,
                jobs: int = 1, progress: bool = True, *, in_place: bool = False,
                backup: bool = True, summary: str | os.PathLike | None = None,
                compare_layout: bool = True, force: bool = False) -> BatchSummary:
    """Recalculate many workbooks (files and folders); write a summary workbook and CSV.

    Parameters
    ----------
    paths : iterable of path-like
        Workbooks and folders (searched recursively for .xlsx) [-].
    outdir : path-like, optional
        Output folder; a workbook found in a folder keeps its relative path under it [-].
    jobs : int, optional
        Worker processes (1: in this process) [-].
    progress : bool, optional
        Show a progress bar on stderr [-].
    in_place : bool, optional
        Replace each workbook itself (atomically, with a backup unless ``backup=False``) [-].
    backup : bool, optional
        Keep ``<name>.<time>.bak`` beside each workbook replaced in place [-].
    summary : path-like, optional
        Path of the summary without extension (default ``OUTDIR/recalc_summary``, or
        ``./recalc_summary`` in place); ``.xlsx`` and ``.csv`` are written [-].
    compare_layout : bool, optional
        Compare formulas with the builder's (hand edits) [-].
    force : bool, optional
        Overwrite outputs that swaytune did not make [-].

    Returns
    -------
    summary : BatchSummary
        One result per workbook in input order, summary paths, exit status [-].

    Raises
    ------
    ValueError
        When neither ``outdir`` nor ``in_place`` is given, both are, or ``jobs`` < 1.
    """
    t0 = time.perf_counter()
    if in_place == (outdir is not None):
        raise ValueError("give an output folder (outdir) or in_place=True, not both or neither")
    if int(jobs) < 1:
        raise ValueError(f"jobs={jobs!r} must be >= 1")
    items = collect_paths(paths, exclude=outdir)
    tasks = []
    planned: dict[Path, Path] = {}
    pre_failed: dict[int, RecalcResult] = {}
    for i, (src, rel) in enumerate(items):
        out = None if in_place else Path(outdir) / rel
        if out is not None:
            key = out.resolve()
            if key in planned:
                pre_failed[i] = RecalcResult(path=src, error=f"output {out} would also be "
                                             f"written for {planned[key]}; rename one of them")
                continue
            if _same_file(out, src):
                pre_failed[i] = RecalcResult(path=src, error="the output folder holds the "
                                             "original: choose another folder or --in-place")
                continue
            planned[key] = src
        tasks.append((i, (src, out, in_place, backup, compare_layout, force)))
    results: list[RecalcResult | None] = [None] * len(items)
    for i, r in pre_failed.items():
        results[i] = r
    bar = _Progress(len(items), progress)
    for r in pre_failed.values():
        bar.update(r)
    interrupted = False
    try:
        if int(jobs) == 1 or len(tasks) <= 1:
            for i, args in tasks:
                results[i] = _task(args)
                bar.update(results[i])
        else:
            import concurrent.futures as cf
            import multiprocessing as mp
            ctx = mp.get_context("fork" if "fork" in mp.get_all_start_methods() else "spawn")
            with cf.ProcessPoolExecutor(max_workers=int(jobs), mp_context=ctx,
                                        initializer=_worker_init) as pool:
                futures = {pool.submit(_task, args): i for i, args in tasks}
                try:
                    for fut in cf.as_completed(futures):
                        i = futures[fut]
                        try:
                            results[i] = fut.result()
                        except Exception as exc:  # noqa: BLE001 - a worker died
                            results[i] = RecalcResult(path=_tasks_path(tasks, i),
                                                      error=f"worker failed: {exc}")
                        bar.update(results[i])
                except KeyboardInterrupt:
                    for fut in futures:
                        fut.cancel()
                    raise
    except KeyboardInterrupt:
        interrupted = True
        if progress:
            sys.stderr.write("\ninterrupted: stopping; files already written are complete, "
                             "originals untouched\n")
    done = [r if r is not None else RecalcResult(path=items[i][0],
                                                  error="not recalculated (interrupted)")
            for i, r in enumerate(results)]
    batch = BatchSummary(done, interrupted=interrupted)
    base = Path(summary) if summary is not None else (
        Path(outdir) / SUMMARY_STEM if outdir is not None else Path.cwd() / SUMMARY_STEM)
    batch.summary_xlsx, batch.summary_csv = write_summary(batch, base)
    batch.seconds = time.perf_counter() - t0
    return batch


def _tasks_path(tasks, i: int) -> Path:
    for j, args in tasks:
        if j == i:
            return args[0]
    return Path("?")



# =============================================================================== command line
def add_recalc_arguments(parser) -> None:
    """Add the ``recalc`` options to an argparse parser (``swaytune recalc`` and main_recalc)."""
    parser.add_argument("paths", nargs="+", metavar="PATH", help="workbooks and folders")
    parser.add_argument("-o", "--outdir", help="output folder (required unless --in-place)")
    parser.add_argument("--in-place", action="store_true",
                        help="replace each workbook atomically, keeping <name>.<time>.bak")
    parser.add_argument("--no-backup", action="store_true",
                        help="with --in-place: do not keep a backup")
    parser.add_argument("--jobs", "-j", type=int, default=1, help="worker processes")
    parser.add_argument("--summary", help="summary path without extension (default "
                                          "OUTDIR/recalc_summary)")
    parser.add_argument("--no-progress", action="store_true", help="no progress bar")
    parser.add_argument("--force", action="store_true",
                        help="overwrite outputs that swaytune did not make")
    parser.add_argument("--no-layout-check", action="store_true",
                        help="do not compare formulas with the builder's text (faster on "
                             "batches of many different layouts; results are still checked "
                             "against the engine)")


#: Description of the command (``swaytune recalc --help``).
RECALC_DESCRIPTION = ("Recalculate swaytune workbooks with the engine: fresh cached values, "
                      "refreshed engine values, formulas untouched; a summary workbook and CSV. "
                      "Exit status 0: all OK; 1: a workbook failed or a check is NOT OK; 2: "
                      "usage; 130: interrupted. A preliminary design aid; results must be "
                      "checked by a licensed engineer.")


def run_recalc(args) -> int:
    """Run ``recalc`` for parsed arguments (:func:`add_recalc_arguments`); the exit status.

    Prints the report (not the cautions: the caller prints them, as for every command).
    """
    if args.in_place == (args.outdir is not None):
        print("error: give -o OUTDIR or --in-place (exactly one)", file=sys.stderr)
        return 2
    if args.jobs < 1:
        print(f"error: --jobs {args.jobs} must be >= 1", file=sys.stderr)
        return 2
    batch = recalc_many(args.paths, outdir=args.outdir, jobs=args.jobs,
                        progress=not args.no_progress, in_place=args.in_place,
                        backup=not args.no_backup, summary=args.summary, force=args.force,
                        compare_layout=not args.no_layout_check)
    print_report(batch)
    if not batch.results:
        print("error: no workbooks (*.xlsx) found in " + ", ".join(args.paths), file=sys.stderr)
        return 1
    return batch.exit_status


def main_recalc(argv: Sequence[str] | None = None) -> int:
    """``recalc PATH... [-o OUTDIR] [--in-place] [--jobs N]``; return the exit status.

    0: every workbook recalculated and every check OK; 1: a workbook failed or a check is
    NOT OK; 2: usage error; 130: interrupted (Ctrl-C). The same as ``swaytune recalc``
    (:mod:`workbook_builder.cli`), cautions included.
    """
    import argparse

    from .cli import print_cautions
    parser = argparse.ArgumentParser(prog="swaytune recalc", description=RECALC_DESCRIPTION)
    add_recalc_arguments(parser)
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:
        return int(exc.code or 0)
    status = run_recalc(args)
    print_cautions()
    return status


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main_recalc())
