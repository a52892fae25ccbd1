# SPDX-License-Identifier: MIT
"""Writing an updated copy of an .xlsx package: constants, cached values, chart caches.

:func:`write_package` writes an updated copy of a package: new constants in value cells, new
cached values in formula cells (:func:`encode_value`, the one encoding of cached values that
:mod:`workbook_builder.xlsx.cached` uses too), rebuilt number caches of chart series; every
other byte of every other part is copied unchanged (formula texts included). The copy is written
atomically (:func:`workbook_builder.xlsx.files.atomic_path`) and gets the usual permissions of a
new file (or those of the file it replaces), never the private mode of a temporary file.
:func:`rewrite_cells` does the same for the text of one worksheet part.

Every problem raises :class:`~workbook_builder.xlsx.package.PackageError` (a ``ValueError``)
with a reason fit for a report.
"""
from __future__ import annotations

import functools
import html
import math
import numbers
import os
import re
import zipfile
from pathlib import Path
from typing import Any, Iterable, Mapping

import numpy as np
from openpyxl.utils import column_index_from_string, get_column_letter

from ..project.reader import ILLEGAL_TEXT, MAX_TEXT
from .files import PACKAGE_DIGEST_PROPERTY, atomic_path, package_digest, with_property
from .package import Book, PackageError, sheet_parts, split_coord

__all__ = ["CellError", "write_package", "rewrite_cells", "encode_value"]

# One cell element, optionally namespace-prefixed: <c .../> or <c ...>body</c>.
_CELL_RE = re.compile(
    r"<(?P<p>[A-Za-z_][\w.-]*:)?c\b(?P<attrs>[^>]*?)(?:/>|>(?P<body>.*?)</(?P=p)?c>)", re.S)
_ERROR_CODE_RE = re.compile(r"^(?:#[A-Z0-9/_]+[!?]|#N/A)$")


class CellError(str):
    """A spreadsheet error code to store as a cached value (``t="e"``), e.g. ``CellError("#N/A")``.

    Raises
    ------
    ValueError
        When the text is not an error code of the form ``#NAME?``, ``#DIV/0!``, ``#N/A``.
    """

    def __new__(cls, code: str) -> "CellError":
        if not isinstance(code, str) or not _ERROR_CODE_RE.match(code):
            raise ValueError(f"code={code!r} must be a spreadsheet error code such as '#VALUE!'")
        return super().__new__(cls, code)


def _escape(text: str) -> str:
    # A carriage return would be normalised to a line feed by every XML parser: keep it as &#13;.
    return (text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
            .replace("\r", "&#13;"))


def encode_value(key: tuple[str, str], value: Any) -> tuple[str | None, str]:
    """(``t`` attribute or None, ``<v>`` text) of a cached value; refuse what a cell cannot hold.

    ``key`` is ``(sheet, cell)``, used in messages. bool -> ``b``; int/float -> number (shortest
    round-trip repr); str -> ``str`` (XML-escaped); :class:`CellError` -> ``e``.

    Raises
    ------
    PackageError
        For NaN, inf, control characters, text over 32767 characters, other types.
    """
    if type(value) is float:                 # the common case (same result as below)
        if not math.isfinite(value):
            raise PackageError(f"cached value for {key[0]}!{key[1]} is {value!r}; NaN and "
                               "inf cannot be stored in a cell")
        return None, repr(value)
    if isinstance(value, CellError):
        return "e", _escape(str(value))
    if isinstance(value, (bool, np.bool_)):
        return "b", "1" if bool(value) else "0"
    if isinstance(value, str):
        if ILLEGAL_TEXT.search(value):
            raise PackageError(f"cached value for {key[0]}!{key[1]} holds a control character "
                               "that a workbook cannot store")
        if len(value) > MAX_TEXT:
            raise PackageError(f"cached value for {key[0]}!{key[1]} is longer than {MAX_TEXT} "
                               "characters")
        return "str", _escape(value)
    if isinstance(value, numbers.Integral):
        return None, str(int(value))
    if isinstance(value, numbers.Real):
        x = float(value)
        if not math.isfinite(x):
            raise PackageError(f"cached value for {key[0]}!{key[1]} is {x!r}; NaN and inf "
                               "cannot be stored in a cell")
        return None, repr(x)
    raise PackageError(f"cached value for {key[0]}!{key[1]} has type {type(value).__name__}; "
                       "expected float, int, bool, str or CellError")


