# SPDX-License-Identifier: MIT
"""The Summary sheet: title block, inputs, key results beside their limits, verdicts, cautions.

References: the declarations (functions.quantities.DESIGN_RESULTS, their ``summary`` mark),
the engine's check rules (functions.design.CHECK_RULES) and the firm-template names
(workbook_builder.xlsx.template). US display factors: 1 ft = 0.3048 m and 1 lb = 0.45359237
kg, exact (NIST SP 811 (2008), App. B); g_n = 9.80665 m/s^2, exact (3rd CGPM, 1901).
"""
from __future__ import annotations

import pytest

from functions.design import CHECK_RULES
from functions.quantities import DESIGN_INPUTS, DESIGN_RESULTS, quantity
from functions.worksheet import formula_names
from workbook_builder.plan import PlanOptions
from workbook_builder.plan.checks import NONLINEAR_CHECKS
from workbook_builder.plan.inputs import input_comment
from workbook_builder.plan.reference import CAUTIONS
from workbook_builder.plan.summary import (HEADING, TITLE_BLOCK, SummaryColumns, key_results,
                                           summary_sheet)
from workbook_builder.xlsx.template import TITLE_BLOCK_NAMES

from plan_workbooks import evaluator, plan_workbook

US = {"m": ("ft", 0.3048), "kg": ("kip (weight)", 453.59237),
      "m/s^2": ("milli-g", 9.80665e-3), "N/m": ("kip/ft", 4448.2216152605 / 0.3048),
      "N s/m": ("kip s/ft", 4448.2216152605 / 0.3048), "N": ("kip", 4448.2216152605),
      "kg/m^3": ("lb/ft^3", 0.45359237 / 0.3048 ** 3)}
#: Inputs of a workbook with a row for every numeric design input.
ALL_INPUTS = tuple(q.name for q in DESIGN_INPUTS if q.kind != "choice")
#: Those the Summary shows (the supply specification's are on the Supply sheet).
SHOWN_INPUTS = tuple(n for n in ALL_INPUTS
                     if next(q for q in DESIGN_INPUTS if q.name == n).section != "supply")


def _col(n):
    return "ABCDEFGHI"[n - 1]


def _formulas(sheet, col):
    return {c.content: c for c in sheet.cells.values() if c.ref.startswith(col)
            and c.kind == "formula"}


def _text(sheet, ref):
    cell = sheet.cells.get(ref)
    return None if cell is None else cell.content


def test_key_results_are_the_declared_summary_results_in_checking_order():
    declared = [q for q in DESIGN_RESULTS if q.summary]
    assert key_results() == [q.cell_name for q in declared]
    # the trade's headline figures are among them, the helpers are not
    assert {"damper_mass", "pendulum_length", "stroke", "swing_angle_deg",
            "effective_damping"} <= set(key_results())
    assert not {"small_angle_length", "stroke_ratio", "var_n"} & set(key_results())
    sheet = summary_sheet(PlanOptions()).plan
    shown = _formulas(sheet, "C")
    for q in declared:
        cell = shown[f"={q.cell_name}"]
        r = cell.ref[1:]
        assert cell.fmt == q.fmt
        assert (_text(sheet, f"A{r}"), _text(sheet, f"D{r}")) == (q.label, q.unit)
        assert cell.comment.startswith((q.description or q.label).rstrip("."))
    rows = [int(shown[f"={n}"].ref[1:]) for n in key_results()]
    assert rows == sorted(rows) and rows[-1] - rows[0] <= len(rows)   # + the lower-end row


def test_each_checked_result_stands_beside_its_limit_and_verdict():
    sheet = summary_sheet(PlanOptions()).plan
    cols = SummaryColumns(us=False)
    shown = _formulas(sheet, _col(cols.value))
    for rule in CHECK_RULES:
        [name] = [n for n in key_results() if n in rule.value_formula]
        r = int(shown[f"={name}"].ref[1:])
        assert _text(sheet, f"{_col(cols.limit)}{r}") == f"={rule.limit}"
        assert _text(sheet, f"{_col(cols.verdict)}{r}") == f"=check_{rule.name}"
        assert _text(sheet, f"{_col(cols.rule)}{r}") == rule.rule
        if rule.lower:
            assert _text(sheet, f"{_col(cols.limit)}{r + 1}") == f"={rule.lower}"


@pytest.mark.parametrize("units", ["SI", "US"])
def test_design_inputs_are_shown_with_units_and_where_they_come_from(units):
    options = PlanOptions(units=units, inputs=ALL_INPUTS)
    sheet = summary_sheet(options).plan
    cols = SummaryColumns(us=options.us)
    notes = {c.source[1]: c for c in sheet.cells.values() if c.source[:1] == ("note",)}
    assert set(notes) == set(SHOWN_INPUTS)
    for name, note in notes.items():
        r = note.ref[1:]
        assert note.ref == f"{_col(cols.source)}{r}"
        q = next(q for q in DESIGN_INPUTS if q.name == name)
        assert _text(sheet, f"A{r}") == q.label
        value = sheet.cells[f"{_col(cols.value)}{r}"]
        assert value.content.startswith(f"={q.cell_name}") and value.comment == input_comment(q)
        unit = US.get(q.unit, (q.unit, 1.0))[0] if options.us else q.unit
        if options.us and q.cell_name == "gravity":
            unit = "ft/s^2"
        assert _text(sheet, f"{_col(cols.unit)}{r}") == unit, name


