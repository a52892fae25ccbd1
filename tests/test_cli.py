# SPDX-License-Identifier: MIT
"""Command line: every subcommand is listed and does its job; the cautions end every output that
shows design results, and only those (our own rules: common practice, no source)."""
from __future__ import annotations

import re
import resource
import signal
import subprocess
import sys
import time
import zipfile

import pytest

from workbook_builder.cli import main

from recalc_helpers import ROOT

HEADER = ("case,mode.frequency,mode.modal_mass [t],mode.structural_damping [%],"
          "wind.acceleration [milli-g],wind.acceleration_limit [milli-g],damper.mass_ratio,"
          "damper.clearance\n")


def _rows(n: int) -> str:
    return "".join(f"tower {k},{0.18 + 0.002 * k:.3f},10000,1.0,25,15,0.02,1.5\n"
                   for k in range(n))


def test_help_lists_every_command(capsys):
    with pytest.raises(SystemExit) as exit_info:
        main(["--help"])
    assert exit_info.value.code == 0
    out = capsys.readouterr().out
    for command in ("build", "examples", "pdf", "recalc", "lite-export"):
        assert command in out


def test_lite_export_writes_the_two_files_without_the_design_cautions(tmp_path, capsys):
    """lite-export shows no design, so no cautions (they travel inside main.py itself)."""
    assert main(["lite-export", "--out", str(tmp_path / "lite")]) == 0
    assert (tmp_path / "lite" / "main.py").is_file()
    assert (tmp_path / "lite" / "requirements.txt").read_text().split() == ["numpy", "scipy"]
    out = capsys.readouterr().out
    assert "CAUTION" not in out
    assert "licensed engineer" in (tmp_path / "lite" / "main.py").read_text()


def test_examples_leaves_unchanged_workbooks_alone_and_rewrites_changed_ones(tmp_path, capsys):
    import shutil
    from pathlib import Path

    import openpyxl

    src = Path(__file__).resolve().parents[1] / "example_workbooks"
    shutil.copy(src / "observation_mast.toml", tmp_path)
    assert main(["examples", "--dir", str(tmp_path)]) == 0
    built = tmp_path / "observation_mast.xlsx"
    first = built.read_bytes()
    assert oct(built.stat().st_mode & 0o777) != oct(0o600)
    assert main(["examples", "--dir", str(tmp_path)]) == 0
    assert "up to date" in capsys.readouterr().out
    assert built.read_bytes() == first                     # untouched: same bytes
    toml = tmp_path / "observation_mast.toml"
    toml.write_text(toml.read_text().replace("frequency = 0.42", "frequency = 0.43"))
    assert main(["examples", "--dir", str(tmp_path)]) == 0
    assert "wrote" in capsys.readouterr().out
    wb = openpyxl.load_workbook(built, data_only=True)
    assert wb.defined_names["structure_frequency"] is not None
    assert built.read_bytes() != first
    assert not list(tmp_path.glob(".swaytune-*"))          # no scratch left behind


# ----------------------------------------------------------------------------- case tables
def test_case_names_that_clean_to_one_file_name_are_refused_before_writing(tmp_path, capsys):
    """``a/b`` and ``a_b`` (or ``Café`` and ``Cafè``) would be one file: the second would replace
    the first. The batch is refused, naming both rows, before anything is written."""
    for first, second, file in (("a/b", "a_b", "a_b.xlsx"), ("Café", "Cafè", "Cafe.xlsx"),
                                (".x.", "x", "x.xlsx")):
        src = tmp_path / "coll.csv"
        src.write_text(HEADER + f"{first},0.2,10000,1.0,25,15,0.02,1.5\n"
                                f"{second},0.25,12000,1.2,22,15,0.015,1.2\n", encoding="utf-8")
        assert main(["build", str(src), "-o", str(tmp_path / "out"), "--no-progress"]) == 1
        err = capsys.readouterr().err
        assert f"cases {first!r} and {second!r} would both be written to {file}" in err
        assert "nothing was written" in err and "Traceback" not in err
        assert not (tmp_path / "out").exists()


