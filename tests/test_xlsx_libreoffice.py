# SPDX-License-Identifier: MIT
"""LibreOffice headless helpers: recalculation, recalc modes, PDF export, errors, batches.

The LibreOffice tests are skipped (with the reason shown by ``-ra``) when soffice is not installed;
CI installs it (libreoffice-calc-nogui).
"""
from __future__ import annotations

import math
import re
import zipfile

import openpyxl
import pytest

from workbook_builder.xlsx import libreoffice
from workbook_builder.xlsx.page_setup import set_print_layout

SOFFICE = libreoffice.find_soffice()
needs_soffice = pytest.mark.skipif(SOFFICE is None, reason="LibreOffice (soffice) not installed")


def test_find_soffice_env_override(tmp_path, monkeypatch):
    fake = tmp_path / "soffice"
    fake.write_text("#!/bin/sh\nexit 0\n")
    fake.chmod(0o755)
    monkeypatch.setenv("SWAYTUNE_SOFFICE", str(fake))
    assert libreoffice.find_soffice() == str(fake)


def test_missing_input_raises(tmp_path):
    with pytest.raises(FileNotFoundError, match="not found"):
        libreoffice.recalculate(tmp_path / "nope.xlsx", tmp_path / "out")


def test_unknown_recalc_mode_raises(tmp_path, stale_workbook):
    src = stale_workbook(tmp_path / "s.xlsx")
    with pytest.raises(ValueError, match="recalc='sometimes' must be one of"):
        libreoffice.recalculate(src, tmp_path / "out", recalc="sometimes")


def test_outdir_equal_to_input_dir_refused(tmp_path, stale_workbook):
    src = stale_workbook(tmp_path / "s.xlsx")
    with pytest.raises(ValueError, match="would overwrite the input"):
        libreoffice.recalculate(src, tmp_path)


def test_soffice_that_writes_nothing_is_an_error(tmp_path, stale_workbook):
    # soffice exits with status 0 even when it fails; the missing output must raise.
    fake = tmp_path / "fake_soffice"
    fake.write_text("#!/bin/sh\necho 'pretend failure' >&2\nexit 0\n")
    fake.chmod(0o755)
    src = stale_workbook(tmp_path / "s.xlsx")
    with pytest.raises(libreoffice.OfficeError,
                       match=r"produced no xlsx file .*exit status 0.*pretend"):
        libreoffice.recalculate(src, tmp_path / "out", soffice=str(fake))


def test_timeout_kills_and_raises(tmp_path, stale_workbook):
    fake = tmp_path / "slow_soffice"
    fake.write_text("#!/bin/sh\nsleep 30\n")
    fake.chmod(0o755)
    src = stale_workbook(tmp_path / "s.xlsx")
    with pytest.raises(libreoffice.OfficeError, match="did not finish within 0.5 s"):
        libreoffice.recalculate(src, tmp_path / "out", timeout=0.5, soffice=str(fake))


def test_no_soffice_raises(tmp_path, monkeypatch, stale_workbook):
    monkeypatch.setattr(libreoffice, "find_soffice", lambda: None)
    src = stale_workbook(tmp_path / "s.xlsx")
    with pytest.raises(libreoffice.OfficeError, match="not found"):
        libreoffice.recalculate(src, tmp_path / "out")


@needs_soffice
def test_recalculate_always_recomputes_stale_values(tmp_path, stale_workbook):
    src = stale_workbook(tmp_path / "s.xlsx")
    out = libreoffice.recalculate(src, tmp_path / "out")
    assert out == (tmp_path / "out" / "s.xlsx").resolve()
    v = libreoffice.read_values(out)
    assert v[("Calc sheet", "B1")] == 4
    assert v[("Calc sheet", "C1")] == "big"
    assert v[("Calc sheet", "D1")] is True
    # T0 = 2 pi sqrt(L/g), L = 10 m, g = 9.80665 m/s^2 (3rd CGPM 1901); reference: Python math.
    assert math.isclose(v[("Calc sheet", "F1")], 2 * math.pi * math.sqrt(10 / 9.80665),
                        rel_tol=1e-12)
    # The input itself is untouched.
    assert libreoffice.read_values(src)[("Calc sheet", "B1")] == 999.0


@needs_soffice
def test_recalculate_never_keeps_cached_values(tmp_path, stale_workbook):
    # What a viewer that does not recalculate sees: the cached values, stale or not.
    src = stale_workbook(tmp_path / "s.xlsx")
    out = libreoffice.recalculate(src, tmp_path / "out", recalc="never")
    v = libreoffice.read_values(out)
    assert v[("Calc sheet", "B1")] == 999.0
    assert v[("Calc sheet", "C1")] == "stale"


