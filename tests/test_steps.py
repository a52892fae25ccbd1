# SPDX-License-Identifier: MIT
"""Steps of the design chain (functions.steps): the three kinds and what they read.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import pytest

from functions.steps import Section, Step, closed_form, engine_value, from_form
from functions.worksheet import twin


def test_closed_form_carries_its_formula_and_evaluates():
    step = closed_form("damper_mass", "=mass_ratio*modal_mass",
                       lambda mass_ratio, modal_mass: mass_ratio * modal_mass, "mu M*")
    assert step.is_twin and not step.is_engine_value
    assert step.formula == "=mass_ratio*modal_mass"
    assert step.reads == ("mass_ratio", "modal_mass")
    assert step.evaluate({"mass_ratio": 0.02, "modal_mass": 1e7, "other": 1}) == \
        pytest.approx(2e5, rel=1e-15)


def test_from_form_keeps_the_twins_expression_and_source():
    form = twin("=2*x", lambda x: 2 * x, "2 x", "Arithmetic")
    step = from_form("y", form)
    assert (step.name, step.expression, step.source, step.formula) == \
        ("y", "2 x", "Arithmetic", "=2*x")


def test_engine_value_has_no_formula_and_a_flag():
    step = engine_value("mass_ratio", lambda required_damping: required_damping * 2, "root",
                        "brentq", "engine_flag_mass_ratio")
    assert step.is_engine_value and step.formula == "" and step.flag == "engine_flag_mass_ratio"
    section = Section("2  Mass", (step,), "note")
    assert section.steps[0] is step
    assert isinstance(step, Step)
