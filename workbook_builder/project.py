# SPDX-License-Identifier: MIT
"""Project files: the TOML format, its CSV table form, and their validation.

A project file describes one damper design case (see ``example_workbooks/*.toml`` for a
commented example)::

    [project]                      # identification, all text, all optional
    number = "P-001"
    title = "Pendulum damper, preliminary design"
    structure = "Invented residential tower"
    calculated_by = "A. Engineer"
    checked_by = ""
    date = "2026-12-01"
    revision = "A"
    units = "SI"                   # unit system for bare numbers: "SI" or "US"
    paper = "A4"                   # "A4" or "Letter"
    notes = "free text"

    [mode]                         # the building mode the damper controls
    frequency = 0.2                # [Hz]
    modal_mass = { value = 9000, unit = "t" }   # any input: a number or {value, unit, note}
    structural_damping = { value = 1.0, unit = "%" }

    [wind]                         # response without damper and the comfort limit (peaks)
    acceleration = { value = 25, unit = "milli-g" }
    acceleration_limit = { value = 15, unit = "milli-g" }

    [damper]
    mass_ratio = 0.02              # or damper_mass = ...; neither: the required mass ratio
    tuning_method = "h2"
    clearance = 1.5                # available peak stroke, one side
    max_swing = 15                 # [deg]
    max_detuning = { value = 1, unit = "%" }

    [simulation]                   # optional: the Nonlinear sheet (time-domain check)
    enabled = true                 # default true when the table is present
    load = "random"                # "random" (wind-like) or "harmonic" (at the mode's frequency)
    duration = 600                 # record length [s], in [60, 3600]
    seed = 1                       # seed of the random record (same seed, same record)
    tolerance = 0.05               # accepted departure nonlinear vs linearised, in (0, 1] [-]
    load_factor = 1.0              # force / force that reproduces the wind input, in (0, 10]

The simulation (``functions.simulation.simulate``) runs the design's pendulum length, with the
exact pendulum equation and linearised, under a force calibrated to the wind input: a random
force (corner frequency at the mode's frequency) whose response without the damper has the
expected peak acceleration ``wind.acceleration`` over 600 s (RMS times Davenport's peak factor,
``functions.damper.peak_factor``), or a harmonic force at the mode's frequency whose steady
response without the damper has that peak; ``load_factor`` scales the force (e.g. 2 for a
storm beyond the design wind). Its results are engine values computed when the workbook is
built.

The modal mass may instead come from floor masses and a power-law mode shape::

    [mode.floors]
    heights = [4, 8, 12]           # floor levels above ground, in `height_unit`
    masses = [900, 900, 700]       # floor masses, in `mass_unit`
    height_unit = "m"
    mass_unit = "t"
    building_height = 12           # h in (z/h)^exponent, in `height_unit`
    exponent = 1.5                 # or structure_type = one of MODE_SHAPE_EXPONENTS
    damper_level = 3               # 1-based index of the floor carrying the damper (default: last)

The table form is a CSV file whose header cells are the dotted keys (``mode.frequency``),
optionally with a unit in brackets (``mode.modal_mass [t]``); each row is one project, named by
its ``case`` column (else ``project.number``); a floor table ([mode.floors]) needs the TOML form;
the [simulation] keys work as columns (``simulation.enabled`` true/false, ``simulation.load``...).
Errors name the file, the line and the key.
"""
from __future__ import annotations

import csv
import difflib
import hashlib
import math
import re
import sys
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Any

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

from .units import DEFAULT_UNITS, SI_UNIT, UNIT_SYSTEMS, Unit, unit_for

__all__ = [
    "ProjectError", "InputSpec", "INPUT_SPECS", "InputValue", "Floors", "Project",
    "load_project", "load_cases", "parse_project", "INFO_KEYS", "TUNING_METHODS",
    "SimulationSettings", "SIMULATION_LOADS",
]


class ProjectError(ValueError):
    """A project file that cannot be read or holds an invalid entry (names key and line)."""


