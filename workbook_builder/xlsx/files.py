# SPDX-License-Identifier: MIT
"""Atomic file writes and the guards against overwriting workbooks a person may need.

A workbook written by swaytune carries a custom document property ``SwaytuneGenerator`` (value
``"swaytune <version>"``) and, as a second marker that survives applications which drop custom
properties, a hidden workbook-scoped defined name ``SWAYTUNE_GENERATOR``. :func:`guard_overwrite`
refuses to replace an existing file that carries neither, unless ``force=True``: an engineer's own
hand-made workbook is never lost to a mistyped ``-o``.

A workbook swaytune built also carries the SHA-256 :func:`content_digest` of its cells in the
custom document property ``SwaytuneContentDigest`` (:func:`set_digest`), and every package
swaytune writes (built or recalculated) the SHA-256 :func:`package_digest` of its parts in
``SwaytunePackageDigest``; :func:`guard_hand_edits` refuses to replace a file that no longer
matches them (edited by hand, or saved by another application), unless ``force=True``.
"""
from __future__ import annotations

import contextlib
import hashlib
import html
import os
import re
import tempfile
import zipfile
from pathlib import Path
from typing import Any, Iterable, Iterator

from openpyxl import load_workbook
from openpyxl.packaging.custom import StringProperty
from openpyxl.workbook.defined_name import DefinedName

__all__ = [
    "MARKER_PROPERTY",
    "MARKER_NAME",
    "OverwriteRefused",
    "atomic_path",
    "mark_workbook",
    "set_property",
    "set_hidden_name",
    "is_swaytune_workbook",
    "guard_overwrite",
    "save_workbook",
    "new_file_mode",
    "DIGEST_PROPERTY",
    "content_digest",
    "set_digest",
    "guard_hand_edits",
    "PACKAGE_DIGEST_PROPERTY",
    "package_digest",
    "with_property",
    "read_property",
    "FORCE_HINT",
]

#: How every refusal to overwrite tells the user to overwrite anyway.
FORCE_HINT = "choose another output name, or overwrite it with --force (force=True)"

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
    the file it replaces, or the usual mode for a new file (see :func:`new_file_mode`). An
    error while writing that names no file (a full disk, a file-size limit) is raised again
    naming ``dest``.

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
    except OSError as exc:
        tmp.unlink(missing_ok=True)
        if exc.errno is None or exc.filename is not None:
            raise
        # a write into the open temporary file (full disk, file-size limit) names no file:
        # name the one the user asked for
        raise OSError(exc.errno, f"cannot write it: {exc.strerror or exc}", str(target)) \
            from None
    except BaseException:
        tmp.unlink(missing_ok=True)
        raise


def set_property(wb: Any, name: str, value: str) -> None:
    """Set (replace) a custom document property of an openpyxl workbook holding text."""
    props = wb.custom_doc_props
    for prop in list(props.props):
        if prop.name == name:
            props.props.remove(prop)
    props.append(StringProperty(name=name, value=value))


def set_hidden_name(wb: Any, name: str, text: str) -> None:
    """Set (replace) a hidden workbook-scoped defined name of an openpyxl workbook."""
    if name in wb.defined_names:
        del wb.defined_names[name]
    wb.defined_names.add(DefinedName(name, attr_text=text, hidden=True))


def mark_workbook(wb: Any, version: str) -> None:
    """Mark an openpyxl workbook as produced by swaytune ``version`` (both markers)."""
    text = f"swaytune {version}"
    set_property(wb, MARKER_PROPERTY, text)
    set_hidden_name(wb, MARKER_NAME, f'"{text}"')


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
            f"({FORCE_HINT})")


def save_workbook(wb: Any, path: str | os.PathLike, *, force: bool = False) -> Path:
    """Save an openpyxl workbook atomically after :func:`guard_overwrite`; return the path."""
    guard_overwrite(path, force=force)
    with atomic_path(path) as tmp:
        wb.save(tmp)
    return Path(path)


#: Custom document property holding :func:`content_digest` of the workbook as built.
DIGEST_PROPERTY = "SwaytuneContentDigest"


def content_digest(wb: Any) -> str:
    """SHA-256 of every cell's type and value or formula (not cached values, not styles).

    The same for the workbook in memory and as read back from the saved file, so a rebuild can
    tell whether a file swaytune wrote was changed afterwards.
    """
    h = hashlib.sha256()
    for ws in wb.worksheets:
        h.update(ws.title.encode("utf-8") + b"\0")
        for row in ws.iter_rows():
            for c in row:
                v = c.value
                if v is None or v == "":
                    continue
                if isinstance(v, bool):
                    text = f"b{v}"
                elif isinstance(v, (int, float)):
                    text = f"n{float(v):.16g}"      # openpyxl stores 16 significant digits
                else:
                    text = f"{c.data_type}{v}"
                h.update(f"{c.coordinate}\0{text}\0".encode("utf-8"))
    return h.hexdigest()


