# SPDX-License-Identifier: MIT
"""The values of a plan's sourced cells: the project's inputs and texts, the engine's numbers.

A planned ``text``, ``input``, ``value`` or ``engine`` cell names the source of its value
(:class:`workbook_builder.plan.model.Cell`); :func:`source_value` looks it up in the project,
the design result, the chart tables and the simulation. Nothing here computes physics: every
number is the engine's or the user's.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import functions

from .. import __version__
from .charts import ChartTable
from .checks import NOT_DEFINED
from .model import Plan
from .summary import HEADING

__all__ = ["Sources", "source_value", "plan_values"]


@dataclass
class Sources:
    """Everything a plan's values come from."""

    project: Any                          # workbook_builder.project.Project
    result: Any                           # functions.design.DesignResult
    tables: dict[str, ChartTable]         # plan.charts.chart_tables(result)
    simulation: Any = None                # workbook_builder.compute.SimulationRun


def _finite_or_text(value: Any) -> Any:
    if isinstance(value, float) and not math.isfinite(value):
        return NOT_DEFINED            # the engine says why in its notes
    return value


def _floors(project: Any, key: str, *index: int) -> Any:
    fl = project.floors
    return {"height_unit": lambda: fl.height_unit.symbol, "mass_unit": lambda: fl.mass_unit.symbol,
            "height_factor": lambda: fl.height_unit.factor,
            "mass_factor": lambda: fl.mass_unit.factor,
            "building_height": lambda: fl.building_height, "exponent": lambda: fl.exponent,
            "damper_level": lambda: fl.damper_level,
            "structure_type": lambda: fl.structure_type or "",
            "height": lambda: fl.heights[index[0]], "mass": lambda: fl.masses[index[0]],
            }[key]()


def _law(run: Any) -> tuple[str, str]:
    """The dashpot law of the exact model and its note, as the Nonlinear sheet states them."""
    if run.dashpot_coefficient is None:
        return "linear", "F = c_d v, the dashpot designed on the Calculation sheet"
    return (f"C |v|^{run.velocity_exponent:g}",
            f"C = {run.dashpot_coefficient:.6g} N (s/m)^alpha, the Supply sheet's dashpots "
            "(velocity-exponent law); the linearised model keeps the linear c_d")


def _simulation(run: Any, key: str) -> Any:
    sim, st = run.result, run.settings
    theory = sim.theory
    law, law_note = _law(run)
    values = {
        "load": st.load, "force": run.force, "load_factor": st.load_factor,
        "peak_factor": run.peak_factor, "load_frequency": run.load_frequency,
        "length": run.length, "damper_mass": run.damper_mass,
        "hanger_frequency": run.hanger_frequency, "damper_damping": run.damper_damping,
        "record_length": float(sim.time[-1]), "warmup": sim.warmup, "time_step": sim.time_step,
        "integration_error": sim.integration_error, "swing_deg": sim.nonlinear.swing_deg,
        "frequency_at_swing": sim.damper_frequency_at_swing, "detuning": sim.detuning,
        "simulated_detuning": sim.simulated_detuning,
        "equivalent_swing_deg": sim.equivalent_swing_deg, "departure": sim.departure,
        "departure_quantity": sim.departure_quantity, "tolerance": st.tolerance,
        "verdict": sim.verdict, "notes": "\n".join(sim.notes) or "-",
        "substeps_note": f"{sim.substeps} Runge-Kutta steps per output step",
        "tension_peak": sim.nonlinear.tension_peak,
        "dashpot_law": law, "dashpot_law_note": law_note,
        "load_description": (f"white noise through a low-pass filter (corner at the mode's "
                             f"frequency), seed {st.seed}" if st.load == "random" else
                             "sine at the mode's frequency (resonance of the bare building)")
        + f"; {run.level} wind level: {run.level_acceleration:.5g} m/s^2 peak without the "
          "damper at the damper's level (top occupied floor / phi_occ), times the load factor",
    }
    if theory is not None:
        values.update(theory_acceleration_rms=theory.acceleration_rms,
                      theory_acceleration_rms_without_damper=(
                          theory.acceleration_rms_without_damper),
                      theory_scatter=theory.acceleration_rms_scatter)
    return _finite_or_text(values[key])


def _record(project: Any, key: str) -> str:
    st = project.simulation
    if st is None or not st.enabled:
        sim = "not requested" if st is None else "switched off ([simulation] enabled = false)"
    else:
        sim = (f"{st.load} load, duration {st.duration:g} s, seed {st.seed}, tolerance "
               f"{st.tolerance:g}, load factor {st.load_factor:g} (functions.simulation.simulate, "
               "default integration settings)")
    return {
        "program": f"swaytune {__version__} (workbook builder)",
        "engine": f"functions {functions.__version__}",
        "source": project.source_name, "case": project.case or "-",
        "source_and_case": project.source_name + (f" (case {project.case})"
                                                  if project.case else ""),
        "sha256": project.source_sha256, "units": project.units,
        "tuning_method": project.tuning_method, "simulation": sim,
        "build_time": "see the document properties (created)",
        "rebuild": f"swaytune build {project.source_name} -o <workbook>.xlsx",
    }[key]


def source_value(source: tuple, s: Sources) -> Any:
    """The value of one source (see :class:`workbook_builder.plan.model.Cell`).

    Raises
    ------
    KeyError
        For a source this module does not know.
    """
    kind, *rest = source
    p = s.project
    if kind in ("input", "typed"):
        return p.inputs[rest[0]].value
    if kind == "unit":
        return p.inputs[rest[0]].unit.symbol
    if kind == "factor":
        return p.inputs[rest[0]].unit.factor
    if kind == "range":
        iv = p.inputs[rest[0]]
        return iv.quantity.interval(iv.unit.factor)
    if kind == "note":
        iv = p.inputs[rest[0]]
        return iv.note + ("" if iv.given else " (default)")
    if kind == "info":
        text = p.info.get(rest[0], "")
        return text or (HEADING if rest[0] == "title" else "")
    if kind == "floors":
        return _floors(p, *rest)
    if kind == "cell":
        return s.result.cells[rest[0]]
    if kind == "snapshot":
        return s.result.cells[rest[1]]
    if kind == "chart":
        key, i, j = rest
        return s.tables[key].rows[i][j]
    if kind == "sim":
        return _simulation(s.simulation, rest[0])
    if kind == "sim_response":
        model, attr = rest
        return _finite_or_text(getattr(getattr(s.simulation.result, model), attr))
    if kind == "sim_table":
        key, i, j = rest
        table = s.simulation.time_table if key == "time" else s.simulation.window_table
        return table.rows[i][j]
    if kind == "record":
        return _record(p, rest[0])
    raise KeyError(f"unknown source {source!r}")


def plan_values(plan: Plan, sources: Sources) -> dict[tuple[str, str], Any]:
    """``(sheet, cell) -> value`` of every sourced cell of ``plan``."""
    return {(sheet, c.ref): source_value(c.source, sources) for sheet, c in plan.cells()
            if c.source}
