# SPDX-License-Identifier: MIT
"""The builder's layout of a workbook, for batch recalculation (:mod:`workbook_builder.recalc`).

:func:`reference_layout` lays out the workbook the builder (:func:`workbook_builder.build.
lay_out`, as :func:`workbook_builder.build.build_workbook` without evaluating it) makes for a workbook's inputs and options, once per layout (tuning method,
mass-ratio mode, unit system, floor table, identification rows, template, [simulation]
settings, chart table sizes): the formula text of every cell, the defined names, the labels,
and the list of engine-only cells (:func:`workbook_builder.build.engine_cells`), which tells
recalculation where the engine values are instead of finding them by their labels.

:func:`formula_issues` compares a workbook's formulas with that layout (hand edits, formulas
replaced by values, formulas where the builder writes a value), comparing syntax trees so
that spacing, letter case and sheet prefixes do not count as edits.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from . import __version__
from .xlsx.formulas import FormulaError, parse
from .xlsx.package import Cell, split_coord

__all__ = ["Layout", "reference_layout", "layout_key", "formula_issues", "comparable_sheets",
           "clear_caches", "CANON_CACHE", "LAYOUT_CACHE"]


@dataclass
class Layout:
    """The builder's layout for one set of layout options (see :func:`reference_layout`)."""

    formulas: dict[tuple[str, str], str | None]     # (sheet, cell) -> formula text / None
    names: dict[str, tuple[str, str]]               # defined name -> (sheet, cell)
    labels: dict[str, dict[str, str]]               # sheet -> {cell: text constant}
    engine_cells: list = field(default_factory=list)   # build.EngineCell, in writing order
    simulated: bool = False                          # laid out with the Nonlinear sheet
    #: (sheet, row) -> {column: text} of the label columns A:C, to check that a row of a
    #: workbook holds what the builder writes there before an engine value is written into it.
    row_labels: dict[tuple[str, int], dict[int, str]] = field(default_factory=dict)

    def __post_init__(self) -> None:
        for sheet, cells in self.labels.items():
            for coord, text in cells.items():
                r, c = split_coord(coord)
                if c <= 3:
                    self.row_labels.setdefault((sheet, r), {})[c] = text


#: Syntax trees of formulas, canonical (names upper case, sheets explicit), per (text, sheet).
CANON_CACHE: dict[tuple[str, str], Any] = {}
#: Layouts per :func:`layout_key`.
LAYOUT_CACHE: dict[tuple, Layout | None] = {}


def clear_caches() -> None:
    """Forget every cached layout and syntax tree (a cold start, e.g. for a benchmark)."""
    CANON_CACHE.clear()
    LAYOUT_CACHE.clear()


def layout_key(data, result) -> tuple:
    """What the builder's layout depends on, for a read workbook and its engine result."""
    from .engine import simulation_settings_text
    from .calcsheet import mass_ratio_mode
    from .charts import chart_tables
    p = data.project
    fl = p.floors
    floors = None if fl is None else (len(fl.heights), fl.height_unit.symbol,
                                      fl.mass_unit.symbol, fl.damper_level)
    sim = None if p.simulation is None else simulation_settings_text(p.simulation)
    rows = tuple(len(t.rows) for t in chart_tables(result).values())
    return (__version__, p.tuning_method, mass_ratio_mode(p), p.units, floors,
            bool(p.info.get("structure")), bool(p.info.get("client")), data.template, sim,
            rows)


def reference_layout(data, result) -> Layout | None:
    """The builder's layout for a workbook's inputs and options, cached per layout key.

    Built with the workbook's [simulation] settings when it carries them (so the Nonlinear
    sheet, Checks and Summary compare as text); when that build fails (e.g. the simulation
    cannot run for these inputs) the layout without the Nonlinear sheet is used, and None is
    returned when no layout can be built.
    """
    import dataclasses

    from .build import BuildError, lay_out
    key = layout_key(data, result)
    if key in LAYOUT_CACHE:
        return LAYOUT_CACHE[key]
    made = None
    projects = [data.project]
    if data.project.simulation is not None:
        projects.append(dataclasses.replace(data.project, simulation=None))
    for project in projects:
        try:
            made = lay_out(project, result)
            break
        except (BuildError, ValueError):
            continue
    if made is None:
        LAYOUT_CACHE[key] = None
        return None
    workbook, cells = made
    formulas: dict[tuple[str, str], str | None] = {}
    names = {}
    for name, dn in workbook.defined_names.items():
        dests = list(dn.destinations)
        if len(dests) == 1 and not name.startswith(("TB_", "SWAYTUNE")):
            names[name] = (dests[0][0], dests[0][1].replace("$", ""))
    labels: dict[str, dict[str, str]] = {}
    for ws in workbook.worksheets:
        if data.template and ws.title == "Summary":
            continue
        for row in ws.iter_rows():
            for c in row:
                if c.value is None:
                    continue
                formulas[(ws.title, c.coordinate)] = c.value if c.data_type == "f" else None
                if isinstance(c.value, str) and c.data_type == "s":
                    labels.setdefault(ws.title, {})[c.coordinate] = c.value
    layout = Layout(formulas, names, labels, cells, "Nonlinear" in workbook.sheetnames)
    LAYOUT_CACHE[key] = layout
    return layout


