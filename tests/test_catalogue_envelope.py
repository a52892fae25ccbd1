# SPDX-License-Identifier: MIT
"""Worksheet functions of the frequency band: every engine result reachable, and the functions
used together in a sheet as an engineer would (worst case against a column of factors, the mass
ratio for the band fed back into the worst case, the retune against the design).

The values of every entry against the engine, cell by cell and range by range, are checked by
tests/test_udf.py; the engine's own values against an independent variance and a brute-force
grid by tests/test_envelope.py. Reference values here: the small-angle pendulum
L = g / (2 pi f)^2 (common practice, no source) and the exact period of SWAY_EXACT_PERIOD
(Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, 17.3.1 via
tests/test_pendulum.py); the rest are consistency rules of our own: common practice, no source.
"""
from __future__ import annotations

import inspect
import math

import numpy as np
import pytest

from functions import catalogue, envelope, quantities, udf
from functions.catalogue import envelope as sheet_envelope
from functions.catalogue.declaration import FIELDS, SUMMARY

G = 9.80665
MU, ZS = 0.02, 0.01                       # invented damper: 2 % mass ratio, 1 % damping
LO, HI = 0.9, 1.1                         # band: -10 % to +10 % of the nominal frequency


def _h2(mu=MU, zs=ZS):
    return (udf.sway_optimal_tuning_ratio(mu, "h2", zs),
            udf.sway_optimal_damper_damping(mu, "h2", zs))


def test_every_public_envelope_function_has_worksheet_functions():
    wrapped = {fn.engine for fn in sheet_envelope.ENVELOPE}
    public = {getattr(envelope, n) for n in envelope.__all__
              if inspect.isfunction(getattr(envelope, n))}
    assert public == wrapped
    assert not [k for k in catalogue.COVERED_ELSEWHERE if k.startswith("functions.envelope.")]
    for fn in sheet_envelope.ENVELOPE:
        assert fn.topic == "envelope" and catalogue.BY_NAME[fn.name] is fn


@pytest.mark.parametrize("engine, args", [
    (envelope.band_worst_case, (LO, HI, 0.2, MU, 0.98, 0.07, ZS)),
    (envelope.robust_tuning, (MU, LO, HI, ZS)),
    (envelope.hanger_adjustment, (0.15, LO, HI, 0.98851, 5.0)),
])
def test_each_item_of_a_tuple_result_has_its_own_function(engine, args):
    n = len(engine(*args))
    outputs = sorted(fn.output for fn in sheet_envelope.ENVELOPE if fn.engine is engine)
    assert outputs == list(range(n))
    for fn in sheet_envelope.ENVELOPE:
        if fn.engine is engine:
            assert udf.evaluate(fn.name, *args) == engine(*args)[fn.output]


def test_as_built_fields_are_the_engine_fields_with_the_design_units():
    assert [f[0] for f in sheet_envelope.AS_BUILT_FIELDS] == list(envelope.AsBuiltRetune._fields)
    results = quantities.by_name(quantities.DESIGN_RESULTS)
    for name, unit, _text in sheet_envelope.AS_BUILT_FIELDS:
        assert unit == results[name].unit, name
    summary = catalogue.BY_NAME["SWAY_AS_BUILT_RETUNE"]
    labels = catalogue.BY_NAME["SWAY_AS_BUILT_RETUNE_FIELDS"]
    assert (summary.kind, labels.kind) == (SUMMARY, FIELDS)
    assert summary.fields == labels.fields == sheet_envelope.AS_BUILT_FIELDS


def test_detuned_damping_at_the_nominal_frequency_is_the_effective_damping():
    f, z = _h2()
    assert udf.sway_detuned_effective_damping(1.0, MU, f, z, ZS) == pytest.approx(
        udf.sway_effective_damping(MU, f, z, ZS), rel=1e-14)
    # off nominal the damper is detuned: less effective damping at both ends of the band
    ends = udf.sway_detuned_effective_damping([[LO], [HI]], MU, f, z, ZS)
    assert all(row[0] < udf.sway_effective_damping(MU, f, z, ZS) for row in ends)


def test_worst_case_is_the_largest_of_a_column_of_factors():
    f, z = _h2()
    factors = [[r] for r in np.linspace(LO, HI, 41)]
    column = np.array(udf.sway_detuned_acceleration(factors, 0.2, MU, f, z, ZS), dtype=float)
    worst = udf.sway_band_worst_acceleration(LO, HI, 0.2, MU, f, z, ZS)
    where = udf.sway_band_worst_factor(LO, HI, 0.2, MU, f, z, ZS)
    zeta = udf.sway_band_worst_effective_damping(LO, HI, 0.2, MU, f, z, ZS)
    assert worst >= column.max() * (1.0 - 1e-12)
    assert worst <= column.max() * (1.0 + 1e-3)
    assert LO <= where <= HI
    assert udf.sway_detuned_acceleration(where, 0.2, MU, f, z, ZS) == pytest.approx(worst,
                                                                                  rel=1e-10)
    assert udf.sway_detuned_effective_damping(where, MU, f, z, ZS) == pytest.approx(zeta,
                                                                                   rel=1e-10)
    # with the acceleration without the damper held constant: a = a_d sqrt(zeta_eff / zeta_s)
    assert worst * math.sqrt(zeta / ZS) == pytest.approx(0.2, rel=1e-10)


