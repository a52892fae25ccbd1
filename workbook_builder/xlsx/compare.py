# SPDX-License-Identifier: MIT
"""Golden-workbook comparison, cell by cell, not byte by byte.

Two .xlsx files built from the same project by the same code differ in their bytes (timestamps in
the document properties, zip dates) but must not differ in anything a reviewer sees or relies on.
:func:`compare_workbooks` compares, in this order:

1. each sheet of ``a`` in order (then sheets only in ``b``): presence, then every cell in row-major
   order (formula or constant, cached value, number format, locked flag), then the sheet's merged
   cells, data validations, sheet-scoped defined names, print area and title rows, visibility,
   protection and number of charts;
2. the workbook: sheet order, workbook-scoped defined names, and the document properties except
   their timestamps (``created``, ``modified``, ``lastPrinted``).

So the first message names the first differing sheet and cell. Numbers compare with a relative
tolerance (default 1e-12, enough for last-bit differences between platforms' maths libraries);
everything else compares exactly.
"""
from __future__ import annotations

import math
import os
from pathlib import Path
from typing import Any, Iterable

from openpyxl import load_workbook
from openpyxl.utils import get_column_letter

from .files import PACKAGE_DIGEST_PROPERTY

__all__ = ["compare_workbooks", "assert_workbooks_equal"]

_TIMESTAMPS = {"created", "modified", "lastPrinted"}
_CORE_FIELDS = ("title", "subject", "creator", "keywords", "description", "lastModifiedBy",
                "category", "contentStatus", "identifier", "language", "revision", "version")
_DV_FIELDS = ("type", "operator", "formula1", "formula2", "allow_blank", "showErrorMessage",
              "showInputMessage", "errorStyle", "error", "errorTitle", "prompt", "promptTitle",
              "showDropDown")


def _same(x: Any, y: Any, rel_tol: float) -> bool:
    if isinstance(x, bool) or isinstance(y, bool):
        return type(x) is type(y) and x == y
    if isinstance(x, (int, float)) and isinstance(y, (int, float)):
        if isinstance(x, float) and isinstance(y, float) and math.isnan(x) and math.isnan(y):
            return True
        return x == y or math.isclose(x, y, rel_tol=rel_tol, abs_tol=0.0)
    return x == y


def _formula_text(value: Any) -> Any:
    """Formula cells read as str or ArrayFormula; compare the text (and the array's range)."""
    text = getattr(value, "text", None)
    if text is not None:
        return f"{{array {getattr(value, 'ref', '')}}}{text}"
    return value


def _cells(ws: Any) -> dict[tuple[int, int], Any]:
    out = {}
    for row in ws.iter_rows():
        for c in row:
            if c.value is not None or c.number_format != "General" or c.has_style:
                out[(c.row, c.column)] = c
    return out


def _validations(ws: Any) -> dict[str, dict[str, Any]]:
    out = {}
    for dv in ws.data_validations.dataValidation:
        key = " ".join(sorted(str(dv.sqref).split()))
        out[key] = {f: getattr(dv, f, None) for f in _DV_FIELDS}
    return out


def _names(container: Any) -> dict[str, tuple]:
    return {name: (dn.attr_text, bool(dn.hidden)) for name, dn in container.items()}


def _diff_mapping(where: str, what: str, a: dict, b: dict) -> list[str]:
    out = []
    for key in list(a) + [k for k in b if k not in a]:
        if key not in b:
            out.append(f"{where}: {what} {key!r} only in a")
        elif key not in a:
            out.append(f"{where}: {what} {key!r} only in b")
        elif isinstance(a[key], dict) and a[key] != b[key]:
            fields = [f"{f} {a[key].get(f)!r} (a) != {b[key].get(f)!r} (b)"
                      for f in a[key] if a[key].get(f) != b[key].get(f)]
            out.append(f"{where}: {what} {key!r}: " + "; ".join(fields))
        elif a[key] != b[key]:
            out.append(f"{where}: {what} {key!r}: {a[key]!r} (a) != {b[key]!r} (b)")
    return out


