# SPDX-License-Identifier: MIT
"""Gnumeric's ssconvert: recalculation, private settings, timeout, refusals, example workbooks.

The tests that run ssconvert are skipped (with the reason shown by ``-ra``) when it is not
installed; CI installs it (Debian package gnumeric). The others use small fake programs.

Reference values: for the small stale workbook, plain arithmetic and Python's math module (as in
test_xlsx_libreoffice.py); for the example workbooks, the cached values the builder wrote (the
engine's and the worksheet evaluator's numbers, kept current by tests/test_examples.py). Gnumeric
is a third, independent implementation of the worksheet functions.
"""
from __future__ import annotations

import math
import os
import time
from pathlib import Path

import openpyxl
import pytest

from workbook_builder.xlsx import gnumeric, libreoffice

EXAMPLES = Path(__file__).resolve().parent.parent / "example_workbooks"
SSCONVERT = gnumeric.find_ssconvert()
needs_ssconvert = pytest.mark.skipif(
    SSCONVERT is None, reason="Gnumeric (ssconvert) not installed: apt-get install gnumeric")
# openpyxl warns that a file saved by Gnumeric has no default cell style; harmless here.
pytestmark = pytest.mark.filterwarnings("ignore:Workbook contains no default style:UserWarning")


def _fake(path: Path, body: str) -> str:
    path.write_text("#!/bin/sh\n" + body)
    path.chmod(0o755)
    return str(path)


# ----------------------------------------------------------------------------- without ssconvert
def test_find_ssconvert_env_override(tmp_path, monkeypatch):
    fake = _fake(tmp_path / "ssconvert", "exit 0\n")
    monkeypatch.setenv("SWAYTUNE_SSCONVERT", fake)
    assert gnumeric.find_ssconvert() == fake


def test_missing_input_raises(tmp_path):
    with pytest.raises(FileNotFoundError, match="not found"):
        gnumeric.recalculate(tmp_path / "nope.xlsx", tmp_path / "out")


def test_outdir_equal_to_input_dir_refused(tmp_path, stale_workbook):
    src = stale_workbook(tmp_path / "s.xlsx")
    with pytest.raises(ValueError, match="would overwrite the input s.xlsx"):
        gnumeric.recalculate(src, tmp_path)


def test_no_ssconvert_raises(tmp_path, monkeypatch, stale_workbook):
    monkeypatch.setattr(gnumeric, "find_ssconvert", lambda: None)
    src = stale_workbook(tmp_path / "s.xlsx")
    with pytest.raises(gnumeric.GnumericError, match=r"ssconvert\) not found.*gnumeric"):
        gnumeric.recalculate(src, tmp_path / "out")


def test_private_home_and_arguments(tmp_path, stale_workbook):
    """ssconvert runs with a home of its own (gone afterwards) and in-memory settings."""
    log = tmp_path / "seen.txt"
    fake = _fake(tmp_path / "fake_ssconvert",
                 f'printf "%s\\n" "$HOME" "$XDG_CONFIG_HOME" "$XDG_CACHE_HOME" '
                 f'"$GSETTINGS_BACKEND" "$@" > "{log}"\n'
                 'mkdir -p "$HOME/.config/gnumeric" && cp "$3" "$4"\n')
    src = stale_workbook(tmp_path / "in" / "s.xlsx")
    out = gnumeric.recalculate(src, tmp_path / "out", ssconvert=fake)
    assert out == (tmp_path / "out" / "s.xlsx").resolve()
    assert out.read_bytes() == src.read_bytes()
    home, config, cache, backend, *args = log.read_text().splitlines()
    assert home != os.environ.get("HOME") and not Path(home).exists()    # removed after the run
    assert config == f"{home}/.config" and cache == f"{home}/.cache"
    assert backend == "memory"
    assert args[:3] == ["--import-type=Gnumeric_Excel:xlsx", "--recalc", str(src.resolve())]
    assert Path(args[3]).name == "s.xlsx" and Path(args[3]).parent != out.parent


def test_error_exit_raises_with_the_error_output(tmp_path, stale_workbook):
    fake = _fake(tmp_path / "fake_ssconvert", "echo 'E cannot read: broken part' >&2\nexit 1\n")
    src = stale_workbook(tmp_path / "s.xlsx")
    with pytest.raises(gnumeric.GnumericError,
                       match=r"failed on s.xlsx \(exit status 1\): E cannot read: broken part"):
        gnumeric.recalculate(src, tmp_path / "out", ssconvert=fake)
    assert not (tmp_path / "out" / "s.xlsx").exists()


def test_program_that_writes_nothing_is_an_error(tmp_path, stale_workbook):
    fake = _fake(tmp_path / "fake_ssconvert", "echo 'pretend success' >&2\nexit 0\n")
    src = stale_workbook(tmp_path / "s.xlsx")
    with pytest.raises(gnumeric.GnumericError,
                       match=r"produced no xlsx file from s.xlsx \(exit status 0\): pretend"):
        gnumeric.recalculate(src, tmp_path / "out", ssconvert=fake)


