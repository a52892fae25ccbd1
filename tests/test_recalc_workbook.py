# SPDX-License-Identifier: MIT
"""Recalculating one workbook (workbook_builder.recalc.workbook).

Reference values come from the builder itself: a workbook recalculated after an input change
must hold, cell for cell, what ``build_workbook`` writes for a project with that input (the
engine behind both is tested against published sources in test_design.py / test_damper.py).
Engine values are written where the plan's names point, verdicts follow the engine, and the
updated copy is written atomically (in place with a backup, never over a foreign file).
"""
from __future__ import annotations

import dataclasses
import gc
import os
import shutil
import stat

import openpyxl
import pytest
from openpyxl.workbook.defined_name import DefinedName

from workbook_builder.build import build_workbook, write_workbook
from workbook_builder.project import load_project, parse_project
from workbook_builder.recalc import (RecalcError, parse_overrides, read_inputs, read_workbook,
                                     recalc_many, recalc_workbook, write_results)
from workbook_builder.recalc import workbook as recalc_module
from workbook_builder.xlsx import libreoffice, rewrite
from workbook_builder.xlsx.cached import formula_cells

from recalc_helpers import (assert_numbers_equal, cell_of, cell_values, copy_to, needs_soffice,
                            set_cells)
from workbook_cases import DEN_HARTOG, EXAMPLES, NAMES, example_project

# The fixture ``built`` (the example workbooks and a den_hartog one) is in conftest.py.


# ----------------------------------------------------------------------- safety
def test_garbage_collector_restored_after_success_and_failure(built, tmp_path):
    assert gc.isenabled()
    recalc_workbook(built["den_hartog"], outdir=tmp_path / "a")
    assert gc.isenabled()
    junk = tmp_path / "junk.xlsx"
    junk.write_bytes(b"not a zip")
    assert recalc_workbook(junk, outdir=tmp_path / "b").status == "FAILED"
    assert gc.isenabled()


# ---------------------------------------------------------------- recalculation
@pytest.mark.parametrize("name", NAMES + ["den_hartog"])
def test_recalc_unchanged_workbook_is_identical(built, tmp_path, name):
    res = recalc_workbook(built[name], outdir=tmp_path)
    assert res.status == "OK", res.error or [str(i) for i in res.issues]
    assert res.issues == [] and res.changes == []
    assert formula_cells(res.output) == formula_cells(built[name])
    n = assert_numbers_equal(cell_values(res.output), cell_values(built[name]), rel=1e-15)
    assert n > 500


@pytest.mark.parametrize("name,change", [
    ("residential_tower", {"frequency": 0.205}),            # h2: engine values, flags
    ("observation_mast", {"acceleration": 0.36}),           # floor table, chosen mass
    ("office_tower_us", {"clearance": "40 ft"}),              # US units, stroke check fails
    ("den_hartog", {"modal_mass": {"value": 12000.0, "unit": "t"}}),     # closed forms
    # the design envelope: extreme level, frequency band, second direction, comfort criterion
    ("slender_tower_us", {"extreme_acceleration": "70 milli-g"}),
    ("slender_tower_us", {"band_lower": 0.85}),
    ("slender_tower_us", {"frequency_2": 0.135}),
    ("slender_tower_us", {"return_period": 5.0}),
    ("slender_tower_us", {"floor_ordinate": 0.9}),
])
def test_recalc_equals_fresh_build(built, tmp_path, name, change):
    """Recalculated workbook == the builder's workbook for the changed inputs, every cell."""
    res = recalc_workbook(built[name], outdir=tmp_path, inputs=change)
    assert not res.failed, res.error
    # The project with the same change, built from scratch.
    project = (parse_project(DEN_HARTOG, source="den_hartog.toml") if name == "den_hartog"
               else example_project(name))
    (key, raw), = change.items()
    iv = project.inputs[key]
    value = parse_overrides(change)[key].typed_in(iv.unit.symbol)
    inputs = dict(project.inputs)
    inputs[key] = dataclasses.replace(iv, value=value, si=value * iv.unit.factor)
    fresh = build_workbook(dataclasses.replace(project, inputs=inputs))
    fresh_values = {k: v for k, v in fresh.values.items()}
    for ws in fresh.workbook.worksheets:
        for row in ws.iter_rows():
            for c in row:
                if c.data_type != "f" and c.value is not None:
                    fresh_values[(ws.title, c.coordinate)] = c.value
    got = cell_values(res.output)
    n = assert_numbers_equal(got, fresh_values, rel=1e-12,
                              sheets={"Inputs", "Calculation", "Pendulum", "Checks", "Charts",
                                      "Names", "Summary", "Band", "Comfort"})
    assert n > 700
    # text results (verdicts, flags) too
    for where, v in fresh_values.items():
        if v in ("OK", "NOT OK", "current", "INPUTS CHANGED: rebuild"):
            assert got.get(where) == v, where
    # what changed is reported with old and new values, the input first
    assert res.changes[0].kind == "input" and res.changes[0].name == key
    assert res.changes[0].old == iv.value and res.changes[0].new == value
    assert res.issues == [] or all(i.kind not in ("formula_edited", "engine_mismatch")
                                   for i in res.issues)


