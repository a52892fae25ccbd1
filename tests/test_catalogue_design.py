# SPDX-License-Identifier: MIT
"""Worksheet functions of a whole design: fields and arguments follow the engine's declarations.

Behaviour tests of our own rules: common practice, no source. The values are checked against
the engine by tests/test_udf.py.
"""
from __future__ import annotations

import dataclasses

from functions import catalogue, design, quantities, simulation
from functions.quantities import ENVELOPE_INPUTS, SUPPLY_INPUT_NAMES
from functions.catalogue import design as sheet_design


def test_summary_fields_are_the_engine_fields():
    assert catalogue.BY_NAME["SWAY_SIMULATION_SUMMARY"].fields == simulation.SUMMARY_FIELDS
    names = [f[0] for f in catalogue.BY_NAME["SWAY_RANDOM_RESPONSE_THEORY"].fields]
    assert names == [f.name for f in dataclasses.fields(simulation.RandomTheory)]
    names = [f[0] for f in catalogue.BY_NAME["SWAY_DESIGN"].fields]
    results = quantities.by_name(quantities.DESIGN_RESULTS)
    assert names == list(results) + [f"{n}_ok" for n in design.CHECK_NAMES] + ["all_ok"]
    for name, unit, _text in catalogue.BY_NAME["SWAY_DESIGN"].fields:
        assert unit == (results[name].unit if name in results else "-")


def test_design_arguments_are_the_design_inputs_required_first():
    fn = catalogue.BY_NAME["SWAY_DESIGN"]
    inputs = quantities.by_name(quantities.design_inputs())
    assert sorted(a.name for a in fn.arguments) == sorted(inputs)
    flags = [a.optional for a in fn.arguments]
    assert flags == sorted(flags) and not all(flags)
    for a in fn.arguments:
        q = inputs[a.name]
        assert a.optional is not q.required, a.name
        assert a.choices == q.choices
        assert a.fraction == (q.kind == "fraction" and q.high <= 1.0), a.name


def test_design_functions_are_built_afresh_from_the_declarations():
    fresh = sheet_design.design_sheet_functions()
    assert [fn.name for fn in fresh] == [fn.name for fn in sheet_design.DESIGN]
    assert fresh == sheet_design.DESIGN                 # same declarations, same entries
    assert fresh[0] is not sheet_design.DESIGN[0]


def test_every_entry_is_in_the_catalogue():
    for fn in sheet_design.SIMULATION + sheet_design.DESIGN:
        assert catalogue.BY_NAME[fn.name] is fn
        assert fn.topic in ("simulation", "design")


def test_sway_design_keeps_the_positional_arguments_of_earlier_sheets():
    """The design envelope's inputs come after the arguments of swaytune 0.3, so a sheet that
    passes them by position still means the same (our own rule)."""
    from functions.catalogue import BY_NAME
    names = [a.name for a in BY_NAME["SWAY_DESIGN"].arguments]
    assert names[:14] == ["frequency", "modal_mass", "structural_damping", "acceleration",
                          "acceleration_limit", "clearance", "damper_mass", "mass_ratio",
                          "tuning_method", "max_swing_deg", "max_detuning", "mass_ratio_min",
                          "mass_ratio_max", "g"]
    assert names[14:14 + len(ENVELOPE_INPUTS)] == list(ENVELOPE_INPUTS)
    assert names[14 + len(ENVELOPE_INPUTS):] == list(SUPPLY_INPUT_NAMES)
