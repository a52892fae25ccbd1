# SPDX-License-Identifier: MIT
"""The builder's calls into the engine: design chain, time-domain simulation, engine values.

:func:`run_engine` runs ``functions.design`` for a project; :func:`run_simulation` runs
``functions.simulation.simulate`` for the optional Nonlinear sheet, with the load calibrated to
the wind input; :func:`engine_value` reads one engine value (a result field, or an input by its
defined name) in SI units. The project's [simulation] table travels with a workbook as JSON
data in the custom document property :data:`SIMULATION_PROPERTY`
(:func:`simulation_settings_text`, :func:`read_simulation_settings`). Nothing here writes
cells; :mod:`workbook_builder.build` re-exports every name.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from functions.simulation import PEAK_DURATION, calibrated_load, hanger_damping, simulate

from .calcsheet import INPUT_NAMES
from .project import Project, SimulationSettings

__all__ = ["run_engine", "run_simulation", "SimulationRun", "engine_value", "PEAK_DURATION",
           "SIMULATION_PROPERTY", "simulation_settings_text", "read_simulation_settings"]

#: Custom document property holding the project's [simulation] table as JSON data (never a
#: formula), so the settings of the Nonlinear sheet travel with the workbook.
SIMULATION_PROPERTY = "SwaytuneSimulation"


def _engine_modal_mass(project: Project) -> float | None:
    fl = project.floors
    if fl is None:
        return None
    from functions.structure import modal_mass, power_law_mode_shape
    shape = power_law_mode_shape(fl.heights_si, fl.building_height_si, fl.exponent)
    return float(modal_mass(fl.masses_si, shape, damper_level=fl.damper_level - 1))


def engine_value(project: Project, result, name: str) -> float:
    """Engine value of a result field or of an input (by its defined name), SI.

    .. math::

        v = \\mathrm{result.name} \\quad \\text{or} \\quad x_{SI}(\\mathrm{input})

    Parameters
    ----------
    project : Project
        The project the result was computed for [-].
    result : DesignResult
        The engine's result (:func:`run_engine`) [-].
    name : str
        A ``DesignResult`` field (``"tuning_ratio"``) or an input's defined name
        (``"structure_frequency"``) [-].

    Returns
    -------
    value : float
        The value in SI units (the modal mass is the engine's, also from a floor table) [-].

    Raises
    ------
    ValueError
        For a name that is neither.
    """
    if hasattr(result, name):
        return float(getattr(result, name))
    for spec_name, defined in INPUT_NAMES.items():
        if defined == name:
            return float(project.si(spec_name) if spec_name != "modal_mass"
                         else result.inputs.modal_mass)
    raise ValueError(f"name={name!r} is neither a result field nor an input's defined name: "
                     "no engine value for it")


def simulation_settings_text(settings: SimulationSettings) -> str:
    """The [simulation] table as JSON text (stored in :data:`SIMULATION_PROPERTY`)."""
    import dataclasses
    import json
    return json.dumps(dataclasses.asdict(settings), sort_keys=True)


def read_simulation_settings(text: str) -> SimulationSettings:
    """Settings from :func:`simulation_settings_text`; ValueError when they are not valid."""
    import dataclasses
    import json
    try:
        raw = json.loads(text)
    except ValueError as exc:
        raise ValueError(f"{SIMULATION_PROPERTY}={text[:80]!r} is not JSON: {exc}") from None
    names = {f.name: f for f in dataclasses.fields(SimulationSettings)}
    if not isinstance(raw, dict) or set(raw) - set(names):
        raise ValueError(f"{SIMULATION_PROPERTY}={text[:80]!r} is not a [simulation] table "
                         f"(keys {sorted(names)})")
    from .project import parse_project
    # Validate through the project reader (the one set of rules for [simulation]).
    probe = parse_project({"mode": {"frequency": 0.2, "modal_mass": 1e6,
                                    "structural_damping": 0.01},
                           "wind": {"acceleration": 0.2, "acceleration_limit": 0.1},
                           "damper": {"mass_ratio": 0.02, "clearance": 1.0},
                           "simulation": raw}, source=SIMULATION_PROPERTY)
    return probe.simulation


def run_engine(project: Project):
    """Run the engine's design chain for a project; return the DesignResult.

    Raises
    ------
    ValueError
        From the engine, prefixed with the project's source name.
    """
    from functions.design import DesignInputs, design_damper
    try:
        inputs = DesignInputs(**project.design_kwargs(_engine_modal_mass(project)))
        return design_damper(inputs)
    except ValueError as exc:
        raise ValueError(f"{project.source_name}: {project.case + ': ' if project.case else ''}"
                         f"the design cannot be computed: {exc}") from exc


@dataclass(frozen=True)
class SimulationRun:
    """The time-domain simulation of a design and how its load was chosen.

    ``force`` is the random force's RMS or the harmonic force's amplitude [N], calibrated so
    that the building WITHOUT the damper reaches the wind input's peak acceleration times
    ``settings.load_factor``; ``peak_factor`` [-] is the Davenport factor used for the random
    load (None for a harmonic load). ``length`` [m] is the design's pendulum length (in tune at
    the design swing), ``hanger_frequency`` [Hz] its small-angle frequency and
    ``damper_damping`` [-] the damper's damping on that frequency (the designed dashpot).
    """

    settings: SimulationSettings
    load: Any
    force: float
    load_frequency: float
    peak_factor: float | None
    length: float
    damper_mass: float
    hanger_frequency: float
    damper_damping: float
    result: Any


def run_simulation(project: Project, result) -> SimulationRun:
    """Simulate the design's pendulum damper in time (``functions.simulation.simulate``).

    The design's pendulum length L is simulated, with the designed dashpot: the damper damping
    on the hanger's small-angle frequency f_L (``functions.simulation.hanger_damping``). The
    load is calibrated to the wind input (see :mod:`workbook_builder.project`, [simulation]) by
    ``functions.simulation.calibrated_load``: a random force (corner frequency at the mode's
    frequency) or a harmonic force at the mode's frequency that gives the building WITHOUT the
    damper the input peak acceleration (random: expected peak over :data:`PEAK_DURATION`) times
    the load factor.

    Raises
    ------
    ValueError
        When the project has no enabled [simulation] table, or from the engine (prefixed with
        the project's source name).
    """
    settings = project.simulation
    if settings is None or not settings.enabled:
        raise ValueError(f"{project.source_name}: the project does not ask for a simulation")
    i = result.inputs
    M, fs, zs, g = float(i.modal_mass), float(i.frequency), float(i.structural_damping), \
        float(i.g)
    md, L = float(result.damper_mass), float(result.pendulum_length)
    try:
        zd = hanger_damping(float(result.damper_damping), float(result.damper_frequency), L, g)
        load, force, gp = calibrated_load(float(i.acceleration) * settings.load_factor, M, fs, zs,
                                          settings.load, PEAK_DURATION, settings.seed)
        sim = simulate(M, fs, zs, md, L, zd, load, settings.duration,
                       tolerance=settings.tolerance, g=g)
    except ValueError as exc:
        raise ValueError(f"{project.source_name}: {project.case + ': ' if project.case else ''}"
                         f"the simulation cannot be run: {exc}") from exc
    return SimulationRun(settings, load, force, fs, gp, L, md, sim.damper_frequency, zd, sim)
