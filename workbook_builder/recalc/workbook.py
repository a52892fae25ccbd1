# SPDX-License-Identifier: MIT
"""Recalculating one workbook: engine values refreshed, cached values fresh, formulas kept.

:func:`recalc_workbook` reads a workbook through its plan (:mod:`.read`), reruns the engine's
design chain and, for a workbook with a Nonlinear sheet, the time-domain check; writes the new
engine values (results without a closed form, the input snapshots beside them, the engine
column of the cross-checks, the chart tables, the simulation's values and the Record sheet's
values of the last engine run) into the cells the plan's defined names point at, evaluates
every formula of the plan's sheets as written in the file for its cached value, and copies
everything else unchanged (formulas, styles, a firm's own sheets). It reports what the user
changed since the last engine run (inputs as typed, then key results, in the workbook's units)
and checks each workbook: formulas against the plan's (:mod:`.edits`), every result formula
against the engine, every verdict. Overrides that need another layout (another tuning method,
an input the workbook has no row for) rebuild the workbook from its own inputs.
"""
from __future__ import annotations

import contextlib
import datetime as _dt
import gc
import math
import os
import shutil
import threading
import time
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Mapping

from functions.design import check_rules
from functions.quantities import by_name, design_inputs
from functions.worksheet import TWIN_TOLERANCE

from ..compute import run_design, run_simulation
from ..plan.calculation import SIMULATION_FLAG, engine_flags, snapshot_name
from ..plan.charts import chart_tables
from ..plan import make_plan
from ..plan.checks import check_name, cross_checked
from ..plan.model import Plan, from_simulation
from ..plan.nonlinear import simulation_dependencies
from ..plan.reference import recorded_results
from ..plan.summary import VERDICT_LABELS
from ..plan.values import Sources, source_value
from ..project.units import us_display
from ..xlsx.cached import CellError
from ..xlsx.files import OverwriteRefused, atomic_path, guard_hand_edits, guard_overwrite
from ..xlsx.formulas import Evaluator, FormulaError, is_error
from ..xlsx.package import Book, Cell, PackageError, split_coord
from ..xlsx.rewrite import write_package
from .edits import CANON_CACHE, POSITIONS_CACHE, formula_issues
from .inputs import parse_overrides
from .read import PART_CACHE, Issue, NamedCells, RecalcError, WorkbookData, read_workbook

__all__ = ["RecalcResult", "Change", "recalc_workbook", "write_results", "PARSE_CACHE",
           "CHANGE_TOLERANCE", "SHORT_LABELS", "STATUSES", "HAND_EDITS", "clear_caches",
           "shown_unit"]

#: Relative tolerance below which a value counts as unchanged since the last calculation [-].
CHANGE_TOLERANCE = 1e-12
#: Formula text -> syntax tree, shared by the evaluators of a batch.
PARSE_CACHE: dict[str, Any] = {}
#: Labels of the verdicts besides the design checks (the summary's columns).
SHORT_LABELS = VERDICT_LABELS
#: Status of a workbook after recalculation, from the best to the worst, and what it means.
STATUSES = {
    "OK": "recalculated; every check passes",
    "NOT OK": "recalculated; a check fails",
    "EDITED": "recalculated, but a formula differs from the plan or a cell shows an error: the "
              "workbook's own verdicts cannot be taken as a pass",
    "FAILED": "could not be read or written; nothing was written",
}
#: Issues that make a workbook EDITED: hand edits of the plan's formulas and what they cause.
HAND_EDITS = ("formula_edited", "formula_replaced", "formula_added", "error_value",
              "engine_mismatch", "verdict_mismatch", "unit_factor")


def _shown(v: Any) -> str:
    if v is None:
        return "(none)"
    if isinstance(v, float):
        return f"{v:.6g}"
    return str(v)


@dataclass(frozen=True)
class Change:
    """An input or a key result that changed since the last engine run.

    ``kind`` is ``"input"`` (``old`` and ``new`` as typed, ``unit`` the unit beside the input)
    or ``"result"`` (engine values in the unit the workbook shows them in, ``unit``).
    """

    kind: str
    name: str
    label: str
    old: Any
    new: Any
    unit: str

    def __str__(self) -> str:
        unit = "" if self.unit in ("", "-") else f" {self.unit}"
        return f"{self.label}: {_shown(self.old)} -> {_shown(self.new)}{unit}"


