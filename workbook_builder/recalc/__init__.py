# SPDX-License-Identifier: MIT
"""Batch recalculation of swaytune workbooks with the engine.

    read      a workbook through its plan's defined names: format, options, inputs as typed
    inputs    inputs and overrides in the project file's convention (SI, {value, unit}, "25 milli-g")
    edits     formulas edited by hand, against the plan's
    workbook  one workbook: engine values refreshed, cached values fresh, checks, writing
    batch     many workbooks: folder scans, worker processes, progress, the summary
    summary   the batch summary (CSV, workbook) and the printed report

Preliminary design aid: results must be checked by a licensed engineer against local codes,
wind-tunnel data and the manufacturer's design.
"""
from .batch import BatchSummary, collect_paths, recalc_many
from .inputs import parse_overrides, read_inputs
from .read import Issue, RecalcError, WorkbookData, read_workbook
from .summary import SUMMARY_STEM, print_report, write_summary
from .workbook import RecalcResult, clear_caches, recalc_workbook, write_results

__all__ = ["RecalcError", "Issue", "RecalcResult", "BatchSummary", "WorkbookData",
           "read_workbook", "read_inputs", "parse_overrides", "recalc_workbook", "write_results", "recalc_many",
           "write_summary", "print_report", "collect_paths", "SUMMARY_STEM", "clear_caches"]
