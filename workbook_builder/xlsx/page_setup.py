# SPDX-License-Identifier: MIT
"""Print layout of a worksheet for filing: paper, orientation, fit to width, titles, header, footer.

This is openpyxl page set-up written into the workbook; any application that prints or exports
the file (Excel, LibreOffice, :func:`workbook_builder.xlsx.libreoffice.export_pdf`) follows it.
"""
from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Any

__all__ = ["set_print_layout", "PageHeader", "header_text"]

#: Longest header or footer an application accepts (Excel: 255 characters with the codes).
HEADER_LIMIT = 255


@dataclass(frozen=True)
class PageHeader:
    """The project's identification printed at the top of every page (texts as given)."""

    number: str = ""
    title: str = ""
    revision: str = ""
    calculated_by: str = ""
    checked_by: str = ""


def _escape(text: str, limit: int) -> str:
    """User text for a header: one line, '&' doubled (a header code otherwise), shortened."""
    one_line = " ".join(str(text).split())
    if len(one_line) > limit:
        one_line = one_line[:limit - 3].rstrip() + "..."
    return one_line.replace("&", "&&")


def header_text(header: PageHeader) -> tuple[str, str, str]:
    """Left, centre and right sections of the page header.

    Left: project number and title; centre: revision; right: calculated by / checked by. Each
    section stays within the applications' limit of 255 characters for the whole header.

    Examples
    --------
    >>> header_text(PageHeader("P-1", "Tower & mast", "B", "A. Author", "C. Checker"))
    ('P-1  Tower && mast', 'Rev. B', 'Calc. A. Author / Check. C. Checker')
    """
    left = "  ".join(t for t in (_escape(header.number, 30), _escape(header.title, 100)) if t)
    centre = f"Rev. {_escape(header.revision, 12)}" if header.revision.strip() else ""
    right = (f"Calc. {_escape(header.calculated_by or '-', 30)} / "
             f"Check. {_escape(header.checked_by or '-', 30)}")
    return left, centre, right


def set_print_layout(ws: Any, paper: str = "A4", landscape: bool = False,
                     title_rows: str | tuple[int, int] | None = None, *,
                     print_area: str | None = None, fit_to_width: bool = True,
                     margins_in: float = 0.6, footer: bool = True, pages: int = 0,
                     header: PageHeader | None = None) -> None:
    """Lay out an openpyxl worksheet for filing: paper, fit to width, titles, header, footer.

    ``paper`` is ``"A4"`` or ``"Letter"``; ``title_rows`` repeats rows at the top of each page
    (``"1:3"`` or ``(1, 3)``); ``print_area`` defaults to the used range of the sheet. With
    ``fit_to_width`` the sheet is scaled to one page wide and as many pages tall as needed. With
    ``footer`` each page shows the sheet name and "Page n of N" (header/footer codes &A, &P, &N).
    With ``pages`` > 0 the sheet is scaled to fit that many pages in height. ``header`` puts
    the project number, title, revision and calculated / checked by at the top of every page.

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
        ws.page_setup.fitToHeight = pages
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
    ws.page_margins.top = ws.page_margins.bottom = margins_in + (0.3 if header else 0.15)
    ws.page_margins.header = ws.page_margins.footer = 0.3
    ws.print_options.horizontalCentered = False
    if footer:
        for part in (ws.oddFooter, ws.evenFooter):
            part.left.text = "&A"
            part.right.text = "Page &P of &N"
    if header is not None:
        left, centre, right = header_text(header)
        for part in (ws.oddHeader, ws.evenHeader):
            part.left.text, part.left.size = left or None, 8
            part.center.text, part.center.size = centre or None, 8
            part.right.text, part.right.size = right, 8
