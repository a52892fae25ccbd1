# SPDX-License-Identifier: MIT
"""Print layout of a worksheet for filing: paper, orientation, fit to width, titles, footer.

This is openpyxl page set-up written into the workbook; any application that prints or exports
the file (Excel, LibreOffice, :func:`workbook_builder.xlsx.libreoffice.export_pdf`) follows it.
"""
from __future__ import annotations

import re
from typing import Any

__all__ = ["set_print_layout"]


def set_print_layout(ws: Any, paper: str = "A4", landscape: bool = False,
                     title_rows: str | tuple[int, int] | None = None, *,
                     print_area: str | None = None, fit_to_width: bool = True,
                     margins_in: float = 0.6, footer: bool = True) -> None:
    """Lay out an openpyxl worksheet for filing: paper, fit to width, titles, footer.

    ``paper`` is ``"A4"`` or ``"Letter"``; ``title_rows`` repeats rows at the top of each page
    (``"1:3"`` or ``(1, 3)``); ``print_area`` defaults to the used range of the sheet. With
    ``fit_to_width`` the sheet is scaled to one page wide and as many pages tall as needed. With
    ``footer`` each page shows the sheet name and "Page n of N" (header/footer codes &A, &P, &N).

    Raises
    ------
    ValueError
        For an unknown paper name or malformed title rows.
    """
    sizes = {"A4": ws.PAPERSIZE_A4, "LETTER": ws.PAPERSIZE_LETTER}
    key = str(paper).upper()
    if key not in sizes:
        raise ValueError(f"paper={paper!r} must be one of ['A4', 'Letter']")
    ws.page_setup.paperSize = sizes[key]
    ws.page_setup.orientation = "landscape" if landscape else "portrait"
    if fit_to_width:
        ws.sheet_properties.pageSetUpPr.fitToPage = True
        ws.page_setup.fitToWidth = 1
        ws.page_setup.fitToHeight = 0
    else:
        ws.sheet_properties.pageSetUpPr.fitToPage = False
    if title_rows is not None:
        if isinstance(title_rows, tuple):
            first, last = title_rows
        else:
            m = re.fullmatch(r"\$?(\d+):\$?(\d+)", str(title_rows).strip())
            if not m:
                raise ValueError(f"title_rows={title_rows!r} must look like '1:3' or (1, 3)")
            first, last = int(m.group(1)), int(m.group(2))
        if not (isinstance(first, int) and isinstance(last, int) and 1 <= first <= last):
            raise ValueError(f"title_rows={title_rows!r} must be rows first <= last, from 1")
        ws.print_title_rows = f"{first}:{last}"
    ws.print_area = print_area or ws.dimensions
    for side in ("left", "right"):
        setattr(ws.page_margins, side, margins_in)
    ws.page_margins.top = ws.page_margins.bottom = margins_in + 0.15
    ws.page_margins.header = ws.page_margins.footer = 0.3
    ws.print_options.horizontalCentered = False
    if footer:
        ws.oddFooter.left.text = "&A"
        ws.oddFooter.right.text = "Page &P of &N"
        ws.evenFooter.left.text = "&A"
        ws.evenFooter.right.text = "Page &P of &N"
