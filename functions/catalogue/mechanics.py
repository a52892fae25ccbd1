# SPDX-License-Identifier: MIT
"""Worksheet functions of one pendulum, one structural mode and one damper (closed forms, optima).

The entries of :mod:`functions.pendulum`, :mod:`functions.structure` and :mod:`functions.damper`,
with the argument texts several functions share (also used by the other entry modules of
:mod:`functions.catalogue`).
"""
from __future__ import annotations

from functions import damper, pendulum, structure
from functions.catalogue.declaration import (
    FLAG, LISTS, LOOKUP, ROW_REDUCE, ROWS, TEXT, Argument, SheetFunction,
)

__all__ = ["LENGTH", "AMPLITUDE", "GRAVITY", "MASS_RATIO", "TUNING_RATIO", "DAMPER_DAMPING",
           "STRUCTURAL_DAMPING_0", "PENDULUM", "STRUCTURE", "DAMPER"]

# ---------------------------------------------------------------------------------------------
# Argument texts used by several functions (<= 255 characters each, unit in brackets).
_G = pendulum.STANDARD_GRAVITY

LENGTH = Argument(
    "length", "Pendulum length from the pivot to the centre of mass, > 0 [m].", "m")
AMPLITUDE = Argument(
    "amplitude_deg", "Swing amplitude from the vertical, 0 to <180 [deg]. Empty: 0 "
    "(small swings).", "deg", default=0.0)
GRAVITY = Argument(
    "g", "Acceleration of gravity, > 0 [m/s^2]. Empty: standard gravity 9.80665 [m/s^2].",
    "m/s^2", default=_G)

