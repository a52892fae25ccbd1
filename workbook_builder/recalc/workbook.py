# SPDX-License-Identifier: MIT
"""Recalculating one workbook: engine values refreshed, cached values fresh, formulas kept.

:func:`recalc_workbook` reads a workbook through its plan (:mod:`.read`), reruns the engine's
design chain, writes the new engine values (results without a closed form, the input snapshots
beside them, the engine column of the cross-checks, the chart tables) into the cells the plan's
defined names point at, evaluates every formula of the plan's sheets as written in the file for
its cached value, and copies everything else unchanged (formulas, styles, a firm's own sheets).
The time-domain simulation of a Nonlinear sheet is not rerun: once the inputs change, its flag
says so and the workbook is NOT OK with "REBUILD NEEDED". Each workbook is checked: formulas
against the plan's (:mod:`.edits`), every result formula against the engine, every verdict.
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

from functions.design import CHECK_RULES
from functions.worksheet import TWIN_TOLERANCE

from ..compute import run_design
from ..plan.calculation import engine_flags
from ..plan.charts import chart_tables
from ..plan import make_plan
from ..plan.checks import check_name, cross_checked
from ..plan.model import Plan
from ..plan.summary import VERDICT_LABELS
from ..plan.values import Sources, source_value
from ..xlsx.cached import CellError
from ..xlsx.files import OverwriteRefused, atomic_path, guard_hand_edits, guard_overwrite
from ..xlsx.formulas import Evaluator, FormulaError, is_error
from ..xlsx.package import Book, Cell, PackageError, split_coord
from ..xlsx.rewrite import write_package
from .edits import CANON_CACHE, formula_issues
from .read import PART_CACHE, Issue, NamedCells, RecalcError, WorkbookData, read_workbook

__all__ = ["RecalcResult", "recalc_workbook", "write_results", "PARSE_CACHE",
           "CHANGE_TOLERANCE", "SHORT_LABELS", "clear_caches"]

#: Relative tolerance below which a value counts as unchanged since the last calculation [-].
CHANGE_TOLERANCE = 1e-12
#: Formula text -> syntax tree, shared by the evaluators of a batch.
PARSE_CACHE: dict[str, Any] = {}
#: Labels of the verdicts besides the design checks (the summary's columns).
SHORT_LABELS = VERDICT_LABELS


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


def clear_caches() -> None:
    """Forget parsed formulas, parts, syntax trees and plans (a cold start, e.g. a benchmark)."""
    PARSE_CACHE.clear()
    PART_CACHE.clear()
    CANON_CACHE.clear()
    make_plan.cache_clear()


def _close(a: Any, b: Any, rel: float = CHANGE_TOLERANCE) -> bool:
    if isinstance(a, bool) or isinstance(b, bool):
        return a == b
    if isinstance(a, (int, float)) and isinstance(b, (int, float)):
        return a == b or math.isclose(a, b, rel_tol=rel, abs_tol=0.0)
    return a == b


def _plain(v: Any) -> Any:
    return str(v) if is_error(v) else v


class _Locator:
    """Where planned cells are in the workbook: through their names, or their named ranges."""

    def __init__(self, book: Book, plan: Plan):
        self.names = NamedCells(book)
        self.ranges = []
        for rname, (rsheet, rng) in plan.range_names().items():
            first, _, last = rng.partition(":")
            self.ranges.append((rname, rsheet, split_coord(first), split_coord(last)))

    def __call__(self, sheet: str, ref: str, name: str) -> tuple[str, str]:
        if name:
            return self.names.loc(name)
        r, c = split_coord(ref)
        for rname, rsheet, (r1, c1), (r2, c2) in self.ranges:
            if rsheet == sheet and r1 <= r <= r2 and c1 <= c <= c2:
                width = c2 - c1 + 1
                wsheet, cells = self.names.range_cells(rname)
                if len(cells) != (r2 - r1 + 1) * width:
                    raise RecalcError(f"{rname} holds {len(cells)} cells, the plan "
                                      f"{(r2 - r1 + 1) * width}: the layout is damaged")
                return wsheet, cells[(r - r1) * width + (c - c1)].coordinate
        raise RecalcError(f"{sheet}!{ref}: an engine value without a name (a bug of the plan)")


def _engine_constants(data: WorkbookData, result: Any) -> tuple[dict[tuple[str, str], float],
                                                                  list[Issue]]:
    """New values of the engine cells recalculation refreshes, at their named places."""
    book, plan = data.book, data.plan
    sources = Sources(data.project, result, chart_tables(result))
    out: dict[tuple[str, str], float] = {}
    issues: list[Issue] = []
    locate = _Locator(book, plan)
    for sheet, c in plan.refreshed_cells():
        wsheet, coord = locate(sheet, c.ref, c.name)
        cell = book[wsheet].get(coord)
        where = f"{wsheet}!{coord}"
        if cell.data_type == "f":
            issues.append(Issue("formula_added", where, "engine value replaced by a formula; "
                                "kept as it is (not refreshed)", "engine value", cell.value))
            continue
        if cell.data_type != "n" or cell.value is None:
            shown = "empty" if cell.value is None else repr(cell.value)
            raise RecalcError(f"{where} is {shown} where the builder writes an engine value: "
                              "the layout is damaged; rebuild it from its project file")
        out[(wsheet, coord)] = float(source_value(c.source, sources))
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
    for rule in CHECK_RULES:
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
        if not current and flag == "engine_flag_simulation":
            res.issues.append(Issue(
                "stale_engine_value", flag, "REBUILD NEEDED: the Nonlinear sheet's time-domain "
                "simulation was computed for other inputs and recalc does not rerun it; "
                "rebuild the workbook from its project file with the new inputs (swaytune "
                "build PROJECT.toml -o NEW.xlsx)", "current", str(now(flag))))
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


def _recalc(res: RecalcResult, path: Path, dest: Path | None, in_place: bool, backup: bool,
            overrides: Mapping[str, float] | None, compare_layout: bool, force: bool) -> None:
    data = read_workbook(path, overrides=overrides)
    book, plan = data.book, data.plan
    res.issues.extend(data.issues)
    res.typed = dict(data.typed)
    try:
        result = run_design(data.project)
    except ValueError as exc:
        raise RecalcError(f"the engine cannot compute the design for these inputs: "
                          f"{str(exc).split(': ', 2)[-1]}") from None
    res.design = result
    res.inputs = data.design_kwargs
    named = {n: book.name_cell(n) for n in plan.names()}
    previous = {}
    for name, loc in named.items():
        if loc is not None:
            c = book[loc[0]].get(loc[1])
            previous[name] = c.cached if c.data_type == "f" else c.value
    constants: dict[tuple[str, str], float] = {}
    if overrides:
        for name, (sheet, coord) in data.value_cells.items():
            cell = book[sheet].get(coord)
            new = float(data.typed[name][0])
            if cell.data_type == "f":
                raise RecalcError(f"input {name} ({sheet}!{coord}) holds a formula; an "
                                  "override would replace it")
            if cell.value != new:
                constants[(sheet, coord)] = new
    engine, issues = _engine_constants(data, result)
    res.issues.extend(issues)
    constants.update(engine)
    for (sheet, coord), v in constants.items():
        r, c = split_coord(coord)
        old = book[sheet].cells.get((r, c))
        book[sheet].cells[(r, c)] = Cell(r, c, float(v), "n", float(v),
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
    res.previous = {name: previous.get(name) for name in res.results}
    res.changes = [(n, previous.get(n), v) for n, v in res.results.items()
                   if not _close(previous.get(n), v)]
    _verdicts(data, result, res, now)
    if compare_layout:
        res.issues.extend(formula_issues(book, plan, set(data.value_cells.values())))
    if dest is None:
        return
    if in_place and path.is_symlink():
        dest = path.resolve()       # replace the file the link points at, keep the link
        res.issues.append(Issue("note", str(path), f"a symbolic link: recalculated its target "
                                f"{dest} in place (the link itself is kept)"))
    if not in_place:
        guard_overwrite(dest, force=force)
        guard_hand_edits(dest, force=force)
    chart_values = None
    if "Charts" in book:
        # the book's cells already hold the refreshed constants (written above)
        chart_values = {("Charts", c.coordinate): c.value for c in book["Charts"].cells.values()}
    if in_place and backup:
        res.backup = _backup_path(dest)
        with atomic_path(res.backup) as tmp:        # never a partial backup (full disk)
            shutil.copy2(dest, tmp)
    try:
        write_results(dest if in_place else path, dest, constants=constants, cached=cached,
                      chart_values=chart_values, book=book)     # the package as read above
    except BaseException:
        if res.backup is not None:                  # the original is untouched: no backup
            res.backup.unlink(missing_ok=True)
            res.backup = None
        raise
    res.output = dest


def _backup_path(path: Path) -> Path:
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
        Input overrides, in the unit shown in the workbook (see
        :func:`workbook_builder.recalc.read.read_workbook`) [-].
    compare_layout : bool, optional
        Compare every formula with the plan's (detects hand edits) [-].
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
    >>> for f in (0.15, 0.20, 0.25):
    ...     r = recalc_workbook(folder / "base.xlsx", output=folder / f"f_{f:.2f}.xlsx",
    ...                         inputs={"frequency": f})
    ...     print(f, round(r.results["pendulum_length"], 3), r.status)
    0.15 11.383 OK
    0.2 6.403 OK
    0.25 4.098 OK
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
    res = RecalcResult(path=path)
    try:
        with _gc_paused():
            _recalc(res, path, dest, in_place, backup, inputs, compare_layout, force)
    except (RecalcError, OverwriteRefused) as exc:
        res.error, res.output = str(exc), None
    except Exception as exc:  # noqa: BLE001 - one bad file must not stop a batch
        res.error = f"unexpected error ({type(exc).__name__}): {exc}"
        res.output = None
    res.seconds = time.perf_counter() - t0
    return res
