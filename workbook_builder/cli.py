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
import os
import shutil
import sys
import tempfile
from pathlib import Path
from typing import Sequence

from functions.worksheet import TWIN_TOLERANCE

from . import __version__
from .build import BuildError, BuiltWorkbook, write_workbook
from .reference_docs import update_docs
from .lite_export import NEXT_STEPS, export_lite
from .plan.reference import CAUTIONS
from .progress import Progress
from .project import ProjectError, load_cases, load_project, output_names
from .recalc import print_report, recalc_many
from .xlsx import libreoffice
from .xlsx.compare import compare_workbooks
from .xlsx.draw import DrawError
from .xlsx.files import OverwriteRefused, guard_hand_edits, guard_overwrite

__all__ = ["main", "summary_table", "print_cautions", "EXAMPLES_DIR"]

#: Example projects of the source tree (``swaytune examples``).
EXAMPLES_DIR = Path(__file__).resolve().parent.parent / "example_workbooks"
#: Documentation folder of the source tree (``swaytune docs``).
DOCS_DIR = Path(__file__).resolve().parent.parent / "docs"


def print_cautions(stream=None) -> None:
    """Print the cautions that end every command's output (``stream`` default stdout)."""
    stream = stream or sys.stdout
    print("\nCAUTION - preliminary design aid:", file=stream)
    for text in CAUTIONS[:5]:
        print(f"  * {text}", file=stream)


def summary_line(label: str, built: BuiltWorkbook) -> list[str]:
    """One line of the build summary: key results and verdicts of a built workbook."""
    v = built.value
    design = "OK" if all(verdict == "OK" for _, verdict in built.design_verdicts) \
        else "NOT OK: " + ", ".join(lab.split(" within")[0] for lab, verdict in
                                   built.design_verdicts if verdict != "OK")
    worst = max(rel for *_, rel in built.cross_checks)
    nonlinear = "-"
    if built.simulation is not None:
        sim = built.simulation.result
        bad = [lab.split(" within")[0] for lab, verdict in built.nonlinear_verdicts
               if verdict != "OK"]
        nonlinear = (f"OK ({sim.departure:.1%}, swing {sim.nonlinear.swing_deg:.1f} deg)"
                     if not bad else "NOT OK: " + ", ".join(bad))
    return [label, f"{v('mass_ratio'):.4f}", f"{v('damper_mass'):,.0f}",
            f"{v('damper_frequency'):.4f}", f"{v('pendulum_length'):.3f}",
            f"{v('stroke'):.3f}", f"{v('swing_angle_deg'):.2f}",
            f"{v('acceleration_with_damper'):.4f}", f"{v('acceleration_limit'):.4f}",
            design, f"OK ({worst:.0e})" if worst <= TWIN_TOLERANCE else f"NOT OK ({worst:.1e})",
            nonlinear]


def summary_table(lines: list[list[str]]) -> str:
    """Plain-text table of :func:`summary_line` lines, with a header."""
    head = ["Workbook", "mu [-]", "m_d [kg]", "f_d [Hz]", "L [m]", "stroke [m]",
            "swing [deg]", "a_d [m/s^2]", "a_lim [m/s^2]", "design", "cross-check",
            "nonlinear"]
    widths = [max(len(str(r[i])) for r in [head] + lines) for i in range(len(head))]
    out = ["  ".join(str(c).ljust(w) for c, w in zip(head, widths))]
    out.append("  ".join("-" * w for w in widths))
    out += ["  ".join(str(c).ljust(w) for c, w in zip(r, widths)) for r in lines]
    return "\n".join(out)


def _build_one(project, out: Path, args) -> list[str]:
    built = write_workbook(project, out, force=args.force, template=args.template)
    print(f"wrote {out}")
    for warning in project.warnings:
        print(f"warning: {out.name}: {warning}", file=sys.stderr)
    if getattr(args, "pdf", False):
        _pdf(out, out.parent)
    return summary_line(out.name, built)      # the workbook itself is not kept: flat memory