@dataclass
class RecalcResult:
    """Outcome of recalculating one workbook; ``status`` is one of :data:`STATUSES`."""

    path: Path
    output: Path | None = None
    error: str | None = None
    inputs: dict[str, Any] = field(default_factory=dict)       # DesignInputs kwargs (SI)
    typed: dict[str, tuple[Any, str]] = field(default_factory=dict)   # as typed, with unit
    results: dict[str, Any] = field(default_factory=dict)      # named cells, new values
    changes: list[Change] = field(default_factory=list)        # since the last engine run
    checks: list[tuple[str, str]] = field(default_factory=list)   # (check, "OK"/"NOT OK")
    issues: list[Issue] = field(default_factory=list)
    backup: Path | None = None
    rewritten: bool = False                                     # the output's bytes changed
    units: str = ""                                             # the workbook's unit system
    seconds: float = 0.0
    design: Any = None                                          # engine DesignResult

    @property
    def failed(self) -> bool:
        return self.error is not None

    @property
    def checks_ok(self) -> bool:
        return not self.failed and all(v == "OK" for _, v in self.checks)

    @property
    def hand_edits(self) -> list[Issue]:
        """The issues that make the workbook EDITED."""
        return [i for i in self.issues if i.kind in HAND_EDITS]

    @property
    def status(self) -> str:
        if self.failed:
            return "FAILED"
        if self.hand_edits:
            return "EDITED"
        return "OK" if self.checks_ok else "NOT OK"

    def changed(self, kind: str) -> list[Change]:
        """The changes of one kind (``"input"`` or ``"result"``)."""
        return [c for c in self.changes if c.kind == kind]


def clear_caches() -> None:
    """Forget parsed formulas, parts, syntax trees and plans (a cold start, e.g. a benchmark)."""
    PARSE_CACHE.clear()
    PART_CACHE.clear()
    CANON_CACHE.clear()
    POSITIONS_CACHE.clear()
    LOCATIONS_CACHE.clear()
    make_plan.cache_clear()


def _close(a: Any, b: Any, rel: float = CHANGE_TOLERANCE) -> bool:
    if isinstance(a, bool) or isinstance(b, bool):
        return a == b
    if isinstance(a, (int, float)) and isinstance(b, (int, float)):
        return a == b or math.isclose(a, b, rel_tol=rel, abs_tol=0.0)
    return a == b


def _plain(v: Any) -> Any:
    return str(v) if is_error(v) else v


#: Per plan (by its options): each refreshed cell with its defined name, or its named range
#: and its index in it (row by row), and the range's size.
LOCATIONS_CACHE: dict[Any, list[tuple[str, Any, str, int, int]]] = {}


def _locations(plan: Plan) -> list[tuple[str, Any, str, int, int]]:
    """``(sheet, cell, name or range name, index in the range, range size)`` of every engine
    value recalculation refreshes; a named cell has index -1."""
    found = LOCATIONS_CACHE.get(plan.options)
    if found is not None:
        return found
    ranges = []
    for rname, (rsheet, rng) in plan.range_names().items():
        first, _, last = rng.partition(":")
        ranges.append((rname, rsheet, split_coord(first), split_coord(last)))
    found = []
    for sheet, c in plan.refreshed_cells():
        if c.name:
            found.append((sheet, c, c.name, -1, 0))
            continue
        r, col = split_coord(c.ref)
        for rname, rsheet, (r1, c1), (r2, c2) in ranges:
            if rsheet == sheet and r1 <= r <= r2 and c1 <= col <= c2:
                width = c2 - c1 + 1
                found.append((sheet, c, rname, (r - r1) * width + (col - c1),
                              (r2 - r1 + 1) * width))
                break
        else:
            raise RecalcError(f"{sheet}!{c.ref}: an engine value without a name (a bug of "
                              "the plan)")
    LOCATIONS_CACHE[plan.options] = found
    return found


