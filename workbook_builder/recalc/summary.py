# SPDX-License-Identifier: MIT
"""Summary of a batch recalculation: one row per workbook, as a CSV, a workbook and a report.

:func:`summary_row` flattens a :class:`workbook_builder.recalc.RecalcResult` (status, reason,
key inputs and results with units, every check verdict, changes, issues);
:func:`write_summary` writes the rows as ``base.csv`` and ``base.xlsx`` (sheets Workbooks,
Changes, Issues, Cautions; every text written as text, never as a formula);
:func:`print_report` prints the batch for the command line.
"""
from __future__ import annotations

import csv
import math
import os
import sys
from pathlib import Path
from typing import Any

from openpyxl import Workbook
from openpyxl.styles import Font, PatternFill

from functions.design import CHECK_RULES
from functions.quantities import design_inputs, design_results

from .. import __version__
from ..plan.reference import CAUTIONS
from ..xlsx.files import (FORCE_HINT, OverwriteRefused, atomic_path, guard_overwrite,
                          mark_workbook)
from .workbook import SHORT_LABELS, RecalcResult

__all__ = ["summary_row", "write_summary", "print_report", "csv_safe", "SUMMARY_STEM",
           "guard_summary", "summary_paths"]

#: File stem of the batch summary (``recalc_summary.xlsx`` and ``.csv``); folder scans skip it.
SUMMARY_STEM = "recalc_summary"



def _header(q) -> str:
    return f"{q.name} [{q.unit}]" if q.unit else q.name


def _fmt_value(v: Any) -> str:
    if v is None:
        return "(none)"
    if isinstance(v, float):
        return f"{v:.10g}"
    return str(v)


def _check_columns() -> list[str]:
    return [rule.label for rule in CHECK_RULES] + list(SHORT_LABELS.values()) + [
        "Engine values current"]


def summary_row(r) -> dict[str, Any]:
    row: dict[str, Any] = {"workbook": str(r.path), "status": r.status,
                           "reason": r.error or "",
                           "output": "" if r.output is None else str(r.output)}
    for q in design_inputs():              # key inputs (SI), as the engine took them
        if q.summary:
            row[_header(q)] = r.inputs.get(q.name, "")
    for q in design_results():             # key results, as the workbook computes them
        if q.summary:
            row[_header(q)] = r.results.get(q.cell_name, "")
    verdicts = dict(r.checks)
    for label in _check_columns():
        if label == "Engine values current":
            flags = [v for k, v in r.checks if k.startswith("Engine value current")]
            row[label] = "" if r.failed else ("OK" if all(v == "OK" for v in flags) else
                                              "NOT OK")
        else:
            row[label] = verdicts.get(label, "")
    row["changes"] = "; ".join(f"{n}: {_fmt_value(o)} -> {_fmt_value(v)}"
                               for n, o, v in r.changes)
    row["issues"] = "; ".join(str(i) for i in r.issues)
    row["seconds"] = round(r.seconds, 4)
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
    if not first.startswith("workbook,status,reason,output"):
        raise OverwriteRefused(f"{csv_path} exists and is not a recalc summary; refusing to "
                               f"overwrite it ({FORCE_HINT})")


