# SPDX-License-Identifier: MIT
"""Values of sourced cells: every cell of every layout gets one, from the project or engine.

Real projects (invented data) are run through the engine (workbook_builder.compute) for every
tuning method and mass-ratio mode, each other layout option (units, floor table, template,
random or harmonic simulation) turning up several times. Unit factors: 1 t = 1000 kg (SI
Brochure), 1 % = 0.01, g_n = 9.80665 m/s^2 exact (3rd CGPM, 1901), 1 ft = 0.3048 m and
1 kip (as a mass) = 453.59237 kg exact (NIST SP 811 (2008), App. B).
"""
from __future__ import annotations

import dataclasses
import math

import pytest

from functions.chain import MASS_RATIO_MODES
from functions.damper import OPTIMAL_TUNING_METHODS
from workbook_builder.compute import run_design, run_simulation
from workbook_builder.plan import make_plan, options_for
from workbook_builder.plan.charts import chart_tables
from workbook_builder.plan.checks import NOT_DEFINED
from workbook_builder.plan.summary import HEADING
from workbook_builder.plan.values import Sources, plan_values, source_value
from workbook_builder.project import parse_project

PAIRS = [(method, mode) for method in OPTIMAL_TUNING_METHODS for mode in MASS_RATIO_MODES]
#: (units, floor table, template, simulation load) for the i-th pair: every value of every
#: option turns up, simulations (0.1 s each) on four of them.
SIMULATED = {2: "random", 9: "harmonic", 13: "random", 20: "harmonic"}


def _layout(i):
    return ("US" if i % 2 else "SI", i % 3 == 1, i % 4 == 2, SIMULATED.get(i))


def project_data(method="h2", mode="required", units="SI", floors=False, simulation=None):
    """An invented project: 0.2 Hz mode of 20 000 t, 1 % damping, 30 to 15 milli-g."""
    us = units == "US"
    data = {
        "project": {"number": "V-7", "title": "Values test (invented)", "units": units,
                    "structure": "=Tower A", "notes": "invented"},
        "mode": {"frequency": 0.2, "modal_mass": {"value": 20000, "unit": "t"},
                 "structural_damping": {"value": 1.0, "unit": "%"}},
        "wind": {"acceleration": {"value": 30, "unit": "milli-g"},
                 "acceleration_limit": {"value": 15, "unit": "milli-g"}},
        "damper": {"clearance": {"value": 2000, "unit": "mm"}, "tuning_method": method},
    }
    if mode == "chosen_mass_ratio":
        data["damper"]["mass_ratio"] = 0.015
    elif mode == "chosen_damper_mass":
        data["damper"]["damper_mass"] = {"value": 300, "unit": "t"}
    if floors:
        del data["mode"]["modal_mass"]
        data["mode"]["floors"] = {
            "heights": [100.0, 200.0, 300.0, 400.0] if us else [30.0, 60.0, 90.0, 120.0],
            "masses": [30000.0] * 4 if us else [5000.0] * 4, "building_height":
            400.0 if us else 120.0, "height_unit": "ft" if us else "m",
            "mass_unit": "kip" if us else "t",
            "structure_type": "core_and_peripheral_columns_or_braced"}
    if simulation:
        data["simulation"] = {"load": simulation, "duration": 60}
    return data


def _sources(data, case=""):
    project = parse_project(data, source="values.toml", case=case)
    result = run_design(project)
    run = run_simulation(project, result) if project.simulate else None
    return Sources(project, result, chart_tables(result), run)


def _drawable(value):
    return isinstance(value, str) or (isinstance(value, (int, float))
                                      and not isinstance(value, bool) and math.isfinite(value))


@pytest.mark.parametrize("i", range(len(PAIRS)), ids=lambda i: "-".join(
    (PAIRS[i][0], PAIRS[i][1], *map(str, _layout(i)))))
def test_every_sourced_cell_gets_a_value_a_cell_can_hold(i):
    method, mode = PAIRS[i]
    units, floors, template, load = _layout(i)
    s = _sources(project_data(method, mode, units, floors, load))
    plan = make_plan(options_for(s.project, s.simulation, template))
    values = plan_values(plan, s)
    sourced = {(sheet, c.ref) for sheet, c in plan.cells() if c.source}
    assert set(values) == sourced
    bad = {k: v for k, v in values.items() if not _drawable(v)}
    assert not bad


@pytest.fixture(scope="module")
def us_floors():
    s = _sources(project_data(units="US", floors=True, simulation="harmonic"), case="B-2")
    plan = make_plan(options_for(s.project, s.simulation))
    return s, plan, plan_values(plan, s)


@pytest.fixture(scope="module")
def si():
    s = _sources(project_data(mode="chosen_damper_mass"))
    plan = make_plan(options_for(s.project))
    return s, plan, plan_values(plan, s)


def _by_name(plan, values, name):
    sheet, ref = plan.names()[name]
    return values[(sheet, ref)]


