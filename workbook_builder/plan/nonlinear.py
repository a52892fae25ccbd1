# SPDX-License-Identifier: MIT
"""The Nonlinear sheet: the pendulum damper simulated in time with the exact pendulum equation.

Engine values of ``functions.simulation.simulate`` (a time-domain integration has no worksheet
formula), computed when the workbook is built: the load and the damper simulated, the response
over the record (exact pendulum, linearised, without the damper), the detuning at the simulated
swing and the verdict, the engine's notes, and two charts over time. A flag says when the
inputs have changed since the simulation ran.
"""
from __future__ import annotations

from dataclasses import replace
from functools import partial


from ..project.units import us_display
from .calculation import SIMULATION_FLAG, engine_flag, unit_format
from .charts import CHART_ROWS, BLUE, GREY, ORANGE, TIME_SPEC, WINDOW_SPEC, write_table
from .checks import NOT_DEFINED, SCIENTIFIC
from .model import Chart, Series
from .options import PlanOptions
from .sheet import Looks, SheetLayout, ref

__all__ = ["nonlinear_sheet", "simulation_dependencies", "RESPONSE_ROWS"]


#: Rows of the response table: (label, attribute of a Response, unit, bare building shown,
#: defined name of the exact pendulum's value).
RESPONSE_ROWS = (
    ("RMS building displacement", "displacement_rms", "m", True, "sim_displacement_rms"),
    ("Peak building displacement", "displacement_peak", "m", True, "sim_displacement_peak"),
    ("RMS building acceleration (damper level)", "acceleration_rms", "m/s^2", True,
     "sim_acceleration_rms"),
    ("Peak building acceleration (damper level)", "acceleration_peak", "m/s^2", True,
     "sim_acceleration_peak"),
    ("RMS swing angle", "angle_rms_deg", "deg", False, "sim_swing_rms_deg"),
    ("Peak swing angle", "swing_deg", "deg", False, ""),
    ("RMS stroke (mass relative to the floor)", "stroke_rms", "m", False, "sim_stroke_rms"),
    ("Peak stroke", "stroke_peak", "m", False, "sim_stroke_peak"),
    ("Effective damping identified from the response", "effective_damping", "-", True,
     "sim_effective_damping"),
)


def simulation_dependencies(options: PlanOptions) -> tuple[str, ...]:
    """Inputs the simulation depends on (through the design and the load calibration)."""
    deps = ["structure_frequency", "modal_mass", "structural_damping", "acceleration",
            "floor_ordinate"]
    if "extreme" in options.parts:          # the load of the extreme level (the default)
        deps.append("extreme_acceleration")
    if options.mass_ratio_mode == "required":
        deps.append("acceleration_limit")
    elif options.mass_ratio_mode == "chosen_mass_ratio":
        deps.append("chosen_mass_ratio")
    else:
        deps.append("chosen_damper_mass")
    return tuple(deps + ["gravity"])


def _row(sh: SheetLayout, row: int, label: str, source: tuple | str, unit: str,
         note: str | tuple = "", name: str = "", fmt: str = "", us: bool = False) -> int:
    """Label, engine value (or a formula), unit, note merged over D:F. In a US workbook a value
    with a US unit is shown in it first (B, C) with the SI value, the named cell, in D, E."""
    sh.label(row, 1, label, "wrap box")
    us_unit, factor = us_display(unit) if us else (unit, 1.0)
    col = 4 if factor != 1.0 else 2
    style = "box top" + (" secondary" if col == 4 else "")
    if isinstance(source, str):
        sh.formula(row, col, source, fmt=fmt or unit_format(unit), style=style, name=name,
                   unit=unit, label=label)
    else:
        sh.engine(row, col, source, fmt=fmt or unit_format(unit), style=style, name=name,
                  unit=unit, label=label)
    if col == 4:
        sh.formula(row, 2, f"=D{row}/{factor!r}", fmt=unit_format(us_unit), style="box top")
        sh.label(row, 3, us_unit, "box top")
        sh.label(row, 5, unit, "box top secondary")
    else:
        sh.label(row, 3, unit, "box top")
    note_col = 6 if us else 4
    if us and col == 2:
        sh.blank(row, 4, "box")
        sh.blank(row, 5, "box")
    if isinstance(note, tuple):
        sh.cell(row, note_col, "engine", source=note, style="wrap box")
    else:
        sh.label(row, note_col, note, "wrap box")
    if not us:
        sh.merge(row, 4, row, 6)
    return row + 1


