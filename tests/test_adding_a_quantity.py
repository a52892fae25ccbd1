# SPDX-License-Identifier: MIT
"""Adding an input quantity is one declaration plus its formula.

A test-only input (a margin kept below the comfort limit) and a result computed from it by a
closed form are declared the way a maintainer would add them — a :class:`Quantity` in
functions.quantities and a step in functions.chain — and nothing else is touched. The new
quantity must then appear, derived, in every medium: the project-file schema, the engine's
validation and results, the workbook (input row, named cells, formula, cross-check), the
spreadsheet function SWAY_DESIGN and the batch-recalculation summary. Invented quantity,
invented data.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import dataclasses

import pytest

from functions import chain, quantities
from functions.catalogue import design_sheet_functions
from functions.chain import Section, Step
from functions.design import DesignInputs, design_damper
from functions.quantities import Quantity
from functions.worksheet import twin
from workbook_builder.build import write_workbook
from workbook_builder.plan import make_plan
from workbook_builder.project import ProjectError, parse_project
from workbook_builder.project.schema import input_keys
from workbook_builder.recalc import recalc_workbook
from workbook_builder.recalc.summary import summary_row

MARGIN = Quantity("comfort_margin", "m_c", "Margin kept below the comfort limit", "-",
                  "fraction", 0.0, 0.5, default=0.0, fmt="0.000", section="wind",
                  description="Fraction of the comfort limit kept in reserve",
                  note="Test-only quantity (invented).")
WITH_MARGIN = Quantity("acceleration_with_margin", "a_m", "Peak acceleration with the margin",
                       "m/s^2", "acceleration", fmt="0.00000", summary=True,
                       description="Peak acceleration with the damper, times 1 + margin")
STEP = Step("acceleration_with_margin",
            twin("=acceleration_with_damper*(1+comfort_margin)",
                 lambda acceleration_with_damper, comfort_margin:
                 acceleration_with_damper * (1.0 + comfort_margin)),
            "a_d (1 + m_c)", "Test-only step")

PROJECT = {"mode": {"frequency": 0.2, "modal_mass": 1.0e7, "structural_damping": 0.01},
           "wind": {"acceleration": 0.25, "acceleration_limit": 0.15, "comfort_margin": 0.1},
           "damper": {"mass_ratio": 0.02, "clearance": 1.5}}


@pytest.fixture
def declared(monkeypatch):
    """The two declarations and the step, as a maintainer adds them; undone afterwards."""
    monkeypatch.setattr(quantities, "DESIGN_INPUTS", quantities.DESIGN_INPUTS + (MARGIN,))
    monkeypatch.setattr(quantities, "DESIGN_RESULTS",
                        quantities.DESIGN_RESULTS + (WITH_MARGIN,))
    original = chain.sections

    def sections(method, mode, parts=()):
        return original(method, mode, parts) + (Section("9  Margin", (STEP,)),)

    monkeypatch.setattr(chain, "sections", sections)
    make_plan.cache_clear()
    yield
    make_plan.cache_clear()


def test_the_quantity_is_not_there_without_its_declaration():
    assert "wind.comfort_margin" not in input_keys()
    with pytest.raises(TypeError, match="unexpected field"):
        DesignInputs(frequency=0.2, modal_mass=1e7, structural_damping=0.01, acceleration=0.25,
                     acceleration_limit=0.15, clearance=1.5, comfort_margin=0.1)


def test_project_schema_and_engine(declared):
    project = parse_project(PROJECT, source="margin.toml")
    assert project.si("comfort_margin") == 0.1
    bad = {**PROJECT, "wind": {**PROJECT["wind"], "comfort_margin": 0.7}}
    with pytest.raises(ProjectError, match=r"wind\.comfort_margin: 0\.7 must be in \[0, 0\.5\]"):
        parse_project(bad, source="margin.toml")
    r = design_damper(**project.design_kwargs())
    assert r.acceleration_with_margin == pytest.approx(r.acceleration_with_damper * 1.1,
                                                       rel=1e-15)
    with pytest.raises(ValueError, match=r"comfort_margin=-0\.1 must be in \[0, 0\.5\]"):
        design_damper(**{**project.design_kwargs(), "comfort_margin": -0.1})


def test_workbook_spreadsheet_function_and_recalc_summary(declared, tmp_path):
    project = parse_project(PROJECT, source="margin.toml")
    path = tmp_path / "margin.xlsx"
    built = write_workbook(project, path)
    names = built.names
    for name in ("comfort_margin", "comfort_margin_entered", "comfort_margin_unit",
                 "acceleration_with_margin", "engine_acceleration_with_margin"):
        assert name in names, name
    sheet, ref = names["acceleration_with_margin"]
    assert built.workbook[sheet][ref].value == "=acceleration_with_damper*(1+comfort_margin)"
    assert built.value("acceleration_with_margin") == pytest.approx(
        built.result.acceleration_with_margin, rel=1e-12)
    assert built.value("all_cross_checks") == "OK"
    # the input row carries the declaration's texts and range
    row = [c.value for c in built.workbook["Inputs"][int(names["comfort_margin_entered"][1][1:])]]
    assert MARGIN.label in row and MARGIN.note in " ".join(str(v) for v in row if v)

    fn = next(f for f in design_sheet_functions() if f.name == "SWAY_DESIGN")
    arg = next(a for a in fn.arguments if a.name == "comfort_margin")
    assert arg.optional and arg.default == 0.0 and "[0, 0.5]" in arg.help
    assert "acceleration_with_margin" in [f[0] for f in fn.fields]

    res = recalc_workbook(path, inputs={"comfort_margin": 0.2})
    assert res.status == "OK", res.error or [str(i) for i in res.issues]
    assert res.results["acceleration_with_margin"] == pytest.approx(
        res.results["acceleration_with_damper"] * 1.2, rel=1e-12)
    row = summary_row(res)
    assert row[f"{WITH_MARGIN.label} [m/s^2]"] == res.results["acceleration_with_margin"]


def test_nothing_else_was_edited():
    # the declarations above are the whole addition: the fixture adds them to the engine's
    # tuples and to the chain, and every medium derives from those
    assert dataclasses.is_dataclass(MARGIN) and STEP.is_twin
