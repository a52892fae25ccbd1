# SPDX-License-Identifier: MIT
"""Worksheet functions of two sway directions: every engine function reachable, and the
functions used together in a sheet as an engineer would (the second direction of a design built
from cells, the springs fed into the frequency, messages in their cells).

The values of every entry against the engine, cell by cell and range by range, are checked by
tests/test_udf.py; the engine's own values against a time-domain integration, a Lyapunov
variance and hand calculations by tests/test_directions.py. Reference values here: the
textbook small-swing frequency sqrt(g/L + k/m)/(2 pi) and SRSS by hand; the rest are
consistency rules of our own: common practice, no source.
"""
from __future__ import annotations

import inspect
import math

import pytest

from functions import catalogue, directions, udf
from functions.catalogue import directions as sheet_directions
from functions.design import design_damper, design_second_direction

G = 9.80665


def test_every_public_directions_function_is_reachable():
    wrapped = {fn.engine for fn in sheet_directions.DIRECTIONS}
    public = {getattr(directions, n) for n in directions.__all__
              if inspect.isfunction(getattr(directions, n))}
    covered = {k for k in catalogue.COVERED_ELSEWHERE if k.startswith("functions.directions.")}
    assert not covered
    assert public == wrapped
    assert "functions.design.design_second_direction" in catalogue.COVERED_ELSEWHERE
    for fn in sheet_directions.DIRECTIONS:
        assert fn.topic == "directions" and catalogue.BY_NAME[fn.name] is fn


def test_springs_from_a_cell_lift_the_pendulum_to_the_target():
    m, L, target = 287e3, 11.298, 0.16
    k = udf.sway_spring_stiffness(m, target, L)
    # textbook small-swing frequency of the pendulum with that spring
    assert math.sqrt(G / L + k / m) / (2 * math.pi) == pytest.approx(target, rel=1e-14)
    assert udf.sway_spring_pendulum_frequency(L, k, m) == pytest.approx(target, rel=1e-14)
    # a column of swings: the frequency falls with the swing
    column = udf.sway_spring_pendulum_frequency(L, k, m, [[0.0], [5.0], [15.0]])
    values = [row[0] for row in column]
    assert values[0] > values[1] > values[2]


def test_negative_springs_come_back_as_a_message_in_their_cell():
    got = udf.sway_spring_stiffness(287e3, [[0.16], [0.1]], 11.298)
    assert got[0][0] > 0.0
    assert got[1][0].startswith("damper_frequency=0.1 must be in [0.148279, inf) [Hz]")


def test_combined_stroke_of_a_row_and_a_column():
    got = udf.sway_combined_stroke([[0.3], [0.6]], [0.4, 0.8])
    assert got == [[0.5, pytest.approx(math.sqrt(0.73), rel=1e-15)],
                   [pytest.approx(math.sqrt(0.52), rel=1e-15), pytest.approx(1.0, rel=1e-15)]]


def test_second_direction_built_from_cells_equals_the_engine():
    r = design_damper(frequency=0.15, modal_mass=2.0e7, structural_damping=0.015,
                      acceleration=0.25, acceleration_limit=0.15, clearance=1.2)
    d = design_second_direction(r, 0.17, 1.8e7, 0.015, 0.2, 0.15)
    c = r.cells
    mu2 = c["damper_mass"] / 1.8e7
    f2 = udf.sway_optimal_tuning_ratio(mu2, "h2", 0.015)
    z2 = udf.sway_optimal_damper_damping(mu2, "h2", 0.015)
    fd2 = f2 * 0.17
    k2 = udf.sway_spring_stiffness(c["damper_mass"], fd2, c["small_angle_length"])
    zeff = udf.sway_effective_damping(mu2, f2, z2, 0.015)
    stroke2 = udf.sway_stroke_ratio(mu2, f2, z2, 0.015) * 0.2 * math.sqrt(0.015 / zeff) / (
        2 * math.pi * 0.17) ** 2
    assert fd2 == pytest.approx(d.damper_frequency_2, rel=1e-14)
    assert k2 == pytest.approx(d.spring_stiffness_2, rel=1e-9)
    assert zeff == pytest.approx(d.effective_damping_2, rel=1e-14)
    assert stroke2 == pytest.approx(d.stroke_2, rel=1e-13)
    assert udf.sway_combined_stroke(c["stroke"], stroke2) == pytest.approx(d.combined_stroke,
                                                                          rel=1e-13)
    swing = udf.sway_swing_angle(stroke2, c["pendulum_length"])
    assert udf.sway_spring_pendulum_frequency(c["pendulum_length"], k2, c["damper_mass"],
                                              swing) == pytest.approx(d.frequency_at_swing_2,
                                                                      rel=1e-9)
