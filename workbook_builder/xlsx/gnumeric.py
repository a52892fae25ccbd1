# SPDX-License-Identifier: MIT
"""Gnumeric's ``ssconvert``: recalculation by a second spreadsheet application.

:func:`recalculate` runs ``ssconvert --recalc in.xlsx out.xlsx`` (every formula recomputed
after loading, the result saved as .xlsx) with

* a private, throw-away home directory per run (``HOME``, and the XDG configuration, data and
  cache directories inside it; GSettings kept in memory), so runs never read or change the
  user's own settings and may run side by side;
* the .xlsx importer named (``--import-type=Gnumeric_Excel:xlsx``), so a file that is not an
  .xlsx package is refused instead of being read as text;
* a fresh, separate output directory, a timeout that kills the whole process group, and a check
  that the output file exists (not every failed save ends with a non-zero exit status).

Read the recalculated values with :func:`workbook_builder.xlsx.libreoffice.read_values` and look
for errors with :func:`workbook_builder.xlsx.libreoffice.find_error_cells` (both read any .xlsx
with openpyxl). ``ssconvert`` comes with Gnumeric (Debian and Ubuntu package ``gnumeric``).
"""
from __future__ import annotations

import os
import shutil
import tempfile
from pathlib import Path

from .files import atomic_path
from .libreoffice import find_program, run_program

__all__ = ["GnumericError", "find_ssconvert", "recalculate"]

#: Importer of ``ssconvert`` for .xlsx packages (``ssconvert --list-importers``).
XLSX_IMPORTER = "Gnumeric_Excel:xlsx"


class GnumericError(RuntimeError):
    """ssconvert is missing, failed, timed out, or did not produce the expected output file."""


def find_ssconvert() -> str | None:
    """Return the path of Gnumeric's ``ssconvert`` program, or None.

    Looks at the ``SWAYTUNE_SSCONVERT`` environment variable first, then ``ssconvert`` on
    ``PATH``, then the usual install locations on Linux and macOS.
    """
    return find_program("SWAYTUNE_SSCONVERT", ("ssconvert",),
                        ["/usr/bin/ssconvert", "/usr/local/bin/ssconvert",
                         "/opt/homebrew/bin/ssconvert", "/opt/local/bin/ssconvert"])


def _private_env(home: Path) -> dict[str, str]:
    """The caller's environment with a private home directory and in-memory settings."""
    env = dict(os.environ)
    env["HOME"] = str(home)
    env["XDG_CONFIG_HOME"] = str(home / ".config")
    env["XDG_DATA_HOME"] = str(home / ".local" / "share")
    env["XDG_CACHE_HOME"] = str(home / ".cache")
    env["GSETTINGS_BACKEND"] = "memory"
    return env


def recalculate(path: str | os.PathLike, outdir: str | os.PathLike, timeout: float = 180, *,
                ssconvert: str | None = None) -> Path:
    """Recalculate a workbook with Gnumeric's ssconvert; return the new .xlsx path.

    Every formula is recomputed after loading (``ssconvert --recalc``) and the result is saved
    as ``outdir / <stem>.xlsx``, replacing an older file of that name atomically. ``timeout``
    [s] covers the whole run; ``ssconvert`` overrides :func:`find_ssconvert`.

    Raises
    ------
    FileNotFoundError
        When ``path`` does not exist.
    ValueError
        When the output would overwrite the input (``outdir`` is the input's own directory).
    GnumericError
        When ssconvert is not installed, exits with an error, times out, or produces no
        output file; the message holds the end of its error output.
    """
    src = Path(path).resolve()
    if not src.is_file():
        raise FileNotFoundError(f"workbook to recalculate not found: {src}")
    out_dir = Path(outdir).resolve()
    dest = out_dir / f"{src.stem}.xlsx"
    if dest == src:
        raise ValueError(f"outdir={str(out_dir)!r} would overwrite the input {src.name}; "
                         "use a separate output directory")
    exe = ssconvert or find_ssconvert()
    if exe is None:
        raise GnumericError("Gnumeric (ssconvert) not found; install it (e.g. 'apt-get install "
                            "-y gnumeric') or set SWAYTUNE_SSCONVERT")
    out_dir.mkdir(parents=True, exist_ok=True)
    with tempfile.TemporaryDirectory(prefix="swaytune-gnumeric-") as tmp:
        tmp_path = Path(tmp)
        home = tmp_path / "home"
        home.mkdir()
        work_out = tmp_path / "out"
        work_out.mkdir()
        produced = work_out / dest.name
        cmd = [exe, f"--import-type={XLSX_IMPORTER}", "--recalc", str(src), str(produced)]
        result = run_program(cmd, timeout, _private_env(home), error=GnumericError,
                             program="Gnumeric (ssconvert)")
        detail = (result.stderr.strip() or result.stdout.strip() or "no message")[-2000:]
        if result.returncode != 0:
            raise GnumericError(f"Gnumeric (ssconvert) failed on {src.name} (exit status "
                                f"{result.returncode}): {detail}")
        if not produced.is_file() or produced.stat().st_size == 0:
            raise GnumericError(f"Gnumeric (ssconvert) produced no xlsx file from {src.name} "
                                f"(exit status {result.returncode}): {detail}")
        with atomic_path(dest) as staging:
            shutil.copyfile(produced, staging)
    return dest
