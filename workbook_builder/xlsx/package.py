# SPDX-License-Identifier: MIT
"""Reading and rewriting .xlsx packages without a full spreadsheet library.

:func:`open_package` reads the parts batch recalculation needs (sheets, cells with their
formulas and cached values, workbook-scoped defined names, custom document properties) with the
standard library's zip reader and XML parser, after refusing what a workbook never needs:

* a document type declaration or entity declaration in any part (entity expansion, external
  entities), stricter than ``defusedxml``'s default;
* an encrypted member, a member over :data:`MAX_MEMBER_BYTES` or compressed more than
  :data:`MAX_RATIO` times (zip bombs), a package over :data:`MAX_PACKAGE_BYTES`;
* an OLE compound document (a password-protected workbook or a legacy .xls).

:func:`write_package` writes an updated copy of a package: new constants in value cells, new
cached values in formula cells (:func:`encode_value`, the one encoding of cached values that
:mod:`workbook_builder.xlsx.cached` uses too), rebuilt number caches of chart series; every other
byte of every other part is copied unchanged (formula texts included). The copy is written
atomically (:func:`workbook_builder.xlsx.files.atomic_path`) and gets the usual permissions of a
new file (or those of the file it replaces), never the private mode of a temporary file.

Every problem raises :class:`PackageError` (a ``ValueError``) with a reason fit for a report.
"""
from __future__ import annotations

import functools
import math
import numbers
import os
import posixpath
import re
import zipfile
import zlib
from pathlib import Path
from typing import Any, Iterable, Mapping

import numpy as np
from openpyxl.utils import column_index_from_string, get_column_letter

__all__ = ["PackageError", "CellError", "Book", "Sheet", "Cell", "open_package", "PartCache",
           "write_package", "rewrite_cells", "encode_value", "sheet_parts", "split_coord",
           "MAX_MEMBER_BYTES", "MAX_PACKAGE_BYTES", "MAX_RATIO"]

#: Largest uncompressed size of one package member and of the whole package [bytes].
MAX_MEMBER_BYTES = 64 * 1024 * 1024
MAX_PACKAGE_BYTES = 256 * 1024 * 1024
#: Largest compression ratio accepted for a member larger than 1 MB (zip bombs) [-].
MAX_RATIO = 200.0

_OLE_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
_NS_MAIN = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
_NS_REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
_NS_PKG_REL = "http://schemas.openxmlformats.org/package/2006/relationships"

# One cell element, optionally namespace-prefixed: <c .../> or <c ...>body</c>.
_CELL_RE = re.compile(
    r"<(?P<p>[A-Za-z_][\w.-]*:)?c\b(?P<attrs>[^>]*?)(?:/>|>(?P<body>.*?)</(?P=p)?c>)", re.S)
_INVALID_XML_CHARS = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ufffe\uffff]")
_ERROR_CODE_RE = re.compile(r"^(?:#[A-Z0-9/_]+[!?]|#N/A)$")


