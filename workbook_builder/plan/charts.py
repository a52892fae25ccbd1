# SPDX-License-Identifier: MIT
"""The Charts sheet: engine tables and the native charts that draw them.

Three charts, each beside the table it plots; every number in the tables is the engine's,
computed when the workbook is built or recalculated (:func:`chart_tables`):

1. period ratio T/T0 against swing amplitude, exact (elliptic integral) and small-angle
   formula, with the trade's 15 deg rule of thumb (common practice, no source) and the design
   swing marked;
2. the building's dynamic amplification under a harmonic force over the frequency ratio,
   without and with the damper (:func:`functions.damper.frequency_response`);
3. effective damping against mass ratio, each mass ratio with the damper the design's tuning
   method gives it (:func:`functions.design.design_tuning`,
   :func:`functions.damper.effective_damping`), with the required damping and the design
   point marked;
4. with a frequency band, the acceleration with the damper against the building's frequency
   factor over the band, for the damper as designed and for the robust tuning, with the limit
   (:func:`functions.envelope.detuned_acceleration`).

Table sizes are fixed (the layout never depends on the numbers); each table's numbers are a
named range (``chart_<table>``) that batch recalculation refills. :func:`time_history_table`
and :func:`swing_window_table` give the Nonlinear sheet's tables.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Any

import numpy as np

from functions.damper import effective_damping, frequency_response
from functions.envelope import detuned_acceleration, detuned_effective_damping, robust_tuning
from functions.levels import MELBOURNE_PALMER_FREQUENCIES, melbourne_palmer_limit
from functions.design import CAUTION, design_tuning
from functions.pendulum import small_angle_error

from .model import Chart, Series
from .options import PlanOptions
from .sheet import Looks, SheetLayout, ref

__all__ = ["ChartTable", "TableSpec", "chart_tables", "charts_sheet", "band_sheet",
           "comfort_sheet",
           "RULE_OF_THUMB_DEG", "MAX_TIME_POINTS", "WINDOW_ROWS", "time_history_table", "swing_window_table",
           "write_table", "range_name", "CHART_ROWS", "BLUE", "ORANGE", "GREY", "RED", "GREEN"]

#: Swing amplitude up to which the small-angle period is taken as good enough
#: (common practice, no source; the period error there is about 0.43 %).
RULE_OF_THUMB_DEG = 15.0
#: Rows of the time-history table: a longer record is thinned to exactly this many samples,
#: so that the layout does not change when recalculation reruns the simulation [-].
MAX_TIME_POINTS = 2000
#: Rows of the swing-window table around the peak swing: ten periods at the simulation's
#: default 32 samples per period of its fastest frequency (about ten damper periods) [-].
WINDOW_ROWS = 321
#: Rows of 15 pt (0.53 cm) one chart covers, with a gap.
CHART_ROWS = 19

BLUE, ORANGE, GREY, RED, GREEN = "1F4E79", "C55A11", "7F7F7F", "C00000", "548235"

AMPLITUDE_POINTS, FREQUENCY_POINTS, MASS_RATIO_POINTS, BAND_POINTS = 31, 81, 19, 41
COMFORT_POINTS = 31
FREQUENCY_RATIO_RANGE = (0.6, 1.4)


@dataclass(frozen=True)
class TableSpec:
    """The fixed shape of a chart table: title, column headers with units, formats, rows."""

    key: str
    title: str
    headers: tuple[str, ...]
    formats: tuple[str, ...]
    rows: int


@dataclass(frozen=True)
class ChartTable:
    """A chart table's engine values: one tuple per row (texts for the marks' names)."""

    spec: TableSpec
    rows: tuple[tuple[Any, ...], ...]


def _marks(key: str, x: str, y: str) -> TableSpec:
    return TableSpec(key, "Marks", ("Mark", x, y), ("@", "0.00" if key == "period_marks"
                                                    else "0.0000", "0.00000" if
                                                    key == "period_marks" else "0.0000"), 3)


def table_specs(method: str, parts: tuple[str, ...] = ()) -> dict[str, TableSpec]:
    """The Charts sheet's tables for a tuning method and the calculation's optional parts."""
    band = (TableSpec("band", "Acceleration with damper over the frequency band",
                      ("Frequency factor r [-]", "As designed [m/s^2]", "Robust tuning [m/s^2]",
                       "Limit [m/s^2]", "Effective damping as designed [-]"),
                      ("0.000", "0.00000", "0.00000", "0.00000", "0.00000"),
                      BAND_POINTS),) if "band" in parts else ()
    if "comfort" in parts:
        band += (TableSpec("comfort", "Melbourne & Palmer (1992) peak acceleration criterion",
                           ("Frequency n [Hz]", "Criterion [m/s^2]"), ("0.000", "0.00000"),
                           COMFORT_POINTS),
                 TableSpec("comfort_marks", "Marks", ("Mark", "n [Hz]", "a [m/s^2]"),
                           ("@", "0.000", "0.00000"), 2))
    return {t.key: t for t in band + (
        TableSpec("period", "Period ratio against swing amplitude",
                  ("Swing amplitude θ0 [deg]", "Exact T/T0 [-]", "Small-angle T/T0 [-]"),
                  ("0.0", "0.00000", "0.00000"), AMPLITUDE_POINTS),
        _marks("period_marks", "θ0 [deg]", "T/T0 [-]"),
        TableSpec("response", "Dynamic amplification of the building",
                  ("Frequency ratio ω/ωs [-]", "Without damper [-]", "With damper [-]"),
                  ("0.000", "0.00", "0.00"), FREQUENCY_POINTS),
        TableSpec("damping", f"Effective damping with an optimal damper ({method})",
                  ("Mass ratio μ [-]", "Tuning ratio f [-]", "Damper damping ζd [-]",
                   "Effective damping ζeff [-]"),
                  ("0.0000", "0.0000", "0.0000", "0.0000"), MASS_RATIO_POINTS),
        _marks("damping_marks", "μ [-]", "ζ [-]"),
    )}


#: Texts of the marks tables' first column (fixed).
MARK_NAMES = {"period_marks": (f"{RULE_OF_THUMB_DEG:g}° rule *", f"{RULE_OF_THUMB_DEG:g}° "
                               "rule *", "Design swing"),
              "damping_marks": ("Required ζ", "Required ζ", "Design"),
              "comfort_marks": ("Design, with damper", "Project limit")}


def _floats(values: Any) -> list[float]:
    out = [float(v) for v in np.atleast_1d(np.asarray(values, dtype=float))]
    bad = [v for v in out if not math.isfinite(v)]
    if bad:
        raise ValueError(f"chart data holds a non-finite value {bad[0]!r}; refusing to write it")
    return out


def chart_tables(result: Any) -> dict[str, ChartTable]:
    """The engine values of the Charts sheet's tables for a design result.

    The amplitude axis reaches 60 deg, or 5 deg past the design swing (to at most 179 deg);
    the mass-ratio axis spans the practical range of the inputs, extended to the design's mass
    ratio.

    Raises
    ------
    ValueError
        For non-finite engine values (e.g. an undamped structure at resonance).
    """
    p = result.inputs
    specs = table_specs(p.tuning_method, result.parts)
    swing, zs = float(result.swing_angle_deg), float(p.structural_damping)
    mu, f_d, z_d = float(result.mass_ratio), float(result.tuning_ratio), \
        float(result.damper_damping)
    a_max = max(60.0, min(179.0, math.ceil((swing + 5.0) / 5.0) * 5.0))
    amps = np.linspace(0.0, a_max, AMPLITUDE_POINTS)
    exact = 1.0 + np.asarray(small_angle_error(amps), dtype=float)
    period = tuple(zip(_floats(amps), _floats(exact), _floats(np.ones_like(amps))))
    top = float(exact[-1])
    marks = MARK_NAMES["period_marks"]
    period_marks = ((marks[0], RULE_OF_THUMB_DEG, 1.0), (marks[1], RULE_OF_THUMB_DEG, top),
                    (marks[2], swing, 1.0 + float(small_angle_error(swing))))
    r = np.linspace(*FREQUENCY_RATIO_RANGE, FREQUENCY_POINTS)
    response = tuple(zip(_floats(r), _floats(frequency_response(r, 0.0, 1.0, 0.0, zs)),
                         _floats(frequency_response(r, mu, f_d, z_d, zs))))
    lo_m = min(float(p.mass_ratio_min), mu)
    hi_m = max(float(p.mass_ratio_max), mu)
    lo_m = lo_m if lo_m > 0 else hi_m / 100.0          # a lower end of 0: start at 1 %
    mus = np.linspace(lo_m, hi_m, MASS_RATIO_POINTS)
    if p.tuning_method == "robust":          # each mass ratio tuned robustly for the band
        f_opt, z_opt = robust_tuning(mus, p.band_lower, p.band_upper, zs)
    else:
        f_opt, z_opt = design_tuning(mus, p.tuning_method, zs)
    z_eff = effective_damping(mus, f_opt, z_opt, zs)
    damping = tuple(zip(_floats(mus), _floats(f_opt), _floats(z_opt), _floats(z_eff)))
    required = float(result.required_damping)
    marks = MARK_NAMES["damping_marks"]
    damping_marks = ((marks[0], lo_m, required), (marks[1], hi_m, required),
                     (marks[2], mu, float(result.effective_damping)))
    rows = {"period": period, "period_marks": period_marks, "response": response,
            "damping": damping, "damping_marks": damping_marks}
    if "band" in specs:
        c = result.cells
        rs = np.linspace(p.band_lower, p.band_upper, BAND_POINTS)
        args = (p.acceleration, mu)
        tail = (zs, p.response_exponent)
        nominal = detuned_acceleration(rs, *args, f_d, z_d, *tail)
        robust = detuned_acceleration(rs, *args, c["robust_tuning_ratio"],
                                      c["robust_damper_damping"], *tail)
        rows["band"] = tuple(zip(_floats(rs), _floats(nominal), _floats(robust),
                                 _floats(np.full(BAND_POINTS, p.acceleration_limit)),
                                 _floats(detuned_effective_damping(rs, mu, f_d, z_d, zs))))
    if "comfort" in specs:
        lo, hi = MELBOURNE_PALMER_FREQUENCIES           # open ends: just inside them
        ns = np.geomspace(lo * 1.01, hi * 0.99, COMFORT_POINTS)
        rows["comfort"] = tuple(zip(_floats(ns), _floats(melbourne_palmer_limit(
            ns, p.return_period))))
        names = MARK_NAMES["comfort_marks"]
        rows["comfort_marks"] = ((names[0], p.frequency, float(result.acceleration_with_damper)),
                                 (names[1], p.frequency, p.acceleration_limit))
    return {k: ChartTable(specs[k], rows[k]) for k in specs}


def range_name(key: str) -> str:
    """Defined name of a chart table's values."""
    return f"chart_{key}"


