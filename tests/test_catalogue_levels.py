# SPDX-License-Identifier: MIT
"""Worksheet functions of the extreme level and the occupied floor: every engine result
reachable, and the functions used together in a sheet as an engineer would (the design's
column fed into the extreme level, a displacement given instead of an acceleration, a column
of strokes against the buffers, a column of frequencies against the comfort criterion).

The values of every entry against the engine, cell by cell and range by range, are checked by
tests/test_udf.py; the engine's own values against a two-mass model, the solved harmonic
motion, the exact period and the Melbourne & Palmer formula by tests/test_levels.py. Here the
references are the design chain (SWAY_DESIGN, whose steps tests/test_design.py checks), the
power-law mode shape of SWAY_POWER_LAW_MODE_SHAPE (EN 1991-1-4:2005 Annex F, (F.3)) and the
pendulum functions (SWAY_SWING_ANGLE, SWAY_AMPLITUDE_DETUNING: Abramowitz & Stegun 1964,
§17.2, via tests/test_pendulum.py); the rest are consistency rules of our own: common
practice, no source.
"""
from __future__ import annotations

import inspect
import math

import pytest

from functions import catalogue, levels, udf
from functions.catalogue import levels as sheet_levels

ZS = 0.015                     # invented building: 1.5 % damping, 0.15 Hz, M* = 2e7 kg
FS = 0.15


def _design(acceleration=0.25):
    names = [n for n, _u, _t in catalogue.BY_NAME["SWAY_DESIGN"].fields]
    column = udf.sway_design(FS, 2e7, ZS, acceleration, 0.15, 1.2)
    return dict(zip(names, (row[0] for row in column)))


def test_every_public_levels_function_has_worksheet_functions():
    wrapped = {fn.engine for fn in sheet_levels.LEVELS}
    public = {getattr(levels, n) for n in levels.__all__
              if inspect.isfunction(getattr(levels, n))}
    assert public == wrapped
    assert not [k for k in catalogue.COVERED_ELSEWHERE if k.startswith("functions.levels.")]
    for fn in sheet_levels.LEVELS:
        assert fn.topic == "levels" and catalogue.BY_NAME[fn.name] is fn
    assert "levels" in catalogue.TOPICS


@pytest.mark.parametrize("engine, args", [
    (levels.extreme_response, (0.6, ZS, 0.0416667, 5.6176, FS, 0.9)),
    (levels.extreme_swing, (2.2767, 11.288376, 4.820624)),
])
def test_each_item_of_a_tuple_result_has_its_own_function(engine, args):
    n = len(engine(*args))
    outputs = sorted(fn.output for fn in sheet_levels.LEVELS if fn.engine is engine)
    assert outputs == list(range(n))
    for fn in sheet_levels.LEVELS:
        if fn.engine is engine:
            assert udf.evaluate(fn.name, *args) == engine(*args)[fn.output]


def test_the_design_fed_to_the_extreme_level_repeats_the_design_at_the_service_level():
    d = _design()
    args = (0.25, ZS, d["effective_damping"], d["stroke_ratio"], FS)
    assert udf.sway_extreme_acceleration_with_damper(*args) == pytest.approx(
        d["acceleration_with_damper"], rel=1e-12)
    assert udf.sway_extreme_displacement(*args) == pytest.approx(d["structure_displacement"],
                                                                 rel=1e-12)
    stroke = udf.sway_extreme_stroke(*args)
    assert stroke == pytest.approx(d["stroke"], rel=1e-12)
    assert udf.sway_extreme_swing_angle(stroke, d["pendulum_length"]) == pytest.approx(
        udf.sway_swing_angle(stroke, d["pendulum_length"]), rel=1e-14)
    # in tune at the design swing: no detuning there; from small swings, the pendulum's own
    assert udf.sway_extreme_swing_detuning(stroke, d["pendulum_length"],
                                           d["swing_angle_deg"]) == pytest.approx(0.0, abs=1e-15)
    assert udf.sway_extreme_swing_detuning(stroke, d["pendulum_length"]) == pytest.approx(
        udf.sway_amplitude_detuning(d["swing_angle_deg"]), rel=1e-12)