def _response_row(sh: SheetLayout, row: int, label: str, attr: str, unit: str,
                  has_bare: bool, name: str, us: bool) -> int:
    """A row of the response table; in a US workbook a value with a US unit gets a row in it
    first, the SI row (the named engine values) below it in grey."""
    us_unit, factor = us_display(unit) if us else (unit, 1.0)
    if factor != 1.0:
        sh.label(row, 1, label, "wrap box")
        for col in (2, 3, 4):
            if col == 4 and not has_bare:
                sh.label(row, col, "-", "box")
            else:
                cell = f"{'ABCD'[col - 1]}{row + 1}"
                sh.formula(row, col, f"={cell}/{factor!r}", fmt=unit_format(us_unit),
                           style="box")
        sh.label(row, 5, us_unit, "box")
        row += 1
    sh.label(row, 1, label if factor == 1.0 else "   the same in SI",
             "wrap box" if factor == 1.0 else "box italic secondary")
    style = "box" + (" secondary" if factor != 1.0 else "")
    for col, model in ((2, "nonlinear"), (3, "linear"), (4, "without_damper")):
        if col == 4 and not has_bare:
            sh.label(row, col, "-", style)
        else:
            sh.engine(row, col, ("sim_response", model, attr), fmt=unit_format(unit),
                      style=style, name=name if col == 2 else "", unit=unit,
                      label=f"Simulated {label[0].lower()}{label[1:]}")
    sh.label(row, 5, unit, style)
    return row + 1


def _section(sh: SheetLayout, row: int, title: str, note: str = "") -> int:
    sh.section(row, title, 6)
    row += 1
    if note:
        sh.label(row, 1, note, Looks.WRAP)
        sh.merge(row, 1, row, 6)
        row += 1
    return row