def write_table(sh: SheetLayout, spec: TableSpec, row: int, col: int, source: str,
                texts: tuple[str, ...] = ()) -> tuple[int, int]:
    """Plan a table at (row, col): title, headers, rows of engine values; first/last data row.

    Numbers are engine cells (source ``(source, key, i, j)``); a marks table's first column
    holds the fixed texts ``texts``. The values are the named range :func:`range_name`.
    """
    sh.label(row, col, spec.title, Looks.BOLD)
    for j, head in enumerate(spec.headers):
        sh.label(row + 1, col + j, head, Looks.TABLE_HEAD)
    first = row + 2
    for i in range(spec.rows):
        for j in range(len(spec.headers)):
            if texts and j == 0:
                sh.label(first + i, col, texts[i])
            else:
                sh.engine(first + i, col + j, (source, spec.key, i, j), fmt=spec.formats[j],
                          style="")
    last = first + spec.rows - 1
    sh.name_range(range_name(spec.key), f"{ref(first, col)}:{ref(last, col + len(spec.headers) - 1)}")
    return first, last


def _rng(col: int, first: int, last: int) -> str:
    return f"{ref(first, col)}:{ref(last, col)}"


def charts_sheet(options: PlanOptions) -> SheetLayout:
    """The Charts sheet for ``options``."""
    specs = table_specs(options.tuning_method, options.parts)
    sh = SheetLayout("Charts")
    sh.label(1, 1, "Charts: engine values computed when the workbook was built or "
                   "last recalculated by swaytune", Looks.HEADING)
    sh.label(2, 1, CAUTION, Looks.WARNING)
    sh.widths([12, 11, 11, 2, 12, 11, 11, 2, 11, 11, 11, 12])
    anchors = [f"A{4 + i * CHART_ROWS}" for i in range(3)]
    top = 4 + 3 * CHART_ROWS + 1
    p1, p2 = write_table(sh, specs["period"], top, 1, "chart")
    r1, r2 = write_table(sh, specs["response"], top, 5, "chart")
    d1, d2 = write_table(sh, specs["damping"], top, 9, "chart")
    pm1, pm2 = write_table(sh, specs["period_marks"], p2 + 2, 1, "chart",
                           MARK_NAMES["period_marks"])
    sh.label(pm2 + 1, 1, "* rule of thumb: common practice, no source", Looks.ITALIC)
    dm1, dm2 = write_table(sh, specs["damping_marks"], d2 + 2, 9, "chart",
                           MARK_NAMES["damping_marks"])
    sh.height(top + 1, 45)
    sh.plan.row_breaks.append(top - 1)          # charts on the first page, tables after
    sh.plan.charts += [
        Chart(anchors[0], "Period ratio T/T0 against swing amplitude",
              "Swing amplitude θ0 [deg]", "Period ratio T/T0 [-]", (
                  Series(_rng(1, p1, p2), _rng(2, p1, p2), "Exact (elliptic integral)", BLUE),
                  Series(_rng(1, p1, p2), _rng(3, p1, p2), "Small-angle formula", GREY,
                         dash="dash"),
                  Series(_rng(2, pm1, pm1 + 1), _rng(3, pm1, pm1 + 1),
                         f"{RULE_OF_THUMB_DEG:g}° rule of thumb (common practice, no source)",
                         GREEN, dash="sysDot"),
                  Series(_rng(2, pm2, pm2), _rng(3, pm2, pm2), "Design swing", RED,
                         marker="circle", line=False)),
              x_format="0", y_format="0.00", x_min=0.0, y_min=0.99, fit_x=True),
        Chart(anchors[1], "Building response to a harmonic force", "Frequency ratio ω/ωs [-]",
              "Dynamic amplification |xs/xst| [-]", (
                  Series(_rng(5, r1, r2), _rng(6, r1, r2), "Without damper", GREY,
                         dash="dash"),
                  Series(_rng(5, r1, r2), _rng(7, r1, r2), "With damper", BLUE)),
              x_format="0.00", y_format="0", x_min=FREQUENCY_RATIO_RANGE[0],
              x_max=FREQUENCY_RATIO_RANGE[1], y_min=0.0),
        Chart(anchors[2], specs["damping"].title, "Mass ratio μ = md/M* [-]",
              "Damping ratio ζ [%]", (
                  Series(_rng(9, d1, d2), _rng(12, d1, d2),
                         "Effective damping ζeff (optimal damper)", BLUE),
                  Series(_rng(10, dm1, dm1 + 1), _rng(11, dm1, dm1 + 1), "Required damping",
                         ORANGE, dash="dash"),
                  Series(_rng(10, dm2, dm2), _rng(11, dm2, dm2), "Design", RED,
                         marker="circle", line=False)),
              x_format="0.000", y_format="0.0%", y_min=0.0, fit_x=True),
    ]
    last_row = max(p2, r2, d2, dm2, pm2 + 1)
    # two pages: the charts, then their tables (scaled so the longest table fits)
    sh.page(title_rows="1:2", print_area=f"A1:L{last_row}", freeze="A3", pages=2)
    return sh


