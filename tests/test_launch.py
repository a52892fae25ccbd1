# SPDX-License-Identifier: MIT
"""The command's entry point (workbook_builder.launch): Ctrl-C while starting is a message.

Behaviour of our own command line: common practice, no source.
"""
from __future__ import annotations

import subprocess
import sys

from workbook_builder import launch

from recalc_helpers import ROOT


class _InterruptImport:
    """A meta-path finder that raises KeyboardInterrupt when the command line is imported, as
    a Ctrl-C arriving during the second it takes to import numpy, scipy and openpyxl."""

    def find_spec(self, name, path=None, target=None):
        if name == "workbook_builder.cli":
            raise KeyboardInterrupt
        return None


def test_ctrl_c_while_starting_is_a_message_and_130(monkeypatch, capsys):
    monkeypatch.delitem(sys.modules, "workbook_builder.cli", raising=False)
    monkeypatch.setattr(sys, "meta_path", [_InterruptImport(), *sys.meta_path])
    assert launch.main(["build", "nothing.toml"]) == 130
    captured = capsys.readouterr()
    assert launch.STARTUP_INTERRUPTED in captured.err and "Traceback" not in captured.err
    assert captured.out == ""


def test_the_command_runs_through_the_entry_point(tmp_path, capsys):
    assert launch.main(["examples", "--dir", str(tmp_path)]) == 1
    assert "no example projects" in capsys.readouterr().err


def test_the_entry_point_imports_nothing_heavy():
    """The window it guards is the heavy import; it must not make that import itself."""
    code = ("import sys, workbook_builder.launch; "
            "print(sorted(m for m in ('numpy', 'scipy', 'openpyxl', 'functions') "
            "if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True,
                         text=True, timeout=60, check=True).stdout
    assert out.strip() == "[]"