def nonlinear_sheet(options: PlanOptions) -> SheetLayout:
    """The Nonlinear sheet for ``options`` (which must carry a simulation layout)."""
    # only a workbook with a Nonlinear sheet pays for the simulation's imports (scipy.signal)
    from functions.simulation import PEAK_DURATION      # lazy import (start-up time)
    load, time_rows, window_rows = options.simulation
    random = load == "random"
    us = options.us
    put = partial(_row, us=us)
    sh = SheetLayout("Nonlinear")
    sh.label(1, 1, "Nonlinear check: the pendulum damper simulated in time", Looks.TITLE)
    sh.label(2, 1, "Green cells are ENGINE VALUES (functions.simulation.simulate) computed when "
                   "the workbook was built or last recalculated by swaytune: a time-domain "
                   "integration of the exact pendulum equation has no worksheet formula. The "
                   "flag at the end of table 1 says whether the inputs have changed since; "
                   "swaytune recalc reruns the simulation.", Looks.WRAP)
    sh.merge(2, 1, 2, 6)
    sh.label(3, 1, "Preliminary design aid: the model is one building mode with a rigid hanger "
                   "and a linear dashpot; check it against the manufacturer's design.",
             Looks.WARNING)
    sh.merge(3, 1, 3, 6)
    if us:
        sh.header(4, ["Quantity", "Value", "Unit", "Value (SI)", "SI unit", "Note"])
    else:
        sh.header(4, ["Quantity", "Value", "Unit", "Note"])
        sh.blank(4, 5, Looks.HEAD)
        sh.blank(4, 6, Looks.HEAD)
        sh.merge(4, 4, 4, 6)
    row = _section(sh, 5, "1  Load and damper simulated")
    calib = (f"chosen so that the building WITHOUT the damper has the expected peak "
             f"acceleration a / phi_occ x load factor at the damper's level: RMS x peak factor "
             f"over {PEAK_DURATION:g} s (a: the simulated wind level)"
             if random else "chosen so that the steady peak acceleration of the building "
                            "WITHOUT the damper at the damper's level is a / phi_occ x load "
                            "factor (a: the simulated wind level)")
    row = put(sh, row, "Load (project file, [simulation] load)", ("sim", "load"), "",
               ("sim", "load_description"))
    row = put(sh, row, "Force RMS" if random else "Force amplitude", ("sim", "force"), "N",
               calib, "sim_force", "#,##0")
    row = put(sh, row, "Load factor (force / calibrated force)", ("sim", "load_factor"), "-",
               "project file, [simulation] load_factor", fmt="0.00")
    if random:
        row = put(sh, row, "Peak factor g (Davenport)", ("sim", "peak_factor"), "-",
                   f"functions.damper.peak_factor(f_s, {PEAK_DURATION:g} s)", fmt="0.000")
    row = put(sh, row, "Corner frequency of the force spectrum" if random else
               "Forcing frequency", ("sim", "load_frequency"), "Hz", "the mode's frequency f_s")
    row = put(sh, row, "Hanger length simulated (design pendulum length)", ("sim", "length"),
               "m", "Calculation sheet, step 5.2: in tune at the design swing", "sim_length")
    row = put(sh, row, "Damper mass", ("sim", "damper_mass"), "kg",
               "Calculation sheet, step 2")
    row = put(sh, row, "Small-angle frequency of that hanger", ("sim", "hanger_frequency"),
               "Hz", "f_L = sqrt(g/L) / (2 pi): above f_d, equal to it at the design swing")
    row = put(sh, row, "Damper damping on the hanger's small-angle frequency",
               ("sim", "damper_damping"), "-", "zeta_d f_d / f_L: the dashpot c_d designed on "
                                                "the Calculation sheet")
    row = put(sh, row, "Dashpot law of the exact model", ("sim", "dashpot_law"), "",
               ("sim", "dashpot_law_note"))
    row = put(sh, row, "Record length (after the warm-up)", ("sim", "record_length"), "s",
               "project file, [simulation] duration", fmt="0.0")
    row = put(sh, row, "Warm-up simulated and discarded", ("sim", "warmup"), "s",
               "lets the start-up transient die out", fmt="0.0")
    row = put(sh, row, "Output time step", ("sim", "time_step"), "s",
               ("sim", "substeps_note"), fmt="0.0000")
    row = put(sh, row, "Estimated relative integration error", ("sim", "integration_error"),
               "-", "step doubling (Richardson), relative to the peaks", fmt=SCIENTIFIC)
    row = engine_flag(sh, row, SIMULATION_FLAG, simulation_dependencies(options),
                      "simulation", label_col=1, value_col=2, note_col=6 if us else 4,
                      note_to=None if us else 6)
    row += 1

    row = _section(sh, row, "2  Response over the record",
                   "Exact pendulum: sin(theta), cos(theta) and theta'^2 terms kept; "
                   "linearised: the same damper with sin(theta) = theta (the linear design's "
                   "model); without damper: the bare building under the same force.")
    sh.header(row, ["Quantity", "Exact pendulum", "Linearised", "Without damper", "Unit", ""])
    row += 1
    for label, attr, unit, has_bare, name in RESPONSE_ROWS:
        row = _response_row(sh, row, label, attr, unit, has_bare, name, us)
    if random:
        label = "RMS building acceleration, frequency domain (linear theory)"
        us_unit, factor = us_display("m/s^2") if us else ("m/s^2", 1.0)
        if factor != 1.0:
            sh.label(row, 1, label, "wrap box")
            sh.label(row, 2, "-", "box")
            for col in (3, 4):
                sh.formula(row, col, f"={'ABCD'[col - 1]}{row + 1}/{factor!r}",
                           fmt=unit_format(us_unit), style="box")
            sh.label(row, 5, us_unit, "box")
            row += 1
            label = "   the same in SI"
        style = "box" + (" secondary italic" if factor != 1.0 else "")
        sh.label(row, 1, label, "wrap " + style)
        sh.label(row, 2, "-", style)
        sh.engine(row, 3, ("sim", "theory_acceleration_rms"), fmt=unit_format("m/s^2"),
                  style=style)
        sh.engine(row, 4, ("sim", "theory_acceleration_rms_without_damper"),
                  fmt=unit_format("m/s^2"), style=style)
        sh.label(row, 5, "m/s^2", style)
        row += 1
        sh.label(row, 1, "Expected scatter of an RMS over this record (1 standard deviation)",
                 "wrap box")
        sh.label(row, 2, "-", "box")
        sh.engine(row, 3, ("sim", "theory_scatter"), fmt="0.0%")
        sh.label(row, 4, "-", "box")
        sh.label(row, 5, "-", "box")
        row += 1
    row += 1

    row = _section(sh, row, "3  Detuning check and verdict",
                   "A pendulum's frequency falls as it swings further (exact period, A&S 17.6). "
                   "The hanger is cut to be in tune at the design swing; here the simulated "
                   "swing is compared with it.")
    row = put(sh, row, "Peak swing simulated (exact pendulum)", ("sim", "swing_deg"), "deg",
               "largest |theta| over the record", "sim_swing_deg")
    row = put(sh, row, "Design swing (Calculation sheet)", "=swing_angle_deg", "deg",
               "at the design stroke")
    row = put(sh, row, "Frequency of the hanger at the simulated peak swing",
               ("sim", "frequency_at_swing"), "Hz",
               "exact period (functions.pendulum.pendulum_frequency)", "sim_frequency_at_swing")
    row = put(sh, row, "Detuning at the simulated peak swing, exact-period prediction",
               ("sim", "detuning"), "-", "f(theta) / f(0) - 1 "
                                          "(functions.pendulum.amplitude_detuning)",
               "sim_detuning")
    row = put(sh, row, "Detuning measured from the simulated swing",
               ("sim", "simulated_detuning"), "-", "equivalent linearisation of m g L "
               "sin(theta) over the record: for a random swing it reflects the typical, not the "
               "peak, swing", "sim_measured_detuning")
    row = put(sh, row, "Measured minus predicted detuning",
               f'=IFERROR(sim_measured_detuning-sim_detuning,"{NOT_DEFINED}")', "-",
               "0 for a steady harmonic swing (to order theta^4)")
    row = put(sh, row, "Swing whose exact period gives the measured detuning",
               ("sim", "equivalent_swing_deg"), "deg", "functions.pendulum.amplitude_for_error")
    row = put(sh, row, "Mistuning at the simulated peak swing against the damper frequency f_d",
               f'=IFERROR(sim_frequency_at_swing/damper_frequency-1,"{NOT_DEFINED}")', "-",
               "0 at the design swing; the hanger runs fast at smaller swings and slow at "
               "larger ones")
    row = put(sh, row, "Peak tension of all hangers together (exact pendulum)",
               ("sim", "tension_peak"), "N", "radial equation of the mass over the record "
               "(functions.simulation.model)", "sim_tension_peak", "#,##0")
    row = put(sh, row, "Free-swing bound at the simulated peak swing",
               "=damper_mass*gravity*(3-2*COS(RADIANS(sim_swing_deg)))", "N",
               "m_d g (3 - 2 cos theta): a free swing of that amplitude, at the bottom",
               fmt="#,##0")
    row = put(sh, row, "Largest departure, exact pendulum against linearised",
               ("sim", "departure"), "-", ("sim", "departure_quantity"), "sim_departure")
    row = put(sh, row, "Accepted departure", ("sim", "tolerance"), "-",
               "project file, [simulation] tolerance", "sim_tolerance", "0.000")
    sh.label(row, 1, "Verdict: nonlinear response within the tolerance and swing <= 90 deg",
             "bold wrap box")
    sh.check(row, 2, '=IFERROR(IF(AND(sim_departure<=sim_tolerance,sim_swing_deg<=90),"OK",'
                     '"NOT OK"),"NOT OK")', name="sim_verdict",
             label="Verdict of the nonlinear simulation")
    sh.verdicts(f"B{row}")
    row += 1
    sh.label(row, 1, "Engine's verdict", "box top")
    sh.engine(row, 2, ("sim", "verdict"), style="wrap box")
    sh.merge(row, 2, row, 6)
    row += 1
    sh.label(row, 1, "Engine notes", "box top")
    sh.engine(row, 2, ("sim", "notes"), style="wrap box")
    sh.merge(row, 2, row, 6)
    row += 2
    sh.label(row, 1, "Charts: engine values (the whole record with one point in every few "
                     "output samples; every sample around the peak swing); the tables they "
                     "plot are in columns H:P (not printed).", Looks.WRAP)
    sh.merge(row, 1, row, 6)
    sh.plan.row_breaks.append(row)
    chart_row = row + 1
    time_spec = replace(TIME_SPEC, rows=time_rows)
    window_spec = replace(WINDOW_SPEC, rows=window_rows)
    t1, t2 = write_table(sh, time_spec, 1, 8, "sim_table")
    w_col = 8 + len(time_spec.headers) + 1
    w1, w2 = write_table(sh, window_spec, 1, w_col, "sim_table")
    sh.height(2, 45)
    sh.plan.charts += [
        Chart(f"A{chart_row}", "Building acceleration over time, without and with the damper",
              "Time t [s]", "Acceleration [m/s²]", (
                  Series(f"{ref(t1, 8)}:{ref(t2, 8)}", f"{ref(t1, 9)}:{ref(t2, 9)}",
                         "Without damper", GREY, width=9525),
                  Series(f"{ref(t1, 8)}:{ref(t2, 8)}", f"{ref(t1, 10)}:{ref(t2, 10)}",
                         "With damper (exact pendulum)", BLUE, width=9525)),
              x_format="0", y_format="0.000", x_min=0.0, tick_labels_low=True, fit_x=True),
        Chart(f"A{chart_row + CHART_ROWS}",
              "Hanger swing angle around the peak swing: exact and linearised", "Time t [s]",
              "Angle θ [deg]", (
                  Series(f"{ref(w1, w_col)}:{ref(w2, w_col)}",
                         f"{ref(w1, w_col + 2)}:{ref(w2, w_col + 2)}", "Linearised (sin θ = θ)",
                         ORANGE, dash="dash"),
                  Series(f"{ref(w1, w_col)}:{ref(w2, w_col)}",
                         f"{ref(w1, w_col + 1)}:{ref(w2, w_col + 1)}", "Exact pendulum", BLUE,
                         width=2 * 9525)),
              x_format="0", y_format="0.0", tick_labels_low=True, fit_x=True, x_round=10.0),
    ]
    last = chart_row + 2 * CHART_ROWS - 1
    sh.widths([40, 15, 15, 15, 9, 34 if us else 22, 3, 10, 14, 14, 14, 14, 3, 10, 14, 14])
    sh.page(title_rows="1:1", print_area=f"A1:F{last}", freeze="A5")
    return sh
