# SPDX-License-Identifier: MIT
"""Project files (TOML): reading, defaults, units, floor table, [simulation], every refusal.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import math
from pathlib import Path

import pytest

from workbook_builder.project import ProjectError, load_project, parse_project
from workbook_builder.project.model import SimulationSettings
from workbook_builder.project.reader import key_lines

EXAMPLES = Path(__file__).resolve().parent.parent / "example_workbooks"

MINIMAL = """\
[project]
number = "T-1"
title = "Test"

[mode]
frequency = 0.2
modal_mass = { value = 10000, unit = "t" }
structural_damping = 0.01

[wind]
acceleration = 0.25
acceleration_limit = 0.15

[damper]
mass_ratio = 0.02
clearance = 1.5
"""


def write(tmp_path: Path, text: str, name: str = "p.toml") -> Path:
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def test_minimal_project_reads_units_and_defaults(tmp_path):
    p = load_project(write(tmp_path, MINIMAL))
    assert p.si("modal_mass") == 10000 * 1000.0
    assert p.inputs["modal_mass"].value == 10000 and p.inputs["modal_mass"].unit.symbol == "t"
    assert p.inputs["modal_mass"].line == 7
    assert p.si("max_swing_deg") == 15.0 and not p.inputs["max_swing_deg"].given
    assert p.si("g") == 9.80665
    assert p.si("damper_mass") is None
    assert p.tuning_method == "h2" and p.units == "SI" and p.paper == "A4"
    assert p.info["number"] == "T-1"
    assert len(p.source_sha256) == 64


def test_us_project_reads_bare_numbers_in_us_units(tmp_path):
    text = MINIMAL.replace('[project]\n', '[project]\nunits = "US"\n').replace(
        "clearance = 1.5", "clearance = 5")
    p = load_project(write(tmp_path, text))
    assert p.inputs["clearance"].unit.symbol == "ft"
    assert p.si("clearance") == pytest.approx(5 * 0.3048, rel=1e-15)
    assert p.si("acceleration") == pytest.approx(0.25 * 0.3048, rel=1e-15)   # ft/s^2
    assert p.paper == "Letter"


@pytest.mark.parametrize("name", ["residential_tower", "observation_mast", "office_tower_us"])
def test_examples_load(name):
    p = load_project(EXAMPLES / f"{name}.toml")
    assert p.info["number"].startswith("EX-")


def test_text_starting_with_equals_is_kept_as_text(tmp_path):
    text = MINIMAL.replace('title = "Test"', 'title = "=HYPERLINK(\\"x\\")"')
    p = load_project(write(tmp_path, text))
    assert p.info["title"] == '=HYPERLINK("x")'


# ----------------------------------------------------------------------------- errors
def test_missing_file(tmp_path):
    with pytest.raises(ProjectError, match=r"nothere\.toml: project file not found"):
        load_project(tmp_path / "nothere.toml")


def test_malformed_toml_names_the_line(tmp_path):
    text = MINIMAL.replace("frequency = 0.2", "frequency = = 0.2")
    with pytest.raises(ProjectError, match=r"p\.toml: not a valid TOML file: .*line 6"):
        load_project(write(tmp_path, text))


def test_unknown_key_names_line_and_suggests(tmp_path):
    text = MINIMAL.replace("frequency = 0.2", "frequncy = 0.2")
    with pytest.raises(ProjectError, match=r"p\.toml:6: mode\.frequncy: unknown key "
                                           r"\(did you mean 'mode\.frequency'\?\)"):
        load_project(write(tmp_path, text))


def test_out_of_range_names_key_line_and_range_in_the_unit(tmp_path):
    text = MINIMAL.replace('modal_mass = { value = 10000, unit = "t" }',
                           'modal_mass = { value = -5, unit = "t" }')
    with pytest.raises(ProjectError, match=r"p\.toml:7: mode\.modal_mass: -5 t must be in "
                                           r"\(0, 1e\+08\] \[t\]"):
        load_project(write(tmp_path, text))


@pytest.mark.parametrize("literal", ["nan", "inf", "-inf"])
def test_nan_and_inf_are_refused(tmp_path, literal):
    text = MINIMAL.replace("acceleration = 0.25", f"acceleration = {literal}")
    with pytest.raises(ProjectError, match=r"p\.toml:11: wind\.acceleration: value .* must be "
                                           r"a finite number \(NaN and inf are refused\)"):
        load_project(write(tmp_path, text))


def test_text_instead_of_number(tmp_path):
    text = MINIMAL.replace("structural_damping = 0.01", 'structural_damping = "1 %"')
    with pytest.raises(ProjectError, match=r"p\.toml:8: mode\.structural_damping: value '1 %' "
                                           r"must be a number"):
        load_project(write(tmp_path, text))


def test_bad_unit_names_the_key(tmp_path):
    text = MINIMAL.replace("clearance = 1.5", 'clearance = { value = 1.5, unit = "yd" }')
    with pytest.raises(ProjectError, match=r"p\.toml:16: damper\.clearance: unit 'yd' is not a "
                                           r"length unit"):
        load_project(write(tmp_path, text))


def test_missing_required_input(tmp_path):
    text = MINIMAL.replace("acceleration_limit = 0.15\n", "")
    with pytest.raises(ProjectError, match=r"wind\.acceleration_limit: is missing \(required\)"):
        load_project(write(tmp_path, text))


def test_mass_ratio_and_damper_mass_together(tmp_path):
    text = MINIMAL.replace("mass_ratio = 0.02", "mass_ratio = 0.02\ndamper_mass = 1000")
    with pytest.raises(ProjectError, match=r"p\.toml:16: damper\.damper_mass: damper_mass="
                                           r"1000\.0 and mass_ratio=0\.02: give at most one"):
        load_project(write(tmp_path, text))


def test_unknown_tuning_method(tmp_path):
    text = MINIMAL.replace("mass_ratio = 0.02", 'mass_ratio = 0.02\ntuning_method = "best"')
    with pytest.raises(ProjectError, match=r"p\.toml:16: damper\.tuning_method: 'best' must be "
                                           r"one of"):
        load_project(write(tmp_path, text))


def test_unknown_unit_system(tmp_path):
    text = MINIMAL.replace('[project]\n', '[project]\nunits = "imperial"\n')
    with pytest.raises(ProjectError, match=r"p\.toml:2: project\.units: 'imperial' must be one "
                                           r"of \['SI', 'US'\]"):
        load_project(write(tmp_path, text))


def test_unknown_field_in_input_table(tmp_path):
    text = MINIMAL.replace('unit = "t" }', 'unit = "t", units = "t" }')
    with pytest.raises(ProjectError, match=r"p\.toml:7: mode\.modal_mass: unknown field"):
        load_project(write(tmp_path, text))


def test_practical_range_must_be_ordered(tmp_path):
    text = MINIMAL + "mass_ratio_min = 0.05\nmass_ratio_max = 0.01\n"
    with pytest.raises(ProjectError, match=r"p\.toml:18: damper\.mass_ratio_max: "
                                           r"mass_ratio_max=0\.01 must be above "
                                           r"mass_ratio_min=0\.05"):
        load_project(write(tmp_path, text))


# ----------------------------------------------------------------------------- floors
FLOORS = MINIMAL.replace('modal_mass = { value = 10000, unit = "t" }\n', "") + """
[mode.floors]
heights = [10, 20, 30]
masses = [500, 500, 400]
height_unit = "m"
mass_unit = "t"
building_height = 30
exponent = 1.5
"""


def test_floor_table(tmp_path):
    p = load_project(write(tmp_path, FLOORS))
    assert "modal_mass" not in p.inputs
    assert p.floors.masses_si == [500e3, 500e3, 400e3]
    assert p.floors.damper_level == 3 and p.floors.exponent == 1.5


def test_floor_table_and_modal_mass_together(tmp_path):
    text = FLOORS.replace("structural_damping = 0.01",
                          "structural_damping = 0.01\nmodal_mass = 1e6")
    with pytest.raises(ProjectError, match=r"mode\.modal_mass: give the modal mass or "
                                           r"\[mode\.floors\], not both"):
        load_project(write(tmp_path, text))


@pytest.mark.parametrize("old, new, message", [
    ("masses = [500, 500, 400]", "masses = [500, 500]", r"mode\.floors\.masses: has 2 items, "
                                                        r"heights has 3"),
    ("building_height = 30", "building_height = 20", r"mode\.floors\.building_height: must "
                                                     r"not be below the highest floor"),
    ("building_height = 30", "building_height = -30", r"mode\.floors\.building_height: -30 m "
                                                      r"must be in \(0, 1000\] \[m\]"),
    ("masses = [500, 500, 400]", "masses = [5e8, 5e8, 4e8]", r"mode\.floors: the modal mass of "
     r"the floor table, \d\.\d+e\+11 kg, must be in \(0, 1e\+11\] \[kg\] like the "
     r"modal_mass input"),
    ("exponent = 1.5", "exponent = 6", r"mode\.floors\.exponent: 6 must be in \(0, 5\] \[-\]"),
    ("exponent = 1.5", "exponent = 1.5\nstructure_type = \"x\"",
     r"mode\.floors: give exactly one of 'exponent' and 'structure_type'"),
    ("exponent = 1.5", "exponent = 1.5\ndamper_level = 4",
     r"mode\.floors\.damper_level: 4 must be a floor number in \[1, 3\]"),
    ("heights = [10, 20, 30]", "heights = [10, nan, 30]",
     r"mode\.floors\.heights: item 2 nan must be a finite number"),
])
def test_floor_table_errors(tmp_path, old, new, message):
    with pytest.raises(ProjectError, match=message):
        load_project(write(tmp_path, FLOORS.replace(old, new)))


def test_parse_project_from_dicts():
    data = {"mode": {"frequency": 0.2, "modal_mass": 1e6, "structural_damping": 0.01},
            "wind": {"acceleration": 0.2, "acceleration_limit": 0.1},
            "damper": {"clearance": 1.0}}
    p = parse_project(data, source="dict")
    assert p.si("frequency") == 0.2 and math.isclose(p.si("g"), 9.80665)


def test_simulation_table_defaults_and_values(tmp_path):
    assert load_project(write(tmp_path, MINIMAL)).simulation is None
    assert not load_project(write(tmp_path, MINIMAL)).simulate
    p = load_project(write(tmp_path, MINIMAL + "\n[simulation]\n"))
    assert p.simulation == SimulationSettings() and p.simulate
    assert (p.simulation.load, p.simulation.duration, p.simulation.seed,
            p.simulation.tolerance, p.simulation.load_factor) == ("random", 600.0, 1, 0.05, 1.0)
    p = load_project(write(tmp_path, MINIMAL + '\n[simulation]\nenabled = false\nload = '
                                               '"harmonic"\nduration = 120\nseed = 7\n'
                                               'tolerance = 0.1\nload_factor = 2.5\n'))
    assert not p.simulate
    assert p.simulation == SimulationSettings(False, "harmonic", 120.0, 7, 0.1, 2.5)
    assert type(p.simulation.seed) is int


def test_examples_switch_the_simulation():
    assert load_project(EXAMPLES / "residential_tower.toml").simulate
    assert not load_project(EXAMPLES / "observation_mast.toml").simulate
    assert load_project(EXAMPLES / "office_tower_us.toml").simulation is None


@pytest.mark.parametrize("line, message", [
    ('lode = "random"', r"p\.toml:19: simulation\.lode: unknown key \(did you mean "
                        r"'simulation\.load'\?\)"),
    ('load = "wind"', r"p\.toml:19: simulation\.load: 'wind' must be one of "
                      r"\['random', 'harmonic'\]"),
    ("duration = 30", r"p\.toml:19: simulation\.duration: 30 s must be in \[60, 3600\] "
                      r"\[s\]"),
    ("duration = nan", r"simulation\.duration: value nan must be a finite number"),
    ("tolerance = 0", r"p\.toml:19: simulation\.tolerance: 0 must be in \(0, 1\] \[-\]"),
    ("load_factor = 11", r"simulation\.load_factor: 11 must be in \(0, 10\] \[-\]"),
    ("seed = -1", r"p\.toml:19: simulation\.seed: -1 must be in "
                  r"\[0, 9223372036854775808\) \[-\]"),
    ("seed = 1.5", r"simulation\.seed: 1\.5 must be a whole number"),
    ('enabled = "yes"', r"p\.toml:19: simulation\.enabled: 'yes' must be true or false"),
])
def test_simulation_errors_name_key_and_line(tmp_path, line, message):
    with pytest.raises(ProjectError, match=message):
        load_project(write(tmp_path, MINIMAL + f"\n[simulation]\n{line}\n"))


def test_key_lines_of_tables_and_keys():
    lines = key_lines(MINIMAL)
    assert lines["project"] == 1 and lines["mode.frequency"] == 6 and lines["damper"] == 14


def test_a_byte_order_mark_is_accepted(tmp_path):
    path = tmp_path / "bom.toml"
    path.write_bytes("\ufeff".encode("utf-8") + MINIMAL.encode("utf-8"))
    assert load_project(path).si("frequency") == 0.2


def test_a_huge_integer_is_refused_with_the_key(tmp_path):
    text = MINIMAL.replace("modal_mass = { value = 10000, unit = \"t\" }",
                           "modal_mass = 1" + "0" * 400)
    with pytest.raises(ProjectError, match=r"p\.toml:7: mode\.modal_mass: value 1000+ is too "
                                           r"large for a number"):
        load_project(write(tmp_path, text))


# ----------------------------------------------------------------------------- hostile texts
@pytest.mark.parametrize("key, line", [("structure", 4), ("client", 4), ("notes", 4)])
def test_text_longer_than_a_cell_is_refused_not_cut(tmp_path, key, line):
    text = MINIMAL.replace('title = "Test"\n', f'title = "Test"\n{key} = "{"x" * 32768}"\n')
    with pytest.raises(ProjectError, match=rf"p\.toml:{line}: project\.{key}: is 32768 "
                                           r"characters long; a cell holds at most 32767"):
        load_project(write(tmp_path, text))
    ok = MINIMAL.replace('title = "Test"\n', f'title = "Test"\n{key} = "{"x" * 32767}"\n')
    assert load_project(write(tmp_path, ok)).info[key] == "x" * 32767


@pytest.mark.parametrize("char", ["\\u0007", "\\u001b", "\\ufffe", "\\uffff"])
def test_characters_a_cell_cannot_hold_are_refused(tmp_path, char):
    text = MINIMAL.replace('title = "Test"\n', f'title = "Test"\nstructure = "a{char}b"\n')
    with pytest.raises(ProjectError, match=r"p\.toml:4: project\.structure: holds the "
                                           r"character U\+"):
        load_project(write(tmp_path, text))
    note = MINIMAL.replace("clearance = 1.5", f'clearance = {{ value = 1.5, note = "n{char}" }}')
    with pytest.raises(ProjectError, match=r"damper\.clearance\.note: holds the character"):
        load_project(write(tmp_path, note))


def test_a_file_name_a_cell_cannot_hold_is_refused(tmp_path):
    path = tmp_path / "bad\x07name.toml"
    path.write_text(MINIMAL, encoding="utf-8")
    with pytest.raises(ProjectError, match=r"the file name holds the character U\+0007"):
        load_project(path)


def test_a_damper_where_the_mode_hardly_moves_is_warned_about(tmp_path):
    # (z/h)^k at the damper's floor: (10/30)^1.5 = 0.19 of the top floor's ordinate
    low = FLOORS.replace("exponent = 1.5", "exponent = 1.5\ndamper_level = 1")
    p = load_project(write(tmp_path, low))
    assert len(p.warnings) == 1 and "moves only 19% as much" in p.warnings[0]
    assert load_project(write(tmp_path, FLOORS)).warnings == ()


def test_us_project_defaults_gravity_in_feet_with_the_exact_si_value():
    """With units = "US" the default g is shown in ft/s^2: 9.80665 / 0.3048 ft/s^2, whose
    conversion back is exactly standard gravity (3rd CGPM 1901; 1 ft = 0.3048 m exact, NIST
    SP 811 (2008), App. B). Our own rule for the display: common practice, no source."""
    us = load_project(EXAMPLES / "office_tower_us.toml").inputs["g"]
    assert (us.unit.symbol, us.si, us.given) == ("ft/s^2", 9.80665, False)
    assert us.value * 0.3048 == 9.80665 and us.value == pytest.approx(32.174049, rel=1e-7)
    si = load_project(EXAMPLES / "residential_tower.toml").inputs["g"]
    assert (si.unit.symbol, si.value, si.si) == ("m/s^2", 9.80665, 9.80665)


# ----------------------------------------------------------------------------- design envelope
SECOND = """
[direction_2]
frequency = 0.25
modal_mass = { value = 9000, unit = "t" }
structural_damping = 0.01
acceleration = 0.2
acceleration_limit = 0.15
"""


@pytest.mark.parametrize("extra, key, words", [
    ("\n[band]\nlower = 1.05\nupper = 1.2\n", "band.lower",
     r"1\.05 must be in \[0\.5, 1\]"),                       # the band excludes the nominal 1
    ("\n[band]\nupper = 1.2\n", "band.lower", "is missing: a \\[band\\] table needs lower, upper"),
    ("\n[as_built]\ndamping = 0.01\n", "as_built.frequency", "is missing"),
    (SECOND.replace("modal_mass = { value = 9000, unit = \"t\" }\n", ""),
     "direction_2.modal_mass", "is missing"),
    (SECOND.replace("frequency = 0.25", "frequency = 0.15"), "direction_2.frequency", None),
    ("\n[band]\nlower = 0.9\nupper = 1.1\nrespons_exponent = 1\n", "band.respons_exponent",
     "unknown key \\(did you mean 'band.response_exponent'"),
])
def test_envelope_tables_refuse_bad_inputs_naming_the_key(tmp_path, extra, key, words):
    """Each refusal names the file, the line and the key (our own rule)."""
    path = write(tmp_path, MINIMAL + extra)
    if words is None:      # a second direction below the first: refused by the engine
        project = load_project(path)
        from workbook_builder.compute import run_design
        with pytest.raises(ValueError, match="frequency_2=0.15 Hz needs a damper frequency .*"
                                             "spring_stiffness_2 would be negative"):
            run_design(project)
        return
    with pytest.raises(ProjectError, match=rf"p\.toml:\d+: {key}: .*{words}"):
        load_project(path)


def test_an_extreme_level_below_the_service_level_is_refused(tmp_path):
    text = MINIMAL.replace("acceleration = 0.25", "acceleration = 0.25\nextreme_acceleration = 0.2")
    with pytest.raises(ProjectError, match=r"wind\.extreme_acceleration: extreme_acceleration="
                                           r"0\.2 must not be below acceleration=0\.25"):
        load_project(write(tmp_path, text))


def test_a_limit_in_the_wrong_table_is_refused_with_the_right_one(tmp_path):
    """A comfort limit put with the mode (not the wind at the occupied floor) is an unknown key
    that points to its table."""
    text = MINIMAL.replace("acceleration_limit = 0.15\n", "").replace(
        "[mode]\n", "[mode]\nacceleration_limit = 0.15\n")
    with pytest.raises(ProjectError, match=r"mode\.acceleration_limit: unknown key \(did you "
                                           r"mean 'wind\.acceleration_limit'\?\)"):
        load_project(write(tmp_path, text))


def test_the_comfort_criterion_only_inside_its_frequencies(tmp_path):
    text = MINIMAL.replace("frequency = 0.2", "frequency = 1.5").replace(
        "acceleration_limit = 0.15", "acceleration_limit = 0.15\nreturn_period = 10")
    with pytest.raises(ProjectError, match=r"wind\.return_period: .*0\.06 < f < 1 Hz"):
        load_project(write(tmp_path, text))
