# SPDX-License-Identifier: MIT
"""Worksheet functions of the supply specification, used together as an engineer would.

The values of every entry against the engine, cell by cell and range by range, are checked by
tests/test_udf.py; the engine's own values against quadrature, mpmath and a time-domain
integration by tests/test_dashpots.py and tests/test_suspension.py. Here: every public
function reachable, and the functions chained in a sheet (a coefficient found for a linear
dashpot returns that dashpot; the block's height feeds the stages; the stages' length sums to
the pendulum's): consistency rules of our own, common practice, no source.
"""
from __future__ import annotations

import inspect

import pytest

from functions import catalogue, dashpots, suspension, udf
from functions.catalogue import supply as sheet_supply


def test_every_public_function_has_worksheet_functions():
    wrapped = {fn.engine for fn in sheet_supply.SUPPLY}
    public = {getattr(m, n) for m in (dashpots, suspension) for n in m.__all__
              if inspect.isfunction(getattr(m, n))}
    assert public == wrapped
    for fn in sheet_supply.SUPPLY:
        assert fn.topic == "supply" and catalogue.BY_NAME[fn.name] is fn
    assert "supply" in catalogue.TOPICS


@pytest.mark.parametrize("response", ["random", "harmonic"])
def test_coefficient_and_equivalent_dashpot_in_a_sheet(response):
    c = udf.sway_dashpot_coefficient(19199.3, 0.5, 0.25, response)
    assert udf.sway_equivalent_dashpot(c, 0.5, 0.25, response) == pytest.approx(19199.3)
    assert udf.sway_dashpot_power(c, 0.5, 0.25, response) > 0


def test_block_stages_and_hangers_in_a_sheet():
    height = udf.sway_block_height(287e3, 7850.0, 4.0, 4.0)
    n = udf.sway_stage_count(11.29, 6.0, height)
    stage = udf.sway_stage_length(11.29, 6.0, height)
    assert n * stage == pytest.approx(11.29)
    assert udf.sway_folded_pendulum_length([[stage]] * int(n)) == pytest.approx(11.29)
    static = udf.sway_hanger_tension(287e3, 0.0, 4)
    assert udf.sway_hanger_tension(287e3, 10.0, 4) > static
    assert udf.sway_hanger_breaking_load(static, 3.0) == pytest.approx(3 * static)


def test_bad_input_returns_a_message_naming_the_argument():
    text = udf.sway_hanger_tension(287e3, 10.0, 0)
    assert isinstance(text, str) and "hanger_count" in text
