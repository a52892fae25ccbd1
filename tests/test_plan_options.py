# SPDX-License-Identifier: MIT
"""Layout options: refusals, the JSON stored in a workbook, the options of a project.

The expected options of a project are read off the project files written here (which inputs
they give, their unit system, floor table and [simulation] table), not from the code.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import tomllib
import types

import pytest

from workbook_builder.plan import PLAN_VERSION, PlanOptions, make_plan, options_for
from workbook_builder.project import parse_project

from workbook_cases import MINIMAL

#: Declared numeric inputs with a default (functions/quantities.py): a project without them
#: still has a row for each, holding the default.
DEFAULTED = ("max_swing_deg", "max_detuning", "mass_ratio_min", "mass_ratio_max", "g")


def _project(**changes):
    raw = tomllib.loads(MINIMAL)
    for section, values in changes.items():
        for key, value in values.items():
            if value is None:
                raw[section].pop(key)
            else:
                raw.setdefault(section, {})[key] = value
    return parse_project(raw, source="o.toml")


def test_same_options_same_plan_and_json_round_trip():
    o = PlanOptions(units="SI", paper="A4", tuning_method="den_hartog",
                    mass_ratio_mode="chosen_mass_ratio",
                    inputs=("frequency", "structural_damping", "acceleration",
                            "acceleration_limit", "mass_ratio", "clearance", "max_swing_deg",
                            "max_detuning", "mass_ratio_min", "mass_ratio_max", "g"),
                    floors=4, template=False, simulation=("random", 50, 20))
    assert PlanOptions.from_json(o.to_json()) == o
    assert make_plan(o) is make_plan(PlanOptions.from_json(o.to_json()))
    assert o.version == PLAN_VERSION


@pytest.mark.parametrize("text, match", [
    ("not json", "is not JSON"),
    ('{"colour": 1}', "does not hold the options"),
    ('{"tuning_method": "best"}', "tuning_method='best' must be one of"),
])
def test_bad_options_are_refused(text, match):
    with pytest.raises(ValueError, match=match):
        PlanOptions.from_json(text)


@pytest.mark.parametrize("text", ['[1, 2]', '"SI"', "3"])
def test_json_that_is_not_an_object_is_refused(text):
    with pytest.raises(ValueError, match=r"SwaytunePlan .* does not hold the options of a plan"):
        PlanOptions.from_json(text)


@pytest.mark.parametrize("kwargs, match", [
    ({"tuning_method": "best"}, r"tuning_method='best' must be one of .*h2"),
    ({"mass_ratio_mode": "guess"}, r"mass_ratio_mode='guess' must be one of chosen_mass_ratio"),
    ({"units": "imperial"}, r"units='imperial' and paper='A4' must be SI or US"),
    ({"paper": "A3"}, r"units='SI' and paper='A3' must be SI or US and A4 or Letter"),
])
def test_options_outside_the_layouts_are_refused(kwargs, match):
    with pytest.raises(ValueError, match=match):
        PlanOptions(**kwargs)


def test_json_keeps_lists_as_tuples_and_the_simulation_sizes():
    o = PlanOptions(units="US", paper="Letter", inputs=("frequency", "clearance"),
                    simulation=("harmonic", 769, 325))
    text = o.to_json()
    assert '"simulation": ["harmonic", 769, 325]' in text
    back = PlanOptions.from_json(text)
    assert back == o and back.inputs == ("frequency", "clearance")
    assert back.simulation == ("harmonic", 769, 325) and back.us and not PlanOptions().us
    # a workbook of the same version without the optional keys: the defaults
    assert PlanOptions.from_json('{"units": "US"}') == PlanOptions(units="US")


def test_options_for_a_project_with_a_chosen_mass_ratio():
    o = options_for(_project())
    assert o.inputs == ("frequency", "modal_mass", "structural_damping", "floor_ordinate",
                        "acceleration", "acceleration_limit", "mass_ratio", "clearance") + \
        DEFAULTED
    assert (o.units, o.paper, o.tuning_method, o.mass_ratio_mode) == (
        "SI", "A4", "h2", "chosen_mass_ratio")
    assert (o.floors, o.template, o.simulation, o.version) == (0, False, None, PLAN_VERSION)
    assert options_for(_project(), template=True).template


def test_options_for_us_units_a_chosen_damper_mass_and_a_closed_form_method():
    o = options_for(_project(project={"units": "US"},
                             damper={"mass_ratio": None, "damper_mass": 400.0,
                                     "tuning_method": "den_hartog"}))
    assert (o.units, o.paper, o.tuning_method, o.mass_ratio_mode) == (
        "US", "Letter", "den_hartog", "chosen_damper_mass")
    assert "damper_mass" in o.inputs and "mass_ratio" not in o.inputs
    assert "tuning_method" not in o.inputs          # a choice has no numeric row


def test_options_for_a_floor_table_and_the_required_mass_ratio():
    floors = {"heights": [3.0, 6.0, 9.0, 12.0, 15.0], "masses": [500.0] * 5,
              "mass_unit": "t", "building_height": 15.0, "exponent": 1.0}
    o = options_for(_project(mode={"modal_mass": None, "floors": floors},
                             damper={"mass_ratio": None}))
    assert o.floors == 5 and o.mass_ratio_mode == "required"
    assert not {"modal_mass", "mass_ratio", "damper_mass"} & set(o.inputs)
    assert o.inputs[:2] == ("frequency", "structural_damping")


def test_options_for_a_simulation_hold_its_load_and_table_sizes():
    """A stand-in for workbook_builder.compute.SimulationRun with the attributes read."""
    run = types.SimpleNamespace(settings=types.SimpleNamespace(load="harmonic"),
                                time_table=types.SimpleNamespace(rows=((0.0,),) * 7),
                                window_table=types.SimpleNamespace(rows=((0.0,),) * 3))
    assert options_for(_project(), run).simulation == ("harmonic", 7, 3)
