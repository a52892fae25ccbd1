# SPDX-License-Identifier: MIT
"""Every quantity of the design, declared once.

A :class:`Quantity` holds what every medium needs to know about one quantity: its glossary name
(the engine's argument or result name), symbol, label, SI unit and the kind of unit it is given
in (for display conversion), valid range with open or closed ends, default, display number
format, the name of its cell in a workbook, the table and key of the project file that sets it,
and a short note on where the value usually comes from. Everything else is derived from these
declarations and nowhere else:

* the engine's input validation (:class:`functions.design.DesignInputs` calls
  :meth:`Quantity.validate`);
* the project-file schema (``workbook_builder.project.schema``: keys, tables, accepted units);
* the spreadsheet function ``SWAY_DESIGN`` (argument names, help, ranges, defaults);
* the workbook's input rows (label, symbol, unit, data validation, note) and defined names,
  the Calculation sheet's labels, symbols, units and number formats;
* the batch-recalculation summary's columns and units;
* the reference tables in ``docs/``.

Groups, in the order the workbook shows them: :data:`DESIGN_INPUTS` (the design chain's
inputs), :data:`DESIGN_RESULTS` (its results, in the engineer's checking order),
:data:`HELPERS` (intermediate cells of the worksheet formulas), :data:`SIMULATION_SETTINGS`
(the optional time-domain check) and :data:`FLOOR_TABLE` (the modal mass from floor masses).

Ranges are those of a building or tower mode and a pendulum damper, wide enough for any real
case and narrow enough to catch a value in the wrong unit; where a range is a rule of the trade
rather than a limit of a method, its note says so.
"""
from __future__ import annotations

import inspect
from typing import Iterable

from functions.quantity import (LENGTH_FMT, OPTIONAL, REQUIRED, UNIT_KINDS, Quantity,
                                declare, second_direction)
from functions.quantities_supply import SUPPLY_INPUTS, SUPPLY_RESULTS, SUPPLY_RESULTS_2
from functions.relations import (ENVELOPE_INPUTS, OPTIONAL_TABLES, SUPPLY_INPUT_NAMES,
                                 input_relation_errors)
from functions.envelope import BAND_METHODS
from functions.pendulum import STANDARD_GRAVITY

__all__ = [
    "Quantity", "REQUIRED", "OPTIONAL", "DESIGN_INPUTS", "DESIGN_RESULTS", "HELPERS",
    "SIMULATION_SETTINGS", "FLOOR_TABLE", "BAND_RESULTS", "LEVEL_RESULTS",
    "DIRECTION_RESULTS", "PART_RESULTS", "OPTIONAL_TABLES", "ENVELOPE_INPUTS",
    "SUPPLY_INPUT_NAMES", "SUPPLY_RESULTS", "SUPPLY_RESULTS_2", "UNIT_KINDS", "WORKING_VALUES",
    "quantity", "by_name", "design_inputs", "design_results", "input_relation_errors", "design_signature",
]

_q = declare


_PRACTICE = "Common practice, no source."
_LENGTH_FMT = LENGTH_FMT

