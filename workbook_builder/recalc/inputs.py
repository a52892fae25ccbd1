# SPDX-License-Identifier: MIT
"""A workbook's inputs in the project file's convention, and overrides in the same convention.

An input is given as the project file gives it: a bare number in SI units, a table
``{"value": 25, "unit": "milli-g"}``, or the text ``"25 milli-g"``; a choice (the tuning method)
as its text; ``None`` for an optional input left out (the mass ratio then follows from the
comfort limit). :func:`read_inputs` returns every input of a workbook in that form, so
``recalc_workbook(p, inputs=read_inputs(p))`` changes nothing; :func:`parse_overrides` checks
overrides against the quantity declarations before any workbook is read.
"""
from __future__ import annotations

import math
import os
import re
from typing import Any, Mapping

from functions.quantities import Quantity, design_inputs

from ..project.units import SI_UNIT, unit_for
from .read import RecalcError, read_workbook

__all__ = ["Override", "parse_overrides", "read_inputs", "OVERRIDE_FORMS"]

#: How an override may be written (shown in the messages).
OVERRIDE_FORMS = ("a number in SI units", '{"value": 25, "unit": "milli-g"}', '"25 milli-g"',
                  "None (an optional input left out)")

_TEXT_VALUE = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(\S.*?)?\s*$")


class Override:
    """One input override: the quantity, its SI value (or choice, or None) and the unit it was
    written in (None for an SI number, a choice or None)."""

    __slots__ = ("quantity", "si", "value", "unit")

    def __init__(self, quantity: Quantity, si: Any, value: Any = None, unit: str | None = None):
        self.quantity, self.si, self.value, self.unit = quantity, si, value, unit

    def typed_in(self, symbol: str) -> float:
        """The value to type in a cell whose unit is ``symbol`` (exact when written in it)."""
        if self.unit == symbol:
            return float(self.value)
        return float(self.si) / unit_for(self.quantity.kind, symbol).factor

    def __repr__(self) -> str:
        return f"Override({self.quantity.name}={self.si!r})"


def _inputs_by_key() -> dict[str, Quantity]:
    out = {}
    for q in design_inputs():
        out[q.name] = q
        out.setdefault(q.cell_name, q)
    return out


def _number(key: str, q: Quantity, raw: Any) -> Override:
    value, symbol = raw, None
    if isinstance(raw, Mapping):
        unknown = set(raw) - {"value", "unit", "note"}
        if unknown or "value" not in raw:
            raise RecalcError(f"input {key}: {dict(raw)!r} must be a table with 'value' and "
                              "'unit'")
        value, symbol = raw["value"], raw.get("unit")
    elif isinstance(raw, str):
        m = _TEXT_VALUE.match(raw)
        if m is None:
            raise RecalcError(f"input {key}: {raw!r} is not a number with a unit; write it as "
                              f"one of: {', '.join(OVERRIDE_FORMS)}")
        value, symbol = float(m.group(1)), m.group(2)
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise RecalcError(f"input {key}: {value!r} must be a number ({', '.join(OVERRIDE_FORMS)})")
    value = float(value)
    if not math.isfinite(value):
        raise RecalcError(f"input {key}: {value!r} is not a finite number")
    if symbol is None:
        shown = SI_UNIT[q.kind]
    else:
        try:
            unit = unit_for(q.kind, str(symbol))
        except ValueError as exc:
            raise RecalcError(f"input {key}: {exc}") from None
        shown = unit.symbol
    factor = unit_for(q.kind, shown).factor
    si = value * factor
    if not q.contains(si):
        raise RecalcError(f"input {key}: {value:g} {shown} must be in "
                          f"{q.interval(factor)} [{shown}]")
    return Override(q, si, value, shown if isinstance(raw, (Mapping, str)) else None)


def parse_overrides(overrides: Mapping[str, Any] | None) -> dict[str, Override]:
    """Check input overrides; glossary name -> :class:`Override`.

    Parameters
    ----------
    overrides : mapping or None
        Glossary name (``"frequency"``) or defined name (``"structure_frequency"``) -> value,
        in one of :data:`OVERRIDE_FORMS`; ``tuning_method`` takes one of its choices [-].

    Returns
    -------
    overrides : dict
        Glossary name -> :class:`Override` (SI value, or the choice, or None) [-].

    Raises
    ------
    RecalcError
        For an unknown input (the message lists them), a value that is not a number, an unknown
        unit, a value outside the declared range (named, with the range in its unit), a
        choice that is not one of its choices, or None for a required input.

    Examples
    --------
    >>> o = parse_overrides({"acceleration": "25 milli-g", "mass_ratio": 0.04})
    >>> round(o["acceleration"].si, 8), o["mass_ratio"].si
    (0.24516625, 0.04)
    """
    by_key = _inputs_by_key()
    out: dict[str, Override] = {}
    for key, raw in (overrides or {}).items():
        q = by_key.get(key)
        if q is None:
            raise RecalcError(f"unknown input {key!r}; the inputs are "
                              f"{', '.join(q.name for q in design_inputs())}")
        if q.name in out:
            raise RecalcError(f"input {q.name} is given twice (as {q.name} and {q.cell_name})")
        if raw is None:
            if q.required or not q.optional:
                raise RecalcError(f"input {key} cannot be left out (None): it is required")
            out[q.name] = Override(q, None)
        elif q.kind == "choice":
            if raw not in q.choices:
                raise RecalcError(f"input {key}: {raw!r} must be one of {list(q.choices)}")
            out[q.name] = Override(q, raw, raw)
        else:
            out[q.name] = _number(key, q, raw)
    return out


def read_inputs(path: str | os.PathLike) -> dict[str, Any]:
    """Read a workbook's inputs as the project file writes them.

    .. math::

        x_{SI} = x_{typed} \\cdot \\mathrm{factor}(\\mathrm{unit})

    Parameters
    ----------
    path : path-like
        A workbook made by ``swaytune build`` [-].

    Returns
    -------
    inputs : dict
        Glossary name -> ``{"value": as typed, "unit": unit shown}`` for every input with a
        row, and ``tuning_method`` -> its choice; pass it (changed or not) to
        ``recalc_workbook(inputs=...)``. A floor table's modal mass is not an input [-].

    Raises
    ------
    RecalcError
        See :func:`workbook_builder.recalc.read.read_workbook`.

    Examples
    --------
    >>> import tempfile, pathlib
    >>> from workbook_builder.project import parse_project
    >>> from workbook_builder.build import write_workbook
    >>> project = parse_project({"mode": {"frequency": 0.2, "modal_mass":
    ...     {"value": 9000, "unit": "t"}, "structural_damping": 0.01},
    ...     "wind": {"acceleration": 0.25, "acceleration_limit": 0.15},
    ...     "damper": {"mass_ratio": 0.02, "clearance": 1.5}}, source="demo.toml")
    >>> out = pathlib.Path(tempfile.mkdtemp()) / "demo.xlsx"
    >>> _ = write_workbook(project, out)
    >>> kw = read_inputs(out)
    >>> kw["modal_mass"], kw["mass_ratio"], kw["tuning_method"]
    ({'value': 9000.0, 'unit': 't'}, {'value': 0.02, 'unit': '-'}, 'h2')
    """
    data = read_workbook(path)
    out: dict[str, Any] = {}
    for q in design_inputs():
        if q.kind == "choice":
            if q.name in data.project.inputs:         # not a choice of a table not given
                out[q.name] = data.project.inputs[q.name].value
        elif q.name in data.typed:
            value, unit = data.typed[q.name]
            out[q.name] = {"value": value, "unit": unit}
    return out
