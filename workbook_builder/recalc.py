# SPDX-License-Identifier: MIT
"""Batch recalculation of swaytune workbooks from Python and the command line.

``python -m workbook_builder recalc PATH... [-o OUTDIR] [--in-place] [--jobs N]`` reads each
workbook's inputs from its defined names (the value the user typed in the yellow cell and the
unit written beside it), recomputes every result with the engine (``functions.design``) and
writes an updated workbook:

* formulas are left exactly as they are in the file (a user's edit is reported, never fixed);
* every formula cell of swaytune's sheets gets a fresh cached value, computed from the formula
  text in the file (so a viewer that does not recalculate shows what the formula computes);
* engine-only values (results without a closed form, the input snapshots beside them, the engine
  column of the cross-checks, the chart tables and chart data caches) are refreshed;
* everything else in the package (styles, charts, a firm's own sheets) is copied unchanged.

The output goes to OUTDIR, or replaces the original only with ``--in-place``, which keeps a
backup and writes atomically (temporary file in the same folder, then :func:`os.replace`). A
file that fails (not a workbook, corrupted, truncated, password-protected, a newer format,
missing names, an input outside its valid range, a formula swaytune cannot evaluate) fails
alone with its reason and nothing is written for it.

Each workbook is checked: every formula is compared with the one the builder writes for the
same layout (:func:`workbook_builder.build.build_workbook`), and every result's formula value
with the engine's. The batch writes a summary workbook and CSV (one row per workbook: key
inputs and results, every check verdict, what changed since the last calculation, issues).

The package is read with the standard library's zip reader and ``defusedxml`` (entity
expansion, external entities and DTDs refused), with limits on member sizes. Untrusted files
are never opened with a parser that resolves entities; :func:`assert_defusedxml` checks that
openpyxl itself runs with defusedxml.

Preliminary design aid: results must be checked by a licensed engineer against local codes,
wind-tunnel data and the manufacturer's design.
"""
from __future__ import annotations

import csv
import datetime as _dt
import hashlib
import math
import os
import re
import shutil
import signal
import sys
import time
import zipfile
import zlib
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Iterable, Mapping, Sequence

from . import __version__

__all__ = [
    "RecalcError", "Issue", "RecalcResult", "BatchSummary", "WorkbookData",
    "read_workbook", "read_inputs", "recalc_workbook", "write_results", "recalc_many",
    "write_summary", "main_recalc", "assert_defusedxml", "collect_paths", "FORMAT_NAME",
    "SUMMARY_STEM",
]

#: Defined name holding the workbook's format number (an integer, raised by the builder whenever
#: the layout or a formula changes). A workbook with a higher number, or made by a newer swaytune
#: when no format mark is present, is refused rather than misread.
FORMAT_NAME = "SWAYTUNE_FORMAT"


def _current_format() -> int:
    """Format number the builder writes now (``build.FORMAT_VERSION``; 1 until it has one)."""
    from . import build
    return int(getattr(build, "FORMAT_VERSION", 1))


#: File stem of the batch summary (``recalc_summary.xlsx`` and ``.csv``); folder scans skip it.
SUMMARY_STEM = "recalc_summary"

#: Largest uncompressed size of one package member and of the whole package [bytes].
MAX_MEMBER_BYTES = 64 * 1024 * 1024
MAX_PACKAGE_BYTES = 256 * 1024 * 1024
#: Largest compression ratio accepted for a member larger than 1 MB (zip bombs) [-].
MAX_RATIO = 200.0

_OLE_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
_NS_REL_DOC = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
_REL_PKG = "http://schemas.openxmlformats.org/package/2006/relationships"
#: Relative tolerance below which a value counts as unchanged since the last calculation [-].
CHANGE_TOLERANCE = 1e-12


class RecalcError(ValueError):
    """A workbook that cannot be recalculated; the message says why (shown in the summary)."""


def assert_defusedxml() -> None:
    """Check that defusedxml is installed and that openpyxl uses it.

    Raises
    ------
    RuntimeError
        When defusedxml is missing or openpyxl was imported without it.
    """
    try:
        import defusedxml.ElementTree  # noqa: F401
    except ImportError as exc:  # pragma: no cover - a declared dependency
        raise RuntimeError("defusedxml is not installed; it is required to read untrusted "
                           "workbooks safely (pip install defusedxml)") from exc
    import openpyxl.xml
    if not getattr(openpyxl.xml, "DEFUSEDXML", False):  # pragma: no cover
        raise RuntimeError("openpyxl is not using defusedxml (OPENPYXL_DEFUSEDXML set to "
                           "False?); refusing to read untrusted workbooks")


# =============================================================================== data types
@dataclass(frozen=True)
class Issue:
    """Something found in one workbook.

    ``kind`` is one of ``formula_edited``, ``formula_replaced`` (a builder formula overwritten by
    a value), ``formula_added`` (a formula where the builder writes a value), ``engine_mismatch``
    (a formula's value differs from the engine's), ``stale_engine_value`` (engine values recalc
    does not recompute, computed for other inputs), ``error_value``, ``unit_factor``,
    ``verdict_mismatch``, ``layout`` and ``note``. ``old`` is what the builder writes (or the
    engine's value), ``new`` what the file holds.
    """

    kind: str
    where: str
    message: str
    old: str = ""
    new: str = ""

    def __str__(self) -> str:
        return f"{self.where}: {self.message}"


@dataclass
class RecalcResult:
    """Outcome of recalculating one workbook.

    ``status`` is ``"OK"`` (recalculated, every check OK), ``"NOT OK"`` (recalculated, some
    check NOT OK) or ``"FAILED"`` (nothing written; ``error`` says why).
    """

    path: Path
    output: Path | None = None
    error: str | None = None
    inputs: dict[str, Any] = field(default_factory=dict)       # DesignInputs kwargs (SI)
    typed: dict[str, tuple[Any, str]] = field(default_factory=dict)   # as typed, with unit
    results: dict[str, Any] = field(default_factory=dict)      # named cells, new values
    previous: dict[str, Any] = field(default_factory=dict)     # named cells, old cached values
    changes: list[tuple[str, Any, Any]] = field(default_factory=list)
    checks: list[tuple[str, str]] = field(default_factory=list)   # (check, "OK"/"NOT OK")
    issues: list[Issue] = field(default_factory=list)
    backup: Path | None = None
    seconds: float = 0.0
    design: Any = None                                          # engine DesignResult

    @property
    def failed(self) -> bool:
        return self.error is not None

    @property
    def checks_ok(self) -> bool:
        return not self.failed and all(v == "OK" for _, v in self.checks)

    @property
    def status(self) -> str:
        if self.failed:
            return "FAILED"
        return "OK" if self.checks_ok else "NOT OK"


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
        return [r for r in self.results if not r.failed and not r.checks_ok]

    @property
    def exit_status(self) -> int:
        """0 when every workbook was recalculated and every check is OK, else 1 (130: Ctrl-C)."""
        if self.interrupted:
            return 130
        return 1 if (self.failed or self.not_ok) else 0

    def table(self) -> list[dict[str, Any]]:
        """One flat row per workbook (the CSV rows), for a notebook or a DataFrame."""
        return [_summary_row(r) for r in self.results]


# =============================================================================== package
class _Cell:
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
        return f"{_col_letter(self.column)}{self.row}"

    @property
    def formula(self) -> str | None:
        return self.value if self.data_type == "f" else None


class _Sheet:
    def __init__(self, title: str):
        self.title = title
        self.cells: dict[tuple[int, int], _Cell] = {}

    def cell(self, row: int, column: int) -> _Cell:
        c = self.cells.get((row, column))
        if c is None:
            c = _Cell(row, column, None, "n")
        return c

    def iter_rows(self):
        rows: dict[int, list[_Cell]] = {}
        for (r, _c), cell in sorted(self.cells.items()):
            rows.setdefault(r, []).append(cell)
        for r in sorted(rows):
            yield rows[r]

    def get(self, coord: str) -> _Cell:
        r, c = _split_coord(coord)
        return self.cell(r, c)


class _DefinedName:
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


class _Names(dict):
    """Workbook-scoped defined names (``items()`` as openpyxl's DefinedNameDict)."""


class _Book:
    """The parts of a workbook package the recalculation reads (duck-types openpyxl's)."""

    def __init__(self):
        self.members: list[tuple[zipfile.ZipInfo, bytes]] = []
        self.sheets: dict[str, _Sheet] = {}
        self.sheet_parts: dict[str, str] = {}
        self.defined_names = _Names()
        self.local_names: dict[str, str] = {}
        self.custom_props: dict[str, str] = {}

    @property
    def sheetnames(self) -> dict[str, _Sheet]:
        return self.sheets          # supports `in` and iteration in sheet order, no copy

    def __getitem__(self, title: str) -> _Sheet:
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

    def named(self, name: str) -> _Cell | None:
        loc = self.name_cell(name)
        return None if loc is None else self.sheets[loc[0]].get(loc[1])


def _col_letter(n: int) -> str:
    s = ""
    while n:
        n, r = divmod(n - 1, 26)
        s = chr(65 + r) + s
    return s


def _col_index(letters: str) -> int:
    n = 0
    for ch in letters.upper():
        n = n * 26 + ord(ch) - 64
    return n


_COORD_RE = re.compile(r"\$?([A-Za-z]{1,3})\$?(\d+)")


_COORD_CACHE: dict[str, tuple[int, int]] = {}


def _split_coord(coord: str) -> tuple[int, int]:
    hit = _COORD_CACHE.get(coord)
    if hit is not None:
        return hit
    m = _COORD_RE.fullmatch(coord)
    if not m:
        raise RecalcError(f"cell reference {coord!r} is not valid")
    out = _COORD_CACHE[coord] = (int(m.group(2)), _col_index(m.group(1)))
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
        raise RecalcError(f"refused: part {part} is not UTF-8 encoded XML")
    if b"<!DOCTYPE" in data or b"<!ENTITY" in data:
        raise RecalcError(f"refused: part {part} holds a DTD or XML entity declarations; a "
                          "workbook never needs them (possible entity-expansion attack)")
    try:
        return fromstring(data)
    except ParseError as exc:
        raise RecalcError(f"corrupted workbook: part {part} is not well-formed XML ({exc})") \
            from None