def _compare_sheet(name: str, fa: Any, fb: Any, va: Any, vb: Any, rel_tol: float) -> list[str]:
    out: list[str] = []
    ca, cb = _cells(fa), _cells(fb)
    cva, cvb = _cells(va), _cells(vb)
    where_sheet = f"sheet {name!r}"
    for rc in sorted(set(ca) | set(cb)):
        where = f"sheet {name!r} cell {get_column_letter(rc[1])}{rc[0]}"
        x, y = ca.get(rc), cb.get(rc)
        xv = _formula_text(x.value) if x is not None else None
        yv = _formula_text(y.value) if y is not None else None
        x_formula = x is not None and x.data_type == "f"
        y_formula = y is not None and y.data_type == "f"
        if x_formula != y_formula:
            kinds = ("formula" if x_formula else "constant", "formula" if y_formula else "constant")
            out.append(f"{where}: {kinds[0]} {xv!r} (a) != {kinds[1]} {yv!r} (b)")
            continue
        if x_formula:
            if xv != yv:
                out.append(f"{where}: formula {xv!r} (a) != {yv!r} (b)")
                continue
        elif not _same(xv, yv, rel_tol):
            out.append(f"{where}: value {xv!r} (a) != {yv!r} (b)")
            continue
        # Cached (stored) value, as a viewer that does not recalculate shows it.
        xc = cva[rc].value if rc in cva else None
        yc = cvb[rc].value if rc in cvb else None
        if not _same(xc, yc, rel_tol):
            out.append(f"{where}: cached value {xc!r} (a) != {yc!r} (b)")
        xf = x.number_format if x is not None else "General"
        yf = y.number_format if y is not None else "General"
        if xf != yf:
            out.append(f"{where}: number format {xf!r} (a) != {yf!r} (b)")
        xl = x.protection.locked if x is not None else True
        yl = y.protection.locked if y is not None else True
        if bool(xl) != bool(yl):
            out.append(f"{where}: locked {bool(xl)} (a) != {bool(yl)} (b)")
    ma = sorted(str(r) for r in fa.merged_cells.ranges)
    mb = sorted(str(r) for r in fb.merged_cells.ranges)
    if ma != mb:
        out.append(f"{where_sheet}: merged cells {ma} (a) != {mb} (b)")
    out += _diff_mapping(where_sheet, "data validation", _validations(fa), _validations(fb))
    out += _diff_mapping(where_sheet, "sheet-scoped name", _names(fa.defined_names),
                         _names(fb.defined_names))
    for attr in ("print_area", "print_title_rows", "print_title_cols", "sheet_state"):
        xa, xb = getattr(fa, attr, None), getattr(fb, attr, None)
        if xa != xb:
            out.append(f"{where_sheet}: {attr.replace('_', ' ')} {xa!r} (a) != {xb!r} (b)")
    pa, pb = bool(fa.protection.sheet), bool(fb.protection.sheet)
    if pa != pb:
        out.append(f"{where_sheet}: protected {pa} (a) != {pb} (b)")
    na, nb = len(getattr(fa, "_charts", [])), len(getattr(fb, "_charts", []))
    if na != nb:
        out.append(f"{where_sheet}: {na} chart(s) (a) != {nb} (b)")
    return out


def _properties(wb: Any) -> dict[str, Any]:
    props = {f"core {f}": getattr(wb.properties, f, None) for f in _CORE_FIELDS}
    for p in wb.custom_doc_props.props:
        if p.name != PACKAGE_DIGEST_PROPERTY:     # a digest of the bytes: differs with them
            props[f"custom {p.name}"] = p.value
    return {k: v for k, v in props.items() if k.split(" ", 1)[1] not in _TIMESTAMPS}


def compare_workbooks(a: str | os.PathLike, b: str | os.PathLike, *, rel_tol: float = 1e-12,
                      max_differences: int = 200,
                      ignore_properties: Iterable[str] = ()) -> list[str]:
    """List the differences between two .xlsx workbooks, first differing sheet and cell first.

    Each message names the sheet and cell (or the workbook part) and shows both sides, ``(a)``
    then ``(b)``. An empty list means the workbooks are equal for a reviewer. At most
    ``max_differences`` messages are returned (a last line says how many were left out).
    ``ignore_properties`` names document properties to skip besides the timestamps, e.g.
    ``["custom SwaytuneGenerator"]`` when comparing across program versions.

    Raises
    ------
    FileNotFoundError
        When either file does not exist.
    """
    for p in (a, b):
        if not Path(p).is_file():
            raise FileNotFoundError(f"workbook not found: {p}")
    fa, fb = load_workbook(a), load_workbook(b)
    va, vb = load_workbook(a, data_only=True), load_workbook(b, data_only=True)
    out: list[str] = []
    names_a, names_b = fa.sheetnames, fb.sheetnames
    for name in names_a + [n for n in names_b if n not in names_a]:
        if name not in names_b:
            out.append(f"sheet {name!r}: only in a")
        elif name not in names_a:
            out.append(f"sheet {name!r}: only in b")
        else:
            out += _compare_sheet(name, fa[name], fb[name], va[name], vb[name], rel_tol)
    if [n for n in names_a if n in names_b] != [n for n in names_b if n in names_a]:
        out.append(f"workbook: sheet order {names_a} (a) != {names_b} (b)")
    out += _diff_mapping("workbook", "defined name", _names(fa.defined_names),
                         _names(fb.defined_names))
    skip = set(ignore_properties)
    pa = {k: v for k, v in _properties(fa).items() if k not in skip}
    pb = {k: v for k, v in _properties(fb).items() if k not in skip}
    out += _diff_mapping("workbook", "document property", pa, pb)
    for wb in (fa, fb, va, vb):
        wb.close()
    if len(out) > max_differences:
        extra = len(out) - max_differences
        out = out[:max_differences] + [f"... and {extra} more difference(s)"]
    return out


def assert_workbooks_equal(a: str | os.PathLike, b: str | os.PathLike, **kwargs: Any) -> None:
    """Raise AssertionError listing the first differences when the workbooks differ.

    Keyword arguments go to :func:`compare_workbooks`.
    """
    diffs = compare_workbooks(a, b, **kwargs)
    if diffs:
        shown = "\n  ".join(diffs[:20])
        raise AssertionError(f"{a} and {b} differ ({len(diffs)} difference(s)), first:\n  {shown}")
