# SPDX-License-Identifier: MIT
"""The progress bar of batches: redrawn on a terminal, a line per tenth in a log.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import io

from workbook_builder.progress import Progress


class _Stream(io.StringIO):
    def __init__(self, tty: bool):
        super().__init__()
        self.tty = tty

    def isatty(self) -> bool:
        return self.tty


def test_progress_lines_in_a_log_and_on_a_terminal():
    log = _Stream(tty=False)
    bar = Progress(20, True, log)
    for _ in range(20):
        bar.update("w.xlsx", "OK")
    lines = log.getvalue().splitlines()
    # a log gets a line every tenth of the batch
    assert [line.split("] ")[1].split()[0] for line in lines] == [
        f"{k}/20" for k in range(2, 21, 2)]
    assert lines[-1].startswith("[" + "#" * 30 + "]") and lines[-1].endswith("w.xlsx: OK")
    term = _Stream(tty=True)
    bar = Progress(3, True, term)
    for _ in range(3):
        bar.update("w.xlsx", "OK")
    text = term.getvalue()
    assert text.count("\r") == 3 and text.endswith("\n") and text.count("\n") == 1
    quiet = _Stream(tty=True)
    bar = Progress(3, False, quiet)
    bar.update("w.xlsx", "OK")
    assert quiet.getvalue() == "" and bar.done == 1
