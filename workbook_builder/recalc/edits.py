# SPDX-License-Identifier: MIT
"""Formulas edited by hand: a workbook's formulas against its plan's.

Every formula and verdict of the plan is compared with the workbook's cell — the named cell
through its defined name, an unnamed one at the plan's reference — comparing syntax trees, so
spacing, letter case and sheet prefixes are not edits. A formula where the plan writes a value
(an input cell excepted), a value where it writes a formula, and a different formula are
reported. When rows were inserted or deleted by hand (a named cell is no longer where the plan
puts it), only the named cells of that sheet are compared.
"""
from __future__ import annotations

from typing import Any

from ..plan.model import Plan
from ..xlsx.formulas import FormulaError, parse
from ..xlsx.package import Book, Cell, split_coord
from .read import Issue

__all__ = ["formula_issues", "CANON_CACHE", "POSITIONS_CACHE", "moved_sheets"]

_EMPTY = Cell(0, 0, None, "n")

#: Syntax trees of formulas, canonical (names upper case, sheets explicit), per (text, sheet).
CANON_CACHE: dict[tuple[str, str], Any] = {}
#: Per plan (by its options, which decide it): every planned cell with its row and column.
POSITIONS_CACHE: dict[Any, list[tuple[str, tuple[int, int], Any]]] = {}


def _positions(plan: Plan) -> list[tuple[str, tuple[int, int], Any]]:
    found = POSITIONS_CACHE.get(plan.options)
    if found is None:
        found = POSITIONS_CACHE[plan.options] = [(s, split_coord(c.ref), c)
                                                 for s, c in plan.cells()]
    return found


def canon(formula: str, sheet: str) -> Any:
    """Canonical syntax tree of a formula: names upper case, sheet of references explicit."""
    key = (formula, sheet)
    if key not in CANON_CACHE:
        try:
            tree = _norm(parse(formula), sheet)
        except FormulaError:
            tree = ("text", formula.replace(" ", "").upper())
        CANON_CACHE[key] = tree
    return CANON_CACHE[key]


def _norm(node: Any, sheet: str) -> Any:
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


def moved_sheets(book: Book, plan: Plan) -> list[str]:
    """Sheets where a named cell is not where the plan puts it (rows or columns moved)."""
    moved: list[str] = []
    for name, (psheet, ref) in plan.names().items():
        loc = book.name_cell(name)
        if loc is not None and loc != (psheet, ref) and psheet not in moved:
            moved.append(psheet)
    return moved


def formula_issues(book: Book, plan: Plan, typed_cells: set[tuple[str, str]]) -> list[Issue]:
    """Every formula of the workbook against its plan's (:class:`Issue` list).

    ``typed_cells`` are the input cells, where a user may type a formula.
    """
    issues: list[Issue] = []
    moved = moved_sheets(book, plan)
    if moved:
        issues.append(Issue("layout", ", ".join(moved), "rows or columns were inserted or "
                            "deleted by hand (named cells moved): only the named formulas of "
                            "these sheets were compared with the plan"))
    for sheet, pos, c in _positions(plan):
        ws = book.sheets.get(sheet)
        if ws is None:
            continue
        if sheet in moved:
            if not c.name:
                continue
            loc = book.name_cell(c.name)
            if loc is None:
                continue
            cell = book[loc[0]].get(loc[1])
            where = f"{loc[0]}!{loc[1]}"            # where the cell is now
        else:
            cell = ws.cells.get(pos) or _EMPTY
            where = f"{sheet}!{c.ref}"
        expected = c.content if c.kind in ("formula", "check") else None
        if expected is not None and cell.data_type == "f" and cell.value == expected:
            continue                                  # the same text: the common case
        if expected is None and cell.data_type != "f":
            continue                                  # a value where a value belongs
        if expected is None:
            if cell.data_type == "f" and (sheet, c.ref) not in typed_cells and \
                    c.kind != "input":
                issues.append(Issue("formula_added", where, "holds a formula where the "
                                    "builder writes a value", "(value)", cell.value))
            continue
        if cell.data_type != "f":
            issues.append(Issue("formula_replaced", where, f"the builder's formula {expected} "
                                f"was replaced by the value {cell.value!r}", expected,
                                repr(cell.value)))
        elif canon(cell.value, sheet) != canon(expected, sheet):
            issues.append(Issue("formula_edited", where, f"formula edited: the builder writes "
                                f"{expected}, the workbook holds {cell.value}", expected,
                                cell.value))
    return issues
