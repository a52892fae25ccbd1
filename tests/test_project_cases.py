# SPDX-License-Identifier: MIT
"""Case tables (CSV): one project per row, validated like a project file.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import pytest

from pathlib import Path

from workbook_builder.project import ProjectError, load_cases, output_names


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


# ----------------------------------------------------------------------------- hostile tables
HEAD = ("case,mode.frequency,mode.modal_mass [t],mode.structural_damping,wind.acceleration,"
        "wind.acceleration_limit,damper.mass_ratio,damper.clearance")
ROW = "0.2,10000,0.01,0.25,0.15,0.02,1.5"


def test_quoted_line_breaks_stay_in_their_cell(tmp_path):
    text = ("case,project.notes," + HEAD.split(",", 1)[1] + "\n"
            'a,"line1\r\nline2",' + ROW + "\n"
            'b,"x\u2028y",' + ROW + "\n")
    a, b = load_cases(write(tmp_path, text, "nl.csv"))
    assert a.info["notes"] == "line1\r\nline2"       # not "line1line2"
    assert b.info["notes"] == "x\u2028y"              # U+2028 does not split the row
    bad = text + "c,note," + ROW.replace("0.2,", "-0.2,", 1) + "\n"
    # the error names the line where row c starts (line 5: row a spans lines 2 and 3)
    with pytest.raises(ProjectError, match=r"nl\.csv:5: column mode\.frequency"):
        load_cases(write(tmp_path, bad, "nl.csv"))


@pytest.mark.parametrize("header, message", [
    (HEAD + ",mode.frequency", r"columns 2 \(mode\.frequency\) and 9 \(mode\.frequency\) set "
                               r"the same input"),
    (HEAD.replace("mode.frequency", "mode.frequency.value") + ",mode.frequency",
     r"columns 2 \(mode\.frequency\.value\) and 9 \(mode\.frequency\) set the same input"),
    (HEAD + ",project.title [m]", r"column 9 \(project\.title\) is text, not a number: it "
                                  r"takes no unit \[m\]"),
    (HEAD + ",damper.tuning_method [%]", r"column 9 \(damper\.tuning_method\) is text"),
])
def test_colliding_columns_and_units_on_texts_are_refused(tmp_path, header, message):
    text = header + "\n" + "a," + ROW + ",x\n"
    with pytest.raises(ProjectError, match=r"cols\.csv:1: " + message):
        load_cases(write(tmp_path, text, "cols.csv"))


def _cases(tmp_path, names):
    text = HEAD + "\n" + "".join(f'"{n}",{ROW}\n' for n in names)
    return load_cases(write(tmp_path, text, "names.csv"))


@pytest.mark.parametrize("a, b", [("a/b", "a_b"), ("Café", "Cafè"), (".x.", "x"),
                                  ("Tower", "tower")])
def test_cases_that_would_share_a_file_name_are_refused(tmp_path, a, b):
    projects = _cases(tmp_path, [a, b])
    with pytest.raises(ProjectError, match=r"cases .* would both be written to .*\.xlsx; "
                                           r"rename one of them \(nothing was written\)"):
        output_names(projects)


def test_output_names_are_portable_distinct_and_short(tmp_path):
    long_a, long_b = "tower " + "a" * 300, "tower " + "a" * 299 + "b"
    names = output_names(_cases(tmp_path, ["tower A", "Café", long_a, long_b]))
    assert names[:2] == ["tower_A.xlsx", "Cafe.xlsx"]
    assert len(set(names)) == 4 and all(len(n) <= 105 for n in names)


def test_a_case_name_a_cell_cannot_hold_is_refused(tmp_path):
    text = HEAD + "\n" + f'"bad\x07case",{ROW}\n'
    with pytest.raises(ProjectError, match=r"names\.csv:2: column case: holds the character "
                                           r"U\+0007"):
        load_cases(write(tmp_path, text, "names.csv"))