PENDULUM: tuple[SheetFunction, ...] = (
    SheetFunction(
        "SWAY_EXACT_PERIOD", pendulum.exact_period,
        "Exact period of a simple pendulum released at a given swing: T = 4 sqrt(L/g) K(m), "
        "m = sin^2(amplitude/2) [s].",
        "Period of a full swing, there and back", "s",
        (LENGTH, AMPLITUDE, GRAVITY), "pendulum", example=(10.0, 15.0)),
    SheetFunction(
        "SWAY_SMALL_ANGLE_PERIOD", pendulum.small_angle_period,
        "Small-angle period of a simple pendulum, T0 = 2 pi sqrt(L/g) [s].",
        "Period for vanishing swing", "s",
        (LENGTH, GRAVITY), "pendulum", example=(10.0,)),
    SheetFunction(
        "SWAY_SMALL_ANGLE_ERROR", pendulum.small_angle_error,
        "Relative error of the small-angle period at a swing, T/T0 - 1 (0.0043 at 15 deg) [-].",
        "Relative period error T/T0 - 1", "-",
        (Argument("amplitude_deg", "Swing amplitude from the vertical, 0 to <180 [deg].",
                  "deg"),),
        "pendulum", example=(15.0,)),
    SheetFunction(
        "SWAY_AMPLITUDE_FOR_ERROR", pendulum.amplitude_for_error,
        "Swing amplitude at which the small-angle period is wrong by a given relative error "
        "(inverse of SWAY_SMALL_ANGLE_ERROR) [deg].",
        "Swing amplitude", "deg",
        (Argument("period_error", "Accepted relative period error T/T0 - 1, 0 to 10 [-] "
                  "(0.01 for 1 %).", "-", param="error"),),
        "pendulum", example=(0.01,)),
    SheetFunction(
        "SWAY_PENDULUM_FREQUENCY", pendulum.pendulum_frequency,
        "Frequency of free swinging of a simple pendulum at a given swing, 1/T [Hz].",
        "Frequency", "Hz",
        (LENGTH, AMPLITUDE, GRAVITY), "pendulum", example=(10.0, 15.0)),
    SheetFunction(
        "SWAY_EQUIVALENT_LENGTH", pendulum.equivalent_length,
        "Pendulum length whose exact period at the design swing is 1/frequency: the length "
        "that tunes a pendulum damper [m].",
        "Pendulum length", "m",
        (Argument("frequency", "Target frequency, e.g. the damper's tuned frequency, > 0 [Hz].",
                  "Hz"),
         Argument("amplitude_deg", "Design swing at which the pendulum must be in tune, 0 to "
                  "<180 [deg]. Empty: 0 (small swings).", "deg", default=0.0),
         GRAVITY),
        "pendulum", example=(0.2, 5.0)),
    SheetFunction(
        "SWAY_COMPOUND_PENDULUM_LENGTH", pendulum.compound_pendulum_length,
        "Simple-pendulum length of a rigid swinging body, L = I / (m d) [m].",
        "Equivalent simple length", "m",
        (Argument("inertia_about_pivot", "Mass moment of inertia about the pivot axis, at least "
                  "mass * pivot_to_centre^2 [kg m^2].", "kg m^2"),
         Argument("mass", "Total swinging mass, > 0 [kg].", "kg"),
         Argument("pivot_to_centre", "Distance from the pivot to the centre of mass, > 0 [m].",
                  "m")),
        "pendulum", example=(1.5e7, 1.0e5, 10.0)),
    SheetFunction(
        "SWAY_FOLDED_PENDULUM_LENGTH", pendulum.folded_pendulum_length,
        "Equivalent length of a multi-stage (folded) pendulum: the sum of the stage lengths [m]. "
        "A row gives one result; a block gives one result per row.",
        "Equivalent simple length", "m",
        (Argument("stage_lengths", "Hanger length of each stage, > 0 [m]: a row or a column; "
                  "empty cells are skipped.", "m", kind=ROWS),),
        "pendulum", kind=ROW_REDUCE, example=([[4.0, 4.0, 4.0]],)),
    SheetFunction(
        "SWAY_PENDULUM_MOTION", pendulum.pendulum_motion,
        "Exact swing angle of a pendulum released from rest, at a given time (Jacobi "
        "elliptic functions) [deg].",
        "Angle from the vertical", "deg",
        (Argument("elapsed_time", "Time since release, any sign [s].", "s", param="time"),
         LENGTH,
         Argument("amplitude_deg", "Release angle from the vertical, 0 to <180 [deg].", "deg"),
         GRAVITY),
        "pendulum", example=(1.0, 10.0, 15.0)),
    SheetFunction(
        "SWAY_SWING_ANGLE", pendulum.swing_angle,
        "Swing angle of a pendulum whose mass is displaced sideways by a stroke, "
        "asin(stroke/length) [deg].",
        "Swing angle from the vertical", "deg",
        (Argument("stroke", "Horizontal displacement of the mass from rest, 0 to length [m].",
                  "m"),
         LENGTH),
        "pendulum", example=(1.0, 10.0)),
    SheetFunction(
        "SWAY_AMPLITUDE_DETUNING", pendulum.amplitude_detuning,
        "Relative drop of a pendulum's frequency at a swing, f(a)/f(0) - 1, zero or negative "
        "[-].",
        "Relative frequency change", "-",
        (Argument("amplitude_deg", "Swing amplitude from the vertical, 0 to <180 [deg].",
                  "deg"),),
        "pendulum", example=(15.0,)),
)

MASS_RATIO = Argument(
    "mass_ratio", "Damper mass over the generalised modal mass, mu > 0 and < 1 (0.02 for "
    "2 %) [-].", "-", fraction=True)
TUNING_RATIO = Argument(
    "tuning_ratio", "Damper frequency over structure frequency, f > 0 [-].", "-")
DAMPER_DAMPING = Argument(
    "damper_damping", "Damper damping ratio on its own frequency, c_d/(2 m_d omega_d), 0 to <1 "
    "(0.07 for 7 %) [-].", "-", fraction=True)
STRUCTURAL_DAMPING_0 = Argument(
    "structural_damping", "Damping ratio of the structure without the damper, 0 to <1 (0.01 "
    "for 1 %) [-]. Empty: 0.", "-", default=0.0, fraction=True)
_METHOD_HELP = ("Optimum: den_hartog, harmonic_base, white_noise_force, white_noise_base, "
                "nishihara_asami (undamped structure only), h2 or hinf (any structural "
                "damping) [-]. Empty: den_hartog.")
