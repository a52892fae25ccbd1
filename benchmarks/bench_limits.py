# SPDX-License-Identifier: MIT
"""Limits and resources: the figures of the reliability issue, measured in one run.

1. **Case-table build streams** (``swaytune build cases.csv``): the command is run in a child
   process for a short table (N/4 rows, the reference) and a long one (N rows); the peak memory
   (resident set) and the throughput of both are printed with their ratio. Flat memory means a
   ratio near 1; the target is under 300 MB at any N (before: 1.9 MB more per workbook, 575 MB
   after 222 workbooks).
2. **Zip bomb refused before it is read**: 250 members of 999,999 zero bytes (~250 MB from
   ~250 KB, each member under the per-member threshold). The time and the peak Python memory of
   the refusal are printed against opening a real example workbook in the same run (before:
   accepted, 591 MB).
3. **Parts not encoded as UTF-8 and DTDs**: a shared-strings part with an internal entity in
   UTF-16 (with and without byte-order mark), UTF-32 and ISO-8859-1, and a package with more
   than ``MAX_MEMBERS`` members: each must be refused; the outcome is printed.

Run: ``python benchmarks/bench_limits.py [N]`` (default N = 120 rows; the issue's 10,000 rows
take about 50 minutes on 2 cores and show the same flat memory).
"""
from __future__ import annotations

import argparse
import json
import subprocess
import sys
import tempfile
import time
import tracemalloc
import zipfile
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from workbook_builder.xlsx import package  # noqa: E402
from workbook_builder.xlsx.package import PackageError, open_package  # noqa: E402

HEADER = ("case,mode.frequency,mode.modal_mass [t],mode.structural_damping [%],"
          "wind.acceleration [milli-g],wind.acceleration_limit [milli-g],damper.mass_ratio,"
          "damper.clearance\n")

#: Runs ``swaytune ARGS`` in this child and reports its peak resident memory (ru_maxrss, KiB).
CHILD = """
import json, resource, sys, time
sys.path.insert(0, sys.argv[1])
from workbook_builder.launch import main
t0 = time.perf_counter()
status = main(sys.argv[2:])
seconds = time.perf_counter() - t0
print(json.dumps({"status": status, "seconds": seconds,
                  "maxrss_mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024}),
      file=sys.stderr)
"""


def case_table(path: Path, rows: int) -> Path:
    """An invented table of ``rows`` towers, frequency and damping varied."""
    lines = [f"tower {k:05d},{0.15 + 0.1 * (k % 50) / 50:.4f},{8000 + 40 * (k % 100)},"
             f"{0.8 + 0.01 * (k % 40):.2f},25,15,{0.015 + 0.0002 * (k % 30):.4f},1.5\n"
             for k in range(rows)]
    path.write_text(HEADER + "".join(lines), encoding="utf-8")
    return path


def build_table(folder: Path, rows: int) -> dict:
    src = case_table(folder / f"cases_{rows}.csv", rows)
    proc = subprocess.run([sys.executable, "-c", CHILD, str(ROOT), "build", str(src), "-o",
                           str(folder / f"out_{rows}"), "--no-progress"],
                          capture_output=True, text=True, timeout=6 * 3600)
    figures = json.loads(proc.stderr.strip().splitlines()[-1])
    assert figures["status"] == 0, proc.stderr[-2000:]
    written = len(list((folder / f"out_{rows}").glob("*.xlsx")))
    assert written == rows, (written, rows)
    figures["rate"] = rows / figures["seconds"]
    return figures


def _zip(path: Path, members: dict[str, bytes]) -> Path:
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as zf:
        for name, data in members.items():
            zf.writestr(name, data)
    return path


def _measure(call) -> tuple[str, float, float]:
    """Outcome, seconds and peak Python memory (MB, tracemalloc) of ``call()``."""
    tracemalloc.start()
    t0 = time.perf_counter()
    try:
        call()
        outcome = "read"
    except PackageError as exc:
        outcome = f"refused ({str(exc)[:70]}...)"
    seconds = time.perf_counter() - t0
    peak = tracemalloc.get_traced_memory()[1] / 1e6
    tracemalloc.stop()
    return outcome, seconds, peak


