# SPDX-License-Identifier: MIT
"""Case tables (CSV): one project per row, validated like a project file."""
from __future__ import annotations

import pytest

from pathlib import Path

from workbook_builder.project import ProjectError, load_cases


def write(tmp_path: Path, text: str, name: str = "p.toml") -> Path:
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


CSV = """\
case,project.title,mode.frequency [Hz],mode.modal_mass [t],mode.structural_damping [%],\
wind.acceleration [milli-g],wind.acceleration_limit [milli-g],damper.mass_ratio,damper.clearance [m]
A,Case A,0.2,10000,1.0,25,15,0.02,1.5
B,=Case B,0.25,12000,1.2,22,15,,1.2
"""


def test_csv_cases(tmp_path):
    cases = load_cases(write(tmp_path, CSV, "cases.csv"))
    assert [c.case for c in cases] == ["A", "B"]
    a, b = cases
    assert a.si("modal_mass") == 1e7 and a.si("structural_damping") == pytest.approx(0.01)
    assert a.si("acceleration") == pytest.approx(25 * 0.00980665, rel=1e-15)
    assert b.si("mass_ratio") is None           # empty cell: not given
    assert b.info["title"] == "=Case B"         # text stays text
    assert a.source_sha256 != b.source_sha256


def test_csv_error_names_line_and_column(tmp_path):
    text = CSV.replace("B,=Case B,0.25", "B,=Case B,-0.25")
    with pytest.raises(ProjectError, match=r"cases\.csv:3: column mode\.frequency: -0\.25 Hz "
                                           r"must be in \[0\.01, 20\] \[Hz\]"):
        load_cases(write(tmp_path, text, "cases.csv"))


def test_csv_unknown_column(tmp_path):
    text = CSV.replace("damper.clearance [m]", "damper.clearence [m]")
    with pytest.raises(ProjectError, match=r"cases\.csv:2: column damper\.clearence: unknown key"):
        load_cases(write(tmp_path, text, "cases.csv"))


def test_csv_duplicate_case_and_empty(tmp_path):
    text = CSV.replace("B,=Case B", "A,=Case B")
    with pytest.raises(ProjectError, match=r"cases\.csv:3: case name 'A' is used twice"):
        load_cases(write(tmp_path, text, "cases.csv"))
    with pytest.raises(ProjectError, match=r"e\.csv: the case table has no rows"):
        load_cases(write(tmp_path, CSV.splitlines()[0] + "\n", "e.csv"))
    with pytest.raises(ProjectError, match=r"m\.csv: case table not found"):
        load_cases(tmp_path / "m.csv")


def test_simulation_in_csv_cases(tmp_path):
    text = ("case,mode.frequency,mode.modal_mass [t],mode.structural_damping,"
            "wind.acceleration,wind.acceleration_limit,damper.mass_ratio,damper.clearance,"
            "simulation.enabled,simulation.load,simulation.duration\n"
            "a,0.2,10000,0.01,0.25,0.15,0.02,1.5,true,harmonic,300\n"
            "b,0.2,10000,0.01,0.25,0.15,0.02,1.5,false,random,600\n"
            "c,0.2,10000,0.01,0.25,0.15,0.02,1.5,,,\n")
    a, b, c = load_cases(write(tmp_path, text, "cases.csv"))
    assert a.simulate and a.simulation.load == "harmonic" and a.simulation.duration == 300
    assert not b.simulate and b.simulation.load == "random"
    assert c.simulation is None and c.case == "c"
    bad = text.replace("true,harmonic", "maybe,harmonic")
    with pytest.raises(ProjectError, match=r"bad\.csv:2: column simulation\.enabled: "
                                           r"'maybe' must be true or false"):
        load_cases(write(tmp_path, bad, "bad.csv"))
