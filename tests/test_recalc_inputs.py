# SPDX-License-Identifier: MIT
"""Inputs in the project file's convention (workbook_builder.recalc.inputs) and the report of
the user's edits.

The API takes and returns inputs as the project file does: SI numbers, ``{value, unit}`` or
``"25 milli-g"``; ``recalc_workbook(p, inputs=read_inputs(p))`` changes nothing; every design
input can be overridden, also one the workbook's layout has no row for (the workbook is then
rebuilt from its own inputs). An input edited in a spreadsheet application and saved is
reported as "old -> new" in the unit shown beside it, whichever application saved the file.
Unit factors: 1 t = 1000 kg (SI Brochure); g_n = 9.80665 m/s^2 (3rd CGPM 1901); 1 ft = 0.3048 m
(exact, NIST SP 811 (2008) App. B). The rest are our own rules (common practice, no source).
"""
from __future__ import annotations

import concurrent.futures as cf
import dataclasses

import openpyxl
import pytest

from functions.design import ACCELERATION_RTOL
from functions.quantities import quantity
from workbook_builder.build import build_workbook, write_workbook
from workbook_builder.project import parse_project
from workbook_builder.recalc import (RecalcError, parse_overrides, read_inputs, recalc_many,
                                     recalc_workbook, write_results)
from workbook_builder.xlsx import gnumeric, libreoffice

from recalc_helpers import assert_numbers_equal, cell_of, cell_values, copy_to, needs_soffice

MILLI_G = 9.80665e-3


# ----------------------------------------------------------------------- parse_overrides
@pytest.mark.parametrize("raw, si", [
    (0.24516625, 0.24516625),                                   # SI number
    ({"value": 25, "unit": "milli-g"}, 25 * MILLI_G),
    ("25 milli-g", 25 * MILLI_G),
    ("  2.5e1   milli-g ", 25 * MILLI_G),
    ("0.8 ft/s^2", 0.8 * 0.3048),
])
def test_an_override_is_written_as_the_project_file_writes_it(raw, si):
    o = parse_overrides({"acceleration": raw})["acceleration"]
    assert o.si == pytest.approx(si, rel=1e-15)


def test_an_override_typed_in_the_cell_unit_is_kept_exactly():
    o = parse_overrides({"acceleration": "25 milli-g"})["acceleration"]
    assert o.typed_in("milli-g") == 25.0                          # no round trip through SI
    assert o.typed_in("m/s^2") == pytest.approx(25 * MILLI_G, rel=1e-15)
    si = parse_overrides({"acceleration": 0.24516625})["acceleration"]
    assert si.typed_in("milli-g") == pytest.approx(25.0, rel=1e-15)


def test_defined_names_choices_and_left_out_inputs():
    o = parse_overrides({"structure_frequency": 0.2, "tuning_method": "hinf",
                         "mass_ratio": None})
    assert o["frequency"].si == 0.2 and o["tuning_method"].si == "hinf"
    assert o["mass_ratio"].si is None


@pytest.mark.parametrize("overrides, message", [
    ({"frequency": "fast"}, r"input frequency: 'fast' is not a number with a unit"),
    ({"frequency": True}, r"input frequency: True must be a number"),
    ({"frequency": float("nan")}, r"not a finite number"),
    ({"frequency": {"value": 1}}, None),                           # SI unit implied: valid
    ({"frequency": {"unit": "Hz"}}, r"must be a table with 'value' and 'unit'"),
    ({"modal_mass": "5 parsecs"}, r"unit 'parsecs' is not a mass unit"),
    ({"structural_damping": "30 %"}, r"30 % must be in \(0, 20\] \[%\]"),
    ({"frequency": None}, r"input frequency cannot be left out"),
    ({"tuning_method": "best"}, r"'best' must be one of"),
    ({"frequency": 0.2, "structure_frequency": 0.3}, r"given twice"),
    ({"frequncy": 0.2}, r"unknown input 'frequncy'; the inputs are frequency, "),
])
def test_bad_overrides_name_the_input_the_value_and_the_range(overrides, message):
    if message is None:
        parse_overrides(overrides)
        return
    with pytest.raises(RecalcError, match=message):
        parse_overrides(overrides)


# ----------------------------------------------------------------------- round trip
@pytest.mark.parametrize("name", ["residential_tower", "office_tower_us", "observation_mast",
                                  "den_hartog"])
def test_read_inputs_round_trip_changes_nothing(built, tmp_path, name):
    kw = read_inputs(built[name])
    res = recalc_workbook(built[name], output=tmp_path / "same.xlsx", inputs=kw)
    assert res.status == "OK" and res.changes == [], res.error or res.changes
    assert not [i for i in res.issues if i.kind == "note"]
    assert_numbers_equal(cell_values(res.output), cell_values(built[name]), rel=1e-15)