def canon(formula: str, sheet: str):
    """Canonical syntax tree of a formula: names upper case, sheet of references explicit."""
    key = (formula, sheet)
    if key in CANON_CACHE:
        return CANON_CACHE[key]
    try:
        tree = _norm(parse(formula), sheet)
    except FormulaError:
        tree = ("text", formula.replace(" ", "").upper())
    CANON_CACHE[key] = tree
    return tree


def _norm(node, sheet):
    kind = node[0]
    if kind == "ref":
        return ("ref", node[1] or sheet) + tuple(node[2:])
    if kind == "name":
        return ("name", node[1].upper())
    if kind == "call":
        return ("call", node[1], tuple(_norm(a, sheet) for a in node[2]))
    if kind == "un":
        return ("un", node[1], _norm(node[2], sheet))
    if kind == "pct":
        return ("pct", _norm(node[1], sheet))
    if kind == "bin":
        return ("bin", node[1], _norm(node[2], sheet), _norm(node[3], sheet))
    return node



def comparable_sheets(data, layout: Layout) -> tuple[set[str], list[str]]:
    """Sheets laid out as the builder lays them out now: same names, same labels (>= 90 %).

    A workbook made by another builder version (or whose options recalc cannot read) differs
    on some sheets only; those are not compared as text.
    """
    book = data.book
    file_names = {}
    for name in book.defined_names:
        loc = book.name_cell(name)
        if loc is not None and not name.startswith(("TB_", "SWAYTUNE")):
            file_names[name] = loc
    ok, skipped = set(), []
    for sheet in {s for s, _ in layout.formulas}:
        if sheet not in book.sheets:
            continue
        mine = {n: c for n, (sh, c) in file_names.items() if sh == sheet}
        theirs = {n: c for n, (sh, c) in layout.names.items() if sh == sheet}
        texts = layout.labels.get(sheet, {})
        same = sum(1 for coord, text in texts.items() if book[sheet].get(coord).value == text)
        if mine == theirs and (not texts or same >= 0.9 * len(texts)):
            ok.add(sheet)
        else:
            skipped.append(sheet)
    return ok, sorted(skipped)


def formula_issues(data, layout: Layout, typed_cells: set[tuple[str, str]]) -> list:
    """Every formula of the workbook against the builder's (:class:`recalc.Issue` list).

    ``typed_cells`` are the input cells, where a user may type a formula.
    """
    from .recalc import Issue
    issues = []
    book = data.book
    comparable, skipped = comparable_sheets(data, layout)
    if skipped:
        why = ("another swaytune version" if layout.simulated or data.project.simulation is None
               else "another swaytune version, or a Nonlinear sheet whose simulation the "
                    "builder could not rerun for these inputs")
        issues.append(Issue("note", ", ".join(skipped), "laid out differently from the "
                            f"builder's layout for these inputs ({why}): formulas on these "
                            "sheets were checked against the engine only, not compared as "
                            "text"))
    rcs = layout.__dict__.get("_rc")
    if rcs is None or len(rcs) != len(layout.formulas):   # once per layout: (row, column)
        rcs = layout.__dict__["_rc"] = [split_coord(coord) for _, coord in layout.formulas]
    for ((sheet, coord), expected), rc in zip(layout.formulas.items(), rcs):
        if sheet not in comparable:
            continue
        ws = book.sheets.get(sheet)
        if ws is None:
            continue
        cell = ws.cells.get(rc)
        if cell is not None and expected is not None and cell.value == expected:
            continue                          # the same text: the common case, no parsing
        if cell is None:
            cell = Cell(0, 0, None, "n")
        where = f"{sheet}!{coord}"
        if expected is None:
            if cell.data_type == "f" and (sheet, coord) not in typed_cells:
                issues.append(Issue("formula_added", where, "holds a formula where the builder "
                                    "writes a value", "(value)", cell.value))
            continue
        if cell.data_type != "f":
            issues.append(Issue("formula_replaced", where, f"the builder's formula "
                                f"{expected} was replaced by the value {cell.value!r}",
                                expected, repr(cell.value)))
        elif canon(cell.value, sheet) != canon(expected, sheet):
            issues.append(Issue("formula_edited", where, f"formula edited: the builder writes "
                                f"{expected}, the workbook holds {cell.value}", expected,
                                cell.value))
    return issues
