# SPDX-License-Identifier: MIT
"""The project-file schema is the engine's declarations: same values accepted, every refusal
naming the file, the line and the key.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import math
import re

import numpy as np
import pytest

from functions.design import DesignInputs
from functions.quantities import DESIGN_INPUTS, SIMULATION_SETTINGS
from workbook_builder.project import ProjectError, load_project
from workbook_builder.project.schema import input_keys, known_keys, schema_table

BASE = {"frequency": 0.2, "modal_mass": 1e7, "structural_damping": 0.01, "acceleration": 0.25,
        "acceleration_limit": 0.15, "clearance": 1.5}
NUMERIC = [q for q in DESIGN_INPUTS if q.kind not in ("choice",)]


def _toml(values: dict) -> str:
    """A project file in SI units holding ``values`` (glossary names), one key per line."""
    tables: dict[str, list[str]] = {}
    for q in DESIGN_INPUTS:
        if q.name in values:
            v = values[q.name]
            text = f'"{v}"' if isinstance(v, str) else repr(v) if isinstance(v, int) \
                else repr(float(v))
            tables.setdefault(q.section, []).append(f"{q.key or q.name} = {text}")
    return "".join(f"[{t}]\n" + "\n".join(lines) + "\n\n" for t, lines in tables.items())


def _candidates(q) -> list[float]:
    """Both ends, the next double on either side of each, a middle value and far outside."""
    out = []
    for end in (q.low, q.high):
        if math.isfinite(end):
            out += [end, float(np.nextafter(end, -np.inf)), float(np.nextafter(end, np.inf))]
    mid = q.default if q.has_default else (q.low + q.high) / 2
    if q.kind == "count":             # whole numbers: the ends and next to them, as integers
        return [int(q.low), int(q.low) - 1, int(q.high), int(q.high) + 1, int(mid), 2.5, -1]
    return out + [mid, -1.0, 0.0, 1e30]


def _case(q, v) -> dict:
    values = dict(BASE)
    if q.name == "mass_ratio_min":
        values["mass_ratio_max"] = 0.2           # keep the pair ordered, test one end only
    if q.name == "mass_ratio_max":
        values["mass_ratio_min"] = 0.0
    # the companions a table needs, at values that keep the pair valid (the band contains 1)
    values.update({"band_lower": {"band_upper": 1.5}, "band_upper": {"band_lower": 0.5},
                   "response_exponent": {"band_lower": 0.9, "band_upper": 1.1},
                   "measured_damping": {"measured_frequency": 0.2}}.get(q.name, {}))
    second = {"frequency_2": 0.25, "modal_mass_2": 9e6, "structural_damping_2": 0.01,
              "acceleration_2": 0.2, "acceleration_limit_2": 0.15}
    if q.name in second or q.name == "extreme_acceleration_2":
        values.update(second, extreme_acceleration=10.0, extreme_acceleration_2=10.0)
    supply = {"hanger_count": 4, "hanger_safety_factor": 3.0, "hanger_axial_stiffness": 2e8,
              "block_length_1": 3.0, "block_length_2": 3.0, "available_height": 20.0,
              "buffer_stiffness": 1e6}
    if q.section == "supply":
        values.update(supply, extreme_acceleration=10.0)
    values[q.name] = v
    return values


@pytest.mark.parametrize("q", NUMERIC, ids=lambda q: q.name)
def test_project_file_and_engine_accept_exactly_the_same_values(q, tmp_path):
    checked = 0
    for v in _candidates(q):
        values = _case(q, v)
        try:
            DesignInputs(**values)
            engine_ok = True
        except ValueError:
            engine_ok = False
        path = tmp_path / "p.toml"
        text = _toml(values)
        path.write_text(text, encoding="utf-8")
        try:
            load_project(path)
            file_ok = True
        except ProjectError as exc:
            file_ok = False
            lines = text.splitlines()
            table = lines.index(f"[{q.section}]")     # the key's line in its own table
            line = next(i for i, t in enumerate(lines, 1)
                        if i > table and t.startswith(f"{q.key or q.name} ="))
            keys = {q.file_key, "damper.mass_ratio_max"} if q.name == "mass_ratio_min" \
                else {q.file_key}        # the order of the practical range names the upper end
            m = re.match(r"p\.toml:(\d+): ([\w.]+): ", str(exc))
            assert m and m.group(2) in keys, str(exc)
            if m.group(2) == q.file_key:
                assert int(m.group(1)) == line, str(exc)
        assert file_ok == engine_ok, (q.name, v, file_ok, engine_ok)
        checked += 1
    assert checked >= 6


@pytest.mark.parametrize("q", [q for q in SIMULATION_SETTINGS if q.kind not in ("flag",
                                                                               "choice")],
                         ids=lambda q: q.name)
def test_simulation_settings_accept_what_their_declaration_accepts(q, tmp_path):
    for v in _candidates(q):
        if q.kind == "count":
            if v != int(v) or abs(v) > 2 ** 64:
                continue
            v = int(v)
        try:
            q.validate(v)
            declared_ok = True
        except ValueError:
            declared_ok = False
        path = tmp_path / "s.toml"
        path.write_text(_toml(BASE) + f"[simulation]\n{q.name} = {v!r}\n", encoding="utf-8")
        try:
            load_project(path)
            file_ok = True
        except ProjectError as exc:
            file_ok = False
            assert re.match(rf"s\.toml:\d+: simulation\.{q.name}: ", str(exc)), str(exc)
        assert file_ok == declared_ok, (q.name, v)


def _tables(values: dict) -> dict[str, list[str]]:
    tables: dict[str, list[str]] = {}
    for line in _toml(values).splitlines():
        if line.startswith("["):
            current = tables.setdefault(line.strip("[]"), [])
        elif line:
            current.append(line)
    return tables


#: (table, lines put into it, keys taken out of the base project, key the refusal names)
BAD = [
    ("mode", ["frequncy = 0.2"], ["frequency"], "mode.frequncy"),
    ("mode", ['frequency = "fast"'], ["frequency"], "mode.frequency"),
    ("mode", ['frequency = { value = 0.2, unit = "rpm" }'], ["frequency"], "mode.frequency"),
    ("mode", ["frequency = { valu = 0.2 }"], ["frequency"], "mode.frequency"),
    ("mode", ["frequency = nan"], ["frequency"], "mode.frequency"),
    ("mode", [], ["modal_mass"], "mode.modal_mass"),         # missing: its table's line
    ("damper", ["mass_ratio_min = 0.04", "mass_ratio_max = 0.03"], [], "damper.mass_ratio_max"),
    ("damper", ['tuning_method = "fastest"'], [], "damper.tuning_method"),
    ("project", ['units = "metric"'], [], "project.units"),
    ("project", ["title = 3"], [], "project.title"),
    ("simulation", ["load = 3"], [], "simulation.load"),
    ("mode.floors", ["heights = [1]"], ["modal_mass"], "mode.floors"),
    ("mode.floors", ["heights = [10, 20]", "masses = [1e3, 1e3]", "building_height = 20",
                     "exponent = 1", "damper_level = 3"], ["modal_mass"],
     "mode.floors.damper_level"),
]


@pytest.mark.parametrize("table, lines, drop, key", BAD, ids=[b[-1] for b in BAD])
def test_every_refusal_names_file_line_and_key(table, lines, drop, key, tmp_path):
    tables = _tables({k: v for k, v in BASE.items() if k not in drop})
    tables.setdefault(table, []).extend(lines)
    text = "".join(f"[{t}]\n" + "\n".join(ls) + "\n\n" for t, ls in tables.items())
    path = tmp_path / "bad.toml"
    path.write_text(text, encoding="utf-8")
    with pytest.raises(ProjectError) as info:
        load_project(path)
    m = re.match(r"bad\.toml:(\d+): ([\w.]+): ", str(info.value))
    assert m, str(info.value)
    assert m.group(2) == key
    line = text.splitlines()[int(m.group(1)) - 1]
    # the line names the key itself, or the table the key belongs in
    assert line.split("=")[0].strip() == key.split(".")[-1] or line == f"[{table}]" or \
        line == f"[{key.rsplit('.', 1)[0]}]", (line, str(info.value))


def test_schema_is_derived_from_the_declarations():
    assert set(input_keys()) == {q.file_key for q in DESIGN_INPUTS}
    assert "damper.max_swing" in known_keys() and "site.gravity" in known_keys()
    table = schema_table()
    for q in DESIGN_INPUTS + SIMULATION_SETTINGS:
        assert f"`{q.file_key}`" in table
