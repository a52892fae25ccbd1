# SPDX-License-Identifier: MIT
"""Native charts of a built workbook: titles, axis units, data caches equal to the cells.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import re
import shutil
import subprocess
import zipfile
from xml.etree import ElementTree

import openpyxl
import pytest

from workbook_builder.build import write_workbook
from workbook_builder.plan.charts import MAX_TIME_POINTS
from workbook_builder.project import parse_project
from workbook_builder.xlsx import libreoffice
from workbook_builder.xlsx.charts import fill_chart_caches

NS = {"c": "http://schemas.openxmlformats.org/drawingml/2006/chart",
      "a": "http://schemas.openxmlformats.org/drawingml/2006/main"}
needs_soffice = pytest.mark.skipif(libreoffice.find_soffice() is None,
                                   reason="LibreOffice (soffice) not installed")
PROJECT = {"mode": {"frequency": 0.2, "modal_mass": 2.0e7, "structural_damping": 0.01},
           "wind": {"acceleration": 0.25, "acceleration_limit": 0.15},
           "damper": {"mass_ratio": 0.02, "clearance": 1.5}}     # invented demo data


@pytest.fixture(scope="module")
def saved(tmp_path_factory):
    path = tmp_path_factory.mktemp("charts") / "charts.xlsx"
    write_workbook(parse_project(PROJECT, source="charts.toml"), path)
    return path


@pytest.fixture(scope="module")
def nonlinear(tmp_path_factory):
    path = tmp_path_factory.mktemp("charts") / "nonlinear.xlsx"
    data = {**PROJECT, "simulation": {"load": "harmonic", "duration": 300}}
    write_workbook(parse_project(data, source="nonlinear.toml"), path)
    return path


def _chart_xml(path):
    with zipfile.ZipFile(path) as zf:
        names = sorted(n for n in zf.namelist() if re.fullmatch(r"xl/charts/chart\d+\.xml", n))
        return [ElementTree.fromstring(zf.read(n)) for n in names]


def _text(el):
    return "".join(t.text or "" for t in el.iter(f"{{{NS['a']}}}t"))


def test_three_charts_with_titles_and_axis_units(saved):
    roots = _chart_xml(saved)
    assert len(roots) == 3
    titles = [_text(r.find("c:chart/c:title", NS)) for r in roots]
    assert titles[0].startswith("Period ratio") and "harmonic force" in titles[1]
    for root in roots:
        axes = root.findall("c:chart/c:plotArea/c:valAx", NS)
        assert len(axes) == 2
        for ax in axes:
            assert re.search(r"\[[^\]]+\]$", _text(ax.find("c:title", NS)))   # unit in brackets
            assert ax.find("c:delete", NS).get("val") in ("0", "false")


def test_chart_caches_equal_cells(saved):
    ws = openpyxl.load_workbook(saved, data_only=True)["Charts"]
    n_refs = 0
    for root in _chart_xml(saved):
        for num_ref in root.iter(f"{{{NS['c']}}}numRef"):
            ref = num_ref.find("c:f", NS).text
            cache = num_ref.find("c:numCache", NS)
            assert cache is not None, f"no cache for {ref}"
            rng = ref.split("!")[1].replace("$", "")
            cells = [row[0].value for row in ws[rng]] if ":" in rng else [ws[rng].value]
            assert int(cache.find("c:ptCount", NS).get("val")) == len(cells)
            pts = {int(p.get("idx")): float(p.find("c:v", NS).text)
                   for p in cache.findall("c:pt", NS)}
            assert sorted(pts) == list(range(len(cells)))
            for i, v in enumerate(cells):
                assert pts[i] == pytest.approx(v, rel=1e-14)
            n_refs += 1
    assert n_refs == 2 * (4 + 2 + 3)   # x and y of every series


def test_fill_chart_caches_str_ref_and_formula_refusal():
    from openpyxl.chart import LineChart, Reference

    wb = openpyxl.Workbook()
    ws = wb.active
    ws.append(["x", "Series A"])
    for i in range(3):
        ws.append([i, i * i])
    ch = LineChart()
    ch.add_data(Reference(ws, min_col=2, min_row=1, max_row=4), titles_from_data=True)
    ch.set_categories(Reference(ws, min_col=1, min_row=2, max_row=4))
    ws.add_chart(ch, "D2")
    assert fill_chart_caches(ws) == 3
    s = ch.series[0]
    assert [p.v for p in s.tx.strRef.strCache.pt] == ["Series A"]
    assert [p.v for p in s.val.numRef.numCache.pt] == [0.0, 1.0, 4.0]
    ws["B3"] = "=B2+1"
    with pytest.raises(ValueError, match=r"holds formula cell\(s\) \['B3'\]"):
        fill_chart_caches(ws)


def test_sheet_layout_and_text_cells(saved):
    wb = openpyxl.load_workbook(saved)
    ws = wb["Charts"]
    assert "licensed engineer" in ws["A2"].value
    assert ws.print_title_rows == "$1:$2"
    assert ws.page_setup.fitToWidth == 1
    assert not any(c.data_type == "f" for row in ws.iter_rows() for c in row)


@needs_soffice
@pytest.mark.skipif(shutil.which("pdftoppm") is None, reason="pdftoppm not installed")
def test_renders_to_pdf_and_png(saved, tmp_path):
    pdf = libreoffice.export_pdf(saved, tmp_path)
    assert pdf.read_bytes().startswith(b"%PDF")
    subprocess.run(["pdftoppm", "-png", "-r", "60", "-f", "1", "-l", "1", str(pdf),
                    str(tmp_path / "page")], check=True, timeout=120)
    png = next(tmp_path.glob("page*.png"))
    assert png.stat().st_size > 20_000   # three charts drawn, not a blank page


def test_time_history_charts_carry_their_data(nonlinear):
    path = nonlinear
    roots = _chart_xml(path)[-2:]                  # the Nonlinear sheet's two charts
    titles = [_text(r.find("c:chart/c:title", NS)) for r in roots]
    assert "without and with the damper" in titles[0] and "swing angle" in titles[1]
    cells = openpyxl.load_workbook(path, data_only=True)["Nonlinear"]
    for root in roots:
        for ax in root.findall("c:chart/c:plotArea/c:valAx", NS):
            assert re.search(r"\[[^\]]+\]$", _text(ax.find("c:title", NS)))
        for num_ref in root.iter(f"{{{NS['c']}}}numRef"):
            rng = num_ref.find("c:f", NS).text.split("!")[1].replace("$", "")
            values = [row[0].value for row in cells[rng]]
            pts = [float(p.find("c:v", NS).text)
                   for p in num_ref.find("c:numCache", NS).findall("c:pt", NS)]
            assert pts == pytest.approx(values, rel=1e-14) and len(pts) <= MAX_TIME_POINTS
