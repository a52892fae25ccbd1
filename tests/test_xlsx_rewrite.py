# SPDX-License-Identifier: MIT
"""Writing an updated copy of a package: encoding of cached values, cells of one sheet part,
chart number caches, atomic replacement.

Cell types follow ECMA-376 Part 1 (5th ed., 2016), 18.18.11 ST_CellType: n number, b boolean,
e error, str formula string; 18.3.1.96 <v> cell value. A cell holds at most 32,767 characters
(Microsoft, "Excel specifications and limits"). An XML parser turns a carriage return into a
line feed unless it is written as a character reference (W3C, XML 1.0, 5th ed., 2008, 2.11
End-of-Line Handling). Chart series cache their numbers in numRef/numCache (ECMA-376 Part 1,
21.2 DrawingML - Charts).
"""
from __future__ import annotations

import math
import re
import zipfile

import numpy as np
import openpyxl
import pytest
from openpyxl.chart import Reference, ScatterChart, Series

from workbook_builder.xlsx.files import new_file_mode
from workbook_builder.xlsx.package import PackageError
from workbook_builder.xlsx.rewrite import CellError, encode_value, rewrite_cells, write_package

KEY = ("Calc", "B2")


# ----------------------------------------------------------------------------- encode_value
@pytest.mark.parametrize("code", ["VALUE", "#value!", "", "#N/A extra"])
def test_cell_error_rejects_non_codes(code):
    with pytest.raises(ValueError, match="must be a spreadsheet error code"):
        CellError(code)


@pytest.mark.parametrize("value, expected", [
    (True, ("b", "1")),
    (np.bool_(False), ("b", "0")),
    (7, (None, "7")),
    (np.int64(-3), (None, "-3")),
    (0.1, (None, "0.1")),                       # shortest repr that round-trips
    (np.float64(1e-300), (None, "1e-300")),
    ("a<b & c>d", ("str", "a&lt;b &amp; c&gt;d")),
    ("line\rfeed", ("str", "line&#13;feed")),   # kept as a character reference
    (CellError("#N/A"), ("e", "#N/A")),
    (CellError("#DIV/0!"), ("e", "#DIV/0!")),
])
def test_encode_value(value, expected):
    assert encode_value(KEY, value) == expected


@pytest.mark.parametrize("value, match", [
    (math.nan, r"Calc!B2 is nan; NaN and inf cannot be stored"),
    (-math.inf, r"Calc!B2 is -inf"),
    (np.float32("inf"), r"Calc!B2 is inf"),
    ("bell\x07", r"Calc!B2 holds a control character"),
    ("x" * 32768, r"Calc!B2 is longer than 32767 characters"),
    (None, r"Calc!B2 has type NoneType"),
    (b"bytes", r"Calc!B2 has type bytes"),
])
def test_encode_value_refuses(value, match):
    with pytest.raises(PackageError, match=match):
        encode_value(KEY, value)


def test_longest_text_a_cell_holds_is_accepted():
    assert encode_value(KEY, "x" * 32767) == ("str", "x" * 32767)


# ----------------------------------------------------------------------------- rewrite_cells
SHEET = ('<worksheet><sheetData><row r="1">'
         '<c r="A1" s="3"><v>1</v></c>'
         '<c r="B1"><f>A1*2</f><v>2</v></c>'
         '<c r="C1" t="str"><f>IF(A1&gt;1,"big","small")</f><v>small</v></c>'
         '<c r="D1" t="s"><v>0</v></c>'
         '</row></sheetData></worksheet>')


def test_rewrite_cells_constants_and_cached_values():
    new = rewrite_cells(SHEET, "Calc", constants={"A1": 4.0},
                        cached={"B1": 8.0, "C1": "big"})
    assert '<c r="A1" s="3"><v>4.0</v></c>' in new          # style kept
    assert '<c r="B1"><f>A1*2</f><v>8.0</v></c>' in new
    assert '<c r="C1" t="str"><f>IF(A1&gt;1,"big","small")</f><v>big</v></c>' in new
    assert '<c r="D1" t="s"><v>0</v></c>' in new             # untouched
    # a cached value of another type changes the cell's type
    new = rewrite_cells(SHEET, "Calc", cached={"C1": CellError("#VALUE!")})
    assert '<c r="C1" t="e"><f>IF(A1&gt;1,"big","small")</f><v>#VALUE!</v></c>' in new


def test_rewrite_cells_namespace_prefixed_markup():
    xml = ('<x:worksheet xmlns:x="urn:main"><x:sheetData><x:row r="1">'
           '<x:c r="A1"><x:f>1+1</x:f><x:v>0</x:v></x:c></x:row></x:sheetData></x:worksheet>')
    new = rewrite_cells(xml, "Calc", cached={"A1": True})
    assert '<x:c r="A1" t="b"><x:f>1+1</x:f><x:v>1</x:v></x:c>' in new


