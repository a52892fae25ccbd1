# SPDX-License-Identifier: MIT
"""Batch recalculation: ``swaytune recalc`` against LibreOffice and Gnumeric, same batch, same run.

Generates N workbooks (default 200) from the example projects with varied inputs typed into
their input cells (cached values left stale, as after an edit in a program that does not
recalculate), then recalculates the batch

1. with :func:`workbook_builder.recalc.recalc_many` (the ``recalc`` command; one process, and
   ``--jobs 2``),
2. with LibreOffice headless: ONE soffice process converting every file
   (``soffice --headless --convert-to xlsx --outdir D f1 f2 ...``) with a private profile that
   forces recalculation on load (``OOXMLRecalcMode=0``, see
   :mod:`workbook_builder.xlsx.libreoffice`),
3. with Gnumeric: ``ssconvert --recalc IN OUT`` for each file in turn (its usual use, one
   process per file; see :mod:`workbook_builder.xlsx.gnumeric`),

and prints the time ratios and the largest relative difference between the values each
application computes and ours (every numeric cell of the Inputs, Calculation, Pendulum, Checks,
Names and Summary sheets; relative 1e-9, or absolute 1e-12 near zero). The spreadsheet applications cannot refresh the engine-only values
(results without a closed form, the chart tables), so they recalculate the workbooks our
command wrote: every formula value they compute must equal the cached value we wrote. The
applications do the formula work only; ours also runs the engine, reads and compares the
layout, reports the edits and writes the files.

The batch uses the four layouts without the time-domain check (the residential tower with its
[simulation] switched off): a spreadsheet application has nothing to compare it with. The
time-domain check is timed on its own at the end (``--simulated K`` workbooks of the
residential tower, default 10), since recalc reruns the simulation for each.

Targets (issue 11): at most 25 ms per workbook; at least 10x faster than Gnumeric's
``ssconvert --recalc`` on the same batch; identical values to 1e-9; ``--jobs 2`` faster than
``--jobs 1``.

Run: ``python benchmarks/bench_recalc.py [N] [--jobs 1,2] [--keep DIR] [--no-libreoffice]
[--no-gnumeric] [--simulated K]``. ``--no-libreoffice --no-gnumeric`` times our command only
(no ratio, no comparison), for iterating on speed.
"""
from __future__ import annotations

import argparse
import dataclasses
import shutil
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from workbook_builder import recalc  # noqa: E402
from workbook_builder.xlsx import gnumeric, libreoffice, package  # noqa: E402
from workbook_builder.build import write_workbook  # noqa: E402
from workbook_builder.project import load_project, parse_project  # noqa: E402

#: Cells whose values are compared (engine constants and formulas of the calculation).
SHEETS = ("Inputs", "Calculation", "Pendulum", "Checks", "Names", "Summary")
#: Differences up to this size count as equal whatever the values' size: near zero (iteration
#: differences of the AGM, cancellations) only an absolute comparison means anything.
TINY = 1e-12

_DEN_HARTOG = {
    "project": {"number": "B-1", "title": "Benchmark (invented)"},
    "mode": {"frequency": 0.2, "modal_mass": {"value": 9000, "unit": "t"},
             "structural_damping": {"value": 1.0, "unit": "%"}},
    "wind": {"acceleration": 0.25, "acceleration_limit": 0.15},
    "damper": {"mass_ratio": 0.02, "clearance": 1.5, "tuning_method": "den_hartog"},
}


def _bases(folder: Path, simulated: bool) -> list[Path]:
    """The base workbooks: the four layouts, or the residential tower with its simulation."""
    folder.mkdir(parents=True, exist_ok=True)
    names = ("residential_tower",) if simulated else (
        "residential_tower", "observation_mast", "office_tower_us")
    bases = []
    for name in names:
        project = load_project(ROOT / "example_workbooks" / f"{name}.toml")
        if not simulated:
            project = dataclasses.replace(project, simulation=None)
        out = folder / f"_base_{name}.xlsx"
        write_workbook(project, out)
        bases.append(out)
    if not simulated:
        out = folder / "_base_den_hartog.xlsx"
        write_workbook(parse_project(_DEN_HARTOG, source="den_hartog.toml"), out)
        bases.append(out)
    return bases