@dataclass(frozen=True)
class InputSpec:
    """Declaration of one numeric input: key, label, symbol, kind, range, default, note."""

    name: str            # engine argument name (DesignInputs field) and defined name
    key: str             # dotted key in the project file
    label: str
    symbol: str
    kind: str            # unit kind, see units.UNITS
    low: float
    high: float
    low_open: bool = False
    high_open: bool = False
    default: float | None = None   # SI value; None: required (or optional, see below)
    optional: bool = False
    note: str = ""

    def interval(self, factor: float = 1.0) -> str:
        """Valid range in a unit with ``factor`` to SI, e.g. ``(0, 20]``."""
        def fmt(x: float) -> str:
            return "inf" if math.isinf(x) else f"{x / factor:.6g}"
        return (f"{'(' if self.low_open else '['}{fmt(self.low)}, {fmt(self.high)}"
                f"{')' if self.high_open else ']'}")

    def contains(self, si: float) -> bool:
        lo_ok = si > self.low if self.low_open else si >= self.low
        hi_ok = si < self.high if self.high_open else si <= self.high
        return lo_ok and hi_ok


INF = math.inf

#: Every numeric input, in the order of the Inputs sheet. Ranges are SI.
INPUT_SPECS: tuple[InputSpec, ...] = (
    InputSpec("frequency", "mode.frequency", "Frequency of the mode", "f_s", "frequency",
              0.0, 20.0, low_open=True,
              note="Modal analysis of the structure; EN 1991-1-4 Annex F (F.2) 46/h as a "
                   "first estimate; confirm by measurement on the finished structure."),
    InputSpec("modal_mass", "mode.modal_mass", "Generalised mass of the mode (mode = 1 at "
              "the damper)", "M*", "mass", 0.0, 1e11, low_open=True,
              note="Modal analysis: sum of m_i phi_i^2 with the mode normalised to 1 at the "
                   "damper level (or from the floor table)."),
    InputSpec("structural_damping", "mode.structural_damping", "Inherent damping of the "
              "structure", "zeta_s", "fraction", 0.0, 0.2, low_open=True,
              note="EN 1991-1-4 Table F.2 log decrement / (2 pi); measured values scatter "
                   "widely, use a cautious value."),
    InputSpec("acceleration", "wind.acceleration", "Peak acceleration without damper", "a",
              "acceleration", 0.0, 10.0, low_open=True,
              note="Wind-tunnel study or code calculation (EN 1991-1-4 Annex B/C) at the "
                   "comfort return period."),
    InputSpec("acceleration_limit", "wind.acceleration_limit", "Accepted peak acceleration",
              "a_lim", "acceleration", 0.0, 10.0, low_open=True,
              note="Comfort criterion agreed for the project (e.g. ISO 10137 Annex D; "
                   "Melbourne & Palmer 1992)."),
    InputSpec("mass_ratio", "damper.mass_ratio", "Mass ratio chosen (optional)", "mu",
              "fraction", 0.0, 0.2, low_open=True, optional=True,
              note="Give the mass ratio or the damper mass, or neither (the required mass "
                   "ratio is used)."),
    InputSpec("damper_mass", "damper.damper_mass", "Damper mass chosen (optional)", "m_d",
              "mass", 0.0, 1e10, low_open=True, optional=True,
              note="Moving mass of the pendulum (without hangers and frame)."),
    InputSpec("clearance", "damper.clearance", "Available peak stroke (one side)", "x_max",
              "length", 0.0, 100.0, low_open=True,
              note="Free travel of the mass to the nearest obstruction or buffer."),
    InputSpec("max_swing_deg", "damper.max_swing", "Accepted swing angle", "theta_max",
              "angle", 0.0, 45.0, low_open=True, default=15.0,
              note="Small-angle period good to about 15 deg (common practice, no source)."),
    InputSpec("max_detuning", "damper.max_detuning", "Accepted detuning at the design swing",
              "|df/f|_max", "fraction", 0.0, 0.2, low_open=True, default=0.01,
              note="Common practice, no source; the damper's tuning tolerance."),
    InputSpec("mass_ratio_min", "damper.mass_ratio_min", "Practical mass ratio, lower end",
              "mu_min", "fraction", 0.0, 0.2, default=0.005,
              note="Common practice, no source."),
    InputSpec("mass_ratio_max", "damper.mass_ratio_max", "Practical mass ratio, upper end",
              "mu_max", "fraction", 0.0, 0.2, low_open=True, default=0.05,
              note="Common practice, no source."),
    InputSpec("g", "site.gravity", "Acceleration of gravity", "g", "acceleration",
              9.7, 9.9, default=9.80665,
              note="Standard gravity 9.80665 m/s^2 (3rd CGPM 1901) unless a local value is "
                   "known."),
)
SPEC_BY_NAME = {s.name: s for s in INPUT_SPECS}
SPEC_BY_KEY = {s.key: s for s in INPUT_SPECS}

