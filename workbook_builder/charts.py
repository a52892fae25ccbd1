# SPDX-License-Identifier: MIT
"""Charts sheet: engine-computed tables and native charts with their data cached.

Three charts, each next to the table it plots (every value in the tables comes from the engine at
build time; nothing here does physics):

1. period ratio T/T0 against swing amplitude, exact (elliptic integral) and small-angle formula,
   with the trade's 15 deg rule of thumb (common practice, no source) and the design swing marked;
2. the building's dynamic amplification under a harmonic force over the frequency ratio, without
   and with the damper (:func:`functions.damper.frequency_response`);
3. effective damping against mass ratio, each mass ratio with its optimal damper
   (:func:`functions.damper.optimal_tuning` + :func:`functions.damper.effective_damping`), with the
   required damping and the design point marked.

openpyxl writes chart series as cell references only. A viewer that does not recalculate or
re-read the cells (file previewers) then draws empty charts, so every reference here also carries
its data cache (``<c:numCache>``, ``<c:strCache>``) filled from the values written to the cells:
see :func:`fill_chart_caches`, which works for any openpyxl chart whose source cells hold values.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Sequence

import numpy as np

from .xlsx.page_setup import set_print_layout

__all__ = ["ChartTable", "chart_tables", "add_charts_sheet", "fill_chart_caches",
           "RULE_OF_THUMB_DEG", "time_history_table", "swing_window_table",
           "add_time_history_charts", "MAX_TIME_POINTS"]

#: Swing amplitude up to which the small-angle period is taken as good enough
#: (common practice, no source; the period error there is about 0.43 %).
RULE_OF_THUMB_DEG = 15.0

#: Largest number of points of a time-history chart (the record is subsampled to it) [-].
MAX_TIME_POINTS = 3000

_BLUE, _ORANGE, _GREY, _RED, _GREEN = "1F4E79", "C55A11", "7F7F7F", "C00000", "548235"
_CHART_WIDTH_CM, _CHART_HEIGHT_CM = 20.5, 9.6
_CHART_ROWS = 19          # rows of 15 pt (0.53 cm) one chart covers, with a gap


@dataclass(frozen=True)
class ChartTable:
    """A block of engine values for one chart: title, column headers (with units), rows."""

    key: str
    title: str
    headers: tuple[str, ...]
    rows: tuple[tuple[float, ...], ...]
    number_formats: tuple[str, ...]


def _floats(values: Any) -> list[float]:
    out = [float(v) for v in np.atleast_1d(np.asarray(values, dtype=float))]
    bad = [v for v in out if not math.isfinite(v)]
    if bad:
        raise ValueError(f"chart data holds a non-finite value {bad[0]!r}; refusing to write it")
    return out


def _attr(result: Any, name: str) -> Any:
    """Read a result quantity, looking in ``result`` then ``result.inputs``."""
    if hasattr(result, name):
        return getattr(result, name)
    return getattr(result.inputs, name)


def _tuning_curve(mass_ratios: np.ndarray, method: str, zs: float) -> tuple[np.ndarray, ...]:
    from functions import damper

    closed = getattr(damper, "CLOSED_FORM_METHODS", ())
    # Closed forms are undamped-structure formulas (DESIGN_API.md); apply them as such.
    f, zd = damper.optimal_tuning(mass_ratios, method, 0.0 if method in closed else zs)
    f, zd = np.asarray(f, dtype=float), np.asarray(zd, dtype=float)
    zeff = np.asarray(damper.effective_damping(mass_ratios, f, zd, zs), dtype=float)
    return f, zd, zeff


def chart_tables(result: Any, *, amplitude_max_deg: float = 60.0, amplitude_step_deg: float = 2.0,
                 frequency_ratio_range: tuple[float, float] = (0.6, 1.4),
                 frequency_points: int = 81,
                 mass_ratio_range: tuple[float, float] | None = None,
                 mass_ratio_points: int = 19) -> dict[str, ChartTable]:
    """Compute the chart tables for a design result (engine values only).

    ``result`` is a :class:`functions.design.DesignResult` (any object with the same attribute
    names works). The amplitude range is extended to include the design swing; the mass-ratio
    range defaults to the practical range of the inputs, extended to include the design mass
    ratio.

    Returns a dict with keys ``period``, ``period_marks``, ``response``, ``damping``,
    ``damping_marks``.

    Raises
    ------
    ValueError
        For ranges or point counts that make no table, or non-finite engine values.
    """
    from functions import damper, pendulum

    if not (0 < amplitude_step_deg <= amplitude_max_deg < 180):
        raise ValueError(f"amplitude_max_deg={amplitude_max_deg!r} and amplitude_step_deg="
                         f"{amplitude_step_deg!r} must satisfy 0 < step <= max < 180 [deg]")
    lo_r, hi_r = frequency_ratio_range
    if not (0 <= lo_r < hi_r) or frequency_points < 3:
        raise ValueError(f"frequency_ratio_range={frequency_ratio_range!r} must be 0 <= low < high "
                         f"and frequency_points={frequency_points!r} >= 3 [-]")
    if mass_ratio_points < 3:
        raise ValueError(f"mass_ratio_points={mass_ratio_points!r} must be >= 3")

    swing = float(_attr(result, "swing_angle_deg"))
    zs = float(_attr(result, "structural_damping"))
    mu = float(_attr(result, "mass_ratio"))
    f_d = float(_attr(result, "tuning_ratio"))
    z_d = float(_attr(result, "damper_damping"))
    method = str(_attr(result, "tuning_method"))

    # 1. Period ratio against swing amplitude.
    a_max = max(amplitude_max_deg, min(179.0, math.ceil((swing + 5.0) / 5.0) * 5.0))
    amps = np.arange(0.0, a_max + 1e-9, amplitude_step_deg)
    exact = 1.0 + np.asarray(pendulum.small_angle_error(amps), dtype=float)
    period = ChartTable(
        "period", "Period ratio against swing amplitude",
        ("Swing amplitude θ0 [deg]", "Exact T/T0 [-]", "Small-angle T/T0 [-]"),
        tuple(zip(_floats(amps), _floats(exact), _floats(np.ones_like(amps)))),
        ("0.0", "0.00000", "0.00000"))
    top = float(exact[-1])
    design_ratio = 1.0 + float(pendulum.small_angle_error(swing))
    period_marks = ChartTable(
        "period_marks", "Marks",
        ("Mark", "θ0 [deg]", "T/T0 [-]"),
        ((f"{RULE_OF_THUMB_DEG:g}° rule *", RULE_OF_THUMB_DEG, 1.0),
         (f"{RULE_OF_THUMB_DEG:g}° rule *", RULE_OF_THUMB_DEG, top),
         ("Design swing", swing, design_ratio)),
        ("@", "0.00", "0.00000"))

    # 2. Dynamic amplification over frequency ratio.
    r = np.linspace(lo_r, hi_r, frequency_points)
    bare = damper.frequency_response(r, 0.0, 1.0, 0.0, zs)
    with_damper = damper.frequency_response(r, mu, f_d, z_d, zs)
    response = ChartTable(
        "response", "Dynamic amplification of the building",
        ("Frequency ratio ω/ωs [-]", "Without damper [-]", "With damper [-]"),
        tuple(zip(_floats(r), _floats(bare), _floats(with_damper))),
        ("0.000", "0.00", "0.00"))

    # 3. Effective damping against mass ratio, optimal damper at each mass ratio.
    if mass_ratio_range is None:
        lo_m = float(getattr(result.inputs, "mass_ratio_min", 0.005))
        hi_m = float(getattr(result.inputs, "mass_ratio_max", 0.05))
    else:
        lo_m, hi_m = mass_ratio_range
    lo_m, hi_m = min(lo_m, mu), max(hi_m, mu)
    if not (0 < lo_m < hi_m):
        raise ValueError(f"mass_ratio_range={(lo_m, hi_m)!r} must be 0 < low < high [-]")
    mus = np.linspace(lo_m, hi_m, mass_ratio_points)
    f_opt, z_opt, z_eff = _tuning_curve(mus, method, zs)
    damping = ChartTable(
        "damping", f"Effective damping with an optimal damper ({method})",
        ("Mass ratio μ [-]", "Tuning ratio f [-]", "Damper damping ζd [-]",
         "Effective damping ζeff [-]"),
        tuple(zip(_floats(mus), _floats(f_opt), _floats(z_opt), _floats(z_eff))),
        ("0.0000", "0.0000", "0.0000", "0.0000"))
    required = float(_attr(result, "required_damping"))
    damping_marks = ChartTable(
        "damping_marks", "Marks",
        ("Mark", "μ [-]", "ζ [-]"),
        (("Required ζ", lo_m, required), ("Required ζ", hi_m, required),
         ("Design", mu, float(_attr(result, "effective_damping")))),
        ("@", "0.0000", "0.0000"))
    return {t.key: t for t in (period, period_marks, response, damping, damping_marks)}


def _write_table(ws: Any, table: ChartTable, row: int, col: int) -> tuple[int, int]:
    """Write title, headers and rows at (row, col); return (first data row, last data row)."""
    from openpyxl.styles import Alignment, Border, Font, PatternFill, Side

    thin = Side(style="thin", color="A6A6A6")
    ws.cell(row, col, table.title).font = Font(bold=True)
    for j, head in enumerate(table.headers):
        c = ws.cell(row + 1, col + j, head)
        c.font = Font(bold=True)
        c.fill = PatternFill("solid", fgColor="DDEBF7")
        c.alignment = Alignment(wrap_text=True, vertical="center")
        c.border = Border(bottom=thin)
    for i, values in enumerate(table.rows):
        for j, v in enumerate(values):
            c = ws.cell(row + 2 + i, col + j)
            c.value = v
            if isinstance(v, str):
                c.data_type = "s"      # text is never a formula
            c.number_format = table.number_formats[j]
    return row + 2, row + 1 + len(table.rows)


def _series(ws: Any, xcol: int, ycol: int, first: int, last: int, title: str, color: str, *,
            dash: str | None = None, marker: str | None = None, line: bool = True,
            width_emu: int = 22000) -> Any:
    from openpyxl.chart import Reference, Series

    x = Reference(ws, min_col=xcol, min_row=first, max_row=last)
    y = Reference(ws, min_col=ycol, min_row=first, max_row=last)
    s = Series(y, x, title=title)
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
    from openpyxl.drawing.text import CharacterProperties, ParagraphProperties

    for para in title.tx.rich.p:
        para.pPr = ParagraphProperties(defRPr=CharacterProperties(sz=int(size_pt * 100), b=bold))
        for run in para.r or []:
            run.rPr = CharacterProperties(sz=int(size_pt * 100), b=bold)


def _tick_labels(size_pt: float) -> Any:
    from openpyxl.chart.text import RichText
    from openpyxl.drawing.text import CharacterProperties, Paragraph, ParagraphProperties

    cp = CharacterProperties(sz=int(size_pt * 100))
    return RichText(p=[Paragraph(pPr=ParagraphProperties(defRPr=cp), endParaRPr=cp)])


def _scatter(title: str, x_title: str, y_title: str, *, x_min: float | None = None,
             x_max: float | None = None, y_format: str = "0.00", x_format: str = "0.00",
             width_cm: float = _CHART_WIDTH_CM, height_cm: float = _CHART_HEIGHT_CM) -> Any:
    from openpyxl.chart import ScatterChart
    from openpyxl.chart.axis import ChartLines

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


def add_charts_sheet(wb: Any, result: Any, *, title: str = "Charts", index: int | None = None,
                     paper: str = "A4", positions: dict[str, tuple[int, int]] | None = None,
                     **table_options: Any) -> Any:
    """Add a sheet with the three chart tables and their native charts; return the sheet.

    ``result`` is a :class:`functions.design.DesignResult`; ``table_options`` go to
    :func:`chart_tables`. The charts sit on top (so they are seen first and print first), the
    tables below them; each chart's series carry their data cache. The sheet is laid out for
    printing on ``paper`` (A4 or Letter, portrait, fit to width, title rows repeated). When
    ``positions`` is given it receives ``table key -> (first data row, first column)`` of
    every table written (the builder's list of engine cells is made from it).

    Raises
    ------
    ValueError
        When a sheet named ``title`` already exists, or see :func:`chart_tables`.
    """
    from openpyxl.styles import Font
    from openpyxl.utils import get_column_letter
    from openpyxl.worksheet.pagebreak import Break

    if title in wb.sheetnames:
        raise ValueError(f"title={title!r}: the workbook already has a sheet of that name")
    tables = chart_tables(result, **table_options)
    ws = wb.create_sheet(title, index)
    ws["A1"] = "Charts: engine values computed when the workbook was built"
    ws["A1"].font = Font(bold=True, size=13)
    ws["A2"] = ("Preliminary design aid: results must be checked by a licensed engineer against "
                "local codes, wind-tunnel data and the manufacturer's design.")
    ws["A2"].font = Font(italic=True, color=_RED)
    for col, width in zip("ABCDEFGHIJKL", (12, 11, 11, 2, 12, 11, 11, 2, 11, 11, 11, 12)):
        ws.column_dimensions[col].width = width

    # Charts first (rows 4..), tables below them: period A:C, response E:G, damping I:L; the
    # marks under the period and damping tables.
    anchors = [f"A{4 + i * _CHART_ROWS}" for i in range(3)]
    top = 4 + 3 * _CHART_ROWS + 1
    p1, p2 = _write_table(ws, tables["period"], top, 1)
    r1, r2 = _write_table(ws, tables["response"], top, 5)
    d1, d2 = _write_table(ws, tables["damping"], top, 9)
    pm1, pm2 = _write_table(ws, tables["period_marks"], p2 + 2, 1)
    ws.cell(pm2 + 1, 1, "* rule of thumb: common practice, no source").font = Font(italic=True)
    dm1, dm2 = _write_table(ws, tables["damping_marks"], d2 + 2, 9)
    if positions is not None:
        positions.update({"period": (p1, 1), "response": (r1, 5), "damping": (d1, 9),
                          "period_marks": (pm1, 1), "damping_marks": (dm1, 9)})
    ws.row_dimensions[top + 1].height = 45
    ws.row_breaks.append(Break(id=top - 1))      # charts on the first page, tables after

    # 1. Period ratio.
    amp = tables["period"].rows
    ch1 = _scatter("Period ratio T/T0 against swing amplitude", "Swing amplitude θ0 [deg]",
                   "Period ratio T/T0 [-]", x_min=0.0, x_max=amp[-1][0], y_format="0.00",
                   x_format="0")
    ch1.series.append(_series(ws, 1, 2, p1, p2, "Exact (elliptic integral)", _BLUE))
    ch1.series.append(_series(ws, 1, 3, p1, p2, "Small-angle formula", _GREY, dash="dash"))
    ch1.series.append(_series(ws, 2, 3, pm1, pm1 + 1,
                              f"{RULE_OF_THUMB_DEG:g}° rule of thumb (common practice, no source)",
                              _GREEN, dash="sysDot"))
    ch1.series.append(_series(ws, 2, 3, pm2, pm2, "Design swing", _RED, marker="circle",
                              line=False))
    ch1.y_axis.scaling.min = 0.99
    ws.add_chart(ch1, anchors[0])

    # 2. Dynamic amplification.
    rr = tables["response"].rows
    ch2 = _scatter("Building response to a harmonic force", "Frequency ratio ω/ωs [-]",
                   "Dynamic amplification |xs/xst| [-]", x_min=rr[0][0], x_max=rr[-1][0],
                   y_format="0", x_format="0.00")
    ch2.series.append(_series(ws, 5, 6, r1, r2, "Without damper", _GREY, dash="dash"))
    ch2.series.append(_series(ws, 5, 7, r1, r2, "With damper", _BLUE))
    ch2.y_axis.scaling.min = 0.0
    ws.add_chart(ch2, anchors[1])

    # 3. Effective damping.
    dr = tables["damping"].rows
    ch3 = _scatter(tables["damping"].title, "Mass ratio μ = md/M* [-]",
                   "Damping ratio ζ [%]", x_min=dr[0][0], x_max=dr[-1][0], y_format="0.0%",
                   x_format="0.000")
    ch3.series.append(_series(ws, 9, 12, d1, d2, "Effective damping ζeff (optimal damper)",
                              _BLUE))
    ch3.series.append(_series(ws, 10, 11, dm1, dm1 + 1, "Required damping", _ORANGE,
                              dash="dash"))
    ch3.series.append(_series(ws, 10, 11, dm2, dm2, "Design", _RED, marker="circle", line=False))
    ch3.y_axis.scaling.min = 0.0
    ws.add_chart(ch3, anchors[2])

    fill_chart_caches(ws)
    last_row = max(p2, r2, d2, dm2)
    set_print_layout(ws, paper=paper, landscape=False, title_rows="1:2",
                     print_area=f"A1:{get_column_letter(12)}{last_row}")
    return ws


def _significant(values: Any, digits: int = 6) -> list[float]:
    """Values rounded to ``digits`` significant digits (plenty for a chart; stable files)."""
    return [float(f"{v:.{digits}g}") + 0.0 for v in _floats(values)]


def time_history_table(simulation: Any, max_points: int = MAX_TIME_POINTS) -> ChartTable:
    """Time histories of a simulation for the charts, subsampled to ``max_points`` rows.

    ``simulation`` is a :class:`functions.simulation.SimulationResult`. Every k-th sample is kept
    (k the smallest stride that gives at most ``max_points`` rows; the output step of the
    simulation resolves each period with at least 8 samples, so k = 2 or 3 still draws the
    oscillation); values are rounded to 6 significant digits. Columns: time, building
    acceleration without and with the damper (exact pendulum), hanger angle exact and
    linearised.

    Raises
    ------
    ValueError
        If ``max_points`` < 2 or a value is not finite.
    """
    if max_points < 2:
        raise ValueError(f"max_points={max_points!r} must be >= 2")
    n = int(simulation.time.size)
    stride = max(1, math.ceil(n / max_points))
    pick = slice(0, n, stride)
    nl, lin, bare = simulation.nonlinear, simulation.linear, simulation.without_damper
    columns = (_significant(simulation.time[pick]), _significant(bare.acceleration[pick]),
               _significant(nl.acceleration[pick]), _significant(nl.angle_deg[pick]),
               _significant(lin.angle_deg[pick]))
    return ChartTable(
        "time", f"Time histories (one sample in {stride})" if stride > 1 else "Time histories",
        ("Time t [s]", "Acceleration without damper [m/s^2]",
         "Acceleration with damper [m/s^2]", "Hanger angle, exact [deg]",
         "Hanger angle, linearised [deg]"),
        tuple(zip(*columns)), ("0.00", "0.00000", "0.00000", "0.000", "0.000"))


def swing_window_table(simulation: Any, periods: float = 10.0) -> ChartTable:
    """Hanger angle, exact and linearised, over ``periods`` damper periods around the peak swing.

    Every output sample of the window (no subsampling), values rounded to 6 significant
    digits; the window is centred on the largest |angle| of the exact model and kept inside
    the record.

    Raises
    ------
    ValueError
        If ``periods`` is not positive or a value is not finite.
    """
    if not periods > 0:
        raise ValueError(f"periods={periods!r} must be > 0")
    t = simulation.time
    angle = simulation.nonlinear.angle_deg
    n = int(t.size)
    half = max(1, int(round(0.5 * periods / simulation.damper_frequency / simulation.time_step)))
    centre = int(np.argmax(np.abs(angle)))
    lo = max(0, min(centre - half, n - 1 - 2 * half))
    hi = min(n, lo + 2 * half + 1)
    pick = slice(lo, hi)
    return ChartTable(
        "swing_window", f"Around the peak swing ({periods:g} damper periods)",
        ("Time t [s]", "Hanger angle, exact [deg]", "Hanger angle, linearised [deg]"),
        tuple(zip(_significant(t[pick]), _significant(angle[pick]),
                  _significant(simulation.linear.angle_deg[pick]))),
        ("0.00", "0.000", "0.000"))


def add_time_history_charts(ws: Any, simulation: Any, *, chart_row: int, data_row: int,
                            data_col: int, max_points: int = MAX_TIME_POINTS) -> int:
    """Write the time-history tables and two native charts over time; return the last row used.

    Chart 1, anchored at column A of ``chart_row``: building acceleration over the whole record
    without the damper and with it (exact pendulum model). Chart 2 below it: hanger angle,
    exact and linearised, over ten damper periods around the peak swing (over the whole record
    the oscillations are too dense to tell two curves apart). The tables
    (:func:`time_history_table`, five columns, then :func:`swing_window_table` one column to
    the right of it) start at (``data_row``, ``data_col``); the series carry their data caches
    (:func:`fill_chart_caches`). Nothing here does physics: the values are the engine's.

    Raises
    ------
    ValueError
        See :func:`time_history_table`.
    """
    table = time_history_table(simulation, max_points)
    first, last = _write_table(ws, table, data_row, data_col)
    ws.row_dimensions[data_row + 1].height = max(ws.row_dimensions[data_row + 1].height or 0,
                                                 45)
    t_end = table.rows[-1][0]
    thin = 9525                     # EMU, 0.75 pt: thousands of points stay legible
    ch1 = _scatter("Building acceleration over time, without and with the damper",
                   "Time t [s]", "Acceleration [m/s²]", x_min=0.0, x_max=t_end,
                   y_format="0.000", x_format="0")
    window = swing_window_table(simulation)
    w_col = data_col + len(table.headers) + 1
    w_first, w_last = _write_table(ws, window, data_row, w_col)
    ch2 = _scatter("Hanger swing angle around the peak swing: exact and linearised",
                   "Time t [s]", "Angle θ [deg]",
                   x_min=10.0 * math.floor(window.rows[0][0] / 10.0),
                   x_max=10.0 * math.ceil(window.rows[-1][0] / 10.0), y_format="0.0",
                   x_format="0")
    for ch in (ch1, ch2):
        ch.x_axis.tickLblPos = "low"        # time labels under the plot, not on the zero line
    ch1.series.append(_series(ws, data_col, data_col + 1, first, last, "Without damper",
                              _GREY, width_emu=thin))
    ch1.series.append(_series(ws, data_col, data_col + 2, first, last,
                              "With damper (exact pendulum)", _BLUE, width_emu=thin))
    ws.add_chart(ch1, f"A{chart_row}")
    ch2.series.append(_series(ws, w_col, w_col + 2, w_first, w_last, "Linearised (sin θ = θ)",
                              _ORANGE, dash="dash"))
    ch2.series.append(_series(ws, w_col, w_col + 1, w_first, w_last, "Exact pendulum", _BLUE,
                              width_emu=2 * thin))
    ws.add_chart(ch2, f"A{chart_row + _CHART_ROWS}")
    fill_chart_caches(ws)
    return chart_row + 2 * _CHART_ROWS - 1


def _cells_of(wb: Any, ref: str) -> list[Any]:
    """Values of the cells of a chart reference such as ``'Charts'!$A$5:$A$35``."""
    from openpyxl.utils.cell import range_boundaries

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
    from openpyxl.chart.data_source import NumData, NumVal

    pts = [NumVal(idx=i, v=float(v)) for i, v in enumerate(values)
           if isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)]
    return NumData(formatCode=fmt, ptCount=len(values), pt=pts)


def _str_cache(values: Sequence[Any]) -> Any:
    from openpyxl.chart.data_source import StrData, StrVal

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