def test_a_failing_row_is_reported_and_the_others_are_built(tmp_path, capsys):
    """Row 2 needs no damper (the engine refuses to size one): rows 1 and 3 are still built,
    the failure is named, exit status 1."""
    src = tmp_path / "c.csv"
    src.write_text(HEADER + "tower A,0.2,10000,1.0,25,15,0.02,1.5\n"
                            "calm,0.25,12000,1.2,10,15,,1.2\n"
                            "tower C,0.22,9000,1.0,22,15,0.015,1.2\n", encoding="utf-8")
    assert main(["build", str(src), "-o", str(tmp_path / "out"), "--no-progress"]) == 1
    captured = capsys.readouterr()
    assert sorted(p.name for p in (tmp_path / "out").iterdir()) == ["tower_A.xlsx",
                                                                     "tower_C.xlsx"]
    assert "FAILED  case 'calm'" in captured.err and "no damper is required" in captured.err
    assert "2 of 3 workbook(s) written, 1 failed" in captured.out


def test_progress_of_a_case_table_counts_the_rows(tmp_path, capsys):
    src = tmp_path / "c.csv"
    src.write_text(HEADER + _rows(3), encoding="utf-8")
    assert main(["build", str(src), "-o", str(tmp_path / "out")]) == 0
    err = capsys.readouterr().err
    assert "3/3" in err and "tower_2.xlsx" in err


def _swaytune(args, cwd, **kw):
    return subprocess.Popen([sys.executable, "-m", "workbook_builder", *args], cwd=cwd,
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, **kw)


def test_ctrl_c_during_a_case_table_build_reports_and_exits_130(tmp_path):
    """Ctrl-C once a workbook exists (a state the test can see, not a time): no traceback, a
    report that counts the files really written, each of them complete, no temporary files."""
    src = tmp_path / "c.csv"
    src.write_text(HEADER + _rows(40), encoding="utf-8")
    out = tmp_path / "out"
    proc = _swaytune(["build", str(src), "-o", str(out), "--no-progress"], tmp_path)
    deadline = time.monotonic() + 120
    while not (out.is_dir() and any(p.suffix == ".xlsx" for p in out.iterdir())):
        assert proc.poll() is None and time.monotonic() < deadline, proc.communicate()
        time.sleep(0.02)
    proc.send_signal(signal.SIGINT)
    stdout, stderr = proc.communicate(timeout=120)
    assert proc.returncode == 130, stderr
    assert "Traceback" not in stderr and "interrupted after" in stderr
    written = sorted(out.iterdir())
    assert written and all(p.suffix == ".xlsx" for p in written)     # no temporary files
    for p in written:
        with zipfile.ZipFile(p) as zf:
            assert zf.testzip() is None
    count = int(re.search(r"(\d+) of 40 workbook\(s\) written", stdout).group(1))
    assert count == len(written) < 40


def _file_size_limit():
    resource.setrlimit(resource.RLIMIT_FSIZE, (20_000, 20_000))


@pytest.mark.parametrize("source", ["project", "table"])
def test_a_file_size_limit_is_an_error_naming_the_file(tmp_path, source):
    """A full disk or a file-size limit while writing: a message naming the file, exit 1, no
    traceback, nothing half-written left."""
    if source == "project":
        args = ["build", str(ROOT / "example_workbooks" / "observation_mast.toml"), "-o",
                str(tmp_path / "mast.xlsx")]
        name = "mast.xlsx"
    else:
        (tmp_path / "c.csv").write_text(HEADER + _rows(2), encoding="utf-8")
        args = ["build", str(tmp_path / "c.csv"), "-o", str(tmp_path / "out"), "--no-progress"]
        name = "tower_0.xlsx"
    proc = _swaytune(args, tmp_path, preexec_fn=_file_size_limit)
    stdout, stderr = proc.communicate(timeout=120)
    assert proc.returncode == 1, stderr
    assert re.search(rf"error: \S*{name}: cannot write it: File too large", stderr), stderr
    assert "Traceback" not in stderr and "CAUTION" not in stderr + stdout
    assert not list(tmp_path.rglob("*.xlsx")) and not list(tmp_path.rglob(".*tmp*"))


def test_recalc_summary_under_a_file_is_an_error(tmp_path, capsys):
    a_file = tmp_path / "notes.txt"
    a_file.write_text("mine")
    src = tmp_path / "p.toml"
    src.write_text((ROOT / "example_workbooks" / "observation_mast.toml").read_text())
    assert main(["build", str(src), "-o", str(tmp_path / "in" / "p.xlsx")]) == 0
    capsys.readouterr()
    status = main(["recalc", str(tmp_path / "in"), "-o", str(tmp_path / "out"), "--summary",
                   str(a_file / "x"), "--no-progress"])
    err = capsys.readouterr().err
    assert status == 1 and err.startswith("error: ") and "Traceback" not in err
    assert "notes.txt" in err and a_file.read_text() == "mine"
