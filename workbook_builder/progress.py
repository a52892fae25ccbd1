# SPDX-License-Identifier: MIT
"""A progress bar on stderr for batches (building many cases, recalculating many workbooks).

On a terminal the bar is redrawn in place; otherwise (a log, a pipe) one line is written every
tenth of the batch and at its end, so a log shows progress without thousands of lines.
"""
from __future__ import annotations

import sys
import time
from typing import TextIO

__all__ = ["Progress"]


class Progress:
    """``update(name, status)`` after each item of a batch of ``total``."""

    def __init__(self, total: int, enabled: bool = True, stream: TextIO | None = None):
        self.total = total
        self.stream = stream or sys.stderr
        self.enabled = enabled and total > 0
        self.tty = bool(getattr(self.stream, "isatty", lambda: False)())
        self.done = 0
        self.t0 = time.perf_counter()
        self.step = max(1, total // 10)

    def update(self, name: str, status: str) -> None:
        self.done += 1
        if not self.enabled:
            return
        width = 30
        filled = int(width * self.done / self.total)
        elapsed = time.perf_counter() - self.t0
        eta = elapsed / self.done * (self.total - self.done)
        line = (f"[{'#' * filled}{'.' * (width - filled)}] {self.done}/{self.total} "
                f"{elapsed:5.1f}s elapsed, ~{eta:4.1f}s left  {name}: {status}")
        if self.tty:
            self.stream.write("\r" + line[:120].ljust(120))
            if self.done == self.total:
                self.stream.write("\n")
        elif self.done % self.step == 0 or self.done == self.total:
            self.stream.write(line + "\n")
        self.stream.flush()
