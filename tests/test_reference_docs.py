# SPDX-License-Identifier: MIT
"""The reference tables in docs/ are generated from the declarations and kept current."""
from __future__ import annotations

import shutil
from pathlib import Path

import pytest

from functions.quantities import DESIGN_INPUTS, SIMULATION_SETTINGS
from workbook_builder import cli
from workbook_builder.reference_docs import DOCS, quantities_markdown, section_text, update_docs

ROOT = Path(__file__).resolve().parent.parent


def test_every_generated_reference_is_current():
    stale = update_docs(ROOT / "docs", check=True)
    assert not stale, f"out of date: {stale}; run: swaytune docs"


def test_docs_command_checks_and_updates(tmp_path, capsys):
    docs = tmp_path / "docs"
    shutil.copytree(ROOT / "docs", docs)
    path = docs / "project_files.md"
    text = path.read_text(encoding="utf-8")
    start = text.index("<!-- BEGIN PROJECT FILE KEYS")
    path.write_text(text[:start] + "<!-- BEGIN PROJECT FILE KEYS (generated: swaytune docs) -->"
                    "\nold\n<!-- END PROJECT FILE KEYS -->\n", encoding="utf-8")
    assert cli.main(["docs", "--dir", str(docs), "--check"]) == 1
    assert "out of date" in capsys.readouterr().out
    assert cli.main(["docs", "--dir", str(docs)]) == 0
    assert cli.main(["docs", "--dir", str(docs), "--check"]) == 0
    assert "every generated reference is current" in capsys.readouterr().out
    new = path.read_text(encoding="utf-8")
    for q in DESIGN_INPUTS + SIMULATION_SETTINGS:
        assert f"`{q.file_key}`" in new


def test_markers_must_be_present(tmp_path):
    bad = tmp_path / "none.md"
    bad.write_text("no markers\n", encoding="utf-8")
    with pytest.raises(ValueError, match="markers not found"):
        section_text(bad, "DESIGN QUANTITIES", "x")


def test_quantities_table_shows_every_formula_and_check():
    text = quantities_markdown()
    assert "`=structural_damping*(acceleration/acceleration_limit)^2`" in text
    assert "engine value" in text                          # the required mass ratio, h2
    assert '`=IF(stroke<=clearance,"OK","NOT OK")`' in text
    assert set(DOCS) == {"spreadsheet_functions.md", "project_files.md",
                         "design_quantities.md"}
