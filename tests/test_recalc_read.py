# SPDX-License-Identifier: MIT
"""Reading a workbook for recalculation (workbook_builder.recalc.read).

Inputs are read only through the plan's defined names, as typed with their units; a damaged
layout (a missing name), an unknown unit, a value that is not a number or is out of range, and
workbooks of another format or generator are refused with the reason. Reference values are
the example projects' inputs (example_workbooks/*.toml) converted with the exact unit factors
named beside them.
"""
from __future__ import annotations

import openpyxl
import pytest
from openpyxl.packaging.custom import StringProperty

from workbook_builder.plan import FORMAT_NAME, PLAN_VERSION
from workbook_builder.recalc import read_inputs, read_workbook, recalc_workbook
from workbook_builder.recalc.read import SIMULATION_PROPERTY
from workbook_builder.xlsx.files import mark_workbook

from recalc_helpers import ROOT, cell_of, copy_to, set_cells
from workbook_cases import NAMES, example_project

# The fixture ``built`` (the example workbooks and a den_hartog one) is in conftest.py.


# ----------------------------------------------------- reading, inputs as typed
def test_read_inputs_as_the_project_file_writes_them(built):
    # residential_tower.toml: 24,000 t, 1.2 %, 21 and 13 milli-g (the project file's own
    # values: read back as typed, with their units)
    kw = read_inputs(built["residential_tower"])
    assert kw["modal_mass"] == {"value": 24000.0, "unit": "t"}
    assert kw["structural_damping"] == {"value": 1.2, "unit": "%"}
    assert kw["acceleration"] == {"value": 21.0, "unit": "milli-g"}
    assert kw["acceleration_limit"] == {"value": 13.0, "unit": "milli-g"}
    assert kw["tuning_method"] == "h2"
    assert "mass_ratio" not in kw and "damper_mass" not in kw      # sized by the engine
    data = read_workbook(built["residential_tower"])
    assert data.typed["modal_mass"] == (24000.0, "t")
    # the engine's SI values: 1 t = 1000 kg (SI Brochure); g_n = 9.80665 m/s^2 (3rd CGPM 1901)
    si = data.design_kwargs
    assert si["modal_mass"] == pytest.approx(24000 * 1000.0, rel=1e-15)
    assert si["acceleration"] == pytest.approx(21 * 9.80665 / 1000, rel=1e-15)


def test_read_inputs_us_units(built):
    # office_tower_us.toml: 70,000 kip (1 kip = 453.59237 kg, exact; NIST SP 811 App. B),
    # 60 in clearance (0.0254 m exact).
    kw = read_inputs(built["office_tower_us"])
    assert kw["modal_mass"] == {"value": 70000.0, "unit": "kip"}
    assert kw["clearance"] == {"value": 60.0, "unit": "in"}
    si = read_workbook(built["office_tower_us"]).design_kwargs
    assert si["modal_mass"] == pytest.approx(70000 * 453.59237, rel=1e-15)
    assert si["clearance"] == pytest.approx(60 * 0.0254, rel=1e-15)
    assert si["mass_ratio"] == pytest.approx(0.02, rel=1e-15)


def test_read_inputs_matches_project(built):
    for name in NAMES:
        project = example_project(name)
        data = read_workbook(built[name])
        for key, item in project.inputs.items():
            if isinstance(item.si, str):                  # a choice (tuning method)
                assert data.project.inputs[key].si == item.si
                continue
            assert data.project.inputs[key].si == pytest.approx(item.si, rel=1e-15), key
        assert data.project.tuning_method == project.tuning_method
        assert (data.project.floors is None) == (project.floors is None)


@pytest.mark.parametrize("unit", ["kg", "tons"])
def test_a_changed_unit_is_refused_naming_the_cell(built, tmp_path, unit):
    """Units are set when the workbook is built (their cells are locked): a unit changed anyway
    is refused with the cell, the old and the new unit, and what to do (our own rule)."""
    path = copy_to(built["residential_tower"], tmp_path)
    sheet, coord = cell_of(path, "modal_mass_unit")
    set_cells(path, {cell_of(path, "modal_mass_entered"): 24_000_000, (sheet, coord): unit})
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "FAILED" and not (tmp_path / "out").exists()
    assert f"({sheet}!{coord}) was changed from 't' to '{unit}'" in res.error
    assert "type the value in t" in res.error


def test_input_outside_valid_range_fails(built, tmp_path):
    path = copy_to(built["residential_tower"], tmp_path)
    set_cells(path, {cell_of(path, "structural_damping_entered"): 50})     # 50 % > 20 %
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "FAILED"
    assert "outside their valid range" in res.error and "structural_damping=50 %" in res.error
    assert not (tmp_path / "out").exists()