#: Inputs of the design chain (``functions.design.DesignInputs``), in the order of the
#: workbook's Inputs sheet.
DESIGN_INPUTS: tuple[Quantity, ...] = (
    _q("frequency", "f_s", "Frequency of the mode", "Hz", "frequency", 0.01, 20.0,
       fmt="0.00000", defined_name="structure_frequency", section="mode", summary=True,
       description="Natural frequency of the structure's mode",
       note="Modal analysis of the structure; EN 1991-1-4 Annex F (F.2) 46/h as a first "
            "estimate; confirm by measurement on the finished structure."),
    _q("modal_mass", "M*", "Generalised mass of the mode (mode = 1 at the damper)", "kg",
       "mass", 0.0, 1e11, low_open=True, fmt="#,##0", section="mode", summary=True,
       description="Generalised mass of the mode, normalised to 1 at the damper",
       note="Modal analysis: sum of m_i phi_i^2 with the mode normalised to 1 at the damper "
            "level (or from the floor table)."),
    _q("structural_damping", "zeta_s", "Inherent damping of the structure", "-", "fraction",
       0.0, 0.2, low_open=True, fmt="0.000000", section="mode", summary=True,
       description="Damping ratio of the mode without the damper",
       note="EN 1991-1-4 Table F.2 log decrement / (2 pi); measured values scatter widely, "
            "use a cautious value."),
    _q("floor_ordinate", "phi_occ", "Mode ordinate at the top occupied floor (damper = 1)", "-",
       "fraction", 0.0, 2.0, low_open=True, default=1.0, fmt="0.0000", section="mode",
       description="Mode-shape ordinate at the top occupied floor over that at the damper's "
                   "level",
       note="Accelerations and limits are at the top occupied floor, the damper's stroke at "
            "its own level: phi_occ = phi(z_occupied) / phi(z_damper), e.g. (z_occ/z_d)^k for "
            "the power-law mode of EN 1991-1-4 Annex F (F.3); 1 when the damper is at that "
            "floor."),
    _q("acceleration", "a", "Peak acceleration without damper (service level, top occupied "
       "floor)", "m/s^2", "acceleration", 0.0, 10.0, low_open=True, fmt="0.00000",
       section="wind", summary=True,
       description="Peak acceleration without the damper at the service (comfort) level, top "
                   "occupied floor",
       note="Wind-tunnel study or code calculation (EN 1991-1-4 Annex B/C) at the comfort "
            "return period, at the top occupied floor."),
    _q("acceleration_limit", "a_lim", "Accepted peak acceleration (top occupied floor)",
       "m/s^2", "acceleration", 0.0, 10.0, low_open=True, fmt="0.00000", section="wind",
       summary=True, description="Acceptable peak acceleration at the top occupied floor",
       note="Comfort criterion agreed for the project (e.g. ISO 10137 Annex D; Melbourne & "
            "Palmer 1992), at the top occupied floor."),
    _q("extreme_acceleration", "a_x", "Peak acceleration without damper (extreme level, top "
       "occupied floor)", "m/s^2", "acceleration", 0.0, 50.0, low_open=True,
       default=OPTIONAL, fmt="0.00000", section="wind",
       description="Peak acceleration without the damper at the extreme level (stroke, swing, "
                   "buffers and forces are checked there), top occupied floor",
       note="Wind-tunnel study or code calculation at the strength return period (e.g. 50 "
            "years), top occupied floor; not below the service level."),
    _q("return_period", "R", "Return period of the comfort criterion (Melbourne & Palmer)",
       "years", "return_period", 0.1, 100.0, default=OPTIONAL, fmt="0.0", section="wind",
       description="Return period R of the Melbourne & Palmer (1992) peak-acceleration "
                   "criterion, shown beside the project's own limit",
       note="Melbourne & Palmer, J. Wind Eng. Ind. Aerodyn. 41-44 (1992) 105-116: the "
            "criterion at the mode's frequency for this return period; the accepted peak "
            "acceleration above stays the design limit."),
    _q("damper_mass", "m_d", "Damper mass chosen (optional)", "kg", "mass", 0.0, 1e10,
       low_open=True, default=OPTIONAL, fmt="#,##0", defined_name="chosen_damper_mass",
       section="damper", description="Damper mass if chosen (else from the mass ratio)",
       note="Moving mass of the pendulum (without hangers and frame)."),
    _q("mass_ratio", "mu", "Mass ratio chosen (optional)", "-", "fraction", 0.0, 0.2,
       low_open=True, default=OPTIONAL, fmt="0.000000", defined_name="chosen_mass_ratio",
       section="damper", description="Mass ratio if chosen (else the required one)",
       note="Give the mass ratio or the damper mass, or neither (the required mass ratio is "
            "used)."),
    _q("tuning_method", "", "Tuning method", "", "choice", default="h2",
       choices=BAND_METHODS, section="damper", summary=True,
       description="Optimal tuning method",
       note="h2 and hinf hold for a damped structure; the closed forms are derived for an "
            "undamped one; robust tunes for the frequency band (needs [band]). The "
            "Calculation sheet is laid out for the method (rebuild to change it)."),
    _q("clearance", "x_max", "Available peak stroke (one side)", "m", "length", 0.0, 100.0,
       low_open=True, fmt=_LENGTH_FMT, section="damper", summary=True,
       description="Available peak stroke of the damper, one side",
       note="Free travel of the mass to the nearest obstruction or buffer."),
    _q("max_swing_deg", "theta_max", "Accepted swing angle", "deg", "angle", 0.0, 45.0,
       low_open=True, default=15.0, fmt="0.000", section="damper", key="max_swing",
       description="Largest accepted swing angle",
       note="Small-angle period good to about 15 deg (common practice, no source)."),
    _q("max_detuning", "|df/f|_max", "Accepted detuning at the design swing", "-", "fraction",
       0.0, 0.2, low_open=True, default=0.01, fmt="0.000000", section="damper",
       description="Largest accepted |detuning| between small and design swing",
       note="The damper's tuning tolerance. " + _PRACTICE),
    _q("mass_ratio_min", "mu_min", "Practical mass ratio, lower end", "-", "fraction", 0.0,
       0.2, default=0.005, fmt="0.000000", section="damper",
       description="Smallest practical mass ratio (0: no lower end)", note=_PRACTICE),
    _q("mass_ratio_max", "mu_max", "Practical mass ratio, upper end", "-", "fraction", 0.0,
       0.2, low_open=True, default=0.05, fmt="0.000000", section="damper",
       description="Largest practical mass ratio, above the lower end", note=_PRACTICE),
    _q("band_lower", "r_lo", "Building frequency, lower end of the band (factor on f_s)", "-",
       "fraction", 0.5, 1.0, default=OPTIONAL, fmt="0.000", section="band", key="lower",
       description="Lowest frequency factor r = f_actual/f_s the building may turn out at",
       note="Model against measurement: +-10 to 20 % is a usual planning range (common "
            "practice, no source). Give lower and upper together."),
    _q("band_upper", "r_hi", "Building frequency, upper end of the band (factor on f_s)", "-",
       "fraction", 1.0, 2.0, default=OPTIONAL, fmt="0.000", section="band", key="upper",
       description="Highest frequency factor r = f_actual/f_s the building may turn out at",
       note="Model against measurement: +-10 to 20 % is a usual planning range (common "
            "practice, no source). Give lower and upper together."),
    _q("response_exponent", "k", "Rule for the response without damper across the band, "
       "a r^k", "-", "fraction", -3.0, 3.0, default=0.0, fmt="0.000", section="band",
       description="Exponent k of a(r) = a r^k for the acceleration without the damper "
                   "across the band (0: held constant)",
       note="0 holds the acceleration without the damper constant across the band (the "
            "default assumption); another value is the engineer's rule (e.g. from the "
            "wind-tunnel data)."),
    _q("measured_frequency", "f_meas", "Measured frequency of the finished building", "Hz",
       "frequency", 0.01, 20.0, default=OPTIONAL, fmt="0.00000", section="as_built",
       key="frequency", description="Frequency of the mode measured on the finished building",
       note="Ambient-vibration test of the finished structure without the damper's mass (a "
            "test with the mass locked gives f sqrt(1 + mu) less: correct it first)."),
    _q("measured_damping", "zeta_meas", "Measured damping of the finished building", "-",
       "fraction", 0.0, 0.2, low_open=True, default=OPTIONAL, fmt="0.000000",
       section="as_built", key="damping",
       description="Damping ratio of the mode measured on the finished building",
       note="From the same test; left out, the design value is used. Give it only with the "
            "measured frequency."),
    _q("frequency_2", "f_s2", "Direction 2: frequency of the mode", "Hz", "frequency", 0.01,
       20.0, default=OPTIONAL, fmt="0.00000", section="direction_2", key="frequency",
       description="Natural frequency of the second sway mode (the other horizontal direction)",
       note="Modal analysis; the pendulum is cut for the main mode, so give as direction 2 the "
            "direction whose damper frequency is the higher one (springs add to it)."),
    _q("modal_mass_2", "M*_2", "Direction 2: generalised mass of the mode (damper = 1)", "kg",
       "mass", 0.0, 1e11, low_open=True, default=OPTIONAL, fmt="#,##0",
       section="direction_2", key="modal_mass",
       description="Generalised mass of the second sway mode, normalised to 1 at the damper",
       note="Modal analysis: sum of m_i phi_i^2 of the second mode, normalised to 1 at the "
            "damper level."),
    _q("structural_damping_2", "zeta_s2", "Direction 2: inherent damping", "-", "fraction",
       0.0, 0.2, low_open=True, default=OPTIONAL, fmt="0.000000", section="direction_2",
       key="structural_damping", description="Damping ratio of the second mode without the "
                                            "damper",
       note="As for the main mode: a cautious value."),
    _q("acceleration_2", "a_2", "Direction 2: peak acceleration without damper (service "
       "level, top occupied floor)", "m/s^2", "acceleration", 0.0, 10.0, low_open=True,
       default=OPTIONAL, fmt="0.00000", section="direction_2", key="acceleration",
       description="Peak acceleration without the damper in direction 2, service level, top "
                   "occupied floor",
       note="Wind-tunnel study or code calculation for the second direction, comfort return "
            "period."),
    _q("acceleration_limit_2", "a_lim2", "Direction 2: accepted peak acceleration (top "
       "occupied floor)", "m/s^2", "acceleration", 0.0, 10.0, low_open=True,
       default=OPTIONAL, fmt="0.00000", section="direction_2", key="acceleration_limit",
       description="Acceptable peak acceleration in direction 2, top occupied floor",
       note="Usually the main direction's comfort limit."),
    _q("extreme_acceleration_2", "a_x2", "Direction 2: peak acceleration without damper "
       "(extreme level, top occupied floor)", "m/s^2", "acceleration", 0.0, 50.0,
       low_open=True, default=OPTIONAL, fmt="0.00000", section="direction_2",
       key="extreme_acceleration",
       description="Peak acceleration without the damper in direction 2 at the extreme level, "
                   "top occupied floor",
       note="Give it with the main direction's extreme acceleration."),
    _q("g", "g", "Acceleration of gravity", "m/s^2", "acceleration", 9.7, 9.9,
       default=STANDARD_GRAVITY, fmt="0.00000", defined_name="gravity", section="site",
       key="gravity", description="Acceleration of gravity at the site",
       note="Standard gravity 9.80665 m/s^2 (3rd CGPM 1901) unless a local value is known; "
            "9.78 at the equator to 9.83 at the poles."),
) + SUPPLY_INPUTS

