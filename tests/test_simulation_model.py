# SPDX-License-Identifier: MIT
"""Equations of motion of the building mode with its pendulum, through simulate.

References used here: scipy.special.ellipk (exact pendulum period, A&S §17.2), the energy
integral of the Lagrangian, the odd symmetry of the equations in (x, theta) and a
fourth-order central difference of the simulated velocity. Demo data are invented.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.interpolate import CubicHermiteSpline
from scipy.special import ellipk
from simulation_reference import FS, G, L, M, ZD, ZS

from functions.pendulum import exact_period
from functions.simulation import simulate


def upward_crossings(result):
    t = result.time
    th = result.nonlinear.angle_deg
    w = result.nonlinear.angular_velocity_deg
    out = []
    for i in np.flatnonzero((th[:-1] < 0) & (th[1:] >= 0)):
        spline = CubicHermiteSpline(t[i:i + 2], th[i:i + 2], w[i:i + 2])
        out.append([x for x in spline.roots() if t[i] - 1e-12 <= x <= t[i + 1] + 1e-12][0])
    return np.array(out)


@pytest.mark.parametrize("release_deg", [120.0, 170.0])
def test_free_pendulum_reproduces_exact_period(release_deg):
    # The building is made 1e12 times heavier than the mass: the hanger's support is fixed to
    # ~1e-12, and the pendulum swings freely from rest at the release angle.
    T_ref = exact_period(L, release_deg)
    # independent of our code: T = 4 sqrt(L/g) K(m), m = sin^2(a/2) (A&S §17.2, scipy ellipk)
    T_scipy = 4 * math.sqrt(L / G) * ellipk(math.sin(math.radians(release_deg) / 2) ** 2)
    assert T_ref == pytest.approx(T_scipy, rel=1e-13)
    # rtol 1e-7 on the state gives periods good to a few 1e-9 (zero crossings by cubic Hermite
    # interpolation of angle and rate between samples)
    r = simulate(1e15, FS, 0.0, 1e3, L, 0.0, None, 4.5 * T_ref, initial_angle_deg=release_deg,
                 samples_per_period=64, rtol=1e-7)
    assert r.integration_error <= 1e-7
    periods = np.diff(upward_crossings(r))
    assert len(periods) >= 3
    np.testing.assert_allclose(periods, T_ref, rtol=1e-6)
    np.testing.assert_allclose(periods, T_scipy, rtol=1e-6)
    assert r.nonlinear.swing_deg == pytest.approx(release_deg, rel=1e-6)


def test_energy_conserved_for_undamped_system():
    # Undamped building and damper, no load, released at 90 deg with the building displaced:
    # E = (M+m) v^2/2 + m L cos(th) v w + m L^2 w^2/2 + K x^2/2 + m g L (1 - cos th) is constant
    # (the Lagrangian's energy integral). The drift stays within the integrator's error estimate.
    m, fs = 5e4, 0.2
    K = M * (2 * math.pi * fs) ** 2
    r = simulate(M, fs, 0.0, m, L, 0.0, None, 100.0, initial_angle_deg=90.0,
                 initial_displacement=0.3, rtol=1e-6)
    n = r.nonlinear
    x, v = n.displacement, n.velocity
    th, w = np.radians(n.angle_deg), np.radians(n.angular_velocity_deg)
    E = (0.5 * (M + m) * v**2 + m * L * np.cos(th) * v * w + 0.5 * m * L**2 * w**2
         + 0.5 * K * x**2 + m * G * L * (1 - np.cos(th)))
    assert r.integration_error <= 1e-6
    assert np.max(np.abs(E / E[0] - 1)) <= max(r.integration_error, 1e-12)
    # the acceleration output (x'' from the equations of motion) against a fourth-order central
    # difference of the velocity history; the 90 deg release whips the mass through the bottom
    # (harmonics up to ~5 f_d at 32 samples per period), so the difference is only good to ~0.4 %
    h = r.time_step
    fd = (-v[4:] + 8 * v[3:-1] - 8 * v[1:-3] + v[:-4]) / (12 * h)
    np.testing.assert_allclose(n.acceleration[2:-2], fd, atol=1e-2 * np.max(np.abs(fd)))


@settings(max_examples=5, deadline=None)
@given(st.floats(1.0, 150.0), st.floats(-0.5, 0.5), st.floats(0.005, 0.2))
def test_mirror_symmetry(angle, x0, mu):
    # The equations are odd in (x, theta): mirrored initial state -> mirrored motion, exactly.
    a = simulate(M, FS, ZS, mu * M, L, ZD, None, 10.0, initial_angle_deg=angle,
                 initial_displacement=x0)
    b = simulate(M, FS, ZS, mu * M, L, ZD, None, 10.0, initial_angle_deg=-angle,
                 initial_displacement=-x0)
    np.testing.assert_array_equal(a.nonlinear.angle_deg, -b.nonlinear.angle_deg)
    np.testing.assert_array_equal(a.nonlinear.displacement, -b.nonlinear.displacement)
