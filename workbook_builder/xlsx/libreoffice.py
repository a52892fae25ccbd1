# SPDX-License-Identifier: MIT
"""LibreOffice headless: recalculation, PDF export, reading values back and error scan.

Every conversion runs ``soffice --headless --convert-to ...`` with

* a private, throw-away user profile per run (``-env:UserInstallation=file:///tmp/...``), so
  runs never share state, never touch the user's own profile and may run side by side;
* ``OOXMLRecalcMode`` (and ``ODFRecalcMode``) written into that profile's
  ``registrymodifications.xcu`` before the first start: ``0`` (always recalculate on load, the
  default here) makes LibreOffice recompute every formula instead of trusting cached values;
  ``1`` (never) keeps the cached values, which is how a viewer that does not recalculate sees
  the file; macros are disabled (MacroSecurityLevel 3);
* a fresh, separate output directory, a timeout that kills the whole process group, and a check
  that the output file exists (``soffice`` exits with status 0 even when the conversion failed).

Spreadsheet error codes differ between applications (LibreOffice shows ``Err:502`` where Excel shows
``#NUM!``; saved to .xlsx, LibreOffice maps most to Excel codes). :func:`find_error_cells` therefore
answers "is this an error", not "which one".
"""
from __future__ import annotations

import os
import re
import shutil
import signal
import subprocess
import tempfile
from pathlib import Path
from typing import Any, Iterable

from openpyxl import load_workbook

from .cached import formula_cells
from .files import atomic_path

__all__ = [
    "OfficeError",
    "find_soffice",
    "find_program",
    "run_program",
    "recalculate",
    "export_pdf",
    "convert",
    "convert_many",
    "read_values",
    "find_error_cells",
    "is_error_value",
    "ERROR_CODES",
]

#: Error codes a spreadsheet application may store in a cell (Excel, LibreOffice, Google Sheets).
ERROR_CODES = frozenset({
    "#NULL!", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!", "#N/A", "#GETTING_DATA",
    "#SPILL!", "#CALC!", "#FIELD!", "#BLOCKED!", "#CONNECT!", "#BUSY!", "#UNKNOWN!", "#ERROR!",
})
_ERROR_PATTERN = re.compile(r"^(?:Err:\d{3}|#[A-Z0-9/_]+[!?]|#N/A)$")

#: Recalculation modes understood by LibreOffice's Formula/Load settings.
_RECALC_MODES = {"always": 0, "never": 1}

_XCU_TEMPLATE = """<?xml version="1.0" encoding="UTF-8"?>
<oor:items xmlns:oor="http://openoffice.org/2001/registry" \
xmlns:xs="http://www.w3.org/2001/XMLSchema" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance">
<item oor:path="/org.openoffice.Office.Calc/Formula/Load"><prop oor:name="OOXMLRecalcMode" \
oor:op="fuse"><value>{mode}</value></prop></item>
<item oor:path="/org.openoffice.Office.Calc/Formula/Load"><prop oor:name="ODFRecalcMode" \
oor:op="fuse"><value>{mode}</value></prop></item>
<item oor:path="/org.openoffice.Office.Common/Misc"><prop oor:name="FirstRun" \
oor:op="fuse"><value>false</value></prop></item>
<item oor:path="/org.openoffice.Office.Common/Security/Scripting">\
<prop oor:name="MacroSecurityLevel" oor:op="fuse"><value>3</value></prop></item>
</oor:items>
"""


class OfficeError(RuntimeError):
    """LibreOffice is missing, timed out, or did not produce the expected output file."""


def find_program(variable: str, names: tuple[str, ...], candidates: list[str]) -> str | None:
    """The path of an external program, or None: the environment variable ``variable`` first,
    then each of ``names`` on ``PATH``, then the usual install locations ``candidates``."""
    env = os.environ.get(variable)
    if env and Path(env).is_file() and os.access(env, os.X_OK):
        return str(Path(env))
    for name in names:
        found = shutil.which(name)
        if found:
            return found
    for cand in candidates:
        if Path(cand).is_file() and os.access(cand, os.X_OK):
            return cand
    return None


def find_soffice() -> str | None:
    """Return the path of the LibreOffice ``soffice`` program, or None.

    Looks at the ``SWAYTUNE_SOFFICE`` environment variable first, then ``soffice`` and
    ``libreoffice`` on ``PATH``, then the usual install locations on Linux, macOS and Windows.
    """
    candidates = [
        "/usr/lib/libreoffice/program/soffice",
        "/opt/libreoffice/program/soffice",
        "/Applications/LibreOffice.app/Contents/MacOS/soffice",
        r"C:\Program Files\LibreOffice\program\soffice.exe",
        r"C:\Program Files (x86)\LibreOffice\program\soffice.exe",
    ]
    candidates += sorted(str(p) for p in Path("/opt").glob("libreoffice*/program/soffice"))
    return find_program("SWAYTUNE_SOFFICE", ("soffice", "libreoffice"), candidates)


