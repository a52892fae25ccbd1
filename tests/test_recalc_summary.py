# SPDX-License-Identifier: MIT
"""The batch summary (workbook_builder.recalc.summary): rows, CSV, workbook, printed report.

No text of the summary is ever read as a formula by a spreadsheet program; its columns come
from the engine's quantity declarations (functions.quantities), each with its unit. The rows
here are made by hand (RecalcResult and BatchSummary), so every expected text is the format the
module documents; the batch tests (test_recalc_batch.py) read the summary of real workbooks.
"""
from __future__ import annotations

import csv
import dataclasses
import io
import math
from pathlib import Path

import openpyxl
import pytest

from functions import quantities
from functions.design import CHECK_RULES
from functions.quantities import design_inputs, design_results
from workbook_builder.plan.reference import CAUTIONS
from workbook_builder.recalc import BatchSummary, Issue, RecalcResult, print_report, write_summary
from workbook_builder.recalc.summary import csv_safe, summary_row
from workbook_builder.recalc.workbook import SHORT_LABELS

FIXED = ["workbook", "status", "reason", "output"]
TAIL = ["changes", "issues", "seconds"]


def _header(q) -> str:
    """The column of a quantity: its name, then its SI unit in brackets (none for a choice)."""
    return f"{q.name} [{q.unit}]" if q.unit else q.name


def _result(**kw) -> RecalcResult:
    """A recalculated workbook with a distinct number in every summary quantity."""
    inputs = {q.name: 1.0 + i for i, q in enumerate(design_inputs())}
    results = {q.cell_name: 100.0 + i for i, q in enumerate(design_results())}
    base = dict(path=Path("in/tower.xlsx"), output=Path("out/tower.xlsx"), inputs=inputs,
                results=results, checks=[(rule.label, "OK") for rule in CHECK_RULES])
    base.update(kw)
    return RecalcResult(**base)


# ----------------------------------------------------------------------------- csv
def test_csv_text_is_never_a_formula():
    assert csv_safe("=HYPERLINK(1)") == "'=HYPERLINK(1)"
    assert csv_safe("plain") == "plain"
    assert csv_safe(-1.5) == -1.5


@pytest.mark.parametrize("text", ["=1+1", "+1+1", "-1+1", "@SUM(A1)", "\t=1", "\r=1"])
def test_csv_safe_quotes_every_formula_start(text):
    # characters a spreadsheet program reads as the start of a formula (common practice, no
    # source: the usual CSV-injection list)
    assert csv_safe(text) == "'" + text


@pytest.mark.parametrize("value", ["1+1", "a=b", "", "'=1", 0, -2, 1.5, None])
def test_csv_safe_leaves_other_values(value):
    assert csv_safe(value) == value


# ----------------------------------------------------------------------------- columns
def test_columns_come_from_the_quantity_declarations():
    row = summary_row(_result())
    heads = list(row)
    assert heads[:4] == FIXED and heads[-3:] == TAIL
    wanted = ([_header(q) for q in design_inputs() if q.summary]
              + [_header(q) for q in design_results() if q.summary])
    assert heads[4:4 + len(wanted)] == wanted               # in declaration order
    summary_names = {q.name for q in design_inputs() + design_results() if q.summary}
    for q in design_inputs() + design_results():
        if q.summary:
            assert q.unit == "" or _header(q).endswith(f" [{q.unit}]")
        elif q.name not in summary_names:                    # e.g. tuning_ratio, g
            assert _header(q) not in row and q.name not in row, q.name


def test_columns_hold_the_inputs_and_results_of_the_workbook():
    r = _result()
    row = summary_row(r)
    for q in design_inputs():
        if q.summary:
            assert row[_header(q)] == r.inputs[q.name], q.name          # SI, by glossary name
    for q in design_results():
        if q.summary:
            assert row[_header(q)] == r.results[q.cell_name], q.name    # by defined name


def test_a_quantity_marked_for_the_summary_gets_its_column(monkeypatch, tmp_path):
    assert "tuning_ratio [-]" not in summary_row(_result())
    marked = tuple(dataclasses.replace(q, summary=q.name == "tuning_ratio" or
                                       (q.summary and q.name != "stroke"))
                   for q in quantities.DESIGN_RESULTS)
    monkeypatch.setattr(quantities, "DESIGN_RESULTS", marked)
    r = _result()
    row = summary_row(r)
    assert row["tuning_ratio [-]"] == r.results["tuning_ratio"]
    assert "stroke [m]" not in row                       # the flag taken off: no column
    _, csv_path = write_summary(BatchSummary([r]), tmp_path / "s")
    with open(csv_path, encoding="utf-8") as fh:
        header = next(csv.reader(fh))
    assert "tuning_ratio [-]" in header and "stroke [m]" not in header


def test_verdict_columns():
    labels = [rule.label for rule in CHECK_RULES]
    r = _result(checks=[(labels[0], "NOT OK")] + [(x, "OK") for x in labels[1:]] + [
        (SHORT_LABELS["all_cross_checks"], "OK"),
        ("Engine value current (engine_flag_tuning)", "OK"),
        ("Engine value current (engine_flag_simulation)", "NOT OK")])
    row = summary_row(r)
    assert row[labels[0]] == "NOT OK" and all(row[x] == "OK" for x in labels[1:])
    assert row[SHORT_LABELS["all_cross_checks"]] == "OK"
    assert row[SHORT_LABELS["fixed_point_converged"]] == ""      # not among the verdicts
    assert row["Engine values current"] == "NOT OK"              # one flag NOT OK
    failed = summary_row(RecalcResult(Path("x.xlsx"), error="empty file"))
    assert failed["status"] == "FAILED" and failed["reason"] == "empty file"
    assert failed["Engine values current"] == "" and failed[labels[0]] == ""
    assert list(failed) == list(row)                             # the same columns