def set_digest(wb: Any) -> None:
    """Store :func:`content_digest` of an openpyxl workbook in :data:`DIGEST_PROPERTY`.

    Call it last, just before saving: :func:`guard_hand_edits` compares the digest with the
    cells of the saved file.
    """
    set_property(wb, DIGEST_PROPERTY, content_digest(wb))


def guard_hand_edits(path: str | os.PathLike, force: bool = False) -> None:
    """Refuse to replace a swaytune workbook that was changed after it was built.

    Raises
    ------
    OverwriteRefused
        When ``path`` carries a content digest that no longer matches its cells (edited, or
        saved by another application), unless ``force``.
    """
    p = Path(path)
    if force or not p.is_file():
        return
    try:
        with zipfile.ZipFile(p) as zf:
            members = [(i.filename, zf.read(i)) for i in zf.infolist()]
    except (zipfile.BadZipFile, OSError, ValueError):
        return                  # not readable as a workbook: guard_overwrite decides
    stored = read_property(dict(members).get("docProps/custom.xml", b""),
                           PACKAGE_DIGEST_PROPERTY)
    if stored is not None:
        if stored == package_digest(members):
            return              # byte for byte what swaytune wrote
        raise OverwriteRefused(
            f"{p} was changed after swaytune wrote it (edited, or saved by another "
            f"application); refusing to overwrite it ({FORCE_HINT})")
    try:
        wb = load_workbook(p)
    except Exception:           # not readable as a workbook: guard_overwrite decides
        return
    stored = next((prop.value for prop in wb.custom_doc_props.props
                   if prop.name == DIGEST_PROPERTY), None)
    if stored is not None and stored != content_digest(wb):
        raise OverwriteRefused(
            f"{p} was changed after swaytune built it (edited, or saved by another "
            f"application); refusing to overwrite it ({FORCE_HINT})")


#: Custom document property holding :func:`package_digest` of the package as written.
PACKAGE_DIGEST_PROPERTY = "SwaytunePackageDigest"
#: Parts left out of the package digest: the properties (the digest itself, timestamps).
_UNHASHED = frozenset({"docProps/custom.xml", "docProps/core.xml", "docProps/app.xml"})


def package_digest(members: Iterable[tuple[str, bytes]]) -> str:
    """SHA-256 of every part of a package (name and bytes) but its document properties."""
    h = hashlib.sha256()
    for name, raw in sorted(members):
        if name not in _UNHASHED:
            h.update(name.encode("utf-8") + b"\0" + hashlib.sha256(raw).digest())
    return h.hexdigest()


_PROPERTY_RE = r'<(?:\w+:)?property\b[^>]*\bname="{name}"[^>]*>.*?</(?:\w+:)?property>'
_VALUE_RE = re.compile(r"<(?:\w+:)?lpwstr>(.*?)</(?:\w+:)?lpwstr>", re.S)
_PID_RE = re.compile(r'\bpid="(\d+)"')
_FMTID = "{D5CDD505-2E9C-101B-9397-08002B2CF9AE}"


def read_property(custom_xml: bytes, name: str) -> str | None:
    """The text of custom document property ``name`` in ``docProps/custom.xml`` (or None)."""
    text = custom_xml.decode("utf-8", "replace")
    m = re.search(_PROPERTY_RE.format(name=re.escape(name)), text, re.S)
    if m is None:
        return None
    v = _VALUE_RE.search(m.group(0))
    return None if v is None else html.unescape(v.group(1))


def with_property(custom_xml: bytes, name: str, value: str) -> bytes:
    """``docProps/custom.xml`` with text property ``name`` set to ``value`` (added if absent).

    Raises
    ------
    ValueError
        When the part is not a custom-properties part.
    """
    text = custom_xml.decode("utf-8")
    pattern = re.compile(_PROPERTY_RE.format(name=re.escape(name)), re.S)
    pids = [int(p) for p in _PID_RE.findall(text)]
    pid = next((int(m) for m in _PID_RE.findall(pattern.search(text).group(0))), None) \
        if pattern.search(text) else max(pids, default=1) + 1
    prop = (f'<property fmtid="{_FMTID}" pid="{pid}" name="{html.escape(name)}">'
            f'<vt:lpwstr>{html.escape(value, quote=False)}</vt:lpwstr></property>')
    if pattern.search(text):
        return pattern.sub(lambda _: prop, text, count=1).encode("utf-8")
    end = re.search(r"</(?:\w+:)?Properties>\s*$", text)
    if end is None or "vt=" not in text.replace(":vt=", "vt="):
        raise ValueError("not a custom-properties part (no Properties element or vt prefix)")
    return (text[:end.start()] + prop + text[end.start():]).encode("utf-8")