def generate(folder: Path, n: int, simulated: bool = False) -> list[Path]:
    """N workbooks: the layouts in turn, frequency and acceleration varied, cached values
    stale."""
    bases = _bases(folder, simulated)
    files = []
    for i in range(n):
        base = bases[i % len(bases)]
        data = recalc.read_workbook(base)
        f_typed, _ = data.typed["frequency"]
        a_typed, _ = data.typed["acceleration"]
        scale = 0.9 + 0.2 * ((i * 37) % 101) / 100.0
        consts = {data.value_cells["frequency"]: f_typed * scale,
                  data.value_cells["acceleration"]: a_typed * (0.95 + 0.1 * ((i * 53) % 97)
                                                               / 96.0)}
        dest = folder / f"w{i:04d}.xlsx"
        recalc.write_results(base, dest, constants=consts)
        files.append(dest)
    for b in bases:
        b.unlink()
    return files


def libreoffice_batch(files: list[Path], outdir: Path, timeout: float) -> float:
    """Recalculate every file in ONE soffice process; return the wall time [s]."""
    t0 = time.perf_counter()
    # libreoffice.convert_many: one soffice process, private profile with OOXMLRecalcMode=0
    # (always recalculate on load), macros off, every output checked.
    libreoffice.convert_many(files, outdir, "xlsx:Calc MS Excel 2007 XML", timeout=timeout)
    return time.perf_counter() - t0


def gnumeric_batch(files: list[Path], outdir: Path, timeout: float) -> float:
    """``ssconvert --recalc`` on every file in turn; return the wall time [s]."""
    t0 = time.perf_counter()
    for f in files:
        gnumeric.recalculate(f, outdir, timeout=timeout)
    return time.perf_counter() - t0


def values(path: Path) -> dict[tuple[str, str], float]:
    """Numeric values (cached values of formulas, constants) of the compared sheets."""
    book = package.open_package(path)
    out = {}
    for title in SHEETS:
        if title not in book.sheets:
            continue
        for cell in book.sheets[title].cells.values():
            v = cell.cached if cell.data_type == "f" else cell.value
            if isinstance(v, float):
                out[(title, cell.coordinate)] = v
    return out


def error_cells(path: Path) -> list[str]:
    """Cells whose stored value is a spreadsheet error (is it an error, not which one)."""
    book = package.open_package(path)
    out = []
    for title, sheet in book.sheets.items():
        for cell in sheet.cells.values():
            v = cell.cached if cell.data_type == "f" else cell.value
            if cell.cached_type == "e" or libreoffice.is_error_value(v):
                out.append(f"{path.name} {title}!{cell.coordinate}={v}")
    return out


def compare(ours: Path, theirs: Path, who: str) -> tuple[float, float, int, str]:
    """(largest relative difference, largest absolute difference of tiny values, count, where)."""
    a, b = values(ours), values(theirs)
    worst_rel, worst_abs, where, n = 0.0, 0.0, "", 0
    for key, va in a.items():
        vb = b.get(key)
        if vb is None:
            raise SystemExit(f"{theirs.name}: {key} has no numeric value in {who}'s file")
        n += 1
        diff = abs(va - vb)
        if diff <= TINY:
            worst_abs = max(worst_abs, diff)
            continue
        rel = diff / max(abs(va), abs(vb))
        if rel > worst_rel:
            worst_rel, where = rel, f"{ours.name} {key[0]}!{key[1]} ours {va!r} {who} {vb!r}"
    return worst_rel, worst_abs, n, where


def _ours(folder: Path, out: Path, jobs: int) -> tuple[float, object]:
    recalc.clear_caches()                   # every run starts cold
    t0 = time.perf_counter()
    batch = recalc.recalc_many([folder], outdir=out, jobs=jobs, progress=False)
    seconds = time.perf_counter() - t0
    failed = [r for r in batch.results if r.failed]
    if failed:
        raise SystemExit(f"our command failed on {len(failed)} file(s): {failed[0].error}")
    return seconds, batch


