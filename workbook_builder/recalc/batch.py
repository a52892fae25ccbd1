# SPDX-License-Identifier: MIT
"""Recalculating a batch of workbooks: folders scanned, worker processes, a summary.

:func:`recalc_many` expands files and folders (:func:`collect_paths`), recalculates each
workbook (:func:`workbook_builder.recalc.workbook.recalc_workbook`, in this process or in
worker processes), shows a progress bar on stderr and writes the batch summary
(:mod:`workbook_builder.recalc.summary`). A file that fails fails alone; Ctrl-C stops handing
out work and lets the running workers finish their atomic writes.
"""
from __future__ import annotations

import concurrent.futures as cf
import ctypes
import ctypes.util
import gc
import math
import multiprocessing as mp
import os
import signal
import sys
import time
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Iterable, Mapping

from ..progress import Progress
from .summary import SUMMARY_STEM, guard_summary, summary_row, write_summary
from .inputs import parse_overrides
from .workbook import RecalcResult, _same_file, recalc_workbook

__all__ = ["BatchSummary", "collect_paths", "recalc_many", "summary_base"]


@dataclass
class BatchSummary:
    """Outcome of a batch: one :class:`RecalcResult` per input, in input order."""

    results: list[RecalcResult]
    summary_xlsx: Path | None = None
    summary_csv: Path | None = None
    interrupted: bool = False
    seconds: float = 0.0

    @property
    def failed(self) -> list[RecalcResult]:
        return [r for r in self.results if r.failed]

    @property
    def not_ok(self) -> list[RecalcResult]:
        return [r for r in self.results if r.status == "NOT OK"]

    @property
    def edited(self) -> list[RecalcResult]:
        return [r for r in self.results if r.status == "EDITED"]

    @property
    def us(self) -> bool:
        """Whether every workbook read shows US customary units (the summary's units)."""
        units = [r.units for r in self.results if r.units]
        return bool(units) and all(u == "US" for u in units)

    @property
    def exit_status(self) -> int:
        """0 when every workbook is OK; 1 when one is NOT OK, EDITED or FAILED (130: Ctrl-C)."""
        if self.interrupted:
            return 130
        return 0 if all(r.status == "OK" for r in self.results) else 1

    def table(self) -> list[dict]:
        """One flat row per workbook (the CSV rows), for a notebook or a DataFrame."""
        return [summary_row(r, self.us) for r in self.results]


def collect_paths(paths: Iterable[str | os.PathLike],
                  exclude: str | os.PathLike | None = None) -> list[tuple[Path, Path]]:
    """Expand files and folders into (workbook, path relative to its root) pairs.

    Folders are searched recursively for ``*.xlsx`` and ``*.xlsm``; hidden files, spreadsheet lock files
    (``~$*``), temporary files, batch summaries (``recalc_summary*``) and anything under
    ``exclude`` (the output folder) are skipped. Files named explicitly are always taken (so a
    wrong file fails with its reason).
    """
    out: list[tuple[Path, Path]] = []
    seen: set[Path] = set()
    skip = Path(exclude).resolve() if exclude is not None else None
    for p in paths:
        p = Path(p)
        if p.is_dir():
            for f in sorted(p.rglob("*")):
                if not f.is_file() or f.suffix.lower() not in (".xlsx", ".xlsm"):
                    continue
                if skip is not None and skip in f.resolve().parents:
                    continue
                rel = f.relative_to(p)
                if any(part.startswith((".", "~$")) for part in rel.parts):
                    continue
                if f.name.startswith(SUMMARY_STEM):
                    continue
                key = f.resolve()
                if key not in seen:
                    seen.add(key)
                    out.append((f, rel))
        else:
            key = p.resolve() if p.exists() else p
            if key not in seen:
                seen.add(key)
                out.append((p, Path(p.name)))
    return out


def _worker_init(parent: int) -> None:
    # Workers ignore Ctrl-C: the parent stops handing out work and lets the running ones
    # finish their (atomic) writes.
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    # A worker must not outlive a parent killed outright (kill -9): on Linux the kernel sends
    # it SIGTERM when the parent dies (prctl PR_SET_PDEATHSIG); elsewhere it ends when its
    # task queue is closed.
    if sys.platform.startswith("linux"):
        try:
            libc = ctypes.CDLL(ctypes.util.find_library("c") or "libc.so.6", use_errno=True)
            libc.prctl(1, signal.SIGTERM, 0, 0, 0)          # 1 = PR_SET_PDEATHSIG
        except (OSError, AttributeError):
            pass
        if os.getppid() != parent:                           # died before prctl took hold
            os._exit(1)


def _task(args) -> RecalcResult:
    path, output, in_place, backup, keep, compare, force, inputs = args   # output None in place
    res = recalc_workbook(path, output=output, in_place=in_place, backup=backup,
                          keep_backups=keep, compare_layout=compare, force=force, inputs=inputs)
    res.design = None           # the engine's result stays in the worker (less to send back)
    return res


