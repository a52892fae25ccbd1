# SPDX-License-Identifier: MIT
"""The Summary sheet: title block, design inputs, results beside their limits, verdicts.

One printed page: the design inputs with their units and where they come from, each key result
beside the limit it is checked against and its verdict, the remaining verdicts, the cautions.
In US customary workbooks the US values come first with the SI values beside them.

Without a firm's template the sheet opens with a title block of our own (its cells carry the
title-block names ``TB_*`` of :mod:`workbook_builder.xlsx.template`, so a built workbook can
serve as a template itself); with a template, the firm's sheets hold the title block and this
sheet starts with its heading.
"""
from __future__ import annotations

from functions.design import CheckRule, check_rules
from functions.quantities import Quantity, design_inputs, design_results, quantity
from functions.worksheet import formula_names

from ..project.units import us_display
from .calculation import engine_flags, result_comment, unit_format
from .checks import NONLINEAR_CHECKS, check_name
from .inputs import input_comment
from .options import PlanOptions
from .reference import CAUTIONS, part_key_results
from .sheet import Looks, SheetLayout, ref

__all__ = ["summary_sheet", "HEADING", "TITLE_BLOCK", "key_results", "VERDICT_LABELS",
           "SummaryColumns", "shown"]

HEADING = "Pendulum tuned mass damper - preliminary design"