def _open_package(path: Path) -> _Book:
    """Read a .xlsx package safely; raise RecalcError with a clear reason otherwise."""
    try:
        with open(path, "rb") as fh:
            head = fh.read(8)
    except IsADirectoryError:
        raise RecalcError("is a directory, not a workbook") from None
    except FileNotFoundError:
        raise RecalcError("file not found") from None
    except OSError as exc:
        raise RecalcError(f"cannot be read: {exc.strerror or exc}") from None
    if not head:
        raise RecalcError("empty file (0 bytes): not a workbook")
    if head == _OLE_MAGIC:
        raise RecalcError("password-protected (encrypted) workbook or legacy .xls file (OLE "
                          "compound document): swaytune cannot read it; save a copy without a "
                          "password as .xlsx")
    if not head.startswith(b"PK"):
        raise RecalcError("not a workbook: the file is not an .xlsx package (zip)")
    book = _Book()
    try:
        with zipfile.ZipFile(path) as zf:
            infos = zf.infolist()
            total = 0
            for info in infos:
                if info.flag_bits & 0x1:
                    raise RecalcError("encrypted zip member: not a workbook swaytune can read")
                if info.file_size > MAX_MEMBER_BYTES or (
                        info.file_size > 1_000_000
                        and info.file_size > MAX_RATIO * max(info.compress_size, 1)):
                    raise RecalcError(f"refused: package member {info.filename} is "
                                      f"{info.file_size} bytes uncompressed (limit "
                                      f"{MAX_MEMBER_BYTES}, ratio {MAX_RATIO:g})")
                total += info.file_size
            if total > MAX_PACKAGE_BYTES:
                raise RecalcError(f"refused: package is {total} bytes uncompressed (limit "
                                  f"{MAX_PACKAGE_BYTES})")
            names = {i.filename for i in infos}
            if "xl/workbook.xml" not in names:
                raise RecalcError("not an Excel workbook: the package has no xl/workbook.xml")
            for info in infos:
                book.members.append((info, zf.read(info)))
    except RecalcError:
        raise
    except zipfile.BadZipFile as exc:
        raise RecalcError(f"corrupted or truncated workbook: not a valid zip package ({exc})") \
            from None
    except (EOFError, zlib.error, UnicodeDecodeError, NotImplementedError, ValueError,
            OverflowError) as exc:
        raise RecalcError(f"corrupted or truncated workbook: the zip package cannot be read "
                          f"({type(exc).__name__}: {exc})") from None
    data = {info.filename: raw for info, raw in book.members}
    _read_workbook_part(book, data)
    strings = _read_shared_strings(data)
    for title, part in book.sheet_parts.items():
        if part not in data:
            raise RecalcError(f"corrupted workbook: sheet {title!r} part {part} is missing")
        book.sheets[title] = _read_sheet(title, data[part], part, strings)
    if "docProps/custom.xml" in data:
        root = _parse_xml(data["docProps/custom.xml"], "docProps/custom.xml")
        for prop in root:
            name = prop.get("name")
            texts = [child.text or "" for child in prop]
            if name:
                book.custom_props[name] = texts[0] if texts else ""
    return book


def _read_workbook_part(book: _Book, data: dict[str, bytes]) -> None:
    import posixpath
    root = _parse_xml(data["xl/workbook.xml"], "xl/workbook.xml")
    rels_part = "xl/_rels/workbook.xml.rels"
    if rels_part not in data:
        raise RecalcError("corrupted workbook: xl/_rels/workbook.xml.rels is missing")
    rels = _parse_xml(data[rels_part], rels_part)
    targets = {r.get("Id"): r.get("Target") for r in rels if _local(r.tag) == "Relationship"}
    order: list[str] = []
    for el in root.iter():
        tag = _local(el.tag)
        if tag == "sheet":
            rid = next((v for k, v in el.attrib.items() if _local(k) == "id"), None)
            target = targets.get(rid)
            if target is None:
                continue
            part = target.lstrip("/") if target.startswith("/") else posixpath.normpath(
                posixpath.join("xl", target))
            if "worksheets/" not in part:
                continue            # chartsheets and the like carry no cells
            book.sheet_parts[el.get("name")] = part
            order.append(el.get("name"))
        elif tag == "definedName":
            name = el.get("name") or ""
            text = el.text or ""
            hidden = el.get("hidden") in ("1", "true")
            if el.get("localSheetId") is not None:
                book.local_names[name] = text
                continue
            book.defined_names[name] = _DefinedName(name, text, False, hidden)


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


