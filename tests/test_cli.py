# SPDX-License-Identifier: MIT
"""Command line: every subcommand is listed, prints the cautions, and does its job."""
from __future__ import annotations

import pytest

from workbook_builder.cli import main


def test_help_lists_every_command(capsys):
    with pytest.raises(SystemExit) as exit_info:
        main(["--help"])
    assert exit_info.value.code == 0
    out = capsys.readouterr().out
    for command in ("build", "examples", "pdf", "recalc", "lite-export"):
        assert command in out


def test_lite_export_writes_the_two_files_and_the_cautions(tmp_path, capsys):
    assert main(["lite-export", "--out", str(tmp_path / "lite")]) == 0
    assert (tmp_path / "lite" / "main.py").is_file()
    assert (tmp_path / "lite" / "requirements.txt").read_text().split() == ["numpy", "scipy"]
    out = capsys.readouterr().out.lower()
    assert "preliminary design aid" in out and "licensed" in out


def test_examples_leaves_unchanged_workbooks_alone_and_rewrites_changed_ones(tmp_path, capsys):
    import shutil
    from pathlib import Path

    import openpyxl

    src = Path(__file__).resolve().parents[1] / "example_workbooks"
    shutil.copy(src / "observation_mast.toml", tmp_path)
    assert main(["examples", "--dir", str(tmp_path)]) == 0
    built = tmp_path / "observation_mast.xlsx"
    first = built.read_bytes()
    assert oct(built.stat().st_mode & 0o777) != oct(0o600)
    assert main(["examples", "--dir", str(tmp_path)]) == 0
    assert "up to date" in capsys.readouterr().out
    assert built.read_bytes() == first                     # untouched: same bytes
    toml = tmp_path / "observation_mast.toml"
    toml.write_text(toml.read_text().replace("frequency = 0.42", "frequency = 0.43"))
    assert main(["examples", "--dir", str(tmp_path)]) == 0
    assert "wrote" in capsys.readouterr().out
    wb = openpyxl.load_workbook(built, data_only=True)
    assert wb.defined_names["structure_frequency"] is not None
    assert built.read_bytes() != first
    assert not list(tmp_path.glob(".swaytune-*"))          # no scratch left behind
