# SPDX-License-Identifier: MIT
"""The Supply sheet: the damper specified for its manufacturer, one table per direction.

Present when the project gives ``[supply]`` (the calculation's part ``supply``). Laid out for
printing (portrait, one page wide): the title and project, the cautions, then a table of the
damper as a whole (mass block, hangers, stages, space, buffers, loads on the structure) and one
table per sway direction (frequencies, strokes and velocities, dashpot law and constants,
forces). Every value is a formula reading a named cell of the Inputs or Calculation sheet, and
its last column names that step, so each number can be traced; in US customary workbooks the
US value comes first with the SI value beside it.
"""
from __future__ import annotations

from functions.quantities import quantity

from .calculation import result_comment, step_numbers
from .options import PlanOptions
from .reference import CAUTIONS
from .sheet import Looks, SheetLayout
from .summary import shown

__all__ = ["supply_sheet", "SUPPLY_TABLES"]

#: (table title, [(group, defined names)]) of the sheet; names absent from a workbook (the
#: band's hanger range without a band) are left out.
SUPPLY_TABLES = (
    ("The damper as a whole", (
        ("Mass block", ("damper_mass", "block_density", "block_length_1",
                        "block_length_2", "block_height", "block_volume")),
        ("Pendulum and hangers", ("pendulum_length", "hanger_count", "stage_count",
                                  "stage_length", "unstretched_length", "hanger_stretch",
                                  "stretch_frequency_error", "hanger_length_lower",
                                  "hanger_length_upper", "hanger_adjustment_range")),
        ("Hanger loads", ("hanger_static_tension", "hanger_peak_tension",
                          "extreme_hanger_tension", "hanger_safety_factor",
                          "hanger_breaking_load")),
        ("Space", ("available_height", "vertical_space", "clearance", "plan_space_1",
                   "plan_space_2")),
        ("Buffers", ("buffer_stiffness", "buffer_deflection", "buffer_force",
                     "combined_buffer_deflection", "combined_buffer_force")),
        ("Vertical load on the structure", ("static_vertical_load", "extreme_vertical_load")),
    )),
    ("Direction 1 (main sway direction)", (
        ("Tuning", ("structure_frequency", "damper_frequency", "tuning_ratio",
                    "damper_damping", "stiffness")),
        ("Motion", ("stroke", "extreme_stroke", "swing_angle_deg", "extreme_swing_deg",
                    "damper_velocity", "extreme_damper_velocity")),
        ("Dashpots", ("dashpot", "velocity_exponent", "dashpot_units", "dashpot_level",
                      "peak_factor", "dashpot_reference_velocity", "dashpot_reference_force",
                      "dashpot_coefficient", "dashpot_damping_random",
                      "dashpot_damping_harmonic", "extreme_dashpot_damping_random",
                      "extreme_dashpot_damping_harmonic", "dashpot_unit_force",
                      "extreme_dashpot_unit_force", "dashpot_power", "extreme_dashpot_power",
                      "extreme_dashpot_heat")),
        ("Horizontal force on the structure", ("horizontal_force",
                                               "extreme_horizontal_force")),
    )),
    ("Direction 2 (second sway direction)", (
        ("Tuning", ("frequency_2", "damper_frequency_2", "tuning_ratio_2", "damper_damping_2",
                    "spring_stiffness_2", "stiffness_2")),
        ("Motion", ("stroke_2", "extreme_stroke_2", "combined_stroke",
                    "extreme_combined_stroke", "combined_swing_deg",
                    "extreme_combined_swing_deg", "damper_velocity_2",
                    "extreme_damper_velocity_2")),
        ("Dashpots", ("dashpot_2", "peak_factor_2", "dashpot_reference_velocity_2", "dashpot_reference_force_2",
                      "dashpot_coefficient_2", "dashpot_damping_random_2",
                      "dashpot_damping_harmonic_2", "extreme_dashpot_damping_random_2",
                      "extreme_dashpot_damping_harmonic_2", "dashpot_unit_force_2",
                      "extreme_dashpot_unit_force_2", "dashpot_power_2",
                      "extreme_dashpot_power_2", "extreme_dashpot_heat_2")),
        ("Horizontal force on the structure", ("horizontal_force_2",
                                               "extreme_horizontal_force_2")),
    )),
)

