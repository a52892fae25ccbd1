# SPDX-License-Identifier: MIT
"""swaytune engine: pure, vectorised functions for pendulum tuned mass damper design.

SI units (m, kg, s, Hz, N), angles in degrees, damping as a fraction of critical.
"""
from functions.pendulum import (  # noqa: F401
    STANDARD_GRAVITY,
    amplitude_detuning,
    amplitude_for_error,
    compound_pendulum_length,
    equivalent_length,
    exact_period,
    folded_pendulum_length,
    pendulum_frequency,
    pendulum_motion,
    small_angle_error,
    small_angle_period,
    swing_angle,
)

__version__ = "0.1.0"
