# SPDX-License-Identifier: MIT
"""The Supply sheet: the damper specified for its manufacturer, every number traceable.

Behaviour tests of our own rules (common practice, no source): each value reads the named
cell of its quantity, its last column names the Calculation step that computes it, the
cautions stand beside the tables, direction 2's table only with a second direction; and the
values a built workbook caches equal the engine's (functions.design.design_damper).
"""
from __future__ import annotations

import pathlib

import openpyxl
import pytest

from functions.design import design_damper
from functions.chain import parts_of
from functions.quantities import SUPPLY_RESULTS, SUPPLY_RESULTS_2, quantity
from functions.worksheet import formula_names
from workbook_builder.build import write_workbook
from workbook_builder.plan import PlanOptions
from workbook_builder.plan.calculation import step_numbers
from workbook_builder.plan.reference import CAUTIONS
from workbook_builder.plan.supply import SUPPLY_TABLES, supply_sheet
from workbook_builder.project import parse_project

PARTS = ("extreme", "supply")
BOTH = ("band", "extreme", "direction_2", "supply", "dashpots_at_extreme")


def _options(parts, units="SI"):
    inputs = ("frequency", "modal_mass", "structural_damping", "acceleration",
              "acceleration_limit", "extreme_acceleration", "clearance", "velocity_exponent",
              "dashpot_units", "hanger_count", "hanger_safety_factor",
              "hanger_axial_stiffness", "block_density", "block_length_1", "block_length_2",
              "available_height", "buffer_stiffness")
    if "band" in parts:
        inputs += ("band_lower", "band_upper")
    if "direction_2" in parts:
        inputs += ("frequency_2", "modal_mass_2", "structural_damping_2", "acceleration_2",
                   "acceleration_limit_2", "extreme_acceleration_2")
    return PlanOptions(units=units, inputs=inputs, parts=parts)


def _rows(sheet):
    """(label, value cell, step text) of every quantity row."""
    out = []
    for ref, cell in sheet.cells.items():
        if ref.startswith("A") and cell.kind == "label":
            row = ref[1:]
            value = sheet.cells.get(f"C{row}")
            step = [c for r, c in sheet.cells.items() if r[1:] == row and c.kind == "label"
                    and str(c.content).startswith(("Calculation ", "Inputs"))]
            if value is not None and step:
                out.append((cell.content, value, step[0].content))
    return out


@pytest.mark.parametrize("parts", [PARTS, BOTH])
@pytest.mark.parametrize("units", ["SI", "US"])
def test_every_value_reads_its_quantity_and_names_its_step(parts, units):
    options = _options(parts, units)
    sheet = supply_sheet(options).plan
    numbers = step_numbers(options)
    rows = _rows(sheet)
    assert len(rows) > 40
    for label, value, step in rows:
        if value.kind == "value":                           # a choice, shown as typed
            assert value.source == ("input", "dashpot_level")
            continue
        (name,) = formula_names(value.content)
        assert quantity(name).label == label
        assert step == (f"Calculation {numbers[name]}" if name in numbers else "Inputs")
    second = any("Direction 2" in str(c.content) for c in sheet.cells.values())
    assert second == ("direction_2" in parts)
    texts = {c.content for c in sheet.cells.values() if c.kind == "label"}
    assert set(CAUTIONS) <= texts


def test_tables_cover_every_result_of_the_part():
    listed = {n for _, groups in SUPPLY_TABLES for _, names in groups for n in names}
    numbers = step_numbers(_options(BOTH))
    for q in SUPPLY_RESULTS + SUPPLY_RESULTS_2:
        assert q.cell_name in listed and q.cell_name in numbers, q.name


PROJECT = {
    "mode": {"frequency": 0.19, "modal_mass": {"value": 24000, "unit": "t"},
             "structural_damping": 0.012},
    "wind": {"acceleration": 0.206, "acceleration_limit": 0.1275,
             "extreme_acceleration": 0.47},
    "damper": {"clearance": 1.6},
    "supply": {"velocity_exponent": 0.5, "dashpot_units": 4, "dashpot_level": "extreme",
               "hanger_count": 4, "hanger_safety_factor": 3.0,
               "hanger_axial_stiffness": {"value": 250, "unit": "MN"},
               "block_length_1": 4.5, "block_length_2": 4.0, "available_height": 6.0,
               "buffer_stiffness": {"value": 2000, "unit": "kN/m"}},
}


def test_built_workbook_caches_the_engines_values(tmp_path: pathlib.Path):
    project = parse_project(PROJECT, source="supply.toml")
    out = tmp_path / "supply.xlsx"
    write_workbook(project, out)
    book = openpyxl.load_workbook(out, data_only=True)
    formulas = openpyxl.load_workbook(out)["Supply"]
    sheet = book["Supply"]
    cells = design_damper(**project.design_kwargs()).cells
    seen = 0
    for row in range(1, sheet.max_row + 1):
        f = formulas.cell(row, 3).value
        if isinstance(f, str) and f.startswith("="):
            (name,) = formula_names(f)
            if name in cells:
                assert sheet.cell(row, 3).value == pytest.approx(cells[name], rel=1e-12), name
                seen += 1
    assert seen > 40
    assert cells["stage_count"] == 2
    assert "dashpots_at_extreme" in parts_of(project.design_kwargs())