#: Text fields of the [project] table (title block and record).
INFO_KEYS = ("number", "title", "structure", "client", "calculated_by", "checked_by", "date",
             "revision", "notes")
_PROJECT_KEYS = set(INFO_KEYS) | {"units", "paper"}
_FLOOR_KEYS = {"heights", "masses", "height_unit", "mass_unit", "building_height", "exponent",
               "structure_type", "damper_level"}
_OTHER_KEYS = {"damper.tuning_method"}


def _tuning_methods() -> tuple[str, ...]:
    try:
        from functions.damper import OPTIMAL_TUNING_METHODS
        return tuple(OPTIMAL_TUNING_METHODS)
    except ImportError:  # pragma: no cover - engine module not installed
        return ("h2",)


TUNING_METHODS = _tuning_methods()


@dataclass(frozen=True)
class InputValue:
    """One input as the project gave it, with its SI value."""

    spec: InputSpec
    value: float        # as entered, in ``unit``
    unit: Unit
    si: float
    note: str
    given: bool         # False: the default was used
    line: int | None


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


#: Load types of the [simulation] table.
SIMULATION_LOADS = ("random", "harmonic")
_SIMULATION_KEYS = {"enabled", "load", "duration", "seed", "tolerance", "load_factor"}


@dataclass(frozen=True)
class SimulationSettings:
    """The [simulation] table: settings of the optional Nonlinear sheet.

    ``duration`` [s] is the record kept after the warm-up; ``tolerance`` [-] the accepted
    relative departure of the nonlinear RMS response from the linearised one; ``load_factor``
    [-] scales the force calibrated to the wind input; ``seed`` [-] fixes the random record.
    """

    enabled: bool = True
    load: str = "random"
    duration: float = 600.0
    seed: int = 1
    tolerance: float = 0.05
    load_factor: float = 1.0


@dataclass(frozen=True)
class Project:
    """A validated project: identification, inputs (SI and as entered), options."""

    source_name: str
    source_sha256: str
    info: dict[str, str]
    units: str
    paper: str
    inputs: dict[str, InputValue]
    tuning_method: str
    floors: Floors | None = None
    case: str = ""
    lines: dict[str, int] = field(default_factory=dict, compare=False, repr=False)
    simulation: SimulationSettings | None = None    # None: no [simulation] table

    @property
    def simulate(self) -> bool:
        """True when the project asks for the Nonlinear sheet."""
        return self.simulation is not None and self.simulation.enabled

    def si(self, name: str) -> float | None:
        """SI value of input ``name`` (None for an optional input not given)."""
        item = self.inputs.get(name)
        return None if item is None else item.si

    def design_kwargs(self, modal_mass: float | None = None) -> dict[str, Any]:
        """Keyword arguments for ``functions.design.DesignInputs`` (SI)."""
        kwargs: dict[str, Any] = {}
        for spec in INPUT_SPECS:
            item = self.inputs.get(spec.name)
            kwargs[spec.name] = None if item is None else item.si
        if modal_mass is not None:
            kwargs["modal_mass"] = modal_mass
        kwargs["tuning_method"] = self.tuning_method
        return kwargs