_R_ATTR_RE = re.compile(r'\sr\s*=\s*["\']([A-Z]+[0-9]+)["\']')
_T_ATTR_RE = re.compile(r'\st\s*=\s*("[^"]*"|\'[^\']*\')')


_F_RE_CACHE: dict[str, re.Pattern] = {}
_VIS_RE_CACHE: dict[str, re.Pattern] = {}
_CELL_NAME_RE = re.compile(r"(?:[A-Za-z_][\w.-]*:)?c")


def _targeted_sub(xml: str, refs: set[str], repl) -> str | None:
    """Apply ``repl`` to the cell elements of ``refs`` only, found by their ``r`` attribute.

    Cost grows with the number of cells changed, not with the size of the sheet (a sheet of
    thousands of constants with a few formulas). Returns None when a cell cannot be located
    this way (the caller then scans every cell).
    """
    edits = []
    pos = 0
    # Cells are stored row by row, column by column: search forward in that order.
    for ref in sorted(refs, key=lambda r: split_coord(r)):
        i = xml.find(f' r="{ref}"', pos)
        if i < 0:
            return None
        start = xml.rfind("<", 0, i)
        if start < 0 or not _CELL_NAME_RE.fullmatch(xml, start + 1, i):
            return None
        m = _CELL_RE.match(xml, start)
        if m is None:
            return None
        edits.append((start, m.end(), m))
        pos = m.end()
    out, pos = [], 0
    for start, end, m in edits:
        if start < pos:
            return None
        out.append(xml[pos:start])
        out.append(repl(m))
        pos = end
    out.append(xml[pos:])
    return "".join(out)


def rewrite_cells(xml: str, sheet: str, constants: Mapping[str, Any] | None = None,
                  cached: Mapping[str, Any] | None = None, *, require_all: bool = False) -> str:
    """One pass over a worksheet part: new constant values and new cached values.

    ``constants`` and ``cached`` map a cell (``"D12"``) to its value. A constant is written
    only into a cell without a formula (a number, or a text as an inline string), a cached
    value only into a formula cell
    (:func:`encode_value`); the formula text and every other attribute and element are kept.
    Only the cells to change are located (the cost grows with their number, not with the size
    of the sheet) unless ``require_all`` asks that every formula cell receive a value.

    Raises
    ------
    PackageError
        When a cell to change is not there (or is a formula cell for ``constants``, a value
        cell for ``cached``), a value cannot be stored, or (``require_all``) a formula cell is
        left without a value.
    """
    constants = constants or {}
    cached = cached or {}
    encoded = {ref: encode_value((sheet, ref), v) for ref, v in cached.items()}
    pending_c = set(constants)
    pending_f = set(cached)
    missing: list[str] = []

    def repl(m: re.Match) -> str:
        attrs = m.group("attrs")
        rm = _R_ATTR_RE.search(attrs)
        if rm is None:
            return m.group(0)
        ref = rm.group(1)
        in_c, in_f = ref in constants, ref in encoded
        body = m.group("body") or ""
        p = m.group("p") or ""
        f_re = _F_RE_CACHE.get(p)
        if f_re is None:
            f_re = _F_RE_CACHE[p] = re.compile(
                rf"<{re.escape(p)}f\b[^>]*?(?:/>|>.*?</{re.escape(p)}f>)", re.S)
            _VIS_RE_CACHE[p] = re.compile(
                rf"<{re.escape(p)}(?:v|is)\b[^>]*?(?:/>|>.*?</{re.escape(p)}(?:v|is)>)", re.S)
        if not (in_c or in_f):
            if require_all and f_re.search(body):
                missing.append(ref)
            return m.group(0)
        fm = f_re.search(body)
        new_attrs = _T_ATTR_RE.sub("", attrs) if "t" in attrs else attrs
        if fm is None:
            if not in_c:
                return m.group(0)
            pending_c.discard(ref)
            if isinstance(constants[ref], str):        # an engine text (a verdict, a note)
                _, text = encode_value((sheet, ref), constants[ref])
                return (f'<{p}c{new_attrs} t="inlineStr"><{p}is><{p}t xml:space="preserve">'
                        f'{text}</{p}t></{p}is></{p}c>')
            x = float(constants[ref])
            if not math.isfinite(x):
                raise PackageError(f"{sheet}!{ref}: refusing to write {x!r}")
            return f"<{p}c{new_attrs}><{p}v>{x!r}</{p}v></{p}c>"
        if not in_f:
            return m.group(0)                  # never touch a formula's text
        pending_f.discard(ref)
        t, text = encoded[ref]
        if t is not None:
            new_attrs += f' t="{t}"'
        rest = body[fm.end():]
        if rest and not (not p and rest.startswith("<v>") and rest.endswith("</v>")
                         and rest.count("<") == 2):   # one plain <v> (the usual): dropped
            rest = _VIS_RE_CACHE[p].sub("", rest)
        else:
            rest = ""
        return f"<{p}c{new_attrs}>{body[:fm.end()]}<{p}v>{text}</{p}v>{rest}</{p}c>"

    new = None if require_all else _targeted_sub(xml, set(constants) | set(encoded), repl)
    if new is None:                            # every cell wanted, or unusual markup
        pending_c, pending_f = set(constants), set(cached)
        new = _CELL_RE.sub(repl, xml)
    if missing:
        shown = ", ".join(missing[:10]) + (" ..." if len(missing) > 10 else "")
        raise PackageError(f"no cached value given for {len(missing)} formula cell(s) on sheet "
                           f"{sheet!r}: {shown}")
    if pending_c:
        raise PackageError(f"constant cell(s) {sorted(pending_c)[:5]} of sheet {sheet!r} not "
                           "found in the package (a formula cell, or written by another "
                           "application?)")
    if pending_f:
        raise PackageError(f"cached value given for cell(s) that are not formula cells: "
                           f"sheet {sheet!r}: {', '.join(sorted(pending_f)[:10])}")
    return new


