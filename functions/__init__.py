# SPDX-License-Identifier: MIT
"""swaytune engine: pure, vectorised functions for pendulum tuned mass damper design.

SI units (m, kg, s, Hz, N), angles in degrees, damping as a fraction of critical. Every public
name of the topic modules is re-exported here::

    pendulum      exact period, small-angle error, tuned (equivalent) length, motion
    structure     modal mass, mode shapes, EN 1991-1-4 Annex F estimates, log decrement
    closed_forms  published optima (Den Hartog, Warburton, Nishihara & Asami) with their
                  worksheet formulas
    damper        optimal tuning, effective damping, stroke, required damping and mass ratio
    optima        numerical optima (h2, hinf) on a damped structure, reached through
                  damper.optimal_tuning (no public names of its own)
    quantities    every quantity of the design declared once (name, symbol, unit, range, ...)
    worksheet     closed forms written twice: numpy and native worksheet formula
    chain         the design chain as declared steps, each beside its worksheet formula
    design        the whole design chain -> DesignResult with checks
    study         the design chain over broadcast input arrays -> DesignTable (columns)
    simulation    time-domain check of the pendulum damper on the building mode
"""
from functions import (chain, closed_forms, damper, design, optima, pendulum, quantities,
                       simulation, structure, study, worksheet)
from functions.chain import *  # noqa: F401,F403
from functions.closed_forms import *  # noqa: F401,F403
from functions.damper import *  # noqa: F401,F403
from functions.design import *  # noqa: F401,F403
from functions.optima import *  # noqa: F401,F403
from functions.pendulum import *  # noqa: F401,F403
from functions.quantities import *  # noqa: F401,F403
from functions.simulation import *  # noqa: F401,F403
from functions.structure import *  # noqa: F401,F403
from functions.study import *  # noqa: F401,F403
from functions.worksheet import *  # noqa: F401,F403

__version__ = "0.2.0"

__all__ = sorted({*pendulum.__all__, *structure.__all__, *closed_forms.__all__,
                  *damper.__all__, *optima.__all__, *quantities.__all__, *worksheet.__all__,
                  *chain.__all__, *design.__all__, *study.__all__, *simulation.__all__})