def _notes(sh: SheetLayout, row: int, notes: tuple[str, ...], last_col: int) -> None:
    """Notes under a chart page's table, one wrapped row each across the page."""
    for i, text in enumerate(notes):
        sh.label(row + i, 1, text, Looks.WRAP)
        sh.merge(row + i, 1, row + i, last_col)
        sh.height(row + i, 30)


def comfort_sheet(options: PlanOptions) -> SheetLayout:
    """The Comfort sheet (with a return period): the Melbourne & Palmer criterion against the
    frequency, with the design's acceleration and the project's limit at the mode's frequency;
    the chart above its tables, one page."""
    specs = table_specs(options.tuning_method, options.parts)
    sh = SheetLayout("Comfort")
    sh.label(1, 1, "Comfort criterion: engine values, computed when the workbook was built or "
                   "last recalculated", Looks.HEADING)
    sh.label(2, 1, CAUTION, Looks.WARNING)
    sh.widths([16, 16, 16, 2, 22, 14, 14])
    top = 4 + CHART_ROWS
    c1, c2 = write_table(sh, specs["comfort"], top, 1, "chart")
    m1, m2 = write_table(sh, specs["comfort_marks"], top, 5, "chart",
                         MARK_NAMES["comfort_marks"])
    sh.height(top + 1, 30)
    notes = ("W. H. Melbourne, T. R. Palmer, J. Wind Eng. Ind. Aerodyn. 41-44 (1992) 105-116: "
             "a = sqrt(2 ln(n T)) (0.68 + ln(R) / 5) exp(-3.65 - 0.41 ln n), T = 600 s, for "
             "0.06 < n < 1 Hz, R the return period [years].",
             "The project's accepted peak acceleration stays the design limit; the criterion "
             "is shown beside it (Calculation sheet and Checks sheet). Accelerations at the "
             "top occupied floor.")
    _notes(sh, c2 + 2, notes, 7)
    sh.plan.charts.append(Chart(
        "A4", specs["comfort"].title, "Frequency of the mode n [Hz]",
        "Peak acceleration [m/s^2]", (
            Series(_rng(1, c1, c2), _rng(2, c1, c2), "Criterion (return period R)", BLUE),
            Series(_rng(6, m1, m1), _rng(7, m1, m1), "Design, with damper", RED,
                   marker="circle", line=False),
            Series(_rng(6, m2, m2), _rng(7, m2, m2), "Project limit", ORANGE,
                   marker="diamond", line=False)),
        x_format="0.00", y_format="0.000", x_min=0.0, x_max=1.0, y_min=0.0))
    sh.page(title_rows="1:2", print_area=f"A1:G{c2 + 1 + len(notes)}", freeze="A3", pages=1)
    return sh


