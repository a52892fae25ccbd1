# SPDX-License-Identifier: MIT
"""Worksheet functions of the second wind level and the occupied floor.

The entries of :mod:`functions.levels`: the response with the damper at the extreme level
(acceleration at the occupied floor, displacement and stroke at the damper's level), the
occupied floor's acceleration from a displacement at the damper, the swing and detuning at the
extreme stroke, the buffers (stroke beyond the clearance, contact velocity and energy), the
peak force of the damper on the structure, the Melbourne & Palmer comfort criterion and the
floor ordinate of a power-law mode shape. An engine result of two or three numbers has one
worksheet function per number (as ``SWAY_BAND_WORST_ACCELERATION`` and its partners).
"""
from __future__ import annotations

from functions import levels
from functions.catalogue.declaration import Argument, SheetFunction
from functions.catalogue.envelope import STRUCTURAL_DAMPING

__all__ = ["LEVELS"]

# The linear system's assumption, shared by the extreme-level functions.
_LINEAR = ("Linear: the service level's effective damping and stroke ratio hold at the extreme "
           "level and the response scales with the input; the resonant rule a sqrt(zeta_s / "
           "zeta_eff) reduces the resonant part only.")
_HARMONIC = ("Harmonic motion at one frequency (kinematics); a random response needs its own "
             "statement. Pass the structure's frequency for the response at resonance.")

EXTREME_ACCELERATION = Argument(
    "extreme_acceleration", "Peak acceleration WITHOUT the damper at the occupied floor at the "
    "extreme level, > 0 [m/s^2].", "m/s^2")
EFFECTIVE_DAMPING = Argument(
    "effective_damping", "Effective damping ratio of the building with its damper (the "
    "design's, SWAY_EFFECTIVE_DAMPING), > 0 and < 1 [-].", "-", fraction=True)
STROKE_RATIO = Argument(
    "stroke_ratio", "Damper stroke over building displacement at the damper's level (the "
    "design's, SWAY_STROKE_RATIO), > 0 [-].", "-")
FREQUENCY = Argument(
    "frequency", "Natural frequency of the building's mode, > 0 [Hz].", "Hz")
FLOOR_ORDINATE = Argument(
    "floor_ordinate", "Mode ordinate at the occupied floor over that at the damper's level, "
    "> 0 [-]. Empty: 1 (the damper at the occupied floor's level).", "-", default=1.0)
STROKE = Argument(
    "stroke", "Peak stroke (amplitude) of the damper relative to the building, >= 0 [m].", "m")
CLEARANCE = Argument(
    "clearance", "Free travel from rest to the buffers, >= 0 [m].", "m")
MOTION_FREQUENCY = Argument(
    "frequency", "Frequency of the damper's motion, > 0; the building's frequency for the "
    "response at resonance [Hz].", "Hz")

_RESPONSE_ARGS = (EXTREME_ACCELERATION, STRUCTURAL_DAMPING, EFFECTIVE_DAMPING, STROKE_RATIO,
                  FREQUENCY, FLOOR_ORDINATE)
_RESPONSE_EXAMPLE = (0.6, 0.015, 0.0416667, 5.6176, 0.15, 0.9)
_SWING_ARGS = (
    Argument("extreme_stroke", "Peak stroke of the damper at the extreme level, 0 to "
             "pendulum_length [m].", "m"),
    Argument("pendulum_length", "Pendulum length, > 0 [m].", "m"),
    Argument("design_swing_deg", "Swing at which the pendulum is in tune (the design's swing "
             "angle), 0 to <180 [deg]. Empty: 0 (small swings).", "deg", default=0.0),
)
_SWING_EXAMPLE = (2.2767, 11.288376, 4.820624)