#: Title block: (row, column, label, info key, defined name); values in the next column,
#: merged to the column before the next label (the title to the last column).
TITLE_BLOCK = (
    (2, 1, "Project no.", "number", "TB_PROJECT_NUMBER"),
    (2, 4, "Revision", "revision", "TB_REVISION"),
    (3, 1, "Title", "title", "TB_TITLE"),
    (4, 1, "Calculated by", "calculated_by", "TB_CALCULATED_BY"),
    (4, 4, "Checked by", "checked_by", "TB_CHECKED_BY"),
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


class SummaryColumns:
    """Columns of the Summary sheet. Inputs: label, symbol, value, unit, [SI value, SI unit,]
    source; results: label, symbol, value, unit, limit, verdict, [SI value, SI unit,] rule."""

    def __init__(self, us: bool) -> None:
        self.us = us
        self.label, self.symbol, self.value, self.unit, self.limit, self.verdict = range(1, 7)
        if us:
            self.input_si, self.input_si_unit, self.source = 5, 6, 7
            self.result_si, self.result_si_unit, self.rule = 7, 8, 9
            self.last = 9
        else:
            self.input_si = self.input_si_unit = self.result_si = self.result_si_unit = 0
            self.source, self.rule, self.last = 5, 7, 7

    def widths(self, wide: bool = False) -> list[float]:
        """Column widths; ``wide`` gives the labels more room (the design envelope's long
        labels on one line each)."""
        extra = 14 if wide else 0
        if self.us:
            return [32 + extra, 9, 11, 12, 11, 9, 11, 8, 25]
        return [36 + extra, 9, 12, 11, 11, 9, 28]


def key_results(options: PlanOptions | None = None) -> list[str]:
    """Defined names of the key results shown on the Summary sheet, in checking order (with
    ``options``, those of its optional parts too)."""
    names = [q.cell_name for q in design_results() if q.summary]
    if options is not None:
        names += [q.cell_name for q in part_key_results(options)]
    return names


def _rule_of(name: str, parts: tuple[str, ...] = ()) -> CheckRule | None:
    """The design check whose value is the result ``name`` (or its absolute value)."""
    for rule in check_rules(parts):
        if formula_names(rule.value_formula) == (name,):
            return rule
    return None


def _title_block(sh: SheetLayout, last: int) -> int:
    sh.label(1, 1, HEADING, Looks.HEADING)
    for row, col, label, key, name in TITLE_BLOCK:
        sh.label(row, col, label, Looks.TB_LABEL)
        to = last if col == 4 or key == "title" else 3
        sh.text(row, col + 1, ("info", key), Looks.TB_VALUE + (" wrap" if key == "title"
                                                               else ""), name=name)
        for c in range(col + 2, to + 1):
            sh.blank(row, c, Looks.TB_VALUE)
        sh.merge(row, col + 1, row, to)
    sh.label(5, 4, "Sheet", Looks.TB_LABEL)
    sh.label(5, 5, "Summary", Looks.TB_VALUE)
    for c in range(6, last + 1):
        sh.blank(5, c, Looks.TB_VALUE)
    sh.merge(5, 5, 5, last)
    return 7


def shown(sh: SheetLayout, row: int, col: int, name: str, q_unit: str, fmt: str,
           us: bool, *, style: str = "box", comment: str = "") -> str:
    """The value of ``name`` in the display unit (US or SI); return the unit shown."""
    if not us:
        sh.formula(row, col, f"={name}", fmt=fmt, style=style, comment=comment)
        return q_unit
    unit, factor = us_display(q_unit, name)
    if factor == 1.0:
        sh.formula(row, col, f"={name}", fmt=fmt, style=style, comment=comment)
    else:
        sh.formula(row, col, f"={name}/{factor!r}", fmt=unit_format(unit), style=style,
                   comment=comment)
    return unit


def _inputs(sh: SheetLayout, row: int, options: PlanOptions, cols: SummaryColumns) -> int:
    sh.section(row, "Design inputs", cols.last)
    row += 1
    head = ["Input", "Symbol", "Value", "Unit"]
    head += ["Value (SI)", "SI unit"] if cols.us else []
    sh.header(row, head + ["Where it comes from"])
    for c in range(cols.source + 1, cols.last + 1):
        sh.blank(row, c, Looks.HEAD)
    sh.merge(row, cols.source, row, cols.last)
    row += 1
    for q in design_inputs():
        if q.section == "supply":   # the Supply sheet lists them with the specification
            continue
        if q.kind == "choice":
            sh.label(row, cols.label, q.label, "box")
            sh.label(row, cols.symbol, q.symbol, "box")
            sh.value(row, cols.value, source=("input", q.name), style="box")
            sh.blank(row, cols.unit, "box")
            for c in (cols.input_si, cols.input_si_unit):
                if c:
                    sh.blank(row, c, "box")
            sh.label(row, cols.source, "Chosen in the project file (laid out for it: rebuild "
                                       "to change it)", "box wrap")
        elif q.name in options.inputs or (q.name == "modal_mass" and options.floors):
            sh.label(row, cols.label, q.label, "box wrap")
            sh.label(row, cols.symbol, q.symbol, "box")
            unit = shown(sh, row, cols.value, q.cell_name, q.unit, q.fmt, cols.us,
                          comment=input_comment(q))
            sh.label(row, cols.unit, unit, "box")
            if cols.us:
                sh.formula(row, cols.input_si, f"={q.cell_name}", fmt=q.fmt,
                           style="box secondary")
                sh.label(row, cols.input_si_unit, q.unit, "box secondary")
            if q.name in options.inputs:
                sh.text(row, cols.source, ("note", q.name), "box wrap")
            else:
                sh.label(row, cols.source, "Floor table on the Inputs sheet", "box wrap")
        else:
            continue
        for c in range(cols.source + 1, cols.last + 1):
            sh.blank(row, c, "box")
        sh.merge(row, cols.source, row, cols.last)
        row += 1
    if "supply" in options.parts:
        sh.label(row, cols.label, "Supply specification ([supply]): its inputs are on the "
                                  "Inputs sheet and beside its results on the Supply sheet",
                 "box wrap italic")
        for c in range(cols.label + 1, cols.last + 1):
            sh.blank(row, c, "box")
        sh.merge(row, cols.label, row, cols.last)
        row += 1
    return row + 1


def _results(sh: SheetLayout, row: int, cols: SummaryColumns, options: PlanOptions) -> int:
    sh.section(row, "Results and design checks", cols.last)
    row += 1
    head = ["Result", "Symbol", "Value", "Unit", "Limit", "Verdict"]
    head += ["Value (SI)", "SI unit"] if cols.us else []
    sh.header(row, head + ["Rule"])
    row += 1
    first = row
    for name in key_results(options):
        q: Quantity = quantity(name)
        sh.label(row, cols.label, q.label, "box wrap")
        sh.label(row, cols.symbol, q.symbol, "box")
        unit = shown(sh, row, cols.value, name, q.unit, q.fmt, cols.us,
                      comment=result_comment(q, "Calculation sheet"))
        sh.label(row, cols.unit, unit, "box")
        if cols.us:
            sh.formula(row, cols.result_si, f"={name}", fmt=q.fmt, style="box secondary")
            sh.label(row, cols.result_si_unit, q.unit, "box secondary")
        rule = _rule_of(name, options.parts)
        if rule is None:
            for c in (cols.limit, cols.verdict, cols.rule):
                sh.blank(row, c, "box")
        else:
            shown(sh, row, cols.limit, rule.limit, rule.unit, q.fmt, cols.us)
            sh.formula(row, cols.verdict, f"={check_name(rule.name)}", style="bold box")
            sh.label(row, cols.rule, rule.rule, "box wrap")
            if rule.lower:
                row += 1
                sh.label(row, cols.label, "   lower limit", "box italic")
                for c in (cols.symbol, cols.value, cols.unit, cols.verdict, cols.rule):
                    sh.blank(row, c, "box")
                for c in (cols.result_si, cols.result_si_unit):
                    if c:
                        sh.blank(row, c, "box")
                shown(sh, row, cols.limit, rule.lower, rule.unit, q.fmt, cols.us)
        row += 1
    col = ref(first, cols.verdict)[:-len(str(first))]
    sh.verdicts(f"{col}{first}:{col}{row - 1}")
    return row + 1


def summary_sheet(options: PlanOptions) -> SheetLayout:
    """The Summary sheet for ``options``."""
    sh = SheetLayout("Summary")
    cols = SummaryColumns(options.us)
    if options.template:
        sh.label(1, 1, HEADING, Looks.TITLE)
        row = 3
    else:
        row = _title_block(sh, cols.last)
    for label, key in (("Structure", "structure"), ("Client", "client")):
        sh.label(row, 1, label, Looks.BOLD)
        sh.text(row, 2, ("info", key), Looks.WRAP, name=f"project_{key}")
        sh.merge(row, 2, row, cols.last)
        row += 1
    row = _inputs(sh, row + 1, options, cols)
    if options.parts:
        # the design envelope: the inputs on the first page, results and verdicts on a second
        sh.plan.row_breaks.append(row - 1)
    row = _results(sh, row, cols, options)
    sh.section(row, "Verdicts", cols.last)
    row += 1
    start = row
    rows = [("All design checks", "=all_design_checks")]
    rows += [(label, f"={name}") for name, label in VERDICT_LABELS.items()]
    if options.simulation is not None:
        rows += [(_SHORT[name], f"={name}") for name, *_ in NONLINEAR_CHECKS]
    flags = engine_flags(options)
    if len(flags) <= 3:
        rows += [(f"Engine value of the {what} current (inputs unchanged)", f"={flag}_ok")
                 for flag, what in flags]
    else:       # one row for them all (each has its own on the Checks sheet)
        every = ",".join(f'{flag}_ok="OK"' for flag, _ in flags)
        rows.append((f"Every engine value current (inputs unchanged; {len(flags)} flags on the "
                     "Checks sheet)", f'=IF(AND({every}),"OK","NOT OK")'))
    for label, formula in rows:
        sh.label(row, 1, label, "bold box")
        for c in range(2, cols.verdict):
            sh.blank(row, c, "box")
        sh.merge(row, 1, row, cols.verdict - 1)
        sh.formula(row, cols.verdict, formula, style="bold box")
        row += 1
    col = ref(start, cols.verdict)[:-len(str(start))]
    sh.verdicts(f"{col}{start}:{col}{row - 1}")
    row += 1
    sh.label(row, 1, "Source file", Looks.BOLD)
    sh.text(row, 2, ("record", "source_and_case"))
    row += 2
    sh.label(row, 1, "CAUTION", Looks.CAUTION)
    row += 1
    for text in CAUTIONS[:5]:
        sh.label(row, 1, text, Looks.WRAP)
        sh.merge(row, 1, row, cols.last)
        row += 1
    sh.label(row, 1, "See the Cautions sheet.")
    sh.widths(cols.widths(wide=bool(options.parts)))
    sh.page(pages=0 if options.parts else 1)
    return sh
