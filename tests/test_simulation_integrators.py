# SPDX-License-Identifier: MIT
"""Time integration of the simulation against outside references.

References used here: scipy.signal.lsim (exact first-order-hold discretisation),
scipy.integrate.solve_ivp (independent nonlinear integration), the textbook steady-state
amplitude of a damped oscillator and the 2-DOF transfer function of
tests/simulation_reference.py. Demo data are invented.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.signal import lsim
from simulation_reference import DEMO, FS, G, L, M, MD, ZD, ZS, transfer

from functions.simulation import HarmonicForce, RandomForce, simulate


def test_linear_matches_scipy_lsim():
    # scipy.signal.lsim with interp=True uses the same first-order hold, evaluated step by step
    r = simulate(*DEMO, RandomForce(5e4, 0.2, seed=3), 120.0, warmup=0.0)
    m = MD
    mass = np.array([[M + m, m], [m, m]])
    ws, wd = 2 * np.pi * FS, math.sqrt(G / L)
    inv = np.linalg.inv(mass)
    A = np.block([[np.zeros((2, 2)), np.eye(2)],
                  [-inv @ np.diag([M * ws**2, m * wd**2]),
                   -inv @ np.diag([2 * ZS * M * ws, 2 * ZD * m * wd])]])
    B = np.concatenate([[0, 0], inv @ [1.0, 0.0]])[:, None]
    _, y, _ = lsim((A, B, np.eye(4), np.zeros((4, 1))), r.force, r.time, interp=True)
    np.testing.assert_allclose(r.linear.displacement, y[:, 0], rtol=0,
                               atol=1e-10 * np.max(np.abs(y[:, 0])))
    np.testing.assert_allclose(r.linear.stroke, y[:, 1], rtol=0,
                               atol=1e-10 * np.max(np.abs(y[:, 1])))


def test_harmonic_steady_state_is_exact():
    # Bare building: X = (F0/K) / sqrt((1 - r^2)^2 + (2 zeta r)^2) (any vibrations text, e.g.
    # Den Hartog, Mechanical Vibrations, 4th ed. 1956, §2.3, from memory). A long warm-up
    # removes the start-up transient (e^-25); 5 % building damping keeps it short.
    F0, ff, ZS = 3e4, 0.19, 0.05
    system = (M, FS, ZS, MD, L, ZD)
    r = simulate(*system, HarmonicForce(F0, ff), 100.0, warmup=400.0)
    K = M * (2 * np.pi * FS) ** 2
    ratio = ff / FS
    X = F0 / K / math.sqrt((1 - ratio**2) ** 2 + (2 * ZS * ratio) ** 2)
    t = r.time + r.warmup
    phase = math.atan2(2 * ZS * ratio, 1 - ratio**2)
    np.testing.assert_allclose(r.without_damper.displacement,
                               X * np.sin(2 * np.pi * ff * t - phase), atol=1e-9 * X)
    # identified damping of the bare building is its own damping
    assert r.without_damper.effective_damping == pytest.approx(ZS, rel=1e-6)
    # coupled, linear: same amplitude as the textbook 2-DOF transfer function
    hx, hu = transfer(ff, *system)
    z = r.linear.displacement
    assert np.max(np.abs(z)) == pytest.approx(F0 * abs(hx), rel=1e-3)  # sampled peak
    c = np.column_stack([np.sin(2 * np.pi * ff * t), np.cos(2 * np.pi * ff * t)])
    amp = np.hypot(*np.linalg.lstsq(c, z, rcond=None)[0])
    assert amp == pytest.approx(F0 * abs(hx), rel=1e-9)
    damper = pytest.importorskip("functions.damper")
    mu, f = MD / M, math.sqrt(G / L) / (2 * math.pi) / FS
    assert amp * K / F0 == pytest.approx(
        damper.frequency_response(ratio, mu, f, ZD, ZS), rel=1e-7)


def test_rk4_agrees_with_solve_ivp():
    load = HarmonicForce(1.2e5, 0.2)
    kw = dict(warmup=0.0, rtol=1e-8)
    a = simulate(*DEMO, load, 60.0, **kw)
    b = simulate(*DEMO, load, 60.0, integrator="solve_ivp", **kw)
    assert a.nonlinear.swing_deg > 15.0
    for name in ("displacement", "angle_deg", "acceleration"):
        ya, yb = getattr(a.nonlinear, name), getattr(b.nonlinear, name)
        np.testing.assert_allclose(ya, yb, atol=1e-6 * np.max(np.abs(yb)))
    assert b.substeps == 0


def test_step_is_refined_until_error_estimate_meets_rtol():
    load = HarmonicForce(1.2e5, 0.2)
    loose = simulate(*DEMO, load, 60.0, warmup=0.0, rtol=1e-3)
    tight = simulate(*DEMO, load, 60.0, warmup=0.0, rtol=1e-8)
    assert loose.substeps == 2 and tight.substeps > loose.substeps
    assert tight.integration_error <= 1e-8
    # the loose run's true error is bounded by its estimate (checked against the tight run)
    err = np.max(np.abs(loose.nonlinear.angle_deg - tight.nonlinear.angle_deg))
    assert err / np.max(np.abs(tight.nonlinear.angle_deg)) <= 3 * max(loose.integration_error,
                                                                      1e-12)


def test_divergence_is_reported_not_returned():
    with pytest.raises(ValueError, match=r"nonlinear integration diverged"):
        simulate(*DEMO, HarmonicForce(1e9, 0.2), 100.0, warmup=0.0, samples_per_period=8)