def test_robust_tuning_lowers_the_worst_case_and_balances_the_ends():
    f, z = (udf.sway_robust_tuning_ratio(MU, LO, HI, ZS),
            udf.sway_robust_damper_damping(MU, LO, HI, ZS))
    robust = udf.sway_band_worst_acceleration(LO, HI, 0.2, MU, f, z, ZS)
    nominal = udf.sway_band_worst_acceleration(LO, HI, 0.2, MU, *_h2(), ZS)
    assert robust < nominal
    low, high = (udf.sway_detuned_acceleration(r, 0.2, MU, f, z, ZS) for r in (LO, HI))
    assert low == pytest.approx(high, rel=1e-8) and robust == pytest.approx(low, rel=1e-8)
    # a band of no width is the h2 optimum
    assert udf.sway_robust_tuning_ratio(MU, 1.0, 1.0, ZS) == pytest.approx(_h2()[0], rel=1e-12)


@pytest.mark.parametrize("method", ["h2", "robust"])
def test_band_mass_ratio_meets_the_limit_at_the_worst_case(method):
    a, limit, zs = 0.25, 0.15, 0.015
    mu = udf.sway_band_mass_ratio(a, limit, zs, LO, HI, method)
    if method == "h2":
        f, z = _h2(mu, zs)
    else:
        f, z = (udf.sway_robust_tuning_ratio(mu, LO, HI, zs),
                udf.sway_robust_damper_damping(mu, LO, HI, zs))
    worst = udf.sway_band_worst_acceleration(LO, HI, a, mu, f, z, zs)
    assert worst == pytest.approx(limit, rel=1e-8)
    assert udf.sway_band_mass_ratio(a, limit, zs, LO, HI, " Robust ") == udf.sway_band_mass_ratio(
        a, limit, zs, LO, HI, "robust")


def test_band_mass_ratio_messages_come_back_in_their_cells():
    got = udf.sway_band_mass_ratio(0.25, 0.15, 0.015, LO, HI, "robust", [[0.0], [0.5]])
    assert got[0][0] == udf.sway_band_mass_ratio(0.25, 0.15, 0.015, LO, HI, "robust")
    assert got[1][0] == ("response_exponent=0.5 must be 0 for method='robust' (the robust "
                         "tuning holds the acceleration without the damper constant across "
                         "the band)")
    got = udf.sway_band_mass_ratio([[0.25], [0.1]], 0.15, 0.015, LO, HI)
    assert got[0][0] > 0.0 and got[1][0] == 0.0     # the building alone meets the limit
    assert udf.sway_band_mass_ratio(0.25, 0.15, 0.015, LO, HI, "best").startswith(
        "method='best' must be one of: den_hartog")


def test_hanger_lengths_are_in_tune_at_the_band_ends():
    fs, f = 0.15, 0.98851
    longest = udf.sway_longest_hanger_length(fs, LO, HI, f)
    shortest = udf.sway_shortest_hanger_length(fs, LO, HI, f)
    for length, r in ((longest, LO), (shortest, HI)):      # small-angle pendulum
        assert length == pytest.approx(G / (2.0 * math.pi * f * r * fs) ** 2, rel=1e-13)
    # at a design swing of 5 deg the exact period is 1 / f_d
    (row,) = udf.sway_longest_hanger_length(fs, [[LO, 1.0]], HI, f, 5.0)
    for length, r in zip(row, (LO, 1.0)):
        assert udf.sway_exact_period(length, 5.0) == pytest.approx(1.0 / (f * r * fs),
                                                                   rel=1e-12)
    assert shortest < longest


def test_as_built_retune_with_the_design_frequency_repeats_the_design():
    names = [n for n, _u, _t in catalogue.BY_NAME["SWAY_DESIGN"].fields]
    design = dict(zip(names, (row[0] for row in udf.sway_design(0.15, 2e7, 0.015, 0.25, 0.15,
                                                                   1.2))))
    got = udf.sway_as_built_retune(0.15, design["damper_mass"], 2e7, 0.015, "h2",
                                   design["swing_angle_deg"])
    retune = dict(zip(envelope.AsBuiltRetune._fields, (row[0] for row in got)))
    for name in envelope.AsBuiltRetune._fields:
        assert retune[name] == pytest.approx(design[name], rel=1e-9), name
    # the dashpot from its own definition, c_d = 2 zeta_d m_d (2 pi f_d)
    assert retune["dashpot"] == pytest.approx(
        2.0 * retune["damper_damping"] * design["damper_mass"] * 2.0 * math.pi
        * retune["damper_frequency"], rel=1e-13)
    # two measured frequencies across: one column of settings per case
    two = udf.sway_as_built_retune([[0.14, 0.16]], design["damper_mass"], 2e7, 0.015)
    assert len(two) == 5 and all(len(row) == 2 for row in two)
    assert two[1][0] == pytest.approx(0.14 * two[0][0], rel=1e-14)