# ----------------------------------------------------------------------------- files
def _batch() -> BatchSummary:
    ok = _result(changes=[("structure_frequency", 0.2, 0.25)])
    edited = _result(path=Path("in/=edited.xlsx"), output=Path("out/=edited.xlsx"),
                     changes=[("stroke", None, math.inf)],
                     issues=[Issue("formula_edited", "Calculation!D16", "=HYPERLINK(1) typed",
                                   "=1/(1+mass_ratio)", "=2")])
    failed = RecalcResult(Path("in/bad.xlsx"), error="=cmd|' /C calc'!A0")
    return BatchSummary([ok, edited, failed], seconds=2.0)


def test_summary_workbook_sheets_and_csv(tmp_path):
    batch = _batch()
    xlsx, csv_path = write_summary(batch, tmp_path / "sub" / "recalc_summary")
    assert (xlsx.name, csv_path.name) == ("recalc_summary.xlsx", "recalc_summary.csv")
    with open(csv_path, encoding="utf-8", newline="") as fh:
        rows = list(csv.reader(fh))
    wb = openpyxl.load_workbook(xlsx)
    assert wb.sheetnames == ["Workbooks", "Changes", "Issues", "Cautions"]
    sheet = [[c.value for c in r] for r in wb["Workbooks"].iter_rows()]
    assert sheet[0] == rows[0] == list(summary_row(batch.results[0]))
    assert [r[1] for r in sheet[1:]] == ["OK", "OK", "FAILED"]
    # every text stays text: in the workbook as a string cell, in the CSV behind an apostrophe
    reason = sheet[0].index("reason")
    cell = wb["Workbooks"].cell(4, reason + 1)
    assert cell.value == "=cmd|' /C calc'!A0" and cell.data_type == "s"
    assert rows[3][reason] == "'=cmd|' /C calc'!A0"
    assert all(c.data_type != "f" for ws in wb for r in ws.iter_rows() for c in r)
    changes = [[c.value for c in r] for r in wb["Changes"].iter_rows(min_row=2)]
    assert changes == [["in/tower.xlsx", "structure_frequency", 0.2, 0.25],
                       ["in/=edited.xlsx", "stroke", "(none)", "inf"]]    # inf as text
    issues = [[c.value for c in r] for r in wb["Issues"].iter_rows(min_row=2)]
    assert issues == [["in/=edited.xlsx", "formula_edited", "Calculation!D16",
                       "=HYPERLINK(1) typed", "=1/(1+mass_ratio)", "=2"],
                      ["in/bad.xlsx", "FAILED", None, "=cmd|' /C calc'!A0", None, None]]
    assert [r[0].value for r in wb["Cautions"].iter_rows()] == list(CAUTIONS)


def test_summary_of_an_empty_batch_has_the_columns(tmp_path):
    xlsx, csv_path = write_summary(BatchSummary([]), tmp_path / "s")
    with open(csv_path, encoding="utf-8") as fh:
        assert list(csv.reader(fh)) == [list(summary_row(_result()))]
    assert openpyxl.load_workbook(xlsx)["Workbooks"].max_row == 1


# ----------------------------------------------------------------------------- report
def test_report_of_ok_not_ok_and_failed_workbooks():
    labels = [rule.label for rule in CHECK_RULES]
    ok = _result(changes=[("structure_frequency", 0.2, 0.25)])
    not_ok = _result(path=Path("in/b.xlsx"), output=Path("out/b.xlsx"),
                     checks=[(labels[1], "NOT OK"), (labels[2], "NOT OK"), (labels[0], "OK")],
                     issues=[Issue("formula_edited", "Calculation!D16", "formula edited")],
                     changes=[(f"n{i}", float(i), None) for i in range(8)])
    failed = RecalcResult(Path("in/c.xlsx"), error="empty file")
    batch = BatchSummary([ok, not_ok, failed], seconds=2.0)
    out = io.StringIO()
    print_report(batch, out)
    lines = out.getvalue().splitlines()
    assert lines[:6] == [
        "OK      in/tower.xlsx -> out/tower.xlsx",
        "        changed: structure_frequency 0.2 -> 0.25",
        "NOT OK  in/b.xlsx -> out/b.xlsx",
        f"        NOT OK: {labels[1]}; {labels[2]}",
        "        formula_edited: Calculation!D16: formula edited",
        "        changed: n0 0 -> (none), n1 1 -> (none), n2 2 -> (none), n3 3 -> (none), "
        "n4 4 -> (none), n5 5 -> (none) (+2 more)"]
    assert lines[6] == "FAILED  in/c.xlsx: empty file"
    assert lines[7:] == ["", "3 workbook(s): 1 OK, 1 NOT OK, 1 failed (2.0 s)"]


def test_report_names_the_summary_files():
    batch = BatchSummary([_result()], summary_xlsx=Path("o/recalc_summary.xlsx"),
                         summary_csv=Path("o/recalc_summary.csv"))
    out = io.StringIO()
    print_report(batch, out)
    text = out.getvalue()
    assert "1 workbook(s): 1 OK, 0 NOT OK, 0 failed" in text
    assert text.endswith("summary: o/recalc_summary.xlsx and o/recalc_summary.csv\n")