def test_recalc_after_user_edit_and_stale_flags(built, tmp_path):
    """An input typed in a spreadsheet program (cached values stale) is recalculated."""
    path = copy_to(built["residential_tower"], tmp_path)
    set_cells(path, {cell_of(path, "structure_frequency_entered"): 0.18})
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "OK", res.checks
    assert res.results["structure_frequency"] == 0.18
    # Every engine value current again (the flag compares snapshots with the inputs).
    assert all(v in ("current", "OK") for k, v in res.results.items()
               if k.startswith("engine_flag") and not k.count("_") > 3)
    ref = recalc_workbook(built["residential_tower"], inputs={"frequency": 0.18})
    assert res.results["tuning_ratio"] == ref.results["tuning_ratio"]


def test_changes_old_and_new(built, tmp_path):
    res = recalc_workbook(built["den_hartog"], outdir=tmp_path, inputs={"frequency": 0.25})
    changes = {c.name: (c.old, c.new) for c in res.changes}
    assert changes["frequency"] == (0.2, 0.25)
    old, new = changes["damper_frequency"]
    # f_d = f f_s with Den Hartog's f = 1/(1+mu) (Den Hartog 1956, s3.3), mu = 0.02
    assert old == pytest.approx(0.2 / 1.02, rel=1e-14)
    assert new == pytest.approx(0.25 / 1.02, rel=1e-14)
    assert "tuning_ratio" not in changes          # depends on the mass ratio only


def test_dry_run_writes_nothing(built, tmp_path):
    before = set(built["den_hartog"].parent.iterdir())
    res = recalc_workbook(built["den_hartog"])
    assert res.status == "OK" and res.output is None
    assert set(built["den_hartog"].parent.iterdir()) == before


