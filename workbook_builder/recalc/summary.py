# SPDX-License-Identifier: MIT
"""Summary of a batch recalculation: one row per workbook, as a CSV, a workbook and a report.

:func:`summary_row` flattens a :class:`workbook_builder.recalc.RecalcResult` (status, reason,
key inputs and results under readable labels with units, every check verdict, what changed
since the last engine run, hand edits, other issues); :func:`write_summary` writes the rows as
``base.csv`` and ``base.xlsx`` (sheets Report, Workbooks, Changes, Issues, Statuses, Cautions; landscape,
frozen header, filters; every text written as text, never as a formula); :func:`print_report`
prints the batch for the command line. Values are shown in the batch's units: US customary
when every workbook of the batch is, else SI.
"""
from __future__ import annotations

import csv
import math
import os
import sys
from pathlib import Path
from typing import Any

from openpyxl import Workbook
from openpyxl.styles import Alignment, Font, PatternFill

from functions.design import PART_CHECK_RULES, CHECK_RULES
from functions.quantities import design_inputs, design_results

from .. import __version__
from ..plan.reference import CAUTIONS
from ..xlsx.files import (FORCE_HINT, OverwriteRefused, atomic_path, guard_overwrite,
                          mark_workbook)
from .workbook import HAND_EDITS, SHORT_LABELS, STATUSES, RecalcResult, shown_unit

__all__ = ["summary_row", "write_summary", "print_report", "report_lines", "csv_safe",
           "SUMMARY_STEM", "guard_summary", "summary_paths", "FIXED_COLUMNS"]

#: File stem of the batch summary (``recalc_summary.xlsx`` and ``.csv``); folder scans skip it.
SUMMARY_STEM = "recalc_summary"
#: The first columns of every summary (an earlier summary is recognised by them).
FIXED_COLUMNS = ("Workbook", "Status", "Reason", "Output")
#: Fill of each status in the summary workbook (our own colours).
_STATUS_FILL = {"OK": "D9EAD3", "NOT OK": "F4CCCC", "EDITED": "FCE5CD", "FAILED": "D9D9D9"}


def _header(q, us: bool) -> str:
    unit = shown_unit(q, us)[0]
    return f"{q.label} [{unit}]" if unit else q.label


def _check_columns() -> list[str]:
    return [rule.label for rule in CHECK_RULES + tuple(r for _, r in PART_CHECK_RULES)] + \
        list(SHORT_LABELS.values()) + [
        "Engine values current"]


def _in_units(v: Any, factor: float) -> Any:
    if isinstance(v, (int, float)) and not isinstance(v, bool):
        return v / factor
    return "" if v is None else v


def summary_row(r: RecalcResult, us: bool = False) -> dict[str, Any]:
    """One flat row of the summary for a workbook (``us``: values in US customary units)."""
    row: dict[str, Any] = dict(zip(FIXED_COLUMNS, (
        str(r.path), r.status, r.error or "", "" if r.output is None else str(r.output))))
    for q in design_inputs():              # key inputs, as the engine took them
        if q.summary:
            row[_header(q, us)] = _in_units(r.inputs.get(q.name), shown_unit(q, us)[1])
    for q in design_results():             # key results, as the workbook computes them
        if q.summary:
            row[_header(q, us)] = _in_units(r.results.get(q.cell_name), shown_unit(q, us)[1])
    verdicts = dict(r.checks)
    for label in _check_columns():
        if label == "Engine values current":
            flags = [v for k, v in r.checks if k.startswith("Engine value current")]
            row[label] = "" if r.failed else ("OK" if all(v == "OK" for v in flags) else
                                              "NOT OK")
        else:
            row[label] = verdicts.get(label, "")
    row["Inputs changed"] = "; ".join(str(c) for c in r.changed("input"))
    row["Results changed"] = "; ".join(str(c) for c in r.changed("result"))
    row["Hand edits"] = "; ".join(str(i) for i in r.hand_edits)
    row["Other notes"] = "; ".join(str(i) for i in r.issues if i.kind not in HAND_EDITS)
    row["Backup"] = "" if r.backup is None else str(r.backup)
    row["Seconds"] = round(r.seconds, 4)
    return row


def csv_safe(v: Any) -> Any:
    """Text that a spreadsheet would read as a formula gets a leading apostrophe."""
    if isinstance(v, str) and v[:1] in ("=", "+", "-", "@", "\t", "\r"):
        return "'" + v
    return v