_TUNING_ARGS = (
    Argument("mass_ratio", "Damper mass over the generalised modal mass, mu > 0 and < 1 (0.02 "
             "for 2 %) [-].", "-", fraction=True),
    Argument("method", _METHOD_HELP, "-", default="den_hartog", kind=TEXT,
             choices=damper.OPTIMAL_TUNING_METHODS),
    Argument("structural_damping", "Damping ratio of the structure without the damper, 0 to "
             "0.3 for h2 and hinf, must be 0 for the closed forms [-]. Empty: 0.", "-",
             default=0.0, fraction=True),
)
_EXACT = Argument(
    "exact", "FALSE or empty: the EN 1991-1-4 form delta = 2 pi zeta; TRUE: the exact relation "
    "of a viscously damped oscillator [-].", "-", default=False, kind=FLAG)

STRUCTURE: tuple[SheetFunction, ...] = (
    SheetFunction(
        "SWAY_MODAL_MASS", structure.modal_mass,
        "Generalised (modal) mass of a mode scaled to 1 at the damper's level, "
        "sum(m_i phi_i^2) / phi_damper^2 [kg].",
        "Generalised mass M*", "kg",
        (Argument("floor_masses", "Lumped mass of each level, >= 0 [kg]: a row or a column, one "
                  "cell per level.", "kg", kind=ROWS),
         Argument("mode_shape", "Mode ordinate of each level, any scaling [-]: a row or a column "
                  "beside floor_masses.", "-", kind=ROWS),
         Argument("damper_level", "Position of the damper's level in the lists, 1 = first cell "
                  "[-]. Empty: the last cell (the top, when listed bottom up).", "-",
                  default=-1, integer=True, position=True)),
        "structure", kind=LISTS, example=([[1e6, 1e6, 1e6]], [[0.25, 0.5, 1.0]]),
        notes="Empty cells on the same level of both lists are skipped."),
    SheetFunction(
        "SWAY_POWER_LAW_MODE_SHAPE", structure.power_law_mode_shape,
        "Power-law fundamental mode shape (z/h)^exponent, EN 1991-1-4 Annex F (F.3); 1 at the "
        "top [-].",
        "Mode ordinate", "-",
        (Argument("height", "Height above ground, 0 to building_height [m].", "m"),
         Argument("building_height", "Height of the structure, > 0 [m].", "m"),
         Argument("exponent", "Mode-shape exponent, > 0 [-]: 0.6 slender frames, 1.0 core and "
                  "columns or braced, 1.5 slender cantilevers or concrete cores, 2.0 towers, "
                  "2.5 lattice steel towers.", "-")),
        "structure", example=(100.0, 200.0, 1.5)),
    SheetFunction(
        "SWAY_POWER_LAW_MODAL_MASS", structure.power_law_modal_mass,
        "Generalised mass of a uniform structure with a power-law mode shape, damper at the "
        "top: m h / (2 exponent + 1) [kg].",
        "Generalised mass M*", "kg",
        (Argument("mass_per_height", "Mass per unit height, > 0 [kg/m].", "kg/m"),
         Argument("building_height", "Height of the structure, > 0 [m].", "m"),
         Argument("exponent", "Mode-shape exponent, > 0 (see SWAY_POWER_LAW_MODE_SHAPE) [-].",
                  "-")),
        "structure", example=(2.0e5, 200.0, 1.5)),
    SheetFunction(
        "SWAY_ANNEX_F_FREQUENCY", structure.annex_f_frequency,
        "Preliminary first frequency of a multi-storey building taller than 50 m, 46/h "
        "(EN 1991-1-4 Annex F) [Hz].",
        "Estimated first frequency", "Hz",
        (Argument("building_height", "Height of the building, > 50 [m].", "m"),),
        "structure", example=(230.0,)),
    SheetFunction(
        "SWAY_DAMPING_FROM_LOG_DECREMENT", structure.damping_from_log_decrement,
        "Damping ratio from a logarithmic decrement, delta / (2 pi) (EN 1991-1-4 form) or "
        "exact [-].",
        "Damping ratio", "-",
        (Argument("log_decrement", "Logarithmic decrement ln(x_n / x_n+1), >= 0 [-].", "-"),
         _EXACT),
        "structure", example=(0.05,)),
    SheetFunction(
        "SWAY_LOG_DECREMENT_FROM_DAMPING", structure.log_decrement_from_damping,
        "Logarithmic decrement from a damping ratio, 2 pi zeta (EN 1991-1-4 form) or exact "
        "[-].",
        "Logarithmic decrement", "-",
        (Argument("damping_ratio", "Fraction of critical damping, 0 to <1 (0.01 for 1 %) [-].",
                  "-", fraction=True),
         _EXACT),
        "structure", example=(0.01,)),
    SheetFunction(
        "SWAY_MODE_SHAPE_EXPONENT", structure.MODE_SHAPE_EXPONENTS,
        "Exponent of the power-law mode shape (z/h)^exponent for a type of structure, "
        "EN 1991-1-4 Annex F (F.3) [-].",
        "Mode-shape exponent", "-",
        (Argument("structure_type", "Type of structure (a cell or a range of names) [-]: "
                  + ", ".join(structure.MODE_SHAPE_EXPONENTS) + ".", "-", kind=TEXT,
                  choices=tuple(structure.MODE_SHAPE_EXPONENTS)),),
        "structure", kind=LOOKUP, table="functions.structure.MODE_SHAPE_EXPONENTS",
        example=("tower_or_chimney",)),
    SheetFunction(
        "SWAY_STRUCTURAL_LOG_DECREMENT", structure.STRUCTURAL_LOG_DECREMENTS,
        "Structural logarithmic decrement of a type of building, EN 1991-1-4 Annex F, Table F.2; "
        "damping ratio = decrement / (2 pi) [-].",
        "Logarithmic decrement", "-",
        (Argument("building_type", "Type of building (a cell or a range of names) [-]: "
                  + ", ".join(structure.STRUCTURAL_LOG_DECREMENTS) + ".", "-", kind=TEXT,
                  choices=tuple(structure.STRUCTURAL_LOG_DECREMENTS)),),
        "structure", kind=LOOKUP, table="functions.structure.STRUCTURAL_LOG_DECREMENTS",
        example=("steel_building",)),
)