def _pdf(path: Path, outdir: Path) -> None:
    if libreoffice.find_soffice() is None:
        print("PDF not written: LibreOffice (soffice) is not installed", file=sys.stderr)
        return
    pdf = libreoffice.export_pdf(path, outdir)
    print(f"wrote {pdf}")


def _cmd_build(args) -> int:
    source = Path(args.source)
    if source.suffix.lower() != ".csv":
        project = load_project(source)
        out = Path(args.output) if args.output else source.with_suffix(".xlsx")
        lines = [_build_one(project, out, args)]
        print()
        print(summary_table(lines))
        return 0
    projects = load_cases(source)
    names = output_names(projects)           # distinct names, checked before writing anything
    outdir = Path(args.output) if args.output else source.with_name(source.stem + "_workbooks")
    if outdir.suffix.lower() == ".xlsx" or (outdir.exists() and not outdir.is_dir()):
        print(f"error: {outdir}: a case table builds one workbook per row; -o must be a "
              "folder", file=sys.stderr)
        return 2
    lines, failed = [], []
    bar = Progress(len(projects), enabled=not args.no_progress)
    try:
        for project, name in zip(projects, names):
            try:
                lines.append(_build_one(project, outdir / name, args))
                bar.update(name, "written")
            except (ValueError, BuildError, DrawError, OverwriteRefused) as exc:
                failed.append((project.case, str(exc)))      # the other rows are built
                bar.update(name, "FAILED")
    except KeyboardInterrupt:
        _report_cases(lines, failed, len(projects))
        print(f"interrupted after {len(lines)} of {len(projects)} workbooks; every file "
              "written is complete (atomic writes)", file=sys.stderr)
        return 130
    _report_cases(lines, failed, len(projects))
    return 1 if failed else 0


def _report_cases(lines: list[list[str]], failed: list[tuple[str, str]], total: int) -> None:
    print()
    if lines:
        print(summary_table(lines))
    for case, reason in failed:
        print(f"FAILED  case {case!r}: {reason}", file=sys.stderr)
    print(f"\n{len(lines)} of {total} workbook(s) written, {len(failed)} failed")


def _cmd_examples(args) -> int:
    folder = Path(args.dir) if args.dir else EXAMPLES_DIR
    sources = sorted(folder.glob("*.toml"))
    if not sources:
        print(f"error: no example projects (*.toml) in {folder}", file=sys.stderr)
        return 1
    lines = []
    for source in sources:
        project = load_project(source)
        out = source.with_suffix(".xlsx")
        args.template = None
        lines.append(_build_example(project, out, args))
    print()
    print(summary_table(lines))
    return 0


def _build_example(project, out: Path, args) -> list[str]:
    """Rebuild an example; leave the file untouched when only timestamps would change.

    Keeps a clean working tree after the README's main command when the code has not changed.
    """
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
    return summary_line(out.name, built)


def _cmd_pdf(args) -> int:
    path = Path(args.workbook)
    if not path.is_file():
        print(f"error: {path}: workbook not found", file=sys.stderr)
        return 1
    _pdf(path, Path(args.output) if args.output else path.parent)
    return 0


def _recalc_arguments(parser) -> None:
    """Add the ``recalc`` options to an argparse parser."""
    parser.add_argument("paths", nargs="+", metavar="PATH", help="workbooks and folders")
    parser.add_argument("-o", "--outdir", help="output folder (required unless --in-place)")
    parser.add_argument("--in-place", action="store_true",
                        help="replace each workbook atomically, keeping <name>.<time>.bak")
    parser.add_argument("--no-backup", action="store_true",
                        help="with --in-place: do not keep a backup")
    parser.add_argument("--jobs", "-j", type=int, default=1, help="worker processes")
    parser.add_argument("--summary", help="summary path without extension (default "
                                          "OUTDIR/recalc_summary)")
    parser.add_argument("--no-progress", action="store_true", help="no progress bar")
    parser.add_argument("--force", action="store_true",
                        help="overwrite outputs that swaytune did not make")
    parser.add_argument("--no-layout-check", action="store_true",
                        help="do not compare formulas with the builder's text (faster on "
                             "batches of many different layouts; results are still checked "
                             "against the engine)")