def _read_sheet(title: str, raw: bytes, part: str, strings: list[str]) -> _Sheet:
    from openpyxl.formula.translate import Translator
    root = _parse_xml(raw, part)
    ns = root.tag[:root.tag.index("}") + 1] if root.tag.startswith("{") else ""
    t_sheetdata, t_row, t_c, t_f, t_v, t_is = (ns + x for x in ("sheetData", "row", "c", "f",
                                                                 "v", "is"))
    sheet = _Sheet(title)
    cells = sheet.cells
    shared: dict[str, tuple[str, str]] = {}       # si -> (formula, origin coordinate)
    pending_shared: list[tuple[_Cell, str, str]] = []
    for sd in root.iter(t_sheetdata):
        for row_el in sd.iter(t_row):
            for c in row_el.iter(t_c):
                ref = c.get("r")
                if ref is None:
                    raise RecalcError(f"corrupted workbook: a cell of sheet {title!r} has no "
                                      "reference (r attribute)")
                r, col = _split_coord(ref)
                t = c.get("t", "n")
                if t == "n" and len(c) == 1 and c[0].tag == t_v:
                    vtext = c[0].text                # fast path: a plain number
                    if vtext:
                        try:
                            x = float(vtext)
                        except ValueError:
                            pass
                        else:
                            cells[(r, col)] = _Cell(r, col, x, "n", x, t)
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
                    cell = _Cell(r, col, None, "f", cached, t)
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
                    cells[(r, col)] = _Cell(r, col, cached, dtype, cached, t)
    for cell, si, ref in pending_shared:
        master = shared.get(si)
        if master is None:
            raise RecalcError(f"corrupted workbook: shared formula {si} of {title}!{ref} has "
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
            raise RecalcError(f"corrupted workbook: {title}!{ref} points at shared string "
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
        raise RecalcError(f"corrupted workbook: {title}!{ref} holds {vtext!r}, not a number") \
            from None


# =============================================================================== reading
@dataclass
class WorkbookData:
    """What :func:`read_workbook` finds in a swaytune workbook."""

    path: Path
    book: _Book
    project: Any                       # workbook_builder.project.Project
    typed: dict[str, tuple[Any, str]]  # input name -> (value as typed, unit symbol)
    value_cells: dict[str, tuple[str, str]]   # input name -> (sheet, cell) of the typed value
    generator: str
    template: bool
    issues: list[Issue] = field(default_factory=list)

    @property
    def design_kwargs(self) -> dict[str, Any]:
        """Keyword arguments of ``functions.design.DesignInputs`` (SI; modal mass from floors)."""
        from .build import _engine_modal_mass   # noqa: PLC0415 - the builder's own rule
        return self.project.design_kwargs(_engine_modal_mass(self.project))


def _version_tuple(text: str) -> tuple[int, ...]:
    nums = re.findall(r"\d+", text.split("+")[0])
    return tuple(int(n) for n in nums[:3]) if nums else (0,)


def _workbook_format(book: _Book) -> int | None:
    dn = book.defined_names.get(FORMAT_NAME)
    if dn is None:
        return None
    try:
        return int(float(dn.attr_text.strip().strip('"')))
    except ValueError:
        return None


def _check_generator(book: _Book) -> str:
    from .atomic import MARKER_NAME, MARKER_PROPERTY
    text = book.custom_props.get(MARKER_PROPERTY, "")
    if not text:
        dn = book.defined_names.get(MARKER_NAME)
        if dn is not None:
            text = dn.attr_text.strip().strip('"')
    if not text.startswith("swaytune"):
        raise RecalcError("not a swaytune workbook (no swaytune marker): only workbooks made by "
                          "'swaytune build' can be recalculated")
    fmt = book.defined_names.get(FORMAT_NAME)
    if fmt is not None:
        try:
            number = int(float(fmt.attr_text.strip().strip('"')))
        except ValueError:
            raise RecalcError(f"format mark {FORMAT_NAME}={fmt.attr_text!r} is not a "
                              "number") from None
        current = _current_format()
        if number > current:
            raise RecalcError(f"workbook format {number} is newer than this swaytune "
                              f"({__version__}) reads (format {current}); upgrade "
                              "swaytune to recalculate it")
    made = text.split(None, 1)[1] if " " in text else ""
    if made and _version_tuple(made) > _version_tuple(__version__):
        raise RecalcError(f"made by {text}, newer than this swaytune {__version__}; its "
                          "format may differ: upgrade swaytune to recalculate it")
    return text


def _header_columns(sheet: _Sheet, wanted: Sequence[str]) -> tuple[int, dict[str, int]] | None:
    """Find a row holding every header in ``wanted``; return (row, {header: column})."""
    rows: dict[int, dict[str, int]] = {}
    for (r, c), cell in sheet.cells.items():
        if isinstance(cell.value, str) and cell.data_type == "s" and cell.value in wanted:
            rows.setdefault(r, {})[cell.value] = c
    for r in sorted(rows):
        if all(w in rows[r] for w in wanted):
            return r, rows[r]
    return None


def _row_with_label(sheet: _Sheet, label: str, column: int = 1) -> int | None:
    for (r, c), cell in sorted(sheet.cells.items()):
        if c == column and cell.data_type == "s" and isinstance(cell.value, str) \
                and cell.value.strip() == label:
            return r
    return None


def _text(cell: _Cell) -> str:
    v = cell.value
    if v is None:
        return ""
    if isinstance(v, float) and v.is_integer():
        return str(int(v))
    return str(v)


def _number(book: _Book, cell: _Cell, sheet: str, what: str) -> float:
    """Numeric value of a typed cell (a constant, or a formula the user typed there)."""
    v = cell.value
    if cell.data_type == "f":
        from .formulas import Evaluator, FormulaError, is_error
        try:
            v = Evaluator(book, sheets=[]).cell(sheet, cell.row, cell.column)
        except FormulaError as exc:
            raise RecalcError(f"{what} ({sheet}!{cell.coordinate}): formula cannot be "
                              f"evaluated: {exc}") from None
        if is_error(v):
            raise RecalcError(f"{what} ({sheet}!{cell.coordinate}) evaluates to {v}")
    if isinstance(v, bool) or not isinstance(v, (int, float)):
        shown = "empty" if v in (None, "") else repr(v)
        raise RecalcError(f"{what} ({sheet}!{cell.coordinate}) is {shown}, not a number")
    v = float(v)
    if not math.isfinite(v):
        raise RecalcError(f"{what} ({sheet}!{cell.coordinate}) is {v!r}, not a finite number")
    return v


def _expected_names(method: str, mode: str) -> list[str]:
    """Names a workbook must define: every result the engine cross-checks.

    Helper names (``var_*``, the Pendulum sheet's) are not required: the file's own formulas
    are evaluated whatever they are, and the comparison with the builder's layout reports any
    difference.
    """
    from .calcsheet import all_steps
    return [item.name for item in all_steps(method, mode) if item.engine]


def read_workbook(path: str | os.PathLike, *, overrides: Mapping[str, float] | None = None
                  ) -> WorkbookData:
    """Read a swaytune workbook: layout, inputs as typed (with units), project.

    Parameters
    ----------
    path : path-like
        The workbook (.xlsx) [-].
    overrides : mapping, optional
        Input name (``functions.design`` field such as ``"frequency"``, or its defined name
        such as ``"structure_frequency"``) -> value in the unit shown beside the input in the
        workbook; replaces the typed value (used for parameter studies) [-].

    Returns
    -------
    data : WorkbookData
        Project (inputs in SI and as typed), the cells of the typed values, issues [-].

    Raises
    ------
    RecalcError
        For a file that is not a readable swaytune workbook (the message says why), a newer
        format, missing defined names, an unknown unit, a value that is not a number or is
        outside its valid range.
    """
    assert_defusedxml()
    from .calcsheet import INPUT_NAMES
    from .project import INPUT_SPECS, TUNING_METHODS, InputValue, Project
    from .template import FIELD_LABELS, TITLE_BLOCK_NAMES
    from .units import DEFAULT_UNITS, unit_for

    path = Path(path)
    book = _open_package(path)
    generator = _check_generator(book)
    issues: list[Issue] = []
    if "Inputs" not in book:
        raise RecalcError("missing sheet 'Inputs': the workbook's layout is damaged")
    inputs_ws = book["Inputs"]
    head = _header_columns(inputs_ws, ("Value", "Unit", "Factor to SI", "Value (SI)"))
    if head is None:
        raise RecalcError("the Inputs sheet has no header row (Value, Unit, Factor to SI, "
                          "Value (SI)): the layout is damaged")
    _, cols = head
    overrides = dict(overrides or {})
    by_defined = {v: k for k, v in INPUT_NAMES.items()}
    for key in list(overrides):
        if key in by_defined:
            overrides[by_defined[key]] = overrides.pop(key)
    unknown = sorted(set(overrides) - set(INPUT_NAMES))
    if unknown:
        raise RecalcError(f"unknown input(s) {unknown}; use one of {sorted(INPUT_NAMES)}")

    missing = [INPUT_NAMES[s.name] for s in INPUT_SPECS
               if not s.optional and book.name_cell(INPUT_NAMES[s.name]) is None]
    if missing:
        raise RecalcError(f"missing defined name(s) {', '.join(missing)}: the workbook's "
                          "layout is damaged (rebuild it from its project file)")
    floors_mode = False
    mm_cell = book.named("modal_mass")
    if mm_cell is not None and mm_cell.data_type == "f" and \
            "modal_mass_from_floors" in mm_cell.value.lower():
        floors_mode = True

    typed: dict[str, tuple[Any, str]] = {}
    value_cells: dict[str, tuple[str, str]] = {}
    inputs: dict[str, Any] = {}
    bad: list[str] = []
    for spec in INPUT_SPECS:
        name = INPUT_NAMES[spec.name]
        if spec.name == "modal_mass" and floors_mode:
            continue
        loc = book.name_cell(name)
        if loc is None:
            if spec.name in overrides:
                raise RecalcError(f"input {spec.name} is not in this workbook (its layout has "
                                  "no cell for it)")
            continue
        sheet, coord = loc
        if sheet != "Inputs":
            raise RecalcError(f"defined name {name} points at {sheet}!{coord}, not at the "
                              "Inputs sheet: the layout is damaged")
        row, _ = _split_coord(coord)
        vcell = inputs_ws.cell(row, cols["Value"])
        unit_text = _text(inputs_ws.cell(row, cols["Unit"])).strip()
        try:
            unit = unit_for(spec.kind, unit_text)
        except ValueError as exc:
            raise RecalcError(f"input {spec.name} (Inputs!{_col_letter(cols['Unit'])}{row}): "
                              f"{exc}") from None
        what = f"input {spec.name}"
        if spec.name in overrides:
            value = float(overrides.pop(spec.name))
            if not math.isfinite(value):
                raise RecalcError(f"{what}: override {value!r} is not a finite number")
        else:
            value = _number(book, vcell, "Inputs", what)
        fcell = inputs_ws.cell(row, cols["Factor to SI"])
        if not (isinstance(fcell.value, float) and
                math.isclose(fcell.value, unit.factor, rel_tol=1e-15, abs_tol=0.0)):
            issues.append(Issue("unit_factor", f"Inputs!{fcell.coordinate}",
                                f"factor to SI {fcell.value!r} does not match unit "
                                f"{unit.symbol!r} ({unit.factor!r}); the engine uses "
                                f"{unit.factor!r}", repr(unit.factor), repr(fcell.value)))
        si = value * unit.factor
        if not spec.contains(si):
            bad.append(f"{spec.name}={value:g} {unit.symbol} must be in "
                       f"{spec.interval(unit.factor)} [{unit.symbol}] "
                       f"(Inputs!{vcell.coordinate})")
        typed[spec.name] = (value, unit.symbol)
        value_cells[spec.name] = ("Inputs", vcell.coordinate)
        inputs[spec.name] = InputValue(spec, value, unit, si, spec.note, True, None)
    if overrides:
        raise RecalcError(f"input(s) {sorted(overrides)} are not in this workbook")
    if "mass_ratio" in inputs and "damper_mass" in inputs:
        raise RecalcError("both chosen_mass_ratio and chosen_damper_mass are defined: the "
                          "layout is damaged")
    lo, hi = inputs.get("mass_ratio_min"), inputs.get("mass_ratio_max")
    if lo is not None and hi is not None and lo.si >= hi.si:
        bad.append(f"mass_ratio_max={hi.si:g} must be above mass_ratio_min={lo.si:g} [-]")
    if bad:
        raise RecalcError("input(s) outside their valid range: " + "; ".join(bad))

    row = _row_with_label(inputs_ws, "Tuning method")
    method = _text(inputs_ws.cell(row, cols["Value"])).strip() if row else ""
    if method not in TUNING_METHODS:
        raise RecalcError(f"tuning method {method!r} (Inputs sheet) must be one of "
                          f"{list(TUNING_METHODS)}")
    floors = _read_floors(book, inputs_ws) if floors_mode else None

    # Identification (title block, structure/client rows, record) for the reference layout.
    info: dict[str, str] = {}
    summary = book.sheets.get("Summary")
    labels = {}
    if summary is not None:
        for (r, c), cell in summary.cells.items():
            if cell.data_type == "s" and isinstance(cell.value, str) and r <= 12:
                labels.setdefault(cell.value.strip(), (r, c))
    for key, dname in TITLE_BLOCK_NAMES.items():
        cell = book.named(dname)
        if cell is None and FIELD_LABELS.get(key) in labels:
            r, c = labels[FIELD_LABELS[key]]
            cell = summary.cell(r, c + 1)
        info[{"project_number": "number"}.get(key, key)] = "" if cell is None else _text(cell)
    template = bool(book.sheets) and next(iter(book.sheets)) != "Summary"
    for label, key in (("Structure", "structure"), ("Client", "client")):
        r = _row_with_label(summary, label) if summary is not None else None
        info[key] = _text(summary.cell(r, 2)) if r else ""
    note_row = _row_with_label(inputs_ws, "Notes")
    info["notes"] = _text(inputs_ws.cell(note_row + 1, 1)) if note_row else ""
    record = book.sheets.get("Record")
    system = "SI"
    source_name = path.name
    if record is not None:
        r = _row_with_label(record, "Unit system of the project")
        if r and _text(record.cell(r, 2)) in DEFAULT_UNITS:
            system = _text(record.cell(r, 2))
        r = _row_with_label(record, "Source file")
        if r and _text(record.cell(r, 2)):
            source_name = _text(record.cell(r, 2))
    calc = book.sheets.get("Calculation")
    if calc is not None and _header_columns(calc, ("Value (US)",)) is not None:
        system = "US"
    project = Project(source_name=source_name,
                      source_sha256=hashlib.sha256(path.name.encode()).hexdigest(), info=info,
                      units=system, paper="Letter" if system == "US" else "A4", inputs=inputs,
                      tuning_method=method, floors=floors, case="")

    from .calcsheet import mass_ratio_mode
    mode = mass_ratio_mode(project)
    missing = [n for n in _expected_names(method, mode) if book.name_cell(n) is None]
    if floors_mode:
        missing += [n for n in ("modal_mass_from_floors", "building_height", "mode_exponent")
                    if book.name_cell(n) is None]
    if missing:
        raise RecalcError(f"missing defined name(s) {', '.join(missing)} for tuning method "
                          f"{method!r}: the layout is damaged, laid out for another method or "
                          "made by another swaytune version (rebuild it from its project file)")
    _check_layout_method(book, method, mode)
    return WorkbookData(path, book, project, typed, value_cells, generator, template, issues)


def _check_layout_method(book: _Book, method: str, mode: str) -> None:
    """Refuse a tuning method whose layout differs from the file's (engine value vs formula)."""
    from .calcsheet import EngineValue, all_steps
    for item in all_steps(method, mode):
        cell = book.named(item.name)
        if cell is None:
            continue
        is_engine = isinstance(item, EngineValue)
        if is_engine and cell.data_type == "f" and item.name == "tuning_ratio":
            raise RecalcError(f"tuning method {method!r} needs engine values, but the "
                              "Calculation sheet is laid out with closed-form formulas: the "
                              "method was changed after the build; rebuild the workbook")
        if not is_engine and item.name == "tuning_ratio" and cell.data_type != "f":
            raise RecalcError(f"tuning method {method!r} has a closed form, but the "
                              "Calculation sheet holds an engine value for it: the method was "
                              "changed after the build; rebuild the workbook")


_BRACKET_UNIT_RE = re.compile(r"\[([^\]]+)\]\s*$")


def _read_floors(book: _Book, ws: _Sheet):
    from functions.structure import MODE_SHAPE_EXPONENTS
    from .project import Floors
    from .units import unit_for

    head = _header_columns_prefix(ws, "Floor")
    if head is None:
        raise RecalcError("the Inputs sheet has a modal mass from floors but no floor table "
                          "header ('Floor'): the layout is damaged")
    hrow = head
    htext = _text(ws.cell(hrow, 3))
    mtext = _text(ws.cell(hrow, 4))
    try:
        hu = unit_for("length", _BRACKET_UNIT_RE.search(htext).group(1).strip())
        mu = unit_for("mass", _BRACKET_UNIT_RE.search(mtext).group(1).strip())
    except (AttributeError, ValueError) as exc:
        raise RecalcError(f"floor table header {htext!r} / {mtext!r}: units cannot be "
                          f"read ({exc})") from None
    heights, masses = [], []
    r = hrow + 1
    while isinstance(ws.cell(r, 1).value, float):
        heights.append(_number(book, ws.cell(r, 3), "Inputs", f"floor {len(heights) + 1} "
                                                              "height"))
        masses.append(_number(book, ws.cell(r, 4), "Inputs", f"floor {len(masses) + 1} mass"))
        r += 1
    if not heights:
        raise RecalcError("the floor table has no floors")
    if any(h <= 0 for h in heights) or any(m <= 0 for m in masses):
        raise RecalcError("input(s) outside their valid range: floor heights and masses must "
                          "be > 0")

    def typed_of(name: str) -> float:
        sheet, coord = book.name_cell(name)
        row, _ = _split_coord(coord)
        return _number(book, book[sheet].cell(row, 3), sheet, name)

    h = typed_of("building_height")
    exponent = typed_of("mode_exponent")
    if h <= 0 or max(heights) > h:
        raise RecalcError(f"input(s) outside their valid range: building height {h:g} must be "
                          "> 0 and not below the highest floor")
    if not 0 < exponent <= 5:
        raise RecalcError(f"input(s) outside their valid range: mode shape exponent "
                          f"{exponent:g} must be in (0, 5] [-]")
    lr = _row_with_label(ws, "Damper at floor (1-based)")
    level = int(_number(book, ws.cell(lr, 3), "Inputs", "damper floor")) if lr else len(heights)
    if not 1 <= level <= len(heights):
        raise RecalcError(f"input(s) outside their valid range: damper floor {level} must be "
                          f"in [1, {len(heights)}]")
    label_row = _row_with_label_prefix(ws, "Mode shape exponent")
    stype = None
    if label_row:
        m = re.search(r"\(([^)]+)\)\s*$", _text(ws.cell(label_row, 1)))
        if m and m.group(1) in MODE_SHAPE_EXPONENTS:
            stype = m.group(1)
    return Floors(tuple(heights), tuple(masses), hu, mu, h, exponent, stype, level)


def _header_columns_prefix(ws: _Sheet, label: str) -> int | None:
    for (r, c), cell in sorted(ws.cells.items()):
        if c == 1 and cell.data_type == "s" and cell.value == label:
            nxt = ws.cell(r, 3)
            if isinstance(nxt.value, str) and nxt.value.startswith("Height"):
                return r
    return None


def _row_with_label_prefix(ws: _Sheet, prefix: str) -> int | None:
    for (r, c), cell in sorted(ws.cells.items()):
        if c == 1 and cell.data_type == "s" and isinstance(cell.value, str) \
                and cell.value.startswith(prefix):
            return r
    return None


def read_inputs(path: str | os.PathLike) -> dict[str, Any]:
    """Read a workbook's inputs as keyword arguments of the engine's design chain.

    .. math::

        x_{SI} = x_{typed} \\cdot \\mathrm{factor}(\\mathrm{unit})

    Parameters
    ----------
    path : path-like
        A workbook made by ``swaytune build`` [-].

    Returns
    -------
    inputs : dict
        ``functions.design.DesignInputs`` fields in SI units (``frequency`` [Hz],
        ``modal_mass`` [kg], ``acceleration`` [m/s^2], ...), ``tuning_method``; the modal
        mass of a floor table is computed from the floors [-].

    Raises
    ------
    RecalcError
        See :func:`read_workbook`.

    Examples
    --------
    >>> import tempfile, pathlib
    >>> from workbook_builder.project import parse_project
    >>> from workbook_builder.build import write_workbook
    >>> project = parse_project({"mode": {"frequency": 0.2, "modal_mass":
    ...     {"value": 9000, "unit": "t"}, "structural_damping": 0.01},
    ...     "wind": {"acceleration": 0.25, "acceleration_limit": 0.15},
    ...     "damper": {"mass_ratio": 0.02, "clearance": 1.5}}, source="demo.toml")
    >>> out = pathlib.Path(tempfile.mkdtemp()) / "demo.xlsx"
    >>> _ = write_workbook(project, out)
    >>> kw = read_inputs(out)
    >>> kw["modal_mass"], kw["mass_ratio"], kw["tuning_method"]
    (9000000.0, 0.02, 'h2')
    """
    return read_workbook(path).design_kwargs


# =============================================================================== engine values
def _engine_constants(data: WorkbookData, result) -> tuple[dict[tuple[str, str], float],
                                                            list[Issue]]:
    """New values of every engine-only constant cell: (sheet, cell) -> value."""
    from .calcsheet import INPUT_NAMES, EngineValue, all_steps
    book = data.book
    out: dict[tuple[str, str], float] = {}
    issues: list[Issue] = []
    by_defined = {v: k for k, v in INPUT_NAMES.items()}

    def engine_value(name: str) -> float:
        if hasattr(result, name):
            return float(getattr(result, name))
        spec_name = by_defined.get(name)
        if spec_name == "modal_mass":
            return float(result.inputs.modal_mass)
        if spec_name is not None:
            return float(data.project.si(spec_name))
        raise RecalcError(f"no engine value for {name!r}")

    steps = all_steps(data.project.tuning_method, _mode(data))
    for item in steps:
        if isinstance(item, EngineValue):
            loc = book.name_cell(item.name)
            cell = book[loc[0]].get(loc[1])
            if cell.data_type == "f":
                issues.append(Issue("formula_added", f"{loc[0]}!{loc[1]}",
                                    f"engine value {item.name} was replaced by a formula; "
                                    "kept as it is (not refreshed)", "engine value",
                                    cell.value))
                continue
            out[loc] = engine_value(item.engine)

    # Snapshots of the inputs of each refreshed engine value, read from its flag formula. Only
    # the flag that follows a refreshed group of engine values is refreshed: a flag guarding
    # values recalc does not recompute (the Nonlinear sheet's simulation) keeps its snapshots,
    # so it says "INPUTS CHANGED" when they are stale, never "current".
    flags = []
    for name in book.defined_names:
        if name.startswith("engine_flag_"):
            loc = book.name_cell(name)
            cell = book[loc[0]].get(loc[1]) if loc else None
            if cell is not None and cell.data_type == "f":
                flags.append((loc[0], _split_coord(loc[1])[0], name, cell))
    refreshed_groups = []
    group: list = []
    for item in steps:
        if isinstance(item, EngineValue) and group and item.depends_on == group[-1].depends_on:
            group.append(item)
            continue
        if group:
            refreshed_groups.append(group)
        group = [item] if isinstance(item, EngineValue) else []
    if group:
        refreshed_groups.append(group)
    for grp in refreshed_groups:
        last = book.name_cell(grp[-1].name)
        if last is None or (last[0], last[1]) not in out:
            continue                                  # not refreshed (a formula now)
        last_row = _split_coord(last[1])[0]
        after = sorted((row, name, cell) for sh, row, name, cell in flags
                       if sh == last[0] and row > last_row)
        if not after:
            continue
        _, fname, fcell = after[0]
        deps = re.findall(r"ABS\(([A-Za-z_][A-Za-z0-9_.]*)-\$?([A-Z]{1,3})\$?(\d+)\)",
                          fcell.value)
        if tuple(d for d, _, _ in deps) != tuple(grp[0].depends_on):
            issues.append(Issue("layout", f"{last[0]}!{fcell.coordinate} ({fname})",
                                "the flag does not check the inputs its engine values depend "
                                f"on ({', '.join(grp[0].depends_on)}); snapshots not refreshed"))
            continue
        for dep, col, row in deps:
            snap = book[last[0]].cell(int(row), _col_index(col))
            if snap.data_type == "f":
                continue
            out[(last[0], f"{col}{row}")] = engine_value(dep)

    # Engine column of the cross-checks (Checks sheet).
    checks = book.sheets.get("Checks")
    engine_of = {item.name: item.engine for item in steps if item.engine}
    label_of = {item.label: item.name for item in steps if item.engine}
    if checks is not None:
        head = _header_columns(checks, ("Quantity", "Workbook formula", "Engine value"))
        if head is None:
            raise RecalcError("the Checks sheet has no cross-check header (Quantity, Workbook "
                              "formula, Engine value): the layout is damaged")
        hrow, hc = head
        r = hrow + 1
        while True:
            label = checks.cell(r, hc["Quantity"])
            if not (isinstance(label.value, str) and label.value in label_of):
                break
            name = label_of[label.value]
            ecell = checks.cell(r, hc["Engine value"])
            if ecell.data_type == "f":
                issues.append(Issue("formula_added", f"Checks!{ecell.coordinate}",
                                    "engine value replaced by a formula; kept as it is",
                                    "engine value", ecell.value))
            else:
                out[("Checks", ecell.coordinate)] = engine_value(engine_of[name])
            r += 1

    # Chart tables (engine values) on the Charts sheet.
    charts = book.sheets.get("Charts")
    if charts is not None:
        from .charts import chart_tables
        for table in chart_tables(result).values():
            found = _find_table(charts, table.headers)
            if found is None:
                raise RecalcError(f"the Charts sheet has no table with headers "
                                  f"{list(table.headers)}: its layout is damaged")
            r0, c0 = found
            n_old = 0
            while charts.cell(r0 + 1 + n_old, c0 + 1).value is not None:
                n_old += 1
            if n_old != len(table.rows):
                raise RecalcError(f"the chart table {table.title!r} needs {len(table.rows)} "
                                  f"rows for these inputs, the workbook has {n_old}: rebuild "
                                  "the workbook from its project file")
            for i, values in enumerate(table.rows):
                for j, v in enumerate(values):
                    if isinstance(v, str):
                        continue
                    coord = f"{_col_letter(c0 + j)}{r0 + 1 + i}"
                    if charts.get(coord).data_type == "f":
                        continue
                    out[("Charts", coord)] = float(v)
    return out, issues


def _find_table(ws: _Sheet, headers: Sequence[str]) -> tuple[int, int] | None:
    for (r, c), cell in sorted(ws.cells.items()):
        if cell.value == headers[0] and all(ws.cell(r, c + j).value == h
                                            for j, h in enumerate(headers)):
            return r, c
    return None


def _mode(data: WorkbookData) -> str:
    from .calcsheet import mass_ratio_mode
    return mass_ratio_mode(data.project)


# =============================================================================== evaluation
_PARSE_CACHE: dict[str, Any] = {}
_CANON_CACHE: dict[tuple[str, str], Any] = {}


def _evaluator(book: _Book, sheets: Sequence[str]):
    from .formulas import Evaluator
    ev = Evaluator(book, sheets=sheets)
    # Share parsed formulas between workbooks (same formula texts in every workbook).
    if isinstance(getattr(ev, "_parsed", None), dict):
        ev._parsed = _PARSE_CACHE
    return ev


def _our_sheets(book: _Book) -> list[str]:
    from .build import SHEETS
    return [s for s in book.sheetnames if s in SHEETS]


def _canon(formula: str, sheet: str):
    """Canonical syntax tree of a formula: names upper case, sheet of references explicit."""
    key = (formula, sheet)
    if key in _CANON_CACHE:
        return _CANON_CACHE[key]
    from .formulas import FormulaError, parse
    try:
        tree = _norm(parse(formula), sheet)
    except FormulaError:
        tree = ("text", formula.replace(" ", "").upper())
    _CANON_CACHE[key] = tree
    return tree


def _norm(node, sheet):
    kind = node[0]
    if kind == "ref":
        return ("ref", node[1] or sheet) + tuple(node[2:])
    if kind == "name":
        return ("name", node[1].upper())
    if kind == "call":
        return ("call", node[1], tuple(_norm(a, sheet) for a in node[2]))
    if kind == "un":
        return ("un", node[1], _norm(node[2], sheet))
    if kind == "pct":
        return ("pct", _norm(node[1], sheet))
    if kind == "bin":
        return ("bin", node[1], _norm(node[2], sheet), _norm(node[3], sheet))
    return node


# Reference layouts (formula text of every cell the builder writes), cached per layout key.
_REFERENCE_CACHE: dict[tuple, dict[tuple[str, str], str | None]] = {}


def _layout_key(data: WorkbookData) -> tuple:
    p = data.project
    fl = p.floors
    floors = None if fl is None else (len(fl.heights), fl.height_unit.symbol,
                                      fl.mass_unit.symbol, fl.damper_level)
    return (__version__, p.tuning_method, _mode(data), p.units, floors,
            bool(p.info.get("structure")), bool(p.info.get("client")), data.template)


def _reference_formulas(data: WorkbookData, result) -> dict[tuple[str, str], Any] | None:
    """The builder's layout for these inputs, cached per layout key.

    Maps ``(sheet, cell)`` to the formula text (None for a constant) of every non-empty cell,
    ``("", "names")`` to ``{name: (sheet, cell)}`` and ``("", "labels")`` to
    ``{sheet: {cell: text}}`` (the text constants: the sheet's labels).
    """
    key = _layout_key(data)
    if key in _REFERENCE_CACHE:
        return _REFERENCE_CACHE[key]
    from .build import BuildError, build_workbook
    try:
        built = build_workbook(data.project, result=result)
    except (BuildError, ValueError):
        return None
    ref: dict[tuple[str, str], Any] = {}
    names = {}
    for name, dn in built.workbook.defined_names.items():
        dests = list(dn.destinations)
        if len(dests) == 1 and not name.startswith(("TB_", "SWAYTUNE")):
            names[name] = (dests[0][0], dests[0][1].replace("$", ""))
    labels: dict[str, dict[str, str]] = {}
    for ws in built.workbook.worksheets:
        if data.template and ws.title == "Summary":
            continue
        for row in ws.iter_rows():
            for c in row:
                if c.value is None:
                    continue
                ref[(ws.title, c.coordinate)] = c.value if c.data_type == "f" else None
                if isinstance(c.value, str) and c.data_type == "s":
                    labels.setdefault(ws.title, {})[c.coordinate] = c.value
    ref[("", "names")] = names
    ref[("", "labels")] = labels
    _REFERENCE_CACHE[key] = ref
    return ref


def _comparable_sheets(data: WorkbookData, reference: Mapping) -> tuple[set[str], list[str]]:
    """Sheets laid out as the builder lays them out now: same names, same labels (>= 90 %).

    A workbook made with project options recalc does not read (a [simulation] table) or by
    another builder version differs on some sheets only; those are not compared as text.
    """
    book = data.book
    ref_names: dict[str, tuple[str, str]] = reference.get(("", "names"), {})
    labels: dict[str, dict[str, str]] = reference.get(("", "labels"), {})
    file_names = {}
    for name in book.defined_names:
        loc = book.name_cell(name)
        if loc is not None and not name.startswith(("TB_", "SWAYTUNE")):
            file_names[name] = loc
    ok, skipped = set(), []
    for sheet in {s for s, _ in reference if s}:
        if sheet not in book.sheets:
            continue
        mine = {n: c for n, (sh, c) in file_names.items() if sh == sheet}
        theirs = {n: c for n, (sh, c) in ref_names.items() if sh == sheet}
        texts = labels.get(sheet, {})
        same = sum(1 for coord, text in texts.items() if book[sheet].get(coord).value == text)
        if mine == theirs and (not texts or same >= 0.9 * len(texts)):
            ok.add(sheet)
        else:
            skipped.append(sheet)
    return ok, sorted(skipped)


def _formula_issues(data: WorkbookData, reference: Mapping[tuple[str, str], Any],
                    typed_cells: set[tuple[str, str]]) -> list[Issue]:
    issues = []
    book = data.book
    comparable, skipped = _comparable_sheets(data, reference)
    if skipped:
        issues.append(Issue("note", ", ".join(skipped), "laid out differently from the "
                            "builder's layout for these inputs (another swaytune version, or "
                            "project options recalc does not read such as [simulation]): "
                            "formulas on these sheets were checked against the engine only, "
                            "not compared as text"))
    for (sheet, coord), expected in reference.items():
        if sheet not in comparable:
            continue
        ws = book.sheets.get(sheet)
        if ws is None:
            continue
        cell = ws.cells.get(_split_coord(coord))
        if cell is not None and expected is not None and cell.value == expected:
            continue                          # the same text: the common case, no parsing
        if cell is None:
            cell = _Cell(0, 0, None, "n")
        where = f"{sheet}!{coord}"
        if expected is None:
            if cell.data_type == "f" and (sheet, coord) not in typed_cells:
                issues.append(Issue("formula_added", where, "holds a formula where the builder "
                                    "writes a value", "(value)", cell.value))
            continue
        if cell.data_type != "f":
            issues.append(Issue("formula_replaced", where, f"the builder's formula "
                                f"{expected} was replaced by the value {cell.value!r}",
                                expected, repr(cell.value)))
        elif _canon(cell.value, sheet) != _canon(expected, sheet):
            issues.append(Issue("formula_edited", where, f"formula edited: the builder writes "
                                f"{expected}, the workbook holds {cell.value}", expected,
                                cell.value))
    return issues


# =============================================================================== writing
_CELL_RE = re.compile(
    r"<(?P<p>[A-Za-z_][\w.-]*:)?c\b(?P<attrs>[^>]*?)(?:/>|>(?P<body>.*?)</(?P=p)?c>)", re.S)
_R_ATTR_RE = re.compile(r'\sr\s*=\s*["\']([A-Z]+[0-9]+)["\']')
_T_ATTR_RE = re.compile(r'\st\s*=\s*("[^"]*"|\'[^\']*\')')


_F_RE_CACHE: dict[str, re.Pattern] = {}
_VIS_RE_CACHE: dict[str, re.Pattern] = {}
_BAD_XML_CHARS = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ufffe\uffff]")


def _xml_escape(text: str) -> str:
    return (text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
            .replace("\r", "&#13;"))


def _encode_cached(sheet: str, ref: str, value: Any) -> tuple[str | None, str]:
    """(t attribute, <v> text) of a cached value; same encoding as workbook_builder.cached."""
    from .cached import CellError
    if isinstance(value, CellError):
        return "e", _xml_escape(str(value))
    if isinstance(value, bool):
        return "b", "1" if value else "0"
    if isinstance(value, str):
        if _BAD_XML_CHARS.search(value) or len(value) > 32767:
            raise RecalcError(f"{sheet}!{ref}: text result cannot be stored in a cell")
        return "str", _xml_escape(value)
    x = float(value)
    if not math.isfinite(x):
        raise RecalcError(f"{sheet}!{ref}: refusing to write {x!r}")
    return None, repr(x)


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
    for ref in sorted(refs, key=lambda r: _split_coord(r)):
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


def _rewrite_cells(xml: str, constants: Mapping[str, float], cached: Mapping[str, Any],
                   sheet: str) -> str:
    """One pass over a worksheet part: new constant values and new cached values.

    A constant is written only into a cell without a formula, a cached value only into a
    formula cell; the formula text and every other attribute and element are kept.
    """
    pending_c = set(constants)
    pending_f = set(cached)

    def repl(m: re.Match) -> str:
        attrs = m.group("attrs")
        rm = _R_ATTR_RE.search(attrs)
        if rm is None:
            return m.group(0)
        ref = rm.group(1)
        in_c, in_f = ref in constants, ref in cached
        if not (in_c or in_f):
            return m.group(0)
        body = m.group("body") or ""
        p = m.group("p") or ""
        f_re = _F_RE_CACHE.get(p)
        if f_re is None:
            f_re = _F_RE_CACHE[p] = re.compile(
                rf"<{re.escape(p)}f\b[^>]*?(?:/>|>.*?</{re.escape(p)}f>)", re.S)
            _VIS_RE_CACHE[p] = re.compile(
                rf"<{re.escape(p)}(?:v|is)\b[^>]*?(?:/>|>.*?</{re.escape(p)}(?:v|is)>)", re.S)
        fm = f_re.search(body)
        new_attrs = _T_ATTR_RE.sub("", attrs)
        if fm is None:
            if not in_c:
                return m.group(0)
            pending_c.discard(ref)
            x = float(constants[ref])
            if not math.isfinite(x):
                raise RecalcError(f"{sheet}!{ref}: refusing to write {x!r}")
            return f"<{p}c{new_attrs}><{p}v>{x!r}</{p}v></{p}c>"
        if not in_f:
            return m.group(0)                  # never touch a formula's text
        pending_f.discard(ref)
        t, text = _encode_cached(sheet, ref, cached[ref])
        if t is not None:
            new_attrs += f' t="{t}"'
        rest = _VIS_RE_CACHE[p].sub("", body[fm.end():])
        return f"<{p}c{new_attrs}>{body[:fm.end()]}<{p}v>{text}</{p}v>{rest}</{p}c>"

    new = _targeted_sub(xml, set(constants) | set(cached), repl)
    if new is None:                            # unusual markup: scan every cell
        pending_c, pending_f = set(constants), set(cached)
        new = _CELL_RE.sub(repl, xml)
    if pending_c:
        raise RecalcError(f"constant cell(s) {sorted(pending_c)[:5]} of sheet {sheet!r} not "
                          "found in the package (a formula cell, or written by another "
                          "application?)")
    if pending_f:
        raise RecalcError(f"formula cell(s) {sorted(pending_f)[:5]} of sheet {sheet!r} not "
                          "found in the package")
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


def write_results(source: str | os.PathLike, dest: str | os.PathLike, *,
                  constants: Mapping[tuple[str, str], float] | None = None,
                  cached: Mapping[tuple[str, str], Any] | None = None,
                  chart_values: Mapping[tuple[str, str], Any] | None = None,
                  mode_from: str | os.PathLike | None = None) -> Path:
    """Write an updated copy of a workbook: new constants, cached values, chart caches.

    Every other part of the package is copied unchanged (formulas included). The file is
    written next to ``dest`` and moved onto it atomically (:func:`os.replace`); on any error
    ``dest`` is left as it was and no temporary file remains.

    Parameters
    ----------
    source : path-like
        The workbook to copy [-].
    dest : path-like
        The file to write (may equal ``source``: replaced atomically) [-].
    constants : mapping, optional
        ``(sheet, "D12") -> number`` for constant (non-formula) cells [-].
    cached : mapping, optional
        ``(sheet, "D12") -> value`` cached values of formula cells (float, bool, str or
        :class:`workbook_builder.cached.CellError`; encoded as
        :func:`workbook_builder.cached.insert_cached_values` does) [-].
    chart_values : mapping, optional
        ``(sheet, "A5") -> value`` of the cells charts plot; their number caches are rebuilt
        from these [-].
    mode_from : path-like, optional
        File whose permission bits the output gets (default ``source``) [-].

    Returns
    -------
    dest : Path
        The written file [-].

    Raises
    ------
    RecalcError
        When a cell to change does not exist (or is a formula cell for ``constants``, a
        value cell for ``cached``), or a value cannot be stored (NaN, inf).
    """
    from .atomic import atomic_path
    from .cached import sheet_parts

    src = Path(source)
    target = Path(dest)
    by_sheet: dict[str, tuple[dict[str, float], dict[str, Any]]] = {}
    for which, mapping in ((0, constants or {}), (1, cached or {})):
        for (sheet, coord), v in mapping.items():
            by_sheet.setdefault(sheet, ({}, {}))[which][coord.replace("$", "").upper()] = v
    with zipfile.ZipFile(src) as zin:
        members = [(info, zin.read(info)) for info in zin.infolist()]
        parts = sheet_parts(zin)
    unknown = set(by_sheet) - set(parts)
    if unknown:
        raise RecalcError(f"unknown sheet(s) {sorted(unknown)}")
    part_sheet = {parts[s]: s for s in by_sheet}
    chart_lookup = None
    if chart_values:
        def chart_lookup(ref: str):
            sheet, _, rng = ref.rpartition("!")
            sheet = sheet.strip("'").replace("''", "'")
            m = re.fullmatch(r"\$?([A-Z]{1,3})\$?(\d+)(?::\$?([A-Z]{1,3})\$?(\d+))?", rng)
            if not m:
                return None
            c1, r1 = _col_index(m.group(1)), int(m.group(2))
            c2, r2 = (_col_index(m.group(3)), int(m.group(4))) if m.group(3) else (c1, r1)
            keys = [(sheet, f"{_col_letter(c)}{r}") for r in range(r1, r2 + 1)
                    for c in range(c1, c2 + 1)]
            if not all(k in chart_values for k in keys):
                return None
            return [chart_values[k] for k in keys]
    with atomic_path(target) as tmp:
        with zipfile.ZipFile(tmp, "w") as zout:
            for info, raw in members:
                sheet = part_sheet.get(info.filename)
                if sheet is not None:
                    consts, values = by_sheet[sheet]
                    raw = _rewrite_cells(raw.decode("utf-8"), consts, values, sheet) \
                        .encode("utf-8")
                elif chart_lookup is not None and info.filename.startswith("xl/charts/") \
                        and info.filename.endswith(".xml"):
                    raw = _refresh_chart_xml(raw.decode("utf-8"), chart_lookup).encode("utf-8")
                zout.writestr(info, raw, compresslevel=1)   # fast; still deflate
        try:
            shutil.copymode(mode_from or src, tmp)
        except OSError:
            pass
    return target


# =============================================================================== recalculation
def _close(a: Any, b: Any, rel: float = CHANGE_TOLERANCE) -> bool:
    if isinstance(a, bool) or isinstance(b, bool):
        return a == b
    if isinstance(a, (int, float)) and isinstance(b, (int, float)):
        return a == b or math.isclose(a, b, rel_tol=rel, abs_tol=0.0)
    return a == b


def _plain(v: Any) -> Any:
    from .formulas import is_error
    if is_error(v):
        return str(v)
    return v


def _output_path(path: Path, outdir: Path | None, in_place: bool,
                 output: str | os.PathLike | None) -> Path | None:
    if output is not None:
        return Path(output)
    if in_place:
        return path
    if outdir is not None:
        return Path(outdir) / path.name
    return None


def _backup_path(path: Path) -> Path:
    stamp = _dt.datetime.now().strftime("%Y%m%d-%H%M%S")
    cand = path.with_name(f"{path.name}.{stamp}.bak")
    n = 1
    while cand.exists():
        cand = path.with_name(f"{path.name}.{stamp}-{n}.bak")
        n += 1
    return cand


def recalc_workbook(path: str | os.PathLike, outdir: str | os.PathLike | None = None,
                    in_place: bool = False, backup: bool = True, *,
                    output: str | os.PathLike | None = None,
                    inputs: Mapping[str, float] | None = None,
                    compare_layout: bool = True, force: bool = False) -> RecalcResult:
    """Recalculate one workbook with the engine and write the updated copy.

    Parameters
    ----------
    path : path-like
        A workbook made by ``swaytune build`` [-].
    outdir : path-like, optional
        Folder for the updated copy (same file name); created if needed [-].
    in_place : bool, optional
        Replace ``path`` itself, atomically (explicit opt-in) [-].
    backup : bool, optional
        With ``in_place``, first copy the original to ``<name>.<time>.bak`` [-].
    output : path-like, optional
        Exact output file (instead of ``outdir``) [-].
    inputs : mapping, optional
        Input overrides, in the unit shown in the workbook (see :func:`read_workbook`) [-].
    compare_layout : bool, optional
        Compare every formula with the builder's (detects hand edits) [-].
    force : bool, optional
        Overwrite an existing output that swaytune did not make [-].

    Returns
    -------
    result : RecalcResult
        Status, inputs, new and old values, changes, check verdicts, issues; ``error`` holds
        the reason when the workbook failed (nothing is written then) [-].

    Raises
    ------
    ValueError
        Only for contradictory arguments (``in_place`` with ``outdir``/``output``, an output
        equal to the input without ``in_place``); a bad workbook is reported in the result.

    Examples
    --------
    A parameter study from a notebook: vary the structure's frequency over a list, write one
    recalculated variant per value and collect a table (invented scenario).

    >>> import tempfile, pathlib
    >>> from workbook_builder.project import parse_project
    >>> from workbook_builder.build import write_workbook
    >>> folder = pathlib.Path(tempfile.mkdtemp())
    >>> project = parse_project({"mode": {"frequency": 0.2, "modal_mass":
    ...     {"value": 9000, "unit": "t"}, "structural_damping": 0.01},
    ...     "wind": {"acceleration": 0.25, "acceleration_limit": 0.15},
    ...     "damper": {"mass_ratio": 0.02, "clearance": 1.5}}, source="study.toml")
    >>> _ = write_workbook(project, folder / "base.xlsx")
    >>> table = []
    >>> for f in (0.15, 0.20, 0.25):
    ...     r = recalc_workbook(folder / "base.xlsx", output=folder / f"f_{f:.2f}.xlsx",
    ...                         inputs={"frequency": f})
    ...     table.append((f, round(r.results["pendulum_length"], 3), r.status))
    >>> for row in table:
    ...     print(row)
    (0.15, 11.383, 'OK')
    (0.2, 6.403, 'OK')
    (0.25, 4.098, 'OK')

    The pendulum length is the engine's (``functions.design.design_damper``) for each frequency:

    >>> from functions.design import design_damper
    >>> kw = read_inputs(folder / "f_0.25.xlsx")
    >>> round(design_damper(**kw).pendulum_length, 3)
    4.098
    """
    t0 = time.perf_counter()
    path = Path(path)
    if in_place and (outdir is not None or output is not None):
        raise ValueError("in_place=True cannot be combined with outdir or output")
    dest = _output_path(path, Path(outdir) if outdir is not None else None, in_place, output)
    if dest is not None and not in_place and _same_file(dest, path):
        raise ValueError(f"the output {dest} is the input itself; use in_place=True (keeps a "
                         "backup) or another output folder")
    res = RecalcResult(path=path)
    try:
        _recalc(res, path, dest, in_place, backup, inputs, compare_layout, force)
    except RecalcError as exc:
        res.error = str(exc)
        res.output = None
    except Exception as exc:  # noqa: BLE001 - one bad file must not stop a batch
        from .atomic import OverwriteRefused
        if isinstance(exc, OverwriteRefused):
            res.error = str(exc)
        else:
            res.error = f"unexpected error ({type(exc).__name__}): {exc}"
        res.output = None
    res.seconds = time.perf_counter() - t0
    return res


def _same_file(a: Path, b: Path) -> bool:
    try:
        return a.resolve() == b.resolve()
    except OSError:
        return False


def _recalc(res: RecalcResult, path: Path, dest: Path | None, in_place: bool, backup: bool,
            overrides, compare_layout: bool, force: bool) -> None:
    from .build import run_engine
    from .calcsheet import CROSS_CHECK_TOLERANCE, all_steps, design_checks
    from .formulas import FormulaError, is_error

    data = read_workbook(path, overrides=overrides)
    book = data.book
    res.issues.extend(data.issues)
    res.typed = dict(data.typed)
    try:
        result = run_engine(data.project)
    except ValueError as exc:
        raise RecalcError(f"the engine cannot compute the design for these inputs: "
                          f"{str(exc).split(': ', 1)[-1]}") from None
    res.design = result
    res.inputs = data.design_kwargs
    res.inputs["modal_mass"] = float(result.inputs.modal_mass)

    # Old cached values of every named cell (the last calculation).
    named = {}
    for name in book.defined_names:
        loc = book.name_cell(name)
        if loc is not None:
            named[name] = loc
    previous = {}
    for name, (sheet, coord) in named.items():
        c = book[sheet].get(coord)
        previous[name] = c.cached if c.data_type == "f" else c.value

    # Apply overrides and refresh engine-only constants in the in-memory book.
    constants: dict[tuple[str, str], float] = {}
    if overrides:
        for spec_name, (sheet, coord) in data.value_cells.items():
            if spec_name in data.typed:
                cell = book[sheet].get(coord)
                new = float(data.typed[spec_name][0])
                if cell.data_type != "n" or cell.value != new:
                    if cell.data_type == "f":
                        raise RecalcError(f"input {spec_name} ({sheet}!{coord}) holds a "
                                          "formula; an override would replace it")
                    constants[(sheet, coord)] = new
    engine_consts, engine_issues = _engine_constants(data, result)
    res.issues.extend(engine_issues)
    constants.update(engine_consts)
    for (sheet, coord), v in constants.items():
        r, c = _split_coord(coord)
        old = book[sheet].cells.get((r, c))
        book[sheet].cells[(r, c)] = _Cell(r, c, float(v), "n", float(v),
                                          old.cached_type if old else "n")

    # Evaluate every formula of swaytune's sheets, as written in the file.
    sheets = _our_sheets(book)
    ev = _evaluator(book, sheets)
    try:
        values = ev.values()
    except (FormulaError, RecursionError) as exc:
        raise RecalcError(f"a formula cannot be evaluated by swaytune ({exc}); recalculate "
                          "this workbook in a spreadsheet application instead") from None
    from .cached import CellError
    cached: dict[tuple[str, str], Any] = {}
    for sheet, cells in values.items():
        for coord, v in cells.items():
            if is_error(v):
                cached[(sheet, coord)] = CellError(str(v))
                res.issues.append(Issue("error_value", f"{sheet}!{coord}",
                                        f"formula evaluates to {v}", "", str(v)))
            elif isinstance(v, float) and not math.isfinite(v):
                cached[(sheet, coord)] = CellError("#NUM!")
                res.issues.append(Issue("error_value", f"{sheet}!{coord}",
                                        "formula evaluates to a non-finite number", "", "#NUM!"))
            elif v is None:
                cached[(sheet, coord)] = 0.0
            else:
                cached[(sheet, coord)] = v

    # Other sheets (a firm's template) may show our names: refresh what the evaluator can
    # compute, leave the rest as it is.
    others = [t for t in book.sheets if t not in sheets]
    if others:
        stale = 0
        for title in others:
            for cell in list(book[title].cells.values()):
                if cell.data_type != "f":
                    continue
                try:
                    v = ev.cell(title, cell.row, cell.column)   # reuses our values
                except (FormulaError, RecursionError):
                    stale += 1
                    continue
                if is_error(v) or v is None or (isinstance(v, float) and not math.isfinite(v)):
                    stale += 1
                    continue
                cached[(title, cell.coordinate)] = v
        if stale:
            res.issues.append(Issue("note", ", ".join(others), f"{stale} formula cell(s) on "
                                    "sheets not made by swaytune keep their old cached value "
                                    "(not evaluated here); a spreadsheet program recalculates "
                                    "them on opening"))

    def now(name: str) -> Any:
        sheet, coord = named[name]
        key = (sheet, coord)
        if key in cached:
            return _plain(cached[key])
        return book[sheet].get(coord).value

    res.results = {name: now(name) for name in named if not name.startswith("TB_")}
    res.previous = {name: previous[name] for name in res.results}
    for name, new in res.results.items():
        old = previous.get(name)
        if not _close(old, new):
            res.changes.append((name, old, new))

    # Engine cross-check of every result formula (the engine's value against the formula's).
    steps = all_steps(data.project.tuning_method, _mode(data))
    for item in steps:
        if not item.engine:
            continue
        v = res.results.get(item.name)
        e = float(getattr(result, item.engine))
        if not isinstance(v, (int, float)) or isinstance(v, bool):
            rel = math.inf
        else:
            rel = abs(v) if e == 0 else abs(v / e - 1)
        if not rel <= CROSS_CHECK_TOLERANCE:
            loc = named[item.name]
            res.issues.append(Issue("engine_mismatch", f"{loc[0]}!{loc[1]} ({item.name})",
                                    f"the formula gives {v!r}, the engine {e!r} (relative "
                                    f"difference {rel:.3g} > {CROSS_CHECK_TOLERANCE:g})",
                                    repr(e), repr(v)))

    # Verdicts: design checks as the workbook computes them, the engine's, the workbook's own
    # cross-check, fixed point and engine-value flags.
    checks_ws = book.sheets.get("Checks")
    engine_ok = {c.name: bool(c.ok) for c in result.checks}
    keyword_to_engine = {"acceleration": "acceleration", "stroke": "stroke", "swing": "swing",
                         "detuning": "detuning", "mass ratio": "mass_ratio"}
    for chk in design_checks():
        r = _row_with_label(checks_ws, chk.label) if checks_ws is not None else None
        wb_verdict = None
        if r is not None:
            key = ("Checks", f"G{r}")
            wb_verdict = _plain(cached.get(key, checks_ws.cell(r, 7).value))
        eng = engine_ok.get(keyword_to_engine.get(chk.engine_keyword, ""), None)
        label = chk.label
        verdict = wb_verdict if wb_verdict in ("OK", "NOT OK") else "NOT OK"
        res.checks.append((label, verdict))
        if eng is not None and (verdict == "OK") != eng:
            res.issues.append(Issue("verdict_mismatch", f"Checks!G{r}" if r else label,
                                    f"the workbook says {verdict}, the engine "
                                    f"{'OK' if eng else 'NOT OK'}", "OK" if eng else "NOT OK",
                                    str(verdict)))
    for name, label in (("all_cross_checks", "Workbook formulas agree with the engine"),
                        ("fixed_point_converged", "Pendulum fixed point converged")):
        if name not in res.results:
            res.issues.append(Issue("layout", name, f"defined name {name} is missing: the "
                                    f"verdict '{label}' cannot be read"))
            continue
        v = res.results.get(name)
        res.checks.append((label, v if v in ("OK", "NOT OK") else "NOT OK"))
    flags = sorted(n for n in res.results if n.startswith("engine_flag_"))
    for n in flags:
        current = res.results[n] == "current"
        res.checks.append((f"Engine value current ({n})", "OK" if current else "NOT OK"))
        if not current:
            loc = named[n]
            res.issues.append(Issue("stale_engine_value", f"{loc[0]}!{loc[1]} ({n})",
                                    "engine values that recalc does not recompute (e.g. the "
                                    "Nonlinear sheet's time-domain simulation) were computed "
                                    "for other inputs: rebuild the workbook from its project "
                                    "file", "current", str(res.results[n])))
    if any(i.kind == "engine_mismatch" for i in res.issues) and \
            ("Workbook formulas agree with the engine", "OK") in res.checks:
        res.checks.append(("Every result formula agrees with the engine", "NOT OK"))

    # Hand edits: every formula against the builder's for the same layout.
    if compare_layout:
        fmt = _workbook_format(book)
        if fmt is not None and fmt < _current_format():
            res.issues.append(Issue("note", "format", f"workbook format {fmt} is older than "
                                    f"the current builder's ({_current_format()}): formula "
                                    "differences below may come from the builder, not from a "
                                    "hand edit; rebuild from the project file to update the "
                                    "layout"))
        reference = _reference_formulas(data, result)
        if reference is None:
            res.issues.append(Issue("note", "layout", "the builder's layout could not be "
                                    "made for these inputs; formulas were not compared"))
        else:
            typed_cells = set(data.value_cells.values())
            res.issues.extend(_formula_issues(data, reference, typed_cells))

    # Write.
    if dest is None:
        return
    from .atomic import guard_overwrite
    if not in_place:
        guard_overwrite(dest, force=force)
    chart_values = {k: v for k, v in constants.items() if k[0] == "Charts"}
    if chart_values and "Charts" in book:
        for (r, c), cell in book["Charts"].cells.items():
            chart_values.setdefault(("Charts", cell.coordinate), cell.value)
    if in_place and backup:
        bpath = _backup_path(path)
        shutil.copy2(path, bpath)
        res.backup = bpath
    write_results(path, dest, constants=constants, cached=cached,
                  chart_values=chart_values or None, mode_from=path)
    res.output = dest


# =============================================================================== batches
def collect_paths(paths: Iterable[str | os.PathLike],
                  exclude: str | os.PathLike | None = None) -> list[tuple[Path, Path]]:
    """Expand files and folders into (workbook, path relative to its root) pairs.

    Folders are searched recursively for ``*.xlsx``; hidden files, spreadsheet lock files
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


def _worker_init() -> None:
    # Workers ignore Ctrl-C: the parent stops handing out work and lets the running ones
    # finish their (atomic) writes.
    signal.signal(signal.SIGINT, signal.SIG_IGN)


def _task(args) -> RecalcResult:
    path, output, in_place, backup, compare, force = args
    if in_place:
        return recalc_workbook(path, in_place=True, backup=backup, compare_layout=compare,
                               force=force)
    return recalc_workbook(path, output=output, compare_layout=compare, force=force)


class _Progress:
    def __init__(self, total: int, enabled: bool, stream=None):
        self.total = total
        self.stream = stream or sys.stderr
        self.enabled = enabled and total > 0
        self.tty = bool(getattr(self.stream, "isatty", lambda: False)())
        self.done = 0
        self.t0 = time.perf_counter()
        self.step = max(1, total // 10)

    def update(self, res: RecalcResult) -> None:
        self.done += 1
        if not self.enabled:
            return
        width = 30
        filled = int(width * self.done / self.total)
        elapsed = time.perf_counter() - self.t0
        eta = elapsed / self.done * (self.total - self.done)
        line = (f"[{'#' * filled}{'.' * (width - filled)}] {self.done}/{self.total} "
                f"{elapsed:5.1f}s elapsed, ~{eta:4.1f}s left  {res.path.name}: {res.status}")
        if self.tty:
            self.stream.write("\r" + line[:120].ljust(120))
            if self.done == self.total:
                self.stream.write("\n")
        elif self.done % self.step == 0 or self.done == self.total:
            self.stream.write(line + "\n")
        self.stream.flush()


def recalc_many(paths: Iterable[str | os.PathLike], outdir: str | os.PathLike | None = None,
                jobs: int = 1, progress: bool = True, *, in_place: bool = False,
                backup: bool = True, summary: str | os.PathLike | None = None,
                compare_layout: bool = True, force: bool = False) -> BatchSummary:
    """Recalculate many workbooks (files and folders); write a summary workbook and CSV.

    Parameters
    ----------
    paths : iterable of path-like
        Workbooks and folders (searched recursively for .xlsx) [-].
    outdir : path-like, optional
        Output folder; a workbook found in a folder keeps its relative path under it [-].
    jobs : int, optional
        Worker processes (1: in this process) [-].
    progress : bool, optional
        Show a progress bar on stderr [-].
    in_place : bool, optional
        Replace each workbook itself (atomically, with a backup unless ``backup=False``) [-].
    backup : bool, optional
        Keep ``<name>.<time>.bak`` beside each workbook replaced in place [-].
    summary : path-like, optional
        Path of the summary without extension (default ``OUTDIR/recalc_summary``, or
        ``./recalc_summary`` in place); ``.xlsx`` and ``.csv`` are written [-].
    compare_layout : bool, optional
        Compare formulas with the builder's (hand edits) [-].
    force : bool, optional
        Overwrite outputs that swaytune did not make [-].

    Returns
    -------
    summary : BatchSummary
        One result per workbook in input order, summary paths, exit status [-].

    Raises
    ------
    ValueError
        When neither ``outdir`` nor ``in_place`` is given, both are, or ``jobs`` < 1.
    """
    t0 = time.perf_counter()
    if in_place == (outdir is not None):
        raise ValueError("give an output folder (outdir) or in_place=True, not both or neither")
    if int(jobs) < 1:
        raise ValueError(f"jobs={jobs!r} must be >= 1")
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
        tasks.append((i, (src, out, in_place, backup, compare_layout, force)))
    results: list[RecalcResult | None] = [None] * len(items)
    for i, r in pre_failed.items():
        results[i] = r
    bar = _Progress(len(items), progress)
    for r in pre_failed.values():
        bar.update(r)
    interrupted = False
    try:
        if int(jobs) == 1 or len(tasks) <= 1:
            for i, args in tasks:
                results[i] = _task(args)
                bar.update(results[i])
        else:
            import concurrent.futures as cf
            import multiprocessing as mp
            ctx = mp.get_context("fork" if "fork" in mp.get_all_start_methods() else "spawn")
            with cf.ProcessPoolExecutor(max_workers=int(jobs), mp_context=ctx,
                                        initializer=_worker_init) as pool:
                futures = {pool.submit(_task, args): i for i, args in tasks}
                try:
                    for fut in cf.as_completed(futures):
                        i = futures[fut]
                        try:
                            results[i] = fut.result()
                        except Exception as exc:  # noqa: BLE001 - a worker died
                            results[i] = RecalcResult(path=_tasks_path(tasks, i),
                                                      error=f"worker failed: {exc}")
                        bar.update(results[i])
                except KeyboardInterrupt:
                    for fut in futures:
                        fut.cancel()
                    raise
    except KeyboardInterrupt:
        interrupted = True
        if progress:
            sys.stderr.write("\ninterrupted: stopping; files already written are complete, "
                             "originals untouched\n")
    done = [r if r is not None else RecalcResult(path=items[i][0],
                                                  error="not recalculated (interrupted)")
            for i, r in enumerate(results)]
    batch = BatchSummary(done, interrupted=interrupted)
    base = Path(summary) if summary is not None else (
        Path(outdir) / SUMMARY_STEM if outdir is not None else Path.cwd() / SUMMARY_STEM)
    batch.summary_xlsx, batch.summary_csv = write_summary(batch, base)
    batch.seconds = time.perf_counter() - t0
    return batch


def _tasks_path(tasks, i: int) -> Path:
    for j, args in tasks:
        if j == i:
            return args[0]
    return Path("?")


# =============================================================================== summary
_KEY_INPUTS = ("frequency", "modal_mass", "structural_damping", "acceleration",
               "acceleration_limit", "clearance", "tuning_method")
_KEY_RESULTS = ("required_damping", "mass_ratio", "damper_mass", "damper_frequency",
                "damper_damping", "effective_damping", "acceleration_with_damper", "stroke",
                "pendulum_length", "swing_angle_deg", "detuning")
_UNITS = {"frequency": "Hz", "modal_mass": "kg", "structural_damping": "-",
          "acceleration": "m/s^2", "acceleration_limit": "m/s^2", "clearance": "m",
          "tuning_method": "", "required_damping": "-", "mass_ratio": "-", "damper_mass": "kg",
          "damper_frequency": "Hz", "damper_damping": "-", "effective_damping": "-",
          "acceleration_with_damper": "m/s^2", "stroke": "m", "pendulum_length": "m",
          "swing_angle_deg": "deg", "detuning": "-"}


def _fmt_value(v: Any) -> str:
    if v is None:
        return "(none)"
    if isinstance(v, float):
        return f"{v:.10g}"
    return str(v)


def _check_columns() -> list[str]:
    from .calcsheet import design_checks
    return [c.label for c in design_checks()] + [
        "Workbook formulas agree with the engine", "Pendulum fixed point converged",
        "Engine values current"]


def _summary_row(r: RecalcResult) -> dict[str, Any]:
    row: dict[str, Any] = {"workbook": str(r.path), "status": r.status,
                           "reason": r.error or "",
                           "output": "" if r.output is None else str(r.output)}
    for k in _KEY_INPUTS:
        row[f"{k} [{_UNITS[k]}]" if _UNITS[k] else k] = r.inputs.get(k, "")
    for k in _KEY_RESULTS:
        row[f"{k} [{_UNITS[k]}]"] = r.results.get(k, "")
    verdicts = dict(r.checks)
    for label in _check_columns():
        if label == "Engine values current":
            flags = [v for k, v in r.checks if k.startswith("Engine value current")]
            row[label] = "" if r.failed else ("OK" if all(v == "OK" for v in flags) else
                                              "NOT OK")
        else:
            row[label] = verdicts.get(label, "")
    row["changes"] = "; ".join(f"{n}: {_fmt_value(o)} -> {_fmt_value(v)}"
                               for n, o, v in r.changes)
    row["issues"] = "; ".join(str(i) for i in r.issues)
    row["seconds"] = round(r.seconds, 4)
    return row


def _csv_safe(v: Any) -> Any:
    """Text that a spreadsheet would read as a formula gets a leading apostrophe."""
    if isinstance(v, str) and v[:1] in ("=", "+", "-", "@", "\t", "\r"):
        return "'" + v
    return v


def write_summary(batch: BatchSummary, base: str | os.PathLike) -> tuple[Path, Path]:
    """Write the batch summary as ``base.xlsx`` and ``base.csv``; return both paths.

    The workbook has a sheet per view: Workbooks (one row each: status, reason, key inputs and
    results, every check verdict, changes, issues), Changes (old and new value of every named
    cell that changed), Issues, Cautions. Every text is written as text, never as a formula.
    """
    from openpyxl import Workbook
    from openpyxl.styles import Font, PatternFill

    from .atomic import atomic_path
    from .build import CAUTIONS

    base = Path(base)
    base.parent.mkdir(parents=True, exist_ok=True)
    rows = batch.table()
    headers = list(rows[0]) if rows else list(_summary_row(RecalcResult(Path("-"))))
    csv_path = base.with_name(base.name + ".csv")
    xlsx_path = base.with_name(base.name + ".xlsx")
    with atomic_path(csv_path) as tmp:
        with open(tmp, "w", newline="", encoding="utf-8") as fh:
            w = csv.writer(fh)
            w.writerow(headers)
            for row in rows:
                w.writerow([_csv_safe(row.get(h, "")) for h in headers])

    wb = Workbook()
    ws = wb.active
    ws.title = "Workbooks"
    bold = Font(bold=True)
    bad = PatternFill("solid", fgColor="FFC7CE")
    good = PatternFill("solid", fgColor="C6EFCE")

    def put(sheet, r, c, v):
        cell = sheet.cell(r, c)
        if isinstance(v, str):
            cell.value = v
            cell.data_type = "s"
        elif isinstance(v, float) and not math.isfinite(v):
            cell.value = str(v)
            cell.data_type = "s"
        else:
            cell.value = v
        return cell

    for j, h in enumerate(headers, start=1):
        put(ws, 1, j, h).font = bold
    for i, row in enumerate(rows, start=2):
        for j, h in enumerate(headers, start=1):
            c = put(ws, i, j, row.get(h, ""))
            if row.get(h) in ("OK", "NOT OK", "FAILED"):
                c.fill = good if row[h] == "OK" else bad
    ws.freeze_panes = "B2"
    ch = wb.create_sheet("Changes")
    for j, h in enumerate(("workbook", "quantity (defined name)", "old value", "new value"), 1):
        put(ch, 1, j, h).font = bold
    r = 2
    for res in batch.results:
        for name, old, new in res.changes:
            for j, v in enumerate((str(res.path), name, "(none)" if old is None else old,
                                   new), 1):
                put(ch, r, j, v)
            r += 1
    iss = wb.create_sheet("Issues")
    for j, h in enumerate(("workbook", "kind", "where", "message", "builder / engine",
                           "workbook"), 1):
        put(iss, 1, j, h).font = bold
    r = 2
    for res in batch.results:
        if res.failed:
            for j, v in enumerate((str(res.path), "FAILED", "", res.error, "", ""), 1):
                put(iss, r, j, v)
            r += 1
        for i in res.issues:
            for j, v in enumerate((str(res.path), i.kind, i.where, i.message, i.old, i.new), 1):
                put(iss, r, j, v)
            r += 1
    cau = wb.create_sheet("Cautions")
    for i, text in enumerate(CAUTIONS, start=1):
        put(cau, i, 1, text)
    for sheet in (ws, ch, iss):
        sheet.column_dimensions["A"].width = 40
    wb.properties.creator = f"swaytune {__version__} (recalc summary)"
    with atomic_path(xlsx_path) as tmp:
        wb.save(tmp)
    return xlsx_path, csv_path


# =============================================================================== command line
def _print_report(batch: BatchSummary, stream=None) -> None:
    stream = stream or sys.stdout
    for r in batch.results:
        if r.failed:
            print(f"FAILED  {r.path}: {r.error}", file=stream)
            continue
        bad = [label for label, v in r.checks if v != "OK"]
        line = f"{r.status:<7} {r.path}"
        if r.output is not None:
            line += f" -> {r.output}"
        print(line, file=stream)
        if bad:
            print(f"        NOT OK: {'; '.join(bad)}", file=stream)
        for i in r.issues:
            print(f"        {i.kind}: {i}", file=stream)
        if r.changes:
            shown = ", ".join(f"{n} {_fmt_value(o)} -> {_fmt_value(v)}"
                              for n, o, v in r.changes[:6])
            more = f" (+{len(r.changes) - 6} more)" if len(r.changes) > 6 else ""
            print(f"        changed: {shown}{more}", file=stream)
    n = len(batch.results)
    print(f"\n{n} workbook(s): {n - len(batch.failed) - len(batch.not_ok)} OK, "
          f"{len(batch.not_ok)} NOT OK, {len(batch.failed)} failed "
          f"({batch.seconds:.1f} s)", file=stream)
    if batch.summary_xlsx:
        print(f"summary: {batch.summary_xlsx} and {batch.summary_csv}", file=stream)


def main_recalc(argv: Sequence[str] | None = None) -> int:
    """``recalc PATH... [-o OUTDIR] [--in-place] [--jobs N]``; return the exit status.

    0: every workbook recalculated and every check OK; 1: a workbook failed or a check is
    NOT OK; 2: usage error; 130: interrupted (Ctrl-C).
    """
    import argparse
    parser = argparse.ArgumentParser(
        prog="swaytune recalc",
        description="Recalculate swaytune workbooks with the engine: fresh cached values, "
                    "refreshed engine values, formulas untouched; a summary workbook and CSV. "
                    "A preliminary design aid; results must be checked by a licensed engineer.")
    parser.add_argument("paths", nargs="+", metavar="PATH", help="workbooks and folders")
    parser.add_argument("-o", "--outdir", help="output folder (required unless --in-place)")
    parser.add_argument("--in-place", action="store_true",
                        help="replace each workbook atomically, keeping <name>.<time>.bak")
    parser.add_argument("--no-backup", action="store_true",
                        help="with --in-place: do not keep a backup")
    parser.add_argument("--jobs", "-j", type=int, default=1, help="worker processes")
    parser.add_argument("--summary", help="summary path without extension (default "
                                          "OUTDIR/recalc_summary)")
    parser.add_argument("--no-progress", action="store_true", help="no progress bar")
    parser.add_argument("--force", action="store_true",
                        help="overwrite outputs that swaytune did not make")
    parser.add_argument("--no-layout-check", action="store_true",
                        help="do not compare formulas with the builder's text (faster on "
                             "batches of many different layouts; results are still checked "
                             "against the engine)")
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:
        return int(exc.code or 0)
    if args.in_place == (args.outdir is not None):
        print("error: give -o OUTDIR or --in-place (exactly one)", file=sys.stderr)
        return 2
    if args.jobs < 1:
        print(f"error: --jobs {args.jobs} must be >= 1", file=sys.stderr)
        return 2
    from .build import CAUTIONS
    batch = recalc_many(args.paths, outdir=args.outdir, jobs=args.jobs,
                        progress=not args.no_progress, in_place=args.in_place,
                        backup=not args.no_backup, summary=args.summary, force=args.force,
                        compare_layout=not args.no_layout_check)
    _print_report(batch)
    if not batch.results:
        print("error: no workbooks (*.xlsx) found in " + ", ".join(args.paths), file=sys.stderr)
    print("\nCAUTION - preliminary design aid:")
    for text in CAUTIONS[:5]:
        print(f"  * {text}")
    return batch.exit_status if batch.results else 1


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main_recalc())
