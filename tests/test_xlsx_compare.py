# SPDX-License-Identifier: MIT
"""Golden-workbook comparison: each kind of difference is found, named and ordered.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import datetime as dt
import time

import openpyxl
import pytest
from openpyxl.packaging.custom import StringProperty
from openpyxl.styles import Protection
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.worksheet.datavalidation import DataValidation

from workbook_builder.xlsx.cached import write_with_cached_values
from workbook_builder.xlsx.compare import assert_workbooks_equal, compare_workbooks


def _book(**change):
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Inputs"
    ws["A1"] = "Frequency"
    ws["B1"] = change.get("B1", 0.2)
    ws["B1"].number_format = change.get("fmt", "0.000")
    ws["B1"].protection = Protection(locked=False)
    ws["A3"] = "Damper"
    ws.merge_cells(change.get("merge", "A3:C3"))
    dv = DataValidation(type="decimal", operator="between", formula1="0.01",
                        formula2=change.get("dv_max", "10"), allow_blank=False)
    dv.add("B1")
    ws.add_data_validation(dv)
    calc = wb.create_sheet("Calculation")
    calc["A1"] = "Period"
    calc["B1"] = change.get("formula", "=1/Inputs!B1")
    if "extra_sheet" in change:
        wb.create_sheet(change["extra_sheet"])
    wb.defined_names.add(DefinedName("FREQUENCY", attr_text=change.get(
        "name_ref", "Inputs!$B$1")))
    wb.properties.title = change.get("title", "Invented tower damper")
    wb.custom_doc_props.append(StringProperty(name="SwaytuneGenerator",
                                              value=change.get("version", "swaytune 0.1.0")))
    if "created" in change:
        wb.properties.created = change["created"]
    return wb


def _save(tmp_path, name, cached=5.0, **change):
    return write_with_cached_values(_book(**change), tmp_path / name,
                                    {("Calculation", "B1"): cached})


def test_identical_builds_equal_despite_timestamps(tmp_path):
    a = _save(tmp_path, "a.xlsx", created=dt.datetime(2020, 1, 1))
    time.sleep(1.1)   # different modified timestamp and zip dates
    b = _save(tmp_path, "b.xlsx", created=dt.datetime(2024, 6, 30))
    assert a.read_bytes() != b.read_bytes()
    assert compare_workbooks(a, b) == []
    assert_workbooks_equal(a, b)


@pytest.mark.parametrize("change, expected", [
    ({"B1": 0.25}, "sheet 'Inputs' cell B1: value 0.2 (a) != 0.25 (b)"),
    ({"fmt": "0.00"}, "sheet 'Inputs' cell B1: number format '0.000' (a) != '0.00' (b)"),
    ({"formula": "=2/Inputs!B1"},
     "sheet 'Calculation' cell B1: formula '=1/Inputs!B1' (a) != '=2/Inputs!B1' (b)"),
    ({"cached": 5.5}, "sheet 'Calculation' cell B1: cached value 5.0 (a) != 5.5 (b)"),
    ({"merge": "A3:D3"}, "sheet 'Inputs': merged cells ['A3:C3'] (a) != ['A3:D3'] (b)"),
    ({"dv_max": "20"},
     "sheet 'Inputs': data validation 'B1': formula2 '10' (a) != '20' (b)"),
    ({"name_ref": "Inputs!$B$2"}, "workbook: defined name 'FREQUENCY': ('Inputs!$B$1', False) "
                                  "(a) != ('Inputs!$B$2', False) (b)"),
    ({"extra_sheet": "Notes"}, "sheet 'Notes': only in b"),
    ({"title": "Other"}, "workbook: document property 'core title': 'Invented tower damper' (a) "
                         "!= 'Other' (b)"),
    ({"version": "swaytune 0.2.0"}, "workbook: document property 'custom SwaytuneGenerator'"),
])
def test_each_difference_is_reported(tmp_path, change, expected):
    a = _save(tmp_path, "a.xlsx")
    b = _save(tmp_path, "b.xlsx", **change)
    diffs = compare_workbooks(a, b)
    assert len(diffs) == 1, diffs
    assert diffs[0].startswith(expected)


def test_text_that_looks_like_a_formula_differs_from_formula(tmp_path):
    a = _book()
    b = _book()
    b["Inputs"]["C5"] = "=1+1"
    b["Inputs"]["C5"].data_type = "s"
    a["Inputs"]["C5"] = "=1+1"
    a.save(tmp_path / "a.xlsx")
    b.save(tmp_path / "b.xlsx")
    diffs = compare_workbooks(tmp_path / "a.xlsx", tmp_path / "b.xlsx")
    assert diffs == ["sheet 'Inputs' cell C5: formula '=1+1' (a) != constant '=1+1' (b)"]


def test_locked_flag(tmp_path):
    a = _book()
    b = _book()
    b["Inputs"]["B1"].protection = Protection(locked=True)
    a.save(tmp_path / "a.xlsx")
    b.save(tmp_path / "b.xlsx")
    assert compare_workbooks(tmp_path / "a.xlsx", tmp_path / "b.xlsx") == [
        "sheet 'Inputs' cell B1: locked False (a) != True (b)"]


def test_first_differing_sheet_and_cell_first(tmp_path):
    a = _book()
    b = _book()
    b["Calculation"]["A1"] = "Changed"      # later sheet
    b["Inputs"]["A3"] = "Changed"           # first sheet, later row
    b["Inputs"]["B1"] = 0.3                 # first sheet, first differing cell
    b.properties.title = "Other"            # workbook level: last
    a.save(tmp_path / "a.xlsx")
    b.save(tmp_path / "b.xlsx")
    diffs = compare_workbooks(tmp_path / "a.xlsx", tmp_path / "b.xlsx")
    assert [d.split(":")[0] for d in diffs] == [
        "sheet 'Inputs' cell B1", "sheet 'Inputs' cell A3", "sheet 'Calculation' cell A1",
        "workbook"]


def test_sheet_order(tmp_path):
    a = _book()
    b = _book()
    b.move_sheet("Calculation", offset=-1)
    a.save(tmp_path / "a.xlsx")
    b.save(tmp_path / "b.xlsx")
    assert compare_workbooks(tmp_path / "a.xlsx", tmp_path / "b.xlsx") == [
        "workbook: sheet order ['Inputs', 'Calculation'] (a) != ['Calculation', 'Inputs'] (b)"]


def test_relative_tolerance(tmp_path):
    a = _save(tmp_path, "a.xlsx", cached=5.0)
    b = _save(tmp_path, "b.xlsx", cached=5.0 * (1 + 1e-14))
    assert compare_workbooks(a, b) == []
    assert len(compare_workbooks(a, b, rel_tol=0.0)) == 1


def test_ignore_properties_and_cap(tmp_path):
    a = _save(tmp_path, "a.xlsx")
    b = _save(tmp_path, "b.xlsx", version="swaytune 9", B1=1.0, formula="=3")
    assert len(compare_workbooks(a, b)) == 3
    assert len(compare_workbooks(a, b, ignore_properties=["custom SwaytuneGenerator"])) == 2
    capped = compare_workbooks(a, b, max_differences=1)
    assert capped[-1] == "... and 2 more difference(s)"


def test_assert_workbooks_equal_message(tmp_path):
    a = _save(tmp_path, "a.xlsx")
    b = _save(tmp_path, "b.xlsx", B1=9.0)
    with pytest.raises(AssertionError, match=r"differ \(1 difference\(s\)\), first:\n  sheet "
                                             r"'Inputs' cell B1"):
        assert_workbooks_equal(a, b)


def test_missing_file(tmp_path):
    with pytest.raises(FileNotFoundError, match="workbook not found"):
        compare_workbooks(tmp_path / "x.xlsx", tmp_path / "y.xlsx")