LEVELS: tuple[SheetFunction, ...] = (
    SheetFunction(
        "SWAY_EXTREME_ACCELERATION_WITH_DAMPER", levels.extreme_response,
        "Peak acceleration with the damper at the occupied floor at the extreme level: "
        "a_x sqrt(zeta_s / zeta_eff) [m/s^2].",
        "Extreme acceleration with the damper", "m/s^2", _RESPONSE_ARGS, "levels", output=0,
        example=_RESPONSE_EXAMPLE, notes=_LINEAR),
    SheetFunction(
        "SWAY_EXTREME_DISPLACEMENT", levels.extreme_response,
        "Peak building displacement at the damper's level with the damper at the extreme "
        "level: a_x,d / (phi (2 pi f_s)^2) [m].",
        "Extreme displacement at the damper's level", "m", _RESPONSE_ARGS, "levels", output=1,
        example=_RESPONSE_EXAMPLE, notes=_LINEAR + " Harmonic motion at the building's "
                                                   "frequency."),
    SheetFunction(
        "SWAY_EXTREME_STROKE", levels.extreme_response,
        "Peak damper stroke relative to the building at the extreme level: stroke ratio times "
        "the extreme displacement [m].",
        "Extreme stroke", "m", _RESPONSE_ARGS, "levels", output=2,
        example=_RESPONSE_EXAMPLE, notes=_LINEAR + " Stroke and displacement with equal peak "
                                                   "factors."),
    SheetFunction(
        "SWAY_EXTREME_ACCELERATION_FROM_DISPLACEMENT",
        levels.extreme_acceleration_from_displacement,
        "Peak acceleration without the damper at the occupied floor from a peak displacement "
        "without the damper at the damper's level: phi (2 pi f_s)^2 x_0 [m/s^2].",
        "Acceleration without the damper at the occupied floor", "m/s^2",
        (Argument("displacement_without_damper", "Peak displacement of the building WITHOUT "
                  "the damper at the damper's level, > 0 [m].", "m"),
         FREQUENCY, FLOOR_ORDINATE),
        "levels", example=(0.5, 0.15, 0.9),
        notes="Harmonic motion at the building's frequency in one mode; feed the result to "
              "SWAY_EXTREME_STROKE and its partners as extreme_acceleration."),
    SheetFunction(
        "SWAY_EXTREME_SWING_ANGLE", levels.extreme_swing,
        "Swing angle of the pendulum at the extreme stroke, asin(x_d / L) [deg].",
        "Extreme swing angle", "deg", _SWING_ARGS, "levels", output=0,
        example=_SWING_EXAMPLE),
    SheetFunction(
        "SWAY_EXTREME_SWING_DETUNING", levels.extreme_swing,
        "Relative change of the pendulum's frequency at the extreme swing against its "
        "frequency at the design swing (exact period) [-].",
        "Detuning at the extreme swing", "-", _SWING_ARGS, "levels", output=1,
        example=_SWING_EXAMPLE,
        notes="Negative when the extreme swing is the larger: the pendulum runs slow there. "
              "Rigid hanger, gravity alone."),
    SheetFunction(
        "SWAY_BUFFER_EXCESS", levels.buffer_excess,
        "Stroke beyond the clearance to the buffers, max(0, A - c): the buffers' travel "
        "needed [m].",
        "Stroke beyond the clearance", "m", (STROKE, CLEARANCE), "levels",
        example=(2.3, 1.2)),
    SheetFunction(
        "SWAY_CONTACT_VELOCITY", levels.contact_velocity,
        "Velocity of the damper reaching the buffers in harmonic motion, 2 pi f sqrt(A^2 - c^2); "
        "0 when the stroke stays within the clearance [m/s].",
        "Contact velocity", "m/s", (STROKE, CLEARANCE, MOTION_FREQUENCY), "levels",
        example=(2.3, 1.2, 0.15), notes=_HARMONIC),
    SheetFunction(
        "SWAY_BUFFER_ENERGY", levels.buffer_energy,
        "Kinetic energy the buffers must absorb at contact in harmonic motion, m_d v^2 / 2 "
        "[J].",
        "Energy at contact", "J",
        (Argument("damper_mass", "Moving mass of the damper, > 0 [kg].", "kg"),
         STROKE, CLEARANCE, MOTION_FREQUENCY),
        "levels", example=(287e3, 2.3, 1.2, 0.15),
        notes=_HARMONIC + " Relative to the building; the pendulum's rise and the dashpot's "
                          "work during the buffer's travel are not counted."),
    SheetFunction(
        "SWAY_PEAK_DAMPER_FORCE", levels.peak_damper_force,
        "Peak horizontal force of the damper on the building in harmonic motion, "
        "A sqrt(k^2 + (2 pi f c)^2) [N].",
        "Peak damper force", "N",
        (STROKE,
         Argument("stiffness", "Restoring stiffness of the damper, m_d (2 pi f_d)^2 for a "
                  "pendulum, > 0 [N/m].", "N/m"),
         Argument("dashpot", "Linear dashpot constant, >= 0 [N s/m].", "N s/m"),
         MOTION_FREQUENCY),
        "levels", example=(2.2767, 249092.2, 31856.5, 0.15),
        notes="Linear spring and dashpot, their forces 90 deg apart in harmonic motion; the "
              "pendulum's gravity force taken as linear; buffer forces come on top."),
    SheetFunction(
        "SWAY_MELBOURNE_PALMER_LIMIT", levels.melbourne_palmer_limit,
        "Melbourne & Palmer (1992) peak-acceleration comfort criterion: sqrt(2 ln nT) (0.68 + "
        "ln(R)/5) exp(-3.65 - 0.41 ln n) [m/s^2].",
        "Accepted peak acceleration", "m/s^2",
        (Argument("frequency", "Natural frequency of the building's mode, above 0.06 and below "
                  "1 [Hz].", "Hz"),
         Argument("return_period", "Return period of the wind, 0.1 to 100 (1 for a yearly "
                  "wind) [years].", "years"),
         Argument("duration", "Duration of the wind event [s]. Empty: 600 s (10 minutes, the "
                  "paper's).", "s", default=600.0)),
        "levels", example=(0.2, 1.0),
        notes="Compare with the peak acceleration at the occupied floor for wind of the same "
              "return period."),
    SheetFunction(
        "SWAY_POWER_LAW_FLOOR_ORDINATE", levels.power_law_floor_ordinate,
        "Mode ordinate of the occupied floor over that of the damper's level for a power-law "
        "mode shape, (z_occ / z_d)^zeta [-].",
        "Floor ordinate", "-",
        (Argument("occupied_height", "Height of the top occupied floor above ground, > 0 [m].",
                  "m"),
         Argument("damper_height", "Height of the damper's level above ground, > 0 [m].", "m"),
         Argument("exponent", "Exponent of the power-law mode shape, > 0 (see "
                  "SWAY_MODE_SHAPE_EXPONENT) [-].", "-")),
        "levels", example=(280.0, 300.0, 1.5),
        notes="EN 1991-1-4:2005 Annex F, (F.3); the building's height cancels."),
)