_NUMREF_RE = re.compile(
    r"<(?P<p>[A-Za-z_][\w.-]*:)?numRef>\s*<(?P=p)?f>(?P<f>[^<]*)</(?P=p)?f>"
    r"(?P<cache>\s*<(?P=p)?numCache>.*?</(?P=p)?numCache>)?\s*</(?P=p)?numRef>", re.S)
_FORMAT_RE = re.compile(r"<(?:[A-Za-z_][\w.-]*:)?formatCode>([^<]*)</", re.S)


def _refresh_chart_xml(xml: str, value_of) -> str:
    """Rewrite the number caches of chart series from the cells they reference."""
    def repl(m: re.Match) -> str:
        p = m.group("p") or ""
        ref = html.unescape(m.group("f"))
        values = value_of(ref)
        if values is None:
            return m.group(0)
        fmt = "General"
        if m.group("cache"):
            fm = _FORMAT_RE.search(m.group("cache"))
            if fm:
                fmt = fm.group(1)
        pts = "".join(f'<{p}pt idx="{i}"><{p}v>{float(v)!r}</{p}v></{p}pt>'
                      for i, v in enumerate(values)
                      if isinstance(v, (int, float)) and not isinstance(v, bool)
                      and math.isfinite(v))
        return (f"<{p}numRef><{p}f>{m.group('f')}</{p}f><{p}numCache><{p}formatCode>{fmt}"
                f"</{p}formatCode><{p}ptCount val=\"{len(values)}\"/>{pts}</{p}numCache>"
                f"</{p}numRef>")

    return _NUMREF_RE.sub(repl, xml)


@functools.lru_cache(maxsize=1024)
def _range_keys(sheet: str, rng: str) -> tuple[tuple[str, str], ...] | None:
    """``(sheet, "A5")`` of every cell of a chart's range, row by row, or None."""
    m = re.fullmatch(r"\$?([A-Z]{1,3})\$?(\d+)(?::\$?([A-Z]{1,3})\$?(\d+))?", rng)
    if not m:
        return None
    c1, r1 = column_index_from_string(m.group(1)), int(m.group(2))
    c2, r2 = ((column_index_from_string(m.group(3)), int(m.group(4))) if m.group(3)
              else (c1, r1))
    return tuple((sheet, f"{get_column_letter(c)}{r}") for r in range(r1, r2 + 1)
                 for c in range(c1, c2 + 1))