#: Description of the command (``swaytune recalc --help``).
RECALC_DESCRIPTION = ("Recalculate swaytune workbooks with the engine: fresh cached values, "
                      "refreshed engine values, formulas untouched; a summary workbook and CSV. "
                      "Exit status 0: all OK; 1: a workbook failed or a check is NOT OK; 2: "
                      "usage; 130: interrupted. A preliminary design aid; results must be "
                      "checked by a licensed engineer.")


def _cmd_recalc(args) -> int:
    """Run ``recalc`` for parsed arguments; the exit status (the caller prints the cautions)."""
    if args.in_place == (args.outdir is not None):
        print("error: give -o OUTDIR or --in-place (exactly one)", file=sys.stderr)
        return 2
    if args.jobs < 1:
        print(f"error: --jobs {args.jobs} must be >= 1", file=sys.stderr)
        return 2
    batch = recalc_many(args.paths, outdir=args.outdir, jobs=args.jobs,
                        progress=not args.no_progress, in_place=args.in_place,
                        backup=not args.no_backup, summary=args.summary, force=args.force,
                        compare_layout=not args.no_layout_check)
    print_report(batch)
    if batch.interrupted:
        print("interrupted: every file already written is complete; the summary says what "
              "happened to each workbook", file=sys.stderr)
    if not batch.results:
        print("error: no workbooks (*.xlsx, *.xlsm) found in " + ", ".join(args.paths),
              file=sys.stderr)
        return 1
    return batch.exit_status


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

    r = sub.add_parser("recalc", help="recalculate workbooks (files, folders) with the engine "
                                      "into -o OUTDIR or --in-place; writes a summary",
                       description=RECALC_DESCRIPTION)
    _recalc_arguments(r)
    r.set_defaults(func=_cmd_recalc)

    x = sub.add_parser("lite-export", help="write main.py and requirements.txt that make the "
                                           "SWAY_ worksheet functions work in xlwings Lite")
    x.add_argument("--out", default="swaytune_lite",
                   help="folder to write into (created if missing; default: swaytune_lite)")
    x.add_argument("--force", action="store_true",
                   help="replace main.py and requirements.txt there even if they differ")
    x.set_defaults(func=_cmd_lite_export)

    d = sub.add_parser("docs", help="regenerate the reference tables in docs/ from the "
                                    "declarations (functions, project-file keys, quantities)")
    d.add_argument("--dir", default=str(DOCS_DIR), help=f"docs folder (default {DOCS_DIR})")
    d.add_argument("--check", action="store_true",
                   help="write nothing; exit 1 when a reference is out of date")
    d.set_defaults(func=_cmd_docs)
    return parser


def _cmd_lite_export(args) -> int:
    for path in export_lite(args.out, force=args.force):
        print(f"wrote {path}")
    print(NEXT_STEPS)
    return 0


def _cmd_docs(args) -> int:
    changed = update_docs(args.dir, check=args.check)
    for path in changed:
        print(f"{path}: {'out of date' if args.check else 'updated'}")
    if not changed:
        print(f"{args.dir}: every generated reference is current")
    return 1 if (args.check and changed) else 0


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; return the exit status.

    0 success; 1 error (for ``recalc``: a workbook failed or a check is NOT OK); 2 usage;
    130 ``recalc`` interrupted (Ctrl-C).
    """
    args = _parser().parse_args(argv)
    try:
        status = args.func(args)
    except KeyboardInterrupt:
        print("\ninterrupted: every file already written is complete (atomic writes); "
              "nothing half-written was left", file=sys.stderr)
        return 130
    except (ProjectError, OverwriteRefused, ValueError) as exc:
        print(f"error: {exc}", file=sys.stderr)
        print_cautions(sys.stderr)
        return 1
    except OSError as exc:       # read-only folder, full disk, a file where a folder belongs
        where = f"{exc.filename}: " if exc.filename else ""
        print(f"error: {where}{exc.strerror or exc}", file=sys.stderr)
        print_cautions(sys.stderr)
        return 1
    print_cautions()
    return status


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