def _tasks_of(chunk: list) -> list[RecalcResult]:
    return [_task(args) for args in chunk]


def summary_base(paths: list, outdir: str | os.PathLike | None,
                 summary: str | os.PathLike | None) -> Path:
    """Where the summary goes: ``summary``, else in the output folder, else next to the
    workbooks (the first folder given, or the folder of the first file)."""
    if summary is not None:
        return Path(summary)
    if outdir is not None:
        return Path(outdir) / SUMMARY_STEM
    first = Path(paths[0]) if paths else Path.cwd()
    return (first if first.is_dir() else first.parent) / SUMMARY_STEM


def recalc_many(paths: Iterable[str | os.PathLike], outdir: str | os.PathLike | None = None,
                jobs: int = 1, progress: bool = True, *, in_place: bool = False,
                backup: bool = True, keep_backups: bool = False,
                summary: str | os.PathLike | None = None, compare_layout: bool = True,
                force: bool = False, inputs: Mapping[str, Any] | None = None,
                executor: cf.Executor | None = None) -> BatchSummary:
    """Recalculate many workbooks (files and folders); write a summary workbook and CSV.

    Parameters
    ----------
    paths : iterable of path-like
        Workbooks and folders (searched recursively for .xlsx and .xlsm) [-].
    outdir : path-like, optional
        Output folder; a workbook found in a folder keeps its relative path under it [-].
    jobs : int, optional
        Worker processes on this machine (1: in this process) [-].
    progress : bool, optional
        Show a progress bar on stderr [-].
    in_place : bool, optional
        Replace each workbook itself (atomically; only when its content changes) [-].
    backup : bool, optional
        Keep the original as ``<name>.bak`` beside each workbook replaced in place [-].
    keep_backups : bool, optional
        Keep every backup (``<name>.<time>.bak``) instead of one per workbook [-].
    summary : path-like, optional
        Path of the summary without extension (default ``OUTDIR/recalc_summary``, or next to
        the workbooks in place); ``.xlsx`` and ``.csv`` are written [-].
    compare_layout : bool, optional
        Compare formulas with the builder's (hand edits) [-].
    force : bool, optional
        Overwrite outputs that swaytune did not make [-].
    inputs : mapping, optional
        Input overrides for every workbook, as :func:`recalc_workbook` takes them (numbers in
        SI, ``{"value", "unit"}``, ``"25 milli-g"``, a tuning method) [-].
    executor : concurrent.futures.Executor, optional
        Run the workbooks on this executor instead (a process pool, a cluster's executor);
        ``jobs`` is then not used. The paths must be reachable from its workers [-].

    Returns
    -------
    summary : BatchSummary
        One result per workbook in input order, summary paths, exit status [-].

    Raises
    ------
    ValueError
        When neither ``outdir`` nor ``in_place`` is given, both are, ``jobs`` < 1, the
        output folder is a file, or an override is invalid (naming it, its value and range).
    OverwriteRefused
        When a file named like the summary exists and is not an earlier summary (unless
        ``force``); checked before any workbook is recalculated.
    """
    t0 = time.perf_counter()
    if in_place == (outdir is not None):
        raise ValueError("give an output folder (outdir) or in_place=True, not both or neither")
    if int(jobs) < 1:
        raise ValueError(f"jobs={jobs!r} must be >= 1")
    if outdir is not None and Path(outdir).exists() and not Path(outdir).is_dir():
        raise ValueError(f"the output folder {outdir} is a file; give a folder")
    parse_overrides(inputs)                 # a bad override fails here, before any work
    raw_inputs = dict(inputs) if inputs else None
    paths = list(paths)
    if outdir is not None and any(Path(p).is_dir() and _same_file(Path(p), Path(outdir))
                                  for p in paths):
        raise ValueError(f"the output folder {outdir} is the folder being recalculated: "
                         "choose another folder, or --in-place")
    base = summary_base(paths, outdir, summary)
    guard_summary(base, force)              # before any work: never clobber the user's files
    items = collect_paths(paths, exclude=outdir)
    tasks = []
    planned: dict[Path, Path] = {}
    pre_failed: dict[int, RecalcResult] = {}
    for i, (src, rel) in enumerate(items):
        out = None if in_place else Path(outdir) / rel
        if out is not None:
            key = out.resolve()
            if key in planned:
                pre_failed[i] = RecalcResult(path=src, error=f"output {out} would also be "
                                             f"written for {planned[key]}; rename one of them")
                continue
            if _same_file(out, src):
                pre_failed[i] = RecalcResult(path=src, error="the output folder holds the "
                                             "original: choose another folder or --in-place")
                continue
            planned[key] = src
        tasks.append((i, (src, out, in_place, backup, keep_backups, compare_layout, force,
                          raw_inputs)))
    results: list[RecalcResult | None] = [None] * len(items)
    for i, r in pre_failed.items():
        results[i] = r
    bar = Progress(len(items), progress)
    for r in pre_failed.values():
        bar.update(r.path.name, r.status)
    interrupted = False
    try:
        with _StopOnCtrlC() as stop:
            if executor is not None:
                _run_executor(tasks, results, executor, bar, stop)
            elif int(jobs) == 1 or len(tasks) <= 1:
                for i, args in tasks:
                    if stop.requested:
                        break
                    results[i] = _task(args)
                    bar.update(results[i].path.name, results[i].status)
            else:
                _run_pool(tasks, results, int(jobs), bar, stop)
            interrupted = stop.requested
    except KeyboardInterrupt:               # a second Ctrl-C, or no handler (not the main
        interrupted = True                  # thread): the current write is atomic anyway
    if interrupted and progress:
        sys.stderr.write("\ninterrupted: files already written are complete, originals "
                         "untouched; the summary says what happened to each workbook\n")
    done = [r if r is not None else RecalcResult(path=items[i][0],
                                                  error="not recalculated (interrupted)")
            for i, r in enumerate(results)]
    batch = BatchSummary(done, interrupted=interrupted, seconds=time.perf_counter() - t0)
    batch.summary_xlsx, batch.summary_csv = write_summary(batch, base, force=force)
    batch.seconds = time.perf_counter() - t0
    return batch


