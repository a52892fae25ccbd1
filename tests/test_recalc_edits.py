# SPDX-License-Identifier: MIT
"""Formulas edited by hand (workbook_builder.recalc.edits), through a whole recalculation.

The builder's formula text (the plan) is the reference: a different formula, a value over a
formula, a formula over a value are reported and never silently fixed; spacing, letter case and
sheet prefixes are not edits. Values are Den Hartog's f = 1/(1+mu) (Den Hartog, Mechanical
Vibrations, 4th ed., 1956, §3.3) at the test project's mu = 0.02.
"""
from __future__ import annotations

import pytest

from workbook_builder.recalc import recalc_workbook
from workbook_builder.xlsx.cached import formula_cells

from recalc_helpers import cell_of, cell_values, copy_to, set_cells

# The fixture ``built`` (the example workbooks and a den_hartog one) is in conftest.py.


# ------------------------------------------------------ formulas edited by hand
def test_formula_edited_by_hand_is_reported_not_fixed(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    sheet, coord = cell_of(path, "tuning_ratio")
    set_cells(path, {(sheet, coord): "=1/(1+mass_ratio)*1.01"})
    res = recalc_workbook(path, outdir=tmp_path / "out")
    assert res.status == "NOT OK"
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
    assert res.status == "NOT OK"
    assert cell_values(res.output)[(sheet, coord)] == 0.5      # the user's value is kept


def test_equivalent_formula_text_is_not_an_edit(built, tmp_path):
    path = copy_to(built["den_hartog"], tmp_path)
    sheet, coord = cell_of(path, "tuning_ratio")
    set_cells(path, {(sheet, coord): "=1 / ( 1 + MASS_RATIO )"})
    res = recalc_workbook(path)
    assert not [i for i in res.issues if i.kind == "formula_edited"]