@pytest.mark.parametrize("kwargs, match", [
    ({"constants": {"B1": 1.0}}, r"constant cell\(s\) \['B1'\] of sheet 'Calc' not found"),
    ({"constants": {"Z9": 1.0}}, r"constant cell\(s\) \['Z9'\]"),
    ({"cached": {"A1": 1.0}}, r"not formula cells: sheet 'Calc': A1"),
    ({"constants": {"A1": math.inf}}, r"Calc!A1: refusing to write inf"),
    ({"cached": {"B1": 1.0}, "require_all": True},
     r"no cached value given for 1 formula cell\(s\) on sheet 'Calc': C1"),
])
def test_rewrite_cells_refuses(kwargs, match):
    with pytest.raises(PackageError, match=match):
        rewrite_cells(SHEET, "Calc", **kwargs)


# ----------------------------------------------------------------------------- write_package
def _chart_book(path):
    """A sheet of x, y = 2^x values, a formula cell, and a scatter chart of the values."""
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Chart data"
    for r, x in enumerate((1, 2, 3), start=2):
        ws.cell(r, 1, float(x))
        ws.cell(r, 2, float(2 ** x))
    ws["D1"] = "=SUM(B2:B4)"
    chart = ScatterChart()
    xs = Reference(ws, min_col=1, min_row=2, max_row=4)
    ys = Reference(ws, min_col=2, min_row=2, max_row=4)
    chart.series.append(Series(ys, xs))
    ws.add_chart(chart, "F2")
    wb.save(path)
    return path


def _numbers(cache_xml: str) -> list[float]:
    return [float(v) for v in re.findall(r'<pt idx="\d+"><v>([^<]*)</v></pt>', cache_xml)]


def test_write_package_refreshes_chart_caches_and_cells(tmp_path):
    src = _chart_book(tmp_path / "src.xlsx")
    values = {("Chart data", f"A{r}"): float(r) for r in (2, 3, 4)}
    values.update({("Chart data", f"B{r}"): float(r * r) for r in (2, 3, 4)})
    dest = write_package(src, tmp_path / "out.xlsx", cached={("Chart data", "$d$1"): 29.0},
                         chart_values=values)
    with zipfile.ZipFile(dest) as zf, zipfile.ZipFile(src) as zs:
        chart = zf.read("xl/charts/chart1.xml").decode()
        assert zf.namelist() == zs.namelist()
        unchanged = [n for n in zs.namelist() if zs.read(n) == zf.read(n)]
    caches = re.findall(r"<numCache>.*?</numCache>", chart)
    assert [_numbers(c) for c in caches] == [[2.0, 3.0, 4.0], [4.0, 9.0, 16.0]]
    assert all('<ptCount val="3"/>' in c for c in caches)
    assert openpyxl.load_workbook(dest, data_only=True)["Chart data"]["D1"].value == 29.0
    assert "xl/workbook.xml" in unchanged and "xl/worksheets/sheet1.xml" not in unchanged


def test_chart_series_with_a_cell_missing_keeps_its_cache(tmp_path):
    src = _chart_book(tmp_path / "src.xlsx")
    values = {("Chart data", f"A{r}"): float(r) for r in (2, 3, 4)}     # x only
    dest = write_package(src, tmp_path / "out.xlsx", chart_values=values)
    with zipfile.ZipFile(dest) as zf:
        chart = zf.read("xl/charts/chart1.xml").decode()
    assert chart.count("<numCache>") == 1                     # the y series: left as it was
    assert "<f>'Chart data'!$B$2:$B$4</f></numRef>" in chart


def test_write_package_errors_leave_the_destination(tmp_path):
    src = _chart_book(tmp_path / "src.xlsx")
    dest = tmp_path / "dest.xlsx"
    dest.write_bytes(b"previous content")
    with pytest.raises(PackageError, match=r"unknown sheet\(s\) \['Nope'\]"):
        write_package(src, dest, cached={("Nope", "A1"): 1.0})
    with pytest.raises(PackageError, match="not formula cells"):
        write_package(src, dest, cached={("Chart data", "A2"): 1.0})
    assert dest.read_bytes() == b"previous content"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["dest.xlsx", "src.xlsx"]


def test_write_package_in_place_keeps_usual_permissions(tmp_path):
    src = _chart_book(tmp_path / "src.xlsx")
    write_package(src, src, constants={("Chart data", "A2"): 1.5})
    assert openpyxl.load_workbook(src)["Chart data"]["A2"].value == 1.5
    assert src.stat().st_mode & 0o777 == new_file_mode(tmp_path / "new.xlsx")   # not 0o600