# ----------------------------------------------------------------------- the edits report
def _with_acceleration(built, tmp_path, value: float):
    """The residential tower with its acceleration (typed in milli-g) changed as in a
    spreadsheet application: the typed cell only, cached values of the last engine run."""
    src = built["residential_tower"]
    path = tmp_path / "edited.xlsx"
    write_results(src, path, constants={cell_of(src, "acceleration_entered"): value})
    return path


def _assert_reports_the_edit(res):
    assert not res.failed, res.error
    inputs = res.changed("input")
    assert [str(c) for c in inputs] == [
        f"{quantity('acceleration').label}: 21 -> 25 milli-g"]
    results = {c.name: c for c in res.changed("result")}
    quantities = __import__("functions").quantities
    assert set(results) <= {q.cell_name for q in quantities.design_results()
                            + quantities.PART_RESULTS if q.summary}
    assert "mass_ratio" in results and "damper_mass" in results
    assert results["damper_mass"].unit == "kg" and results["damper_mass"].new > \
        results["damper_mass"].old
    for c in res.changes:                     # never an internal helper value
        assert not c.name.startswith(("var_", "engine_flag", "warburton"))


def test_an_edit_saved_without_cached_values_is_reported_in_the_typed_unit(built, tmp_path):
    """Saved by openpyxl (no cached values at all): the edit is still "21 -> 25 milli-g"."""
    path = _with_acceleration(built, tmp_path, 25.0)
    wb = openpyxl.load_workbook(path)
    wb.save(path)
    res = recalc_workbook(path, outdir=tmp_path / "out")
    _assert_reports_the_edit(res)
    again = recalc_workbook(res.output)                 # recalculated: nothing new to report
    assert again.changes == []


@needs_soffice
def test_an_edit_saved_by_libreoffice_is_reported_in_the_typed_unit(built, tmp_path):
    """LibreOffice recalculates the cached values when it saves: the report still lists the
    user's edit, old -> new in milli-g, then the key results, never internal values."""
    path = _with_acceleration(built, tmp_path, 25.0)
    saved = libreoffice.recalculate(path, tmp_path / "lo")
    res = recalc_workbook(saved, outdir=tmp_path / "out")
    _assert_reports_the_edit(res)


@pytest.mark.skipif(gnumeric.find_ssconvert() is None, reason="Gnumeric (ssconvert) is not "
                    "installed: apt-get install gnumeric")
def test_an_edit_saved_by_gnumeric_is_reported_in_the_typed_unit(built, tmp_path):
    path = _with_acceleration(built, tmp_path, 25.0)
    saved = gnumeric.recalculate(path, tmp_path / "gn")
    res = recalc_workbook(saved, outdir=tmp_path / "out")
    _assert_reports_the_edit(res)


# ----------------------------------------------------------------------- every input
def _fresh(project, **changes):
    inputs = dict(project.inputs)
    for key, value in changes.items():
        q = quantity(key)
        if q.kind == "choice":
            inputs[key] = dataclasses.replace(project.inputs[key], value=value, si=value)
        else:
            template = next(iv for iv in project.inputs.values() if iv.unit is not None
                            and iv.quantity.kind == q.kind)
            inputs[key] = dataclasses.replace(template, quantity=q, value=value,
                                              si=value * template.unit.factor)
    return build_workbook(dataclasses.replace(project, inputs=inputs))


@pytest.mark.parametrize("overrides", [{"mass_ratio": 0.03}, {"tuning_method": "hinf"},
                                       {"mass_ratio": 0.03, "tuning_method": "den_hartog"}])
def test_any_input_overrides_even_one_without_a_row(built, tmp_path, overrides):
    """The residential tower is sized with the required mass ratio and h2: a given mass ratio
    or another tuning method needs another layout, so the workbook is rebuilt from its own
    inputs; it equals a fresh build of the project with those inputs."""
    project = parse_project({"mode": {"frequency": 0.2, "modal_mass":
                                      {"value": 9000, "unit": "t"}, "structural_damping": 0.01},
                             "wind": {"acceleration": 0.25, "acceleration_limit": 0.15},
                             "damper": {"clearance": 1.5}}, source="req.toml")
    src = tmp_path / "req.xlsx"
    write_workbook(project, src)
    res = recalc_workbook(src, output=tmp_path / "new.xlsx", inputs=overrides)
    assert res.status in ("OK", "NOT OK"), res.error or [str(i) for i in res.issues]
    assert any(i.kind == "note" and "new layout" in i.message for i in res.issues)
    back = read_inputs(res.output)
    if "mass_ratio" in overrides:
        assert back["mass_ratio"] == {"value": 0.03, "unit": "-"}
    assert back["tuning_method"] == overrides.get("tuning_method", "h2")
    fresh = _fresh(project, **overrides)
    got = cell_values(res.output)
    for (sheet, coord), v in fresh.values.items():
        if isinstance(v, float) and sheet in ("Calculation", "Summary"):
            assert got[(sheet, coord)] == pytest.approx(v, rel=1e-12, abs=1e-300)
    # the input left out again: back to the required mass ratio (and the original layout)
    if overrides == {"mass_ratio": 0.03}:
        undo = recalc_workbook(res.output, output=tmp_path / "undo.xlsx",
                               inputs={"mass_ratio": None})
        assert undo.status == "OK" and "mass_ratio" not in read_inputs(undo.output)
        assert undo.results["mass_ratio"] == pytest.approx(
            recalc_workbook(src).results["mass_ratio"], rel=1e-12)