def _write_profile(profile: Path, recalc: str) -> None:
    """Create a private LibreOffice user profile with the recalculation mode set."""
    user = profile / "user"
    user.mkdir(parents=True, exist_ok=True)
    (user / "registrymodifications.xcu").write_text(
        _XCU_TEMPLATE.format(mode=_RECALC_MODES[recalc]), encoding="utf-8")


def run_program(cmd: list[str], timeout: float, env: dict[str, str], *,
                error: type[Exception] = OfficeError,
                program: str = "LibreOffice") -> subprocess.CompletedProcess:
    """Run ``cmd`` in its own process group; kill the whole group on timeout and raise
    ``error`` naming ``program``."""
    proc = subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=subprocess.PIPE, env=env,
                            start_new_session=True, text=True, errors="replace")
    try:
        out, err = proc.communicate(timeout=timeout)
    except subprocess.TimeoutExpired:
        try:
            os.killpg(proc.pid, signal.SIGKILL)
        except (ProcessLookupError, PermissionError):
            proc.kill()
        proc.communicate()
        raise error(f"{program} did not finish within {timeout:g} s: "
                    f"{' '.join(cmd)}") from None
    return subprocess.CompletedProcess(cmd, proc.returncode, out, err)


def convert(path: str | os.PathLike, outdir: str | os.PathLike, target: str = "xlsx", *,
            timeout: float = 180, recalc: str = "always", soffice: str | None = None) -> Path:
    """Convert ``path`` with LibreOffice headless into ``outdir``; return the output path.

    ``target`` is the ``--convert-to`` argument (``"xlsx"``, ``"pdf"``, ``"ods"`` or with a filter,
    e.g. ``"xlsx:Calc MS Excel 2007 XML"``); ``recalc`` is ``"always"`` (``OOXMLRecalcMode=0``) or
    ``"never"`` (keep cached values). The output is ``outdir / (stem + "." + extension)`` and
    replaces an older file of that name atomically.

    Raises
    ------
    FileNotFoundError
        When ``path`` does not exist.
    ValueError
        When ``outdir`` is the input's own directory and the extension would overwrite the input,
        or ``recalc`` is unknown.
    OfficeError
        When soffice is not installed, times out, or produces no output file.
    """
    return convert_many([path], outdir, target, timeout=timeout, recalc=recalc,
                        soffice=soffice)[0]


def convert_many(paths: Iterable[str | os.PathLike], outdir: str | os.PathLike,
                 target: str = "xlsx", *, timeout: float = 180, recalc: str = "always",
                 soffice: str | None = None) -> list[Path]:
    """Convert many files in ONE LibreOffice process; return the outputs in input order.

    Same settings as :func:`convert` (private profile, recalculation mode, separate output
    folder, timeout for the whole batch, a check that every output exists); starting soffice
    once instead of once per file saves its start-up time (seconds) on every file. Each output
    ``outdir / (stem + "." + extension)`` replaces an older file of that name atomically; when
    any file fails, nothing is moved into ``outdir``.

    Raises
    ------
    FileNotFoundError
        When an input does not exist.
    ValueError
        When no file is given, two inputs share a stem (their outputs would collide), an
        output would overwrite its input, or ``recalc`` is unknown.
    OfficeError
        When soffice is not installed, times out, or produces no output for some file (named).
    """
    srcs = [Path(p).resolve() for p in paths]
    if not srcs:
        raise ValueError("paths is empty: give at least one file to convert")
    for src in srcs:
        if not src.is_file():
            raise FileNotFoundError(f"workbook to convert not found: {src}")
    if recalc not in _RECALC_MODES:
        raise ValueError(f"recalc={recalc!r} must be one of {sorted(_RECALC_MODES)}")
    ext = target.split(":", 1)[0].lower()
    out_dir = Path(outdir).resolve()
    dests = [out_dir / f"{src.stem}.{ext}" for src in srcs]
    if len(set(dests)) != len(dests):
        seen: set[Path] = set()
        dup = next(d for d in dests if d in seen or seen.add(d))
        raise ValueError(f"two inputs would both be converted to {dup.name}; convert them "
                         "into separate folders")
    for src, dest in zip(srcs, dests):
        if dest == src:
            raise ValueError(f"outdir={str(out_dir)!r} would overwrite the input {src.name}; "
                             "use a separate output directory")
    exe = soffice or find_soffice()
    if exe is None:
        raise OfficeError("LibreOffice (soffice) not found; install it (e.g. 'apt-get install -y "
                          "libreoffice-calc-nogui') or set SWAYTUNE_SOFFICE")
    out_dir.mkdir(parents=True, exist_ok=True)
    with tempfile.TemporaryDirectory(prefix="swaytune-lo-") as tmp:
        tmp_path = Path(tmp)
        profile = tmp_path / "profile"
        _write_profile(profile, recalc)
        work_out = tmp_path / "out"
        work_out.mkdir()
        cmd = [exe, f"-env:UserInstallation={profile.as_uri()}", "--headless", "--norestore",
               "--nologo", "--nodefault", "--nolockcheck", "--convert-to", target,
               "--outdir", str(work_out)] + [str(src) for src in srcs]
        env = dict(os.environ)
        env.setdefault("SAL_USE_VCLPLUGIN", "svp")
        result = run_program(cmd, timeout, env)
        missing = [src.name for src, dest in zip(srcs, dests)
                   if not (work_out / dest.name).is_file()
                   or (work_out / dest.name).stat().st_size == 0]
        if missing:
            detail = (result.stderr.strip() or result.stdout.strip() or "no message")[-2000:]
            shown = ", ".join(missing[:5]) + (" ..." if len(missing) > 5 else "")
            raise OfficeError(f"LibreOffice produced no {ext} file from {shown} "
                              f"(exit status {result.returncode}): {detail}")
        # Move into place atomically (temporary file next to the destination, then os.replace).
        for dest in dests:
            with atomic_path(dest) as staging:
                shutil.copyfile(work_out / dest.name, staging)
    return dests


