# SPDX-License-Identifier: MIT
"""Batch recalculation: ``swaytune recalc`` against LibreOffice headless, same batch, same run.

Generates N workbooks (default 200) from the example projects with varied inputs typed into
their input cells (cached values left stale, as after an edit in a program that does not
recalculate), then recalculates the batch

1. with :func:`workbook_builder.recalc.recalc_many` (the ``recalc`` command, one process), and
2. with LibreOffice headless: ONE soffice process converting every file
   (``soffice --headless --convert-to xlsx --outdir D f1 f2 ...``) with a private profile that
   forces recalculation on load (``OOXMLRecalcMode=0``, see
   :mod:`workbook_builder.xlsx.libreoffice`),

and prints the time ratio and the largest relative difference between the two sets of values
(every numeric cell of the Inputs, Calculation, Pendulum, Checks, Names and Summary sheets).
LibreOffice cannot refresh the engine-only values (results without a closed form, the chart
tables), so it recalculates the workbooks our command wrote: every formula value it computes must
equal the cached value we wrote. Both passes do the same formula work; ours also runs the engine,
reads and compares the layout and writes the files.

Targets (issue 6): at least 10x faster than LibreOffice; identical values to 1e-9.

Run: ``python benchmarks/bench_recalc.py [N] [--jobs 1,2] [--keep DIR]`` (the machine this was
written on has 2 cores; LibreOffice converts in one process, our command is timed with one
process and with ``--jobs 2``). ``--no-libreoffice`` times our command only (no ratio, no
comparison), for iterating on speed; the default is the full comparison.
"""
from __future__ import annotations

import argparse
import shutil
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from workbook_builder import recalc  # noqa: E402
from workbook_builder.xlsx import libreoffice, package  # noqa: E402
from workbook_builder.build import write_workbook  # noqa: E402
from workbook_builder.project import load_project, parse_project  # noqa: E402

#: Cells whose values are compared (engine constants and formulas of the calculation).
SHEETS = ("Inputs", "Calculation", "Pendulum", "Checks", "Names", "Summary")
#: Below this magnitude a value is compared absolutely (relative-difference cells ~1e-16).
TINY = 1e-9

_DEN_HARTOG = {
    "project": {"number": "B-1", "title": "Benchmark (invented)"},
    "mode": {"frequency": 0.2, "modal_mass": {"value": 9000, "unit": "t"},
             "structural_damping": {"value": 1.0, "unit": "%"}},
    "wind": {"acceleration": 0.25, "acceleration_limit": 0.15},
    "damper": {"mass_ratio": 0.02, "clearance": 1.5, "tuning_method": "den_hartog"},
}


def generate(folder: Path, n: int) -> list[Path]:
    """N workbooks: 4 layouts, frequency and acceleration varied, cached values stale."""
    folder.mkdir(parents=True, exist_ok=True)
    bases = []
    for name in ("residential_tower", "observation_mast", "office_tower_us"):
        out = folder / f"_base_{name}.xlsx"
        write_workbook(load_project(ROOT / "example_workbooks" / f"{name}.toml"), out)
        bases.append(out)
    out = folder / "_base_den_hartog.xlsx"
    write_workbook(parse_project(_DEN_HARTOG, source="den_hartog.toml"), out)
    bases.append(out)
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
    if libreoffice.find_soffice() is None:
        raise SystemExit("LibreOffice (soffice) not found: cannot run the comparison")
    t0 = time.perf_counter()
    # libreoffice.convert_many: one soffice process, private profile with OOXMLRecalcMode=0
    # (always recalculate on load), macros off, every output checked.
    libreoffice.convert_many(files, outdir, "xlsx:Calc MS Excel 2007 XML", timeout=timeout)
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


