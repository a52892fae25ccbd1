# SPDX-License-Identifier: MIT
"""The committed example workbooks are exactly what the current code builds.

Rebuild each example project and compare it with the committed workbook cell by cell (value or
formula, cached value, number format, locking, names, validations, print set-up), ignoring the
document timestamps (workbook_builder.xlsx.compare). To refresh them: ``swaytune examples``.
"""
from __future__ import annotations

from pathlib import Path

import pytest

from workbook_builder.build import write_workbook
from workbook_builder.xlsx.compare import compare_workbooks
from workbook_builder.project import load_project

EXAMPLES = Path(__file__).resolve().parent.parent / "example_workbooks"
SOURCES = sorted(EXAMPLES.glob("*.toml"))


def test_there_are_three_examples_one_in_us_units():
    assert len(SOURCES) >= 3
    systems = {load_project(s).units for s in SOURCES}
    assert systems == {"SI", "US"}


@pytest.mark.parametrize("source", SOURCES, ids=[s.stem for s in SOURCES])
def test_committed_workbook_is_current(source, tmp_path):
    committed = source.with_suffix(".xlsx")
    assert committed.is_file(), f"{committed.name} is missing: run `swaytune examples`"
    fresh = tmp_path / committed.name
    write_workbook(load_project(source), fresh)
    diffs = compare_workbooks(committed, fresh)
    assert not diffs, (f"{committed.name} is not what the current code builds (run `swaytune "
                       f"examples`); first differences:\n  " + "\n  ".join(diffs[:10]))