def test_unevaluable_formula_fails(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    sheet, coord = cell_of(path, "stroke")
    set_cells(path, {(sheet, coord): "=stroke_ratio*structure_displacement)"})   # malformed
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "FAILED" and "cannot be evaluated" in res.error
    assert not (tmp_path / "out").exists()


# ------------------------------------------------------ engine values, verdicts
def test_engine_values_written_through_the_plans_names(built, tmp_path):
    """Engine values go where the workbook's names point, wherever that is."""
    res = recalc_workbook(built["den_hartog"], outdir=tmp_path / "o", inputs={"frequency": 0.3})
    got = cell_values(res.output)
    sheet, coord = cell_of(res.output, "engine_damper_frequency")
    # Den Hartog's f = 1/(1+mu) (Den Hartog 1956, s3.3): f_d = 0.3 / 1.02
    assert got[(sheet, coord)] == pytest.approx(0.3 / 1.02, rel=1e-15)
    # a named engine value whose name was deleted: the layout is damaged -> FAILED
    path = copy_to(built["den_hartog"], tmp_path / "moved")
    set_cells(path, {}, delete_names=("engine_stroke",))
    moved = recalc_workbook(path, outdir=tmp_path / "o2")
    assert moved.status == "FAILED" and "engine_stroke" in moved.error
    assert not (tmp_path / "o2" / path.name).exists()


def test_nonlinear_sheet_rerun_by_recalc(tmp_path):
    """recalc reruns the time-domain simulation: after an input edit the Nonlinear sheet equals
    a fresh build for the new inputs (same seed), and every engine flag is current."""
    project = load_project(EXAMPLES / "residential_tower.toml")
    path = tmp_path / "sim.xlsx"
    write_workbook(project, path)
    same = recalc_workbook(path)
    assert same.status == "OK", [str(i) for i in same.issues]
    changed = recalc_workbook(path, outdir=tmp_path / "o", inputs={"frequency": 0.2})
    assert changed.status in ("OK", "NOT OK"), [str(i) for i in changed.issues]
    assert not [i for i in changed.issues if i.kind == "stale_engine_value"]
    flags = {k: changed.results[k] for k in ("engine_flag_mass_ratio", "engine_flag_tuning",
                                             "engine_flag_simulation")}
    assert list(flags.values()) == ["current", "current", "current"]
    iv = project.inputs["frequency"]
    inputs = dict(project.inputs)
    inputs["frequency"] = dataclasses.replace(iv, value=0.2, si=0.2)
    fresh = build_workbook(dataclasses.replace(project, inputs=inputs))
    fresh_values = dict(fresh.values)
    for c in (c for row in fresh.workbook["Nonlinear"].iter_rows() for c in row):
        if c.data_type != "f" and c.value is not None:
            fresh_values[("Nonlinear", c.coordinate)] = c.value
    n = assert_numbers_equal(cell_values(changed.output), fresh_values, rel=1e-12,
                             sheets={"Nonlinear"})
    assert n > 5000
    # a hand edit is still found on every sheet, the Nonlinear one included
    sheet, coord = cell_of(path, "damper_frequency")
    set_cells(path, {(sheet, coord): "=tuning_ratio*structure_frequency*1.02"})
    edited = recalc_workbook(path)
    assert [i.where for i in edited.issues if i.kind == "formula_edited"] == [f"{sheet}!{coord}"]
    assert edited.status == "EDITED"
    # the [simulation] settings travel with the workbook (document property)
    assert read_workbook(path).project.simulation == project.simulation
    assert not [i for i in edited.issues if i.kind == "note"]


def test_firm_template_workbook(tmp_path):
    """A workbook built on a firm's template: its own sheet is kept, our formulas compared."""
    firm = openpyxl.Workbook()
    cover = firm.active
    cover.title = "Calc cover"
    cover["A3"], cover["B3"] = "Job", "(fill)"
    cover["A5"], cover["B5"] = "Damper mass [kg]", "=damper_mass"   # shows one of our names
    cover["A6"], cover["B6"] = "Firm-only function", "=VLOOKUP(1,A1:A2,1,FALSE)"
    firm.defined_names.add(DefinedName("TB_PROJECT_NUMBER", attr_text="'Calc cover'!$B$3"))
    firm.save(tmp_path / "firm.xlsx")
    out = tmp_path / "on_template.xlsx"
    write_workbook(parse_project(DEN_HARTOG, source="t.toml"), out,
                   template=tmp_path / "firm.xlsx")
    res = recalc_workbook(out, outdir=tmp_path / "o", inputs={"modal_mass": "12000 t"})
    assert res.status == "OK", res.error or [str(i) for i in res.issues]
    assert not [i for i in res.issues if i.kind.startswith("formula")]
    assert any(i.kind == "note" and "Calc cover" in i.where for i in res.issues)  # VLOOKUP
    got = cell_values(res.output)
    # M* = 12,000 t, mu = 0.02 -> m_d = 240,000 kg
    assert got[("Calc cover", "B5")] == pytest.approx(240_000.0, rel=1e-15)
    assert formula_cells(res.output)[("Calc cover", "B6")] == "=VLOOKUP(1,A1:A2,1,FALSE)"
    assert read_workbook(res.output).book.named("TB_PROJECT_NUMBER").value == "T-6"


# ---------------------------------------------------------------------- writing
def test_in_place_keeps_backup_and_is_atomic(built, tmp_path, monkeypatch):
    path = copy_to(built["den_hartog"], tmp_path)
    original = path.read_bytes()
    res = recalc_workbook(path, in_place=True, inputs={"frequency": 0.22})
    assert res.status == "OK" and res.output == path
    assert res.backup is not None and res.backup.read_bytes() == original
    assert read_inputs(path)["frequency"]["value"] == 0.22
    # a failure while writing leaves the file as it was and no temporary file
    before = path.read_bytes()

    def boom(*a, **k):
        raise OSError("disk full (simulated)")

    monkeypatch.setattr(rewrite, "rewrite_cells", boom)
    res2 = recalc_workbook(path, in_place=True, backup=False, inputs={"frequency": 0.23})
    assert res2.status == "FAILED" and "disk full" in res2.error
    assert path.read_bytes() == before
    assert sorted(p.name for p in tmp_path.iterdir() if p.name.startswith(".")) == []


@pytest.mark.parametrize("name, value, message", [
    ("frequency", 1e-300, r"frequency: 1e-300 Hz must be in \[0\.01, 20\] \[Hz\]"),
    ("frequency", 1e300, r"frequency: 1e\+300 Hz must be in \[0\.01, 20\]"),
    ("modal_mass", 1e300, r"modal_mass: 1e\+300 kg must be in"),
    ("modal_mass", "1e300 t", r"modal_mass: 1e\+300 t must be in \(0, 1e\+08\] \[t\]"),
    ("acceleration", "25 parsecs", r"acceleration: unit 'parsecs' is not a acceleration unit"),
    ("tuning_method", "best", r"tuning_method: 'best' must be one of"),
    ("frequncy", 0.2, r"unknown input 'frequncy'"),
])
def test_bad_overrides_are_refused_before_any_work(built, tmp_path, name, value, message):
    """Before: ``frequency = 1e-300`` gave "unexpected error (ZeroDivisionError)". A bad
    override is an argument error: it names the input, the value and the valid range, and
    nothing is read or written."""
    with pytest.raises(ValueError, match=message):
        recalc_workbook(built["den_hartog"], outdir=tmp_path, inputs={name: value})
    assert not list(tmp_path.iterdir())


def test_a_failed_write_leaves_no_backup(built, tmp_path, monkeypatch):
    """A full disk while writing: the original is untouched, so no backup may be left beside it
    (before: .bak files of 0-40 KB next to workbooks that were never modified)."""
    path = copy_to(built["den_hartog"], tmp_path)
    before = path.read_bytes()

    def boom(*a, **k):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(rewrite, "rewrite_cells", boom)
    res = recalc_workbook(path, in_place=True, inputs={"frequency": 0.23})
    assert res.status == "FAILED" and "No space left" in res.error and res.backup is None
    assert path.read_bytes() == before
    assert sorted(p.name for p in tmp_path.iterdir()) == [path.name]


def test_a_failed_backup_leaves_no_partial_backup(built, tmp_path, monkeypatch):
    path = copy_to(built["den_hartog"], tmp_path)
    before = path.read_bytes()

    def half_copy(src, dst, *a, **k):
        with open(src, "rb") as f, open(dst, "wb") as g:
            g.write(f.read(4096))
        raise OSError(27, "File too large")

    monkeypatch.setattr(shutil, "copy2", half_copy)
    res = recalc_workbook(path, in_place=True, inputs={"frequency": 0.23})
    assert res.status == "FAILED" and "File too large" in res.error
    assert path.read_bytes() == before
    assert sorted(p.name for p in tmp_path.iterdir()) == [path.name]


def test_in_place_through_a_symbolic_link_replaces_the_target_and_keeps_the_link(built, tmp_path):
    target = copy_to(built["den_hartog"], tmp_path / "store")
    (tmp_path / "desk").mkdir()
    link = tmp_path / "desk" / "tower.xlsx"
    link.symlink_to(target)
    original = target.read_bytes()
    res = recalc_workbook(link, in_place=True, inputs={"frequency": 0.22})
    assert res.status == "OK"
    assert link.is_symlink() and link.resolve() == target.resolve()
    assert read_inputs(target)["frequency"]["value"] == 0.22
    assert res.output == target.resolve()
    assert res.backup is not None and res.backup.parent == target.parent.resolve()
    assert res.backup.read_bytes() == original
    assert [i for i in res.issues if i.kind == "note" and "symbolic link" in i.message
            and str(target.resolve()) in i.message]
    assert list((tmp_path / "desk").iterdir()) == [link]


def test_an_output_edited_since_recalc_wrote_it_is_not_replaced(built, tmp_path):
    out = tmp_path / "out"
    first = recalc_workbook(built["den_hartog"], outdir=out, inputs={"frequency": 0.22})
    assert first.status == "OK"
    again = recalc_workbook(built["den_hartog"], outdir=out, inputs={"frequency": 0.23})
    assert again.status == "OK"                 # unchanged since recalc wrote it: replaced
    sheet, coord = cell_of(again.output, "clearance")
    set_cells(again.output, {(sheet, "I5"): "checked on site, see my note"})
    edited = again.output.read_bytes()
    res = recalc_workbook(built["den_hartog"], outdir=out, inputs={"frequency": 0.24})
    assert res.status == "FAILED" and res.output is None
    assert "was changed after swaytune" in res.error and "--force" in res.error
    assert again.output.read_bytes() == edited
    forced = recalc_workbook(built["den_hartog"], outdir=out, inputs={"frequency": 0.24},
                             force=True)
    assert forced.status == "OK" and read_inputs(forced.output)["frequency"]["value"] == 0.24


def test_output_guard_refuses_foreign_file(built, tmp_path):
    (tmp_path / "out").mkdir()
    (tmp_path / "out" / "den_hartog.xlsx").write_text("my own notes")
    res = recalc_workbook(built["den_hartog"], outdir=tmp_path / "out")
    assert res.status == "FAILED" and "not produced by swaytune" in res.error
    assert (tmp_path / "out" / "den_hartog.xlsx").read_text() == "my own notes"


def test_write_results_refuses_formula_cell(built, tmp_path):
    sheet, coord = cell_of(built["den_hartog"], "stroke")
    with pytest.raises(RecalcError, match="not found"):
        write_results(built["den_hartog"], tmp_path / "x.xlsx", constants={(sheet, coord): 1.0})
    assert not (tmp_path / "x.xlsx").exists()


def test_outputs_have_normal_permissions(built, tmp_path):
    """Built workbooks, recalc outputs and summaries: 0o644 under umask 022, not 0o600."""
    old = os.umask(0o022)
    try:
        out = tmp_path / "built.xlsx"
        write_workbook(parse_project(DEN_HARTOG, source="p.toml"), out)
        src = copy_to(built["den_hartog"], tmp_path / "in")
        os.chmod(src, 0o600)                   # a private original: the copies are not
        batch = recalc_many([src], outdir=tmp_path / "out", progress=False)
        assert batch.exit_status == 0
        files = [out, batch.results[0].output, batch.summary_xlsx, batch.summary_csv]
        assert [stat.S_IMODE(f.stat().st_mode) for f in files] == [0o644] * 4
        # in place: the file keeps its own mode
        inplace = copy_to(built["den_hartog"], tmp_path / "ip")
        os.chmod(inplace, 0o640)
        res = recalc_workbook(inplace, in_place=True, inputs={"frequency": 0.21})
        assert res.status == "OK" and stat.S_IMODE(inplace.stat().st_mode) == 0o640
    finally:
        os.umask(old)


# -------------------------------------------------------------- parameter study
def test_parameter_study(built, tmp_path):
    """Vary the structure's frequency, recalculate a variant per value, collect a table."""
    base = built["residential_tower"]
    table = []
    for f in (0.17, 0.19, 0.21):
        res = recalc_workbook(base, output=tmp_path / f"tower_f{f:.2f}.xlsx",
                              inputs={"frequency": f})
        table.append((f, res.results["mass_ratio"], res.results["pendulum_length"],
                      res.status))
    assert [row[0] for row in table] == [0.17, 0.19, 0.21]
    # Small-angle length g / (2 pi f_d)^2 falls as the frequency rises (simple pendulum).
    lengths = [row[2] for row in table]
    assert lengths[0] > lengths[1] > lengths[2]
    # The required mass ratio depends on the damping ratios only, not on the frequency.
    assert table[0][1] == pytest.approx(table[2][1], rel=1e-9)
    assert len(list(tmp_path.glob("tower_f*.xlsx"))) == 3


# ------------------------------------------------------------------ LibreOffice
@needs_soffice
def test_output_opens_in_libreoffice_without_errors(built, tmp_path):
    res = recalc_workbook(built["observation_mast"], outdir=tmp_path / "ours",
                          inputs={"frequency": 0.4})
    lo = libreoffice.recalculate(res.output, tmp_path / "lo")
    assert libreoffice.find_error_cells(lo) == []
    ours, theirs = cell_values(res.output), cell_values(lo)
    n = 0
    for key, v in ours.items():
        if isinstance(v, float) and key[0] in ("Calculation", "Pendulum", "Checks"):
            assert theirs[key] == pytest.approx(v, rel=1e-9, abs=1e-12), key
            n += 1
    assert n > 200        # the design chain, the Pendulum sheet's 10 rows, the cross-check
    # A workbook saved by LibreOffice (other package layout) is read and recalculated too.
    again = recalc_workbook(lo, outdir=tmp_path / "again")
    assert again.status == "OK", again.error or [str(i) for i in again.issues]
    assert not [i for i in again.issues if i.kind.startswith("formula")]



def test_the_simulation_is_rerun_only_when_its_inputs_changed(tmp_path, monkeypatch):
    """The Nonlinear sheet's values were computed for inputs equal to its snapshots: recalc
    keeps them (the simulation is deterministic, its settings fixed at build) and reruns it
    once an input it depends on changes (our own rule)."""
    path = tmp_path / "sim.xlsx"
    write_workbook(load_project(EXAMPLES / "residential_tower.toml"), path)
    calls = []
    real = recalc_module.run_simulation
    monkeypatch.setattr(recalc_module, "run_simulation",
                        lambda *a: calls.append(1) or real(*a))
    same = recalc_workbook(path, outdir=tmp_path / "a")
    assert same.status == "OK" and calls == []
    assert assert_numbers_equal(cell_values(same.output), cell_values(path), rel=1e-9,
                                sheets={"Nonlinear"}) > 5000
    changed = recalc_workbook(path, outdir=tmp_path / "b", inputs={"frequency": 0.2})
    assert calls == [1] and changed.results["engine_flag_simulation"] == "current"