def _locate(names: NamedCells, name: str, index: int, size: int) -> tuple[str, str]:
    """Where a refreshed cell is in the workbook: through its name, or its named range."""
    if index < 0:
        return names.loc(name)
    wsheet, cells = names.range_cells(name)
    if len(cells) != size:
        raise RecalcError(f"{name} holds {len(cells)} cells, the plan {size}: the layout is "
                          "damaged")
    return wsheet, cells[index].coordinate


def _engine_constants(data: WorkbookData, result: Any, simulation: Any = None
                      ) -> tuple[dict[tuple[str, str], Any], list[Issue]]:
    """New values of the engine cells recalculation refreshes, at their named places."""
    book, plan = data.book, data.plan
    sources = Sources(data.project, result, chart_tables(result), simulation)
    out: dict[tuple[str, str], Any] = {}
    issues: list[Issue] = []
    names = NamedCells(book)
    for sheet, c, name, index, size in _locations(plan):
        if simulation is None and from_simulation(c):
            continue                # not rerun: its inputs did not change (or no such sheet)
        wsheet, coord = _locate(names, name, index, size)
        cell = book[wsheet].get(coord)
        where = f"{wsheet}!{coord}"
        if cell.data_type == "f":
            issues.append(Issue("formula_added", where, "engine value replaced by a formula; "
                                "kept as it is (not refreshed)", "engine value", cell.value))
            continue
        value = source_value(c.source, sources)
        text = isinstance(value, str)
        if cell.data_type != ("s" if text else "n") or cell.value is None:
            shown = "empty" if cell.value is None else repr(cell.value)
            raise RecalcError(f"{where} is {shown} where the builder writes an engine value: "
                              "the layout is damaged; rebuild it from its project file")
        out[(wsheet, coord)] = value if text else float(value)
    return out, issues


def _evaluate(book: Book, plan: Plan, res: RecalcResult) -> dict[tuple[str, str], Any]:
    sheets = [s.title for s in plan.sheets if s.title in book.sheets]
    ev = Evaluator(book, sheets=sheets, parse_cache=PARSE_CACHE)
    try:
        values = ev.values()
    except (FormulaError, RecursionError) as exc:
        raise RecalcError(f"a formula cannot be evaluated by swaytune ({exc}); recalculate "
                          "this workbook in a spreadsheet application instead") from None
    cached: dict[tuple[str, str], Any] = {}
    for sheet, cells in values.items():
        for coord, v in cells.items():
            if is_error(v) or (isinstance(v, float) and not math.isfinite(v)):
                code = str(v) if is_error(v) else "#NUM!"
                cached[(sheet, coord)] = CellError(code)
                res.issues.append(Issue("error_value", f"{sheet}!{coord}",
                                        f"formula evaluates to {code}", "", code))
            else:
                cached[(sheet, coord)] = 0.0 if v is None else v
    others = [t for t in book.sheets if t not in sheets]
    stale = 0
    for title in others:          # a firm's sheets may show our names
        for cell in list(book[title].cells.values()):
            if cell.data_type != "f":
                continue
            try:
                v = ev.cell(title, cell.row, cell.column)
            except (FormulaError, RecursionError):
                stale += 1
                continue
            if is_error(v) or v is None or (isinstance(v, float) and not math.isfinite(v)):
                stale += 1
                continue
            cached[(title, cell.coordinate)] = v
    if stale:
        res.issues.append(Issue("note", ", ".join(others), f"{stale} formula cell(s) on sheets "
                                "not made by swaytune keep their old cached value (not "
                                "evaluated here); a spreadsheet program recalculates them on "
                                "opening"))
    return cached