# --------------------------------------------------------------------------- line finder
_HEADER_RE = re.compile(r"^\s*\[\s*([A-Za-z0-9_.\-\s\"']+?)\s*\]\s*(#.*)?$")
_KEY_RE = re.compile(r"^\s*([A-Za-z0-9_\-\"'.\s]+?)\s*=")


def _key_lines(text: str) -> dict[str, int]:
    """Map each dotted key (``mode.frequency``) to the line (1-based) that sets it."""
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


# --------------------------------------------------------------------------- loading
class _Context:
    def __init__(self, source: str, lines: dict[str, int], row_label: str = ""):
        self.source = source
        self.lines = lines
        self.row_label = row_label

    def where(self, key: str) -> str:
        line = self.lines.get(key)
        if line is None and "." in key:
            line = self.lines.get(key.rsplit(".", 1)[0])
        loc = f"{self.source}:{line}" if line else self.source
        return f"{loc}: {self.row_label}{key}"

    def error(self, key: str, message: str) -> ProjectError:
        return ProjectError(f"{self.where(key)}: {message}")


def _flatten(data: dict, prefix: str = "") -> dict[str, Any]:
    out: dict[str, Any] = {}
    for k, v in data.items():
        key = f"{prefix}{k}"
        if isinstance(v, dict) and not (key in SPEC_BY_KEY or key in ("mode.floors",
                                                                     "simulation")):
            out.update(_flatten(v, key + "."))
        else:
            out[key] = v
    return out


def _is_number(v: Any) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool)


def _check_finite(ctx: _Context, key: str, v: Any, what: str = "value") -> float:
    if not _is_number(v):
        raise ctx.error(key, f"{what} {v!r} must be a number")
    if not math.isfinite(v):
        raise ctx.error(key, f"{what} {v!r} must be a finite number (NaN and inf are refused)")
    return float(v)


def _read_input(ctx: _Context, spec: InputSpec, raw: Any, system: str) -> InputValue:
    key = spec.key
    note = spec.note
    unit_symbol = DEFAULT_UNITS[system][spec.kind]
    if isinstance(raw, dict):
        unknown = set(raw) - {"value", "unit", "note"}
        if unknown:
            raise ctx.error(key, f"unknown field(s) {sorted(unknown)}; an input table takes "
                                 "value, unit and note")
        if "value" not in raw:
            raise ctx.error(key, "the table has no 'value'")
        unit_symbol = raw.get("unit", unit_symbol)
        if "note" in raw:
            if not isinstance(raw["note"], str):
                raise ctx.error(key, f"note {raw['note']!r} must be text")
            note = raw["note"]
        raw = raw["value"]
    value = _check_finite(ctx, key, raw)
    if not isinstance(unit_symbol, str):
        raise ctx.error(key, f"unit {unit_symbol!r} must be text")
    try:
        unit = unit_for(spec.kind, unit_symbol)
    except ValueError as exc:
        raise ctx.error(key, str(exc)) from None
    si = value * unit.factor
    if not spec.contains(si):
        raise ctx.error(key, f"{value:g} {unit.symbol} must be in "
                             f"{spec.interval(unit.factor)} [{unit.symbol}]")
    return InputValue(spec, value, unit, si, note, True, ctx.lines.get(key))


