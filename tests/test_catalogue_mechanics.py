# SPDX-License-Identifier: MIT
"""Worksheet functions of one pendulum, one mode and one damper: where each entry points.

Behaviour tests of our own rules: common practice, no source. The values of every entry are
checked against the engine by tests/test_udf.py.
"""
from __future__ import annotations

import importlib

import pytest

from functions import catalogue, damper, pendulum
from functions.catalogue import mechanics
from functions.catalogue.declaration import LOOKUP

ENTRIES = mechanics.PENDULUM + mechanics.STRUCTURE + mechanics.DAMPER


@pytest.mark.parametrize("group, topic", [(mechanics.PENDULUM, "pendulum"),
                                          (mechanics.STRUCTURE, "structure"),
                                          (mechanics.DAMPER, "damper")])
def test_each_group_calls_the_engine_module_of_its_topic(group, topic):
    assert group
    for fn in group:
        assert fn.topic == topic, fn.name
        module = fn.table.rpartition(".")[0] if fn.kind == LOOKUP else fn.engine.__module__
        assert module == f"functions.{topic}", fn.name
        assert importlib.import_module(module)


def test_every_entry_is_in_the_catalogue_in_order():
    names = [fn.name for fn in catalogue.FUNCTIONS]
    assert names[:len(ENTRIES)] == [fn.name for fn in ENTRIES]
    assert all(catalogue.BY_NAME[fn.name] is fn for fn in ENTRIES)


def test_shared_arguments_carry_the_engine_defaults():
    assert mechanics.GRAVITY.default == pendulum.STANDARD_GRAVITY
    assert mechanics.AMPLITUDE.default == 0.0
    assert not mechanics.LENGTH.optional
    assert mechanics.MASS_RATIO.fraction and mechanics.DAMPER_DAMPING.fraction
    assert mechanics.STRUCTURAL_DAMPING_0.default == 0.0


def test_the_optimal_tuning_pair_is_two_items_of_one_engine_call():
    ratio = catalogue.BY_NAME["SWAY_OPTIMAL_TUNING_RATIO"]
    damping = catalogue.BY_NAME["SWAY_OPTIMAL_DAMPER_DAMPING"]
    assert ratio.engine is damping.engine is damper.optimal_tuning
    assert (ratio.output, damping.output) == (0, 1)
    assert ratio.arguments == damping.arguments
    assert len(damper.optimal_tuning(0.02, "h2", 0.01)) == 2     # both items have a function
