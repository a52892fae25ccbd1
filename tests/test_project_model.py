# SPDX-License-Identifier: MIT
"""A validated project: floor table, engine arguments, [simulation] settings as stored text.

Reference for the floor table: a uniform mass per height m over a height h with the mode
shape (z/h)^k (EN 1991-1-4:2005 Annex F, (F.3)) has the generalised mass
M* = integral_0^h m (z/h)^(2k) dz = m h / (2k + 1) (calculus). N equal floors at z_i = i h / N
give the right Riemann sum of that integral, larger by (2k + 1) / (2N) relative to leading
order (Euler-Maclaurin: f(1)/(2N) for f(x) = x^(2k), f(0) = 0); the tolerances below follow
from that. Unit factors: 1 ft = 0.3048 m and 1 kip (as a mass) = 1000 lb = 453.59237 kg, exact
(NIST SP 811 (2008), App. B); 1 t = 1000 kg (SI Brochure).
"""
from __future__ import annotations

import dataclasses
import json
import tomllib

import pytest

from functions.design import DesignInputs
from functions.quantities import DESIGN_INPUTS, SIMULATION_SETTINGS
from workbook_builder.project import ProjectError, load_project, parse_project
from workbook_builder.project.model import (Floors, SimulationSettings, settings_from_text,
                                            settings_text)
from workbook_builder.project.units import UNITS

from workbook_cases import MINIMAL


def _floors(n, total_mass, height, k, units=("m", "t"), damper=None):
    """N equal floors of a uniform building, as entered in ``units`` (height, mass)."""
    h_unit, m_unit = UNITS["length"][units[0]], UNITS["mass"][units[1]]
    return Floors(tuple(height * i / n for i in range(1, n + 1)), (total_mass / n,) * n,
                  h_unit, m_unit, height, k, None, damper or n)


@pytest.mark.parametrize("k", [0.6, 1.0, 1.5, 2.0])
@pytest.mark.parametrize("units, factor", [(("m", "t"), 1000.0), (("ft", "kip"), 453.59237)])
def test_many_equal_floors_approach_the_closed_form_modal_mass(k, units, factor):
    total = 50000.0                                     # in the mass unit entered
    closed = total * factor / (2 * k + 1)               # m h / (2k + 1) [kg]
    errors = {}
    for n in (400, 800):
        got = _floors(n, total, 300.0, k, units).modal_mass()
        errors[n] = got / closed - 1
        # leading Euler-Maclaurin term; the next, k (2k+1) / (6 N^2), is below 2 % of it
        assert errors[n] == pytest.approx((2 * k + 1) / (2 * n), rel=0.02), (k, n)
    assert errors[800] / errors[400] == pytest.approx(0.5, rel=0.01)   # first order in 1/N


def test_a_lower_damper_scales_the_modal_mass_by_its_mode_ordinate():
    """M* normalised to 1 at floor j is the top-normalised M* / phi_j^2 (exactly)."""
    top = _floors(40, 8000.0, 160.0, 1.5).modal_mass()
    mid = _floors(40, 8000.0, 160.0, 1.5, damper=20).modal_mass()
    assert mid == pytest.approx(top / (20 / 40) ** 3, rel=1e-14)


def test_floor_table_in_us_units_converts_with_exact_factors():
    fl = _floors(3, 3000.0, 120.0, 1.0, units=("ft", "kip"))
    assert fl.heights_si == pytest.approx([12.192, 24.384, 36.576], rel=1e-15)
    assert fl.masses_si == pytest.approx([453592.37] * 3, rel=1e-15)
    assert fl.building_height_si == pytest.approx(36.576, rel=1e-15)
    # phi = 1/3, 2/3, 1: M* = m (1/9 + 4/9 + 1) = 14/9 m (the engine's docstring example)
    assert fl.modal_mass() == pytest.approx(453592.37 * 14 / 9, rel=1e-14)


def _project(**damper):
    raw = tomllib.loads(MINIMAL)
    raw["damper"].update(damper)
    return raw


def test_design_kwargs_are_si_and_complete(tmp_path):
    p = load_project(_write(tmp_path, MINIMAL))
    kw = p.design_kwargs()
    assert kw["modal_mass"] == 1e7 and kw["mass_ratio"] == 0.02 and kw["damper_mass"] is None
    assert kw["tuning_method"] == "h2"
    assert set(kw) == {q.name for q in DESIGN_INPUTS}


