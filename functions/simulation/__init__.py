# SPDX-License-Identifier: MIT
"""Time-domain check of a pendulum damper on a building mode, exact and linearised.

Every public name of the modules below is re-exported here (``simulation.simulate(...)``)::

    model        the coupled building mode and pendulum: Lagrangian, equations, matrices
    loads        HarmonicForce, RandomForce, force_spectrum
    integrators  exact linear discretisation, RK4 with step doubling, solve_ivp
    theory       frequency-domain random response: random_response_theory, RandomTheory
    results      Response, SimulationResult, SUMMARY_FIELDS
    run          simulate: nonlinear, linearised and bare building under one load
    retune       retune_for_swing, RetuneResult
    summary      simulation_summary (flat inputs, for spreadsheets)
    calibration  calibrated_load (force from a peak acceleration), hanger_damping

The notes on the model, the integration and the loads head the module they describe.
"""
import importlib
from typing import Any

#: The modules whose names the package re-exports, imported on first use (PEP 562): the
#: Nonlinear sheet's layout needs one constant, not scipy's integration modules.
MODULES = ("calibration", "integrators", "loads", "results", "retune", "run", "summary",
           "theory")

__all__ = [
    "HarmonicForce",
    "RandomForce",
    "Response",
    "RandomTheory",
    "SimulationResult",
    "RetuneResult",
    "SUMMARY_FIELDS",
    "INTEGRATORS",
    "force_spectrum",
    "random_response_theory",
    "simulate",
    "retune_for_swing",
    "simulation_summary",
    # load calibration (functions.simulation.calibration) and the load types
    "LOAD_TYPES",
    "PEAK_DURATION",
    "CalibratedLoad",
    "calibrated_load",
    "hanger_damping",
]


def __getattr__(name: str) -> Any:
    if name in MODULES:
        return importlib.import_module(f"{__name__}.{name}")
    if name in __all__ or name in ("MAX_AUTO_WARMUP", "MAX_SAMPLES"):
        for module in MODULES:
            found = importlib.import_module(f"{__name__}.{module}")
            if hasattr(found, name):
                return getattr(found, name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


def __dir__() -> list[str]:
    return sorted({*globals(), *MODULES, *__all__})
