# SPDX-License-Identifier: MIT
"""The reference sheets: Names lists every defined name of the plan, Cautions, Record.

No reference values: the Names sheet is checked against the names the other sheets define
(workbook_builder.plan.model.Plan), the Record rows against their declaration.
"""
from __future__ import annotations

import pytest

from functions.chain import PARTS
from functions.quantities import DESIGN_INPUTS, design_inputs, design_results
from workbook_builder.plan import PlanOptions, make_plan
from workbook_builder.plan.model import Cell, Plan, SheetPlan, refreshed
from workbook_builder.plan.reference import (CAUTIONS, RECORD_ROWS, cautions_sheet,
                                             last_run_name, last_run_unit_name,
                                             recorded_inputs, recorded_results,
                                             names_sheet, record_sheet)

NUMERIC = tuple(q.name for q in DESIGN_INPUTS if q.kind != "choice" and q.name != "modal_mass")
FULL = PlanOptions(units="US", tuning_method="h2", mass_ratio_mode="chosen_damper_mass",
                   inputs=NUMERIC, floors=3, simulation=("random", 30, 12))


def _listed(sheet):
    """Name -> (refers to, quantity, unit, value cell) of the Names sheet's rows."""
    out = {}
    row = 5
    while f"A{row}" in sheet.cells:
        out[sheet.cells[f"A{row}"].content] = tuple(
            sheet.cells[f"{c}{row}"] for c in "BCDE")
        row += 1
    return out


@pytest.mark.parametrize("options", [PlanOptions(), FULL], ids=["plain", "full"])
def test_names_sheet_lists_every_name_of_the_plan_once(options):
    plan = make_plan(options)
    names = plan.sheet("Names")
    assert not any(c.name for c in names.cells.values())    # the list defines no name itself
    listed = _listed(names)
    expected = dict(plan.names()) | dict(plan.range_names())
    assert set(listed) == set(expected) and len(listed) == len(expected)
    assert list(listed) == sorted(listed)
    for name, (refers, label, unit, value) in listed.items():
        sheet, where = expected[name]
        assert refers.content == f"{sheet}!{where}", name
        if name in plan.range_names():
            assert (label.content, value.kind, value.content) == ("range of values", "label",
                                                                  None)
            continue
        _, cell = plan.named(name)
        assert label.content == (cell.label or "helper cell") and unit.content == cell.unit
        if cell.kind == "text":            # user text: never read through a formula
            assert value.kind == "label" and value.content is None, name
        else:
            assert (value.kind, value.content) == ("formula", f"={name}"), name


def test_names_sheet_of_a_hand_made_plan():
    plan = Plan(PlanOptions(), [SheetPlan("S", cells={
        "A1": Cell("A1", "formula", "=2", name="zeta", unit="-", label="Zeta"),
        "B1": Cell("B1", "text", source=("info", "notes"), name="alpha"),
        "C1": Cell("C1", "value", 3.0, name="beta")}, ranges={"gamma": "A5:B6"})])
    listed = _listed(names_sheet(plan).plan)
    assert list(listed) == ["alpha", "beta", "gamma", "zeta"]
    assert [c.content for c in listed["zeta"]] == ["S!A1", "Zeta", "-", "=zeta"]
    assert [c.content for c in listed["beta"]] == ["S!C1", "helper cell", "", "=beta"]
    assert [c.content for c in listed["alpha"]][:2] == ["S!B1", "helper cell"]
    assert listed["alpha"][3].content is None and listed["gamma"][3].content is None


def test_record_rows_are_named_texts_from_the_record():
    sheet = record_sheet(PlanOptions(inputs=("frequency", "clearance"))).plan
    for row, (label, key, name) in enumerate(RECORD_ROWS, start=3):
        assert sheet.cells[f"A{row}"].content == label
        value = sheet.cells[f"B{row}"]
        assert (value.kind, value.source, value.name) == ("text", ("record", key), name)
    keys = [key for _, key, _ in RECORD_ROWS]
    assert {"program", "engine", "source", "sha256", "rebuild"} <= set(keys)
    assert len(set(keys)) == len(keys)


def test_cautions_are_numbered_in_order():
    sheet = cautions_sheet().plan
    for i, text in enumerate(CAUTIONS, start=1):
        assert sheet.cells[f"A{i + 2}"].content == f"{i}."
        assert sheet.cells[f"B{i + 2}"].content == text
    words = " ".join(CAUTIONS)
    for word in ("preliminary design aid", "licensed", "local codes", "wind-tunnel",
                 "manufacturer"):
        assert word in words


@pytest.mark.parametrize("floors", [0, 3])
def test_record_keeps_the_values_of_the_last_engine_run(floors):
    """Every input with a row: its value as typed (an engine value recalc rewrites) and its unit
    (a constant); every key result, and the floor table's modal mass; all through names (our
    own rule: recalc reports the user's edits against these)."""
    inputs = ("frequency", "structural_damping", "acceleration", "acceleration_limit",
              "clearance") + (() if floors else ("modal_mass",))
    options = PlanOptions(inputs=inputs, floors=floors)
    cells = {c.name: c for c in record_sheet(options).plan.cells.values() if c.name}
    for q in recorded_inputs(options):
        value, unit = cells[last_run_name(q.cell_name)], cells[last_run_unit_name(q.cell_name)]
        assert (value.kind, value.source) == ("engine", ("typed", q.name)) and refreshed(value)
        assert (unit.kind, unit.source) == ("value", ("unit", q.name)) and not refreshed(unit)
    assert [q.name for q in recorded_inputs(options)] == [
        q.name for q in design_inputs() if q.name in inputs]
    results = recorded_results(options)
    assert ("modal_mass" in [q.name for q in results]) == bool(floors)
    for q in results:
        cell = cells[last_run_name(q.cell_name)]
        assert cell.source == ("cell", q.cell_name) and refreshed(cell)
    assert {q.cell_name for q in design_results() if q.summary} <= {q.cell_name for q in results}


def test_the_record_keeps_the_key_results_of_the_optional_parts():
    """recalc reports the key results of the design envelope that changed (our own rule)."""
    names = [q.cell_name for q in recorded_results(PlanOptions(parts=PARTS))]
    core = [q.cell_name for q in recorded_results(PlanOptions())]
    assert names[:len(core)] == core
    assert {"band_worst_acceleration", "extreme_stroke", "buffer_energy", "comfort_limit_mp",
            "combined_stroke", "band_worst_acceleration_2"} <= set(names[len(core):])
    assert "extreme_stroke" not in [q.cell_name for q in recorded_results(
        PlanOptions(parts=("band",)))]
