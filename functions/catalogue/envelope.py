# SPDX-License-Identifier: MIT
"""Worksheet functions of the damper over a band of building frequencies.

The entries of :mod:`functions.envelope`: the damper designed for the nominal frequency when the
building turns out at ``r`` times it (detuned effective damping and acceleration), the worst
case over a band of such factors, the robust tuning for the band, the mass ratio that meets the
limit over the whole band, the hanger lengths in tune at the band's ends and the retune to the
measured frequency. An engine result of two or three numbers has one worksheet function per
number (as ``SWAY_OPTIMAL_TUNING_RATIO`` and ``SWAY_OPTIMAL_DAMPER_DAMPING``); the retune's
named settings are a summary with its fields function (as ``SWAY_DESIGN``).
"""
from __future__ import annotations

from functions import damper, envelope
from functions.catalogue.declaration import FIELDS, SUMMARY, TEXT, Argument, SheetFunction
from functions.catalogue.mechanics import GRAVITY

__all__ = ["AS_BUILT_FIELDS", "ENVELOPE"]

#: Numbers of :class:`functions.envelope.AsBuiltRetune`, in its field order (a test checks it).
AS_BUILT_FIELDS = (
    ("tuning_ratio", "-", "Damper frequency over the measured building frequency"),
    ("damper_frequency", "Hz", "New damper frequency"),
    ("pendulum_length", "m", "Hanger length in tune at the design swing"),
    ("damper_damping", "-", "Damper damping ratio on the damper's own frequency"),
    ("dashpot", "N s/m", "Dashpot constant c_d = 2 zeta_d m_d (2 pi f_d)"),
)

# What holds the response without the damper across the band (the module's assumption).
_CONSTANT = ("The acceleration without the damper is held constant across the band unless "
             "response_exponent k gives the rule a r^k; mass, damper and structural damping "
             "are as designed (the frequency error is a stiffness error).")

FACTOR = Argument(
    "frequency_factor", "Actual over nominal frequency of the building's mode, r = f_actual / "
    "f_nominal, > 0 (0.9 for 10 % low) [-].", "-")
BAND_LOWER = Argument(
    "band_lower", "Lowest frequency factor of the band, f_actual / f_nominal, 0.5 to 1 (0.9 "
    "for 10 % below nominal) [-].", "-")
BAND_UPPER = Argument(
    "band_upper", "Highest frequency factor of the band, f_actual / f_nominal, 1 to 2 (1.1 "
    "for 10 % above nominal) [-].", "-")
ACCELERATION = Argument(
    "acceleration", "Peak acceleration without the damper at the nominal frequency, > 0 "
    "[m/s^2].", "m/s^2")
MASS_RATIO = Argument(
    "mass_ratio", "Damper mass over the generalised modal mass, mu > 0 and < 1 (0.02 for "
    "2 %) [-].", "-", fraction=True)
NOMINAL_TUNING = Argument(
    "tuning_ratio", "Damper frequency over the NOMINAL building frequency, f_d / f_nominal "
    "(as designed), > 0 [-].", "-")
DAMPER_DAMPING = Argument(
    "damper_damping", "Damper damping ratio on its own frequency, c_d/(2 m_d omega_d), 0 to <1 "
    "(0.07 for 7 %) [-].", "-", fraction=True)
STRUCTURAL_DAMPING = Argument(
    "structural_damping", "Damping ratio of the building without the damper, > 0 and < 1 "
    "(0.01 for 1 %) [-].", "-", fraction=True)
EXPONENT = Argument(
    "response_exponent", "Exponent k of the rule a(r) = a r^k for the acceleration without "
    "the damper across the band, -3 to 3 [-]. Empty: 0 (held constant).", "-", default=0.0)
SWING = Argument(
    "design_swing_deg", "Swing at which the pendulum must be in tune, 0 to <180 [deg]. Empty: "
    "0 (small swings).", "deg", default=0.0)

_EXAMPLE_DAMPER = (0.02, 0.9846, 0.0702, 0.01)     # mu, f, zeta_d (h2 at zeta_s 1 %), zeta_s
_WORST_ARGS = (BAND_LOWER, BAND_UPPER, ACCELERATION, MASS_RATIO, NOMINAL_TUNING,
               DAMPER_DAMPING, STRUCTURAL_DAMPING, EXPONENT)