#: Results of the design chain (``functions.design.DesignResult``), in checking order.
DESIGN_RESULTS: tuple[Quantity, ...] = (
    _q("required_damping", "zeta_req", "Total damping needed to meet the limit", "-",
       "fraction", fmt="0.000000", summary=True,
       description="Total damping ratio that brings the resonant response to the limit, "
                   "zeta_s (a/a_lim)^2"),
    _q("mass_ratio", "mu", "Mass ratio", "-", "fraction", fmt="0.000000", summary=True,
       description="Damper mass over modal mass"),
    _q("damper_mass", "m_d", "Damper mass", "kg", "mass", fmt="#,##0", summary=True,
       description="Moving mass of the damper"),
    _q("tuning_ratio", "f", "Optimal tuning ratio", "-", "fraction", fmt="0.0000",
       description="Damper frequency over structure frequency"),
    _q("damper_damping", "zeta_d", "Optimal damper damping (own frequency)", "-", "fraction",
       fmt="0.000000", summary=True,
       description="Damper damping ratio on the damper's own frequency"),
    _q("damper_frequency", "f_d", "Damper frequency", "Hz", "frequency", fmt="0.00000",
       summary=True, description="Natural frequency of the damper"),
    _q("small_angle_length", "L_0", "Small-angle pendulum length", "m", "length",
       fmt=_LENGTH_FMT, description="Pendulum length tuned to f_d at small swings, "
                                 "g/(2 pi f_d)^2"),
    _q("effective_damping", "zeta_eff", "Effective damping (equal displacement variance)",
       "-", "fraction", fmt="0.000000", summary=True,
       description="Total damping of the structure with its damper, equivalent in "
                   "displacement variance under white-noise force"),
    _q("acceleration_with_damper", "a_d", "Peak acceleration with the damper (service level, "
       "top occupied floor)", "m/s^2",
       "acceleration", fmt="0.00000", summary=True,
       description="Peak acceleration with the damper, a sqrt(zeta_s/zeta_eff) (resonant "
                   "response)"),
    _q("structure_displacement", "x_s", "Peak displacement of the structure (service level, "
       "damper level)",
       "m", "length", fmt=_LENGTH_FMT,
       description="Peak displacement of the structure with the damper at the damper's "
                   "level, a_d/(phi_occ (2 pi f_s)^2)"),
    _q("stroke_ratio", "x_d/x_s", "Stroke ratio (RMS relative / RMS structure)", "-",
       "fraction", fmt="0.000",
       description="RMS damper displacement relative to the structure over RMS structure "
                   "displacement"),
    _q("stroke", "x_d", "Peak stroke of the damper (relative, service level)", "m", "length",
       fmt=_LENGTH_FMT,
       summary=True, description="Peak damper displacement relative to the structure"),
    _q("pendulum_length", "L", "Pendulum length in tune at the design swing", "m", "length",
       fmt=_LENGTH_FMT, summary=True, description="Pendulum length in tune at its design swing"),
    _q("swing_angle_deg", "theta", "Swing angle at the design stroke (service level)", "deg",
       "angle",
       fmt="0.000", summary=True, description="Design swing angle, asin(x_d/L)"),
    _q("small_angle_error", "e", "Small-angle period error at that swing", "-", "fraction",
       fmt="0.000000", description="Exact period over small-angle period minus 1 at the "
                                   "swing"),
    _q("detuning", "df/f", "Detuning at that swing (f(theta)/f(0) - 1)", "-", "fraction",
       fmt="0.000000", summary=True,
       description="Frequency at the design swing over frequency at small swings, minus 1"),
    _q("stiffness", "k_d", "Equivalent spring stiffness", "N/m", "stiffness", fmt="#,##0",
       summary=True,
       description="Equivalent stiffness of the damper, m_d (2 pi f_d)^2"),
    _q("dashpot", "c_d", "Dashpot constant", "N s/m", "dashpot", fmt="#,##0", summary=True,
       description="Damping coefficient of the damper, 2 m_d (2 pi f_d) zeta_d"),
)

