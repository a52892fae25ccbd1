# SPDX-License-Identifier: MIT
"""Project files (TOML): reading and validation against the declarations.

A project file describes one damper design case (see ``example_workbooks/*.toml`` for a
commented example, and ``docs/project_files.md`` for every key, generated from the engine's
declarations)::

    [project]                      # identification, all text, all optional
    number = "P-001"
    title = "Pendulum damper, preliminary design"
    structure = "Invented residential tower"
    calculated_by = "A. Engineer"
    units = "SI"                   # unit system for bare numbers: "SI" or "US"
    paper = "A4"                   # "A4" or "Letter"

    [mode]                         # the building mode the damper controls
    frequency = 0.2                # [Hz]
    modal_mass = { value = 9000, unit = "t" }   # any number: a value or {value, unit, note}
    structural_damping = { value = 1.0, unit = "%" }

    [wind]                         # response without damper and the comfort limit (peaks)
    acceleration = { value = 25, unit = "milli-g" }
    acceleration_limit = { value = 15, unit = "milli-g" }

    [damper]
    mass_ratio = 0.02              # or damper_mass = ...; neither: the required mass ratio
    tuning_method = "h2"
    clearance = 1.5                # available peak stroke, one side
    max_swing = 15                 # [deg]

    [band]                         # optional: the building frequency only known within a band
    lower = 0.9                    # frequency factors f_actual / f_s around the nominal 1
    upper = 1.1

    [as_built]                     # optional: measured on the finished building (retune)
    frequency = 0.19               # [Hz]

    [simulation]                   # optional: the Nonlinear sheet (time-domain check)
    load = "random"                # "random" (wind-like) or "harmonic"
    duration = 600                 # record length [s]

The modal mass may instead come from floor masses and a power-law mode shape
(``[mode.floors]``: ``heights``, ``masses``, ``height_unit``, ``mass_unit``,
``building_height``, ``exponent`` or ``structure_type``, ``damper_level``). Every number is
checked against the valid range of its declaration (:mod:`functions.quantities`) — the same
range the engine checks — and so is the modal mass a floor table gives. Every refusal names the
file, the line and the key.
"""
from __future__ import annotations

import difflib
import hashlib
import math
import re
import sys
from pathlib import Path
from typing import Any

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

from functions.quantities import OPTIONAL_TABLES, Quantity, input_relation_errors, quantity
from functions.structure import MODE_SHAPE_EXPONENTS

from .model import Floors, InputValue, Project, ProjectError, SimulationSettings
from .schema import (FLOOR_LISTS, INFO_KEYS, OPTION_KEYS, floor_keys, input_keys,
                     known_keys, simulation_keys)
from .units import DEFAULT_UNITS, SI_UNIT, unit_for

__all__ = ["parse_project", "load_project", "key_lines", "read_number", "input_quantity_key",
           "check_text", "floor_warnings", "ILLEGAL_TEXT", "MAX_TEXT", "SMALL_ORDINATE"]

_HEADER_RE = re.compile(r"^\s*\[\s*([A-Za-z0-9_.\-\s\"']+?)\s*\]\s*(#.*)?$")
_KEY_RE = re.compile(r"^\s*([A-Za-z0-9_\-\"'.\s]+?)\s*=")


def key_lines(text: str) -> dict[str, int]:
    """Map each dotted key (``mode.frequency``) and table to the line (1-based) that sets it."""
    lines: dict[str, int] = {}
    table = ""
    in_multiline: str | None = None
    for number, raw in enumerate(text.splitlines(), start=1):
        if in_multiline:
            if raw.count(in_multiline) % 2 == 1:
                in_multiline = None
            continue
        m = _HEADER_RE.match(raw)
        if m and not raw.lstrip().startswith("[["):
            table = ".".join(p.strip().strip("\"'") for p in m.group(1).split("."))
            lines.setdefault(table, number)
            continue
        m = _KEY_RE.match(raw)
        if m:
            key = ".".join(p.strip().strip("\"'") for p in m.group(1).split("."))
            full = f"{table}.{key}" if table else key
            lines.setdefault(full, number)
            rest = raw[m.end():]
            for quote in ('"""', "'''"):
                if rest.count(quote) % 2 == 1:
                    in_multiline = quote
    return lines


class _Context:
    """Where a key is (file, line, CSV column label) for messages."""

    def __init__(self, source: str, lines: dict[str, int], row_label: str = ""):
        self.source = source
        self.lines = lines
        self.row_label = row_label

    def line(self, key: str) -> int:
        """The key's line, else its table's, else the first line."""
        while key:
            if key in self.lines:
                return self.lines[key]
            key = key.rsplit(".", 1)[0] if "." in key else ""
        return min(self.lines.values(), default=1)

    def error(self, key: str, message: str) -> ProjectError:
        return ProjectError(f"{self.source}:{self.line(key)}: {self.row_label}{key}: {message}")


