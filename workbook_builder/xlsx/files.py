# SPDX-License-Identifier: MIT
"""Atomic file writes and a guard against overwriting workbooks swaytune did not make.

A workbook written by swaytune carries a custom document property ``SwaytuneGenerator`` (value
``"swaytune <version>"``) and, as a second marker that survives applications which drop custom
properties, a hidden workbook-scoped defined name ``SWAYTUNE_GENERATOR``. :func:`guard_overwrite`
refuses to replace an existing file that carries neither, unless ``force=True``: an engineer's own
hand-made workbook is never lost to a mistyped ``-o``.
"""
from __future__ import annotations

import contextlib
import os
import tempfile
import zipfile
from pathlib import Path
from typing import Any, Iterator

__all__ = [
    "MARKER_PROPERTY",
    "MARKER_NAME",
    "OverwriteRefused",
    "atomic_path",
    "mark_workbook",
    "is_swaytune_workbook",
    "guard_overwrite",
    "save_workbook",
    "new_file_mode",
]

MARKER_PROPERTY = "SwaytuneGenerator"
MARKER_NAME = "SWAYTUNE_GENERATOR"


class OverwriteRefused(FileExistsError):
    """The destination exists and was not produced by swaytune (use force to overwrite)."""


def new_file_mode(dest: str | os.PathLike) -> int:
    """Permission bits for ``dest``: those of the file it replaces, else 0o666 minus umask.

    :func:`tempfile.mkstemp` creates private (0o600) files; a workbook moved into place with
    :func:`os.replace` would keep that mode, so give it the mode a plain ``open()`` would.
    """
    try:
        return os.stat(dest).st_mode & 0o7777
    except OSError:
        mask = os.umask(0o022)
        os.umask(mask)
        return 0o666 & ~mask


@contextlib.contextmanager
def atomic_path(dest: str | os.PathLike) -> Iterator[Path]:
    """Yield a temporary path next to ``dest``; move it onto ``dest`` on success.

    The temporary file lives in the destination's directory so :func:`os.replace` is atomic: a
    reader sees either the old file or the complete new one, never half a file. On an exception
    the temporary file is removed and ``dest`` is left untouched. The new file gets the mode of
    the file it replaces, or the usual mode for a new file (see :func:`new_file_mode`).

    Examples
    --------
    >>> import tempfile, pathlib
    >>> d = pathlib.Path(tempfile.mkdtemp())
    >>> with atomic_path(d / "a.txt") as tmp:
    ...     _ = tmp.write_text("done")
    >>> (d / "a.txt").read_text()
    'done'
    """
    target = Path(dest)
    target.parent.mkdir(parents=True, exist_ok=True)
    fd, name = tempfile.mkstemp(prefix=f".{target.stem}-", suffix=target.suffix + ".tmp",
                                dir=target.parent)
    os.close(fd)
    tmp = Path(name)
    try:
        yield tmp
        os.chmod(tmp, new_file_mode(target))
        os.replace(tmp, target)
    except BaseException:
        tmp.unlink(missing_ok=True)
        raise


def mark_workbook(wb: Any, version: str) -> None:
    """Mark an openpyxl workbook as produced by swaytune ``version`` (both markers)."""
    from openpyxl.packaging.custom import StringProperty
    from openpyxl.workbook.defined_name import DefinedName

    text = f"swaytune {version}"
    props = wb.custom_doc_props
    for prop in list(props.props):
        if prop.name == MARKER_PROPERTY:
            props.props.remove(prop)
    props.append(StringProperty(name=MARKER_PROPERTY, value=text))
    if MARKER_NAME in wb.defined_names:
        del wb.defined_names[MARKER_NAME]
    wb.defined_names.add(DefinedName(MARKER_NAME, attr_text=f'"{text}"', hidden=True))


def is_swaytune_workbook(path: str | os.PathLike) -> bool:
    """True when the file at ``path`` is an .xlsx package carrying a swaytune marker."""
    try:
        with zipfile.ZipFile(path) as zf:
            names = set(zf.namelist())
            if "docProps/custom.xml" in names:
                custom = zf.read("docProps/custom.xml").decode("utf-8", "replace")
                if f'name="{MARKER_PROPERTY}"' in custom:
                    return True
            if "xl/workbook.xml" in names:
                book = zf.read("xl/workbook.xml").decode("utf-8", "replace")
                return f'name="{MARKER_NAME}"' in book
    except (zipfile.BadZipFile, OSError, KeyError):
        return False
    return False


def guard_overwrite(path: str | os.PathLike, force: bool = False) -> None:
    """Refuse to overwrite an existing file that swaytune did not produce.

    Raises
    ------
    OverwriteRefused
        When ``path`` exists, is not a swaytune workbook and ``force`` is False.
    """
    p = Path(path)
    if force or not p.exists():
        return
    if p.is_dir():
        raise OverwriteRefused(f"{p} is a directory, not a workbook file")
    if not is_swaytune_workbook(p):
        raise OverwriteRefused(
            f"{p} exists and was not produced by swaytune; refusing to overwrite it "
            "(choose another output name, or force the overwrite)")


def save_workbook(wb: Any, path: str | os.PathLike, *, force: bool = False) -> Path:
    """Save an openpyxl workbook atomically after :func:`guard_overwrite`; return the path."""
    guard_overwrite(path, force=force)
    with atomic_path(path) as tmp:
        wb.save(tmp)
    return Path(path)