_VARIANCE = "Helper of the white-noise variance"
#: Display format of the variance helpers: 5 significant digits whatever their size (D is of
#: the order of 1e-5, w near 1).
_HELPER_FMT = "0.0000E+00"

#: Intermediate cells of the worksheet formulas (not results of the engine's chain).
HELPERS: tuple[Quantity, ...] = (
    _q("var_w", "w", "Helper: w = f^2", "-", "fraction", fmt=_HELPER_FMT,
       description=_VARIANCE),
    _q("var_g", "g", "Helper: g = zeta_d f", "-", "fraction", fmt=_HELPER_FMT,
       description=_VARIANCE),
    _q("var_x", "X", "Helper: X = zeta_s w + g", "-", "fraction", fmt=_HELPER_FMT,
       description=_VARIANCE),
    _q("var_y", "Y", "Helper: Y = g (1 + mu) + zeta_s", "-", "fraction", fmt=_HELPER_FMT,
       description=_VARIANCE),
    _q("var_t", "t", "Helper: t = (1 + mu) w - 1", "-", "fraction", fmt=_HELPER_FMT,
       description=_VARIANCE),
    _q("var_n", "N", "Helper: N (variance numerator)", "-", "fraction", fmt=_HELPER_FMT,
       description=_VARIANCE),
    _q("var_d", "D", "Helper: D (variance denominator)", "-", "fraction", fmt=_HELPER_FMT,
       description=_VARIANCE),
    _q("warburton_tuning_ratio", "f_W", "For comparison: Warburton white-noise-force tuning "
       "(undamped structure)", "-", "fraction", fmt="0.0000",
       description="Warburton's white-noise-force optimum, shown beside a numerical one"),
    _q("warburton_damper_damping", "zeta_W", "For comparison: Warburton white-noise-force "
       "damping (undamped structure)", "-", "fraction", fmt="0.000000",
       description="Warburton's white-noise-force optimum, shown beside a numerical one"),
)