def _read_floors(ctx: _Context, raw: Any, system: str) -> Floors:
    key = "mode.floors"
    if not isinstance(raw, dict):
        raise ctx.error(key, "must be a table ([mode.floors])")
    unknown = set(raw) - _FLOOR_KEYS
    if unknown:
        raise ctx.error(key, f"unknown key(s) {sorted(unknown)}; use {sorted(_FLOOR_KEYS)}")
    units: dict[str, Unit] = {}
    for ukey, kind in (("height_unit", "length"), ("mass_unit", "mass")):
        symbol = raw.get(ukey, DEFAULT_UNITS[system][kind])
        try:
            units[ukey] = unit_for(kind, symbol)
        except ValueError as exc:
            raise ctx.error(f"{key}.{ukey}", str(exc)) from None
    lists = {}
    for lkey in ("heights", "masses"):
        if lkey not in raw:
            raise ctx.error(key, f"'{lkey}' is missing")
        seq = raw[lkey]
        if not isinstance(seq, list) or not seq:
            raise ctx.error(f"{key}.{lkey}", "must be a non-empty list of numbers")
        vals = [_check_finite(ctx, f"{key}.{lkey}", v, f"item {i + 1}")
                for i, v in enumerate(seq)]
        if any(v <= 0 for v in vals):
            raise ctx.error(f"{key}.{lkey}", "every item must be > 0")
        lists[lkey] = tuple(vals)
    if len(lists["heights"]) != len(lists["masses"]):
        raise ctx.error(f"{key}.masses", f"has {len(lists['masses'])} items, heights has "
                                         f"{len(lists['heights'])}")
    if "building_height" not in raw:
        raise ctx.error(key, "'building_height' is missing")
    h = _check_finite(ctx, f"{key}.building_height", raw["building_height"])
    if h <= 0 or max(lists["heights"]) > h:
        raise ctx.error(f"{key}.building_height", f"{h:g} must be > 0 and not below the "
                                                  "highest floor")
    structure_type = raw.get("structure_type")
    if ("exponent" in raw) == (structure_type is not None):
        raise ctx.error(key, "give exactly one of 'exponent' and 'structure_type'")
    if structure_type is not None:
        from functions.structure import MODE_SHAPE_EXPONENTS
        if structure_type not in MODE_SHAPE_EXPONENTS:
            raise ctx.error(f"{key}.structure_type", f"{structure_type!r} is not one of "
                                                     f"{sorted(MODE_SHAPE_EXPONENTS)}")
        exponent = float(MODE_SHAPE_EXPONENTS[structure_type])
    else:
        exponent = _check_finite(ctx, f"{key}.exponent", raw["exponent"])
        if not 0 < exponent <= 5:
            raise ctx.error(f"{key}.exponent", f"{exponent:g} must be in (0, 5] [-]")
    n = len(lists["heights"])
    level = raw.get("damper_level", n)
    if not isinstance(level, int) or isinstance(level, bool) or not 1 <= level <= n:
        raise ctx.error(f"{key}.damper_level", f"{level!r} must be a floor number in [1, {n}]")
    return Floors(lists["heights"], lists["masses"], units["height_unit"], units["mass_unit"],
                  h, exponent, structure_type, level)


def _read_simulation(ctx: _Context, raw: Any) -> SimulationSettings:
    key = "simulation"
    if not isinstance(raw, dict):
        raise ctx.error(key, "must be a table ([simulation])")
    unknown = set(raw) - _SIMULATION_KEYS
    if unknown:
        close = difflib.get_close_matches(sorted(unknown)[0], sorted(_SIMULATION_KEYS), n=1)
        hint = f" (did you mean '{close[0]}'?)" if close else ""
        raise ctx.error(f"{key}.{sorted(unknown)[0]}", f"unknown key{hint}; [simulation] takes "
                                                       f"{sorted(_SIMULATION_KEYS)}")
    out = SimulationSettings()
    values: dict[str, Any] = {}
    enabled = raw.get("enabled", True)
    if not isinstance(enabled, bool):
        raise ctx.error(f"{key}.enabled", f"{enabled!r} must be true or false")
    values["enabled"] = enabled
    load = raw.get("load", out.load)
    if load not in SIMULATION_LOADS:
        raise ctx.error(f"{key}.load", f"{load!r} must be one of {list(SIMULATION_LOADS)}")
    values["load"] = load
    seed = raw.get("seed", out.seed)
    if isinstance(seed, bool) or not isinstance(seed, int) or not 0 <= seed < 2**63:
        raise ctx.error(f"{key}.seed", f"{seed!r} must be an integer in [0, 2^63)")
    values["seed"] = seed
    for name, low, high, low_open, unit in (("duration", 60.0, 3600.0, False, "s"),
                                            ("tolerance", 0.0, 1.0, True, "-"),
                                            ("load_factor", 0.0, 10.0, True, "-")):
        if name not in raw:
            continue
        v = _check_finite(ctx, f"{key}.{name}", raw[name])
        if not ((v > low if low_open else v >= low) and v <= high):
            raise ctx.error(f"{key}.{name}", f"{v:g} must be in {'(' if low_open else '['}"
                                             f"{low:g}, {high:g}] [{unit}]")
        values[name] = v
    return SimulationSettings(**values)