def summary_paths(base: str | os.PathLike) -> tuple[Path, Path]:
    """``base.csv`` and ``base.xlsx``."""
    base = Path(base)
    return base.with_name(base.name + ".csv"), base.with_name(base.name + ".xlsx")


def guard_summary(base: str | os.PathLike, force: bool = False) -> None:
    """Refuse to replace files named like the summary that are not earlier summaries of ours.

    Raises
    ------
    OverwriteRefused
        When ``base.xlsx`` or ``base.csv`` exists and is not a summary swaytune wrote.
    """
    csv_path, xlsx_path = summary_paths(base)
    guard_overwrite(xlsx_path, force=force)
    if force or not csv_path.exists():
        return
    try:
        with open(csv_path, encoding="utf-8", newline="") as fh:
            first = fh.readline()
    except (OSError, UnicodeDecodeError):
        first = ""
    if not first.lower().startswith("workbook,status,reason,output"):
        raise OverwriteRefused(f"{csv_path} exists and is not a recalc summary; refusing to "
                               f"overwrite it ({FORCE_HINT})")


def _sheet(wb: Workbook, title: str, headers: list[str], rows: list[list[Any]],
           widths: list[float], status_col: int | None = None, first: bool = False,
           wide: bool = False):
    """A sheet of the summary: bold wrapped header, frozen, filtered, landscape, widths.

    A ``wide`` table (one line per workbook, long texts unwrapped) prints on as many pages
    across as it needs; the others fit the page width.
    """
    ws = wb.active if first else wb.create_sheet(title)
    ws.title = title
    for j, h in enumerate(headers, start=1):
        c = _put(ws, 1, j, h)
        c.font = Font(bold=True)
        c.alignment = Alignment(wrap_text=True, vertical="top")
    for i, row in enumerate(rows, start=2):
        for j, v in enumerate(row, start=1):
            c = _put(ws, i, j, v)
            if j == status_col and v in _STATUS_FILL:
                c.fill = PatternFill("solid", fgColor=_STATUS_FILL[v])
            elif isinstance(v, str) and len(v) > 40 and not wide:
                c.alignment = Alignment(wrap_text=True, vertical="top")
    for j, w in enumerate(widths[:len(headers)], start=1):
        ws.column_dimensions[ws.cell(1, j).column_letter].width = w
    ws.freeze_panes = "B2"
    if rows:
        ws.auto_filter.ref = ws.dimensions
    ws.page_setup.orientation = "landscape"
    ws.print_title_rows = "1:1"
    if not wide:
        ws.page_setup.fitToWidth, ws.page_setup.fitToHeight = 1, 0
        ws.sheet_properties.pageSetUpPr.fitToPage = True
    return ws


def _put(sheet, r: int, c: int, v: Any):
    """Write a value; every text stays text (never a formula), NaN and inf as text."""
    cell = sheet.cell(r, c)
    if isinstance(v, str) or (isinstance(v, float) and not math.isfinite(v)):
        cell.value = str(v)
        cell.data_type = "s"
    else:
        cell.value = v
    return cell


