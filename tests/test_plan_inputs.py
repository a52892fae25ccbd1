# SPDX-License-Identifier: MIT
"""The Inputs sheet: data validation = the declared range, named rows, the floor table.

Every planned formula is evaluated by the builder's formula evaluator
(workbook_builder.xlsx.formulas.Evaluator). References: the declared ranges
(functions.quantities, Quantity.contains) applied to the SI value the sheet computes, entered
value x factor, and the engine's modal mass (functions.structure.modal_mass, itself tested
against Clough & Penzien and EN 1991-1-4 Annex F in test_structure.py).
"""
from __future__ import annotations

import numpy as np
import pytest
from openpyxl import Workbook

from functions.quantities import DESIGN_INPUTS, FLOOR_TABLE, by_name
from functions.structure import modal_mass, power_law_mode_shape
from workbook_builder.plan import PlanOptions
from workbook_builder.plan.inputs import (FLOOR_NAMES, entered_name, factor_name, input_comment,
                                          inputs_sheet, unit_name)
from workbook_builder.project.units import UNITS
from workbook_builder.xlsx.formulas import Evaluator, check_formula

from plan_workbooks import evaluator, plan_workbook

NUMERIC = tuple(q for q in DESIGN_INPUTS if q.kind != "choice")
ALL_INPUTS = PlanOptions(mass_ratio_mode="chosen_mass_ratio",
                         inputs=tuple(q.name for q in NUMERIC))
FLOOR_QUANTITIES = by_name(FLOOR_TABLE)


@pytest.fixture(scope="module")
def sheet():
    return inputs_sheet(ALL_INPUTS).plan


def _row_of(sheet, name):
    return next(c for c in sheet.cells.values() if c.name == name)


def _validation(sheet, ref):
    [v] = [v for v in sheet.validations if v.ref == ref]
    check_formula("=" + v.formula)
    return v


def _points(low, high):
    """Entered values at and just beside the range ends (numpy.nextafter), and inside."""
    pts = [(low + high) / 2, -high, 0.0]
    for end in (low, high):
        pts += [end, float(np.nextafter(end, -np.inf)), float(np.nextafter(end, np.inf))]
    return pts


def _accepted(formula, cells):
    """True when a data-validation formula accepts the cells' values (an error rejects)."""
    wb = Workbook()
    ws = wb.active
    ws.title = "Inputs"
    for ref, value in cells.items():
        ws[ref] = value
    return Evaluator(wb).evaluate("=" + formula, "Inputs") is True


@pytest.mark.parametrize("q", NUMERIC, ids=lambda q: q.name)
def test_validation_accepts_exactly_the_declared_range_in_every_unit(sheet, q):
    """At the range ends in the entered unit and one floating-point step beside them, the
    sheet's rule agrees with Quantity.contains of the SI value the sheet computes
    (entered x factor, as the project reader computes it)."""
    entered = _row_of(sheet, entered_name(q.cell_name))
    factor_cell = _row_of(sheet, factor_name(q.cell_name))
    rule = _validation(sheet, entered.ref).formula
    for unit in UNITS[q.kind].values():
        verdicts = []
        for x in _points(q.low / unit.factor, q.high / unit.factor):
            got = _accepted(rule, {entered.ref: x, factor_cell.ref: unit.factor})
            want = q.contains(x * unit.factor)
            assert got == want, (q.name, unit.symbol, x)
            verdicts.append(got)
        assert True in verdicts and False in verdicts, (q.name, unit.symbol)
    # text is not a number: refused whatever the range
    assert not _accepted(rule, {entered.ref: "ten", factor_cell.ref: 1.0})


@pytest.mark.parametrize("unit", list(UNITS["length"].values()), ids=lambda u: u.symbol)
def test_floor_table_scalars_are_validated_in_the_height_unit(unit):
    """Building height in the floor table's height unit (factor cell floor_height_factor),
    the mode exponent as a number (k of (z/h)^k)."""
    sh = inputs_sheet(PlanOptions(floors=3)).plan
    for q, factor in ((FLOOR_QUANTITIES["building_height"], unit.factor),
                      (FLOOR_QUANTITIES["exponent"], 1.0)):
        entered = _row_of(sh, entered_name(q.cell_name))
        rule = _validation(sh, entered.ref).formula
        for x in _points(q.low / factor, q.high / factor):
            wb = plan_workbook([], named={"floor_height_factor": unit.factor})
            wb.create_sheet("Inputs")[entered.ref] = x
            got = Evaluator(wb).evaluate("=" + rule, "Inputs") is True
            assert got == q.contains(x * factor), (q.name, unit.symbol, x)


@pytest.mark.parametrize("q", NUMERIC, ids=lambda q: q.name)
def test_input_row_holds_entered_value_unit_factor_and_si_cell(sheet, q):
    n = q.cell_name
    entered = _row_of(sheet, entered_name(n))
    row = entered.ref[1:]
    cells = {r[0]: c for r, c in sheet.cells.items() if r[1:] == row}
    assert entered.ref == f"C{row}" and entered.kind == "input"
    assert entered.source == ("input", q.name) and "input" in entered.style.split()
    assert (cells["D"].name, cells["D"].source) == (unit_name(n), ("unit", q.name))
    assert (cells["E"].name, cells["E"].source) == (factor_name(n), ("factor", q.name))
    si = cells["F"]
    assert (si.kind, si.name, si.content) == ("formula", n, f"=C{row}*E{row}")
    assert (si.unit, si.fmt, si.label) == (q.unit, q.fmt, q.label)
    assert [cells[c].content for c in "ABG"] == [q.label, q.symbol, q.unit]
    assert cells["H"].source == ("range", q.name) and cells["I"].source == ("note", q.name)


