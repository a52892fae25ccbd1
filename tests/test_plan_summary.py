# SPDX-License-Identifier: MIT
"""The Summary sheet: title block, key results from the declarations, every verdict, cautions.

References: the declarations (functions.quantities.DESIGN_RESULTS, their ``summary`` mark),
the engine's check rules (functions.design.CHECK_RULES) and the firm-template names
(workbook_builder.xlsx.template). US display factors: 1 ft = 0.3048 m and 1 lb = 0.45359237
kg, exact (NIST SP 811 (2008), App. B); g_n = 9.80665 m/s^2, exact (3rd CGPM, 1901).
"""
from __future__ import annotations

import pytest

from functions.design import CHECK_RULES
from functions.quantities import DESIGN_RESULTS
from workbook_builder.plan import PlanOptions
from workbook_builder.plan.checks import NONLINEAR_CHECKS
from workbook_builder.plan.reference import CAUTIONS
from workbook_builder.plan.summary import HEADING, TITLE_BLOCK, key_results, summary_sheet
from workbook_builder.xlsx.template import TITLE_BLOCK_NAMES

from plan_workbooks import evaluator, plan_workbook

US = {"m": ("ft", 0.3048), "kg": ("kip", 453.59237), "m/s^2": ("milli-g", 9.80665e-3),
      "N/m": ("kip/ft", 4448.2216152605 / 0.3048),
      "N s/m": ("kip s/ft", 4448.2216152605 / 0.3048)}


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
    shown = _formulas(sheet, "B")
    for q in declared:
        cell = shown[f"={q.cell_name}"]
        r = cell.ref[1:]
        assert cell.fmt == q.fmt
        assert (_text(sheet, f"A{r}"), _text(sheet, f"C{r}")) == (q.label, q.unit)
    rows = [int(shown[f"={n}"].ref[1:]) for n in key_results()]
    assert rows == list(range(rows[0], rows[0] + len(rows)))


def test_us_units_add_exact_display_conversions():
    si = summary_sheet(PlanOptions()).plan
    assert not any(c.ref[0] in "DE" and c.kind == "formula" for c in si.cells.values())
    us = summary_sheet(PlanOptions(units="US")).plan
    values = {q.cell_name: 10.0 + i for i, q in enumerate(DESIGN_RESULTS)}
    ev = evaluator(plan_workbook([us], named=values))
    converted = 0
    for q in DESIGN_RESULTS:
        if not q.summary:
            continue
        r = _formulas(us, "B")[f"={q.cell_name}"].ref[1:]
        if q.unit not in US:
            assert f"D{r}" not in us.cells, q.name
            continue
        unit, factor = US[q.unit]
        assert _text(us, f"E{r}") == unit
        assert ev.evaluate(f"=D{r}", "Summary") == pytest.approx(values[q.cell_name] / factor,
                                                                 rel=1e-15)
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
    first = next(int(c.ref[1:]) for c in sheet.cells.values()
                 if c.content == f"=check_{CHECK_RULES[0].name}")
    expected = ([f"check_{r.name}" for r in CHECK_RULES]
                + ["all_design_checks", "all_cross_checks", "fixed_point_converged"] + extra)
    got = [sheet.cells[f"B{first + i}"].content for i in range(len(expected))]
    assert got == [f"={n}" for n in expected]
    assert f"B{first + len(expected)}" not in sheet.cells
    assert sheet.verdict_ranges == [f"B{first}:B{first + len(expected) - 1}"]
    labels = [sheet.cells[f"A{first + i}"].content for i in range(len(CHECK_RULES))]
    assert labels == [r.label for r in CHECK_RULES]


def test_title_block_carries_the_template_names_unless_a_template_holds_it():
    own = summary_sheet(PlanOptions()).plan
    names = {c.name: c for c in own.cells.values() if c.name}
    assert {name for *_, name in TITLE_BLOCK} == {n for n in names if n.startswith("TB_")}
    # the names a firm's template marks its title block with: a built workbook can serve as one
    assert {n for n in names if n.startswith("TB_")} == set(TITLE_BLOCK_NAMES.values())
    for row, col, label, key, name in TITLE_BLOCK:
        cell = names[name]
        assert (cell.kind, cell.source) == ("text", ("info", key))
        assert _text(own, f"{'ABCD'[col - 1]}{row}") == label
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
