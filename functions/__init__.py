# SPDX-License-Identifier: MIT
"""swaytune engine: pure, vectorised functions for pendulum tuned mass damper design.

SI units (m, kg, s, Hz, N), angles in degrees, damping as a fraction of critical. Every public
name of the topic modules is re-exported here, imported on first use::

    pendulum      exact period, small-angle error, tuned (equivalent) length, motion
    structure     modal mass, mode shapes, EN 1991-1-4 Annex F estimates, log decrement
    closed_forms  published optima (Den Hartog, Warburton, Nishihara & Asami) with their
                  worksheet formulas
    damper        optimal tuning, effective damping, stroke, required damping and mass ratio
    envelope      the damper over a band of building frequencies: detuned response, worst
                  case, robust tuning, mass ratio for the band, hanger range, as-built retune
    levels        the extreme wind level and the occupied floor: response, swing, buffers,
                  damper force, Melbourne & Palmer comfort criterion, floor ordinate
    directions    one pendulum mass for two sway directions: springs, dashpots, combined
                  stroke and swing
    dashpots      linear and velocity-exponent dashpots: equivalent damping (equal energy,
                  statistical linearisation), coefficient, power, peak force
    suspension    hangers (tension, breaking load, stretch), mass block, folded stages,
                  space, buffer contact
    optima        numerical optima (h2, hinf) on a damped structure, reached through
                  damper.optimal_tuning (no public names of its own)
    quantities    every quantity of the design declared once (name, symbol, unit, range, ...)
    worksheet     closed forms written twice: numpy and native worksheet formula
    chain         the design chain as declared steps, each beside its worksheet formula
    design        the whole design chain -> DesignResult with checks
    study         the design chain over broadcast input arrays -> DesignTable (columns)
    simulation    time-domain check of the pendulum damper on the building mode
"""
import importlib
from typing import Any

__version__ = "0.5.0"

#: The topic modules, in the order their names are searched. They are imported on first use
#: (PEP 562), so ``import functions.quantities`` or the ``swaytune --version`` command does not
#: pay for scipy's start-up.
TOPICS = ("pendulum", "structure", "closed_forms", "damper", "optima", "envelope", "levels",
          "quantities", "worksheet", "chain", "design", "study", "simulation", "directions",
          "dashpots", "suspension")


def _topic(name: str) -> Any:
    return importlib.import_module(f"{__name__}.{name}")


def __getattr__(name: str) -> Any:
    if name in TOPICS:
        return _topic(name)
    if name == "__all__":
        return sorted({n for topic in TOPICS for n in _topic(topic).__all__})
    for topic in TOPICS:
        module = _topic(topic)
        if name in module.__all__:
            return getattr(module, name)
    raise AttributeError(f"module 'functions' has no attribute {name!r}")


def __dir__() -> list[str]:
    return sorted({*globals(), *TOPICS, *__getattr__("__all__")})
