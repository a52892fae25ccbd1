# SPDX-License-Identifier: MIT
"""Native charts drawn from a plan's chart specs, with their data caches filled.

openpyxl writes chart series as cell references only. A viewer that does not recalculate or
re-read the cells (file previewers) then draws empty charts, so every reference here also
carries its data cache (``<c:numCache>``, ``<c:strCache>``) filled from the values written to
the cells: see :func:`fill_chart_caches`, which works for any openpyxl chart whose source cells
hold values. :func:`add_chart` draws one :class:`workbook_builder.plan.model.Chart`.
"""
from __future__ import annotations

import math
from typing import Any, Sequence

from openpyxl.chart import Reference, ScatterChart, Series
from openpyxl.chart.axis import ChartLines
from openpyxl.chart.data_source import NumData, NumVal, StrData, StrVal
from openpyxl.chart.text import RichText
from openpyxl.drawing.text import CharacterProperties, Paragraph, ParagraphProperties
from openpyxl.utils.cell import range_boundaries

from ..plan.model import Chart

__all__ = ["add_chart", "fill_chart_caches", "CHART_WIDTH_CM", "CHART_HEIGHT_CM"]

CHART_WIDTH_CM, CHART_HEIGHT_CM = 20.5, 9.6


def _reference(ws: Any, cell_range: str) -> Any:
    c1, r1, c2, r2 = range_boundaries(cell_range)
    return Reference(ws, min_col=c1, min_row=r1, max_col=c2, max_row=r2)


def _series(ws: Any, x_range: str, y_range: str, title: str, color: str, *,
            dash: str | None = None, marker: str | None = None, line: bool = True,
            width_emu: int = 22000) -> Any:
    s = Series(_reference(ws, y_range), _reference(ws, x_range), title=title)
    if line:
        s.graphicalProperties.line.solidFill = color
        s.graphicalProperties.line.width = width_emu      # EMU (22000: about 1.7 pt)
        if dash:
            s.graphicalProperties.line.dashStyle = dash
    else:
        s.graphicalProperties.line.noFill = True
    if marker:
        s.marker.symbol = marker
        s.marker.size = 8
        s.marker.graphicalProperties.solidFill = color
        s.marker.graphicalProperties.line.solidFill = color
    else:
        s.marker.symbol = "none"
    s.smooth = False
    return s


def _text_size(title: Any, size_pt: float, bold: bool) -> None:
    """Set the font size of a chart or axis title (paragraph default and every run)."""
    for para in title.tx.rich.p:
        para.pPr = ParagraphProperties(defRPr=CharacterProperties(sz=int(size_pt * 100), b=bold))
        for run in para.r or []:
            run.rPr = CharacterProperties(sz=int(size_pt * 100), b=bold)


def _tick_labels(size_pt: float) -> Any:
    cp = CharacterProperties(sz=int(size_pt * 100))
    return RichText(p=[Paragraph(pPr=ParagraphProperties(defRPr=cp), endParaRPr=cp)])


def _scatter(title: str, x_title: str, y_title: str, *, x_min: float | None = None,
             x_max: float | None = None, y_format: str = "0.00", x_format: str = "0.00",
             width_cm: float = CHART_WIDTH_CM, height_cm: float = CHART_HEIGHT_CM) -> Any:
    ch = ScatterChart()
    ch.title = title
    ch.style = 2
    ch.scatterStyle = "lineMarker"
    ch.x_axis.title = x_title
    ch.y_axis.title = y_title
    _text_size(ch.title, 11, True)
    _text_size(ch.x_axis.title, 9, False)
    _text_size(ch.y_axis.title, 9, False)
    for axis in (ch.x_axis, ch.y_axis):
        axis.txPr = _tick_labels(8)
        axis.majorTickMark = "out"
        # openpyxl 3.1 marks axes deleted unless told otherwise: keep them visible.
        axis.delete = False
    ch.x_axis.number_format = x_format
    ch.y_axis.number_format = y_format
    ch.x_axis.majorGridlines = ChartLines()
    if x_min is not None:
        ch.x_axis.scaling.min = x_min
    if x_max is not None:
        ch.x_axis.scaling.max = x_max
    ch.legend.position = "b"
    ch.legend.txPr = _tick_labels(8)
    ch.width, ch.height = width_cm, height_cm
    return ch


