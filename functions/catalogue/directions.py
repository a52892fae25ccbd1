# SPDX-License-Identifier: MIT
"""Worksheet functions of one pendulum mass serving two sway directions.

The entries of :mod:`functions.directions`: the horizontal spring stiffness that lifts the
pendulum to the second direction's damper frequency, the frequency of the pendulum with its
springs at a swing (exact for a rigid hanger), and the combined (SRSS) stroke of the two
directions. The second direction's whole design takes the first direction's design object
(:func:`functions.directions.design_second_direction`); in a sheet its numbers follow from
these functions and the single-direction ones (SWAY_OPTIMAL_TUNING_RATIO,
SWAY_EFFECTIVE_DAMPING, SWAY_STROKE_RATIO, SWAY_SWING_ANGLE).
"""
from __future__ import annotations

from functions import directions
from functions.catalogue.declaration import Argument, SheetFunction
from functions.catalogue.mechanics import GRAVITY

__all__ = ["DIRECTIONS"]

DAMPER_MASS = Argument("damper_mass", "Moving mass of the damper (the pendulum), > 0 [kg].",
                       "kg")

DIRECTIONS: tuple[SheetFunction, ...] = (
    SheetFunction(
        "SWAY_SPRING_STIFFNESS", directions.spring_stiffness,
        "Horizontal spring stiffness that lifts a pendulum to a damper frequency: "
        "k = m_d ((2 pi f_d)^2 - g / L) [N/m].",
        "Spring stiffness", "N/m",
        (DAMPER_MASS,
         Argument("damper_frequency", "Damper frequency needed in the stiffer direction, > 0 "
                  "[Hz].", "Hz"),
         Argument("pendulum_length", "Length whose gravity frequency sqrt(g/L)/(2 pi) the "
                  "springs add to: for a second direction, g/(2 pi f_d1)^2 of the first "
                  "[m].", "m"),
         GRAVITY),
        "directions", example=(287e3, 0.16, 11.298),
        notes="A damper frequency below the pendulum's own gives a message, not a negative "
              "stiffness: tune the hangers to the lower-frequency direction and add springs "
              "in the other."),
    SheetFunction(
        "SWAY_SPRING_PENDULUM_FREQUENCY", directions.spring_pendulum_frequency,
        "Frequency of a pendulum with a horizontal spring on the mass, at a swing (exact for a "
        "rigid hanger; sqrt(g/L + k/m)/(2 pi) at small swings) [Hz].",
        "Frequency at the swing", "Hz",
        (Argument("pendulum_length", "Hanger length from pivot to the mass's centre, > 0 "
                  "[m].", "m"),
         Argument("spring_stiffness", "Total horizontal spring stiffness on the mass, >= 0 "
                  "[N/m].", "N/m"),
         DAMPER_MASS,
         Argument("swing_deg", "Swing amplitude from the vertical, 0 to <90 [deg]. Empty: 0 "
                  "(small swings).", "deg", default=0.0),
         GRAVITY),
        "directions", example=(11.288, 4.1e4, 287e3, 5.0),
        notes="Both the gravity and the spring part soften with the swing; the spring part "
              "about four times as fast (omega^2 ~ g/L (1 - theta^2/8) + k/m (1 - "
              "theta^2/2))."),
    SheetFunction(
        "SWAY_COMBINED_STROKE", directions.combined_stroke,
        "Radial peak stroke of the pendulum swinging in two uncorrelated directions: "
        "sqrt(x_1^2 + x_2^2) (SRSS) [m].",
        "Combined stroke", "m",
        (Argument("stroke_1", "Peak stroke in direction 1, >= 0 [m].", "m"),
         Argument("stroke_2", "Peak stroke in direction 2, >= 0 [m].", "m")),
        "directions", example=(0.95, 0.55),
        notes="Square root of the sum of squares for uncorrelated responses (common practice, "
              "no source); the absolute sum x_1 + x_2 is an upper bound. Show both "
              "directions' own peaks too."),
)
