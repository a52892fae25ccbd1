# SPDX-License-Identifier: MIT
"""The Calculation sheet: one row per step of the design chain, for every method and mode.

References: the chain's own declarations (functions.chain.steps: formula, engine value or not,
the cells each step reads) and the engine's values (functions.design.design_damper), with the
sheet's formulas evaluated by the builder's formula evaluator. US display factors: 1 ft =
0.3048 m, 1 lb = 0.45359237 kg, 1 lbf = 4.4482216152605 N, exact (NIST SP 811 (2008),
App. B); g_n = 9.80665 m/s^2, exact (3rd CGPM, 1901).
"""
from __future__ import annotations

import pytest

from functions.chain import all_variants, sections
from functions.damper import CLOSED_FORM_METHODS
from functions.design import design_damper
from functions.quantities import WORKING_VALUES, quantity
from functions.worksheet import formula_names
from workbook_builder.plan import PlanOptions
from workbook_builder.plan.calculation import (FLAG_LABEL, calculation_sheet, engine_flags,
                                               snapshot_name)
from workbook_builder.plan.pendulum import pendulum_sheet

from plan_workbooks import evaluator, plan_workbook

VARIANTS = [(method, mode) for method, mode, _ in all_variants()]
#: Invented design inputs (0.2 Hz mode, 20 000 t, 1 %): swings of 4 to 7 deg in every variant.
INPUTS = dict(frequency=0.2, modal_mass=2e7, structural_damping=0.01, acceleration=0.3,
              acceleration_limit=0.15, clearance=3.0)
MODE_INPUT = {"chosen_mass_ratio": {"mass_ratio": 0.01},
              "chosen_damper_mass": {"damper_mass": 2e5}, "required": {}}
US_FACTORS = {"m": ("ft", 0.3048), "kg": ("kip (weight)", 453.59237),
              "m/s^2": ("milli-g", 9.80665e-3),
              "N/m": ("kip/ft", 4448.2216152605 / 0.3048),
              "N s/m": ("kip s/ft", 4448.2216152605 / 0.3048)}


def _options(method, mode, units="SI"):
    return PlanOptions(units=units, tuning_method=method, mass_ratio_mode=mode)


def _steps(method, mode):
    return [s for sec in sections(method, mode) for s in sec.steps]


def _step_cells(sheet, method, mode):
    """The planned value cell of each step, in chain order."""
    named = {c.name: c for c in sheet.cells.values() if c.name}
    return [(step, named[step.name]) for step in _steps(method, mode)]


def _row(ref):
    return int("".join(ch for ch in ref if ch.isdigit()))


@pytest.mark.parametrize("method, mode", VARIANTS)
def test_one_row_per_step_with_its_formula_or_engine_value(method, mode):
    sheet = calculation_sheet(_options(method, mode)).plan
    pairs = _step_cells(sheet, method, mode)
    main = [_row(c.ref) for s, c in pairs if s.name not in WORKING_VALUES]
    working = [_row(c.ref) for s, c in pairs if s.name in WORKING_VALUES]
    assert main == sorted(set(main)), "one row per step, in the chain's order"
    # the working values (variance terms), in chain order, on a page of their own at the end
    assert working == sorted(set(working)) and \
        len(working) == len([n for n in WORKING_VALUES if not n.endswith("_2")])
    assert min(working) > max(main) and sheet.row_breaks == [min(working) - 2]
    for step, cell in pairs:
        q = quantity(step.name)
        assert cell.ref == f"D{cell.ref[1:]}" and (cell.unit, cell.fmt) == (q.unit, q.fmt)
        assert cell.comment.startswith((q.description or q.label).rstrip(".")), step.name
        if step.is_engine_value:
            assert (cell.kind, cell.source) == ("engine", ("cell", step.name)), step.name
        else:
            assert (cell.kind, cell.content) == ("formula", step.formula), step.name
        r = cell.ref[1:]
        texts = [sheet.cells[f"{col}{r}"].content for col in "BCEFG"]
        assert texts == [q.label, q.symbol, q.unit, step.expression, step.source], step.name
    engine = {c.source[1] for c in sheet.cells.values() if c.kind == "engine"
              and c.source[0] == "cell"}
    # the chain's engine values: the required mass ratio, the numerical optima
    expected = ({"mass_ratio"} if mode == "required" else set()) | (
        set() if method in CLOSED_FORM_METHODS else {"tuning_ratio", "damper_damping"})
    assert engine == expected


@pytest.mark.parametrize("method, mode", VARIANTS)
def test_steps_are_numbered_by_section(method, mode):
    sheet = calculation_sheet(_options(method, mode)).plan
    numbers = []
    for s, sec in enumerate(sections(method, mode), start=1):
        numbers += [f"{s}.{k}" for k in range(1, len(sec.steps) + 1)]
    got = [sheet.cells[f"A{c.ref[1:]}"].content for _, c in _step_cells(sheet, method, mode)]
    assert got == numbers
    # where the working values were, a row names them and their numbers
    pointer = [c for c in sheet.cells.values() if str(c.content).startswith("Working values w")]
    assert len(pointer) == 1
    assert sheet.cells[f"A{pointer[0].ref[1:]}"].content == "4.1-7"