_BAND = ("Damper as designed (tuned at the nominal frequency) on a building whose frequency "
         "is r f_s")
#: Results of the frequency band and the as-built retune (``[band]``, ``[as_built]``): cells
#: of the calculation only when those inputs are given.
BAND_RESULTS: tuple[Quantity, ...] = (
    _q("band_worst_acceleration", "a_w", "Worst peak acceleration with the damper over the "
       "band", "m/s^2", "acceleration", fmt="0.00000",
       summary=True, description="Largest peak acceleration with the damper for any building frequency in "
                   "the band (damper as designed)"),
    _q("band_worst_factor", "r_w", "Frequency factor of the worst case", "-", "fraction",
       fmt="0.0000", description="Frequency factor r = f_actual/f_s where the worst case "
                                 "lies"),
    _q("band_worst_damping", "zeta_w", "Effective damping at the worst case", "-", "fraction",
       fmt="0.000000", description=_BAND + ": effective damping at the worst case"),
    _q("band_mass_ratio", "mu_band", "Mass ratio that meets the limit over the whole band",
       "-", "fraction", fmt="0.000000",
       summary=True, description="Least mass ratio whose damper, tuned at the nominal frequency by the "
                   "design's method, meets the limit anywhere in the band"),
    _q("band_damper_mass", "m_band", "Damper mass that meets the limit over the whole band",
       "kg", "mass", fmt="#,##0", description="mu_band M*"),
    _q("robust_tuning_ratio", "f_rob", "Robust tuning ratio for the band", "-", "fraction",
       fmt="0.0000", description="Tuning that maximises the least effective damping over the "
                                 "band (for the design's mass ratio)"),
    _q("robust_damper_damping", "zeta_rob", "Robust damper damping for the band", "-",
       "fraction", fmt="0.000000",
       description="Damper damping of the robust tuning, on the damper's own frequency"),
    _q("robust_worst_acceleration", "a_w,rob", "Worst peak acceleration over the band, robust "
       "tuning", "m/s^2", "acceleration", fmt="0.00000",
       description="Largest peak acceleration with the damper over the band when it is tuned "
                   "robustly instead"),
    _q("hanger_length_lower", "L_lo", "Hanger length in tune at the band's lower end", "m",
       "length", fmt=_LENGTH_FMT,
       summary=True, description="Hanger length in tune at the design swing if the building is at r_lo f_s "
                   "(the longest setting)"),
    _q("hanger_length_upper", "L_hi", "Hanger length in tune at the band's upper end", "m",
       "length", fmt=_LENGTH_FMT,
       summary=True, description="Hanger length in tune at the design swing if the building is at r_hi f_s "
                   "(the shortest setting)"),
    _q("hanger_adjustment_range", "dL", "Hanger adjustment range needed", "m", "length",
       fmt=_LENGTH_FMT, description="Travel of the hanger adjustment, L_lo - L_hi"),
    _q("retune_tuning_ratio", "f_ab", "As-built tuning ratio", "-", "fraction", fmt="0.0000",
       description="Optimal tuning ratio for the measured building (design's method)"),
    _q("retune_damper_damping", "zeta_ab", "As-built damper damping", "-", "fraction",
       fmt="0.000000", description="Optimal damper damping for the measured building, on the "
                                   "damper's own frequency"),
    _q("retune_damper_frequency", "f_d,ab", "As-built damper frequency", "Hz", "frequency",
       fmt="0.00000", description="Damper frequency for the measured building"),
    _q("retune_pendulum_length", "L_ab", "As-built hanger length", "m", "length",
       fmt=_LENGTH_FMT, summary=True, description="Hanger length in tune with the measured building at the "
                                    "design swing"),
    _q("retune_dashpot", "c_ab", "As-built dashpot constant", "N s/m", "dashpot", fmt="#,##0",
       summary=True, description="Dashpot constant for the measured building, 2 m_d (2 pi f_d,ab) zeta_ab"),
)