def recalculate(path: str | os.PathLike, outdir: str | os.PathLike, timeout: float = 180, *,
                recalc: str = "always", soffice: str | None = None) -> Path:
    """Recalculate a workbook in LibreOffice headless; return the new .xlsx path.

    Every formula is recomputed on load (``OOXMLRecalcMode=0`` in a private profile) and the result
    is saved as ``outdir / <stem>.xlsx``. Read the recalculated values with :func:`read_values` and
    look for errors with :func:`find_error_cells`. ``recalc="never"`` keeps the cached values
    instead (useful to check what a viewer that does not recalculate shows).

    Raises
    ------
    FileNotFoundError, ValueError, OfficeError
        See :func:`convert`.
    """
    return convert(path, outdir, "xlsx:Calc MS Excel 2007 XML", timeout=timeout, recalc=recalc,
                   soffice=soffice)


def export_pdf(path: str | os.PathLike, outdir: str | os.PathLike, timeout: float = 180, *,
               recalc: str = "always", soffice: str | None = None) -> Path:
    """Export a workbook to PDF through LibreOffice headless; return the PDF path.

    Formulas are recalculated first. Page size, orientation, print areas, repeated title rows and
    fit-to-width come from the workbook itself (see
    :func:`workbook_builder.xlsx.page_setup.set_print_layout`).

    Raises
    ------
    FileNotFoundError, ValueError, OfficeError
        See :func:`convert`.
    """
    return convert(path, outdir, "pdf:calc_pdf_Export", timeout=timeout, recalc=recalc,
                   soffice=soffice)


def is_error_value(value: Any, data_type: str | None = None) -> bool:
    """True when a cell value read back is a spreadsheet error (``#VALUE!``, ``Err:502``, ...)."""
    if data_type == "e":
        return True
    return isinstance(value, str) and bool(_ERROR_PATTERN.match(value.strip()))


def read_values(path: str | os.PathLike) -> dict[tuple[str, str], Any]:
    """Read the stored (cached or recalculated) values of every non-empty cell.

    Returns a dict ``(sheet title, "A1") -> value`` read with openpyxl ``data_only=True``; formula
    cells without a cached value read as None and are included.
    """
    wb = load_workbook(path, data_only=True)
    try:
        out: dict[tuple[str, str], Any] = {}
        formulas = formula_cells(path)
        for ws in wb.worksheets:
            for row in ws.iter_rows():
                for cell in row:
                    if cell.value is not None or (ws.title, cell.coordinate) in formulas:
                        out[(ws.title, cell.coordinate)] = cell.value
        return out
    finally:
        wb.close()


def find_error_cells(path: str | os.PathLike, *, include_text: bool = True,
                     sheets: Iterable[str] | None = None) -> list[tuple[str, str, str]]:
    """List cells whose stored value is a spreadsheet error, as (sheet, cell, shown value).

    Reads the file with openpyxl ``data_only=True`` (so run it on a recalculated copy, see
    :func:`recalculate`). Cells typed as errors always count; with ``include_text`` a text cell
    that reads exactly like an error code (``#NAME?``, ``Err:502``) counts too, because some
    applications store errors that way. Order: sheet order, then row by row.
    """
    wanted = None if sheets is None else set(sheets)
    wb = load_workbook(path, data_only=True)
    try:
        found = []
        for ws in wb.worksheets:
            if wanted is not None and ws.title not in wanted:
                continue
            for row in ws.iter_rows():
                for cell in row:
                    if cell.value is None:
                        continue
                    if cell.data_type == "e" or (include_text and is_error_value(cell.value)):
                        found.append((ws.title, cell.coordinate, str(cell.value)))
        return found
    finally:
        wb.close()
