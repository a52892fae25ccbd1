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


def _numbers(path: Path) -> tuple[dict, dict]:
    """Cached values of the named cells, and every number of the Charts sheet by cell."""
    from openpyxl import load_workbook
    wb = load_workbook(path, data_only=True)
    named = {}
    for name, dn in wb.defined_names.items():
        dests = list(dn.destinations)
        if len(dests) == 1 and ":" not in dests[0][1]:
            value = wb[dests[0][0]][dests[0][1].replace("$", "")].value
            if isinstance(value, (int, float)) and not isinstance(value, bool):
                named[name] = value
    charts = {c.coordinate: c.value for row in wb["Charts"].iter_rows() for c in row
              if isinstance(c.value, float)}
    return named, charts


def test_numbers_equal_those_of_the_first_release(tmp_path):
    """The office tower example as swaytune 0.1.0 built it (tests/data): every named number
    and every chart number of today's build equals it to 1e-12 (the layout may change, the
    numbers may not)."""
    old_named, old_charts = _numbers(Path(__file__).parent / "data" /
                                     "format2_office_tower_us.xlsx")
    fresh = tmp_path / "office_tower_us.xlsx"
    write_workbook(load_project(EXAMPLES / "office_tower_us.toml"), fresh)
    new_named, new_charts = _numbers(fresh)
    common = set(old_named) & set(new_named)
    assert len(common) >= 40
    for name in common:
        assert new_named[name] == pytest.approx(old_named[name], rel=1e-12, abs=0), name
    assert len(old_charts) >= 300 and set(old_charts) <= set(new_charts)
    for coord, value in old_charts.items():
        assert new_charts[coord] == pytest.approx(value, rel=1e-12, abs=0), coord
