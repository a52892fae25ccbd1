# SPDX-License-Identifier: MIT
"""The batch summary (workbook_builder.recalc.summary): rows, CSV, workbook, printed report.

No text of the summary is ever read as a formula by a spreadsheet program; its columns come
from the engine's quantity declarations (functions.quantities), each with its unit.
"""
from __future__ import annotations

from workbook_builder.recalc.summary import csv_safe


# -------------------------------------------------------------------------- csv
def test_csv_text_is_never_a_formula():
    assert csv_safe("=HYPERLINK(1)") == "'=HYPERLINK(1)"
    assert csv_safe("plain") == "plain"
    assert csv_safe(-1.5) == -1.5

