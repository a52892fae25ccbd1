# SPDX-License-Identifier: MIT
"""Test configuration and the fixtures several test modules share.

Property-based tests are repeatable on CI (derandomised). ``built`` builds the example projects
and a closed-form one (tests/workbook_cases.py) once per module; ``stale_workbook`` writes a
small workbook whose cached values are stale, for the spreadsheet-application tests.
"""
from __future__ import annotations

import os
from pathlib import Path

import openpyxl
import pytest
from hypothesis import settings

from workbook_builder.build import write_workbook
from workbook_builder.project import parse_project
from workbook_builder.xlsx.cached import CellError, write_with_cached_values

from workbook_cases import DEN_HARTOG, NAMES, example_project

settings.register_profile("ci", derandomize=True, database=None, print_blob=True)
if os.environ.get("CI"):
    settings.load_profile("ci")


@pytest.fixture(scope="module")
def built(tmp_path_factory) -> dict[str, Path]:
    """The example workbooks and a closed-form (den_hartog) one, built once per module.

    test_build.py and test_xlsx_cached.py define fixtures of their own under this name.
    """
    d = tmp_path_factory.mktemp("built")
    out = {}
    for name in NAMES:
        out[name] = d / f"{name}.xlsx"
        write_workbook(example_project(name), out[name])
    out["den_hartog"] = d / "den_hartog.xlsx"
    write_workbook(parse_project(DEN_HARTOG, source="den_hartog.toml"), out["den_hartog"])
    return out


def _stale_workbook(path):
    """A small workbook with number, text, boolean and error formulas and a stale cached value."""
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Calc sheet"
    ws["A1"] = 2.0
    ws["B1"] = "=A1*2"
    ws["C1"] = '=IF(A1>1,"big","small")'
    ws["D1"] = "=A1>1"
    ws["E1"] = "=SQRT(-1)"
    ws["F1"] = "=2*PI()*SQRT(10/9.80665)"   # small-angle period of a 10 m pendulum [s]
    ws["G1"] = "=NOSUCHFUNCTION(1)"
    ws["A2"] = "label"
    # Stale cached values: an application must recompute them when told to recalculate.
    values = {("Calc sheet", "B1"): 999.0, ("Calc sheet", "C1"): "stale",
              ("Calc sheet", "D1"): False, ("Calc sheet", "E1"): CellError("#NUM!"),
              ("Calc sheet", "F1"): 0.0, ("Calc sheet", "G1"): CellError("#NAME?")}
    return write_with_cached_values(wb, path, values)


@pytest.fixture
def stale_workbook():
    """Factory: ``stale_workbook(path)`` writes the small stale workbook there, returns the path.

    Its formulas (A1 = 2): B1 = A1*2, C1 = IF(A1>1,"big","small"), D1 = A1>1, E1 = SQRT(-1)
    (an error), F1 = 2*PI()*SQRT(10/9.80665), G1 = an unknown function (an error); the cached
    values stored with them (999, "stale", FALSE, #NUM!, 0, #NAME?) are stale.
    """
    return _stale_workbook
