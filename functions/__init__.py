# SPDX-License-Identifier: MIT
"""swaytune engine: pure, vectorised functions for pendulum tuned mass damper design.

SI units (m, kg, s, Hz, N), angles in degrees, damping as a fraction of critical. Every public
name of the topic modules is re-exported here::

    pendulum    exact period, small-angle error, tuned (equivalent) length, motion
    structure   modal mass, mode shapes, EN 1991-1-4 Annex F estimates, log decrement
    damper      optimal tuning, effective damping, stroke, required damping and mass ratio
    optima      numerical optima (h2, hinf) on a damped structure, reached through
                damper.optimal_tuning (no public names of its own)
    design      the whole design chain -> DesignResult with checks
    simulation  time-domain check of the pendulum damper on the building mode
"""
from functions import damper, design, optima, pendulum, simulation, structure
from functions.damper import *  # noqa: F401,F403
from functions.design import *  # noqa: F401,F403
from functions.optima import *  # noqa: F401,F403
from functions.pendulum import *  # noqa: F401,F403
from functions.simulation import *  # noqa: F401,F403
from functions.structure import *  # noqa: F401,F403

__version__ = "0.1.0"

__all__ = sorted({*pendulum.__all__, *structure.__all__, *damper.__all__, *optima.__all__,
                  *design.__all__, *simulation.__all__})
