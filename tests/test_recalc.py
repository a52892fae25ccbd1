# SPDX-License-Identifier: MIT
"""Batch recalculation: inputs from names, fresh cached values, hand edits, robustness.

Reference values come from the builder itself: a workbook recalculated after an input change
must hold, cell for cell, what ``build_workbook`` writes for a project with that input (the
engine behind both is tested against published sources in test_design.py / test_damper.py).
"""
from __future__ import annotations

import csv
import hashlib
import shutil
import signal
import subprocess
import sys
import zipfile
from pathlib import Path

import openpyxl
import pytest

from workbook_builder.build import build_workbook, write_workbook
from workbook_builder.project import load_project, parse_project
from workbook_builder import cli
from workbook_builder.plan import FORMAT_NAME, PLAN_VERSION
from workbook_builder.recalc import (RecalcError, read_inputs, read_workbook, recalc_many,
                                     recalc_workbook, write_results)
from workbook_builder.recalc.summary import SUMMARY_STEM, csv_safe
from workbook_builder.xlsx import libreoffice, rewrite
from workbook_builder.xlsx.cached import formula_cells

from workbook_cases import DEN_HARTOG, EXAMPLES, NAMES, example_project

ROOT = Path(__file__).resolve().parent.parent
SOFFICE = libreoffice.find_soffice()
needs_soffice = pytest.mark.skipif(SOFFICE is None, reason="LibreOffice (soffice) not installed")
# The fixture ``built`` (the example workbooks and a den_hartog one) is in conftest.py.


def _sha(path: Path) -> str:
    return hashlib.sha256(Path(path).read_bytes()).hexdigest()


def _copy(src: Path, dest_dir: Path, name: str | None = None) -> Path:
    dest_dir.mkdir(parents=True, exist_ok=True)
    dest = dest_dir / (name or src.name)
    shutil.copyfile(src, dest)
    return dest


def _values(path: Path) -> dict[tuple[str, str], object]:
    wb = openpyxl.load_workbook(path, data_only=True)
    try:
        return {(ws.title, c.coordinate): c.value for ws in wb.worksheets
                for row in ws.iter_rows() for c in row if c.value is not None}
    finally:
        wb.close()


def _assert_numbers_equal(a: dict, b: dict, rel: float = 1e-12, sheets=None) -> int:
    """Every numeric cell of ``b`` equals ``a`` (relative ``rel``); return the count compared."""
    n = 0
    for key, vb in b.items():
        if sheets is not None and key[0] not in sheets:
            continue
        if isinstance(vb, bool) or not isinstance(vb, (int, float)):
            continue
        va = a.get(key)
        assert isinstance(va, (int, float)), f"{key}: {va!r} vs {vb!r}"
        assert va == pytest.approx(vb, rel=rel, abs=1e-300), f"{key}: {va!r} vs {vb!r}"
        n += 1
    return n


def _set_cells(path: Path, edits: dict[tuple[str, str], object], out: Path | None = None,
               delete_names: tuple[str, ...] = (), add_names: dict | None = None) -> Path:
    """Edit a workbook as an engineer would in a spreadsheet program (openpyxl round trip)."""
    from openpyxl.workbook.defined_name import DefinedName
    wb = openpyxl.load_workbook(path)
    for (sheet, coord), value in edits.items():
        wb[sheet][coord] = value
    for name in delete_names:
        del wb.defined_names[name]
    for name, text in (add_names or {}).items():
        wb.defined_names.add(DefinedName(name, attr_text=text))
    out = out or path
    wb.save(out)
    return out


def _cell_of(path: Path, name: str) -> tuple[str, str]:
    data = read_workbook(path)
    return data.book.name_cell(name)


def main_recalc(args):
    """``swaytune recalc ARGS``: the exit status."""
    return cli.main(["recalc", *args])


# ----------------------------------------------------------------------------- safety
def test_garbage_collector_restored_after_success_and_failure(built, tmp_path):
    import gc
    assert gc.isenabled()
    recalc_workbook(built["den_hartog"], outdir=tmp_path / "a")
    assert gc.isenabled()
    junk = tmp_path / "junk.xlsx"
    junk.write_bytes(b"not a zip")
    assert recalc_workbook(junk, outdir=tmp_path / "b").status == "FAILED"
    assert gc.isenabled()


