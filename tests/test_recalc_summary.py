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
from workbook_builder.recalc.summary import csv_safe, report_lines, summary_row
from workbook_builder.recalc.workbook import SHORT_LABELS, STATUSES, Change

FIXED = ["Workbook", "Status", "Reason", "Output"]
TAIL = ["Inputs changed", "Results changed", "Hand edits", "Other notes", "Backup", "Seconds"]
#: 1 ft = 0.3048 m, 1 lb = 0.45359237 kg (exact; NIST SP 811 (2008) App. B); g_n = 9.80665
#: m/s^2 (3rd CGPM 1901); the summary of a US batch shows kip, ft and milli-g.
FOOT, KIP, MILLI_G = 0.3048, 453.59237, 9.80665e-3
KIPF_PER_FT = 1000 * 0.45359237 * 9.80665 / 0.3048          # kip (force) per foot, in N/m
US = {"kg": ("kip (weight)", KIP), "m": ("ft", FOOT), "m/s^2": ("milli-g", MILLI_G),
      "N/m": ("kip/ft", KIPF_PER_FT), "N s/m": ("kip s/ft", KIPF_PER_FT)}


def _header(q, us: bool = False) -> str:
    """The column of a quantity: its label, then its unit in brackets (none for a choice)."""
    unit = US.get(q.unit, (q.unit,))[0] if us else q.unit
    if us and q.name == "g":
        unit = "ft/s^2"                 # gravity in ft/s^2, the building's response in milli-g
    return f"{q.label} [{unit}]" if unit else q.label


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
    assert heads[:4] == FIXED and heads[-len(TAIL):] == TAIL
    wanted = ([_header(q) for q in design_inputs() if q.summary]
              + [_header(q) for q in design_results() if q.summary])
    assert heads[4:4 + len(wanted)] == wanted               # in declaration order
    summary_names = {q.name for q in design_inputs() + design_results() if q.summary}
    for q in design_inputs() + design_results():
        if q.summary:
            assert q.unit == "" or _header(q).endswith(f" [{q.unit}]")
        elif q.name not in summary_names:                    # e.g. tuning_ratio, g
            assert _header(q) not in row and q.name not in row, q.name


@pytest.mark.parametrize("us", [False, True])
def test_columns_hold_the_inputs_and_results_of_the_workbook(us):
    """SI workbooks: SI values; a batch of US workbooks: kip, ft and milli-g (factors exact)."""
    r = _result()
    row = summary_row(r, us)
    factor = {k: f for k, (_, f) in US.items()} if us else {}
    for q in design_inputs():
        if q.summary and q.kind != "choice":
            want = r.inputs[q.name] / factor.get(q.unit, 1.0)
            assert row[_header(q, us)] == pytest.approx(want, rel=1e-15), q.name
    for q in design_results():
        if q.summary:
            want = r.results[q.cell_name] / factor.get(q.unit, 1.0)
            assert row[_header(q, us)] == pytest.approx(want, rel=1e-15), q.name


def test_a_quantity_marked_for_the_summary_gets_its_column(monkeypatch, tmp_path):
    tuning = f"{quantities.quantity('tuning_ratio').label} [-]"
    stroke = f"{quantities.quantity('stroke').label} [m]"
    assert tuning not in summary_row(_result())
    marked = tuple(dataclasses.replace(q, summary=q.name == "tuning_ratio" or
                                       (q.summary and q.name != "stroke"))
                   for q in quantities.DESIGN_RESULTS)
    monkeypatch.setattr(quantities, "DESIGN_RESULTS", marked)
    r = _result()
    row = summary_row(r)
    assert row[tuning] == r.results["tuning_ratio"]
    assert stroke not in row                              # the flag taken off: no column
    _, csv_path = write_summary(BatchSummary([r]), tmp_path / "s")
    with open(csv_path, encoding="utf-8") as fh:
        header = next(csv.reader(fh))
    assert tuning in header and stroke not in header


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
    assert failed["Status"] == "FAILED" and failed["Reason"] == "empty file"
    assert failed["Engine values current"] == "" and failed[labels[0]] == ""
    assert list(failed) == list(row)                             # the same columns