def test_design_kwargs_of_a_floor_table_take_its_modal_mass():
    raw = _project()
    del raw["mode"]["modal_mass"]
    raw["mode"]["structural_damping"] = {"value": 1.2, "unit": "%"}
    raw["mode"]["floors"] = {"heights": [40.0, 80.0, 120.0], "masses": [3000.0] * 3,
                             "height_unit": "ft", "mass_unit": "kip",
                             "building_height": 120.0, "exponent": 1.0}
    p = parse_project(raw, source="f.toml")
    kw = p.design_kwargs()
    assert "modal_mass" not in p.inputs and p.si("modal_mass") is None
    assert kw["modal_mass"] == p.modal_mass() == p.floors.modal_mass()
    assert kw["modal_mass"] == pytest.approx(3000 * 453.59237 * 14 / 9, rel=1e-14)
    assert kw["structural_damping"] == pytest.approx(0.012, rel=1e-15)
    assert DesignInputs(**kw).modal_mass == kw["modal_mass"]     # the engine takes them


def _write(tmp_path, text):
    path = tmp_path / "p.toml"
    path.write_text(text, encoding="utf-8")
    return path


def test_where_names_source_line_case_and_key(tmp_path):
    p = load_project(_write(tmp_path, MINIMAL))
    assert p.where("frequency") == "p.toml:7: mode.frequency"          # line 7 of MINIMAL
    assert p.where("g") == "p.toml: site.gravity"                      # a default: no line
    cased = dataclasses.replace(p, case="tower B")
    assert cased.where("clearance") == "p.toml:17: tower B: damper.clearance"


def test_project_properties():
    p = parse_project(_project(tuning_method="hinf"), source="p.toml")
    assert p.tuning_method == "hinf" and p.si("damper_mass") is None
    assert p.simulation is None and not p.simulate
    raw = _project()
    raw["simulation"] = {"enabled": False}
    off = parse_project(raw, source="p.toml")
    assert off.simulation == SimulationSettings(enabled=False) and not off.simulate
    raw["simulation"] = {}
    assert parse_project(raw, source="p.toml").simulate      # an empty table asks for it
    assert issubclass(ProjectError, ValueError)


def test_simulation_settings_defaults_are_the_declarations():
    declared = {q.name: q.default for q in SIMULATION_SETTINGS}
    assert dataclasses.asdict(SimulationSettings()) == declared
    assert declared == {"enabled": True, "load": "random", "duration": 600.0, "seed": 1,
                        "tolerance": 0.05, "load_factor": 1.0, "level": "extreme"}


@pytest.mark.parametrize("settings", [
    SimulationSettings(),
    SimulationSettings(enabled=False, load="harmonic", duration=120.0, seed=7, tolerance=0.1,
                       load_factor=4.0),
    SimulationSettings(seed=2 ** 62, duration=3600.0),
])
def test_settings_text_round_trip(settings):
    text = settings_text(settings)
    assert json.loads(text) == dataclasses.asdict(settings)
    assert list(json.loads(text)) == sorted(json.loads(text))        # stable text
    assert not text.startswith("=")
    back = settings_from_text(text)
    assert back == settings and type(back.seed) is int and type(back.duration) is float


def test_the_largest_seed_a_project_accepts_round_trips():
    raw = tomllib.loads(MINIMAL)
    raw["simulation"] = {"seed": 2 ** 63 - 1}
    settings = parse_project(raw, source="seed.toml").simulation
    assert settings.seed == 2 ** 63 - 1                  # the reader accepts it
    assert settings_from_text(settings_text(settings)) == settings


def test_settings_text_may_leave_out_defaults():
    assert settings_from_text('{"load": "harmonic"}') == SimulationSettings(load="harmonic")
    assert settings_from_text("{}") == SimulationSettings()


@pytest.mark.parametrize("text, match", [
    ("not json", r"settings 'not json' are not JSON"),
    ('{"loud": 1}', r"are not a \[simulation\] table"),
    ('{"duration": -5}', r"duration=-5\.0? must be in \[60, 3600\]"),
])
def test_simulation_settings_text_refuses(text, match):
    with pytest.raises(ValueError, match=match):
        settings_from_text(text)


@pytest.mark.parametrize("text, match", [
    ("[1, 2]", r"are not a \[simulation\] table"),
    ('{"load": "gust"}', r"load='gust' must be one of random, harmonic"),
    ('{"enabled": "yes"}', r"enabled='yes' must be true or false"),
    ('{"seed": 1.5}', r"seed=1\.5 must be a whole number in \[0, 9223372036854775808\)"),
    ('{"tolerance": 0}', r"tolerance=0\.?0? must be in \(0, 1\]"),
    ('{"load_factor": 11}', r"load_factor=11\.?0? must be in \(0, 10\]"),
])
def test_settings_text_refuses_values_outside_their_declaration(text, match):
    with pytest.raises(ValueError, match=match):
        settings_from_text(text)