def _application(who: str, run, files: list[Path], ours_dir: Path, out: Path,
                 timeout: float) -> tuple[float, bool]:
    """Time an application on our outputs, compare its values; (seconds, targets met)."""
    ours = [ours_dir / f.name for f in files]
    print(f"{who}: recalculating {len(ours)} files ...", flush=True)
    seconds = run(ours, out, timeout)
    worst_rel, worst_abs, count, where = 0.0, 0.0, 0, ""
    errors: list[str] = []
    for f in files:
        errors += error_cells(out / f.name)
        rel, ab, n, w = compare(ours_dir / f.name, out / f.name, who)
        count += n
        worst_abs = max(worst_abs, ab)
        if rel > worst_rel:
            worst_rel, where = rel, w
    print(f"  {who}: {seconds:8.2f} s ({seconds / len(files) * 1e3:6.1f} ms per workbook); "
          f"values compared: {count}")
    print(f"  largest relative difference: {worst_rel:.3g}   target <= 1e-9: "
          f"{'met' if worst_rel <= 1e-9 else 'NOT met'}" + (f"  (at {where})" if where else ""))
    print(f"  largest difference within the absolute floor {TINY:g}: {worst_abs:.3g}")
    print(f"  error cells after {who}'s recalculation: {len(errors)}"
          + (f", e.g. {errors[:3]}" if errors else ""))
    return seconds, worst_rel <= 1e-9 and not errors


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("n", nargs="?", type=int, default=200, help="number of workbooks")
    ap.add_argument("--jobs", default="1,2",
                    help="comma-separated worker counts to time our command with (default 1,2)")
    ap.add_argument("--keep", help="keep the generated files in this folder")
    ap.add_argument("--timeout", type=float, default=3600.0, help="application timeout [s]")
    ap.add_argument("--no-libreoffice", action="store_true", help="skip LibreOffice")
    ap.add_argument("--no-gnumeric", action="store_true", help="skip Gnumeric")
    ap.add_argument("--simulated", type=int, default=10,
                    help="workbooks with the time-domain check, timed on their own (default 10)")
    args = ap.parse_args(argv)
    if args.n < 1:
        ap.error("n must be >= 1")
    args.jobs = [int(j) for j in str(args.jobs).split(",") if j.strip()]
    if not args.jobs or min(args.jobs) < 1:
        ap.error("--jobs takes worker counts >= 1, e.g. 1,2")
    work = Path(args.keep) if args.keep else Path(tempfile.mkdtemp(prefix="swaytune-bench-"))
    ok = True
    try:
        print(f"generating {args.n} workbooks in {work} ...", flush=True)
        files = generate(work / "in", args.n)
        timings = {}
        for jobs in args.jobs:
            out = work / ("ours" if jobs == args.jobs[0] else f"ours_j{jobs}")
            timings[jobs], batch = _ours(work / "in", out, jobs)
        print(f"\nworkbooks: {len(files)} (four layouts, no time-domain check)")
        for jobs, seconds in timings.items():
            per = seconds / len(files) * 1e3
            ok &= per <= 25.0 or jobs != 1
            print(f"swaytune recalc --jobs {jobs}:  {seconds:8.2f} s ({per:6.1f} ms per "
                  f"workbook)" + ("   target <= 25 ms: " + ("met" if per <= 25 else "NOT met")
                                 if jobs == 1 else ""))
        if 1 in timings and 2 in timings:
            faster = timings[2] < timings[1]
            print(f"--jobs 2 / --jobs 1: {timings[2] / timings[1]:.2f}   target < 1: "
                  f"{'met' if faster else 'NOT met'}")
        statuses: dict[str, int] = {}
        for r in batch.results:
            statuses[r.status] = statuses.get(r.status, 0) + 1
        print(f"statuses: {statuses}")
        best = min(timings.values())
        for who, skip, find, run in (
                ("Gnumeric", args.no_gnumeric, gnumeric.find_ssconvert, gnumeric_batch),
                ("LibreOffice", args.no_libreoffice, libreoffice.find_soffice,
                 libreoffice_batch)):
            if skip:
                print(f"{who} skipped: no ratio, no comparison")
                continue
            if find() is None:
                print(f"{who} is not installed: no ratio, no comparison")
                continue
            seconds, same = _application(who, run, files, work / "ours",
                                         work / who.lower(), args.timeout)
            ratio = seconds / timings[args.jobs[0]]
            fastest = min(timings, key=timings.get)
            verdict = ("met" if ratio >= 10 else f"met with --jobs {fastest} only"
                       if seconds / best >= 10 else "NOT met")
            print(f"  ratio ({who} / swaytune --jobs {args.jobs[0]}): {ratio:.1f}x; with "
                  f"--jobs {fastest}: {seconds / best:.1f}x   target >= 10x: {verdict}")
            ok &= same and (seconds / best >= 10 or who == "LibreOffice")
        if args.simulated:
            sims = generate(work / "sim_in", args.simulated, simulated=True)
            seconds, _ = _ours(work / "sim_in", work / "sim_out", 1)
            print(f"\nwith the time-domain check rerun (residential tower, {len(sims)} "
                  f"workbooks): {seconds / len(sims) * 1e3:.0f} ms per workbook (the "
                  "simulation of a 600 s record; no target)")
        return 0 if ok else 1
    finally:
        if not args.keep:
            shutil.rmtree(work, ignore_errors=True)


if __name__ == "__main__":
    sys.exit(main())
