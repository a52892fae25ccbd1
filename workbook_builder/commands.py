# SPDX-License-Identifier: MIT
"""What each ``swaytune`` command does, once its arguments are parsed (:mod:`.cli`).

:mod:`.cli` imports this module only when a command runs, so ``swaytune --help`` and
``--version`` do not pay for the engine's and the builders' imports. Every ``cmd_*`` function
takes the parsed arguments and returns the exit status: 0 when every design check passes, 1
when a check fails or a file could not be read or written, 2 for a usage error.
"""
from __future__ import annotations

import os
import shutil
import sys
import tempfile
from pathlib import Path
from typing import TYPE_CHECKING

from functions.design import CAUTION
from functions.worksheet import TWIN_TOLERANCE

from .plan.reference import CAUTIONS
from .progress import Progress
from .project import ProjectError, load_cases, load_project, output_names
from .project.units import us_display
from .xlsx.files import OverwriteRefused, guard_hand_edits, guard_overwrite

if TYPE_CHECKING:
    from .build import BuiltWorkbook

# Each command imports the rest of what it needs when it runs (marked "lazy import"): the
# builders, the recalculation, LibreOffice and the reference generator are not all needed at
# once, and ``swaytune recalc`` on one workbook should start quickly.

__all__ = ["print_cautions", "summary_line", "summary_table", "cmd_build", "cmd_examples",
           "cmd_pdf", "cmd_recalc", "cmd_lite_export", "cmd_docs", "EXPECTED_ERRORS", "run"]

#: Errors a command reports as ``error: ...`` with exit status 1 (a file that could not be
#: read or written, a project refused), not as a traceback.
EXPECTED_ERRORS = (ProjectError, OverwriteRefused, ValueError)


def run(args) -> int:
    """Run the parsed command ``args.command``; the exit status (errors reported, status 1)."""
    command = globals()["cmd_" + args.command.replace("-", "_")]
    try:
        return command(args)
    except EXPECTED_ERRORS as exc:
        print(f"error: {exc}", file=sys.stderr)
        return 1
    except OSError as exc:       # read-only folder, full disk, a file where a folder belongs
        where = f"{exc.filename}: " if exc.filename else ""
        print(f"error: {where}{exc.strerror or exc}", file=sys.stderr)
        return 1


def print_cautions(stream=None) -> None:
    """Print the cautions that end an output showing design results (default stdout)."""
    stream = stream or sys.stdout
    print(f"\nCAUTION: {CAUTION}", file=stream)
    for text in CAUTIONS[5:6]:
        print(f"  {text}", file=stream)


def summary_line(label: str, built: "BuiltWorkbook") -> list[str]:
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
    us = built.project.units == "US"

    def shown(name: str, si_unit: str, digits: int) -> str:
        """The value in the project's units (US customary first in a US project)."""
        unit, factor = us_display(si_unit, name) if us else (si_unit, 1.0)
        return f"{v(name) / factor:,.{digits}f} {unit}"

    return [label, f"{v('mass_ratio'):.4f}", shown("damper_mass", "kg", 0),
            f"{v('damper_frequency'):.4f}", shown("pendulum_length", "m", 3),
            shown("stroke", "m", 3), f"{v('swing_angle_deg'):.2f}",
            shown("acceleration_with_damper", "m/s^2", 4),
            shown("acceleration_limit", "m/s^2", 4),
            design, f"OK ({worst:.0e})" if worst <= TWIN_TOLERANCE else f"NOT OK ({worst:.1e})",
            nonlinear]


def all_checks_pass(built: "BuiltWorkbook") -> bool:
    """Whether every verdict of a built workbook is OK: design checks, cross-checks against
    the engine and the time-domain checks."""
    return (all(verdict == "OK" for _, verdict in built.design_verdicts + built.nonlinear_verdicts)
            and max(rel for *_, rel in built.cross_checks) <= TWIN_TOLERANCE)


def summary_table(lines: list[list[str]]) -> str:
    """Plain-text table of :func:`summary_line` lines, with a header."""
    head = ["Workbook", "mu [-]", "damper mass", "f_d [Hz]", "hanger L", "stroke",
            "swing [deg]", "a with damper", "a limit", "design", "cross-check", "nonlinear"]
    widths = [max(len(str(r[i])) for r in [head] + lines) for i in range(len(head))]
    out = ["  ".join(str(c).ljust(w) for c, w in zip(head, widths))]
    out.append("  ".join("-" * w for w in widths))
    out += ["  ".join(str(c).ljust(w) for c, w in zip(r, widths)) for r in lines]
    return "\n".join(out)


def _build_one(project, out: Path, args) -> tuple[list[str], bool]:
    from .build import write_workbook       # lazy import (start-up time)
    built = write_workbook(project, out, force=args.force, template=args.template)
    print(f"wrote {out}")
    for warning in project.warnings:
        print(f"warning: {out.name}: {warning}", file=sys.stderr)
    if getattr(args, "pdf", False):
        _pdf(out, out.parent)
    # the workbook itself is not kept: flat memory
    return summary_line(out.name, built), all_checks_pass(built)


