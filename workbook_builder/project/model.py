# SPDX-License-Identifier: MIT
"""A validated project: identification, inputs as entered and in SI, floor table, settings.

:class:`Project` is what the project-file reader (:mod:`workbook_builder.project.reader`)
returns and what batch recalculation rebuilds from a workbook's cells. Every input keeps its
declaration (:mod:`functions.quantities`), the value and unit as the user gave them, and its SI
value; :meth:`Project.design_kwargs` gives the engine's keyword arguments.
"""
from __future__ import annotations

import dataclasses
import json
from dataclasses import dataclass, field
from typing import Any

from functions.quantities import SIMULATION_SETTINGS, Quantity, design_inputs
from functions.structure import modal_mass, power_law_mode_shape

from .units import Unit

__all__ = ["ProjectError", "InputValue", "Floors", "SimulationSettings", "Project",
           "settings_text", "settings_from_text"]


class ProjectError(ValueError):
    """A project file that cannot be read or holds an invalid entry (names file, line, key)."""


@dataclass(frozen=True)
class InputValue:
    """One input as the project gave it, with its SI value.

    ``value`` is as entered in ``unit`` (a text for a choice, whose ``unit`` is None);
    ``given`` is False when the declared default was used; ``line`` is the line that set it.
    """

    quantity: Quantity
    value: Any
    unit: Unit | None
    si: Any
    note: str
    given: bool
    line: int | None = None


@dataclass(frozen=True)
class Floors:
    """Floor table for the modal mass from a power-law mode shape (values as entered)."""

    heights: tuple[float, ...]
    masses: tuple[float, ...]
    height_unit: Unit
    mass_unit: Unit
    building_height: float
    exponent: float
    structure_type: str | None
    damper_level: int            # 1-based

    @property
    def heights_si(self) -> list[float]:
        return [h * self.height_unit.factor for h in self.heights]

    @property
    def masses_si(self) -> list[float]:
        return [m * self.mass_unit.factor for m in self.masses]

    @property
    def building_height_si(self) -> float:
        return self.building_height * self.height_unit.factor

    def mode_shape(self) -> list[float]:
        """Mode ordinate phi = (z/h)^exponent of each floor [-] (the engine's
        :func:`functions.structure.power_law_mode_shape`)."""
        return [float(x) for x in power_law_mode_shape(self.heights_si, self.building_height_si,
                                                       self.exponent)]

    def modal_mass(self) -> float:
        """Generalised mass of the mode normalised to 1 at the damper's floor [kg].

        The engine's sum m_i phi_i^2 / phi_damper^2 with phi = (z/h)^exponent
        (:func:`functions.structure.modal_mass`, EN 1991-1-4 Annex F (F.3)).
        """
        return float(modal_mass(self.masses_si, self.mode_shape(),
                                damper_level=self.damper_level - 1))


#: Settings of the optional time-domain check: the fields and defaults of
#: :data:`functions.quantities.SIMULATION_SETTINGS` (``enabled``, ``load``, ``duration`` [s],
#: ``seed``, ``tolerance`` [-], ``load_factor`` [-]).
SimulationSettings = dataclasses.make_dataclass(
    "SimulationSettings", [(q.name, Any, field(default=q.default)) for q in SIMULATION_SETTINGS],
    frozen=True)
SimulationSettings.__module__ = __name__


def settings_text(settings: Any) -> str:
    """The ``[simulation]`` settings as JSON text (stored with a workbook)."""
    return json.dumps(dataclasses.asdict(settings), sort_keys=True)


def settings_from_text(text: str) -> Any:
    """Settings from :func:`settings_text`, each validated by its declaration.

    Raises
    ------
    ValueError
        When the text is not JSON, has unknown keys, or a value is outside its range.
    """
    try:
        raw = json.loads(text)
    except ValueError as exc:
        raise ValueError(f"settings {text[:80]!r} are not JSON: {exc}") from None
    declared = {q.name: q for q in SIMULATION_SETTINGS}
    if not isinstance(raw, dict) or set(raw) - set(declared):
        raise ValueError(f"settings {text[:80]!r} are not a [simulation] table (keys "
                         f"{sorted(declared)})")
    return SimulationSettings(**{k: declared[k].validate(v) for k, v in raw.items()})


@dataclass(frozen=True)
class Project:
    """A validated project: identification, inputs (SI and as entered), options.

    ``inputs`` maps each design input's glossary name to its :class:`InputValue` (the
    tuning method among them); an optional input not given is absent, and so is the modal
    mass when a floor table gives it.
    """

    source_name: str
    source_sha256: str
    info: dict[str, str]
    units: str
    paper: str
    inputs: dict[str, InputValue]
    floors: Floors | None = None
    case: str = ""
    lines: dict[str, int] = field(default_factory=dict, compare=False, repr=False)
    simulation: Any = None            # SimulationSettings; None: no [simulation] table
    #: Warnings about valid but doubtful inputs (e.g. a damper where the mode hardly moves).
    warnings: tuple[str, ...] = ()

    @property
    def tuning_method(self) -> str:
        return self.inputs["tuning_method"].value

    @property
    def simulate(self) -> bool:
        """True when the project asks for the Nonlinear sheet."""
        return self.simulation is not None and bool(self.simulation.enabled)

    def si(self, name: str) -> Any:
        """SI value of input ``name`` (None for an optional input not given)."""
        item = self.inputs.get(name)
        return None if item is None else item.si

    def modal_mass(self) -> float:
        """The modal mass the engine uses: the input, or the floor table's [kg]."""
        return self.floors.modal_mass() if self.floors is not None else self.si("modal_mass")

    def design_kwargs(self) -> dict[str, Any]:
        """Keyword arguments of ``functions.design.DesignInputs`` (SI)."""
        kwargs = {q.name: self.si(q.name) for q in design_inputs()}
        kwargs["modal_mass"] = self.modal_mass()
        return kwargs

    def where(self, name: str) -> str:
        """``source:line: key`` of an input, for messages."""
        q = next((q for q in design_inputs() if q.name == name), None)
        key = q.file_key if q is not None else name
        line = self.lines.get(key)
        loc = f"{self.source_name}:{line}" if line else self.source_name
        return f"{loc}: {self.case + ': ' if self.case else ''}{key}"