def test_inputs_are_shown_as_entered_with_unit_factor_and_range(si):
    s, plan, values = si
    expected = {"acceleration_entered": 30, "acceleration_unit": "milli-g",
                "acceleration_factor": 9.80665e-3, "structural_damping_entered": 1.0,
                "structural_damping_unit": "%", "structural_damping_factor": 0.01,
                "chosen_damper_mass_entered": 300, "chosen_damper_mass_factor": 1000.0,
                "clearance_unit": "mm", "tuning_method": "h2"}
    for name, value in expected.items():
        assert _by_name(plan, values, name) == value, name
    ranges = {plan.named(f"{n}_entered")[1].ref[1:]: n for n in ("structural_damping",
                                                                 "clearance", "acceleration")}
    shown = {ranges[ref[1:]]: v for (sheet, ref), v in values.items()
             if sheet == "Inputs" and ref[0] == "H" and ref[1:] in ranges}
    # declared ranges (0, 0.2], (0, 100] m, (0, 10] m/s^2 in the entered units (10 m/s^2 =
    # 1019.716 milli-g, shown to 6 significant digits)
    assert shown == {"structural_damping": "(0, 20]", "clearance": "(0, 100000]",
                     "acceleration": "(0, 1019.72]"}
    notes = [v for (sheet, ref), v in values.items() if sheet == "Inputs" and ref[0] == "I"
             and isinstance(v, str) and v.endswith("(default)")]
    assert len(notes) == 6    # floor ordinate, max swing, max detuning, practical mass ratios, g


def test_texts_and_record_come_from_the_project(si, us_floors):
    s, plan, values = si
    assert _by_name(plan, values, "project_structure") == "=Tower A"     # stays text
    assert _by_name(plan, values, "TB_TITLE") == "Values test (invented)"
    assert _by_name(plan, values, "TB_DATE") == ""
    no_title = dataclasses.replace(s.project, info={**s.project.info, "title": ""})
    assert source_value(("info", "title"), dataclasses.replace(s, project=no_title)) == HEADING
    assert _by_name(plan, values, "record_case") == "-"
    assert _by_name(plan, values, "record_simulation") == "not requested"
    assert _by_name(plan, values, "record_sha256") == s.project.source_sha256
    s2, plan2, values2 = us_floors
    assert _by_name(plan2, values2, "record_case") == "B-2"
    assert source_value(("record", "source_and_case"), s2) == "values.toml (case B-2)"
    assert _by_name(plan2, values2, "record_simulation").startswith(
        "harmonic load, duration 60 s")


def test_floor_table_is_shown_as_entered(us_floors):
    s, plan, values = us_floors
    assert _by_name(plan, values, "floor_height_unit") == "ft"
    assert _by_name(plan, values, "floor_mass_unit") == "kip"
    assert _by_name(plan, values, "floor_height_factor") == 0.3048
    assert _by_name(plan, values, "floor_mass_factor") == pytest.approx(453.59237, rel=1e-15)
    assert _by_name(plan, values, "building_height_entered") == pytest.approx(400.0,
                                                                              rel=1e-15)
    assert _by_name(plan, values, "mode_exponent_entered") == 1.0
    assert _by_name(plan, values, "damper_floor") == 4
    assert _by_name(plan, values, "mode_shape_type") == "core_and_peripheral_columns_or_braced"
    sheet, rng = plan.range_names()["floor_heights_entered"]
    first = int(rng.split(":")[0][1:])
    assert [values[(sheet, f"C{first + i}")] for i in range(4)] == [100.0, 200.0, 300.0, 400.0]
    assert [values[(sheet, f"D{first + i}")] for i in range(4)] == [30000.0] * 4


def test_engine_values_are_the_design_results_and_chart_tables(si):
    s, plan, values = si
    for sheet, cell in plan.cells():
        kind = cell.source[:1]
        if kind == ("cell",):
            assert values[(sheet, cell.ref)] == s.result.cells[cell.source[1]]
        elif kind == ("chart",):
            _, key, i, j = cell.source
            assert values[(sheet, cell.ref)] == s.tables[key].rows[i][j]
    assert _by_name(plan, values, "engine_stroke") == s.result.stroke
    assert _by_name(plan, values, "chosen_damper_mass_entered") * 1000.0 == s.result.damper_mass


def test_simulation_values_are_the_runs(us_floors):
    s, plan, values = us_floors
    run = s.simulation
    assert _by_name(plan, values, "sim_force") == run.force
    assert _by_name(plan, values, "sim_swing_deg") == run.result.nonlinear.swing_deg
    assert _by_name(plan, values, "sim_length") == run.length == s.result.pendulum_length
    for dep in ("acceleration", "gravity", "modal_mass"):
        assert _by_name(plan, values, f"engine_flag_simulation_{dep}") == s.result.cells[dep]
    sheet, rng = plan.range_names()["chart_time"]
    top = rng.split(":")[0]
    assert values[(sheet, top)] == run.time_table.rows[0][0]
    assert len(run.time_table.rows) == plan.options.simulation[1]


def test_nan_from_the_simulation_becomes_not_defined(us_floors):
    """A swing over the top has no detuning, a departure against a zero linear response is
    infinite: such values are shown as text, never as a number (the drawer refuses NaN)."""
    s, plan, _ = us_floors
    run = s.simulation
    nl = dataclasses.replace(run.result.nonlinear, effective_damping=math.nan)
    broken = dataclasses.replace(run.result, detuning=math.nan, departure=math.inf,
                                 equivalent_swing_deg=math.nan, nonlinear=nl)
    s2 = dataclasses.replace(s, simulation=dataclasses.replace(run, result=broken))
    for source in (("sim", "detuning"), ("sim", "departure"), ("sim", "equivalent_swing_deg"),
                   ("sim_response", "nonlinear", "effective_damping")):
        assert source_value(source, s2) == NOT_DEFINED, source
    values = plan_values(plan, s2)
    assert all(_drawable(v) for v in values.values())
    assert _by_name(plan, values, "sim_detuning") == NOT_DEFINED


@pytest.mark.parametrize("source", [("colour", "x"), ("sims", "force"), ("cells",)])
def test_unknown_source_is_a_key_error(si, source):
    with pytest.raises(KeyError, match="unknown source"):
        source_value(source, si[0])
