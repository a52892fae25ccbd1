# SPDX-License-Identifier: MIT
"""Firm templates: title block filled through defined names, the firm's layout kept, text safe.

The template is made here for an invented firm (demo data only).

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import datetime as dt

import openpyxl
import pytest
from openpyxl.styles import Font, PatternFill
from openpyxl.workbook.defined_name import DefinedName

from workbook_builder.xlsx import libreoffice
from workbook_builder.xlsx.template import (TITLE_BLOCK_NAMES, add_default_title_block,
                                            open_template, template_fields, unfilled_fields)

FIRM = "Example Structures Office (invented)"
FIELDS = {"project_number": "P-4711", "title": "Invented tower: pendulum damper",
          "calculated_by": "A.B.", "checked_by": "C.D.", "date": dt.date(2026, 3, 14),
          "revision": "B"}


def make_template(path, *, skip=(), sheet_scope=False):
    """A small firm template: cover sheet with a styled title block marked by defined names."""
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Calc cover"
    ws["A1"] = FIRM
    ws["A1"].font = Font(bold=True, size=16, color="1F3864")
    labels = {"project_number": 3, "title": 4, "calculated_by": 5, "checked_by": 6, "date": 7,
              "revision": 8}
    for key, row in labels.items():
        ws.cell(row, 1, key.replace("_", " ").capitalize())
        target = ws.cell(row, 2, "(fill)")
        target.font = Font(name="Arial", italic=True, color="C00000")
        target.fill = PatternFill("solid", fgColor="FFF2CC")
        target.number_format = "@"
        if key in skip:
            continue
        ref = f"'Calc cover'!$B${row}"
        if key == "title":
            ws.merge_cells("B4:E4")
            ref = "'Calc cover'!$B$4:$E$4"
        dn = DefinedName(TITLE_BLOCK_NAMES[key], attr_text=ref)
        if sheet_scope:
            ws.defined_names.add(dn)
        else:
            wb.defined_names.add(dn)
    ws.column_dimensions["B"].width = 31
    wb.defined_names.add(DefinedName("FIRM_LOGO_AREA", attr_text="'Calc cover'!$F$1:$H$3"))
    notes = wb.create_sheet("Firm notes")
    notes["A1"] = "Filing instructions of the invented firm."
    ws.print_title_rows = "1:2"
    wb.save(path)
    return path


def test_fields_filled_and_firm_layout_kept(tmp_path):
    src = make_template(tmp_path / "firm.xlsx")
    wb = open_template(src, FIELDS)
    ws = wb["Calc cover"]
    assert [ws[f"B{r}"].value for r in range(3, 9)] == [
        "P-4711", "Invented tower: pendulum damper", "A.B.", "C.D.", "2026-03-14", "B"]
    assert all(ws[f"B{r}"].data_type == "s" for r in range(3, 9))
    # Firm's styles, sheets, names, merges and widths survive a save and reload.
    out = tmp_path / "filled.xlsx"
    wb.save(out)
    wb2 = openpyxl.load_workbook(out)
    ws2 = wb2["Calc cover"]
    assert wb2.sheetnames == ["Calc cover", "Firm notes"]
    assert ws2["A1"].value == FIRM and ws2["A1"].font.b and ws2["A1"].font.sz == 16
    assert ws2["B3"].font.name == "Arial" and ws2["B3"].font.i
    assert ws2["B3"].fill.fgColor.rgb.endswith("FFF2CC")
    assert "B4:E4" in [str(r) for r in ws2.merged_cells.ranges]
    assert ws2.column_dimensions["B"].width == 31
    assert "FIRM_LOGO_AREA" in wb2.defined_names
    assert ws2.print_title_rows == "$1:$2"
    assert template_fields(wb2)["title"] == ("Calc cover", "B4")


def test_text_starting_with_equals_stays_text(tmp_path):
    src = make_template(tmp_path / "firm.xlsx")
    wb = open_template(src, {"title": "=HYPERLINK(\"http://example.invalid\")", "revision": "=1+1"})
    out = tmp_path / "filled.xlsx"
    wb.save(out)
    ws = openpyxl.load_workbook(out)["Calc cover"]
    assert ws["B8"].value == "=1+1" and ws["B8"].data_type == "s"
    assert ws["B4"].data_type == "s"


@pytest.mark.skipif(libreoffice.find_soffice() is None,
                    reason="LibreOffice (soffice) not installed")
def test_equals_text_is_not_evaluated_by_libreoffice(tmp_path):
    src = make_template(tmp_path / "firm.xlsx")
    wb = open_template(src, {"revision": "=1+1"})
    wb.save(tmp_path / "filled.xlsx")
    out = libreoffice.recalculate(tmp_path / "filled.xlsx", tmp_path / "lo")
    assert libreoffice.read_values(out)[("Calc cover", "B8")] == "=1+1"


def test_numbers_and_datetimes_become_text(tmp_path):
    src = make_template(tmp_path / "firm.xlsx")
    wb = open_template(src, {"revision": 3, "project_number": 4711.0,
                             "date": dt.datetime(2026, 3, 14, 0, 0)})
    ws = wb["Calc cover"]
    assert (ws["B8"].value, ws["B3"].value, ws["B7"].value) == ("3", "4711", "2026-03-14")


def test_none_leaves_field(tmp_path):
    src = make_template(tmp_path / "firm.xlsx")
    wb = open_template(src, {"checked_by": None, "revision": "A"})
    assert wb["Calc cover"]["B6"].value == "(fill)"


def test_sheet_scoped_names_accepted(tmp_path):
    src = make_template(tmp_path / "firm.xlsx", sheet_scope=True)
    assert open_template(src, FIELDS)["Calc cover"]["B3"].value == "P-4711"


def test_unmarked_fields_skipped_or_strict(tmp_path):
    src = make_template(tmp_path / "firm.xlsx", skip=("checked_by", "revision"))
    wb = open_template(src, FIELDS)
    assert wb["Calc cover"]["B6"].value == "(fill)"
    assert unfilled_fields(wb, FIELDS) == ["checked_by", "revision"]
    with pytest.raises(ValueError, match=r"has no defined name for field\(s\) checked_by "
                                         r"\(TB_CHECKED_BY\), revision \(TB_REVISION\)"):
        open_template(src, FIELDS, strict=True)


@pytest.mark.parametrize("fields, match", [
    ({"engineer": "X"}, r"unknown title-block field\(s\) \['engineer'\]"),
    ({"revision": float("nan")}, r"revision=nan must be text or a finite number"),
    ({"revision": [1]}, r"revision=\[1\] must be text, a number or a date"),
    ({"revision": True}, r"revision=True must be text"),
    ({"title": "bad\x07bell"}, r"title='bad\\x07bell' holds a control character"),
])
def test_bad_fields(tmp_path, fields, match):
    src = make_template(tmp_path / "firm.xlsx")
    with pytest.raises(ValueError, match=match):
        open_template(src, fields)


def test_missing_and_broken_templates(tmp_path):
    with pytest.raises(FileNotFoundError, match="template workbook not found"):
        open_template(tmp_path / "nope.xlsx", FIELDS)
    bad = tmp_path / "bad.xlsx"
    bad.write_text("not a zip")
    with pytest.raises(ValueError, match="is not a readable .xlsx workbook"):
        open_template(bad, FIELDS)


def test_name_pointing_nowhere(tmp_path):
    wb = openpyxl.Workbook()
    wb.defined_names.add(DefinedName("TB_REVISION", attr_text="#REF!"))
    wb.save(tmp_path / "t.xlsx")
    with pytest.raises(ValueError, match=r"defined name TB_REVISION refers to '#REF!'"):
        open_template(tmp_path / "t.xlsx", {"revision": "A"})


def test_default_title_block(tmp_path):
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Calculation"
    cells = add_default_title_block(ws, dict(FIELDS, title="=not a formula"), "B2",
                                    define_names=True)
    assert cells == {"project_number": "C3", "revision": "E3", "title": "C4",
                     "calculated_by": "C5", "checked_by": "E5", "date": "C6"}
    assert ws["B2"].value == "Tuned mass damper calculation"
    assert ws["B3"].value == "Project no." and ws["C3"].value == "P-4711"
    assert ws["C4"].value == "=not a formula" and ws["C4"].data_type == "s"
    assert ws["E6"].value == "Calculation"
    assert "C4:E4" in [str(r) for r in ws.merged_cells.ranges]
    wb.save(tmp_path / "own.xlsx")
    # The workbook now serves as a template itself.
    again = open_template(tmp_path / "own.xlsx", {"revision": "C"})
    assert again["Calculation"]["E3"].value == "C"
    with pytest.raises(ValueError, match=r"already exist"):
        add_default_title_block(wb.create_sheet("Second"), FIELDS, define_names=True)


def test_default_title_block_without_names_and_empty_fields():
    wb = openpyxl.Workbook()
    cells = add_default_title_block(wb.active, {})
    assert wb.active["B2"].value == "" and cells["project_number"] == "B2"
    assert not any(n in wb.defined_names for n in TITLE_BLOCK_NAMES.values())