def compare(ours: Path, theirs: Path) -> tuple[float, float, int, str]:
    """(largest relative difference, largest absolute difference of tiny values, count, where)."""
    a, b = values(ours), values(theirs)
    worst_rel, worst_abs, where, n = 0.0, 0.0, "", 0
    for key, va in a.items():
        vb = b.get(key)
        if vb is None:
            raise SystemExit(f"{theirs.name}: {key} has no numeric value in LibreOffice's file")
        n += 1
        scale = max(abs(va), abs(vb))
        if scale < TINY:
            worst_abs = max(worst_abs, abs(va - vb))
            continue
        rel = abs(va - vb) / scale
        if rel > worst_rel:
            worst_rel, where = rel, f"{ours.name} {key[0]}!{key[1]} ours {va!r} LO {vb!r}"
    return worst_rel, worst_abs, n, where


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("n", nargs="?", type=int, default=200, help="number of workbooks")
    ap.add_argument("--jobs", default="1,2",
                    help="comma-separated worker counts to time our command with (default 1,2)")
    ap.add_argument("--keep", help="keep the generated files in this folder")
    ap.add_argument("--timeout", type=float, default=3600.0, help="LibreOffice timeout [s]")
    ap.add_argument("--no-libreoffice", action="store_true",
                    help="time our command only (no LibreOffice pass, no comparison); for "
                         "iterating on speed")
    args = ap.parse_args(argv)
    if args.n < 1:
        ap.error("n must be >= 1")
    args.jobs = [int(j) for j in str(args.jobs).split(",") if j.strip()]
    if not args.jobs or min(args.jobs) < 1:
        ap.error("--jobs takes worker counts >= 1, e.g. 1,2")
    work = Path(args.keep) if args.keep else Path(tempfile.mkdtemp(prefix="swaytune-bench-"))
    try:
        print(f"generating {args.n} workbooks in {work} ...", flush=True)
        files = generate(work / "in", args.n)

        timings = {}
        batch = None
        for jobs in args.jobs:
            out = work / ("ours" if jobs == args.jobs[0] else f"ours_j{jobs}")
            recalc.clear_caches()             # every run starts cold
            t0 = time.perf_counter()
            b = recalc.recalc_many([work / "in"], outdir=out, jobs=jobs, progress=False)
            timings[jobs] = time.perf_counter() - t0
            batch = batch or b
            failed = [r for r in b.results if r.failed]
            if failed:
                print(f"our command failed on {len(failed)} file(s): {failed[0].error}")
                return 1
            if jobs != args.jobs[0]:
                shutil.rmtree(out, ignore_errors=True)

        if args.no_libreoffice:
            for jobs, t_ours in timings.items():
                print(f"swaytune recalc --jobs {jobs}:  {t_ours:8.2f} s "
                      f"({t_ours / len(files) * 1e3:6.1f} ms per workbook)")
            print("LibreOffice skipped (--no-libreoffice): no ratio, no comparison")
            return 0

        # LibreOffice recalculates OUR outputs: same formulas, same engine values (LibreOffice
        # cannot refresh engine-only values), so every formula value must agree.
        ours = [work / "ours" / f.name for f in files]
        print(f"LibreOffice: one soffice process converting {len(ours)} files ...", flush=True)
        t_lo = libreoffice_batch(ours, work / "lo", args.timeout)

        worst_rel, worst_abs, count, where = 0.0, 0.0, 0, ""
        errors: list[str] = []
        for f in files:
            errors += error_cells(work / "lo" / f.name)
            rel, ab, n, w = compare(work / "ours" / f.name, work / "lo" / f.name)
            count += n
            worst_abs = max(worst_abs, ab)
            if rel > worst_rel:
                worst_rel, where = rel, w
        print(f"\nworkbooks: {len(files)}; values compared: {count}")
        ratios = {}
        for jobs, t_ours in timings.items():
            ratios[jobs] = t_lo / t_ours
            print(f"swaytune recalc --jobs {jobs}:  {t_ours:8.2f} s "
                  f"({t_ours / len(files) * 1e3:6.1f} ms per workbook)")
        print(f"LibreOffice headless:        {t_lo:8.2f} s "
              f"({t_lo / len(files) * 1e3:6.1f} ms per workbook)")
        for jobs, ratio in ratios.items():
            print(f"ratio (LibreOffice / swaytune --jobs {jobs}): {ratio:.1f}x   target >= 10x: "
                  f"{'met' if ratio >= 10 else 'NOT met'}")
        ratio = max(ratios.values())
        print(f"largest relative difference: {worst_rel:.3g}   target <= 1e-9: "
              f"{'met' if worst_rel <= 1e-9 else 'NOT met'}")
        if where:
            print(f"  at {where}")
        print(f"largest absolute difference of values below {TINY:g}: {worst_abs:.3g}")
        print(f"error cells after LibreOffice's recalculation: {len(errors)}"
              + (f", e.g. {errors[:3]}" if errors else ""))
        statuses = {}
        for r in batch.results:
            statuses[r.status] = statuses.get(r.status, 0) + 1
        print(f"verdicts: {statuses}")
        return 0 if (ratio >= 10 and worst_rel <= 1e-9 and not errors) else 1
    finally:
        if not args.keep:
            shutil.rmtree(work, ignore_errors=True)


if __name__ == "__main__":
    sys.exit(main())