def _verdicts(data: WorkbookData, result: Any, res: RecalcResult, now) -> None:
    plan = data.plan
    engine_ok = {c.name: c.ok for c in result.checks}
    for rule in check_rules(plan.options.parts):
        verdict = now(check_name(rule.name))
        verdict = verdict if verdict in ("OK", "NOT OK") else "NOT OK"
        res.checks.append((rule.label, verdict))
        if (verdict == "OK") != engine_ok[rule.name]:
            res.issues.append(Issue("verdict_mismatch", check_name(rule.name),
                                    f"the workbook says {verdict}, the engine "
                                    f"{'OK' if engine_ok[rule.name] else 'NOT OK'}",
                                    "OK" if engine_ok[rule.name] else "NOT OK", verdict))
    for name, label in SHORT_LABELS.items():
        v = now(name)
        res.checks.append((label, v if v in ("OK", "NOT OK") else "NOT OK"))
    for flag, what in engine_flags(plan.options):
        current = now(flag) == "current"
        res.checks.append((f"Engine value current ({flag})", "OK" if current else "NOT OK"))
        if not current:
            res.issues.append(Issue(
                "stale_engine_value", flag, f"the engine value of the {what} does not match "
                "the inputs after recalculation (a snapshot cell edited by hand?); rebuild the "
                "workbook from its project file", "current", str(now(flag))))
    for name in cross_checked(plan.options):
        v, e = now(name), float(result.cells[name])
        ok = isinstance(v, (int, float)) and not isinstance(v, bool)
        rel = (abs(v) if e == 0 else abs(v / e - 1)) if ok else math.inf
        if not rel <= TWIN_TOLERANCE:
            res.issues.append(Issue("engine_mismatch", name, f"the formula gives {v!r}, the "
                                    f"engine {e!r} (relative difference {rel:.3g} > "
                                    f"{TWIN_TOLERANCE:g})", repr(e), repr(v)))
    if any(i.kind == "engine_mismatch" for i in res.issues) and \
            (SHORT_LABELS["all_cross_checks"], "OK") in res.checks:
        res.checks.append(("Every result formula agrees with the engine", "NOT OK"))


def shown_unit(q: Any, us: bool) -> tuple[str, float]:
    """Unit and factor from SI a quantity is shown in: its SI unit, or in a US customary
    workbook (or batch) its US unit."""
    return us_display(q.unit, q.cell_name) if us else (q.unit, 1.0)


def _changes(data: WorkbookData, result: Any) -> list[Change]:
    """Inputs (as typed) and key results changed since the last engine run."""
    out = []
    declared = by_name(design_inputs())
    for name in list(data.last_inputs) + [n for n in data.typed if n not in data.last_inputs]:
        old, unit = data.last_inputs.get(name, (None, ""))
        new, unit = data.typed.get(name, (None, unit))
        if not _close(old, new):
            out.append(Change("input", name, declared[name].label, old, new, unit))
    for q in recorded_results(data.plan.options):
        old, new = data.last_results.get(q.cell_name), result.cells.get(q.cell_name)
        unit, factor = shown_unit(q, data.plan.options.us)
        old = old / factor if isinstance(old, (int, float)) else old
        new = float(new) / factor if isinstance(new, (int, float)) else new
        if not _close(old, new):
            out.append(Change("result", q.cell_name, q.label, old, new, unit))
    return out


def _design(data: WorkbookData) -> tuple[Any, Any]:
    """The engine's design and, for a workbook with a Nonlinear sheet, its simulation rerun."""
    try:
        result = run_design(data.project)
    except ValueError as exc:
        raise RecalcError(f"the engine cannot compute the design for these inputs: "
                          f"{str(exc).split(': ', 2)[-1]}") from None
    options = data.plan.options
    if options.simulation is None or _simulation_current(data, result):
        return result, None
    settings = data.project.simulation
    if settings is None or not settings.enabled:
        raise RecalcError("the workbook has a Nonlinear sheet but its simulation settings "
                          "(document property SwaytuneSimulation) are missing: rebuild it from "
                          "its project file")
    try:
        run = run_simulation(data.project, result)
    except ValueError as exc:
        raise RecalcError(f"the time-domain check cannot be rerun: "
                          f"{str(exc).split(': ', 2)[-1]}") from None
    sizes = (settings.load, len(run.time_table.rows), len(run.window_table.rows))
    if sizes != tuple(options.simulation):
        data.relayout.append(f"the time-domain record now fills {sizes[1]} and {sizes[2]} "
                             f"rows instead of {options.simulation[1]} and "
                             f"{options.simulation[2]}")
    return result, run


def _simulation_current(data: WorkbookData, result: Any) -> bool:
    """Whether the Nonlinear sheet's values were computed for these very inputs: every input
    the simulation depends on equals its snapshot (relative 1e-12, as the sheet's flag), so the
    simulation (deterministic, its settings fixed at build) need not be rerun."""
    for dep in simulation_dependencies(data.plan.options):
        loc = data.book.name_cell(snapshot_name(SIMULATION_FLAG, dep))
        snap = data.book[loc[0]].get(loc[1]).value if loc is not None else None
        now = result.cells.get(dep)
        if not (isinstance(snap, float) and isinstance(now, (int, float))
                and abs(now - snap) <= 1e-12 * abs(snap)):
            return False
    return True