def write_summary(batch, base: str | os.PathLike, force: bool = False) -> tuple[Path, Path]:
    """Write the batch summary as ``base.xlsx`` and ``base.csv``; return both paths.

    The workbook has a sheet per view: Workbooks (one row each: status, reason, key inputs and
    results, every check verdict, changes, issues), Changes (old and new value of every named
    cell that changed), Issues, Cautions. Every text is written as text, never as a formula.
    A file of either name that is not an earlier summary is never replaced (unless ``force``).

    Raises
    ------
    OverwriteRefused
        When ``base.xlsx`` or ``base.csv`` exists and is not a summary swaytune wrote.
    """
    base = Path(base)
    rows = batch.table()
    headers = list(rows[0]) if rows else list(summary_row(RecalcResult(Path("-"))))
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
    ws = wb.active
    ws.title = "Workbooks"
    bold = Font(bold=True)
    bad = PatternFill("solid", fgColor="FFC7CE")
    good = PatternFill("solid", fgColor="C6EFCE")

    def put(sheet, r, c, v):
        cell = sheet.cell(r, c)
        if isinstance(v, str):
            cell.value = v
            cell.data_type = "s"
        elif isinstance(v, float) and not math.isfinite(v):
            cell.value = str(v)
            cell.data_type = "s"
        else:
            cell.value = v
        return cell

    for j, h in enumerate(headers, start=1):
        put(ws, 1, j, h).font = bold
    for i, row in enumerate(rows, start=2):
        for j, h in enumerate(headers, start=1):
            c = put(ws, i, j, row.get(h, ""))
            if row.get(h) in ("OK", "NOT OK", "FAILED"):
                c.fill = good if row[h] == "OK" else bad
    ws.freeze_panes = "B2"
    ch = wb.create_sheet("Changes")
    for j, h in enumerate(("workbook", "quantity (defined name)", "old value", "new value"), 1):
        put(ch, 1, j, h).font = bold
    r = 2
    for res in batch.results:
        for name, old, new in res.changes:
            for j, v in enumerate((str(res.path), name, "(none)" if old is None else old,
                                   new), 1):
                put(ch, r, j, v)
            r += 1
    iss = wb.create_sheet("Issues")
    for j, h in enumerate(("workbook", "kind", "where", "message", "builder / engine",
                           "workbook"), 1):
        put(iss, 1, j, h).font = bold
    r = 2
    for res in batch.results:
        if res.failed:
            for j, v in enumerate((str(res.path), "FAILED", "", res.error, "", ""), 1):
                put(iss, r, j, v)
            r += 1
        for i in res.issues:
            for j, v in enumerate((str(res.path), i.kind, i.where, i.message, i.old, i.new), 1):
                put(iss, r, j, v)
            r += 1
    cau = wb.create_sheet("Cautions")
    for i, text in enumerate(CAUTIONS, start=1):
        put(cau, i, 1, text)
    for sheet in (ws, ch, iss):
        sheet.column_dimensions["A"].width = 40
    wb.properties.creator = f"swaytune {__version__} (recalc summary)"
    mark_workbook(wb, __version__)
    with atomic_path(xlsx_path) as tmp:
        wb.save(tmp)
    return xlsx_path, csv_path


def print_report(batch, stream=None) -> None:
    """Print one block per workbook (status, NOT OK checks, issues, changes) and a total."""
    stream = stream or sys.stdout
    for r in batch.results:
        if r.failed:
            print(f"FAILED  {r.path}: {r.error}", file=stream)
            continue
        bad = [label for label, v in r.checks if v != "OK"]
        line = f"{r.status:<7} {r.path}"
        if r.output is not None:
            line += f" -> {r.output}"
        print(line, file=stream)
        if bad:
            print(f"        NOT OK: {'; '.join(bad)}", file=stream)
        for i in r.issues:
            print(f"        {i.kind}: {i}", file=stream)
        if r.changes:
            shown = ", ".join(f"{n} {_fmt_value(o)} -> {_fmt_value(v)}"
                              for n, o, v in r.changes[:6])
            more = f" (+{len(r.changes) - 6} more)" if len(r.changes) > 6 else ""
            print(f"        changed: {shown}{more}", file=stream)
    n = len(batch.results)
    print(f"\n{n} workbook(s): {n - len(batch.failed) - len(batch.not_ok)} OK, "
          f"{len(batch.not_ok)} NOT OK, {len(batch.failed)} failed "
          f"({batch.seconds:.1f} s)", file=stream)
    if batch.summary_xlsx:
        print(f"summary: {batch.summary_xlsx} and {batch.summary_csv}", file=stream)