_X = "Extreme level: "
#: Results of the extreme level (``extreme_acceleration``) and of the comfort criterion
#: (``return_period``): cells of the calculation only when those inputs are given.
LEVEL_RESULTS: tuple[Quantity, ...] = (
    _q("extreme_acceleration_with_damper", "a_x,d", "Extreme level: peak acceleration with "
       "the damper (top occupied floor)", "m/s^2", "acceleration", fmt="0.00000",
       description=_X + "peak acceleration with the damper, a_x sqrt(zeta_s/zeta_eff)"),
    _q("extreme_displacement", "x_x", "Extreme level: peak displacement of the structure "
       "(damper level)", "m", "length", fmt=_LENGTH_FMT,
       description=_X + "peak displacement of the structure with the damper at the damper's "
                        "level"),
    _q("extreme_stroke", "x_d,x", "Extreme level: peak stroke of the damper (relative)", "m",
       "length", fmt=_LENGTH_FMT, summary=True,
       description=_X + "peak damper displacement relative to the structure"),
    _q("extreme_swing_deg", "theta_x", "Extreme level: swing angle", "deg", "angle",
       fmt="0.000", summary=True, description=_X + "swing angle, asin(x_d,x / L)"),
    _q("extreme_small_angle_error", "e_x", "Extreme level: small-angle period error at that "
       "swing", "-", "fraction", fmt="0.000000",
       description=_X + "exact period over small-angle period minus 1 at the swing"),
    _q("extreme_detuning", "df_x/f", "Extreme level: detuning against the tuned frequency", "-",
       "fraction", fmt="0.000000", summary=True,
       description=_X + "frequency at the extreme swing over the frequency at the design "
                        "swing (in tune), minus 1"),
    _q("buffer_excess", "dx_b", "Extreme level: stroke beyond the clearance (buffers)", "m",
       "length", fmt=_LENGTH_FMT, summary=True,
       description=_X + "stroke beyond the available clearance, taken by the buffers (0: no "
                        "contact)"),
    _q("contact_velocity", "v_b", "Extreme level: velocity at buffer contact", "m/s",
       "velocity", fmt="0.0000",
       description=_X + "relative velocity of the mass when it reaches the clearance, "
                        "harmonic motion"),
    _q("buffer_energy", "E_b", "Extreme level: energy the buffers must absorb", "J", "energy",
       fmt="#,##0", summary=True, description=_X + "kinetic energy at contact, m_d v_b^2 / 2"),
    _q("extreme_damper_force", "F_x", "Extreme level: peak force of the damper on the "
       "structure", "N", "force", fmt="#,##0", summary=True,
       description=_X + "peak horizontal force of spring and dashpot, harmonic motion"),
    _q("comfort_limit_mp", "a_MP", "Melbourne & Palmer peak acceleration criterion", "m/s^2",
       "acceleration", fmt="0.00000", summary=True,
       description="Peak acceleration criterion of Melbourne & Palmer (1992) at the mode's "
                   "frequency and the return period R"),
)

_D2 = "Direction 2: "
#: Results of the second sway direction (``[direction_2]``): cells of the calculation only
#: when its inputs are given. Those of the form ``<result>_2`` of a direction-1 result are
#: declared from it (:func:`_second`).
_second = second_direction


