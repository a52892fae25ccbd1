# SPDX-License-Identifier: MIT
"""SheetLayout: each call records the planned cell or sheet setting it names, nothing else.

Column letters are checked against the spreadsheet convention (A..Z, then AA, AB, ...: a
bijective base-26 numeral; common practice, no source) computed independently in the test.
"""
from __future__ import annotations

import pytest

from workbook_builder.plan.sheet import Looks, SheetLayout, ref


def _letters(col: int) -> str:
    out = ""
    while col:
        col, rem = divmod(col - 1, 26)
        out = chr(ord("A") + rem) + out
    return out


@pytest.mark.parametrize("row, col", [(1, 1), (5, 26), (7, 27), (12, 28), (3, 52), (9, 703),
                                      (1048576, 16384)])
def test_ref_is_the_a1_reference(row, col):
    assert ref(row, col) == f"{_letters(col)}{row}"


def test_ref_of_the_last_cell_of_a_sheet():
    # 16384 columns by 1048576 rows, the last column XFD (Excel 2007+ limits; from memory)
    assert ref(12, 28) == "AB12" and ref(1048576, 16384) == "XFD1048576"


def test_each_cell_call_records_its_kind_source_name_and_look():
    sh = SheetLayout("S")
    assert sh.title == "S" and sh.plan.cells == {}
    sh.label(1, 1, "Heading", Looks.TITLE)
    sh.text(2, 1, ("info", "title"), name="TB_TITLE")
    sh.input(3, 3, ("input", "frequency"), name="structure_frequency_entered", unit="Hz")
    sh.value(3, 4, source=("unit", "frequency"), name="structure_frequency_unit")
    sh.formula(3, 6, "=C3*E3", fmt="0.00000", name="structure_frequency", unit="Hz",
               label="Frequency")
    sh.engine(4, 4, ("cell", "mass_ratio"), name="mass_ratio")
    sh.check(5, 7, '=IF(A1>0,"OK","NOT OK")', name="check_x")
    sh.blank(6, 2, Looks.FILL)
    cells = sh.plan.cells
    assert list(cells) == ["A1", "A2", "C3", "D3", "F3", "D4", "G5", "B6"]
    kinds = {r: (c.kind, c.source, c.name) for r, c in cells.items()}
    assert kinds["A1"] == ("label", (), "") and cells["A1"].content == "Heading"
    assert kinds["A2"] == ("text", ("info", "title"), "TB_TITLE")
    assert kinds["C3"] == ("input", ("input", "frequency"), "structure_frequency_entered")
    assert kinds["D3"] == ("value", ("unit", "frequency"), "structure_frequency_unit")
    assert kinds["F3"] == ("formula", (), "structure_frequency")
    assert kinds["D4"] == ("engine", ("cell", "mass_ratio"), "mass_ratio")
    assert kinds["G5"] == ("check", (), "check_x")
    assert kinds["B6"] == ("label", (), "") and cells["B6"].content is None
    # inputs and engine values carry their colour token beside the look asked for
    assert cells["C3"].style.split() == ["input", "box"] and cells["C3"].fmt == "General"
    assert cells["D4"].style.split() == ["engine", "box"]
    assert cells["G5"].style == "bold box"
    assert (cells["F3"].fmt, cells["F3"].unit, cells["F3"].label) == ("0.00000", "Hz",
                                                                      "Frequency")


def test_a_second_cell_at_the_same_place_replaces_the_first():
    sh = SheetLayout("S")
    sh.label(2, 2, "old")
    sh.formula(2, 2, "=1+1")
    assert len(sh.plan.cells) == 1 and sh.plan.cells["B2"].kind == "formula"


def test_header_and_section_fill_their_rows():
    sh = SheetLayout("S")
    sh.header(4, ["Input", "Symbol", "Value"], first_col=2)
    sh.section(6, "1  Damping required", 4)
    assert {r: (c.content, c.style) for r, c in sh.plan.cells.items() if r.endswith("4")} == {
        "B4": ("Input", Looks.HEAD), "C4": ("Symbol", Looks.HEAD), "D4": ("Value", Looks.HEAD)}
    assert sh.plan.cells["A6"].content == "1  Damping required"
    assert sh.plan.cells["A6"].style == Looks.SECTION
    assert [sh.plan.cells[f"{c}6"].style for c in "BCD"] == [Looks.FILL] * 3
    assert "E6" not in sh.plan.cells


def test_sheet_settings_are_recorded():
    sh = SheetLayout("S")
    sh.merge(2, 1, 2, 9)
    sh.widths([34, 9])
    sh.height(3, 30)
    sh.height(3, 15)                     # a smaller height never shrinks the row
    sh.height(4, 12)
    sh.validation("C5", "AND(ABS(C5)>=0,C5>0)", "a number > 0", prompt_title="f_s",
                  prompt="x" * 300)
    sh.verdicts("G4:G8")
    sh.name_range("chart_period", "A63:C93")
    sh.page(landscape=True, title_rows="1:4", print_area="A1:F40", freeze="C5")
    p = sh.plan
    assert p.merges == ["A2:I2"] and p.widths == [34, 9] and p.heights == {3: 30, 4: 12}
    [v] = p.validations
    assert (v.ref, v.formula, v.error, v.prompt_title) == ("C5", "AND(ABS(C5)>=0,C5>0)",
                                                           "a number > 0", "f_s")
    assert v.prompt == "x" * 255           # input message limit of 255 characters (from memory)
    assert p.verdict_ranges == ["G4:G8"] and p.ranges == {"chart_period": "A63:C93"}
    assert (p.landscape, p.title_rows, p.print_area, p.freeze) == (True, "1:4", "A1:F40",
                                                                   "C5")
    sh.page()
    assert (p.landscape, p.title_rows, p.print_area, p.freeze) == (False, None, None, None)
