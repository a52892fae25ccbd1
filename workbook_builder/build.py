# SPDX-License-Identifier: MIT
"""Building a workbook: project -> engine -> plan -> drawn workbook with cached values.

:func:`build_workbook` runs the engine for a project (:mod:`workbook_builder.compute`), lays
out the plan for its options (:func:`workbook_builder.plan.make_plan`), fills in the values of
the plan's sourced cells, draws it (:func:`workbook_builder.xlsx.draw.draw`) and evaluates every
formula to get its cached value, so a viewer that does not recalculate shows correct numbers.
:func:`write_workbook` saves it atomically, refusing to overwrite a file swaytune did not make
or that was edited since swaytune made it.
"""
from __future__ import annotations

import functools
import math
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from openpyxl import Workbook

from . import __version__
from .compute import SimulationRun, run_design, run_simulation
from .plan import (FORMAT_NAME, PLAN_PROPERTY, PLAN_VERSION, SIMULATION_PROPERTY, Plan,
                   make_plan, options_for)
from .plan.checks import NONLINEAR_CHECKS, check_name, cross_checked, engine_name
from .plan.charts import chart_tables
from .plan.values import Sources, plan_values
from .project import Project
from .project.model import settings_text
from .xlsx.cached import write_with_cached_values
from .xlsx.draw import draw
from .xlsx.page_setup import PageHeader
from .xlsx.files import (guard_hand_edits, guard_overwrite, mark_workbook, set_digest,
                          set_hidden_name, set_property)
from .xlsx.formulas import Evaluator, is_error
from .xlsx.template import open_template

from functions.design import check_rules

__all__ = ["BuildError", "BuiltWorkbook", "build_workbook", "write_workbook",
           "SIMULATION_PROPERTY", "title_fields", "page_header"]


class BuildError(RuntimeError):
    """The workbook could not be built consistently (e.g. a formula evaluates to an error)."""


@dataclass
class BuiltWorkbook:
    """A built workbook, its plan, the cached values of its formulas and the engine's results.

    ``cross_checks`` holds ``(name, workbook value, engine value, relative difference)`` of
    every cross-checked result; ``design_verdicts`` and ``nonlinear_verdicts`` the workbook's
    ``(label, verdict)`` of each check.
    """

    workbook: Workbook
    values: dict[tuple[str, str], Any]
    result: Any
    project: Project
    plan: Plan
    simulation: SimulationRun | None = None
    cross_checks: list[tuple[str, float, float, float]] = field(default_factory=list)
    design_verdicts: list[tuple[str, str]] = field(default_factory=list)
    nonlinear_verdicts: list[tuple[str, str]] = field(default_factory=list)

    @functools.cached_property
    def names(self) -> dict[str, tuple[str, str]]:
        """Defined name -> (sheet, cell) of the plan (computed once)."""
        return self.plan.names()

    def value(self, name: str) -> Any:
        """Value (cached value of a formula, or the constant) of the cell named ``name``."""
        key = self.names[name]
        if key in self.values:
            return self.values[key]
        return self.workbook[key[0]][key[1]].value

    def engine_cells(self) -> list[tuple[str, str, tuple]]:
        """``(sheet, cell, source)`` of every engine value recalculation recomputes."""
        return [(s, c.ref, c.source) for s, c in self.plan.refreshed_cells()]


def title_fields(project: Project) -> dict[str, str]:
    """Title-block fields of a firm's template (``workbook_builder.xlsx.template``)."""
    info = project.info
    return {"project_number": info.get("number", ""), "title": info.get("title", ""),
            "calculated_by": info.get("calculated_by", ""),
            "checked_by": info.get("checked_by", ""), "date": info.get("date", ""),
            "revision": info.get("revision", "")}


def page_header(project: Project) -> PageHeader:
    """The project's identification printed at the top of every page."""
    info = project.info
    return PageHeader(number=info.get("number", ""), title=info.get("title", ""),
                      revision=info.get("revision", ""),
                      calculated_by=info.get("calculated_by", ""),
                      checked_by=info.get("checked_by", ""))


