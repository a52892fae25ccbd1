# SPDX-License-Identifier: MIT
"""The ``swaytune`` command line (also ``python -m workbook_builder``).

Commands::

    swaytune build PROJECT.toml [-o OUT.xlsx] [--template FIRM.xlsx] [--force] [--pdf]
    swaytune build CASES.csv [-o OUT_DIR]           one workbook per row
    swaytune examples [--dir DIR] [--force]         build every example project next to it
    swaytune pdf WORKBOOK.xlsx [-o OUT_DIR]          export to PDF through LibreOffice
    swaytune recalc PATH... (-o OUTDIR | --in-place) [--jobs N] [--summary BASE] ...
                                                    recalculate workbooks with the engine

An existing output file is replaced only when swaytune made it and it was not changed since (or
with ``--force``); writes are atomic. Every command ends with the cautions.
"""
from __future__ import annotations

import argparse
import re
import sys
from pathlib import Path
from typing import Sequence

from . import __version__
from .xlsx import libreoffice
from .xlsx.compare import compare_workbooks
from .xlsx.files import OverwriteRefused, guard_hand_edits, guard_overwrite

__all__ = ["main", "summary_table", "print_cautions", "EXAMPLES_DIR"]

#: Example projects of the source tree (``swaytune examples``).
EXAMPLES_DIR = Path(__file__).resolve().parent.parent / "example_workbooks"


def print_cautions(stream=None) -> None:
    """Print the cautions that end every command's output (``stream`` default stdout)."""
    from .build import CAUTIONS
    stream = stream or sys.stdout
    print("\nCAUTION - preliminary design aid:", file=stream)
    for text in CAUTIONS[:5]:
        print(f"  * {text}", file=stream)


def summary_table(rows: list[tuple[str, object]]) -> str:
    """Plain-text table of key results and verdicts, one line per built workbook.

    ``rows`` holds ``(label, BuiltWorkbook)`` pairs.
    """
    head = ["Workbook", "mu [-]", "m_d [kg]", "f_d [Hz]", "L [m]", "stroke [m]",
            "swing [deg]", "a_d [m/s^2]", "a_lim [m/s^2]", "design", "cross-check",
            "nonlinear"]
    lines = []
    for label, built in rows:
        v = built.value
        design = "OK" if all(verdict == "OK" for _, verdict in built.design_verdicts) \
            else "NOT OK: " + ", ".join(lab.split(" within")[0] for lab, verdict in
                                       built.design_verdicts if verdict != "OK")
        worst = max(rel for *_, rel in built.cross_checks)
        nonlinear = "-"
        if getattr(built, "simulation", None) is not None:
            sim = built.simulation.result
            bad = [lab.split(" within")[0] for lab, verdict in built.nonlinear_verdicts
                   if verdict != "OK"]
            nonlinear = (f"OK ({sim.departure:.1%}, swing {sim.nonlinear.swing_deg:.1f} deg)"
                         if not bad else "NOT OK: " + ", ".join(bad))
        lines.append([label, f"{v('mass_ratio'):.4f}", f"{v('damper_mass'):,.0f}",
                      f"{v('damper_frequency'):.4f}", f"{v('pendulum_length'):.3f}",
                      f"{v('stroke'):.3f}", f"{v('swing_angle_deg'):.2f}",
                      f"{v('acceleration_with_damper'):.4f}", f"{v('acceleration_limit'):.4f}",
                      design, f"OK ({worst:.0e})" if worst <= 1e-9 else f"NOT OK ({worst:.1e})",
                      nonlinear])
    widths = [max(len(str(r[i])) for r in [head] + lines) for i in range(len(head))]
    out = ["  ".join(str(c).ljust(w) for c, w in zip(head, widths))]
    out.append("  ".join("-" * w for w in widths))
    out += ["  ".join(str(c).ljust(w) for c, w in zip(r, widths)) for r in lines]
    return "\n".join(out)


def _safe_name(text: str) -> str:
    name = re.sub(r"[^A-Za-z0-9._-]+", "_", text).strip("._")
    return name or "case"


def _build_one(project, out: Path, args) -> object:
    from .build import write_workbook
    built = write_workbook(project, out, force=args.force, template=args.template)
    print(f"wrote {out}")
    if getattr(args, "pdf", False):
        _pdf(out, out.parent)
    return built


def _pdf(path: Path, outdir: Path) -> None:
    if libreoffice.find_soffice() is None:
        print("PDF not written: LibreOffice (soffice) is not installed", file=sys.stderr)
        return
    pdf = libreoffice.export_pdf(path, outdir)
    print(f"wrote {pdf}")


