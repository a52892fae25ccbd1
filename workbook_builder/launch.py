# SPDX-License-Identifier: MIT
"""The ``swaytune`` command's entry point: Ctrl-C while the program is still starting is a
message and exit status 130, not a traceback.

Importing the command line takes about a second (numpy, scipy, openpyxl and the engine); this
module imports nothing heavy, so it can catch an interrupt that arrives in that second. Once
:func:`workbook_builder.cli.main` runs, it handles interrupts itself.
"""
from __future__ import annotations

import sys
from typing import Sequence

__all__ = ["main", "STARTUP_INTERRUPTED"]

#: Printed when Ctrl-C arrives before the command has started: nothing was read or written.
STARTUP_INTERRUPTED = "interrupted while starting: nothing was read or written"


def main(argv: Sequence[str] | None = None) -> int:
    """Run ``swaytune ARGS``; the exit status (130 when interrupted while starting).

    Examples
    --------
    >>> import contextlib, io
    >>> with contextlib.redirect_stdout(io.StringIO()), contextlib.redirect_stderr(io.StringIO()):
    ...     status = main(["examples", "--dir", "a folder without example projects"])
    >>> status
    1
    """
    try:    # lazy import: the second it takes is the window this function guards
        from .cli import main as run
    except KeyboardInterrupt:
        print(f"\n{STARTUP_INTERRUPTED}", file=sys.stderr)
        return 130
    return run(argv)
