# SPDX-License-Identifier: MIT
"""Reading .xlsx packages safely, without a full spreadsheet library.

:func:`open_package` reads the parts batch recalculation needs (sheets, cells with their
formulas and cached values, workbook-scoped defined names, custom document properties) with the
standard library's zip reader and XML parser, after refusing what a workbook never needs:

* a document type declaration or entity declaration in any part (entity expansion, external
  entities), stricter than ``defusedxml``'s default;
* an encrypted member, a member over :data:`MAX_MEMBER_BYTES` or compressed more than
  :data:`MAX_RATIO` times (zip bombs), a package over :data:`MAX_PACKAGE_BYTES`, compressed
  more than :data:`MAX_RATIO` times as a whole or with more than :data:`MAX_MEMBERS` members;
* a part that is not UTF-8 (a UTF-16 part could hide a DTD from the byte search);
* an OLE compound document (a password-protected workbook or a legacy .xls).

:class:`PartCache` lets a batch parse byte-identical parts once. Writing an updated copy of a
package is :mod:`workbook_builder.xlsx.rewrite`.

Every problem raises :class:`PackageError` (a ``ValueError``) with a reason fit for a report.
"""
from __future__ import annotations

import importlib.util
import posixpath
import re
import zipfile
import zlib
from pathlib import Path
from typing import Any
from xml.etree.ElementTree import ParseError, fromstring

import openpyxl.xml
from openpyxl.formula.translate import Translator
from openpyxl.utils import column_index_from_string, get_column_letter

__all__ = ["assert_defusedxml", "PackageError", "Book", "Sheet", "Cell", "open_package", "PartCache", "sheet_parts",
           "split_coord", "MAX_MEMBER_BYTES", "MAX_PACKAGE_BYTES", "MAX_RATIO", "MAX_MEMBERS"]

#: Largest uncompressed size of one package member and of the whole package [bytes]. A
#: swaytune workbook is a few MB uncompressed (its Nonlinear sheet's time histories included).
MAX_MEMBER_BYTES = 64 * 1024 * 1024
MAX_PACKAGE_BYTES = 96 * 1024 * 1024
#: Largest compression ratio accepted for a member larger than 1 MB, and for the whole package
#: once it is over 4 MB uncompressed (zip bombs; a workbook deflates about 5 to 20 times) [-].
MAX_RATIO = 200.0
#: Largest number of members of a package [-].
MAX_MEMBERS = 5000

_DECLARED_ENCODING = re.compile(rb'^\s*<\?xml[^>]*encoding\s*=\s*["\']([A-Za-z0-9._-]+)["\']')
_UTF8 = re.compile(rb"^(?i:utf-?8|us-ascii|ascii)$")
_OLE_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
_NS_MAIN = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
_NS_REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
_NS_PKG_REL = "http://schemas.openxmlformats.org/package/2006/relationships"


def assert_defusedxml() -> None:
    """Check that defusedxml is installed and that openpyxl uses it.

    Untrusted workbooks are read by this module's own parser (DTDs refused); openpyxl, which
    reads a firm's template and a user's edited workbook elsewhere, must resolve no entities.

    Raises
    ------
    RuntimeError
        When defusedxml is missing or openpyxl was imported without it.
    """
    if importlib.util.find_spec("defusedxml") is None:  # pragma: no cover - a dependency
        raise RuntimeError("defusedxml is not installed; it is required to read untrusted "
                           "workbooks safely (pip install defusedxml)")
    if not getattr(openpyxl.xml, "DEFUSEDXML", False):  # pragma: no cover
        raise RuntimeError("openpyxl is not using defusedxml (OPENPYXL_DEFUSEDXML set to "
                           "False?); refusing to read untrusted workbooks")


class PackageError(ValueError):
    """A package that cannot be read or written; the message says why."""


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

    def name_range(self, name: str) -> tuple[str, list[Cell]] | None:
        """The sheet and the cells (row by row) of a name that refers to a range."""
        dn = self.defined_names.get(name)
        if dn is None:
            return None
        dests = list(dn.destinations)
        if len(dests) != 1 or dests[0][0] not in self.sheets:
            return None
        sheet, ref = dests[0]
        first, _, last = ref.replace("$", "").upper().partition(":")
        (r1, c1), (r2, c2) = split_coord(first), split_coord(last or first)
        ws = self.sheets[sheet]
        return sheet, [ws.cell(r, c) for r in range(r1, r2 + 1) for c in range(c1, c2 + 1)]

    def named(self, name: str) -> Cell | None:
        loc = self.name_cell(name)
        return None if loc is None else self.sheets[loc[0]].get(loc[1])


#: Cell type of a value cell by its ``t`` attribute (anything else is a number).
_CELL_TYPES = {"s": "s", "str": "s", "inlineStr": "s", "b": "b", "e": "e"}

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
    declared = _DECLARED_ENCODING.match(data[:200])
    if data[:2] in (b"\xff\xfe", b"\xfe\xff") or b"\x00" in data[:4] or (
            declared is not None and not _UTF8.match(declared.group(1))):
        # UTF-16 or -32 (with or without a byte-order mark) or another declared encoding: the
        # byte search for a DTD below would miss it, and a workbook part is always UTF-8
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
            if len(infos) > MAX_MEMBERS:
                raise PackageError(f"refused: the package has {len(infos)} members (limit "
                                  f"{MAX_MEMBERS})")
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
            compressed = sum(i.compress_size for i in infos)
            if total > MAX_PACKAGE_BYTES or (total > 4_000_000
                                             and total > MAX_RATIO * max(compressed, 1)):
                raise PackageError(f"refused: package is {total} bytes uncompressed from "
                                  f"{compressed} bytes (limit {MAX_PACKAGE_BYTES}, ratio "
                                  f"{MAX_RATIO:g})")
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
        book.sheets[title] = _cached_sheet(cache, title, data[part], part, strings,
                                           strings_raw)
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
                    dtype = _CELL_TYPES.get(t, "n")
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
