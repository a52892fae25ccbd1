# SPDX-License-Identifier: MIT
"""The Nonlinear sheet: what the simulation depends on, its tables and charts, its verdict.

References: the design chain's inputs (functions.chain: which inputs the design the simulation
runs on reads in each mass-ratio mode) and the options' table sizes; the verdict formula is
evaluated by the builder's formula evaluator.
"""
from __future__ import annotations

import pytest
from openpyxl.utils.cell import range_boundaries

from functions.chain import steps
from workbook_builder.plan import PlanOptions
from workbook_builder.plan.checks import NOT_DEFINED
from workbook_builder.plan.model import refreshed
from workbook_builder.plan.nonlinear import (RESPONSE_ROWS, nonlinear_sheet,
                                             simulation_dependencies)

from plan_workbooks import evaluator, plan_workbook

#: What functions.simulation.simulate is given beside the damper (workbook_builder.compute):
#: the mode (frequency, modal mass, damping), the load calibrated to the wind input, gravity.
SIMULATE_READS = {"structure_frequency", "modal_mass", "structural_damping", "acceleration",
                  "gravity"}
#: The design values the simulation runs on (the damper simulated).
DAMPER = ("pendulum_length", "damper_mass", "damper_damping", "damper_frequency")


def _options(load="random", time_rows=50, window_rows=20, mode="required"):
    return PlanOptions(mass_ratio_mode=mode, simulation=(load, time_rows, window_rows))


def _named(sheet):
    return {c.name: c for c in sheet.cells.values() if c.name}


def _inputs_read(method, mode, targets):
    """The inputs the chain's steps for ``targets`` read, directly or through other steps."""
    by_name = {s.name: s for s in steps(method, mode)}
    seen, todo = set(), list(targets)
    while todo:
        name = todo.pop()
        if name in seen:
            continue
        seen.add(name)
        if name in by_name:
            todo += by_name[name].reads
    return {n for n in seen if n not in by_name}


@pytest.mark.parametrize("method", ["h2", "den_hartog"])
@pytest.mark.parametrize("mode", ["required", "chosen_mass_ratio", "chosen_damper_mass"])
def test_simulation_depends_on_every_input_its_damper_and_load_read(method, mode):
    deps = simulation_dependencies(_options(mode=mode))
    assert len(set(deps)) == len(deps)
    assert set(deps) == _inputs_read(method, mode, DAMPER) | SIMULATE_READS


@pytest.mark.parametrize("mode", ["required", "chosen_mass_ratio", "chosen_damper_mass"])
def test_flag_snapshots_every_dependency_and_is_refreshed(mode):
    """recalc reruns the simulation, so it rewrites the snapshots too (our own rule)."""
    options = _options(mode=mode)
    named = _named(nonlinear_sheet(options).plan)
    flag = named["engine_flag_simulation"]
    assert flag.kind == "check"
    for dep in simulation_dependencies(options):
        snap = named[f"engine_flag_simulation_{dep}"]
        assert snap.source == ("snapshot", "simulation", dep) and refreshed(snap)
        assert dep in flag.content and snap.name in flag.content


@pytest.mark.parametrize("load, time_rows, window_rows", [("random", 50, 20),
                                                          ("harmonic", 769, 325)])
def test_tables_have_the_sizes_of_the_options(load, time_rows, window_rows):
    sheet = nonlinear_sheet(_options(load, time_rows, window_rows)).plan
    sizes = {}
    for name, rng in sheet.ranges.items():
        c1, r1, c2, r2 = range_boundaries(rng)
        sizes[name] = (r2 - r1 + 1, c2 - c1 + 1)
        sources = {sheet.cells[f"{chr(64 + c)}{r}"].source for r in (r1, r2)
                   for c in (c1, c2)}
        assert {s[:2] for s in sources} == {("sim_table", name.split("_", 1)[1])}
    assert sizes == {"chart_time": (time_rows, 5), "chart_swing_window": (window_rows, 3)}
    cells = [c for c in sheet.cells.values() if c.source[:1] == ("sim_table",)]
    assert len(cells) == 5 * time_rows + 3 * window_rows
    assert all(refreshed(c) for c in cells)
    # every single simulation value has a name (recalc writes only through names)
    assert all(c.name for c in sheet.cells.values()
               if c.kind == "engine" and c.source[0] in ("sim", "sim_response"))