def test_a_rarer_wind_swings_further_and_detunes_the_pendulum():
    d = _design()
    stroke = udf.sway_extreme_stroke(0.6, ZS, d["effective_damping"], d["stroke_ratio"], FS)
    assert stroke == pytest.approx(d["stroke"] * 0.6 / 0.25, rel=1e-12)      # linear
    assert udf.sway_extreme_swing_angle(stroke, d["pendulum_length"]) > d["swing_angle_deg"]
    assert udf.sway_extreme_swing_detuning(stroke, d["pendulum_length"],
                                           d["swing_angle_deg"]) < 0.0
    # beyond the clearance of 1.2 m: the buffers are reached
    assert udf.sway_buffer_excess(stroke, 1.2) == pytest.approx(stroke - 1.2, rel=1e-14)
    v = udf.sway_contact_velocity(stroke, 1.2, FS)
    assert udf.sway_buffer_energy(d["damper_mass"], stroke, 1.2, FS) == pytest.approx(
        d["damper_mass"] * v * v / 2, rel=1e-14)
    force = udf.sway_peak_damper_force(stroke, d["stiffness"], d["dashpot"], FS)
    assert force >= d["stiffness"] * stroke                # the dashpot adds to the spring


def test_a_displacement_given_instead_of_an_acceleration():
    x0 = 0.45                                       # m, without the damper, at the damper
    a = udf.sway_extreme_acceleration_from_displacement(x0, FS, 0.9)
    # without the damper (zeta_eff = zeta_s) the displacement at the damper comes back
    assert udf.sway_extreme_displacement(a, ZS, ZS, 5.0, FS, 0.9) == pytest.approx(x0,
                                                                                  rel=1e-14)
    assert a == pytest.approx(0.9 * (2 * math.pi * FS) ** 2 * x0, rel=1e-14)


def test_a_column_of_strokes_against_the_buffers():
    strokes = [[0.5], [1.2], [2.0], [-1.0]]
    v = udf.sway_contact_velocity(strokes, 1.2, FS)
    assert v[0][0] == 0.0 and v[1][0] == 0.0 and v[2][0] > 0.0
    assert v[3][0] == "stroke=-1.0 must be in [0, inf) [m]"
    excess = udf.sway_buffer_excess(strokes[:3], 1.2)
    assert [row[0] for row in excess] == [0.0, 0.0, pytest.approx(0.8, rel=1e-14)]


def test_comfort_criterion_over_a_column_of_frequencies():
    got = udf.sway_melbourne_palmer_limit([[0.1], [0.2], [1.2]], 10.0)
    assert got[0][0] > got[1][0] > 0.0            # a lower frequency is allowed more
    assert got[2][0] == "frequency=1.2 must be in (0.06, 1) [Hz]"
    # a longer return period is allowed more (0.68 + ln(R)/5 grows with R)
    assert udf.sway_melbourne_palmer_limit(0.2, 10.0) > udf.sway_melbourne_palmer_limit(0.2, 1.0)
    assert udf.sway_melbourne_palmer_limit(0.2, 1.0, "") == udf.sway_melbourne_palmer_limit(
        0.2, 1.0, 600.0)


def test_floor_ordinate_is_the_ratio_of_the_mode_shape():
    h, k = 320.0, 1.5
    want = udf.sway_power_law_mode_shape(280.0, h, k) / udf.sway_power_law_mode_shape(300.0, h, k)
    assert udf.sway_power_law_floor_ordinate(280.0, 300.0, k) == pytest.approx(want, rel=1e-14)


def test_damping_ratios_are_fractions():
    assert udf.sway_extreme_stroke(0.6, ZS, 5.0, 5.6, FS).startswith(
        "effective_damping=5.0 must be in [0, 1) [-]: give a fraction")
