# SPDX-License-Identifier: MIT
"""The design chain's declared steps: order, variants, worksheet formulas allowed.

Reference values are the engine's functions, themselves tested against published sources
(test_damper.py, test_pendulum.py); the order and variants are our own rules: common practice,
no source.
"""
from __future__ import annotations

import pytest

from functions.chain import (MASS_RATIO_MODES, SMALL_SWING_ERROR, all_variants, mass_ratio_mode,
                             sections, steps)
from functions.damper import CLOSED_FORM_METHODS, OPTIMAL_TUNING_METHODS
from functions.quantities import DESIGN_INPUTS, DESIGN_RESULTS, quantity
from functions.worksheet import formula_names
from workbook_builder.xlsx.formulas import check_formula

INPUT_CELLS = {q.cell_name for q in DESIGN_INPUTS}
HELPER_CELLS = {"fixed_point_length", "agm_at_swing"}      # the Pendulum sheet's helpers


@pytest.mark.parametrize("method, mode, chain", all_variants(),
                         ids=[f"{m}-{d}" for m, d, _ in all_variants()])
def test_each_step_reads_inputs_or_earlier_steps(method, mode, chain):
    known = set(INPUT_CELLS)
    for step in chain:
        assert set(step.reads) <= known, (step.name, set(step.reads) - known)
        if step.formula:
            check_formula(step.formula)
            names = set(formula_names(step.formula))
            assert names <= known | HELPER_CELLS, (step.name, names - known - HELPER_CELLS)
        quantity(step.name)                       # every step computes a declared quantity
        known.add(step.name)
    results = {q.cell_name for q in DESIGN_RESULTS}
    assert results <= known, results - known


@pytest.mark.parametrize("method", OPTIMAL_TUNING_METHODS)
def test_engine_values_only_where_there_is_no_closed_form(method):
    for mode in MASS_RATIO_MODES:
        engine = [s.name for s in steps(method, mode) if s.is_engine_value]
        expected = (["mass_ratio"] if mode == "required" else []) + (
            [] if method in CLOSED_FORM_METHODS else ["tuning_ratio", "damper_damping"])
        assert engine == expected


def test_twins_and_helper_formulas():
    chain = steps("h2", "required")
    by_name = {s.name: s for s in chain}
    assert by_name["required_damping"].is_twin
    assert not by_name["pendulum_length"].is_twin
    assert by_name["pendulum_length"].formula == "=fixed_point_length"
    assert by_name["small_angle_error"].formula == SMALL_SWING_ERROR
    assert SMALL_SWING_ERROR.endswith(",1/agm_at_swing-1)")


def test_sections_in_checking_order():
    titles = [s.title for s in sections("den_hartog", "chosen_mass_ratio")]
    assert [t.split()[0] for t in titles] == ["1", "2", "3", "4", "5", "6"]


def test_mass_ratio_mode():
    assert mass_ratio_mode(True, False) == "chosen_mass_ratio"
    assert mass_ratio_mode(False, True) == "chosen_damper_mass"
    assert mass_ratio_mode(False, False) == "required"
    with pytest.raises(ValueError, match="mode='x' must be one of"):
        sections("h2", "x")
    with pytest.raises(ValueError, match="method='x' must be one of"):
        sections("x", "required")
