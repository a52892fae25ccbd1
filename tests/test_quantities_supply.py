# SPDX-License-Identifier: MIT
"""Declarations of the supply specification (functions.quantities_supply).

Behaviour tests of our own rules (common practice, no source); the densities are those of
EN 1991-1-1:2002 Tables A.1 and A.4 (steel 77 to 78.5 kN/m^3, reinforced concrete 25 kN/m^3).
"""
from __future__ import annotations

from functions.chain import steps
from functions.quantities import OPTIONAL_TABLES, PART_RESULTS, design_inputs, quantity
from functions.quantities_supply import (DASHPOT_LEVELS, SECOND_DIRECTION_SUPPLY, SUPPLY_INPUTS,
                                         SUPPLY_RESULTS, SUPPLY_RESULTS_2, SUPPLY_TABLE)
from functions.relations import SUPPLY_INPUT_NAMES

EVERYTHING = ("extreme", "direction_2", "supply", "dashpots_at_extreme")


def test_inputs_are_one_table_with_the_required_keys():
    assert {q.section for q in SUPPLY_INPUTS} == {"supply"}
    assert SUPPLY_TABLE == OPTIONAL_TABLES["supply"]
    assert [q.name for q in SUPPLY_INPUTS if q.optional] == list(SUPPLY_TABLE)
    assert set(SUPPLY_INPUT_NAMES) == {q.name for q in SUPPLY_INPUTS}
    assert all(q in design_inputs() for q in SUPPLY_INPUTS)
    level = next(q for q in SUPPLY_INPUTS if q.name == "dashpot_level")
    assert level.choices == DASHPOT_LEVELS and level.default == "service"


def test_the_factor_of_safety_has_no_default():
    """The designer chooses it: no value is presented as a standard."""
    q = next(q for q in SUPPLY_INPUTS if q.name == "hanger_safety_factor")
    assert q.optional and "designer's choice" in q.label


def test_density_default_is_steel_and_concrete_is_in_range():
    q = next(q for q in SUPPLY_INPUTS if q.name == "block_density")
    assert q.default == 7850.0 and q.contains(2500.0) and not q.contains(-7850.0)


def test_every_step_of_the_part_is_declared_once():
    names = [s.name for s in steps("h2", "required", EVERYTHING)]
    declared = {q.cell_name for q in PART_RESULTS}
    supply = [q.name for q in SUPPLY_RESULTS + SUPPLY_RESULTS_2]
    assert len(supply) == len(set(supply))
    assert set(supply) <= set(names) and set(supply) <= declared
    for name in names:
        quantity(name)                                  # every step is declared (KeyError)
    assert {n + "_2" for n in SECOND_DIRECTION_SUPPLY} <= set(names)