def _recalc(res: RecalcResult, path: Path, dest: Path | None, in_place: bool, backup: str,
            overrides: Mapping[str, Any] | None, compare_layout: bool, force: bool) -> None:
    data = read_workbook(path, overrides=overrides)
    book, plan = data.book, data.plan
    res.issues.extend(data.issues)
    res.typed = dict(data.typed)
    res.units = plan.options.units
    result, simulation = _design(data)
    res.design = result
    res.inputs = data.design_kwargs
    res.changes = _changes(data, result)
    if data.relayout:
        _relayout(res, data, path, dest, in_place, backup, force)
        return
    named = {n: book.name_cell(n) for n in plan.names()}
    constants: dict[tuple[str, str], Any] = {}
    if overrides:
        for name, (sheet, coord) in data.value_cells.items():
            cell = book[sheet].get(coord)
            new = float(data.typed[name][0])
            if cell.data_type == "f":
                raise RecalcError(f"input {name} ({sheet}!{coord}) holds a formula; an "
                                  "override would replace it")
            if cell.value != new:
                constants[(sheet, coord)] = new
    engine, issues = _engine_constants(data, result, simulation)
    res.issues.extend(issues)
    constants.update(engine)
    new_constants: dict[tuple[str, str], Any] = {}       # those that differ from the file's
    for (sheet, coord), v in constants.items():
        r, c = split_coord(coord)
        old = book[sheet].cells.get((r, c))
        if old is None or not _same_value(old.value, v):
            new_constants[(sheet, coord)] = v
        book[sheet].cells[(r, c)] = Cell(r, c, v, "s" if isinstance(v, str) else "n", v,
                                          old.cached_type if old else "n")
    cached = _evaluate(book, plan, res)

    def now(name: str) -> Any:
        loc = named.get(name)
        if loc is None:
            return None
        if loc in cached:
            return _plain(cached[loc])
        return book[loc[0]].get(loc[1]).value

    res.results = {name: now(name) for name in named if not name.startswith("TB_")}
    _verdicts(data, result, res, now)
    if compare_layout:
        res.issues.extend(formula_issues(book, plan, set(data.value_cells.values())))
    if dest is None:
        return
    chart_values = None
    if "Charts" in book:
        # the book's cells already hold the refreshed constants (written above)
        chart_values = {("Charts", c.coordinate): c.value for c in book["Charts"].cells.values()}
    # only the values that differ from the file's are rewritten (a value within
    # SAME_VALUE_RTOL of the stored one is the same value); in place, nothing to rewrite
    # leaves the file alone
    new_cached = _changed_cached(book, cached)
    if in_place and not (new_constants or new_cached):
        res.output = dest
        return
    _write(res, path, dest, in_place, backup, force, lambda src, out: write_results(
        src, out, constants=new_constants, cached=new_cached, chart_values=chart_values,
        book=book))


def _relayout(res: RecalcResult, data: WorkbookData, path: Path, dest: Path | None,
              in_place: bool, backup: str, force: bool) -> None:
    """Rebuild the workbook from its own inputs, for a layout the overrides need."""
    why = "; ".join(data.relayout)
    titles = {s.title for s in data.plan.sheets}
    foreign = [s for s in data.book.sheets if s not in titles]
    if data.plan.options.template or foreign:
        held = "a firm's template" if data.plan.options.template else \
            "sheets not made by swaytune (" + ", ".join(foreign) + ")"
        raise RecalcError(f"needs another layout ({why}), but the workbook holds {held}, which "
                          "a rebuild would not carry over: rebuild it from its project file "
                          "(swaytune build)")
    edited = [i for i in formula_issues(data.book, data.plan, set(data.value_cells.values()))
              if i.kind in HAND_EDITS]
    if edited:
        raise RecalcError(f"needs another layout ({why}), but formulas were edited by hand "
                          f"({', '.join(i.where for i in edited[:4])}), which a rebuild would "
                          "lose: carry the edits over by hand, or rebuild from the project file")
    res.issues.append(Issue("note", str(path), f"rebuilt from the workbook's inputs in a new "
                            f"layout: {why}"))
    if dest is None:
        return

    def build(src: Path, out: Path) -> None:
        from ..build import write_workbook      # lazy import (only a new layout needs it)
        try:
            write_workbook(data.project, out, force=True)
        except (ValueError, RuntimeError) as exc:       # BuildError, DrawError
            raise RecalcError(f"the new layout cannot be built: {exc}") from None

    _write(res, path, dest, in_place, backup, force, build)
    fresh = recalc_workbook(res.output, compare_layout=False)
    if fresh.failed:
        raise RecalcError(f"the rebuilt workbook cannot be read back: {fresh.error}")
    res.results, res.checks = fresh.results, fresh.checks
    res.issues.extend(fresh.issues)