def _cmd_build(args) -> int:
    from .project import load_cases, load_project
    source = Path(args.source)
    rows = []
    if source.suffix.lower() == ".csv":
        projects = load_cases(source)
        outdir = Path(args.output) if args.output else source.with_name(source.stem + "_workbooks")
        if outdir.suffix.lower() == ".xlsx":
            print("error: a case table builds one workbook per row; -o must be a directory",
                  file=sys.stderr)
            return 2
        for project in projects:
            out = outdir / f"{_safe_name(project.case)}.xlsx"
            rows.append((out.name, _build_one(project, out, args)))
    else:
        project = load_project(source)
        out = Path(args.output) if args.output else source.with_suffix(".xlsx")
        rows.append((out.name, _build_one(project, out, args)))
    print()
    print(summary_table(rows))
    return 0


def _cmd_examples(args) -> int:
    from .project import load_project
    folder = Path(args.dir) if args.dir else EXAMPLES_DIR
    sources = sorted(folder.glob("*.toml"))
    if not sources:
        print(f"error: no example projects (*.toml) in {folder}", file=sys.stderr)
        return 1
    rows = []
    for source in sources:
        project = load_project(source)
        out = source.with_suffix(".xlsx")
        args.template = None
        rows.append((out.name, _build_example(project, out, args)))
    print()
    print(summary_table(rows))
    return 0


def _build_example(project, out: Path, args) -> object:
    """Rebuild an example; leave the file untouched when only timestamps would change.

    Keeps a clean working tree after the README's main command when the code has not changed.
    """
    import os
    import shutil
    import tempfile

    from .build import write_workbook
    if not out.exists():
        return _build_one(project, out, args)
    guard_overwrite(out, force=args.force)
    guard_hand_edits(out, force=args.force)
    scratch = Path(tempfile.mkdtemp(prefix=".swaytune-", dir=out.parent))
    try:
        tmp = scratch / out.name            # a new file: normal permissions
        built = write_workbook(project, tmp, force=True)
        if compare_workbooks(out, tmp):
            os.replace(tmp, out)
            print(f"wrote {out}")
        else:
            print(f"up to date {out}")
    finally:
        shutil.rmtree(scratch, ignore_errors=True)
    return built


def _cmd_pdf(args) -> int:
    path = Path(args.workbook)
    if not path.is_file():
        print(f"error: {path}: workbook not found", file=sys.stderr)
        return 1
    _pdf(path, Path(args.output) if args.output else path.parent)
    return 0


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
    b.set_defaults(func=_cmd_build)

    e = sub.add_parser("examples", help="build every example project (*.toml) into its .xlsx "
                                        "next to it and print a summary")
    e.add_argument("--dir", help=f"folder of example projects (default {EXAMPLES_DIR})")
    e.add_argument("--force", action="store_true",
                   help="overwrite outputs even if swaytune did not make them")
    e.set_defaults(func=_cmd_examples)

    p = sub.add_parser("pdf", help="export a workbook to PDF through LibreOffice")
    p.add_argument("workbook")
    p.add_argument("-o", "--output", help="output directory (default: next to the workbook)")
    p.set_defaults(func=_cmd_pdf)

    from .recalc import RECALC_DESCRIPTION, add_recalc_arguments, run_recalc
    r = sub.add_parser("recalc", help="recalculate workbooks (files, folders) with the engine "
                                      "into -o OUTDIR or --in-place; writes a summary",
                       description=RECALC_DESCRIPTION)
    add_recalc_arguments(r)
    r.set_defaults(func=run_recalc)

    x = sub.add_parser("lite-export", help="write main.py and requirements.txt that make the "
                                           "SWAY_ worksheet functions work in xlwings Lite")
    x.add_argument("--out", default="swaytune_lite",
                   help="folder to write into (created if missing; default: swaytune_lite)")
    x.set_defaults(func=_cmd_lite_export)
    return parser


def _cmd_lite_export(args) -> int:
    from .lite_export import main_lite_export
    return main_lite_export(["--out", args.out], cautions=False)


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; return the exit status.

    0 success; 1 error (for ``recalc``: a workbook failed or a check is NOT OK); 2 usage;
    130 ``recalc`` interrupted (Ctrl-C).
    """
    args = _parser().parse_args(argv)
    from .project import ProjectError
    try:
        status = args.func(args)
    except (ProjectError, OverwriteRefused, ValueError, FileNotFoundError) as exc:
        print(f"error: {exc}", file=sys.stderr)
        print_cautions(sys.stderr)
        return 1
    print_cautions()
    return status


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
