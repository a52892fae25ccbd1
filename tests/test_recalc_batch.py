# SPDX-License-Identifier: MIT
"""Recalculating many workbooks (workbook_builder.recalc.batch) and ``swaytune recalc``.

Folders are scanned (outputs, lock files, backups and summaries skipped), a bad file fails
alone with its reason, worker processes give the same results as one process, an interrupt or
a crash never leaves an original damaged, and the command's exit status says whether every
workbook was recalculated with every check OK.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import csv
import signal
import time
import subprocess
import sys
import zipfile
from pathlib import Path

import openpyxl
import pytest

from functions.quantities import quantity
from workbook_builder import cli
from workbook_builder.recalc import (BatchSummary, RecalcResult, collect_paths, read_inputs,
                                     recalc_many, recalc_workbook, write_results)
from workbook_builder.recalc.summary import SUMMARY_STEM
from workbook_builder.xlsx.files import OverwriteRefused

from recalc_helpers import ROOT, cell_of, copy_to, main_recalc, sha256_of
from workbook_cases import NAMES

# The fixture ``built`` (the example workbooks and a den_hartog one) is in conftest.py.


# ------------------------------------------------------------------- robustness
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
        copy_to(built[name], folder)
    before = {p.name: sha256_of(p) for p in folder.iterdir()}
    batch = recalc_many([folder], outdir=tmp_path / "out", progress=False)
    by_name = {r.path.name: r for r in batch.results}
    for name, words in expected.items():
        assert by_name[name].status == "FAILED", name
        assert words in by_name[name].error, (name, by_name[name].error)
        assert not (tmp_path / "out" / name).exists()
    for name in NAMES:
        assert by_name[f"{name}.xlsx"].status == "OK", by_name[f"{name}.xlsx"].error
        assert (tmp_path / "out" / f"{name}.xlsx").is_file()
    assert {p.name: sha256_of(p) for p in folder.iterdir()} == before       # originals intact
    assert batch.exit_status == 1
    # the summary names every failed file with its reason
    rows = list(csv.DictReader(open(batch.summary_csv, encoding="utf-8")))
    assert len(rows) == len(expected) + len(NAMES)
    for row in rows:
        name = Path(row["Workbook"]).name
        if name in expected:
            assert row["Status"] == "FAILED" and expected[name] in row["Reason"]
    leftovers = [p for p in (tmp_path / "out").iterdir() if p.name.startswith(".")]
    assert leftovers == []


def test_in_place_needs_the_flag(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    with pytest.raises(ValueError, match="is the input itself"):
        recalc_workbook(path, outdir=tmp_path)
    with pytest.raises(ValueError, match="output folder"):
        recalc_many([path], progress=False)
    assert main_recalc([str(path)]) == 2
    assert main_recalc([str(path), "-o", str(tmp_path / "o"), "--jobs", "0"]) == 2
    (tmp_path / "empty").mkdir()
    assert main_recalc([str(tmp_path / "empty"), "-o", str(tmp_path / "o")]) == 1


def _run_cli(args, **kw):
    return subprocess.Popen([sys.executable, "-m", "workbook_builder", "recalc", *args],
                            cwd=ROOT, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                            **kw)


def _wait_for(condition, proc, timeout=120.0) -> None:
    """Poll until ``condition()`` holds (a state the test can observe), or fail."""
    t0 = time.monotonic()
    while not condition():
        assert proc.poll() is None, "the batch ended before the state was reached"
        assert time.monotonic() - t0 < timeout, "state not reached"
        time.sleep(0.05)


@pytest.mark.parametrize("sig", [signal.SIGINT, signal.SIGKILL])
@pytest.mark.parametrize("in_place", [False, True])
@pytest.mark.parametrize("jobs", ["1", "2"])
def test_interrupt_or_crash_leaves_originals_intact(built, tmp_path, sig, in_place, jobs):
    """Stopped mid-batch (Ctrl-C or a hard kill), with one process or workers: every
    original is intact or replaced whole with its backup beside it, and after Ctrl-C the
    summary says what happened to each file (issue: items 4 and 16)."""
    folder = tmp_path / "many"
    n = 40
    for i in range(n):
        src = built[NAMES[i % 3]]
        # a clearance typed in each copy: in place, a workbook whose content would not change
        # is left alone (no backup), so every copy needs an edit to be replaced
        sheet, coord = cell_of(src, "clearance_entered")
        value = openpyxl.load_workbook(src)[sheet][coord].value
        folder.mkdir(exist_ok=True)
        write_results(src, folder / f"w{i:02d}.xlsx", constants={(sheet, coord): value * 1.01})
    before = {p.name: sha256_of(p) for p in folder.iterdir()}
    out_dir = tmp_path / "out"
    args = [str(folder), "--jobs", jobs, "--no-progress"] + (
        ["--in-place", "--summary", str(tmp_path / "s")] if in_place else ["-o", str(out_dir)])
    proc = _run_cli(args)
    # wait for a state the test can observe: a first workbook done, whatever the speed
    if in_place:
        _wait_for(lambda: any(p.suffix == ".bak" for p in folder.iterdir()), proc)
    else:
        _wait_for(lambda: out_dir.is_dir() and any(p.suffix == ".xlsx" and
                                                   not p.name.startswith(".")
                                                   for p in out_dir.iterdir()), proc)
    proc.send_signal(sig)
    out, err = proc.communicate(timeout=120)
    assert proc.returncode == (130 if sig == signal.SIGINT else -signal.SIGKILL), err
    assert "Traceback" not in err
    replaced = set()
    for p in folder.iterdir():
        if p.suffix == ".bak":
            continue
        if p.name.startswith("."):
            # a temporary file left by a hard kill (SIGKILL) is never a workbook's name
            assert sig == signal.SIGKILL and p.name.endswith(".tmp")
            continue
        backups = list(folder.glob(p.name + ".bak"))
        if sha256_of(p) == before[p.name]:
            # untouched: no stray backup (a partial one would be a lie)
            assert not backups or sig == signal.SIGKILL, p.name
            continue
        # replaced in place: complete new workbook, the original kept as a backup
        assert in_place
        replaced.add(p.name)
        assert len(backups) == 1 and sha256_of(backups[0]) == before[p.name]
        assert read_inputs(p)["tuning_method"] == "h2"
    assert len(replaced) < n                       # stopped mid-batch
    if not in_place and out_dir.exists():
        for p in out_dir.iterdir():
            if p.suffix == ".xlsx" and not p.name.startswith(SUMMARY_STEM):
                assert zipfile.ZipFile(p).testzip() is None
            assert not (sig == signal.SIGINT and p.name.startswith("."))
    if sig == signal.SIGINT:
        assert "interrupted" in err
        summary = (tmp_path / "s.csv") if in_place else (out_dir / "recalc_summary.csv")
        rows = list(csv.DictReader(open(summary, encoding="utf-8")))
        assert len(rows) == n
        for row in rows:
            name = Path(row["Workbook"]).name
            done = row["Status"] in ("OK", "NOT OK", "EDITED")
            if in_place:
                assert done == (name in replaced), (name, row["Status"], row["Reason"])
            else:
                assert done == (out_dir / name).is_file(), (name, row["Status"])
            if not done:
                assert row["Reason"] == "not recalculated (interrupted)", row


# ------------------------------------------------------ jobs, progress, folders
def test_jobs_gives_same_results(built, tmp_path):
    folder = tmp_path / "jobs"
    for name in NAMES + ["den_hartog"]:
        copy_to(built[name], folder)
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


def test_folder_scan_skips_outputs_backups_and_summaries(built, tmp_path):
    folder = tmp_path / "proj"
    copy_to(built["den_hartog"], folder)
    copy_to(built["den_hartog"], folder / "sub", "b.xlsx")
    (folder / "~$den_hartog.xlsx").write_bytes(b"lock")
    (folder / "recalc_summary.xlsx").write_bytes(b"old summary")
    (folder / "den_hartog.xlsx.20261202-010000.bak").write_bytes(b"backup")
    first = recalc_many([folder], outdir=folder / "out", progress=False)
    assert sorted(r.path.name for r in first.results) == ["b.xlsx", "den_hartog.xlsx"]
    assert (folder / "out" / "sub" / "b.xlsx").is_file()     # relative layout kept
    again = recalc_many([folder], outdir=folder / "out", progress=False)
    assert len(again.results) == 2 and again.exit_status == 0


def _touch(folder: Path, *names: str) -> None:
    for name in names:
        f = folder / name
        f.parent.mkdir(parents=True, exist_ok=True)
        f.write_bytes(b"")


def test_collect_paths_folder_rules(tmp_path):
    """Folders: *.xlsx and *.xlsm at any depth (any letter case), in sorted order, with their
    path relative to the folder; hidden files and folders, lock files (~$), summaries, other
    suffixes (.xls, .csv, backups) and everything under ``exclude`` are skipped."""
    proj = tmp_path / "proj"
    _touch(proj, "a.xlsx", "B.XLSX", "m.xlsm", "sub/c.xlsx", "out/f.xlsx",
           "old.xls", "notes.csv", "a.xlsx.20261202-010000.bak", ".hidden.xlsx", "~$a.xlsx",
           "recalc_summary.xlsx", "sub/recalc_summary_2.xlsx", ".git/d.xlsx", "~$tmp/e.xlsx")
    (proj / "folder.xlsx").mkdir()                          # a folder is not a workbook
    got = collect_paths([proj])
    assert [(f.relative_to(proj), rel) for f, rel in got] == [
        (Path(n), Path(n)) for n in ("B.XLSX", "a.xlsx", "m.xlsm", "out/f.xlsx", "sub/c.xlsx")]
    # the output folder inside the input folder: given as text or as a path
    for exclude in (proj / "out", str(proj / "out")):
        rels = [rel for _, rel in collect_paths([proj], exclude=exclude)]
        assert rels == [Path("B.XLSX"), Path("a.xlsx"), Path("m.xlsm"), Path("sub/c.xlsx")]


def test_collect_paths_hidden_folder_given_by_name_is_scanned(tmp_path):
    # hidden is judged below the folder given, not on the folder itself
    _touch(tmp_path / ".drafts", "a.xlsx")
    assert [rel for _, rel in collect_paths([tmp_path / ".drafts"])] == [Path("a.xlsx")]


def test_collect_paths_files_named_explicitly_are_always_taken(tmp_path):
    _touch(tmp_path, ".hidden.xlsx", "recalc_summary.xlsx", "notes.txt", "~$lock.xlsx")
    names = [".hidden.xlsx", "recalc_summary.xlsx", "notes.txt", "~$lock.xlsx", "missing.xlsx"]
    got = collect_paths([tmp_path / n for n in names])
    assert [(f, rel) for f, rel in got] == [(tmp_path / n, Path(n)) for n in names]


def test_collect_paths_each_file_once(tmp_path):
    proj = tmp_path / "proj"
    _touch(proj, "a.xlsx", "sub/b.xlsx")
    a = proj / "a.xlsx"
    # found by the folder scan first: its relative path is kept
    got = collect_paths([proj, a, proj / "sub" / ".." / "a.xlsx", str(a)])
    assert [rel for _, rel in got] == [Path("a.xlsx"), Path("sub/b.xlsx")]
    # named first, then found again in its folder
    got = collect_paths([proj / "sub" / "b.xlsx", proj])
    assert [rel for _, rel in got] == [Path("b.xlsx"), Path("a.xlsx")]
    # a missing file named twice
    assert len(collect_paths([tmp_path / "gone.xlsx", tmp_path / "gone.xlsx"])) == 1


def test_two_inputs_for_one_output_and_output_over_the_original(built, tmp_path):
    one = copy_to(built["den_hartog"], tmp_path / "one")
    two = copy_to(built["den_hartog"], tmp_path / "two")
    batch = recalc_many([one, two], outdir=tmp_path / "out", progress=False)
    assert [r.status for r in batch.results] == ["OK", "FAILED"]
    assert "would also be written for" in batch.results[1].error and str(one) in \
        batch.results[1].error
    assert batch.exit_status == 1
    same = recalc_many([one], outdir=tmp_path / "one", progress=False)
    assert same.results[0].status == "FAILED"
    assert "the output folder holds the original" in same.results[0].error


@pytest.mark.parametrize("suffix", [".xlsx", ".csv"])
def test_the_users_own_file_named_like_the_summary_is_refused_before_any_work(built, tmp_path,
                                                                              suffix):
    """``--summary NAME`` where NAME.xlsx / NAME.csv is the user's own file: refused before a
    single workbook is recalculated (before: silently replaced)."""
    folder = tmp_path / "in"
    copy_to(built["den_hartog"], folder)
    mine = tmp_path / f"budget{suffix}"
    mine.write_text("my own table\n")
    with pytest.raises(OverwriteRefused, match=rf"budget\{suffix}.*(not produced by swaytune|"
                                               r"not a recalc summary).*--force"):
        recalc_many([folder], outdir=tmp_path / "out", summary=tmp_path / "budget",
                    progress=False)
    assert mine.read_text() == "my own table\n"
    assert not (tmp_path / "out").exists()                 # no workbook was recalculated
    assert main_recalc([str(folder), "-o", str(tmp_path / "out"), "--summary",
                        str(tmp_path / "budget"), "--no-progress"]) == 1
    assert mine.read_text() == "my own table\n"
    batch = recalc_many([folder], outdir=tmp_path / "out", summary=tmp_path / "budget",
                        progress=False, force=True)
    assert batch.summary_csv.read_text().startswith("Workbook,Status")


def test_an_earlier_summary_is_replaced(built, tmp_path):
    folder = tmp_path / "in"
    copy_to(built["den_hartog"], folder)
    for _ in range(2):
        batch = recalc_many([folder], outdir=tmp_path / "out", progress=False)
        assert batch.exit_status == 0 and batch.summary_xlsx.name == f"{SUMMARY_STEM}.xlsx"


def test_output_folder_that_is_a_file_or_the_input_folder_is_refused(built, tmp_path, capsys):
    folder = tmp_path / "in"
    copy_to(built["den_hartog"], folder)
    a_file = tmp_path / "notes.txt"
    a_file.write_text("mine")
    with pytest.raises(ValueError, match=r"the output folder .*notes\.txt is a file"):
        recalc_many([folder], outdir=a_file, progress=False)
    with pytest.raises(ValueError, match=r"is the folder being recalculated"):
        recalc_many([folder], outdir=folder, progress=False)
    # the command: a message, no traceback, exit 2 (a usage error), nothing written
    assert main_recalc([str(folder), "-o", str(a_file), "--no-progress"]) == 2
    err = capsys.readouterr().err
    assert "error: the output folder" in err and "Traceback" not in err
    assert a_file.read_text() == "mine"
    assert cli.main(["recalc", str(folder), "-o", str(folder), "--no-progress"]) == 2
    assert "is the folder being recalculated" in capsys.readouterr().err
    assert sorted(p.name for p in folder.iterdir()) == ["den_hartog.xlsx"]


def test_recalc_many_argument_errors(tmp_path):
    with pytest.raises(ValueError, match="not both or neither"):
        recalc_many([tmp_path], outdir=tmp_path / "o", in_place=True, progress=False)
    with pytest.raises(ValueError, match="jobs=0 must be >= 1"):
        recalc_many([tmp_path], outdir=tmp_path / "o", jobs=0, progress=False)


def test_exit_status():
    ok = RecalcResult(Path("a.xlsx"), checks=[("Stroke within the clearance", "OK")])
    not_ok = RecalcResult(Path("b.xlsx"), checks=[("Stroke within the clearance", "NOT OK")])
    failed = RecalcResult(Path("c.xlsx"), error="empty file")
    assert BatchSummary([ok]).exit_status == 0
    assert BatchSummary([]).exit_status == 0
    assert BatchSummary([ok, not_ok]).exit_status == 1
    assert BatchSummary([ok, failed]).exit_status == 1
    assert BatchSummary([ok], interrupted=True).exit_status == 130
    both = BatchSummary([ok, not_ok, failed])
    assert both.failed == [failed] and both.not_ok == [not_ok]


# -------------------------------------------------------------- swaytune recalc
def test_cli_exit_status_and_summary(built, tmp_path, capsys):
    ok_dir = tmp_path / "ok"
    copy_to(built["den_hartog"], ok_dir)
    assert main_recalc([str(ok_dir), "-o", str(tmp_path / "o1"), "--no-progress"]) == 0
    out = capsys.readouterr().out
    assert "1 workbook(s): 1 OK" in out and "CAUTION" in out
    # a check NOT OK -> 1 (US example with a small clearance fails the stroke check)
    (tmp_path / "nok").mkdir()
    path = tmp_path / "nok" / "office_tower_us.xlsx"
    # 5 in typed in the clearance cell; cached values still those of the last calculation
    write_results(built["office_tower_us"], path,
                  constants={cell_of(built["office_tower_us"], "clearance_entered"): 5.0})
    assert main_recalc([str(path), "-o", str(tmp_path / "o2"), "--no-progress"]) == 1
    out = capsys.readouterr().out
    assert "NOT OK: Stroke within the clearance" in out
    wb = openpyxl.load_workbook(tmp_path / "o2" / "recalc_summary.xlsx")
    assert wb.sheetnames == ["Report", "Workbooks", "Changes", "Issues", "Statuses",
                             "Cautions"]
    head = [c.value for c in wb["Workbooks"][1]]
    row = [c.value for c in wb["Workbooks"][2]]
    verdict = dict(zip(head, row))
    assert verdict["Status"] == "NOT OK"
    assert verdict["Stroke within the clearance"] == "NOT OK"
    assert verdict["Acceleration with damper within the limit"] == "OK"
    changes = [[c.value for c in r] for r in wb["Changes"].iter_rows(min_row=2)]
    # the input as typed, in the unit shown beside it (60 in -> 5 in)
    assert ["input", quantity("clearance").label, 60, 5, "in"] in [r[1:] for r in changes]
    # US workbooks: the summary's values in US customary units (1 ft = 0.3048 m, exact)
    assert verdict[f"{quantity('clearance').label} [ft]"] == pytest.approx(5 / 12, rel=1e-12)


def test_swaytune_recalc_command(built, tmp_path, capsys):
    """``swaytune recalc`` (workbook_builder.cli) with the cautions, as every command."""
    with pytest.raises(SystemExit):
        cli.main(["--help"])
    assert "recalc" in capsys.readouterr().out
    folder = tmp_path / "in"
    copy_to(built["den_hartog"], folder)
    status = cli.main(["recalc", str(folder), "-o", str(tmp_path / "out"), "--no-progress",
                       "--jobs", "1"])
    out = capsys.readouterr().out
    assert status == 0
    assert "1 workbook(s): 1 OK" in out and "CAUTION: Preliminary design aid" in out
    assert "licensed" in out
    assert (tmp_path / "out" / "den_hartog.xlsx").is_file()
    assert (tmp_path / "out" / "recalc_summary.csv").is_file()
    # neither -o nor --in-place: usage error 2, no design shown so no cautions
    assert cli.main(["recalc", str(folder)]) == 2
    captured = capsys.readouterr()
    assert "exactly one" in captured.err and "CAUTION" not in captured.out
    # a failed workbook: exit status 1
    bad = tmp_path / "bad.xlsx"
    bad.write_bytes(b"not a zip")
    assert cli.main(["recalc", str(bad), "-o", str(tmp_path / "o3"), "--no-progress"]) == 1
    assert "FAILED" in capsys.readouterr().out


def test_python_m_workbook_builder_recalc(built, tmp_path):
    folder = tmp_path / "in"
    copy_to(built["den_hartog"], folder)
    proc = subprocess.run([sys.executable, "-m", "workbook_builder", "recalc", str(folder),
                           "-o", str(tmp_path / "out"), "--no-progress"], cwd=ROOT,
                          capture_output=True, text=True, timeout=300)
    assert proc.returncode == 0, proc.stderr
    assert "1 OK" in proc.stdout and "CAUTION" in proc.stdout