def test_input_not_a_number_fails(built, tmp_path):
    path = copy_to(built["residential_tower"], tmp_path)
    set_cells(path, {cell_of(path, "clearance_entered"): "1.6 m"})
    res = recalc_workbook(path)
    assert res.status == "FAILED" and "'1.6 m', not a number" in res.error


# ------------------------------------------- names, labels, document properties
def test_missing_name_fails(built, tmp_path):
    path = copy_to(built["residential_tower"], tmp_path)
    set_cells(path, {}, delete_names=("clearance",))
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "FAILED"
    assert "missing defined name(s) clearance" in res.error and "rebuild" in res.error


def test_missing_result_name_fails(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    set_cells(path, {}, delete_names=("stroke",))
    res = recalc_workbook(path)
    assert res.status == "FAILED" and "stroke" in res.error


def test_renaming_every_label_changes_nothing_recalc_reads(built, tmp_path):
    """A firm translates or rewords every label of the workbook: recalc reads and reports the
    same (it reads cells only through the plan's defined names)."""
    for name in ("residential_tower", "observation_mast", "office_tower_us"):
        path = copy_to(built[name], tmp_path / "labels")
        plan = read_workbook(path).plan
        wb = openpyxl.load_workbook(path)
        renamed = 0
        for sheet, cell in plan.cells():
            if cell.kind == "label" and isinstance(cell.content, str) and cell.content:
                wb[sheet][cell.ref].value = "Übersetzt: " + cell.content[::-1]
                renamed += 1
        wb.save(path)
        assert renamed > 200
        a = recalc_workbook(built[name], inputs={"frequency": 0.21})
        b = recalc_workbook(path, inputs={"frequency": 0.21})
        assert b.status == a.status and b.error is None, b.error
        assert [str(i) for i in b.issues] == [str(i) for i in a.issues]
        assert b.checks == a.checks
        for key, value in a.results.items():
            if isinstance(value, float):
                assert b.results[key] == pytest.approx(value, rel=1e-15), key


def test_unreadable_simulation_property_is_noted(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    wb = openpyxl.load_workbook(path)
    wb.custom_doc_props.append(StringProperty(name=SIMULATION_PROPERTY, value="{broken"))
    wb.save(path)
    res = recalc_workbook(path)
    assert res.status == "OK"
    assert read_workbook(path).project.simulation is None
    assert any(i.kind == "note" and i.where == SIMULATION_PROPERTY and "not JSON" in i.message
               for i in res.issues)


# ------------------------------------------------ format and generator refusals
def test_newer_format_fails(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    set_cells(path, {}, add_names={FORMAT_NAME: "99"})
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "FAILED" and "newer" in res.error


def test_newer_generator_version_fails(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    wb = openpyxl.load_workbook(path)
    mark_workbook(wb, "99.0.0")
    wb.save(path)
    res = recalc_workbook(path)
    assert res.status == "FAILED" and "newer" in res.error and "99.0.0" in res.error


def test_not_a_swaytune_workbook_fails(tmp_path):
    wb = openpyxl.Workbook()
    wb.active["A1"] = 1
    wb.save(tmp_path / "other.xlsx")
    res = recalc_workbook(tmp_path / "other.xlsx")
    assert res.status == "FAILED" and "not a swaytune workbook" in res.error


def test_workbook_of_swaytune_0_1_is_refused_with_how_to_rebuild(tmp_path):
    """A workbook built by swaytune 0.1.0 (layout format 2; tests/data) is refused: its cells
    are found only by their labels. The message says how to rebuild it."""
    old = ROOT / "tests" / "data" / "format2_office_tower_us.xlsx"
    res = recalc_workbook(old, outdir=tmp_path / "o")
    assert res.status == "FAILED"
    assert "layout format 2 (swaytune 0.1)" in res.error
    assert "swaytune build PROJECT.toml -o NEW.xlsx" in res.error and "Record sheet" in res.error
    assert not (tmp_path / "o").exists()


def test_workbook_without_format_mark_is_refused(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    assert read_workbook(path).book.defined_names[FORMAT_NAME].attr_text == str(PLAN_VERSION)
    set_cells(path, {}, delete_names=(FORMAT_NAME,))
    res = recalc_workbook(path)
    assert res.status == "FAILED" and "layout format 1" in res.error


def test_bad_format_mark_fails(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    set_cells(path, {}, add_names={FORMAT_NAME: '"two"'})
    res = recalc_workbook(path)
    assert res.status == "FAILED" and "is not a number" in res.error