_RESULT = {q.name: q for q in DESIGN_RESULTS + HELPERS + LEVEL_RESULTS}
DIRECTION_RESULTS: tuple[Quantity, ...] = (
    _second(_RESULT["mass_ratio"], summary=True),
    _second(_RESULT["required_damping"]),
    _second(_RESULT["tuning_ratio"]),
    _second(_RESULT["damper_damping"]),
    _second(_RESULT["damper_frequency"], summary=True),
    *(_second(_RESULT[n]) for n in ("var_w", "var_g", "var_x", "var_y", "var_t", "var_n",
                                   "var_d")),
    _second(_RESULT["effective_damping"]),
    _second(_RESULT["acceleration_with_damper"], summary=True),
    _second(_RESULT["structure_displacement"]),
    _second(_RESULT["stroke_ratio"]),
    _second(_RESULT["stroke"]),
    _second(_RESULT["swing_angle_deg"]),
    _q("spring_stiffness_2", "k_2", _D2 + "horizontal spring stiffness", "N/m", "stiffness",
       fmt="#,##0", summary=True,
       description=_D2 + "springs that lift the pendulum to f_d2, m_d (2 pi)^2 (f_d2^2 - "
                         "f_d^2)"),
    _second(_RESULT["stiffness"]),
    _second(_RESULT["dashpot"], summary=True),
    _q("small_swing_frequency_2", "f_2(0)", _D2 + "frequency of pendulum and springs, small "
       "swings", "Hz", "frequency", fmt="0.00000",
       description=_D2 + "sqrt(g/L + k_2/m_d) / (2 pi)"),
    _q("frequency_at_swing_2", "f_2(theta)", _D2 + "frequency at its design swing (exact)",
       "Hz", "frequency", fmt="0.00000",
       description=_D2 + "exact frequency of the spring-stiffened pendulum at its swing"),
    _q("detuning_2", "df_2/f_2", _D2 + "detuning at its swing (f(theta)/f(0) - 1)", "-",
       "fraction", fmt="0.000000", summary=True,
       description=_D2 + "frequency at its swing over the small-swing frequency, minus 1"),
    _q("frequency_error_2", "e_f2", _D2 + "frequency at its swing against the target f_d2",
       "-", "fraction", fmt="0.000000",
       description=_D2 + "f_2(theta_2) / f_d2 - 1 (springs sized at direction 1's swing)"),
    _q("required_mass_ratio_2", "mu_req2", _D2 + "mass ratio its limit alone needs", "-",
       "fraction", fmt="0.000000",
       description=_D2 + "least mass ratio whose damper meets direction 2's limit"),
    _q("required_damper_mass_2", "m_req2", _D2 + "damper mass its limit alone needs", "kg",
       "mass", fmt="#,##0", summary=True,
       description=_D2 + "mu_req2 M*_2: raise the damper mass to it when direction 2 fails"),
    _q("combined_stroke", "x_r", "Both directions: combined (SRSS) peak stroke", "m", "length",
       fmt=_LENGTH_FMT, summary=True,
       description="sqrt(x_d1^2 + x_d2^2): peaks of uncorrelated directions (common practice, "
                   "no source)"),
    _q("stroke_sum", "x_1+x_2", "Both directions: sum of the peak strokes (upper bound)", "m",
       "length", fmt=_LENGTH_FMT,
       description="x_d1 + x_d2: fully correlated peaks, an upper bound"),
    _q("combined_swing_deg", "theta_r", "Both directions: combined swing angle", "deg",
       "angle", fmt="0.000", summary=True, description="asin(x_r / L)"),
    _second(_RESULT["extreme_acceleration_with_damper"]),
    _second(_RESULT["extreme_displacement"]),
    _second(_RESULT["extreme_stroke"]),
    _q("extreme_combined_stroke", "x_r,x", "Extreme level, both directions: combined (SRSS) "
       "peak stroke", "m", "length", fmt=_LENGTH_FMT, summary=True,
       description="sqrt(x_d,x1^2 + x_d,x2^2) at the extreme level (common practice, no "
                   "source)"),
    _q("extreme_combined_swing_deg", "theta_r,x", "Extreme level, both directions: combined "
       "swing angle", "deg", "angle", fmt="0.000", summary=True,
       description="asin(x_r,x / L) at the extreme level"),
    _q("band_worst_acceleration_2", "a_w2", "Direction 2: worst peak acceleration with the "
       "damper over the band", "m/s^2", "acceleration", fmt="0.00000", summary=True,
       description=_D2 + "largest peak acceleration with the damper for any building "
                         "frequency in the band (damper as designed)"),
    _q("band_worst_factor_2", "r_w2", "Direction 2: frequency factor of the worst case", "-",
       "fraction", fmt="0.0000", description=_D2 + "frequency factor of the worst case"),
    _q("combined_buffer_excess", "dx_b,r", "Extreme level, both directions: stroke beyond "
       "the clearance (buffers)", "m", "length", fmt=_LENGTH_FMT, summary=True,
       description="Combined stroke beyond the available clearance, taken by the buffers"),
    _q("combined_contact_velocity", "v_b,r", "Extreme level, both directions: velocity at "
       "buffer contact", "m/s", "velocity", fmt="0.0000",
       description="Velocity at contact of the SRSS amplitude, harmonic at the higher mode "
                   "frequency (conservative)"),
    _q("combined_buffer_energy", "E_b,r", "Extreme level, both directions: energy the "
       "buffers must absorb", "J", "energy", fmt="#,##0", summary=True,
       description="Kinetic energy at contact, m_d v_b,r^2 / 2"),
    _second(_RESULT["extreme_damper_force"]),
)