def _cells_of(wb: Any, ref: str) -> list[Any]:
    """Values of the cells of a chart reference such as ``'Charts'!$A$5:$A$35``."""
    sheet, _, rng = ref.rpartition("!")
    sheet = sheet.strip("'").replace("''", "'")
    ws = wb[sheet]
    c1, r1, c2, r2 = range_boundaries(rng.replace("$", ""))
    cells = [ws.cell(r, c) for r in range(r1, r2 + 1) for c in range(c1, c2 + 1)]
    formulas = [c.coordinate for c in cells if c.data_type == "f"]
    if formulas:
        raise ValueError(f"chart reference {ref} holds formula cell(s) {formulas[:5]}; chart "
                         "caches need values")
    return [c.value for c in cells]


def _num_cache(values: Sequence[Any], fmt: str = "General") -> Any:
    pts = [NumVal(idx=i, v=float(v)) for i, v in enumerate(values)
           if isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)]
    return NumData(formatCode=fmt, ptCount=len(values), pt=pts)


def _str_cache(values: Sequence[Any]) -> Any:
    return StrData(ptCount=len(values),
                   pt=[StrVal(idx=i, v=str(v)) for i, v in enumerate(values) if v is not None])


def fill_chart_caches(ws: Any) -> int:
    """Fill the data caches of every chart series on ``ws`` from its source cells.

    Covers values (``val``/``yVal``), categories (``cat``/``xVal``) and series titles read from
    cells. Source cells must hold values, not formulas (formulas have no value before a
    recalculation). Returns the number of references filled.

    Raises
    ------
    ValueError
        When a referenced cell holds a formula.
    """
    wb = ws.parent
    filled = 0
    for chart in getattr(ws, "_charts", []):
        for s in chart.series:
            for part in ("val", "yVal", "cat", "xVal"):
                src = getattr(s, part, None)
                if src is None:
                    continue
                if src.numRef is not None and src.numRef.f:
                    values = _cells_of(wb, src.numRef.f)
                    src.numRef.numCache = _num_cache(values)
                    filled += 1
                if getattr(src, "strRef", None) is not None and src.strRef.f:
                    values = _cells_of(wb, src.strRef.f)
                    src.strRef.strCache = _str_cache(values)
                    filled += 1
            tx = getattr(s, "tx", None)
            if tx is not None and tx.strRef is not None and tx.strRef.f:
                values = _cells_of(wb, tx.strRef.f)
                tx.strRef.strCache = _str_cache(values)
                filled += 1
    return filled


def _x_values(ws: Any, cell_range: str) -> list[float]:
    return [v for v in _cells_of(ws.parent, f"'{ws.title}'!{cell_range}")
            if isinstance(v, (int, float)) and not isinstance(v, bool)]


def add_chart(ws: Any, spec: Chart) -> Any:
    """Draw ``spec`` on ``ws`` (whose cells already hold the values) and return the chart."""
    x_min, x_max = spec.x_min, spec.x_max
    if spec.fit_x:
        xs = _x_values(ws, spec.series[0].x)
        step = spec.x_round
        lo, hi = min(xs), max(xs)
        if step:
            lo, hi = step * math.floor(lo / step), step * math.ceil(hi / step)
        x_min = lo if x_min is None else x_min
        x_max = hi if x_max is None else x_max
    ch = _scatter(spec.title, spec.x_title, spec.y_title, x_min=x_min, x_max=x_max,
                  y_format=spec.y_format, x_format=spec.x_format)
    if spec.y_min is not None:
        ch.y_axis.scaling.min = spec.y_min
    if spec.tick_labels_low:
        ch.x_axis.tickLblPos = "low"        # labels under the plot, not on the zero line
    for s in spec.series:
        ch.series.append(_series(ws, s.x, s.y, s.title, s.color, dash=s.dash or None,
                                 marker=s.marker or None, line=s.line, width_emu=s.width))
    ws.add_chart(ch, spec.anchor)
    return ch