def _flatten(data: dict, prefix: str = "") -> dict[str, Any]:
    out: dict[str, Any] = {}
    leaf_tables = set(input_keys()) | set(simulation_keys()) | set(floor_keys())
    for k, v in data.items():
        key = f"{prefix}{k}"
        if isinstance(v, dict) and key not in leaf_tables:
            out.update(_flatten(v, key + "."))
        else:
            out[key] = v
    return out


def _is_number(v: Any) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool)


def _finite(ctx: _Context, key: str, v: Any, what: str = "value") -> float:
    if not _is_number(v):
        raise ctx.error(key, f"{what} {v!r} must be a number")
    try:
        x = float(v)
    except OverflowError:
        raise ctx.error(key, f"{what} {v!r} is too large for a number") from None
    if not math.isfinite(x):
        raise ctx.error(key, f"{what} {v!r} must be a finite number (NaN and inf are refused)")
    return x


def read_number(ctx: _Context, q: Quantity, key: str, raw: Any, system: str) -> InputValue:
    """A number (or ``{value, unit, note}``) checked against the declaration of ``q``."""
    note = q.note
    symbol = DEFAULT_UNITS[system].get(q.kind, SI_UNIT.get(q.kind, "-"))
    if isinstance(raw, dict):
        unknown = set(raw) - {"value", "unit", "note"}
        if unknown:
            raise ctx.error(key, f"unknown field(s) {sorted(unknown)}; a number's table takes "
                                 "value, unit and note")
        if "value" not in raw:
            raise ctx.error(key, "the table has no 'value'")
        symbol = raw.get("unit", symbol)
        if "note" in raw:
            if not isinstance(raw["note"], str):
                raise ctx.error(key, f"note {raw['note']!r} must be text")
            note = check_text(ctx, f"{key}.note", raw["note"])
        raw = raw["value"]
    if q.kind == "count":
        if isinstance(raw, bool) or not isinstance(raw, int):
            raise ctx.error(key, f"{raw!r} must be a whole number in {q.interval()}")
        value: float = raw
    else:
        value = _finite(ctx, key, raw)
    if not isinstance(symbol, str):
        raise ctx.error(key, f"unit {symbol!r} must be text")
    try:
        unit = unit_for(q.kind, symbol)
    except ValueError as exc:
        raise ctx.error(key, str(exc)) from None
    si = value * unit.factor if q.kind != "count" else value
    if not (math.isfinite(si) and q.contains(si)):
        shown = f"{value:g}" if unit.symbol == "-" else f"{value:g} {unit.symbol}"
        raise ctx.error(key, f"{shown} must be in {q.interval(unit.factor)} [{unit.symbol}]")
    return InputValue(q, value, unit, si, note, True, ctx.lines.get(key))


def _read_choice(ctx: _Context, q: Quantity, key: str, raw: Any) -> InputValue:
    if raw not in q.choices:
        close = difflib.get_close_matches(str(raw), q.choices, n=1)
        hint = f" (did you mean {close[0]!r}?)" if close else ""
        raise ctx.error(key, f"{raw!r} must be one of {list(q.choices)}{hint}")
    return InputValue(q, raw, None, raw, q.note, True, ctx.lines.get(key))


def _default(q: Quantity, system: str = "SI") -> InputValue:
    """The default of ``q`` in the unit system's unit of its kind (US: g in ft/s^2) when the
    conversion back to SI is exact, else in the SI unit; its SI value is the declared one."""
    if q.kind == "choice":
        return InputValue(q, q.default, None, q.default, q.note, False)
    unit = unit_for(q.kind, DEFAULT_UNITS[system].get(q.kind, SI_UNIT[q.kind]))
    value = q.default / unit.factor
    if value * unit.factor != q.default:
        unit, value = unit_for(q.kind, SI_UNIT[q.kind]), q.default
    return InputValue(q, value, unit, q.default, q.note, False)