def band_sheet(options: PlanOptions) -> SheetLayout:
    """The Band sheet (with a frequency band): the acceleration with the damper over the band,
    as designed and tuned robustly, against the limit; the chart above its table, one page."""
    spec = table_specs(options.tuning_method, options.parts)["band"]
    sh = SheetLayout("Band")
    sh.label(1, 1, "Frequency band: engine values, computed when the workbook was built or "
                   "last recalculated", Looks.HEADING)
    sh.label(2, 1, CAUTION, Looks.WARNING)
    sh.widths([16, 16, 16, 16, 16, 16])
    top = 4 + CHART_ROWS
    b1, b2 = write_table(sh, spec, top, 1, "chart")
    sh.height(top + 1, 45)
    notes = ("The damper as designed is tuned at the nominal frequency f_s; the robust tuning "
             "maximises the least effective damping over the band for the same mass ratio "
             "(Calculation sheet, section 7).",
             "Mass, damper and structural damping as designed: the frequency error is a "
             "stiffness error. The acceleration without the damper is held constant across "
             "the band unless the rule a r^k is given (Inputs sheet).",
             "Worst case and its check: Calculation sheet 7.1 and the Checks sheet.")
    _notes(sh, b2 + 2, notes, 6)
    sh.plan.charts.append(Chart(
        "A4", spec.title, "Frequency factor r = f_actual / f_s [-]",
        "Peak acceleration [m/s^2]", (
            Series(_rng(1, b1, b2), _rng(2, b1, b2), "Damper as designed", BLUE),
            Series(_rng(1, b1, b2), _rng(3, b1, b2), "Robust tuning for the band", GREEN,
                   dash="dash"),
            Series(_rng(1, b1, b2), _rng(4, b1, b2), "Limit", RED, dash="sysDot")),
        x_format="0.00", y_format="0.000", fit_x=True, x_round=0.05))
    sh.page(title_rows="1:2", print_area=f"A1:F{b2 + 1 + len(notes)}", freeze="A3", pages=1)
    return sh