# ----------------------------------------------------------------------------- reading
def test_read_inputs_si_and_units(built):
    # residential_tower.toml: 24,000 t, 1.2 %, 21 and 13 milli-g (g_n = 9.80665, 3rd CGPM 1901).
    kw = read_inputs(built["residential_tower"])
    assert kw["modal_mass"] == pytest.approx(24000 * 1000.0, rel=1e-15)
    assert kw["structural_damping"] == pytest.approx(0.012, rel=1e-15)
    assert kw["acceleration"] == pytest.approx(21 * 9.80665 / 1000, rel=1e-15)
    assert kw["acceleration_limit"] == pytest.approx(13 * 9.80665 / 1000, rel=1e-15)
    assert kw["tuning_method"] == "h2"
    assert kw["mass_ratio"] is None and kw["damper_mass"] is None
    data = read_workbook(built["residential_tower"])
    assert data.typed["modal_mass"] == (24000.0, "t")
    assert data.typed["acceleration"] == (21.0, "milli-g")


def test_read_inputs_us_units(built):
    # office_tower_us.toml: 70,000 kip (1 kip = 453.59237 kg, exact; NIST SP 811 App. B),
    # 60 in clearance (0.0254 m exact).
    kw = read_inputs(built["office_tower_us"])
    assert kw["modal_mass"] == pytest.approx(70000 * 453.59237, rel=1e-15)
    assert kw["clearance"] == pytest.approx(60 * 0.0254, rel=1e-15)
    assert kw["mass_ratio"] == pytest.approx(0.02, rel=1e-15)


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


def test_unit_choice_typed_by_the_user(built, tmp_path):
    """The engineer changes the modal mass from 24,000 t to 24,000,000 kg: same design."""
    path = _copy(built["residential_tower"], tmp_path)
    _set_cells(path, {_cell_of(path, "modal_mass_entered"): 24_000_000,
                      _cell_of(path, "modal_mass_unit"): "kg",
                      _cell_of(path, "modal_mass_factor"): 1.0})
    data = read_workbook(path)
    assert data.typed["modal_mass"] == (24_000_000.0, "kg")
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "OK", res.error or [str(i) for i in res.issues]
    ref = recalc_workbook(built["residential_tower"])
    for key in ("mass_ratio", "stroke", "pendulum_length", "damper_mass"):
        assert res.results[key] == pytest.approx(ref.results[key], rel=1e-12)
    assert not [i for i in res.issues if i.kind.startswith("formula")]


def test_unknown_unit_fails(built, tmp_path):
    path = _copy(built["residential_tower"], tmp_path)
    _set_cells(path, {_cell_of(path, "modal_mass_unit"): "tons"})
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "FAILED"
    assert "'tons' is not a mass unit" in res.error


# ----------------------------------------------------------------------------- recalculation
@pytest.mark.parametrize("name", NAMES + ["den_hartog"])
def test_recalc_unchanged_workbook_is_identical(built, tmp_path, name):
    res = recalc_workbook(built[name], outdir=tmp_path)
    assert res.status == "OK", res.error or [str(i) for i in res.issues]
    assert res.issues == [] and res.changes == []
    assert formula_cells(res.output) == formula_cells(built[name])
    n = _assert_numbers_equal(_values(res.output), _values(built[name]), rel=1e-15)
    assert n > 500


@pytest.mark.parametrize("name,change", [
    ("residential_tower", {"frequency": 0.205}),            # h2: engine values, flags
    ("observation_mast", {"acceleration": 0.36}),           # floor table, chosen mass
    ("office_tower_us", {"clearance": 40.0}),                 # US units, stroke check fails
    ("den_hartog", {"modal_mass": 12000.0}),                 # closed forms
])
def test_recalc_equals_fresh_build(built, tmp_path, name, change):
    """Recalculated workbook == the builder's workbook for the changed inputs, every cell."""
    res = recalc_workbook(built[name], outdir=tmp_path, inputs=change)
    assert not res.failed, res.error
    # The project with the same change, built from scratch.
    project = (parse_project(DEN_HARTOG, source="den_hartog.toml") if name == "den_hartog"
               else example_project(name))
    (key, value), = change.items()
    import dataclasses
    iv = project.inputs[key]
    inputs = dict(project.inputs)
    inputs[key] = dataclasses.replace(iv, value=value, si=value * iv.unit.factor)
    fresh = build_workbook(dataclasses.replace(project, inputs=inputs))
    fresh_values = {k: v for k, v in fresh.values.items()}
    for ws in fresh.workbook.worksheets:
        for row in ws.iter_rows():
            for c in row:
                if c.data_type != "f" and c.value is not None:
                    fresh_values[(ws.title, c.coordinate)] = c.value
    got = _values(res.output)
    n = _assert_numbers_equal(got, fresh_values, rel=1e-12,
                              sheets={"Inputs", "Calculation", "Pendulum", "Checks", "Charts",
                                      "Names", "Summary"})
    assert n > 700
    # text results (verdicts, flags) too
    for key, v in fresh_values.items():
        if v in ("OK", "NOT OK", "current", "INPUTS CHANGED: rebuild"):
            assert got.get(key) == v, key
    # what changed is reported with old and new values
    changed = {n for n, _, _ in res.changes}
    (spec,) = change
    from functions.quantities import quantity
    assert quantity(spec).cell_name in changed
    assert res.issues == [] or all(i.kind not in ("formula_edited", "engine_mismatch")
                                   for i in res.issues)