def _read_floors(ctx: _Context, flat: dict[str, Any], system: str) -> Floors:
    key = "mode.floors"
    units = {}
    for lkey, ukey in FLOOR_LISTS.items():
        kind = "length" if lkey == "heights" else "mass"
        symbol = flat.get(f"{key}.{ukey}", DEFAULT_UNITS[system][kind])
        try:
            units[ukey] = unit_for(kind, symbol)
        except ValueError as exc:
            raise ctx.error(f"{key}.{ukey}", str(exc)) from None
    lists = {}
    for lkey in FLOOR_LISTS:
        seq = flat.get(f"{key}.{lkey}")
        if seq is None:
            raise ctx.error(key, f"'{lkey}' is missing")
        if not isinstance(seq, list) or not seq:
            raise ctx.error(f"{key}.{lkey}", "must be a non-empty list of numbers")
        vals = [_finite(ctx, f"{key}.{lkey}", v, f"item {i + 1}") for i, v in enumerate(seq)]
        if any(v <= 0 for v in vals):
            raise ctx.error(f"{key}.{lkey}", "every item must be > 0")
        lists[lkey] = tuple(vals)
    if len(lists["heights"]) != len(lists["masses"]):
        raise ctx.error(f"{key}.masses", f"has {len(lists['masses'])} items, heights has "
                                         f"{len(lists['heights'])}")
    n = len(lists["heights"])
    scalars = floor_keys()
    if f"{key}.building_height" not in flat:
        raise ctx.error(key, "'building_height' is missing")
    h = read_number(ctx, scalars[f"{key}.building_height"], f"{key}.building_height",
                    {"value": flat[f"{key}.building_height"],
                     "unit": units["height_unit"].symbol}, system).si
    if max(lists["heights"]) * units["height_unit"].factor > h:
        raise ctx.error(f"{key}.building_height", "must not be below the highest floor")
    structure_type = flat.get(f"{key}.structure_type")
    if (f"{key}.exponent" in flat) == (structure_type is not None):
        raise ctx.error(key, "give exactly one of 'exponent' and 'structure_type'")
    if structure_type is not None:
        if structure_type not in MODE_SHAPE_EXPONENTS:
            raise ctx.error(f"{key}.structure_type", f"{structure_type!r} is not one of "
                                                     f"{sorted(MODE_SHAPE_EXPONENTS)}")
        exponent = float(MODE_SHAPE_EXPONENTS[structure_type])
    else:
        exponent = read_number(ctx, scalars[f"{key}.exponent"], f"{key}.exponent",
                               flat[f"{key}.exponent"], system).si
    level = flat.get(f"{key}.damper_level", n)
    if isinstance(level, bool) or not isinstance(level, int) or not 1 <= level <= n:
        raise ctx.error(f"{key}.damper_level", f"{level!r} must be a floor number in [1, {n}]")
    floors = Floors(lists["heights"], lists["masses"], units["height_unit"],
                    units["mass_unit"], h / units["height_unit"].factor, exponent,
                    structure_type, level)
    q = quantity("modal_mass")
    mass = floors.modal_mass()
    if not (math.isfinite(mass) and q.contains(mass)):
        raise ctx.error(key, f"the modal mass of the floor table, {mass:.6g} kg, must be in "
                             f"{q.interval()} [kg] like the modal_mass input (check the "
                             "masses' unit and the damper's floor)")
    return floors


def floor_warnings(floors: Floors) -> list[str]:
    """Warnings about a floor table: a damper where the mode hardly moves."""
    shape = floors.mode_shape()
    ratio = shape[floors.damper_level - 1] / max(shape)
    if ratio >= SMALL_ORDINATE:
        return []
    return [f"the damper's floor {floors.damper_level} moves only {ratio:.0%} as much as the "
            f"highest floor in this mode: a damper there works poorly, and the modal mass "
            f"normalised to it ({floors.modal_mass():.4g} kg) grows as 1/phi^2; check the "
            "damper's floor"]


#: Mode ordinate at the damper, relative to the highest floor's, below which a floor table gets
#: a warning (common practice, no source: dampers sit where the mode moves most).
SMALL_ORDINATE = 0.5


def _read_simulation(ctx: _Context, flat: dict[str, Any]) -> Any:
    raw = flat["simulation"]
    if not isinstance(raw, dict):
        raise ctx.error("simulation", "must be a table ([simulation])")
    declared = simulation_keys()
    values = {}
    for name, v in raw.items():
        key = f"simulation.{name}"
        q = declared.get(key)
        if q is None:
            close = difflib.get_close_matches(key, sorted(declared), n=1)
            hint = f" (did you mean '{close[0]}'?)" if close else ""
            raise ctx.error(key, f"unknown key{hint}; [simulation] takes "
                                 f"{sorted(k.split('.')[1] for k in declared)}")
        if q.kind == "flag":
            if not isinstance(v, bool):
                raise ctx.error(key, f"{v!r} must be true or false")
            values[name] = v
        elif q.kind == "choice":
            values[name] = _read_choice(ctx, q, key, v).value
        else:
            values[name] = read_number(ctx, q, key, v, "SI").si
    return SimulationSettings(**values)


#: Characters a workbook cell cannot hold (XML 1.0): control characters but tab, line feed and
#: carriage return, and the non-characters U+FFFE, U+FFFF.
ILLEGAL_TEXT = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ufffe\uffff]")
#: Longest text a cell holds [characters].
MAX_TEXT = 32767


