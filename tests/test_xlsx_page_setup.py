# SPDX-License-Identifier: MIT
"""Print layout of a worksheet: paper, orientation, fit to width, title rows, footer, refusals.

Paper size codes from ECMA-376 Part 1 (5th ed., 2016), 18.3.1.63 pageSetup (paperSize): 1 =
Letter, 9 = A4. That LibreOffice's PDF export follows the layout is tested in
test_xlsx_libreoffice.py (test_export_pdf_with_print_layout).
"""
from __future__ import annotations

import openpyxl
import pytest

from workbook_builder.xlsx.page_setup import (HEADER_LIMIT, PageHeader, header_text,
                                              set_print_layout)


def test_set_print_layout_fields():
    wb = openpyxl.Workbook()
    ws = wb.active
    ws["A1"] = 1
    ws["D20"] = 2
    set_print_layout(ws, paper="A4", title_rows=(1, 3))
    assert int(ws.page_setup.paperSize) == 9   # ECMA-376 Part 1, 18.3.1.63: 9 = A4
    assert ws.page_setup.orientation == "portrait"
    assert ws.sheet_properties.pageSetUpPr.fitToPage is True
    assert ws.page_setup.fitToWidth == 1 and ws.page_setup.fitToHeight == 0
    assert ws.print_title_rows == "$1:$3"
    assert "$A$1:$D$20" in str(ws.print_area)
    assert ws.oddFooter.right.text == "Page &P of &N"


@pytest.mark.parametrize("paper", ["A3", "legal", ""])
def test_set_print_layout_bad_paper(paper):
    ws = openpyxl.Workbook().active
    with pytest.raises(ValueError, match=r"paper=.* must be one of \['A4', 'Letter'\]"):
        set_print_layout(ws, paper=paper)


@pytest.mark.parametrize("rows", ["1-3", "a:b", (3, 1), (0, 2)])
def test_set_print_layout_bad_title_rows(rows):
    ws = openpyxl.Workbook().active
    with pytest.raises(ValueError, match="title_rows="):
        set_print_layout(ws, title_rows=rows)


def test_set_print_layout_letter_landscape_without_fit_or_footer():
    ws = openpyxl.Workbook().active
    ws["A1"] = "Title"
    ws["C9"] = 3.5
    set_print_layout(ws, paper="Letter", landscape=True, fit_to_width=False, footer=False,
                     print_area="A1:C9", margins_in=0.5)
    assert int(ws.page_setup.paperSize) == 1   # ECMA-376 Part 1, 18.3.1.63: 1 = Letter
    assert ws.page_setup.orientation == "landscape"
    assert ws.sheet_properties.pageSetUpPr.fitToPage is False
    assert ws.print_title_rows is None
    assert "$A$1:$C$9" in str(ws.print_area)
    assert ws.page_margins.left == ws.page_margins.right == 0.5
    assert not ws.oddFooter.right.text


def test_page_header_carries_the_project_on_every_page():
    ws = openpyxl.Workbook().active
    ws["A1"] = "Title"
    header = PageHeader(number="P-7", title="Mast & deck", revision="C",
                        calculated_by="A. Author", checked_by="")
    set_print_layout(ws, header=header, pages=1)
    for part in (ws.oddHeader, ws.evenHeader):
        assert part.left.text == "P-7  Mast && deck"     # '&' starts a header code: doubled
        assert part.center.text == "Rev. C"
        assert part.right.text == "Calc. A. Author / Check. -"
    assert ws.oddFooter.left.text == "&A" and ws.oddFooter.right.text == "Page &P of &N"
    assert ws.page_setup.fitToWidth == 1 and ws.page_setup.fitToHeight == 1


def test_header_texts_stay_within_the_applications_limit():
    long = PageHeader(number="N" * 80, title="T " * 200, revision="R" * 40,
                      calculated_by="C" * 90, checked_by="K\n" * 60)
    left, centre, right = header_text(long)
    assert len(left) + len(centre) + len(right) + 20 <= HEADER_LIMIT
    assert "\n" not in right and left.endswith("...")