def test_a_required_mass_ratio_meets_the_limit_with_every_method(built, tmp_path):
    """Overriding the tuning method of a required-mass-ratio workbook: the new required damper
    meets the acceleration limit with that method (issue acceptance)."""
    src = tmp_path / "req.xlsx"
    write_workbook(parse_project({"mode": {"frequency": 0.2, "modal_mass": 9e6,
                                           "structural_damping": 0.01},
                                  "wind": {"acceleration": 0.25, "acceleration_limit": 0.15},
                                  "damper": {"clearance": 1.5}}, source="req.toml"), src)
    for method in quantity("tuning_method").choices:
        res = recalc_workbook(src, output=tmp_path / f"{method}.xlsx",
                              inputs={"tuning_method": method})
        if method == "robust":            # tuned for a band: refused without one, saying so
            assert res.failed and "give band_lower and band_upper" in res.error
            continue
        assert not res.failed, res.error
        a = res.results["acceleration_with_damper"]
        assert a <= 0.15 * (1 + ACCELERATION_RTOL), (method, a)


def test_a_layout_change_is_refused_where_a_rebuild_would_lose_work(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    wb = openpyxl.load_workbook(path)
    wb.create_sheet("Our costing")["A1"] = "kept by hand"
    wb.save(path)
    res = recalc_workbook(path, outdir=tmp_path / "out", inputs={"tuning_method": "h2"})
    assert res.status == "FAILED" and "Our costing" in res.error
    assert "swaytune build" in res.error and not (tmp_path / "out").exists()


# ----------------------------------------------------------------------- batches
def test_recalc_many_takes_overrides_and_any_executor(built, tmp_path):
    """The same overrides for every workbook; a process pool gives what a serial run gives."""
    folder = tmp_path / "in"
    for name in ("den_hartog", "residential_tower"):
        copy_to(built[name], folder)
    serial = recalc_many([folder], outdir=tmp_path / "a", progress=False,
                         inputs={"frequency": "0.21 Hz"})
    with cf.ProcessPoolExecutor(max_workers=2) as pool:
        pooled = recalc_many([folder], outdir=tmp_path / "b", progress=False,
                             inputs={"frequency": "0.21 Hz"}, executor=pool)
    assert [r.status for r in serial.results] == [r.status for r in pooled.results]
    for a, b in zip(serial.results, pooled.results):
        assert a.results["structure_frequency"] == b.results["structure_frequency"] == 0.21
        assert a.results == b.results and [str(c) for c in a.changes] == [
            str(c) for c in b.changes]
    with pytest.raises(ValueError, match="unknown input 'speed'"):
        recalc_many([folder], outdir=tmp_path / "c", progress=False, inputs={"speed": 1})
    assert not (tmp_path / "c").exists()


def test_in_place_backs_up_only_a_changed_workbook_once(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    first = recalc_workbook(path, in_place=True)
    assert first.output == path and first.backup is None and not first.rewritten
    assert sorted(p.name for p in tmp_path.iterdir()) == [path.name]
    for f in (0.21, 0.22):
        res = recalc_workbook(path, in_place=True, inputs={"frequency": f})
        assert res.rewritten and res.backup == path.with_name(path.name + ".bak")
    assert sorted(p.name for p in tmp_path.iterdir()) == [path.name, path.name + ".bak"]
    assert read_inputs(path.with_name(path.name + ".bak"))["frequency"]["value"] == 0.21
    kept = recalc_workbook(path, in_place=True, inputs={"frequency": 0.23}, keep_backups=True)
    assert kept.backup.name.startswith(path.name + ".") and kept.backup.name.endswith(".bak")
    assert len(list(tmp_path.glob("*.bak"))) == 2


def test_the_in_place_summary_goes_next_to_the_workbooks(built, tmp_path, monkeypatch):
    folder = tmp_path / "project"
    copy_to(built["den_hartog"], folder)
    elsewhere = tmp_path / "cwd"
    elsewhere.mkdir()
    monkeypatch.chdir(elsewhere)
    batch = recalc_many([folder], in_place=True, progress=False)
    assert batch.summary_csv.parent == folder and not list(elsewhere.iterdir())
