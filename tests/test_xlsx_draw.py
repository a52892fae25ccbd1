# SPDX-License-Identifier: MIT
"""Drawing a plan with openpyxl: protection, text stays text, names, rules, refusals, rows.

The drawn workbook is compared with its own plan (workbook_builder.plan): every planned cell,
name, range, validation and verdict rule must be in it as planned. Colours are the builder's
own convention (yellow FFF2CC inputs, green E2EFDA engine values, C6EFCE / FFC7CE verdicts).
"""
from __future__ import annotations

import math
import tomllib

import numpy as np
import openpyxl
import pytest
from openpyxl.styles import Alignment
from openpyxl.utils import get_column_letter
from openpyxl.utils.cell import absolute_coordinate
from openpyxl.workbook.defined_name import DefinedName

from workbook_builder.compute import run_design
from workbook_builder.plan import PlanOptions, make_plan, options_for
from workbook_builder.plan.charts import chart_tables
from workbook_builder.plan.model import Plan
from workbook_builder.plan.sheet import SheetLayout
from workbook_builder.plan.values import Sources, plan_values
from workbook_builder.project import parse_project
from workbook_builder.xlsx.draw import DrawError, draw, fit_rows, set_property
from workbook_builder.xlsx.formulas import FormulaError

from workbook_cases import MINIMAL

FLOORS = {"heights": [4.0, 8.0, 12.0], "masses": [900.0, 900.0, 700.0], "mass_unit": "t",
          "building_height": 12.0, "exponent": 1.0}            # invented


def _project():
    raw = tomllib.loads(MINIMAL)               # title "=1+1", notes "=SUM(A1:A3) stays text"
    del raw["mode"]["modal_mass"]
    raw["mode"]["floors"] = FLOORS
    return parse_project(raw, source="draw.toml")


def _drawn(template=None):
    project = _project()
    result = run_design(project)
    plan = make_plan(options_for(project, template=template is not None))
    values = plan_values(plan, Sources(project, result, chart_tables(result)))
    return plan, values, draw(plan, values, template=template)


@pytest.fixture(scope="module")
def drawn():
    return _drawn()


def _planned(plan):
    return {(s, c.ref): c for s, c in plan.cells()}


def test_sheets_in_plan_order_protected_without_a_password(drawn):
    plan, _, wb = drawn
    assert wb.sheetnames == [s.title for s in plan.sheets]
    for ws in wb.worksheets:
        assert ws.protection.sheet is True and not ws.protection.password, ws.title


def test_input_cells_are_unlocked_and_yellow_every_other_cell_locked(drawn):
    plan, _, wb = drawn
    planned = _planned(plan)
    inputs = 0
    for ws in wb.worksheets:
        for row in ws.iter_rows():
            for cell in row:
                c = planned.get((ws.title, cell.coordinate))
                is_input = c is not None and c.kind == "input"
                assert cell.protection.locked is (not is_input), (ws.title, cell.coordinate)
                if is_input:
                    inputs += 1
                    assert cell.fill.fgColor.rgb.endswith("FFF2CC")
                elif c is not None and c.kind == "engine":
                    assert cell.fill.fgColor.rgb.endswith("E2EFDA")
    assert inputs == sum(1 for c in planned.values() if c.kind == "input") > 10


def test_cells_hold_their_planned_formula_or_value(drawn):
    plan, values, wb = drawn
    for (sheet, ref), c in _planned(plan).items():
        cell = wb[sheet][ref]
        if c.kind in ("formula", "check"):
            assert (cell.data_type, cell.value) == ("f", c.content), (sheet, ref)
        elif c.source:
            want = values[(sheet, ref)]
            assert cell.value == want and (cell.data_type == "s") == isinstance(want, str)
        else:
            assert cell.value == c.content, (sheet, ref)
        if c.fmt:
            assert cell.number_format == c.fmt


def test_user_text_starting_with_equals_stays_text(drawn):
    plan, _, wb = drawn
    texts = {}
    for (sheet, ref), c in _planned(plan).items():
        if c.kind == "text":
            cell = wb[sheet][ref]
            assert cell.data_type == "s", (sheet, ref)
            texts[c.name] = cell.value
    assert texts["TB_TITLE"] == "=1+1" and texts["project_notes"] == "=SUM(A1:A3) stays text"


def test_names_and_named_ranges_are_defined_as_planned(drawn):
    plan, _, wb = drawn
    planned = {**plan.names(), **plan.range_names()}
    for name, (sheet, where) in planned.items():
        target = ":".join(absolute_coordinate(p) for p in where.split(":"))
        assert list(wb.defined_names[name].destinations) == [(sheet, target)], name
    assert set(wb.defined_names) == set(planned)       # the drawer adds no other name


def test_validations_and_verdict_colours_are_present(drawn):
    plan, _, wb = drawn
    count = 0
    for sp in plan.sheets:
        ws = wb[sp.title]
        drawn_rules = {str(dv.sqref): dv for dv in ws.data_validations.dataValidation}
        assert len(drawn_rules) == len(sp.validations)
        for v in sp.validations:
            dv = drawn_rules[v.ref]
            assert (dv.type, dv.formula1, dv.error) == ("custom", v.formula, v.error)
            assert dv.showErrorMessage and dv.allow_blank is False
            assert (dv.prompt or "") == v.prompt
            count += 1
        colours = {}
        for fmt in ws.conditional_formatting:
            colours[str(fmt.sqref)] = {(tuple(r.formula), r.dxf.fill.fgColor.rgb[-6:])
                                       for r in fmt.rules}
        assert set(colours) == set(sp.verdict_ranges)
        for rng in sp.verdict_ranges:
            assert colours[rng] == {(('"OK"',), "C6EFCE"), (('"NOT OK"',), "FFC7CE")}
    assert count >= 12


