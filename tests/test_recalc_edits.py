# SPDX-License-Identifier: MIT
"""Formulas edited by hand (workbook_builder.recalc.edits).

The builder's formula text (the plan) is the reference: a different formula, a value over a
formula, a formula over a value are reported and never silently fixed; spacing, letter case and
sheet prefixes are not edits (:func:`canon`). When rows were inserted by hand, only the named
formulas of that sheet are compared, and a 'layout' issue says so (:func:`moved_sheets`).
Values are Den Hartog's f = 1/(1+mu) (Den Hartog, Mechanical Vibrations, 4th ed., 1956, §3.3)
at the test project's mu = 0.02.
"""
from __future__ import annotations

import re
from pathlib import Path

import openpyxl
import pytest

from workbook_builder.recalc import read_workbook, recalc_workbook
from workbook_builder.recalc.edits import canon, moved_sheets
from workbook_builder.xlsx.cached import formula_cells

from recalc_helpers import cell_of, cell_values, copy_to, set_cells

# The fixture ``built`` (the example workbooks and a den_hartog one) is in conftest.py.


# ------------------------------------------------------ formulas edited by hand
def test_formula_edited_by_hand_is_reported_not_fixed(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    sheet, coord = cell_of(path, "tuning_ratio")
    set_cells(path, {(sheet, coord): "=1/(1+mass_ratio)*1.01"})
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "EDITED"
    edits = [i for i in res.issues if i.kind == "formula_edited"]
    assert [i.where for i in edits] == [f"{sheet}!{coord}"]
    assert edits[0].old == "=1/(1+mass_ratio)" and edits[0].new == "=1/(1+mass_ratio)*1.01"
    mism = {i.where for i in res.issues if i.kind == "engine_mismatch"}
    assert {"tuning_ratio", "damper_frequency", "stiffness"} <= mism
    assert ("Workbook formulas agree with the engine", "NOT OK") in res.checks
    # never silently fixed: the output keeps the user's formula, its cached value is the edit's
    assert formula_cells(res.output)[(sheet, coord)] == "=1/(1+mass_ratio)*1.01"
    assert cell_values(res.output)[(sheet, coord)] == pytest.approx(1.01 / 1.02, rel=1e-15)


def test_formula_replaced_by_value_is_reported(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    sheet, coord = cell_of(path, "stroke")
    set_cells(path, {(sheet, coord): 0.5})
    res = recalc_workbook(path, outdir=tmp_path / "out")
    kinds = {(i.kind, i.where) for i in res.issues}
    assert ("formula_replaced", f"{sheet}!{coord}") in kinds
    assert res.status == "EDITED"
    assert cell_values(res.output)[(sheet, coord)] == 0.5      # the user's value is kept


def test_summary_formula_showing_an_error_is_never_a_pass(built, tmp_path):
    """A Summary formula edited by hand so that it shows #VALUE!: the status is EDITED (a hand
    edit is never reported as a pass), the error cell and the edit are both named (our own
    rule)."""
    path = copy_to(built["den_hartog"], tmp_path)
    sheet, coord = cell_of(path, "all_design_checks")
    set_cells(path, {(sheet, coord): '=1+"x"'})
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "EDITED", [str(i) for i in res.issues]
    where = f"{sheet}!{coord}"
    assert ("error_value", where) in {(i.kind, i.where) for i in res.issues}
    assert ("formula_edited", where) in {(i.kind, i.where) for i in res.hand_edits}
    assert not res.changes                          # no input changed, no result changed


def test_equivalent_formula_text_is_not_an_edit(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    sheet, coord = cell_of(path, "tuning_ratio")
    set_cells(path, {(sheet, coord): "=1 / ( 1 + MASS_RATIO )"})
    res = recalc_workbook(path)
    assert not [i for i in res.issues if i.kind == "formula_edited"]



def test_formula_typed_in_an_input_cell_is_not_an_edit(built, tmp_path):
    """An engineer may type a formula where an input goes; its value is the input."""
    path = copy_to(built["den_hartog"], tmp_path)
    set_cells(path, {cell_of(path, "structure_frequency_entered"): "=0.5*0.5"})
    res = recalc_workbook(path)
    assert res.status == "OK", res.error or [str(i) for i in res.issues]
    assert not [i for i in res.issues if i.kind.startswith("formula")]
    assert res.results["structure_frequency"] == 0.25


def test_formula_where_the_builder_writes_a_value_is_reported(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    sheet, coord = cell_of(path, "modal_mass_factor")        # t -> kg, a constant
    set_cells(path, {(sheet, coord): "=1000"})
    res = recalc_workbook(path)
    added = [i for i in res.issues if i.kind == "formula_added"]
    assert [(i.where, i.new) for i in added] == [(f"{sheet}!{coord}", "=1000")]


# -------------------------------------------------------- canonical formula text
BUILT = "=1/(1+mass_ratio)"          # the builder's tuning ratio of Den Hartog's method


@pytest.mark.parametrize("typed", [
    "=1/(1+mass_ratio)",                  # the same text
    "=1 / ( 1 + mass_ratio )",            # spacing
    "=1/(1+MASS_RATIO)",                  # letter case of a defined name
    "=1/(1+Mass_Ratio)",
    "=(1/(1+mass_ratio))",                # parentheses that change nothing
])
def test_canon_spacing_case_and_parentheses_are_not_edits(typed):
    assert canon(typed, "Calculation") == canon(BUILT, "Calculation")


@pytest.mark.parametrize("typed", [
    "=1/(1-mass_ratio)",                  # another operator
    "=1*(1+mass_ratio)",
    "=1/1+mass_ratio",                    # parentheses that change the order
    "=1/(1+mass_ratio)^1",                # an operation more, even one that changes nothing
    "=1/(1+damper_mass)",                 # another name
    "=1/(2+mass_ratio)",                  # another number
])
def test_canon_a_different_formula_is_an_edit(typed):
    assert canon(typed, "Calculation") != canon(BUILT, "Calculation")


def test_canon_function_names_and_booleans_ignore_case_text_does_not():
    sheet = "Checks"
    assert canon("=sqrt(a)", sheet) == canon("=SQRT(a)", sheet)
    assert canon("=if(TRUE,1,2)", sheet) == canon("=IF(true,1,2)", sheet)
    # the text a verdict gives is part of the formula: its case matters
    verdict = '=IF(stroke<=clearance,"OK","NOT OK")'
    assert canon(verdict, sheet) != canon('=IF(stroke<=clearance,"ok","NOT OK")', sheet)
    assert canon(verdict, sheet) != canon('=IF(stroke<clearance,"OK","NOT OK")', sheet)


def test_canon_sheet_prefixes_are_not_edits():
    # a reference without a sheet is on the formula's own sheet
    same = ("=D7*2", "=Calculation!D7*2", "='Calculation'!D7*2", "=Calculation!$D$7*2")
    assert len({canon(f, "Calculation") for f in same}) == 1
    # the same cell address on another sheet is another cell
    assert canon("=Inputs!D7*2", "Calculation") != canon("=D7*2", "Calculation")
    assert canon("=D7*2", "Inputs") != canon("=D7*2", "Calculation")


def test_canon_of_a_formula_that_does_not_parse_compares_its_text():
    # unbalanced parenthesis: compared as text without spaces, upper case
    assert canon("=1/(1 + mass_ratio", "Calculation") == canon("=1/(1+MASS_RATIO", "Calculation")
    assert canon("=1/(1 + mass_ratio", "Calculation") != canon(BUILT, "Calculation")


# ------------------------------------------------------- rows inserted by hand
_ABSOLUTE = re.compile(r"^(?P<sheet>'?[^!]+'?)!\$(?P<col>[A-Z]+)\$(?P<row>\d+)$")


def _insert_row(path: Path, sheet: str, row: int) -> int:
    """Insert a row as a spreadsheet program does: cells below move down, and so do the
    defined names pointing at them (openpyxl's insert_rows moves the cells only)."""
    wb = openpyxl.load_workbook(path)
    wb[sheet].insert_rows(row)
    moved = 0
    for dn in wb.defined_names.values():
        m = _ABSOLUTE.match(dn.attr_text)
        if m and m["sheet"].strip("'") == sheet and int(m["row"]) >= row:
            dn.attr_text = f"{m['sheet']}!${m['col']}${int(m['row']) + 1}"
            moved += 1
    wb.save(path)
    return moved


def test_row_inserted_on_the_calculation_sheet(built, tmp_path):
    """Every named cell of the sheet moved down: only its named formulas are compared (through
    their names), nothing is reported as edited, and a 'layout' issue says why."""
    original = built["den_hartog"]
    path = copy_to(original, tmp_path)
    assert _insert_row(path, "Calculation", 3) >= 20
    data = read_workbook(path)
    assert moved_sheets(data.book, data.plan) == ["Calculation"]
    unmoved = read_workbook(original)
    assert moved_sheets(unmoved.book, unmoved.plan) == []
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "OK", res.error or [str(i) for i in res.issues]
    layout = [i for i in res.issues if i.kind == "layout"]
    assert len(layout) == 1 and layout[0].where == "Calculation"
    assert "only the named formulas of these sheets were compared" in layout[0].message
    assert not [i for i in res.issues if i.kind.startswith("formula")]
    assert not [i for i in res.issues if i.kind == "engine_mismatch"]
    # the same numbers as the workbook as built
    ref = recalc_workbook(original)
    for key, value in ref.results.items():
        if isinstance(value, float):
            assert res.results[key] == pytest.approx(value, rel=1e-15), key


def _edit_moved_tuning_ratio(built, tmp_path) -> tuple[list, str]:
    path = copy_to(built["den_hartog"], tmp_path)
    _insert_row(path, "Calculation", 3)
    sheet, coord = cell_of(path, "tuning_ratio")
    set_cells(path, {(sheet, coord): "=1/(1+mass_ratio)*1.01"})
    res = recalc_workbook(path)
    return [i for i in res.issues if i.kind == "formula_edited"], f"{sheet}!{coord}"


def test_edit_of_a_moved_named_formula_is_still_found(built, tmp_path):
    edits, _ = _edit_moved_tuning_ratio(built, tmp_path)
    assert [(i.old, i.new) for i in edits] == [("=1/(1+mass_ratio)", "=1/(1+mass_ratio)*1.01")]


def test_edit_of_a_moved_named_formula_is_reported_where_the_cell_is(built, tmp_path):
    edits, where = _edit_moved_tuning_ratio(built, tmp_path)
    assert [i.where for i in edits] == [where]
