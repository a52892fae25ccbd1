# SPDX-License-Identifier: MIT
"""The README's promises: its examples run, and CI runs its test command verbatim."""
from __future__ import annotations

import doctest
import io
import re
from pathlib import Path

from workbook_builder.recalc import print_report, read_workbook, recalc_many, write_results

ROOT = Path(__file__).resolve().parents[1]


def readme_commands() -> list[str]:
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    section = text.split("## Two commands", 1)[1].split("\n## ", 1)[0]
    return re.findall(r"```bash\n(.+?)\n```", section, flags=re.S)


def test_readme_gives_two_commands_main_job_then_tests():
    commands = readme_commands()
    assert len(commands) == 2
    assert "examples" in commands[0]
    assert "pytest" in commands[1]


def test_ci_runs_the_readme_test_command_verbatim():
    ci = (ROOT / ".ci" / "run").read_text(encoding="utf-8").splitlines()
    assert readme_commands()[1] in ci


def test_readme_python_examples_run():
    result = doctest.testfile(str(ROOT / "README.md"), module_relative=False,
                              optionflags=doctest.ELLIPSIS)
    assert result.attempted > 0
    assert result.failed == 0


def test_readme_states_the_cautions():
    text = (ROOT / "README.md").read_text(encoding="utf-8").lower()
    for phrase in ("preliminary design aid", "licensed engineer", "local codes", "wind-tunnel",
                   "manufacturer"):
        assert phrase in text


def test_the_recalc_report_excerpt_is_what_recalc_prints(tmp_path, monkeypatch):
    """The README's report excerpt is real: the residential tower with its acceleration typed
    as 25 instead of 21 milli-g, recalculated from projects/ into recalculated/."""
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    excerpt = re.search(r"```text\n(OK      projects/residential_tower.+?)\n```", text,
                        flags=re.S).group(1).splitlines()
    monkeypatch.chdir(tmp_path)
    (tmp_path / "projects").mkdir()
    src = ROOT / "example_workbooks" / "residential_tower.xlsx"
    edited = Path("projects") / "residential_tower.xlsx"
    data = read_workbook(src)
    write_results(src, edited, constants={data.value_cells["acceleration"]: 25.0})
    batch = recalc_many([Path("projects")], outdir=Path("recalculated"), progress=False)
    out = io.StringIO()
    print_report(batch, out)
    assert out.getvalue().splitlines()[:len(excerpt)] == excerpt
