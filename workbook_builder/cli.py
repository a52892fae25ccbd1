# SPDX-License-Identifier: MIT
"""The ``swaytune`` command line (also ``python -m workbook_builder``).

Commands::

    swaytune build PROJECT.toml [-o OUT.xlsx] [--template FIRM.xlsx] [--force] [--pdf]
    swaytune build CASES.csv [-o OUT_DIR]           one workbook per row
    swaytune examples [--dir DIR] [--force]         build every example project next to it
    swaytune pdf WORKBOOK.xlsx [-o OUT_DIR]          export to PDF through LibreOffice
    swaytune recalc PATH... (-o OUTDIR | --in-place) [--jobs N] [--summary BASE] ...
                                                    recalculate workbooks with the engine
    swaytune lite-export [--out DIR]                the worksheet functions for xlwings Lite
    swaytune docs [--check]                         regenerate the reference tables in docs/

An existing output file is replaced only when swaytune made it and it was not changed since (or
with ``--force``); writes are atomic. Every command ends with the cautions.
"""
from __future__ import annotations

import argparse
import sys
from pathlib import Path
from typing import Sequence

from . import __version__

__all__ = ["main", "EXAMPLES_DIR", "DOCS_DIR", "RECALC_DESCRIPTION"]

#: Example projects of the source tree (``swaytune examples``).
EXAMPLES_DIR = Path(__file__).resolve().parent.parent / "example_workbooks"
#: Documentation folder of the source tree (``swaytune docs``).
DOCS_DIR = Path(__file__).resolve().parent.parent / "docs"


def _recalc_arguments(parser) -> None:
    """Add the ``recalc`` options to an argparse parser."""
    parser.add_argument("paths", nargs="+", metavar="PATH", help="workbooks and folders")
    parser.add_argument("-o", "--outdir", help="output folder (required unless --in-place)")
    parser.add_argument("--in-place", action="store_true",
                        help="replace each workbook atomically when its content changes, "
                             "keeping the original as <name>.bak")
    parser.add_argument("--no-backup", action="store_true",
                        help="with --in-place: do not keep a backup")
    parser.add_argument("--keep-backups", action="store_true",
                        help="with --in-place: keep every backup (<name>.<time>.bak) instead "
                             "of one per workbook")
    parser.add_argument("--jobs", "-j", type=int, default=1, help="worker processes")
    parser.add_argument("--summary", help="summary path without extension (default "
                                          "OUTDIR/recalc_summary, or next to the workbooks "
                                          "with --in-place)")
    parser.add_argument("--no-progress", action="store_true", help="no progress bar")
    parser.add_argument("--force", action="store_true",
                        help="overwrite outputs that swaytune did not make")
    parser.add_argument("--no-layout-check", action="store_true",
                        help="do not compare formulas with the builder's text (faster on "
                             "batches of many different layouts; results are still checked "
                             "against the engine)")


#: Description of the command (``swaytune recalc --help``).
RECALC_DESCRIPTION = ("Recalculate swaytune workbooks with the engine: fresh cached values, "
                      "refreshed engine values (the time-domain check rerun), formulas "
                      "untouched; reports the inputs edited since the last engine run, the key "
                      "results that changed and any hand edit; writes a summary workbook and "
                      "CSV. Status of each workbook: OK, NOT OK (a check fails), EDITED (a "
                      "formula differs from the plan or a cell shows an error), FAILED (could "
                      "not be read or written). Exit status 0: all OK; 1: any other status; 2: "
                      "usage; 130: interrupted. A preliminary design aid; results must be "
                      "checked by a licensed engineer.")


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="swaytune",
        description="Pendulum tuned mass damper: project file -> self-checking workbook. "
                    "A preliminary design aid; results must be checked by a licensed engineer.")
    parser.add_argument("--version", action="version", version=f"swaytune {__version__}")
    sub = parser.add_subparsers(dest="command", required=True)

    b = sub.add_parser("build", help="build a workbook from a project file (.toml) or one "
                                     "workbook per row of a case table (.csv)")
    b.add_argument("source", help="project file (.toml) or case table (.csv)")
    b.add_argument("-o", "--output", help="output .xlsx (for a .csv: output directory)")
    b.add_argument("--template", help="firm's calc-sheet template (.xlsx) with a title block "
                                      "marked by defined names")
    b.add_argument("--force", action="store_true",
                   help="overwrite an existing output even if swaytune did not make it")
    b.add_argument("--pdf", action="store_true", help="also export a PDF (needs LibreOffice)")
    b.add_argument("--no-progress", action="store_true",
                   help="no progress bar for a case table")

    e = sub.add_parser("examples", help="build every example project (*.toml) into its .xlsx "
                                        "next to it and print a summary")
    e.add_argument("--dir", default=str(EXAMPLES_DIR),
                   help=f"folder of example projects (default {EXAMPLES_DIR})")
    e.add_argument("--force", action="store_true",
                   help="overwrite outputs even if swaytune did not make them")

    p = sub.add_parser("pdf", help="export a workbook to PDF through LibreOffice")
    p.add_argument("workbook")
    p.add_argument("-o", "--output", help="output directory (default: next to the workbook)")

    r = sub.add_parser("recalc", help="recalculate workbooks (files, folders) with the engine "
                                      "into -o OUTDIR or --in-place; writes a summary",
                       description=RECALC_DESCRIPTION)
    _recalc_arguments(r)

    x = sub.add_parser("lite-export", help="write main.py and requirements.txt that make the "
                                           "SWAY_ worksheet functions work in xlwings Lite")
    x.add_argument("--out", default="swaytune_lite",
                   help="folder to write into (created if missing; default: swaytune_lite)")
    x.add_argument("--force", action="store_true",
                   help="replace main.py and requirements.txt there even if they differ")

    d = sub.add_parser("docs", help="regenerate the reference tables in docs/ from the "
                                    "declarations (functions, project-file keys, quantities)")
    d.add_argument("--dir", default=str(DOCS_DIR), help=f"docs folder (default {DOCS_DIR})")
    d.add_argument("--check", action="store_true",
                   help="write nothing; exit 1 when a reference is out of date")
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; return the exit status.

    0 when every design check passes (or the command shows no design); 1 when a check fails or
    a file could not be read or written; 2 for a usage error; 130 when interrupted (Ctrl-C).
    ``--help`` and ``--version`` answer before the engine is imported.
    """
    args = _parser().parse_args(argv)
    try:
        # the engine and the builders load only once a command runs, so --help and
        # --version answer at once (scipy alone takes a third of a second to import)
        from .commands import run       # lazy import (start-up time)
        return run(args)
    except KeyboardInterrupt:
        print("\ninterrupted: every file already written is complete (atomic writes); "
              "nothing half-written was left", file=sys.stderr)
        return 130

if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