_WORST_EXAMPLE = (0.9, 1.1, 0.2) + _EXAMPLE_DAMPER
_ROBUST_ARGS = (
    Argument("mass_ratio", "Damper mass over the generalised modal mass, 0.0001 to 0.5 (0.02 "
             "for 2 %) [-].", "-", fraction=True),
    BAND_LOWER, BAND_UPPER,
    Argument("structural_damping", "Damping ratio of the building without the damper, 0 to "
             "0.3 (0.01 for 1 %) [-]. Empty: 0.", "-", default=0.0, fraction=True),
)
_HANGER_ARGS = (
    Argument("frequency", "Nominal frequency of the building's mode, > 0 [Hz].", "Hz"),
    BAND_LOWER, BAND_UPPER,
    Argument("tuning_ratio", "Damper frequency over the ACTUAL building frequency the damper "
             "is retuned to (the nominal method's optimum), > 0 [-].", "-"),
    SWING, GRAVITY,
)
_HANGER_NOTES = ("The hangers must be adjustable from SWAY_SHORTEST_HANGER_LENGTH to "
                 "SWAY_LONGEST_HANGER_LENGTH; the tuning ratio to the actual building is taken "
                 "as the same across the band.")
_AS_BUILT_ARGS = (
    Argument("measured_frequency", "Frequency of the mode measured on the finished building, "
             "without the damper's mass (a test with the damper locked measures f / "
             "sqrt(1 + mu)), > 0 [Hz].", "Hz"),
    Argument("damper_mass", "Moving mass of the damper as built, > 0 [kg].", "kg"),
    Argument("modal_mass", "Generalised mass of the mode, normalised to 1 at the damper's "
             "level, > 0 [kg].", "kg"),
    Argument("structural_damping", "Damping ratio of the mode, measured if known, else the "
             "design value, 0 to 0.3 [-]. Empty: 0.", "-", default=0.0, fraction=True),
    Argument("method", "Tuning method (closed forms as printed, for an undamped building; h2, "
             "hinf for the damped one) [-]. Empty: h2.", "-", default="h2", kind=TEXT,
             choices=damper.OPTIMAL_TUNING_METHODS),
    SWING, GRAVITY,
)