def write_summary(batch, base: str | os.PathLike, force: bool = False) -> tuple[Path, Path]:
    """Write the batch summary as ``base.xlsx`` and ``base.csv``; return both paths.

    The workbook has a sheet per view: Report (the printed report, every change listed; the
    page to print), Workbooks (one row each: status, reason, key inputs and
    results, every check verdict, changes, hand edits, notes), Changes (each input and key
    result changed since the last engine run, old and new, in the workbook's units), Issues,
    Statuses (what each status means), Cautions. Every text is written as text, never as a
    formula. A file of either name that is not an earlier summary is never replaced (unless
    ``force``).

    Raises
    ------
    OverwriteRefused
        When ``base.xlsx`` or ``base.csv`` exists and is not a summary swaytune wrote.
    """
    base = Path(base)
    us = batch.us
    rows = [summary_row(r, us) for r in batch.results]
    headers = list(rows[0]) if rows else list(summary_row(RecalcResult(Path("-")), us))
    csv_path, xlsx_path = summary_paths(base)
    guard_summary(base, force)
    base.parent.mkdir(parents=True, exist_ok=True)
    with atomic_path(csv_path) as tmp:
        with open(tmp, "w", newline="", encoding="utf-8") as fh:
            w = csv.writer(fh)
            w.writerow(headers)
            for row in rows:
                w.writerow([csv_safe(row.get(h, "")) for h in headers])

    wb = Workbook()
    rep = wb.active
    rep.title = "Report"
    for i, line in enumerate(report_lines(batch, limit=0), start=1):
        _put(rep, i, 1, line).font = Font(name="DejaVu Sans Mono", size=9,
                                          bold=line[:1] not in (" ", ""))
    rep.column_dimensions["A"].width = 130
    rep.page_setup.fitToWidth, rep.page_setup.fitToHeight = 1, 0
    rep.sheet_properties.pageSetUpPr.fitToPage = True
    widths = [34, 9, 30, 34] + [12] * (len(headers) - 4)
    _sheet(wb, "Workbooks", headers, [[row.get(h, "") for h in headers] for row in rows],
           widths, status_col=2, wide=True)
    changes = [[str(res.path), c.kind, c.label, _cell(c.old), _cell(c.new), c.unit]
               for res in batch.results for c in res.changes]
    _sheet(wb, "Changes", ["Workbook", "Input or result", "Quantity", "Old value", "New value",
                           "Unit"], changes, [34, 12, 44, 14, 14, 10])
    issues = []
    for res in batch.results:
        if res.failed:
            issues.append([str(res.path), "FAILED", "", res.error, "", ""])
        issues += [[str(res.path), i.kind, i.where, i.message, i.old, i.new] for i in res.issues]
    _sheet(wb, "Issues", ["Workbook", "Kind", "Where", "Message", "Plan or engine",
                          "Workbook holds"], issues, [34, 16, 22, 70, 24, 24])
    _sheet(wb, "Statuses", ["Status", "Meaning"], [[k, v] for k, v in STATUSES.items()],
           [10, 100], status_col=1)
    cau = wb.create_sheet("Cautions")
    for i, text in enumerate(CAUTIONS, start=1):
        _put(cau, i, 1, text)
    cau.column_dimensions["A"].width = 120
    wb.properties.creator = f"swaytune {__version__} (recalc summary)"
    mark_workbook(wb, __version__)
    with atomic_path(xlsx_path) as tmp:
        wb.save(tmp)
    return xlsx_path, csv_path


def _cell(v: Any) -> Any:
    return "(none)" if v is None else v


def _listed(label: str, items: list, limit: int = 6) -> str:
    """``label: item``, one item a line (at most ``limit``; the rest counted)."""
    head = f"        {label + ':':<17}"
    lines = [head + str(items[0])] + [" " * len(head) + str(x) for x in items[1:limit]]
    if len(items) > limit:
        lines.append(" " * len(head) + f"(+{len(items) - limit} more in the summary)")
    return "\n".join(lines)


def report_lines(batch, limit: int = 6) -> list[str]:
    """The report, one block per workbook, then a total (see :func:`print_report`).

    ``limit`` changes of each kind are listed per workbook (the rest counted; 0: all).
    """
    out: list[str] = []
    for r in batch.results:
        if r.failed:
            out.append(f"{'FAILED':<8}{r.path}: {r.error}")
            continue
        line = f"{r.status:<8}{r.path}"
        if r.output is not None:
            line += f" -> {r.output}" if r.rewritten or r.output != r.path else " (unchanged)"
        out.append(line)
        for label, items in (("inputs changed", r.changed("input")),
                             ("results changed", r.changed("result")),
                             ("hand edits", r.hand_edits)):
            if items:
                out += _listed(label, items, limit or len(items)).split("\n")
        bad = [label for label, v in r.checks if v != "OK"]
        if bad:
            out.append(f"        NOT OK: {'; '.join(bad)}")
        out += [f"        {i.kind}: {i}" for i in r.issues if i.kind not in HAND_EDITS]
        if r.backup is not None:
            out.append(f"        backup: {r.backup}")
    counts = {s: sum(r.status == s for r in batch.results) for s in STATUSES}
    out += ["", f"{len(batch.results)} workbook(s): "
            + ", ".join(f"{n} {s}" for s, n in counts.items()) + f" ({batch.seconds:.1f} s)"]
    return out


def print_report(batch, stream=None) -> None:
    """Print one block per workbook and a total.

    A block: the status, the file and its output; the inputs changed since the last engine
    run (old -> new, in the workbook's units); the key results that changed; the hand edits
    (formulas that differ from the plan, cells showing an error); the checks NOT OK; notes.
    """
    stream = stream or sys.stdout
    for line in report_lines(batch):
        print(line, file=stream)
    if batch.summary_xlsx:
        print(f"summary: {batch.summary_xlsx} and {batch.summary_csv}", file=stream)
