# SPDX-License-Identifier: MIT
"""Results of the simulation: statistics of a response and the bare building's record.

References used here: the steady amplitude of a damped oscillator at resonance,
X = (F0 / K) / (2 zeta) (J. P. Den Hartog, Mechanical Vibrations, 4th ed. 1956, ch. 2, from
memory), and the RMS of a sine, X / sqrt(2). Demo data are invented.
"""
from __future__ import annotations

import math

import pytest
from simulation_reference import DEMO, FS, L, M, MD, ZD

from functions.simulation import HarmonicForce, RandomForce, simulate


def test_without_damper_response_is_reported():
    r = simulate(*DEMO, RandomForce(2e4, 0.1, seed=1), 600.0)
    assert r.without_damper.angle_deg is None and r.without_damper.stroke_peak == 0.0
    assert r.without_damper.displacement.shape == r.linear.displacement.shape == r.time.shape
    assert r.theory.displacement_rms < r.theory.displacement_rms_without_damper


def test_rms_and_peak_of_a_steady_sine():
    # Bare building at resonance, 5 % damping, warm-up 400 s (transient e^-25): the steady
    # response lags the force by 90 deg, x = -X cos(omega t), and the warm-up is 80 whole
    # periods. The record of 20 whole periods holds N + 1 uniform samples with both ends at
    # x = -X, so its mean square is X^2 (N/2 + 1) / (N + 1), not quite X^2 / 2.
    F0, zs = 2e4, 0.05
    r = simulate(M, FS, zs, MD, L, ZD, HarmonicForce(F0, FS), 100.0, warmup=400.0)
    bare = r.without_damper
    ws = 2 * math.pi * FS
    X = F0 / (M * ws**2) / (2 * zs)
    n1 = bare.displacement.size
    rms = X * math.sqrt((0.5 * (n1 - 1) + 1) / n1)
    assert rms == pytest.approx(X / math.sqrt(2), rel=1e-3)
    assert bare.displacement_rms == pytest.approx(rms, rel=1e-8)
    assert bare.acceleration_rms == pytest.approx(ws**2 * rms, rel=1e-8)
    assert bare.displacement_peak == pytest.approx(X, rel=1e-8)
    assert bare.acceleration_peak == pytest.approx(ws**2 * X, rel=1e-8)
    assert bare.effective_damping == pytest.approx(zs, rel=1e-6)