def _mark(wb: Workbook, plan: Plan, project: Project) -> None:
    mark_workbook(wb, __version__)
    set_hidden_name(wb, FORMAT_NAME, str(PLAN_VERSION))     # replaces a template's stale mark
    set_property(wb, PLAN_PROPERTY, plan.options.to_json())
    if project.simulation is not None:
        set_property(wb, SIMULATION_PROPERTY, settings_text(project.simulation))
    wb.properties.creator = f"swaytune {__version__}"
    wb.properties.title = project.info.get("title") or "Pendulum damper design"
    wb.calculation.fullCalcOnLoad = True


def _cached_values(wb: Workbook, plan: Plan) -> dict[tuple[str, str], Any]:
    ev = Evaluator(wb, sheets=[s.title for s in plan.sheets])
    values: dict[tuple[str, str], Any] = {}
    errors = []
    for sheet, cells in ev.values().items():
        for coord, v in cells.items():
            if is_error(v) or (isinstance(v, float) and not math.isfinite(v)):
                errors.append(f"{sheet}!{coord}={v}")
            else:
                values[(sheet, coord)] = v
    if errors:
        raise BuildError("formula(s) evaluate to an error: " + ", ".join(errors[:10]))
    return values


def build_workbook(project: Project, *, template: str | Path | None = None,
                   result: Any = None, simulation: SimulationRun | None = None
                   ) -> BuiltWorkbook:
    """Build the workbook for a project and compute the cached value of every formula.

    Parameters
    ----------
    project : Project
        A validated project (:func:`workbook_builder.project.load_project`) [-].
    template : path, optional
        A firm's calc-sheet template whose title block is marked by defined names [-].
    result : DesignResult, optional
        The engine result, when already computed [-].
    simulation : SimulationRun, optional
        The time-domain simulation, when already computed; otherwise it is run when the
        project asks for it [-].

    Returns
    -------
    built : BuiltWorkbook
        Workbook, plan, cached values, engine result and cross-check figures [-].

    Raises
    ------
    ValueError
        When the engine cannot compute the design for these inputs.
    BuildError
        When a formula of ours evaluates to an error (a bug, never silently written).
    """
    result = run_design(project) if result is None else result
    if simulation is None and project.simulate:
        simulation = run_simulation(project, result)
    plan = make_plan(options_for(project, simulation, template is not None))
    values = plan_values(plan, Sources(project, result, chart_tables(result), simulation))
    tpl = open_template(template, title_fields(project)) if template is not None else None
    wb = draw(plan, values, template=tpl, header=page_header(project))
    _mark(wb, plan, project)
    cached = _cached_values(wb, plan)
    built = BuiltWorkbook(wb, cached, result, project, plan, simulation)
    for name in cross_checked(plan.options):
        v, e = built.value(name), float(built.value(engine_name(name)))
        built.cross_checks.append((name, v, e, abs(v) if e == 0 else abs(v / e - 1)))
    built.design_verdicts = [(rule.label, built.value(check_name(rule.name)))
                             for rule in check_rules(plan.options.parts)]
    if simulation is not None:
        built.nonlinear_verdicts = [(label, built.value(name))
                                    for name, label, *_ in NONLINEAR_CHECKS]
    return built


def write_workbook(project: Project, out: str | Path, *, force: bool = False,
                   template: str | Path | None = None) -> BuiltWorkbook:
    """Build and save a project's workbook to ``out`` with cached values, atomically.

    Raises
    ------
    OverwriteRefused
        When ``out`` exists and was not made by swaytune, or was changed after swaytune built
        it (unless ``force``).
    ValueError, BuildError
        See :func:`build_workbook`.
    """
    guard_overwrite(out, force=force)
    guard_hand_edits(out, force=force)
    built = build_workbook(project, template=template)
    set_digest(built.workbook)
    # Without a template every formula cell is ours and must get its cached value.
    write_with_cached_values(built.workbook, out, built.values, require_all=template is None)
    return built