ENVELOPE: tuple[SheetFunction, ...] = (
    SheetFunction(
        "SWAY_DETUNED_EFFECTIVE_DAMPING", envelope.detuned_effective_damping,
        "Effective damping of the building with its damper when the building's frequency is "
        "r times the nominal: zeta_eff(mu, f/r, zeta_d, zeta_s) [-].",
        "Effective damping ratio", "-",
        (FACTOR, MASS_RATIO, NOMINAL_TUNING, DAMPER_DAMPING,
         Argument("structural_damping", "Damping ratio of the building without the damper, 0 "
                  "to <1 (0.01 for 1 %) [-]. Empty: 0.", "-", default=0.0, fraction=True)),
        "envelope", example=(0.9,) + _EXAMPLE_DAMPER,
        notes="The damper and the modal mass are as designed: the tuning ratio to the actual "
              "building is f / r. At r = 1 this is SWAY_EFFECTIVE_DAMPING."),
    SheetFunction(
        "SWAY_DETUNED_ACCELERATION", envelope.detuned_acceleration,
        "Peak acceleration with the damper when the building's frequency is r times the "
        "nominal: a r^k sqrt(zeta_s / zeta_eff(r)) [m/s^2].",
        "Acceleration with the damper", "m/s^2",
        (FACTOR, ACCELERATION, MASS_RATIO, NOMINAL_TUNING, DAMPER_DAMPING, STRUCTURAL_DAMPING,
         EXPONENT),
        "envelope", example=(0.9, 0.2) + _EXAMPLE_DAMPER, notes=_CONSTANT),
    SheetFunction(
        "SWAY_BAND_WORST_ACCELERATION", envelope.band_worst_case,
        "Largest peak acceleration with the damper anywhere in a band of building frequencies, "
        "for a damper tuned as given [m/s^2].",
        "Worst acceleration with the damper", "m/s^2", _WORST_ARGS, "envelope", output=0,
        example=_WORST_EXAMPLE,
        notes=_CONSTANT + " Searched on 257 points of the band, refined by golden section."),
    SheetFunction(
        "SWAY_BAND_WORST_FACTOR", envelope.band_worst_case,
        "Frequency factor r = f_actual / f_nominal at which the acceleration with the damper "
        "is largest over the band [-].",
        "Frequency factor of the worst case", "-", _WORST_ARGS, "envelope", output=1,
        example=_WORST_EXAMPLE, notes=_CONSTANT),
    SheetFunction(
        "SWAY_BAND_WORST_EFFECTIVE_DAMPING", envelope.band_worst_case,
        "Effective damping at the worst case of the band (the least over the band when the "
        "acceleration without the damper is constant) [-].",
        "Effective damping ratio at the worst case", "-", _WORST_ARGS, "envelope", output=2,
        example=_WORST_EXAMPLE, notes=_CONSTANT),
    SheetFunction(
        "SWAY_ROBUST_TUNING_RATIO", envelope.robust_tuning,
        "Tuning ratio f_d / f_nominal that minimises the worst acceleration over a band of "
        "building frequencies (numerical, damped building) [-].",
        "Robust tuning ratio", "-", _ROBUST_ARGS, "envelope", output=0,
        example=(0.02, 0.9, 1.1, 0.01),
        notes="The acceleration without the damper is held constant across the band. A band "
              "of no width (1, 1) gives the h2 optimum."),
    SheetFunction(
        "SWAY_ROBUST_DAMPER_DAMPING", envelope.robust_tuning,
        "Damper damping ratio on its own frequency of the robust tuning, which minimises the "
        "worst acceleration over the band [-].",
        "Robust damper damping ratio", "-", _ROBUST_ARGS, "envelope", output=1,
        example=(0.02, 0.9, 1.1, 0.01),
        notes="Pair it with SWAY_ROBUST_TUNING_RATIO of the same arguments."),
    SheetFunction(
        "SWAY_BAND_MASS_RATIO", envelope.band_mass_ratio,
        "Least mass ratio whose damper keeps the peak acceleration within the limit anywhere in "
        "the band; 0 when the building alone does [-].",
        "Mass ratio for the band", "-",
        (ACCELERATION,
         Argument("acceleration_limit", "Accepted peak acceleration, > 0 [m/s^2].", "m/s^2"),
         Argument("structural_damping", "Damping ratio of the building without the damper, "
                  "above 0, at most 0.3 (0.015 for 1.5 %) [-].", "-", fraction=True),
         BAND_LOWER, BAND_UPPER,
         Argument("method", "How the damper is tuned: a nominal method (den_hartog, ..., h2, "
                  "hinf; tuned at the nominal frequency) or robust (over the band) [-]. "
                  "Empty: h2.", "-", default="h2", kind=TEXT, choices=envelope.BAND_METHODS),
         Argument("response_exponent", "Exponent k of a(r) = a r^k for the acceleration "
                  "without the damper, -3 to 3; 0 with robust [-]. Empty: 0 (held constant).",
                  "-", default=0.0)),
        "envelope", example=(0.25, 0.15, 0.015, 0.9, 1.1),
        notes=_CONSTANT + " Solved for each cell (a root search: about 0.1 s per cell)."),
    SheetFunction(
        "SWAY_LONGEST_HANGER_LENGTH", envelope.hanger_adjustment,
        "Hanger length in tune if the building is at the band's lower end: the longest the "
        "hangers must reach [m].",
        "Hanger length at the band's lower end", "m", _HANGER_ARGS, "envelope", output=0,
        example=(0.15, 0.9, 1.1, 0.98851, 5.0), notes=_HANGER_NOTES),
    SheetFunction(
        "SWAY_SHORTEST_HANGER_LENGTH", envelope.hanger_adjustment,
        "Hanger length in tune if the building is at the band's upper end: the shortest the "
        "hangers must reach [m].",
        "Hanger length at the band's upper end", "m", _HANGER_ARGS, "envelope", output=1,
        example=(0.15, 0.9, 1.1, 0.98851, 5.0), notes=_HANGER_NOTES),
    SheetFunction(
        "SWAY_AS_BUILT_RETUNE", envelope.as_built_retune,
        "Damper settings for the building's measured frequency: tuning, damper frequency, "
        "hanger length, damping, dashpot, as a column; labels: SWAY_AS_BUILT_RETUNE_FIELDS() "
        "[-].",
        "Column of the retuned damper's settings", "-", _AS_BUILT_ARGS, "envelope",
        kind=SUMMARY, fields=AS_BUILT_FIELDS, example=(0.14, 287e3, 2.0e7, 0.015, "h2", 5.0),
        notes="With the design's own frequency, damping and swing it repeats the design's "
              "damper frequency, pendulum length, damping and dashpot. A row of cases gives "
              "one column per case, a column of cases one row per case."),
    SheetFunction(
        "SWAY_AS_BUILT_RETUNE_FIELDS", envelope.as_built_retune,
        "Names and units of the numbers of SWAY_AS_BUILT_RETUNE, as a column of texts (put it "
        "beside the settings) [-].",
        "Column of labels", "-", (), "envelope", kind=FIELDS, fields=AS_BUILT_FIELDS),
)