class PackageError(ValueError):
    """A package that cannot be read or written; the message says why."""


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
        if _INVALID_XML_CHARS.search(value):
            raise PackageError(f"cached value for {key[0]}!{key[1]} holds a control character "
                               "that a workbook cannot store")
        if len(value) > 32767:
            raise PackageError(f"cached value for {key[0]}!{key[1]} is longer than 32767 "
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


# =============================================================================== reading
class Cell:
    """A cell read from the package (duck-types the openpyxl cell the evaluator reads)."""

    __slots__ = ("row", "column", "value", "data_type", "cached", "cached_type")

    def __init__(self, row: int, column: int, value: Any, data_type: str,
                 cached: Any = None, cached_type: str = "n"):
        self.row = row
        self.column = column
        self.value = value
        self.data_type = data_type
        self.cached = cached
        self.cached_type = cached_type

    @property
    def coordinate(self) -> str:
        return f"{get_column_letter(self.column)}{self.row}"

    @property
    def formula(self) -> str | None:
        return self.value if self.data_type == "f" else None


class Sheet:
    """A worksheet's cells by ``(row, column)`` (duck-types the parts of openpyxl's the
    evaluator reads: ``title``, ``cell()``, ``iter_rows()``)."""

    def __init__(self, title: str):
        self.title = title
        self.cells: dict[tuple[int, int], Cell] = {}

    def cell(self, row: int, column: int) -> Cell:
        c = self.cells.get((row, column))
        if c is None:
            c = Cell(row, column, None, "n")
        return c

    def iter_rows(self):
        rows: dict[int, list[Cell]] = {}
        for (r, _c), cell in sorted(self.cells.items()):
            rows.setdefault(r, []).append(cell)
        for r in sorted(rows):
            yield rows[r]

    def get(self, coord: str) -> Cell:
        r, c = split_coord(coord)
        return self.cell(r, c)


class DefinedNameRef:
    """A defined name as written (``attr_text``); ``destinations`` as openpyxl's."""

    def __init__(self, name: str, text: str, local: bool, hidden: bool):
        self.name = name
        self.attr_text = text
        self.local = local
        self.hidden = hidden

    @property
    def destinations(self):
        m = _SINGLE_REF_RE.fullmatch(self.attr_text.strip())
        if not m:
            return iter(())
        sheet = m.group("sheet")
        if sheet.startswith("'"):
            sheet = sheet[1:-1].replace("''", "'")
        return iter([(sheet, m.group("ref"))])


_SINGLE_REF_RE = re.compile(
    r"(?P<sheet>'(?:[^']|'')+'|[A-Za-z_][A-Za-z0-9_. ]*)!(?P<ref>\$?[A-Za-z]{1,3}\$?\d+"
    r"(?::\$?[A-Za-z]{1,3}\$?\d+)?)")


class Names(dict):
    """Workbook-scoped defined names (``items()`` as openpyxl's DefinedNameDict)."""


class Book:
    """The parts of a workbook package the recalculation reads (duck-types openpyxl's)."""

    def __init__(self):
        self.members: list[tuple[zipfile.ZipInfo, bytes]] = []
        self.sheets: dict[str, Sheet] = {}
        self.sheet_parts: dict[str, str] = {}
        self.defined_names = Names()
        self.local_names: dict[str, str] = {}
        self.custom_props: dict[str, str] = {}

    @property
    def sheetnames(self) -> dict[str, Sheet]:
        return self.sheets          # supports `in` and iteration in sheet order, no copy

    def __getitem__(self, title: str) -> Sheet:
        return self.sheets[title]

    def __contains__(self, title: str) -> bool:
        return title in self.sheets

    def name_cell(self, name: str) -> tuple[str, str] | None:
        dn = self.defined_names.get(name)
        if dn is None:
            return None
        dests = list(dn.destinations)
        if len(dests) != 1:
            return None
        sheet, ref = dests[0]
        ref = ref.replace("$", "").split(":")[0].upper()
        if sheet not in self.sheets:
            return None
        return sheet, ref

    def named(self, name: str) -> Cell | None:
        loc = self.name_cell(name)
        return None if loc is None else self.sheets[loc[0]].get(loc[1])


_COORD_RE = re.compile(r"\$?([A-Za-z]{1,3})\$?(\d+)")


_COORD_CACHE: dict[str, tuple[int, int]] = {}


def split_coord(coord: str) -> tuple[int, int]:
    hit = _COORD_CACHE.get(coord)
    if hit is not None:
        return hit
    m = _COORD_RE.fullmatch(coord)
    if not m:
        raise PackageError(f"cell reference {coord!r} is not valid")
    out = _COORD_CACHE[coord] = (int(m.group(2)), column_index_from_string(m.group(1)))
    return out


def _local(tag: str) -> str:
    return tag.rsplit("}", 1)[-1]


def _parse_xml(data: bytes, part: str):
    """Parse one package part; refuse DTDs (hence every entity declaration) outright.

    A workbook part never needs a document type declaration. Without one there can be no
    entity declarations (no "billion laughs", no external entities), so after this check the
    fast C parser of the standard library is safe; the refusal is stricter than defusedxml's
    default, which allows a DTD without entities.
    """
    from xml.etree.ElementTree import ParseError, fromstring
    if data[:2] in (b"\xff\xfe", b"\xfe\xff") or data[:4] in (b"\x00\x00\xfe\xff",
                                                              b"\xff\xfe\x00\x00"):
        raise PackageError(f"refused: part {part} is not UTF-8 encoded XML")
    if b"<!DOCTYPE" in data or b"<!ENTITY" in data:
        raise PackageError(f"refused: part {part} holds a DTD or XML entity declarations; a "
                          "workbook never needs them (possible entity-expansion attack)")
    try:
        return fromstring(data)
    except ParseError as exc:
        raise PackageError(f"corrupted workbook: part {part} is not well-formed XML ({exc})") \
            from None


class PartCache:
    """Parsed worksheets and shared strings of earlier packages, keyed by their exact bytes.

    A batch of variants of one workbook holds many byte-identical parts (a Nonlinear sheet of
    thousands of engine values, sheets whose cached values have not been refreshed yet):
    :func:`open_package` with ``cache=`` parses such a part once. The key is the part's full
    bytes (with the sheet title and the shared strings' bytes), so a hit is a part that
    already parsed and passed every check; failures are never stored. A hit returns a new
    :class:`Sheet` whose cell dictionary is a copy (the :class:`Cell` objects are shared: the
    caller must replace cells, never change them in place, as the recalculation does). At
    most ``max_bytes`` of part bytes are kept (oldest forgotten first).
    """

    def __init__(self, max_bytes: int = 16 * 1024 * 1024):
        self.max_bytes = int(max_bytes)
        self._items: dict[tuple, tuple[Any, int]] = {}
        self._bytes = 0

    def clear(self) -> None:
        self._items.clear()
        self._bytes = 0

    def __len__(self) -> int:
        return len(self._items)

    def get(self, key: tuple):
        hit = self._items.get(key)
        return None if hit is None else hit[0]

    def put(self, key: tuple, value: Any, size: int) -> None:
        """Keep ``value`` for ``key`` (``size`` bytes of part); parts over a quarter of the
        budget are not kept."""
        if size > self.max_bytes // 4 or key in self._items:
            return
        while self._items and self._bytes + size > self.max_bytes:
            del_key = next(iter(self._items))
            self._bytes -= self._items.pop(del_key)[1]
        self._items[key] = (value, size)
        self._bytes += size


def _cached_sheet(cache: PartCache | None, title: str, raw: bytes, part: str,
                  strings: list[str], strings_raw: bytes) -> Sheet:
    if cache is None:
        return _read_sheet(title, raw, part, strings)
    key = ("sheet", title, raw, strings_raw)
    hit = cache.get(key)
    if hit is None:
        hit = _read_sheet(title, raw, part, strings)
        cache.put(key, hit, len(raw))
    sheet = Sheet(title)
    sheet.cells = dict(hit.cells)
    return sheet


def open_package(path: Path, *, cache: PartCache | None = None) -> Book:
    """Read a .xlsx package safely; raise PackageError with a clear reason otherwise.

    ``cache`` (a :class:`PartCache`) lets a batch parse byte-identical parts only once; the
    package is still checked in full (limits, DTDs) every time.
    """
    try:
        with open(path, "rb") as fh:
            head = fh.read(8)
    except IsADirectoryError:
        raise PackageError("is a directory, not a workbook") from None
    except FileNotFoundError:
        raise PackageError("file not found") from None
    except OSError as exc:
        raise PackageError(f"cannot be read: {exc.strerror or exc}") from None
    if not head:
        raise PackageError("empty file (0 bytes): not a workbook")
    if head == _OLE_MAGIC:
        raise PackageError("password-protected (encrypted) workbook or legacy .xls file (OLE "
                          "compound document): swaytune cannot read it; save a copy without a "
                          "password as .xlsx")
    if not head.startswith(b"PK"):
        raise PackageError("not a workbook: the file is not an .xlsx package (zip)")
    book = Book()
    try:
        with zipfile.ZipFile(path) as zf:
            infos = zf.infolist()
            total = 0
            for info in infos:
                if info.flag_bits & 0x1:
                    raise PackageError("encrypted zip member: not a workbook swaytune can read")
                if info.file_size > MAX_MEMBER_BYTES or (
                        info.file_size > 1_000_000
                        and info.file_size > MAX_RATIO * max(info.compress_size, 1)):
                    raise PackageError(f"refused: package member {info.filename} is "
                                      f"{info.file_size} bytes uncompressed (limit "
                                      f"{MAX_MEMBER_BYTES}, ratio {MAX_RATIO:g})")
                total += info.file_size
            if total > MAX_PACKAGE_BYTES:
                raise PackageError(f"refused: package is {total} bytes uncompressed (limit "
                                  f"{MAX_PACKAGE_BYTES})")
            names = {i.filename for i in infos}
            if "xl/workbook.xml" not in names:
                raise PackageError("not an Excel workbook: the package has no xl/workbook.xml")
            for info in infos:
                book.members.append((info, zf.read(info)))
    except PackageError:
        raise
    except zipfile.BadZipFile as exc:
        raise PackageError(f"corrupted or truncated workbook: not a valid zip package ({exc})") \
            from None
    except (EOFError, zlib.error, UnicodeDecodeError, NotImplementedError, ValueError,
            OverflowError) as exc:
        raise PackageError(f"corrupted or truncated workbook: the zip package cannot be read "
                          f"({type(exc).__name__}: {exc})") from None
    data = {info.filename: raw for info, raw in book.members}
    _read_workbook_part(book, data)
    strings_raw = data.get("xl/sharedStrings.xml", b"")
    strings = None
    if cache is not None:
        skey = ("strings", strings_raw)
        strings = cache.get(skey)
    if strings is None:
        strings = _read_shared_strings(data)
        if cache is not None:
            cache.put(skey, strings, len(strings_raw))
    for title, part in book.sheet_parts.items():
        if part not in data:
            raise PackageError(f"corrupted workbook: sheet {title!r} part {part} is missing")
        raw = data[part]
        if cache is not None and (b"<!DOCTYPE" in raw or b"<!ENTITY" in raw):
            _parse_xml(raw, part)            # refused, whatever the cache holds
        book.sheets[title] = _cached_sheet(cache, title, raw, part, strings, strings_raw)
    if "docProps/custom.xml" in data:
        root = _parse_xml(data["docProps/custom.xml"], "docProps/custom.xml")
        for prop in root:
            name = prop.get("name")
            texts = [child.text or "" for child in prop]
            if name:
                book.custom_props[name] = texts[0] if texts else ""
    return book


def _read_workbook_part(book: Book, data: dict[str, bytes]) -> None:
    root = _parse_xml(data["xl/workbook.xml"], "xl/workbook.xml")
    rels_part = "xl/_rels/workbook.xml.rels"
    if rels_part not in data:
        raise PackageError("corrupted workbook: xl/_rels/workbook.xml.rels is missing")
    for title, part in _sheet_targets(root, _parse_xml(data[rels_part], rels_part)):
        if "worksheets/" in part:           # chartsheets and the like carry no cells
            book.sheet_parts[title] = part
    for el in root.iter():
        if _local(el.tag) != "definedName":
            continue
        name = el.get("name") or ""
        text = el.text or ""
        if el.get("localSheetId") is not None:
            book.local_names[name] = text
            continue
        book.defined_names[name] = DefinedNameRef(name, text, False,
                                                  el.get("hidden") in ("1", "true"))



def _sheet_targets(workbook_root, rels_root) -> list[tuple[str, str]]:
    """(sheet title, part name) of every sheet of ``xl/workbook.xml``, in workbook order."""
    targets = {r.get("Id"): r.get("Target") for r in rels_root
               if _local(r.tag) == "Relationship"}
    out = []
    for el in workbook_root.iter():
        if _local(el.tag) != "sheet":
            continue
        rid = next((v for k, v in el.attrib.items() if _local(k) == "id"), None)
        target = targets.get(rid)
        if target is None:
            continue
        part = target.lstrip("/") if target.startswith("/") else posixpath.normpath(
            posixpath.join("xl", target))
        out.append((el.get("name"), part))
    return out


def sheet_parts(zf: zipfile.ZipFile) -> dict[str, str]:
    """Map each sheet title to its part name inside an open package (``xl/worksheets/...``).

    Raises
    ------
    PackageError
        When ``xl/workbook.xml`` or its relationships are missing or not plain XML.
    """
    try:
        book = zf.read("xl/workbook.xml")
        rels = zf.read("xl/_rels/workbook.xml.rels")
    except KeyError as exc:
        raise PackageError(f"corrupted workbook: {exc.args[0]}") from None
    return dict(_sheet_targets(_parse_xml(book, "xl/workbook.xml"),
                               _parse_xml(rels, "xl/_rels/workbook.xml.rels")))


def _read_shared_strings(data: dict[str, bytes]) -> list[str]:
    part = "xl/sharedStrings.xml"
    if part not in data:
        return []
    root = _parse_xml(data[part], part)
    out = []
    for si in root:
        if _local(si.tag) != "si":
            continue
        out.append(_text_of(si))
    return out


def _text_of(el) -> str:
    """Text of a string item / inline string: every <t>, skipping phonetic runs (<rPh>)."""
    parts = []
    for child in el:
        tag = _local(child.tag)
        if tag == "t":
            parts.append(child.text or "")
        elif tag == "r":
            for t in child:
                if _local(t.tag) == "t":
                    parts.append(t.text or "")
    return "".join(parts)


def _read_sheet(title: str, raw: bytes, part: str, strings: list[str]) -> Sheet:
    from openpyxl.formula.translate import Translator
    root = _parse_xml(raw, part)
    ns = root.tag[:root.tag.index("}") + 1] if root.tag.startswith("{") else ""
    t_sheetdata, t_row, t_c, t_f, t_v, t_is = (ns + x for x in ("sheetData", "row", "c", "f",
                                                                 "v", "is"))
    sheet = Sheet(title)
    cells = sheet.cells
    shared: dict[str, tuple[str, str]] = {}       # si -> (formula, origin coordinate)
    pending_shared: list[tuple[Cell, str, str]] = []
    for sd in root.iter(t_sheetdata):
        for row_el in sd.iter(t_row):
            for c in row_el.iter(t_c):
                ref = c.get("r")
                if ref is None:
                    raise PackageError(f"corrupted workbook: a cell of sheet {title!r} has no "
                                      "reference (r attribute)")
                r, col = split_coord(ref)
                t = c.get("t", "n")
                if t == "n" and len(c) == 1 and c[0].tag == t_v:
                    vtext = c[0].text                # fast path: a plain number
                    if vtext:
                        try:
                            x = float(vtext)
                        except ValueError:
                            pass
                        else:
                            cells[(r, col)] = Cell(r, col, x, "n", x, t)
                            continue
                f_el = v_el = is_el = None
                for child in c:
                    tag = child.tag
                    if tag == t_f:
                        f_el = child
                    elif tag == t_v:
                        v_el = child
                    elif tag == t_is:
                        is_el = child
                vtext = None if v_el is None else (v_el.text or "")
                cached = _decode_value(t, vtext, is_el, strings, title, ref)
                if f_el is not None:
                    ftype = f_el.get("t", "normal")
                    text = f_el.text or ""
                    cell = Cell(r, col, None, "f", cached, t)
                    if ftype == "shared":
                        si = f_el.get("si", "")
                        if text:
                            shared[si] = (text, ref)
                            cell.value = "=" + text
                        else:
                            pending_shared.append((cell, si, ref))
                    elif ftype == "dataTable":
                        cell.value = "=#REF!"        # what-if tables are not supported
                    else:
                        cell.value = "=" + text
                    cells[(r, col)] = cell
                else:
                    if cached is None:
                        continue
                    dtype = {"s": "s", "str": "s", "inlineStr": "s", "b": "b",
                             "e": "e"}.get(t, "n")
                    cells[(r, col)] = Cell(r, col, cached, dtype, cached, t)
    for cell, si, ref in pending_shared:
        master = shared.get(si)
        if master is None:
            raise PackageError(f"corrupted workbook: shared formula {si} of {title}!{ref} has "
                              "no master cell")
        cell.value = Translator("=" + master[0], origin=master[1]).translate_formula(ref)
    return sheet


def _decode_value(t: str, vtext: str | None, is_el, strings: list[str], title: str, ref: str):
    if t == "inlineStr":
        return None if is_el is None else _text_of(is_el)
    if vtext is None:
        return None
    if t == "s":
        try:
            return strings[int(vtext)]
        except (ValueError, IndexError):
            raise PackageError(f"corrupted workbook: {title}!{ref} points at shared string "
                              f"{vtext!r}, which does not exist") from None
    if t in ("str", "e", "d"):
        return vtext
    if not vtext.strip():
        return None
    if t == "b":
        return vtext.strip() in ("1", "true")
    try:
        return float(vtext)
    except ValueError:
        raise PackageError(f"corrupted workbook: {title}!{ref} holds {vtext!r}, not a number") \
            from None


# =============================================================================== writing
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


def rewrite_cells(xml: str, sheet: str, constants: Mapping[str, float] | None = None,
                  cached: Mapping[str, Any] | None = None, *, require_all: bool = False) -> str:
    """One pass over a worksheet part: new constant values and new cached values.

    ``constants`` and ``cached`` map a cell (``"D12"``) to its value. A constant is written
    only into a cell without a formula (as a number), a cached value only into a formula cell
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
    import html

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
                  require_all: Iterable[str] = (), compresslevel: int | None = 1) -> Path:
    """Write an updated copy of a package: new constants, cached values, chart caches.

    ``constants`` and ``cached`` map ``(sheet, "D12")`` to a value (see :func:`rewrite_cells`);
    ``chart_values`` maps ``(sheet, "A5")`` to the value of a cell a chart plots, and every
    chart series whose cells are all in it gets its number cache rebuilt. Every sheet named in
    ``require_all`` must receive a cached value for each of its formula cells. ``dest`` may
    equal ``source``; it is replaced atomically and on any error left as it was, with no
    temporary file remaining. ``compresslevel`` 1 is fast and still deflates; None keeps the
    library default.

    Raises
    ------
    PackageError
        For an unknown sheet, see :func:`rewrite_cells`.
    """
    from .files import atomic_path

    src = Path(source)
    target = Path(dest)
    by_sheet: dict[str, tuple[dict[str, float], dict[str, Any]]] = {}
    for which, mapping in ((0, constants or {}), (1, cached or {})):
        for (sheet, coord), v in mapping.items():
            by_sheet.setdefault(sheet, ({}, {}))[which][coord.replace("$", "").upper()] = v
    every = set(require_all)
    for sheet in every:
        by_sheet.setdefault(sheet, ({}, {}))
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
    with atomic_path(target) as tmp:
        with zipfile.ZipFile(tmp, "w") as zout:
            for info, raw in out:
                if compresslevel is None:
                    zout.writestr(info, raw)
                else:
                    zout.writestr(info, raw, compresslevel=compresslevel)
    return target