_INTRO = ("For the damper's manufacturer and the engineer of the supporting structure: every "
          "value reads a cell of the Inputs or Calculation sheet (last column: its step), in "
          "SI for the formulas")
_LAW = ("Dashpot law F = C |v|^alpha sign(v) for the units of one direction together; one "
        "unit takes C / n_c. Equivalent damping: statistical linearisation (random response) "
        "and equal energy per cycle (harmonic response), Elliott, Ghandchi Tehrani & Langley "
        "(2015).")


def _rows(options: PlanOptions, names: tuple[str, ...], numbers: dict[str, str]) -> list[str]:
    """The names of a group that this workbook holds (inputs given, steps present)."""
    inputs = set(options.inputs)
    out = []
    for name in names:
        q = quantity(name)
        if name in numbers or (q.section and (q.name in inputs or (
                q.kind == "choice" and "supply" in options.parts))):
            out.append(name)
    return out


def supply_sheet(options: PlanOptions) -> SheetLayout:
    """The Supply sheet for ``options`` (with the part ``supply``)."""
    sh = SheetLayout("Supply")
    us = options.us
    value, unit, last = 3, 4, (7 if us else 5)
    si, si_unit, step_col = (5, 6, 7) if us else (0, 0, 5)
    numbers = step_numbers(options)
    sh.label(1, 1, "Damper supply specification", Looks.TITLE)
    sh.label(2, 1, "Project", Looks.BOLD)
    sh.text(2, 2, ("info", "title"))
    sh.merge(2, 2, 2, last)
    sh.label(3, 1, "Project no. / revision", Looks.BOLD)
    sh.text(3, 2, ("info", "number"))
    sh.text(3, value, ("info", "revision"))
    sh.label(4, 1, _INTRO + (", US customary values first." if us else "."), Looks.WRAP)
    sh.merge(4, 1, 4, last)
    sh.height(4, 30)
    row = 6
    sh.label(row, 1, "CAUTION", Looks.CAUTION)
    row += 1
    for text in CAUTIONS:
        sh.label(row, 1, text, Looks.WRAP)
        sh.merge(row, 1, row, last)
        row += 1
    row += 1
    for title, groups in SUPPLY_TABLES:
        if title.startswith("Direction 2") and "direction_2" not in options.parts:
            continue
        sh.section(row, title, last)
        row += 1
        head = ["Item", "Symbol", "Value", "Unit"] + (["Value (SI)", "SI unit"] if us else [])
        sh.header(row, head + ["Step"])
        row += 1
        for group, names in groups:
            present = _rows(options, names, numbers)
            if not present:
                continue
            sh.label(row, 1, group, "bold italic")
            row += 1
            for name in present:
                q = quantity(name)
                sh.label(row, 1, q.label, "box wrap")
                sh.label(row, 2, q.symbol, "box")
                where = f"Calculation {numbers[name]}" if name in numbers else "Inputs"
                if q.kind == "choice":
                    sh.value(row, value, source=("input", q.name), style="box")
                    for c in (unit, si, si_unit):
                        if c:
                            sh.blank(row, c, "box")
                else:
                    shown_unit = shown(sh, row, value, name, q.unit, q.fmt, us,
                                       comment=result_comment(q, where))
                    sh.label(row, unit, shown_unit, "box")
                    if us:
                        sh.formula(row, si, f"={name}", fmt=q.fmt, style="box secondary")
                        sh.label(row, si_unit, q.unit, "box secondary")
                sh.label(row, step_col, where, "box")
                row += 1
        if title.startswith("Direction 1"):
            sh.label(row, 1, _LAW, Looks.WRAP)
            sh.merge(row, 1, row, last)
            sh.height(row, 30)
            row += 1
        row += 1
    sh.widths([46, 9, 12, 12, 12, 9, 16] if us else [52, 10, 14, 12, 18])
    sh.page(pages=0)
    return sh