def _pdf(path: Path, outdir: Path) -> None:
    from .xlsx import libreoffice           # lazy import (start-up time)
    if libreoffice.find_soffice() is None:
        print("PDF not written: LibreOffice (soffice) is not installed", file=sys.stderr)
        return
    pdf = libreoffice.export_pdf(path, outdir)
    print(f"wrote {pdf}")


def cmd_build(args) -> int:
    source = Path(args.source)
    if source.suffix.lower() != ".csv":
        project = load_project(source)
        out = Path(args.output) if args.output else source.with_suffix(".xlsx")
        return _finish([_build_one(project, out, args)])
    projects = load_cases(source)
    names = output_names(projects)           # distinct names, checked before writing anything
    outdir = Path(args.output) if args.output else source.with_name(source.stem + "_workbooks")
    if outdir.suffix.lower() == ".xlsx" or (outdir.exists() and not outdir.is_dir()):
        print(f"error: {outdir}: a case table builds one workbook per row; -o must be a "
              "folder", file=sys.stderr)
        return 2
    lines: list[tuple[list[str], bool]] = []
    failed: list[tuple[str, str]] = []
    bar = Progress(len(projects), enabled=not args.no_progress)
    try:
        for project, name in zip(projects, names):
            try:
                lines.append(_build_one(project, outdir / name, args))
                bar.update(name, "written")
            except (ValueError, RuntimeError, OverwriteRefused) as exc:   # BuildError, DrawError
                failed.append((project.case, str(exc)))      # the other rows are built
                bar.update(name, "FAILED")
    except KeyboardInterrupt:
        _report_cases(lines, failed, len(projects))
        print(f"interrupted after {len(lines)} of {len(projects)} workbooks; every file "
              "written is complete (atomic writes)", file=sys.stderr)
        return 130
    return _report_cases(lines, failed, len(projects))


def _finish(lines: list[tuple[list[str], bool]], failed: int = 0) -> int:
    """Print the summary table, the verdict line and the cautions; the exit status."""
    print()
    print(summary_table([line for line, _ in lines]))
    bad = sum(not ok for _, ok in lines)
    print(f"\n{len(lines) - bad} of {len(lines)} design(s): every check OK"
          + (f"; {bad} with a check NOT OK" if bad else ""))
    print_cautions()
    return 1 if bad or failed else 0


def _report_cases(lines: list[tuple[list[str], bool]], failed: list[tuple[str, str]],
                  total: int) -> int:
    for case, reason in failed:
        print(f"FAILED  case {case!r}: {reason}", file=sys.stderr)
    print(f"{len(lines)} of {total} workbook(s) written, {len(failed)} failed")
    return _finish(lines, len(failed)) if lines else 1


def cmd_examples(args) -> int:
    folder = Path(args.dir)
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
    return _finish(lines)


def _build_example(project, out: Path, args) -> tuple[list[str], bool]:
    """Rebuild an example; leave the file untouched when only timestamps would change.

    Keeps a clean working tree after the README's main command when the code has not changed.
    """
    from .build import write_workbook                # lazy import (start-up time)
    from .xlsx.compare import compare_workbooks      # lazy import (start-up time)
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
    return summary_line(out.name, built), all_checks_pass(built)


def cmd_pdf(args) -> int:
    path = Path(args.workbook)
    if not path.is_file():
        print(f"error: {path}: workbook not found", file=sys.stderr)
        return 1
    _pdf(path, Path(args.output) if args.output else path.parent)
    return 0


def cmd_recalc(args) -> int:
    """Run ``recalc`` for parsed arguments; the exit status."""
    if args.in_place == (args.outdir is not None):
        print("error: give -o OUTDIR or --in-place (exactly one)", file=sys.stderr)
        return 2
    if args.jobs < 1:
        print(f"error: --jobs {args.jobs} must be >= 1", file=sys.stderr)
        return 2
    from .recalc import print_report, recalc_many       # lazy import (start-up time)
    try:
        batch = recalc_many(args.paths, outdir=args.outdir, jobs=args.jobs,
                            progress=not args.no_progress, in_place=args.in_place,
                            backup=not args.no_backup, keep_backups=args.keep_backups,
                            summary=args.summary, force=args.force,
                            compare_layout=not args.no_layout_check)
    except ValueError as exc:       # contradictory options (the output folder is the input)
        print(f"error: {exc}", file=sys.stderr)
        return 2
    print_report(batch)
    if any(not r.failed for r in batch.results):
        print_cautions()            # design results were shown
    if batch.interrupted:
        print("interrupted: every file already written is complete; the summary says what "
              "happened to each workbook", file=sys.stderr)
    if not batch.results:
        print("error: no workbooks (*.xlsx, *.xlsm) found in " + ", ".join(args.paths),
              file=sys.stderr)
        return 1
    return batch.exit_status


def cmd_lite_export(args) -> int:
    from .lite_export import NEXT_STEPS, export_lite    # lazy import (start-up time)
    for path in export_lite(args.out, force=args.force):
        print(f"wrote {path}")
    print(NEXT_STEPS)
    return 0


def cmd_docs(args) -> int:
    from .reference_docs import update_docs            # lazy import (start-up time)
    changed = update_docs(args.dir, check=args.check)
    for path in changed:
        print(f"{path}: {'out of date' if args.check else 'updated'}")
    if not changed:
        print(f"{args.dir}: every generated reference is current")
    return 1 if (args.check and changed) else 0