def test_timeout_kills_the_process_group(tmp_path, stale_workbook):
    pid_file = tmp_path / "child.pid"
    fake = _fake(tmp_path / "slow_ssconvert", f'sleep 30 &\necho $! > "{pid_file}"\nwait\n')
    src = stale_workbook(tmp_path / "s.xlsx")
    start = time.monotonic()
    with pytest.raises(gnumeric.GnumericError, match="did not finish within 0.5 s"):
        gnumeric.recalculate(src, tmp_path / "out", timeout=0.5, ssconvert=fake)
    # Killing only the program would leave its child holding the output pipes for 30 s.
    assert time.monotonic() - start < 10
    child = int(pid_file.read_text())       # the program's own child: killed with the group

    def running() -> bool:
        try:
            state = Path(f"/proc/{child}/stat").read_text().rsplit(")", 1)[1].split()[0]
        except (FileNotFoundError, ProcessLookupError):
            return False
        return state != "Z"                  # a zombie is dead, waiting to be reaped
    deadline = time.monotonic() + 5
    while running() and time.monotonic() < deadline:
        time.sleep(0.05)
    assert not running()


# ----------------------------------------------------------------------------- with ssconvert
@needs_ssconvert
def test_recalculate_recomputes_stale_values(tmp_path, stale_workbook):
    src = stale_workbook(tmp_path / "s.xlsx")
    out = gnumeric.recalculate(src, tmp_path / "out")
    v = libreoffice.read_values(out)
    assert v[("Calc sheet", "B1")] == 4                 # A1*2 with A1 = 2 (cached: 999)
    assert v[("Calc sheet", "C1")] == "big"
    assert v[("Calc sheet", "D1")] is True
    # T0 = 2 pi sqrt(L/g), L = 10 m, g = 9.80665 m/s^2 (3rd CGPM 1901); reference: Python math.
    assert math.isclose(v[("Calc sheet", "F1")], 2 * math.pi * math.sqrt(10 / 9.80665),
                        rel_tol=1e-12)
    # Error codes differ between applications: test "is an error", not which one.
    errors = libreoffice.find_error_cells(out)
    assert [(s, c) for s, c, _ in errors] == [("Calc sheet", "E1"), ("Calc sheet", "G1")]
    assert libreoffice.read_values(src)[("Calc sheet", "B1")] == 999.0    # input untouched


@needs_ssconvert
def test_a_file_that_is_not_a_workbook_is_refused(tmp_path):
    src = tmp_path / "notes.xlsx"
    src.write_text("these are notes, not a workbook\n")
    with pytest.raises(gnumeric.GnumericError, match=r"notes.xlsx"):
        gnumeric.recalculate(src, tmp_path / "out")
    assert not (tmp_path / "out" / "notes.xlsx").exists()


def _named_results(path: Path) -> dict[str, tuple[str, str, float]]:
    """Defined names of single formula cells with a numeric cached value: (sheet, cell, value)."""
    formulas = openpyxl.load_workbook(path)
    cached = openpyxl.load_workbook(path, data_only=True)
    out = {}
    for name, dn in formulas.defined_names.items():
        dests = list(dn.destinations)
        if len(dests) != 1 or ":" in dests[0][1] or dests[0][0] not in formulas.sheetnames:
            continue
        sheet, coord = dests[0][0], dests[0][1].replace("$", "")
        value = cached[sheet][coord].value
        if (formulas[sheet][coord].data_type == "f" and isinstance(value, (int, float))
                and not isinstance(value, bool)):
            out[name] = (sheet, coord, value)
    return out


@needs_ssconvert
@pytest.mark.parametrize("workbook", sorted(p.name for p in EXAMPLES.glob("*.xlsx")))
def test_example_workbooks_recalculate_to_their_cached_values(tmp_path, workbook):
    src = EXAMPLES / workbook
    results = _named_results(src)
    assert len(results) >= 30, sorted(results)   # the design chain's named results
    out = gnumeric.recalculate(src, tmp_path / "gnumeric")
    assert libreoffice.find_error_cells(out) == []
    values = libreoffice.read_values(out)
    bad = []
    for name, (sheet, coord, want) in sorted(results.items()):
        got = values.get((sheet, coord))
        # abs only for results that are exactly zero (a converged iteration's last change)
        if not (isinstance(got, (int, float)) and not isinstance(got, bool)
                and math.isclose(got, want, rel_tol=1e-9, abs_tol=1e-15)):
            bad.append((name, f"{sheet}!{coord}", want, got))
    assert not bad, f"{len(bad)} named result(s) differ from the cached values: {bad[:5]}"
