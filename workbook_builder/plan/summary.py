# SPDX-License-Identifier: MIT
"""The Summary sheet: title block, structure, key results, every verdict, cautions.

Without a firm's template the sheet opens with a title block of our own (its cells carry the
title-block names ``TB_*`` of :mod:`workbook_builder.xlsx.template`, so a built workbook can
serve as a template itself); with a template, the firm's sheets hold the title block and this
sheet starts with its heading.
"""
from __future__ import annotations

from functions.design import CHECK_RULES
from functions.quantities import design_results

from ..project.units import US_DISPLAY
from .calculation import engine_flags, unit_format
from .checks import NONLINEAR_CHECKS, check_name
from .options import PlanOptions
from .reference import CAUTIONS
from .sheet import Looks, SheetLayout

__all__ = ["summary_sheet", "HEADING", "TITLE_BLOCK", "key_results"]

HEADING = "Pendulum tuned mass damper - preliminary design"

#: Title block: (row, column, label, info key, defined name); values in the next column.
TITLE_BLOCK = (
    (2, 1, "Project no.", "number", "TB_PROJECT_NUMBER"),
    (2, 3, "Revision", "revision", "TB_REVISION"),
    (3, 1, "Title", "title", "TB_TITLE"),
    (4, 1, "Calculated by", "calculated_by", "TB_CALCULATED_BY"),
    (4, 3, "Checked by", "checked_by", "TB_CHECKED_BY"),
    (5, 1, "Date", "date", "TB_DATE"),
)

#: Labels of the verdicts besides the design checks (the recalc summary's columns too).
VERDICT_LABELS = {"all_cross_checks": "Workbook formulas agree with the engine",
                  "fixed_point_converged": "Pendulum fixed point converged"}

_SHORT = {
    "sim_check_departure": "Nonlinear simulation: response within the tolerance",
    "sim_check_detuning": "Nonlinear simulation: detuning at the simulated swing",
    "sim_check_swing": "Nonlinear simulation: simulated swing",
}


def key_results() -> list[str]:
    """Defined names of the key results shown on the Summary sheet, in checking order."""
    return [q.cell_name for q in design_results() if q.summary]


def _title_block(sh: SheetLayout) -> int:
    sh.label(1, 1, HEADING, Looks.HEADING)
    for row, col, label, key, name in TITLE_BLOCK:
        sh.label(row, col, label, Looks.TB_LABEL)
        sh.text(row, col + 1, ("info", key), Looks.TB_VALUE + (" wrap" if key == "title"
                                                               else ""), name=name)
        if key == "title":
            sh.blank(row, col + 2, Looks.TB_VALUE)
            sh.blank(row, col + 3, Looks.TB_VALUE)
            sh.merge(row, col + 1, row, col + 3)
    sh.label(5, 3, "Sheet", Looks.TB_LABEL)
    sh.label(5, 4, "Summary", Looks.TB_VALUE)
    return 7


def summary_sheet(options: PlanOptions) -> SheetLayout:
    """The Summary sheet for ``options``."""
    sh = SheetLayout("Summary")
    if options.template:
        sh.label(1, 1, HEADING, Looks.TITLE)
        row = 3
    else:
        row = _title_block(sh)
    for label, key in (("Structure", "structure"), ("Client", "client")):
        sh.label(row, 1, label, Looks.BOLD)
        sh.text(row, 2, ("info", key), Looks.WRAP, name=f"project_{key}")
        sh.merge(row, 2, row, 4)
        row += 1
    row += 1
    sh.section(row, "Key results", 3)
    row += 1
    results = {q.cell_name: q for q in design_results()}
    for name in key_results():
        q = results[name]
        sh.label(row, 1, q.label, "box")
        sh.formula(row, 2, f"={name}", fmt=q.fmt, style="box")
        sh.label(row, 3, q.unit, "box")
        if options.us and q.unit in US_DISPLAY:
            us_unit, factor = US_DISPLAY[q.unit]
            sh.formula(row, 4, f"=B{row}/{factor!r}", fmt=unit_format(us_unit), style="box")
            sh.label(row, 5, us_unit, "box")
        row += 1
    row += 1
    sh.section(row, "Verdicts", 3)
    row += 1
    start = row
    rows = [(rule.label, f"={check_name(rule.name)}") for rule in CHECK_RULES]
    rows += [("All design checks", "=all_design_checks")]
    rows += [(label, f"={name}") for name, label in VERDICT_LABELS.items()]
    if options.simulation is not None:
        rows += [(_SHORT[name], f"={name}") for name, *_ in NONLINEAR_CHECKS]
    rows += [(f"Engine value of the {what} current (inputs unchanged)", f"={flag}_ok")
             for flag, what in engine_flags(options)]
    for label, formula in rows:
        sh.label(row, 1, label, "bold box wrap")
        sh.formula(row, 2, formula, style="bold box")
        row += 1
    sh.verdicts(f"B{start}:B{row - 1}")
    row += 1
    sh.label(row, 1, "Tuning method", Looks.BOLD)
    sh.value(row, 2, source=("input", "tuning_method"))
    row += 1
    sh.label(row, 1, "Source file", Looks.BOLD)
    sh.text(row, 2, ("record", "source_and_case"))
    row += 2
    sh.label(row, 1, "CAUTION", Looks.CAUTION)
    row += 1
    for text in CAUTIONS[:5]:
        sh.label(row, 1, text, Looks.WRAP)
        sh.merge(row, 1, row, 3)
        row += 1
    sh.label(row, 1, "See the Cautions sheet.")
    sh.widths([42, 30, 14, 12, 9])
    sh.page()
    return sh