class _StopOnCtrlC:
    """Ctrl-C during a batch: stop handing out work and let the workbooks under way finish
    (their writes are atomic), so the summary can say what happened to each; a second Ctrl-C
    stops at once. Outside the main thread Ctrl-C raises KeyboardInterrupt as usual."""

    def __init__(self) -> None:
        self.requested = False
        self.previous = None

    def __enter__(self) -> "_StopOnCtrlC":
        try:
            self.previous = signal.signal(signal.SIGINT, self._handler)
        except ValueError:                  # not the main thread
            self.previous = None
        return self

    def _handler(self, signum, frame) -> None:
        if self.requested:
            raise KeyboardInterrupt
        self.requested = True

    def __exit__(self, *exc) -> None:
        if self.previous is not None:
            signal.signal(signal.SIGINT, self.previous)


def _drain(pool: cf.Executor, tasks: list, results: list, bar: Progress, stop: _StopOnCtrlC,
           chunk: int) -> None:
    """Hand ``tasks`` to ``pool`` in chunks of ``chunk`` workbooks, filling ``results``."""
    chunks = [tasks[k:k + chunk] for k in range(0, len(tasks), chunk)]
    futures = {pool.submit(_tasks_of, [args for _, args in c]): c for c in chunks}
    pending = set(futures)
    while pending:
        done, pending = cf.wait(pending, timeout=0.2, return_when=cf.FIRST_COMPLETED)
        for fut in done:
            part = futures[fut]
            if fut.cancelled():
                continue
            try:
                out = fut.result()
            except Exception as exc:  # noqa: BLE001 - a worker died
                out = [RecalcResult(path=args[0], error=f"worker failed: {exc}")
                       for _, args in part]
            for (i, _), r in zip(part, out):
                results[i] = r
                bar.update(r.path.name, r.status)
        if stop.requested:              # hand out no more work; wait for the running
            for fut in pending:
                fut.cancel()
            pending = {f for f in pending if not f.cancelled()}


def _run_executor(tasks: list, results: list, executor: cf.Executor, bar: Progress,
                  stop: _StopOnCtrlC) -> None:
    """Recalculate ``tasks`` on a caller's executor (chunks of a few workbooks each)."""
    _drain(executor, tasks, results, bar, stop, chunk=max(1, min(8, len(tasks) // 16)))


def _run_pool(tasks: list, results: list, jobs: int, bar: Progress, stop: _StopOnCtrlC) -> None:
    """Recalculate ``tasks`` in ``jobs`` worker processes, filling ``results``.

    The first workbook is recalculated here before the workers start: forked workers then
    share its warm caches (imports, the plan, parsed parts) instead of each paying for them.
    Each worker takes a few chunks of workbooks (fewer round trips than one at a time).
    """
    (i, args), rest = tasks[0], tasks[1:]
    results[i] = _task(args)
    bar.update(results[i].path.name, results[i].status)
    if not rest or stop.requested:
        return
    ctx = mp.get_context("fork" if "fork" in mp.get_all_start_methods() else "spawn")
    # Objects alive now move to the collector's permanent generation: forked workers then
    # never walk (and so never copy) the pages they share with this process; measured on 80
    # workbooks, this halves the time each takes in a worker (benchmarks/bench_recalc.py).
    gc.collect()
    gc.freeze()
    try:
        with cf.ProcessPoolExecutor(max_workers=jobs, mp_context=ctx, initializer=_worker_init,
                                    initargs=(os.getpid(),)) as pool:
            _drain(pool, rest, results, bar, stop,
                   chunk=max(1, math.ceil(len(rest) / (4 * jobs))))
    finally:
        gc.unfreeze()
