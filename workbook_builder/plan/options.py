# SPDX-License-Identifier: MIT
"""What a workbook's layout depends on, stored in the workbook so its plan can be rebuilt.

:class:`PlanOptions` holds every fact that moves, adds or removes a cell: the plan's version,
the unit system, the paper, the tuning method, how the mass ratio is set, which inputs have a
row, the size of the floor table, whether a firm's template holds the title block, and the
sizes of the optional Nonlinear sheet's tables. Numbers never change the layout. The options
travel with the workbook as JSON in the custom document property :data:`PLAN_PROPERTY`; the
version is also the hidden workbook-scoped defined name :data:`FORMAT_NAME`.
"""
from __future__ import annotations

import json
from dataclasses import asdict, dataclass, fields
from typing import Any

from functions.chain import MASS_RATIO_MODES, mass_ratio_mode, parts_of, valid_parts
from functions.envelope import BAND_METHODS
from functions.quantities import design_inputs

from ..project.schema import OPTION_KEYS

__all__ = ["PLAN_VERSION", "FORMAT_NAME", "PLAN_PROPERTY", "SIMULATION_PROPERTY", "PlanOptions",
           "options_for"]

#: Version of the plan (the layout of the workbooks this builder writes). RAISE IT BY ONE ON
#: EVERY LAYOUT CHANGE (a sheet, row, column, defined name or formula moved, added, removed or
#: rewritten). History: 1 = swaytune 0.1 before the mark existed; 2 = the mark and the
#: SwaytuneSimulation property (0.1.0); 3 = the plan as data, every value recalculation reads
#: or writes in a named cell, the options in SwaytunePlan; 4 = the printed calculation: Summary
#: with inputs and limits, US values first, working values on their own page, the Pendulum
#: sheet's secant iteration in 10 rows, cell notes, page headers; 5 = the values of the last
#: engine run on the Record sheet, every simulation value named, fixed-size simulation tables
#: (swaytune 0.3.0; 0.4.0 added the design envelope's optional rows and sheets without raising
#: it); 6 = the supply specification (its inputs, sections and the Supply sheet), choices of
#: optional tables (swaytune 0.5.0).
PLAN_VERSION = 6
#: Defined name (workbook scope, hidden) holding :data:`PLAN_VERSION`.
FORMAT_NAME = "SWAYTUNE_FORMAT"
#: Custom document property holding the options as JSON data (never a formula).
PLAN_PROPERTY = "SwaytunePlan"
#: Custom document property holding the project's [simulation] settings as JSON data.
SIMULATION_PROPERTY = "SwaytuneSimulation"


@dataclass(frozen=True)
class PlanOptions:
    """Layout options of one workbook.

    ``inputs`` lists the design inputs with a row on the Inputs sheet (glossary names, in
    declaration order: an optional input not given has none, nor the modal mass when
    ``floors`` > 0 floors give it). ``simulation`` is None without a Nonlinear sheet, else
    ``(load, time rows, window rows)`` of its tables. ``parts`` lists the optional parts of
    the calculation (``functions.chain.PARTS``: frequency band, as-built retune).
    """

    units: str = "SI"
    paper: str = "A4"
    tuning_method: str = "h2"
    mass_ratio_mode: str = "required"
    inputs: tuple[str, ...] = ()
    floors: int = 0
    template: bool = False
    simulation: tuple[str, int, int] | None = None
    parts: tuple[str, ...] = ()
    version: int = PLAN_VERSION

    def __post_init__(self) -> None:
        if self.tuning_method not in BAND_METHODS or (self.tuning_method == "robust"
                                                      and "band" not in self.parts):
            raise ValueError(f"tuning_method={self.tuning_method!r} must be one of "
                             f"{', '.join(BAND_METHODS)} (robust only with a band)")
        if self.mass_ratio_mode not in MASS_RATIO_MODES:
            raise ValueError(f"mass_ratio_mode={self.mass_ratio_mode!r} must be one of "
                             f"{', '.join(MASS_RATIO_MODES)}")
        if not valid_parts(self.parts):
            raise ValueError(f"parts={self.parts!r} must be optional parts of the calculation "
                             "(functions.chain.PARTS, in that order)")
        if self.units not in OPTION_KEYS["units"] or self.paper not in OPTION_KEYS["paper"]:
            raise ValueError(f"units={self.units!r} and paper={self.paper!r} must be SI or US "
                             "and A4 or Letter")

    @property
    def us(self) -> bool:
        return self.units == "US"

    def to_json(self) -> str:
        """The options as JSON text."""
        return json.dumps(asdict(self), sort_keys=True)

    def choice(self, name: str) -> str:
        """The text of the choice input ``name`` the workbook is laid out for."""
        if name == "dashpot_level":
            return "extreme" if "dashpots_at_extreme" in self.parts else "service"
        return getattr(self, name)

    @classmethod
    def from_json(cls, text: str) -> "PlanOptions":
        """Options from :meth:`to_json`.

        Raises
        ------
        ValueError
            When the text is not the JSON of options of this builder.
        """
        try:
            raw = json.loads(text)
        except ValueError as exc:
            raise ValueError(f"{PLAN_PROPERTY} is not JSON: {exc}") from None
        names = {f.name for f in fields(cls)}
        if not isinstance(raw, dict) or set(raw) - names:
            raise ValueError(f"{PLAN_PROPERTY} {text[:80]!r} does not hold the options of a "
                             f"plan (keys {sorted(names)})")
        kwargs: dict[str, Any] = dict(raw)
        kwargs["inputs"] = tuple(raw.get("inputs", ()))
        kwargs["parts"] = tuple(raw.get("parts", ()))
        if raw.get("simulation") is not None:
            kwargs["simulation"] = tuple(raw["simulation"])
        try:
            return cls(**kwargs)
        except TypeError as exc:
            raise ValueError(f"{PLAN_PROPERTY}: {exc}") from None


def options_for(project: Any, simulation: Any = None, template: bool = False) -> PlanOptions:
    """The layout options of a project's workbook (``simulation``: its SimulationRun)."""
    inputs = tuple(q.name for q in design_inputs()
                   if q.kind != "choice" and q.name in project.inputs)
    sim = None
    if simulation is not None:
        sim = (simulation.settings.load, len(simulation.time_table.rows),
               len(simulation.window_table.rows))
    return PlanOptions(
        units=project.units, paper=project.paper, tuning_method=project.tuning_method,
        mass_ratio_mode=mass_ratio_mode("mass_ratio" in project.inputs,
                                        "damper_mass" in project.inputs),
        inputs=inputs, floors=0 if project.floors is None else len(project.floors.heights),
        template=template, simulation=sim, parts=parts_of(project.design_kwargs()))