def test_us_values_come_first_with_exact_factors_and_si_beside():
    si = summary_sheet(PlanOptions()).plan
    assert not any(c.ref[0] in "HI" for c in si.cells.values())
    us = summary_sheet(PlanOptions(units="US")).plan
    cols = SummaryColumns(us=True)
    values = {q.cell_name: 10.0 + i for i, q in enumerate(DESIGN_RESULTS)}
    values.update({q.cell_name: 1.0 + i for i, q in enumerate(DESIGN_INPUTS)})
    ev = evaluator(plan_workbook([us], named=values))
    si_cells = _formulas(us, _col(cols.result_si))
    converted = 0
    for q in DESIGN_RESULTS:
        if not q.summary:
            continue
        r = si_cells[f"={q.cell_name}"].ref[1:]
        assert _text(us, f"{_col(cols.result_si_unit)}{r}") == q.unit
        got = ev.evaluate(f"={_col(cols.value)}{r}", "Summary")
        if q.unit not in US:
            assert _text(us, f"{_col(cols.unit)}{r}") == q.unit
            assert got == values[q.cell_name]
            continue
        unit, factor = US[q.unit]
        assert _text(us, f"{_col(cols.unit)}{r}") == unit
        assert got == pytest.approx(values[q.cell_name] / factor, rel=1e-15)
        converted += 1
    assert converted >= 6


@pytest.mark.parametrize("options, extra", [
    (PlanOptions(), ["engine_flag_mass_ratio_ok", "engine_flag_tuning_ok"]),
    (PlanOptions(tuning_method="den_hartog", mass_ratio_mode="chosen_mass_ratio"), []),
    (PlanOptions(tuning_method="hinf", simulation=("harmonic", 20, 10)),
     [n for n, *_ in NONLINEAR_CHECKS] + ["engine_flag_mass_ratio_ok", "engine_flag_tuning_ok",
                                          "engine_flag_simulation_ok"]),
])
def test_every_verdict_is_repeated_and_coloured(options, extra):
    sheet = summary_sheet(options).plan
    v = _col(SummaryColumns(us=options.us).verdict)
    design = [sheet.cells[f"{v}{r}"] for r in range(1, 200) if f"{v}{r}" in sheet.cells
              and str(sheet.cells[f"{v}{r}"].content).startswith("=check_")]
    # each design check once, on the row of the result it checks (results in checking order)
    rules = {f"=check_{r.name}": r for r in CHECK_RULES}
    assert sorted(c.content for c in design) == sorted(rules)
    for c in design:
        rule = rules[c.content]
        assert sheet.cells[f"A{c.ref[1:]}"].content == quantity(
            formula_names(rule.value_formula)[0]).label
    first = next(int(c.ref[1:]) for c in sheet.cells.values()
                 if c.content == "=all_design_checks")
    expected = ["all_design_checks", "all_cross_checks", "fixed_point_converged"] + extra
    got = [sheet.cells[f"{v}{first + i}"].content for i in range(len(expected))]
    assert got == [f"={n}" for n in expected]
    assert f"{v}{first + len(expected)}" not in sheet.cells
    results = int(design[0].ref[1:])
    assert sheet.verdict_ranges[-1] == f"{v}{first}:{v}{first + len(expected) - 1}"
    assert any(rng.startswith(f"{v}") and int(rng.split(":")[0][1:]) <= results
               <= int(rng.split(":")[1][1:]) for rng in sheet.verdict_ranges[:-1])


def test_summary_prints_on_one_page():
    assert summary_sheet(PlanOptions()).plan.pages == 1


def test_title_block_carries_the_template_names_unless_a_template_holds_it():
    own = summary_sheet(PlanOptions()).plan
    names = {c.name: c for c in own.cells.values() if c.name}
    assert {name for *_, name in TITLE_BLOCK} == {n for n in names if n.startswith("TB_")}
    # the names a firm's template marks its title block with: a built workbook can serve as one
    assert {n for n in names if n.startswith("TB_")} == set(TITLE_BLOCK_NAMES.values())
    for row, col, label, key, name in TITLE_BLOCK:
        cell = names[name]
        assert (cell.kind, cell.source) == ("text", ("info", key))
        assert _text(own, f"{'ABCDEFG'[col - 1]}{row}") == label
    assert _text(own, "A1") == HEADING
    firm = summary_sheet(PlanOptions(template=True)).plan
    assert not any(c.name.startswith("TB_") for c in firm.cells.values())
    assert _text(firm, "A1") == HEADING
    for sheet in (own, firm):
        texts = {c.name: c.source for c in sheet.cells.values() if c.kind == "text" and c.name}
        assert texts["project_structure"] == ("info", "structure")
        assert texts["project_client"] == ("info", "client")


def test_cautions_and_the_source_are_shown():
    sheet = summary_sheet(PlanOptions()).plan
    contents = [c.content for c in sheet.cells.values()]
    for text in CAUTIONS[:5]:
        assert text in contents
    assert "See the Cautions sheet." in contents
    sources = [c.source for c in sheet.cells.values() if c.source]
    assert ("record", "source_and_case") in sources and ("input", "tuning_method") in sources