def write_package(source: str | os.PathLike, dest: str | os.PathLike, *,
                  constants: Mapping[tuple[str, str], float] | None = None,
                  cached: Mapping[tuple[str, str], Any] | None = None,
                  chart_values: Mapping[tuple[str, str], Any] | None = None,
                  require_all: Iterable[str] = (), compresslevel: int | None = 1,
                  book: Book | None = None) -> Path:
    """Write an updated copy of a package: new constants, cached values, chart caches.

    ``constants`` and ``cached`` map ``(sheet, "D12")`` to a value (see :func:`rewrite_cells`);
    ``chart_values`` maps ``(sheet, "A5")`` to the value of a cell a chart plots, and every
    chart series whose cells are all in it gets its number cache rebuilt. Every sheet named in
    ``require_all`` must receive a cached value for each of its formula cells. ``dest`` may
    equal ``source``; it is replaced atomically and on any error left as it was, with no
    temporary file remaining. ``compresslevel`` 1 is fast and still deflates; None keeps the
    library default. ``book``, the package of ``source`` as already read by
    :func:`workbook_builder.xlsx.package.open_package`, saves reading it again.

    Raises
    ------
    PackageError
        For an unknown sheet, see :func:`rewrite_cells`.
    """
    src = Path(source)
    target = Path(dest)
    by_sheet: dict[str, tuple[dict[str, float], dict[str, Any]]] = {}
    for which, mapping in ((0, constants or {}), (1, cached or {})):
        for (sheet, coord), v in mapping.items():
            by_sheet.setdefault(sheet, ({}, {}))[which][coord.replace("$", "").upper()] = v
    every = set(require_all)
    for sheet in every:
        by_sheet.setdefault(sheet, ({}, {}))
    if book is not None:
        members, parts = book.members, book.sheet_parts
    else:
        with zipfile.ZipFile(src) as zin:
            members = [(info, zin.read(info)) for info in zin.infolist()]
            parts = sheet_parts(zin)
    unknown = set(by_sheet) - set(parts)
    if unknown:
        raise PackageError(f"unknown sheet(s) {sorted(unknown)}; the workbook has "
                           f"{sorted(parts)}")
    part_sheet = {parts[s]: s for s in by_sheet}
    chart_lookup = None
    if chart_values:
        def chart_lookup(ref: str):
            sheet, _, rng = ref.rpartition("!")
            sheet = sheet.strip("'").replace("''", "'")
            keys = _range_keys(sheet, rng)
            if keys is None:
                return None
            if not all(k in chart_values for k in keys):
                return None
            return [chart_values[k] for k in keys]
    out = []
    for info, raw in members:
        sheet = part_sheet.get(info.filename)
        if sheet is not None:
            consts, values = by_sheet[sheet]
            raw = rewrite_cells(raw.decode("utf-8"), sheet, consts, values,
                                require_all=sheet in every).encode("utf-8")
        elif chart_lookup is not None and info.filename.startswith("xl/charts/") \
                and info.filename.endswith(".xml"):
            raw = _refresh_chart_xml(raw.decode("utf-8"), chart_lookup).encode("utf-8")
        out.append((info, raw))
    out = _with_package_digest(out)
    with atomic_path(target) as tmp:
        with zipfile.ZipFile(tmp, "w") as zout:
            for info, raw in out:
                if compresslevel is None:
                    zout.writestr(info, raw)
                else:
                    zout.writestr(info, raw, compresslevel=compresslevel)
    return target


def _with_package_digest(members: list) -> list:
    """The members with the package digest stored in ``docProps/custom.xml`` (when there is
    such a part): a later write can tell whether the file was changed since."""
    digest = package_digest((info.filename, raw) for info, raw in members)
    out = []
    for info, raw in members:
        if info.filename == "docProps/custom.xml":
            try:
                raw = with_property(raw, PACKAGE_DIGEST_PROPERTY, digest)
            except (ValueError, UnicodeDecodeError):
                pass                # an unusual part: keep it, the guard falls back
        out.append((info, raw))
    return out