#: Every result of the optional parts of the calculation.
PART_RESULTS: tuple[Quantity, ...] = (BAND_RESULTS + LEVEL_RESULTS + DIRECTION_RESULTS
                                      + SUPPLY_RESULTS + SUPPLY_RESULTS_2)

#: Defined names of the helpers that are working values only (the white-noise variance's
#: terms): a workbook groups them on a page of their own.
WORKING_VALUES: tuple[str, ...] = tuple(q.cell_name for q in HELPERS
                                        if q.description == _VARIANCE)
# (and their direction-2 copies)
WORKING_VALUES += tuple(name + "_2" for name in WORKING_VALUES)

#: Settings of the optional time-domain check (project file table ``[simulation]``).
SIMULATION_SETTINGS: tuple[Quantity, ...] = (
    _q("enabled", "", "Simulation switched on", "", "flag", default=True,
       section="simulation", description="Build the Nonlinear sheet"),
    _q("load", "", "Load of the simulation", "", "choice", default="random",
       choices=("random", "harmonic"), section="simulation",
       description="random (wind-like) or harmonic (at the mode's frequency)"),
    _q("duration", "T", "Record length simulated", "s", "time", 60.0, 3600.0, default=600.0,
       fmt="0.0", section="simulation", description="Record length kept after the warm-up"),
    _q("seed", "", "Seed of the random record", "-", "count", 0, 2 ** 63, high_open=True,
       default=1, section="simulation", description="Same seed, same random record"),
    _q("tolerance", "", "Accepted departure, nonlinear against linearised", "-", "fraction",
       0.0, 1.0, low_open=True, default=0.05, fmt="0.000", section="simulation",
       description="Accepted relative departure of the nonlinear RMS response from the "
                   "linearised one"),
    _q("load_factor", "", "Load factor", "-", "fraction", 0.0, 10.0, low_open=True,
       default=1.0, fmt="0.00", section="simulation",
       description="Force over the force that reproduces the wind input (2: a storm beyond "
                   "the design wind)"),
    _q("level", "", "Wind level simulated", "", "choice", default="extreme",
       choices=("extreme", "service"), section="simulation",
       description="extreme (the extreme level's acceleration, when given; else the service "
                   "level) or service"),
)

#: The modal mass from floor masses and a power-law mode shape (project table
#: ``[mode.floors]``); the floor heights and masses themselves are lists > 0.
FLOOR_TABLE: tuple[Quantity, ...] = (
    _q("building_height", "h", "Building height (floor table)", "m", "length", 0.0, 1000.0,
       low_open=True, fmt=_LENGTH_FMT, section="mode.floors",
       description="Height h of the power-law mode shape (z/h)^k"),
    _q("exponent", "k", "Mode shape exponent (floor table)", "-", "fraction", 0.0, 5.0,
       low_open=True, fmt="0.000", defined_name="mode_exponent", section="mode.floors",
       description="Exponent k of the mode shape (z/h)^k, EN 1991-1-4 Annex F (F.3)"),
    _q("damper_level", "", "Damper at floor (1-based)", "-", "count", 1, 10000,
       section="mode.floors", description="Number of the floor carrying the damper, from "
                                          "the bottom (default: the top floor)"),
)

def by_name(group: Iterable[Quantity]) -> dict[str, Quantity]:
    """Glossary name -> declaration, for one group."""
    return {q.name: q for q in group}


def quantity(name: str) -> Quantity:
    """A design input, result or helper by its defined name, or an input by glossary name.

    Defined names are unique (the chosen mass ratio is ``chosen_mass_ratio``, the result
    ``mass_ratio``); an input's glossary name (``frequency``) is accepted where it is not a
    defined name.

    Raises
    ------
    KeyError
        When no quantity has that name.

    Examples
    --------
    >>> quantity("structure_frequency").name, quantity("frequency").cell_name
    ('frequency', 'structure_frequency')
    """
    for q in design_inputs() + design_results() + HELPERS + PART_RESULTS:
        if q.cell_name == name:
            return q
    for q in design_inputs():
        if q.name == name:
            return q
    raise KeyError(name)


def design_inputs() -> tuple[Quantity, ...]:
    """The design chain's inputs as declared now (read at call time, never cached)."""
    return DESIGN_INPUTS


def design_results() -> tuple[Quantity, ...]:
    """The design chain's results as declared now (read at call time, never cached)."""
    return DESIGN_RESULTS


def design_signature() -> inspect.Signature:
    """Keyword-only signature of :class:`DesignInputs` from the current declarations."""
    params = []
    for q in design_inputs():
        default = inspect.Parameter.empty if q.required else (None if q.optional else q.default)
        params.append(inspect.Parameter(q.name, inspect.Parameter.KEYWORD_ONLY, default=default))
    return inspect.Signature(params)