def test_si_cell_converts_the_entered_value():
    # 25 milli-g with g_n = 9.80665 m/s^2 exactly (3rd CGPM, 1901): 0.24516625 m/s^2
    sh = inputs_sheet(ALL_INPUTS).plan
    wb = plan_workbook([sh], value=lambda s: {"input": 25.0, "factor": 9.80665e-3}.get(s[0]))
    assert evaluator(wb).evaluate("=acceleration", "Inputs") == pytest.approx(0.24516625,
                                                                              rel=1e-15)


def test_rows_follow_the_inputs_of_the_options():
    """An optional input not given has no row; the choice of method always has one; with a
    floor table the modal mass is a formula reading the table."""
    sh = inputs_sheet(PlanOptions(inputs=("frequency", "clearance"), floors=2)).plan
    names = {c.name: c for c in sh.cells.values() if c.name}
    assert {"structure_frequency_entered", "clearance_entered"} <= set(names)
    for absent in ("chosen_mass_ratio", "chosen_damper_mass", "modal_mass_entered",
                   "gravity_entered"):
        assert absent not in names
    assert names["modal_mass"].content == "=modal_mass_from_floors"
    method = names["tuning_method"]
    assert method.kind == "value" and method.source == ("input", "tuning_method")
    row = method.ref[1:]
    assert sh.cells[f"H{row}"].content == ", ".join(by_name(DESIGN_INPUTS)["tuning_method"]
                                                    .choices)
    assert set(FLOOR_NAMES) <= set(names) | set(sh.ranges)
    assert names["project_notes"].source == ("info", "notes")
    without = inputs_sheet(PlanOptions(inputs=("frequency",))).plan
    assert not any(c.name in FLOOR_NAMES or c.name == "modal_mass"
                   for c in without.cells.values())


# (heights, height unit, masses, mass unit, building height, exponent, damper floor): invented
FLOOR_TABLES = [
    ((4.0, 8.0, 12.0, 16.0), "m", (800.0, 800.0, 800.0, 600.0), "t", 16.0, 1.0, 4),
    ((40.0, 80.0, 120.0, 160.0, 200.0, 240.0, 280.0), "ft",
     (2000.0, 1900.0, 1900.0, 1800.0, 1800.0, 1700.0, 1200.0), "kip", 300.0, 1.5, 5),
    (tuple(10.0 * i for i in range(1, 12)), "m",
     (420.0, 400.0, 380.0, 360.0, 340.0, 320.0, 300.0, 280.0, 260.0, 240.0, 900.0), "t",
     120.0, 2.0, 11),
    ((3500.0, 7000.0, 10500.0), "mm", (2.1e5, 2.0e5, 1.5e5), "kg", 12000.0, 0.6, 1),
]


@pytest.mark.parametrize("table", FLOOR_TABLES, ids=lambda t: f"{len(t[0])}-floors")
def test_floor_table_modal_mass_equals_the_engine(table):
    """SUMPRODUCT(m phi^2) / INDEX(phi, damper_floor)^2 over the entered table, evaluated,
    against functions.structure.modal_mass of the SI table (rounding only: summation order
    and POWER against numpy differ by a few units in the last place)."""
    heights, h_unit, masses, m_unit, building, exponent, floor = table
    hf, mf = UNITS["length"][h_unit].factor, UNITS["mass"][m_unit].factor
    sources = {"height_unit": h_unit, "mass_unit": m_unit, "height_factor": hf,
               "mass_factor": mf, "building_height": building, "exponent": exponent,
               "damper_level": floor, "structure_type": ""}

    def value(source):
        if source[0] != "floors":
            return None
        if source[1] in ("height", "mass"):
            return (heights if source[1] == "height" else masses)[source[2]]
        return sources[source[1]]

    sh = inputs_sheet(PlanOptions(floors=len(heights))).plan
    got = evaluator(plan_workbook([sh], value)).evaluate("=modal_mass", "Inputs")
    shape = power_law_mode_shape(np.multiply(heights, hf), building * hf, exponent)
    want = modal_mass(np.multiply(masses, mf), shape, damper_level=floor - 1)
    assert got == pytest.approx(want, rel=1e-13)


def test_floor_heights_and_masses_must_be_positive_numbers():
    sh = inputs_sheet(PlanOptions(floors=3)).plan
    [v] = [v for v in sh.validations if ":" in v.ref]
    first = v.ref.split(":")[0]
    assert v.ref.startswith("C") and v.ref.split(":")[1].startswith("D")
    for x, ok in ((1e-3, True), (450.0, True), (0.0, False), (-2.0, False), ("tall", False)):
        assert _accepted(v.formula, {first: x}) is ok, x


def test_entered_inputs_carry_a_note_with_where_they_come_from():
    options = PlanOptions(inputs=tuple(q.name for q in DESIGN_INPUTS if q.kind != "choice"))
    sheet = inputs_sheet(options).plan
    entered = [c for c in sheet.cells.values() if c.kind == "input"]
    assert len(entered) == len(options.inputs)
    for cell in entered:
        q = next(q for q in DESIGN_INPUTS if q.name == cell.source[1])
        assert cell.comment == input_comment(q)
        assert q.note in cell.comment and q.interval() in cell.comment