def test_charts_draw_the_planned_tables_outside_the_print_area():
    sheet = nonlinear_sheet(_options()).plan
    time_range, window_range = sheet.ranges["chart_time"], sheet.ranges["chart_swing_window"]
    assert len(sheet.charts) == 2
    for chart, table in zip(sheet.charts, (time_range, window_range)):
        t1, tr1, t2, tr2 = range_boundaries(table)
        for series in chart.series:
            for rng in (series.x, series.y):
                c1, r1, c2, r2 = range_boundaries(rng)
                assert c1 == c2 and t1 <= c1 <= t2 and (r1, r2) == (tr1, tr2), rng
        assert chart.series[0].x.startswith(table.split(":")[0][0])    # x: the time column
    p1, _, p2, _ = range_boundaries(sheet.print_area)
    assert p2 < range_boundaries(time_range)[0]        # the tables are not printed


def test_random_and_harmonic_loads_show_their_own_rows():
    random = nonlinear_sheet(_options("random")).plan
    harmonic = nonlinear_sheet(_options("harmonic")).plan

    def sources(sheet):
        return {c.source for c in sheet.cells.values() if c.source}
    only_random = {("sim", "peak_factor"), ("sim", "theory_acceleration_rms"),
                   ("sim", "theory_acceleration_rms_without_damper"), ("sim", "theory_scatter")}
    assert only_random <= sources(random) and not only_random & sources(harmonic)
    labels = {c.content for c in harmonic.cells.values() if c.kind == "label"}
    assert "Force amplitude" in labels and "Force RMS" not in labels


def test_response_rows_name_the_exact_pendulums_values():
    sheet = nonlinear_sheet(_options()).plan
    named = _named(sheet)
    for label, attr, unit, has_bare, name in RESPONSE_ROWS:
        row = next(c.ref[1:] for c in sheet.cells.values() if c.content == label)
        assert sheet.cells[f"B{row}"].source == ("sim_response", "nonlinear", attr)
        assert sheet.cells[f"C{row}"].source == ("sim_response", "linear", attr)
        bare = sheet.cells[f"D{row}"]
        assert bare.source == (("sim_response", "without_damper", attr) if has_bare else ())
        if name:
            assert named[name].ref == f"B{row}" and named[name].unit == unit


@pytest.mark.parametrize("values, verdict", [
    ({"sim_departure": 0.02, "sim_tolerance": 0.05, "sim_swing_deg": 20.0}, "OK"),
    ({"sim_departure": 0.05, "sim_tolerance": 0.05, "sim_swing_deg": 90.0}, "OK"),
    ({"sim_departure": 0.06, "sim_tolerance": 0.05, "sim_swing_deg": 20.0}, "NOT OK"),
    ({"sim_departure": 0.02, "sim_tolerance": 0.05, "sim_swing_deg": 91.0}, "NOT OK"),
    ({"sim_departure": NOT_DEFINED, "sim_tolerance": 0.05, "sim_swing_deg": 20.0}, "NOT OK"),
])
def test_verdict_needs_the_departure_within_tolerance_and_a_swing_up_to_90_deg(values, verdict):
    sheet = nonlinear_sheet(_options()).plan
    formula = _named(sheet)["sim_verdict"].content
    assert evaluator(plan_workbook([], named=values)).evaluate(formula, "V") == verdict


def test_us_workbook_shows_us_values_first_with_the_named_si_values_beside():
    """1 ft = 0.3048 m, 1 lbf = 4.4482216152605 N (exact, NIST SP 811 (2008), App. B);
    1 milli-g = 9.80665e-3 m/s^2 (g_n exact, 3rd CGPM 1901)."""
    us = nonlinear_sheet(PlanOptions(units="US", simulation=("random", 50, 20))).plan
    named = _named(us)
    for name, unit, factor in (("sim_length", "ft", 0.3048), ("sim_force", "kip",
                                                                4448.2216152605)):
        cell = named[name]
        r = cell.ref[1:]
        assert cell.ref == f"D{r}" and us.cells[f"E{r}"].content == cell.unit
        assert us.cells[f"C{r}"].content == unit
        ev = evaluator(plan_workbook([us], lambda source: 2.5))
        assert ev.evaluate(f"=B{r}", "Nonlinear") == pytest.approx(2.5 / factor, rel=1e-15)
    # the response table: a US row, then the named SI row
    stroke = named["sim_stroke_peak"]
    r = int(stroke.ref[1:])
    assert stroke.ref == f"B{r}" and us.cells[f"B{r - 1}"].content == f"=B{r}/0.3048"
    assert us.cells[f"E{r - 1}"].content == "ft" and us.cells[f"E{r}"].content == "m"
    si = nonlinear_sheet(_options()).plan
    assert _named(si)["sim_length"].ref[0] == "B"