def parse_project(data: dict, *, source: str = "<project>", text: str = "",
                  lines: dict[str, int] | None = None, row_label: str = "",
                  case: str = "") -> Project:
    """Validate a project already read into nested dicts (from TOML or a CSV row).

    Raises
    ------
    ProjectError
        Naming the source, the line (when known) and the key.
    """
    lines = _key_lines(text) if lines is None else lines
    ctx = _Context(source, lines, row_label)
    flat = _flatten(data)
    known = set(SPEC_BY_KEY) | {f"project.{k}" for k in _PROJECT_KEYS} | _OTHER_KEYS | {
        "mode.floors", "simulation"}
    for key in flat:
        if key not in known:
            close = difflib.get_close_matches(key, sorted(known), n=1)
            hint = f" (did you mean '{close[0]}'?)" if close else ""
            raise ctx.error(key, f"unknown key{hint}")
    info: dict[str, str] = {}
    for k in INFO_KEYS:
        v = flat.get(f"project.{k}", "")
        if not isinstance(v, str):
            v = v.isoformat() if hasattr(v, "isoformat") else v
            if not isinstance(v, str):
                raise ctx.error(f"project.{k}", f"{v!r} must be text (in quotes)")
        info[k] = v
    system = flat.get("project.units", "SI")
    if system not in UNIT_SYSTEMS:
        raise ctx.error("project.units", f"{system!r} must be one of {list(UNIT_SYSTEMS)}")
    paper = flat.get("project.paper", "Letter" if system == "US" else "A4")
    if paper not in ("A4", "Letter"):
        raise ctx.error("project.paper", f"{paper!r} must be 'A4' or 'Letter'")
    method = flat.get("damper.tuning_method", "h2")
    if method not in TUNING_METHODS:
        raise ctx.error("damper.tuning_method", f"{method!r} must be one of "
                                                f"{list(TUNING_METHODS)}")
    floors = None
    if "mode.floors" in flat:
        floors = _read_floors(ctx, flat["mode.floors"], system)
    inputs: dict[str, InputValue] = {}
    for spec in INPUT_SPECS:
        if spec.name == "modal_mass" and floors is not None:
            if spec.key in flat:
                raise ctx.error(spec.key, "give the modal mass or [mode.floors], not both")
            continue
        if spec.key in flat:
            inputs[spec.name] = _read_input(ctx, spec, flat[spec.key], system)
        elif spec.default is not None:
            unit = unit_for(spec.kind, SI_UNIT[spec.kind])
            inputs[spec.name] = InputValue(spec, spec.default, unit, spec.default, spec.note,
                                           False, None)
        elif not spec.optional:
            raise ctx.error(spec.key, "is missing (required)")
    if "mass_ratio" in inputs and "damper_mass" in inputs:
        raise ctx.error("damper.damper_mass", "give damper.mass_ratio or damper.damper_mass, "
                                              "not both")
    lo, hi = inputs["mass_ratio_min"], inputs["mass_ratio_max"]
    if lo.si >= hi.si:
        raise ctx.error("damper.mass_ratio_max", f"{hi.si:g} must be above mass_ratio_min "
                                                 f"{lo.si:g}")
    simulation = None
    if "simulation" in flat:
        simulation = _read_simulation(ctx, flat["simulation"])
    digest = hashlib.sha256(text.encode("utf-8")).hexdigest()
    return Project(source, digest, info, system, paper, inputs, method, floors, case, lines,
                   simulation)


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
        text = path.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise ProjectError(f"{path}: project file not found") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise ProjectError(f"{path}: cannot read the project file: {exc}") from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise ProjectError(f"{path}: not a valid TOML file: {exc}") from None
    project = parse_project(data, source=path.name, text=text)
    return project