def bomb_figures(folder: Path) -> None:
    example = ROOT / "example_workbooks" / "residential_tower.xlsx"
    good = _measure(lambda: open_package(example))
    with zipfile.ZipFile(example) as zf:
        members = {i.filename: zf.read(i) for i in zf.infolist()}
    members.update({f"docProps/f{k}.bin": b"\0" * 999_999 for k in range(250)})
    bomb = _zip(folder / "bomb.xlsx", members)
    bad = _measure(lambda: open_package(bomb))
    with zipfile.ZipFile(bomb) as zf:
        total = sum(i.file_size for i in zf.infolist())
    print(f"\n2. zip bomb: {bomb.stat().st_size / 1e3:.0f} KB file, {total / 1e6:.0f} MB "
          "uncompressed, 250 members each under 1 MB")
    print(f"   real workbook ({example.name}): {good[0]}, {good[1] * 1e3:.1f} ms, "
          f"peak {good[2]:.1f} MB")
    print(f"   bomb:  {bad[0]}")
    print(f"          {bad[1] * 1e3:.1f} ms, peak {bad[2]:.2f} MB  -> time ratio "
          f"{bad[1] / good[1]:.2f}, memory ratio {bad[2] / max(good[2], 1e-9):.3f} "
          "(target: refused, well below 1)")


def encoding_figures(folder: Path) -> None:
    strings = ('<?xml version="1.0" encoding="{enc}"?><!DOCTYPE sst [<!ENTITY e "INJECTED">]>'
               '<sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" count="1" '
               'uniqueCount="1"><si><t>&e;</t></si></sst>')
    example = ROOT / "example_workbooks" / "residential_tower.xlsx"
    with zipfile.ZipFile(example) as zf:
        members = {i.filename: zf.read(i) for i in zf.infolist()}
    print("\n3. parts not encoded as UTF-8, DTDs and member count (target: every one refused)")
    for codec, declared in (("utf-16", "UTF-16"), ("utf-16-le", "UTF-16"),
                            ("utf-32", "UTF-32"), ("iso-8859-1", "ISO-8859-1"),
                            ("utf-8", "UTF-8")):
        parts = dict(members)
        parts["xl/sharedStrings.xml"] = strings.format(enc=declared).encode(codec)
        path = _zip(folder / f"enc_{codec}.xlsx", parts)
        outcome, seconds, _ = _measure(lambda: open_package(path))
        print(f"   DTD + entity in {codec:<10}: {outcome} {seconds * 1e3:.1f} ms")
    parts = dict(members)
    parts.update({f"docProps/m{k}": b"" for k in range(package.MAX_MEMBERS)})
    path = _zip(folder / "members.xlsx", parts)
    outcome, seconds, _ = _measure(lambda: open_package(path))
    print(f"   {len(parts)} members: {outcome} {seconds * 1e3:.1f} ms")


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("rows", nargs="?", type=int, default=120)
    args = parser.parse_args(argv)
    with tempfile.TemporaryDirectory(prefix="swaytune-limits-") as tmp:
        folder = Path(tmp)
        short = build_table(folder, max(args.rows // 4, 1))
        long = build_table(folder, args.rows)
        print(f"1. case-table build, {args.rows // 4} rows (reference) and {args.rows} rows, "
              "one process each")
        print(f"   peak memory {short['maxrss_mb']:.0f} MB -> {long['maxrss_mb']:.0f} MB "
              f"(ratio {long['maxrss_mb'] / short['maxrss_mb']:.2f}; target: flat, < 300 MB)")
        print(f"   throughput  {short['rate']:.2f} -> {long['rate']:.2f} workbooks/s "
              f"(ratio {long['rate'] / short['rate']:.2f}; target: does not fall)")
        bomb_figures(folder)
        encoding_figures(folder)
    return 0


if __name__ == "__main__":
    sys.exit(main())
