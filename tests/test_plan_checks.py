# SPDX-License-Identifier: MIT
"""The Checks sheet: design checks as the engine's rules, the cross-check of every result.

References: the engine's check rules and verdicts (functions.design.CHECK_RULES,
design_damper), the chain's steps (functions.chain.steps) and the declared results
(functions.quantities.DESIGN_RESULTS); the sheet's formulas are evaluated by the builder's
formula evaluator.
"""
from __future__ import annotations

import pytest

from functions.chain import all_variants, steps
from functions.design import CHECK_RULES, design_damper
from functions.quantities import DESIGN_RESULTS
from functions.worksheet import TWIN_TOLERANCE, formula_names
from workbook_builder.plan import PlanOptions
from workbook_builder.plan.calculation import engine_flags
from workbook_builder.plan.checks import (NONLINEAR_CHECKS, NOT_DEFINED, check_name,
                                          checks_sheet, cross_checked, engine_name)

from plan_workbooks import evaluator, plan_workbook

RESULTS = [q.cell_name for q in DESIGN_RESULTS]
SIM = PlanOptions(tuning_method="hinf", mass_ratio_mode="required",
                  simulation=("random", 40, 12))


def _named(sheet):
    return {c.name: c for c in sheet.cells.values() if c.name}


def _row(ref):
    return ref[1:]


def test_one_row_per_design_check_with_the_engines_rule():
    sheet = checks_sheet(PlanOptions()).plan
    named = _named(sheet)
    rows = []
    for rule in CHECK_RULES:
        verdict = named[check_name(rule.name)]
        r = _row(verdict.ref)
        rows.append(int(r))
        assert (verdict.kind, verdict.content) == ("check", rule.verdict_formula), rule.name
        cells = [sheet.cells[f"{c}{r}"] for c in "ABCDEF"]
        assert [c.content for c in cells[:4]] == [rule.label, rule.rule, rule.value_formula,
                                                  f"={rule.limit}"]
        assert cells[4].content == (f"={rule.lower}" if rule.lower else None)
        assert cells[5].content == rule.unit
    assert rows == list(range(4, 4 + len(CHECK_RULES)))
    assert f"G4:G{3 + len(CHECK_RULES)}" in sheet.verdict_ranges


def test_verdicts_evaluate_to_the_engines_checks():
    """A design whose stroke exceeds the clearance and whose mass ratio is above the
    practical range: the planned verdicts give the engine's OK / NOT OK, and the summary
    verdict is NOT OK."""
    r = design_damper(frequency=0.2, modal_mass=2e7, structural_damping=0.01,
                      acceleration=0.3, acceleration_limit=0.15, clearance=0.1,
                      mass_ratio=0.08)
    assert not r.check("stroke").ok and not r.check("mass_ratio").ok and r.check("swing").ok
    sheet = checks_sheet(PlanOptions(mass_ratio_mode="chosen_mass_ratio")).plan
    read = {n for rule in CHECK_RULES for n in formula_names(rule.verdict_formula)}
    ev = evaluator(plan_workbook([sheet], named={n: r.cells[n] for n in read}))
    for rule in CHECK_RULES:
        got = ev.evaluate(f"={check_name(rule.name)}", "Checks")
        assert got == ("OK" if r.check(rule.name).ok else "NOT OK"), rule.name
    assert ev.evaluate("=all_design_checks", "Checks") == "NOT OK"


def test_all_design_checks_is_ok_only_when_every_check_is():
    formula = _named(checks_sheet(PlanOptions()).plan)["all_design_checks"].content
    names = [check_name(rule.name) for rule in CHECK_RULES]
    assert set(formula_names(formula)) == set(names)
    ok = dict.fromkeys(names, "OK")
    assert evaluator(plan_workbook([], named=ok)).evaluate(formula, "V") == "OK"
    for name in names:
        wb = plan_workbook([], named={**ok, name: "NOT OK"})
        assert evaluator(wb).evaluate(formula, "V") == "NOT OK", name


@pytest.mark.parametrize("method, mode", [(m, d) for m, d, _ in all_variants()])
def test_every_result_of_the_chain_is_cross_checked_in_chain_order(method, mode):
    options = PlanOptions(tuning_method=method, mass_ratio_mode=mode)
    chain = [s.name for s in steps(method, mode)]
    names = cross_checked(options)
    assert set(names) == set(RESULTS) and set(RESULTS) <= set(chain)
    assert names == sorted(names, key=chain.index)
    sheet = checks_sheet(options).plan
    named = _named(sheet)
    for name in names:
        engine = named[engine_name(name)]
        assert (engine.kind, engine.source) == ("engine", ("cell", name))
        r = _row(engine.ref)
        assert sheet.cells[f"C{r}"].content == f"={name}"
        assert sheet.cells[f"F{r}"].content == TWIN_TOLERANCE


