# SPDX-License-Identifier: MIT
"""The example workbooks as a checking engineer receives them: LibreOffice's PDF, read as text.

Each example is built and exported to PDF by LibreOffice headless (one soffice run for all of
them, workbook_builder.xlsx.libreoffice.convert_many); poppler's ``pdftotext -raw`` gives each
page's text in drawing order. Then: every label of the plan inside a sheet's print area is
printed whole (a column too narrow clips it; compared without white space, since a wrapped
label breaks across lines); every page carries the project number, title, revision,
calculated / checked by, its sheet name and "Page n of N"; the Summary is one page; no number is
shown as '###' or an error code.

Behaviour tests of our own rules: common practice, no source. Skipped, with the reason, when
soffice or pdftotext is not installed (CI installs libreoffice-calc-nogui and poppler-utils).
"""
from __future__ import annotations

import re
import shutil
import subprocess

import pytest
from openpyxl.utils import range_boundaries

from workbook_builder.build import write_workbook
from workbook_builder.project import load_project
from workbook_builder.xlsx import libreoffice

from workbook_cases import EXAMPLES, NAMES

pytestmark = [
    pytest.mark.skipif(libreoffice.find_soffice() is None,
                       reason="LibreOffice (soffice) is not installed"),
    pytest.mark.skipif(shutil.which("pdftotext") is None,
                       reason="pdftotext (poppler-utils) is not installed"),
]


@pytest.fixture(scope="module")
def printed(tmp_path_factory):
    """name -> (built workbook, list of page texts)."""
    folder = tmp_path_factory.mktemp("printed")
    built, paths = {}, []
    for name in NAMES:
        path = folder / f"{name}.xlsx"
        built[name] = write_workbook(load_project(EXAMPLES / f"{name}.toml"), path)
        paths.append(path)
    pdfs = libreoffice.convert_many(paths, folder / "pdf", "pdf:calc_pdf_Export")
    out = {}
    for name, pdf in zip(NAMES, pdfs):
        text = subprocess.run(["pdftotext", "-raw", str(pdf), "-"], capture_output=True,
                              text=True, timeout=120, check=True).stdout
        out[name] = (built[name], [p for p in text.split("\f") if p.strip()])
    return out


def _squeeze(text: str) -> str:
    return "".join(text.split())


def _printed_labels(plan):
    """(sheet, cell, text) of every label inside its sheet's print area."""
    for sheet in plan.sheets:
        area = range_boundaries(sheet.print_area) if sheet.print_area else None
        for cell in sheet.cells.values():
            if cell.kind != "label" or not isinstance(cell.content, str) or not cell.content:
                continue
            if area is not None:
                col, row = range_boundaries(f"{cell.ref}:{cell.ref}")[:2]
                if not (area[0] <= col <= area[2] and area[1] <= row <= area[3]):
                    continue
            yield sheet.title, cell.ref, cell.content


@pytest.mark.parametrize("name", NAMES)
def test_every_label_prints_whole(printed, name):
    built, pages = printed[name]
    text = _squeeze("".join(pages))
    labels = list(_printed_labels(built.plan))
    assert len(labels) > 300
    cut = [(s, ref, t) for s, ref, t in labels if _squeeze(t) not in text]
    assert not cut, f"{len(cut)} label(s) not printed whole, first: {cut[:5]}"


@pytest.mark.parametrize("name", NAMES)
def test_every_page_carries_the_project_and_its_place(printed, name):
    built, pages = printed[name]
    info = built.project.info
    sheets = [s.title for s in built.plan.sheets]
    for number, page in enumerate(pages, start=1):
        flat = " ".join(page.split())
        assert info["number"] in flat and info["title"][:40] in flat, number
        assert f"Rev. {info['revision']}" in flat, number
        assert f"Calc. {info['calculated_by']} / Check." in flat, number
        assert f"Page {number} of {len(pages)}" in flat, number
        footer = re.search(rf"(\w+) Page {number} of", flat)
        assert footer and footer.group(1) in sheets, number


@pytest.mark.parametrize("name", NAMES)
def test_summary_is_one_page_and_numbers_are_shown(printed, name):
    built, pages = printed[name]
    assert "Summary Page 1 of" in " ".join(pages[0].split())
    if built.plan.options.parts:
        # the design envelope: inputs on the first page, results and verdicts from the second,
        # the whole Summary on two pages
        assert "Design inputs" in pages[0] and "Results and design checks" in pages[1]
        assert "Summary Page 2 of" in " ".join(pages[1].split())
        assert "Summary Page" not in " ".join(pages[2].split())
    else:
        assert "Design inputs" in pages[0] and "Results and design checks" in pages[0]
        assert "Summary Page" not in " ".join(pages[1].split())
    text = "".join(pages)
    assert "###" not in text
    for code in ("Err:", "#NAME?", "#VALUE!", "#DIV/0!", "#NUM!", "#REF!", "#N/A"):
        assert code not in text, code