def _significant(values: Any, digits: int = 6) -> list[float]:
    """Values rounded to ``digits`` significant digits (plenty for a chart; stable files)."""
    return [float(f"{v:.{digits}g}") + 0.0 for v in _floats(values)]


TIME_SPEC = TableSpec("time", "Time histories", (
    "Time t [s]", "Acceleration without damper [m/s^2]", "Acceleration with damper [m/s^2]",
    "Hanger angle, exact [deg]", "Hanger angle, linearised [deg]"),
    ("0.00", "0.00000", "0.00000", "0.000", "0.000"), 0)
WINDOW_SPEC = TableSpec("swing_window", "Around the peak swing (10 damper periods)", (
    "Time t [s]", "Hanger angle, exact [deg]", "Hanger angle, linearised [deg]"),
    ("0.00", "0.000", "0.000"), 0)


def time_history_table(simulation: Any, max_points: int = MAX_TIME_POINTS) -> ChartTable:
    """Time histories of a simulation, thinned to exactly ``max_points`` rows (or every sample).

    Samples evenly spread over the record (indices rounded from a linear spacing, first and
    last included; the output step resolves each period with at least 8 samples, so a stride
    below 3 still draws the oscillation), 6 significant digits: time, building acceleration
    without and with the damper (exact pendulum), hanger angle exact and linearised. The table
    has the same size for any inputs whose record holds at least ``max_points`` samples.

    Raises
    ------
    ValueError
        If ``max_points`` < 2 or a value is not finite.
    """
    if max_points < 2:
        raise ValueError(f"max_points={max_points!r} must be >= 2")
    n = int(simulation.time.size)
    pick = np.round(np.linspace(0, n - 1, min(n, max_points))).astype(int)
    nl, lin, bare = simulation.nonlinear, simulation.linear, simulation.without_damper
    columns = (_significant(simulation.time[pick]), _significant(bare.acceleration[pick]),
               _significant(nl.acceleration[pick]), _significant(nl.angle_deg[pick]),
               _significant(lin.angle_deg[pick]))
    rows = tuple(zip(*columns))
    return ChartTable(replace(TIME_SPEC, rows=len(rows)), rows)


def swing_window_table(simulation: Any, rows: int = WINDOW_ROWS) -> ChartTable:
    """Hanger angle, exact and linearised, over ``rows`` consecutive samples around the peak.

    Every output sample of the window, 6 significant digits; the window is centred on the
    largest |angle| of the exact model and kept inside the record (the whole record when it is
    shorter), so the table has the same size for any inputs.

    Raises
    ------
    ValueError
        If ``rows`` < 2 or a value is not finite.
    """
    if not rows >= 2:
        raise ValueError(f"rows={rows!r} must be >= 2")
    t, angle = simulation.time, simulation.nonlinear.angle_deg
    n = int(t.size)
    size = min(n, int(rows))
    centre = int(np.argmax(np.abs(angle)))
    lo = max(0, min(centre - size // 2, n - size))
    pick = slice(lo, lo + size)
    out = tuple(zip(_significant(t[pick]), _significant(angle[pick]),
                    _significant(simulation.linear.angle_deg[pick])))
    return ChartTable(replace(WINDOW_SPEC, rows=len(out)), out)
