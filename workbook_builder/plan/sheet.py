# SPDX-License-Identifier: MIT
"""Laying out one sheet of the plan: rows and columns in, planned cells out.

:class:`SheetLayout` is the small vocabulary every sheet module uses: a label, a formula, an
input, an engine value, a header row, a merged range, a data-validation rule. Each call records
a :class:`workbook_builder.plan.model.Cell` at (row, column); nothing is drawn here.
"""
from __future__ import annotations

from typing import Any

from openpyxl.utils import get_column_letter

from .model import SIMULATION_KINDS, Cell, SheetPlan, Validation

__all__ = ["SheetLayout", "ref", "Looks", "SIMULATION_SOURCES"]

#: Sources of the time-domain simulation's single values (named after their source; its tables
#: are named ranges).
SIMULATION_SOURCES = tuple(k for k in SIMULATION_KINDS if k != "sim_table")


def ref(row: int, col: int) -> str:
    """A1 reference of (row, column), both 1-based."""
    return f"{get_column_letter(col)}{row}"


class Looks:
    """Look tokens (drawn by ``workbook_builder.xlsx.draw``)."""

    TITLE = "title"            # large bold heading
    HEADING = "heading"        # bold, a size below the title
    BOLD = "bold"
    ITALIC = "italic"
    CAUTION = "caution"        # bold dark red
    WARNING = "warning"        # italic dark red
    HEAD = "head"              # white bold on dark, boxed, wrapped: a table's header row
    TABLE_HEAD = "table_head"  # bold on light blue, wrapped: a chart table's header
    SECTION = "section"        # bold on the section colour
    FILL = "section_fill"      # the section colour alone
    BOX = "box"
    WRAP = "wrap"
    TOP = "top"
    TB_LABEL = "tb_label"      # title-block label
    TB_VALUE = "tb_value"      # title-block value
    SECONDARY = "secondary"    # grey text: a value shown a second time (SI beside US)


class SheetLayout:
    """Records the cells of one sheet; ``plan`` is the resulting :class:`SheetPlan`."""

    def __init__(self, title: str) -> None:
        self.plan = SheetPlan(title)

    @property
    def title(self) -> str:
        return self.plan.title

    # cells --------------------------------------------------------------------------------
    def cell(self, row: int, col: int, kind: str, content: Any = None, *, source: tuple = (),
             name: str = "", fmt: str = "", style: str = "", unit: str = "",
             label: str = "", comment: str = "") -> Cell:
        """Record one cell (replacing what was planned there).

        A simulation value without a name of its own is named after its source
        (``engine_sim_load``, ``engine_sim_response_linear_swing_deg``): recalculation writes
        engine values only through defined names.
        """
        if kind == "engine" and not name and source and source[0] in SIMULATION_SOURCES:
            name = "_".join(["engine"] + [str(part) for part in source])
        c = Cell(ref(row, col), kind, content, source, name, fmt, style, unit, label, comment)
        self.plan.cells[c.ref] = c
        return c

    def label(self, row: int, col: int, text: str, style: str = "") -> Cell:
        return self.cell(row, col, "label", text, style=style)

    def blank(self, row: int, col: int, style: str) -> Cell:
        """An empty cell that carries a look (a fill or a border)."""
        return self.cell(row, col, "label", None, style=style)

    def text(self, row: int, col: int, source: tuple, style: str = "", name: str = "") -> Cell:
        """User text (from the project): always text, never a formula."""
        return self.cell(row, col, "text", source=source, style=style, name=name)

    def formula(self, row: int, col: int, formula: str, *, fmt: str = "", style: str = "",
                name: str = "", unit: str = "", label: str = "", comment: str = "") -> Cell:
        return self.cell(row, col, "formula", formula, fmt=fmt, style=style, name=name,
                         unit=unit, label=label, comment=comment)

    def check(self, row: int, col: int, formula: str, *, name: str = "", style: str = "bold box",
              label: str = "") -> Cell:
        return self.cell(row, col, "check", formula, style=style, name=name, label=label)

    def input(self, row: int, col: int, source: tuple, *, fmt: str = "General",
              style: str = "box", name: str = "", unit: str = "", label: str = "",
              comment: str = "") -> Cell:
        return self.cell(row, col, "input", source=source, fmt=fmt, style=f"input {style}",
                         name=name, unit=unit, label=label, comment=comment)

    def value(self, row: int, col: int, content: Any = None, *, source: tuple = (),
              fmt: str = "", style: str = "", name: str = "", unit: str = "",
              label: str = "") -> Cell:
        return self.cell(row, col, "value", content, source=source, fmt=fmt, style=style,
                         name=name, unit=unit, label=label)

    def engine(self, row: int, col: int, source: tuple, *, fmt: str = "", style: str = "box",
               name: str = "", unit: str = "", label: str = "", comment: str = "") -> Cell:
        return self.cell(row, col, "engine", source=source, fmt=fmt, style=f"engine {style}",
                         name=name, unit=unit, label=label, comment=comment)

    def header(self, row: int, labels: list[str], first_col: int = 1) -> None:
        for i, text in enumerate(labels):
            self.label(row, first_col + i, text, Looks.HEAD)

    def section(self, row: int, title: str, last_col: int) -> None:
        """A section heading: bold title on the section colour across the table's width."""
        self.label(row, 1, title, Looks.SECTION)
        for col in range(2, last_col + 1):
            self.blank(row, col, Looks.FILL)

    # sheet-level ---------------------------------------------------------------------------
    def merge(self, row: int, col: int, last_row: int, last_col: int) -> None:
        self.plan.merges.append(f"{ref(row, col)}:{ref(last_row, last_col)}")

    def widths(self, widths: list[float]) -> None:
        self.plan.widths = list(widths)

    def height(self, row: int, points: float) -> None:
        self.plan.heights[row] = max(points, self.plan.heights.get(row, 0.0))

    def validation(self, cell_range: str, formula: str, error: str, *,
                   prompt_title: str = "", prompt: str = "") -> None:
        self.plan.validations.append(Validation(cell_range, formula, error, prompt_title,
                                                prompt[:255]))

    def verdicts(self, cell_range: str) -> None:
        """Colour a range of "OK" / "NOT OK" cells green / red."""
        self.plan.verdict_ranges.append(cell_range)

    def name_range(self, name: str, cell_range: str) -> None:
        self.plan.ranges[name] = cell_range

    def page(self, *, landscape: bool = False, title_rows: str | None = None,
             print_area: str | None = None, freeze: str | None = None,
             pages: int = 0) -> None:
        self.plan.landscape = landscape
        self.plan.title_rows = title_rows
        self.plan.print_area = print_area
        self.plan.freeze = freeze
        self.plan.pages = pages
