# SPDX-License-Identifier: MIT
"""Cached values in formula cells: types, formulas kept, package otherwise unchanged, errors.

Cell types follow ECMA-376 Part 1 (5th ed., 2016), 18.18.11 ST_CellType: n number, b boolean,
e error, str formula string; 18.3.1.96 <v> cell value.
"""
from __future__ import annotations

import math
import zipfile

import numpy as np
import openpyxl
import pytest
from hypothesis import given, settings, strategies as st
from openpyxl.worksheet.formula import ArrayFormula

from workbook_builder.xlsx import libreoffice
from workbook_builder.xlsx.cached import (CellError, formula_cells, insert_cached_values,
                                          write_with_cached_values)

needs_soffice = pytest.mark.skipif(libreoffice.find_soffice() is None,
                                   reason="LibreOffice (soffice) not installed")

PERIOD_10M = 2 * math.pi * math.sqrt(10 / 9.80665)   # small-angle period, L = 10 m [s]


def _book():
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Inputs & data"
    ws["A1"] = 10.0
    ws["A2"] = "=A1"   # not given a value in most tests
    calc = wb.create_sheet("Calculation")
    calc["B2"] = "='Inputs & data'!A1*2"
    calc["B3"] = "=2*PI()*SQRT('Inputs & data'!A1/9.80665)"
    calc["B4"] = '=IF(B2>1,"OK","NOT OK")'
    calc["B5"] = "=B2>1"
    calc["B6"] = "=SQRT(-1)"
    calc["B7"] = "=ROUND(B2,0)"
    calc["C1"] = "plain text"
    calc["C2"] = 3.5
    calc["D1"] = ArrayFormula("D1", "=SUMPRODUCT(B2:B3)")
    return wb


VALUES = {
    ("Calculation", "B2"): 20.0,
    ("Calculation", "B3"): PERIOD_10M,
    ("Calculation", "B4"): "OK",
    ("Calculation", "$B$5"): True,
    ("Calculation", "b6"): CellError("#NUM!"),
    ("Calculation", "B7"): 20,
    ("Calculation", "D1"): 20.0 + PERIOD_10M,
}


@pytest.fixture()
def built(tmp_path):
    wb = _book()
    plain = tmp_path / "plain.xlsx"
    wb.save(plain)
    path = write_with_cached_values(_book(), tmp_path / "cached.xlsx", VALUES)
    return plain, path


def test_values_read_back_with_data_only(built):
    _, path = built
    ws = openpyxl.load_workbook(path, data_only=True)["Calculation"]
    assert ws["B2"].value == 20.0 and ws["B2"].data_type == "n"
    assert ws["B3"].value == PERIOD_10M            # repr round-trips the float exactly
    assert ws["B4"].value == "OK" and ws["B4"].data_type == "s"
    assert ws["B5"].value is True and ws["B5"].data_type == "b"
    assert ws["B6"].value == "#NUM!" and ws["B6"].data_type == "e"
    assert ws["B7"].value == 20
    assert ws["D1"].value == 20.0 + PERIOD_10M
    assert ws["C1"].value == "plain text" and ws["C2"].value == 3.5


def test_formulas_unchanged(built):
    plain, path = built
    assert formula_cells(path) == formula_cells(plain)
    assert formula_cells(path)[("Calculation", "B4")] == '=IF(B2>1,"OK","NOT OK")'
    ws = openpyxl.load_workbook(path)["Calculation"]
    assert isinstance(ws["D1"].value, ArrayFormula) and ws["D1"].value.ref == "D1"


def test_only_given_cells_change(built):
    plain, path = built
    with zipfile.ZipFile(plain) as a, zipfile.ZipFile(path) as b:
        assert a.namelist() == b.namelist()
        changed = [n for n in a.namelist() if a.read(n) != b.read(n)]
    # Only the calculation sheet differs (docProps/core.xml timestamps may differ by a second).
    assert set(changed) - {"docProps/core.xml"} == {"xl/worksheets/sheet2.xml"}
    ws = openpyxl.load_workbook(path, data_only=True)["Inputs & data"]
    assert ws["A2"].value is None                  # formula without a given value stays uncached


def test_xml_of_cells(built):
    _, path = built
    xml = zipfile.ZipFile(path).read("xl/worksheets/sheet2.xml").decode()
    assert '<c r="B4" t="str"><f>IF(B2&gt;1,"OK","NOT OK")</f><v>OK</v></c>' in xml
    assert '<c r="B5" t="b"><f>B2&gt;1</f><v>1</v></c>' in xml
    assert '<c r="B6" t="e"><f>SQRT(-1)</f><v>#NUM!</v></c>' in xml
    assert '<c r="B7"><f>ROUND(B2,0)</f><v>20</v></c>' in xml


