# SPDX-License-Identifier: MIT
"""The project-file schema, derived from the engine's quantity declarations.

Every key of a project file comes from :mod:`functions.quantities`: a design input is set by
``[section] key`` of its declaration (``[mode] frequency``), a simulation setting by
``[simulation] name``, the floor table's scalars by ``[mode.floors] name``; the accepted units
of a number are those of its unit kind (:mod:`workbook_builder.project.units`). Only the
identification texts of ``[project]`` and the two project options (``units``, ``paper``) are
declared here, since they are not quantities of the design.

:func:`schema_table` renders the keys as a Markdown table for ``docs/project_files.md``.
"""
from __future__ import annotations

from typing import Iterable

from functions.quantities import (FLOOR_TABLE, SIMULATION_SETTINGS, Quantity, design_inputs)

from .units import UNITS

__all__ = ["INFO_KEYS", "OPTION_KEYS", "FLOOR_LISTS", "input_keys", "simulation_keys",
           "floor_keys", "known_keys", "accepted_units", "schema_table"]

#: Identification texts of the ``[project]`` table (title block, record), all optional.
INFO_KEYS = ("number", "title", "structure", "client", "calculated_by", "checked_by", "date",
             "revision", "notes")
#: Options of the ``[project]`` table: unit system of bare numbers, paper size.
OPTION_KEYS = {"units": ("SI", "US"), "paper": ("A4", "Letter")}
#: The floor table's lists (numbers > 0) and the units they are given in.
FLOOR_LISTS = {"heights": "height_unit", "masses": "mass_unit"}


def input_keys() -> dict[str, Quantity]:
    """Dotted project-file key -> design input (``mode.frequency`` -> frequency)."""
    return {q.file_key: q for q in design_inputs()}


def simulation_keys() -> dict[str, Quantity]:
    """Dotted key -> setting of the ``[simulation]`` table."""
    return {q.file_key: q for q in SIMULATION_SETTINGS}


def floor_keys() -> dict[str, Quantity]:
    """Dotted key -> scalar of the ``[mode.floors]`` table."""
    return {q.file_key: q for q in FLOOR_TABLE}


def known_keys() -> set[str]:
    """Every dotted key a project file may hold (tables included)."""
    keys = set(input_keys()) | set(simulation_keys()) | set(floor_keys())
    keys |= {f"project.{k}" for k in (*INFO_KEYS, *OPTION_KEYS)}
    keys |= {f"mode.floors.{k}" for k in FLOOR_LISTS} | \
        {f"mode.floors.{u}" for u in FLOOR_LISTS.values()}
    keys |= {"mode.floors.structure_type"}
    return keys


def accepted_units(q: Quantity) -> tuple[str, ...]:
    """Unit symbols a project file may give ``q`` in (empty for a text or a flag)."""
    return tuple(UNITS.get(q.kind, {}))


def _rows(quantities: Iterable[Quantity]) -> list[str]:
    out = []
    for q in quantities:
        units = ", ".join(f"`{u}`" for u in accepted_units(q)) or "text"
        if q.kind == "choice":
            what = "one of " + ", ".join(f"`{c}`" for c in q.choices)
        elif q.kind == "flag":
            what = "`true` or `false`"
        else:
            what = f"{q.interval()} [{q.unit}]"
        default = "required" if q.required else ("optional" if q.optional else
                                                 f"{q.default!r}".strip("'"))
        out.append(f"| `{q.file_key}` | {q.label} | {what} | {units} | {default} | "
                   f"{(q.note or q.description).replace('|', '/')} |")
    return out


def schema_table() -> str:
    """Markdown table of every numeric and choice key, from the declarations."""
    head = ["| Key | Quantity | Valid range (SI) | Units accepted | Default | Where it comes from |",
            "| --- | --- | --- | --- | --- | --- |"]
    return "\n".join(head + _rows(design_inputs()) + _rows(SIMULATION_SETTINGS)
                     + _rows(FLOOR_TABLE)) + "\n"