@pytest.mark.parametrize("method, mode", VARIANTS)
def test_flags_and_snapshots_guard_the_engine_values(method, mode):
    """Required mass ratio: a flag on its inputs (required damping, structural damping);
    numerical optimum: a flag on its inputs (mass ratio, structural damping)."""
    options = _options(method, mode)
    sheet = calculation_sheet(options).plan
    expected = {}
    if mode == "required":
        expected["engine_flag_mass_ratio"] = ("required_damping", "structural_damping")
    if method not in CLOSED_FORM_METHODS:
        expected["engine_flag_tuning"] = ("mass_ratio", "structural_damping")
    assert [f for f, _ in engine_flags(options)] == list(expected)
    named = {c.name: c for c in sheet.cells.values() if c.name}
    for flag, deps in expected.items():
        assert named[flag].kind == "check"
        # the question beside the flag is answered by its "current" (not "Inputs changed?")
        assert sheet.cells[f"B{_row(named[flag].ref)}"].content == FLAG_LABEL
        assert FLAG_LABEL.startswith("Engine value current?")
        for dep in deps:
            snap = named[snapshot_name(flag, dep)]
            assert (snap.kind, snap.source) == ("engine", ("snapshot", "design", dep))
            assert _row(snap.ref) < _row(named[flag].ref)
            assert dep in formula_names(named[flag].content)
    flags = {n for n in named if n.startswith("engine_flag_")}
    assert flags == set(expected) | {snapshot_name(f, d) for f, ds in expected.items()
                                     for d in ds}


def _design(method, mode):
    return design_damper(**INPUTS, tuning_method=method, **MODE_INPUT[mode])


def _sheet_workbook(options, result, snapshot_scale=None):
    """Calculation and Pendulum sheets with the engine's values in the cells they read."""
    sheets = [calculation_sheet(options).plan, pendulum_sheet().plan]
    defined = {c.name for sp in sheets for c in sp.cells.values() if c.name}
    read = {n for sp in sheets for c in sp.cells.values() if c.kind in ("formula", "check")
            for n in formula_names(c.content)}
    scale = snapshot_scale or {}

    def value(source):
        if source[0] == "cell":
            return result.cells[source[1]]
        if source[0] == "snapshot":
            return result.cells[source[2]] * scale.get(source[2], 1.0)
        raise KeyError(source)
    return plan_workbook(sheets, value, {n: result.cells[n] for n in sorted(read - defined)})


@pytest.mark.parametrize("method, mode", VARIANTS)
def test_sheet_evaluates_to_the_engine_values(method, mode):
    result = _design(method, mode)
    assert 3.5 < result.swing_angle_deg < 7.0        # where 1/AGM - 1 keeps 1e-12 (pendulum)
    options = _options(method, mode)
    ev = evaluator(_sheet_workbook(options, result))
    for step in _steps(method, mode):
        got, want = ev.evaluate(f"={step.name}", "Calculation"), result.cells[step.name]
        assert got == pytest.approx(want, rel=1e-12, abs=0.0), step.name
    for flag, _ in engine_flags(options):
        assert ev.evaluate(f"={flag}", "Calculation") == "current"


@pytest.mark.parametrize("method, mode", [("hinf", "required"), ("h2", "chosen_mass_ratio")])
def test_flag_reports_an_input_changed_by_more_than_1e_12(method, mode):
    result = _design(method, mode)
    options = _options(method, mode)
    deps = {"engine_flag_mass_ratio": ("required_damping", "structural_damping"),
            "engine_flag_tuning": ("mass_ratio", "structural_damping")}
    for flag, _ in engine_flags(options):
        for dep in deps[flag]:
            for scale, verdict in ((1 + 4e-13, "current"), (1 + 3e-12, "INPUTS CHANGED: "
                                                                       "rebuild")):
                wb = _sheet_workbook(options, result, {dep: scale})
                assert evaluator(wb).evaluate(f"={flag}", "Calculation") == verdict, (
                    flag, dep, scale)


def test_us_columns_come_first_and_convert_with_exact_factors():
    """US layout: the US value and unit first (D, E), the named SI value beside (F, G); units
    without a US counterpart are shown as they are; masses as weights in kip."""
    options = _options("h2", "required", units="US")
    result = _design("h2", "required")
    sheet = calculation_sheet(options).plan
    si_sheet = calculation_sheet(_options("h2", "required")).plan
    assert not any(c.ref[0] in "HI" for c in si_sheet.cells.values())
    assert [sheet.cells[f"{c}4"].content for c in "DEFG"] == ["Value (US)", "US unit",
                                                              "Value (SI)", "SI unit"]
    ev = evaluator(_sheet_workbook(options, result))
    shown = 0
    for step, cell in _step_cells(sheet, "h2", "required"):
        r = cell.ref[1:]
        assert cell.ref == f"F{r}", step.name
        unit = quantity(step.name).unit
        got = ev.evaluate(f"=D{r}", "Calculation")
        if unit not in US_FACTORS:
            assert sheet.cells[f"E{r}"].content == unit, step.name
            assert got == ev.evaluate(f"=F{r}", "Calculation"), step.name
            continue
        us_unit, factor = US_FACTORS[unit]
        assert sheet.cells[f"E{r}"].content == us_unit
        assert got == pytest.approx(result.cells[step.name] / factor, rel=1e-13), step.name
        shown += 1
    assert shown >= 8