DAMPER: tuple[SheetFunction, ...] = (
    SheetFunction(
        "SWAY_DAMPER_MASS_RATIO", damper.damper_mass_ratio,
        "Mass ratio of a damper on a structural mode, mu = m_d / M* (M* normalised to a unit "
        "mode ordinate at the damper) [-].",
        "Mass ratio mu", "-",
        (Argument("damper_mass", "Moving mass of the damper, > 0 [kg].", "kg"),
         Argument("modal_mass", "Generalised mass of the mode, normalised to 1 at the damper's "
                  "level, > 0 [kg].", "kg")),
        "damper", example=(300e3, 15e6)),
    SheetFunction(
        "SWAY_OPTIMAL_TUNING_RATIO", damper.optimal_tuning,
        "Optimal tuning ratio f = omega_d / omega_s of a tuned mass damper by a published "
        "optimum (Den Hartog, Warburton, Nishihara-Asami) or numerically (h2, hinf) [-].",
        "Optimal tuning ratio f", "-", _TUNING_ARGS, "damper", output=0,
        example=(0.02, "h2", 0.01)),
    SheetFunction(
        "SWAY_OPTIMAL_DAMPER_DAMPING", damper.optimal_tuning,
        "Optimal damper damping ratio on the damper's own frequency, c_d / (2 m_d omega_d), "
        "by a published optimum or numerically (h2, hinf) [-].",
        "Optimal damper damping ratio", "-", _TUNING_ARGS, "damper", output=1,
        example=(0.02, "h2", 0.01)),
    SheetFunction(
        "SWAY_DISPLACEMENT_VARIANCE_RATIO", damper.displacement_variance_ratio,
        "Structure displacement variance under white-noise force, normalised by "
        "pi S0 omega_s / k_s^2 (1/(2 zeta) for a bare structure) [-].",
        "Normalised displacement variance", "-",
        (MASS_RATIO, TUNING_RATIO, DAMPER_DAMPING, STRUCTURAL_DAMPING_0), "damper",
        example=(0.02, 0.985, 0.07, 0.01)),
    SheetFunction(
        "SWAY_EFFECTIVE_DAMPING", damper.effective_damping,
        "Effective damping of a structure with its damper: the damping ratio of the bare "
        "structure with the same displacement variance under white-noise force [-].",
        "Effective damping ratio", "-",
        (MASS_RATIO, TUNING_RATIO, DAMPER_DAMPING, STRUCTURAL_DAMPING_0), "damper",
        example=(0.02, 0.985, 0.07, 0.01)),
    SheetFunction(
        "SWAY_STROKE_RATIO", damper.stroke_ratio,
        "RMS damper displacement relative to the structure over RMS structure displacement, "
        "under white-noise force [-].",
        "Stroke ratio", "-",
        (MASS_RATIO, TUNING_RATIO, DAMPER_DAMPING, STRUCTURAL_DAMPING_0), "damper",
        example=(0.02, 0.985, 0.07, 0.01)),
    SheetFunction(
        "SWAY_REQUIRED_DAMPING", damper.required_damping,
        "Total damping that brings a resonant acceleration down to a limit, "
        "zeta_s (a / a_lim)^2 (resonant response only) [-].",
        "Required total damping ratio", "-",
        (Argument("acceleration", "Peak (or RMS) acceleration without the damper, > 0 "
                  "[m/s^2].", "m/s^2"),
         Argument("acceleration_limit", "Acceptable peak (or RMS, consistently) acceleration, "
                  "> 0 [m/s^2].", "m/s^2"),
         Argument("structural_damping", "Damping ratio of the structure without the damper, "
                  "> 0 and < 1 (0.015 for 1.5 %) [-].", "-", fraction=True)),
        "damper", example=(0.25, 0.15, 0.015)),
    SheetFunction(
        "SWAY_REQUIRED_MASS_RATIO", damper.required_mass_ratio,
        "Smallest mass ratio whose damper, tuned by the method (h2 unless given), gives a "
        "target total (effective) damping; 0 when the structure alone has it [-].",
        "Required mass ratio", "-",
        (Argument("total_damping", "Target effective damping ratio, > 0 and < 1 (0.04 for "
                  "4 %) [-].", "-", fraction=True),
         Argument("structural_damping", "Damping ratio of the structure without the damper, "
                  "0 to 0.3 [-]. Empty: 0.", "-", default=0.0, fraction=True),
         Argument("method", "Tuning method, as the design applies it (a closed form tuned for "
                  "an undamped structure; h2, hinf for the damped one) [-]. Empty: h2.", "-",
                  default="h2", kind=TEXT, choices=damper.OPTIMAL_TUNING_METHODS)),
        "damper", example=(0.04, 0.01)),
    SheetFunction(
        "SWAY_PEAK_FACTOR", damper.peak_factor,
        "Davenport's peak factor: expected largest value over RMS of a random response, "
        "sqrt(2 ln nuT) + 0.5772/sqrt(2 ln nuT) [-].",
        "Peak factor", "-",
        (Argument("frequency", "Mean up-crossing rate, for a resonant response the natural "
                  "frequency, > 0 [Hz].", "Hz"),
         Argument("duration", "Averaging time, frequency * duration > e [s]. Empty: 600 s.",
                  "s", default=600.0)),
        "damper", example=(0.2,)),
    SheetFunction(
        "SWAY_FREQUENCY_RESPONSE", damper.frequency_response,
        "Dynamic amplification |x_s / x_static| of a structure under a harmonic force, with "
        "a damper or bare (mass_ratio 0) [-].",
        "Dynamic amplification", "-",
        (Argument("frequency_ratio", "Forcing frequency over the structure's frequency, >= 0 "
                  "[-].", "-"),
         Argument("mass_ratio", "Damper mass over the generalised modal mass, 0 to <1 [-]. "
                  "Empty: 0 (bare structure).", "-", default=0.0, fraction=True),
         Argument("tuning_ratio", "Damper frequency over structure frequency, > 0 [-]. "
                  "Empty: 1.", "-", default=1.0),
         Argument("damper_damping", "Damper damping ratio on its own frequency, 0 to <1 [-]. "
                  "Empty: 0.", "-", default=0.0, fraction=True),
         Argument("structural_damping", "Damping ratio of the structure, 0 to <1 [-]. Empty: "
                  "0.02.", "-", default=0.02, fraction=True)),
        "damper", example=(1.0, 0.02, 0.98, 0.086, 0.0)),
)