# ----------------------------------------------------------------------------- files
def _batch() -> BatchSummary:
    ok = _result(changes=[Change("input", "frequency", "Frequency of the mode", 0.2, 0.25,
                                 "Hz")])
    edited = _result(path=Path("in/=edited.xlsx"), output=Path("out/=edited.xlsx"),
                     changes=[Change("result", "stroke", "=Stroke", None, math.inf, "m")],
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
    assert wb.sheetnames == ["Report", "Workbooks", "Changes", "Issues", "Statuses",
                             "Cautions"]
    sheet = [[c.value for c in r] for r in wb["Workbooks"].iter_rows()]
    assert sheet[0] == rows[0] == list(summary_row(batch.results[0]))
    assert [r[1] for r in sheet[1:]] == ["OK", "EDITED", "FAILED"]
    # readable on paper and on screen: landscape, header frozen and filtered
    ws = wb["Workbooks"]
    assert ws.page_setup.orientation == "landscape" and ws.freeze_panes == "B2"
    assert ws.auto_filter.ref == ws.dimensions
    assert [[c.value for c in r] for r in wb["Statuses"].iter_rows(min_row=2)] == [
        [k, v] for k, v in STATUSES.items()]
    # the page to print: the report, every change listed (none left to "more")
    report = [r[0].value or "" for r in wb["Report"].iter_rows()]
    assert report == report_lines(batch, limit=0) and report[0].startswith("OK      in/tower")
    # every text stays text: in the workbook as a string cell, in the CSV behind an apostrophe
    reason = sheet[0].index("Reason")
    cell = wb["Workbooks"].cell(4, reason + 1)
    assert cell.value == "=cmd|' /C calc'!A0" and cell.data_type == "s"
    assert rows[3][reason] == "'=cmd|' /C calc'!A0"
    assert all(c.data_type != "f" for ws in wb for r in ws.iter_rows() for c in r)
    changes = [[c.value for c in r] for r in wb["Changes"].iter_rows(min_row=2)]
    assert changes == [["in/tower.xlsx", "input", "Frequency of the mode", 0.2, 0.25, "Hz"],
                       ["in/=edited.xlsx", "result", "=Stroke", "(none)", "inf", "m"]]
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
def test_report_of_ok_not_ok_edited_and_failed_workbooks():
    labels = [rule.label for rule in CHECK_RULES]
    ok = _result(changes=[Change("input", "frequency", "Frequency of the mode", 0.2, 0.25,
                                 "Hz"),
                          Change("result", "damper_mass", "Damper mass", 480000.0, 512000.0,
                                 "kg")])
    not_ok = _result(path=Path("in/b.xlsx"), output=Path("out/b.xlsx"),
                     checks=[(labels[1], "NOT OK"), (labels[2], "NOT OK"), (labels[0], "OK")],
                     changes=[Change("input", f"n{i}", f"Input {i}", float(i), None, "m")
                              for i in range(8)])
    edited = _result(path=Path("in/e.xlsx"), output=Path("out/e.xlsx"),
                     issues=[Issue("formula_edited", "Calculation!D16", "formula edited"),
                             Issue("note", "Other", "a note")])
    failed = RecalcResult(Path("in/c.xlsx"), error="empty file")
    batch = BatchSummary([ok, not_ok, edited, failed], seconds=2.0)
    out = io.StringIO()
    print_report(batch, out)
    lines = out.getvalue().splitlines()
    assert lines == [
        "OK      in/tower.xlsx -> out/tower.xlsx",
        "        inputs changed:  Frequency of the mode: 0.2 -> 0.25 Hz",
        "        results changed: Damper mass: 480000 -> 512000 kg",
        "NOT OK  in/b.xlsx -> out/b.xlsx",
        "        inputs changed:  Input 0: 0 -> (none) m"] + [
        f"                         Input {i}: {i} -> (none) m" for i in range(1, 6)] + [
        "                         (+2 more in the summary)",
        f"        NOT OK: {labels[1]}; {labels[2]}",
        "EDITED  in/e.xlsx -> out/e.xlsx",
        "        hand edits:      Calculation!D16: formula edited",
        "        note: Other: a note",
        "FAILED  in/c.xlsx: empty file",
        "",
        "4 workbook(s): 1 OK, 1 NOT OK, 1 EDITED, 1 FAILED (2.0 s)"]


def test_report_names_the_summary_files():
    batch = BatchSummary([_result()], summary_xlsx=Path("o/recalc_summary.xlsx"),
                         summary_csv=Path("o/recalc_summary.csv"))
    out = io.StringIO()
    print_report(batch, out)
    text = out.getvalue()
    assert "1 workbook(s): 1 OK, 0 NOT OK, 0 EDITED, 0 FAILED" in text
    assert text.endswith("summary: o/recalc_summary.xlsx and o/recalc_summary.csv\n")