#: Relative difference below which a stored number counts as the same value: another writer
#: may keep 15-16 significant digits where recalculation writes the shortest exact repr [-].
SAME_VALUE_RTOL = 1e-15


def _same_value(old: Any, new: Any) -> bool:
    return type(old) is type(new) and _close(old, new, SAME_VALUE_RTOL)


def _changed_cached(book: Book, cached: Mapping[tuple[str, str], Any]
                    ) -> dict[tuple[str, str], Any]:
    """The new cached values that differ from the ones the file holds (:func:`_same_value`)."""
    out = {}
    for key, v in cached.items():
        old = book[key[0]].cells.get(split_coord(key[1]))
        if old is None or not _same_value(old.cached, v):
            out[key] = v
    return out


def _write(res: RecalcResult, path: Path, dest: Path, in_place: bool, backup: str,
           force: bool, write) -> None:
    """Write the output through ``write(source, out)``: a new file, or the workbook itself
    (atomically, the original kept as a backup unless ``backup`` is "none"; the caller writes
    in place only when a value changed)."""
    if not in_place:
        guard_overwrite(dest, force=force)
        guard_hand_edits(dest, force=force)
        write(path, dest)
        res.output, res.rewritten = dest, True
        return
    if path.is_symlink():
        dest = path.resolve()       # replace the file the link points at, keep the link
        res.issues.append(Issue("note", str(path), f"a symbolic link: recalculated its target "
                                f"{dest} in place (the link itself is kept)"))
    scratch = dest.with_name(f".{dest.name}.swaytune-new")
    try:
        write(dest, scratch)
        if backup != "none":
            res.backup = _backup_path(dest, keep=backup == "keep")
            if backup != "keep":
                guard_overwrite(res.backup, force=force)
            with atomic_path(res.backup) as tmp:        # never a partial backup (full disk)
                shutil.copy2(dest, tmp)
        shutil.copymode(dest, scratch)     # the workbook keeps its own permissions
        os.replace(scratch, dest)
        res.output, res.rewritten = dest, True
    finally:
        scratch.unlink(missing_ok=True)


def _backup_path(path: Path, keep: bool = False) -> Path:
    """``<name>.bak`` (one per workbook, replaced), or with ``keep`` a new time-stamped one."""
    if not keep:
        return path.with_name(f"{path.name}.bak")
    stamp = _dt.datetime.now().strftime("%Y%m%d-%H%M%S")
    cand = path.with_name(f"{path.name}.{stamp}.bak")
    n = 1
    while cand.exists():
        cand = path.with_name(f"{path.name}.{stamp}-{n}.bak")
        n += 1
    return cand


def write_results(source: str | os.PathLike, dest: str | os.PathLike, *,
                  constants: Mapping[tuple[str, str], float] | None = None,
                  cached: Mapping[tuple[str, str], Any] | None = None,
                  chart_values: Mapping[tuple[str, str], Any] | None = None,
                  book: Book | None = None) -> Path:
    """Write an updated copy of a workbook: new constants, cached values, chart caches.

    Every other part of the package is copied unchanged (formulas included); the copy is
    written atomically. ``book`` is ``source`` as already read (not read again). See
    :func:`workbook_builder.xlsx.rewrite.write_package`.

    Raises
    ------
    RecalcError
        When a cell to change does not exist (or is a formula cell for ``constants``, a
        value cell for ``cached``), or a value cannot be stored (NaN, inf).
    """
    try:
        return write_package(source, dest, constants=constants, cached=cached,
                             chart_values=chart_values, book=book)
    except PackageError as exc:
        raise RecalcError(str(exc)) from None