def test_recalc_after_user_edit_and_stale_flags(built, tmp_path):
    """An input typed in a spreadsheet program (cached values stale) is recalculated."""
    path = _copy(built["residential_tower"], tmp_path)
    _set_cells(path, {_cell_of(path, "structure_frequency_entered"): 0.18})
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
    changes = {n: (o, v) for n, o, v in res.changes}
    assert changes["structure_frequency"] == (0.2, 0.25)
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


# ----------------------------------------------------------------------------- detections
def test_formula_edited_by_hand_is_reported_not_fixed(built, tmp_path):
    path = _copy(built["den_hartog"], tmp_path)
    sheet, coord = _cell_of(path, "tuning_ratio")
    _set_cells(path, {(sheet, coord): "=1/(1+mass_ratio)*1.01"})
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "NOT OK"
    edits = [i for i in res.issues if i.kind == "formula_edited"]
    assert [i.where for i in edits] == [f"{sheet}!{coord}"]
    assert edits[0].old == "=1/(1+mass_ratio)" and edits[0].new == "=1/(1+mass_ratio)*1.01"
    mism = {i.where for i in res.issues if i.kind == "engine_mismatch"}
    assert {"tuning_ratio", "damper_frequency", "stiffness"} <= mism
    assert ("Workbook formulas agree with the engine", "NOT OK") in res.checks
    # never silently fixed: the output keeps the user's formula, its cached value is the edit's
    assert formula_cells(res.output)[(sheet, coord)] == "=1/(1+mass_ratio)*1.01"
    assert _values(res.output)[(sheet, coord)] == pytest.approx(1.01 / 1.02, rel=1e-15)


def test_formula_replaced_by_value_is_reported(built, tmp_path):
    path = _copy(built["den_hartog"], tmp_path)
    sheet, coord = _cell_of(path, "stroke")
    _set_cells(path, {(sheet, coord): 0.5})
    res = recalc_workbook(path, outdir=tmp_path / "out")
    kinds = {(i.kind, i.where) for i in res.issues}
    assert ("formula_replaced", f"{sheet}!{coord}") in kinds
    assert res.status == "NOT OK"
    assert _values(res.output)[(sheet, coord)] == 0.5      # the user's value is kept


def test_equivalent_formula_text_is_not_an_edit(built, tmp_path):
    path = _copy(built["den_hartog"], tmp_path)
    sheet, coord = _cell_of(path, "tuning_ratio")
    _set_cells(path, {(sheet, coord): "=1 / ( 1 + MASS_RATIO )"})
    res = recalc_workbook(path)
    assert not [i for i in res.issues if i.kind == "formula_edited"]


def test_input_outside_valid_range_fails(built, tmp_path):
    path = _copy(built["residential_tower"], tmp_path)
    _set_cells(path, {_cell_of(path, "structural_damping_entered"): 50})     # 50 % > 20 %
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "FAILED"
    assert "outside their valid range" in res.error and "structural_damping=50 %" in res.error
    assert not (tmp_path / "out").exists()


def test_input_not_a_number_fails(built, tmp_path):
    path = _copy(built["residential_tower"], tmp_path)
    _set_cells(path, {_cell_of(path, "clearance_entered"): "1.6 m"})
    res = recalc_workbook(path)
    assert res.status == "FAILED" and "'1.6 m', not a number" in res.error


def test_missing_name_fails(built, tmp_path):
    path = _copy(built["residential_tower"], tmp_path)
    _set_cells(path, {}, delete_names=("clearance",))
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "FAILED"
    assert "missing defined name(s) clearance" in res.error and "rebuild" in res.error


def test_missing_result_name_fails(built, tmp_path):
    path = _copy(built["den_hartog"], tmp_path)
    _set_cells(path, {}, delete_names=("stroke",))
    res = recalc_workbook(path)
    assert res.status == "FAILED" and "stroke" in res.error


