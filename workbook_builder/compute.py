# SPDX-License-Identifier: MIT
"""The engine runs a workbook needs: the design chain and the optional time-domain check.

:func:`run_design` runs :func:`functions.design.design_damper` for a project (the modal mass of
a floor table included); :func:`run_simulation` runs :func:`functions.simulation.simulate` with
the load calibrated to the wind input by the engine
(:func:`functions.simulation.calibrated_load`) and keeps the tables the Nonlinear sheet plots.
Every refusal of the engine is prefixed with the project's source (and case).
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from functions.design import DesignInputs, DesignResult, design_damper

from .plan.charts import ChartTable, swing_window_table, time_history_table
from .project import Project

__all__ = ["run_design", "run_simulation", "SimulationRun", "simulated_level",
           "simulated_acceleration", "dashpot_law"]


def _prefix(project: Project) -> str:
    return f"{project.source_name}: {project.case + ': ' if project.case else ''}"


def run_design(project: Project) -> DesignResult:
    """Run the engine's design chain for a project.

    Raises
    ------
    ValueError
        From the engine, prefixed with the project's source name (and case).
    """
    try:
        return design_damper(DesignInputs(**project.design_kwargs()))
    except ValueError as exc:
        raise ValueError(f"{_prefix(project)}the design cannot be computed: {exc}") from exc


@dataclass(frozen=True)
class SimulationRun:
    """The time-domain simulation of a design and how its load was chosen.

    ``force`` is the random force's RMS or the harmonic force's amplitude [N], calibrated so
    that the building WITHOUT the damper reaches the wind input's peak acceleration times
    ``settings.load_factor``; ``peak_factor`` [-] is Davenport's factor of a random load (None
    for a harmonic load). ``length`` [m] is the design's pendulum length, ``hanger_frequency``
    [Hz] its small-angle frequency and ``damper_damping`` [-] the damper's damping on that
    frequency (the designed dashpot). ``time_table`` and ``window_table`` are the Nonlinear
    sheet's chart tables.
    """

    settings: Any
    load: Any
    force: float
    load_frequency: float
    peak_factor: float | None
    length: float
    damper_mass: float
    hanger_frequency: float
    damper_damping: float
    result: Any
    time_table: ChartTable
    window_table: ChartTable
    #: The wind level simulated (``extreme`` or ``service``) and the peak acceleration without
    #: the damper at the damper's level the load reproduces (before the load factor) [m/s^2].
    level: str = "service"
    level_acceleration: float = 0.0
    #: The exact model's dashpot law: C |v|^alpha (``dashpot_coefficient`` [N (s/m)^alpha]),
    #: or None for the linear dashpot of the design.
    velocity_exponent: float = 1.0
    dashpot_coefficient: float | None = None


def simulated_level(settings: Any, inputs: Any) -> str:
    """The wind level the time-domain check runs at: ``extreme`` when asked for (the default)
    and the project gives the extreme level, else ``service``."""
    extreme = getattr(settings, "level", "extreme") == "extreme"
    return "extreme" if extreme and inputs.extreme_acceleration is not None else "service"


def simulated_acceleration(settings: Any, inputs: Any) -> float:
    """Peak acceleration without the damper (top occupied floor) of the simulated level
    [m/s^2]."""
    return float(inputs.extreme_acceleration if simulated_level(settings, inputs) == "extreme"
                 else inputs.acceleration)


def dashpot_law(result: DesignResult) -> dict[str, float]:
    """The dashpot law a design's simulation uses: its supply specification's velocity-exponent
    dashpot (``velocity_exponent``, ``dashpot_coefficient`` of ``simulate``), or {} for the
    linear dashpot of the design (no [supply], or alpha = 1)."""
    alpha = result.inputs.velocity_exponent
    if "supply" not in result.parts or alpha == 1.0:
        return {}
    return {"velocity_exponent": float(alpha),
            "dashpot_coefficient": float(result.cells["dashpot_coefficient"])}


def run_simulation(project: Project, result: DesignResult) -> SimulationRun:
    """Simulate the design's pendulum damper in time (``functions.simulation.simulate``).

    The design's pendulum length is simulated with the designed dashpot, the damper damping
    on the hanger's small-angle frequency (``functions.simulation.hanger_damping``; with a
    supply specification's velocity-exponent dashpot, its law in the exact model:
    :func:`dashpot_law`), under a
    load that gives the building WITHOUT the damper the input peak acceleration times the load
    factor (``functions.simulation.calibrated_load``: a random force, expected peak over
    :data:`functions.simulation.PEAK_DURATION`, or a harmonic force at the mode's frequency).
    The input is that of the wind level ``[simulation] level`` (:func:`simulated_level`: the
    extreme level by default, when the project gives it), converted from the top occupied floor
    to the damper's level (divided by ``floor_ordinate``: the modal model is normalised there).

    Raises
    ------
    ValueError
        When the project has no enabled [simulation] table, or from the engine (prefixed with
        the project's source name).
    """
    # the simulation's modules load scipy.signal and scipy.integrate (about half a second):
    # only a workbook with a Nonlinear sheet needs them
    from functions.simulation import (PEAK_DURATION, calibrated_load,  # lazy import
                                      hanger_damping, simulate)
    settings = project.simulation
    if settings is None or not settings.enabled:
        raise ValueError(f"{project.source_name}: the project does not ask for a simulation")
    i = result.inputs
    M, fs, zs, g = i.modal_mass, i.frequency, i.structural_damping, i.g
    # the modal model is normalised at the damper: its acceleration there is a / phi_occ
    level = simulated_acceleration(settings, i) / i.floor_ordinate
    md, L = float(result.damper_mass), float(result.pendulum_length)
    try:
        zd = hanger_damping(float(result.damper_damping), float(result.damper_frequency), L, g)
        load, force, gp = calibrated_load(level * settings.load_factor, M, fs, zs,
                                          settings.load, PEAK_DURATION, settings.seed)
        law = dashpot_law(result)
        sim = simulate(M, fs, zs, md, L, zd, load, settings.duration,
                       tolerance=settings.tolerance, g=g, **law)
        tables = time_history_table(sim), swing_window_table(sim)
    except ValueError as exc:
        raise ValueError(f"{_prefix(project)}the simulation cannot be run: {exc}") from exc
    return SimulationRun(settings, load, float(force), fs, gp, L, md, sim.damper_frequency, zd,
                         sim, *tables, simulated_level(settings, i), level,
                         law.get("velocity_exponent", 1.0), law.get("dashpot_coefficient"))
