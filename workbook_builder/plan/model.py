# SPDX-License-Identifier: MIT
"""The workbook plan as plain data: every cell the builder writes, and how.

A :class:`Plan` lists, sheet by sheet, every :class:`Cell` the builder writes: its reference,
its kind (:data:`CELL_KINDS`), its content (a label's text, a formula's text, a constant) or the
source of its value (an input of the project, an engine value, a chart table entry, ...), its
defined name, number format, unit and look. The plan depends only on the layout options
(:class:`workbook_builder.plan.options.PlanOptions`), never on the numbers, so batch
recalculation rebuilds the very plan a workbook was drawn from (its options are stored in the
workbook) and reads and writes cells through the plan's defined names.

Nothing here touches a spreadsheet library: ``workbook_builder.xlsx.draw`` draws a plan with
openpyxl, ``workbook_builder.plan.values`` fills in the values of its sourced cells.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Iterator

__all__ = ["CELL_KINDS", "REFRESHED_SOURCES", "SIMULATION_KINDS", "refreshed", "from_simulation",
           "Cell", "Validation", "Series", "Chart", "SheetPlan", "Plan"]

#: Kinds of planned cells:
#:
#: * ``label`` — the builder's own words (headings, labels, notes); never read back;
#: * ``text`` — text the user supplied (project identification, notes): always text, never a
#:   formula, whatever it starts with;
#: * ``input`` — a value the user may edit (unlocked, data validation);
#: * ``value`` — a constant the builder writes (a unit and its factor to SI, a setting);
#: * ``formula`` — a native worksheet formula;
#: * ``check`` — a verdict formula giving "OK" or "NOT OK";
#: * ``engine`` — an engine value without a worksheet formula (green).
CELL_KINDS = ("label", "text", "input", "value", "formula", "check", "engine")

#: Sources of engine values that batch recalculation recomputes: cells of the design chain,
#: snapshots of the inputs they were computed for, chart tables, the inputs as typed at the
#: last engine run (Record sheet) and the time-domain simulation's values and tables.
REFRESHED_SOURCES = ("cell", "snapshot", "chart", "typed", "sim", "sim_response", "sim_table")
#: Sources of the time-domain simulation's values (its snapshots are ``("snapshot",
#: "simulation", ...)``).
SIMULATION_KINDS = ("sim", "sim_response", "sim_table")


def refreshed(cell: "Cell") -> bool:
    """True for an engine value batch recalculation recomputes (see REFRESHED_SOURCES)."""
    return cell.kind == "engine" and bool(cell.source) and cell.source[0] in REFRESHED_SOURCES


def from_simulation(cell: "Cell") -> bool:
    """True for a value of the time-domain simulation, or a snapshot of the inputs it was
    computed for."""
    source = cell.source
    return bool(source) and (source[0] in SIMULATION_KINDS or source[:2] == ("snapshot",
                                                                            "simulation"))


@dataclass(frozen=True)
class Cell:
    """One planned cell.

    ``content`` is the text of a label or a formula, or a constant; ``source`` says where the
    value of a ``text``, ``input``, ``value`` or ``engine`` cell comes from (a tuple whose first
    item is its kind, e.g. ``("input", "frequency")``, ``("cell", "tuning_ratio")``,
    ``("chart", "period", 3, 1)``). ``style`` holds space-separated look tokens drawn by
    ``workbook_builder.xlsx.draw``; ``comment`` becomes the cell's note.
    """

    ref: str
    kind: str
    content: Any = None
    source: tuple = ()
    name: str = ""
    fmt: str = ""
    style: str = ""
    unit: str = ""
    label: str = ""
    #: The cell's note (comment): where an input or a result comes from.
    comment: str = ""

    def __post_init__(self) -> None:
        if self.kind not in CELL_KINDS:
            raise ValueError(f"kind={self.kind!r} must be one of {', '.join(CELL_KINDS)}")
        if self.kind in ("formula", "check") and not str(self.content).startswith("="):
            raise ValueError(f"{self.ref}: a {self.kind} cell needs a formula, not "
                             f"{self.content!r}")


@dataclass(frozen=True)
class Validation:
    """A custom data-validation rule (formula without ``=``) on a cell or range."""

    ref: str
    formula: str
    error: str
    prompt_title: str = ""
    prompt: str = ""


@dataclass(frozen=True)
class Series:
    """One chart series: x and y ranges (``A5:A35``) of its sheet, title and line look."""

    x: str
    y: str
    title: str
    color: str
    dash: str = ""
    marker: str = ""
    line: bool = True
    width: int = 22000        # EMU (22000: about 1.7 pt)


@dataclass(frozen=True)
class Chart:
    """A scatter chart anchored at a cell, drawing series of its own sheet."""

    anchor: str
    title: str
    x_title: str
    y_title: str
    series: tuple[Series, ...]
    x_format: str = "0.00"
    y_format: str = "0.00"
    x_min: float | None = None
    x_max: float | None = None
    y_min: float | None = None
    tick_labels_low: bool = False
    #: Fit the x axis to the data of the first series (smallest to largest x), rounded out
    #: to ``x_round`` (0: exactly), instead of fixed limits.
    fit_x: bool = False
    x_round: float = 0.0


@dataclass
class SheetPlan:
    """Every cell of one sheet, with its merged ranges, widths, rules, charts and print set-up."""

    title: str
    cells: dict[str, Cell] = field(default_factory=dict)
    merges: list[str] = field(default_factory=list)
    widths: list[float] = field(default_factory=list)
    heights: dict[int, float] = field(default_factory=dict)
    validations: list[Validation] = field(default_factory=list)
    verdict_ranges: list[str] = field(default_factory=list)
    charts: list[Chart] = field(default_factory=list)
    landscape: bool = False
    title_rows: str | None = None
    print_area: str | None = None
    row_breaks: list[int] = field(default_factory=list)
    freeze: str | None = None
    #: Pages the sheet is scaled to fit in height (0: as many as its width allows).
    pages: int = 0
    #: Named ranges of this sheet: defined name -> range (``A63:C93``), e.g. a chart table.
    ranges: dict[str, str] = field(default_factory=dict)


@dataclass
class Plan:
    """The whole workbook: its sheets in order and the options they were laid out for."""

    options: Any
    sheets: list[SheetPlan] = field(default_factory=list)
    #: The finished plan's lookups (see :meth:`seal`); empty while the plan is being laid out.
    _sealed: dict[str, Any] = field(default_factory=dict, repr=False, compare=False)

    def seal(self) -> "Plan":
        """Compute the lookups a workbook is read through once, for a plan that is finished
        and will not change (every workbook of a batch reads through the same plan)."""
        self._sealed.clear()
        self._sealed.update(names=self.names(), range_names=self.range_names(),
                            refreshed=[(s, c) for s, c in self.cells() if refreshed(c)])
        return self

    def sheet(self, title: str) -> SheetPlan:
        for sheet in self.sheets:
            if sheet.title == title:
                return sheet
        raise KeyError(title)

    def cells(self) -> Iterator[tuple[str, Cell]]:
        """Every planned cell as ``(sheet title, cell)``, sheet by sheet."""
        for sheet in self.sheets:
            for cell in sheet.cells.values():
                yield sheet.title, cell

    def names(self) -> dict[str, tuple[str, str]]:
        """Defined name -> (sheet title, cell reference)."""
        if "names" in self._sealed:
            return self._sealed["names"]
        return {c.name: (s, c.ref) for s, c in self.cells() if c.name}

    def range_names(self) -> dict[str, tuple[str, str]]:
        """Defined name of a range -> (sheet title, range)."""
        if "range_names" in self._sealed:
            return self._sealed["range_names"]
        return {name: (sheet.title, rng) for sheet in self.sheets
                for name, rng in sheet.ranges.items()}

    def refreshed_cells(self) -> list[tuple[str, Cell]]:
        """``(sheet title, cell)`` of every engine value recalculation recomputes."""
        if "refreshed" in self._sealed:
            return self._sealed["refreshed"]
        return [(s, c) for s, c in self.cells() if refreshed(c)]

    def named(self, name: str) -> tuple[str, Cell]:
        """The sheet and cell of a defined name.

        Raises
        ------
        KeyError
            When the plan has no cell of that name.
        """
        for s, c in self.cells():
            if c.name == name:
                return s, c
        raise KeyError(name)