def test_newer_format_fails(built, tmp_path):
    path = _copy(built["den_hartog"], tmp_path)
    _set_cells(path, {}, add_names={FORMAT_NAME: "99"})
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "FAILED" and "newer" in res.error


def test_newer_generator_version_fails(built, tmp_path):
    from workbook_builder.xlsx.files import mark_workbook
    path = _copy(built["den_hartog"], tmp_path)
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


def test_unevaluable_formula_fails(built, tmp_path):
    path = _copy(built["den_hartog"], tmp_path)
    sheet, coord = _cell_of(path, "stroke")
    _set_cells(path, {(sheet, coord): "=stroke_ratio*structure_displacement)"})   # malformed
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "FAILED" and "cannot be evaluated" in res.error
    assert not (tmp_path / "out").exists()


# ----------------------------------------------------------------------------- robustness
def _bad_files(built: Path, folder: Path) -> dict[str, str]:
    """Broken files and the words their failure reason must contain."""
    folder.mkdir(parents=True, exist_ok=True)
    raw = built.read_bytes()
    (folder / "truncated.xlsx").write_bytes(raw[: len(raw) // 2])
    corrupt = bytearray(raw)
    # flip bytes inside the first compressed member's data (CRC or inflate error)
    for i in range(200, 600):
        corrupt[i] ^= 0x5A
    (folder / "corrupted.xlsx").write_bytes(bytes(corrupt))
    (folder / "encrypted.xlsx").write_bytes(b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + b"\0" * 4000)
    (folder / "notes.xlsx").write_text("these are not the workbooks you are looking for\n")
    (folder / "empty.xlsx").write_bytes(b"")
    with zipfile.ZipFile(folder / "zip_not_workbook.xlsx", "w") as z:
        z.writestr("readme.txt", "hello")
    return {"truncated.xlsx": "corrupted or truncated", "corrupted.xlsx": "corrupted",
            "encrypted.xlsx": "password-protected", "notes.xlsx": "not a workbook",
            "empty.xlsx": "empty file", "zip_not_workbook.xlsx": "not an Excel workbook"}


def test_bad_files_fail_alone(built, tmp_path):
    folder = tmp_path / "batch"
    expected = _bad_files(built["den_hartog"], folder)
    for name in NAMES:
        _copy(built[name], folder)
    before = {p.name: _sha(p) for p in folder.iterdir()}
    batch = recalc_many([folder], outdir=tmp_path / "out", progress=False)
    by_name = {r.path.name: r for r in batch.results}
    for name, words in expected.items():
        assert by_name[name].status == "FAILED", name
        assert words in by_name[name].error, (name, by_name[name].error)
        assert not (tmp_path / "out" / name).exists()
    for name in NAMES:
        assert by_name[f"{name}.xlsx"].status == "OK", by_name[f"{name}.xlsx"].error
        assert (tmp_path / "out" / f"{name}.xlsx").is_file()
    assert {p.name: _sha(p) for p in folder.iterdir()} == before       # originals intact
    assert batch.exit_status == 1
    # the summary names every failed file with its reason
    rows = list(csv.DictReader(open(batch.summary_csv, encoding="utf-8")))
    assert len(rows) == len(expected) + len(NAMES)
    for row in rows:
        name = Path(row["workbook"]).name
        if name in expected:
            assert row["status"] == "FAILED" and expected[name] in row["reason"]
    leftovers = [p for p in (tmp_path / "out").iterdir() if p.name.startswith(".")]
    assert leftovers == []


def test_in_place_keeps_backup_and_is_atomic(built, tmp_path, monkeypatch):
    path = _copy(built["den_hartog"], tmp_path)
    original = path.read_bytes()
    res = recalc_workbook(path, in_place=True, inputs={"frequency": 0.22})
    assert res.status == "OK" and res.output == path
    assert res.backup is not None and res.backup.read_bytes() == original
    assert read_inputs(path)["frequency"] == 0.22
    # a failure while writing leaves the file as it was and no temporary file
    before = path.read_bytes()

    def boom(*a, **k):
        raise OSError("disk full (simulated)")

    monkeypatch.setattr(rewrite, "rewrite_cells", boom)
    res2 = recalc_workbook(path, in_place=True, backup=False, inputs={"frequency": 0.23})
    assert res2.status == "FAILED" and "disk full" in res2.error
    assert path.read_bytes() == before
    assert sorted(p.name for p in tmp_path.iterdir() if p.name.startswith(".")) == []


def test_in_place_needs_the_flag(built, tmp_path):
    path = _copy(built["den_hartog"], tmp_path)
    with pytest.raises(ValueError, match="is the input itself"):
        recalc_workbook(path, outdir=tmp_path)
    with pytest.raises(ValueError, match="output folder"):
        recalc_many([path], progress=False)
    assert main_recalc([str(path)]) == 2
    assert main_recalc([str(path), "-o", str(tmp_path / "o"), "--jobs", "0"]) == 2
    (tmp_path / "empty").mkdir()
    assert main_recalc([str(tmp_path / "empty"), "-o", str(tmp_path / "o")]) == 1


def test_output_guard_refuses_foreign_file(built, tmp_path):
    (tmp_path / "out").mkdir()
    (tmp_path / "out" / "den_hartog.xlsx").write_text("my own notes")
    res = recalc_workbook(built["den_hartog"], outdir=tmp_path / "out")
    assert res.status == "FAILED" and "not produced by swaytune" in res.error
    assert (tmp_path / "out" / "den_hartog.xlsx").read_text() == "my own notes"


def _run_cli(args, **kw):
    return subprocess.Popen([sys.executable, "-m", "workbook_builder", "recalc", *args],
                            cwd=ROOT, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                            **kw)


@pytest.mark.parametrize("sig", [signal.SIGINT, signal.SIGKILL])
@pytest.mark.parametrize("in_place", [False, True])
def test_interrupt_or_crash_leaves_originals_intact(built, tmp_path, sig, in_place):
    folder = tmp_path / "many"
    n = 60
    for i in range(n):
        _copy(built[NAMES[i % 3]], folder, f"w{i:02d}.xlsx")
    before = {p.name: _sha(p) for p in folder.iterdir()}
    args = [str(folder)] + (["--in-place", "--summary", str(tmp_path / "s")] if in_place
                            else ["-o", str(tmp_path / "out")])
    proc = _run_cli(args)
    # Wait for the first progress line (10 % done; stderr is not a terminal), then stop it.
    line = proc.stderr.readline()
    assert f"/{n}" in line, line
    proc.send_signal(sig)
    out, err = proc.communicate(timeout=120)
    assert proc.returncode == (130 if sig == signal.SIGINT else -signal.SIGKILL), err
    if sig == signal.SIGINT:
        assert "interrupted" in err
        assert "not recalculated (interrupted)" in open(
            (tmp_path / "s.csv") if in_place else (tmp_path / "out" / "recalc_summary.csv"),
            encoding="utf-8").read()
    replaced = 0
    for p in folder.iterdir():
        if p.suffix == ".bak":
            continue
        if p.name.startswith("."):
            # a temporary file left by a hard kill (SIGKILL) is never a workbook's name
            assert sig == signal.SIGKILL and p.name.endswith(".tmp")
            continue
        if _sha(p) == before[p.name]:
            continue
        # replaced in place: complete new workbook, the original kept as a backup
        assert in_place
        replaced += 1
        backups = [b for b in folder.glob(p.name + ".*.bak")]
        assert len(backups) == 1 and _sha(backups[0]) == before[p.name]
        assert read_inputs(p)["tuning_method"] == "h2"
    assert replaced < n                       # stopped mid-batch
    if not in_place and (tmp_path / "out").exists():
        for p in (tmp_path / "out").iterdir():
            if p.suffix == ".xlsx" and not p.name.startswith(SUMMARY_STEM):
                assert zipfile.ZipFile(p).testzip() is None
            assert not (sig == signal.SIGINT and p.name.startswith("."))


def test_jobs_gives_same_results(built, tmp_path):
    folder = tmp_path / "jobs"
    for name in NAMES + ["den_hartog"]:
        _copy(built[name], folder)
    (folder / "broken.xlsx").write_bytes(b"PK\x03\x04 broken")
    one = recalc_many([folder], outdir=tmp_path / "o1", progress=False)
    two = recalc_many([folder], outdir=tmp_path / "o2", jobs=2, progress=False)
    assert [r.path for r in one.results] == [r.path for r in two.results]
    for a, b in zip(one.results, two.results):
        assert a.status == b.status and a.error == b.error
        assert a.results == b.results
    assert two.exit_status == 1


def test_progress_bar_on_stderr(built, tmp_path, capsys):
    recalc_many([built["den_hartog"], built["observation_mast"]], outdir=tmp_path,
                progress=True)
    err = capsys.readouterr().err
    assert "2/2" in err and "[" in err


def test_cli_exit_status_and_summary(built, tmp_path, capsys):
    ok_dir = tmp_path / "ok"
    _copy(built["den_hartog"], ok_dir)
    assert main_recalc([str(ok_dir), "-o", str(tmp_path / "o1"), "--no-progress"]) == 0
    out = capsys.readouterr().out
    assert "1 workbook(s): 1 OK" in out and "CAUTION" in out
    # a check NOT OK -> 1 (US example with a small clearance fails the stroke check)
    (tmp_path / "nok").mkdir()
    path = tmp_path / "nok" / "office_tower_us.xlsx"
    # 5 in typed in the clearance cell; cached values still those of the last calculation
    write_results(built["office_tower_us"], path,
                  constants={_cell_of(built["office_tower_us"], "clearance_entered"): 5.0})
    assert main_recalc([str(path), "-o", str(tmp_path / "o2"), "--no-progress"]) == 1
    out = capsys.readouterr().out
    assert "NOT OK: Stroke within the clearance" in out
    wb = openpyxl.load_workbook(tmp_path / "o2" / "recalc_summary.xlsx")
    assert wb.sheetnames == ["Workbooks", "Changes", "Issues", "Cautions"]
    head = [c.value for c in wb["Workbooks"][1]]
    row = [c.value for c in wb["Workbooks"][2]]
    verdict = dict(zip(head, row))
    assert verdict["status"] == "NOT OK"
    assert verdict["Stroke within the clearance"] == "NOT OK"
    assert verdict["Acceleration with damper within the limit"] == "OK"
    changes = [[c.value for c in r] for r in wb["Changes"].iter_rows(min_row=2)]
    assert ["clearance", 1.524, 0.127] in [r[1:] for r in changes]


def test_folder_scan_skips_outputs_backups_and_summaries(built, tmp_path):
    folder = tmp_path / "proj"
    _copy(built["den_hartog"], folder)
    _copy(built["den_hartog"], folder / "sub", "b.xlsx")
    (folder / "~$den_hartog.xlsx").write_bytes(b"lock")
    (folder / "recalc_summary.xlsx").write_bytes(b"old summary")
    (folder / "den_hartog.xlsx.20261202-010000.bak").write_bytes(b"backup")
    first = recalc_many([folder], outdir=folder / "out", progress=False)
    assert sorted(r.path.name for r in first.results) == ["b.xlsx", "den_hartog.xlsx"]
    assert (folder / "out" / "sub" / "b.xlsx").is_file()     # relative layout kept
    again = recalc_many([folder], outdir=folder / "out", progress=False)
    assert len(again.results) == 2 and again.exit_status == 0


def test_csv_text_is_never_a_formula():
    assert csv_safe("=HYPERLINK(1)") == "'=HYPERLINK(1)"
    assert csv_safe("plain") == "plain"
    assert csv_safe(-1.5) == -1.5


def test_write_results_refuses_formula_cell(built, tmp_path):
    sheet, coord = _cell_of(built["den_hartog"], "stroke")
    with pytest.raises(RecalcError, match="not found"):
        write_results(built["den_hartog"], tmp_path / "x.xlsx", constants={(sheet, coord): 1.0})
    assert not (tmp_path / "x.xlsx").exists()


def test_firm_template_workbook(tmp_path):
    """A workbook built on a firm's template: its own sheet is kept, our formulas compared."""
    from openpyxl.workbook.defined_name import DefinedName
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
    res = recalc_workbook(out, outdir=tmp_path / "o", inputs={"modal_mass": 12000})
    assert res.status == "OK", res.error or [str(i) for i in res.issues]
    assert not [i for i in res.issues if i.kind.startswith("formula")]
    assert any(i.kind == "note" and "Calc cover" in i.where for i in res.issues)  # VLOOKUP
    got = _values(res.output)
    # M* = 12,000 t, mu = 0.02 -> m_d = 240,000 kg
    assert got[("Calc cover", "B5")] == pytest.approx(240_000.0, rel=1e-15)
    assert formula_cells(res.output)[("Calc cover", "B6")] == "=VLOOKUP(1,A1:A2,1,FALSE)"
    assert read_workbook(res.output).book.named("TB_PROJECT_NUMBER").value == "T-6"


def test_workbook_of_swaytune_0_1_is_refused_with_how_to_rebuild(tmp_path):
    """A workbook built by swaytune 0.1.0 (layout format 2; tests/data) is refused: its cells
    are found only by their labels. The message says how to rebuild it."""
    old = ROOT / "tests" / "data" / "format2_office_tower_us.xlsx"
    res = recalc_workbook(old, outdir=tmp_path / "o")
    assert res.status == "FAILED"
    assert "layout format 2 (swaytune 0.1)" in res.error
    assert "swaytune build PROJECT.toml -o NEW.xlsx" in res.error and "Record sheet" in res.error
    assert not (tmp_path / "o").exists()


def test_nonlinear_sheet_flags_stale_simulation(tmp_path):
    """recalc does not rerun the time-domain simulation: it says so (NOT OK, rebuild)."""
    project = load_project(EXAMPLES / "residential_tower.toml")
    if getattr(project, "simulation", None) is None:
        pytest.skip("the example has no [simulation] table")
    path = tmp_path / "sim.xlsx"
    write_workbook(project, path)
    same = recalc_workbook(path)
    assert same.status == "OK", [str(i) for i in same.issues]
    changed = recalc_workbook(path, outdir=tmp_path / "o", inputs={"frequency": 0.2})
    assert changed.status == "NOT OK"
    stale = [i for i in changed.issues if i.kind == "stale_engine_value"]
    assert len(stale) == 1 and stale[0].where == "engine_flag_simulation"
    # the engine values recalc does recompute are current
    flags = {k: changed.results[k] for k in ("engine_flag_mass_ratio", "engine_flag_tuning",
                                             "engine_flag_simulation")}
    assert list(flags.values()) == ["current", "current", "INPUTS CHANGED: rebuild"]
    # a hand edit is still found on every sheet, the Nonlinear one included
    sheet, coord = _cell_of(path, "damper_frequency")
    _set_cells(path, {(sheet, coord): "=tuning_ratio*structure_frequency*1.02"})
    edited = recalc_workbook(path)
    assert [i.where for i in edited.issues if i.kind == "formula_edited"] == [f"{sheet}!{coord}"]
    # the [simulation] settings travel with the workbook (document property)
    assert read_workbook(path).project.simulation == project.simulation
    assert not [i for i in edited.issues if i.kind == "note"]
    assert "REBUILD NEEDED" in stale[0].message


# ----------------------------------------------------------------------------- parameter study
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


# ----------------------------------------------------------------------------- LibreOffice
@needs_soffice
def test_output_opens_in_libreoffice_without_errors(built, tmp_path):
    res = recalc_workbook(built["observation_mast"], outdir=tmp_path / "ours",
                          inputs={"frequency": 0.4})
    lo = libreoffice.recalculate(res.output, tmp_path / "lo")
    assert libreoffice.find_error_cells(lo) == []
    ours, theirs = _values(res.output), _values(lo)
    n = 0
    for key, v in ours.items():
        if isinstance(v, float) and key[0] in ("Calculation", "Pendulum", "Checks"):
            assert theirs[key] == pytest.approx(v, rel=1e-9, abs=1e-12), key
            n += 1
    assert n > 400
    # A workbook saved by LibreOffice (other package layout) is read and recalculated too.
    again = recalc_workbook(lo, outdir=tmp_path / "again")
    assert again.status == "OK", again.error or [str(i) for i in again.issues]
    assert not [i for i in again.issues if i.kind.startswith("formula")]


# ----------------------------------------------------------------------------- format, layout
def test_workbook_without_format_mark_is_refused(built, tmp_path):
    path = _copy(built["den_hartog"], tmp_path)
    assert read_workbook(path).book.defined_names[FORMAT_NAME].attr_text == str(PLAN_VERSION)
    _set_cells(path, {}, delete_names=(FORMAT_NAME,))
    res = recalc_workbook(path)
    assert res.status == "FAILED" and "layout format 1" in res.error


def test_bad_format_mark_fails(built, tmp_path):
    path = _copy(built["den_hartog"], tmp_path)
    _set_cells(path, {}, add_names={FORMAT_NAME: '"two"'})
    res = recalc_workbook(path)
    assert res.status == "FAILED" and "is not a number" in res.error


def test_engine_values_written_through_the_plans_names(built, tmp_path):
    """Engine values go where the workbook's names point, wherever that is."""
    res = recalc_workbook(built["den_hartog"], outdir=tmp_path / "o", inputs={"frequency": 0.3})
    got = _values(res.output)
    sheet, coord = _cell_of(res.output, "engine_damper_frequency")
    # Den Hartog's f = 1/(1+mu) (Den Hartog 1956, s3.3): f_d = 0.3 / 1.02
    assert got[(sheet, coord)] == pytest.approx(0.3 / 1.02, rel=1e-15)
    # a named engine value whose name was deleted: the layout is damaged -> FAILED
    path = _copy(built["den_hartog"], tmp_path / "moved")
    _set_cells(path, {}, delete_names=("engine_stroke",))
    moved = recalc_workbook(path, outdir=tmp_path / "o2")
    assert moved.status == "FAILED" and "engine_stroke" in moved.error
    assert not (tmp_path / "o2" / path.name).exists()


def test_renaming_every_label_changes_nothing_recalc_reads(built, tmp_path):
    """A firm translates or rewords every label of the workbook: recalc reads and reports the
    same (it reads cells only through the plan's defined names)."""
    from workbook_builder.recalc.read import read_workbook as read
    for name in ("residential_tower", "observation_mast", "office_tower_us"):
        path = _copy(built[name], tmp_path / "labels")
        plan = read(path).plan
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


# ----------------------------------------------------------------------------- permissions
def test_outputs_have_normal_permissions(built, tmp_path):
    """Built workbooks, recalc outputs and summaries: 0o644 under umask 022, not 0o600."""
    import os
    import stat
    old = os.umask(0o022)
    try:
        out = tmp_path / "built.xlsx"
        write_workbook(parse_project(DEN_HARTOG, source="p.toml"), out)
        src = _copy(built["den_hartog"], tmp_path / "in")
        os.chmod(src, 0o600)                   # a private original: the copies are not
        batch = recalc_many([src], outdir=tmp_path / "out", progress=False)
        assert batch.exit_status == 0
        files = [out, batch.results[0].output, batch.summary_xlsx, batch.summary_csv]
        assert [stat.S_IMODE(f.stat().st_mode) for f in files] == [0o644] * 4
        # in place: the file keeps its own mode
        inplace = _copy(built["den_hartog"], tmp_path / "ip")
        os.chmod(inplace, 0o640)
        res = recalc_workbook(inplace, in_place=True, inputs={"frequency": 0.21})
        assert res.status == "OK" and stat.S_IMODE(inplace.stat().st_mode) == 0o640
    finally:
        os.umask(old)


# ----------------------------------------------------------------------------- swaytune recalc
def test_swaytune_recalc_command(built, tmp_path, capsys):
    """``swaytune recalc`` (workbook_builder.cli) with the cautions, as every command."""
    from workbook_builder import cli
    with pytest.raises(SystemExit):
        cli.main(["--help"])
    assert "recalc" in capsys.readouterr().out
    folder = tmp_path / "in"
    _copy(built["den_hartog"], folder)
    status = cli.main(["recalc", str(folder), "-o", str(tmp_path / "out"), "--no-progress",
                       "--jobs", "1"])
    out = capsys.readouterr().out
    assert status == 0
    assert "1 workbook(s): 1 OK" in out and "CAUTION - preliminary design aid" in out
    assert "licensed" in out
    assert (tmp_path / "out" / "den_hartog.xlsx").is_file()
    assert (tmp_path / "out" / "recalc_summary.csv").is_file()
    # neither -o nor --in-place: usage error 2, cautions still printed
    assert cli.main(["recalc", str(folder)]) == 2
    captured = capsys.readouterr()
    assert "exactly one" in captured.err and "CAUTION" in captured.out
    # a failed workbook: exit status 1
    bad = tmp_path / "bad.xlsx"
    bad.write_bytes(b"not a zip")
    assert cli.main(["recalc", str(bad), "-o", str(tmp_path / "o3"), "--no-progress"]) == 1
    assert "FAILED" in capsys.readouterr().out


def test_python_m_workbook_builder_recalc(built, tmp_path):
    folder = tmp_path / "in"
    _copy(built["den_hartog"], folder)
    proc = subprocess.run([sys.executable, "-m", "workbook_builder", "recalc", str(folder),
                           "-o", str(tmp_path / "out"), "--no-progress"], cwd=ROOT,
                          capture_output=True, text=True, timeout=300)
    assert proc.returncode == 0, proc.stderr
    assert "1 OK" in proc.stdout and "CAUTION" in proc.stdout


def test_unreadable_simulation_property_is_noted(built, tmp_path):
    from openpyxl.packaging.custom import StringProperty
    from workbook_builder.recalc.read import SIMULATION_PROPERTY
    path = _copy(built["den_hartog"], tmp_path)
    wb = openpyxl.load_workbook(path)
    wb.custom_doc_props.append(StringProperty(name=SIMULATION_PROPERTY, value="{broken"))
    wb.save(path)
    res = recalc_workbook(path)
    assert res.status == "OK"
    assert read_workbook(path).project.simulation is None
    assert any(i.kind == "note" and i.where == SIMULATION_PROPERTY and "not JSON" in i.message
               for i in res.issues)
