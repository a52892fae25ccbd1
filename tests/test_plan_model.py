# SPDX-License-Identifier: MIT
"""The plan as data: cell kinds, the plan's name look-ups, which engine values are refreshed.

No reference values: these are the plan's own rules (workbook_builder/plan/model.py), checked
on hand-made plans and on plans the layout makes.
"""
from __future__ import annotations

import dataclasses

import pytest

from functions.quantities import DESIGN_INPUTS
from workbook_builder.plan import PlanOptions, make_plan
from workbook_builder.plan.model import (CELL_KINDS, REFRESHED_SOURCES, Cell, Plan, SheetPlan,
                                         from_simulation, refreshed)

NUMERIC = tuple(q.name for q in DESIGN_INPUTS if q.kind != "choice"
                and q.name not in ("mass_ratio", "damper_mass"))


def test_cell_kinds_are_checked():
    with pytest.raises(ValueError, match="kind='colour' must be one of"):
        Cell("A1", "colour")
    with pytest.raises(ValueError, match="a formula cell needs a formula"):
        Cell("A1", "formula", "1+1")


def test_every_declared_kind_makes_a_frozen_cell():
    for kind in CELL_KINDS:
        cell = Cell("B2", kind, "=1" if kind in ("formula", "check") else 1.0)
        assert cell.kind == kind
        with pytest.raises(dataclasses.FrozenInstanceError):
            cell.kind = "label"
    with pytest.raises(ValueError, match=r"C3: a check cell needs a formula, not 'OK'"):
        Cell("C3", "check", "OK")


def _hand_made() -> Plan:
    first = SheetPlan("First", cells={
        "A1": Cell("A1", "label", "Title"),
        "B2": Cell("B2", "input", source=("input", "frequency"), name="freq_entered"),
        "C2": Cell("C2", "formula", "=B2*2", name="twice")})
    second = SheetPlan("Second", cells={"D4": Cell("D4", "engine", source=("cell", "x"),
                                                   name="x")},
                       ranges={"table_x": "A5:C9"})
    return Plan(PlanOptions(), [first, second])


def test_plan_looks_up_names_ranges_and_sheets():
    plan = _hand_made()
    assert plan.names() == {"freq_entered": ("First", "B2"), "twice": ("First", "C2"),
                            "x": ("Second", "D4")}
    assert plan.range_names() == {"table_x": ("Second", "A5:C9")}
    sheet, cell = plan.named("twice")
    assert sheet == "First" and cell.content == "=B2*2"
    assert plan.sheet("Second").ranges == {"table_x": "A5:C9"}
    assert [(s, c.ref) for s, c in plan.cells()] == [("First", "A1"), ("First", "B2"),
                                                     ("First", "C2"), ("Second", "D4")]
    with pytest.raises(KeyError, match="nowhere"):
        plan.named("nowhere")
    with pytest.raises(KeyError, match="Third"):
        plan.sheet("Third")
    with pytest.raises(KeyError):
        plan.named("table_x")            # a range name is not a cell name


@pytest.mark.parametrize("cell, expected", [
    (Cell("A1", "engine", source=("cell", "tuning_ratio")), True),
    (Cell("A1", "engine", source=("snapshot", "design", "mass_ratio")), True),
    (Cell("A1", "engine", source=("chart", "period", 3, 1)), True),
    (Cell("A1", "engine", source=("typed", "frequency")), True),
    (Cell("A1", "engine", source=("snapshot", "simulation", "acceleration")), True),
    (Cell("A1", "engine", source=("sim", "force")), True),
    (Cell("A1", "engine", source=("sim_response", "nonlinear", "stroke_peak")), True),
    (Cell("A1", "engine", source=("sim_table", "time", 0, 1)), True),
    (Cell("A1", "engine"), False),
    (Cell("A1", "input", source=("input", "frequency")), False),
    (Cell("A1", "value", source=("cell", "tuning_ratio")), False),
    (Cell("A1", "formula", "=tuning_ratio"), False),
])
def test_refreshed_means_an_engine_value_recalculation_recomputes(cell, expected):
    assert refreshed(cell) is expected


def test_refreshed_cells_of_a_plan_are_every_engine_value():
    """With a simulation and numerical optima: every engine value is refreshed by recalc (the
    design chain's, their snapshots, the chart tables, the simulation's and the Record sheet's
    values of the last engine run), and each is found through a defined name or a named
    range (our own rule: recalc never locates a cell by its position alone)."""
    options = PlanOptions(tuning_method="hinf", mass_ratio_mode="required", inputs=NUMERIC,
                          simulation=("random", 40, 12))
    plan = make_plan(options)
    engine = [(s, c) for s, c in plan.cells() if c.kind == "engine"]
    assert {s for s, c in engine if refreshed(c)} == {"Calculation", "Checks", "Charts",
                                                      "Nonlinear", "Record"}
    ranges = plan.range_names().values()
    for sheet, cell in engine:
        assert refreshed(cell) and cell.source[0] in REFRESHED_SOURCES, (sheet, cell.ref)
        assert cell.name or any(rs == sheet for rs, _ in ranges), (sheet, cell.ref)


@pytest.mark.parametrize("cell, expected", [
    (Cell("A1", "engine", source=("sim", "force")), True),
    (Cell("A1", "engine", source=("sim_response", "nonlinear", "stroke_peak")), True),
    (Cell("A1", "engine", source=("sim_table", "time", 0, 1)), True),
    (Cell("A1", "engine", source=("snapshot", "simulation", "acceleration")), True),
    (Cell("A1", "engine", source=("snapshot", "design", "mass_ratio")), False),
    (Cell("A1", "engine", source=("cell", "tuning_ratio")), False),
    (Cell("A1", "engine"), False),
])
def test_from_simulation_means_a_value_of_the_time_domain_check(cell, expected):
    """What recalc may keep when the simulation's inputs did not change (our own rule)."""
    assert from_simulation(cell) is expected