def check_text(ctx: _Context, key: str, text: str) -> str:
    """Text a cell can hold, or ProjectError naming the key (never cut or changed)."""
    bad = ILLEGAL_TEXT.search(text)
    if bad:
        raise ctx.error(key, f"holds the character U+{ord(bad.group()):04X} at position "
                             f"{bad.start() + 1}, which a workbook cell cannot store")
    if len(text) > MAX_TEXT:
        raise ctx.error(key, f"is {len(text)} characters long; a cell holds at most "
                             f"{MAX_TEXT}")
    return text


def _text(ctx: _Context, key: str, v: Any) -> str:
    if not isinstance(v, str):
        v = v.isoformat() if hasattr(v, "isoformat") else v
        if not isinstance(v, str):
            raise ctx.error(key, f"{v!r} must be text (in quotes)")
    return check_text(ctx, key, v)


def parse_project(data: dict, *, source: str = "<project>", text: str = "",
                  lines: dict[str, int] | None = None, row_label: str = "",
                  case: str = "") -> Project:
    """Validate a project already read into nested dicts (from TOML or a CSV row).

    Raises
    ------
    ProjectError
        Naming the source, the line and the key.
    """
    lines = key_lines(text) if lines is None else lines
    ctx = _Context(source, lines, row_label)
    flat = _flatten(data)
    known = known_keys() | {"mode.floors", "simulation"}
    for key in flat:
        if key not in known and not key.startswith("simulation."):
            close = difflib.get_close_matches(key, sorted(known), n=1)
            hint = f" (did you mean '{close[0]}'?)" if close else ""
            raise ctx.error(key, f"unknown key{hint}")
    if isinstance(data.get("simulation"), dict):   # the table, even empty, asks for it
        flat["simulation"] = {k.split(".", 1)[1]: v for k, v in flat.items()
                              if k.startswith("simulation.")}
    info = {k: _text(ctx, f"project.{k}", flat.get(f"project.{k}", "")) for k in INFO_KEYS}
    system = flat.get("project.units", "SI")
    if system not in OPTION_KEYS["units"]:
        raise ctx.error("project.units", f"{system!r} must be one of {list(OPTION_KEYS['units'])}")
    paper = flat.get("project.paper", "Letter" if system == "US" else "A4")
    if paper not in OPTION_KEYS["paper"]:
        raise ctx.error("project.paper", f"{paper!r} must be 'A4' or 'Letter'")
    floors = None
    if any(k.startswith("mode.floors.") for k in flat):
        floors = _read_floors(ctx, flat, system)
    inputs: dict[str, InputValue] = {}
    for key, q in input_keys().items():
        if q.name == "modal_mass" and floors is not None:
            if key in flat:
                raise ctx.error(key, "give the modal mass or [mode.floors], not both")
            continue
        if key in flat:
            inputs[q.name] = (_read_choice(ctx, q, key, flat[key]) if q.kind == "choice"
                              else read_number(ctx, q, key, flat[key], system))
        elif q.section in OPTIONAL_TABLES and not any(k.startswith(q.section + ".")
                                                      for k in flat):
            continue                       # an optional table not given: no row, no default
        elif q.name in OPTIONAL_TABLES.get(q.section, ()):
            raise ctx.error(key, f"is missing: a [{q.section}] table needs "
                                 + ", ".join(input_quantity_key(n).split(".", 1)[1]
                                                for n in OPTIONAL_TABLES[q.section]))
        elif q.has_default:
            inputs[q.name] = _default(q, system)
        elif q.required:
            raise ctx.error(key, "is missing (required)")
    for name, message in input_relation_errors({n: iv.si for n, iv in inputs.items()}):
        raise ctx.error(input_quantity_key(name), message)
    simulation = _read_simulation(ctx, flat) if "simulation" in flat else None
    digest = hashlib.sha256(text.encode("utf-8")).hexdigest()
    warnings = tuple(floor_warnings(floors)) if floors is not None else ()
    return Project(source, digest, info, system, paper, inputs, floors, case, lines,
                   simulation, warnings)


def input_quantity_key(name: str) -> str:
    """The project-file key of a design input by glossary name."""
    return next(k for k, q in input_keys().items() if q.name == name)


def load_project(path: str | Path) -> Project:
    """Read and validate a TOML project file.

    Raises
    ------
    ProjectError
        When the file is missing, is not valid TOML (with its line and column) or holds an
        invalid entry (naming the key and its line).
    """
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8-sig")
    except FileNotFoundError:
        raise ProjectError(f"{path}: project file not found") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise ProjectError(f"{path}: cannot read the project file: {exc}") from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise ProjectError(f"{path}: not a valid TOML file: {exc}") from None
    bad = ILLEGAL_TEXT.search(path.name)
    if bad:
        raise ProjectError(f"{path.name!r}: the file name holds the character "
                           f"U+{ord(bad.group()):04X}, which a workbook cell (its Record "
                           "sheet) cannot store; rename the file")
    return parse_project(data, source=path.name, text=text)