@needs_soffice
def test_find_error_cells_after_recalculation(tmp_path, stale_workbook):
    src = stale_workbook(tmp_path / "s.xlsx")
    out = libreoffice.recalculate(src, tmp_path / "out")
    errors = libreoffice.find_error_cells(out)
    # Error codes differ between applications: test "is an error", not which one.
    assert [(s, c) for s, c, _ in errors] == [("Calc sheet", "E1"), ("Calc sheet", "G1")]
    assert all(libreoffice.is_error_value(text) for _, _, text in errors)


@needs_soffice
def test_rerun_replaces_output(tmp_path, stale_workbook):
    src = stale_workbook(tmp_path / "s.xlsx")
    first = libreoffice.recalculate(src, tmp_path / "out")
    first.write_bytes(b"old junk")
    second = libreoffice.recalculate(src, tmp_path / "out")
    assert zipfile.is_zipfile(second)


@needs_soffice
def test_export_pdf_with_print_layout(tmp_path):
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Calculation"
    ws["A1"] = "Title row"
    for r in range(2, 150):
        ws.cell(r, 1, f"step {r}")
        ws.cell(r, 2, f"=A{r}&\" ok\"")
        ws.cell(r, 8, r * 1.5)
    set_print_layout(ws, paper="Letter", landscape=True, title_rows="1:1")
    assert ws.print_title_rows == "$1:$1"
    src = tmp_path / "p.xlsx"
    wb.save(src)
    pdf = libreoffice.export_pdf(src, tmp_path / "pdf")
    data = pdf.read_bytes()
    assert data.startswith(b"%PDF")
    assert len(re.findall(rb"/Type\s*/Page\b", data)) >= 2      # 149 rows: several pages
    # US Letter landscape: 11 in x 8.5 in = 792 pt x 612 pt (ANSI/ASME Y14.1).
    assert re.search(rb"/MediaBox\s*\[\s*0 0 792 612\s*\]", data)


@pytest.mark.parametrize("text, expected", [
    ("#VALUE!", True), ("#NAME?", True), ("#N/A", True), ("#DIV/0!", True), ("Err:502", True),
    ("#NUM!", True), ("OK", False), ("#1 step", False), ("Err:5", False), ("", False),
])
def test_is_error_value(text, expected):
    assert libreoffice.is_error_value(text) is expected


def test_is_error_value_by_type():
    assert libreoffice.is_error_value("anything", "e") is True
    assert libreoffice.is_error_value(3.0) is False


# ----------------------------------------------------------------------------- convert_many
def test_convert_many_argument_errors(tmp_path, stale_workbook):
    with pytest.raises(ValueError, match="paths is empty"):
        libreoffice.convert_many([], tmp_path / "out")
    a = stale_workbook(tmp_path / "a" / "s.xlsx")
    b = stale_workbook(tmp_path / "b" / "s.xlsx")
    with pytest.raises(ValueError, match="would both be converted to s.xlsx"):
        libreoffice.convert_many([a, b], tmp_path / "out")
    with pytest.raises(FileNotFoundError, match="not found"):
        libreoffice.convert_many([a, tmp_path / "nope.xlsx"], tmp_path / "out")
    with pytest.raises(ValueError, match="recalc='sometimes' must be one of"):
        libreoffice.convert_many([a], tmp_path / "out", recalc="sometimes")


def test_convert_many_missing_output_names_the_file(tmp_path, stale_workbook):
    # A soffice that converts only the first file: the batch fails, naming the other, and
    # nothing is moved into the output folder.
    fake = tmp_path / "fake_soffice"
    fake.write_text('#!/bin/sh\noutdir=""; take=0\nfor a; do if [ "$take" = 1 ]; then outdir=$a; take=0; fi; '
                    'if [ "$a" = "--outdir" ]; then take=1; fi; done\n'
                    'for a; do case "$a" in *first.xlsx) cp "$a" "$outdir/";; esac; done\n')
    fake.chmod(0o755)
    first = stale_workbook(tmp_path / "first.xlsx")
    second = stale_workbook(tmp_path / "second.xlsx")
    with pytest.raises(libreoffice.OfficeError, match="no xlsx file from second.xlsx"):
        libreoffice.convert_many([first, second], tmp_path / "out", soffice=str(fake))
    assert not (tmp_path / "out" / "first.xlsx").exists()


@needs_soffice
def test_convert_many_one_process_recalculates_every_file(tmp_path, stale_workbook):
    files = [stale_workbook(tmp_path / "in" / f"s{i}.xlsx") for i in range(3)]
    outs = libreoffice.convert_many(files, tmp_path / "out", "xlsx:Calc MS Excel 2007 XML")
    assert outs == [(tmp_path / "out" / f"s{i}.xlsx").resolve() for i in range(3)]
    for out in outs:
        # stale cached value 999 recomputed: B1 = A1*2 = 4
        assert libreoffice.read_values(out)[("Calc sheet", "B1")] == 4