def test_insert_into_separate_destination(tmp_path):
    src = tmp_path / "a.xlsx"
    _book().save(src)
    before = src.read_bytes()
    dest = insert_cached_values(src, {("Calculation", "B2"): 1.5}, tmp_path / "b.xlsx")
    assert src.read_bytes() == before
    assert openpyxl.load_workbook(dest, data_only=True)["Calculation"]["B2"].value == 1.5


def test_require_all(tmp_path):
    with pytest.raises(ValueError, match=r"no cached value given for 1 formula cell\(s\) on sheet "
                                         r"'Inputs & data': A2"):
        write_with_cached_values(_book(), tmp_path / "x.xlsx", VALUES, require_all=True)
    full = dict(VALUES)
    full[("Inputs & data", "A2")] = 10.0
    path = write_with_cached_values(_book(), tmp_path / "x.xlsx", full, require_all=True)
    assert openpyxl.load_workbook(path, data_only=True)["Inputs & data"]["A2"].value == 10.0


@pytest.mark.parametrize("values, match", [
    ({("Nope", "A1"): 1.0}, r"unknown sheet\(s\) \['Nope'\]"),
    ({("Calculation", "C2"): 1.0}, r"not formula cells: sheet 'Calculation': C2"),
    ({("Calculation", "Z99"): 1.0}, r"not formula cells: sheet 'Calculation': Z99"),
    ({("Calculation", "B2"): float("nan")}, r"Calculation!B2 is nan; NaN and inf"),
    ({("Calculation", "B2"): float("inf")}, r"Calculation!B2 is inf; NaN and inf"),
    ({("Calculation", "B2"): np.float64("-inf")}, r"Calculation!B2 is -inf"),
    ({("Calculation", "B2"): None}, r"Calculation!B2 has type NoneType"),
    ({("Calculation", "B2"): [1.0]}, r"Calculation!B2 has type list"),
    ({("Calculation", "B4"): "bad\x01char"}, r"Calculation!B4 holds a control character"),
    ({("Calculation", "A1:B2"): 1.0}, r"cell 'A1:B2' on sheet 'Calculation' is not a single cell"),
    ({"B2": 1.0}, r"key 'B2' must be a \(sheet title, cell\) pair"),
])
def test_bad_values_raise_and_leave_file(tmp_path, values, match):
    target = tmp_path / "keep.xlsx"
    target.write_bytes(b"previous content")
    with pytest.raises(ValueError, match=match):
        write_with_cached_values(_book(), target, values)
    assert target.read_bytes() == b"previous content"
    assert [p.name for p in tmp_path.iterdir()] == ["keep.xlsx"]   # no temporary left behind


def test_numpy_scalars(tmp_path):
    values = {("Calculation", "B2"): np.float64(0.1), ("Calculation", "B5"): np.bool_(False),
              ("Calculation", "B7"): np.int64(7)}
    path = write_with_cached_values(_book(), tmp_path / "n.xlsx", values)
    ws = openpyxl.load_workbook(path, data_only=True)["Calculation"]
    assert ws["B2"].value == 0.1 and ws["B5"].value is False and ws["B7"].value == 7


@settings(max_examples=40, deadline=None)
@given(x=st.floats(allow_nan=False, allow_infinity=False),
       s=st.text(alphabet=st.characters(blacklist_categories=("Cs", "Cc")), max_size=40)
       | st.text(alphabet="ab \t\n\r&<>\"'", max_size=20))
def test_roundtrip_property(tmp_path_factory, x, s):
    path = tmp_path_factory.mktemp("h") / "h.xlsx"
    write_with_cached_values(_book(), path, {("Calculation", "B2"): x, ("Calculation", "B4"): s})
    ws = openpyxl.load_workbook(path, data_only=True)["Calculation"]
    assert ws["B2"].value == x
    assert (ws["B4"].value or "") == s


@needs_soffice
def test_libreoffice_reads_cached_values_without_recalculating(built, tmp_path):
    # A viewer that does not recalculate sees the cached values.
    _, path = built
    out = libreoffice.recalculate(path, tmp_path / "never", recalc="never")
    v = libreoffice.read_values(out)
    assert v[("Calculation", "B3")] == pytest.approx(PERIOD_10M, rel=1e-15)
    assert v[("Calculation", "B4")] == "OK"
    assert v[("Calculation", "B5")] is True


@needs_soffice
def test_cached_values_equal_libreoffice_recalculation(built, tmp_path):
    # The cached values written here equal what LibreOffice computes with a forced recalculation.
    _, path = built
    out = libreoffice.recalculate(path, tmp_path / "always")
    v = libreoffice.read_values(out)
    for (sheet, coord), cached in VALUES.items():
        got = v[(sheet, coord.replace("$", "").upper())]
        if isinstance(cached, CellError):
            assert libreoffice.is_error_value(got)
        elif isinstance(cached, float):
            assert got == pytest.approx(cached, rel=1e-12)
        else:
            assert got == cached
    assert libreoffice.find_error_cells(out) == [("Calculation", "B6", v[("Calculation", "B6")])]
