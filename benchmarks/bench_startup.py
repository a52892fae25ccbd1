# SPDX-License-Identifier: MIT
"""Start-up of the ``swaytune`` command, end to end, against a bare Python start in the same run.

Times (best of ``--repeat`` runs, each a new process):

* ``python -c pass`` and ``python -c "import numpy"`` (references: what any command pays);
* ``swaytune --version`` and ``swaytune --help`` (target <= 0.3 s: no engine import);
* ``swaytune recalc ONE.xlsx -o OUT`` for a workbook without the time-domain check (target
  <= 0.6 s end to end) and for one with it (reported: the simulation of a 600 s record and
  scipy's integration modules come on top).

Run: ``python benchmarks/bench_startup.py [--repeat 5]``.
"""
from __future__ import annotations

import argparse
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from workbook_builder.build import write_workbook  # noqa: E402
from workbook_builder.project import load_project  # noqa: E402


def best(cmd: list[str], repeat: int, cwd: Path, fresh=None) -> float:
    """The shortest wall time of ``repeat`` runs of ``cmd`` [s] (``fresh()`` before each)."""
    times = []
    for _ in range(repeat):
        if fresh is not None:
            fresh()
        t0 = time.perf_counter()
        subprocess.run(cmd, cwd=cwd, check=True, stdout=subprocess.DEVNULL,
                       stderr=subprocess.DEVNULL)
        times.append(time.perf_counter() - t0)
    return min(times)


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--repeat", type=int, default=5, help="runs of each command (best kept)")
    args = ap.parse_args(argv)
    py = sys.executable
    swaytune = [py, "-m", "workbook_builder"]
    work = Path(tempfile.mkdtemp(prefix="swaytune-startup-"))
    ok = True
    try:
        design_only = work / "office_tower_us.xlsx"
        write_workbook(load_project(ROOT / "example_workbooks" / "office_tower_us.toml"),
                       design_only)
        simulated = work / "residential_tower.xlsx"
        write_workbook(load_project(ROOT / "example_workbooks" / "residential_tower.toml"),
                       simulated)
        out = work / "out"

        def fresh():
            shutil.rmtree(out, ignore_errors=True)

        ref = best([py, "-c", "pass"], args.repeat, work)
        ref_np = best([py, "-c", "import numpy"], args.repeat, work)
        print(f"python -c pass:                 {ref:6.3f} s (reference)")
        print(f"python -c 'import numpy':       {ref_np:6.3f} s (reference)")
        rows = [("swaytune --version", swaytune + ["--version"], 0.3, None),
                ("swaytune --help", swaytune + ["--help"], 0.3, None),
                ("recalc one workbook", swaytune + ["recalc", str(design_only), "-o",
                                                    str(out), "--no-progress"], 0.6, fresh),
                ("recalc one, time-domain check", swaytune + [
                    "recalc", str(simulated), "-o", str(out), "--no-progress"], None, fresh)]
        for label, cmd, target, before in rows:
            t = best(cmd, args.repeat, work, before)
            verdict = "" if target is None else (
                f"   target <= {target:g} s: {'met' if t <= target else 'NOT met'}")
            ok &= target is None or t <= target
            print(f"{label + ':':<32}{t:6.3f} s ({t / ref:5.1f}x a bare python start){verdict}")
        return 0 if ok else 1
    finally:
        shutil.rmtree(work, ignore_errors=True)


if __name__ == "__main__":
    sys.exit(main())