_GC_LOCK = threading.Lock()
_GC_STATE = {"depth": 0, "was_enabled": False}


@contextlib.contextmanager
def _gc_paused():
    """Pause the cyclic garbage collector while one workbook is recalculated.

    A workbook allocates many small objects while the batch's caches (plans, parsed parts)
    hold many long-lived ones, so automatic collections would traverse those caches again and
    again. Reference counting still frees almost everything; the collector is switched back on
    (if it was on) when the workbook is done. Nested and concurrent calls are counted.
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


def recalc_workbook(path: str | os.PathLike, outdir: str | os.PathLike | None = None,
                    in_place: bool = False, backup: bool = True, *,
                    output: str | os.PathLike | None = None,
                    inputs: Mapping[str, Any] | None = None,
                    compare_layout: bool = True, force: bool = False,
                    keep_backups: bool = False) -> RecalcResult:
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
        With ``in_place``, copy the original to ``<name>.bak`` before it is replaced (only
        when its content changes) [-].
    output : path-like, optional
        Exact output file (instead of ``outdir``) [-].
    inputs : mapping, optional
        Input overrides as the project file writes them: glossary name -> a number in SI
        units, ``{"value": 25, "unit": "milli-g"}`` or ``"25 milli-g"``; ``tuning_method``
        -> a choice; None leaves an optional input out. :func:`read_inputs` returns this form.
        An override the layout has no place for rebuilds the workbook from its inputs [-].
    compare_layout : bool, optional
        Compare every formula with the plan's (detects hand edits) [-].
    force : bool, optional
        Overwrite an existing output that swaytune did not make [-].
    keep_backups : bool, optional
        With ``in_place``, keep every backup (``<name>.<time>.bak``) instead of one [-].

    Returns
    -------
    result : RecalcResult
        Status, inputs, new and old values, changes, check verdicts, issues; ``error`` holds
        the reason when the workbook failed (nothing is written then) [-].

    Raises
    ------
    ValueError
        Only for contradictory arguments (``in_place`` with ``outdir``/``output``, an output
        equal to the input without ``in_place``) and bad ``inputs`` (naming the input, the
        value and the valid range); a bad workbook is reported in the result.

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
    >>> for f in (0.15, 0.20, 0.25):
    ...     r = recalc_workbook(folder / "base.xlsx", output=folder / f"f_{f:.2f}.xlsx",
    ...                         inputs={"frequency": f})
    ...     print(f, round(r.results["pendulum_length"], 3), r.status)
    0.15 11.383 OK
    0.2 6.403 OK
    0.25 4.098 OK
    >>> from workbook_builder.recalc import read_inputs
    >>> same = recalc_workbook(folder / "base.xlsx", output=folder / "same.xlsx",
    ...                        inputs=read_inputs(folder / "base.xlsx"))
    >>> same.changes
    []
    """
    t0 = time.perf_counter()
    path = Path(path)
    if in_place and (outdir is not None or output is not None):
        raise ValueError("in_place=True cannot be combined with outdir or output")
    dest = Path(output) if output is not None else (
        path if in_place else (Path(outdir) / path.name if outdir is not None else None))
    if dest is not None and not in_place and _same_file(dest, path):
        raise ValueError(f"the output {dest} is the input itself; use in_place=True (keeps a "
                         "backup) or another output folder")
    overrides = parse_overrides(inputs)
    keep = "none" if not backup else ("keep" if keep_backups else "one")
    res = RecalcResult(path=path)
    try:
        with _gc_paused():
            _recalc(res, path, dest, in_place, keep, overrides, compare_layout, force)
    except (RecalcError, OverwriteRefused) as exc:
        res.error, res.output = str(exc), None
    except Exception as exc:  # noqa: BLE001 - one bad file must not stop a batch
        res.error = f"unexpected error ({type(exc).__name__}): {exc}"
        res.output = None
    res.seconds = time.perf_counter() - t0
    return res