# --------------------------------------------------------------------------- CSV table form
_HEADER_UNIT_RE = re.compile(r"^\s*([A-Za-z0-9_.]+)\s*(?:\[\s*([^\]]+?)\s*\])?\s*$")


def _csv_value(text: str) -> Any:
    text = text.strip()
    try:
        return int(text)
    except ValueError:
        pass
    try:
        return float(text)
    except ValueError:
        return text


def load_cases(path: str | Path) -> list[Project]:
    """Read a CSV table of cases: one project per row.

    Header cells are dotted keys, optionally with a unit in brackets
    (``mode.modal_mass [t]``); a ``case`` column names the row (used for the output file).
    Empty cells leave the input out (default or not given).

    Raises
    ------
    ProjectError
        Naming the file, the line and the column of the first invalid entry.
    """
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8-sig")
    except FileNotFoundError:
        raise ProjectError(f"{path}: case table not found") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise ProjectError(f"{path}: cannot read the case table: {exc}") from None
    rows = list(csv.reader(text.splitlines()))
    if not rows or not any(c.strip() for c in rows[0]):
        raise ProjectError(f"{path}:1: the case table has no header row")
    columns = []
    for i, cell in enumerate(rows[0]):
        m = _HEADER_UNIT_RE.match(cell)
        if not m:
            raise ProjectError(f"{path}:1: column {i + 1} header {cell!r} must be a dotted key "
                               "with an optional [unit]")
        columns.append((m.group(1), m.group(2)))
    projects = []
    seen: set[str] = set()
    for number, row in enumerate(rows[1:], start=2):
        if not any(c.strip() for c in row):
            continue
        if len(row) > len(columns):
            raise ProjectError(f"{path}:{number}: row has {len(row)} cells, the header has "
                               f"{len(columns)}")
        data: dict[str, Any] = {}
        case = ""
        lines: dict[str, int] = {}
        for (key, unit), cell in zip(columns, row):
            if not cell.strip():
                continue
            lines[key] = number
            if key == "case":
                case = cell.strip()
                continue
            value: Any = _csv_value(cell)
            if key in SPEC_BY_KEY and unit:
                value = {"value": value, "unit": unit}
            elif key.startswith("project.") or key in ("damper.tuning_method",
                                                        "simulation.load"):
                value = cell.strip()
            elif key == "simulation.enabled":
                value = {"true": True, "false": False}.get(cell.strip().lower(), cell.strip())
            parts = key.split(".")
            node = data
            for p in parts[:-1]:
                node = node.setdefault(p, {})
                if not isinstance(node, dict):
                    raise ProjectError(f"{path}:{number}: column {key} conflicts with another")
            node[parts[-1]] = value
        case = case or str(data.get("project", {}).get("number", "")) or f"case_{number - 1}"
        if case in seen:
            raise ProjectError(f"{path}:{number}: case name {case!r} is used twice")
        seen.add(case)
        project = parse_project(data, source=path.name, lines=lines,
                                row_label="column ", case=case)
        digest = hashlib.sha256(",".join(row).encode("utf-8")).hexdigest()
        projects.append(replace(project, source_sha256=digest, case=case, lines=lines))
    if not projects:
        raise ProjectError(f"{path}: the case table has no rows")
    return projects