def test_merges_widths_freeze_and_charts_as_planned(drawn):
    plan, _, wb = drawn
    for sp in plan.sheets:
        ws = wb[sp.title]
        assert {str(r) for r in ws.merged_cells.ranges} == set(sp.merges)
        for i, width in enumerate(sp.widths, start=1):
            assert ws.column_dimensions[get_column_letter(i)].width == width
        assert ws.freeze_panes == sp.freeze
        assert len(ws._charts) == len(sp.charts)
    assert len(wb["Charts"]._charts) == 3


def test_nan_and_inf_are_refused_by_the_drawer():
    sh = SheetLayout("S")
    sh.engine(1, 1, ("cell", "x"))
    plan = Plan(PlanOptions(), [sh.plan])
    for bad in (math.nan, math.inf, -math.inf):
        with pytest.raises(DrawError, match=r"S!A1: .* cannot be written \(NaN and inf are "
                                            r"refused\)"):
            draw(plan, {("S", "A1"): bad})


def test_numpy_numbers_are_written_as_floats():
    sh = SheetLayout("S")
    sh.engine(1, 1, ("cell", "x"))
    sh.engine(2, 1, ("cell", "y"))
    wb = draw(Plan(PlanOptions(), [sh.plan]), {("S", "A1"): np.float32(0.25),
                                               ("S", "A2"): np.int64(3)})
    assert [(type(wb["S"][r].value), wb["S"][r].value) for r in ("A1", "A2")] == [
        (float, 0.25), (float, 3.0)]
    with pytest.raises(DrawError, match=r"S!A1: nan cannot be written"):
        draw(Plan(PlanOptions(), [sh.plan]), {("S", "A1"): np.float32("nan"),
                                              ("S", "A2"): 1.0})


@pytest.mark.parametrize("where", ["cell", "validation"])
def test_formula_outside_the_allow_list_is_never_written(where):
    sh = SheetLayout("S")
    if where == "cell":
        sh.formula(1, 1, '=INDIRECT("B1")')
    else:
        sh.validation("A1", 'INDIRECT("B1")>0', "no")
    with pytest.raises(FormulaError, match="INDIRECT"):
        draw(Plan(PlanOptions(), [sh.plan]), {})


def test_a_templates_stale_copies_of_our_names_are_replaced(tmp_path):
    firm = openpyxl.Workbook()
    ws = firm.active
    ws.title = "Firm cover"
    for name, ref in (("stroke", "B2"), ("chart_period", "B3:C9"), ("FIRM_JOB", "B10")):
        firm.defined_names.add(DefinedName(name, attr_text=f"'Firm cover'!"
                                                    f"{absolute_coordinate(ref)}"))
    plan, _, wb = _drawn(template=firm)
    assert wb.sheetnames[0] == "Firm cover"
    sheet, ref = plan.names()["stroke"]
    assert list(wb.defined_names["stroke"].destinations) == [(sheet, absolute_coordinate(ref))]
    sheet, rng = plan.range_names()["chart_period"]
    assert list(wb.defined_names["chart_period"].destinations)[0][0] == sheet == "Charts"
    assert list(wb.defined_names["FIRM_JOB"].destinations) == [("Firm cover", "$B$10")]
    assert not any(n.startswith("TB_") for n in plan.names())    # the firm's title block


def _fit(text, width=10.0, wrap=True, merge=None, height=None):
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.column_dimensions["A"].width = width
    ws.column_dimensions["B"].width = width
    ws["A1"] = text
    ws["A1"].alignment = Alignment(wrap_text=wrap)
    if merge:
        ws.merge_cells(merge)
    if height:
        ws.row_dimensions[1].height = height
    fit_rows(ws, line_height=13.0)
    return ws.row_dimensions[1].height


def test_fit_rows_grows_a_row_with_wrapped_text():
    """About 1.1 characters per unit of column width (the drawer's cautious estimate): 100
    characters in a column 10 wide take ceil(100 / 11) = 10 lines of 13 pt, plus 3 pt."""
    assert _fit("x" * 100) == 10 * 13.0 + 3
    assert _fit("x" * 100, merge="A1:B1") == 5 * 13.0 + 3        # two columns merged
    assert _fit("short\n" * 4 + "end") == 5 * 13.0 + 3           # one line per paragraph
    assert _fit("x" * 100, height=200.0) == 200.0                # never shrinks a row
    assert _fit("x" * 100, wrap=False) is None                   # not wrapped: left alone
    assert _fit("=" + "A1+" * 40 + "1") is None                  # a formula is not text
    assert _fit("x" * 10) is None                                # fits on one line


def test_set_property_replaces_a_custom_property():
    wb = openpyxl.Workbook()
    set_property(wb, "SwaytuneTest", "first")
    set_property(wb, "SwaytuneTest", "=second")
    props = [(p.name, p.value) for p in wb.custom_doc_props.props]
    assert props == [("SwaytuneTest", "=second")]


def test_planned_notes_become_cell_comments_and_styled_cells_name_the_body_font(drawn):
    plan, _, wb = drawn
    notes = 0
    for (sheet, ref), c in _planned(plan).items():
        cell = wb[sheet][ref]
        if c.comment:
            assert cell.comment is not None and cell.comment.text == c.comment, (sheet, ref)
            notes += 1
        else:
            assert cell.comment is None, (sheet, ref)
        if c.style and cell.font is not None and (cell.font.b or cell.font.color):
            assert cell.font.name == "Calibri", (sheet, ref)
    assert notes > 30
