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