def test_cross_check_accepts_a_relative_difference_up_to_the_tolerance():
    """Relative difference |C/D - 1| (absolute |C| when the engine gives 0), rounded to 1e-12,
    against TWIN_TOLERANCE = 1e-9 (functions.worksheet)."""
    sheet = checks_sheet(PlanOptions()).plan
    row = _row(_named(sheet)[engine_name("stroke")].ref)
    for sheet_value, engine_value, verdict in (
            (1.0 + 0.5e-9, 1.0, "OK"), (1.0 - 0.9e-9, 1.0, "OK"), (1.0 + 2e-9, 1.0, "NOT OK"),
            (-3.0 * (1 + 2e-9), -3.0, "NOT OK"), (5e-10, 0.0, "OK"), (2e-9, 0.0, "NOT OK")):
        wb = plan_workbook([sheet], value=lambda s: engine_value, named={"stroke": sheet_value})
        assert evaluator(wb).evaluate(f"=G{row}", "Checks") == verdict, (sheet_value,
                                                                         engine_value)


def test_all_cross_checks_reads_every_cross_check_row():
    sheet = checks_sheet(PlanOptions()).plan
    values = dict.fromkeys(RESULTS, 2.0)
    ok = plan_workbook([sheet], value=lambda s: 2.0, named=values)
    assert evaluator(ok).evaluate("=all_cross_checks", "Checks") == "OK"
    for name in RESULTS:
        wb = plan_workbook([sheet], value=lambda s: 2.0, named={**values, name: 2.00001})
        assert evaluator(wb).evaluate("=all_cross_checks", "Checks") == "NOT OK", name


def test_fixed_point_and_engine_flag_verdicts():
    sheet = checks_sheet(SIM).plan
    named = _named(sheet)
    flags = [f for f, _ in engine_flags(SIM)]
    assert flags == ["engine_flag_mass_ratio", "engine_flag_tuning", "engine_flag_simulation"]
    for change, verdict in ((0.0, "OK"), (1e-12, "OK"), (1.5e-12, "NOT OK")):
        wb = plan_workbook([], named={"fixed_point_change": change})
        got = evaluator(wb).evaluate(named["fixed_point_converged"].content, "V")
        assert got == verdict, change
    for flag in flags:
        for state, verdict in (("current", "OK"), ("INPUTS CHANGED: rebuild", "NOT OK")):
            wb = plan_workbook([], named={flag: state})
            assert evaluator(wb).evaluate(named[f"{flag}_ok"].content, "V") == verdict


def test_nonlinear_checks_only_with_a_simulation():
    names = [n for n, *_ in NONLINEAR_CHECKS]
    assert not set(names) & set(_named(checks_sheet(PlanOptions()).plan))
    named = _named(checks_sheet(SIM).plan)
    for name, label, _, value, limit, unit, verdict in NONLINEAR_CHECKS:
        cell = named[name]
        assert (cell.kind, cell.content, cell.label) == ("check", verdict, label)


@pytest.mark.parametrize("values, expected", [
    ({"sim_verdict": "OK", "sim_detuning": -0.004, "max_detuning": 0.01, "sim_swing_deg": 9.0,
      "max_swing_deg": 15.0}, ("OK", "OK", "OK")),
    ({"sim_verdict": "NOT OK", "sim_detuning": -0.02, "max_detuning": 0.01,
      "sim_swing_deg": 16.0, "max_swing_deg": 15.0}, ("NOT OK", "NOT OK", "NOT OK")),
    # an undefined engine value (NaN from the engine) is written as text: never OK
    ({"sim_verdict": "NOT OK", "sim_detuning": NOT_DEFINED, "max_detuning": 0.01,
      "sim_swing_deg": 9.0, "max_swing_deg": 15.0}, ("NOT OK", "NOT OK", "OK")),
])
def test_nonlinear_verdicts_follow_the_simulated_values(values, expected):
    wb = plan_workbook([checks_sheet(SIM).plan], named=values)
    ev = evaluator(wb)
    got = tuple(ev.evaluate(f"={name}", "Checks") for name, *_ in NONLINEAR_CHECKS)
    assert got == expected


def test_us_design_checks_show_us_values_first_with_si_beside():
    """1 ft = 0.3048 m (exact, NIST SP 811 (2008), App. B); 1 milli-g = 9.80665e-3 m/s^2
    (g_n exact, 3rd CGPM 1901)."""
    us = checks_sheet(PlanOptions(units="US")).plan
    si = checks_sheet(PlanOptions()).plan
    assert not any(c.ref[0] in "HIJ" and c.ref[1:] in ("3", "4") for c in si.cells.values())
    assert [us.cells[f"{c}3"].content for c in "HIJ"] == ["Value (SI)", "Limit (SI)", "SI unit"]
    factors = {"m": ("ft", 0.3048), "m/s^2": ("milli-g", 9.80665e-3)}
    values = {"acceleration_with_damper": 0.12, "acceleration_limit": 0.15, "stroke": 0.7,
              "clearance": 1.6, "swing_angle_deg": 5.0, "max_swing_deg": 15.0,
              "detuning": -6e-4, "max_detuning": 0.01, "mass_ratio": 0.01,
              "mass_ratio_max": 0.05, "mass_ratio_min": 0.005}
    ev = evaluator(plan_workbook([us], named=values))
    for row, rule in enumerate(CHECK_RULES, start=4):
        unit, factor = factors.get(rule.unit, (rule.unit, 1.0))
        assert us.cells[f"F{row}"].content == unit and us.cells[f"J{row}"].content == rule.unit
        limit = ev.evaluate(f"=D{row}", "Checks")
        assert limit == pytest.approx(values[rule.limit] / factor, rel=1e-15), rule.name
        assert ev.evaluate(f"=I{row}", "Checks") == values[rule.limit]
