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
from functions.simulation.calibration import (
    PEAK_DURATION,
    CalibratedLoad,
    calibrated_load,
    hanger_damping,
)
from functions.simulation.integrators import INTEGRATORS
from functions.simulation.loads import LOAD_TYPES, HarmonicForce, RandomForce, force_spectrum
from functions.simulation.results import SUMMARY_FIELDS, Response, SimulationResult
from functions.simulation.retune import RetuneResult, retune_for_swing
from functions.simulation.run import MAX_AUTO_WARMUP, MAX_SAMPLES, simulate  # noqa: F401
from functions.simulation.summary import simulation_summary
from functions.simulation.theory import RandomTheory, random_response_theory

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
