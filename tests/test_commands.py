# SPDX-License-Identifier: MIT
"""What the commands print and return: one exit-status convention for ``build`` and ``recalc``
(0 every check passes, 1 a check fails or a file failed, 2 a usage error), the cautions once at
the end of output that shows design results, and a start-up that does not import the engine
for ``--help`` and ``--version``. These are our own rules (common practice, no source)."""
from __future__ import annotations

import subprocess
import sys

import pytest

from workbook_builder.cli import main
from workbook_builder.recalc import recalc_workbook

from recalc_helpers import ROOT

PROJECT = """
[project]
title = "Invented exit-status tower"
[mode]
frequency = 0.2
modal_mass = {{ value = 9000, unit = "t" }}
structural_damping = 0.01
[wind]
acceleration = 0.25
acceleration_limit = 0.15
[damper]
mass_ratio = {mass_ratio}
clearance = 1.5
"""


def _project(tmp_path, name: str, mass_ratio: float):
    path = tmp_path / f"{name}.toml"
    path.write_text(PROJECT.format(mass_ratio=mass_ratio), encoding="utf-8")
    return path


@pytest.mark.parametrize("mass_ratio, status", [(0.03, 0), (0.002, 1)])
def test_build_and_recalc_agree_on_the_exit_status(tmp_path, capsys, mass_ratio, status):
    """A damper too light for the limit (mass ratio 0.002) fails the acceleration check: both
    commands exit 1; a sufficient one (0.03) passes: both exit 0."""
    src = _project(tmp_path, "t", mass_ratio)
    built = main(["build", str(src), "-o", str(tmp_path / "in" / "t.xlsx")])
    out = capsys.readouterr().out
    assert built == status, out
    recalculated = main(["recalc", str(tmp_path / "in"), "-o", str(tmp_path / "out"),
                         "--no-progress"])
    assert recalculated == status
    assert ("NOT OK" in out) == bool(status)


def test_the_cautions_come_once_at_the_end_of_a_design_output(tmp_path, capsys):
    src = _project(tmp_path, "t", 0.03)
    assert main(["build", str(src), "-o", str(tmp_path / "t.xlsx")]) == 0
    out = capsys.readouterr().out
    assert out.count("CAUTION") == 1
    tail = out[out.index("CAUTION"):]
    assert "licensed engineer" in tail and "wrote" not in tail
    assert main(["recalc", str(tmp_path / "t.xlsx"), "-o", str(tmp_path / "out"),
                 "--no-progress"]) == 0
    out = capsys.readouterr().out
    assert out.count("CAUTION") == 1 and out.rstrip().endswith(out.rstrip().splitlines()[-1])


def test_no_cautions_after_an_error(tmp_path, capsys):
    missing = tmp_path / "missing.toml"
    assert main(["build", str(missing)]) == 1
    captured = capsys.readouterr()
    assert "error:" in captured.err and "CAUTION" not in captured.out + captured.err


def test_a_usage_error_is_status_2(tmp_path, capsys):
    with pytest.raises(SystemExit) as exit_info:
        main(["recalc"])                       # no workbook given
    assert exit_info.value.code == 2
    assert main(["recalc", str(tmp_path), "--no-progress"]) == 2      # neither -o nor --in-place
    assert "-o OUTDIR or --in-place" in capsys.readouterr().err
    assert main(["recalc", str(tmp_path), "-o", str(tmp_path), "--no-progress"]) == 2
    assert "is the folder being recalculated" in capsys.readouterr().err


@pytest.mark.parametrize("argv", [["--version"], ["--help"], ["recalc", "--help"]])
def test_help_and_version_do_not_import_the_engine(argv):
    """--help and --version answer without importing scipy or the engine's topic modules."""
    code = ("import sys\nfrom workbook_builder.cli import main\ntry:\n    main(%r)\n"
            "except SystemExit:\n    pass\nheavy = [m for m in ('scipy', 'functions.damper', "
            "'openpyxl') if m in sys.modules]\nprint('HEAVY', heavy)\n" % (argv,))
    proc = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                          cwd=ROOT, timeout=60)
    assert proc.returncode == 0, proc.stderr
    assert "HEAVY []" in proc.stdout, proc.stdout[-400:]


def test_the_build_summary_of_a_us_project_is_in_us_customary_units(tmp_path, capsys):
    """units = "US": the console shows kip (weight), ft and milli-g (1 kip = 453.59237 kg of
    weight, 1 ft = 0.3048 m, exact, NIST SP 811 (2008) App. B; g_n = 9.80665 m/s^2)."""
    src = ROOT / "example_workbooks" / "office_tower_us.toml"
    assert main(["build", str(src), "-o", str(tmp_path / "us.xlsx")]) == 0
    line = next(x for x in capsys.readouterr().out.splitlines() if x.startswith("us.xlsx"))
    r = recalc_workbook(tmp_path / "us.xlsx").results
    assert f"{r['damper_mass'] / 453.59237:,.0f} kip (weight)" in line
    assert f"{r['pendulum_length'] / 0.3048:,.3f} ft" in line
    assert f"{r['acceleration_with_damper'] / 9.80665e-3:,.4f} milli-g" in line
    assert " kg" not in line and " m/s^2" not in line
